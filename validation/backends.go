package validation

import (
	"fmt"

	"rollerbed/solver"
	"rollerbed/solver/transform"
)

// The two transform backends compute the same discrete Fourier transform,
// and the worker split changes which goroutine does a piece of work but not
// its arithmetic, so one step of the same state must agree to round-off
// (common practice, no source). The flow is a closed channel with a moving
// lid (Poiseuille plus Couette) carrying seeded random perturbations, on a
// clustered grid, so that every term of the step is exercised.

func backendsConfig(opt Options) solver.Config {
	nx, nz := 64, 48
	if opt.Full {
		nx, nz = 256, 128
	}
	return solver.Config{Nx: nx, Nz: nz, Lx: 1, H: 0.25,
		Cluster:   solver.Cluster{Bed: 3, BedWidth: 0.02, At: 0.1, AtFactor: 2, AtWidth: 0.03},
		Viscosity: 1e-5, Bed: solver.Wall{Kind: solver.NoSlip}, Top: solver.Wall{Kind: solver.NoSlip, Speed: 0.1},
		Forcing: solver.Forcing{Kind: solver.FixedGradient, Gradient: 1e-4}}
}

// stepState is the state after one step.
type stepState struct{ u, w, p []float64 }

// backendInit makes the perturbed flow: the laminar profile with seeded
// perturbations near the canopy-top height of the grid's clustering.
func backendInit(opt Options) (u, w []float64, dt float64, err error) {
	s, err := newSolver(opt, backendsConfig(opt))
	if err != nil {
		return nil, nil, 0, err
	}
	defer s.Close()
	prof, _, err := s.LaminarProfile()
	if err != nil {
		return nil, nil, 0, err
	}
	s.SetMeanProfile(prof)
	s.Perturb(0.01, 0.1, 0.05, 42)
	return append([]float64(nil), s.U()...), append([]float64(nil), s.W()...), s.NextStep(), nil
}

// backendStep sets the state u0, w0 in a solver with backend b and the
// given workers, takes one step of dt and returns the state after it.
func backendStep(opt Options, b transform.Backend, workers int, u0, w0 []float64, dt float64) (stepState, error) {
	o := opt
	o.Backend, o.Workers = b, workers
	cfg := backendsConfig(o)
	s, err := newSolver(o, cfg)
	if err != nil {
		return stepState{}, err
	}
	defer s.Close()
	if err := s.SetVelocity(u0, w0); err != nil {
		return stepState{}, err
	}
	if err := s.StepBy(dt); err != nil {
		return stepState{}, err
	}
	st := stepState{u: append([]float64(nil), s.U()...), w: append([]float64(nil), s.W()...),
		p: make([]float64, cfg.Nz*cfg.Nx)}
	s.Pressure(st.p)
	return st, nil
}

func runBackends(opt Options) ([]Check, error) {
	cfg := backendsConfig(opt)
	workers := max(opt.Workers, 1)
	u0, w0, dt, err := backendInit(opt)
	if err != nil {
		return nil, err
	}
	ref, err := backendStep(opt, transform.FFTW, workers, u0, w0, dt)
	if err != nil {
		return nil, err
	}
	var checks []Check
	// The pressure is small against the dynamic pressure u² of the shear
	// flow whose rounding it inherits, so its difference is measured on
	// that scale.
	umax := maxAbs(ref.u)
	compare := func(name, what string, got stepState) {
		for _, f := range []struct {
			field, scale string
			a, b         []float64
			by           float64
		}{
			{"u", "max |u|", got.u, ref.u, umax},
			{"w", "max |w|", got.w, ref.w, maxAbs(ref.w)},
			{"p", "max |u|²", got.p, ref.p, umax * umax},
		} {
			checks = append(checks, AtMost(name+"-"+f.field,
				fmt.Sprintf("max |Δ%s| / %s after one step (dt = %.4g s) of a perturbed shear flow, Nx = %d, Nz = %d: %s",
					f.field, f.scale, dt, cfg.Nx, cfg.Nz, what),
				maxAbsDiff(f.a, f.b)/f.by, roundOff, srcPractice))
		}
	}
	gon, err := backendStep(opt, transform.Gonum, workers, u0, w0, dt)
	if err != nil {
		return checks, err
	}
	compare("gonum-vs-fftw", fmt.Sprintf("gonum against FFTW, %d worker(s)", workers), gon)
	other := 3
	if workers == other {
		other = 1
	}
	par, err := backendStep(opt, transform.FFTW, other, u0, w0, dt)
	if err != nil {
		return checks, err
	}
	compare(fmt.Sprintf("workers-%d-vs-%d", other, workers), fmt.Sprintf("FFTW with %d against %d worker(s)", other, workers), par)
	return checks, nil
}
