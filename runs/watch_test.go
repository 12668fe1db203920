package runs

import (
	"context"
	"path/filepath"
	"slices"
	"testing"
	"time"

	"rollerbed/io/runfolder"
)

// TestWatchFrames runs the small canopy case with an observer that asks
// for a frame at every step (it gets fewer: frames take at most about 2 %
// of the run's time): the frames advance in time, hold fields of the
// grid's shape that the run no longer changes, the metrics of the
// statistics so far, and the last one is marked done with the summary's
// metrics. The run's outputs are those of a run without an observer.
// Common practice, no source.
func TestWatchFrames(t *testing.T) {
	sp := parseSpec(t, smallCanopyCase)
	var frames []*Frame
	var kept []float64 // a copy of the first frame's vorticity
	opt := Options{Dir: filepath.Join(t.TempDir(), "watched"), WatchEvery: time.Nanosecond, WatchScalar: "oxygen",
		Watch: func(f *Frame) {
			if len(frames) == 0 {
				kept = slices.Clone(f.Vorticity)
			}
			frames = append(frames, f)
		}}
	res, err := Run(context.Background(), sp, opt)
	if err != nil {
		t.Fatal(err)
	}
	if len(frames) < 3 || len(frames) > res.Steps {
		t.Fatalf("%d frames for %d steps", len(frames), res.Steps)
	}
	nx, nz := sp.Solver.Nx, sp.Solver.Nz
	for i, f := range frames {
		if len(f.Vorticity) != (nz+1)*nx || len(f.Scalar) != nz*nx || len(f.MeanU) != nz || len(f.X) != nx || len(f.Frontal) != nz*nx {
			t.Fatalf("frame %d: shapes %d %d %d %d %d", i, len(f.Vorticity), len(f.Scalar), len(f.MeanU), len(f.X), len(f.Frontal))
		}
		if i > 0 && f.SimTime < frames[i-1].SimTime {
			t.Errorf("frame %d goes back in time", i)
		}
		if f.ScalarName != "oxygen" || f.CanopyHeight != sp.Canopy.Height() || f.EndTime != sp.Duration {
			t.Errorf("frame %d: scalar %q, canopy %g, end %g", i, f.ScalarName, f.CanopyHeight, f.EndTime)
		}
	}
	if !slices.Equal(kept, frames[0].Vorticity) {
		t.Error("the run changed a frame it had handed on")
	}
	last := frames[len(frames)-1]
	if !last.Done || last.Interrupted || last.Error != "" || last.SimTime != res.SimTime {
		t.Errorf("last frame: done %v, interrupted %v, error %q, t = %g", last.Done, last.Interrupted, last.Error, last.SimTime)
	}
	sum := res.Summary
	if runfolder.Value(last.Flow.PenetrationDepth) != runfolder.Value(sum.Flow.PenetrationDepth) ||
		last.Scalars["oxygen"].TotalUptake != sum.Scalars["oxygen"].TotalUptake {
		t.Errorf("the last frame's metrics differ from the summary's")
	}
	// Before the end, the metrics come from the statistics so far: after
	// the spin-up, the penetration depth is known.
	before := frames[len(frames)-2]
	if before.Done || before.Flow.PenetrationDepth == nil || before.Scalars["oxygen"].TotalUptake == 0 {
		t.Errorf("the frame before the end: done %v, δe %v, uptake %g", before.Done, before.Flow.PenetrationDepth, before.Scalars["oxygen"].TotalUptake)
	}
	plain := filepath.Join(t.TempDir(), "plain")
	if _, err := Run(context.Background(), sp, Options{Dir: plain}); err != nil {
		t.Fatal(err)
	}
	sameOutputs(t, outputs(t, plain), outputs(t, opt.Dir))
}
