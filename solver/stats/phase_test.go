package stats

import (
	"math"
	"testing"

	"rollerbed/solver"
)

// TestHarmonic: the first harmonic of cos(2πφ + θ) sampled at the middles
// of equal bins is amplitude 1 and phase θ exactly (discrete Fourier
// transform of a pure tone; derived).
func TestHarmonic(t *testing.T) {
	for _, n := range []int{3, 8, 12} {
		for _, theta := range []float64{0, 0.4, -2} {
			v, w := make([]float64, n), make([]float64, n)
			for b := range v {
				v[b] = 0.3 + 1.7*math.Cos(2*math.Pi*(float64(b)+0.5)/float64(n)+theta)
				w[b] = 1
			}
			a, ph := Harmonic(v, w)
			if math.Abs(a-1.7) > 1e-13 || math.Abs(math.Remainder(ph-theta, 2*math.Pi)) > 1e-13 {
				t.Errorf("n = %d, θ = %g: amplitude %g phase %g, want 1.7, θ", n, theta, a, ph)
			}
		}
	}
	if a, _ := Harmonic([]float64{1, 2}, []float64{0, 0}); a != 0 {
		t.Errorf("no samples: amplitude %g, want 0", a)
	}
}

func TestPhaseBin(t *testing.T) {
	g, err := solver.NewGrid(8, 4, 1, 1, solver.Cluster{})
	if err != nil {
		t.Fatal(err)
	}
	p := NewPhases(g, 4, 10, 0, nil)
	for _, c := range []struct {
		t    float64
		want int
	}{{0, 0}, {2.4, 0}, {2.5, 1}, {9.99, 3}, {10, 0}, {17.6, 3}, {-1, 3}} {
		if got := p.Bin(c.t); got != c.want {
			t.Errorf("Bin(%g) = %d, want %d", c.t, got, c.want)
		}
	}
}

// TestPhasesUniformFlow: a uniform stream between free-slip walls stays as
// it is, so every phase holds its speed and no stress; the bins share the
// time equally (derived).
func TestPhasesUniformFlow(t *testing.T) {
	s, err := solver.New(solver.Config{Nx: 16, Nz: 8, Lx: 1, H: 0.5, Viscosity: 1e-6,
		Bed: solver.Wall{Kind: solver.FreeSlip}, Top: solver.Wall{Kind: solver.FreeSlip},
		Scalars: []solver.Scalar{{Name: "c", Diffusivity: 1e-6, Initial: 2}}})
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	prof := make([]float64, 8)
	for k := range prof {
		prof[k] = 0.2
	}
	s.SetMeanProfile(prof)
	p := NewPhases(s.Grid(), 4, 2, 0.75, []int{0})
	dt := 0.25
	add := func() {
		if err := s.StepBy(dt); err != nil {
			t.Fatal(err)
		}
		p.Add(s, dt)
	}
	for range 18 {
		add()
	}
	means := p.Means()
	for b, m := range means {
		if math.Abs(m.Time-1) > 1e-12 {
			t.Errorf("bin %d: time %g s, want 1 (4 steps of 0.25 s after the start)", b, m.Time)
		}
		if math.Abs(m.Phase-(float64(b)+0.5)/4) > 1e-15 {
			t.Errorf("bin %d: phase %g", b, m.Phase)
		}
		for k, u := range m.U {
			if math.Abs(u-0.2) > 1e-12 {
				t.Errorf("bin %d level %d: U = %g, want 0.2", b, k, u)
			}
		}
		for j, uw := range m.UW {
			if math.Abs(uw) > 1e-15 {
				t.Errorf("bin %d face %d: u'w' = %g, want 0", b, j, uw)
			}
		}
		if math.Abs(m.C[0][3]-2) > 1e-12 || m.ElementUptake[0] != 0 || m.BedUptake[0] != 0 {
			t.Errorf("bin %d: C = %g, uptake %g, %g: want 2, 0, 0", b, m.C[0][3], m.ElementUptake[0], m.BedUptake[0])
		}
	}
	if n := testing.AllocsPerRun(5, add); n != 0 {
		t.Errorf("Add allocates %v times per step", n)
	}
	saved := p.Export()
	q := NewPhases(s.Grid(), 4, 2, 0, []int{0})
	if err := q.Import(saved); err != nil {
		t.Fatal(err)
	}
	if a, b := p.Means(), q.Means(); a[2].U[3] != b[2].U[3] || a[1].Time != b[1].Time || q.Start != 0.75 {
		t.Errorf("import differs: %v %v, %v %v, start %g", a[2].U[3], b[2].U[3], a[1].Time, b[1].Time, q.Start)
	}
	if err := NewPhases(s.Grid(), 5, 2, 0, []int{0}).Import(saved); err == nil {
		t.Error("import into other bins succeeded")
	}
}
