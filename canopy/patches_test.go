package canopy

import (
	"math"
	"strings"
	"testing"
)

func TestPatchLength(t *testing.T) {
	// Derived: plain ranges and ranges that wrap through x = Lx.
	for _, tc := range []struct {
		p      Patch
		lx, nl float64
	}{
		{Patch{X0: 2, X1: 5}, 10, 3}, {Patch{X0: 9, X1: 1}, 10, 2}, {Patch{X0: 0, X1: 10}, 10, 10}, {Patch{X0: 7.5, X1: 0}, 10, 2.5},
	} {
		if got := tc.p.Length(tc.lx); !near(got, tc.nl, 1e-15) {
			t.Errorf("%+v on Lx = %g: length %g, want %g", tc.p, tc.lx, got, tc.nl)
		}
	}
}

func TestCoverageSharp(t *testing.T) {
	// Derived: half-open ranges, periodic in x.
	const lx = 10.0
	c := &Canopy{Patches: []Patch{{X0: 2, X1: 5}, {X0: 9, X1: 1}}}
	for _, tc := range []struct{ x, want float64 }{
		{2, 1}, {3.5, 1}, {4.999, 1}, {5, 0}, {6, 0}, {1.999, 0},
		{9, 1}, {9.5, 1}, {0, 1}, {0.5, 1}, {1, 0}, // the wrapping patch
		{10.5, 1}, {-0.5, 1}, {-7, 1}, {13, 1}, {16, 0}, // periodic images
	} {
		if got := c.Coverage(tc.x, lx); got != tc.want {
			t.Errorf("Coverage(%g) = %g, want %g", tc.x, got, tc.want)
		}
	}
	if got := c.CoveredFraction(lx); !near(got, 0.5, 1e-15) {
		t.Errorf("covered fraction %g, want (3 + 2)/10", got)
	}
	if got := (&Canopy{}).CoveredFraction(lx); got != 1 {
		t.Errorf("no patches: covered fraction %g, want 1", got)
	}
}

func TestPatchValidate(t *testing.T) {
	const lx = 10.0
	for _, tc := range []struct {
		name    string
		patches []Patch
		edge    float64
		want    string
	}{
		{"none", nil, 0, ""},
		{"touching", []Patch{{X0: 0, X1: 2}, {X0: 2, X1: 4}, {X0: 4, X1: 10}}, 0, ""},
		{"wrap touching", []Patch{{X0: 8, X1: 2}, {X0: 2, X1: 5}, {X0: 5, X1: 8}}, 0.5, ""},
		{"whole", []Patch{{X0: 0, X1: 10}}, 0, ""},
		{"overlap", []Patch{{X0: 1, X1: 4}, {X0: 3, X1: 6}}, 0, "patches 1 [1, 4) m and 2 [3, 6) m overlap by 1 m"},
		{"overlap unsorted", []Patch{{X0: 6, X1: 8}, {X0: 1, X1: 4}, {X0: 3.5, X1: 5}}, 0, "patches 2 [1, 4) m and 3 [3.5, 5) m overlap by 0.5 m"},
		{"overlap wrap", []Patch{{X0: 8, X1: 2}, {X0: 1, X1: 3}}, 0, "patches 1 [8, 2) m and 2 [1, 3) m overlap by 1 m"},
		{"inside", []Patch{{X0: 1, X1: 9}, {X0: 3, X1: 4}}, 0, "overlap"},
		{"x0 too far", []Patch{{X0: 10, X1: 2}}, 0, "x0 = 10 m: need 0 <= x0 < Lx = 10 m"},
		{"x1 too far", []Patch{{X0: 1, X1: 12}}, 0, "x1 = 12 m: need 0 <= x1 <= Lx"},
		{"negative", []Patch{{X0: -1, X1: 2}}, 0, "x0 = -1 m"},
		{"empty", []Patch{{X0: 3, X1: 3}}, 0, "x0 = x1 = 3 m: a patch needs a length"},
		{"edge without patches", nil, 0.2, "no patches"},
		{"edge too wide", []Patch{{X0: 1, X1: 2}, {X0: 4, X1: 8}}, 1.5, "more than the length 1 m of patch 1"},
		{"negative edge", []Patch{{X0: 1, X1: 2}}, -1, "patch edge width -1 m"},
	} {
		err := validatePatches(tc.patches, tc.edge, lx, 0)
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

func TestCoverageSmooth(t *testing.T) {
	const lx, w = 10.0, 0.4
	for _, tc := range []struct {
		name string
		p    Patch
	}{
		{"inside", Patch{X0: 2, X1: 5}},
		{"wrapping", Patch{X0: 9, X1: 1}},
		{"at zero", Patch{X0: 0, X1: 3}},
	} {
		c := &Canopy{Patches: []Patch{tc.p}, PatchEdge: w}
		cov := newCoverage(c.Patches, c.PatchEdge, lx)
		l := tc.p.Length(lx)
		// Derived: ∫ ½(tanh((ξ+c)/s) − tanh((ξ−c)/s)) dξ = 2c on the
		// line, so on the periodic domain ∫₀^Lx C dx = L exactly.
		if got := cov.mean(0, lx) * lx; !near(got, l, 1e-13) {
			t.Errorf("%s: ∫ C dx = %.15g, want the length %g", tc.name, got, l)
		}
		// The closed-form mean matches a fine midpoint sum of the values.
		const n = 200000
		sum := 0.0
		for i := range n {
			sum += cov.at((float64(i) + 0.5) * lx / n)
		}
		if got := sum * lx / n; !near(got, l, 1e-9) {
			t.Errorf("%s: midpoint ∫ C dx = %.12g, want %g", tc.name, got, l)
		}
		// Limits (derived): ½ at the edges when they are far apart, ~1 at
		// the centre, ~0 far away; monotone from the centre outwards.
		for _, tc2 := range []struct{ x, want, tol float64 }{
			{tc.p.X0, 0.5, 1e-6},
			{tc.p.X1, 0.5, 1e-6},
			{tc.p.X0 + l/2, 1, 1e-4},
			{tc.p.X0 + l/2 + lx/2, 0, 1e-4},
		} {
			if got := cov.at(tc2.x); math.Abs(got-tc2.want) > tc2.tol {
				t.Errorf("%s: C(%g) = %g, want %g", tc.name, tc2.x, got, tc2.want)
			}
		}
		centre := tc.p.X0 + l/2
		prev := 2.0
		for k := 0; k <= 1000; k++ {
			v := cov.at(centre + float64(k)*lx/2000)
			if v > prev+1e-15 {
				t.Fatalf("%s: C rises away from the centre at step %d", tc.name, k)
			}
			prev = v
		}
	}
}
