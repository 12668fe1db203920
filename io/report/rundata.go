package report

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"

	"rollerbed/io/runfolder"
)

// skipError marks a figure left out because the run folder lacks its data;
// it becomes a Note, not an error.
type skipError struct{ reason string }

func (e *skipError) Error() string { return e.reason }

func skipf(format string, a ...any) error { return &skipError{fmt.Sprintf(format, a...)} }

// isSkip tells a missing-data skip from a real failure.
func isSkip(err error) bool {
	var s *skipError
	return errors.As(err, &s)
}

// runData is what the figures of one run folder need besides its tables
// and fields: the summary.
type runData struct {
	dir   string
	label string             // short name in overlay figures
	sum   *runfolder.Summary // nil when summary.json is missing or unreadable
}

// loadRun reads the summary of a run folder; it may be missing without an
// error, which the figures that need it report.
func loadRun(dir string) (*runData, error) {
	if err := runfolder.Check(dir); err != nil {
		return nil, err
	}
	r := &runData{dir: dir, label: filepath.Base(filepath.Clean(dir))}
	if s, err := runfolder.ReadSummary(dir); err == nil {
		r.sum = s
	}
	return r, nil
}

// title names the run in figure titles: its title, or the folder;
// shortened to maxTitle characters.
func (r *runData) title() string {
	t := ""
	if r.sum != nil {
		t = r.sum.Run.Title
	}
	if t = strings.Join(strings.Fields(t), " "); t == "" {
		t = r.label
	}
	if rs := []rune(t); len(rs) > maxTitle {
		t = string(rs[:maxTitle-1]) + "…"
	}
	return t
}

// maxTitle is the longest run title in a figure title, in characters.
const maxTitle = 60

// spinUp returns the spin-up time in s, 0 when unknown.
func (r *runData) spinUp() float64 {
	if r.sum == nil {
		return 0
	}
	return r.sum.Run.SpinUp
}

// depth returns the domain depth H in m, NaN when unknown.
func (r *runData) depth() float64 {
	if r.sum == nil || !(r.sum.Run.Depth > 0) {
		return math.NaN()
	}
	return r.sum.Run.Depth
}

// statsTime returns the time over which statistics were gathered in s,
// NaN when unknown.
func (r *runData) statsTime() float64 {
	if r.sum == nil {
		return math.NaN()
	}
	return r.sum.Run.StatsTime
}

// penetrationDepth returns the measured δe in m, NaN when unknown.
func (r *runData) penetrationDepth() float64 {
	if r.sum == nil {
		return math.NaN()
	}
	return runfolder.Value(r.sum.Flow.PenetrationDepth)
}

// canopyHeight returns the canopy height h in m from the flow metrics,
// else from the canopy's description; NaN without a canopy.
func (r *runData) canopyHeight() float64 {
	if r.sum == nil {
		return math.NaN()
	}
	if h := r.sum.Flow.CanopyHeight; h != nil {
		return *h
	}
	if c := r.sum.Canopy; c != nil && c.Height > 0 {
		return c.Height
	}
	return math.NaN()
}

// predictedPenetration returns the predicted δe = 0.23/(C_D a) in m, or
// NaN and why it does not apply.
func (r *runData) predictedPenetration() (float64, string) {
	switch {
	case r.sum == nil:
		return math.NaN(), "no readable " + runfolder.SummaryFile
	case r.sum.Canopy == nil:
		return math.NaN(), "no canopy"
	case r.sum.Canopy.PredictedPenetrationDepth == nil:
		return math.NaN(), r.sum.Canopy.DragDensityNote
	}
	return *r.sum.Canopy.PredictedPenetrationDepth, ""
}

// probeSpectrum is the spectrum of w at the probes of a run.
type probeSpectrum struct {
	freq, psd []float64
	peak      float64 // Hz, 0 for none
	probes    int
	segment   int     // samples per Welch segment
	dt        float64 // s, resampled interval
	z         float64 // m, probe height
}

// spectrumOf reads the spectrum of w that the run wrote, with how it was
// taken from the summary.
func spectrumOf(r *runData) (probeSpectrum, error) {
	if err := present(r.dir, runfolder.SpectrumFile, "written when the probes hold enough samples after the spin-up: run longer"); err != nil {
		return probeSpectrum{}, err
	}
	if r.sum == nil || r.sum.Spectrum == nil {
		return probeSpectrum{}, skipf("%s has %s but no readable %s that says how it was taken", r.dir, runfolder.SpectrumFile, runfolder.SummaryFile)
	}
	t, err := runfolder.ReadSpectrum(r.dir)
	if err != nil {
		return probeSpectrum{}, err
	}
	info := r.sum.Spectrum
	peak := 0.0
	if info.Peak != nil {
		peak = *info.Peak
	}
	return probeSpectrum{freq: t.Freq, psd: t.PSD, peak: peak, probes: info.Probes, segment: info.Segment, dt: info.Interval, z: info.ProbeHeight}, nil
}

// present returns a skip with the given reason when run folder dir lacks
// the file name.
func present(dir, name, why string) error {
	if _, err := os.Stat(filepath.Join(dir, name)); errors.Is(err, os.ErrNotExist) {
		return skipf("%s has no %s (%s)", dir, name, why)
	}
	return nil
}
