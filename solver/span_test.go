package solver

import (
	"math"
	"testing"

	"rollerbed/solver/transform"
)

// box returns the channel of channel() as a spanwise-periodic box.
func box(nx, ny, nz int, b transform.Backend) Config {
	c := channel(nx, nz, b)
	c.Ny, c.Ly = ny, 0.75
	return c
}

// spanBackends lists the backends this build has.
func spanBackends() []transform.Backend {
	if transform.Available(transform.FFTW) {
		return []transform.Backend{transform.FFTW, transform.Gonum}
	}
	return []transform.Backend{transform.Gonum}
}

// TestSpanInvariantMatchesSlice: a y-invariant state stays y-invariant with
// v = 0, and every plane follows the slice solver, to round-off (common
// practice, no source: the three-dimensional equations reduce to the
// two-dimensional ones when nothing depends on y). A sheared, perturbed
// channel with the closure, canopy drag and a scalar with element and bed
// uptake exercises every term.
func TestSpanInvariantMatchesSlice(t *testing.T) {
	const nx, ny, nz = 32, 8, 24
	for _, b := range spanBackends() {
		for _, workers := range []int{1, 3} {
			slice := invariantCase(nx, 1, nz, b, workers)
			boxed := invariantCase(nx, ny, nz, b, workers)
			s2, s3 := mustNew(t, slice), mustNew(t, boxed)
			for _, s := range []*Solver{s2, s3} {
				s.SetVelocityFunc(func(x, z float64) float64 { return z * (1 - z) * (1 + 0.3*math.Sin(math.Pi*x)) },
					func(x, z float64) float64 { return 0.05 * math.Cos(math.Pi*x) * math.Sin(math.Pi*z) })
				s.SetScalarFunc(0, func(x, z float64) float64 { return 1 + 0.2*math.Cos(math.Pi*x)*z })
			}
			for n := 0; n < 15; n++ {
				dt := s2.NextStep()
				if err := s2.StepBy(dt); err != nil {
					t.Fatal(err)
				}
				if err := s3.StepBy(dt); err != nil {
					t.Fatal(err)
				}
			}
			scale := maxAbs(s2.U())
			for name, pair := range map[string][2][]float64{
				"u": {s2.U(), s3.U()}, "w": {s2.W(), s3.W()}, "c": {s2.Scalar(0), s3.Scalar(0)},
				"dudx": {s2.DUDX(), s3.DUDX()}, "nu": {s2.Viscosity(), s3.Viscosity()},
			} {
				if d := planeMismatch(pair[0], pair[1], nx, ny); d > 1e-12*math.Max(scale, maxAbs(pair[0])) {
					t.Errorf("%v, %d workers: %s differs from the slice by %g", b, workers, name, d)
				}
			}
			if v := maxAbs(s3.V()); v > 1e-14*scale {
				t.Errorf("%v, %d workers: |v| = %g, want round-off", b, workers, v)
			}
			if d := maxAbs(s3.DUDY()); d > 1e-12*scale {
				t.Errorf("%v, %d workers: |∂u/∂y| = %g, want round-off", b, workers, d)
			}
			b2, b3 := s2.Budget(0), s3.Budget(0)
			if math.Abs(b2.ElementUptake-b3.ElementUptake) > 1e-12*math.Abs(b2.ElementUptake) ||
				math.Abs(b2.BedIn-b3.BedIn) > 1e-12*math.Abs(b2.BedIn) {
				t.Errorf("%v: budgets differ: %+v vs %+v", b, b2, b3)
			}
		}
	}
}

// invariantCase is a canopy channel with the closure, drag and one scalar;
// the canopy arrays are the same at every y.
func invariantCase(nx, ny, nz int, b transform.Backend, workers int) Config {
	c := box(nx, ny, nz, b)
	// Δy = (Δx Δz)^½ makes the filter width (Δx Δy Δz)^⅓ of the box that
	// of the slice, (Δx Δz)^½.
	c.Ly = float64(ny) * math.Sqrt(c.Lx/float64(nx)*c.H/float64(nz))
	if ny == 1 {
		c.Ny, c.Ly = 0, 0
	}
	c.Workers = workers
	c.Closure = Closure{Cs: 0.17}
	np := nx * max(ny, 1)
	half, area := make([]float64, nz*np), make([]float64, nz*np)
	for k := 0; k < nz/3; k++ {
		for p := 0; p < np; p++ {
			if x := p % nx; x < nx/2 {
				half[k*np+p], area[k*np+p] = 2, 6
			}
		}
	}
	c.Drag = &Drag{HalfArea: half, CD: 1}
	c.Scalars = []Scalar{{
		Name: "c", Diffusivity: 1e-4, Initial: 1,
		Bed:             ScalarBoundary{Kind: Transfer, Capacity: math.Inf(1), Velocity: func(us float64) float64 { return 1e-3 + 0.1*us }},
		Top:             ScalarBoundary{Kind: FixedValue, Value: 1},
		SurfaceArea:     area,
		ElementVelocity: func(sp float64) float64 { return 1e-4 + 1e-3*sp },
		Capacity:        1e-3,
	}}
	return c
}

// planeMismatch returns the largest difference between the slice field f2
// (rows of nx) and every plane row of the box field f3 (planes of ny·nx).
func planeMismatch(f2, f3 []float64, nx, ny int) float64 {
	d := 0.0
	for r := 0; r < len(f2)/nx; r++ {
		for j := 0; j < ny; j++ {
			for i := 0; i < nx; i++ {
				d = math.Max(d, math.Abs(f2[r*nx+i]-f3[(r*ny+j)*nx+i]))
			}
		}
	}
	return d
}

func maxAbs(f []float64) float64 {
	m := 0.0
	for _, v := range f {
		m = math.Max(m, math.Abs(v))
	}
	return m
}
