package canopy

import (
	"strings"
	"testing"
)

// TestOnSlabStripes: stripes across the span put the slice's row on every
// spanwise row of each plane, bit for bit (derived: the same arithmetic).
func TestOnSlabStripes(t *testing.T) {
	m := UniformMesh(32, 20, 2.0, 1.0)
	slab := m.SlabMesh(6, 0.75)
	for _, ps := range [][]Patch{nil, {{X0: 0.31, X1: 0.97}}, {{X0: 1.7, X1: 0.23}, {X0: 0.5, X1: 1.2}}} {
		c := &Canopy{Profile: Block(0.33, 8), Patches: ps, PatchEdge: 0.1, Elements: Elements{Width: 0.004}, CD: 1}
		if ps == nil {
			c.PatchEdge = 0
		}
		a2, a3 := c.OnGrid(m), c.OnGrid(slab)
		if len(a3) != 20*6*32 {
			t.Fatalf("slab array has %d values, want Nz·Ny·Nx = %d", len(a3), 20*6*32)
		}
		for k := range 20 {
			for j := range 6 {
				for i := range 32 {
					if a3[(k*6+j)*32+i] != a2[k*32+i] {
						t.Fatalf("patches %v: a(k=%d, j=%d, i=%d) = %v, slice %v", ps, k, j, i, a3[(k*6+j)*32+i], a2[k*32+i])
					}
				}
			}
		}
	}
}

// TestOnSlabRectangles: the frontal area of rectangles summed over the
// cells is FAI × the rectangles' area to round-off, wherever the edges
// fall and however they are smoothed (derived: cell averages of exact
// integrals); points well inside are covered, well outside bare.
func TestOnSlabRectangles(t *testing.T) {
	m := UniformMesh(32, 20, 2.0, 1.0).SlabMesh(16, 1.0)
	for _, tc := range []struct {
		name    string
		patches []Patch
		edge    float64
	}{
		{"one", []Patch{{X0: 0.31, X1: 0.97, Y0: 0.13, Y1: 0.61}}, 0},
		{"wrapping both ways", []Patch{{X0: 1.7, X1: 0.23, Y0: 0.8, Y1: 0.3}}, 0},
		{"side by side", []Patch{{X0: 0.2, X1: 1.0, Y0: 0, Y1: 0.5}, {X0: 0.6, X1: 1.4, Y0: 0.5, Y1: 1}}, 0.05},
		{"stripe and rectangle", []Patch{{X0: 0.2, X1: 0.8}, {X0: 1.0, X1: 1.6, Y0: 0.25, Y1: 0.75}}, 0.1},
	} {
		c := &Canopy{Profile: Block(0.2, 10), Patches: tc.patches, PatchEdge: tc.edge, Elements: Elements{Width: 0.004}, CD: 1}
		if err := c.ValidateSlab(m.Lx, m.Ly, m.H); err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		a := c.OnGrid(m)
		nx, ny := len(m.X), len(m.Y)
		sum := 0.0
		for n := range nx * ny {
			sum += a[n] / 10 * m.Dx * m.Dy
		}
		want := 0.0
		for _, p := range tc.patches {
			want += p.Length(m.Lx) * p.Width(m.Ly)
		}
		if !near(sum, want, 1e-12) {
			t.Errorf("%s: Σ C Δx Δy = %.15g m², want the covered area %.15g m²", tc.name, sum, want)
		}
	}
	c := &Canopy{Profile: Block(0.2, 10), Patches: []Patch{{X0: 0.5, X1: 1.5, Y0: 0.25, Y1: 0.75}}, Elements: Elements{Width: 0.004}, CD: 1}
	a := c.OnGrid(m)
	nx := len(m.X)
	// x = 1 m is point 16, y = 0.5 m is point 8: inside; y = 0 (point 0) outside.
	if a[8*nx+16] != 10 || a[0*nx+16] != 0 || a[8*nx+0] != 0 {
		t.Errorf("inside %g (want 10), beside %g and upstream %g (want 0)", a[8*nx+16], a[16], a[8*nx])
	}
}

func TestValidateSlab(t *testing.T) {
	const lx, ly = 10.0, 4.0
	for _, tc := range []struct {
		name    string
		patches []Patch
		edge    float64
		ly      float64
		want    string
	}{
		{"side by side", []Patch{{X0: 1, X1: 5, Y0: 0, Y1: 2}, {X0: 3, X1: 7, Y0: 2, Y1: 4}}, 0, ly, ""},
		{"wrapping apart", []Patch{{X0: 1, X1: 5, Y0: 3, Y1: 1}, {X0: 3, X1: 7, Y0: 1, Y1: 3}}, 0.5, ly, ""},
		{"stripe beside rectangle", []Patch{{X0: 1, X1: 3}, {X0: 3, X1: 7, Y0: 1, Y1: 3}}, 0, ly, ""},
		{"rectangles overlap", []Patch{{X0: 1, X1: 5, Y0: 0, Y1: 2}, {X0: 3, X1: 7, Y0: 1, Y1: 3}}, 0, ly, "patches 1 (x [1, 5) m, y [0, 2) m) and 2 (x [3, 7) m, y [1, 3) m) overlap"},
		{"stripe over rectangle", []Patch{{X0: 1, X1: 4}, {X0: 3, X1: 7, Y0: 1, Y1: 3}}, 0, ly, "overlap"},
		{"rectangle in a slice", []Patch{{X0: 1, X1: 5, Y0: 0, Y1: 2}}, 0, 0, "only a slab has a span"},
		{"outside the span", []Patch{{X0: 1, X1: 5, Y0: 1, Y1: 5}}, 0, ly, "y1 = 5 m: need 0 <= y1 <= Ly = 4 m"},
		{"negative side", []Patch{{X0: 1, X1: 5, Y0: -1, Y1: 2}}, 0, ly, "y0 = -1 m"},
		{"edge wider than the span extent", []Patch{{X0: 1, X1: 5, Y0: 1, Y1: 1.5}}, 1, ly, "more than the spanwise extent 0.5 m of patch 1"},
	} {
		c := &Canopy{Profile: Block(0.2, 10), Patches: tc.patches, PatchEdge: tc.edge, Elements: Elements{Width: 0.004}, CD: 1}
		err := c.ValidateSlab(lx, tc.ly, 1)
		switch {
		case tc.want == "" && err != nil:
			t.Errorf("%s: %v", tc.name, err)
		case tc.want != "" && (err == nil || !strings.Contains(err.Error(), tc.want)):
			t.Errorf("%s: error %v, want one containing %q", tc.name, err, tc.want)
		}
	}
	if err := (&Canopy{Profile: Block(0.2, 10), CD: 1}).ValidateSlab(lx, -1, 1); err == nil || !strings.Contains(err.Error(), "domain width -1 m") {
		t.Errorf("negative width: %v", err)
	}
}
