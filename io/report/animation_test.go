package report_test

import (
	"image/gif"
	"os"
	"path/filepath"
	"rollerbed/io/runfolder"
	"strings"
	"testing"

	"rollerbed/io/report"
)

// rollers.gif starts at the first snapshot (the roll-up is the part worth
// showing), and every line of its titles fits over the map.
func TestAnimationStartsAtTheFirstSnapshotAndFits(t *testing.T) {
	dir, _ := sharedRuns(t)
	a, err := report.AnimationOf(dir, report.Vorticity)
	if err != nil {
		t.Fatal(err)
	}
	if len(a.Times) != 9 || a.Times[0] != 0 || a.Times[8] != 4 {
		t.Errorf("frames at %v s, want the 9 snapshots from t = 0 to 4 s", a.Times)
	}
	if a.Overflow > 0 {
		t.Errorf("a title line is %.1f pt wider than the map it is centred over: %q", a.Overflow, a.Titles[0])
	}
	if !a.Diverging || a.Label != "ω [1/s]" || !strings.HasPrefix(a.Titles[0], "Vorticity ω at t = 0 s (frame 1 of 9)") {
		t.Errorf("vorticity: diverging %v, colour bar %q, first title %q", a.Diverging, a.Label, a.Titles[0])
	}
}

// A scalar (a dye, say) can be animated instead, on a sequential scale
// from its smallest to its largest value; a field the snapshots lack is
// an error that names it and the choices.
func TestAnimationOfAScalar(t *testing.T) {
	dir, _ := sharedRuns(t)
	a, err := report.AnimationOf(dir, "oxygen")
	if err != nil {
		t.Fatal(err)
	}
	if a.Diverging || a.Label != "oxygen [unit]" || !strings.HasPrefix(a.Titles[0], "Concentration of scalar oxygen at t = 0 s") || a.Overflow > 0 {
		t.Errorf("oxygen: diverging %v, colour bar %q, overflow %.1f pt, first title %q", a.Diverging, a.Label, a.Overflow, a.Titles[0])
	}
	if !strings.Contains(a.Titles[0], "colours from") {
		t.Errorf("the title does not say what the colours span: %q", a.Titles[0])
	}
	paths, _, err := report.WriteFiguresWith(dir, report.Options{Animate: "oxygen"})
	if err != nil {
		t.Fatal(err)
	}
	gifPath := filepath.Join(dir, runfolder.FiguresDir, "rollers.gif")
	if paths[len(paths)-1] != gifPath {
		t.Fatalf("written %v, want rollers.gif last", paths)
	}
	f, err := os.Open(gifPath)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if g, err := gif.DecodeAll(f); err != nil || len(g.Image) != 9 {
		t.Errorf("rollers.gif of oxygen: %v", err)
	}

	_, _, err = report.WriteFiguresWith(dir, report.Options{Animate: "dye"})
	if err == nil || !strings.Contains(err.Error(), `"dye"`) || !strings.Contains(err.Error(), `"oxygen"`) || !strings.Contains(err.Error(), "rollers.gif") {
		t.Errorf("animating a field the snapshots lack: %v", err)
	}
}
