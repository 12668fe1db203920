package canopy

import (
	"fmt"

	"rollerbed/solver"
)

// OnGrid returns the frontal-area density a in 1/m on the solver grid, Nz
// rows of Nx values (row k at height g.Zc[k], point i at x = g.X[i]), as
// cell averages:
//
//	a[k·Nx + i] = 1/(Δz_k Δx) ∫ from Zf[k] to Zf[k+1] ∫ from X[i] − Δx/2 to X[i] + Δx/2 of a(x, z) dx dz.
//
// Averaging in z gives a cell that holds a sharp top part way up its
// share of the density, so Σ_k a Δz_k over a column equals the frontal area
// index (times the local coverage) to round-off on any grid. Averaging in x
// (rather than sampling at X[i]) does the same for patch edges: the total
// frontal area Σ a Δx Δz equals ∫∫ a dx dz to round-off wherever the edges
// fall, and a sharp edge becomes one intermediate value instead of jumping
// by a whole point as the grid shifts. For a smooth a the two choices
// differ by O(Δx²). With a smoothed top the columns hold ∫₀^H a dz, which
// misses the step's tail above the domain top H: at most
// (w/4) ln(1 + e^(−4(H−h)/w)) a(h⁻), about 0.0045 w a(h⁻) when h + w = H
// (derived).
//
// It panics when the canopy fails Validate(g.Lx, g.H): check it first.
func (c *Canopy) OnGrid(g *solver.Grid) (a []float64) {
	c.mustFit(g)
	col := make([]float64, g.Nz)
	for k := range col {
		col[k] = c.Profile.Integral(g.Zf[k], g.Zf[k+1]) / g.Dz[k]
	}
	cov := newCoverage(c.Patches, c.PatchEdge, g.Lx)
	row := make([]float64, g.Nx)
	for i, x := range g.X {
		row[i] = cov.mean(x-g.Dx/2, x+g.Dx/2)
	}
	a = make([]float64, g.Nz*g.Nx)
	for k, ak := range col {
		for i, ci := range row {
			a[k*g.Nx+i] = ak * ci
		}
	}
	return a
}

// SurfaceArea returns the element surface area per unit volume a_s in 1/m
// on the grid, laid out as OnGrid: a_s = π a for cylinders, 2 a for blades
// (Shape.SurfaceRatio). It is per unit total volume; the sink per unit
// fluid volume is a_s/(1 − φ), as for the drag.
func (c *Canopy) SurfaceArea(g *solver.Grid) []float64 {
	a := c.OnGrid(g)
	r := c.Elements.Shape.SurfaceRatio()
	for i := range a {
		a[i] *= r
	}
	return a
}

// SolidFractionOnGrid returns the solid volume fraction φ (dimensionless)
// on the grid, laid out as OnGrid: proportional to a, with the value
// SolidFraction at the canopy-mean density (see Elements).
func (c *Canopy) SolidFractionOnGrid(g *solver.Grid) []float64 {
	a := c.OnGrid(g)
	kappa := c.Elements.solidPerDensity(c.Profile.MeanDensity())
	for i := range a {
		a[i] *= kappa
	}
	return a
}

// Drag returns the solver's canopy drag: HalfArea = ½ a/(1 − φ) in 1/m on
// the grid (the drag per unit fluid mass, see Elements), the fixed CD or the
// Law, and Diameter = Elements.Width in m for the element Reynolds number.
// Linear is left nil. It panics when the canopy fails Validate(g.Lx, g.H).
func (c *Canopy) Drag(g *solver.Grid) *solver.Drag {
	a := c.OnGrid(g)
	kappa := c.Elements.solidPerDensity(c.Profile.MeanDensity())
	for i, v := range a {
		a[i] = 0.5 * v / (1 - kappa*v)
	}
	d := &solver.Drag{HalfArea: a, Diameter: c.Elements.Width}
	if c.Law != nil {
		d.Law = c.Law
	} else {
		d.CD = c.CD
	}
	return d
}

// mustFit panics when the canopy is not valid on the grid.
func (c *Canopy) mustFit(g *solver.Grid) {
	if err := c.Validate(g.Lx, g.H); err != nil {
		panic(fmt.Sprintf("canopy: grid method called on a canopy that fails Validate (check it first): %v", err))
	}
}
