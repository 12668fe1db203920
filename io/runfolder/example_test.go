package runfolder_test

import (
	"fmt"
	"log"
	"os"
	"path/filepath"
	"strings"

	"rollerbed/canopy"
	"rollerbed/io/runfolder"
)

// Summary keys carry their unit in their last words.
func ExampleUnit() {
	for _, key := range []string{
		"flow.bulk_velocity_m_s",
		"flow.pressure_gradient_m_s2",
		"flow.roller_frequency_hz",
		"scalars.oxygen.total_uptake_per_bed_area_mol_m2_s",
		"flow.strouhal",
	} {
		fmt.Printf("%-50s %q\n", key, runfolder.Unit(key))
	}
	// Output:
	// flow.bulk_velocity_m_s                             "m/s"
	// flow.pressure_gradient_m_s2                        "m/s²"
	// flow.roller_frequency_hz                           "Hz"
	// scalars.oxygen.total_uptake_per_bed_area_mol_m2_s  "mol/(m²·s)"
	// flow.strouhal                                      ""
}

// Nested objects of summary.json become dotted keys, in the file's order.
func ExampleFlattenJSON() {
	es, err := runfolder.FlattenJSON([]byte(`{
  "run": {"steps": 1200, "interrupted": false},
  "flow": {"penetration_depth_m": null},
  "scalars": {"oxygen": {"total_uptake_per_bed_area": 0.25}}
}`))
	if err != nil {
		log.Fatal(err)
	}
	for _, e := range es {
		fmt.Printf("%s = %v\n", e.Key, e.Value)
	}
	// Output:
	// run.steps = 1200
	// run.interrupted = false
	// flow.penetration_depth_m = <nil>
	// scalars.oxygen.total_uptake_per_bed_area = 0.25
}

func ExampleWriteSummaryTable() {
	es, _ := runfolder.FlattenJSON([]byte(`{"run": {"title": "flume A", "steps": 1200},
  "flow": {"bulk_velocity_m_s": 0.05, "roller_frequency_hz": null, "strouhal": 0.021}}`))
	runfolder.WriteSummaryTable(os.Stdout, es)
	// Output:
	// key                       value    unit
	// run.title                 flume A
	// run.steps                 1200     –
	// flow.bulk_velocity_m_s    0.05     m/s
	// flow.roller_frequency_hz  –        Hz
	// flow.strouhal             0.021    –
}

// fakeRun writes a run folder holding only a summary.json.
func fakeRun(parent, name, summary string) string {
	dir := filepath.Join(parent, name)
	if err := os.MkdirAll(dir, 0o755); err != nil {
		log.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, runfolder.SummaryFile), []byte(summary), 0o644); err != nil {
		log.Fatal(err)
	}
	return dir
}

// Two runs side by side; the scalar uptake only the second run has shows
// as "–" for the first.
func ExampleCompare() {
	parent, err := os.MkdirTemp("", "compare-")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(parent)
	sparse := fakeRun(parent, "sparse", `{"flow": {"bulk_velocity_m_s": 0.1, "penetration_depth_m": 0.08}}`)
	dense := fakeRun(parent, "dense", `{"flow": {"bulk_velocity_m_s": 0.1, "penetration_depth_m": 0.02},
  "scalars": {"oxygen": {"total_uptake_per_bed_area_mol_m2_s": 3e-7}}}`)
	cmp, err := runfolder.Compare([]string{sparse, dense})
	if err != nil {
		log.Fatal(err)
	}
	cmp.WriteTable(os.Stdout)
	// Output:
	// key                                                unit        sparse  dense  ÷ first
	// flow.bulk_velocity_m_s                             m/s         0.1     0.1    1
	// flow.penetration_depth_m                           m           0.08    0.02   0.25
	// scalars.oxygen.total_uptake_per_bed_area_mol_m2_s  mol/(m²·s)  –       3e-07  –
}

// A run folder with only its time series gets that figure, and a note on
// each of the others.
// hexColour writes a colour of the diverging palette as #rrggbb.
func ExampleReadCSV() {
	dir, err := os.MkdirTemp("", "table-")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	path := filepath.Join(dir, "profile.csv")
	runfolder.Table{Header: []string{"z [m]", "U [m/s]"}, Columns: [][]float64{{0.01, 0.03}, {0.02, 0.05}}}.WriteCSV(path)
	t, err := runfolder.ReadCSV(path)
	if err != nil {
		log.Fatal(err)
	}
	u, err := t.Column("U")
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println(t.Header, t.Rows(), u)
	// Output:
	// [z [m] U [m/s]] 2 [0.02 0.05]
}

// A folder that no run wrote is refused with the fix.
func ExampleCheck() {
	dir, err := os.MkdirTemp("", "notarun-")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	err = runfolder.Check(dir)
	fmt.Println(strings.ReplaceAll(err.Error(), dir, "DIR"))
	// Output:
	// runfolder: DIR is not a run folder: it holds none of case.toml, run.log, summary.json; give the folder that `rollerbed run --out DIR` wrote
}

func ExampleFormatValue() {
	for _, v := range []any{1200.0, 0.000620664830257, nil, true} {
		fmt.Println(runfolder.FormatValue(v))
	}
	// Output:
	// 1200
	// 0.000620665
	// –
	// yes
}

func ExampleColumnName() {
	fmt.Println(runfolder.ColumnName("w_0 (x=0 m, z=0.08 m) [m/s]"))
	// Output:
	// w_0 (x=0 m, z=0.08 m)
}

// The run writes its folder through the package, and readers read it back
// as typed values: no file name, key or column is spelled outside it.
func Example() {
	dir, err := os.MkdirTemp("", "run-")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	h, cda := 0.12, 8.0
	de := canopy.PredictedPenetrationDepth(cda)
	sum := &runfolder.Summary{
		Run:    runfolder.RunSummary{Title: "flume A", Steps: 1200, SimTime: 60, SpinUp: 20, Depth: 0.4},
		Flow:   runfolder.FlowSummary{BulkVelocity: 0.1, CanopyHeight: &h},
		Canopy: &runfolder.CanopySummary{Height: h, DragDensity: &cda, PredictedPenetrationDepth: &de},
	}
	if err := sum.Write(dir); err != nil {
		log.Fatal(err)
	}
	prof := runfolder.ProfileTable{Z: []float64{0.05, 0.15, 0.25}, U: []float64{0.02, 0.09, 0.13}}
	if err := prof.Write(dir); err != nil {
		log.Fatal(err)
	}

	back, err := runfolder.ReadSummary(dir)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("%s: spin-up %g s, δe predicted %.4g m below h = %g m\n", back.Run.Title, back.Run.SpinUp,
		*back.Canopy.PredictedPenetrationDepth, back.Canopy.Height)
	p, err := runfolder.ReadProfile(dir)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println("U at the top cell:", p.U[len(p.U)-1], "m/s")
	b, _ := os.ReadFile(filepath.Join(dir, runfolder.ProfileFile))
	fmt.Print(string(b))
	// Output:
	// flume A: spin-up 20 s, δe predicted 0.02875 m below h = 0.12 m
	// U at the top cell: 0.13 m/s
	// "z [m]","U [m/s]"
	// 0.05,0.02
	// 0.15,0.09
	// 0.25,0.13
}
