package runs

import (
	"time"

	"rollerbed/canopy"
	"rollerbed/solver"
)

// Spec is a run, ready to start: what the case file says, in the solver's
// terms.
type Spec struct {
	Title    string
	CaseText string // the case file as written, kept for provenance
	Solver   solver.Config
	// Canopy is the canopy geometry and drag law; nil for none. Its drag
	// is put on the solver's grid by NewSolver.
	Canopy *canopy.Canopy
	// ElementUptake says, per scalar of Solver.Scalars, whether the canopy
	// elements take it up; NewSolver then puts the canopy's surface area
	// on the grid for it.
	ElementUptake []bool
	// Transfer holds, per scalar, the element transfer law (for the
	// boundary-layer share in the summary).
	Transfer []canopy.ElementTransfer
	Initial  Initial
	Duration float64 // s of simulated time
	// FixedStep, when > 0, replaces the adaptive step (s).
	FixedStep float64
	// SpinUp is the time (s) after which statistics are gathered.
	SpinUp float64
	Output Output
	// FluidDensity is the fluid density in kg/m³, which flexible blades
	// need (Canopy.Flexible); 0 when not given.
	FluidDensity float64
}

// Initial is the initial state: a mean profile plus seeded perturbations.
type Initial struct {
	Profile      string  // "rest", "uniform", "laminar" or "drag-balanced"
	Speed        float64 // m/s, for "uniform"
	Perturbation float64 // m/s, largest rms of u′ over x at any level
	At, Width    float64 // m, centre height and Gaussian half-width of the perturbed layer
	Seed         uint64
}

// Output says what a run writes and how often. Cadences are in simulated
// seconds; zero turns a kind of output off (the final files are always
// written).
type Output struct {
	ProfileEvery  float64  // rows of the time series
	SnapshotEvery float64  // snapshots in fields.h5
	Fields        []string // snapshot fields, from SnapshotFields
	Compress      int      // deflate level of fields.h5, 0 = none
	// CheckpointEvery (simulated s) and CheckpointWall (wall clock) set
	// the checkpoint cadence; whichever comes first writes one.
	CheckpointEvery float64
	CheckpointWall  time.Duration
	// Probes is the number of probes along the canopy top (or mid-depth
	// without a canopy), evenly spaced in x.
	Probes int
	// PhaseBins is the number of bins of the forcing cycle for the
	// statistics by phase; 0 for none (a steady forcing).
	PhaseBins int
}

// SnapshotFields lists the fields a snapshot may hold, with their units.
var SnapshotFields = map[string]string{
	"u":         "m/s",
	"w":         "m/s",
	"p":         "m2/s2",
	"vorticity": "1/s",
	"nu_t":      "m2/s",
}
