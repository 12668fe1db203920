package validation

import (
	"encoding/json"
	"flag"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"
	"time"

	"rollerbed/solver"
	"rollerbed/solver/transform"
)

var (
	full     = flag.Bool("full", false, "run the fuller (slower, finer) sizes of every validation case")
	keepFlag = flag.String("keep", "", "folder to write each case's CSV tables and checks.json into")
)

// fftwAvailable reports whether this build has the FFTW backend (it needs
// cgo).
func fftwAvailable() bool {
	p, err := transform.New(transform.FFTW, 8, 1, 1)
	if err != nil {
		return false
	}
	p.Close()
	return true
}

// TestCases runs every case at the default size (or the full size with
// -full) and fails on any failed check.
func TestCases(t *testing.T) {
	opt := Options{Full: *full, Keep: *keepFlag, Backend: transform.FFTW}
	haveFFTW := fftwAvailable()
	if !haveFFTW {
		opt.Backend = transform.Gonum
	}
	for _, c := range Cases() {
		t.Run(c.Name, func(t *testing.T) {
			t.Parallel()
			if c.Name == "backends" && !haveFFTW {
				t.Skip("FFTW backend unavailable in this build (no cgo)")
			}
			start := time.Now()
			checks, err := c.Run(opt)
			if err != nil {
				t.Fatal(err)
			}
			if len(checks) == 0 {
				t.Fatal("the case returned no checks")
			}
			for _, ch := range checks {
				if !strings.HasPrefix(ch.Name, c.Name+"/") {
					t.Errorf("check %q is not named after its case", ch.Name)
				}
				if ch.Source == "" {
					t.Errorf("check %q names no source", ch.Name)
				}
				_, known := knownDeviations[ch.Name]
				switch {
				case ch.Pass && known:
					t.Errorf("%v\n%s now passes: remove it from knownDeviations and resolve its note", ch, ch.Name)
				case ch.Pass:
					t.Log(ch)
				case known:
					t.Logf("known deviation (%s): %v", knownDeviations[ch.Name], ch)
				default:
					t.Error(ch)
				}
			}
			t.Logf("%s: %d checks in %v", c.Name, len(checks), time.Since(start).Round(time.Millisecond))
		})
	}
}

// knownDeviations are validation checks against laboratory scalings that
// the 2-D model is known to miss, with the reason. `rollerbed verify` still
// reports them as failed (and exits 1); here a failure is logged, and the
// test fails when one of them starts to pass, so the list stays honest.
var knownDeviations = map[string]string{
	// In a 2-D slice the canopy-top rollers pair without the 3-D breakdown
	// that limits them in flumes, until the depth and the domain stop them
	// (two or three rollers in 4 m): the spacing measured from the spectral
	// peak is 30–50 Ls (40 Ls at the default size, 66 Ls at the full size)
	// instead of 8.1 Ls.
	"canopy-shear-layer/roller-spacing": "2-D rollers pair until the depth and the domain stop them",
}

func TestCheckConstructors(t *testing.T) {
	nan := math.NaN()
	tests := []struct {
		name string
		c    Check
		kind string
		pass bool
	}{
		{"relative inside", Relative("a", "q", 1.0009, 1, 1e-3, "s"), KindRelative, true},
		{"relative outside", Relative("a", "q", 1.0011, 1, 1e-3, "s"), KindRelative, false},
		{"relative below", Relative("a", "q", 0.9989, 1, 1e-3, "s"), KindRelative, false},
		{"relative negative expected", Relative("a", "q", -2.001, -2, 1e-3, "s"), KindRelative, true},
		{"relative wrong sign", Relative("a", "q", 2, -2, 1e-3, "s"), KindRelative, false},
		{"relative NaN", Relative("a", "q", nan, 1, 1e-3, "s"), KindRelative, false},
		{"relative zero expected", Relative("a", "q", 1e-9, 0, 1e-3, "s"), KindRelative, false},
		{"absolute inside", Absolute("a", "q", 1.85, 2, 0.2, "s"), KindAbsolute, true},
		{"absolute outside", Absolute("a", "q", 2.25, 2, 0.2, "s"), KindAbsolute, false},
		{"absolute NaN", Absolute("a", "q", nan, 2, 0.2, "s"), KindAbsolute, false},
		{"at-most below", AtMost("a", "q", 3e-16, 1e-12, "s"), KindAtMost, true},
		{"at-most equal", AtMost("a", "q", 1e-12, 1e-12, "s"), KindAtMost, true},
		{"at-most above", AtMost("a", "q", 2e-12, 1e-12, "s"), KindAtMost, false},
		{"at-most NaN", AtMost("a", "q", nan, 1e-12, "s"), KindAtMost, false},
		{"at-most +Inf", AtMost("a", "q", math.Inf(1), 1e-12, "s"), KindAtMost, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if tt.c.Kind != tt.kind {
				t.Errorf("kind %q, want %q", tt.c.Kind, tt.kind)
			}
			if tt.c.Pass != tt.pass {
				t.Errorf("pass = %v, want %v: %v", tt.c.Pass, tt.pass, tt.c)
			}
			if tt.c.Name != "a" || tt.c.Quantity != "q" || tt.c.Source != "s" {
				t.Errorf("fields not kept: %+v", tt.c)
			}
		})
	}
}

func TestCheckJSON(t *testing.T) {
	c := Relative("case/x", "a quantity", 1.5, 1.4, 0.1, "derived")
	data, err := json.Marshal(c)
	if err != nil {
		t.Fatal(err)
	}
	var m map[string]any
	if err := json.Unmarshal(data, &m); err != nil {
		t.Fatal(err)
	}
	var keys []string
	for k := range m {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	want := []string{"expected", "kind", "measured", "name", "pass", "quantity", "source", "tolerance"}
	if !slices.Equal(keys, want) {
		t.Errorf("JSON keys %v, want %v", keys, want)
	}
	var back Check
	if err := json.Unmarshal(data, &back); err != nil {
		t.Fatal(err)
	}
	if back != c {
		t.Errorf("round trip gave %+v, want %+v", back, c)
	}
}

func TestCasesRegistry(t *testing.T) {
	a, b := Cases(), Cases()
	if len(a) == 0 {
		t.Fatal("no cases")
	}
	name := regexp.MustCompile(`^[a-z][a-z0-9]*(-[a-z0-9]+)*$`)
	seen := map[string]bool{}
	for i, c := range a {
		if c.Name != b[i].Name {
			t.Errorf("order not stable: %q then %q at %d", c.Name, b[i].Name, i)
		}
		if !name.MatchString(c.Name) {
			t.Errorf("case name %q is not lower-case words joined by hyphens", c.Name)
		}
		if seen[c.Name] {
			t.Errorf("case %q listed twice", c.Name)
		}
		seen[c.Name] = true
		if c.Summary == "" || c.run == nil {
			t.Errorf("case %q lacks a summary or a run function", c.Name)
		}
	}
	for _, want := range []string{"vortex-decay", "open-channel-startup", "closed-channel-startup", "couette",
		"stokes-second", "ts-wave", "projection", "backends", "drag-balance", "brinkman-layer", "kelvin-helmholtz",
		"canopy-shear-layer", "womersley-channel", "wave-canopy", "blade-reconfiguration"} {
		if !seen[want] {
			t.Errorf("case %q missing", want)
		}
	}
}

func TestRunUnknown(t *testing.T) {
	tests := []struct {
		name  string
		names []string
	}{
		{"alone", []string{"no-such-case"}},
		{"after a known one", []string{"projection", "no-such-case"}},
		{"a near miss", []string{"vortex"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			checks, err := Run(tt.names, Options{Backend: transform.Gonum})
			if err == nil {
				t.Fatal("no error for an unknown case")
			}
			if len(checks) != 0 {
				t.Errorf("ran %d checks before refusing", len(checks))
			}
			bad := tt.names[len(tt.names)-1]
			if !strings.Contains(err.Error(), `"`+bad+`"`) {
				t.Errorf("error %q does not name %q", err, bad)
			}
			for _, c := range Cases() {
				if !strings.Contains(err.Error(), c.Name) {
					t.Errorf("error %q does not list %q", err, c.Name)
				}
			}
		})
	}
}

// TestRunKeep runs two cheap cases into a folder and reads back what they
// wrote.
func TestRunKeep(t *testing.T) {
	dir := t.TempDir()
	names := []string{"projection", "open-channel-startup"}
	checks, err := Run(names, Options{Keep: dir, Backend: transform.Gonum})
	if err != nil {
		t.Fatal(err)
	}
	for _, n := range names {
		data, err := os.ReadFile(filepath.Join(dir, n, "checks.json"))
		if err != nil {
			t.Fatal(err)
		}
		var kept []Check
		if err := json.Unmarshal(data, &kept); err != nil {
			t.Fatal(err)
		}
		var mine []Check
		for _, c := range checks {
			if strings.HasPrefix(c.Name, n+"/") {
				mine = append(mine, c)
			}
		}
		if len(kept) == 0 || !slices.Equal(kept, mine) {
			t.Errorf("%s: checks.json holds %d checks, Run returned %d (or they differ)", n, len(kept), len(mine))
		}
	}
	csv, err := os.ReadFile(filepath.Join(dir, "open-channel-startup", "transient_nz32.csv"))
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(csv)), "\n")
	if lines[0] != "t_s,z_m,u_measured,u_exact" {
		t.Errorf("header %q", lines[0])
	}
	// Three sample times of 32 levels each.
	if len(lines) != 1+3*32 {
		t.Errorf("%d lines, want %d", len(lines), 1+3*32)
	}
	if m, _ := filepath.Glob(filepath.Join(dir, "*", "*.tmp")); len(m) > 0 {
		t.Errorf("temporary files left: %v", m)
	}
}

func TestFailed(t *testing.T) {
	checks := []Check{AtMost("a", "", 1, 2, "s"), AtMost("b", "", 3, 2, "s"), Absolute("c", "", 0, 1, 0.5, "s")}
	got := Failed(checks)
	if len(got) != 2 || got[0].Name != "b" || got[1].Name != "c" {
		t.Errorf("Failed gave %v", got)
	}
}

func TestOrderAndSlope(t *testing.T) {
	tests := []struct {
		name      string
		got, want float64
		tolerance float64
	}{
		{"order 2", order(4e-3, 1e-3, 2), 2, 1e-14},
		{"order 1 at ratio 3", order(3e-3, 1e-3, 3), 1, 1e-14},
		{"slope of a line", slope([]float64{0, 1, 2, 3, 4}, []float64{1, 3.5, 6, 8.5, 11}, 0, 4), 2.5, 1e-14},
		{"slope over a window", slope([]float64{0, 1, 2, 3, 4}, []float64{9, 9, 2, 3, 4}, 2, 4), 1, 1e-14},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if math.Abs(tt.got-tt.want) > tt.tolerance {
				t.Errorf("got %v, want %v", tt.got, tt.want)
			}
		})
	}
}

// TestModeErrorBound checks the discrete decay rate the bound is built on:
// sin(λ z) sampled at cell centres is an eigenvector of the three-point
// second difference with eigenvalue −λ²(1 − ε), ε = 1 − sinc²(λΔz/2)
// (derived).
func TestModeErrorBound(t *testing.T) {
	tests := []struct {
		lambda, dz float64
	}{{math.Pi, 1.0 / 32}, {3 * math.Pi, 1.0 / 16}, {math.Pi / 2, 0.1}}
	for _, tt := range tests {
		h := tt.lambda * tt.dz / 2
		eps := 1 - math.Pow(math.Sin(h)/h, 2)
		z := 0.3
		f := func(z float64) float64 { return math.Sin(tt.lambda * z) }
		d2 := (f(z+tt.dz) - 2*f(z) + f(z-tt.dz)) / (tt.dz * tt.dz)
		if want := -tt.lambda * tt.lambda * (1 - eps) * f(z); math.Abs(d2-want) > 1e-9*math.Abs(want) {
			t.Errorf("λ = %g, Δz = %g: second difference %g, eigenvalue form %g", tt.lambda, tt.dz, d2, want)
		}
		// One mode of unit amplitude: the bound is the amplitude error.
		nu, tm := 1.0, 0.7/(tt.lambda*tt.lambda)
		got := modeErrorBound(func(n int) float64 {
			if n == 1 {
				return 1
			}
			return 0
		}, func(n int) float64 { return float64(n) * tt.lambda }, nu, tm, tt.dz)
		x := nu * tt.lambda * tt.lambda * tm
		if want := math.Exp(-x*(1-eps)) - math.Exp(-x); math.Abs(got-want) > 1e-12*want {
			t.Errorf("λ = %g, Δz = %g: bound %g, want %g", tt.lambda, tt.dz, got, want)
		}
	}
}

// TestStokesErrorBound: on a uniform grid the estimate peaks at
// (√2/(12e)) (ηΔz)² (derived).
func TestStokesErrorBound(t *testing.T) {
	for _, nz := range []int{256, 1024} {
		h := stokesDepth / stokesEta
		g, err := solver.NewGrid(8, nz, h, h, solver.Cluster{})
		if err != nil {
			t.Fatal(err)
		}
		d := g.Dz[0] * stokesEta
		want := math.Sqrt2 / (12 * math.E) * d * d
		if got := stokesErrorBound(g); math.Abs(got/want-1) > 1e-3 {
			t.Errorf("Nz = %d: estimate %g, want %g", nz, got, want)
		}
	}
}

// TestExactSolutions checks the reference solutions themselves: each must
// satisfy its equation u_t = ν u_zz + Π and its wall conditions, measured
// by central differences (derived).
func TestExactSolutions(t *testing.T) {
	open := channel{top: solver.FreeSlip, span: 2 * startupH}
	closed := channel{top: solver.NoSlip, span: startupH}
	tests := []struct {
		name   string
		u      func(z, t float64) float64
		nu, pi float64
		h, tau float64
		scale  float64
		bed    func(t float64) float64 // bed speed
		top    func(u func(z, t float64) float64, t float64) float64
	}{
		{"open channel", open.exact, startupNu, startupPi, startupH, startupTau, open.peak(),
			func(float64) float64 { return 0 },
			func(u func(z, t float64) float64, t float64) float64 { // ∂u/∂z at the top, times H
				d := 1e-4 * startupH
				return (u(startupH+d, t) - u(startupH-d, t)) / (2 * d) * startupH
			}},
		{"closed channel", closed.exact, startupNu, startupPi, startupH, startupTau, closed.peak(),
			func(float64) float64 { return 0 },
			func(u func(z, t float64) float64, t float64) float64 { return u(startupH, t) }},
		{"couette", couetteExact, couetteNu, 0, couetteH, couetteTau, couetteU,
			func(float64) float64 { return 0 },
			func(u func(z, t float64) float64, t float64) float64 { return u(couetteH, t) - couetteU }},
		{"stokes second", stokesExact, stokesNu, 0, stokesDepth / stokesEta, stokesPeriod, stokesU,
			func(t float64) float64 { return stokesU * math.Cos(stokesOmega*t) },
			nil},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			for _, tf := range []float64{0.03, 0.1, 0.4} {
				tm := tf * tt.tau
				for _, zf := range []float64{0.1, 0.37, 0.8} {
					z := zf * tt.h
					dz, dt := 1e-3*tt.h, 1e-4*tt.tau
					ut := (tt.u(z, tm+dt) - tt.u(z, tm-dt)) / (2 * dt)
					uzz := (tt.u(z+dz, tm) - 2*tt.u(z, tm) + tt.u(z-dz, tm)) / (dz * dz)
					res := (ut - tt.nu*uzz - tt.pi) * tt.tau / tt.scale
					if math.Abs(res) > 1e-4 {
						t.Errorf("t = %g τ, z = %g H: residual of u_t − νu_zz − Π is %.3g of u_scale/τ", tf, zf, res)
					}
				}
				if b := tt.u(0, tm) - tt.bed(tm); math.Abs(b) > 1e-12*tt.scale {
					t.Errorf("t = %g τ: bed condition off by %g", tf, b)
				}
				if tt.top != nil {
					if b := tt.top(tt.u, tm); math.Abs(b) > 1e-6*tt.scale {
						t.Errorf("t = %g τ: top condition off by %g", tf, b)
					}
				}
			}
			// Started from rest: the series sums to the initial state at a
			// small time (the Stokes case starts from its own profile).
			if tt.top != nil {
				if u := tt.u(0.5*tt.h, 1e-6*tt.tau); math.Abs(u) > 1e-3*tt.scale {
					t.Errorf("u(H/2, 0+) = %g, want about 0", u)
				}
			}
		})
	}
}
