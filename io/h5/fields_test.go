package h5

import (
	"errors"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"rollerbed/io/diskspace"
)

func TestFieldsRoundTrip(t *testing.T) {
	for _, tc := range []struct {
		name     string
		compress int
	}{
		{"uncompressed", 0},
		{"deflate 1", 1},
		{"deflate 9", 9},
	} {
		t.Run(tc.name, func(t *testing.T) {
			path := writeTestRun(t, t.TempDir(), tc.compress, 3)

			snaps, err := ListSnapshots(path)
			if err != nil {
				t.Fatal(err)
			}
			if len(snaps) != 3 {
				t.Fatalf("%d snapshots, want 3", len(snaps))
			}
			for s, info := range snaps {
				if info.Index != s || info.Time != float64(s+1) || info.Step != 100*(s+1) || info.Group != "/snapshots/00000"+string(rune('0'+s)) {
					t.Errorf("snapshot %d: %+v", s, info)
				}
				names := []string{}
				for _, fi := range info.Fields {
					names = append(names, fi.Name)
				}
				if strings.Join(names, ",") != "p,u,w" {
					t.Errorf("snapshot %d fields %v, want p,u,w", s, names)
				}
				for _, want := range testFields(s) {
					got, err := ReadField(path, info.Group+"/"+want.Name)
					if err != nil {
						t.Fatal(err)
					}
					if !sameBits(got.Data, want.Data) {
						t.Errorf("snapshot %d field %s: values differ", s, want.Name)
					}
					if got.Rows != want.Rows || got.Cols != want.Cols || got.Units != want.Units ||
						got.Description != want.Description || got.Location != want.Location || got.Name != want.Name {
						t.Errorf("snapshot %d field %s: read %+v", s, want.Name, got)
					}
				}
			}

			g, err := ReadGrid(path)
			if err != nil {
				t.Fatal(err)
			}
			want := testGrid()
			if !sameBits(g.X, want.X) || !sameBits(g.Zc, want.Zc) || !sameBits(g.Zf, want.Zf) || g.Lx != want.Lx || g.H != want.H {
				t.Errorf("grid read back as %+v, want %+v", g, want)
			}
			a, err := ReadField(path, "/canopy/frontal_area")
			if err != nil {
				t.Fatal(err)
			}
			if !sameBits(a.Data, testFrontalArea()) || a.Units != "1/m" || a.Location != LocationCentre {
				t.Errorf("frontal area read back as %+v", a)
			}

			fl, err := Open(path)
			if err != nil {
				t.Fatal(err)
			}
			m, wm := fl.Meta(), testMeta(tc.compress)
			if m.Title != wm.Title || m.Version != wm.Version || m.CaseText != wm.CaseText ||
				m.Seed != wm.Seed || !m.Started.Equal(wm.Started) || m.Compress != wm.Compress {
				t.Errorf("meta read back as %+v, want %+v", m, wm)
			}
			if err := fl.Close(); err != nil {
				t.Fatal(err)
			}
		})
	}
}

func TestCreateErrors(t *testing.T) {
	dir := t.TempDir()
	existing := filepath.Join(dir, "old.h5")
	if err := os.WriteFile(existing, []byte("results of an earlier run"), 0o644); err != nil {
		t.Fatal(err)
	}
	notFolder := filepath.Join(dir, "plain-file")
	if err := os.WriteFile(notFolder, nil, 0o644); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name string
		path string
		meta Meta
		want string
		is   error
	}{
		{"file exists", existing, testMeta(0), "already exists", fs.ErrExist},
		{"missing folder", filepath.Join(dir, "no", "such", "fields.h5"), testMeta(0), "does not exist", nil},
		{"folder is a file", filepath.Join(notFolder, "fields.h5"), testMeta(0), "is a file, not a folder", nil},
		{"compression too high", filepath.Join(dir, "a.h5"), Meta{Compress: 10}, "deflate level from 1", nil},
		{"compression negative", filepath.Join(dir, "b.h5"), Meta{Compress: -1}, "deflate level from 1", nil},
		{"NUL in case text", filepath.Join(dir, "c.h5"), Meta{CaseText: "a\x00b"}, "NUL", nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Create(tc.path, tc.meta)
			if err == nil || !strings.Contains(err.Error(), tc.want) || !strings.Contains(err.Error(), filepath.Base(tc.path)) {
				t.Fatalf("error %v, want one naming %s and saying %q", err, tc.path, tc.want)
			}
			if tc.is != nil && !errors.Is(err, tc.is) {
				t.Errorf("error %v does not wrap %v", err, tc.is)
			}
		})
	}
	if b, _ := os.ReadFile(existing); string(b) != "results of an earlier run" {
		t.Error("Create changed an existing file")
	}
}

func TestWriteSnapshotErrors(t *testing.T) {
	path := filepath.Join(t.TempDir(), "fields.h5")
	noGrid, err := Create(filepath.Join(filepath.Dir(path), "nogrid.h5"), testMeta(0))
	if err != nil {
		t.Fatal(err)
	}
	if err := noGrid.WriteSnapshot(1, 1, testFields(0)); err == nil || !strings.Contains(err.Error(), "WriteGrid") {
		t.Errorf("snapshot before the grid: error %v, want one asking for WriteGrid", err)
	}
	if err := noGrid.WriteStatic("canopy/a", testFrontalArea(), testNz, testNx, "1/m", ""); err == nil || !strings.Contains(err.Error(), "WriteGrid") {
		t.Errorf("static before the grid: error %v, want one asking for WriteGrid", err)
	}

	fl := startTestRun(t, path, 0)
	if err := fl.WriteSnapshot(5, 50, testFields(0)); err != nil {
		t.Fatal(err)
	}
	with := func(mod func(f []Field) []Field) []Field { return mod(testFields(1)) }
	for _, tc := range []struct {
		name   string
		t      float64
		fields []Field
		want   string
	}{
		{"time not after the last", 5, testFields(1), "TruncateAfter"},
		{"time earlier", 4, testFields(1), "not after the last snapshot"},
		{"time NaN", math.NaN(), testFields(1), "not finite"},
		{"no fields", 6, nil, "no fields"},
		{"wrong rows", 6, with(func(f []Field) []Field { f[1].Location = LocationCentre; return f }), "the grid has 5 × 8"},
		{"unknown location", 6, with(func(f []Field) []Field { f[0].Location = "edge"; return f }), `use "centre" or "face"`},
		{"no units", 6, with(func(f []Field) []Field { f[0].Units = ""; return f }), "no units"},
		{"length mismatch", 6, with(func(f []Field) []Field { f[0].Data = f[0].Data[1:]; return f }), "39 values for 5 rows"},
		{"twice the same name", 6, with(func(f []Field) []Field { f[2].Name = "u"; return f }), "given twice"},
		{"slash in name", 6, with(func(f []Field) []Field { f[0].Name = "a/b"; return f }), "use letters, digits"},
		{"dot name", 6, with(func(f []Field) []Field { f[0].Name = ".."; return f }), "starts with '.'"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			err := fl.WriteSnapshot(tc.t, 60, tc.fields)
			if err == nil || !strings.Contains(err.Error(), tc.want) || !strings.Contains(err.Error(), path) {
				t.Fatalf("error %v, want one naming %s and saying %q", err, path, tc.want)
			}
		})
	}
	for _, tc := range []struct{ name, static, want string }{
		{"reserved group", "/snapshots/extra", "reserved"},
		{"reserved grid", "grid/extra", "reserved"},
		{"exists", "/canopy/frontal_area", "already exists"},
		{"bad name", "/canopy/frontal area", "use letters"},
	} {
		t.Run("static "+tc.name, func(t *testing.T) {
			err := fl.WriteStatic(tc.static, testFrontalArea(), testNz, testNx, "1/m", "")
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("error %v, want one saying %q", err, tc.want)
			}
		})
	}
	if err := fl.WriteGrid(testGrid()); err == nil || !strings.Contains(err.Error(), "already has its grid") {
		t.Errorf("second grid: error %v", err)
	}
	// None of the refused writes left anything behind.
	if err := fl.Close(); err != nil {
		t.Fatal(err)
	}
	snaps, err := ListSnapshots(path)
	if err != nil || len(snaps) != 1 {
		t.Fatalf("after the refused writes: %d snapshots (%v), want 1", len(snaps), err)
	}
}

func TestWriteGridErrors(t *testing.T) {
	for _, tc := range []struct {
		name string
		mod  func(g *GridInfo)
		want string
	}{
		{"empty x", func(g *GridInfo) { g.X = nil }, "X is empty"},
		{"decreasing z", func(g *GridInfo) { g.Zc[2] = g.Zc[1] }, "Zc[2]"},
		{"NaN x", func(g *GridInfo) { g.X[3] = math.NaN() }, "X[3]"},
		{"zero depth", func(g *GridInfo) { g.H = 0 }, "H = 0 m"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			fl, err := Create(filepath.Join(t.TempDir(), "fields.h5"), testMeta(0))
			if err != nil {
				t.Fatal(err)
			}
			g := testGrid()
			tc.mod(&g)
			if err := fl.WriteGrid(g); err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("error %v, want one saying %q", err, tc.want)
			}
		})
	}
}

func TestTruncateAfter(t *testing.T) {
	for _, tc := range []struct {
		name      string
		after     float64
		wantTimes []float64
	}{
		{"middle", 3, []float64{1, 2, 3}},
		{"between snapshots", 2.5, []float64{1, 2}},
		{"after the last", 10, []float64{1, 2, 3, 4, 5}},
		{"before the first", 0.5, nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			path := writeTestRun(t, t.TempDir(), 0, 5)
			fl, err := Open(path)
			if err != nil {
				t.Fatal(err)
			}
			if err := fl.TruncateAfter(tc.after); err != nil {
				t.Fatal(err)
			}
			check := func(want []float64) {
				t.Helper()
				snaps, err := ListSnapshots(path)
				if err != nil {
					t.Fatal(err)
				}
				if len(snaps) != len(want) {
					t.Fatalf("%d snapshots, want %d", len(snaps), len(want))
				}
				for i, s := range snaps {
					if s.Time != want[i] || s.Index != i {
						t.Errorf("snapshot %d: index %d, t = %g s; want index %d, t = %g s", i, s.Index, s.Time, i, want[i])
					}
				}
				if got := sidecarTimes(t, SidecarPath(path)); !equalFloats(got, want) {
					t.Errorf("sidecar times %v, want %v", got, want)
				}
			}
			check(tc.wantTimes)
			// The run continues: the next snapshot takes the next index.
			next := float64(len(tc.wantTimes)) + 0.5
			if err := fl.WriteSnapshot(next, 7, testFields(9)); err != nil {
				t.Fatal(err)
			}
			if err := fl.Close(); err != nil {
				t.Fatal(err)
			}
			check(append(tc.wantTimes, next))
		})
	}
}

func equalFloats(a, b []float64) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

func TestDiskFullLeavesFileIntact(t *testing.T) {
	path := filepath.Join(t.TempDir(), "fields.h5")
	fl := startTestRun(t, path, 0)
	if err := fl.WriteSnapshot(1, 1, testFields(0)); err != nil {
		t.Fatal(err)
	}
	before, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	defer func(f func(string) (uint64, bool)) { freeSpace = f }(freeSpace)
	freeSpace = func(string) (uint64, bool) { return 1 << 20, true }

	err = fl.WriteSnapshot(2, 2, testFields(1))
	if err == nil || !strings.Contains(err.Error(), "not enough disk space") || !strings.Contains(err.Error(), "intact") {
		t.Fatalf("error %v, want one about disk space", err)
	}
	after, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if string(before) != string(after) {
		t.Error("the refused snapshot changed the file")
	}
	if len(fl.Snapshots()) != 1 {
		t.Errorf("%d snapshots after the refusal, want 1", len(fl.Snapshots()))
	}
	err = WriteCheckpoint(filepath.Dir(path), testCheckpoint(1, 10))
	if err == nil || !strings.Contains(err.Error(), "not enough disk space") {
		t.Errorf("checkpoint on a full disk: error %v", err)
	}
	freeSpace = diskspace.Free
	if err := fl.WriteSnapshot(2, 2, testFields(1)); err != nil {
		t.Fatalf("after space was freed: %v", err)
	}
}

func TestReadOnlyFile(t *testing.T) {
	if os.Geteuid() == 0 {
		t.Skip("running as root, for whom file permissions do not stop writes; run as a normal user to check read-only files")
	}
	path := filepath.Join(t.TempDir(), "fields.h5")
	fl := startTestRun(t, path, 0)
	if err := fl.WriteSnapshot(1, 1, testFields(0)); err != nil {
		t.Fatal(err)
	}
	if err := os.Chmod(path, 0o444); err != nil {
		t.Fatal(err)
	}
	err := fl.WriteSnapshot(2, 2, testFields(1))
	if err == nil || !strings.Contains(err.Error(), path) || !strings.Contains(err.Error(), "writable") {
		t.Fatalf("error %v, want one naming the file and asking for write permission", err)
	}
	if snaps, err := ListSnapshots(path); err != nil || len(snaps) != 1 {
		t.Errorf("read-only file: %d snapshots (%v), want 1", len(snaps), err)
	}
	if _, err := Open(path); err == nil || !strings.Contains(err.Error(), "writable") {
		t.Errorf("Open of a read-only file: error %v", err)
	}
}

func TestOpenErrors(t *testing.T) {
	dir := t.TempDir()
	notH5 := filepath.Join(dir, "notes.h5")
	os.WriteFile(notH5, []byte("not an HDF5 file"), 0o644)
	otherH5 := filepath.Join(dir, "other.h5")
	func() {
		defer enter()()
		f, err := createFile(otherH5, true)
		if err != nil {
			t.Fatal(err)
		}
		f.close()
	}()
	for _, tc := range []struct{ name, path, want string }{
		{"missing", filepath.Join(dir, "none.h5"), "does not exist"},
		{"not HDF5", notH5, "may not be an HDF5 file"},
		{"foreign HDF5", otherH5, "not a rollerbed fields file"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Open(tc.path)
			if err == nil || !strings.Contains(err.Error(), tc.want) || !strings.Contains(err.Error(), tc.path) {
				t.Fatalf("error %v, want one naming %s and saying %q", err, tc.path, tc.want)
			}
		})
	}
	if _, err := ListSnapshots(notH5); err == nil || !strings.Contains(err.Error(), "h5dump") {
		t.Errorf("ListSnapshots of a non-HDF5 file: error %v", err)
	}
}

func TestWriteAfterClosePanics(t *testing.T) {
	path := filepath.Join(t.TempDir(), "fields.h5")
	fl := startTestRun(t, path, 0)
	if err := fl.Close(); err != nil {
		t.Fatal(err)
	}
	if err := fl.Close(); err != nil {
		t.Errorf("second Close: %v", err)
	}
	defer func() {
		if recover() == nil {
			t.Error("WriteSnapshot after Close did not panic")
		}
	}()
	fl.WriteSnapshot(1, 1, testFields(0))
}
