package report

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"rollerbed/canopy"
	"rollerbed/io/casefile"
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

// runData is what the figures of one run folder need besides its tables:
// the case (for the spin-up and the canopy), and the summary numbers.
type runData struct {
	dir     string
	label   string // short name in overlay figures
	entries []Entry
	cs      *casefile.Case // nil when case.toml is missing or unreadable
	caseErr error
}

// loadRun reads the case and the summary of a run folder; either may be
// missing without an error, which the figures that need them report.
func loadRun(dir string) (*runData, error) {
	if err := CheckRunDir(dir); err != nil {
		return nil, err
	}
	r := &runData{dir: dir, label: filepath.Base(filepath.Clean(dir))}
	if es, err := ReadSummary(dir); err == nil {
		r.entries = es
	}
	text, err := os.ReadFile(filepath.Join(dir, "case.toml"))
	if err != nil {
		r.caseErr = fmt.Errorf("%s has no readable case.toml (%v)", dir, errors.Unwrap(err))
	} else if r.cs, err = casefile.Parse(text); err != nil {
		r.cs, r.caseErr = nil, fmt.Errorf("%s/case.toml does not parse: %v", dir, err)
	}
	return r, nil
}

// value returns a numeric summary entry, or NaN when absent or null.
func (r *runData) value(key string) float64 {
	for _, e := range r.entries {
		if e.Key == key {
			if v, ok := e.Number(); ok {
				return v
			}
		}
	}
	return math.NaN()
}

// text returns a string summary entry, or "".
func (r *runData) text(key string) string {
	for _, e := range r.entries {
		if e.Key == key {
			if s, ok := e.Value.(string); ok {
				return s
			}
		}
	}
	return ""
}

// title names the run in figure titles: its case title, or the folder;
// shortened to maxTitle characters.
func (r *runData) title() string {
	t := r.text("run.title")
	if t == "" && r.cs != nil {
		t = r.cs.Title
	}
	if t = oneLine(t); t == "" {
		t = r.label
	}
	if rs := []rune(t); len(rs) > maxTitle {
		t = string(rs[:maxTitle-1]) + "…"
	}
	return t
}

// maxTitle is the longest run title in a figure title, in characters.
const maxTitle = 60

// spinUp returns time.spin_up of the case, 0 when the case is unreadable.
func (r *runData) spinUp() float64 {
	if r.cs == nil {
		return 0
	}
	return r.cs.Time.SpinUp
}

// depth returns the domain depth H in m, NaN when unknown.
func (r *runData) depth() float64 {
	if r.cs == nil {
		return math.NaN()
	}
	return r.cs.Domain.Depth
}

// canopyHeight returns the canopy height h in m from the summary, else from
// a block canopy of the case; NaN without a canopy.
func (r *runData) canopyHeight() float64 {
	if h := r.value("flow.canopy_height_m"); !math.IsNaN(h) {
		return h
	}
	if r.cs != nil && r.cs.Canopy != nil && r.cs.Canopy.Height > 0 {
		return r.cs.Canopy.Height
	}
	return math.NaN()
}

// dragDensity returns C_D a (1/m) of a uniform block canopy with a fixed
// drag coefficient, or NaN and why it does not apply.
func (r *runData) dragDensity() (float64, string) {
	switch {
	case r.cs == nil:
		return math.NaN(), "no readable case.toml"
	case r.cs.Canopy == nil:
		return math.NaN(), "no canopy"
	case r.cs.Canopy.FrontalArea <= 0:
		return math.NaN(), "the canopy is a profile, not a uniform block, so C_D a varies with height"
	case r.cs.Canopy.DragLaw != casefile.DragFixed:
		return math.NaN(), fmt.Sprintf("canopy.drag_law = %q has no fixed C_D", r.cs.Canopy.DragLaw)
	}
	return r.cs.Canopy.DragCoefficient * r.cs.Canopy.FrontalArea, ""
}

// probeSpectrum is the spectrum of w at the probes of a run.
type probeSpectrum struct {
	canopy.Spectrum
	peak    float64 // Hz
	probes  int
	samples int     // resampled samples per probe after the spin-up
	segment int     // samples per Welch segment
	dt      float64 // s, resampled interval
	z       float64 // m, probe height (NaN when the header does not say)
}

// minSpectrumSamples is the shortest series after the spin-up that gets a
// spectrum, as for the roller frequency of summary.json.
const minSpectrumSamples = 64

// spectrumOf reads probes.csv of a run folder and returns the Welch
// spectrum of w after the spin-up. The series are resampled onto even times
// and cut into segments exactly as the run's own summary does, so the peak
// is flow.roller_frequency_hz.
func spectrumOf(dir string, spinUp float64) (probeSpectrum, error) {
	path := filepath.Join(dir, "probes.csv")
	if _, err := os.Stat(path); errors.Is(err, os.ErrNotExist) {
		return probeSpectrum{}, skipf("%s has no probes.csv (written when the run stops)", dir)
	}
	tab, err := ReadCSV(path)
	if err != nil {
		return probeSpectrum{}, err
	}
	T, err := tab.Column("t")
	if err != nil {
		return probeSpectrum{}, fmt.Errorf("%s: %v", path, err)
	}
	var ws [][]float64
	z := math.NaN()
	for i, h := range tab.Header {
		name := ColumnName(h)
		if !strings.HasPrefix(name, "w_") {
			continue
		}
		ws = append(ws, tab.Columns[i])
		if k := strings.Index(name, "z="); k >= 0 {
			s := name[k+2:]
			if e := strings.IndexAny(s, " )"); e >= 0 {
				s = s[:e]
			}
			if v, err := strconv.ParseFloat(s, 64); err == nil {
				z = v
			}
		}
	}
	if len(ws) == 0 {
		return probeSpectrum{}, fmt.Errorf("%s has no w_N columns of vertical velocity", path)
	}
	k0 := sort.SearchFloat64s(T, spinUp)
	n := len(T) - k0
	if n < minSpectrumSamples {
		return probeSpectrum{}, skipf("probes.csv holds %d samples after the spin-up of %g s; a spectrum needs at least %d: run longer", max(n, 0), spinUp, minSpectrumSamples)
	}
	t0, t1 := T[k0], T[len(T)-1]
	dt := (t1 - t0) / float64(n-1)
	if !(dt > 0) {
		return probeSpectrum{}, fmt.Errorf("%s: the times after the spin-up do not increase", path)
	}
	series := make([][]float64, len(ws))
	for p, v := range ws {
		series[p] = resampleEven(T, v, k0, n, dt)
	}
	seg := 1
	for seg*2 <= n/4 {
		seg *= 2
	}
	seg = max(seg, minSpectrumSamples)
	sp, err := canopy.WelchSpectrum(series, dt, seg)
	if err != nil {
		return probeSpectrum{}, skipf("no spectrum: %v", err)
	}
	return probeSpectrum{Spectrum: sp, peak: sp.Peak(), probes: len(ws), samples: n, segment: seg, dt: dt, z: z}, nil
}

// resampleEven interpolates v(T) linearly onto n even times from T[k0] in
// steps of dt (the resampling of the run's own probe analysis).
func resampleEven(T, v []float64, k0, n int, dt float64) []float64 {
	out := make([]float64, n)
	t0 := T[k0]
	j := k0
	for i := range out {
		t := t0 + float64(i)*dt
		for j < len(T)-2 && T[j+1] < t {
			j++
		}
		a := (t - T[j]) / (T[j+1] - T[j])
		out[i] = v[j] + a*(v[j+1]-v[j])
	}
	return out
}

// readTable reads a CSV table of a run folder; a missing file is a skip
// with the given reason.
func readTable(dir, name, why string) (Table, error) {
	path := filepath.Join(dir, name)
	if _, err := os.Stat(path); errors.Is(err, os.ErrNotExist) {
		return Table{}, skipf("%s has no %s (%s)", dir, name, why)
	}
	return ReadCSV(path)
}

// columns picks named columns of a table, naming the file on failure.
func columns(t Table, file string, names ...string) ([][]float64, error) {
	out := make([][]float64, len(names))
	for i, n := range names {
		c, err := t.Column(n)
		if err != nil {
			return nil, fmt.Errorf("%s: %v", file, err)
		}
		out[i] = c
	}
	return out, nil
}
