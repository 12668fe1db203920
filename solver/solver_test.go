package solver

import (
	"errors"
	"math"
	"testing"

	"rollerbed/solver/transform"
)

// channel returns a small closed-channel configuration.
func channel(nx, nz int, b transform.Backend) Config {
	return Config{
		Nx: nx, Nz: nz, Lx: 2, H: 1,
		Viscosity: 1e-3,
		Bed:       Wall{Kind: NoSlip}, Top: Wall{Kind: NoSlip},
		Forcing: Forcing{Kind: FixedGradient, Gradient: 1e-3},
		Backend: b,
	}
}

// mustNew returns a new solver for c, on the gonum transforms in builds
// without FFTW so that the tests run there too.
func mustNew(t testing.TB, c Config) *Solver {
	t.Helper()
	if !transform.Available(c.Backend) {
		c.Backend = transform.Gonum
	}
	s, err := New(c)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(s.Close)
	return s
}

func TestGridUniformAndStretched(t *testing.T) {
	g, err := NewGrid(16, 32, 1, 2, Cluster{})
	if err != nil {
		t.Fatal(err)
	}
	for k, z := range g.Zc {
		if want := 2 * (float64(k) + 0.5) / 32; math.Abs(z-want) > 1e-15 {
			t.Fatalf("uniform Zc[%d] = %g, want %g", k, z, want)
		}
	}
	c := Cluster{Bed: 4, BedWidth: 0.1, At: 1.2, AtFactor: 3, AtWidth: 0.1}
	g, err = NewGrid(16, 64, 1, 2, c)
	if err != nil {
		t.Fatal(err)
	}
	// The density ratio far from / at the bed is about 4 (common practice,
	// no source: the mapping is built to give it).
	far := g.Dz[63]
	if r := far / g.Dz[0]; r < 2.5 || r > 5 {
		t.Errorf("bed refinement %g, want about 4", r)
	}
	for k := 1; k < g.Nz; k++ {
		if !(g.Zc[k] > g.Zc[k-1]) || !(g.Zf[k] > g.Zf[k-1]) {
			t.Fatalf("grid not monotone at %d", k)
		}
		if !(g.Zc[k-1] > g.Zf[k-1] && g.Zc[k-1] < g.Zf[k]) {
			t.Fatalf("centre %d outside its cell", k-1)
		}
	}
	if g.Zf[0] != 0 || g.Zf[64] != 2 {
		t.Fatal("faces do not span the depth")
	}
}

func TestGridRejectsBadInput(t *testing.T) {
	for _, tc := range []struct {
		nx, nz int
		lx, h  float64
		c      Cluster
	}{
		{7, 16, 1, 1, Cluster{}},
		{16, 2, 1, 1, Cluster{}},
		{16, 16, 0, 1, Cluster{}},
		{16, 16, 1, -1, Cluster{}},
		{16, 16, 1, 1, Cluster{Bed: 0.5, BedWidth: 0.1}},
		{16, 16, 1, 1, Cluster{At: 2, AtFactor: 2, AtWidth: 0.1}},
	} {
		if _, err := NewGrid(tc.nx, tc.nz, tc.lx, tc.h, tc.c); err == nil {
			t.Errorf("NewGrid(%+v) accepted bad input", tc)
		}
	}
}

// TestLaminarStaysSteady: Poiseuille flow is the discrete steady state on a
// uniform grid, to round-off (White, Viscous Fluid Flow, plane Poiseuille).
func TestLaminarStaysSteady(t *testing.T) {
	for _, walls := range [][2]WallKind{{NoSlip, NoSlip}, {NoSlip, FreeSlip}} {
		c := channel(16, 32, transform.Gonum)
		c.Bed.Kind, c.Top.Kind = walls[0], walls[1]
		s := mustNew(t, c)
		prof, _, err := s.LaminarProfile()
		if err != nil {
			t.Fatal(err)
		}
		g := s.Grid()
		for k, z := range g.Zc {
			var want float64
			if walls[1] == NoSlip {
				want = c.Forcing.Gradient / (2 * c.Viscosity) * z * (c.H - z)
			} else {
				want = c.Forcing.Gradient / (2 * c.Viscosity) * z * (2*c.H - z)
			}
			if math.Abs(prof[k]-want) > 1e-13*math.Abs(want)+1e-15 {
				t.Fatalf("%v: laminar U(%g) = %.16g, parabola %.16g", walls, z, prof[k], want)
			}
		}
		s.SetMeanProfile(prof)
		for range 20 {
			if err := s.Step(); err != nil {
				t.Fatal(err)
			}
		}
		mean := make([]float64, c.Nz)
		s.MeanU(mean)
		for k := range mean {
			if math.Abs(mean[k]-prof[k]) > 1e-12*math.Abs(prof[k]) {
				t.Fatalf("%v: drifted at k=%d: %g vs %g", walls, k, mean[k], prof[k])
			}
		}
	}
}

func TestBulkForcingHoldsTarget(t *testing.T) {
	c := channel(16, 24, transform.Gonum)
	c.Forcing = Forcing{Kind: FixedBulk, Bulk: 0.05}
	s := mustNew(t, c)
	for range 30 {
		if err := s.StepBy(0.05); err != nil {
			t.Fatal(err)
		}
	}
	if b := s.Bulk(); math.Abs(b-0.05) > 1e-12 {
		t.Errorf("bulk %g, want 0.05", b)
	}
	if !(s.Gradient() > 0) {
		t.Errorf("gradient %g, want > 0 to accelerate the flow", s.Gradient())
	}
}

func TestSameSeedSameNumbers(t *testing.T) {
	run := func(seed uint64) []float64 {
		s := mustNew(t, channel(32, 24, transform.FFTW))
		prof, _, _ := s.LaminarProfile()
		s.SetMeanProfile(prof)
		s.Perturb(1e-3, 0.5, 0.2, seed)
		for range 5 {
			if err := s.Step(); err != nil {
				t.Fatal(err)
			}
		}
		return append([]float64(nil), s.U()...)
	}
	a, b, c := run(7), run(7), run(8)
	for i := range a {
		if a[i] != b[i] {
			t.Fatalf("same seed differs at %d: %g vs %g", i, a[i], b[i])
		}
	}
	same := true
	for i := range a {
		same = same && a[i] == c[i]
	}
	if same {
		t.Fatal("different seeds gave the same field")
	}
}

func TestBlowUpIsReported(t *testing.T) {
	c := channel(32, 16, transform.Gonum)
	s := mustNew(t, c)
	s.SetVelocityFunc(func(x, z float64) float64 { return 1 + 0.5*math.Sin(math.Pi*x) }, nil)
	var err error
	for i := 0; i < 50 && err == nil; i++ {
		err = s.StepBy(2) // far above the Courant limit
	}
	var b *BlowUpError
	if !errors.As(err, &b) {
		t.Fatalf("got %v, want a BlowUpError", err)
	}
	if !(b.Time > 0) || b.Cause == "" {
		t.Errorf("incomplete report: %+v", b)
	}
}

func TestStepAllocatesNothing(t *testing.T) {
	c := channel(64, 32, transform.FFTW)
	c.Workers = 2
	s := mustNew(t, c)
	s.Perturb(1e-3, 0.5, 0.2, 1)
	if err := s.Step(); err != nil {
		t.Fatal(err)
	}
	if a := testing.AllocsPerRun(5, func() { _ = s.Step() }); a != 0 {
		t.Errorf("%v allocations per step, want 0", a)
	}
}

// TestWorkersAgree: the split over workers changes nothing but the order of
// independent work, so 1, 2 and 3 workers give identical fields, for a
// plain channel and for a canopy flow with the closure, the drag and a
// scalar taken up by the elements and the bed (common practice, no source).
func TestWorkersAgree(t *testing.T) {
	plain := func() Config { return channel(48, 24, transform.Gonum) }
	canopy := func() Config {
		c := canopyChannel(48, 24, 1)
		c.Backend = transform.Gonum
		c.Drag.Law = func(re float64) float64 { return 1 + 10/math.Sqrt(re+1) }
		c.Drag.Diameter = 0.01
		area := make([]float64, len(c.Drag.HalfArea))
		for i, h := range c.Drag.HalfArea {
			area[i] = 2 * math.Pi * h
		}
		c.Scalars = []Scalar{{
			Name: "oxygen", Diffusivity: 1e-6, Initial: 0.25,
			Top:             ScalarBoundary{Kind: FixedValue, Value: 0.3},
			Bed:             ScalarBoundary{Kind: Transfer, Capacity: 1e-4, Velocity: func(us float64) float64 { return 0.01 * us }},
			SurfaceArea:     area,
			ElementVelocity: func(speed float64) float64 { return 1e-4 * math.Sqrt(speed+1e-6) },
			Capacity:        1e-4,
		}}
		return c
	}
	for _, tc := range []struct {
		name string
		cfg  func() Config
		dt   float64
	}{{"channel", plain, 0.05}, {"canopy", canopy, 0.02}} {
		t.Run(tc.name, func(t *testing.T) {
			run := func(workers int) []float64 {
				c := tc.cfg()
				c.Workers = workers
				s := mustNew(t, c)
				s.Perturb(1e-2, 0.5, 0.2, 3)
				for range 4 {
					if err := s.StepBy(tc.dt); err != nil {
						t.Fatal(err)
					}
				}
				out := append(append([]float64(nil), s.U()...), s.W()...)
				out = append(out, s.Viscosity()...)
				for k := range c.Scalars {
					out = append(out, s.Scalar(k)...)
				}
				return out
			}
			a := run(1)
			for _, workers := range []int{2, 3} {
				b := run(workers)
				for i := range a {
					if a[i] != b[i] {
						t.Fatalf("%d workers disagree with 1 at %d: %g vs %g", workers, i, b[i], a[i])
					}
				}
			}
		})
	}
}

// TestDragBalance: with uniform quadratic drag and free-slip walls the flow
// settles where the pressure gradient balances the drag,
// U = √(2 Π / (C_D a)) (Nepf 2012, Annu. Rev. Fluid Mech. 44:123), even
// with C_D a |u| Δt far above 1 (point-implicit drag).
func TestDragBalance(t *testing.T) {
	c := channel(16, 16, transform.Gonum)
	c.Bed.Kind, c.Top.Kind = FreeSlip, FreeSlip
	a, cd := 20.0, 1.2
	half := make([]float64, c.Nx*c.Nz)
	for i := range half {
		half[i] = a / 2
	}
	c.Drag = &Drag{HalfArea: half, CD: cd}
	s := mustNew(t, c)
	want := math.Sqrt(2 * c.Forcing.Gradient / (cd * a))
	dt := 20.0 // C_D a U Δt ≈ 4.4
	for range 200 {
		if err := s.StepBy(dt); err != nil {
			t.Fatal(err)
		}
	}
	if got := s.Bulk(); math.Abs(got/want-1) > 1e-10 {
		t.Errorf("drag-balanced velocity %.12g, want %.12g", got, want)
	}
}

// TestSmagorinskyViscosity: for a uniform shear du/dz = G away from walls the
// model gives ν_t = ℓ² G (definition, Smagorinsky closure).
func TestSmagorinskyViscosity(t *testing.T) {
	c := channel(16, 32, transform.Gonum)
	c.Bed.Kind, c.Top.Kind = FreeSlip, FreeSlip
	c.Closure.Cs = 0.2
	s := mustNew(t, c)
	G := 0.3
	s.SetVelocityFunc(func(x, z float64) float64 { return G * z }, nil)
	s.st.tNow = 0
	s.crew.run(s.explicitTask)
	g := s.Grid()
	k := 16
	delta := math.Sqrt(g.Dx * g.Dz[k])
	ell := c.Closure.Cs * delta // free-slip walls: no wall damping
	want := c.Viscosity + ell*ell*G
	if got := s.Viscosity()[k*c.Nx+3]; math.Abs(got/want-1) > 1e-12 {
		t.Errorf("ν_e = %g, want %g", got, want)
	}
}

// TestSaveRestoreRepeatsBitForBit: a run saved and restored into a fresh
// solver continues with exactly the numbers of the uninterrupted run.
func TestSaveRestoreRepeatsBitForBit(t *testing.T) {
	c := channel(32, 24, transform.FFTW)
	c.Closure.Cs = 0.2
	c.Forcing = Forcing{Kind: FixedBulk, Bulk: 0.2}
	c.Scalars = []Scalar{{Name: "dye", Diffusivity: 1e-6, Initial: 1, Top: ScalarBoundary{Kind: FixedValue, Value: 2},
		Bed: ScalarBoundary{Kind: Transfer, Capacity: 1e-4, Velocity: func(us float64) float64 { return 0.01 * us }}}}
	a := mustNew(t, c)
	a.Perturb(1e-2, 0.5, 0.2, 5)
	for range 5 {
		if err := a.Step(); err != nil {
			t.Fatal(err)
		}
	}
	var st State
	a.Save(&st)
	b := mustNew(t, c)
	if err := b.Restore(&st); err != nil {
		t.Fatal(err)
	}
	for range 5 {
		if err := a.Step(); err != nil {
			t.Fatal(err)
		}
		if err := b.Step(); err != nil {
			t.Fatal(err)
		}
	}
	for i := range a.U() {
		if a.U()[i] != b.U()[i] || a.Scalar(0)[i] != b.Scalar(0)[i] {
			t.Fatalf("restored run differs at %d: %v vs %v", i, a.U()[i], b.U()[i])
		}
	}
	if a.Budget(0) != b.Budget(0) {
		t.Fatalf("budgets differ: %+v vs %+v", a.Budget(0), b.Budget(0))
	}
	if a.Time() != b.Time() || a.Gradient() != b.Gradient() {
		t.Fatal("time or gradient differ")
	}
	small := mustNew(t, channel(16, 24, transform.FFTW))
	if err := small.Restore(&st); err == nil {
		t.Fatal("restored a state of another grid")
	}
}

// TestDragBalancedProfile: deep inside a dense canopy the profile reaches
// U = √(2Π/(C_D a)) (Nepf 2012, Annu. Rev. Fluid Mech. 44:123), and it is
// faster above the canopy.
func TestDragBalancedProfile(t *testing.T) {
	c := channel(16, 64, transform.Gonum)
	c.Viscosity = 1e-6
	c.Top.Kind = FreeSlip
	c.Forcing.Gradient = 1e-4
	a, cd, h := 40.0, 1.0, 0.5
	half := make([]float64, c.Nx*c.Nz)
	g, _ := NewGrid(c.Nx, c.Nz, c.Lx, c.H, c.Cluster)
	for k, z := range g.Zc {
		if z < h {
			for i := 0; i < c.Nx; i++ {
				half[k*c.Nx+i] = a / 2
			}
		}
	}
	c.Drag = &Drag{HalfArea: half, CD: cd}
	s := mustNew(t, c)
	prof, _, err := s.DragBalancedProfile()
	if err != nil {
		t.Fatal(err)
	}
	want := math.Sqrt(2 * c.Forcing.Gradient / (cd * a))
	mid := 16 // z ≈ 0.26 m, many drag lengths 1/(C_D a) = 0.025 m from the top and the bed
	if math.Abs(prof[mid]/want-1) > 0.01 {
		t.Errorf("in-canopy U = %g, want %g", prof[mid], want)
	}
	if !(prof[60] > 3*prof[mid]) {
		t.Errorf("above-canopy U = %g not well above in-canopy %g", prof[60], prof[mid])
	}
}

// TestSecondOrderInTime: a decaying vortex array between no-slip walls, where
// the pressure gradient runs along the walls, converges at second order in
// the step (the incremental pressure keeps the projection from leaving an
// O(Δt) wall slip; Spalart, Moser & Rogers 1991 is second order).
func TestSecondOrderInTime(t *testing.T) {
	for _, kind := range []WallKind{NoSlip, FreeSlip} {
		amp := func(n int) float64 {
			s := mustNew(t, Config{Nx: 16, Nz: 32, Lx: 2 * math.Pi, H: 1, Viscosity: 0.01,
				Bed: Wall{Kind: kind}, Top: Wall{Kind: kind}, Backend: transform.Gonum})
			a := 1e-3
			s.SetVelocityFunc(func(x, z float64) float64 { return a * math.Pi * math.Sin(x) * math.Cos(math.Pi*z) },
				func(x, z float64) float64 { return -a * math.Cos(x) * math.Sin(math.Pi*z) })
			T := 1 / (0.01 * (1 + math.Pi*math.Pi))
			for range n {
				if err := s.StepBy(T / float64(n)); err != nil {
					t.Fatal(err)
				}
			}
			g := s.Grid()
			num, den := 0.0, 0.0
			for k := 0; k < g.Nz; k++ {
				for i := 0; i < g.Nx; i++ {
					b := math.Pi * math.Sin(g.X[i]) * math.Cos(math.Pi*g.Zc[k])
					num += s.U()[k*g.Nx+i] * b
					den += b * b
				}
			}
			return num / den
		}
		a1, a2, a3 := amp(50), amp(100), amp(200)
		order := math.Log2((a1 - a2) / (a2 - a3))
		if order < 1.8 || order > 2.3 {
			t.Errorf("%v walls: time order %.3f, want 2", kind, order)
		}
	}
}
