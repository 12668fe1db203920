package validation

import (
	"fmt"
	"math"

	"rollerbed/canopy"
	"rollerbed/solver"
)

// The scalar verification cases (the scalar equation of package solver;
// check values in DEVELOPERS.md, "Published check values"):
//
//   - still fluid with uniform surface uptake: the mode sin(kx) decays as
//     exp(−(D k² + k_s a_s) t) (derived);
//   - steady diffusion with a first-order sink in a layer under a fixed top
//     concentration and a zero-flux bed: c = C cosh(z/L)/cosh(H/L),
//     L = √(D/λ) (derived), second-order convergence;
//   - a pulse carried once around the periodic domain by uniform flow comes
//     back to its shape (spectral accuracy in x; common practice, no
//     source);
//   - the Churchill–Bernstein correlation at its published check value;
//   - the budget of a turbulent canopy run with elements, a mat, a fixed top
//     and a source closes to round-off;
//   - series resistances: with k_bl ≪ k_s doubling k_s hardly changes the
//     uptake, with k_s ≪ k_bl the uptake doubles (derived).

func stillScalarConfig(nx, nz int, sc solver.Scalar) solver.Config {
	return solver.Config{Nx: nx, Nz: nz, Lx: 1, H: 0.5, Viscosity: 1e-6,
		Bed: solver.Wall{Kind: solver.FreeSlip}, Top: solver.Wall{Kind: solver.FreeSlip},
		Scalars: []solver.Scalar{sc}}
}

func filled(n int, v float64) []float64 {
	a := make([]float64, n)
	for i := range a {
		a[i] = v
	}
	return a
}

func noBoundaryLayer(float64) float64 { return math.Inf(1) }

func runScalars(opt Options) ([]Check, error) {
	var checks []Check

	// Still-fluid decay.
	D, ks, as := 1e-3, 2e-4, 30.0
	s, err := newSolver(opt, stillScalarConfig(32, 8, solver.Scalar{Name: "tracer", Diffusivity: D,
		SurfaceArea: filled(32*8, as), ElementVelocity: noBoundaryLayer, Capacity: ks}))
	if err != nil {
		return nil, err
	}
	k := 2 * math.Pi
	s.SetScalarFunc(0, func(x, z float64) float64 { return math.Sin(k * x) })
	T := 20.0
	for range 400 {
		if err := s.StepBy(T / 400); err != nil {
			s.Close()
			return nil, err
		}
	}
	g := s.Grid()
	num, den := 0.0, 0.0
	for i := 0; i < g.Nx; i++ {
		b := math.Sin(k * g.X[i])
		num += s.Scalar(0)[3*g.Nx+i] * b
		den += b * b
	}
	s.Close()
	checks = append(checks, Relative("still-decay", "amplitude of sin(kx) after t = 20 s, D = 1e-3 m²/s, k_s a_s = 6e-3 1/s, 32×8, Δt = 0.05 s",
		num/den, math.Exp(-(D*k*k+ks*as)*T), 1e-4, "derived: exp(−(D k² + k_s a_s) t)"))

	// Sink layer against cosh, three grids.
	var errs []float64
	for _, nz := range []int{16, 32, 64} {
		Dl, lam, C := 1e-3, 0.05, 2.0
		s, err := newSolver(opt, stillScalarConfig(8, nz, solver.Scalar{Name: "o2", Diffusivity: Dl,
			SurfaceArea: filled(8*nz, lam), ElementVelocity: noBoundaryLayer, Capacity: 1,
			Top: solver.ScalarBoundary{Kind: solver.FixedValue, Value: C}}))
		if err != nil {
			return nil, err
		}
		for range 300 {
			if err := s.StepBy(20); err != nil {
				s.Close()
				return nil, err
			}
		}
		L := math.Sqrt(Dl / lam)
		g := s.Grid()
		e := 0.0
		for kk := 0; kk < nz; kk++ {
			want := C * math.Cosh(g.Zc[kk]/L) / math.Cosh(0.5/L)
			e = math.Max(e, math.Abs(s.Scalar(0)[kk*8]-want)/C)
		}
		s.Close()
		errs = append(errs, e)
	}
	checks = append(checks,
		AtMost("sink-layer-nz32", "max |c − C cosh(z/L)/cosh(H/L)| / C, L = √(D/λ) = 0.141 m, Nz = 32", errs[1], 2e-3, "derived"),
		Absolute("sink-layer-order", "order of the error, Nz = 32 → 64", math.Log2(errs[1]/errs[2]), 2, 0.2, "derived (second-order scheme)"))

	// Pulse around the domain.
	s, err = newSolver(opt, stillScalarConfig(128, 4, solver.Scalar{Name: "dye", Diffusivity: 1e-12}))
	if err != nil {
		return nil, err
	}
	U := 0.1
	s.SetVelocityFunc(func(x, z float64) float64 { return U }, nil)
	pulse := func(x float64) float64 { d := math.Remainder(x-0.5, 1); return math.Exp(-d * d / (2 * 0.05 * 0.05)) }
	s.SetScalarFunc(0, func(x, z float64) float64 { return pulse(x) })
	for range 2000 {
		if err := s.StepBy(1 / U / 2000); err != nil {
			s.Close()
			return nil, err
		}
	}
	g = s.Grid()
	e := 0.0
	for i := 0; i < g.Nx; i++ {
		e = math.Max(e, math.Abs(s.Scalar(0)[g.Nx+i]-pulse(g.X[i])))
	}
	s.Close()
	checks = append(checks, AtMost("pulse-lap", "max |c − c₀| after one lap of a Gaussian pulse (σ = 0.05 m) in uniform flow, 128 points, 2000 steps",
		e, 1e-5, "common practice, no source (spectral accuracy in x)"))

	// Churchill–Bernstein check value.
	checks = append(checks, Relative("churchill-bernstein", "Sh at Re = 6071, Sc = 0.7",
		canopy.ChurchillBernstein(6071, 0.7), 40.6371, 1e-5, "Churchill & Bernstein 1977, J. Heat Transfer 99:300"))

	// Budget on a turbulent canopy.
	b, err := canopyBudget(opt)
	if err != nil {
		return nil, err
	}
	checks = append(checks, AtMost("budget", fmt.Sprintf("relative budget imbalance after 200 steps of a turbulent canopy run (elements %.3g, bed %.3g unit·m)", b.ElementUptake, -b.BedIn),
		b.Imbalance(), 1e-10, "derived: storage change = supply − uptake + sources"))

	// Series-resistance limits.
	u1, err := limitUptake(opt, 1e-6, 1e-3)
	if err != nil {
		return nil, err
	}
	u2, err := limitUptake(opt, 1e-6, 2e-3)
	if err != nil {
		return nil, err
	}
	checks = append(checks, AtMost("boundary-layer-limit", "relative change of uptake when k_s doubles with k_bl = 1e-6 m/s ≪ k_s = 1e-3 m/s",
		math.Abs(u2/u1-1), 2e-3, "derived: 1/k_e = 1/k_bl + 1/k_s, change of order k_bl/k_s"))
	u1, err = limitUptake(opt, 1e-3, 1e-7)
	if err != nil {
		return nil, err
	}
	u2, err = limitUptake(opt, 1e-3, 2e-7)
	if err != nil {
		return nil, err
	}
	checks = append(checks, Relative("surface-limit", "uptake ratio when k_s doubles with k_s = 1e-7 m/s ≪ k_bl = 1e-3 m/s",
		u2/u1, 2, 0.01, "derived: 1/k_e = 1/k_bl + 1/k_s, uptake ∝ k_s"))
	return checks, nil
}

// scalarCanopy is a small turbulent canopy channel with the Smagorinsky
// closure and a block canopy in its lower third.
func scalarCanopy(nx, nz int) solver.Config {
	c := solver.Config{Nx: nx, Nz: nz, Lx: 2, H: 1, Viscosity: 1e-6,
		Bed: solver.Wall{Kind: solver.NoSlip}, Top: solver.Wall{Kind: solver.FreeSlip},
		Forcing: solver.Forcing{Kind: solver.FixedBulk, Bulk: 0.1},
		Closure: solver.Closure{Cs: solver.DefaultSmagorinsky}}
	half := make([]float64, nx*nz)
	for k := 0; k < nz/3; k++ {
		for i := 0; i < nx; i++ {
			half[k*nx+i] = 4
		}
	}
	c.Drag = &solver.Drag{HalfArea: half, CD: 1}
	return c
}

func surfaceOf(c solver.Config) []float64 {
	as := make([]float64, len(c.Drag.HalfArea))
	for i, v := range c.Drag.HalfArea {
		as[i] = 2 * math.Pi * v // a_s = π a for cylinders
	}
	return as
}

func canopyBudget(opt Options) (solver.ScalarBudget, error) {
	c := scalarCanopy(64, 32)
	c.Scalars = []solver.Scalar{{
		Name: "oxygen", Diffusivity: 1.76e-9, Initial: 0.2, Source: 1e-5,
		Top: solver.ScalarBoundary{Kind: solver.FixedValue, Value: 0.25},
		Bed: solver.ScalarBoundary{Kind: solver.Transfer, Capacity: 1e-5,
			Velocity: func(us float64) float64 { return canopy.BedTransferVelocity(us, 570) }},
		SurfaceArea:     surfaceOf(c),
		ElementVelocity: func(speed float64) float64 { return 1e-5 + 1e-4*speed },
		Capacity:        2e-5,
	}}
	s, err := newSolver(opt, c)
	if err != nil {
		return solver.ScalarBudget{}, err
	}
	defer s.Close()
	prof, _, err := s.DragBalancedProfile()
	if err != nil {
		return solver.ScalarBudget{}, err
	}
	s.SetMeanProfile(prof)
	s.Perturb(5e-3, 0.33, 0.1, 2)
	for range 200 {
		if err := s.Step(); err != nil {
			return solver.ScalarBudget{}, err
		}
	}
	return s.Budget(0), nil
}

func limitUptake(opt Options, kbl, ks float64) (float64, error) {
	c := scalarCanopy(32, 24)
	c.Scalars = []solver.Scalar{{Name: "n", Diffusivity: 1e-9, Initial: 1,
		Top:         solver.ScalarBoundary{Kind: solver.FixedValue, Value: 1},
		SurfaceArea: surfaceOf(c), ElementVelocity: func(float64) float64 { return kbl }, Capacity: ks}}
	s, err := newSolver(opt, c)
	if err != nil {
		return 0, err
	}
	defer s.Close()
	prof, _, err := s.DragBalancedProfile()
	if err != nil {
		return 0, err
	}
	s.SetMeanProfile(prof)
	for range 50 {
		if err := s.StepBy(0.02); err != nil {
			return 0, err
		}
	}
	return s.Budget(0).ElementUptake, nil
}
