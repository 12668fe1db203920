package stats

import (
	"math"
	"testing"
)

// TestEvenSeries: a linear signal sampled at uneven times resamples to
// the same line at even times from the first sample after the start
// (linear interpolation is exact for a line: derived), and a span of fewer
// than 8 samples gives none.
func TestEvenSeries(t *testing.T) {
	T := []float64{0, 0.5, 1.1, 1.4, 2.2, 2.9, 3.1, 3.8, 4.6, 5.0, 5.9, 6.3}
	line := make([]float64, len(T))
	for i, tt := range T {
		line[i] = 2 - 0.5*tt
	}
	even, dt := EvenSeries(T, [][]float64{line}, 1)
	if even == nil {
		t.Fatal("no series")
	}
	n := len(T) - 2 // from T = 1.1
	if len(even[0]) != n || math.Abs(dt-(6.3-1.1)/float64(n-1)) > 1e-15 {
		t.Fatalf("%d samples dt %g", len(even[0]), dt)
	}
	for i, v := range even[0] {
		if want := 2 - 0.5*(1.1+float64(i)*dt); math.Abs(v-want) > 1e-12 {
			t.Errorf("sample %d: %g, want %g", i, v, want)
		}
	}
	if even, _ := EvenSeries(T, [][]float64{line}, 4); even != nil {
		t.Error("a span of 4 samples resampled")
	}
	p := &Probes{T: T, U: [][]float64{line}, W: [][]float64{line}}
	u, w, pdt := p.Even(1)
	if len(u) != 1 || len(w) != 1 || pdt != dt || u[0][3] != even[0][3] || w[0][5] != even[0][5] {
		t.Errorf("Probes.Even differs from EvenSeries")
	}
}
