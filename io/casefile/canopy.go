package casefile

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"rollerbed/io/stricttoml"
)

// Element shapes for [canopy] shape.
const (
	// ShapeCylinder: rigid circular cylinders of diameter Canopy.Diameter
	// (stems, lab dowels, tube worms); their surface area per unit volume
	// is π a.
	ShapeCylinder = "cylinder"
	// ShapeBlade: flat blades of width Canopy.Diameter facing the flow
	// (seagrass, kelp); their surface area per unit volume is 2 a.
	ShapeBlade = "blade"
)

// Drag laws for [canopy] drag_law. The canopy force per unit mass f_c acts
// where the frontal area per unit volume a(x, z) is > 0.
const (
	// DragFixed: f_c = −½ C_D a |u| u with the fixed C_D of
	// Canopy.DragCoefficient.
	DragFixed = "fixed"
	// DragCylinder: the same quadratic drag with C_D of a circular
	// cylinder, computed from the element Reynolds number |u| d / ν with
	// d = Canopy.Diameter. Package canopy holds the law and its source.
	DragCylinder = "cylinder"
	// DragLinear: a Darcy–Brinkman layer, f_c = −r u with the rate r of
	// Canopy.LinearRate wherever a > 0; a serves only as the mask of where
	// the canopy is.
	DragLinear = "linear"
)

// Canopy is the optional [canopy] table: a porous layer of submerged
// elements on the bed. Case.Canopy is nil when the file has no [canopy]
// table, which is a run without a canopy.
//
// The vertical profile of the frontal area per unit volume a(z) (1/m: the
// frontal area of the elements per unit volume of water; n stems of
// diameter d per m² of bed give a = n d) comes in exactly one of three
// forms, and the fields of the other two are zero:
//
//   - a uniform block: a = FrontalArea for 0 <= z < Height (top edge
//     smoothed over EdgeWidth);
//   - Profile, rows (z, a) given in the case file;
//   - ProfileFile, a CSV file of such rows.
//
// Along x the canopy covers the whole slice when Patches is empty, and only
// the patches otherwise; inside them a(x, z) = a(z).
type Canopy struct {
	// Height is the height h of the uniform block in m,
	// 0 < h <= Domain.Depth (h = Depth is an emergent canopy). Required
	// with FrontalArea; 0 for the other forms.
	Height float64 `toml:"height"`
	// FrontalArea is the frontal area per unit volume a of the uniform
	// block in 1/m, > 0. Required with Height; 0 for the other forms.
	FrontalArea float64 `toml:"frontal_area"`
	// Profile holds rows {z, a}: the height z in m, strictly increasing
	// from row to row, 0 <= z <= Domain.Depth, and the frontal area per
	// unit volume a at z in 1/m, >= 0 and not 0 in every row; at least 2
	// rows. Package canopy interpolates a linearly in z between rows and
	// takes a = 0 below the first row and above the last. Problems name
	// rows from 0: canopy.profile[0] is the first. nil when not used.
	Profile [][2]float64 `toml:"profile" row:"[z, a]"`
	// ProfileFile is a CSV file of rows z, a (m, 1/m) under the same rules
	// as Profile; package canopy reads and checks it. Load resolves a
	// relative path against the folder of the case file and stores the
	// result; Parse, which has no folder, keeps it as written (relative to
	// the working directory). "" when not used.
	ProfileFile string `toml:"profile_file" path:"relative"`
	// EdgeWidth smooths the top edge of the uniform block: a falls from
	// its full value at z = Height − EdgeWidth to 0 at z = Height (package
	// canopy sets the form of the fall). In m, 0 <= EdgeWidth < Height;
	// default 0, a sharp edge. Block only; 0 for the other forms, whose
	// rows set their own edge.
	EdgeWidth float64 `toml:"edge_width"`
	// Shape is ShapeCylinder (the default) or ShapeBlade.
	Shape string `toml:"shape"`
	// Diameter is the cylinder diameter d or the blade width b in m, > 0.
	// Required with DragCylinder and with the uptake correlations of
	// [[scalar]] uptake (all but UptakeNone and canopy.TransferPowerLaw); optional
	// otherwise (0 = not given).
	Diameter float64 `toml:"diameter"`
	// DragCoefficient is the fixed drag coefficient C_D, dimensionless,
	// 0 < C_D <= 10; default 1 with DragFixed, and 0 with the other laws.
	DragCoefficient float64 `toml:"drag_coefficient"`
	// DragLaw is DragFixed (the default), DragCylinder or DragLinear.
	DragLaw string `toml:"drag_law"`
	// LinearRate is the rate r of DragLinear in 1/s, > 0; required with
	// DragLinear, 0 otherwise.
	LinearRate float64 `toml:"linear_rate"`
	// SolidFraction is the solid volume fraction φ, the share of the
	// canopy volume that the elements themselves fill, dimensionless,
	// 0 <= φ < 0.6; default 0 (neglected).
	SolidFraction float64 `toml:"solid_fraction"`
	// BladeModulus is Young's modulus E of flexible blades in Pa, > 0;
	// 0 (the default) for rigid elements. BladeModulus, BladeThickness
	// and BladeDensity come together, with ShapeBlade and DragFixed.
	BladeModulus float64 `toml:"blade_modulus"`
	// BladeThickness is the thickness t of flexible blades in m,
	// 0 < t < Diameter; 0 for rigid elements.
	BladeThickness float64 `toml:"blade_thickness"`
	// BladeDensity is the density ρ_v of flexible blades in kg/m³,
	// 0 < ρ_v <= Fluid.Density; 0 for rigid elements.
	BladeDensity float64 `toml:"blade_density"`
	// Patches are the [[canopy.patch]] tables: the stretches along x that
	// the canopy covers, none overlapping another. Empty (the default) is
	// a canopy over the whole slice.
	Patches []Patch `toml:"patch"`
}

// Patch is one [[canopy.patch]] table: a stretch of the slice along x that
// the canopy covers. Problems name patches from 0: canopy.patch[0] is the
// first [[canopy.patch]] of the file.
type Patch struct {
	// Start is the x where the patch begins, in m,
	// 0 <= Start < Domain.Length. Required.
	Start float64 `toml:"start"`
	// End is the x where the patch ends, in m, 0 < End <= Domain.Length,
	// End != Start. x is periodic: a patch with Start > End wraps around
	// x = Length and covers Start <= x < Length and 0 <= x < End.
	// Required.
	End float64 `toml:"end"`
	// EdgeWidth smooths the ends: a rises from 0 at each end of the patch
	// to its full value over EdgeWidth inside the patch. In m, from 0 to
	// half the patch length; default 0, sharp ends.
	EdgeWidth float64 `toml:"edge_width"`
	// SpanStart and SpanEnd limit the patch across the span of a slab
	// (domain.width) to SpanStart <= y < SpanEnd, in m, making it a
	// rectangle; y is periodic like x, so SpanStart > SpanEnd wraps
	// around y = Width. Both absent (the default) is a stripe across the
	// whole span. Only in a slab; EdgeWidth smooths the sides as well.
	SpanStart float64 `toml:"span_start"`
	SpanEnd   float64 `toml:"span_end"`
}

// Spanwise reports whether the patch is limited across the span (a
// rectangle) rather than a stripe across the whole span.
func (pt Patch) Spanwise() bool { return pt.SpanStart != pt.SpanEnd }

// SpanLength returns the extent of the patch across a span of the given
// width in m: the whole width for a stripe.
func (pt Patch) SpanLength(width float64) float64 {
	switch {
	case !pt.Spanwise():
		return width
	case pt.SpanEnd > pt.SpanStart:
		return pt.SpanEnd - pt.SpanStart
	}
	return width - pt.SpanStart + pt.SpanEnd
}

// spanSpans returns the patch's extent across the span as one or two
// intervals [from, to) of [0, width).
func (pt Patch) spanSpans(width float64) [][2]float64 {
	if !pt.Spanwise() {
		return [][2]float64{{0, width}}
	}
	return Patch{Start: pt.SpanStart, End: pt.SpanEnd}.spans(width)
}

// Length returns the extent of the patch along x in m on a slice of the
// given streamwise period: End − Start, or length − Start + End for a patch
// that wraps around x = length.
func (pt Patch) Length(length float64) float64 {
	if pt.End > pt.Start {
		return pt.End - pt.Start
	}
	return length - pt.Start + pt.End
}

// spans returns the patch as one or two intervals [from, to) of [0, length).
func (pt Patch) spans(length float64) [][2]float64 {
	if pt.End > pt.Start {
		return [][2]float64{{pt.Start, pt.End}}
	}
	return [][2]float64{{pt.Start, length}, {0, pt.End}}
}

// Defaults and limits of the canopy.
const (
	// defaultDragCoefficient: C_D ≈ 1, the drag coefficient of an isolated
	// circular cylinder at element Reynolds numbers of about 10³ to 10⁵ and
	// the value commonly taken for canopy elements (Nepf 2012, "Flow and
	// transport in regions with aquatic vegetation", Annu. Rev. Fluid
	// Mech. 44:123–142; from memory).
	defaultDragCoefficient = 1.0
	// maxDragCoefficient bounds a fixed C_D well above the values measured
	// for canopy elements, to catch slips of unit or digit (common
	// practice, no source).
	maxDragCoefficient = 10.0
	// maxSolidFraction bounds φ at a dense packing, beyond which the drag
	// laws of separate elements no longer apply (common practice, no
	// source).
	maxSolidFraction = 0.6
	// minProfileRows is the least number of rows of canopy.profile.
	minProfileRows = 2
)

func checkCanopy(c *Case, p *stricttoml.Problems) {
	cp := c.Canopy
	if cp == nil || !p.OK("canopy") {
		return
	}
	if p.Parsing {
		if !p.Has("canopy.shape") {
			cp.Shape = ShapeCylinder
		}
		if !p.Has("canopy.drag_law") {
			cp.DragLaw = DragFixed
		}
		if cp.DragLaw == DragFixed && !p.Has("canopy.drag_coefficient") {
			cp.DragCoefficient = defaultDragCoefficient
		}
	}
	checkCanopyProfile(c, p)
	checkCanopyElements(cp, p)
	checkFlexible(c, p)
	checkPatches(c, p)
}

// checkCanopyProfile checks the vertical profile: one of the three forms.
func checkCanopyProfile(c *Case, p *stricttoml.Problems) {
	cp := c.Canopy
	depth := c.Domain.Depth
	depthOK := p.OK("domain.depth") && depth > 0 && stricttoml.Finite(depth)
	const choose = "give exactly one of canopy.height with canopy.frontal_area (a uniform block), canopy.profile (rows [z, a]) or canopy.profile_file (a CSV file of z, a)"

	var given []string
	switch {
	case p.Used("canopy.height", cp.Height != 0):
		given = append(given, "canopy.height")
	case p.Used("canopy.frontal_area", cp.FrontalArea != 0):
		given = append(given, "canopy.frontal_area")
	}
	block := len(given) == 1
	if p.Used("canopy.profile", cp.Profile != nil) {
		given = append(given, "canopy.profile")
	}
	if p.Used("canopy.profile_file", cp.ProfileFile != "") {
		given = append(given, "canopy.profile_file")
	}
	switch len(given) {
	case 0:
		p.Add("canopy", "", "has no vertical profile; "+choose+" under [canopy], or remove the [canopy] table for a bare bed")
		return
	case 1:
	default:
		p.MoreThanOne(given, choose)
		return
	}

	if block {
		checkCanopyBlock(cp, depth, depthOK, p)
	} else if p.OK("canopy.edge_width") {
		p.OnlyWith("canopy.edge_width", cp.EdgeWidth != 0, stricttoml.FormatFloat(cp.EdgeWidth), "the canopy is a uniform block (canopy.height with canopy.frontal_area); rows of a profile set their own top edge")
	}
	switch given[0] {
	case "canopy.profile":
		checkProfileRows(cp.Profile, depth, depthOK, p)
	case "canopy.profile_file":
		if p.OK("canopy.profile_file") && strings.TrimSpace(cp.ProfileFile) == "" {
			p.Add("canopy.profile_file", strconv.Quote(cp.ProfileFile), `must name a CSV file of rows z, a (m, 1/m), relative to the folder of the case file; e.g. profile_file = "meadow.csv"`)
		}
	}
}

// checkCanopyBlock checks a uniform block: height, frontal_area and the
// smoothing of its top edge.
func checkCanopyBlock(cp *Canopy, depth float64, depthOK bool, p *stricttoml.Problems) {
	if p.Parsing && !p.Has("canopy.height") {
		p.Add("canopy.height", "", "missing; required with canopy.frontal_area: the height h of the uniform canopy block in m, 0 < h <= domain.depth; add e.g. height = 0.2 under [canopy], or give the shape of a(z) as canopy.profile instead")
	} else if p.OK("canopy.height") && p.Positive("canopy.height", cp.Height, "canopy height h, m", "e.g. height = 0.2") &&
		depthOK && cp.Height > depth {
		p.Addf("canopy.height", stricttoml.FormatFloat(cp.Height), "the canopy is taller than the domain: domain.depth = %s m; canopy.height must be > 0 and <= domain.depth (canopy height h, m); lower the canopy or deepen the domain", stricttoml.FormatFloat(depth))
	}
	if p.Parsing && !p.Has("canopy.frontal_area") {
		p.Add("canopy.frontal_area", "", "missing; required with canopy.height: the frontal area per unit volume a of the block in 1/m, > 0 (n stems of diameter d per m² of bed give a = n·d); add e.g. frontal_area = 4.0 under [canopy]")
	} else if p.OK("canopy.frontal_area") {
		p.Positive("canopy.frontal_area", cp.FrontalArea, "frontal area per unit volume a, 1/m", "e.g. frontal_area = 4.0")
	}
	if !p.OK("canopy.edge_width") || !p.AtLeast("canopy.edge_width", cp.EdgeWidth, 0, "smoothing of the top edge of the block, m; 0 = sharp", "") {
		return
	}
	h := cp.Height
	if cp.EdgeWidth > 0 && p.OK("canopy.height") && h > 0 && cp.EdgeWidth >= h {
		p.Addf("canopy.edge_width", stricttoml.FormatFloat(cp.EdgeWidth), "must be less than canopy.height = %s m (the top edge is smoothed between height - edge_width and height); use a narrower edge, e.g. edge_width = %s", stricttoml.FormatFloat(h), stricttoml.FormatRound(h/10))
	}
}

// profileRowKey names row i of canopy.profile.
func profileRowKey(i int) string { return "canopy.profile[" + strconv.Itoa(i) + "]" }

// fmtRow writes a row as TOML would.
func fmtRow(r [2]float64) string {
	return "[" + stricttoml.FormatFloat(r[0]) + ", " + stricttoml.FormatFloat(r[1]) + "]"
}

// checkProfileRows checks the rows of canopy.profile, each for one problem
// at most. Heights are compared with the highest valid height of the rows
// before, so one row out of order gives one problem.
func checkProfileRows(rows [][2]float64, depth float64, depthOK bool, p *stricttoml.Problems) {
	if !p.OK("canopy.profile") {
		return
	}
	if len(rows) < minProfileRows {
		value := "[]"
		if len(rows) == 1 {
			value = "[" + fmtRow(rows[0]) + "]"
		}
		p.Addf("canopy.profile", value, "must have at least %d rows [z, a] (height z in m, frontal area per unit volume a in 1/m), not %d; e.g. profile = [[0.0, 4.0], [0.2, 4.0], [0.25, 0.0]]", minProfileRows, len(rows))
		return
	}
	prev := -1 // the row of the highest valid z so far
	allGood, anyDrag := true, false
	for i, r := range rows {
		key := profileRowKey(i)
		if !p.OK(key) {
			allGood = false // a problem from decoding
			continue
		}
		z, a := r[0], r[1]
		row := "the " + stricttoml.Ordinal(i+1) + " row"
		switch {
		case !stricttoml.Finite(z) || !stricttoml.Finite(a):
			p.Addf(key, fmtRow(r), "z and a must be finite numbers (%s: height z in m, frontal area per unit volume a in 1/m)", row)
		case z < 0:
			p.Addf(key, fmtRow(r), "z = %s m is below the bed (%s); heights z run from 0 at the bed up to domain.depth", stricttoml.FormatFloat(z), row)
		case depthOK && z > depth:
			p.Addf(key, fmtRow(r), "z = %s m is above the top of the domain, domain.depth = %s m (%s); the canopy must fit inside the domain: lower the row or deepen the domain", stricttoml.FormatFloat(z), stricttoml.FormatFloat(depth), row)
		case prev >= 0 && z <= rows[prev][0]:
			p.Addf(key, fmtRow(r), "z = %s m does not rise above z = %s m of %s (%s); heights must increase strictly from row to row: sort the rows by z and merge repeated heights", stricttoml.FormatFloat(z), stricttoml.FormatFloat(rows[prev][0]), profileRowKey(prev), row)
		default:
			prev = i
			if a >= 0 {
				anyDrag = anyDrag || a > 0
				continue
			}
			p.Addf(key, fmtRow(r), "a = %s 1/m is negative (%s); the frontal area per unit volume must be >= 0, with 0 for no elements at that height", stricttoml.FormatFloat(a), row)
		}
		allGood = false
	}
	if allGood && !anyDrag {
		p.Add("canopy.profile", "", "has a = 0 in every row, which is no canopy; give a > 0 (1/m) where the elements are, or remove the [canopy] table for a bare bed")
	}
}

// checkCanopyElements checks the shape and size of the elements, the drag
// law and the solid fraction.
func checkCanopyElements(cp *Canopy, p *stricttoml.Problems) {
	shapeOK := p.OK("canopy.shape") && p.OneOf("canopy.shape", cp.Shape, []string{ShapeCylinder, ShapeBlade}, "")
	diameter := p.Used("canopy.diameter", cp.Diameter != 0)
	if diameter && p.OK("canopy.diameter") {
		p.Positive("canopy.diameter", cp.Diameter, "cylinder diameter d or blade width b, m", "e.g. diameter = 0.006")
	}
	if sf := cp.SolidFraction; p.OK("canopy.solid_fraction") && !(sf >= 0 && sf < maxSolidFraction) {
		p.Add("canopy.solid_fraction", stricttoml.FormatFloat(sf), "must be >= 0 and < 0.6 (solid volume fraction φ: the share of the canopy volume that the elements fill, dimensionless); 0 neglects it")
	}
	if !p.OK("canopy.drag_law") || !p.OneOf("canopy.drag_law", cp.DragLaw, []string{DragFixed, DragCylinder, DragLinear}, "") {
		return
	}
	cd := cp.DragCoefficient
	law := strconv.Quote(cp.DragLaw)
	if cp.DragLaw == DragFixed {
		if p.OK("canopy.drag_coefficient") && !(cd > 0 && cd <= maxDragCoefficient) {
			p.Add("canopy.drag_coefficient", stricttoml.FormatFloat(cd), "must be > 0 and <= 10 (fixed drag coefficient C_D of the elements, dimensionless); about 1 suits cylinders, e.g. drag_coefficient = 1.0")
		}
	} else if p.OK("canopy.drag_coefficient") && p.Used("canopy.drag_coefficient", cd != 0) {
		why := "which computes C_D from the element Reynolds number |u|·d/ν"
		if cp.DragLaw == DragLinear {
			why = "whose force -r·u uses canopy.linear_rate and no C_D"
		}
		p.Add("canopy.drag_coefficient", stricttoml.FormatFloat(cd), "is not used with canopy.drag_law = "+law+", "+why+`; keep one of them: remove drag_coefficient, or drag_law for a fixed C_D`)
	}
	if cp.DragLaw == DragCylinder {
		if !diameter {
			p.Add("canopy.diameter", "", `missing; required with canopy.drag_law = "cylinder": the cylinder diameter d in m, > 0, which sets the element Reynolds number |u|·d/ν; add e.g. diameter = 0.006 under [canopy]`)
		}
		if shapeOK && cp.Shape == ShapeBlade {
			p.Add("canopy.drag_law", law, `is the law of circular cylinders, but canopy.shape = "blade"; for blades give a fixed drag_coefficient instead of drag_law, or set shape = "cylinder"`)
		}
	}
	switch {
	case cp.DragLaw != DragLinear:
		if p.OK("canopy.linear_rate") {
			p.OnlyWith("canopy.linear_rate", cp.LinearRate != 0, stricttoml.FormatFloat(cp.LinearRate), `canopy.drag_law = "linear"`)
		}
	case p.Parsing && !p.Has("canopy.linear_rate"):
		p.Add("canopy.linear_rate", "", `missing; required with canopy.drag_law = "linear": the linear drag rate r in 1/s, > 0 (the canopy force is -r·u); add e.g. linear_rate = 0.5 under [canopy]`)
	case p.OK("canopy.linear_rate"):
		p.Positive("canopy.linear_rate", cp.LinearRate, "linear drag rate r of the Darcy-Brinkman layer, 1/s", "e.g. linear_rate = 0.5")
	}
}

// patchKey names [[canopy.patch]] element i.
func patchKey(i int) string { return "canopy.patch[" + strconv.Itoa(i) + "]" }

// checkPatches checks each [[canopy.patch]] and that no two overlap.
func checkPatches(c *Case, p *stricttoml.Problems) {
	patches := c.Canopy.Patches
	length := c.Domain.Length
	lengthOK := p.OK("domain.length") && length > 0 && stricttoml.Finite(length)
	good := make([]bool, len(patches))
	for i, pt := range patches {
		good[i] = checkPatch(c, i, pt, length, lengthOK, p)
	}
	if !lengthOK {
		return
	}
	for j := range patches {
		for i := 0; i < j && good[j]; i++ {
			if !good[i] {
				continue
			}
			if lo, hi, ok := overlap(patches[i], patches[j], length); ok && overlapAcross(patches[i], patches[j], c.Domain.Width) {
				p.Addf(patchKey(j), "", "(the %s [[canopy.patch]], %s) overlaps %s (%s) from x = %s m to %s m; patches must not overlap: move the start or end of one of them, or merge the two into one patch",
					stricttoml.Ordinal(j+1), describePatch(patches[j], length), patchKey(i), describePatch(patches[i], length), stricttoml.FormatFloat(lo), stricttoml.FormatFloat(hi))
				good[j] = false
			}
		}
	}
}

// checkPatch checks one patch and reports whether it is fit to be compared
// with the others.
func checkPatch(c *Case, i int, pt Patch, length float64, lengthOK bool, p *stricttoml.Problems) bool {
	base := patchKey(i)
	if !p.OK(base) {
		return false
	}
	nth := "the " + stricttoml.Ordinal(i+1) + " [[canopy.patch]]"
	missing := func(name, desc, example string) bool {
		if p.Parsing && !p.Has(base+"."+name) {
			p.Addf(base+"."+name, "", "missing; required in every [[canopy.patch]]: %s; add e.g. %s under %s header", desc, example, nth)
			return true
		}
		return false
	}
	const wrap = "x is periodic, so a patch across x = domain.length has start > end (it wraps around)"

	startOK := false
	switch key := base + ".start"; {
	case missing("start", "the x where the patch begins in m, 0 <= start < domain.length", "start = 0.5"):
	case !p.OK(key):
	case lengthOK && !(pt.Start >= 0 && pt.Start < length):
		p.Addf(key, stricttoml.FormatFloat(pt.Start), "is outside the domain: must be >= 0 and < domain.length = %s m (x where %s begins, m); %s", stricttoml.FormatFloat(length), nth, wrap)
	case !lengthOK && !p.AtLeast(key, pt.Start, 0, "x where the patch begins, m", ""):
	default:
		startOK = true
	}
	endOK := false
	switch key := base + ".end"; {
	case missing("end", "the x where the patch ends in m, 0 < end <= domain.length", "end = 1.5"):
	case !p.OK(key):
	case lengthOK && !(pt.End > 0 && pt.End <= length):
		p.Addf(key, stricttoml.FormatFloat(pt.End), "is outside the domain: must be > 0 and <= domain.length = %s m (x where %s ends, m); %s", stricttoml.FormatFloat(length), nth, wrap)
	case !lengthOK && !p.Positive(key, pt.End, "x where the patch ends, m", ""):
	default:
		endOK = true
	}
	if startOK && endOK && pt.Start == pt.End {
		p.Addf(base+".end", stricttoml.FormatFloat(pt.End), "equals start = %s m, which leaves %s empty; give end > start, or end < start for a patch that wraps around x = domain.length", stricttoml.FormatFloat(pt.Start), nth)
		return false
	}
	extentOK := startOK && endOK && (pt.End > pt.Start || lengthOK)
	key := base + ".edge_width"
	if p.OK(key) && p.AtLeast(key, pt.EdgeWidth, 0, "smoothing of the ends of the patch, m; 0 = sharp", "") && extentOK {
		// The relative margin keeps round-off in the length of a wrapped
		// patch (2 - 1.8 + 0.2) from refusing edge_width = length/2.
		if ext := pt.Length(length); pt.EdgeWidth > ext/2*(1+1e-12) {
			p.Addf(key, stricttoml.FormatFloat(pt.EdgeWidth), "must be at most half the length of %s (%s m of %s m), since a rises over edge_width inside each end of the patch; e.g. edge_width = %s", nth, stricttoml.FormatRound(ext/2), stricttoml.FormatRound(ext), stricttoml.FormatRound(ext/10))
		}
	}
	return checkPatchSpan(c, i, pt, p) && startOK && endOK
}

// checkPatchSpan checks the spanwise extent of one patch and reports
// whether it is fit to be compared with the others.
func checkPatchSpan(c *Case, i int, pt Patch, p *stricttoml.Problems) bool {
	base := patchKey(i)
	nth := "the " + stricttoml.Ordinal(i+1) + " [[canopy.patch]]"
	start, end := p.Used(base+".span_start", pt.SpanStart != 0), p.Used(base+".span_end", pt.SpanEnd != 0)
	if !start && !end {
		return true
	}
	width := c.Domain.Width
	if !c.Domain.Slab() {
		key := base + ".span_start"
		if !start {
			key = base + ".span_end"
		}
		p.Addf(key, "", "limits %s across the span, which only a slab has; give domain.width and domain.ny for a slab, or remove span_start and span_end for the x–z slice", nth)
		return false
	}
	widthOK := p.OK("domain.width") && p.OK("domain.ny") && width > 0 && stricttoml.Finite(width)
	switch {
	case !start:
		p.Addf(base+".span_start", "", "missing: %s gives span_end, so it needs span_start too (the y where it begins, m, 0 <= span_start < domain.width); or remove span_end for a stripe across the whole span", nth)
		return false
	case !end:
		p.Addf(base+".span_end", "", "missing: %s gives span_start, so it needs span_end too (the y where it ends, m, 0 < span_end <= domain.width); or remove span_start for a stripe across the whole span", nth)
		return false
	case !p.OK(base+".span_start") || !p.OK(base+".span_end") || !widthOK:
		return false
	}
	const wrap = "y is periodic, so a patch across y = domain.width has span_start > span_end (it wraps around)"
	switch {
	case !(pt.SpanStart >= 0 && pt.SpanStart < width):
		p.Addf(base+".span_start", stricttoml.FormatFloat(pt.SpanStart), "is outside the span: must be >= 0 and < domain.width = %s m (y where %s begins, m); %s", stricttoml.FormatFloat(width), nth, wrap)
		return false
	case !(pt.SpanEnd > 0 && pt.SpanEnd <= width):
		p.Addf(base+".span_end", stricttoml.FormatFloat(pt.SpanEnd), "is outside the span: must be > 0 and <= domain.width = %s m (y where %s ends, m); %s", stricttoml.FormatFloat(width), nth, wrap)
		return false
	}
	key := base + ".edge_width"
	if ext := pt.SpanLength(width); p.OK(key) && pt.EdgeWidth > ext/2*(1+1e-12) {
		p.Addf(key, stricttoml.FormatFloat(pt.EdgeWidth), "must be at most half the spanwise extent of %s (%s m of %s m), since a rises over edge_width inside each side of the patch too; e.g. edge_width = %s", nth, stricttoml.FormatRound(ext/2), stricttoml.FormatRound(ext), stricttoml.FormatRound(ext/10))
	}
	return true
}

// overlap returns where two patches overlap, from lo to hi, if they do.
// Patches that only touch (one's end is the other's start) do not.
func overlap(a, b Patch, length float64) (lo, hi float64, ok bool) {
	for _, sa := range a.spans(length) {
		for _, sb := range b.spans(length) {
			lo, hi := math.Max(sa[0], sb[0]), math.Min(sa[1], sb[1])
			if lo < hi {
				return lo, hi, true
			}
		}
	}
	return 0, 0, false
}

// overlapAcross reports whether two patches overlap across the span of the
// given width: always when either is a stripe.
func overlapAcross(a, b Patch, width float64) bool {
	if !a.Spanwise() || !b.Spanwise() {
		return true
	}
	for _, sa := range a.spanSpans(width) {
		for _, sb := range b.spanSpans(width) {
			if math.Max(sa[0], sb[0]) < math.Min(sa[1], sb[1]) {
				return true
			}
		}
	}
	return false
}

// describePatch says where a patch lies, for a message.
func describePatch(pt Patch, length float64) string {
	s := fmt.Sprintf("x from %s m to %s m", stricttoml.FormatFloat(pt.Start), stricttoml.FormatFloat(pt.End))
	if pt.Start > pt.End {
		s += ", wrapping around x = " + stricttoml.FormatFloat(length) + " m"
	}
	return s
}

func canopyTemplate() string {
	return `[canopy]
# Optional: a porous layer of submerged elements on the bed (plants, sessile
# animals, lab dowels). Leave the whole table out for a bare bed. Here a
# seagrass meadow: flat blades 0.25 m tall over the whole slice.
#
# The vertical profile of the frontal area per unit volume a(z), in 1/m: the
# frontal area of the elements per unit volume of water (n stems of diameter
# d per m² of bed give a = n·d). Give exactly one of: height with
# frontal_area (a uniform block), profile, or profile_file.
#
# Height h of the uniform block, m. 0 < height <= domain.depth; height =
# depth is an emergent canopy.
height = 0.25
# Frontal area per unit volume a of the uniform block, 1/m. > 0.
frontal_area = 4.0
# Or rows [z, a]: height z in m, strictly increasing, 0 <= z <= depth, and a
# at that height in 1/m, >= 0 and not 0 in every row; at least 2 rows. a is
# linear in z between rows, keeps the first row's value from there down to
# the bed, and is 0 above the last row.
# Messages count rows from 0: canopy.profile[0] is the first.
# profile = [
#   [0.00, 4.0],
#   [0.20, 4.0],
#   [0.25, 0.0],
# ]
# Or a CSV file of rows z, a (m, 1/m) under the same rules; a relative path
# is taken from the folder of this case file.
# profile_file = "meadow.csv"
# Smoothing of the top edge of the block, m: a falls from its full value at
# height - edge_width to 0 at height. Only with height and frontal_area.
# Default 0 (a sharp edge); 0 <= edge_width < height.
# edge_width = 0.0
#
# Element shape. Default "cylinder".
#   "cylinder"  stems, dowels: surface area per unit volume π·a
#   "blade"     flat blades facing the flow: surface area per unit volume 2·a
shape = "blade"
# Cylinder diameter d or blade width b, m. > 0. Required with
# drag_law = "cylinder" and with the uptake correlations of [[scalar]];
# optional otherwise.
diameter = 0.005
# Fixed drag coefficient C_D, dimensionless: the drag force per unit mass is
# -½·C_D·a·|u|·u. Only with drag_law = "fixed". Default 1.0, about the C_D of
# a circular cylinder (Nepf 2012); 0 < drag_coefficient <= 10.
drag_coefficient = 1.0
# Drag law. Default "fixed".
#   "fixed"     C_D = drag_coefficient
#   "cylinder"  C_D of a circular cylinder from the element Reynolds number
#               |u|·d/ν; needs diameter and shape = "cylinder"
#   "linear"    a Darcy-Brinkman layer: force -r·u wherever a > 0 (a only
#               marks where the canopy is); needs linear_rate
# drag_law = "fixed"
# Rate r of the linear drag, 1/s. Required with drag_law = "linear", not
# allowed otherwise; > 0.
# linear_rate = 0.5
# Solid volume fraction φ: the share of the canopy volume that the elements
# fill, dimensionless. Default 0 (neglected); 0 <= solid_fraction < 0.6.
# solid_fraction = 0.0
` + flexibleTemplate + `#
# Optional patches along x. Without any [[canopy.patch]] the canopy covers
# the whole slice; with them, only the patches. Patches must not overlap;
# messages count them from 0 (canopy.patch[0] is the first). Repeat the
# block below for each patch.
# [[canopy.patch]]
# Where the patch begins along x, m. Required; 0 <= start < domain.length.
# start = 0.5
# Where the patch ends along x, m. Required; 0 < end <= domain.length and
# end != start. Since x is periodic, start > end makes a patch that wraps
# around the end of the slice, covering start to length and 0 to end.
# end = 1.5
# Width over which a rises from 0 at each end of the patch, m. Default 0
# (sharp ends); from 0 to half the patch length.
# edge_width = 0.0
# Only in a slab (domain.width and domain.ny): where the patch begins and
# ends across the span, m, making it a rectangle; 0 <= span_start <
# domain.width, 0 < span_end <= domain.width, and span_start > span_end
# wraps around y = width. Both absent (the default): a stripe across the
# whole span. edge_width smooths the sides too and is at most half this
# extent. Patches overlap only where both their x and y ranges do.
# span_start = 0.0
# span_end = 0.5
`
}
