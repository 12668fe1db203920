package canopy

import (
	"math"
	"strings"
	"testing"
)

func TestSurfaceRatio(t *testing.T) {
	// Derived: π d/d for cylinders, 2 b/b for blades.
	for _, tc := range []struct {
		s    Shape
		want float64
	}{{Cylinder, math.Pi}, {Blade, 2}} {
		if got := tc.s.SurfaceRatio(); got != tc.want {
			t.Errorf("%v: a_s/a = %g, want %g", tc.s, got, tc.want)
		}
	}
}

func TestParseShape(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want Shape
		ok   bool
	}{{"cylinder", Cylinder, true}, {" Blade ", Blade, true}, {"CYLINDER", Cylinder, true}, {"sphere", 0, false}, {"", 0, false}} {
		got, err := ParseShape(tc.in)
		if (err == nil) != tc.ok || tc.ok && got != tc.want {
			t.Errorf("ParseShape(%q) = %v, %v", tc.in, got, err)
		}
		if tc.ok && got.String() != strings.ToLower(strings.TrimSpace(tc.in)) {
			t.Errorf("%v.String() = %q", got, got.String())
		}
	}
	if s := Shape(7).String(); s != "Shape(7)" {
		t.Errorf("unknown shape prints %q", s)
	}
}

func TestSolidFraction(t *testing.T) {
	phi := 0.06
	for _, tc := range []struct {
		name string
		c    Canopy
		want float64
	}{
		// Derived: φ = (π/4) a d.
		{"cylinder derived", Canopy{Profile: Block(0.2, 40), Elements: Elements{Shape: Cylinder, Width: 0.005}}, math.Pi / 4 * 40 * 0.005},
		{"cylinder given", Canopy{Profile: Block(0.2, 40), Elements: Elements{Shape: Cylinder, Width: 0.005, SolidFraction: &phi}}, 0.06},
		{"blade none", Canopy{Profile: Block(0.2, 40), Elements: Elements{Shape: Blade, Width: 0.01}}, 0},
		{"blade given", Canopy{Profile: Block(0.2, 40), Elements: Elements{Shape: Blade, Width: 0.01, SolidFraction: &phi}}, 0.06},
		{"no density", Canopy{Profile: Block(0.2, 0), Elements: Elements{Shape: Blade, Width: 0.01, SolidFraction: &phi}}, 0},
	} {
		if got := tc.c.SolidFraction(); !near(got, tc.want, 1e-15) {
			t.Errorf("%s: φ = %g, want %g", tc.name, got, tc.want)
		}
	}
	if got, want := CylinderSolidFraction(100, 0.01), math.Pi/4; !near(got, want, 1e-15) {
		t.Errorf("CylinderSolidFraction(100, 0.01) = %g, want π/4", got)
	}
}

func TestElementsValidate(t *testing.T) {
	one, neg, half := 1.0, -0.1, 0.5
	for _, tc := range []struct {
		name       string
		e          Elements
		mean, peak float64
		want       string
	}{
		{"ok", Elements{Shape: Cylinder, Width: 0.01}, 5, 8, ""},
		{"negative width", Elements{Shape: Cylinder, Width: -0.01}, 5, 8, "element width -0.01 m: need the cylinder diameter d > 0"},
		{"blade width", Elements{Shape: Blade, Width: math.NaN()}, 5, 8, "need the blade width b > 0"},
		{"shape", Elements{Shape: Shape(3), Width: 0.01}, 5, 8, "element shape Shape(3)"},
		{"phi one", Elements{Shape: Cylinder, Width: 0.01, SolidFraction: &one}, 5, 8, "φ = 1: need 0 <= φ < 1"},
		{"phi negative", Elements{Shape: Blade, Width: 0.01, SolidFraction: &neg}, 5, 8, "φ = -0.1"},
		// (π/4)·150·0.01 = 1.18
		{"derived too dense", Elements{Shape: Cylinder, Width: 0.01}, 100, 150, "solid volume fraction reaches 1.178"},
		// 0.5 · 12/5 = 1.2
		{"given scaled too dense", Elements{Shape: Blade, Width: 0.01, SolidFraction: &half}, 5, 12, "reaches 1.2 where a = 12 1/m"},
	} {
		err := tc.e.validate(tc.mean, tc.peak)
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
