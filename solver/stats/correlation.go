package stats

import "math"

// CorrelationSpacing returns the streamwise spacing (m) of the structures
// in a periodic row v sampled every dx metres: the lag of the largest
// maximum of the two-point correlation R(Δx) = ⟨v′(x) v′(x+Δx)⟩ / ⟨v′²⟩ after
// its first zero crossing, up to half the period (common practice, no
// source). It returns 0 when the row has no variation or no such maximum.
func CorrelationSpacing(v []float64, dx float64) float64 {
	n := len(v)
	if n < 4 {
		return 0
	}
	mean := 0.0
	for _, x := range v {
		mean += x
	}
	mean /= float64(n)
	r := make([]float64, n/2+1)
	for lag := range r {
		s := 0.0
		for i := range v {
			s += (v[i] - mean) * (v[(i+lag)%n] - mean)
		}
		r[lag] = s
	}
	if r[0] == 0 {
		return 0
	}
	lag := 1
	for lag < len(r) && r[lag] > 0 {
		lag++
	}
	best, at := math.Inf(-1), 0
	for ; lag < len(r)-1; lag++ {
		if r[lag] >= r[lag-1] && r[lag] >= r[lag+1] && r[lag] > best {
			best, at = r[lag], lag
		}
	}
	if at == 0 {
		return 0
	}
	// Refine with a parabola through the peak and its neighbours.
	a, b, c := r[at-1], r[at], r[at+1]
	off := 0.0
	if d := a - 2*b + c; d < 0 {
		off = 0.5 * (a - c) / d
	}
	return (float64(at) + off) * dx
}
