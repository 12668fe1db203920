// Package runs turns checked case files into runs and drives them: it holds
// the project's example cases, makes a solver from a case, steps it to the
// end while reporting progress, and writes the run folder.
//
// # Cases to spec
//
// FromCase (fromcase.go) maps a parsed and validated case
// (io/casefile) onto a Spec (spec.go): the solver.Config, the canopy
// (package canopy), the initial state, the duration and the output
// cadences. Warnings (warnings.go) lists what in a valid spec is likely to
// spoil the results (too few cells across the shear layer, too short a
// domain for the rollers, element Reynolds numbers outside an uptake
// correlation's range), and EstimateRun (estimate.go) the numbers
// `rollerbed check` prints: spacings, step, run time, memory and output
// size.
//
// # Spec to solver
//
// NewSolver (solver.go) builds the solver of a spec: it describes the
// solver's grid to package canopy as a canopy.Mesh, puts the canopy's drag
// (quadratic or linear) and surface area on it, and sets the initial
// profile and the seeded perturbations.
//
// # The run driver
//
// Run (run.go) prepares the run folder (PrepareDir), writes the case text
// beside the results, steps the solver with the adaptive step, gathers the
// running statistics after the spin-up, writes snapshots to fields.h5
// (io/h5) and the run log (log.go), and stops cleanly on cancellation or a
// blow-up. Checkpoints (checkpoint.go) hold the whole state of a run, the
// statistics and series so far included, so that Options.Resume continues
// to the numbers an uninterrupted run gives.
//
// # Outputs
//
// At its end, whether it finished, was interrupted or blew up, a run writes
// its tables (mean profiles, time series, probes, the spectrum of w at the
// probes, scalar profiles and uptake) and summary.json (Summary: the run,
// the flow metrics, each scalar's uptake, the canopy's C_D a and predicted
// penetration depth) through package io/runfolder, which owns the folder's
// names and formats (output.go). The figures are drawn afterwards from the
// run folder (package io/report, `rollerbed report`).
//
// # Waves, tides and bending blades
//
// A forcing with waves or tides (waves.go) gathers statistics by phase of
// its cycle (package solver/stats, Phases) into phase_profiles.csv and
// phase_cycle.csv and the summary's phases object: the in-canopy to
// above-canopy velocity ratio per phase and of the oscillation, the uptake
// by phase. Flexible blades bend after every step and at every start or
// resume (canopy.Bending rewrites the solver's drag array in place, from
// the velocity alone, so a resumed run bends as the uninterrupted one
// did); their mean bent height goes into the time series and by phase
// into phase_cycle.csv, and the summary's canopy.flexible object says how
// far they bent.
//
// # Examples and bench
//
// The example cases and sweeps (examples.go, the examples folder) are
// embedded in the binary, so the demo, `rollerbed init` and
// `rollerbed sweep example` need no files on disk; a golden test runs each
// example case and compares every output with runs/testdata/golden. Bench
// (bench.go) times the solver against the transforms it cannot avoid, for
// `rollerbed bench`. Version (version.go) is the program version written
// into every run folder; Provenance (version.go) adds the build's revision,
// the Go, HDF5 and FFTW versions, the host and the command line, which
// fields.h5 (root attributes) and summary.json (its provenance object)
// record and `rollerbed version` prints.
package runs
