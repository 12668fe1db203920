package casefile

import (
	"math"

	"rollerbed/io/stricttoml"
)

// Initial velocity profiles for [initial] profile.
const (
	// ProfileRest starts from u = 0.
	ProfileRest = "rest"
	// ProfileUniform starts from u = Initial.Speed everywhere.
	ProfileUniform = "uniform"
	// ProfileLaminar starts from the steady laminar profile for the forcing
	// and the bed and top conditions.
	ProfileLaminar = "laminar"
	// ProfileDragBalanced starts from the mean profile in which the
	// forcing balances canopy drag inside the canopy and the wall (log)
	// law holds above it; it is computed elsewhere (package canopy), and
	// needs a [canopy] table.
	ProfileDragBalanced = "drag-balanced"
)

// Initial is the [initial] table: the starting state.
type Initial struct {
	// Profile is ProfileRest (the default), ProfileUniform, ProfileLaminar
	// or ProfileDragBalanced (only with a canopy).
	Profile string `toml:"profile"`
	// Speed is the velocity of the uniform profile in m/s (ProfileUniform
	// only, 0 otherwise); default 0.
	Speed float64 `toml:"speed"`
	// Perturbation is the rms amplitude in m/s of the seeded random
	// velocity perturbations, >= 0; default 0 (none).
	Perturbation float64 `toml:"perturbation"`
	// PerturbationAt is the centre height of the perturbed layer in m,
	// 0 to Depth; default Depth/2.
	PerturbationAt float64 `toml:"perturbation_at"`
	// PerturbationWidth is the thickness of the perturbed layer in m, > 0;
	// default Depth.
	PerturbationWidth float64 `toml:"perturbation_width"`
	// Seed seeds the random perturbations, >= 0; default 1. The same seed
	// and case give the same numbers on the same machine.
	Seed int64 `toml:"seed"`
}

func checkInitial(c *Case, p *stricttoml.Problems) {
	in := &c.Initial
	depth := c.Domain.Depth
	depthOK := p.OK("domain.depth") && depth > 0 && !math.IsInf(depth, 0)
	if p.Parsing {
		if !p.Has("initial.profile") {
			in.Profile = ProfileRest
		}
		if !p.Has("initial.perturbation_at") {
			in.PerturbationAt = depth / 2
			p.Derive("initial.perturbation_at", "domain.depth")
		}
		if !p.Has("initial.perturbation_width") {
			in.PerturbationWidth = depth
			p.Derive("initial.perturbation_width", "domain.depth")
		}
		if !p.Has("initial.seed") {
			in.Seed = 1
		}
	}
	if p.OK("initial.profile") && p.OneOf("initial.profile", in.Profile, []string{ProfileRest, ProfileUniform, ProfileLaminar, ProfileDragBalanced}, "") {
		if in.Profile == ProfileUniform {
			if p.OK("initial.speed") {
				p.FiniteValue("initial.speed", in.Speed, "velocity of the uniform profile, m/s", "")
			}
		} else if p.OK("initial.speed") {
			p.OnlyWith("initial.speed", in.Speed != 0, stricttoml.FormatFloat(in.Speed), `initial.profile = "uniform"`)
		}
		if in.Profile == ProfileLaminar && c.Bed.Condition == FreeSlip && c.Top.Condition == FreeSlip &&
			c.Forcing.Kind != ForcingBulkVelocity && c.Forcing.PressureGradient() > 0 {
			p.Add("initial.profile", `"laminar"`, "has no steady laminar profile with free-slip at both bed and top under a constant forcing (the flow keeps accelerating); use profile = \"uniform\" or a no-slip or rough bed")
		}
		if in.Profile == ProfileDragBalanced && c.Canopy == nil && p.OK("canopy") {
			p.Add("initial.profile", `"drag-balanced"`, `needs a [canopy] table: the drag-balanced profile balances the forcing against canopy drag inside the canopy; add a [canopy] table, or start without a canopy from profile = "laminar" or "uniform"`)
		}
	}
	if p.OK("initial.perturbation") {
		p.AtLeast("initial.perturbation", in.Perturbation, 0, "rms amplitude of the random perturbations, m/s", "0 for none")
	}
	if p.OK("initial.perturbation_at") {
		if depthOK {
			p.FloatRange("initial.perturbation_at", in.PerturbationAt, 0, depth, "centre height of the perturbed layer, m, 0 to depth", "")
		} else {
			p.AtLeast("initial.perturbation_at", in.PerturbationAt, 0, "centre height of the perturbed layer, m", "")
		}
	}
	if p.OK("initial.perturbation_width") {
		p.Positive("initial.perturbation_width", in.PerturbationWidth, "thickness of the perturbed layer, m", "e.g. the domain depth")
	}
	if p.OK("initial.seed") {
		p.IntRange("initial.seed", in.Seed, 0, math.MaxInt64, "seed of the random perturbations", "e.g. seed = 1")
	}
}

func initialTemplate() string {
	return `[initial]
# Starting velocity profile u(z). Default "rest".
#   "rest"           u = 0 everywhere
#   "uniform"        u = speed everywhere
#   "laminar"        the steady laminar profile for the forcing, bed and top
#   "drag-balanced"  the mean profile in which the forcing balances canopy
#                    drag inside the canopy and the wall (log) law holds
#                    above it; only with a [canopy] table
profile = "drag-balanced"
# Velocity of the "uniform" profile, m/s. Only with profile = "uniform".
# Default 0.
# speed = 0.1
# RMS amplitude of seeded random velocity perturbations, m/s; they start the
# instabilities. Default 0 (none); >= 0.
perturbation = 0.005
# Centre height of the perturbed layer, m. Default depth/2; 0 to depth.
# Here the canopy top, where the shear layer rolls up.
perturbation_at = 0.25
# Thickness of the perturbed layer, m. Default depth; > 0.
perturbation_width = 0.1
# Seed of the random perturbations: the same seed and case give the same
# numbers on the same machine. Default 1; an integer >= 0.
seed = 1
`
}
