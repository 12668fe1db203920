package canopy

import "fmt"

// Mesh is the layout of cells the canopy is put on: an x–z slice Lx long
// (periodic in x) and H deep, with cells Dx wide centred at X[i] and bounded
// in z by the face heights Zf. Arrays on a mesh hold Nz rows of Nx values,
// row k (between Zf[k] and Zf[k+1]) at [k·Nx, (k+1)·Nx), as the solver
// stores its fields.
//
// A slab's mesh also has Ny > 1 spanwise cell centres Y, Dy wide on a span
// Ly wide; its arrays hold Nz planes of Ny·Nx values, point (i, j) of
// level k at (k·Ny + j)·Nx + i. Y empty (or one point) is the slice.
type Mesh struct {
	Lx, H float64   // m, domain length (x) and depth (z)
	Dx    float64   // m, cell width in x
	X     []float64 // m, Nx cell centres in x
	Zf    []float64 // m, Nz+1 face heights from Zf[0] = 0 (the bed) to Zf[Nz] = H
	Ly    float64   // m, spanwise period of a slab; 0 for the slice
	Dy    float64   // m, cell width in y of a slab
	Y     []float64 // m, Ny cell centres in y of a slab; nil for the slice
}

// Slab reports whether the mesh is a three-dimensional slab.
func (m Mesh) Slab() bool { return len(m.Y) > 1 }

// SlabMesh returns m extended across a span ly wide (m) with ny equal
// cells, Y[j] = j·Dy.
func (m Mesh) SlabMesh(ny int, ly float64) Mesh {
	m.Ly, m.Dy, m.Y = ly, ly/float64(ny), make([]float64, ny)
	for j := range m.Y {
		m.Y[j] = float64(j) * m.Dy
	}
	return m
}

// UniformMesh returns the mesh of nx × nz equal cells on a slice lx long and
// h deep (m), with X[i] = i·Dx: the solver's grid without clustering.
func UniformMesh(nx, nz int, lx, h float64) Mesh {
	m := Mesh{Lx: lx, H: h, Dx: lx / float64(nx), X: make([]float64, nx), Zf: make([]float64, nz+1)}
	for i := range m.X {
		m.X[i] = float64(i) * m.Dx
	}
	for j := range m.Zf {
		m.Zf[j] = h * float64(j) / float64(nz)
	}
	return m
}

// OnGrid returns the frontal-area density a in 1/m on the mesh, Nz rows of
// Nx values (row k between m.Zf[k] and m.Zf[k+1], point i at x = m.X[i]),
// as cell averages:
//
//	a[k·Nx + i] = 1/(Δz_k Δx) ∫ from Zf[k] to Zf[k+1] ∫ from X[i] − Δx/2 to X[i] + Δx/2 of a(x, z) dx dz.
//
// Averaging in z gives a cell that holds a sharp top part way up its
// share of the density, so Σ_k a Δz_k over a column equals the frontal area
// index (times the local coverage) to round-off on any mesh. Averaging in x
// (rather than sampling at X[i]) does the same for patch edges: the total
// frontal area Σ a Δx Δz equals ∫∫ a dx dz to round-off wherever the edges
// fall, and a sharp edge becomes one intermediate value instead of jumping
// by a whole point as the mesh shifts. For a smooth a the two choices
// differ by O(Δx²). With a smoothed top the columns hold ∫₀^H a dz, which
// misses the step's tail above the domain top H: at most
// (w/4) ln(1 + e^(−4(H−h)/w)) a(h⁻), about 0.0045 w a(h⁻) when h + w = H
// (derived).
//
// On a slab's mesh the arrays hold Nz planes of Ny·Nx values, cell
// averages over x and y alike: a stripe (a patch across the whole span)
// gives every spanwise row of a plane the slice's row, bit for bit, and a
// rectangle adds Σ over patches of its x average times its y average.
//
// It panics when the canopy fails ValidateSlab(m.Lx, m.Ly, m.H): check it
// first.
func (c *Canopy) OnGrid(m Mesh) (a []float64) {
	c.mustFit(m)
	nx, nz := len(m.X), len(m.Zf)-1
	col := make([]float64, nz)
	for k := range col {
		col[k] = c.Profile.Integral(m.Zf[k], m.Zf[k+1]) / (m.Zf[k+1] - m.Zf[k])
	}
	if m.Slab() {
		return c.onSlab(m, col)
	}
	cov := newCoverage(c.Patches, c.PatchEdge, m.Lx)
	row := make([]float64, nx)
	for i, x := range m.X {
		row[i] = cov.mean(x-m.Dx/2, x+m.Dx/2)
	}
	a = make([]float64, nz*nx)
	for k, ak := range col {
		for i, ci := range row {
			a[k*nx+i] = ak * ci
		}
	}
	return a
}

// SurfaceArea returns the element surface area per unit volume a_s in 1/m
// on the mesh, laid out as OnGrid: a_s = π a for cylinders, 2 a for blades
// (Shape.SurfaceRatio). It is per unit total volume; the sink per unit
// fluid volume is a_s/(1 − φ), as for the drag.
func (c *Canopy) SurfaceArea(m Mesh) []float64 {
	a := c.OnGrid(m)
	r := c.Elements.Shape.SurfaceRatio()
	for i := range a {
		a[i] *= r
	}
	return a
}

// SolidFractionOnGrid returns the solid volume fraction φ (dimensionless)
// on the mesh, laid out as OnGrid: proportional to a, with the value
// SolidFraction at the canopy-mean density (see Elements).
func (c *Canopy) SolidFractionOnGrid(m Mesh) []float64 {
	a := c.OnGrid(m)
	kappa := c.Elements.solidPerDensity(c.Profile.MeanDensity())
	for i := range a {
		a[i] *= kappa
	}
	return a
}

// DragArea returns ½ a/(1 − φ) in 1/m on the mesh, laid out as OnGrid: the
// quadratic drag per unit fluid mass is −DragArea · C_D |u| u (see
// Elements for the 1/(1 − φ) factor), with C_D the fixed CD or the Law.
// It panics when the canopy fails Validate(m.Lx, m.H).
func (c *Canopy) DragArea(m Mesh) []float64 {
	a := c.OnGrid(m)
	kappa := c.Elements.solidPerDensity(c.Profile.MeanDensity())
	for i, v := range a {
		a[i] = 0.5 * v / (1 - kappa*v)
	}
	return a
}

// LinearRate returns the linear drag rate in 1/s on the mesh, laid out as
// OnGrid: Linear wherever the canopy has elements (a > 0), 0 elsewhere.
// The linear drag per unit mass is −LinearRate · u (a Darcy–Brinkman
// layer). It panics when the canopy fails Validate(m.Lx, m.H).
func (c *Canopy) LinearRate(m Mesh) []float64 {
	a := c.OnGrid(m)
	rate := make([]float64, len(a))
	for i, v := range a {
		if v > 0 {
			rate[i] = c.Linear
		}
	}
	return rate
}

// onSlab returns the frontal-area density on a slab's mesh given the
// cell averages col of the profile, level by level.
func (c *Canopy) onSlab(m Mesh, col []float64) []float64 {
	nx, ny := len(m.X), len(m.Y)
	plane := make([]float64, ny*nx)
	if !anySpanwise(c.Patches) {
		cov := newCoverage(c.Patches, c.PatchEdge, m.Lx)
		for i, x := range m.X {
			plane[i] = cov.mean(x-m.Dx/2, x+m.Dx/2)
		}
		for j := 1; j < ny; j++ {
			copy(plane[j*nx:(j+1)*nx], plane[:nx])
		}
	} else {
		mx, my := make([]float64, nx), make([]float64, ny)
		for _, p := range c.Patches {
			bx, by := bands(p, c.PatchEdge, m.Lx, m.Ly)
			for i, x := range m.X {
				mx[i] = bx.mean(x-m.Dx/2, x+m.Dx/2)
			}
			for j, y := range m.Y {
				my[j] = by.mean(y-m.Dy/2, y+m.Dy/2)
			}
			for j, fy := range my {
				for i, fx := range mx {
					plane[j*nx+i] += fx * fy
				}
			}
		}
	}
	a := make([]float64, len(col)*ny*nx)
	for k, ak := range col {
		for n, cn := range plane {
			a[k*ny*nx+n] = ak * cn
		}
	}
	return a
}

// mustFit panics when the canopy is not valid on the mesh.
func (c *Canopy) mustFit(m Mesh) {
	if err := c.ValidateSlab(m.Lx, m.Ly, m.H); err != nil {
		panic(fmt.Sprintf("canopy: grid method called on a canopy that fails Validate (check it first): %v", err))
	}
}
