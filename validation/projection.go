package validation

import (
	"fmt"
	"math"
	"math/rand/v2"

	"rollerbed/solver"
)

// The exact discrete projection (package solver, Numerics; the property is
// derived from the construction: per Fourier mode the pressure solves the
// discrete D G p = D u*/c, so D u = 0 to round-off on any grid):
//
//   - a random velocity field, projected, has divergence at round-off
//     relative to its velocity gradients;
//   - projecting it again changes nothing (the projection is idempotent);
//   - a field that is discretely solenoidal by construction is left alone;
//   - a full step of a sheared, perturbed flow ends divergence-free.
//
// All on a grid stretched at the bed and around a canopy-top height.

func projectionConfig(opt Options) (nx, nz int) {
	if opt.Full {
		return 128, 96
	}
	return 32, 48
}

func projectionGrid(nx, nz int) solver.Config {
	h := 1.0
	return solver.Config{Nx: nx, Nz: nz, Lx: 2, H: h,
		Cluster:   solver.Cluster{Bed: 5, BedWidth: 0.05 * h, At: 0.4 * h, AtFactor: 4, AtWidth: 0.1 * h},
		Viscosity: 1e-3, Bed: solver.Wall{Kind: solver.NoSlip}, Top: solver.Wall{Kind: solver.FreeSlip},
		Forcing: solver.Forcing{Kind: solver.FixedGradient, Gradient: 1e-3}}
}

func runProjection(opt Options) ([]Check, error) {
	nx, nz := projectionConfig(opt)
	s, err := newSolver(opt, projectionGrid(nx, nz))
	if err != nil {
		return nil, err
	}
	defer s.Close()
	g := s.Grid()
	var checks []Check
	ratio := func() float64 { d, sc := s.Divergence(); return d / sc }
	where := fmt.Sprintf("Nx = %d, Nz = %d, grid clustered at the bed and z = 0.4 H (largest spacing ratio %.3f)", nx, nz, g.MaxSpacingRatio())

	// A random field (a fixed seed: the same numbers every run).
	rng := rand.New(rand.NewPCG(1, 2))
	u := make([]float64, nz*nx)
	w := make([]float64, (nz+1)*nx)
	for i := range u {
		u[i] = 2*rng.Float64() - 1
	}
	for i := range w {
		w[i] = 2*rng.Float64() - 1
	}
	if err := s.SetVelocity(u, w); err != nil {
		return nil, err
	}
	checks = append(checks, AtMost("random", "max |∇·u| / max(|∂u/∂x| + |∂w/∂z|) of a projected random field, "+where,
		ratio(), roundOff, srcDerived))

	// Idempotence.
	pu, pw := append([]float64(nil), s.U()...), append([]float64(nil), s.W()...)
	if err := s.SetVelocity(pu, pw); err != nil {
		return checks, err
	}
	change := math.Max(maxAbsDiff(s.U(), pu)/maxAbs(pu), maxAbsDiff(s.W(), pw)/maxAbs(pw))
	checks = append(checks, AtMost("idempotent", "max |P(Pv) − Pv| / max |Pv| (u and w), "+where, change, roundOff, srcDerived))

	// A discretely solenoidal field: w = f(z) cos(kx) at the faces with
	// f = 0 at the walls, u = −(f[k+1] − f[k])/(Dz[k] k) sin(kx) at the
	// centres, so that ∂u/∂x + δw/δz = 0 exactly in the discrete sense.
	kx := 3 * 2 * math.Pi / g.Lx
	f := func(z float64) float64 { return math.Sin(math.Pi*z/g.H) * (1 + 0.5*math.Cos(5*z)) }
	for j, z := range g.Zf {
		for i, x := range g.X {
			v := 0.0
			if j > 0 && j < nz {
				v = f(z) * math.Cos(kx*x)
			}
			w[j*nx+i] = v
		}
	}
	for k := range g.Zc {
		fl, fh := 0.0, 0.0
		if k > 0 {
			fl = f(g.Zf[k])
		}
		if k < nz-1 {
			fh = f(g.Zf[k+1])
		}
		for i, x := range g.X {
			u[k*nx+i] = -(fh - fl) / (g.Dz[k] * kx) * math.Sin(kx*x)
		}
	}
	if err := s.SetVelocity(u, w); err != nil {
		return checks, err
	}
	change = math.Max(maxAbsDiff(s.U(), u)/maxAbs(u), maxAbsDiff(s.W(), w)/maxAbs(w))
	checks = append(checks, AtMost("solenoidal-unchanged", "max |Pv − v| / max |v| for a discretely solenoidal v, "+where, change, roundOff, srcDerived))

	// A step of a laminar profile with seeded perturbations in the shear
	// layer.
	prof, _, err := s.LaminarProfile()
	if err != nil {
		return checks, err
	}
	s.SetMeanProfile(prof)
	s.Perturb(0.05*maxAbs(prof), 0.4*g.H, 0.1*g.H, 7)
	for range 3 {
		if err := s.Step(); err != nil {
			return checks, err
		}
	}
	checks = append(checks, AtMost("after-steps", "max |∇·u| / max(|∂u/∂x| + |∂w/∂z|) after 3 adaptive steps of a perturbed laminar flow, "+where,
		ratio(), roundOff, srcDerived))
	return checks, nil
}
