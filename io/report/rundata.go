package report

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"rollerbed/io/casefile"
	"rollerbed/io/runfolder"
	"rollerbed/solver/stats"
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
	// caseSpinUp is time.spin_up of the case kept in the folder, 0 when
	// it is unreadable.
	caseSpinUp float64
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
	if text, err := os.ReadFile(filepath.Join(dir, runfolder.CaseFile)); err == nil {
		if cs, err := casefile.Parse(text); err == nil {
			r.caseSpinUp = cs.Time.SpinUp
		}
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
	return r.caseSpinUp
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

// minSpectrumSamples is the shortest series after the spin-up that gets a
// spectrum, as for the roller frequency of summary.json.
const minSpectrumSamples = stats.MinSpectrumSamples

// spectrumOf reads probes.csv of a run folder and returns the Welch
// spectrum of w after the spin-up. The series are resampled onto even times
// and cut into segments exactly as the run's own summary does, so the peak
// is flow.roller_frequency_hz.
func spectrumOf(r *runData) (probeSpectrum, error) {
	spinUp := r.spinUp()
	if err := present(r.dir, runfolder.ProbesFile, "written when the run stops"); err != nil {
		return probeSpectrum{}, err
	}
	t, err := runfolder.ReadProbes(r.dir)
	if err != nil {
		return probeSpectrum{}, err
	}
	if len(t.Probes) == 0 {
		return probeSpectrum{}, fmt.Errorf("%s has no w_N columns of vertical velocity", filepath.Join(r.dir, runfolder.ProbesFile))
	}
	ws := make([][]float64, len(t.Probes))
	for i, p := range t.Probes {
		ws[i] = p.W
	}
	series, dt := stats.EvenSeries(t.T, ws, spinUp)
	n := 0
	if series != nil {
		n = len(series[0])
	}
	if n < minSpectrumSamples {
		k0 := sort.SearchFloat64s(t.T, spinUp)
		return probeSpectrum{}, skipf("%s holds %d samples after the spin-up of %g s; a spectrum needs at least %d: run longer", runfolder.ProbesFile, max(len(t.T)-k0, 0), spinUp, minSpectrumSamples)
	}
	if !(dt > 0) {
		return probeSpectrum{}, fmt.Errorf("%s: the times after the spin-up do not increase", filepath.Join(r.dir, runfolder.ProbesFile))
	}
	seg := stats.WelchSegment(n)
	sp, err := stats.WelchSpectrum(series, dt, seg)
	if err != nil {
		return probeSpectrum{}, skipf("no spectrum: %v", err)
	}
	z := t.Probes[len(t.Probes)-1].Z
	return probeSpectrum{freq: sp.Freq, psd: sp.PSD, peak: sp.Peak(), probes: len(ws), segment: seg, dt: dt, z: z}, nil
}

// present returns a skip with the given reason when run folder dir lacks
// the file name.
func present(dir, name, why string) error {
	if _, err := os.Stat(filepath.Join(dir, name)); errors.Is(err, os.ErrNotExist) {
		return skipf("%s has no %s (%s)", dir, name, why)
	}
	return nil
}
