package canopy

import (
	"math"
	"strconv"
	"strings"
	"testing"
)

// mtClose reports whether got is within a relative tolerance tol of want
// (absolute where want is 0); equal infinities are close.
func mtClose(got, want, tol float64) bool {
	if got == want {
		return true
	}
	if want == 0 {
		return math.Abs(got) <= tol
	}
	return math.Abs(got-want) <= tol*math.Abs(want)
}

// Hilpert 1933, as tabulated in Incropera & DeWitt, Fundamentals of Heat
// and Mass Transfer (table number from memory): Sh = C Re^m Sc^(1/3),
// constants copied here independently of the code under test.
var hilpertTable = []struct{ lo, hi, c, m float64 }{
	{0.4, 4, 0.989, 0.330},
	{4, 40, 0.911, 0.385},
	{40, 4000, 0.683, 0.466},
	{4000, 40000, 0.193, 0.618},
	{40000, 400000, 0.027, 0.805},
}

func hilpertFormula(i int, re, sc float64) float64 {
	r := hilpertTable[i]
	return r.c * math.Pow(re, r.m) * math.Pow(sc, 1.0/3)
}

func TestHilpert(t *testing.T) {
	// Inside each range: the published formula (Hilpert 1933, as tabulated
	// in Incropera & DeWitt; table number from memory).
	for i, r := range hilpertTable {
		for _, f := range []float64{0, 0.13, 0.5, 0.9} {
			re := r.lo + f*(r.hi-r.lo)
			for _, sc := range []float64{0.7, 1, 8, 570, 1000} {
				if got, want := Hilpert(re, sc), hilpertFormula(i, re, sc); !mtClose(got, want, 1e-13) {
					t.Errorf("Hilpert(%g, %g) = %.15g, want %.15g (range %g–%g)", re, sc, got, want, r.lo, r.hi)
				}
			}
		}
	}
	// Hand-computed values of the same formula (10^x and 2³ = 8 by hand,
	// five digits).
	for _, tc := range []struct{ re, sc, want float64 }{
		{1, 8, 0.989 * 2},                // C Re^m Sc^⅓ = 0.989 · 1 · 2
		{10, 8, 4.4213},                  // 0.911 · 10^0.385 · 2
		{100, 1, 5.8401},                 // 0.683 · 10^0.932
		{1e4, 8, 114.44},                 // 0.193 · 10^2.472 · 2
		{1e5, 1, 286.00},                 // 0.027 · 10^4.025
		{HilpertMinRe, 1, 0.73093},       // 0.989 · 0.4^0.330
		{0, 1, 0.73093},                  // held floor (see below)
		{HilpertMinRe, 8, 2 * 0.73093},   // floor scales as Sc^⅓
		{HilpertMaxRe, 1, 873.02},        // 0.027 · (4×10⁵)^0.805
		{2 * HilpertMaxRe, 1, 1525.3},    // last range continued: 873.02 · 2^0.805
		{4000, 1, 0.193 * 168.30},        // 4000^0.618 = 168.30: the upper range owns 4000
		{39.999999999, 1, 0.911 * 4.138}, // 40^0.385 = 4.138 (4 digits)
	} {
		if got := Hilpert(tc.re, tc.sc); !mtClose(got, tc.want, 2e-4) {
			t.Errorf("Hilpert(%g, %g) = %.6g, want %.6g (hand-computed)", tc.re, tc.sc, got, tc.want)
		}
	}
}

func TestHilpertBoundaries(t *testing.T) {
	// Each range owns its lower boundary (documented choice); the table
	// jumps there by the stated amount (computed from the constants of
	// Hilpert 1933, as tabulated in Incropera & DeWitt).
	const sc = 570.0
	for _, tc := range []struct {
		re   float64
		jump float64 // (above − below)/below, as stated in Hilpert's comment
	}{{4, -0.006}, {40, 0.011}, {4000, -0.003}, {40000, 0.015}} {
		i := 0
		for hilpertTable[i].hi != tc.re {
			i++
		}
		below, above := math.Nextafter(tc.re, 0), math.Nextafter(tc.re, math.Inf(1))
		if got, want := Hilpert(below, sc), hilpertFormula(i, below, sc); !mtClose(got, want, 1e-13) {
			t.Errorf("just below Re = %g: Sh = %.15g, want the lower range's %.15g", tc.re, got, want)
		}
		if got, want := Hilpert(tc.re, sc), hilpertFormula(i+1, tc.re, sc); !mtClose(got, want, 1e-13) {
			t.Errorf("at Re = %g: Sh = %.15g, want the upper range's %.15g", tc.re, got, want)
		}
		if got, want := Hilpert(above, sc), hilpertFormula(i+1, above, sc); !mtClose(got, want, 1e-13) {
			t.Errorf("just above Re = %g: Sh = %.15g, want the upper range's %.15g", tc.re, got, want)
		}
		jump := Hilpert(tc.re, sc)/Hilpert(below, sc) - 1
		if math.Abs(jump-tc.jump) > 0.0006 {
			t.Errorf("jump at Re = %g is %.4f, documented as %.3f", tc.re, jump, tc.jump)
		}
		if !HilpertInRange(below) || !HilpertInRange(tc.re) || !HilpertInRange(above) {
			t.Errorf("HilpertInRange false near the inner boundary %g", tc.re)
		}
	}
}

func TestHilpertOutOfRange(t *testing.T) {
	// Documented extrapolation (common practice, no source): below
	// Re = 0.4 Sh is held at its Re = 0.4 value; above 4×10⁵ the last
	// range continues.
	const sc = 570.0
	floor := Hilpert(0.4, sc)
	if want := hilpertFormula(0, 0.4, sc); !mtClose(floor, want, 1e-13) {
		t.Errorf("Hilpert(0.4) = %.15g, want the first range's %.15g", floor, want)
	}
	for _, re := range []float64{0, 1e-300, 1e-6, 0.1, 0.3999, math.Nextafter(0.4, 0)} {
		if got := Hilpert(re, sc); got != floor {
			t.Errorf("Hilpert(%g, %g) = %.15g, want the Re = 0.4 floor %.15g", re, sc, got, floor)
		}
		if HilpertInRange(re) {
			t.Errorf("HilpertInRange(%g) = true", re)
		}
	}
	for _, re := range []float64{4e5, math.Nextafter(4e5, math.Inf(1)), 1e6, 1e9} {
		if got, want := Hilpert(re, sc), hilpertFormula(4, re, sc); !mtClose(got, want, 1e-13) {
			t.Errorf("Hilpert(%g, %g) = %.15g, want the last range continued %.15g", re, sc, got, want)
		}
	}
	for _, tc := range []struct {
		re   float64
		want bool
	}{{0.4, true}, {4e5, true}, {1e3, true}, {math.Nextafter(4e5, math.Inf(1)), false}, {1e6, false}, {-1, false}, {math.NaN(), false}, {math.Inf(1), false}} {
		if got := HilpertInRange(tc.re); got != tc.want {
			t.Errorf("HilpertInRange(%g) = %v, want %v", tc.re, got, tc.want)
		}
	}
	if got := Hilpert(math.Inf(1), sc); !math.IsInf(got, 1) {
		t.Errorf("Hilpert(+Inf) = %g, want +Inf", got)
	}
	for _, re := range []float64{-1e-9, -3, math.NaN()} {
		if got := Hilpert(re, sc); !math.IsNaN(got) {
			t.Errorf("Hilpert(%g) = %g, want NaN", re, got)
		}
	}
}

func TestChurchillBernstein(t *testing.T) {
	// Churchill & Bernstein 1977, J. Heat Transfer 99:300, written out
	// again here.
	formula := func(re, sc float64) float64 {
		return 0.3 + 0.62*math.Pow(re, 0.5)*math.Pow(sc, 1.0/3)*
			math.Pow(1+math.Pow(0.4/sc, 2.0/3), -0.25)*math.Pow(1+math.Pow(re/282000, 5.0/8), 4.0/5)
	}
	for _, re := range []float64{0, 0.01, 1, 37, 1e3, 6071, 5e4, 282000, 1e6, 1e7} {
		for _, sc := range []float64{0.7, 1, 7, 570} {
			if got, want := ChurchillBernstein(re, sc), formula(re, sc); !mtClose(got, want, 1e-13) {
				t.Errorf("ChurchillBernstein(%g, %g) = %.15g, want %.15g", re, sc, got, want)
			}
		}
	}
	// Published check value (Churchill & Bernstein 1977, J. Heat Transfer
	// 99:300; DEVELOPERS.md, "Published check values"): 40.6371 at
	// Re = 6071, Sc (Pr) = 0.7, to 4 decimals.
	if got := ChurchillBernstein(6071, 0.7); math.Abs(got-40.6371) > 0.5e-4 {
		t.Errorf("ChurchillBernstein(6071, 0.7) = %.6f, want 40.6371", got)
	}
	// Hand-computed: Re = 100, Sc = 1: 0.3 + 0.62 · 10 · 1.54288^(−¼) ·
	// 1.00698^⅘ = 5.8940.
	if got := ChurchillBernstein(100, 1); math.Abs(got-5.8940) > 1e-4 {
		t.Errorf("ChurchillBernstein(100, 1) = %.6f, want 5.8940", got)
	}
	// Still water: the formula's own limit 0.3 (no floor needed).
	if got := ChurchillBernstein(0, 570); got != 0.3 {
		t.Errorf("ChurchillBernstein(0, 570) = %g, want 0.3", got)
	}
	if got := ChurchillBernstein(-1, 1); !math.IsNaN(got) {
		t.Errorf("ChurchillBernstein(-1, 1) = %g, want NaN", got)
	}
	for _, tc := range []struct {
		re, sc float64
		want   bool
	}{{0.2, 1, true}, {1, 0.2, true}, {1e-3, 570, true}, {0.19, 1, false}, {0, 570, false}, {1e6, 0.7, true}} {
		if got := ChurchillBernsteinInRange(tc.re, tc.sc); got != tc.want {
			t.Errorf("ChurchillBernsteinInRange(%g, %g) = %v, want %v", tc.re, tc.sc, got, tc.want)
		}
	}
}

func TestPlate(t *testing.T) {
	// Incropera & DeWitt: averaged laminar plate 0.664 Re^½ Sc^⅓ and mixed
	// (0.037 Re^0.8 − 871) Sc^⅓ above Re = 5×10⁵.
	laminar := func(re, sc float64) float64 { return 0.664 * math.Pow(re, 0.5) * math.Pow(sc, 1.0/3) }
	turbulent := func(re, sc float64) float64 { return (0.037*math.Pow(re, 0.8) - 871) * math.Pow(sc, 1.0/3) }
	for _, tc := range []struct {
		re, sc       float64
		laminarSide  bool
		handComputed float64 // 0 where not given
	}{
		{0, 570, true, 0},
		{1e4, 8, true, 132.8}, // 0.664 · 100 · 2
		{2.5e3, 1, true, 33.2},
		{4.9e5, 570, true, 0},
		{5e5, 570, true, 0},
		{math.Nextafter(5e5, math.Inf(1)), 570, false, 0},
		{1e6, 1, false, 1463.54}, // 0.037 · 10^4.8 − 871
		{1e8, 570, false, 0},
	} {
		if got, want := PlateLaminar(tc.re, tc.sc), laminar(tc.re, tc.sc); !mtClose(got, want, 1e-13) {
			t.Errorf("PlateLaminar(%g, %g) = %.15g, want %.15g", tc.re, tc.sc, got, want)
		}
		want := turbulent(tc.re, tc.sc)
		if tc.laminarSide {
			want = laminar(tc.re, tc.sc)
		}
		got := PlateMixed(tc.re, tc.sc)
		if !mtClose(got, want, 1e-13) {
			t.Errorf("PlateMixed(%g, %g) = %.15g, want %.15g (laminar branch %v)", tc.re, tc.sc, got, want, tc.laminarSide)
		}
		if tc.handComputed != 0 && !mtClose(got, tc.handComputed, 1e-5) {
			t.Errorf("PlateMixed(%g, %g) = %.6g, want %.6g (hand-computed)", tc.re, tc.sc, got, tc.handComputed)
		}
	}
	// Continuity at the switch (Incropera & DeWitt's 871 is
	// 0.037 Re_c^0.8 − 0.664 Re_c^½ at Re_c = 5×10⁵, rounded; derived).
	rc := PlateCriticalRe
	if a := 0.037*math.Pow(rc, 0.8) - 0.664*math.Sqrt(rc); math.Abs(a-871) > 0.5 {
		t.Errorf("0.037 Re_c^0.8 − 0.664 Re_c^½ = %.3f, expected 871 to rounding", a)
	}
	lo, hi := PlateMixed(rc, 1), PlateMixed(math.Nextafter(rc, math.Inf(1)), 1)
	if jump := hi/lo - 1; jump < 0 || jump > 0.0007 {
		t.Errorf("PlateMixed jumps by %.5f at Re = 5×10⁵, documented as under 0.07 %%", jump)
	}
	if got := PlateMixed(-1, 1); !math.IsNaN(got) {
		t.Errorf("PlateMixed(-1, 1) = %g, want NaN", got)
	}
	for _, tc := range []struct {
		re           float64
		laminar, all bool
	}{{0, true, true}, {4.99e5, true, true}, {5e5, false, true}, {1e8, false, true}, {1.1e8, false, false}, {-1, false, false}} {
		if got := PlateLaminarInRange(tc.re); got != tc.laminar {
			t.Errorf("PlateLaminarInRange(%g) = %v, want %v", tc.re, got, tc.laminar)
		}
		if got := PlateInRange(tc.re); got != tc.all {
			t.Errorf("PlateInRange(%g) = %v, want %v", tc.re, got, tc.all)
		}
	}
}

func TestPowerLaw(t *testing.T) {
	// k = α |u|^n (common practice, no source): hand-computed values.
	for _, tc := range []struct {
		p           PowerLaw
		speed, want float64
	}{
		{PowerLaw{2e-4, 0.5}, 0.04, 4e-5},
		{PowerLaw{2e-4, 0.5}, -0.04, 4e-5},
		{PowerLaw{2e-4, 0.5}, 0, 0},
		{PowerLaw{1e-3, 1}, 0.02, 2e-5},
		{PowerLaw{3e-5, 0}, 0, 3e-5},
		{PowerLaw{3e-5, 0}, 0.7, 3e-5},
		{PowerLaw{1e-4, 0.8}, 1e-5, 1e-8}, // (10⁻⁵)^0.8 = 10⁻⁴
	} {
		if got := tc.p.Velocity(tc.speed); !mtClose(got, tc.want, 1e-12) {
			t.Errorf("%+v.Velocity(%g) = %g, want %g", tc.p, tc.speed, got, tc.want)
		}
	}
}

func TestElementTransfer(t *testing.T) {
	const (
		nu   = 1.0034e-6 // fresh water at 20 °C, m²/s (ITTC 2011, from memory)
		diff = 1.76e-9   // O₂ in water at 20 °C, m²/s (Han & Bartels 1996, J. Phys. Chem. 100:5597)
		d    = 0.0064    // m
	)
	sc := nu / diff
	for _, tc := range []struct {
		name    string
		sh      func(re, sc float64) float64
		inRange func(re float64) bool
	}{
		{" Hilpert ", Hilpert, HilpertInRange},
		{"churchill-bernstein", ChurchillBernstein, func(re float64) bool { return re*sc >= 0.2 }},
		{"PLATE-laminar", PlateLaminar, func(re float64) bool { return re < 5e5 }},
		{"plate", PlateMixed, func(re float64) bool { return re <= 1e8 }},
	} {
		e, err := NewElementTransfer(tc.name, d, nu, diff, 0, 0)
		if err != nil {
			t.Fatalf("NewElementTransfer(%q): %v", tc.name, err)
		}
		if got, want := e.Name(), strings.ToLower(strings.TrimSpace(tc.name)); got != want {
			t.Errorf("Name() = %q, want %q", got, want)
		}
		if e.Width() != d || !mtClose(e.Schmidt(), sc, 1e-15) {
			t.Errorf("%s: Width() = %g, Schmidt() = %g, want %g, %g", tc.name, e.Width(), e.Schmidt(), d, sc)
		}
		for _, u := range []float64{0, 1e-5, 1e-3, 0.05, -0.05, 0.3, 2, 150} {
			re := math.Abs(u) * d / nu
			if got := e.Reynolds(u); !mtClose(got, re, 1e-14) {
				t.Errorf("%s: Reynolds(%g) = %g, want %g", tc.name, u, got, re)
			}
			// Sh = k d/D, so k = Sh D/d.
			if got, want := e.Velocity(u), tc.sh(re, sc)*diff/d; !mtClose(got, want, 1e-13) {
				t.Errorf("%s: Velocity(%g) = %g, want %g", tc.name, u, got, want)
			}
			if got, want := e.InRange(u), tc.inRange(re); got != want {
				t.Errorf("%s: InRange(%g) = %v, want %v (Re = %g)", tc.name, u, got, want, re)
			}
			ks := 2e-5
			if got, want := e.EffectiveVelocity(u, ks), 1/(1/e.Velocity(u)+1/ks); !mtClose(got, want, 1e-14) {
				t.Errorf("%s: EffectiveVelocity(%g, %g) = %g, want %g", tc.name, u, ks, got, want)
			}
		}
	}
	// Hand check: a 6.4 mm dowel at 5 cm/s in 20 °C water, O₂:
	// Re = 318.9, Sh = 0.683 · 318.9^0.466 · 570.1^⅓ = 0.683 · 14.679 ·
	// 8.2919 = 83.13, k = 83.13 · 1.76e-9 / 0.0064 = 2.286e-5 m/s.
	e, _ := NewElementTransfer("hilpert", d, nu, diff, 0, 0)
	if got := e.Velocity(0.05); !mtClose(got, 2.286e-5, 5e-4) {
		t.Errorf("Hilpert dowel: k_bl = %g m/s, want 2.286e-5 (hand-computed)", got)
	}

	p, err := NewElementTransfer("power-law", 0, nu, diff, 2e-4, 0.5)
	if err != nil {
		t.Fatal(err)
	}
	if got := p.Velocity(-0.09); !mtClose(got, 6e-5, 1e-12) {
		t.Errorf("power law: Velocity(-0.09) = %g, want 6e-5", got)
	}
	if !p.InRange(1e3) || p.Reynolds(1) != 0 || p.Name() != "power-law" {
		t.Errorf("power law without width: InRange %v, Reynolds %g, Name %q", p.InRange(1e3), p.Reynolds(1), p.Name())
	}
	pw, err := NewElementTransfer("power-law", d, nu, diff, 2e-4, 0.5)
	if err != nil || !mtClose(pw.Reynolds(0.05), 0.05*d/nu, 1e-14) {
		t.Errorf("power law with width: Reynolds = %g, err %v", pw.Reynolds(0.05), err)
	}

	var zero ElementTransfer
	if got := zero.Velocity(0.3); got != 0 {
		t.Errorf("zero ElementTransfer: Velocity = %g, want 0", got)
	}
}

func TestNewElementTransferErrors(t *testing.T) {
	const nu, diff, d = 1e-6, 2e-9, 0.005
	for _, tc := range []struct {
		name             string
		d, nu, diff      float64
		alpha, n         float64
		wantInMessage    []string
		reasonForFailure string
	}{
		{"stokes", d, nu, diff, 0, 0, []string{`"stokes"`, "hilpert", "churchill-bernstein", "plate-laminar", `"plate"`, "power-law"}, "unknown name"},
		{"", d, nu, diff, 0, 0, []string{"unknown"}, "empty name"},
		{"hilpert", 0, nu, diff, 0, 0, []string{"width d = 0"}, "zero width"},
		{"churchill-bernstein", -0.01, nu, diff, 0, 0, []string{"width d = -0.01"}, "negative width"},
		{"plate", math.NaN(), nu, diff, 0, 0, []string{"width d = NaN"}, "NaN width"},
		{"plate-laminar", math.Inf(1), nu, diff, 0, 0, []string{"width d = +Inf"}, "infinite width"},
		{"hilpert", d, 0, diff, 0, 0, []string{"viscosity ν = 0"}, "zero viscosity"},
		{"hilpert", d, -1e-6, diff, 0, 0, []string{"viscosity"}, "negative viscosity"},
		{"power-law", 0, nu, 0, 1e-4, 0.5, []string{"diffusivity D = 0"}, "zero diffusivity"},
		{"plate", d, nu, math.NaN(), 0, 0, []string{"diffusivity D = NaN"}, "NaN diffusivity"},
		{"power-law", 0, nu, diff, 0, 0.5, []string{"alpha = 0"}, "zero alpha"},
		{"power-law", 0, nu, diff, -1e-4, 0.5, []string{"alpha = -0.0001"}, "negative alpha"},
		{"power-law", 0, nu, diff, 1e-4, -0.5, []string{"exponent n = -0.5"}, "negative n"},
		{"power-law", 0, nu, diff, 1e-4, math.NaN(), []string{"exponent n = NaN"}, "NaN n"},
		{"power-law", -1, nu, diff, 1e-4, 0.5, []string{"width d = -1"}, "negative width for the power law"},
		{"hilpert", d, nu, diff, 1e-4, 0, []string{"power-law"}, "alpha given to a correlation"},
		{"plate", d, nu, diff, 0, 0.8, []string{"power-law"}, "n given to a correlation"},
	} {
		_, err := NewElementTransfer(tc.name, tc.d, tc.nu, tc.diff, tc.alpha, tc.n)
		if err == nil {
			t.Errorf("%s: NewElementTransfer(%q, %g, %g, %g, %g, %g): no error", tc.reasonForFailure, tc.name, tc.d, tc.nu, tc.diff, tc.alpha, tc.n)
			continue
		}
		for _, s := range tc.wantInMessage {
			if !strings.Contains(err.Error(), s) {
				t.Errorf("%s: error %q does not mention %q", tc.reasonForFailure, err, s)
			}
		}
	}
}

func TestSeriesVelocity(t *testing.T) {
	inf := math.Inf(1)
	for _, tc := range []struct {
		kbl, ks, want, tol float64
		what               string
	}{
		{3e-5, inf, 3e-5, 1e-15, "perfect sink gives k_bl"},
		{3e-5, 0, 0, 0, "no uptake gives 0"},
		{0, 1e-4, 0, 0, "stagnant boundary layer gives 0"},
		{inf, 2e-5, 2e-5, 1e-15, "no boundary-layer resistance gives k_s"},
		{inf, inf, inf, 0, "no resistance at all"},
		{0, 0, 0, 0, "both closed"},
		{2e-5, 2e-5, 1e-5, 1e-15, "equal resistances halve"},
		{1e-5, 3e-5, 7.5e-6, 1e-15, "1/(1e5 + 3.333e4)"},
		{1e-6, 1e-3, 1e-6, 1.1e-3, "k_bl ≪ k_s: boundary layer limits"},
		{1e-3, 1e-6, 1e-6, 1.1e-3, "k_s ≪ k_bl: surface limits"},
		{1e-6, 1e-3, 1 / (1e6 + 1e3), 1e-15, "exact form"},
	} {
		if got := SeriesVelocity(tc.kbl, tc.ks); !mtClose(got, tc.want, tc.tol) {
			t.Errorf("%s: SeriesVelocity(%g, %g) = %.15g, want %.15g", tc.what, tc.kbl, tc.ks, got, tc.want)
		}
		if got := SeriesVelocity(tc.ks, tc.kbl); !mtClose(got, tc.want, tc.tol) {
			t.Errorf("%s: SeriesVelocity is not symmetric: (%g, %g) gives %.15g", tc.what, tc.ks, tc.kbl, got)
		}
	}
}

func TestBoundaryLayerShare(t *testing.T) {
	inf := math.Inf(1)
	for _, tc := range []struct {
		kbl, ks, want float64
		what          string
	}{
		{3e-5, inf, 1, "perfect sink: all resistance in the boundary layer"},
		{0, 1e-4, 1, "stagnant boundary layer"},
		{inf, 2e-5, 0, "no boundary-layer resistance"},
		{3e-5, 0, 0, "surface takes nothing up"},
		{2e-5, 2e-5, 0.5, "equal resistances"},
		{1e-5, 3e-5, 0.75, "(1e5)/(1e5 + 3.333e4)"},
		{1e-6, 1e-3, 1 / 1.001, "k_bl ≪ k_s"},
	} {
		if got := BoundaryLayerShare(tc.kbl, tc.ks); !mtClose(got, tc.want, 1e-15) {
			t.Errorf("%s: BoundaryLayerShare(%g, %g) = %.15g, want %.15g", tc.what, tc.kbl, tc.ks, got, tc.want)
		}
		if tc.kbl > 0 && !math.IsInf(tc.kbl, 1) {
			if got, want := BoundaryLayerShare(tc.kbl, tc.ks), SeriesVelocity(tc.kbl, tc.ks)/tc.kbl; !mtClose(got, want, 1e-15) {
				t.Errorf("%s: share %.15g ≠ k_e/k_bl = %.15g", tc.what, got, want)
			}
		}
	}
	for _, tc := range []struct{ kbl, ks float64 }{{0, 0}, {inf, inf}} {
		if got := BoundaryLayerShare(tc.kbl, tc.ks); !math.IsNaN(got) {
			t.Errorf("BoundaryLayerShare(%g, %g) = %g, want NaN (undefined)", tc.kbl, tc.ks, got)
		}
	}
}

func TestShawHanratty(t *testing.T) {
	// Shaw & Hanratty 1977, AIChE J. 23:28: k⁺ = 0.0889 Sc^(−0.704).
	for _, sc := range []float64{1, 100, 570, 700, 1000, 5000, 37000} {
		if got, want := ShawHanratty(sc), 0.0889*math.Pow(sc, -0.704); !mtClose(got, want, 1e-14) {
			t.Errorf("ShawHanratty(%g) = %.15g, want %.15g", sc, got, want)
		}
	}
	// Hand-computed: 0.0889 · 10^(−2.112) = 6.8691e-4 at Sc = 1000.
	if got := ShawHanratty(1000); !mtClose(got, 6.8691e-4, 1e-4) {
		t.Errorf("ShawHanratty(1000) = %.6g, want 6.8691e-4", got)
	}
	if got := ShawHanratty(1); got != 0.0889 {
		t.Errorf("ShawHanratty(1) = %g, want 0.0889", got)
	}
	// k_dbl = u* k⁺ (m/s), sign of u* ignored.
	for _, tc := range []struct{ ustar, sc, want float64 }{
		{0.01, 1000, 6.8691e-6},
		{-0.01, 1000, 6.8691e-6},
		{0, 1000, 0},
		{0.004, 570, 0.004 * 0.0889 * math.Pow(570, -0.704)},
	} {
		if got := BedTransferVelocity(tc.ustar, tc.sc); !mtClose(got, tc.want, 1e-4) {
			t.Errorf("BedTransferVelocity(%g, %g) = %g, want %g", tc.ustar, tc.sc, got, tc.want)
		}
	}
	// Range 700–37 000 (Shaw & Hanratty 1977; range from memory).
	for _, tc := range []struct {
		sc   float64
		want bool
	}{{699, false}, {700, true}, {5000, true}, {37000, true}, {37001, false}, {570, false}, {math.NaN(), false}} {
		if got := ShawHanrattyInRange(tc.sc); got != tc.want {
			t.Errorf("ShawHanrattyInRange(%g) = %v, want %v", tc.sc, got, tc.want)
		}
	}
}

func TestSchmidtOxygenSeawater(t *testing.T) {
	// Keeling et al. 1998 fit, Sc = 1638 − 81.83 T + 1.483 T² − 0.008004 T³.
	fit := func(t float64) float64 { return 1638 - 81.83*t + 1.483*t*t - 0.008004*t*t*t }
	for _, temp := range []float64{0, 5, 10, 15, 20, 25, 30} {
		if got, want := SchmidtOxygenSeawater(temp), fit(temp); !mtClose(got, want, 1e-13) {
			t.Errorf("SchmidtOxygenSeawater(%g) = %.15g, want %.15g", temp, got, want)
		}
	}
	// Hand-computed at 20 °C: 1638 − 1636.6 + 593.2 − 64.032 = 530.568.
	got := SchmidtOxygenSeawater(20)
	if math.Abs(got-530.568) > 1e-9 {
		t.Errorf("SchmidtOxygenSeawater(20) = %.6f, want 530.568", got)
	}
	// Keeling et al. 1998 give 531 at 20 °C (DEVELOPERS.md, "Published
	// check values"), rounded to an integer: the fit must agree to within
	// that rounding, ±0.5.
	if math.Abs(got-531) > 0.5 {
		t.Errorf("SchmidtOxygenSeawater(20) = %.3f, more than 0.5 from the tabulated 531", got)
	}
	if SchmidtOxygenSeawater(0) != 1638 {
		t.Errorf("SchmidtOxygenSeawater(0) = %g, want 1638", SchmidtOxygenSeawater(0))
	}
	// Sc falls with warming across the fit's range (0–30 °C, from memory).
	for temp := SchmidtOxygenMinTemp; temp < SchmidtOxygenMaxTemp; temp++ {
		if SchmidtOxygenSeawater(float64(temp+1)) >= SchmidtOxygenSeawater(float64(temp)) {
			t.Errorf("Sc does not fall from %d to %d °C", temp, temp+1)
		}
	}
}

func TestOxygenDiffusivity(t *testing.T) {
	// Han & Bartels 1996, J. Phys. Chem. 100:5597: 1.76e-9 m²/s at 20 °C,
	// so Sc ≈ 570 with fresh-water ν = 1.0034e-6 m²/s (ITTC 2011, from
	// memory; DEVELOPERS.md, "Published check values").
	if OxygenDiffusivity20C != 1.76e-9 {
		t.Errorf("OxygenDiffusivity20C = %g", OxygenDiffusivity20C)
	}
	if sc := 1.0034e-6 / OxygenDiffusivity20C; math.Abs(sc-570) > 1 {
		t.Errorf("Sc = %g, want ≈ 570", sc)
	}
}

func TestMassTransferAllocates(t *testing.T) {
	e, err := NewElementTransfer("hilpert", 0.005, 1e-6, 2e-9, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	p, err := NewElementTransfer("power-law", 0, 1e-6, 2e-9, 2e-4, 0.5)
	if err != nil {
		t.Fatal(err)
	}
	var sh Sherwood = ChurchillBernstein
	sink := 0.0
	for name, f := range map[string]func(){
		"Velocity":            func() { sink += e.Velocity(0.07) },
		"EffectiveVelocity":   func() { sink += e.EffectiveVelocity(0.07, 1e-5) },
		"power-law Velocity":  func() { sink += p.Velocity(0.07) },
		"Sherwood":            func() { sink += sh(300, 500) },
		"Hilpert":             func() { sink += Hilpert(300, 500) },
		"PlateMixed":          func() { sink += PlateMixed(6e5, 500) },
		"SeriesVelocity":      func() { sink += SeriesVelocity(1e-5, 3e-5) },
		"BoundaryLayerShare":  func() { sink += BoundaryLayerShare(1e-5, 3e-5) },
		"BedTransferVelocity": func() { sink += BedTransferVelocity(0.01, 600) },
	} {
		if n := testing.AllocsPerRun(100, f); n != 0 {
			t.Errorf("%s allocates %g times per call", name, n)
		}
	}
	if math.IsNaN(sink) {
		t.Error("NaN in the allocation test")
	}
}

// TestElementTransfersList checks the one list of element transfer laws:
// every name builds, the correlations name the shape they are for, and an
// unknown name's error lists them all.
func TestElementTransfersList(t *testing.T) {
	const nu, diff, d = 1e-6, 2e-9, 0.005
	names := ElementTransfers()
	want := []string{TransferHilpert, TransferChurchillBernstein, TransferPlateLaminar, TransferPlate, TransferPowerLaw}
	if strings.Join(names, ",") != strings.Join(want, ",") {
		t.Fatalf("ElementTransfers() = %q, want %q", names, want)
	}
	shapes := map[string]Shape{TransferHilpert: Cylinder, TransferChurchillBernstein: Cylinder, TransferPlateLaminar: Blade, TransferPlate: Blade}
	for _, name := range names {
		var err error
		if name == TransferPowerLaw {
			_, err = NewElementTransfer(name, 0, nu, diff, 1e-4, 0.5)
		} else {
			_, err = NewElementTransfer(name, d, nu, diff, 0, 0)
		}
		if err != nil {
			t.Errorf("%s: %v", name, err)
		}
		shape, ok := TransferShape(name)
		if wantShape, correlation := shapes[name]; ok != correlation || ok && shape != wantShape {
			t.Errorf("TransferShape(%q) = %v, %v; want %v, %v", name, shape, ok, wantShape, correlation)
		}
	}
	if _, ok := TransferShape("levich"); ok {
		t.Error("TransferShape of an unknown law reports a shape")
	}
	_, err := NewElementTransfer("levich", d, nu, diff, 0, 0)
	for _, name := range names {
		if err == nil || !strings.Contains(err.Error(), strconv.Quote(name)) {
			t.Errorf("unknown-law error %v does not list %q", err, name)
		}
	}
}
