package solver

import (
	"math"
	"strings"
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
// uptake exercises every term, in a closed channel, over a rough bed, and in
// an open channel over an oscillating bed driven at a fixed bulk velocity.
func TestSpanInvariantMatchesSlice(t *testing.T) {
	const nx, ny, nz = 32, 8, 24
	type variant struct {
		b       transform.Backend
		workers int
		name    string
		set     func(*Config)
	}
	rough := func(c *Config) { c.Bed = Wall{Kind: Rough, Z0: 1e-3} }
	open := func(c *Config) {
		c.Bed = Wall{Kind: NoSlip, Speed: 0.01, Amplitude: 0.02, Omega: 3}
		c.Top = Wall{Kind: FreeSlip}
		c.Forcing = Forcing{Kind: FixedBulk, Bulk: 0.1}
	}
	var variants []variant
	for _, b := range spanBackends() {
		variants = append(variants, variant{b, 1, "closed channel", nil}, variant{b, 3, "closed channel", nil},
			variant{b, 2, "rough bed", rough}, variant{b, 2, "oscillating bed, open top, fixed bulk", open})
	}
	for _, vr := range variants {
		b, workers := vr.b, vr.workers
		slice := invariantCase(nx, 1, nz, b, workers)
		boxed := invariantCase(nx, ny, nz, b, workers)
		if vr.set != nil {
			vr.set(&slice)
			vr.set(&boxed)
		}
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
				t.Errorf("%v, %d workers, %s: %s differs from the slice by %g", b, workers, vr.name, name, d)
			}
		}
		if v := maxAbs(s3.V()); v > 1e-14*scale {
			t.Errorf("%v, %d workers: |v| = %g, want round-off", b, workers, v)
		}
		if d := maxAbs(s3.DUDY()); d > 1e-12*scale {
			t.Errorf("%v, %d workers: |∂u/∂y| = %g, want round-off", b, workers, d)
		}
		if g2, g3 := s2.Gradient(), s3.Gradient(); math.Abs(g2-g3) > 1e-12*math.Abs(g2) {
			t.Errorf("%v, %s: mean pressure gradient %g in the slice, %g in the box", b, vr.name, g2, g3)
		}
		b2, b3 := s2.Budget(0), s3.Budget(0)
		if math.Abs(b2.ElementUptake-b3.ElementUptake) > 1e-12*math.Abs(b2.ElementUptake) ||
			math.Abs(b2.BedIn-b3.BedIn) > 1e-12*math.Abs(b2.BedIn) {
			t.Errorf("%v: budgets differ: %+v vs %+v", b, b2, b3)
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

// perturbedBox is a small canopy box with every term on (closure, drag,
// a scalar with element and bed uptake), started from a laminar profile
// with seeded three-dimensional perturbations.
func perturbedBox(t testing.TB, b transform.Backend, workers int, bed WallKind) *Solver {
	t.Helper()
	c := invariantCase(32, 8, 16, b, workers)
	c.Bed = Wall{Kind: bed, Z0: 1e-3}
	s := mustNew(t, c)
	prof, _, err := s.LaminarProfile()
	if err != nil {
		t.Fatal(err)
	}
	s.SetMeanProfile(prof)
	s.Perturb(0.02*maxAbs(prof), 0.4, 0.2, 11)
	return s
}

// TestSpanObliqueModeDecay: a single oblique Fourier mode between free-slip
// walls, u_h ∥ (k_x, k_y) sin(k_x x + k_y y) cos(πz/H), w ∝ cos(k_x x +
// k_y y) sin(πz/H), is an eigenfunction of the Laplacian with zero pressure,
// so at vanishing amplitude it decays at exactly ν (k_x² + k_y² + (π/H)²)
// (from memory: the viscous decay of a Fourier mode of the unsteady Stokes
// equations). The error of the measured rate falls as Δz² (second order in
// z, the grid's design order).
func TestSpanObliqueModeDecay(t *testing.T) {
	const nu, T, dt = 1e-2, 1.0, 0.01
	var errs []float64
	for _, nz := range []int{16, 32} {
		c := box(16, 8, nz, transform.Gonum)
		c.Viscosity = nu
		c.Bed, c.Top = Wall{Kind: FreeSlip}, Wall{Kind: FreeSlip}
		c.Forcing = Forcing{}
		s := mustNew(t, c)
		kx, ky := 2*math.Pi/c.Lx, 2*math.Pi/c.Ly
		kh, kz := math.Hypot(kx, ky), math.Pi/c.H
		const amp = 1e-6
		b := amp * kz / kh
		g := s.Grid()
		nx, ny := c.Nx, c.Ny
		u, v, w := make([]float64, nz*ny*nx), make([]float64, nz*ny*nx), make([]float64, (nz+1)*ny*nx)
		for k := 0; k <= nz; k++ {
			for j := 0; j < ny; j++ {
				for i := 0; i < nx; i++ {
					th := kx*g.X[i] + ky*g.Y(j)
					p := (k*ny+j)*nx + i
					if k < nz {
						u[p] = b * kx / kh * math.Sin(th) * math.Cos(kz*g.Zc[k])
						v[p] = b * ky / kh * math.Sin(th) * math.Cos(kz*g.Zc[k])
					}
					w[p] = amp * math.Cos(th) * math.Sin(kz*g.Zf[k])
				}
			}
		}
		if err := s.SetVelocity3(u, v, w); err != nil {
			t.Fatal(err)
		}
		e0 := energy(s)
		for range int(math.Round(T / dt)) {
			if err := s.StepBy(dt); err != nil {
				t.Fatal(err)
			}
		}
		rate := -math.Log(energy(s)/e0) / (2 * s.Time())
		want := nu * (kh*kh + kz*kz)
		errs = append(errs, math.Abs(rate-want)/want)
		t.Logf("Nz = %d: rate %.8g 1/s, exact %.8g, relative error %.3g", nz, rate, want, errs[len(errs)-1])
	}
	if errs[1] > 1e-3 {
		t.Errorf("relative error of the decay rate %g at Nz = 32, want < 1e-3", errs[1])
	}
	if r := errs[0] / errs[1]; r < 3.5 || r > 4.5 {
		t.Errorf("error ratio %g between Nz = 16 and 32, want about 4 (second order)", r)
	}
}

// energy returns the sum of the squared velocity components.
func energy(s *Solver) float64 {
	e := 0.0
	for _, f := range [][]float64{s.U(), s.V(), s.W()} {
		for _, x := range f {
			e += x * x
		}
	}
	return e
}

// TestSpanProjectionDivergence: after a projection and after steps, the
// discrete divergence is round-off: below 1e-12 of the velocity gradients
// (common practice, no source: the projection is exact per wavenumber
// pair).
func TestSpanProjectionDivergence(t *testing.T) {
	for _, b := range spanBackends() {
		s := perturbedBox(t, b, 2, NoSlip)
		check := func(when string) {
			div, scale := s.Divergence()
			if !(div <= 1e-12*scale) || scale == 0 {
				t.Errorf("%v, %s: divergence %g against gradients %g", b, when, div, scale)
			}
		}
		check("after the projection")
		for range 5 {
			if err := s.Step(); err != nil {
				t.Fatal(err)
			}
		}
		check("after 5 steps")
		if maxAbs(s.V()) == 0 {
			t.Errorf("%v: the perturbation left v = 0", b)
		}
	}
}

// TestSpanBackendsAgree: FFTW and gonum give the same three-dimensional run
// to 1e-12 over a few steps (common practice, no source).
func TestSpanBackendsAgree(t *testing.T) {
	if !transform.Available(transform.FFTW) {
		t.Skip("built without FFTW")
	}
	f, g := perturbedBox(t, transform.FFTW, 1, NoSlip), perturbedBox(t, transform.Gonum, 1, NoSlip)
	for range 5 {
		dt := f.NextStep()
		if err := f.StepBy(dt); err != nil {
			t.Fatal(err)
		}
		if err := g.StepBy(dt); err != nil {
			t.Fatal(err)
		}
	}
	for name, pair := range map[string][2][]float64{"u": {f.U(), g.U()}, "v": {f.V(), g.V()}, "w": {f.W(), g.W()}, "c": {f.Scalar(0), g.Scalar(0)}} {
		d := 0.0
		for i := range pair[0] {
			d = math.Max(d, math.Abs(pair[0][i]-pair[1][i]))
		}
		if d > 1e-12*maxAbs(pair[1]) {
			t.Errorf("%s: FFTW and gonum differ by %g (max %g)", name, d, maxAbs(pair[1]))
		}
	}
}

// TestSpanWorkersIdentical: one and three workers give the same fields bit
// for bit, with a smooth and a rough bed, and the same budgets to round-off
// (common practice, no source).
func TestSpanWorkersIdentical(t *testing.T) {
	for _, bed := range []WallKind{NoSlip, Rough} {
		one, three := perturbedBox(t, transform.FFTW, 1, bed), perturbedBox(t, transform.FFTW, 3, bed)
		for range 4 {
			if err := one.Step(); err != nil {
				t.Fatal(err)
			}
			if err := three.Step(); err != nil {
				t.Fatal(err)
			}
		}
		for name, pair := range map[string][2][]float64{"u": {one.U(), three.U()}, "v": {one.V(), three.V()}, "w": {one.W(), three.W()}, "c": {one.Scalar(0), three.Scalar(0)}} {
			for i := range pair[0] {
				if pair[0][i] != pair[1][i] {
					t.Fatalf("%v bed: %s[%d] = %g on one worker, %g on three", bed, name, i, pair[0][i], pair[1][i])
				}
			}
		}
		// The budgets sum the workers' shares, in another order.
		if b1, b3 := one.Budget(0), three.Budget(0); math.Abs(b1.BedIn-b3.BedIn) > 1e-13*math.Abs(b1.BedIn) {
			t.Errorf("%v bed: bed uptake %g on one worker, %g on three", bed, b1.BedIn, b3.BedIn)
		}
	}
}

// TestSpanStepAllocatesNothing: the three-dimensional step loop allocates
// nothing (common practice, no source).
func TestSpanStepAllocatesNothing(t *testing.T) {
	s := perturbedBox(t, transform.FFTW, 2, Rough)
	if err := s.Step(); err != nil {
		t.Fatal(err)
	}
	if a := testing.AllocsPerRun(3, func() { _ = s.Step() }); a != 0 {
		t.Errorf("%v allocations per step, want 0", a)
	}
}

// TestSpanSaveRestore: a run restored from a saved state continues bit for
// bit like the uninterrupted one (common practice, no source).
func TestSpanSaveRestore(t *testing.T) {
	a := perturbedBox(t, transform.FFTW, 2, NoSlip)
	for range 3 {
		if err := a.Step(); err != nil {
			t.Fatal(err)
		}
	}
	var st State
	a.Save(&st)
	b := mustNew(t, a.Config())
	if err := b.Restore(&st); err != nil {
		t.Fatal(err)
	}
	for range 3 {
		if err := a.Step(); err != nil {
			t.Fatal(err)
		}
		if err := b.Step(); err != nil {
			t.Fatal(err)
		}
	}
	for name, pair := range map[string][2][]float64{"u": {a.U(), b.U()}, "v": {a.V(), b.V()}, "w": {a.W(), b.W()}, "c": {a.Scalar(0), b.Scalar(0)}, "dvdy": {a.DVDY(), b.DVDY()}} {
		for i := range pair[0] {
			if pair[0][i] != pair[1][i] {
				t.Fatalf("%s[%d] = %g uninterrupted, %g resumed", name, i, pair[0][i], pair[1][i])
			}
		}
	}
	slice := mustNew(t, channel(32, 16, transform.FFTW))
	if err := slice.Restore(&st); err == nil {
		t.Error("a slice accepted the state of a box")
	}
}

// TestSpanSameSeedSameNumbers: the same seed gives the same
// three-dimensional perturbations, another seed others (common practice, no
// source).
func TestSpanSameSeedSameNumbers(t *testing.T) {
	field := func(seed uint64) []float64 {
		s := mustNew(t, box(16, 8, 12, transform.FFTW))
		s.Perturb(1e-3, 0.5, 0.2, seed)
		return append(append([]float64(nil), s.U()...), s.V()...)
	}
	a, b, c := field(3), field(3), field(4)
	same, other := true, true
	for i := range a {
		same = same && a[i] == b[i]
		other = other && a[i] == c[i]
	}
	if !same || other {
		t.Errorf("same seed same field: %v; other seed same field: %v", same, other)
	}
}

func TestSpanRejectsBadInput(t *testing.T) {
	for _, tc := range []struct {
		ny   int
		ly   float64
		want string
	}{
		{2, 1, "Ny = 2"},
		{5, 1, "Ny = 5"},
		{8, 0, "Ly = 0"},
		{8, math.Inf(1), "Ly = +Inf"},
	} {
		c := channel(16, 8, transform.Gonum)
		c.Ny, c.Ly = tc.ny, tc.ly
		_, err := New(c)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("Ny = %d, Ly = %g: error %v, want one naming %q", tc.ny, tc.ly, err, tc.want)
		}
	}
	c := box(16, 8, 8, transform.Gonum)
	c.Drag = &Drag{HalfArea: make([]float64, 16*8), CD: 1}
	if _, err := New(c); err == nil || !strings.Contains(err.Error(), "Nz·Ny·Nx = 1024") {
		t.Errorf("drag of a slice in a box: error %v", err)
	}
}

// TestSpanStepLimits: the adaptive step keeps k_max,y |v| Δt at the
// Courant target and the explicit horizontal diffusion of both directions
// stable, 1/(ν (k_max² + k_max,y²)) (the definitions of NextStep; common
// practice, no source).
func TestSpanStepLimits(t *testing.T) {
	c := box(16, 8, 8, transform.Gonum)
	s := mustNew(t, c)
	g := s.Grid()
	kx, ky := g.Wavenumber(g.KeptModes()), g.WavenumberY(g.KeptModesY())
	if got, want := s.NextStep(), 1/(c.Viscosity*(kx*kx+ky*ky)); math.Abs(got/want-1) > 1e-14 {
		t.Errorf("step at rest %g s, want the diffusion limit %g s", got, want)
	}
	const speed = 2.0
	n := len(s.U())
	v := make([]float64, n)
	for i := range v {
		v[i] = speed
	}
	if err := s.SetVelocity3(make([]float64, n), v, make([]float64, len(s.W()))); err != nil {
		t.Fatal(err)
	}
	if got, want := s.NextStep(), DefaultCFL/(ky*speed); math.Abs(got/want-1) > 1e-14 {
		t.Errorf("step in a uniform spanwise flow %g s, want the Courant limit %g s", got, want)
	}
	if nx, ny, nz := s.Dims(); nx != 16 || ny != 8 || nz != 8 || g.Y(4) != c.Ly/2 {
		t.Errorf("Dims() = %d, %d, %d, Y(4) = %g", nx, ny, nz, g.Y(4))
	}
}
