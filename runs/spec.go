package runs

import (
	"rollerbed/solver"
)

// Version is the program version written into every run folder.
const Version = "0.1.0"

// Spec is a run, ready to start: what the case file says, in the solver's
// terms.
type Spec struct {
	Title    string
	CaseText string // the case file as written, kept for provenance
	Solver   solver.Config
	Initial  Initial
	Duration float64 // s of simulated time
	// FixedStep, when > 0, replaces the adaptive step (s).
	FixedStep float64
	// ProfileEvery is the simulated time between rows of the time series (s).
	ProfileEvery float64
}

// Initial is the initial state: a mean profile plus seeded perturbations.
type Initial struct {
	Profile      string  // "rest", "uniform" or "laminar"
	Speed        float64 // m/s, for "uniform"
	Perturbation float64 // m/s, largest rms of u′ over x at any level
	At, Width    float64 // m, centre height and Gaussian half-width of the perturbed layer
	Seed         uint64
}
