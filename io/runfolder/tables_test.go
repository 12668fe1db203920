package runfolder

import (
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

// TestTablesRoundTrip writes every table of the run folder and reads it
// back to the same bits, and checks the header row that scripts read
// (the file format; common practice, no source).
func TestTablesRoundTrip(t *testing.T) {
	z := []float64{0.01, 0.03, 1.0 / 3}
	v := func(s float64) []float64 { return []float64{s, -s / 7, s * 1e-17} }
	cases := []struct {
		file   string
		header string
		write  func(dir string) error
		read   func(dir string) (any, error)
		want   any
	}{
		{ProfileFile, `"z [m]","U [m/s]"`,
			ProfileTable{z, v(1)}.Write,
			func(d string) (any, error) { return ReadProfile(d) },
			ProfileTable{z, v(1)}},
		{ProfilesFile, `"z [m]","U [m/s]","u'u' [m2/s2]","w'w' [m2/s2]","u'w' [m2/s2]","subgrid stress [m2/s2]","TKE [m2/s2]","nu_t [m2/s]","dispersive stress [m2/s2]"`,
			ProfilesTable{z, v(1), v(2), v(3), v(4), v(5), v(6), v(7), v(8), nil}.Write,
			func(d string) (any, error) { return ReadProfiles(d) },
			ProfilesTable{z, v(1), v(2), v(3), v(4), v(5), v(6), v(7), v(8), nil}},
		// A slab's table ends with v'v'.
		{ProfilesFile, `"z [m]","U [m/s]","u'u' [m2/s2]","w'w' [m2/s2]","u'w' [m2/s2]","subgrid stress [m2/s2]","TKE [m2/s2]","nu_t [m2/s]","dispersive stress [m2/s2]","v'v' [m2/s2]"`,
			ProfilesTable{z, v(1), v(2), v(3), v(4), v(5), v(6), v(7), v(8), v(9)}.Write,
			func(d string) (any, error) { return ReadProfiles(d) },
			ProfilesTable{z, v(1), v(2), v(3), v(4), v(5), v(6), v(7), v(8), v(9)}},
		{TimeSeriesFile, `"t [s]","dt [s]","bulk velocity [m/s]","pressure gradient [m/s2]","Courant number"`,
			TimeSeriesTable{z, v(1), v(2), v(3), v(4), nil}.Write,
			func(d string) (any, error) { return ReadTimeSeries(d) },
			TimeSeriesTable{z, v(1), v(2), v(3), v(4), nil}},
		{TimeSeriesFile, `"t [s]","dt [s]","bulk velocity [m/s]","pressure gradient [m/s2]","Courant number","bent height [m]"`,
			TimeSeriesTable{z, v(1), v(2), v(3), v(4), v(5)}.Write,
			func(d string) (any, error) { return ReadTimeSeries(d) },
			TimeSeriesTable{z, v(1), v(2), v(3), v(4), v(5)}},
		{PhaseProfilesFile, `"z [m]","U (phase 0) [m/s]","u'w' (phase 0) [m2/s2]","U (phase 1) [m/s]","u'w' (phase 1) [m2/s2]"`,
			PhaseProfilesTable{z, nil, []PhaseProfile{{v(1), v(2), nil}, {v(3), v(4), nil}}}.Write,
			func(d string) (any, error) { return ReadPhaseProfiles(d) },
			PhaseProfilesTable{z, nil, []PhaseProfile{{v(1), v(2), nil}, {v(3), v(4), nil}}}},
		{PhaseCycleFile, `"phase [1]","averaging time [s]","U in canopy [m/s]","U above canopy [m/s]","velocity ratio [1]","bent height [m]"`,
			PhaseCycleTable{z, v(1), v(2), v(3), v(4), v(5), nil}.Write,
			func(d string) (any, error) { return ReadPhaseCycle(d) },
			PhaseCycleTable{z, v(1), v(2), v(3), v(4), v(5), nil}},
		{ProbesFile, `"t [s]","u_0 (x=0 m, z=0.08 m) [m/s]","w_0 (x=0 m, z=0.08 m) [m/s]","u_1 (x=0.1333 m, z=0.08 m) [m/s]","w_1 (x=0.1333 m, z=0.08 m) [m/s]"`,
			ProbesTable{z, []ProbeSeries{{X: 0, Z: 0.08, U: v(1), W: v(2)}, {X: 0.1333, Z: 0.08, U: v(3), W: v(4)}}}.Write,
			func(d string) (any, error) { return ReadProbes(d) },
			ProbesTable{z, []ProbeSeries{{X: 0, Z: 0.08, U: v(1), W: v(2)}, {X: 0.1333, Z: 0.08, U: v(3), W: v(4)}}}},
		// A slab's probes name y too.
		{ProbesFile, `"t [s]","u_0 (x=0 m, y=0.05 m, z=0.08 m) [m/s]","w_0 (x=0 m, y=0.05 m, z=0.08 m) [m/s]"`,
			ProbesTable{z, []ProbeSeries{{X: 0, Y: ptr(0.05), Z: 0.08, U: v(1), W: v(2)}}}.Write,
			func(d string) (any, error) { return ReadProbes(d) },
			ProbesTable{z, []ProbeSeries{{X: 0, Y: ptr(0.05), Z: 0.08, U: v(1), W: v(2)}}}},
		{SpectrumFile, `"f [Hz]","S_ww [m2/s]"`,
			SpectrumTable{z, v(1)}.Write,
			func(d string) (any, error) { return ReadSpectrum(d) },
			SpectrumTable{z, v(1)}},
		{ScalarsFile, `"z [m]","oxygen mean [unit]","oxygen resolved flux w'c' [unit m/s]","oxygen diffusive flux [unit m/s]","oxygen eddy diffusivity [m2/s]","tracer mean [unit]","tracer resolved flux w'c' [unit m/s]","tracer diffusive flux [unit m/s]","tracer eddy diffusivity [m2/s]"`,
			ScalarsTable{z, []ScalarProfile{{"oxygen", v(1), v(2), v(3), v(4)}, {"tracer", v(5), v(6), v(7), v(8)}}}.Write,
			func(d string) (any, error) { return ReadScalars(d) },
			ScalarsTable{z, []ScalarProfile{{"oxygen", v(1), v(2), v(3), v(4)}, {"tracer", v(5), v(6), v(7), v(8)}}}},
		{UptakeFile, `"z [m]","oxygen element uptake [unit/(m3 s)]","oxygen uptake per surface area [unit m/s]"`,
			UptakeTable{z, []ScalarUptake{{"oxygen", v(1), v(2)}}}.Write,
			func(d string) (any, error) { return ReadUptake(d) },
			UptakeTable{z, []ScalarUptake{{"oxygen", v(1), v(2)}}}},
	}
	for _, c := range cases {
		t.Run(c.file, func(t *testing.T) {
			dir := t.TempDir()
			if err := c.write(dir); err != nil {
				t.Fatal(err)
			}
			b, err := os.ReadFile(filepath.Join(dir, c.file))
			if err != nil {
				t.Fatal(err)
			}
			if head, _, _ := strings.Cut(string(b), "\n"); head != c.header {
				t.Errorf("header\n got %s\nwant %s", head, c.header)
			}
			got, err := c.read(dir)
			if err != nil {
				t.Fatal(err)
			}
			if !reflect.DeepEqual(got, c.want) {
				t.Errorf("read back %+v\nwant %+v", got, c.want)
			}
		})
	}
}

// TestTableReadersNameTheFix: a table without its columns is an error
// naming the file and the columns it has.
func TestTableReadersNameTheFix(t *testing.T) {
	dir := t.TempDir()
	if err := (Table{Header: []string{"z [m]", "V [m/s]"}, Columns: [][]float64{{1}, {2}}}).WriteCSV(filepath.Join(dir, ProfileFile)); err != nil {
		t.Fatal(err)
	}
	_, err := ReadProfile(dir)
	if err == nil || !strings.Contains(err.Error(), ProfileFile) || !strings.Contains(err.Error(), `no column "U"`) || !strings.Contains(err.Error(), `"V"`) {
		t.Errorf("got %v", err)
	}
	if _, err := ReadSpectrum(dir); err == nil {
		t.Error("a missing spectrum.csv read")
	}
	probes := `"t [s]","u_0 (x=0 m, z=0.1 m) [m/s]"` + "\n1,2\n"
	os.WriteFile(filepath.Join(dir, ProbesFile), []byte(probes), 0o644)
	if _, err := ReadProbes(dir); err == nil || !strings.Contains(err.Error(), "not both") {
		t.Errorf("probe without w: %v", err)
	}
	scalars := `"z [m]","oxygen mean [unit]"` + "\n1,2\n"
	os.WriteFile(filepath.Join(dir, ScalarsFile), []byte(scalars), 0o644)
	if _, err := ReadScalars(dir); err == nil || !strings.Contains(err.Error(), "resolved flux") {
		t.Errorf("scalar with one column: %v", err)
	}
}

// TestSummaryRoundTrip writes a summary with every field set and reads it
// back to the same values; a null metric stays nil.
func TestSummaryRoundTrip(t *testing.T) {
	f := func(v float64) *float64 { return &v }
	in := &Summary{
		Run: RunSummary{Title: "flume A", Steps: 1200, SimTime: 60, WallTime: 12.5, Nx: 64, Nz: 32, Version: "x",
			Interrupted: true, StatsTime: 30, Error: "blow-up", SpinUp: 30, Depth: 0.4},
		Flow: FlowSummary{BulkVelocity: 0.1, Gradient: 1e-3, MaxDivergence: 1e-14, CanopyHeight: f(0.12), UTop: f(0.05),
			U1: f(0.01), U2: f(0.2), MomentumThickness: f(0.01), VorticityThickness: f(0.04), ShearLength: f(0.02),
			PenetrationDepth: f(0.03), RollerFrequency: f(0.25), Strouhal: f(0.03), RollerSpacing: f(0.4),
			RollerSpacingCorrelation: f(0.38), SweepEjectionRatio: nil},
		Scalars: map[string]ScalarSummary{"oxygen": {ElementUptake: 1e-7, BedUptake: 2e-8, TotalUptake: 1.2e-7, TopSupply: 1.1e-7,
			MeanInCanopy: f(0.2), MeanAbove: f(0.25), ExchangeVelocity: f(2e-6), FlushingTime: f(6e4), BoundaryLayerShare: f(0.7), Imbalance: 1e-12}},
		Canopy:   &CanopySummary{Height: 0.12, DragDensity: f(8), PredictedPenetrationDepth: f(0.02875)},
		Spectrum: &SpectrumSummary{Probes: 3, Samples: 640, Segment: 128, Interval: 0.05, ProbeHeight: 0.12, Peak: f(0.25)},
	}
	dir := t.TempDir()
	if err := in.Write(dir); err != nil {
		t.Fatal(err)
	}
	out, err := ReadSummary(dir)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(in, out) {
		t.Errorf("read back %+v\nwant %+v", out, in)
	}
	es, err := ReadEntries(dir)
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]any{KeyPenetrationDepth: 0.03, KeyRollerSpacing: 0.4, KeyTitle: "flume A", "run.spin_up_s": 30.0, "canopy.drag_density_1_m": 8.0, "flow.sweep_ejection_ratio": nil, "spectrum.segment_samples": 128.0}
	for _, e := range es {
		if w, ok := want[e.Key]; ok {
			if e.Value != w {
				t.Errorf("%s = %v, want %v", e.Key, e.Value, w)
			}
			delete(want, e.Key)
		}
	}
	if len(want) > 0 {
		t.Errorf("keys missing from the entries: %v", want)
	}
	if !math.IsNaN(Value(nil)) || Value(f(2)) != 2 || Num(math.Inf(1)) != nil || *Num(3) != 3 {
		t.Error("Num or Value")
	}
}

// TestSweepTableRoundTrip writes and reads sweep.csv back, empty cells
// and quoted text included.
func TestSweepTableRoundTrip(t *testing.T) {
	in := SweepTable{Header: []string{SweepColMember, "canopy.frontal_area", "title", "flow.u_top_m_s"},
		Rows: [][]string{{"0", "2.5", "a, b", "0.1"}, {"1", "5", `"quoted"`, ""}}}
	path := filepath.Join(t.TempDir(), SweepTableFile)
	if err := in.WriteCSV(path); err != nil {
		t.Fatal(err)
	}
	out, err := ReadSweepTable(path)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(in, out) {
		t.Errorf("read back %q, want %q", out, in)
	}
	if v, ok := out.Number(0, "flow.u_top_m_s"); !ok || v != 0.1 {
		t.Errorf("number %g %v", v, ok)
	}
	if _, ok := out.Number(1, "flow.u_top_m_s"); ok {
		t.Error("an empty cell is a number")
	}
	os.WriteFile(path, []byte("x,y\n1,2\n"), 0o644)
	if _, err := ReadSweepTable(path); err == nil || !strings.Contains(err.Error(), SweepColMember) {
		t.Errorf("bad header: %v", err)
	}
}

func ptr(v float64) *float64 { return &v }
