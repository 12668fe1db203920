package runs

import (
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"rollerbed/io/h5"
	"rollerbed/io/runfolder"
)

// interruptedRun runs the small canopy case into a new folder and stops
// it after t = 2.6 s, leaving snapshots at t = 0, 1 and 2 s and a
// checkpoint to resume from.
func interruptedRun(t *testing.T) (*Spec, string) {
	t.Helper()
	sp := parseSpec(t, smallCanopyCase)
	dir := filepath.Join(t.TempDir(), "run")
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	if _, err := Run(ctx, sp, Options{Dir: dir, Progress: func(p Progress) {
		if p.SimTime > 2.6 {
			cancel()
		}
	}}); err != nil {
		t.Fatal(err)
	}
	return sp, dir
}

// readsWhole checks that every snapshot of a fields file reads back and
// returns their times.
func readsWhole(t *testing.T, path string) []float64 {
	t.Helper()
	snaps, err := h5.ListSnapshots(path)
	if err != nil {
		t.Fatal(err)
	}
	var times []float64
	for _, s := range snaps {
		for _, fi := range s.Fields {
			if _, err := h5.ReadField(path, s.Group+"/"+fi.Name); err != nil {
				t.Errorf("%s/%s: %v", s.Group, fi.Name, err)
			}
		}
		times = append(times, s.Time)
	}
	return times
}

// TestResumeRebuildsMissingFields: a resume whose fields.h5 is gone
// continues from the checkpoint with a new one and says what was lost.
func TestResumeRebuildsMissingFields(t *testing.T) {
	sp, dir := interruptedRun(t)
	path := filepath.Join(dir, runfolder.FieldsFile)
	if err := os.Remove(path); err != nil {
		t.Fatal(err)
	}
	res, err := Run(context.Background(), sp, Options{Dir: dir, Resume: true})
	if err != nil {
		t.Fatalf("resume without fields.h5: %v", err)
	}
	if len(res.Warnings) == 0 || !strings.Contains(strings.Join(res.Warnings, "\n"), "is missing: rebuilt from the checkpoint") {
		t.Errorf("warnings %q", res.Warnings)
	}
	if times := readsWhole(t, path); len(times) == 0 || times[len(times)-1] != 4 {
		t.Errorf("snapshots of the rebuilt file at %v, want up to t = 4 s", times)
	}
}

// TestResumeFindsDamagedFields: a block of a compressed snapshot damaged on
// disk (its deflate stream no longer inflates) is found on resume; the
// snapshot is named as lost, the others are kept, and the file the run
// ends with reads back whole. The damaged chunk is found with h5py, an
// independent reader.
func TestResumeFindsDamagedFields(t *testing.T) {
	py := ""
	for _, c := range []string{"python3", "/usr/bin/python3"} {
		if p, err := exec.LookPath(c); err == nil && exec.Command(p, "-c", "import h5py").Run() == nil {
			py = p
			break
		}
	}
	if py == "" {
		t.Skip("no python3 with h5py (make deps installs python3-h5py)")
	}
	sp, dir := interruptedRun(t)
	path := filepath.Join(dir, runfolder.FieldsFile)
	out, err := exec.Command(py, "-c", `
import sys, h5py
f = h5py.File(sys.argv[1], "r")
d = f["/snapshots/000001/u"]
print(d.id.get_chunk_info(0).byte_offset)
`, path).Output()
	if err != nil {
		t.Fatalf("h5py: %v", err)
	}
	off, err := strconv.ParseInt(strings.TrimSpace(string(out)), 10, 64)
	if err != nil {
		t.Fatal(err)
	}
	f, err := os.OpenFile(path, os.O_RDWR, 0)
	if err != nil {
		t.Fatal(err)
	}
	junk := make([]byte, 64)
	for i := range junk {
		junk[i] = byte(37*i + 11)
	}
	if _, err := f.WriteAt(junk, off+16); err != nil {
		t.Fatal(err)
	}
	f.Close()
	res, err := Run(context.Background(), sp, Options{Dir: dir, Resume: true})
	if err != nil {
		t.Fatalf("resume with a damaged fields.h5: %v", err)
	}
	w := strings.Join(res.Warnings, "\n")
	if !strings.Contains(w, "/snapshots/000001/u (t = 1.") || !strings.Contains(w, "does not read back") || !strings.Contains(w, "lost the snapshot(s) at t = 1.") || !strings.Contains(w, ".damaged-") {
		t.Errorf("warnings %q", res.Warnings)
	}
	// Snapshots fall at the first step past each second: kept at t = 0,
	// about 2 and 3, and 4 at the end; the one near 1 s is lost.
	times := readsWhole(t, path)
	if len(times) != 4 || times[0] != 0 || times[3] != 4 || times[1] < 1.5 || times[1] > 2.5 {
		t.Errorf("snapshots at %v, want 0, about 2 and 3, and 4", times)
	}
}

// TestResumeRebuildsTruncatedFields: a fields.h5 cut short (a full disk, a
// copy that stopped) is moved aside and rebuilt on resume.
func TestResumeRebuildsTruncatedFields(t *testing.T) {
	sp, dir := interruptedRun(t)
	path := filepath.Join(dir, runfolder.FieldsFile)
	st, err := os.Stat(path)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.Truncate(path, st.Size()/3); err != nil {
		t.Fatal(err)
	}
	res, err := Run(context.Background(), sp, Options{Dir: dir, Resume: true})
	if err != nil {
		t.Fatalf("resume with a truncated fields.h5: %v", err)
	}
	if w := strings.Join(res.Warnings, "\n"); !strings.Contains(w, "rebuilt from the checkpoint") || !strings.Contains(w, "kept as fields.h5.damaged-") {
		t.Errorf("warnings %q", res.Warnings)
	}
	if times := readsWhole(t, path); len(times) == 0 || times[len(times)-1] != 4 {
		t.Errorf("snapshots of the rebuilt file at %v", times)
	}
}

// TestResumeEditedCase: a case.toml edited after the run started is named
// with the keys that changed, and the started case is put beside it.
func TestResumeEditedCase(t *testing.T) {
	_, dir := interruptedRun(t)
	edited := strings.Replace(smallCanopyCase, "duration = 4.0", "duration = 5.0", 1)
	_, err := Run(context.Background(), parseSpec(t, edited), Options{Dir: dir, Resume: true})
	if err == nil || !strings.Contains(err.Error(), "was edited after the run started: time.duration (4.0 → 5.0)") || strings.Contains(err.Error(), "resume with the") {
		t.Fatalf("resume of an edited case: %v", err)
	}
	b, err := os.ReadFile(filepath.Join(dir, runfolder.StartedCaseFile))
	if err != nil || string(b) != smallCanopyCase {
		t.Errorf("%s: %v, want the started case", runfolder.StartedCaseFile, err)
	}
}
