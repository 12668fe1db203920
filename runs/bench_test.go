package runs

import (
	"fmt"
	"math"
	"testing"
)

// BenchmarkBenchCase times one step of the `rollerbed bench` case, for
// profiling the step with go test -cpuprofile, and its ratio to the
// transform yardstick measured right after.
func BenchmarkBenchCase(b *testing.B) {
	for _, gr := range [][2]int{{512, 128}} {
		for _, workers := range []int{1, 2} {
			b.Run(fmt.Sprintf("%dx%d/workers=%d", gr[0], gr[1], workers), func(b *testing.B) {
				cfg, err := benchConfig(gr[0], gr[1], workers)
				if err != nil {
					b.Fatal(err)
				}
				s, err := newBenchSolver(cfg)
				if err != nil {
					b.Fatal(err)
				}
				defer s.Close()
				dt := s.NextStep()
				b.ReportAllocs()
				b.ResetTimer()
				for b.Loop() {
					if err := s.StepBy(dt); err != nil {
						b.Fatal(err)
					}
				}
				b.StopTimer()
				step := float64(b.Elapsed().Nanoseconds()) / float64(b.N)
				yard := float64(s.TransformYardstick(b.N).Nanoseconds()) / float64(b.N)
				b.ReportMetric(step/1e6, "ms/step")
				b.ReportMetric(step/yard, "yardstick-ratio")
			})
		}
	}
}

// TestBenchSmallGrid runs the bench on a small grid: every number it prints
// is finite and positive, the step allocates nothing with one or two
// workers, and the transform count is the scheme's (counted from the scheme
// of package solver, no outside source: per Runge–Kutta stage, u, w and the
// scalar go forward as x-fluxes and as predicted fields, and come back as
// flux derivatives, values and x-derivatives, with the two pressure-gradient
// components: 3 × 2 × 3 = 18 forward and 3 × (3 × 3 + 2) = 33 inverse).
func TestBenchSmallGrid(t *testing.T) {
	res, err := Bench([][2]int{{64, 16}}, 8, 2, nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(res) != 1 {
		t.Fatalf("got %d results, want 1", len(res))
	}
	r := res[0]
	if r.Grid != "64x16" {
		t.Errorf("grid %q, want 64x16", r.Grid)
	}
	for name, v := range map[string]float64{
		"ms_per_step": r.MsPerStep, "ms_per_step_2_cores": r.MsPerStep2,
		"yardstick_ms_per_step": r.YardstickMs, "yardstick_ratio": r.YardstickRatio,
		"speedup_2_cores": r.Speedup2Cores, "point_updates_per_s": r.PointUpdatesPerS,
		"yardstick_speedup_2_cores": r.YardstickSpeedup2Cores,
		"peak_rss_mb":               r.PeakRSSMB,
	} {
		if !(v > 0) || math.IsInf(v, 0) {
			t.Errorf("%s = %g, want a finite positive number", name, v)
		}
	}
	if r.AllocsPerStep != 0 {
		t.Errorf("allocs_per_step = %g, want 0", r.AllocsPerStep)
	}
	if r.Forward != 18 || r.Inverse != 33 {
		t.Errorf("transforms per step %d forward, %d inverse; want 18 and 33", r.Forward, r.Inverse)
	}
}
