package solver

import "math"

// Closure is the Smagorinsky subgrid model,
//
//	ν_t = ℓ² |S|,  |S| = (2 S_ij S_ij)^½,  1/ℓ² = 1/(Cs Δ)² + 1/(κ (z + z0))²,
//
// with Δ = (Δx Δz)^½ in the slice and (Δx Δy Δz)^⅓ in three dimensions, and the wall damping of Mason & Thomson (1992, J. Fluid
// Mech. 242:51); z is the distance to the nearest no-slip or rough wall and
// z0 the bed roughness length. Cs = 0 turns the model off (a direct
// simulation with the molecular viscosity only).
type Closure struct {
	Cs float64
}

// DefaultSmagorinsky is the constant suggested for two-dimensional mixing
// layers (Leith 1990, Phys. Fluids A 2:297, uses 0.2; Lilly 1967 gives 0.17
// for isotropic turbulence, Deardorff 1970 ≈ 0.1 for sheared flow).
const DefaultSmagorinsky = 0.2

// Drag is the canopy drag, a body force −r u on every velocity component
// with the local rate (1/s)
//
//	r = C_D · HalfArea · |u| + Linear,
//
// HalfArea = ½ a (a the frontal area per unit volume, 1/m) and |u| the local
// speed (of all three components in three dimensions). C_D is fixed, or Law(Re_d) with Re_d = |u| d/ν when Law is set.
// The rate is applied point-implicitly in each stage, so C_D a |u| Δt far
// above 1 stays stable. Arrays hold a value per cell centre, Nz·Nx in the
// slice and Nz·Ny·Nx in three dimensions (one plane per level); either may
// be nil.
type Drag struct {
	HalfArea []float64 // 1/m, ½ a
	CD       float64   // fixed drag coefficient
	Law      func(re float64) float64
	Diameter float64   // m, element diameter d for Re_d
	Linear   []float64 // 1/s, linear drag rate (Darcy–Brinkman form)
}

// setupClosure precomputes ℓ² per level and sizes the drag arrays.
func (s *Solver) setupClosure() {
	g, c := s.g, s.cfg
	s.ell2 = make([]float64, s.nz)
	if c.Closure.Cs > 0 {
		for k, z := range g.Zc {
			delta := math.Sqrt(g.Dx * g.Dz[k])
			if s.ny > 1 {
				delta = math.Cbrt(g.Dx * (g.Ly / float64(g.Ny)) * g.Dz[k])
			}
			inv := 1 / (c.Closure.Cs * delta * c.Closure.Cs * delta)
			d := math.Inf(1)
			if c.Bed.Kind != FreeSlip {
				d = z + c.Bed.Z0
			}
			if c.Top.Kind == NoSlip {
				d = math.Min(d, c.H-z)
			}
			if !math.IsInf(d, 1) {
				inv += 1 / (Karman * d * Karman * d)
			}
			s.ell2[k] = 1 / inv
		}
	}
	if c.Drag != nil {
		s.dragC = make([]float64, s.nz*s.np)
		s.dragF = make([]float64, (s.nz+1)*s.np)
		s.dragRow, s.dragFace = make([]bool, s.nz), make([]bool, s.nz+1)
		for k := range s.dragRow {
			s.dragRow[k] = anyNonzero(c.Drag.HalfArea, k, s.np) || anyNonzero(c.Drag.Linear, k, s.np)
		}
		for j := 1; j < s.nz; j++ {
			s.dragFace[j] = s.dragRow[j-1] || s.dragRow[j]
		}
	}
}

// anyNonzero reports whether row k (width nx) of f holds a nonzero value; a
// nil f has none.
func anyNonzero(f []float64, k, nx int) bool {
	if f == nil {
		return false
	}
	for _, v := range f[k*nx : (k+1)*nx] {
		if v != 0 {
			return true
		}
	}
	return false
}

// eddyViscosityRow sets dst to ν + ν_t at the centres of level k, with
// |S|² = 2(∂u/∂x)² + 2(∂w/∂z)² + the mean of the squared shear
// ∂u/∂z + ∂w/∂x at the two faces of the cell.
func (s *Solver) eddyViscosityRow(k int, dst []float64) {
	if s.ny > 1 {
		s.spanEddyViscosity(k, dst)
		return
	}
	nx, nz := s.nx, s.nz
	u, w, ux, wx := s.u, s.w, s.ux, s.wx
	nu := s.cfg.Viscosity
	r := k * nx
	idz, l2 := s.invDz[k], s.ell2[k]
	cen, uxr := u[r:r+nx], ux[r:r+nx]
	wb, wt := w[r:r+nx], w[r+nx:r+2*nx]
	nuc := dst[:len(cen)]
	if k == 0 || k == nz-1 {
		// Shear at the faces below (j = k) and above (j = k+1), at a wall
		// from the wall closure.
		ubed, utop := s.cfg.Bed.SpeedAt(s.st.tNow), s.cfg.Top.SpeedAt(s.st.tNow)
		for i := range cen {
			sb := s.faceShear(k, r+i, ubed, utop)
			st := s.faceShear(k+1, r+nx+i, ubed, utop)
			wz := (wt[i] - wb[i]) * idz
			s2 := 2*(uxr[i]*uxr[i]+wz*wz) + 0.5*(sb*sb+st*st)
			nuc[i] = nu + l2*math.Sqrt(s2)
		}
		return
	}
	viscRow(nu, l2, idz, s.invHf[k], s.invHf[k+1], cen, u[r-nx:r], u[r+nx:r+2*nx], uxr, wb, wt,
		wx[r:r+nx], wx[r+nx:r+2*nx], nuc)
}

// dragRateRow sets dst to the canopy drag rate (1/s) at the centres of
// level k.
func (s *Solver) dragRateRow(k int, dst []float64) {
	g, nx := s.g, s.np // nx: values in a level
	nu := s.cfg.Viscosity
	drag := s.cfg.Drag
	r := k * nx
	u, wb, wt := s.u[r:r+nx], s.w[r:r+nx], s.w[r+nx:r+2*nx]
	dst = dst[:len(u)]
	dz := g.Dz[k]
	lo, hi := (g.Zf[k+1]-g.Zc[k])/dz, (g.Zc[k]-g.Zf[k])/dz
	clear(dst)
	if half := drag.HalfArea; half != nil {
		half = half[r : r+nx]
		wb, wt, half = wb[:len(u)], wt[:len(u)], half[:len(u)]
		for i, ha := range half {
			if ha == 0 {
				continue
			}
			speed := s.pointSpeed(r+i, lo*wb[i]+hi*wt[i])
			cd := drag.CD
			if drag.Law != nil {
				cd = drag.Law(speed * drag.Diameter / nu)
			}
			dst[i] = cd * ha * speed
		}
	}
	if lin := drag.Linear; lin != nil {
		lin = lin[r : r+nx]
		for i, v := range lin[:len(dst)] {
			dst[i] += v
		}
	}
}

// faceShear returns ∂u/∂z + ∂w/∂x at face j (index i of that face's level):
// interior faces by centred differences, wall faces from the wall closure.
func (s *Solver) faceShear(j, i int, ubed, utop float64) float64 {
	return s.faceShearOf(s.u, s.wx, j, i, ubed, utop)
}

// faceShearOf returns ∂f/∂z + ∂w/∂h at face j for a velocity component f
// along the bed (u or v) and the derivative wh of w along it (∂w/∂x or
// ∂w/∂y), fbed and ftop the wall speeds of f.
func (s *Solver) faceShearOf(f, wh []float64, j, i int, fbed, ftop float64) float64 {
	g, nx, nz := s.g, s.np, s.nz // nx: values in a level
	u := f
	switch {
	case j > 0 && j < nz:
		return (u[i]-u[i-nx])/g.Hf[j] + wh[i]
	case j == 0:
		switch s.cfg.Bed.Kind {
		case NoSlip:
			return s.bedA*(u[i]-fbed) - s.bedB*(u[i+nx]-fbed)
		case Rough:
			// log law: ∂u/∂z = u*/(κ z) at the first centre
			return math.Sqrt(s.roughC) * math.Abs(u[i]) / (Karman * g.Zc[0])
		}
		return 0
	default:
		if s.cfg.Top.Kind == NoSlip {
			// i indexes face level nz; the nearest centres are levels nz−1, nz−2.
			return -(s.topA*(u[i-nx]-ftop) - s.topB*(u[i-2*nx]-ftop))
		}
		return 0
	}
}
