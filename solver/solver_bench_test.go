package solver

import (
	"fmt"
	"testing"

	"rollerbed/solver/transform"
)

// BenchmarkStep times one adaptive RK3 step of a perturbed channel flow.
func BenchmarkStep(b *testing.B) {
	for _, sz := range [][2]int{{256, 64}, {512, 128}} {
		for _, workers := range []int{1, 2} {
			b.Run(fmt.Sprintf("%dx%d/workers=%d", sz[0], sz[1], workers), func(b *testing.B) {
				c := channel(sz[0], sz[1], transform.FFTW)
				c.Workers = workers
				benchSteps(b, startLaminar(b, c))
			})
		}
	}
}

// BenchmarkStep3D times one RK3 step of a perturbed channel flow in a
// spanwise-periodic box; compare its ns/point with BenchmarkStep's.
func BenchmarkStep3D(b *testing.B) {
	for _, sz := range [][3]int{{128, 64, 64}} {
		for _, workers := range []int{1, 2} {
			b.Run(fmt.Sprintf("%dx%dx%d/workers=%d", sz[0], sz[1], sz[2], workers), func(b *testing.B) {
				c := channel(sz[0], sz[2], transform.FFTW)
				c.Ny, c.Ly = sz[1], 1
				c.Workers = workers
				benchSteps(b, startLaminar(b, c))
			})
		}
	}
}

// startLaminar makes a solver of c started from its laminar profile with
// seeded perturbations.
func startLaminar(tb testing.TB, c Config) *Solver {
	tb.Helper()
	s := mustNew(tb, c)
	prof, _, _ := s.LaminarProfile()
	s.SetMeanProfile(prof)
	s.Perturb(1e-3, 0.5, 0.2, 1)
	return s
}

// benchSteps times steps of s at its next step size and reports ms per step
// and ns per point update.
func benchSteps(b *testing.B, s *Solver) {
	dt := s.NextStep()
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		if err := s.StepBy(dt); err != nil {
			b.Fatal(err)
		}
	}
	nx, ny, nz := s.Dims()
	perStep := float64(b.Elapsed().Nanoseconds()) / float64(b.N)
	b.ReportMetric(perStep/1e6, "ms/step")
	b.ReportMetric(perStep/float64(nx*ny*nz), "ns/point")
}
