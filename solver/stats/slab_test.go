package stats

import (
	"math"
	"testing"

	"rollerbed/solver"
)

// slabGrid is a grid of 16 × 8 × 6 cells on a slab 2 m long, 1 m wide and
// 1 m deep.
func slabGrid(t *testing.T) *solver.Grid {
	t.Helper()
	g, err := solver.NewGrid(16, 6, 2, 1, solver.Cluster{})
	if err != nil {
		t.Fatal(err)
	}
	g.Ny, g.Ly = 8, 1
	return g
}

// TestSlabStresses: in a slab the averages run over x and y:
// u′ = A cos(ky y), v′ = C sin(kx x), w′ = B cos(ky y) give ⟨u′u′⟩ = ½A²,
// ⟨v′v′⟩ = ½C², ⟨u′w′⟩ = ½AB and TKE = ½(½A² + ½C² + ½B²) (averages of
// products of sinusoids; derived).
func TestSlabStresses(t *testing.T) {
	g := slabGrid(t)
	nx, ny, nz := g.Nx, g.Ny, g.Nz
	np := nx * ny
	A, B, C, U0 := 0.3, 0.2, 0.1, 1.5
	kx, ky := 2*math.Pi/g.Lx, 2*math.Pi/g.Ly
	u, v := make([]float64, nz*np), make([]float64, nz*np)
	w, wx := make([]float64, (nz+1)*np), make([]float64, (nz+1)*np)
	nue := make([]float64, nz*np)
	for k := range nz + 1 {
		for j := range ny {
			for i := range nx {
				n := (k*ny+j)*nx + i
				cy := math.Cos(ky * g.Y(j))
				if k > 0 && k < nz {
					w[n] = B * cy
				}
				if k < nz {
					u[n], v[n], nue[n] = U0+A*cy, C*math.Sin(kx*g.X[i]), 1e-6
				}
			}
		}
	}
	p := NewProfiles(g, 1e-6, 0)
	p.add(1, 0.5, u, w, wx, nue)
	p.addV(0.5, v)
	m := p.Mean()
	for k := range nz {
		if math.Abs(m.U[k]-U0) > 1e-13 || math.Abs(m.UU[k]-0.5*A*A) > 1e-13 || math.Abs(m.VV[k]-0.5*C*C) > 1e-13 {
			t.Fatalf("level %d: U %g UU %g VV %g", k, m.U[k], m.UU[k], m.VV[k])
		}
	}
	for j := 1; j < nz; j++ {
		if math.Abs(m.UW[j]-0.5*A*B) > 1e-13 || math.Abs(m.WW[j]-0.5*B*B) > 1e-13 {
			t.Fatalf("face %d: UW %g WW %g", j, m.UW[j], m.WW[j])
		}
	}
	k := nz / 2
	want := 0.5 * (0.5*A*A + 0.5*C*C + 0.5*(m.WW[k]+m.WW[k+1]))
	if math.Abs(m.TKE[k]-want) > 1e-13 {
		t.Errorf("TKE %g, want %g with v", m.TKE[k], want)
	}
	saved := p.Export()
	q := NewProfiles(g, 1e-6, 0)
	if err := q.Import(saved); err != nil {
		t.Fatal(err)
	}
	if got := q.Mean(); got.VV[k] != m.VV[k] {
		t.Errorf("⟨v′v′⟩ after a checkpoint %g, want %g", got.VV[k], m.VV[k])
	}
	if p := NewProfiles(g, 1e-6, 0); p.Mean().VV != nil && len(p.Mean().VV) != 0 {
		t.Error("no samples: VV should be empty")
	}
}

// TestSpanCorrelationLength: R(Δy) = cos(2πΔy/Ly) for w′ ∝ cos(2πy/Ly)
// (derived), whose integral to the first zero Ly/4 is Ly/(2π); a
// y-invariant level correlates across the whole span, so the length is
// only bounded below by half the span.
func TestSpanCorrelationLength(t *testing.T) {
	const nx, ny, ly = 8, 64, 2.0
	dy := ly / ny
	cosine, flat := make([]float64, nx*ny), make([]float64, nx*ny)
	for j := range ny {
		for i := range nx {
			cosine[j*nx+i] = 3 + math.Cos(2*math.Pi*float64(j)*dy/ly)*(1+0.1*float64(i))
			flat[j*nx+i] = math.Sin(2 * math.Pi * float64(i) / nx)
		}
	}
	// The trapezoidal rule on 16 intervals to the zero errs by about
	// (π/2)²/(12·16²) relative (derived).
	if l, ok := SpanCorrelationLength(cosine, nx, ny, dy); !ok || math.Abs(l-ly/(2*math.Pi)) > 1e-3*ly {
		t.Errorf("cosine: length %g (bounded %v), want %g", l, ok, ly/(2*math.Pi))
	}
	if l, ok := SpanCorrelationLength(flat, nx, ny, dy); ok || math.Abs(l-ly/2) > 1e-12 {
		t.Errorf("y-invariant: length %g (bounded %v), want half the span %g and unbounded", l, ok, ly/2)
	}
	if l, ok := SpanCorrelationLength(make([]float64, nx*ny), nx, ny, dy); l != 0 || !ok {
		t.Errorf("no variation: %g %v", l, ok)
	}
}

// TestCorrelationSpacingRows: rows of the same wave at different phases
// across the span give the wave's length (derived), and one row is
// CorrelationSpacing bit for bit.
func TestCorrelationSpacingRows(t *testing.T) {
	const nx, ny, lx = 64, 6, 3.0
	dx := lx / nx
	v := make([]float64, nx*ny)
	for j := range ny {
		for i := range nx {
			v[j*nx+i] = math.Sin(2*math.Pi*3*float64(i)*dx/lx + float64(j))
		}
	}
	if got := CorrelationSpacingRows(v, nx, dx); math.Abs(got-lx/3) > 0.01*lx {
		t.Errorf("spacing %g m, want %g m", got, lx/3)
	}
	if a, b := CorrelationSpacingRows(v[:nx], nx, dx), CorrelationSpacing(v[:nx], dx); a != b {
		t.Errorf("one row: %v, CorrelationSpacing %v", a, b)
	}
}

// TestProbesAcross: a probe in a slab reads the point of its row.
func TestProbesAcross(t *testing.T) {
	g := slabGrid(t)
	p := NewProbesAcross(g, []float64{0.5}, []float64{0.375}, []float64{0.5})
	if pr := p.Points[0]; pr.row != 3 || pr.i != 4 {
		t.Errorf("probe at row %d point %d, want 3 and 4", pr.row, pr.i)
	}
	if p := NewProbes(g, []float64{0.5}, []float64{0.5}); p.Points[0].row != 0 {
		t.Error("NewProbes should put probes at y = 0")
	}
}
