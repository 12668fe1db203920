package validation

import (
	"fmt"
	"math"

	"rollerbed/solver"
)

// Couette flow between a fixed bed and a lid moving at U, no pressure
// gradient (White, Viscous Fluid Flow; Schlichting & Gersten,
// Boundary-Layer Theory; series derived): the steady state is u = U z/H and
// the start-up from rest, the lid set moving at t = 0, is
//
//	u = U z/H − Σ_(n≥1) 2U(−1)^(n+1)/(nπ) sin(nπz/H) exp(−n²π²νt/H²),
//
// the sine series of U z/H with each term decaying at its own rate.

const (
	couetteH  = 0.05 // m
	couetteNu = 1e-6 // m²/s
	couetteU  = 0.02 // m/s, lid speed
	couetteNx = 8
	// couetteTau is the viscous time H²/ν, s.
	couetteTau = couetteH * couetteH / couetteNu
)

func couetteExact(z, t float64) float64 {
	sum := 0.0
	for n := 1; ; n++ {
		fn := float64(n)
		decay := math.Exp(-fn * fn * math.Pi * math.Pi * couetteNu * t / (couetteH * couetteH))
		c := 2 / (fn * math.Pi) * decay
		if n%2 == 0 {
			c = -c
		}
		sum += c * math.Sin(fn*math.Pi*z/couetteH)
		if decay < 1e-17 || n > 1_000_000 {
			break
		}
	}
	return couetteU * (z/couetteH - sum)
}

// couetteErrorBound is the a-priori error estimate of the transient (see
// modeErrorBound) relative to U, the largest over the sample times: the
// series coefficients are 2/(nπ) U.
func couetteErrorBound(times []float64, dz float64) float64 {
	amp := func(n int) float64 { return 2 / (float64(n) * math.Pi) }
	lambda := func(n int) float64 { return float64(n) * math.Pi / couetteH }
	worst := 0.0
	for _, t := range times {
		worst = math.Max(worst, modeErrorBound(amp, lambda, couetteNu, t*couetteTau, dz))
	}
	return worst
}

func couetteConfig(nz int) solver.Config {
	return solver.Config{Nx: couetteNx, Nz: nz, Lx: 10 * couetteH, H: couetteH, Viscosity: couetteNu,
		Bed: solver.Wall{Kind: solver.NoSlip}, Top: solver.Wall{Kind: solver.NoSlip, Speed: couetteU}}
}

func runCouette(opt Options) ([]Check, error) {
	cfg := startupConfig(opt)
	// The impulsive start leaves a wall layer a few cells thick at the
	// first sample of the channel cases; start sampling later.
	cfg.times = []float64{0.02, 0.05, 0.2}
	var checks []Check
	tables := map[string]*table{}
	errs := make([]float64, len(cfg.nz))
	summary := newTable("nz", "max_error_over_U")
	for i, nz := range cfg.nz {
		e, prof, err := couetteTransient(opt, nz, cfg)
		if err != nil {
			return checks, err
		}
		errs[i] = e
		summary.add(float64(nz), e)
		tables[fmt.Sprintf("transient_nz%d.csv", nz)] = prof
		if i >= cfg.checkAt {
			tol := tolMargin * couetteErrorBound(cfg.times, couetteH/float64(nz))
			checks = append(checks, AtMost(fmt.Sprintf("transient-nz%d", nz),
				fmt.Sprintf("max |u − u_series| / U over z at t/(H²/ν) = %v, Nz = %d (tolerance: %g × the a-priori estimate)", cfg.times, nz, float64(tolMargin)),
				e, tol, srcChannel))
		}
	}
	for i := 1; i < len(cfg.nz); i++ {
		checks = append(checks, Absolute(fmt.Sprintf("order-nz%d-nz%d", cfg.nz[i-1], cfg.nz[i]),
			"observed order of the transient error under z refinement", order(errs[i-1], errs[i], 2), 2, orderTol, srcOrder))
	}
	tables["summary.csv"] = summary

	// Steady state: the one-sided wall derivative and the interior
	// operator are exact for a linear profile, so the discrete steady
	// state is U z/H on any grid (derived); check a clustered one too.
	nz := cfg.nz[cfg.checkAt]
	steady := newTable("clustered", "z_m", "u_laminar_profile", "u_linear")
	for gi, cl := range []solver.Cluster{{}, {Bed: 4, BedWidth: 0.2 * couetteH, At: 0.7 * couetteH, AtFactor: 3, AtWidth: 0.1 * couetteH}} {
		name := "uniform"
		if gi == 1 {
			name = "clustered"
		}
		c := couetteConfig(nz)
		c.Cluster = cl
		s, err := newSolver(opt, c)
		if err != nil {
			return checks, err
		}
		prof, _, err := s.LaminarProfile()
		if err != nil {
			s.Close()
			return checks, err
		}
		worst := 0.0
		for k, z := range s.Grid().Zc {
			worst = math.Max(worst, math.Abs(prof[k]-couetteU*z/couetteH))
			steady.add(float64(gi), z, prof[k], couetteU*z/couetteH)
		}
		checks = append(checks, AtMost("laminar-profile-"+name,
			fmt.Sprintf("max |LaminarProfile − U z/H| / U, %s Nz = %d", name, nz), worst/couetteU, roundOff, srcStokes))
		s.SetMeanProfile(prof)
		for s.Time() < 0.1*couetteTau {
			if err := s.Step(); err != nil {
				s.Close()
				return checks, err
			}
		}
		mean := make([]float64, nz)
		s.MeanU(mean)
		checks = append(checks, AtMost("steady-"+name,
			fmt.Sprintf("max |u − U z/H| / U after 0.1 H²/ν (%d adaptive steps) from LaminarProfile, %s Nz = %d", s.Steps(), name, nz),
			maxAbsDiff(mean, prof)/couetteU, roundOff, srcPractice))
		s.Close()
	}
	tables["steady.csv"] = steady
	return checks, keep(opt, "couette", tables)
}

// couetteTransient runs the start-up on a uniform grid and returns the
// largest error over the sample times relative to U, and the profiles.
func couetteTransient(opt Options, nz int, cfg startupSetup) (float64, *table, error) {
	s, err := newSolver(opt, couetteConfig(nz))
	if err != nil {
		return 0, nil, err
	}
	defer s.Close()
	dt := couetteTau / float64(cfg.steps)
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
			ex := couetteExact(z, s.Time())
			worst = math.Max(worst, math.Abs(mean[k]-ex)/couetteU)
			prof.add(s.Time(), z, mean[k], ex)
		}
	}
	return worst, prof, nil
}
