package canopy

import (
	"math"
	"testing"
)

// TestTanhMomentumThickness: U = Ū + ½ΔU tanh(z/δ) has θ = δ/2 (from the
// definition; Ho & Huerre 1984) and δω = 2δ.
func TestTanhMomentumThickness(t *testing.T) {
	delta, h := 0.02, 0.3
	n := 4000
	z := make([]float64, n)
	u := make([]float64, n)
	for k := range z {
		z[k] = 0.6 * (float64(k) + 0.5) / float64(n)
		u[k] = 0.1 + 0.05*math.Tanh((z[k]-h)/delta)
	}
	sl, err := MeasureShearLayer(z, u, h)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(sl.Theta/(delta/2)-1) > 2e-3 {
		t.Errorf("θ = %g, want %g", sl.Theta, delta/2)
	}
	if math.Abs(sl.VorticityThickness/(2*delta)-1) > 1e-3 {
		t.Errorf("δω = %g, want about %g", sl.VorticityThickness, 2*delta)
	}
	if !(sl.UBar > sl.U1 && sl.UBar < sl.U2) || math.Abs(sl.UTop-0.1) > 1e-6 {
		t.Errorf("velocities %+v", sl)
	}
	// Ls = U(h)/U'(h) = 0.1 / (0.05/δ)
	if want := 0.1 / (0.05 / delta); math.Abs(sl.ShearLength/want-1) > 1e-3 {
		t.Errorf("Ls = %g, want %g", sl.ShearLength, want)
	}
}

// TestPenetrationOfExponentialStress: τ = τ0 exp((z − h)/L) below h falls to
// 10 % at δe = L ln 10 (derived).
func TestPenetrationOfExponentialStress(t *testing.T) {
	h, L := 0.5, 0.04
	n := 2000
	z := make([]float64, n)
	tau := make([]float64, n)
	for k := range z {
		z[k] = float64(k) / float64(n) // h = 0.5 is a grid point
		tau[k] = -0.002 * math.Exp(-math.Abs(z[k]-h)/L)
	}
	if got, want := PenetrationDepth(z, tau, h), L*math.Log(10); math.Abs(got/want-1) > 1e-3 {
		t.Errorf("δe = %g, want %g", got, want)
	}
	// Stress that never falls below 10 % inside the canopy: δe = h.
	for k := range tau {
		tau[k] = -1
	}
	if got := PenetrationDepth(z, tau, h); got != h {
		t.Errorf("δe = %g, want h = %g", got, h)
	}
}
