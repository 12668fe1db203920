package canopy

import (
	"math"
	"testing"
)

func TestWhiteCylinder(t *testing.T) {
	// White, Viscous Fluid Flow, 2nd ed. 1991, §3-9 (equation number from
	// memory; form and range 1 < Re < 2×10⁵ as quoted by secondary sources):
	// C_D = 1 + 10 Re^(−2/3).
	formula := func(re float64) float64 { return 1 + 10*math.Pow(re, -2.0/3) }
	for _, re := range []float64{1, 2.5, 8, 40, 100, 125, 1000, 3.7e3, 8000, 1e5, 2e5} {
		if got, want := WhiteCylinder(re), formula(re); !near(got, want, 1e-14) {
			t.Errorf("C_D(%g) = %.15g, want %.15g", re, got, want)
		}
	}
	// Exact values of the formula (derived).
	for _, tc := range []struct{ re, want float64 }{{1, 11}, {8, 3.5}, {125, 1.4}, {1000, 1.1}, {1e6 / 8, 1.004}} {
		if got := WhiteCylinder(tc.re); !near(got, tc.want, 1e-14) {
			t.Errorf("C_D(%g) = %.15g, want %g", tc.re, got, tc.want)
		}
	}
	// Outside the range the end values hold (documented clamp).
	low, high := formula(WhiteMinRe), formula(WhiteMaxRe)
	for _, tc := range []struct{ re, want float64 }{
		{0, low}, {0.3, low}, {-5, low}, {math.Inf(-1), low},
		{2.0000001e5, high}, {1e6, high}, {1e12, high}, {math.Inf(1), high},
	} {
		if got := WhiteCylinder(tc.re); !near(got, tc.want, 1e-14) {
			t.Errorf("C_D(%g) = %.15g, want the end value %.15g", tc.re, got, tc.want)
		}
	}
	if !math.IsNaN(WhiteCylinder(math.NaN())) {
		t.Error("C_D(NaN) is not NaN")
	}
	// Sanity against the measured drag curve of a single cylinder (values
	// from memory: ≈ 1.4 at Re = 100, ≈ 1.0 at Re = 10³, ≈ 1.15 at 10⁴;
	// the fit is within 15 %).
	for _, tc := range []struct{ re, measured float64 }{{100, 1.4}, {1000, 1.0}, {1e4, 1.15}} {
		if got := WhiteCylinder(tc.re); math.Abs(got/tc.measured-1) > 0.15 {
			t.Errorf("C_D(%g) = %g, more than 15 %% from the measured %g", tc.re, got, tc.measured)
		}
	}
}

func TestWhiteCylinderAllocates(t *testing.T) {
	var law DragLaw = WhiteCylinder
	if n := testing.AllocsPerRun(100, func() { _ = law(123) }); n != 0 {
		t.Errorf("the drag law allocates %g times per call", n)
	}
}

func TestParseDragLaw(t *testing.T) {
	law, err := ParseDragLaw(" White-Cylinder ")
	if err != nil || law(8) != WhiteCylinder(8) {
		t.Errorf("ParseDragLaw(white-cylinder) = %v, %v", law, err)
	}
	if _, err := ParseDragLaw("stokes"); err == nil {
		t.Error("ParseDragLaw(stokes): no error")
	}
}

func TestDragLength(t *testing.T) {
	// Derived: 1/(C_D ā) with ā = ∫a dz / h.
	for _, tc := range []struct {
		name string
		p    Profile
		cd   float64
		want float64
	}{
		{"block", Block(0.2, 5), 1.2, 1 / 6.0},
		{"table", Table([]float64{0.1, 0.3}, []float64{4, 8}), 1, 0.3 / (0.4 + 1.2)},
		{"no density", Block(0.2, 0), 1, math.Inf(1)},
		{"no drag", Block(0.2, 5), 0, math.Inf(1)},
	} {
		if got := tc.p.DragLength(tc.cd); !near(got, tc.want, 1e-15) && got != tc.want {
			t.Errorf("%s: drag length %g m, want %g m", tc.name, got, tc.want)
		}
	}
}
