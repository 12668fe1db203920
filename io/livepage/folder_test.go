package livepage

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"rollerbed/io/h5"
	"rollerbed/io/runfolder"
)

// caseText is a case file as a run folder keeps it; Follow reads its
// title and duration.
const caseText = `title = "folder test"
[domain]
length = 2.0
depth = 0.5
nx = 16
nz = 8
[fluid]
viscosity = 1.0e-5
[canopy]
height = 0.25
frontal_area = 10.0
[forcing]
bulk_velocity = 0.05
[time]
duration = 10.0
`

// writeFolder writes a run folder with fields.h5 holding snapshots at
// the times ts, a canopy, run.log with a warning, and no summary.
func writeFolder(t *testing.T, ts ...float64) string {
	t.Helper()
	dir := t.TempDir()
	os.WriteFile(filepath.Join(dir, runfolder.CaseFile), []byte(caseText), 0o644)
	os.WriteFile(filepath.Join(dir, runfolder.LogFile), []byte("2026-01-01T00:00:00Z started\n2026-01-01T00:00:01Z "+warningMark+"the flow is odd\n"), 0o644)
	v := testView(0)
	g := v.Grid
	f, err := h5.Create(filepath.Join(dir, runfolder.FieldsFile), h5.Meta{Title: "folder test", CaseText: caseText})
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if err := f.WriteGrid(g); err != nil {
		t.Fatal(err)
	}
	if err := f.WriteStatic("canopy/frontal_area", v.Frontal, 8, 16, "1/m", "a"); err != nil {
		t.Fatal(err)
	}
	for i, tm := range ts {
		w := testView(tm)
		u := make([]float64, 8*16)
		for k := range u {
			u[k] = g.Zc[k/16] * (1 + tm)
		}
		c := make([]float64, 8*16)
		for k := range c {
			c[k] = float64(k) * tm
		}
		err := f.WriteSnapshot(tm, 10*(i+1), []h5.Field{
			{Name: "u", Units: "m/s", Description: "u", Data: u, Rows: 8, Cols: 16, Location: h5.LocationCentre},
			{Name: "vorticity", Units: "1/s", Description: "ω", Data: w.Fields[0].Data, Rows: 9, Cols: 16, Location: h5.LocationFace},
			{Name: "oxygen", Units: "unit", Description: "c", Data: c, Rows: 8, Cols: 16, Location: h5.LocationCentre},
		})
		if err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

// TestFolderWhileRunning reads a folder without a summary: the newest
// snapshot's maps and profile, the log's warnings, the metrics blank.
// Common practice, no source.
func TestFolderWhileRunning(t *testing.T) {
	dir := writeFolder(t, 1, 2)
	f := &Folder{Dir: dir}
	v, changed := f.Read()
	if !changed {
		t.Fatal("the first read did not change")
	}
	if v.State != Running || v.Title != "folder test" || v.EndTime != 10 || v.Time != 2 || v.Steps != 20 {
		t.Errorf("state %s, title %q, t = %g of %g, step %d", v.State, v.Title, v.Time, v.EndTime, v.Steps)
	}
	if len(v.Fields) != 2 || v.Fields[0].Name != "vorticity" || v.Fields[1].Name != "oxygen" {
		t.Errorf("fields %v", v.Fields)
	}
	if len(v.ProfileU) != 8 || v.ProfileU[0] != v.Grid.Zc[0]*3 {
		t.Errorf("profile %v", v.ProfileU)
	}
	if v.CanopyHeight != 0.25 {
		t.Errorf("canopy height %g, want 0.25", v.CanopyHeight)
	}
	if len(v.Warnings) != 1 || v.Warnings[0] != "the flow is odd" {
		t.Errorf("warnings %q", v.Warnings)
	}
	if !strings.Contains(v.Note, runfolder.SummaryFile) {
		t.Errorf("note %q", v.Note)
	}
	for _, m := range v.Metrics {
		if m.Value != nil {
			t.Errorf("%s = %g before the summary", m.Key, *m.Value)
		}
	}
	if _, changed := f.Read(); changed {
		t.Error("a second read of unchanged files changed")
	}
}

// TestFolderFinished reads a folder with its summary: the state, the
// metrics and the warnings come from it, and report.html is linked.
// Common practice, no source.
func TestFolderFinished(t *testing.T) {
	dir := writeFolder(t, 1)
	pen := 0.042
	sum := runfolder.Summary{Run: runfolder.RunSummary{Title: "folder test", SimTime: 10, Steps: 99, Warnings: []string{"w1"}},
		Flow:    runfolder.FlowSummary{PenetrationDepth: &pen},
		Scalars: map[string]runfolder.ScalarSummary{"oxygen": {TotalUptake: 3e-6}}}
	if err := sum.Write(dir); err != nil {
		t.Fatal(err)
	}
	os.WriteFile(filepath.Join(dir, runfolder.ReportFile), []byte("<html></html>"), 0o644)
	v, _ := (&Folder{Dir: dir, Scalar: "oxygen"}).Read()
	if v.State != Finished || v.Time != 10 || v.Steps != 99 {
		t.Errorf("state %s at t = %g, step %d", v.State, v.Time, v.Steps)
	}
	got := map[string]Metric{}
	for _, m := range v.Metrics {
		got[m.Key] = m
	}
	if m := got[runfolder.KeyPenetrationDepth]; m.Value == nil || *m.Value != pen || m.Unit != "m" {
		t.Errorf("penetration depth %+v", m)
	}
	if m := got["scalars.oxygen.total_uptake_per_bed_area"]; m.Value == nil || *m.Value != 3e-6 {
		t.Errorf("uptake %+v", m)
	}
	if len(v.Warnings) != 1 || v.Warnings[0] != "w1" {
		t.Errorf("warnings %q", v.Warnings)
	}
	if len(v.Links) == 0 || v.Links[0] != runfolder.ReportFile {
		t.Errorf("links %q", v.Links)
	}
}

// TestFollowRefusesOtherFolders checks the message for a folder that is
// not a run's. Common practice, no source.
func TestFollowRefusesOtherFolders(t *testing.T) {
	err := Follow(context.Background(), &Folder{Dir: t.TempDir()}, time.Second, func(*View) {})
	if err == nil || !strings.Contains(err.Error(), "not a run folder") {
		t.Errorf("Follow of an empty folder: %v", err)
	}
}

// TestFollowPublishesChanges follows a folder while a snapshot is added.
// Common practice, no source.
func TestFollowPublishesChanges(t *testing.T) {
	dir := writeFolder(t, 1)
	ctx, cancel := context.WithCancel(context.Background())
	views := make(chan *View, 10)
	done := make(chan error)
	go func() { done <- Follow(ctx, &Folder{Dir: dir}, 10*time.Millisecond, func(v *View) { views <- v }) }()
	if v := <-views; v.Time != 1 {
		t.Errorf("first view at t = %g", v.Time)
	}
	f, err := h5.Open(filepath.Join(dir, runfolder.FieldsFile))
	if err != nil {
		t.Fatal(err)
	}
	w := testView(3)
	if err := f.WriteSnapshot(3, 30, []h5.Field{{Name: "vorticity", Units: "1/s", Data: w.Fields[0].Data, Rows: 9, Cols: 16, Location: h5.LocationFace}}); err != nil {
		t.Fatal(err)
	}
	f.Close()
	timeout := time.After(10 * time.Second)
	for v := <-views; v.Time != 3; {
		select {
		case v = <-views:
		case <-timeout:
			t.Fatalf("no view of the new snapshot; the last at t = %g", v.Time)
		}
	}
	cancel()
	if err := <-done; err != nil {
		t.Error(err)
	}
}

// FuzzLogWarnings checks that any run.log text gives warnings that are
// the ends of its lines after the warning mark, never a panic.
func FuzzLogWarnings(f *testing.F) {
	f.Add("2026-01-01T00:00:00Z started\n2026-01-01T00:00:01Z warning: odd\n")
	f.Add("warning: no time stamp\n\x00 warning: \n")
	f.Fuzz(func(t *testing.T, text string) {
		path := filepath.Join(t.TempDir(), runfolder.LogFile)
		if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		for _, w := range logWarnings(path) {
			if !strings.Contains(text, " "+warningMark+w) {
				t.Errorf("warning %q is not in the log after %q", w, warningMark)
			}
		}
	})
}
