package runs

import (
	"context"
	"path/filepath"
	"testing"

	"rollerbed/io/casefile"
	"rollerbed/io/runfolder"
)

// TestSlabTideBlades: the features that were built for the slice (a
// reversing tide, bending blades, statistics by phase, frames for a
// watcher) run in a slab, where a level is a plane: the blades bend per
// column of the plane, the phase statistics average over x and y, and
// frames hold span averages with the slice's shapes.
func TestSlabTideBlades(t *testing.T) {
	text, _ := parseExample(t, "tidal-flexible-meadow")
	s := string(text)
	for _, kv := range [][3]string{
		{"domain", "nx", "16"}, {"domain", "nz", "16"},
		{"domain", "width", "0.5"}, {"domain", "ny", "4"},
		{"time", "duration", "6"}, {"time", "spin_up", "1"},
		{"output", "profile_every", "0.5"}, {"output", "snapshot_every", "3"},
		{"output", "checkpoint_every", "3"}, {"output", "probes", "3"},
		{"numerics", "workers", "1"},
	} {
		s = setKey(s, kv[0], kv[1], kv[2])
	}
	c, err := casefile.Parse([]byte(s))
	if err != nil {
		t.Fatal(err)
	}
	sp, err := FromCase(c, "")
	if err != nil {
		t.Fatal(err)
	}
	if sp.Solver.Ny != 4 {
		t.Fatalf("Ny %d, want a slab of 4", sp.Solver.Ny)
	}
	var frames []*Frame
	dir := filepath.Join(t.TempDir(), "run")
	if _, err := Run(context.Background(), sp, Options{Dir: dir, Watch: func(f *Frame) { frames = append(frames, f) }}); err != nil {
		t.Fatal(err)
	}
	sum, err := runfolder.ReadSummary(dir)
	if err != nil {
		t.Fatal(err)
	}
	if sum.Canopy == nil || sum.Canopy.Flexible == nil {
		t.Fatalf("summary canopy %+v: want the flexible summary", sum.Canopy)
	}
	if h, l := sum.Canopy.Flexible.FinalHeight, sum.Canopy.Flexible.Length; !(h > 0 && h <= l) {
		t.Errorf("bent height %g m of blades %g m long: want it in (0, l]", h, l)
	}
	if len(frames) == 0 {
		t.Fatal("the watcher got no frames")
	}
	f := frames[len(frames)-1]
	nx, nz := len(f.X), len(f.Zc)
	if len(f.Vorticity) != (nz+1)*nx || len(f.Frontal) != nz*nx || (f.Scalar != nil && len(f.Scalar) != nz*nx) {
		t.Errorf("frame of a slab: vorticity %d, frontal %d, scalar %d values; want the slice's shapes (%d, %d)",
			len(f.Vorticity), len(f.Frontal), len(f.Scalar), (nz+1)*nx, nz*nx)
	}
}
