package runs

import (
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"testing"

	"rollerbed/io/casefile"
	"rollerbed/io/h5"
	"rollerbed/io/report"
	"rollerbed/io/runfolder"
)

var update = flag.Bool("update", false, "rewrite the golden run folders in testdata/golden")

// goldenVolatile are the summary.json keys (flattened with dots) that
// change from run to run or from build to build, and so are left out of
// the golden comparison.
var goldenVolatile = map[string]bool{
	"run.wall_time_s": true,
	"run.version":     true,
	// The provenance names the build, the libraries, the host and the
	// command line of the process that wrote the summary: all differ from
	// machine to machine and build to build.
	"provenance.version":           true,
	"provenance.revision":          true,
	"provenance.revision_time":     true,
	"provenance.revision_modified": true,
	"provenance.go_version":        true,
	"provenance.hdf5_version":      true,
	"provenance.fftw_version":      true,
	"provenance.host":              true,
	"provenance.command_line":      true,
}

// TestExampleOutputsGolden runs every embedded example case on a small grid
// for a short time and compares every file of its run folder with the
// golden copy in testdata/golden: the CSV tables, the case text and the
// XDMF sidecar byte for byte, summary.json value for value (bits of every
// number; keys added since the golden copy was written are allowed), and
// fields.h5 through a digest of every dataset's bits. Refactors must keep
// this test green without -update: results stay bit-identical.
// Common practice, no source.
func TestExampleOutputsGolden(t *testing.T) {
	if testing.Short() {
		t.Skip("runs every example case")
	}
	for _, name := range Examples() {
		if slabExample(t, name) {
			// A slab example shrunk to 64 × 32 cells keeps its spanwise
			// cells and runs for minutes, not seconds; the slab's outputs
			// are held by TestSlabRun on a grid of its own instead.
			continue
		}
		t.Run(name, func(t *testing.T) {
			dir := t.TempDir()
			runShrunkExample(t, name, dir)
			golden := filepath.Join("testdata", "golden", name)
			if _, _, err := report.WriteFigures(dir); err != nil {
				t.Fatalf("figures: %v", err)
			}
			got := goldenFiles(t, dir)
			if *update {
				if err := os.RemoveAll(golden); err != nil {
					t.Fatal(err)
				}
				if err := os.MkdirAll(golden, 0o755); err != nil {
					t.Fatal(err)
				}
				for f, b := range got {
					if err := os.WriteFile(filepath.Join(golden, f), b, 0o644); err != nil {
						t.Fatal(err)
					}
				}
				return
			}
			ents, err := os.ReadDir(golden)
			if err != nil {
				t.Fatalf("%v (write the golden files with go test ./runs -run Golden -update)", err)
			}
			for _, e := range ents {
				want, err := os.ReadFile(filepath.Join(golden, e.Name()))
				if err != nil {
					t.Fatal(err)
				}
				b, ok := got[e.Name()]
				if !ok {
					t.Errorf("%s: the run no longer writes it", e.Name())
					continue
				}
				if e.Name() == "summary.json" {
					compareSummaries(t, want, b)
					continue
				}
				if !bytes.Equal(b, want) {
					t.Errorf("%s differs from %s:\n%s", e.Name(), filepath.Join(golden, e.Name()), firstDifference(want, b))
				}
			}
		})
	}
}

// slabExample reports whether the named example is a three-dimensional
// slab.
func slabExample(t *testing.T, name string) bool {
	_, c := parseExample(t, name)
	return c.Domain.Slab()
}

// parseExample returns the text of the named example and its case.
func parseExample(t *testing.T, name string) ([]byte, *casefile.Case) {
	t.Helper()
	text, err := Example(name)
	if err != nil {
		t.Fatal(err)
	}
	c, err := casefile.Parse(text)
	if err != nil {
		t.Fatalf("example %s: %v", name, err)
	}
	return text, c
}

// runShrunkExample runs the named example on a 64 × 32 grid for a few
// hundred steps at most into dir. The case text itself is edited, so the
// case.toml of the run folder says what was run.
func runShrunkExample(t *testing.T, name, dir string) {
	t.Helper()
	text, c := parseExample(t, name)
	var err error
	d := math.Min(c.Time.Duration, 24)
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
	s := string(text)
	for _, kv := range [][3]string{
		{"domain", "nx", "64"}, {"domain", "nz", "32"},
		{"time", "duration", g(d)}, {"time", "spin_up", g(d / 4)},
		{"output", "profile_every", g(d / 20)}, {"output", "snapshot_every", g(d / 3)},
		{"output", "checkpoint_every", g(d / 2)}, {"output", "probes", "3"},
		{"numerics", "workers", "1"},
	} {
		s = setKey(s, kv[0], kv[1], kv[2])
	}
	if c, err = casefile.Parse([]byte(s)); err != nil {
		t.Fatalf("example %s shrunk: %v", name, err)
	}
	sp, err := FromCase(c, "")
	if err != nil {
		t.Fatalf("example %s: %v", name, err)
	}
	res, err := Run(context.Background(), sp, Options{Dir: dir})
	if err != nil {
		t.Fatalf("example %s: %v", name, err)
	}
	if res.Interrupted {
		t.Fatalf("example %s: interrupted", name)
	}
}

// setKey sets key = value in [table] of a case text: it replaces the key's
// line, or adds the line after the table's header, or adds the table at the
// end. It knows just the layout of the example cases (one key a line,
// no inline tables).
func setKey(text, table, key, value string) string {
	lines := strings.Split(text, "\n")
	in, header := false, -1
	for i, l := range lines {
		tl := strings.TrimSpace(l)
		if strings.HasPrefix(tl, "[") {
			in = tl == "["+table+"]"
			if in {
				header = i
			}
			continue
		}
		if in {
			if k, _, ok := strings.Cut(tl, "="); ok && strings.TrimSpace(k) == key {
				lines[i] = key + " = " + value
				return strings.Join(lines, "\n")
			}
		}
	}
	if header < 0 {
		return text + "\n[" + table + "]\n" + key + " = " + value + "\n"
	}
	lines = append(lines[:header+1], append([]string{key + " = " + value}, lines[header+1:]...)...)
	return strings.Join(lines, "\n")
}

// goldenFiles returns the comparable files of a run folder by name:
// every file but the checkpoints (their bits hold the wall-clock
// provenance) and run.log (timings), with fields.h5 replaced by a digest
// of its datasets and the figures by one of their bytes.
func goldenFiles(t *testing.T, dir string) map[string][]byte {
	t.Helper()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	out := map[string][]byte{}
	for _, e := range ents {
		n := e.Name()
		switch {
		case n == "figures" && e.IsDir():
			out["figures.digest"] = filesDigest(t, filepath.Join(dir, n))
		case e.IsDir(), strings.HasPrefix(n, "checkpoint-"), n == "run.log", n == runfolder.LockFile:
		case n == "fields.h5":
			out["fields.digest"] = fieldsDigest(t, filepath.Join(dir, n))
		default:
			b, err := os.ReadFile(filepath.Join(dir, n))
			if err != nil {
				t.Fatal(err)
			}
			out[n] = b
		}
	}
	return out
}

// filesDigest lists the files of a folder with the SHA-256 of each.
func filesDigest(t *testing.T, dir string) []byte {
	t.Helper()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var b strings.Builder
	for _, e := range ents {
		data, err := os.ReadFile(filepath.Join(dir, e.Name()))
		if err != nil {
			t.Fatal(err)
		}
		fmt.Fprintf(&b, "%s %x\n", e.Name(), sha256.Sum256(data))
	}
	return []byte(b.String())
}

// fieldsDigest describes every dataset of a fields file with the SHA-256
// of its values' bits, a line each.
func fieldsDigest(t *testing.T, path string) []byte {
	t.Helper()
	var b strings.Builder
	hash := func(v []float64) string {
		h := sha256.New()
		for _, x := range v {
			fmt.Fprintf(h, "%016x", math.Float64bits(x))
		}
		return fmt.Sprintf("%x", h.Sum(nil))
	}
	g, err := h5.ReadGrid(path)
	if err != nil {
		t.Fatal(err)
	}
	fmt.Fprintf(&b, "grid Lx=%x H=%x x=%s zc=%s zf=%s\n", math.Float64bits(g.Lx), math.Float64bits(g.H), hash(g.X), hash(g.Zc), hash(g.Zf))
	for _, s := range []string{"/canopy/frontal_area", "/canopy/surface_area"} {
		if f, err := h5.ReadField(path, s); err == nil {
			fmt.Fprintf(&b, "%s %dx%d %s %s\n", s, f.Rows, f.Cols, f.Units, hash(f.Data))
		}
	}
	snaps, err := h5.ListSnapshots(path)
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range snaps {
		fmt.Fprintf(&b, "%s t=%x step=%d\n", s.Group, math.Float64bits(s.Time), s.Step)
		for _, fi := range s.Fields {
			f, err := h5.ReadField(path, s.Group+"/"+fi.Name)
			if err != nil {
				t.Fatal(err)
			}
			fmt.Fprintf(&b, "  %s %dx%d %s %s\n", fi.Name, f.Rows, f.Cols, f.Units, hash(f.Data))
		}
	}
	return []byte(b.String())
}

// compareSummaries checks that every value of the golden summary.json is
// in the new one with the same bits, leaving out goldenVolatile keys.
func compareSummaries(t *testing.T, want, got []byte) {
	t.Helper()
	w, g := flatJSON(t, want), flatJSON(t, got)
	keys := make([]string, 0, len(w))
	for k := range w {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		if goldenVolatile[k] {
			continue
		}
		gv, ok := g[k]
		if !ok {
			t.Errorf("summary.json: %s is gone (golden value %s)", k, w[k])
			continue
		}
		if gv != w[k] {
			t.Errorf("summary.json: %s = %s, golden %s", k, gv, w[k])
		}
	}
}

// flatJSON flattens a JSON object to dotted keys and the raw text of each
// value, so numbers compare by their printed (shortest round-trip) digits.
func flatJSON(t *testing.T, b []byte) map[string]string {
	t.Helper()
	var v any
	dec := json.NewDecoder(bytes.NewReader(b))
	dec.UseNumber()
	if err := dec.Decode(&v); err != nil {
		t.Fatalf("summary.json: %v", err)
	}
	out := map[string]string{}
	var walk func(prefix string, v any)
	walk = func(prefix string, v any) {
		switch x := v.(type) {
		case map[string]any:
			for k, e := range x {
				walk(strings.TrimPrefix(prefix+"."+k, "."), e)
			}
		case []any:
			for i, e := range x {
				walk(fmt.Sprintf("%s[%d]", prefix, i), e)
			}
		default:
			out[prefix] = fmt.Sprint(x)
		}
	}
	walk("", v)
	return out
}

// firstDifference shows the first line where two texts part.
func firstDifference(want, got []byte) string {
	wl, gl := strings.Split(string(want), "\n"), strings.Split(string(got), "\n")
	for i := 0; i < len(wl) || i < len(gl); i++ {
		var a, b string
		if i < len(wl) {
			a = wl[i]
		}
		if i < len(gl) {
			b = gl[i]
		}
		if a != b {
			return fmt.Sprintf("line %d\n  golden: %.200s\n  now:    %.200s", i+1, a, b)
		}
	}
	return "same lines, other bytes"
}
