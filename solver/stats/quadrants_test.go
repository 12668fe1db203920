package stats

import (
	"math"
	"testing"
)

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
