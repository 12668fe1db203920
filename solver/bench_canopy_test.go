package solver

import (
	"fmt"
	"testing"

	"rollerbed/solver/transform"
)

// canopyChannel is the benchmark's canopy case: a channel with a dense
// block canopy in its lower third, Smagorinsky closure and bulk forcing.
func canopyChannel(nx, nz, workers int) Config {
	c := channel(nx, nz, transform.FFTW)
	c.Top.Kind = FreeSlip
	c.Viscosity = 1e-6
	c.Forcing = Forcing{Kind: FixedBulk, Bulk: 0.1}
	c.Closure.Cs = DefaultSmagorinsky
	half := make([]float64, nx*nz)
	for k := 0; k < nz/3; k++ {
		for i := 0; i < nx; i++ {
			half[k*nx+i] = 4
		}
	}
	c.Drag = &Drag{HalfArea: half, CD: 1}
	c.Workers = workers
	return c
}

// startCanopy makes a solver of c started from its drag-balanced profile
// with perturbations seeded at the canopy top.
func startCanopy(tb testing.TB, c Config) *Solver {
	tb.Helper()
	s := mustNew(tb, c)
	prof, _, err := s.DragBalancedProfile()
	if err != nil {
		tb.Fatal(err)
	}
	s.SetMeanProfile(prof)
	s.Perturb(1e-3, 0.33, 0.1, 1)
	return s
}

// BenchmarkCanopyStep times one RK3 step of a turbulent canopy flow with the
// closure and the drag on.
func BenchmarkCanopyStep(b *testing.B) {
	for _, sz := range [][2]int{{256, 64}, {512, 128}} {
		for _, workers := range []int{1, 2} {
			b.Run(fmt.Sprintf("%dx%d/workers=%d", sz[0], sz[1], workers), func(b *testing.B) {
				benchSteps(b, startCanopy(b, canopyChannel(sz[0], sz[1], workers)))
			})
		}
	}
}
