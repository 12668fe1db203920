package report_test

import (
	"context"
	"encoding/json"
	"fmt"
	"image/gif"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"rollerbed/io/runfolder"
	"slices"
	"strings"
	"sync"
	"testing"

	"rollerbed/io/casefile"
	"rollerbed/io/report"
	"rollerbed/runs"
)

// figureCase is a small canopy run of a few hundred steps (a copy of the
// small case of the runs tests) with a snapshot every 0.5 s, so that the
// animation has frames after the spin-up. SEED is replaced.
const figureCase = `
title = "report test: small canopy"
[domain]
length = 0.4
depth = 0.2
nx = 32
nz = 24
[fluid]
viscosity = 1.0e-5
[bed]
condition = "no-slip"
[top]
condition = "free-slip"
[canopy]
height = 0.08
frontal_area = 15.0
diameter = 0.004
drag_coefficient = 1.0
[forcing]
bulk_velocity = 0.05
[initial]
profile = "drag-balanced"
perturbation = 0.002
perturbation_at = 0.08
perturbation_width = 0.03
seed = SEED
[[scalar]]
name = "oxygen"
diffusivity = 1.76e-9
initial = 0.25
uptake = "hilpert"
capacity = 2.0e-5
[time]
duration = 4.0
spin_up = 1.0
[output]
profile_every = 0.25
snapshot_every = 0.5
checkpoint_every = 2.0
probes = 4
[numerics]
workers = 1
`

// runCase runs figureCase with the given seed into dir, or with the case
// text changed by edit first.
func runCase(dir string, seed int, edit func(string) string, ctx context.Context) error {
	text := strings.Replace(figureCase, "SEED", fmt.Sprint(seed), 1)
	if edit != nil {
		text = edit(text)
	}
	c, err := casefile.Parse([]byte(text))
	if err != nil {
		return err
	}
	sp, err := runs.FromCase(c, "")
	if err != nil {
		return err
	}
	_, err = runs.Run(ctx, sp, runs.Options{Dir: dir})
	return err
}

var (
	shared     string // a folder holding run folders "seed3" and "seed5"
	sharedOnce sync.Once
	sharedErr  error
)

// sharedRuns returns two finished run folders of figureCase, seeds 3 and
// 5, made once for all the tests of the package. Tests must not change
// them, except for their figures folders.
func sharedRuns(t *testing.T) (a, b string) {
	t.Helper()
	sharedOnce.Do(func() {
		if shared, sharedErr = os.MkdirTemp("", "report-test-"); sharedErr != nil {
			return
		}
		for _, seed := range []int{3, 5} {
			if sharedErr = runCase(filepath.Join(shared, fmt.Sprint("seed", seed)), seed, nil, context.Background()); sharedErr != nil {
				return
			}
		}
	})
	if sharedErr != nil {
		t.Fatalf("making the test runs: %v", sharedErr)
	}
	return filepath.Join(shared, "seed3"), filepath.Join(shared, "seed5")
}

func TestMain(m *testing.M) {
	code := m.Run()
	if shared != "" {
		os.RemoveAll(shared)
	}
	os.Exit(code)
}

// pngSize decodes a PNG file and returns its size.
func pngSize(t *testing.T, path string) (w, h int) {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatalf("%s does not decode as PNG: %v", path, err)
	}
	return img.Bounds().Dx(), img.Bounds().Dy()
}

func TestFiguresOfAFinishedRun(t *testing.T) {
	dir, _ := sharedRuns(t)
	paths, notes, err := report.WriteFigures(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(notes) != 0 {
		t.Errorf("notes on a complete run folder: %v", notes)
	}
	var names []string
	for _, p := range paths {
		if filepath.Dir(p) != filepath.Join(dir, runfolder.FiguresDir) {
			t.Errorf("%s is not in the figures folder", p)
		}
		names = append(names, filepath.Base(p))
	}
	want := []string{"vorticity.png", "profiles.png", "spectrum.png", "timeseries.png", "uptake.png", "scalars.png", "rollers.gif"}
	if !slices.Equal(names, want) {
		t.Fatalf("figures %v, want %v", names, want)
	}
	vw, vh, err := report.VorticityFigureSize(dir)
	if err != nil {
		t.Fatal(err)
	}
	// The slice is 0.4 m × 0.2 m: drawn at its true aspect ratio, the
	// map is about half as high as wide, plus the title and the x axis.
	if vw != report.FigureWidth || vh < report.FigureWidth/3 || vh > report.FigureWidth*2/3 {
		t.Errorf("vorticity.png should be %d × %d, outside the range for a 2:1 slice", vw, vh)
	}
	for _, p := range paths[:6] {
		w, h := pngSize(t, p)
		wantW, wantH := report.FigureWidth, report.FigureHeight
		if filepath.Base(p) == "vorticity.png" {
			wantH = vh
		}
		if w != wantW || h != wantH {
			t.Errorf("%s is %d × %d, want %d × %d", filepath.Base(p), w, h, wantW, wantH)
		}
	}
	f, err := os.Open(paths[6])
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	anim, err := gif.DecodeAll(f)
	if err != nil {
		t.Fatalf("rollers.gif does not decode: %v", err)
	}
	// Snapshots every 0.5 s from 0 to 4 s make the frames, from the
	// first, so that the roll-up during the spin-up shows.
	if len(anim.Image) != 9 {
		t.Errorf("rollers.gif has %d frames, want 9 (t = 0, 0.5, ..., 4 s)", len(anim.Image))
	}
	total := 0
	for i, fr := range anim.Image {
		if len(fr.Palette) > 256 {
			t.Errorf("frame %d has %d colours", i, len(fr.Palette))
		}
		if fr.Bounds().Dx() != report.AnimationWidth {
			t.Errorf("frame %d is %d wide, want %d", i, fr.Bounds().Dx(), report.AnimationWidth)
		}
		total += anim.Delay[i]
	}
	if total < 450 || total > 550 {
		t.Errorf("the animation plays in %d/100 s, want about 5 s", total)
	}
}

// The peak the spectrum figure marks (the summary's) lies within one
// frequency bin of the largest density of spectrum.csv (the parabolic
// refinement moves it by less than a bin: common practice, no source).
func TestSpectrumPeakMatchesTable(t *testing.T) {
	dir, _ := sharedRuns(t)
	peak, err := report.SpectrumPeak(dir)
	if err != nil {
		t.Fatal(err)
	}
	sp, err := runfolder.ReadSpectrum(dir)
	if err != nil {
		t.Fatal(err)
	}
	at := 1
	for i := 1; i < len(sp.PSD); i++ {
		if sp.PSD[i] > sp.PSD[at] {
			at = i
		}
	}
	if df := sp.Freq[1] - sp.Freq[0]; !(math.Abs(peak-sp.Freq[at]) <= df) {
		t.Fatalf("spectrum peak %v Hz, largest density of %s at %v Hz (bin %v Hz)", peak, runfolder.SpectrumFile, sp.Freq[at], df)
	}
}

// copyRun copies the named files of a run folder into a new one.
func copyRun(t *testing.T, from string, names ...string) string {
	t.Helper()
	to := t.TempDir()
	for _, n := range names {
		b, err := os.ReadFile(filepath.Join(from, n))
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(to, n), b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return to
}

func TestMissingDataSkipsWithNotes(t *testing.T) {
	full, _ := sharedRuns(t)
	dir := copyRun(t, full, runfolder.CaseFile, runfolder.SummaryFile, runfolder.TimeSeriesFile)
	paths, notes, err := report.WriteFigures(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(paths) != 1 || filepath.Base(paths[0]) != "timeseries.png" {
		t.Errorf("written %v, want only timeseries.png", paths)
	}
	want := map[string]string{
		"vorticity.png": "no fields.h5",
		"rollers.gif":   "no fields.h5",
		"profiles.png":  "no profiles.csv",
		"spectrum.png":  "no spectrum.csv",
		"uptake.png":    "no uptake.csv",
		"scalars.png":   "no scalars.csv",
	}
	for _, n := range notes {
		if w, ok := want[n.Figure]; !ok || !strings.Contains(n.Reason, w) {
			t.Errorf("note %q, want a reason with %q", n, w)
		}
		delete(want, n.Figure)
	}
	if len(want) > 0 {
		t.Errorf("no notes for %v", want)
	}
}

// An interrupted run keeps its first snapshot and no statistics: the
// vorticity map is drawn, the rest is skipped with a reason.
func TestInterruptedRunFigures(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "stopped")
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if err := runCase(dir, 3, nil, ctx); err != nil {
		t.Fatal(err)
	}
	paths, notes, err := report.WriteFigures(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(paths) != 1 || filepath.Base(paths[0]) != "vorticity.png" {
		t.Errorf("written %v, want only vorticity.png", paths)
	}
	reasons := map[string]string{}
	for _, n := range notes {
		reasons[n.Figure] = n.Reason
	}
	for fig, want := range map[string]string{
		"profiles.png":   "time.spin_up = 1 s",
		"spectrum.png":   "spectrum.csv",
		"timeseries.png": "1 row",
		"rollers.gif":    "at least 2",
		"scalars.png":    "time.spin_up = 1 s",
	} {
		if !strings.Contains(reasons[fig], want) {
			t.Errorf("%s: reason %q, want one with %q", fig, reasons[fig], want)
		}
	}
}

func TestDamagedTableIsAnErrorAndTheRestIsWritten(t *testing.T) {
	full, _ := sharedRuns(t)
	dir := copyRun(t, full, runfolder.CaseFile, runfolder.SummaryFile, runfolder.TimeSeriesFile, runfolder.ProfilesFile)
	os.WriteFile(filepath.Join(dir, "profiles.csv"), []byte("\"z [m]\",\"U [m/s]\"\n0.1,abc\n"), 0o644)
	paths, _, err := report.WriteFigures(dir)
	if err == nil || !strings.Contains(err.Error(), "profiles.png") || !strings.Contains(err.Error(), `"abc" is not a number`) {
		t.Errorf("error %v, want one naming profiles.png and the bad cell", err)
	}
	if len(paths) != 1 || filepath.Base(paths[0]) != "timeseries.png" {
		t.Errorf("written %v, want timeseries.png still", paths)
	}
}

func TestFiguresRefuseWhatIsNotARunFolder(t *testing.T) {
	empty := t.TempDir()
	if _, err := report.Figures(empty); err == nil || !strings.Contains(err.Error(), "is not a run folder") {
		t.Errorf("empty folder: %v", err)
	}
	if _, err := report.Figures(filepath.Join(empty, "nowhere")); err == nil || !strings.Contains(err.Error(), "rollerbed run --out") {
		t.Errorf("missing folder: %v", err)
	}
}

func TestCompareTwoSeeds(t *testing.T) {
	a, b := sharedRuns(t)
	// A third run folder with a scalar summary the others lack.
	c := copyRun(t, b, runfolder.CaseFile)
	sum, _ := os.ReadFile(filepath.Join(b, "summary.json"))
	var m map[string]any
	json.Unmarshal(sum, &m)
	m["scalars"] = map[string]any{"oxygen": map[string]any{"total_uptake_per_bed_area_mol_m2_s": 2e-6}}
	out, _ := json.Marshal(m)
	os.WriteFile(filepath.Join(c, "summary.json"), out, 0o644)

	cmp, err := runfolder.Compare([]string{a, b, c})
	if err != nil {
		t.Fatal(err)
	}
	rows := map[string]runfolder.ComparisonRow{}
	for _, r := range cmp.Rows {
		rows[r.Key] = r
	}
	nx := rows["run.nx"]
	if len(nx.Values) != 3 || *nx.Values[1] != 32 || *nx.RatioToFirst[2] != 1 {
		t.Errorf("run.nx row %+v", nx)
	}
	if r := rows["flow.bulk_velocity_m_s"]; r.Unit != "m/s" {
		t.Errorf("bulk velocity unit %q", r.Unit)
	}
	ox, ok := rows["scalars.oxygen.total_uptake_per_bed_area_mol_m2_s"]
	if !ok || ox.Values[0] != nil || ox.RatioToFirst[2] != nil || *ox.Values[2] != 2e-6 || ox.Unit != "mol/(m²·s)" {
		t.Errorf("scalar row %+v (present %v)", ox, ok)
	}
	if _, ok := rows["run.title"]; ok {
		t.Error("a text key in the numeric comparison")
	}
	paths, notes, err := report.CompareFigures([]string{a, b}, filepath.Join(t.TempDir(), "cmp"))
	if err != nil || len(notes) != 0 || len(paths) != 4 {
		t.Fatalf("overlay figures %v, notes %v, error %v", paths, notes, err)
	}
	for _, p := range paths {
		if w, h := pngSize(t, p); w != report.FigureWidth || h != report.FigureHeight {
			t.Errorf("%s is %d × %d", p, w, h)
		}
	}
}

func TestCompareNeedsSummaries(t *testing.T) {
	a, _ := sharedRuns(t)
	half := copyRun(t, a, runfolder.CaseFile)
	_, err := runfolder.Compare([]string{a, half})
	if err == nil || !strings.Contains(err.Error(), "has no summary.json") || !strings.Contains(err.Error(), "--resume") {
		t.Errorf("error %v", err)
	}
}
