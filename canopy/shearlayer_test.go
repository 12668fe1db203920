package canopy

import (
	"math"
	"math/rand/v2"
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

// TestWelchFindsBuriedSine: a 0.37 Hz sine in noise twice its amplitude is
// the spectral peak (common practice, no source).
func TestWelchFindsBuriedSine(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	dt, f0 := 0.1, 0.37
	var series [][]float64
	for p := 0; p < 4; p++ {
		s := make([]float64, 4096)
		for i := range s {
			s[i] = math.Sin(2*math.Pi*f0*float64(i)*dt+float64(p)) + 2*rng.NormFloat64()
		}
		series = append(series, s)
	}
	sp, err := WelchSpectrum(series, dt, 512)
	if err != nil {
		t.Fatal(err)
	}
	df := 1 / (512 * dt)
	if got := sp.Peak(); math.Abs(got-f0) > df/2 {
		t.Errorf("peak %g Hz, want %g ± %g", got, f0, df/2)
	}
	if _, err := WelchSpectrum(series, dt, 10000); err == nil {
		t.Error("segment longer than the series accepted")
	}
}

// TestQuadrantShares: samples only in Q2 and Q4 with stresses 1:3 give
// sweep/ejection ratio 3 (definition).
func TestQuadrantShares(t *testing.T) {
	u := []float64{-1, 1, -1, 1}
	w := []float64{1, -3, 1, -3}
	// means: u 0, w −1 → fluctuations w' = 2, −2, 2, −2; products −2, −2, −2, −2
	q := QuadrantShares(u, w)
	if math.Abs(q.Q2-0.5) > 1e-15 || math.Abs(q.Q4-0.5) > 1e-15 || q.Q1 != 0 || q.Q3 != 0 {
		t.Fatalf("%+v", q)
	}
	u = []float64{-1, 2, -1} // zero-mean fluctuations: stresses −1 (Q2), −2 (Q4), 0
	w = []float64{1, -1, 0}
	q = QuadrantShares(u, w)
	if s := q.Q1 + q.Q2 + q.Q3 + q.Q4; math.Abs(s-1) > 1e-12 {
		t.Errorf("shares add to %g", s)
	}
	if r := q.SweepEjectionRatio(); math.Abs(r-2) > 1e-12 {
		t.Errorf("sweep/ejection %g, want 2", r)
	}
}

// TestCorrelationSpacing: a row of four waves per period (plus a weaker
// harmonic) has structures every quarter period (definition of the
// two-point correlation; common practice, no source).
func TestCorrelationSpacing(t *testing.T) {
	n, L := 256, 2.0
	v := make([]float64, n)
	for i := range v {
		x := L * float64(i) / float64(n)
		v[i] = math.Sin(2*math.Pi*4*x/L) + 0.3*math.Sin(2*math.Pi*12*x/L+1)
	}
	if got, want := CorrelationSpacing(v, L/float64(n)), L/4; math.Abs(got-want) > 0.01*want {
		t.Errorf("spacing %g, want %g", got, want)
	}
	if got := CorrelationSpacing(make([]float64, 8), 0.1); got != 0 {
		t.Errorf("flat row: %g", got)
	}
}
