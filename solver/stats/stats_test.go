package stats

import (
	"math"
	"testing"

	"rollerbed/solver"
)

// TestReynoldsStressOfTravellingWave: u′ = A cos(kx + φ), w′ = B cos(kx)
// gives ⟨u′w′⟩ = ½ A B cos φ and ⟨u′u′⟩ = ½ A² (averages of products of
// sinusoids; derived).
func TestReynoldsStressOfTravellingWave(t *testing.T) {
	g, err := solver.NewGrid(32, 8, 2, 1, solver.Cluster{})
	if err != nil {
		t.Fatal(err)
	}
	nx, nz := g.Nx, g.Nz
	A, B, phi, U0 := 0.3, 0.2, 0.7, 1.5
	k := 2 * math.Pi / g.Lx
	u := make([]float64, nz*nx)
	w := make([]float64, (nz+1)*nx)
	wx := make([]float64, (nz+1)*nx)
	nue := make([]float64, nz*nx)
	for kk := 0; kk < nz; kk++ {
		for i := 0; i < nx; i++ {
			u[kk*nx+i] = U0 + A*math.Cos(k*g.X[i]+phi)
			nue[kk*nx+i] = 1e-6 + 1e-3
		}
	}
	for j := 1; j < nz; j++ {
		for i := 0; i < nx; i++ {
			w[j*nx+i] = B * math.Cos(k*g.X[i])
		}
	}
	p := NewProfiles(g, 1e-6, 1)
	p.add(0.5, 0.1, u, w, wx, nue) // before the start: ignored
	p.add(1.0, 0.2, u, w, wx, nue)
	p.add(1.2, 0.3, u, w, wx, nue)
	if n, sec := p.Samples(); n != 2 || math.Abs(sec-0.5) > 1e-15 {
		t.Fatalf("samples %d over %g s", n, sec)
	}
	m := p.Mean()
	for kk := 0; kk < nz; kk++ {
		if math.Abs(m.U[kk]-U0) > 1e-13 || math.Abs(m.UU[kk]-0.5*A*A) > 1e-13 || math.Abs(m.NuT[kk]-1e-3) > 1e-15 {
			t.Fatalf("level %d: U %g UU %g NuT %g", kk, m.U[kk], m.UU[kk], m.NuT[kk])
		}
	}
	for j := 1; j < nz; j++ {
		if want := 0.5 * A * B * math.Cos(phi); math.Abs(m.UW[j]-want) > 1e-13 {
			t.Fatalf("face %d: UW %g, want %g", j, m.UW[j], want)
		}
		// The field does not change in time, so all of the stress is
		// dispersive (spatial deviations of the time mean).
		if math.Abs(m.Dispersive[j]-m.UW[j]) > 1e-13 {
			t.Fatalf("face %d: dispersive %g, resolved %g", j, m.Dispersive[j], m.UW[j])
		}
		if math.Abs(m.WW[j]-0.5*B*B) > 1e-13 || math.Abs(m.SGS[j]) > 1e-15 {
			t.Fatalf("face %d: WW %g SGS %g", j, m.WW[j], m.SGS[j])
		}
	}
	if m.UW[0] != 0 || m.UW[nz] != 0 {
		t.Error("stress at the walls must be zero")
	}
}

func TestProbesRecordNearestPoints(t *testing.T) {
	g, _ := solver.NewGrid(16, 8, 1, 1, solver.Cluster{})
	s, err := solver.New(solver.Config{Nx: 16, Nz: 8, Lx: 1, H: 1, Viscosity: 1e-3,
		Bed: solver.Wall{Kind: solver.FreeSlip}, Top: solver.Wall{Kind: solver.FreeSlip}, Backend: 1})
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	s.SetVelocityFunc(func(x, z float64) float64 { return 2 }, nil)
	p := NewProbes(g, []float64{0.5, 1.26}, []float64{0.3, 0.9})
	p.Reserve(3)
	for range 3 {
		p.Add(s)
	}
	if len(p.T) != 3 || p.U[1][0] != 2 || p.W[0][0] != 0 {
		t.Fatalf("series %v %v %v", p.T, p.U, p.W)
	}
	p.Reserve(10)
	if a := testing.AllocsPerRun(5, func() { p.Add(s) }); a != 0 {
		t.Errorf("Add allocates %v", a)
	}
	if p.Points[1].i != 4 { // 1.26 wraps to 0.26, nearest sample 0.25
		t.Errorf("probe x index %d, want 4", p.Points[1].i)
	}
}

func TestExportImportRoundTrip(t *testing.T) {
	g, _ := solver.NewGrid(8, 8, 1, 1, solver.Cluster{})
	p := NewProfiles(g, 1e-6, 0.5)
	u := make([]float64, 64)
	w := make([]float64, 72)
	for i := range u {
		u[i] = float64(i) * 0.01
	}
	for i := range w {
		w[i] = float64(i%8) * 0.003
	}
	p.add(1, 0.1, u, w, make([]float64, 72), make([]float64, 64))
	q := NewProfiles(g, 1e-6, 0)
	if err := q.Import(p.Export()); err != nil {
		t.Fatal(err)
	}
	a, b := p.Mean(), q.Mean()
	for j := range a.UW {
		if a.UW[j] != b.UW[j] || (j < len(a.U) && a.U[j] != b.U[j]) {
			t.Fatalf("restored statistics differ at %d", j)
		}
	}
	if q.Start != 0.5 {
		t.Errorf("start %g", q.Start)
	}
	small, _ := solver.NewGrid(8, 4, 1, 1, solver.Cluster{})
	if err := NewProfiles(small, 1e-6, 0).Import(p.Export()); err == nil {
		t.Error("imported statistics of another grid")
	}
}

// TestScalarProfilesLinearDiffusion: a steady linear profile c = c0 + G z in
// still fluid has no resolved flux and a diffusive flux −D G (Fick's law).
func TestScalarProfilesLinearDiffusion(t *testing.T) {
	s, err := solver.New(solver.Config{Nx: 8, Nz: 16, Lx: 1, H: 1, Viscosity: 1e-6,
		Bed: solver.Wall{Kind: solver.FreeSlip}, Top: solver.Wall{Kind: solver.FreeSlip}, Backend: 1,
		Scalars: []solver.Scalar{{Name: "salt", Diffusivity: 1e-3}}})
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	G := 0.4
	s.SetScalarFunc(0, func(x, z float64) float64 { return 1 + G*z })
	p := NewScalarProfiles(s.Grid(), 0, 1e-6, 1e-3, 1, 0)
	p.Add(s, 1)
	m := p.Mean()
	for j := 1; j < 16; j++ {
		if math.Abs(m.Diffusive[j]+1e-3*G) > 1e-15 || math.Abs(m.Resolved[j]) > 1e-15 {
			t.Fatalf("face %d: diffusive %g resolved %g", j, m.Diffusive[j], m.Resolved[j])
		}
	}
	q := NewScalarProfiles(s.Grid(), 0, 1e-6, 1e-3, 1, 0)
	if err := q.Import("salt", p.Export("salt")); err != nil || q.Mean().C[3] != m.C[3] {
		t.Fatalf("round trip: %v", err)
	}
}
