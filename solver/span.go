package solver

import (
	"fmt"
	"math"

	"rollerbed/solver/transform"
)

// The spanwise direction. With Config.Ny > 1 the solver runs a box periodic
// in x and y: a level is a plane of Ny·Nx values, point (i, j) at
// f[(k·Ny + j)·Nx + i], x = i·Lx/Nx, y = j·Ly/Ny, and the row kernels of the
// slice run over whole planes. The transforms are two-dimensional over the
// (x, y) planes of all levels, with the 2/3 rule in both directions. The
// spanwise velocity v sits at the centres with u; its equation,
//
//	∂v/∂t + ∂B/∂x + ∂C/∂y + ∂g_v/∂z = −∂p/∂y + ∂/∂z(ν_e ∂v/∂z) − r v,
//	B = u v − ν_e (∂u/∂y + ∂v/∂x),  C = v v − 2 ν_e ∂v/∂y,  g_v = v_f w − ν_e ∂w/∂y,
//
// takes the slice's scheme: explicit horizontal fluxes, B also being the
// y-flux of the u-equation; g_v at the faces, v_f interpolated as u is;
// implicit vertical diffusion; point-implicit drag. The w-equation gains the
// y-flux v_f w − ν_e (∂v/∂z + ∂w/∂y) at the faces and the scalars v c −
// K ∂c/∂y. The horizontal divergence of the fluxes, i k_x F̂_x + i k_y F̂_y,
// is formed in spectral space, so one inverse transform per field serves
// both directions.

// spanwise holds what only a three-dimensional run needs; its arrays and
// plans are nil in an x–z slice run.
type spanwise struct {
	// scalarBase is the first row of the scalars in the plans: 2Nz+1 in the
	// slice, 3Nz+1 with v.
	scalarBase int

	derivY transform.Plan // ∂/∂y of u, w, v and the scalars (rows as vel)
	fluxY  transform.Plan // y-fluxes (rows as flux)

	v, vx      []float64   // views: v and ∂v/∂x at the centres
	uy, vy, wy []float64   // views into derivY.Real()
	py         []float64   // view: ∂p/∂y at the centres
	nV         []float64   // explicit right-hand side of v of the previous stage
	gv         []float64   // z-flux of v-momentum at the faces
	bedSpeed   [][]float64 // per worker: (u² + v²)^½ at level 0 of a block of columns (rough bed only)
	kcutY      int         // highest kept spanwise mode (2/3 rule)
	ky         []float64   // 1/m, wavenumber of each spectral row l of a plane, 0 where not kept
	keepY      []bool      // per spectral row l of a plane: kept by the 2/3 rule
	keptRows   []int       // the kept spectral rows l, in order
	kmaxY      float64     // 1/m, wavenumber of mode kcutY
}

// Span limits: Ny must be even for the real two-dimensional transforms and
// hold at least one kept mode besides the mean under the 2/3 rule.
const minSpanCells = 4

// checkSpan checks the spanwise extent: Ny <= 1 is the slice.
func (c *Config) checkSpan() error {
	if c.Ny <= 1 {
		return nil
	}
	switch {
	case c.Ny < minSpanCells || c.Ny%2 != 0:
		return fmt.Errorf("solver: spanwise cells Ny = %d: need an even number >= %d (or 1 for the x–z slice)", c.Ny, minSpanCells)
	case !(c.Ly > 0) || math.IsInf(c.Ly, 0):
		return fmt.Errorf("solver: spanwise width Ly = %g m: need a finite width > 0", c.Ly)
	}
	return nil
}

// pointsName names the number of values of a per-point array.
func (c *Config) pointsName() string {
	if c.Ny > 1 {
		return "Nz·Ny·Nx"
	}
	return "Nz·Nx"
}

// ThreeD reports whether the solver runs the spanwise-periodic box.
func (s *Solver) ThreeD() bool { return s.ny > 1 }

// Dims returns the number of points along x, y and z (ny = 1 in the slice).
func (s *Solver) Dims() (nx, ny, nz int) { return s.nx, s.ny, s.nz }

// V returns the spanwise velocity at cell centres, Nz levels of Ny·Nx, m/s
// (nil in the slice).
func (s *Solver) V() []float64 { return s.v }

// DVDX returns ∂v/∂x at cell centres, 1/s (nil in the slice).
func (s *Solver) DVDX() []float64 { return s.vx }

// DUDY returns ∂u/∂y at cell centres, 1/s (nil in the slice).
func (s *Solver) DUDY() []float64 { return s.uy }

// DVDY returns ∂v/∂y at cell centres, 1/s (nil in the slice).
func (s *Solver) DVDY() []float64 { return s.vy }

// DWDY returns ∂w/∂y at faces, 1/s (nil in the slice).
func (s *Solver) DWDY() []float64 { return s.wy }

// ScalarDY returns ∂c/∂y of scalar i at the cell centres, a view (nil in
// the slice).
func (s *Solver) ScalarDY(i int) []float64 { return s.sc[i].cy }

// vRow is the first plan row of v.
func (s *Solver) vRow() int { return 2*s.nz + 1 }

// setupSpan binds the views of the three-dimensional fields and sizes their
// work arrays.
func (s *Solver) setupSpan() {
	if s.ny == 1 {
		return
	}
	np, nz := s.np, s.nz
	cells, faces := nz*np, (nz+1)*np
	a, b := s.vRow()*np, (s.vRow()+nz)*np
	s.v, s.vx = s.vel.Real()[a:b], s.deriv.Real()[a:b]
	s.uy, s.wy, s.vy = s.derivY.Real()[:cells], s.derivY.Real()[cells:cells+faces], s.derivY.Real()[a:b]
	s.py = s.pgrad.Real()[a:b]
	s.nV, s.gv = make([]float64, cells), make([]float64, faces)
	clear(s.derivY.Real())
	if s.cfg.Bed.Kind == Rough {
		// The log-law stress acts along the horizontal velocity:
		// τ/ρ = C |u_h| (u, v), |u_h| taken before the stage's solves.
		s.bedSpeed = make([][]float64, s.vel.Parts()) // one per worker
		for p := range s.bedSpeed {
			s.bedSpeed[p] = make([]float64, implicitBlock)
		}
	}
}

// fillBedSpeed sets the worker's bed speeds for the columns [i0, i1).
func (s *Solver) fillBedSpeed(part, i0, i1 int) {
	sp := s.bedSpeed[part][:i1-i0]
	for i := range sp {
		sp[i] = math.Hypot(s.u[i0+i], s.v[i0+i])
	}
}

// setupSpanModes sets the spanwise wavenumbers and the kept rows of a
// spectral plane, and splits the kept rows between the workers for the
// projection.
func (s *Solver) setupSpanModes() {
	if s.ny == 1 {
		return
	}
	g, ny := s.g, s.ny
	s.kcutY = g.KeptModesY()
	s.kmaxY = g.WavenumberY(s.kcutY)
	s.ky, s.keepY = make([]float64, ny), make([]bool, ny)
	for l := 0; l < ny; l++ {
		m := l
		if l > ny/2 {
			m = l - ny
		}
		if m >= -s.kcutY && m <= s.kcutY {
			s.keepY[l], s.ky[l] = true, g.WavenumberY(m)
			s.keptRows = append(s.keptRows, l)
		}
	}
}

// spanCentreRowGo sets the horizontal cross flux B = u v − ν_e (∂u/∂y +
// ∂v/∂x) (the x-flux of v and the y-flux of u) into b1 and b2, and the
// y-flux of v, C = v v − 2 ν_e ∂v/∂y, into fc; len(u).
func spanCentreRowGo(u, v, uy, vx, vy, nuc, b1, b2, fc []float64) {
	n := len(u)
	v, uy, vx, vy, nuc, b1, b2, fc = v[:n], uy[:n], vx[:n], vy[:n], nuc[:n], b1[:n], b2[:n], fc[:n]
	for i, uu := range u {
		vv := v[i]
		bb := uu*vv - nuc[i]*(uy[i]+vx[i])
		b1[i], b2[i] = bb, bb
		fc[i] = vv*vv - 2*nuc[i]*vy[i]
	}
}
