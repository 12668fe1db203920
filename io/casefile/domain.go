package casefile

import (
	"math"
	"strconv"

	"rollerbed/io/stricttoml"
)

// Domain is the [domain] table: the slice (or the slab) and its grid.
// Without Width and Ny the run is the two-dimensional x–z slice; with both
// it is a three-dimensional slab, periodic across the span (y) too.
type Domain struct {
	// Length is the streamwise period Lx in m, > 0. Required.
	Length float64 `toml:"length"`
	// Depth is the height H from the bed (z = 0) to the top, in m, > 0.
	// Required.
	Depth float64 `toml:"depth"`
	// Nx is the number of cells along x: even, 8 to 16384. Required.
	Nx int `toml:"nx"`
	// Nz is the number of cells along z: 8 to 8192. Required.
	Nz int `toml:"nz"`
	// Width is the spanwise period Ly of the slab in m, > 0. Optional:
	// without it (and Ny) the run is the x–z slice.
	Width float64 `toml:"width"`
	// Ny is the number of cells across the span (y): even, 4 to 4096.
	// Only together with Width; 0 (absent) is the slice.
	Ny int `toml:"ny"`
	// Cluster is the optional vertical clustering of cells.
	Cluster Cluster `toml:"cluster"`
}

// Slab reports whether the case asks for the three-dimensional slab
// (domain.width and domain.ny given) rather than the x–z slice.
func (d *Domain) Slab() bool { return d.Ny > 0 }

// Cluster is the [domain.cluster] table: a smooth clustering of cells in z.
// The cell density (cells per metre, up to a constant) is
//
//	1 + (Bed−1)·exp(−z/BedWidth) + (AtFactor−1)·exp(−((z−At)/AtWidth)²)
//
// so cells near the bed are about Bed times finer than far from it, and
// about AtFactor times finer around z = At. The field names match
// solver.Cluster.
type Cluster struct {
	// Bed is the spacing refinement at the bed, dimensionless, 1 to 50;
	// 1 (the default) is no bed clustering.
	Bed float64 `toml:"bed"`
	// BedWidth is the e-folding height of the bed refinement in m, > 0;
	// default Depth/10.
	BedWidth float64 `toml:"bed_width"`
	// At is the height of a second refinement in m, 0 < At < Depth;
	// 0 (key absent, the default) is none.
	At float64 `toml:"at"`
	// AtFactor is the spacing refinement around At, dimensionless, 1 to
	// 50; default 1.
	AtFactor float64 `toml:"at_factor"`
	// AtWidth is the Gaussian half-width of the second refinement in m,
	// > 0; default Depth/20.
	AtWidth float64 `toml:"at_width"`
}

// Limits of the grid and of the clustering factors. The factor limit keeps
// the ratio of neighbouring cell heights moderate (common practice, no
// source); a factor below 1 would fold the grid.
const (
	// MaxNx and MaxNz are the most cells along x and z a case may have.
	MaxNx = 16384
	MaxNz = 8192
	// MaxNy is the most cells across the span; MinNy the fewest, so that
	// the span holds at least one resolved oblique mode besides the mean
	// (common practice, no source).
	MaxNy            = 4096
	MinNy            = 4
	minCells         = 8
	maxClusterFactor = 50
)

func checkDomain(c *Case, p *stricttoml.Problems) {
	d := &c.Domain
	p.Require("domain.length", "the streamwise period Lx of the slice in m, > 0", "length = 2.0")
	p.Require("domain.depth", "the depth H from bed to top in m, > 0", "depth = 0.5")
	p.Require("domain.nx", "the number of cells along x, even, 8 to 16384", "nx = 256")
	p.Require("domain.nz", "the number of cells along z, 8 to 8192", "nz = 64")
	if p.OK("domain.length") {
		p.Positive("domain.length", d.Length, "streamwise period Lx, m", "e.g. length = 2.0")
	}
	if p.OK("domain.depth") {
		p.Positive("domain.depth", d.Depth, "depth H from bed to top, m", "e.g. depth = 0.5")
	}
	if p.OK("domain.nx") && p.IntRange("domain.nx", int64(d.Nx), minCells, MaxNx, "cells along x", "e.g. nx = 256") && d.Nx%2 != 0 {
		p.Addf("domain.nx", strconv.Itoa(d.Nx), "must be even (cells along x, for the real Fourier transform); use %d or %d", d.Nx-1, d.Nx+1)
	}
	if p.OK("domain.nz") {
		p.IntRange("domain.nz", int64(d.Nz), minCells, MaxNz, "cells along z", "use at least 8, e.g. nz = 64")
	}
	checkSpan(c, p)
	checkCluster(c, p)
}

// checkSpan checks the spanwise width and cell count of a slab: both or
// neither.
func checkSpan(c *Case, p *stricttoml.Problems) {
	d := &c.Domain
	const slice = "leave out both domain.width and domain.ny for the x–z slice"
	width, ny := p.Used("domain.width", d.Width != 0), p.Used("domain.ny", d.Ny != 0)
	switch {
	case width && !ny:
		p.Add("domain.ny", "", "missing: a slab with domain.width needs the number of cells across the span, even and at least 4, e.g. ny = 32; or "+slice)
	case ny && !width:
		p.Add("domain.width", "", "missing: a slab with domain.ny needs the spanwise period Ly in m, > 0, e.g. width = 1.0; or "+slice)
	}
	if width && p.OK("domain.width") {
		p.Positive("domain.width", d.Width, "spanwise period Ly of the slab, m", "e.g. width = 1.0, or "+slice)
	}
	if ny && p.OK("domain.ny") && p.IntRange("domain.ny", int64(d.Ny), MinNy, MaxNy, "cells across the span", "use at least 4, e.g. ny = 32, or "+slice) && d.Ny%2 != 0 {
		p.Addf("domain.ny", strconv.Itoa(d.Ny), "must be even (cells across the span, for the real Fourier transform); use %d or %d", d.Ny-1, d.Ny+1)
	}
}

func checkCluster(c *Case, p *stricttoml.Problems) {
	cl := &c.Domain.Cluster
	depth := c.Domain.Depth
	depthOK := p.OK("domain.depth") && depth > 0 && !math.IsInf(depth, 0)
	const fold = "a factor below 1 would fold the grid, one above 50 makes neighbouring cells differ too much in size"
	if p.Parsing {
		if !p.Has("domain.cluster.bed") {
			cl.Bed = 1
		}
		if !p.Has("domain.cluster.bed_width") {
			cl.BedWidth = depth / 10
			p.Derive("domain.cluster.bed_width", "domain.depth")
		}
		if !p.Has("domain.cluster.at_factor") {
			cl.AtFactor = 1
		}
		if !p.Has("domain.cluster.at_width") {
			cl.AtWidth = depth / 20
			p.Derive("domain.cluster.at_width", "domain.depth")
		}
		if !p.Has("domain.cluster.at") {
			for _, k := range []string{"at_factor", "at_width"} {
				if p.Has("domain.cluster." + k) {
					p.Add("domain.cluster."+k, "", "needs domain.cluster.at, the height of the second cluster; add at (m, 0 < at < depth) or remove "+k)
				}
			}
		}
	}
	if p.OK("domain.cluster.bed") {
		p.FloatRange("domain.cluster.bed", cl.Bed, 1, maxClusterFactor, "spacing refinement at the bed; 1 = none", fold)
	}
	if p.OK("domain.cluster.bed_width") {
		p.Positive("domain.cluster.bed_width", cl.BedWidth, "e-folding height of the bed refinement, m", "e.g. bed_width = 0.05")
	}
	if p.Has("domain.cluster.at") || cl.At != 0 {
		const hint = "remove the key for no second cluster"
		switch {
		case !p.OK("domain.cluster.at"):
		case depthOK:
			p.OpenRange("domain.cluster.at", cl.At, 0, depth, "height of the second cluster, m, inside the domain depth", hint)
		default:
			p.Positive("domain.cluster.at", cl.At, "height of the second cluster, m", hint)
		}
	}
	if p.OK("domain.cluster.at_factor") {
		p.FloatRange("domain.cluster.at_factor", cl.AtFactor, 1, maxClusterFactor, "spacing refinement around at; 1 = none", fold)
	}
	if p.OK("domain.cluster.at_width") {
		p.Positive("domain.cluster.at_width", cl.AtWidth, "half-width of the second cluster, m", "e.g. at_width = 0.025")
	}
}

func domainTemplate() string {
	return `[domain]
# The slice: x runs downstream and is periodic, z runs up from the bed.
# Streamwise period Lx of the slice, m. Required; > 0.
length = 2.0
# Depth H from the bed (z = 0) to the top of the domain, m. Required; > 0.
depth = 0.5
# Cells along x. Required; an even integer from 8 to 16384.
nx = 256
# Cells along z. Required; an integer from 8 to 8192.
nz = 64
# Optional: a three-dimensional slab instead of the slice. Give both keys
# and the domain becomes periodic across the span (y) too, with a third
# velocity component; the Kelvin–Helmholtz rollers at a canopy top can then
# break up as real ones do, so their spacing no longer follows the domain
# length. It costs about ny times the slice. Leave both out for the slice.
# Spanwise period Ly of the slab, m. > 0; use at least two expected roller
# spacings (check warns when it is narrower).
# width = 1.0
# Cells across the span. An even integer from 4 to 4096; only with width.
# ny = 32

[domain.cluster]
# Optional smooth clustering of cells in z. The cell density is
#   1 + (bed - 1)·exp(-z/bed_width) + (at_factor - 1)·exp(-((z - at)/at_width)²)
# so cells at the bed are about bed times finer than far from it, and cells
# around z = at about at_factor times finer. Factors are from 1 to 50: below 1
# the grid would fold, above 50 neighbouring cells differ too much in size.
# The whole table may be left out for a uniform grid.
#
# Spacing refinement at the bed, dimensionless. Default 1 (none); 1 to 50.
bed = 3.0
# e-folding height of the bed refinement, m. Default depth/10; > 0.
bed_width = 0.05
# Height of a second cluster, m, e.g. at a canopy top. Default: none;
# 0 < at < depth. Here at the top of the meadow.
at = 0.25
# Spacing refinement around z = at, dimensionless. Default 1; 1 to 50.
# Only together with at.
at_factor = 2.0
# Gaussian half-width of the second cluster, m. Default depth/20; > 0.
# Only together with at.
# at_width = 0.025
`
}
