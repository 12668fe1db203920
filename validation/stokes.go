package validation

import (
	"fmt"
	"math"

	"rollerbed/solver"
)

// Stokes' second problem (White, Viscous Fluid Flow; Schlichting &
// Gersten, Boundary-Layer Theory): a bed oscillating as U cos(ωt) under deep
// still fluid carries the periodic velocity
//
//	u = U exp(−ηz) cos(ωt − ηz),  η = √(ω/(2ν)),
//
// a wave damped over the penetration depth δ = 1/η. The domain is
// stokesDepth δ deep with a free-slip top; the finite depth changes the
// solution by a relative amount of order 2 exp(−ηH) (derived from the
// finite-depth solution U cosh(k(H − z))/cosh(kH), k = (1+i)η), here
// about 1e-5 U, far below the tolerance.
//
// The run starts from the exact profile at t = 0, so there is no start-up
// transient, and is compared with it over the last of stokesPeriods periods.

const (
	stokesNu     = 1e-6              // m²/s
	stokesOmega  = 2 * math.Pi / 4.0 // rad/s, a 4 s period
	stokesU      = 0.1               // m/s
	stokesDepth  = 12.0              // domain depth in penetration depths
	stokesPeriod = 2 * math.Pi / stokesOmega
	// stokesPeriods is the number of periods run; the last is compared.
	stokesPeriods = 6
)

var stokesEta = math.Sqrt(stokesOmega / (2 * stokesNu))

// stokesErrorBound is an a-priori estimate of the largest error, relative
// to U, of the second-order scheme on grid g (derived): the three-point
// operator turns the complex wavenumber k = (1+i)η of exp(−kz) into
// k(1 − (kΔz)²/24 + …), so the wave picks up the exponent error
// ∫ k³ Δz(z')²/24 dz' on its way up, of modulus (√2/12) η³ ∫₀^z Δz² dz',
// on an amplitude that has fallen to exp(−ηz). On a uniform grid its
// largest value is (√2/(12e)) (ηΔz)², at z = δ.
func stokesErrorBound(g *solver.Grid) float64 {
	worst, below := 0.0, 0.0
	for k, z := range g.Zc {
		d := g.Dz[k]
		phase := (below + d*d*d/2) * math.Sqrt2 / 12 * stokesEta * stokesEta * stokesEta
		worst = math.Max(worst, math.Exp(-stokesEta*z)*phase)
		below += d * d * d
	}
	return worst
}

func stokesExact(z, t float64) float64 {
	return stokesU * math.Exp(-stokesEta*z) * math.Cos(stokesOmega*t-stokesEta*z)
}

// stokesCluster refines the spacing at the bed four times, over two
// penetration depths.
func stokesCluster() solver.Cluster {
	return solver.Cluster{Bed: 4, BedWidth: 2 / stokesEta}
}

type stokesRun struct {
	grid  string
	nz    int
	cl    solver.Cluster
	steps int // per period
}

func stokesConfig(opt Options) []stokesRun {
	if opt.Full {
		return []stokesRun{
			{"clustered", 64, stokesCluster(), 800},
			{"clustered", 128, stokesCluster(), 800},
			{"clustered", 256, stokesCluster(), 1600},
			{"uniform", 256, solver.Cluster{}, 1600},
		}
	}
	return []stokesRun{
		{"clustered", 32, stokesCluster(), 800},
		{"clustered", 64, stokesCluster(), 800},
		{"clustered", 128, stokesCluster(), 800},
		{"uniform", 128, solver.Cluster{}, 800},
	}
}

func runStokes(opt Options) ([]Check, error) {
	runs := stokesConfig(opt)
	var checks []Check
	tables := map[string]*table{}
	summary := newTable("clustered", "nz", "steps_per_period", "max_error_over_U", "estimate_over_U", "min_dz_over_delta")
	errs := make([]float64, len(runs))
	for i, r := range runs {
		e, prof, minDz, bound, err := r.run(opt)
		if err != nil {
			return checks, err
		}
		errs[i] = e
		cl := 0.0
		if r.grid == "clustered" {
			cl = 1
		}
		summary.add(cl, float64(r.nz), float64(r.steps), e, bound, minDz*stokesEta)
		tables[fmt.Sprintf("profiles_%s_nz%d.csv", r.grid, r.nz)] = prof
		if i == 0 && !opt.Full {
			// The coarsest clustered grid only anchors the order.
			continue
		}
		checks = append(checks, AtMost(fmt.Sprintf("profile-%s-nz%d", r.grid, r.nz),
			fmt.Sprintf("max |u − U e^(−ηz) cos(ωt − ηz)| / U over z and 8 phases of period %d, %s Nz = %d, H = %g δ (tolerance: %g × the a-priori estimate)",
				stokesPeriods, r.grid, r.nz, stokesDepth, float64(tolMargin)),
			e, tolMargin*bound, srcStokes))
	}
	for i := 1; i < len(runs); i++ {
		if runs[i].grid != "clustered" {
			continue
		}
		checks = append(checks, Absolute(fmt.Sprintf("order-nz%d-nz%d", runs[i-1].nz, runs[i].nz),
			"observed order of the error under z refinement, bed-clustered grid", order(errs[i-1], errs[i], 2), 2, orderTol, srcOrder))
	}
	tables["summary.csv"] = summary
	return checks, keep(opt, "stokes-second", tables)
}

// run integrates stokesPeriods periods from the exact profile and returns
// the largest error over the last period relative to U, the profiles there
// (t, z, measured, exact), the smallest cell height and the a-priori error
// estimate of the grid.
func (r stokesRun) run(opt Options) (worst float64, out *table, minDz, bound float64, err error) {
	h := stokesDepth / stokesEta
	s, err := newSolver(opt, solver.Config{Nx: 8, Nz: r.nz, Lx: h, H: h, Cluster: r.cl, Viscosity: stokesNu,
		Bed: solver.Wall{Kind: solver.NoSlip, Amplitude: stokesU, Omega: stokesOmega},
		Top: solver.Wall{Kind: solver.FreeSlip}})
	if err != nil {
		return 0, nil, 0, 0, err
	}
	defer s.Close()
	g := s.Grid()
	worst, out, err = periodicError(s, stokesExact, stokesU, stokesPeriod, stokesPeriods, r.steps)
	if err != nil {
		return 0, nil, 0, 0, err
	}
	return worst, out, g.MinDz(), stokesErrorBound(g), nil
}
