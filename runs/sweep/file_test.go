package sweep

import (
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"rollerbed/io/stricttoml"
)

// TestSweepLines checks the lines problems of a sweep file get: of the
// key, of an array element, of an inline table's keys, of the enclosing
// table for a key the file does not hold.
func TestSweepLines(t *testing.T) {
	text := `# a comment with key = "x"
title = "t = 1"   # trailing
base = 'base.toml'
extra.note = """
not = a key
"""

[[axis]]
key = "canopy.height"
values = [
  0.1,  # a = 1
  0.2,
]

[[axis]]
key = "canopy.frontal_area"
log = { from = 1.0, to = 8.0, count = 4 }

[axis.linear]
from = 1

[slurm]
memory = "4G"
extra = ["--qos=a", "--x=[y]"]
`
	pos, deep := stricttoml.Scan(text)
	if deep != 0 {
		t.Fatalf("refused at line %d", deep)
	}
	for key, line := range map[string]int{
		"title": 2, "base": 3, "extra.note": 4, "not": 0,
		"axis[0]": 8, "axis[0].key": 9, "axis[0].values": 10, "axis[0].values[1]": 12,
		"axis[1]": 15, "axis[1].key": 16, "axis[1].log": 17, "axis[1].log.from": 17, "axis[1].log.count": 17,
		"axis[1].linear": 19, "axis[1].linear.from": 20,
		"slurm": 22, "slurm.memory": 23, "slurm.extra": 24, "slurm.extra[1]": 24, "slurm.partition": 22,
		"seeds": 0, "axis[2].key": 8,
	} {
		if l := stricttoml.LineOf(pos, key); l != line {
			t.Errorf("line of %s = %d, want %d", key, l, line)
		}
	}
}

func TestParseEverything(t *testing.T) {
	f, err := Load(filepath.Join("testdata", "everything.toml"))
	if err != nil {
		t.Fatal(err)
	}
	if f.Title != "test: every key" || f.Combine != CombineZip || !reflect.DeepEqual(f.Seeds, []int64{7, 9}) || len(f.Axes) != 3 {
		t.Fatalf("parsed %+v", f)
	}
	if a := f.Axes[1]; a.Spacing != SpacingLinear || !reflect.DeepEqual(a.Values, []any{0.04, 0.05, 0.06}) {
		t.Errorf("axis 1: %+v", a)
	}
	if a := f.Axes[0]; a.Spacing != SpacingLog || !reflect.DeepEqual(a.Values, []any{4.0, 8.0, 16.0}) {
		t.Errorf("axis 0: %+v", a)
	}
	bin, _ := filepath.Abs(filepath.Join("testdata", "bin", "rollerbed"))
	want := &Slurm{TimeLimit: "1-00:00:00", CPUsPerTask: 2, Memory: "500M", Partition: "short", Extra: []string{"--account=lab42", "--qos=normal"},
		Setup: []string{"module load hdf5", "export OMP_NUM_THREADS=1"}, Binary: bin}
	if !reflect.DeepEqual(f.Slurm, want) {
		t.Errorf("slurm %+v, want %+v", f.Slurm, want)
	}
	if f.BasePath != filepath.Join("testdata", "small", "base.toml") {
		t.Errorf("base path %q", f.BasePath)
	}
	pl, err := NewPlan(f)
	if err != nil {
		t.Fatal(err)
	}
	if len(pl.Members) != 6 {
		t.Errorf("%d members, want 3 zipped × 2 seeds", len(pl.Members))
	}
}

func TestExpandRange(t *testing.T) {
	tests := []struct {
		spacing  string
		from, to float64
		count    int
		want     []float64
	}{
		{SpacingLinear, 0, 1, 5, []float64{0, 0.25, 0.5, 0.75, 1}},
		{SpacingLinear, 1, -1, 3, []float64{1, 0, -1}},
		{SpacingLinear, 0.1, 0.7, 7, []float64{0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7}},
		{SpacingLog, 0.625, 25, 3, []float64{0.625, 3.95284707521, 25}},
		{SpacingLog, 1e-3, 1e3, 7, []float64{1e-3, 1e-2, 1e-1, 1, 10, 100, 1000}},
		{SpacingLog, 2, 9, 1, []float64{2}},
	}
	for _, tc := range tests {
		if got := expandRange(tc.spacing, tc.from, tc.to, tc.count); !reflect.DeepEqual(got, tc.want) {
			t.Errorf("%s %g..%g (%d): %v, want %v", tc.spacing, tc.from, tc.to, tc.count, got, tc.want)
		}
	}
}

func TestResolveKey(t *testing.T) {
	for _, key := range []string{"canopy.frontal_area", "domain.cluster.at", "canopy.patch[3].edge_width", "output.fields", "canopy.profile", "initial.seed", "title"} {
		if _, err := resolveKey(key); err != nil {
			t.Errorf("%s: %v", key, err)
		}
	}
	for key, want := range map[string]string{
		"":                     "is empty",
		"domain.nx.y":          "domain.nx is an integer, not a table",
		"canopy.patch[x].end":  "not a whole number",
		"canopy.patch[-1].end": "not a whole number",
		"canopy.patch[0]":      "whole [[canopy.patch]] element",
		"canopy..height":       "empty component",
		"canopy.Height":        "did you mean canopy.height?",
	} {
		_, err := resolveKey(key)
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("%q: %v, want %q", key, err, want)
		}
	}
}

func TestLoadMissingFile(t *testing.T) {
	_, err := Load(filepath.Join(t.TempDir(), "none.toml"))
	if !errors.Is(err, os.ErrNotExist) {
		t.Errorf("missing file: %v", err)
	}
}
