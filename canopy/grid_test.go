package canopy

import (
	"math"
	"strings"
	"testing"
)

// testGrid is a mesh with the sizes the tests read.
type testGrid struct {
	Mesh
	Nx, Nz int
	Dz     []float64 // m, cell heights
}

func newTestGrid(m Mesh) testGrid {
	g := testGrid{Mesh: m, Nx: len(m.X), Nz: len(m.Zf) - 1}
	for k := range g.Nz {
		g.Dz = append(g.Dz, m.Zf[k+1]-m.Zf[k])
	}
	return g
}

// testGrids returns a uniform and a stretched mesh of 32 × 40 cells on a
// slice 2 m long and 1 m deep; the stretched one has the faces
// H (ξ − 0.15 sin(2πξ)/π) of evenly spaced ξ, cells about 1.9 times finer
// at the bed and the top than at mid-depth.
func testGrids(t *testing.T) map[string]testGrid {
	t.Helper()
	uniform := UniformMesh(32, 40, 2.0, 1.0)
	stretched := UniformMesh(32, 40, 2.0, 1.0)
	for j := range stretched.Zf {
		xi := float64(j) / 40
		stretched.Zf[j] = xi - 0.15*math.Sin(2*math.Pi*xi)/math.Pi
	}
	stretched.Zf[0], stretched.Zf[40] = 0, 1
	return map[string]testGrid{"uniform": newTestGrid(uniform), "stretched": newTestGrid(stretched)}
}

// columnIntegral returns Σ_k a[k·Nx + i] Δz_k at point i.
func columnIntegral(g testGrid, a []float64, i int) float64 {
	sum := 0.0
	for k := range g.Nz {
		sum += a[k*g.Nx+i] * g.Dz[k]
	}
	return sum
}

func TestOnGridColumns(t *testing.T) {
	const h = 0.33 // inside a cell on both grids
	for gname, g := range testGrids(t) {
		for _, tc := range []struct {
			name string
			p    Profile
			want float64 // ∫₀^H a dz
		}{
			// Derived: a0 h for a block, the exact piecewise-linear integral for a table.
			{"block", Block(h, 12), 12 * h},
			{"table", Table([]float64{0.05, 0.2, h}, []float64{3, 9, 6}), 0.05*3 + 0.15*6 + 0.13*7.5},
			// Derived: a0 (h + (w/4) ln(1 + e^(−4h/w))) up to terms e^(−4(H−h)/w).
			{"smoothed block", Profile{Z: []float64{h}, A: []float64{12}, Edge: 0.04}, 12 * (h + 0.01*math.Log1p(math.Exp(-4*h/0.04)))},
		} {
			c := &Canopy{Profile: tc.p, Elements: Elements{Width: 0.004}, CD: 1}
			a := c.OnGrid(g.Mesh)
			if len(a) != g.Nx*g.Nz {
				t.Fatalf("%s %s: %d values, want Nz·Nx = %d", gname, tc.name, len(a), g.Nx*g.Nz)
			}
			for _, i := range []int{0, 7, g.Nx - 1} {
				if got := columnIntegral(g, a, i); !near(got, tc.want, 1e-12) {
					t.Errorf("%s %s: column %d ∫ a dz = %.15g, want %.15g", gname, tc.name, i, got, tc.want)
				}
			}
			if tc.p.Edge == 0 {
				if got := columnIntegral(g, a, 3); !near(got, tc.p.FrontalAreaIndex(), 1e-12) {
					t.Errorf("%s %s: column ∫ = %.15g, frontal area index %.15g", gname, tc.name, got, tc.p.FrontalAreaIndex())
				}
			}
		}
		// The block's partial top cell holds a0 times its filled fraction;
		// cells below hold a0, cells above 0 (derived).
		a := (&Canopy{Profile: Block(h, 12), Elements: Elements{Width: 0.004}, CD: 1}).OnGrid(g.Mesh)
		for k := range g.Nz {
			var want float64
			switch {
			case g.Zf[k+1] <= h:
				want = 12
			case g.Zf[k] < h:
				want = 12 * (h - g.Zf[k]) / g.Dz[k]
				if want <= 0 || want >= 12 {
					t.Errorf("%s: the top cell is not partial", gname)
				}
			}
			if got := a[k*g.Nx+5]; !near(got, want, 1e-13) {
				t.Errorf("%s: cell %d [%g, %g] m: a = %.15g, want %.15g", gname, k, g.Zf[k], g.Zf[k+1], got, want)
			}
		}
	}
}

func TestOnGridPatches(t *testing.T) {
	g := testGrids(t)["uniform"] // Lx = 2 m, Δx = 1/16 m
	for _, tc := range []struct {
		name    string
		patches []Patch
		edge    float64
	}{
		{"off-grid edges", []Patch{{X0: 0.31, X1: 0.97}}, 0},
		{"wrapping", []Patch{{X0: 1.7, X1: 0.23}}, 0},
		{"two", []Patch{{X0: 0.1, X1: 0.5}, {X0: 1.03, X1: 1.61}}, 0},
		{"smoothed", []Patch{{X0: 0.31, X1: 0.97}}, 0.1},
		{"smoothed wrapping", []Patch{{X0: 1.7, X1: 0.23}, {X0: 0.5, X1: 1.2}}, 0.15},
	} {
		c := &Canopy{Profile: Block(0.2, 10), Patches: tc.patches, PatchEdge: tc.edge, Elements: Elements{Width: 0.004}, CD: 1}
		a := c.OnGrid(g.Mesh)
		// Derived: Σ_i C_i Δx = Σ L exactly (cell averages of a closed-form
		// integral), for sharp and smoothed edges alike.
		sum := 0.0
		for i := range g.Nx {
			sum += a[i] / 10 * g.Dx
		}
		if want := c.CoveredFraction(g.Lx) * g.Lx; !near(sum, want, 1e-12) {
			t.Errorf("%s: Σ C Δx = %.15g m, want the covered length %.15g m", tc.name, sum, want)
		}
		// Rows are the profile's cell average times the coverage.
		for k := 0; k < g.Nz; k++ {
			col := c.Profile.Integral(g.Zf[k], g.Zf[k+1]) / g.Dz[k]
			for i := range g.Nx {
				if !near(a[k*g.Nx+i], col*a[i]/10, 1e-15) {
					t.Fatalf("%s: a(%d, %d) is not the product of column and coverage", tc.name, k, i)
				}
			}
		}
	}
	// Sharp edges: inside points 1, outside 0, edge cells their covered
	// share (derived). Patch [0.31, 0.97): cell 5 spans [0.28125, 0.34375).
	c := &Canopy{Profile: Block(0.2, 1), Patches: []Patch{{X0: 0.31, X1: 0.97}}, Elements: Elements{Width: 0.004}, CD: 1}
	a := c.OnGrid(g.Mesh)
	for _, tc := range []struct {
		i    int
		want float64
	}{{0, 0}, {4, 0}, {5, (0.34375 - 0.31) * 16}, {6, 1}, {15, 1}, {16, (0.97 - 0.96875) * 16}, {17, 0}, {31, 0}} {
		if got := a[tc.i]; !near(got, tc.want, 1e-12) {
			t.Errorf("coverage cell %d (x = %g m): %.15g, want %.15g", tc.i, g.X[tc.i], got, tc.want)
		}
	}
}

func TestDragAreaOnGrid(t *testing.T) {
	g := testGrids(t)["stretched"]
	base := Canopy{Profile: Block(0.3, 60), Elements: Elements{Shape: Cylinder, Width: 0.01}, CD: 1.1}
	a := base.OnGrid(g.Mesh)

	// Cylinders: ½ a/(1 − (π/4) a d) (derived; the 1/(1 − φ) factor per
	// Nepf 2012, from memory).
	d := base.DragArea(g.Mesh)
	for i, v := range a {
		want := 0.5 * v / (1 - math.Pi/4*v*0.01)
		if !near(d[i], want, 1e-15) {
			t.Fatalf("DragArea[%d] = %g, want %g", i, d[i], want)
		}
	}

	// Blades with no solid fraction, with a drag law: ½ a (derived).
	blades := base
	blades.Elements = Elements{Shape: Blade, Width: 0.008}
	blades.CD, blades.Law = 0, WhiteCylinder
	d = blades.DragArea(g.Mesh)
	for i, v := range a {
		if d[i] != 0.5*v {
			t.Fatalf("blade DragArea[%d] = %g, want ½ a = %g", i, d[i], 0.5*v)
		}
	}
}

func TestLinearRateOnGrid(t *testing.T) {
	// The rate where the canopy has elements, 0 elsewhere, the partial top
	// cell and the patch edges included (derived).
	g := testGrids(t)["uniform"]
	c := &Canopy{Profile: Block(0.33, 20), Patches: []Patch{{X0: 0.31, X1: 0.97}}, Elements: Elements{Width: 0.004}, Linear: 2.5}
	a, r := c.OnGrid(g.Mesh), c.LinearRate(g.Mesh)
	inside := 0
	for i, v := range a {
		want := 0.0
		if v > 0 {
			want, inside = 2.5, inside+1
		}
		if r[i] != want {
			t.Fatalf("cell %d: a = %g, rate %g, want %g", i, v, r[i], want)
		}
	}
	if inside == 0 || inside == len(a) {
		t.Errorf("%d of %d cells hold elements: the test needs both kinds", inside, len(a))
	}
}

func TestSurfaceAndSolidOnGrid(t *testing.T) {
	g := testGrids(t)["uniform"]
	phi := 0.05
	for _, tc := range []struct {
		name         string
		e            Elements
		ratio, kappa float64
	}{
		// Derived: a_s = π a, 2 a (package doc, Elements and drag); φ = (π/4) a d or φ a/ā.
		{"cylinder", Elements{Shape: Cylinder, Width: 0.006}, math.Pi, math.Pi / 4 * 0.006},
		{"blade", Elements{Shape: Blade, Width: 0.01}, 2, 0},
		{"blade given φ", Elements{Shape: Blade, Width: 0.01, SolidFraction: &phi}, 2, phi / 25},
	} {
		c := &Canopy{Profile: Profile{Z: []float64{0.4}, A: []float64{25}, Edge: 0.05}, Elements: tc.e, CD: 1}
		a, as, sf := c.OnGrid(g.Mesh), c.SurfaceArea(g.Mesh), c.SolidFractionOnGrid(g.Mesh)
		for i := range a {
			if !near(as[i], tc.ratio*a[i], 1e-15) || !near(sf[i], tc.kappa*a[i], 1e-15) {
				t.Fatalf("%s: cell %d: a %g, a_s %g, φ %g", tc.name, i, a[i], as[i], sf[i])
			}
		}
	}
}

func TestCanopyValidate(t *testing.T) {
	ok := Canopy{Profile: Block(0.3, 10), Elements: Elements{Width: 0.01}, CD: 1}
	for _, tc := range []struct {
		name      string
		edit      func(c *Canopy)
		lx, depth float64
		want      string
	}{
		{"ok", func(*Canopy) {}, 2, 1, ""},
		{"law", func(c *Canopy) { c.CD, c.Law = 0, WhiteCylinder }, 2, 1, ""},
		{"length", func(*Canopy) {}, 0, 1, "domain length 0 m"},
		{"too tall", func(*Canopy) {}, 2, 0.2, "above the domain top 0.2 m"},
		{"patch", func(c *Canopy) { c.Patches = []Patch{{X0: 1, X1: 3}} }, 2, 1, "x1 = 3 m"},
		{"width", func(c *Canopy) { c.Elements.Width = -1 }, 2, 1, "element width -1 m"},
		{"law without width", func(c *Canopy) { c.Elements.Width, c.CD, c.Law = 0, 0, WhiteCylinder }, 2, 1, "drag law needs the element"},
		{"no cd", func(c *Canopy) { c.CD = 0 }, 2, 1, "drag coefficient C_D = 0: need a finite value > 0"},
		{"both", func(c *Canopy) { c.Law = WhiteCylinder }, 2, 1, "both a fixed drag coefficient C_D = 1 and a Reynolds-number drag law"},
		{"linear", func(c *Canopy) { c.CD, c.Linear = 0, 3 }, 2, 1, ""},
		{"linear and C_D", func(c *Canopy) { c.Linear = 3 }, 2, 1, "both a linear drag rate 3 1/s and a quadratic drag"},
		{"linear and law", func(c *Canopy) { c.CD, c.Law, c.Linear = 0, WhiteCylinder, 3 }, 2, 1, "both a linear drag rate 3 1/s"},
		{"linear negative", func(c *Canopy) { c.CD, c.Linear = 0, -1 }, 2, 1, "linear drag rate -1 1/s: need a finite rate > 0"},
		{"linear NaN", func(c *Canopy) { c.CD, c.Linear = 0, math.NaN() }, 2, 1, "linear drag rate NaN 1/s"},
	} {
		c := ok
		tc.edit(&c)
		err := c.Validate(tc.lx, tc.depth)
		switch {
		case tc.want == "" && err != nil:
			t.Errorf("%s: unexpected error %v", tc.name, err)
		case tc.want != "" && err == nil:
			t.Errorf("%s: no error, want %q", tc.name, tc.want)
		case tc.want != "" && !strings.Contains(err.Error(), tc.want):
			t.Errorf("%s: error %q does not contain %q", tc.name, err, tc.want)
		}
	}
}

func TestOnGridPanicsOnInvalid(t *testing.T) {
	g := testGrids(t)["uniform"]
	c := &Canopy{Profile: Block(1.5, 10), Elements: Elements{Width: 0.01}, CD: 1} // taller than H = 1 m
	defer func() {
		r := recover()
		if r == nil || !strings.Contains(r.(string), "above the domain top") {
			t.Errorf("recovered %v, want a panic naming the problem", r)
		}
	}()
	c.OnGrid(g.Mesh)
}

func TestCanopyPointValues(t *testing.T) {
	// Derived: a(x, z) = C(x) a(z).
	c := &Canopy{Profile: Table([]float64{0.1, 0.3}, []float64{4, 8}), Patches: []Patch{{X0: 1, X1: 2}}, Elements: Elements{Width: 0.01}, CD: 1}
	for _, tc := range []struct{ x, z, want float64 }{
		{1.5, 0.2, 6}, {0.5, 0.2, 0}, {1, 0.05, 4}, {1.99, 0.31, 0}, {3.5, 0.3, 8},
	} {
		if got := c.At(tc.x, tc.z, 2.5); !near(got, tc.want, 1e-15) {
			t.Errorf("a(%g, %g) = %g, want %g", tc.x, tc.z, got, tc.want)
		}
	}
	if c.Height() != 0.3 || !near(c.FrontalAreaIndex(), 1.6, 1e-15) || !near(c.DragLength(2), 0.3/3.2, 1e-15) {
		t.Errorf("h %g, ∫a dz %g, drag length %g", c.Height(), c.FrontalAreaIndex(), c.DragLength(2))
	}
}
