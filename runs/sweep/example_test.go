package sweep_test

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"rollerbed/runs"
	"rollerbed/runs/sweep"
)

// The example sweeps built into the binary plan, every member checked.
func TestExampleSweepsPlan(t *testing.T) {
	want := map[string]int{"canopy-density": 14, "filter-garden-height": 4}
	names := runs.SweepExamples()
	if len(names) != len(want) {
		t.Errorf("example sweeps %v, want %d", names, len(want))
	}
	for _, name := range names {
		files, err := runs.SweepExample(name)
		if err != nil {
			t.Fatal(err)
		}
		dir := t.TempDir()
		for fn, b := range files {
			os.WriteFile(filepath.Join(dir, fn), b, 0o644)
		}
		f, err := sweep.Load(filepath.Join(dir, name+".toml"))
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		pl, err := sweep.NewPlan(f)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if len(pl.Members) != want[name] {
			t.Errorf("%s: %d members, want %d", name, len(pl.Members), want[name])
		}
		if f.Slurm == nil || f.Title == "" {
			t.Errorf("%s: an example should show a title and a [slurm] table", name)
		}
		// The memory the example asks covers what its members need.
		if len(pl.Warnings) > 0 {
			t.Errorf("%s: %q", name, pl.Warnings)
		}
	}
	// The density sweep spans the sparse to the dense regime: C_D a h from
	// 0.05 to 2 (C_D = 1, h = 0.08 m).
	files, _ := runs.SweepExample("canopy-density")
	f, err := sweep.Parse(files["canopy-density.toml"], "")
	if err != nil {
		t.Fatal(err)
	}
	a := f.Axes[0].Values
	if lo, hi := a[0].(float64)*0.08, a[len(a)-1].(float64)*0.08; lo != 0.05 || hi != 2 {
		t.Errorf("C_D a h from %g to %g, want 0.05 to 2", lo, hi)
	}
	if _, err := runs.SweepExample("nope"); err == nil || !strings.Contains(err.Error(), "canopy-density") {
		t.Errorf("unknown example: %v", err)
	}
}

// A sweep file is parsed without reading its base case; the axes come out
// expanded.
func ExampleParse() {
	text := `
base = "flume.toml"
combine = "product"
replicates = 2

[[axis]]
key = "canopy.frontal_area"
log = { from = 1.0, to = 16.0, count = 3 }

[[axis]]
key = "forcing.bulk_velocity"
values = [0.05, 0.1]
`
	f, err := sweep.Parse([]byte(text), "sweeps/density.toml")
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("base:", f.BasePath)
	for _, a := range f.Axes {
		fmt.Println(a.Key, a.Spacing, a.Values)
	}
	fmt.Println("replicates:", f.Replicates)
	// Output:
	// base: sweeps/flume.toml
	// canopy.frontal_area log [1 4 16]
	// forcing.bulk_velocity values [0.05 0.1]
	// replicates: 2
}

// Mistakes in a sweep file are reported all at once, each with its line,
// the key, the value and the fix.
func ExampleParse_mistakes() {
	text := `base = "flume.toml"
combine = "zip"

[[axis]]
key = "canopy.frontal_aera"
values = [1.0, 2.0]

[[axis]]
key = "forcing.bulk_velocity"
log = { from = 0.0, to = 0.2, count = 3 }
`
	_, err := sweep.Parse([]byte(text), "density.toml")
	fmt.Println(err)
	// Output:
	// density.toml line 5: axis[0].key = "canopy.frontal_aera": is not a key of the case file: no "frontal_aera" in [canopy]; did you mean canopy.frontal_area?
	// density.toml line 10: axis[1].log.from = 0.0: must be > 0: a log range needs positive ends; use linear = {...} for a range through zero
}

func ExampleParsePlotSpec() {
	s, err := sweep.ParsePlotSpec("flow.penetration_depth_m:canopy.frontal_area")
	fmt.Println(s.Y, "against", s.X, err)
	_, err = sweep.ParsePlotSpec("flow.penetration_depth_m")
	fmt.Println(err)
	// Output:
	// flow.penetration_depth_m against canopy.frontal_area <nil>
	// --plot "flow.penetration_depth_m": write the metric and the parameter as Y:X, e.g. --plot flow.penetration_depth_m:canopy.frontal_area
}
