package sweep

import (
	"context"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"rollerbed/io/runfolder"
	"strings"
	"sync"
	"testing"
	"time"

	"rollerbed/io/casefile"
	"rollerbed/runs"
)

// planSmall plans the four-member test sweep into a new folder.
func planSmall(t *testing.T) string {
	t.Helper()
	f, err := Load(filepath.Join("testdata", "small", "sweep.toml"))
	if err != nil {
		t.Fatal(err)
	}
	pl, err := NewPlan(f)
	if err != nil {
		t.Fatal(err)
	}
	dir := filepath.Join(t.TempDir(), "sweep")
	if err := pl.Write(dir, false); err != nil {
		t.Fatal(err)
	}
	return dir
}

// summaryNumbers reads the numeric values of a summary.json, flattened,
// without the wall-clock keys.
func summaryNumbers(t *testing.T, path string) map[string]float64 {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	out := map[string]float64{}
	es, err := runfolder.FlattenJSON(b)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range es {
		if f, ok := e.Number(); ok && !strings.Contains(e.Key, "wall_time") {
			out[e.Key] = f
		}
	}
	return out
}

// TestRunInterruptedAndRerun runs the four members one at a time, cancels
// the run while the third steps, and runs the sweep again: the two
// finished members are skipped (their summaries untouched), the third
// resumes from its checkpoint to the numbers of an uninterrupted run, the
// fourth starts, and every member finishes exactly once.
func TestRunInterruptedAndRerun(t *testing.T) {
	dir := planSmall(t)
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	var mu sync.Mutex
	var events []string
	opt := RunOptions{
		Jobs:                1,
		Event:               func(s string) { mu.Lock(); events = append(events, s); mu.Unlock() },
		MemberProgressEvery: time.Nanosecond,
		MemberProgress: func(i int, p runs.Progress) {
			if i == 2 && p.SimTime > 1.5 {
				cancel()
			}
		},
	}
	res, err := Run(ctx, dir, opt)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(res.Finished, []int{0, 1}) || !reflect.DeepEqual(res.Interrupted, []int{2}) || !reflect.DeepEqual(res.NotStarted, []int{3}) || res.Complete() {
		t.Fatalf("first run: finished %v, interrupted %v, not started %v\n%s", res.Finished, res.Interrupted, res.NotStarted, strings.Join(events, "\n"))
	}
	if res.Jobs != 1 || res.WorkersPerRun != 1 {
		t.Errorf("jobs %d, workers %d; want 1 and the base's numerics.workers = 1", res.Jobs, res.WorkersPerRun)
	}
	if st := ReadFolderState(RunDir(dir, "0002")); st.State != StateInterrupted || !st.Checkpoint {
		t.Fatalf("member 0002 after the cancel: %+v", st)
	}
	if st := ReadFolderState(RunDir(dir, "0003")); st.State != StatePending {
		t.Fatalf("member 0003 after the cancel: %+v", st)
	}
	mtimes := map[string]time.Time{}
	for _, m := range []string{"0000", "0001"} {
		fi, err := os.Stat(filepath.Join(RunDir(dir, m), "summary.json"))
		if err != nil {
			t.Fatal(err)
		}
		mtimes[m] = fi.ModTime()
	}

	var reports []Report
	opt = RunOptions{Jobs: 2, Report: func(r Report) { reports = append(reports, r) }}
	res, err = Run(context.Background(), dir, opt)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(res.Skipped, []int{0, 1}) || !reflect.DeepEqual(res.Finished, []int{2, 3}) || !reflect.DeepEqual(res.Resumed, []int{2}) || !res.Complete() {
		t.Fatalf("second run: skipped %v, finished %v, resumed %v, failed %v %v", res.Skipped, res.Finished, res.Resumed, res.Failed, res.Errors)
	}
	if last := reports[len(reports)-1]; last.Done != 4 || last.Running != 0 || last.Fraction != 1 {
		t.Errorf("last report %+v", last)
	}
	for m, before := range mtimes {
		fi, _ := os.Stat(filepath.Join(RunDir(dir, m), "summary.json"))
		if !fi.ModTime().Equal(before) {
			t.Errorf("member %s was run again: its summary.json changed at %v", m, fi.ModTime())
		}
	}
	for _, m := range []string{"0000", "0001", "0002", "0003"} {
		log, err := os.ReadFile(filepath.Join(RunDir(dir, m), "run.log"))
		if err != nil {
			t.Fatal(err)
		}
		if n := strings.Count(string(log), "finished at"); n != 1 {
			t.Errorf("member %s finished %d times:\n%s", m, n, log)
		}
		if resumed := strings.Contains(string(log), "resumed from"); resumed != (m == "0002") {
			t.Errorf("member %s: resumed %v:\n%s", m, resumed, log)
		}
		if st := ReadFolderState(RunDir(dir, m)); st.State != StateDone {
			t.Errorf("member %s: %+v", m, st)
		}
	}
	// A third run has nothing to do.
	res, err = Run(context.Background(), dir, RunOptions{})
	if err != nil || len(res.Skipped) != 4 || len(res.Finished) != 0 {
		t.Errorf("third run: %+v, %v", res, err)
	}

	// The resumed member reached the numbers of an uninterrupted run.
	c, err := casefile.Load(filepath.Join(MemberDir(dir, "0002"), runfolder.CaseFile))
	if err != nil {
		t.Fatal(err)
	}
	sp, err := runs.FromCase(c, "")
	if err != nil {
		t.Fatal(err)
	}
	ref := filepath.Join(t.TempDir(), "ref")
	if _, err := runs.Run(context.Background(), sp, runs.Options{Dir: ref}); err != nil {
		t.Fatal(err)
	}
	got, want := summaryNumbers(t, filepath.Join(RunDir(dir, "0002"), "summary.json")), summaryNumbers(t, filepath.Join(ref, runfolder.SummaryFile))
	if !reflect.DeepEqual(got, want) {
		t.Errorf("resumed member differs from an uninterrupted run:\n got %v\nwant %v", got, want)
	}

	// The collected table: member, varied values, summary columns.
	col, err := Collect(dir)
	if err != nil {
		t.Fatal(err)
	}
	recs := col.Records()
	if len(recs) != 5 {
		t.Fatalf("%d records", len(recs))
	}
	if h := recs[0]; !reflect.DeepEqual(h[:4], []string{"member", "canopy.frontal_area", "initial.seed", "run.steps"}) || !contains(h, "flow.penetration_depth_m [m]") || contains(h, "run.interrupted") || contains(h, "run.version") {
		t.Errorf("header %v", h)
	}
	for i, want := range [][]string{{"0000", "10.0", "3"}, {"0001", "10.0", "4"}, {"0002", "15.0", "3"}, {"0003", "15.0", "4"}} {
		if !reflect.DeepEqual(recs[i+1][:3], want) {
			t.Errorf("row %d starts %v, want %v", i, recs[i+1][:3], want)
		}
	}
	if err := col.WriteCSV(filepath.Join(dir, CSVName)); err != nil {
		t.Fatal(err)
	}
	figs, err := col.Plot([]PlotSpec{{Y: "flow.penetration_depth_m", X: "canopy.frontal_area"}, {Y: "flow.roller_spacing_correlation_m", X: "canopy.frontal_area"}, {Y: "run.steps", X: "initial.seed"}})
	if err != nil {
		t.Fatal(err)
	}
	for i, ref := range []string{"Nepf", "Raupach", ""} {
		if !strings.Contains(figs[i].Reference, ref) || figs[i].Points != 4 {
			t.Errorf("figure %d: %+v", i, figs[i])
		}
		b, err := os.ReadFile(figs[i].Path)
		if err != nil || !strings.HasPrefix(string(b), "\x89PNG") {
			t.Errorf("figure %s is not a PNG: %v", figs[i].Path, err)
		}
	}
	if err := col.CheckPlots([]PlotSpec{{Y: "flow.penetration_depth", X: "canopy.frontal_area"}}); err == nil || !strings.Contains(err.Error(), "did you mean flow.penetration_depth_m?") {
		t.Errorf("bad plot key: %v", err)
	}
}

func TestRunChoosesWorkers(t *testing.T) {
	// Members that leave numerics.workers at 0 share the cores.
	sd, _ := planSweep(t, "base = \"base.toml\"\nreplicates = 3\n", "workers = 1", "workers = 0", "duration = 4.0", "duration = 0.5",
		"spin_up = 1.0", "spin_up = 0.0", "profile_every = 0.5", "profile_every = 0.25",
		"snapshot_every = 1.0", "snapshot_every = 0.5", "checkpoint_every = 1.0", "checkpoint_every = 0.5")
	res, err := Run(context.Background(), sd, RunOptions{Cores: 8})
	if err != nil {
		t.Fatal(err)
	}
	if res.Jobs != 3 || res.WorkersPerRun != 2 || !res.Complete() {
		t.Errorf("8 cores, 3 members: %d jobs of %d workers, complete %v %v; want 3 of 2", res.Jobs, res.WorkersPerRun, res.Complete(), res.Errors)
	}
}

func TestFolderStates(t *testing.T) {
	dir := t.TempDir()
	write := func(name, text string) {
		os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644)
	}
	sum := func(interrupted bool, errText string) string {
		b, _ := json.Marshal(map[string]any{"run": map[string]any{"steps": 5, "sim_time_s": 1.5, "interrupted": interrupted, "error": errText}})
		return string(b)
	}
	tests := []struct {
		name  string
		setup func()
		want  State
	}{
		{"missing", func() { os.RemoveAll(dir) }, StatePending},
		{"empty", func() { os.MkdirAll(dir, 0o755) }, StatePending},
		{"started", func() { write(runfolder.LogFile, "started") }, StateStarted},
		{"checkpointed", func() { write("checkpoint-000000005.h5", "x") }, StateInterrupted},
		{"interrupted summary", func() { write(runfolder.SummaryFile, sum(true, "")) }, StateInterrupted},
		{"failed", func() { write(runfolder.SummaryFile, sum(false, "blow-up at t = 1 s")) }, StateFailed},
		{"done", func() { write(runfolder.SummaryFile, sum(false, "")) }, StateDone},
		{"damaged summary", func() { write(runfolder.SummaryFile, "{") }, StateInterrupted},
	}
	for _, tc := range tests {
		tc.setup()
		if got := ReadFolderState(dir); got.State != tc.want {
			t.Errorf("%s: %+v, want %s", tc.name, got, tc.want)
		}
	}
}

// TestCheckPlotsNullEverywhere: a summary key that no member could give
// (null in all) is named as such, not as an unknown key.
func TestCheckPlotsNullEverywhere(t *testing.T) {
	c := &Collection{Keys: []string{"canopy.frontal_area"}, Columns: []string{"flow.penetration_depth_m"}, Empty: []string{"flow.roller_frequency_hz"}}
	err := c.CheckPlots([]PlotSpec{{Y: "flow.roller_frequency_hz", X: "canopy.frontal_area"}})
	if err == nil || !strings.Contains(err.Error(), "null in every done member") || strings.Contains(err.Error(), "neither a varied key") {
		t.Errorf("CheckPlots: %v", err)
	}
	if err := c.CheckPlots([]PlotSpec{{Y: "flow.penetration_depth_m", X: "canopy.frontal_area"}}); err != nil {
		t.Errorf("a numeric column: %v", err)
	}
}

// TestSweepFolderLocked: while one process holds a sweep folder (a runner),
// a forced replan, a submission and a second runner are refused, naming it.
func TestSweepFolderLocked(t *testing.T) {
	sd, pl := planSweep(t, "base = \"base.toml\"\nreplicates = 2\n")
	lock, err := runfolder.TakeLock(sd)
	if err != nil {
		t.Fatal(err)
	}
	defer lock.Release()
	if err := pl.Write(sd, true); !errors.Is(err, runfolder.ErrInUse) {
		t.Errorf("plan --force on a held folder: %v", err)
	}
	if _, err := Submit(context.Background(), sd, SubmitOptions{DryRun: true}); !errors.Is(err, runfolder.ErrInUse) {
		t.Errorf("submit on a held folder: %v", err)
	}
	if _, err := Run(context.Background(), sd, RunOptions{}); !errors.Is(err, runfolder.ErrInUse) {
		t.Errorf("a second runner: %v", err)
	}
	if _, err := os.Stat(MemberDir(sd, "0000")); err != nil {
		t.Errorf("the refused plan --force removed a member: %v", err)
	}
}
