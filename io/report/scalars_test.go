package report_test

import (
	"slices"
	"strings"
	"testing"

	"rollerbed/io/report"
	"rollerbed/io/runfolder"
)

// scalars.png draws each scalar's mean concentration of scalars.csv
// against height, with the canopy top in the key.
func TestScalarProfiles(t *testing.T) {
	dir, _ := sharedRuns(t)
	p, titles, values, err := report.ScalarPanels(dir)
	if err != nil {
		t.Fatal(err)
	}
	table, err := runfolder.ReadScalars(dir)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(titles, []string{"oxygen"}) || len(values) != 1 || !slices.Equal(values[0], table.Scalars[0].Mean) {
		t.Errorf("panels %q, want one of oxygen with the mean of %s", titles, runfolder.ScalarsFile)
	}
	if len(p.Keys) != 1 || !strings.Contains(p.Keys[0], "canopy top h = 0.08 m") || !p.KeyClear {
		t.Errorf("key %q (clear %v), want the canopy top", p.Keys, p.KeyClear)
	}
	if !strings.Contains(p.Title, "Time-mean scalar concentration profiles") {
		t.Errorf("title %q", p.Title)
	}
}

// uptake.png keeps its key above the plot: the uptake is largest near
// the canopy top, where a key inside the plot would hide it.
func TestUptakeKeyAboveThePlot(t *testing.T) {
	dir, _ := sharedRuns(t)
	p, err := report.UptakePanels(dir)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(p.Keys, []string{"oxygen", "canopy top h = 0.08 m"}) || !p.KeyClear {
		t.Errorf("key %q (clear %v)", p.Keys, p.KeyClear)
	}
}
