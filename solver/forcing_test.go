package solver

import (
	"math"
	"strings"
	"testing"
)

func TestRampAt(t *testing.T) {
	tests := []struct {
		t, ramp, want float64
	}{
		{0, 0, 1}, {5, 0, 1}, {-1, 10, 0}, {0, 10, 0}, {5, 10, 0.5}, {10, 10, 1}, {20, 10, 1},
		{2.5, 10, 0.5 * (1 - math.Sqrt2/2)},
	}
	for _, tt := range tests {
		if got := RampAt(tt.t, tt.ramp); math.Abs(got-tt.want) > 1e-15 {
			t.Errorf("RampAt(%g, %g) = %g, want %g", tt.t, tt.ramp, got, tt.want)
		}
	}
}

func TestForcingLaws(t *testing.T) {
	f := Forcing{Kind: FixedGradient, Gradient: 1e-4,
		Waves: []Oscillation{{Amplitude: 2e-3, Period: 8}, {Amplitude: 1e-3, Period: 4, Phase: math.Pi / 2}}}
	// t = 0: cos 0 = 1, cos(π/2) = 0; t = 2 s: cos(π/2) = 0, cos(3π/2) = 0;
	// t = 3 s: cos(3π/4) = −√2/2, cos(2π) = 1.
	for _, c := range []struct{ t, want float64 }{{0, 1e-4 + 2e-3}, {2, 1e-4}, {3, 1e-4 - 2e-3*math.Sqrt2/2 + 1e-3}} {
		if got := f.GradientAt(c.t); math.Abs(got-c.want) > 1e-15 {
			t.Errorf("GradientAt(%g) = %g, want %g", c.t, got, c.want)
		}
	}
	if f.Steady() || f.Period() != 8 {
		t.Errorf("Steady %v, Period %g: want false, 8", f.Steady(), f.Period())
	}
	for _, c := range []struct{ t, want float64 }{{0, 0}, {2, 0.25}, {8, 0}, {10, 0.25}, {-2, 0.75}} {
		if got := f.PhaseAt(c.t); math.Abs(got-c.want) > 1e-15 {
			t.Errorf("PhaseAt(%g) = %g, want %g", c.t, got, c.want)
		}
	}
	tide := Forcing{Kind: FixedBulk, Bulk: 0.05, Tides: []Oscillation{{Amplitude: 0.2, Period: 100}}, Ramp: 50}
	if got := tide.BulkAt(0); got != 0 {
		t.Errorf("ramped BulkAt(0) = %g, want 0", got)
	}
	if got, want := tide.BulkAt(100), 0.25; math.Abs(got-want) > 1e-15 {
		t.Errorf("BulkAt(100) = %g, want %g", got, want)
	}
	if got, want := tide.BulkAt(150), 0.05-0.2; math.Abs(got-want) > 1e-15 {
		t.Errorf("reversing BulkAt(150) = %g, want %g", got, want)
	}
	tide.OneWay = true
	if got, want := tide.BulkAt(150), 0.15; math.Abs(got-want) > 1e-15 {
		t.Errorf("one-way BulkAt(150) = %g, want %g", got, want)
	}
	if tide.Period() != 100 {
		t.Errorf("tide Period %g, want 100", tide.Period())
	}
	steady := Forcing{Kind: FixedGradient, Gradient: 3e-5}
	if !steady.Steady() || steady.Period() != 0 || steady.PhaseAt(7) != 0 || steady.GradientAt(7) != 3e-5 {
		t.Errorf("steady forcing: Steady %v Period %g PhaseAt %g GradientAt %g", steady.Steady(), steady.Period(), steady.PhaseAt(7), steady.GradientAt(7))
	}
}

func TestForcingCheck(t *testing.T) {
	tests := []struct {
		name string
		f    Forcing
		want string
	}{
		{"zero period", Forcing{Waves: []Oscillation{{Amplitude: 1, Period: 0}}}, "period 0 s"},
		{"negative period", Forcing{Kind: FixedBulk, Tides: []Oscillation{{Amplitude: 1, Period: -3}}}, "period -3 s"},
		{"NaN amplitude", Forcing{Waves: []Oscillation{{Amplitude: math.NaN(), Period: 1}}}, "amplitude NaN"},
		{"negative ramp", Forcing{Ramp: -1}, "ramp -1 s"},
		{"waves under a bulk target", Forcing{Kind: FixedBulk, Waves: []Oscillation{{Amplitude: 1, Period: 1}}}, "use FixedGradient"},
		{"tides under a gradient", Forcing{Tides: []Oscillation{{Amplitude: 1, Period: 1}}}, "use FixedBulk"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := New(Config{Nx: 8, Nz: 8, Lx: 1, H: 1, Viscosity: 1e-6, Forcing: tt.f})
			if err == nil || !strings.Contains(err.Error(), tt.want) || !strings.HasPrefix(err.Error(), "solver: ") {
				t.Errorf("error %v, want one containing %q", err, tt.want)
			}
		})
	}
}

// TestOscillatingForcingMatchesSteadyWhenFlat: a forcing whose oscillating parts have zero
// amplitude takes the unsteady path through the step, but gives
// the same Π at every stage, so the run matches the steady one bit for bit
// (common practice, no source).
func TestOscillatingForcingMatchesSteadyWhenFlat(t *testing.T) {
	base := Config{Nx: 16, Nz: 12, Lx: 1, H: 0.5, Viscosity: 1e-3,
		Bed: Wall{Kind: NoSlip}, Top: Wall{Kind: FreeSlip},
		Forcing: Forcing{Kind: FixedGradient, Gradient: 1e-3}}
	flat := base
	flat.Forcing.Waves = []Oscillation{{Amplitude: 0, Period: 3}}
	run := func(cfg Config) []float64 {
		s, err := New(cfg)
		if err != nil {
			t.Fatal(err)
		}
		defer s.Close()
		s.Perturb(1e-3, 0.25, 0.2, 3)
		for range 20 {
			if err := s.StepBy(0.01); err != nil {
				t.Fatal(err)
			}
		}
		return append([]float64(nil), s.U()...)
	}
	a, b := run(base), run(flat)
	for i := range a {
		if a[i] != b[i] {
			t.Fatalf("u[%d]: steady %v, flat oscillation %v", i, a[i], b[i])
		}
	}
}

// TestUnsteadyForcingAllocatesNothing: waves, tides and a ramp leave the
// step free of allocations.
func TestUnsteadyForcingAllocatesNothing(t *testing.T) {
	for _, f := range []Forcing{
		{Kind: FixedGradient, Gradient: 1e-4, Waves: []Oscillation{{Amplitude: 1e-3, Period: 2}}, Ramp: 1},
		{Kind: FixedBulk, Bulk: 0.01, Tides: []Oscillation{{Amplitude: 0.02, Period: 5}}, OneWay: true, Ramp: 1},
	} {
		s, err := New(Config{Nx: 16, Nz: 8, Lx: 1, H: 0.5, Viscosity: 1e-3,
			Bed: Wall{Kind: NoSlip}, Top: Wall{Kind: FreeSlip}, Forcing: f})
		if err != nil {
			t.Fatal(err)
		}
		if n := testing.AllocsPerRun(10, func() {
			if err := s.StepBy(0.01); err != nil {
				t.Fatal(err)
			}
		}); n != 0 {
			t.Errorf("%v forcing: %v allocations per step", f.Kind, n)
		}
		s.Close()
	}
}
