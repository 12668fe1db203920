package runfolder

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
)

// The files and folders of a run folder, by name. The names are part of
// the folder's contract: scripts, sweeps and the report find the files by
// them.
const (
	// CaseFile is the case text the run was started from, as written.
	CaseFile = "case.toml"
	// StartedCaseFile is where a refused resume puts the case the run
	// started with when case.toml was edited since.
	StartedCaseFile = "case-started.toml"
	// SummaryFile holds the Summary as JSON.
	SummaryFile = "summary.json"
	// LogFile is the run's log, a line per event.
	LogFile = "run.log"
	// FieldsFile holds the grid, the canopy and the snapshots (HDF5).
	FieldsFile = "fields.h5"
	// ProfileFile is the final x-mean velocity profile (ProfileTable).
	ProfileFile = "final_profile.csv"
	// ProfilesFile holds the time-mean statistics (ProfilesTable).
	ProfilesFile = "profiles.csv"
	// TimeSeriesFile holds the bulk velocity and the pressure gradient
	// against time (TimeSeriesTable).
	TimeSeriesFile = "timeseries.csv"
	// ProbesFile holds u and w at the probes (ProbesTable).
	ProbesFile = "probes.csv"
	// SpectrumFile holds the Welch spectrum of w at the probes after the
	// spin-up (SpectrumTable).
	SpectrumFile = "spectrum.csv"
	// ScalarsFile holds the scalars' mean profiles and fluxes
	// (ScalarsTable).
	ScalarsFile = "scalars.csv"
	// UptakeFile holds the element uptake by height (UptakeTable).
	UptakeFile = "uptake.csv"
	// ReportFile is the one-file report of a run (or of a comparison, in
	// its output folder): HTML with the figures embedded, readable without
	// a server.
	ReportFile = "report.html"
	// FiguresDir is the folder of the figures.
	FiguresDir = "figures"
	// CheckpointPrefix and CheckpointSuffix frame the names of the
	// checkpoints, checkpoint-NNNNNNNNN.h5 with the step number.
	CheckpointPrefix = "checkpoint-"
	CheckpointSuffix = ".h5"
)

// SweepTableFile is the table of a sweep folder that gathers its members'
// summaries (SweepTable).
const SweepTableFile = "sweep.csv"

// LockFile is the file of a run or sweep folder that one process at a time
// holds locked while it writes the folder (Lock); it names the holder.
const LockFile = ".rollerbed.lock"

// markers are files that every run folder holds from its first moments.
var markers = []string{CaseFile, LogFile, SummaryFile}

// IsCheckpoint tells whether a file name is a checkpoint's.
func IsCheckpoint(name string) bool {
	return strings.HasPrefix(name, CheckpointPrefix) && strings.HasSuffix(name, CheckpointSuffix)
}

// Check returns an error unless dir is a folder that a run wrote: it must
// hold at least one of case.toml, run.log and summary.json.
func Check(dir string) error {
	st, err := os.Stat(dir)
	if err != nil {
		return fmt.Errorf("runfolder: run folder %s: %w; give the folder that `rollerbed run --out DIR` wrote", dir, errors.Unwrap(err))
	}
	if !st.IsDir() {
		return fmt.Errorf("runfolder: %s is a file, not a run folder; give the folder that `rollerbed run --out DIR` wrote", dir)
	}
	for _, m := range markers {
		if _, err := os.Stat(filepath.Join(dir, m)); err == nil {
			return nil
		}
	}
	return fmt.Errorf("runfolder: %s is not a run folder: it holds none of %s; give the folder that `rollerbed run --out DIR` wrote", dir, strings.Join(markers, ", "))
}
