package report_test

import (
	"fmt"
	"log"
	"os"
	"path/filepath"
	"rollerbed/io/runfolder"
	"strings"

	"rollerbed/io/report"
)

func ExampleWriteFigures() {
	dir, err := os.MkdirTemp("", "run-")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	sum := &runfolder.Summary{Run: runfolder.RunSummary{Title: "spin-up only"}}
	if err := sum.Write(dir); err != nil {
		log.Fatal(err)
	}
	ts := runfolder.TimeSeriesTable{T: []float64{0, 1, 2}, Dt: []float64{0, 1, 1}, Bulk: []float64{0, 0.04, 0.05},
		Gradient: []float64{1e-3, 8e-4, 7e-4}, Courant: []float64{0, 0.5, 0.5}}
	if err := ts.Write(dir); err != nil {
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
	// spectrum.png skipped: RUNDIR has no spectrum.csv (written when the probes hold enough samples after the spin-up: run longer)
	// uptake.png skipped: RUNDIR has no uptake.csv (written by runs with scalars)
	// scalars.png skipped: RUNDIR has no scalars.csv (written by runs with scalars once statistics are gathered after the spin-up)
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

func hexColour(v float64) string {
	c := report.DivergingColor(v)
	return fmt.Sprintf("#%02x%02x%02x", c.R, c.G, c.B)
}
