package solver

import (
	"math"
	"testing"

	"rollerbed/solver/transform"
)

func still(nx, nz int) Config {
	return Config{Nx: nx, Nz: nz, Lx: 1, H: 0.5, Viscosity: 1e-6,
		Bed: Wall{Kind: FreeSlip}, Top: Wall{Kind: FreeSlip}, Backend: transform.Gonum}
}

func uniform(n int, v float64) []float64 {
	a := make([]float64, n)
	for i := range a {
		a[i] = v
	}
	return a
}

// perfectBoundaryLayer makes k_e = k_s: no boundary-layer resistance.
func perfectBoundaryLayer(float64) float64 { return math.Inf(1) }

// TestStillFluidUptakeDecay: with uniform surface uptake in still fluid the
// mode sin(kx) decays as exp(−(D k² + k_s a_s) t) (derived).
func TestStillFluidUptakeDecay(t *testing.T) {
	c := still(32, 8)
	D, ks, as := 1e-3, 2e-4, 30.0
	c.Scalars = []Scalar{{Name: "tracer", Diffusivity: D, SurfaceArea: uniform(32*8, as),
		ElementVelocity: perfectBoundaryLayer, Capacity: ks}}
	s := mustNew(t, c)
	k := 2 * math.Pi / c.Lx
	g := s.Grid()
	s.SetScalarFunc(0, func(x, z float64) float64 { return math.Sin(k * x) })
	T := 20.0
	n := 400
	for range n {
		if err := s.StepBy(T / float64(n)); err != nil {
			t.Fatal(err)
		}
	}
	num, den := 0.0, 0.0
	for i := 0; i < g.Nx; i++ {
		b := math.Sin(k * g.X[i])
		num += s.Scalar(0)[3*g.Nx+i] * b
		den += b * b
	}
	want := math.Exp(-(D*k*k + ks*as) * T)
	if got := num / den; math.Abs(got/want-1) > 1e-4 {
		t.Errorf("amplitude %.10g, want %.10g (rel %.2e)", got, want, got/want-1)
	}
}

// TestSinkLayerConvergesToCosh: steady diffusion with a first-order sink λ
// in a layer of depth H below a fixed top concentration C and a zero-flux
// bed has c = C cosh(z/L)/cosh(H/L), L = √(D/λ) (derived), to second order.
func TestSinkLayerConvergesToCosh(t *testing.T) {
	errAt := func(nz int) float64 {
		c := still(8, nz)
		D, lam, C := 1e-3, 0.05, 2.0
		c.Scalars = []Scalar{{Name: "o2", Diffusivity: D, SurfaceArea: uniform(8*nz, lam),
			ElementVelocity: perfectBoundaryLayer, Capacity: 1, Top: ScalarBoundary{Kind: FixedValue, Value: C}}}
		s := mustNew(t, c)
		for range 300 {
			if err := s.StepBy(20); err != nil {
				t.Fatal(err)
			}
		}
		L := math.Sqrt(D / lam)
		g := s.Grid()
		e := 0.0
		for k := 0; k < nz; k++ {
			want := C * math.Cosh(g.Zc[k]/L) / math.Cosh(c.H/L)
			e = math.Max(e, math.Abs(s.Scalar(0)[k*8]-want))
		}
		return e / C
	}
	e1, e2, e3 := errAt(16), errAt(32), errAt(64)
	order := math.Log2(e2 / e3)
	if e2 > 2e-3 || order < 1.8 || order > 2.2 {
		t.Errorf("errors %.3g %.3g %.3g, order %.3f, want 2", e1, e2, e3, order)
	}
}

// TestPulseReturnsAfterOneLap: a scalar pulse carried once around the
// periodic domain by uniform flow comes back to its shape (spectral
// accuracy in x; common practice, no source).
func TestPulseReturnsAfterOneLap(t *testing.T) {
	c := still(128, 4)
	c.Scalars = []Scalar{{Name: "dye", Diffusivity: 1e-12}}
	s := mustNew(t, c)
	U := 0.1
	s.SetVelocityFunc(func(x, z float64) float64 { return U }, nil)
	g := s.Grid()
	pulse := func(x float64) float64 {
		d := math.Remainder(x-0.5, 1)
		return math.Exp(-d * d / (2 * 0.05 * 0.05))
	}
	s.SetScalarFunc(0, func(x, z float64) float64 { return pulse(x) })
	// Small steps, so the time error of RK3 (about (kUΔt)³ per lap)
	// stays below the check and what is left is the error in x.
	n := 2000
	for range n {
		if err := s.StepBy(c.Lx / U / float64(n)); err != nil {
			t.Fatal(err)
		}
	}
	e := 0.0
	for i := 0; i < g.Nx; i++ {
		e = math.Max(e, math.Abs(s.Scalar(0)[g.Nx+i]-pulse(g.X[i])))
	}
	if e > 1e-5 {
		t.Errorf("pulse after one lap differs by %.3g", e)
	}
}

// TestBudgetClosesOnTurbulentCanopy: storage change = top supply − element
// uptake − bed uptake + sources, to round-off, on a turbulent canopy run
// with a mat, elements, a fixed top concentration and a source.
func TestBudgetClosesOnTurbulentCanopy(t *testing.T) {
	c := canopyChannel(64, 32, 2)
	nx, nz := c.Nx, c.Nz
	as := make([]float64, nx*nz)
	for i, v := range c.Drag.HalfArea {
		as[i] = 2 * math.Pi * v // a_s = π a for cylinders, a = 2·HalfArea
	}
	c.Scalars = []Scalar{{
		Name: "oxygen", Diffusivity: 1.76e-9, Initial: 0.2, Source: 1e-5,
		Top:             ScalarBoundary{Kind: FixedValue, Value: 0.25},
		Bed:             ScalarBoundary{Kind: Transfer, Capacity: 1e-5, Velocity: func(us float64) float64 { return 0.0889 * us * math.Pow(570, -0.704) }},
		SurfaceArea:     as,
		ElementVelocity: func(speed float64) float64 { return 1e-5 + 1e-4*speed },
		Capacity:        2e-5,
	}}
	s := mustNew(t, c)
	prof, _, err := s.DragBalancedProfile()
	if err != nil {
		t.Fatal(err)
	}
	s.SetMeanProfile(prof)
	s.Perturb(5e-3, 0.33, 0.1, 2)
	for range 200 {
		if err := s.Step(); err != nil {
			t.Fatal(err)
		}
	}
	b := s.Budget(0)
	if !(b.ElementUptake > 0) || !(b.BedIn < 0) {
		t.Fatalf("uptake terms %+v", b)
	}
	if im := b.Imbalance(); im > 1e-10 {
		t.Errorf("budget imbalance %.3g (%+v)", im, b)
	}
	sum := 0.0
	for _, v := range s.UptakeByLevel(0) {
		sum += v
	}
	if math.Abs(sum-b.ElementUptake) > 1e-12*b.ElementUptake {
		t.Errorf("uptake by level sums to %g, total %g", sum, b.ElementUptake)
	}
	if a := testing.AllocsPerRun(3, func() { _ = s.Step() }); a != 0 {
		t.Errorf("%v allocations per step with a scalar", a)
	}
}

// TestTransferLimits: when the boundary layer dominates the resistance
// (k_bl ≪ k_s), doubling k_s barely changes the uptake; when the surface
// dominates (k_s ≪ k_bl), uptake is nearly proportional to k_s (series
// resistances; derived).
func TestTransferLimits(t *testing.T) {
	uptake := func(kbl, ks float64) float64 {
		c := canopyChannel(32, 24, 1)
		as := make([]float64, c.Nx*c.Nz)
		for i, v := range c.Drag.HalfArea {
			as[i] = 2 * math.Pi * v
		}
		c.Scalars = []Scalar{{Name: "n", Diffusivity: 1e-9, Initial: 1, Top: ScalarBoundary{Kind: FixedValue, Value: 1},
			SurfaceArea: as, ElementVelocity: func(float64) float64 { return kbl }, Capacity: ks}}
		s := mustNew(t, c)
		prof, _, _ := s.DragBalancedProfile()
		s.SetMeanProfile(prof)
		for range 50 {
			if err := s.StepBy(0.02); err != nil {
				t.Fatal(err)
			}
		}
		return s.Budget(0).ElementUptake
	}
	// Boundary layer dominates: k_bl = 1e-6 m/s, k_s = 1e-3 and 2e-3.
	a, b := uptake(1e-6, 1e-3), uptake(1e-6, 2e-3)
	if r := b/a - 1; r < 0 || r > 2e-3 {
		t.Errorf("boundary-layer limit: doubling k_s changed uptake by %.3g, want of order k_bl/k_s = 1e-3", r)
	}
	// Surface dominates: k_s = 1e-7 and 2e-7 against k_bl = 1e-3.
	a, b = uptake(1e-3, 1e-7), uptake(1e-3, 2e-7)
	if r := b / a; math.Abs(r-2) > 0.01 {
		t.Errorf("surface limit: doubling k_s scaled uptake by %.4g, want about 2", r)
	}
}
