package runs

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"rollerbed/io/runfolder"
	"sort"
	"strings"
	"testing"

	"rollerbed/io/casefile"
	"rollerbed/io/h5"
	"rollerbed/solver"
)

func TestExamplesParse(t *testing.T) {
	for _, name := range Examples() {
		text, err := Example(name)
		if err != nil {
			t.Fatal(err)
		}
		c, err := casefile.Parse(text)
		if err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		sp, err := FromCase(c, "")
		if err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		s, err := NewSolver(sp)
		if err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		s.Close()
	}
	if _, err := Example("no-such-case"); err == nil {
		t.Error("unknown example accepted")
	}
}

func TestRunWritesFolderAndRefusesToOverwrite(t *testing.T) {
	sp := parseSpec(t, smallCanopyCase)
	dir := filepath.Join(t.TempDir(), "run")
	res, err := Run(context.Background(), sp, Options{Dir: dir})
	if err != nil {
		t.Fatal(err)
	}
	if res.Steps == 0 || res.SimTime != 4 {
		t.Errorf("result %+v", res)
	}
	for _, f := range []string{runfolder.CaseFile, runfolder.ProfileFile, runfolder.ProfilesFile, runfolder.ProbesFile, runfolder.TimeSeriesFile,
		runfolder.SummaryFile, runfolder.FieldsFile, "fields.xmf", runfolder.LogFile, runfolder.ScalarsFile, runfolder.UptakeFile, runfolder.SpectrumFile} {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Errorf("missing %s: %v", f, err)
		}
	}
	snaps, err := h5.ListSnapshots(filepath.Join(dir, runfolder.FieldsFile))
	if err != nil || len(snaps) != 5 { // t = 0, 1, 2, 3, 4
		t.Errorf("snapshots %d (%v), want 5", len(snaps), err)
	}
	sum, err := runfolder.ReadSummary(dir)
	if err != nil {
		t.Fatal(err)
	}
	if sum.Run.Steps != res.Steps || sum.Run.SimTime != 4 || sum.Run.Nx == 0 || sum.Run.Version != Version ||
		sum.Run.SpinUp != sp.SpinUp || sum.Run.Depth != sp.Solver.H {
		t.Errorf("run summary %+v", sum.Run)
	}
	if d := sum.Flow.MaxDivergence; !(d < 1e-12) {
		t.Errorf("max divergence %g", d)
	}
	if c := sum.Canopy; c == nil || c.Height != sp.Canopy.Height() || c.PredictedPenetrationDepth == nil {
		t.Errorf("canopy summary %+v", c)
	}
	// The spectrum the run writes is the one its roller frequency comes
	// from (the same computation: common practice, no source).
	spec, err := runfolder.ReadSpectrum(dir)
	if err != nil || sum.Spectrum == nil || len(spec.Freq) != sum.Spectrum.Segment/2+1 {
		t.Errorf("spectrum.csv %d rows (%v), summary %+v", len(spec.Freq), err, sum.Spectrum)
	} else if f := sum.Flow.RollerFrequency; f != nil && (sum.Spectrum.Peak == nil || *sum.Spectrum.Peak != *f) {
		t.Errorf("roller frequency %g Hz, spectrum peak %v", *f, sum.Spectrum.Peak)
	}
	ox, ok := sum.Scalars["oxygen"]
	if !ok || ox.ExchangeVelocity == nil || ox.BoundaryLayerShare == nil {
		t.Fatalf("scalar summary %+v", sum.Scalars)
	}
	if im := ox.Imbalance; im > 1e-10 {
		t.Errorf("budget imbalance %g", im)
	}
	if !(ox.ElementUptake > 0) || !(ox.BedUptake > 0) {
		t.Errorf("uptake %v, %v", ox.ElementUptake, ox.BedUptake)
	}
	if sh := *ox.BoundaryLayerShare; !(sh > 0 && sh < 1) {
		t.Errorf("boundary-layer share %g", sh)
	}
	before, _ := os.ReadFile(filepath.Join(dir, runfolder.ProfileFile))
	_, err = Run(context.Background(), sp, Options{Dir: dir})
	if !errors.Is(err, ErrFolderInUse) {
		t.Fatalf("second run into the same folder: %v, want ErrFolderInUse", err)
	}
	after, _ := os.ReadFile(filepath.Join(dir, runfolder.ProfileFile))
	if !bytes.Equal(before, after) {
		t.Error("refused run still changed the folder")
	}
	if _, err := Run(context.Background(), sp, Options{Dir: dir, Force: true}); err != nil {
		t.Errorf("--force run: %v", err)
	}
}

// outputs reads the files that must be equal between an uninterrupted and a
// resumed run (summary.json holds wall times and is left out).
func outputs(t *testing.T, dir string) map[string][]byte {
	t.Helper()
	m := map[string][]byte{}
	for _, f := range []string{runfolder.ProfileFile, runfolder.ProfilesFile, runfolder.ProbesFile, runfolder.TimeSeriesFile, runfolder.ScalarsFile, runfolder.UptakeFile} {
		b, err := os.ReadFile(filepath.Join(dir, f))
		if err != nil {
			t.Fatal(err)
		}
		m[f] = b
	}
	snaps, err := h5.ListSnapshots(filepath.Join(dir, runfolder.FieldsFile))
	if err != nil {
		t.Fatal(err)
	}
	for _, sn := range snaps {
		for _, f := range sn.Fields {
			v, err := h5.ReadField(filepath.Join(dir, runfolder.FieldsFile), sn.Group+"/"+f.Name)
			if err != nil {
				t.Fatal(err)
			}
			var buf bytes.Buffer
			json.NewEncoder(&buf).Encode(v)
			m[sn.Group+"/"+f.Name] = buf.Bytes()
		}
	}
	return m
}

func sameOutputs(t *testing.T, a, b map[string][]byte) {
	t.Helper()
	var keys []string
	for k := range a {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	if len(a) != len(b) {
		t.Fatalf("%d outputs vs %d", len(a), len(b))
	}
	for _, k := range keys {
		if !bytes.Equal(a[k], b[k]) {
			t.Fatalf("%s differs between the uninterrupted and the resumed run", k)
		}
	}
}

// TestResumeIsBitForBit: a run stopped part-way (as by SIGINT) and resumed
// gives exactly the files of an uninterrupted run.
func TestResumeIsBitForBit(t *testing.T) {
	sp := parseSpec(t, smallCanopyCase)
	full := filepath.Join(t.TempDir(), "full")
	if _, err := Run(context.Background(), sp, Options{Dir: full}); err != nil {
		t.Fatal(err)
	}
	part := filepath.Join(t.TempDir(), "part")
	ctx, cancel := context.WithCancel(context.Background())
	stopAt := 0
	res, err := Run(ctx, sp, Options{Dir: part, Progress: func(p Progress) {
		if p.SimTime > 1.7 && stopAt == 0 {
			stopAt = p.Steps
			cancel()
		}
	}})
	if err != nil {
		t.Fatal(err)
	}
	if !res.Interrupted || res.SimTime >= 4 {
		t.Fatalf("the run was not interrupted: %+v", res)
	}
	res, err = Run(context.Background(), sp, Options{Dir: part, Resume: true})
	if err != nil {
		t.Fatal(err)
	}
	if !res.Resumed || res.SimTime != 4 {
		t.Fatalf("resume result %+v", res)
	}
	sameOutputs(t, outputs(t, full), outputs(t, part))
}

// TestResumeFallsBackFromDamagedCheckpoint: with the newest checkpoint
// damaged, the previous one is used, a warning says so, and the result
// still equals the uninterrupted run.
func TestResumeFallsBackFromDamagedCheckpoint(t *testing.T) {
	sp := parseSpec(t, smallCanopyCase)
	full := filepath.Join(t.TempDir(), "full")
	if _, err := Run(context.Background(), sp, Options{Dir: full}); err != nil {
		t.Fatal(err)
	}
	part := filepath.Join(t.TempDir(), "part")
	ctx, cancel := context.WithCancel(context.Background())
	if _, err := Run(ctx, sp, Options{Dir: part, Progress: func(p Progress) {
		if p.SimTime > 2.6 {
			cancel()
		}
	}}); err != nil {
		t.Fatal(err)
	}
	files, _ := filepath.Glob(filepath.Join(part, "checkpoint-*.h5"))
	sort.Strings(files)
	if len(files) != 2 {
		t.Fatalf("checkpoints %v, want 2", files)
	}
	newest := files[len(files)-1]
	b, _ := os.ReadFile(newest)
	os.WriteFile(newest, b[:len(b)/2], 0o644)
	res, err := Run(context.Background(), sp, Options{Dir: part, Resume: true})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Warnings) == 0 {
		t.Error("no warning about the damaged checkpoint")
	}
	sameOutputs(t, outputs(t, full), outputs(t, part))
}

func TestResumeErrors(t *testing.T) {
	sp := parseSpec(t, smallCanopyCase)
	if _, err := Run(context.Background(), sp, Options{Dir: t.TempDir(), Resume: true}); err == nil {
		t.Error("resumed a folder without checkpoints")
	}
	dir := filepath.Join(t.TempDir(), "run")
	if _, err := Run(context.Background(), sp, Options{Dir: dir}); err != nil {
		t.Fatal(err)
	}
	other := *sp
	other.CaseText += "\n# changed\n"
	if _, err := Run(context.Background(), &other, Options{Dir: dir, Resume: true}); err == nil {
		t.Error("resumed with another case text")
	}
}

// TestUnwritableFolder: a run folder that cannot take files gives an error
// before any work, not a crash.
func TestUnwritableFolder(t *testing.T) {
	sp := parseSpec(t, smallCanopyCase)
	file := filepath.Join(t.TempDir(), "plain-file")
	os.WriteFile(file, []byte("x"), 0o644)
	if _, err := Run(context.Background(), sp, Options{Dir: filepath.Join(file, "run")}); err == nil {
		t.Error("ran into a folder below a plain file")
	}
	if os.Geteuid() != 0 {
		ro := t.TempDir()
		os.Chmod(ro, 0o555)
		defer os.Chmod(ro, 0o755)
		if _, err := Run(context.Background(), sp, Options{Dir: ro}); err == nil {
			t.Error("ran into a read-only folder")
		}
	} else if _, err := exec.LookPath("setpriv"); err == nil {
		t.Log("running as root: read-only folders are tested by the command-line test as another user")
	}
}

func TestEstimate(t *testing.T) {
	sp := parseSpec(t, smallCanopyCase)
	e, err := EstimateRun(sp)
	if err != nil {
		t.Fatal(err)
	}
	if e.VelocityScale <= 0 || e.Steps <= 0 || e.StepCost <= 0 || e.MemoryBytes <= 0 || e.OutputBytes <= 0 {
		t.Errorf("estimate %+v", e)
	}
}

// TestWarnings: a grid too coarse for the canopy-top shear layer, a domain
// too short for several rollers and an element Reynolds number outside the
// uptake correlation's range each give a warning naming what would do.
func TestWarnings(t *testing.T) {
	// Thin elements in slow water: Re = |u| d/ν = 0.05 × 5e-5 / 1e-5 = 0.25,
	// below the Hilpert table's first range (0.4–4).
	sp := parseSpec(t, strings.Replace(smallCanopyCase, "diameter = 0.004", "diameter = 0.00005", 1))
	ws := Warnings(sp)
	joined := ""
	for _, w := range ws {
		joined += w + "\n"
	}
	for _, want := range []string{"domain.nz =", "domain.length =", `scalar[0].uptake = "hilpert"`} {
		if !strings.Contains(joined, want) {
			t.Errorf("no warning mentioning %q in:\n%s", want, joined)
		}
	}
	demo, err := casefile.Parse(Demo())
	if err != nil {
		t.Fatal(err)
	}
	dsp, err := FromCase(demo, "")
	if err != nil {
		t.Fatal(err)
	}
	if ws := Warnings(dsp); len(ws) != 0 {
		t.Errorf("the demo case warns: %v", ws)
	}
}

// TestCanopyMetricsConsistent: on a real (small) dense-canopy run the
// shear-layer metrics are finite, positive where they must be and
// consistent: U1 < Ū < U2 and δe ≤ h (C_D a h = 1.2, a dense canopy; Nepf
// 2012 for δe < h in dense canopies).
func TestCanopyMetricsConsistent(t *testing.T) {
	sp := parseSpec(t, smallCanopyCase)
	res, err := Run(context.Background(), sp, Options{Dir: t.TempDir()})
	if err != nil {
		t.Fatal(err)
	}
	f := res.Summary.Flow
	for name, v := range map[string]*float64{"u_top": f.UTop, "u1": f.U1, "u2": f.U2, "θ": f.MomentumThickness,
		"δω": f.VorticityThickness, "Ls": f.ShearLength, "δe": f.PenetrationDepth, "sweep/ejection": f.SweepEjectionRatio} {
		if v == nil || !(*v > 0) {
			t.Errorf("%s = %v, want a finite value > 0", name, v)
		}
	}
	// The roller frequency and what follows from it are there together,
	// or null together with the reason.
	switch {
	case f.RollerFrequency == nil && (f.RollerFrequencyNote == "" || f.Strouhal != nil || f.RollerSpacing != nil):
		t.Errorf("roller frequency null, note %q, Strouhal %v, spacing %v", f.RollerFrequencyNote, f.Strouhal, f.RollerSpacing)
	case f.RollerFrequency != nil && (f.RollerFrequencyNote != "" || f.RollerSpacing == nil || !(*f.RollerSpacing > 0)):
		t.Errorf("roller frequency %g, note %q, spacing %v", *f.RollerFrequency, f.RollerFrequencyNote, f.RollerSpacing)
	}
	if t.Failed() {
		return
	}
	ubar := 0.5 * (*f.U1 + *f.U2)
	if !(*f.U1 < ubar && ubar < *f.U2) {
		t.Errorf("Ū = %g not between U1 = %g and U2 = %g", ubar, *f.U1, *f.U2)
	}
	if h := *f.CanopyHeight; !(*f.PenetrationDepth <= h) {
		t.Errorf("δe = %g above the canopy height %g", *f.PenetrationDepth, h)
	}
}

// TestGardenTakesUpMoreThanMat: the two uptake examples, shortened and
// coarsened, in one flow: the tall elements over a mat take up more oxygen
// per unit bed area than the mat alone (the question the pair is for).
func TestGardenTakesUpMoreThanMat(t *testing.T) {
	short := func(name string) *Spec {
		text, err := Example(name)
		if err != nil {
			t.Fatal(err)
		}
		s := string(text)
		for _, r := range [][2]string{{"nx = 320", "nx = 64"}, {"nz = 80", "nz = 32"},
			{"duration = 300.0", "duration = 20.0"}, {"spin_up = 100.0", "spin_up = 5.0"},
			{"snapshot_every = 10.0", "snapshot_every = 10.0"}} {
			s = strings.Replace(s, r[0], r[1], 1)
		}
		return parseSpec(t, s)
	}
	garden, err := Run(context.Background(), short("filter-feeder-garden"), Options{Dir: t.TempDir()})
	if err != nil {
		t.Fatal(err)
	}
	mat, err := Run(context.Background(), short("mat-alone"), Options{Dir: t.TempDir()})
	if err != nil {
		t.Fatal(err)
	}
	g, m := garden.Summary.Scalars["oxygen"], mat.Summary.Scalars["oxygen"]
	if !(g.TotalUptake > m.TotalUptake) || !(m.BedUptake > 0) || !(g.ElementUptake > 0) {
		t.Errorf("garden total %g (elements %g, bed %g), mat alone %g", g.TotalUptake, g.ElementUptake, g.BedUptake, m.TotalUptake)
	}
	for _, s := range []runfolder.ScalarSummary{g, m} {
		if s.Imbalance > 1e-10 {
			t.Errorf("budget imbalance %g", s.Imbalance)
		}
	}
}

// TestFixedStepBeyondStability: a fixed step above the Courant limit √3 of
// the three-stage Runge–Kutta scheme (common practice, no source) gets a
// warning while it runs, and a blow-up names time.fixed_step, not the
// adaptive step's keys.
func TestFixedStepBeyondStability(t *testing.T) {
	sp := parseSpec(t, strings.Replace(smallCanopyCase, "spin_up = 1.0", "spin_up = 1.0\nfixed_step = 0.2", 1))
	res, err := Run(context.Background(), sp, Options{Dir: t.TempDir()})
	if res == nil {
		t.Fatal(err)
	}
	warned := false
	for _, w := range res.Warnings {
		warned = warned || strings.Contains(w, "time.fixed_step = 0.2 s reached a Courant number")
	}
	if !warned {
		t.Errorf("no warning on the fixed step; warnings %q, error %v", res.Warnings, err)
	}
	var blow *solver.BlowUpError
	if errors.As(err, &blow) && (!strings.Contains(err.Error(), "time.fixed_step") || strings.Contains(err.Error(), "time.cfl")) {
		t.Errorf("blow-up advice: %v", err)
	}
}
