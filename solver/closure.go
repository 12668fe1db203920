package solver

import "math"

// Closure is the Smagorinsky subgrid model,
//
//	ν_t = ℓ² |S|,  |S| = (2 S_ij S_ij)^½,  1/ℓ² = 1/(Cs Δ)² + 1/(κ (z + z0))²,
//
// with Δ = (Δx Δz)^½ and the wall damping of Mason & Thomson (1992, J. Fluid
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

// Drag is the canopy drag, a body force −r u on both velocity components
// with the local rate (1/s)
//
//	r = C_D · HalfArea · |u| + Linear,
//
// HalfArea = ½ a (a the frontal area per unit volume, 1/m) and |u| the local
// speed. C_D is fixed, or Law(Re_d) with Re_d = |u| d/ν when Law is set.
// The rate is applied point-implicitly in each stage, so C_D a |u| Δt far
// above 1 stays stable. Arrays hold Nz·Nx values at cell centres; either may
// be nil.
type Drag struct {
	HalfArea []float64 // 1/m, ½ a
	CD       float64   // fixed drag coefficient
	Law      func(re float64) float64
	Diameter float64   // m, element diameter d for Re_d
	Linear   []float64 // 1/s, linear drag rate (Darcy–Brinkman form)
}

func (s *Solver) needsClosurePhase() bool {
	return s.cfg.Closure.Cs > 0 || s.cfg.Drag != nil || len(s.sc) > 0
}

// setupClosure precomputes ℓ² per level and sizes the drag arrays.
func (s *Solver) setupClosure() {
	g, c := s.g, s.cfg
	s.ell2 = make([]float64, s.nz)
	if c.Closure.Cs > 0 {
		for k, z := range g.Zc {
			delta := math.Sqrt(g.Dx * g.Dz[k])
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
		s.dragC = make([]float64, s.nz*s.nx)
		s.dragF = make([]float64, (s.nz+1)*s.nx)
	}
}

// closurePart computes the effective viscosity and the drag rate at the
// centres of its share of rows.
func (s *Solver) closurePart(part int) {
	g, nx, nz := s.g, s.nx, s.nz
	u, w, ux := s.u, s.w, s.ux
	nu := s.cfg.Viscosity
	les := s.cfg.Closure.Cs > 0
	drag := s.cfg.Drag
	bed, top := s.cfg.Bed, s.cfg.Top
	ubed, utop := bed.SpeedAt(s.st.tNow), top.SpeedAt(s.st.tNow)
	k0, k1 := span(nz, s.pool.n, part)
	for k := k0; k < k1; k++ {
		dz := g.Dz[k]
		lo, hi := (g.Zf[k+1]-g.Zc[k])/dz, (g.Zc[k]-g.Zf[k])/dz
		r := k * nx
		for i := r; i < r+nx; i++ {
			wc := lo*w[i] + hi*w[i+nx]
			if les {
				wz := (w[i+nx] - w[i]) / dz
				sb := s.faceShear(k, i, ubed, utop)
				st := s.faceShear(k+1, i+nx, ubed, utop)
				s2 := 2*(ux[i]*ux[i]+wz*wz) + 0.5*(sb*sb+st*st)
				s.nuC[i] = nu + s.ell2[k]*math.Sqrt(s2)
			}
			if drag != nil {
				speed := math.Sqrt(u[i]*u[i] + wc*wc)
				rate := 0.0
				if drag.HalfArea != nil && drag.HalfArea[i] != 0 {
					cd := drag.CD
					if drag.Law != nil {
						cd = drag.Law(speed * drag.Diameter / nu)
					}
					rate = cd * drag.HalfArea[i] * speed
				}
				if drag.Linear != nil {
					rate += drag.Linear[i]
				}
				s.dragC[i] = rate
			}
		}
	}
	if s.stageNo == 0 && len(s.sc) > 0 {
		s.scalarRatesPart(part)
	}
}

// faceShear returns ∂u/∂z + ∂w/∂x at face j (index i of that face's row):
// interior faces by centred differences, wall faces from the wall closure.
func (s *Solver) faceShear(j, i int, ubed, utop float64) float64 {
	g, nx, nz := s.g, s.nx, s.nz
	u := s.u
	switch {
	case j > 0 && j < nz:
		return (u[i]-u[i-nx])/g.Hf[j] + s.wx[i]
	case j == 0:
		switch s.cfg.Bed.Kind {
		case NoSlip:
			return s.bedA*(u[i]-ubed) - s.bedB*(u[i+nx]-ubed)
		case Rough:
			// log law: ∂u/∂z = u*/(κ z) at the first centre
			return math.Sqrt(s.roughC) * math.Abs(u[i]) / (Karman * g.Zc[0])
		}
		return 0
	default:
		if s.cfg.Top.Kind == NoSlip {
			// i indexes face row nz; the nearest centres are rows nz−1, nz−2.
			return -(s.topA*(u[i-nx]-utop) - s.topB*(u[i-2*nx]-utop))
		}
		return 0
	}
}
