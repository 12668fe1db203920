package report_test

import (
	"context"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"rollerbed/io/report"
	"rollerbed/io/runfolder"
)

// TestSlabFigures: a slab's run folder gets every figure of a slice (from
// its span averages) plus its x–z section and plan view; compare and its
// overlays take a slab beside a slice unchanged.
func TestSlabFigures(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "slab")
	slab := func(s string) string {
		return strings.NewReplacer("nx = 32\nnz = 24", "nx = 32\nnz = 24\nwidth = 0.2\nny = 8").Replace(s)
	}
	if err := runCase(dir, 3, slab, context.Background()); err != nil {
		t.Fatal(err)
	}
	paths, notes, err := report.WriteFigures(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(notes) != 0 {
		t.Errorf("notes on a complete slab run folder: %v", notes)
	}
	var names []string
	for _, p := range paths {
		names = append(names, filepath.Base(p))
		if strings.HasSuffix(p, ".png") {
			if w, h := pngSize(t, p); w != report.FigureWidth || h < 100 {
				t.Errorf("%s is %d × %d", filepath.Base(p), w, h)
			}
		}
	}
	want := []string{"vorticity.png", "profiles.png", "spectrum.png", "timeseries.png", "uptake.png", "scalars.png", "section.png", "plan.png", "breakup.gif", "rollers.gif"}
	if !slices.Equal(names, want) {
		t.Fatalf("figures %v, want %v", names, want)
	}
	slice, _ := sharedRuns(t)
	cmp, err := runfolder.Compare([]string{slice, dir})
	if err != nil {
		t.Fatal(err)
	}
	if len(cmp.Rows) == 0 {
		t.Error("no comparison rows for a slice beside a slab")
	}
	if _, _, err := report.CompareFigures([]string{slice, dir}, t.TempDir()); err != nil {
		t.Errorf("overlay figures of a slice and a slab: %v", err)
	}
}
