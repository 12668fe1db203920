package report_test

import (
	"slices"
	"strings"
	"testing"

	"rollerbed/io/report"
	"rollerbed/io/runfolder"
)

// timeseries.png labels its time axis in plain numbers and puts its key
// in a strip of its own above the plots, where it covers neither data nor
// frame.
func TestTimeseriesReadsPlainly(t *testing.T) {
	dir := t.TempDir()
	sum := &runfolder.Summary{Run: runfolder.RunSummary{Title: "long", SpinUp: 10}}
	if err := sum.Write(dir); err != nil {
		t.Fatal(err)
	}
	var ts runfolder.TimeSeriesTable
	for i := range 46 {
		ts.T = append(ts.T, float64(i))
		ts.Dt = append(ts.Dt, 0.01)
		ts.Bulk = append(ts.Bulk, 0.05)
		ts.Gradient = append(ts.Gradient, 1e-3/(1+float64(i)))
		ts.Courant = append(ts.Courant, 0.5)
	}
	if err := ts.Write(dir); err != nil {
		t.Fatal(err)
	}
	p, err := report.TimeseriesPanels(dir)
	if err != nil {
		t.Fatal(err)
	}
	for _, ticks := range p.XTicks {
		if !slices.Contains(ticks, "20") || !slices.Contains(ticks, "40") {
			t.Errorf("time ticks %q, want 20 and 40 among them", ticks)
		}
		for _, l := range ticks {
			if strings.ContainsAny(l, "e") {
				t.Errorf("time tick %q has an exponent", l)
			}
		}
	}
	if len(p.Keys) != 1 || !strings.Contains(p.Keys[0], "end of the spin-up, t = 10 s") || !p.KeyClear {
		t.Errorf("key %q (clear of the plots: %v), want the end of the spin-up above the plots", p.Keys, p.KeyClear)
	}
}
