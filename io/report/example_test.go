package report_test

import (
	"fmt"
	"log"
	"os"
	"path/filepath"
	"strings"

	"rollerbed/io/report"
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
		fmt.Printf("%-50s %q\n", key, report.Unit(key))
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
	es, err := report.FlattenJSON([]byte(`{
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
	es, _ := report.FlattenJSON([]byte(`{"run": {"title": "flume A", "steps": 1200},
  "flow": {"bulk_velocity_m_s": 0.05, "roller_frequency_hz": null, "strouhal": 0.021}}`))
	report.WriteSummaryTable(os.Stdout, es)
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
	if err := os.WriteFile(filepath.Join(dir, "summary.json"), []byte(summary), 0o644); err != nil {
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
	cmp, err := report.Compare([]string{sparse, dense})
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
func ExampleWriteFigures() {
	dir, err := os.MkdirTemp("", "run-")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	os.WriteFile(filepath.Join(dir, "summary.json"), []byte(`{"run": {"title": "spin-up only"}}`), 0o644)
	ts := report.Table{
		Header:  []string{"t [s]", "bulk velocity [m/s]", "pressure gradient [m/s2]"},
		Columns: [][]float64{{0, 1, 2}, {0, 0.04, 0.05}, {1e-3, 8e-4, 7e-4}},
	}
	if err := ts.WriteCSV(filepath.Join(dir, "timeseries.csv")); err != nil {
		log.Fatal(err)
	}
	paths, notes, err := report.WriteFigures(dir)
	if err != nil {
		log.Fatal(err)
	}
	for _, p := range paths {
		rel, _ := filepath.Rel(dir, p)
		fmt.Println("wrote", rel)
	}
	for _, n := range notes {
		fmt.Println(strings.ReplaceAll(n.String(), dir, "RUNDIR"))
	}
	// Output:
	// wrote figures/timeseries.png
	// vorticity.png skipped: RUNDIR has no fields.h5
	// profiles.png skipped: RUNDIR has no profiles.csv (no statistics were gathered: the run stopped before time.spin_up)
	// spectrum.png skipped: RUNDIR has no probes.csv (written when the run stops)
	// uptake.png skipped: RUNDIR has no uptake.csv (written by runs with scalars)
	// rollers.gif skipped: RUNDIR has no fields.h5
}

func ExampleDivergingColor() {
	for _, v := range []float64{-1, 0, 1} {
		c := hexColour(v)
		fmt.Printf("%+.0f %s\n", v, c)
	}
	// Output:
	// -1 #0e2f4f
	// +0 #f3eedf
	// +1 #7a1f2b
}

// hexColour writes a colour of the diverging palette as #rrggbb.
func hexColour(v float64) string {
	c := report.DivergingColor(v)
	return fmt.Sprintf("#%02x%02x%02x", c.R, c.G, c.B)
}

func ExampleReadCSV() {
	dir, err := os.MkdirTemp("", "table-")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	path := filepath.Join(dir, "profile.csv")
	report.Table{Header: []string{"z [m]", "U [m/s]"}, Columns: [][]float64{{0.01, 0.03}, {0.02, 0.05}}}.WriteCSV(path)
	t, err := report.ReadCSV(path)
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
func ExampleCheckRunDir() {
	dir, err := os.MkdirTemp("", "notarun-")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	err = report.CheckRunDir(dir)
	fmt.Println(strings.ReplaceAll(err.Error(), dir, "DIR"))
	// Output:
	// DIR is not a run folder: it holds none of case.toml, run.log, summary.json; give the folder that `rollerbed run --out DIR` wrote
}

func ExampleFormatValue() {
	for _, v := range []any{1200.0, 0.000620664830257, nil, true} {
		fmt.Println(report.FormatValue(v))
	}
	// Output:
	// 1200
	// 0.000620665
	// –
	// yes
}

func ExampleColumnName() {
	fmt.Println(report.ColumnName("w_0 (x=0 m, z=0.08 m) [m/s]"))
	// Output:
	// w_0 (x=0 m, z=0.08 m)
}
