package casefile

import (
	"math"
	"slices"
	"strconv"
	"strings"

	"rollerbed/canopy"
	"rollerbed/io/stricttoml"
)

// Boundary conditions of a scalar at the top and at the bed, for
// [[scalar]] top and bed. Fluxes are in unit·m/s, where unit is the
// concentration unit the user chose for the scalar (mol/m³, for example).
const (
	// ScalarFixed holds the concentration at the boundary: Scalar.TopValue
	// at the top, Scalar.BedValue at the bed (unit, >= 0). The default at
	// the top.
	ScalarFixed = "fixed"
	// ScalarFlux prescribes the flux through the boundary (unit·m/s): at
	// the top Scalar.TopValue, a downward supply into the domain (< 0 for
	// a loss through the top); at the bed Scalar.BedValue, the flux out of
	// the fluid into the bed (< 0 for a release from the bed).
	ScalarFlux = "flux"
	// ScalarNoFlux lets nothing through the boundary. The default at the
	// bed.
	ScalarNoFlux = "none"
	// ScalarMat (bed only) is a microbial mat or other uptaking bed: the
	// flux k_bed (c − c_w) leaves the fluid through the bed, with c the
	// concentration next to the bed, c_w = Scalar.SurfaceConcentration and
	// 1/k_bed = 1/k_dbl + 1/k_s,bed. k_s,bed = Scalar.BedCapacity is the
	// mat's own uptake capacity; k_dbl is the transfer velocity of the
	// diffusive boundary layer over the bed, from the local friction
	// velocity u* by the wall mass-transfer law of Shaw & Hanratty (1977,
	// AIChE J. 23:28–37; k_dbl = 0.0889 u* Sc^−0.704, from memory), which
	// the transport code holds. It needs a bed with shear stress
	// (bed.condition "no-slip" or "rough").
	ScalarMat = "mat"
)

// Uptake laws of the canopy elements, for [[scalar]] uptake: UptakeNone
// or one of the element transfer laws of package canopy
// (canopy.ElementTransfers: "hilpert", "churchill-bernstein",
// "plate-laminar", "plate", "power-law"), which holds the laws, their
// sources and the element shape each correlation is for. The elements
// take up a_s k_e (c − c_w) per unit volume, with a_s the element surface
// area per unit volume (π a for cylinders, 2 a for blades), c_w =
// Scalar.SurfaceConcentration and 1/k_e = 1/k_bl + 1/k_s: the
// boundary-layer transfer velocity k_bl of the law in series with the
// surface capacity k_s = Scalar.Capacity. The correlations give
// k_bl = Sh D / d, with Sh from the element Reynolds number |u| d / ν
// (d = Canopy.Diameter) and the Schmidt number Sc = ν/D; the power law is
// a fit of the user's own, k_bl = α |u|^n with α = Scalar.PowerAlpha and
// n = Scalar.PowerExponent.
const (
	// UptakeNone: the elements take up nothing (the default).
	UptakeNone = "none"
)

// uptakeLaws returns the names of [[scalar]] uptake, in the order of the
// messages.
func uptakeLaws() []string { return append([]string{UptakeNone}, canopy.ElementTransfers()...) }

// shapeWords describe an element shape in the messages about uptake
// correlations.
var shapeWords = map[string]struct{ correlation, plural, width, example string }{
	ShapeCylinder: {"circular cylinders", "cylinders", "the cylinder diameter d in m, > 0", "diameter = 0.006"},
	ShapeBlade:    {"flat plates (blades)", "blades", "the blade width b in m, > 0", "diameter = 0.005"},
}

// lawsFor returns the uptake correlations for the element shape, quoted
// and joined with "or".
func lawsFor(shape string) string {
	var laws []string
	for _, name := range canopy.ElementTransfers() {
		if sh, ok := canopy.TransferShape(name); ok && sh.String() == shape {
			laws = append(laws, strconv.Quote(name))
		}
	}
	if len(laws) <= 1 {
		return strings.Join(laws, "")
	}
	return strings.Join(laws[:len(laws)-1], ", ") + " or " + laws[len(laws)-1]
}

// Scalar is one [[scalar]] table: a passive scalar (oxygen, a nutrient, a
// dye) that the flow carries and the canopy elements and the bed may take
// up. It obeys
//
//	∂c/∂t + ∇·(u c) = ∇·((D + ν_t/Sc_t) ∇c) + Source − a_s k_e (c − c_w)
//
// with the uptake term only where the canopy is (see the Uptake constants).
// Concentrations are in a unit of the user's choice ("unit" below, e.g.
// mol/m³), fluxes in unit·m/s and sources in unit/s. Problems name scalars
// from 0: scalar[0] is the first [[scalar]] of the file.
type Scalar struct {
	// Name names the scalar in fields.h5, in output.fields and in the
	// tables: a lowercase letter, then lowercase letters, digits and _, at
	// most 32 characters; unique among the scalars and none of the flow
	// fields FieldU, FieldW, FieldP, FieldVorticity, FieldNuT. Required.
	Name string `toml:"name"`
	// Diffusivity is the molecular diffusivity D in m²/s, 0 < D < 1e-3.
	// The file gives it or Schmidt, not both; Parse derives the other,
	// D = ν/Sc, from Fluid.Viscosity. A Case built in code must hold both,
	// with Schmidt = Fluid.Viscosity/Diffusivity (a sweep that changes
	// one of the three must change Schmidt or Diffusivity with it).
	Diffusivity float64 `toml:"diffusivity"`
	// Schmidt is the Schmidt number Sc = ν/D, dimensionless, > 0; see
	// Diffusivity.
	Schmidt float64 `toml:"schmidt"`
	// TurbulentSchmidt is the turbulent Schmidt number Sc_t of the subgrid
	// flux ν_t/Sc_t ∇c, dimensionless, 0 < Sc_t <= 10; default 1.0 with
	// the Smagorinsky closure (common practice, no source; values of 0.5
	// to 1 are in use), and 0 with turbulence.closure = "none", which has
	// no subgrid flux.
	TurbulentSchmidt float64 `toml:"turbulent_schmidt"`
	// Initial is the uniform initial concentration in unit, >= 0;
	// default 0.
	Initial float64 `toml:"initial"`
	// Source is a uniform volume source in unit/s, any finite number
	// (< 0 for a sink through the volume); default 0.
	Source float64 `toml:"source"`
	// Top is the condition at the top, z = Domain.Depth: ScalarFixed
	// (the default), ScalarFlux or ScalarNoFlux.
	Top string `toml:"top"`
	// TopValue is the concentration at the top in unit, >= 0, with
	// ScalarFixed (default Initial); the downward supply into the domain
	// in unit·m/s, any finite number and required, with ScalarFlux; and 0
	// with ScalarNoFlux.
	TopValue float64 `toml:"top_value"`
	// Bed is the condition at the bed, z = 0: ScalarNoFlux (the default),
	// ScalarMat, ScalarFlux or ScalarFixed.
	Bed string `toml:"bed"`
	// BedValue is the flux out of the fluid into the bed in unit·m/s, any
	// finite number, with ScalarFlux; the concentration at the bed in
	// unit, >= 0, with ScalarFixed; required with those two and 0
	// otherwise.
	BedValue float64 `toml:"bed_value"`
	// BedCapacity is the uptake capacity k_s,bed of the mat in m/s, > 0,
	// or +Inf for a perfect sink (the diffusive boundary layer alone then
	// limits uptake). Required with ScalarMat, 0 otherwise.
	BedCapacity float64 `toml:"bed_capacity"`
	// Uptake is the uptake law of the canopy elements, one of the Uptake
	// constants; default UptakeNone. Any other law needs a [canopy] table.
	Uptake string `toml:"uptake"`
	// Capacity is the uptake capacity k_s of the element surfaces in m/s,
	// > 0, or +Inf for a perfect sink (the boundary layer alone then
	// limits uptake). Required unless Uptake is UptakeNone, 0 then.
	Capacity float64 `toml:"capacity"`
	// PowerAlpha is the coefficient α of canopy.TransferPowerLaw in
	// m^(1−n)·s^(n−1), so that α |u|^n is in m/s, > 0. Required with
	// canopy.TransferPowerLaw, 0 otherwise.
	PowerAlpha float64 `toml:"power_alpha"`
	// PowerExponent is the exponent n of canopy.TransferPowerLaw, dimensionless,
	// 0 <= n <= 2. Required with canopy.TransferPowerLaw, 0 otherwise.
	PowerExponent float64 `toml:"power_exponent"`
	// SurfaceConcentration is the concentration c_w at the element and mat
	// surfaces in unit, >= 0; default 0. Only with an uptake law or
	// ScalarMat; 0 otherwise.
	SurfaceConcentration float64 `toml:"surface_concentration"`
}

// Defaults and limits of the scalars.
const (
	// defaultTurbulentSchmidt: Sc_t = 1 (common practice, no source;
	// values of 0.5 to 1 are in use).
	defaultTurbulentSchmidt = 1.0
	// maxTurbulentSchmidt bounds Sc_t far above the values in use, to
	// catch slips (common practice, no source).
	maxTurbulentSchmidt = 10.0
	// maxDiffusivity bounds D in m²/s: gases in air diffuse at about
	// 1e-5 m²/s and solutes in water at about 1e-9 m²/s, so 1e-3 catches
	// slips of unit (common practice, no source).
	maxDiffusivity = 1e-3
	// maxScalarName is the longest scalar name, in bytes, which keeps the
	// columns of the tables readable (common practice, no source).
	maxScalarName = 32
	// schmidtTolerance is the relative mismatch allowed between
	// Scalar.Schmidt and Fluid.Viscosity/Scalar.Diffusivity in a Case
	// built in code, which covers the round-off of deriving one from the
	// other.
	schmidtTolerance = 1e-12
)

// scalarKey names [[scalar]] element i, or its key name when name is not
// "".
func scalarKey(i int, name string) string {
	k := "scalar[" + strconv.Itoa(i) + "]"
	if name != "" {
		k += "." + name
	}
	return k
}

// validScalarName reports whether name may name a scalar: a lowercase
// letter, then lowercase letters, digits and _, at most maxScalarName
// bytes.
func validScalarName(name string) bool {
	if name == "" || len(name) > maxScalarName || name[0] < 'a' || name[0] > 'z' {
		return false
	}
	for i := 0; i < len(name); i++ {
		if c := name[i]; !(c >= 'a' && c <= 'z' || c >= '0' && c <= '9' || c == '_') {
			return false
		}
	}
	return true
}

// scalarNameFor suggests a valid scalar name close to name: lowercase,
// other characters turned into _, a letter first, cut to the longest name.
func scalarNameFor(name string) string {
	var b strings.Builder
	for _, r := range strings.ToLower(strings.TrimSpace(name)) {
		switch {
		case r >= 'a' && r <= 'z', r >= '0' && r <= '9', r == '_':
			b.WriteRune(r)
		case b.Len() > 0 && !strings.HasSuffix(b.String(), "_"):
			b.WriteByte('_')
		}
	}
	s := strings.Trim(b.String(), "_")
	if s == "" {
		return "tracer"
	}
	if s[0] < 'a' || s[0] > 'z' {
		s = "c" + s
	}
	if len(s) > maxScalarName {
		s = strings.TrimRight(s[:maxScalarName], "_")
	}
	return s
}

// scalarNames returns the names of the scalars that may name a field: each
// valid name that is not a flow field or a repeat of one before it, in the
// order of the file.
func (c *Case) scalarNames() []string {
	var names []string
	for _, s := range c.Scalars {
		if !validScalarName(s.Name) || slices.Contains(baseFields, s.Name) || slices.Contains(slabFields, s.Name) || slices.Contains(names, s.Name) {
			continue
		}
		names = append(names, s.Name)
	}
	return names
}

// badScalarName reports whether name is the name of a scalar that is not
// valid, which the scalar's own check reports.
func (c *Case) badScalarName(name string) bool {
	for _, s := range c.Scalars {
		if s.Name == name && !validScalarName(name) {
			return true
		}
	}
	return false
}

func checkScalars(c *Case, p *stricttoml.Problems) {
	if !p.OK("scalar") {
		return
	}
	nu := c.Fluid.Viscosity
	nuOK := p.OK("fluid.viscosity") && nu > 0 && nu < 1
	first := map[string]int{}
	for i := range c.Scalars {
		checkScalar(c, i, nu, nuOK, first, p)
	}
}

// checkScalar applies the defaults of [[scalar]] element i and checks it.
// first maps each valid name seen so far to its element.
func checkScalar(c *Case, i int, nu float64, nuOK bool, first map[string]int, p *stricttoml.Problems) {
	base := scalarKey(i, "")
	if !p.OK(base) {
		return
	}
	s := &c.Scalars[i]
	key := func(name string) string { return scalarKey(i, name) }
	nth := "the " + stricttoml.Ordinal(i+1) + " [[scalar]]"
	smagorinsky := p.OK("turbulence.closure") && c.Turbulence.Closure == ClosureSmagorinsky
	if p.Parsing {
		if !p.Has(key("turbulent_schmidt")) && smagorinsky {
			s.TurbulentSchmidt = defaultTurbulentSchmidt
		}
		if !p.Has(key("top")) {
			s.Top = ScalarFixed
		}
		if !p.Has(key("bed")) {
			s.Bed = ScalarNoFlux
		}
		if !p.Has(key("uptake")) {
			s.Uptake = UptakeNone
		}
	}
	// missing records a required key that the text lacks; it reports
	// whether it did.
	missing := func(name, desc, example string) bool {
		if p.Parsing && !p.Has(key(name)) {
			p.Addf(key(name), "", "missing; required %s; add e.g. %s under %s header", desc, example, nth)
			return true
		}
		return false
	}

	checkScalarName(c, i, first, p)
	checkDiffusivity(s, i, nu, nuOK, p)

	if k := key("turbulent_schmidt"); p.OK(k) && p.OK("turbulence.closure") {
		if smagorinsky {
			if v := s.TurbulentSchmidt; !(v > 0 && v <= maxTurbulentSchmidt) {
				p.Add(k, stricttoml.FormatFloat(v), "must be > 0 and <= 10 (turbulent Schmidt number Sc_t of the subgrid flux ν_t/Sc_t, dimensionless); values of 0.5 to 1 are in use, e.g. turbulent_schmidt = 1.0")
			}
		} else {
			p.OnlyWith(k, s.TurbulentSchmidt != 0, stricttoml.FormatFloat(s.TurbulentSchmidt), `turbulence.closure = "smagorinsky" (without a subgrid model there is no subgrid flux ν_t/Sc_t)`)
		}
	}
	if k := key("initial"); p.OK(k) {
		p.AtLeast(k, s.Initial, 0, "uniform initial concentration, unit of the scalar", "e.g. initial = 0.0")
	}
	if k := key("source"); p.OK(k) {
		p.FiniteValue(k, s.Source, "uniform volume source, unit of the scalar per s; < 0 for a sink", "0 for none")
	}

	checkScalarTop(s, i, missing, p)
	bedOK := checkScalarBed(c, s, i, missing, p)
	uptakeOK := checkUptake(c, s, i, missing, p)

	// The surface concentration is used by element uptake and by a mat;
	// when either condition is itself wrong, only its value is checked.
	k := key("surface_concentration")
	if !p.OK(k) {
		return
	}
	if bedOK && uptakeOK && s.Bed != ScalarMat && s.Uptake == UptakeNone {
		p.OnlyWith(k, s.SurfaceConcentration != 0, stricttoml.FormatFloat(s.SurfaceConcentration), "the scalar is taken up: "+key("uptake")+` names an uptake law, or `+key("bed")+` = "mat"`)
		return
	}
	p.AtLeast(k, s.SurfaceConcentration, 0, "concentration c_w at the element and mat surfaces, unit of the scalar", "e.g. surface_concentration = 0.0")
}

// checkScalarName checks the name of scalar i: its form, that it is not a
// flow field and that no scalar before it has it.
func checkScalarName(c *Case, i int, first map[string]int, p *stricttoml.Problems) {
	s := &c.Scalars[i]
	k := scalarKey(i, "name")
	const rule = "start with a lowercase letter and hold only lowercase letters, digits and _, at most 32 characters"
	const use = "it names the field in fields.h5, in output.fields and in the tables"
	switch {
	case p.Parsing && !p.Has(k):
		p.Addf(k, "", `missing; required in every [[scalar]]: the name of the scalar (%s), which must %s; add e.g. name = "oxygen" under the %s [[scalar]] header`, use, rule, stricttoml.Ordinal(i+1))
	case !p.OK(k):
	case !validScalarName(s.Name):
		p.Addf(k, strconv.Quote(s.Name), "must %s (%s); e.g. name = %q", rule, use, scalarNameFor(s.Name))
	case slices.Contains(baseFields, s.Name):
		p.Addf(k, strconv.Quote(s.Name), "is the name of a flow field (%s), which fields.h5 and output.fields already use; give the scalar another name, e.g. name = %q",
			strings.Join(baseFields, ", "), s.Name+"_tracer")
	case slices.Contains(slabFields, s.Name):
		p.Addf(k, strconv.Quote(s.Name), "is the name of a flow field of a slab (%s), which fields.h5 uses; give the scalar another name, e.g. name = %q",
			strings.Join(slabFields, ", "), s.Name+"_tracer")
	case slices.Contains(ReservedNames, s.Name):
		p.Addf(k, strconv.Quote(s.Name), "is kept by fields.h5 for its coordinates and the velocity vector (%s); give the scalar another name, e.g. name = %q",
			strings.Join(ReservedNames, ", "), s.Name+"_tracer")
	default:
		if j, seen := first[s.Name]; seen {
			p.Addf(k, strconv.Quote(s.Name), "repeats %s (the %s [[scalar]]); each scalar needs a name of its own: rename one of them", scalarKey(j, "name"), stricttoml.Ordinal(j+1))
			return
		}
		first[s.Name] = i
	}
}

// checkDiffusivity checks the diffusivity and the Schmidt number of scalar
// i: while parsing exactly one is given and the other is derived from the
// viscosity nu (when nuOK); in a Case built in code both must agree.
func checkDiffusivity(s *Scalar, i int, nu float64, nuOK bool, p *stricttoml.Problems) {
	dk, sk := scalarKey(i, "diffusivity"), scalarKey(i, "schmidt")
	const dDesc = "molecular diffusivity D, m²/s"
	const dHint = "e.g. diffusivity = 1.76e-9 for oxygen in water at 20 °C, 2e-5 for a gas in air"
	const sDesc = "Schmidt number Sc = ν/D, dimensionless"
	checkD := func() bool {
		return p.OK(dk) && p.OpenRange(dk, s.Diffusivity, 0, maxDiffusivity, dDesc, dHint)
	}
	checkSc := func() bool {
		return p.OK(sk) && p.Positive(sk, s.Schmidt, sDesc, "e.g. schmidt = 600 for oxygen in water at 20 °C")
	}
	// derivedD checks the diffusivity that a valid Sc gives.
	derivedD := func() {
		if d := nu / s.Schmidt; !(representable(d) && d < maxDiffusivity) {
			p.Addf(sk, stricttoml.FormatFloat(s.Schmidt), "gives a diffusivity D = ν/Sc = %s m²/s with fluid.viscosity = %s m²/s; D must be > 0 and < 0.001 m²/s, so Sc must be > %s; check the value, or give diffusivity (m²/s) instead",
				stricttoml.FormatRound(d), stricttoml.FormatFloat(nu), stricttoml.FormatRound(nu/maxDiffusivity))
		}
	}
	if !p.Parsing {
		dOK, sOK := checkD(), checkSc()
		if dOK && sOK && nuOK {
			derivedD()
			if want := nu / s.Diffusivity; p.OK(sk) && !(math.Abs(s.Schmidt-want) <= schmidtTolerance*want) {
				p.Addf(sk, stricttoml.FormatFloat(s.Schmidt), "differs from fluid.viscosity / %s = %s / %s = %s; Schmidt must equal ν/D: set it to %s, or change Diffusivity to match",
					dk, stricttoml.FormatFloat(nu), stricttoml.FormatFloat(s.Diffusivity), stricttoml.FormatRound(want), stricttoml.FormatFloat(want))
			}
		}
		return
	}
	hasD, hasS := p.Has(dk), p.Has(sk)
	switch {
	case hasD && hasS:
		p.Addf(sk, "", "%s and %s are both given; give exactly one: the molecular diffusivity D in m²/s, or the Schmidt number Sc = ν/D; the other follows from fluid.viscosity", dk, sk)
		p.Suppress(dk)
	case !hasD && !hasS:
		p.Addf(dk, "", "missing; required: the molecular diffusivity D in m²/s, 0 < D < 0.001, or instead the Schmidt number Sc = ν/D as schmidt; add e.g. diffusivity = 1.76e-9 (oxygen in water at 20 °C) under the %s [[scalar]] header", stricttoml.Ordinal(i+1))
		p.Suppress(sk)
	case hasD:
		if checkD() && nuOK {
			s.Schmidt = nu / s.Diffusivity
			if !representable(s.Schmidt) {
				p.Addf(dk, stricttoml.FormatFloat(s.Diffusivity), "is too small: Sc = ν/D = %s with fluid.viscosity = %s m²/s is beyond what a float holds accurately; molecular diffusivities are about 1e-9 m²/s in water and 1e-5 m²/s in air", stricttoml.FormatRound(s.Schmidt), stricttoml.FormatFloat(nu))
			}
		}
		p.Derive(sk, dk, "fluid.viscosity")
	default:
		if checkSc() && nuOK {
			s.Diffusivity = nu / s.Schmidt
			derivedD()
		}
		p.Derive(dk, sk, "fluid.viscosity")
	}
}

// representable reports whether a value derived from another (D = ν/Sc or
// Sc = ν/D) is far enough from the limits of a float64 to be derived back
// without loss.
func representable(v float64) bool { return v >= 1e-300 && v <= 1e300 }

// checkScalarTop checks the condition at the top of scalar i.
func checkScalarTop(s *Scalar, i int, missing func(name, desc, example string) bool, p *stricttoml.Problems) {
	tk, vk := scalarKey(i, "top"), scalarKey(i, "top_value")
	hint := ""
	if s.Top == ScalarMat {
		hint = "a mat is for the bed only"
	}
	if !p.OK(tk) || !p.OneOf(tk, s.Top, []string{ScalarFixed, ScalarFlux, ScalarNoFlux}, hint) {
		return
	}
	switch s.Top {
	case ScalarFixed:
		if p.Parsing && !p.Has(vk) {
			s.TopValue = s.Initial
			p.Derive(vk, scalarKey(i, "initial"))
		}
		if p.OK(vk) {
			p.AtLeast(vk, s.TopValue, 0, "concentration held at the top, unit of the scalar", "")
		}
	case ScalarFlux:
		if !missing("top_value", `with `+tk+` = "flux": the downward supply into the domain through the top in unit·m/s, any finite number (< 0 for a loss through the top)`, "top_value = 0.0") && p.OK(vk) {
			p.FiniteValue(vk, s.TopValue, "downward supply through the top, unit of the scalar·m/s; < 0 for a loss", "")
		}
	default:
		if p.OK(vk) {
			p.OnlyWith(vk, s.TopValue != 0, stricttoml.FormatFloat(s.TopValue), tk+` = "fixed" or "flux"`)
		}
	}
}

// checkScalarBed checks the condition at the bed of scalar i, and reports
// whether the condition itself is valid.
func checkScalarBed(c *Case, s *Scalar, i int, missing func(name, desc, example string) bool, p *stricttoml.Problems) bool {
	bk, vk, ck := scalarKey(i, "bed"), scalarKey(i, "bed_value"), scalarKey(i, "bed_capacity")
	if !p.OK(bk) || !p.OneOf(bk, s.Bed, []string{ScalarNoFlux, ScalarMat, ScalarFlux, ScalarFixed}, "") {
		return false
	}
	if s.Bed == ScalarMat {
		if !missing("bed_capacity", `with `+bk+` = "mat": the uptake capacity k_s,bed of the mat in m/s, > 0, or inf for a perfect sink`, "bed_capacity = 1.0e-5") && p.OK(ck) {
			capacity(p, ck, s.BedCapacity, "uptake capacity k_s,bed of the mat, m/s", "e.g. bed_capacity = 1.0e-5")
		}
		if p.OK("bed.condition") && c.Bed.Condition == FreeSlip {
			p.Add(bk, strconv.Quote(s.Bed), `needs a bed with shear stress: the mat's boundary-layer transfer velocity follows from the friction velocity, which bed.condition = "free-slip" makes zero; set bed.condition = "no-slip" or "rough", or give the uptake as bed = "flux"`)
		}
	} else if p.OK(ck) {
		p.OnlyWith(ck, s.BedCapacity != 0, stricttoml.FormatFloat(s.BedCapacity), bk+` = "mat"`)
	}
	switch s.Bed {
	case ScalarFlux:
		if !missing("bed_value", `with `+bk+` = "flux": the flux out of the fluid into the bed in unit·m/s, any finite number (< 0 for a release from the bed)`, "bed_value = 1.0e-7") && p.OK(vk) {
			p.FiniteValue(vk, s.BedValue, "flux out of the fluid into the bed, unit of the scalar·m/s; < 0 for a release", "")
		}
	case ScalarFixed:
		if !missing("bed_value", `with `+bk+` = "fixed": the concentration held at the bed in unit, >= 0`, "bed_value = 0.0") && p.OK(vk) {
			p.AtLeast(vk, s.BedValue, 0, "concentration held at the bed, unit of the scalar", "")
		}
	default:
		if p.OK(vk) {
			p.OnlyWith(vk, s.BedValue != 0, stricttoml.FormatFloat(s.BedValue), bk+` = "flux" or "fixed"`)
		}
	}
	return true
}

// capacity checks an uptake capacity: > 0, with +Inf allowed for a perfect
// sink.
func capacity(p *stricttoml.Problems, key string, v float64, desc, hint string) bool {
	if v > 0 {
		return true
	}
	p.Add(key, stricttoml.FormatFloat(v), stricttoml.Note("must be > 0, or inf for a perfect sink"+stricttoml.What(desc), hint))
	return false
}

// checkUptake checks the uptake of scalar i by the canopy elements and
// the keys that go with it, and reports whether the law itself is valid.
func checkUptake(c *Case, s *Scalar, i int, missing func(name, desc, example string) bool, p *stricttoml.Problems) bool {
	uk := scalarKey(i, "uptake")
	ck, ak, nk := scalarKey(i, "capacity"), scalarKey(i, "power_alpha"), scalarKey(i, "power_exponent")
	if !p.OK(uk) || !p.OneOf(uk, s.Uptake, uptakeLaws(), "") {
		return false
	}
	law := strconv.Quote(s.Uptake)
	if s.Uptake == UptakeNone {
		for _, k := range []struct {
			key string
			v   float64
		}{{ck, s.Capacity}, {ak, s.PowerAlpha}, {nk, s.PowerExponent}} {
			if p.OK(k.key) {
				p.OnlyWith(k.key, k.v != 0, stricttoml.FormatFloat(k.v), uk+` names an uptake law (the canopy elements take up the scalar)`)
			}
		}
		return true
	}
	cp := c.Canopy
	if cp == nil {
		if p.OK("canopy") {
			p.Add(uk, law, `needs a [canopy] table: the canopy elements take up the scalar; add a [canopy] table, or set uptake = "none" (the default) for a scalar that only the bed or the boundaries exchange`)
		}
		return true
	}

	if shape, ok := canopy.TransferShape(s.Uptake); ok && p.OK("canopy.shape") {
		if want := shape.String(); cp.Shape != want {
			p.Addf(uk, law, `is a correlation for %s, but canopy.shape = %q; for %s use uptake = %s, or fit "power-law" with power_alpha and power_exponent`,
				shapeWords[want].correlation, cp.Shape, shapeWords[cp.Shape].plural, lawsFor(cp.Shape))
		} else {
			needDiameter(cp, uk, law, shapeWords[want].width, shapeWords[want].example, p)
		}
	}

	const powerLaw = "the power law k_bl = α·|u|^n"
	if s.Uptake == canopy.TransferPowerLaw {
		if !missing("power_alpha", `with `+uk+` = "power-law": the coefficient α of `+powerLaw+` in m^(1-n)·s^(n-1), > 0`, "power_alpha = 3.0e-5") && p.OK(ak) {
			p.Positive(ak, s.PowerAlpha, "coefficient α of "+powerLaw+", m^(1-n)·s^(n-1)", "e.g. power_alpha = 3.0e-5")
		}
		if !missing("power_exponent", `with `+uk+` = "power-law": the exponent n of `+powerLaw+`, dimensionless, 0 <= n <= 2`, "power_exponent = 0.5") && p.OK(nk) {
			p.FloatRange(nk, s.PowerExponent, 0, 2, "exponent n of "+powerLaw+", dimensionless", "e.g. power_exponent = 0.5")
		}
	} else {
		for _, k := range []struct {
			key string
			v   float64
		}{{ak, s.PowerAlpha}, {nk, s.PowerExponent}} {
			if p.OK(k.key) {
				p.OnlyWith(k.key, k.v != 0, stricttoml.FormatFloat(k.v), uk+` = "power-law"`)
			}
		}
	}
	if !missing("capacity", `with `+uk+` = `+law+`: the uptake capacity k_s of the element surfaces in m/s, > 0, or inf for a perfect sink`, "capacity = 1.0e-5") && p.OK(ck) {
		capacity(p, ck, s.Capacity, "uptake capacity k_s of the element surfaces, m/s", "e.g. capacity = 1.0e-5")
	}
	return true
}

// needDiameter records a problem when the canopy gives no element size,
// which the uptake correlation of key (its value law) needs.
func needDiameter(cp *Canopy, key, law, desc, example string, p *stricttoml.Problems) {
	if !p.OK("canopy.diameter") || p.Used("canopy.diameter", cp.Diameter != 0) {
		return
	}
	p.Addf("canopy.diameter", "", "missing; required with %s = %s: %s, which sets the element Reynolds number |u|·d/ν of the uptake correlation; add e.g. %s under [canopy]", key, law, desc, example)
}

func scalarTemplate() string {
	return `# [[scalar]]
# Optional: passive scalars (oxygen, nutrients, dye) that the flow carries
# and that the canopy elements and the bed may take up. Repeat the block for
# each scalar, or leave it out for none; messages count scalars from 0
# (scalar[0] is the first). Each scalar c obeys
#   dc/dt + div(u·c) = div((D + ν_t/Sc_t)·grad c) + source - a_s·k_e·(c - c_w)
# with a_s the element surface area per unit volume (π·a for cylinders, 2·a
# for blades) and 1/k_e = 1/k_bl + 1/k_s: the transfer velocity k_bl of the
# boundary layer around each element (from the uptake law) in series with
# the uptake capacity k_s of the surface itself.
# Concentrations are in a unit of your choice (e.g. mol/m³), called "unit"
# here; fluxes are in unit·m/s and sources in unit/s.
# The example, commented out so that the demo stays a flow-only run:
# dissolved oxygen in mol/m³, taken up by the blades and by a microbial mat
# on the bed. Its concentrations and capacities are invented for the demo.
#
# Name of the scalar in fields.h5, output.fields and the tables. Required;
# it starts with a lowercase letter and holds only lowercase letters, digits
# and _, at most 32 characters; each scalar its own, and none of u, w, p,
# vorticity, nu_t, v, q_criterion, nor of x, z_centre, z_face, component,
# time, velocity, y, slab.
# name = "oxygen"
# Molecular diffusivity D, m²/s. 0 < diffusivity < 1e-3. Give diffusivity
# or schmidt, not both; the other follows from the viscosity of [fluid].
# Oxygen at 20 °C: 1.76e-9 (Han & Bartels 1996, J. Phys. Chem. 100:5597).
# diffusivity = 1.76e-9
# Or the Schmidt number Sc = ν/D, dimensionless; > 0. For the oxygen above
# in the seawater-20C of [fluid], about
#   schmidt = 597
# Turbulent Schmidt number Sc_t of the subgrid flux ν_t/Sc_t, dimensionless.
# Only with the Smagorinsky closure. Default 1.0 (common practice, no
# source; values of 0.5 to 1 are in use); > 0 and <= 10.
# turbulent_schmidt = 1.0
# Uniform initial concentration, unit. Default 0; >= 0.
# initial = 0.23
# Uniform volume source, unit/s (negative for a sink through the volume).
# Default 0; any finite number.
# source = 0.0
# Condition at the top (z = depth). Default "fixed".
#   "fixed"  concentration top_value at the top (air-saturated water here)
#   "flux"   a downward supply top_value into the domain, unit·m/s
#            (negative for a loss through the top)
#   "none"   nothing passes the top
# top = "fixed"
# Concentration held at the top (with "fixed", unit; default initial,
# >= 0), or downward supply (with "flux", unit·m/s; required, any finite
# number). Not with "none".
# top_value = 0.23
# Condition at the bed (z = 0). Default "none".
#   "none"   nothing passes the bed
#   "mat"    a microbial mat takes up the flux k_bed·(c - c_w), with
#            1/k_bed = 1/k_dbl + 1/bed_capacity; k_dbl, the transfer
#            velocity of the diffusive boundary layer over the bed,
#            follows from the local friction velocity (Shaw & Hanratty
#            1977); needs bed_capacity and a no-slip or rough bed
#   "flux"   the flux bed_value out of the fluid into the bed, unit·m/s
#            (negative for a release from the bed)
#   "fixed"  the concentration bed_value at the bed, unit
# bed = "mat"
# Flux (with "flux", unit·m/s; any finite number) or concentration (with
# "fixed", unit; >= 0) at the bed. Required with those two, not allowed
# otherwise, e.g.
#   bed_value = 0.0
# Uptake capacity k_s,bed of the mat surface, m/s; > 0, or inf for a
# perfect sink (the boundary layer alone then limits uptake). Required with
# "mat", not allowed otherwise.
# bed_capacity = 2.0e-6
# Uptake by the canopy elements; only with a [canopy] table. Default "none".
#   "none"                 the elements take up nothing
#   "hilpert"              cylinders: Hilpert's correlation
#   "churchill-bernstein"  cylinders: Churchill & Bernstein (1977)
#   "plate-laminar"        blades: a laminar flat-plate boundary layer
#   "plate"                blades: a flat plate whose boundary layer may
#                          turn turbulent along the blade
#   "power-law"            k_bl = power_alpha·|u|^power_exponent, a fit of
#                          your own; any shape
# The correlations give k_bl = Sh·D/d from the element Reynolds number
# |u|·d/ν and Sc. The cylinder ones need shape "cylinder", the plate ones
# shape "blade", and all four the diameter of [canopy] (d: the cylinder
# diameter or the blade width).
# uptake = "plate-laminar"
# Uptake capacity k_s of the element surfaces, m/s; > 0, or inf for a
# perfect sink. Required unless uptake is "none".
# capacity = 1.0e-5
# Coefficient α of "power-law", m^(1-n)·s^(n-1); > 0. Required with
# "power-law", not allowed otherwise, e.g.
#   power_alpha = 3.0e-5
# Exponent n of "power-law", dimensionless; 0 <= n <= 2. Required with
# "power-law", not allowed otherwise, e.g.
#   power_exponent = 0.5
# Concentration c_w at the element and mat surfaces, unit. Default 0;
# >= 0. Only with an uptake law or a "mat" bed.
# surface_concentration = 0.0
`
}
