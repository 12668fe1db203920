// Package runfolder owns the contract of a run folder, the folder that
// `rollerbed run --out DIR` writes: the name of every file in it, the
// summary (summary.json) and its types, a typed writer and reader for
// every CSV table with its column names, and the one atomic write that
// every file of the project goes through. The run writes the folder
// through this package; the report, the sweeps and the command line read
// it through it, so that a renamed key or column is a compile error, not a
// figure that silently loses a line.
//
// # Files
//
//	case.toml          CaseFile: the case text the run started from
//	run.log            LogFile
//	summary.json       SummaryFile: Summary (Write, ReadSummary, ReadEntries)
//	fields.h5          FieldsFile: grid, canopy, snapshots (package io/h5)
//	final_profile.csv  ProfileTable: the final x-mean velocity
//	profiles.csv       ProfilesTable: time-mean statistics after the spin-up
//	timeseries.csv     TimeSeriesTable: bulk velocity, pressure gradient
//	probes.csv         ProbesTable: u and w at the probes every step
//	spectrum.csv       SpectrumTable: the Welch spectrum of w at the probes
//	scalars.csv        ScalarsTable: mean scalar profiles and fluxes
//	uptake.csv         UptakeTable: element uptake by height
//	figures/           FiguresDir: the figures of package io/report
//	checkpoint-NNNNNNNNN.h5  checkpoints (IsCheckpoint)
//
// A sweep folder gathers its members' summaries in sweep.csv
// (SweepTable).
//
// # Summary
//
// Summary holds the run's numbers in SI units, each JSON key ending in its
// unit ("bulk_velocity_m_s"); metrics that do not apply to a run are null
// (nil pointers). Besides the flow metrics it holds what readers need so
// that they never parse the case again: the spin-up and the domain depth
// (RunSummary), the canopy height, its C_D a and the predicted penetration
// depth where they apply (CanopySummary), and how the spectrum was taken
// (SpectrumSummary). ReadEntries flattens the file into dotted keys for
// tables that show every key (WriteSummaryTable, Compare, sweep.csv); Unit
// reads a key's unit from its suffix.
//
// # Writing
//
// WriteFileAtomic writes a temporary file in the same folder, syncs it,
// renames it over the target and syncs the folder, so that a reader never
// sees half a file and an interrupted write leaves the previous version
// in place. Tables are written with every float64 in the shortest form that
// reads back to the same bits.
//
// ReadStatus tells from a run folder's files alone whether its run is
// finished, failed, interrupted with a checkpoint, or only started; sweeps
// use it for their members.
package runfolder
