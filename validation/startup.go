package validation

import (
	"fmt"
	"math"

	"rollerbed/solver"
)

// Start-up of channel flow from rest under a constant pressure gradient Π
// (White, Viscous Fluid Flow; Schlichting & Gersten, Boundary-Layer Theory;
// the series below derived). With u(z, 0) = 0 the velocity is the steady
// parabola minus its sine series, each term decaying at its own rate:
//
// Closed channel, no-slip at z = 0 and z = H:
//
//	u_s = Π/(2ν) z (H − z),
//	u   = u_s − Σ_(n odd) 4ΠH²/(ν π³ n³) sin(nπz/H) exp(−n²π²νt/H²).
//
// Open channel, no-slip bed, free-slip top (half of a closed channel of
// depth 2H, mirrored at z = H):
//
//	u_s = Π/(2ν) z (2H − z),
//	u   = u_s − Σ_(n odd) 16ΠH²/(ν π³ n³) sin(nπz/(2H)) exp(−n²π²νt/(4H²)).
//
// The series coefficients are those of u_s: ∫₀^H z(H − z) sin(nπz/H) dz =
// 4H³/(n³π³) for odd n and 0 for even n.

// channel is one of the two start-up problems.
type channel struct {
	name string
	top  solver.WallKind
	// span is the length over which the sine eigenfunctions fit: H for the
	// closed channel, 2H for the open one.
	span float64
}

func (c channel) steady(z float64) float64 {
	return startupPi / (2 * startupNu) * z * (c.span - z)
}

// peak is the largest steady velocity, the scale of the errors.
func (c channel) peak() float64 { return c.steady(c.span / 2) }

// exact returns the start-up velocity at height z and time t.
func (c channel) exact(z, t float64) float64 {
	l := c.span
	amp := 4 * startupPi * l * l / (startupNu * math.Pi * math.Pi * math.Pi)
	sum := 0.0
	for n := 1; ; n += 2 {
		fn := float64(n)
		decay := math.Exp(-fn * fn * math.Pi * math.Pi * startupNu * t / (l * l))
		term := amp / (fn * fn * fn) * decay
		sum += term * math.Sin(fn*math.Pi*z/l)
		if term < 1e-17*amp || n > 1_000_001 {
			break
		}
	}
	return c.steady(z) - sum
}

// The parameters of the start-up problems: a 5 cm deep water layer driven
// by g S with S = 1e-6. The checks compare dimensionless ratios, which do
// not depend on these choices.
const (
	startupH  = 0.05    // m
	startupNu = 1e-6    // m²/s
	startupPi = 9.81e-6 // m/s², g S
	startupNx = 8
	// startupTau is the viscous time H²/ν, s.
	startupTau = startupH * startupH / startupNu
)

// startupSetup are the sizes of a start-up case.
type startupSetup struct {
	nz      []int     // grids, each twice the one before
	checkAt int       // index of the first grid whose transient is checked
	steps   int       // steps per viscous time H²/ν
	times   []float64 // sample times in units of H²/ν
}

func startupConfig(opt Options) startupSetup {
	s := startupSetup{nz: []int{16, 32, 64}, checkAt: 1, steps: 4000, times: []float64{0.01, 0.05, 0.2}}
	if opt.Full {
		s.nz = []int{32, 64, 128, 256}
		s.steps = 16000
	}
	return s
}

// errorBound is the a-priori error estimate of the transient (see
// modeErrorBound), relative to the peak steady velocity, the largest over
// the sample times: the series coefficients relative to the peak are
// 32/(π³n³) for odd n in both channels.
func (c channel) errorBound(times []float64, dz float64) float64 {
	amp := func(n int) float64 {
		if n%2 == 0 {
			return 0
		}
		fn := float64(n)
		return 32 / (math.Pi * math.Pi * math.Pi * fn * fn * fn)
	}
	lambda := func(n int) float64 { return float64(n) * math.Pi / c.span }
	worst := 0.0
	for _, t := range times {
		worst = math.Max(worst, modeErrorBound(amp, lambda, startupNu, t*startupTau, dz))
	}
	return worst
}

func runOpenStartup(opt Options) ([]Check, error) {
	return runStartup(opt, channel{name: "open-channel-startup", top: solver.FreeSlip, span: 2 * startupH})
}

func runClosedStartup(opt Options) ([]Check, error) {
	return runStartup(opt, channel{name: "closed-channel-startup", top: solver.NoSlip, span: startupH})
}

func (c channel) config(nz int, cl solver.Cluster) solver.Config {
	return solver.Config{Nx: startupNx, Nz: nz, Lx: 10 * startupH, H: startupH, Cluster: cl,
		Viscosity: startupNu, Bed: solver.Wall{Kind: solver.NoSlip}, Top: solver.Wall{Kind: c.top},
		Forcing: solver.Forcing{Kind: solver.FixedGradient, Gradient: startupPi}}
}

func runStartup(opt Options, c channel) ([]Check, error) {
	cfg := startupConfig(opt)
	var checks []Check
	tables := map[string]*table{}
	errs := make([]float64, len(cfg.nz))
	summary := newTable("nz", "max_error_over_peak")
	for i, nz := range cfg.nz {
		e, prof, err := c.transient(opt, nz, cfg)
		if err != nil {
			return checks, err
		}
		errs[i] = e
		summary.add(float64(nz), e)
		tables[fmt.Sprintf("transient_nz%d.csv", nz)] = prof
		if i >= cfg.checkAt {
			tol := tolMargin * c.errorBound(cfg.times, startupH/float64(nz))
			checks = append(checks, AtMost(fmt.Sprintf("transient-nz%d", nz),
				fmt.Sprintf("max |u − u_series| / u_peak over z at t/(H²/ν) = %v, Nz = %d (tolerance: %g × the a-priori estimate)", cfg.times, nz, float64(tolMargin)),
				e, tol, srcChannel))
		}
	}
	for i := 1; i < len(cfg.nz); i++ {
		checks = append(checks, Absolute(fmt.Sprintf("order-nz%d-nz%d", cfg.nz[i-1], cfg.nz[i]),
			"observed order of the transient error under z refinement", order(errs[i-1], errs[i], 2), 2, orderTol, srcOrder))
	}
	tables["summary.csv"] = summary

	nz := cfg.nz[cfg.checkAt]
	more, steadyTab, err := c.steadyChecks(opt, nz)
	checks = append(checks, more...)
	if err != nil {
		return checks, err
	}
	tables["steady.csv"] = steadyTab
	return checks, keep(opt, c.name, tables)
}

// transient runs the start-up from rest on a uniform grid and returns the
// largest error over the sample times relative to the peak steady velocity,
// and the profiles (t, z, measured, exact).
func (c channel) transient(opt Options, nz int, cfg startupSetup) (float64, *table, error) {
	s, err := newSolver(opt, c.config(nz, solver.Cluster{}))
	if err != nil {
		return 0, nil, err
	}
	defer s.Close()
	dt := startupTau / float64(cfg.steps)
	prof := newTable("t_s", "z_m", "u_measured", "u_exact")
	mean := make([]float64, nz)
	worst := 0.0
	done := 0
	for _, tt := range cfg.times {
		n := int(math.Round(tt * float64(cfg.steps)))
		if err := advance(s, n-done, dt); err != nil {
			return 0, nil, err
		}
		done = n
		s.MeanU(mean)
		for k, z := range s.Grid().Zc {
			ex := c.exact(z, s.Time())
			worst = math.Max(worst, math.Abs(mean[k]-ex)/c.peak())
			prof.add(s.Time(), z, mean[k], ex)
		}
	}
	return worst, prof, nil
}

// steadyChecks compares LaminarProfile with the parabola on a uniform grid
// and runs from it on a uniform and a bed-clustered grid, which must stay
// steady to round-off.
func (c channel) steadyChecks(opt Options, nz int) ([]Check, *table, error) {
	var checks []Check
	tab := newTable("z_m", "u_laminar_profile", "u_parabola")
	grids := []struct {
		name string
		cl   solver.Cluster
	}{
		{"uniform", solver.Cluster{}},
		{"clustered", solver.Cluster{Bed: 4, BedWidth: 0.2 * startupH}},
	}
	for _, gr := range grids {
		s, err := newSolver(opt, c.config(nz, gr.cl))
		if err != nil {
			return checks, nil, err
		}
		prof, _, err := s.LaminarProfile()
		if err != nil {
			s.Close()
			return checks, nil, err
		}
		if gr.name == "uniform" {
			// The wall closure is a one-sided second-order derivative and
			// the interior operator is exact for quadratics on a uniform
			// grid, so the discrete steady state is the parabola itself
			// (derived).
			worst := 0.0
			for k, z := range s.Grid().Zc {
				worst = math.Max(worst, math.Abs(prof[k]-c.steady(z)))
				tab.add(z, prof[k], c.steady(z))
			}
			checks = append(checks, AtMost("laminar-profile",
				fmt.Sprintf("max |LaminarProfile − Π z(%s − z)/(2ν)| / u_peak, uniform Nz = %d", spanName(c), nz),
				worst/c.peak(), roundOff, srcChannel))
		}
		s.SetMeanProfile(prof)
		// Run a tenth of a viscous time with the adaptive step.
		for s.Time() < 0.1*startupTau {
			if err := s.Step(); err != nil {
				s.Close()
				return checks, nil, err
			}
		}
		mean := make([]float64, nz)
		s.MeanU(mean)
		checks = append(checks, AtMost("steady-"+gr.name,
			fmt.Sprintf("max |u − u_laminar| / u_peak after 0.1 H²/ν (%d adaptive steps) from LaminarProfile, %s Nz = %d", s.Steps(), gr.name, nz),
			maxAbsDiff(mean, prof)/c.peak(), roundOff, srcPractice))
		checks = append(checks, AtMost("steady-w-"+gr.name,
			"max |w| / u_peak after the same run", maxAbs(s.W())/c.peak(), roundOff, srcPractice))
		s.Close()
	}
	return checks, tab, nil
}

func spanName(c channel) string {
	if c.span == startupH {
		return "H"
	}
	return "2H"
}
