package stats

import (
	"math"
	"testing"
)

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
