package runs

import (
	"fmt"
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
