package canopy

import (
	"math"
	"strings"
	"testing"
)

// near reports whether got is within tol of want, relative to max(1, |want|).
func near(got, want, tol float64) bool {
	return math.Abs(got-want) <= tol*math.Max(1, math.Abs(want))
}

func TestBlockIntegrals(t *testing.T) {
	// All values derived: a = a0 on [0, h], 0 above.
	for _, tc := range []struct{ h, a0 float64 }{
		{0.2, 10}, {1.5, 0.8}, {0.013, 250}, {3, 0},
	} {
		p := Block(tc.h, tc.a0)
		wantH := tc.h
		if tc.a0 == 0 {
			wantH = 0
		}
		if got := p.Height(); got != wantH {
			t.Errorf("Block(%g, %g).Height() = %g, want %g", tc.h, tc.a0, got, wantH)
		}
		if got, want := p.FrontalAreaIndex(), tc.a0*tc.h; !near(got, want, 1e-15) {
			t.Errorf("Block(%g, %g) frontal area index = %g, want %g", tc.h, tc.a0, got, want)
		}
		if tc.a0 > 0 && !near(p.MeanDensity(), tc.a0, 1e-15) {
			t.Errorf("Block(%g, %g) mean density = %g, want a0", tc.h, tc.a0, p.MeanDensity())
		}
		for _, z := range []float64{0.25 * tc.h, 0.5 * tc.h, tc.h, 2 * tc.h} {
			want := tc.a0 * math.Min(z, tc.h)
			if got := p.Integral(0, z); !near(got, want, 1e-15) {
				t.Errorf("Block(%g, %g) ∫ from 0 to %g = %g, want %g", tc.h, tc.a0, z, got, want)
			}
		}
		if got := p.At(0.5 * tc.h); got != tc.a0 {
			t.Errorf("Block(%g, %g).At(h/2) = %g", tc.h, tc.a0, got)
		}
		if got := p.At(1.001 * tc.h); got != 0 {
			t.Errorf("Block(%g, %g).At(1.001 h) = %g, want 0 above the top", tc.h, tc.a0, got)
		}
	}
}

func TestTableInterpolation(t *testing.T) {
	// Derived: linear between points, the first value down to the bed, 0
	// above the last point.
	p := Table([]float64{0.1, 0.3, 0.5}, []float64{4, 8, 2})
	for _, tc := range []struct{ z, want float64 }{
		{0, 4}, {0.05, 4}, {0.1, 4}, {0.2, 6}, {0.3, 8}, {0.4, 5}, {0.5, 2}, {0.5001, 0}, {-0.1, 0},
	} {
		if got := p.At(tc.z); !near(got, tc.want, 1e-14) {
			t.Errorf("At(%g) = %g, want %g", tc.z, got, tc.want)
		}
	}
	// 0.1·4 + 0.2·(4+8)/2 + 0.2·(8+2)/2
	if got := p.FrontalAreaIndex(); !near(got, 2.6, 1e-15) {
		t.Errorf("frontal area index = %g, want 2.6", got)
	}
	if got := p.Integral(0.2, 0.4); !near(got, 0.1*(6+8)/2+0.1*(8+5)/2, 1e-15) {
		t.Errorf("∫ from 0.2 to 0.4 = %g, want 1.35", got)
	}
	if got := p.Height(); got != 0.5 {
		t.Errorf("Height = %g, want 0.5 (last point non-zero)", got)
	}

	// A tapered top: the height is where the taper reaches 0.
	taper := Table([]float64{0.1, 0.2, 0.3}, []float64{5, 0, 0})
	if got := taper.Height(); got != 0.2 {
		t.Errorf("tapered Height = %g, want 0.2", got)
	}
	if got := taper.FrontalAreaIndex(); !near(got, 0.5+0.25, 1e-15) {
		t.Errorf("tapered frontal area index = %g, want 0.75", got)
	}

	// Table copies its arguments.
	z, a := []float64{0.2}, []float64{3}
	q := Table(z, a)
	z[0], a[0] = 9, 9
	if q.Z[0] != 0.2 || q.A[0] != 3 {
		t.Errorf("Table kept a reference to its arguments: %v %v", q.Z, q.A)
	}
}

func TestProfileValidate(t *testing.T) {
	for _, tc := range []struct {
		name  string
		p     Profile
		depth float64
		want  string // "" for valid; else a fragment of the message
	}{
		{"block", Block(0.3, 5), 1, ""},
		{"emergent", Block(1, 5), 1, ""},
		{"no density", Block(0.3, 0), 1, ""},
		{"smooth", Profile{Z: []float64{0.3}, A: []float64{5}, Edge: 0.05}, 1, ""},
		{"empty", Profile{}, 1, "no points"},
		{"lengths", Profile{Z: []float64{0.1, 0.2}, A: []float64{1}}, 1, "2 heights and 1 densities"},
		{"at bed", Block(0, 5), 1, "a canopy of one point needs z > 0"},
		{"table from the bed", Table([]float64{0, 0.2, 0.25}, []float64{4, 4, 0}), 1, ""},
		{"below the bed", Table([]float64{-0.01, 0.2}, []float64{4, 4}), 1, "z = -0.01 m: need a finite height at or above the bed"},
		{"negative z", Table([]float64{-0.1, 0.2}, []float64{1, 1}), 1, "z = -0.1 m"},
		{"too tall", Block(1.2, 5), 1, "z = 1.2 m is above the domain top 1 m"},
		{"order", Table([]float64{0.1, 0.3, 0.2}, []float64{1, 1, 1}), 1, "point 3: z = 0.2 m is not above the previous z = 0.3 m"},
		{"repeat", Table([]float64{0.1, 0.1}, []float64{1, 1}), 1, "increase strictly"},
		{"negative a", Table([]float64{0.1, 0.2}, []float64{1, -2}), 1, "a = -2 1/m: need a finite density >= 0"},
		{"nan a", Block(0.2, math.NaN()), 1, "a = NaN"},
		{"inf z", Block(math.Inf(1), 1), 1, "z = +Inf"},
		{"bad depth", Block(0.2, 1), 0, "depth 0 m"},
		{"negative edge", Profile{Z: []float64{0.3}, A: []float64{5}, Edge: -0.1}, 1, "top edge width -0.1 m"},
		{"wide edge", Profile{Z: []float64{0.3}, A: []float64{5}, Edge: 0.4}, 1, "more than the canopy height 0.3 m"},
		{"edge above top", Profile{Z: []float64{0.9}, A: []float64{5}, Edge: 0.2}, 1, "reaches z = h + w = 1.1 m, above the domain top 1 m: use a width <= 0.1 m"},
	} {
		err := tc.p.Validate(tc.depth)
		switch {
		case tc.want == "" && err != nil:
			t.Errorf("%s: unexpected error %v", tc.name, err)
		case tc.want != "" && err == nil:
			t.Errorf("%s: no error, want one containing %q", tc.name, tc.want)
		case tc.want != "" && !strings.Contains(err.Error(), tc.want):
			t.Errorf("%s: error %q does not contain %q", tc.name, err, tc.want)
		}
	}
}

// lncosh is ln cosh y, stable for large |y|.
func lncosh(y float64) float64 {
	y = math.Abs(y)
	return y + math.Log1p(math.Exp(-2*y)) - math.Ln2
}

func TestSmoothTop(t *testing.T) {
	const h, a0, w = 0.4, 10.0, 0.04
	p := Profile{Z: []float64{h}, A: []float64{a0}, Edge: w}
	s := w / 2

	t.Run("monotone", func(t *testing.T) {
		// Derived: the step is monotone, so a smoothed block is too.
		prev := math.Inf(1)
		for k := 0; k <= 4000; k++ {
			z := float64(k) * 2 * h / 4000
			a := p.At(z)
			if a > prev {
				t.Fatalf("a rises from %g to %g at z = %g m", prev, a, z)
			}
			prev = a
		}
	})

	t.Run("limits", func(t *testing.T) {
		// Derived: S → 1 far below, ½ at, → 0 far above the top.
		for _, tc := range []struct{ z, want, tol float64 }{
			{h - 8*w, a0, 1e-13},
			{h, a0 / 2, 1e-15},
			{h + 20*w, 0, 1e-14},
			{h - w, a0 * 0.5 * (1 + math.Tanh(2)), 1e-14},
			{h + w, a0 * 0.5 * (1 - math.Tanh(2)), 1e-14},
		} {
			if got := p.At(tc.z); !near(got, tc.want, tc.tol) {
				t.Errorf("At(%g) = %.15g, want %.15g", tc.z, got, tc.want)
			}
		}
		// The width-0 limit: a very narrow edge is the sharp block away
		// from h.
		narrow := Profile{Z: []float64{h}, A: []float64{a0}, Edge: 1e-7}
		for _, z := range []float64{h - 1e-4, h + 1e-4, 0.1} {
			if got, want := narrow.At(z), Block(h, a0).At(z); !near(got, want, 1e-14) {
				t.Errorf("narrow edge At(%g) = %g, sharp %g", z, got, want)
			}
		}
	})

	t.Run("area", func(t *testing.T) {
		// Derived: ∫₀^∞ a0 S dz = a0 (h + (w/4) ln(1 + e^(−4h/w))).
		want := a0 * (h + w/4*math.Log1p(math.Exp(-4*h/w)))
		if got := p.Integral(0, math.Inf(1)); !near(got, want, 1e-13) {
			t.Errorf("∫ a dz = %.15g, want %.15g", got, want)
		}
		if got := p.FrontalAreaIndex(); !near(got, a0*h, 1e-15) {
			t.Errorf("frontal area index = %g, want the sharp a0 h = %g", got, a0*h)
		}
		// Derived: the antiderivative of a0 S is a0 (z/2 − (s/2) ln cosh((z−h)/s)).
		prim := func(z float64) float64 { return a0 * (z/2 - s/2*lncosh((z-h)/s)) }
		for _, r := range [][2]float64{{0.35, 0.41}, {h, h + 0.013}, {0.39, 0.395}, {0, 0.5}} {
			want := prim(r[1]) - prim(r[0])
			if r[0] == 0 {
				want = prim(r[1]) - prim(0)
			}
			if got := p.Integral(r[0], r[1]); !near(got, want, 2e-14) {
				t.Errorf("∫ from %g to %g = %.16g, want %.16g", r[0], r[1], got, want)
			}
		}
		// Additivity of the quadrature.
		for _, z := range []float64{0.2, 0.39, 0.4, 0.4123, 0.7} {
			sum := p.Integral(0, z) + p.Integral(z, math.Inf(1))
			if !near(sum, p.Integral(0, math.Inf(1)), 1e-14) {
				t.Errorf("∫₀^z + ∫_z^∞ = %.16g at z = %g", sum, z)
			}
		}
	})

	t.Run("sloped top", func(t *testing.T) {
		// Derived: with slope a′ just below the top the smoothed area
		// exceeds the sharp one by π² w² a′/192 (second order in w).
		q := Profile{Z: []float64{0.1, 0.5}, A: []float64{2, 10}}
		slope := (10.0 - 2) / 0.4
		for _, w := range []float64{0.05, 0.025} {
			q.Edge = w
			got := q.Integral(0, math.Inf(1)) - q.FrontalAreaIndex()
			want := math.Pi * math.Pi * w * w * slope / 192
			if !near(got, want, 1e-12) {
				t.Errorf("w = %g: area excess %.12g, want %.12g", w, got, want)
			}
		}
	})

	t.Run("tapered top", func(t *testing.T) {
		// A top that already tapers to 0 gets nothing above h.
		q := Profile{Z: []float64{0.1, 0.2}, A: []float64{5, 0}, Edge: 0.02}
		if got := q.At(0.21); got != 0 {
			t.Errorf("tapered smoothed At(0.21) = %g, want 0", got)
		}
	})
}
