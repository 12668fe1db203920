package stats

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

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

// TestWelchSegment: the largest power of two up to half of the series, at
// least MinSpectrumSamples (the project's choice, common practice, no
// source).
func TestWelchSegment(t *testing.T) {
	for _, c := range []struct{ n, want int }{
		{0, 64}, {64, 64}, {127, 64}, {128, 64}, {256, 128}, {511, 128}, {512, 256}, {5000, 2048}, {11829, 4096},
	} {
		if got := WelchSegment(c.n); got != c.want {
			t.Errorf("WelchSegment(%d) = %d, want %d", c.n, got, c.want)
		}
	}
}

// TestResolvedPeak: a peak is resolved only between the lowest positive
// and the highest (Nyquist) frequency bins (common practice, no source).
func TestResolvedPeak(t *testing.T) {
	freq := []float64{0, 0.1, 0.2, 0.3, 0.4, 0.5}
	for _, c := range []struct {
		name string
		psd  []float64
		ok   bool
		why  string
	}{
		{"inside", []float64{9, 1, 2, 5, 2, 1}, true, ""},
		{"lowest bin", []float64{0, 8, 3, 2, 1, 1}, false, "lowest resolved frequency"},
		{"nyquist", []float64{0, 1, 1, 2, 3, 4}, false, "Nyquist"},
		{"steady", []float64{0, 0, 0, 0, 0, 0}, false, "steady"},
	} {
		s := Spectrum{Freq: freq, PSD: c.psd}
		f, why := s.ResolvedPeak()
		if c.ok && (f != s.Peak() || why != "") {
			t.Errorf("%s: %g %q, want the peak %g", c.name, f, why, s.Peak())
		}
		if !c.ok && (f != 0 || !strings.Contains(why, c.why)) {
			t.Errorf("%s: %g %q, want 0 and %q", c.name, f, why, c.why)
		}
	}
}
