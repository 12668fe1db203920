package runs

import (
	"context"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"testing"

	"rollerbed/io/casefile"
)

func demoSpec(t *testing.T) *Spec {
	t.Helper()
	c, err := casefile.Parse(Demo())
	if err != nil {
		t.Fatalf("demo case does not parse: %v", err)
	}
	sp, err := FromCase(c)
	if err != nil {
		t.Fatal(err)
	}
	return sp
}

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
		if _, err := FromCase(c); err != nil {
			t.Errorf("%s: %v", name, err)
		}
	}
	if _, err := Example("no-such-case"); err == nil {
		t.Error("unknown example accepted")
	}
}

func TestRunWritesFolderAndRefusesToOverwrite(t *testing.T) {
	sp := demoSpec(t)
	sp.Duration = 5
	dir := filepath.Join(t.TempDir(), "run")
	res, err := Run(context.Background(), sp, Options{Dir: dir})
	if err != nil {
		t.Fatal(err)
	}
	if res.Steps == 0 || res.SimTime != 5 {
		t.Errorf("result %+v", res)
	}
	for _, f := range []string{"case.toml", "profile.csv", "timeseries.csv", "summary.json"} {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Errorf("missing %s: %v", f, err)
		}
	}
	b, _ := os.ReadFile(filepath.Join(dir, "summary.json"))
	var sum map[string]map[string]any
	if err := json.Unmarshal(b, &sum); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"steps", "sim_time_s", "wall_time_s", "nx", "nz", "version"} {
		if _, ok := sum["run"][k]; !ok {
			t.Errorf("summary.json lacks run.%s", k)
		}
	}
	if d := sum["flow"]["max_divergence"].(float64); !(d < 1e-12) {
		t.Errorf("max divergence %g", d)
	}
	before, _ := os.ReadFile(filepath.Join(dir, "profile.csv"))
	_, err = Run(context.Background(), sp, Options{Dir: dir})
	if !errors.Is(err, ErrFolderInUse) {
		t.Fatalf("second run into the same folder: %v, want ErrFolderInUse", err)
	}
	after, _ := os.ReadFile(filepath.Join(dir, "profile.csv"))
	if string(before) != string(after) {
		t.Error("refused run still changed the folder")
	}
	if _, err := Run(context.Background(), sp, Options{Dir: dir, Force: true}); err != nil {
		t.Errorf("--force run: %v", err)
	}
}

func TestRunStopsWhenCancelled(t *testing.T) {
	sp := demoSpec(t)
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	res, err := Run(ctx, sp, Options{Dir: t.TempDir()})
	if err != nil {
		t.Fatal(err)
	}
	if !res.Interrupted || res.SimTime != 0 {
		t.Errorf("result %+v, want an interrupted run at t = 0", res)
	}
}

func TestEstimate(t *testing.T) {
	sp := demoSpec(t)
	e, err := EstimateRun(sp)
	if err != nil {
		t.Fatal(err)
	}
	// Laminar open-channel centre-line speed Π H²/(2ν) bounds the scale
	// (White, Viscous Fluid Flow; derived).
	lam := sp.Solver.Forcing.Gradient * sp.Solver.H * sp.Solver.H / (2 * sp.Solver.Viscosity)
	if e.VelocityScale <= 0 || e.VelocityScale > lam*(1+1e-9) {
		t.Errorf("velocity scale %g, want in (0, %g]", e.VelocityScale, lam)
	}
	if e.Steps <= 0 || e.StepCost <= 0 || e.MemoryBytes <= 0 {
		t.Errorf("estimate %+v", e)
	}
}
