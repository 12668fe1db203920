package stats

import "math"

// CorrelationSpacing returns the streamwise spacing (m) of the structures
// in a periodic row v sampled every dx metres: the lag of the largest
// maximum of the two-point correlation R(Δx) = ⟨v′(x) v′(x+Δx)⟩ / ⟨v′²⟩ after
// its first zero crossing, up to half the period (common practice, no
// source). It returns 0 when the row has no variation or no such maximum.
func CorrelationSpacing(v []float64, dx float64) float64 {
	return CorrelationSpacingRows(v, len(v), dx)
}

// CorrelationSpacingRows is CorrelationSpacing for a plane of rows n
// values long (a slab's level, Ny rows of Nx): the correlation along the
// rows is summed over them, each about its own mean, so the spacing is
// that of the correlation averaged across the span.
func CorrelationSpacingRows(v []float64, n int, dx float64) float64 {
	if n < 4 || len(v) < n {
		return 0
	}
	r := make([]float64, n/2+1)
	for row := 0; row+n <= len(v); row += n {
		addCorrelation(r, v[row:row+n])
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

// addCorrelation adds to r[lag] the sums Σ_i v′(i) v′(i+lag) of the
// periodic row v about its mean, for lag 0 to len(r) − 1.
func addCorrelation(r, v []float64) {
	n := len(v)
	mean := 0.0
	for _, x := range v {
		mean += x
	}
	mean /= float64(n)
	for lag := range r {
		s := 0.0
		for i := range v {
			s += (v[i] - mean) * (v[(i+lag)%n] - mean)
		}
		r[lag] += s
	}
}

// SpanCorrelationLength returns how far across the span the structures of
// a slab's level v (ny rows of nx values, row j at y = j·dy, m) stay
// coherent: the integral length
//
//	L_y = ∫₀^{y₀} R(Δy) dΔy,   R(Δy) = ⟨v′(x, y) v′(x, y+Δy)⟩ / ⟨v′²⟩,
//
// the correlation averaged over x and y about the level's mean, integrated
// by the trapezoidal rule up to its first zero crossing y₀ (found by linear
// interpolation); the integral scale of a two-point correlation (Pope 2000,
// Turbulent Flows, §6.2; from memory). When R stays positive up to half
// the span (the largest lag a periodic span resolves) the integral runs
// to there and bounded is false: the span is too narrow to measure the
// length, which is then a lower bound. It returns 0, true for a level
// without variation.
func SpanCorrelationLength(v []float64, nx, ny int, dy float64) (length float64, bounded bool) {
	if nx < 1 || ny < 2 || len(v) < nx*ny {
		return 0, true
	}
	mean := 0.0
	for _, x := range v[:nx*ny] {
		mean += x
	}
	mean /= float64(nx * ny)
	r := make([]float64, ny/2+1)
	for lag := range r {
		s := 0.0
		for j := range ny {
			a, b := v[j*nx:(j+1)*nx], v[(j+lag)%ny*nx:]
			for i, x := range a {
				s += (x - mean) * (b[i] - mean)
			}
		}
		r[lag] = s
	}
	if r[0] == 0 {
		return 0, true
	}
	for lag := 1; lag < len(r); lag++ {
		a, b := r[lag-1]/r[0], r[lag]/r[0]
		if b <= 0 {
			// The zero crossing between the two lags, by linear interpolation.
			f := a / (a - b)
			return length + 0.5*a*f*dy, true
		}
		length += 0.5 * (a + b) * dy
	}
	return length, false
}
