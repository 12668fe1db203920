package validation

import (
	"fmt"
	"math"

	"rollerbed/solver"
	"rollerbed/solver/transform"
)

// The spanwise-periodic box (solver.Config.Ny > 1), checked against the
// slice and against an exact solution:
//
//   - a y-invariant state stays y-invariant and every plane follows the
//     slice solver to round-off: the three-dimensional equations reduce to
//     the slice's when nothing depends on y (derived). The flow is a
//     perturbed closed channel with the Smagorinsky closure (Δy chosen so
//     that (Δx Δy Δz)^⅓ is the slice's (Δx Δz)^½) and a Darcy–Brinkman drag
//     layer;
//   - an oblique Fourier mode between free-slip walls, w ∝ cos(k_x x +
//     k_y y) sin(πz/H) with the horizontal velocity the projection gives it,
//     is an eigenfunction of the Laplacian with zero pressure, so at small
//     amplitude it decays at ν (k_x² + k_y² + (π/H)²) (derived, as the
//     vortex-decay case), with the second-order error in z;
//   - the divergence of a perturbed three-dimensional flow after a step, the
//     two transform backends and one or three workers (common practice, no
//     source).

const (
	boxNx, boxNy = 32, 8
	boxNu        = 1e-3 // m²/s, the channel
	boxModeNu    = 1e-2 // m²/s, the decaying mode
	boxModeT     = 1.0  // s
	boxModeDt    = 0.01 // s
	boxModeLy    = 0.75 // m, Lx = 2 m, H = 1 m
	// boxModeTol is the allowed relative error of the decay rate at
	// Nz = 32, where the a-priori second-order error is
	// (π/H)²/(k²)·(πΔz/H)²/12 ≈ 9e-5 (derived).
	boxModeTol = 1e-3
)

// boxChannel is the closed channel of the invariance check: Ny = 1 for the
// slice. Its drag layer is the same at every y.
func boxChannel(ny, nz int) solver.Config {
	c := solver.Config{Nx: boxNx, Nz: nz, Lx: 2, H: 1, Viscosity: boxNu,
		Bed: solver.Wall{Kind: solver.NoSlip}, Top: solver.Wall{Kind: solver.NoSlip},
		Forcing: solver.Forcing{Kind: solver.FixedGradient, Gradient: 1e-3},
		Closure: solver.Closure{Cs: 0.17}}
	if ny > 1 {
		c.Ny, c.Ly = ny, float64(ny)*math.Sqrt(c.Lx/float64(c.Nx)*c.H/float64(nz))
	}
	np := c.Nx * ny
	lin := make([]float64, nz*np)
	for p := range lin[:nz/3*np] {
		lin[p] = 0.5
	}
	c.Drag = &solver.Drag{Linear: lin}
	return c
}

// boxInvariance runs the slice and the box from the same y-invariant state
// and returns the largest difference of u, w and ν_e between any plane row
// and the slice, and the largest |v|, both over max |u|.
func boxInvariance(opt Options, steps int) (diff, vmax float64, err error) {
	const nz = 24
	var runs [2]*solver.Solver
	for i, ny := range []int{1, boxNy} {
		s, err := newSolver(opt, boxChannel(ny, nz))
		if err != nil {
			return 0, 0, err
		}
		defer s.Close()
		s.SetVelocityFunc(func(x, z float64) float64 { return z * (1 - z) * (1 + 0.3*math.Sin(math.Pi*x)) },
			func(x, z float64) float64 { return 0.05 * math.Cos(math.Pi*x) * math.Sin(math.Pi*z) })
		runs[i] = s
	}
	slice, box := runs[0], runs[1]
	for range steps {
		dt := slice.NextStep()
		if err := slice.StepBy(dt); err != nil {
			return 0, 0, err
		}
		if err := box.StepBy(dt); err != nil {
			return 0, 0, err
		}
	}
	scale := maxAbs(slice.U())
	for _, f := range [][2][]float64{{slice.U(), box.U()}, {slice.W(), box.W()}, {slice.Viscosity(), box.Viscosity()}} {
		for p, v := range f[1] {
			diff = math.Max(diff, math.Abs(v-f[0][(p/(boxNy*boxNx))*boxNx+p%boxNx]))
		}
	}
	return diff / scale, maxAbs(box.V()) / scale, nil
}

// boxModeRate seeds the oblique mode through w alone (the projection adds
// its horizontal velocity) and returns its decay rate over boxModeT from the
// (k_x, k_y) coefficient of w at mid-depth.
func boxModeRate(opt Options, nz int) (rate, exact float64, err error) {
	c := solver.Config{Nx: 16, Ny: boxNy, Nz: nz, Lx: 2, Ly: boxModeLy, H: 1, Viscosity: boxModeNu,
		Bed: solver.Wall{Kind: solver.FreeSlip}, Top: solver.Wall{Kind: solver.FreeSlip}}
	s, err := newSolver(opt, c)
	if err != nil {
		return 0, 0, err
	}
	defer s.Close()
	g := s.Grid()
	kx, ky, kz := 2*math.Pi/c.Lx, 2*math.Pi/c.Ly, math.Pi/c.H
	np := c.Nx * c.Ny
	w := make([]float64, (nz+1)*np)
	for j := 1; j < nz; j++ {
		for p := range np {
			w[j*np+p] = 1e-6 * math.Cos(kx*g.X[p%c.Nx]+ky*g.Y(p/c.Nx)) * math.Sin(kz*g.Zf[j])
		}
	}
	if err := s.SetVelocity3(make([]float64, nz*np), nil, w); err != nil {
		return 0, 0, err
	}
	mid := nz / 2
	amp := func() float64 { return cabs(obliqueMode(s.W()[mid*np:(mid+1)*np], g, kx, ky)) }
	a0 := amp()
	if err := advance(s, int(math.Round(boxModeT/boxModeDt)), boxModeDt); err != nil {
		return 0, 0, err
	}
	return -math.Log(amp()/a0) / s.Time(), boxModeNu * (kx*kx + ky*ky + kz*kz), nil
}

func cabs(c complex128) float64 { return math.Hypot(real(c), imag(c)) }

// boxPerturbed returns a perturbed box channel after a step on backend b
// with the given workers, and its divergence over the velocity gradients.
func boxPerturbed(opt Options, b transform.Backend, workers int) (u, v, w []float64, div float64, err error) {
	o := opt
	o.Backend, o.Workers = b, workers
	s, err := newSolver(o, boxChannel(boxNy, 16))
	if err != nil {
		return nil, nil, nil, 0, err
	}
	defer s.Close()
	prof, _, err := s.LaminarProfile()
	if err != nil {
		return nil, nil, nil, 0, err
	}
	s.SetMeanProfile(prof)
	s.Perturb(0.02*maxAbs(prof), 0.4, 0.2, 5)
	if err := s.StepBy(s.NextStep()); err != nil {
		return nil, nil, nil, 0, err
	}
	d, scale := s.Divergence()
	return append([]float64(nil), s.U()...), append([]float64(nil), s.V()...), append([]float64(nil), s.W()...), d / scale, nil
}

func runBox(opt Options) ([]Check, error) {
	diff, vmax, err := boxInvariance(opt, 10)
	if err != nil {
		return nil, err
	}
	checks := []Check{
		AtMost("y-invariant-vs-slice", fmt.Sprintf("max |box − slice| of u, w and ν_e over max |u| after 10 steps of a y-invariant perturbed channel with closure and drag, Nx = %d, Ny = %d, Nz = 24", boxNx, boxNy),
			diff, roundOff, srcDerived),
		AtMost("y-invariant-v", "max |v| / max |u| of the same run", vmax, roundOff, srcDerived),
	}
	nzs := []int{16, 32}
	if opt.Full {
		nzs = append(nzs, 64)
	}
	errs := make([]float64, len(nzs))
	for i, nz := range nzs {
		rate, exact, err := boxModeRate(opt, nz)
		if err != nil {
			return checks, err
		}
		errs[i] = math.Abs(rate/exact - 1)
		if nz >= 32 {
			checks = append(checks, Relative(fmt.Sprintf("oblique-decay-nz%d", nz),
				fmt.Sprintf("decay rate (1/s) of the oblique mode (k_x, k_y) = (π, 8π/3) 1/m between free-slip walls, Nx = 16, Ny = %d, Nz = %d", boxNy, nz),
				rate, exact, boxModeTol, srcDerived+" (ν (k_x² + k_y² + (π/H)²))"))
		}
	}
	for i := 1; i < len(nzs); i++ {
		checks = append(checks, Absolute(fmt.Sprintf("order-nz%d-nz%d", nzs[i-1], nzs[i]),
			"observed order of the decay-rate error under z refinement", order(errs[i-1], errs[i], 2), 2, orderTol, srcOrder))
	}
	workers := max(opt.Workers, 1)
	u, v, w, div, err := boxPerturbed(opt, opt.Backend, workers)
	if err != nil {
		return checks, err
	}
	checks = append(checks, AtMost("divergence", "max |∇·u| / max velocity gradient after a step of a perturbed box", div, roundOff, srcPractice))
	compare := func(name, what string, b transform.Backend, n int) error {
		u2, v2, w2, _, err := boxPerturbed(opt, b, n)
		if err != nil {
			return err
		}
		d := math.Max(maxAbsDiff(u2, u)/maxAbs(u), math.Max(maxAbsDiff(v2, v)/maxAbs(v), maxAbsDiff(w2, w)/maxAbs(w)))
		checks = append(checks, AtMost(name, "largest relative difference of u, v, w after a step of a perturbed box: "+what, d, roundOff, srcPractice))
		return nil
	}
	if transform.Available(transform.FFTW) {
		other := transform.Gonum
		if opt.Backend == transform.Gonum {
			other = transform.FFTW
		}
		if err := compare("backends", fmt.Sprintf("%v against %v", other, opt.Backend), other, workers); err != nil {
			return checks, err
		}
	}
	other := 3
	if workers == other {
		other = 1
	}
	if err := compare(fmt.Sprintf("workers-%d-vs-%d", other, workers), fmt.Sprintf("%d against %d worker(s)", other, workers), opt.Backend, other); err != nil {
		return checks, err
	}
	return checks, nil
}
