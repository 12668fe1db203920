package runs

import (
	"context"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"rollerbed/io/runfolder"
)

// tidalBladesCase is smallCanopyCase as a meadow of flexible blades under a
// reversing tide of 2 s, with phase statistics.
var tidalBladesCase = strings.NewReplacer(
	"bulk_velocity = 0.05", "bulk_velocity = 0.01\nramp = 0.5\ntide_reverses = true\n[[forcing.tide]]\namplitude = 0.06\nperiod = 2.0",
	"diameter = 0.004", "diameter = 0.004\nshape = \"blade\"\nblade_modulus = 2.0e7\nblade_thickness = 2.0e-4\nblade_density = 950.0",
	"uptake = \"hilpert\"", "uptake = \"plate\"",
	"viscosity = 1.0e-5", "viscosity = 1.0e-5\ndensity = 1025.0",
	"probes = 4", "probes = 4\nphase_bins = 4",
).Replace(smallCanopyCase)

// TestWavesResumeIsBitForBit: a run with a tide, bending blades and phase
// statistics, stopped part-way and resumed, writes exactly the files of an
// uninterrupted run, the tables by phase included.
func TestWavesResumeIsBitForBit(t *testing.T) {
	sp := parseSpec(t, tidalBladesCase)
	full := filepath.Join(t.TempDir(), "full")
	if _, err := Run(context.Background(), sp, Options{Dir: full}); err != nil {
		t.Fatal(err)
	}
	part := filepath.Join(t.TempDir(), "part")
	ctx, cancel := context.WithCancel(context.Background())
	res, err := Run(ctx, sp, Options{Dir: part, Progress: func(p Progress) {
		if p.SimTime > 2.3 {
			cancel()
		}
	}})
	if err != nil {
		t.Fatal(err)
	}
	if !res.Interrupted {
		t.Fatal("the run was not interrupted")
	}
	if _, err := Run(context.Background(), sp, Options{Dir: part, Resume: true}); err != nil {
		t.Fatal(err)
	}
	a, b := outputs(t, full), outputs(t, part)
	for _, f := range []string{runfolder.PhaseProfilesFile, runfolder.PhaseCycleFile} {
		ba, err := os.ReadFile(filepath.Join(full, f))
		if err != nil {
			t.Fatal(err)
		}
		bb, err := os.ReadFile(filepath.Join(part, f))
		if err != nil {
			t.Fatal(err)
		}
		a[f], b[f] = ba, bb
	}
	sameOutputs(t, a, b)
	sum, err := runfolder.ReadSummary(part)
	if err != nil {
		t.Fatal(err)
	}
	fl := sum.Canopy.Flexible
	if sum.Phases == nil || sum.Phases.Bins != 4 || sum.Phases.OscillatingRatio == nil || fl == nil {
		t.Fatalf("summary phases %+v, flexible %+v", sum.Phases, fl)
	}
	// The tide bends the blades below their length and lets them rise at
	// slack water.
	if !(fl.MinHeight < 0.9*fl.Length) || !(fl.MaxHeight > fl.MinHeight) || fl.MaxHeight > fl.Length*(1+1e-12) {
		t.Errorf("bent height from %g to %g m for blades %g m long", fl.MinHeight, fl.MaxHeight, fl.Length)
	}
}

// TestStiffBladesAreRigid: blades too stiff to bend give the rigid canopy's
// run bit for bit (the bending rewrites the drag with the rigid values).
func TestStiffBladesAreRigid(t *testing.T) {
	rigid := strings.NewReplacer("diameter = 0.004", "diameter = 0.004\nshape = \"blade\"",
		"uptake = \"hilpert\"", "uptake = \"plate\"").Replace(smallCanopyCase)
	stiff := strings.NewReplacer("diameter = 0.004", "diameter = 0.004\nshape = \"blade\"\nblade_modulus = 1.0e30\nblade_thickness = 1.0e-3\nblade_density = 1000.0",
		"uptake = \"hilpert\"", "uptake = \"plate\"",
		"viscosity = 1.0e-5", "viscosity = 1.0e-5\ndensity = 1025.0").Replace(smallCanopyCase)
	dirs := [2]string{filepath.Join(t.TempDir(), "rigid"), filepath.Join(t.TempDir(), "stiff")}
	for i, text := range []string{rigid, stiff} {
		if _, err := Run(context.Background(), parseSpec(t, text), Options{Dir: dirs[i]}); err != nil {
			t.Fatal(err)
		}
	}
	a, b := outputs(t, dirs[0]), outputs(t, dirs[1])
	// The time series of the stiff blades has the bent height too.
	delete(a, runfolder.TimeSeriesFile)
	delete(b, runfolder.TimeSeriesFile)
	sameOutputs(t, a, b)
	ts, err := runfolder.ReadTimeSeries(dirs[1])
	if err != nil {
		t.Fatal(err)
	}
	for _, h := range ts.BentHeight {
		if h < 0.08*(1-1e-15) || h > 0.08*(1+1e-15) {
			t.Fatalf("stiff blades bent to %g m, want their length 0.08 m", h)
		}
	}
}

func TestWaveWarnings(t *testing.T) {
	long := strings.Replace(tidalBladesCase, "duration = 4.0", "duration = 8.0", 1)
	short := strings.Replace(tidalBladesCase, "duration = 4.0", "duration = 3.0", 1)
	waves := strings.NewReplacer("bulk_velocity = 0.01\nramp = 0.5\ntide_reverses = true\n[[forcing.tide]]\namplitude = 0.06\nperiod = 2.0",
		"gradient = 1.0e-4\n[[forcing.wave]]\namplitude = 0.05\nperiod = 2.0").Replace(long)
	tests := []struct {
		name, text string
		want       []string
	}{
		{"enough cycles", long, nil},
		{"too few cycles", short, []string{"cover 1 cycles of the 2 s forcing period; averages by phase need at least 3: raise time.duration to 7 s"}},
		{"short excursion", waves, []string{"the wave excursion A/ω² ≈ 0.00507 m is shorter than the blades (0.08 m)"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := waveWarnings(parseSpec(t, tt.text))
			if len(got) != len(tt.want) {
				t.Fatalf("warnings %q, want %d", got, len(tt.want))
			}
			for i, w := range tt.want {
				if !strings.Contains(got[i], w) {
					t.Errorf("warning %q, want one containing %q", got[i], w)
				}
			}
		})
	}
}

// TestOscillationsFromCase: phases in degrees become radians, and a tide
// holds its direction unless the case lets it reverse.
func TestOscillationsFromCase(t *testing.T) {
	oneWay := strings.Replace(tidalBladesCase, "tide_reverses = true\n", "", 1)
	for _, tt := range []struct {
		text    string
		reverse bool
	}{{tidalBladesCase, true}, {oneWay, false}} {
		text := strings.Replace(tt.text, "period = 2.0", "period = 2.0\nphase = 90.0", 1)
		f := parseSpec(t, text).Solver.Forcing
		if len(f.Tides) != 1 || math.Abs(f.Tides[0].Phase-math.Pi/2) > 1e-15 || f.Ramp != 0.5 || f.OneWay == tt.reverse {
			t.Errorf("forcing %+v, want a tide at phase π/2, ramp 0.5 s, one-way %v", f, !tt.reverse)
		}
	}
}
