package validation

import (
	"fmt"
	"math"
	"math/cmplx"

	"rollerbed/solver"
)

// Laminar oscillatory flow in a plane channel, the plane-channel analogue of
// Womersley's pipe solution (Womersley 1955, J. Physiol. 127:553, pipe form;
// the plane form is derived here). Between no-slip walls at z = 0 and z = H
// a pressure gradient Π = A cos(ωt) drives the periodic flow
//
//	u = Re{ (A/(iω)) [1 − cosh(λ(z − H/2))/cosh(λH/2)] e^(iωt) },  λ = (1+i)√(ω/(2ν)),
//
// from ∂u/∂t = Π + ν ∂²u/∂z² with u = 0 at both walls. The Womersley
// number α = (H/2)√(ω/ν) sets the shape: a plug core lagging the gradient by
// a quarter period, with Stokes layers and overshoots at the walls when α
// is large. The same profile, scaled so that its depth mean is U_b cos(ωt),
// is the flow under a tidal bulk-velocity target: the depth mean of the
// bracket is 1 − tanh(λH/2)/(λH/2).
//
// The runs start from the exact profile at t = 0 (no start-up transient)
// and are compared with it over the last of womersleyPeriods periods.

const (
	womersleyNu    = 1e-6 // m²/s
	womersleyH     = 0.01 // m
	womersleyAlpha = 4.0  // Womersley number (H/2)√(ω/ν)
	womersleyA     = 1e-3 // m/s², amplitude of Π
	womersleyUb    = 0.02 // m/s, amplitude of the tidal bulk target
	// womersleyPeriods is the number of periods run; the last is compared.
	womersleyPeriods = 2
)

var womersleyOmega = womersleyAlpha * womersleyAlpha * womersleyNu / (womersleyH * womersleyH / 4)

func womersleyPeriod() float64 { return 2 * math.Pi / womersleyOmega }

// womersleyShape returns the complex profile 1 − cosh(λ(z − H/2))/cosh(λH/2).
func womersleyShape(z float64) complex128 {
	lam := complex(1, 1) * complex(math.Sqrt(womersleyOmega/(2*womersleyNu)), 0)
	return 1 - cmplx.Cosh(lam*complex(z-womersleyH/2, 0))/cmplx.Cosh(lam*complex(womersleyH/2, 0))
}

// womersleyShapeMean returns the depth mean of womersleyShape,
// 1 − tanh(λH/2)/(λH/2).
func womersleyShapeMean() complex128 {
	lam := complex(1, 1) * complex(math.Sqrt(womersleyOmega/(2*womersleyNu)), 0)
	x := lam * complex(womersleyH/2, 0)
	return 1 - cmplx.Tanh(x)/x
}

// womersleyGradient is the exact profile under Π = A cos(ωt).
func womersleyGradient(z, t float64) float64 {
	amp := complex(womersleyA, 0) / complex(0, womersleyOmega)
	return real(amp * womersleyShape(z) * cmplx.Exp(complex(0, womersleyOmega*t)))
}

// womersleyTide is the exact profile whose depth mean is U_b cos(ωt).
func womersleyTide(z, t float64) float64 {
	amp := complex(womersleyUb, 0) / womersleyShapeMean()
	return real(amp * womersleyShape(z) * cmplx.Exp(complex(0, womersleyOmega*t)))
}

// womersleyErrorBound is an a-priori estimate of the largest error, relative
// to the velocity scale, of the three-point operator on a uniform grid of
// spacing dz (derived): its truncation error ν Δz²/12 ∂⁴u/∂z⁴ is at most
// (Δz²/12)(ω/ν) ω |Û| with |Û| at most the core amplitude times
// |cosh(λ(z − H/2))/cosh(λH/2)| ≤ 1 (reached at the walls), and the
// operator iω − ν ∂²/∂z² divides it by at least ω.
func womersleyErrorBound(dz float64) float64 {
	return dz * dz * womersleyOmega / (12 * womersleyNu)
}

type womersleyRun struct {
	forcing string // "gradient" or "tide"
	nz      int
	steps   int // per period
}

func womersleyConfig(opt Options) []womersleyRun {
	nzs := []int{16, 32, 64}
	if opt.Full {
		nzs = []int{32, 64, 128}
	}
	var runs []womersleyRun
	for _, f := range []string{"gradient", "tide"} {
		for _, nz := range nzs {
			runs = append(runs, womersleyRun{f, nz, 1000})
		}
	}
	return runs
}

func runWomersley(opt Options) ([]Check, error) {
	runs := womersleyConfig(opt)
	var checks []Check
	tables := map[string]*table{}
	summary := newTable("tide", "nz", "steps_per_period", "max_error_over_U", "estimate_over_U")
	errs := make([]float64, len(runs))
	for i, r := range runs {
		e, prof, err := r.run(opt)
		if err != nil {
			return checks, err
		}
		errs[i] = e
		bound := womersleyErrorBound(womersleyH / float64(r.nz))
		tide := 0.0
		if r.forcing == "tide" {
			tide = 1
		}
		summary.add(tide, float64(r.nz), float64(r.steps), e, bound)
		tables[fmt.Sprintf("profiles_%s_nz%d.csv", r.forcing, r.nz)] = prof
		checks = append(checks, AtMost(fmt.Sprintf("profile-%s-nz%d", r.forcing, r.nz),
			fmt.Sprintf("max |u − u_exact| / U over z and 8 phases of period %d, %s forcing, Womersley number %g, uniform Nz = %d (tolerance: %g × the a-priori estimate)",
				womersleyPeriods, r.forcing, womersleyAlpha, r.nz, float64(tolMargin)),
			e, tolMargin*bound, srcWomersley))
		if i > 0 && runs[i-1].forcing == r.forcing {
			checks = append(checks, Absolute(fmt.Sprintf("order-%s-nz%d-nz%d", r.forcing, runs[i-1].nz, r.nz),
				"observed order of the error under z refinement, "+r.forcing+" forcing", order(errs[i-1], e, 2), 2, orderTol, srcOrder))
		}
	}
	tables["summary.csv"] = summary
	return checks, keep(opt, "womersley-channel", tables)
}

// run integrates womersleyPeriods periods from the exact profile and returns
// the largest error over the last period relative to the velocity scale
// (A/ω for the gradient forcing, U_b for the tide) and the profiles there
// (t, z, measured, exact).
func (r womersleyRun) run(opt Options) (worst float64, out *table, err error) {
	cfg := solver.Config{Nx: 8, Nz: r.nz, Lx: womersleyH, H: womersleyH, Viscosity: womersleyNu,
		Bed: solver.Wall{Kind: solver.NoSlip}, Top: solver.Wall{Kind: solver.NoSlip}}
	exact, scale := womersleyGradient, womersleyA/womersleyOmega
	if r.forcing == "tide" {
		exact, scale = womersleyTide, womersleyUb
		cfg.Forcing = solver.Forcing{Kind: solver.FixedBulk,
			Tides: []solver.Oscillation{{Amplitude: womersleyUb, Period: womersleyPeriod()}}}
	} else {
		cfg.Forcing = solver.Forcing{Kind: solver.FixedGradient,
			Waves: []solver.Oscillation{{Amplitude: womersleyA, Period: womersleyPeriod()}}}
	}
	s, err := newSolver(opt, cfg)
	if err != nil {
		return 0, nil, err
	}
	defer s.Close()
	return periodicError(s, exact, scale, womersleyPeriod(), womersleyPeriods, r.steps)
}
