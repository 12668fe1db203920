package canopy

import (
	"errors"
	"math"
	"sort"

	"github.com/mjibson/go-dsp/spectral"
)

// ShearLayer holds the metrics of the mean canopy shear layer, from a mean
// profile U(z) and the Reynolds stress. Lengths in m, velocities in m/s.
type ShearLayer struct {
	H    float64 // canopy height h
	UTop float64 // U(h)
	// U1 and U2 are the velocities at the lower and upper edges of the shear
	// layer, at heights Z1 and Z2: below and above h, the heights where the
	// shear |dU/dz| is smallest (the in-canopy plateau and the free stream
	// or the free surface). For a tanh profile they are its asymptotes.
	U1, U2, Z1, Z2 float64
	DeltaU, UBar   float64 // U2 − U1 and (U1 + U2)/2
	// Momentum thickness θ = ∫ [¼ − ((U − Ū)/ΔU)²] dz over the layer where
	// |U − Ū| < ΔU/2 (the mixing-layer definition of Ho & Huerre 1984,
	// Annu. Rev. Fluid Mech. 16:365; for U = Ū + ½ΔU tanh(z/δ) it is δ/2).
	Theta float64
	// Vorticity thickness δω = ΔU / max dU/dz.
	VorticityThickness float64
	// Shear length Ls = U(h)/U′(h) (Raupach, Finnigan & Brunet 1996,
	// Boundary-Layer Meteorol. 78:351).
	ShearLength float64
}

// MeasureShearLayer computes the shear-layer metrics of the profile U at
// heights z (increasing) for a canopy of height h.
func MeasureShearLayer(z, u []float64, h float64) (ShearLayer, error) {
	n := len(z)
	if n < 4 || len(u) != n {
		return ShearLayer{}, errors.New("canopy: a shear layer needs at least 4 levels of U(z)")
	}
	if !(h > z[0] && h < z[n-1]) {
		return ShearLayer{}, errors.New("canopy: the canopy top lies outside the profile")
	}
	sl := ShearLayer{H: h}
	sl.UTop = interp(z, u, h)
	// Shear at midpoints.
	zm := make([]float64, n-1)
	sh := make([]float64, n-1)
	for k := 0; k < n-1; k++ {
		zm[k] = 0.5 * (z[k] + z[k+1])
		sh[k] = (u[k+1] - u[k]) / (z[k+1] - z[k])
	}
	sl.ShearLength = sl.UTop / interp(zm, sh, h)
	// The peak of the shear near the canopy top (within half a canopy
	// height below and one above), and the calmest heights below and above.
	peak := 0.0
	for k := 0; k < n-1; k++ {
		if zm[k] >= 0.5*h && zm[k] <= 2*h && sh[k] > peak {
			peak = sh[k]
		}
	}
	if !(peak > 0) {
		return ShearLayer{}, errors.New("canopy: the mean profile has no positive shear near the canopy top")
	}
	lo, hi := -1, -1
	for k := 0; k < n-1; k++ {
		a := math.Abs(sh[k])
		if zm[k] < h && (lo < 0 || a < math.Abs(sh[lo])) {
			lo = k
		}
		if zm[k] > h && (hi < 0 || a <= math.Abs(sh[hi])) {
			hi = k
		}
	}
	if lo < 0 || hi < 0 {
		return ShearLayer{}, errors.New("canopy: the profile needs levels below and above the canopy top")
	}
	sl.Z1, sl.Z2 = zm[lo], zm[hi]
	sl.U1, sl.U2 = interp(z, u, sl.Z1), interp(z, u, sl.Z2)
	sl.DeltaU = sl.U2 - sl.U1
	sl.UBar = 0.5 * (sl.U1 + sl.U2)
	sl.VorticityThickness = sl.DeltaU / peak
	// θ by the trapezoidal rule over the whole profile, integrand clipped
	// at zero outside the layer.
	f := func(v float64) float64 {
		r := (v - sl.UBar) / sl.DeltaU
		return math.Max(0.25-r*r, 0)
	}
	for k := 0; k < n-1; k++ {
		sl.Theta += 0.5 * (f(u[k]) + f(u[k+1])) * (z[k+1] - z[k])
	}
	return sl, nil
}

// PenetrationFraction is the fraction of the Reynolds stress at the canopy
// top that marks the penetration depth (Nepf et al. 2007, Water Resour.
// Res. 43, W04422).
const PenetrationFraction = 0.1

// PenetrationDepth returns δe, the distance below the canopy top h at which
// the magnitude of the stress profile tau(z) (increasing z, e.g. −⟨u′w′⟩
// plus the subgrid part) first falls to PenetrationFraction of its value at
// h, by linear interpolation. It returns h when the stress never falls that
// far inside the canopy (the sparse-canopy limit δe ≈ h).
func PenetrationDepth(z, tau []float64, h float64) float64 {
	top := math.Abs(interp(z, tau, h))
	if top == 0 {
		return 0
	}
	target := PenetrationFraction * top
	k := sort.SearchFloat64s(z, h)
	k = min(k, len(z)-1)
	prevZ, prevT := h, top
	for k--; k >= 0; k-- {
		t := math.Abs(tau[k])
		if t <= target {
			// interpolate between (z[k], t) and (prevZ, prevT)
			s := (prevT - target) / (prevT - t)
			zc := prevZ + s*(z[k]-prevZ)
			return h - zc
		}
		prevZ, prevT = z[k], t
	}
	return h
}

// interp evaluates the piecewise-linear function through (x, y) at v,
// clamping outside.
func interp(x, y []float64, v float64) float64 {
	n := len(x)
	if v <= x[0] {
		return y[0]
	}
	if v >= x[n-1] {
		return y[n-1]
	}
	k := sort.SearchFloat64s(x, v)
	t := (v - x[k-1]) / (x[k] - x[k-1])
	return y[k-1] + t*(y[k]-y[k-1])
}

// Spectrum is a one-sided power spectral density.
type Spectrum struct {
	Freq []float64 // Hz
	PSD  []float64 // (unit of the signal)²/Hz
}

// WelchSpectrum averages the Welch power spectra (Hann window, half
// overlapping segments of segment samples) of evenly sampled series taken
// every dt seconds. Each series has its mean removed first.
func WelchSpectrum(series [][]float64, dt float64, segment int) (Spectrum, error) {
	if len(series) == 0 || !(dt > 0) {
		return Spectrum{}, errors.New("canopy: a spectrum needs at least one series and a sampling interval > 0")
	}
	segment -= segment % 2
	if segment < 8 {
		return Spectrum{}, errors.New("canopy: a Welch segment needs at least 8 samples")
	}
	var out Spectrum
	for _, s := range series {
		if len(s) < segment {
			return Spectrum{}, errors.New("canopy: a series is shorter than one Welch segment; run longer or sample more often")
		}
		mean := 0.0
		for _, v := range s {
			mean += v
		}
		mean /= float64(len(s))
		x := make([]float64, len(s))
		for i, v := range s {
			x[i] = v - mean
		}
		p, f := spectral.Pwelch(x, 1/dt, &spectral.PwelchOptions{NFFT: segment, Noverlap: segment / 2})
		if out.PSD == nil {
			out.PSD = make([]float64, len(p))
			out.Freq = f
		}
		for i := range p {
			out.PSD[i] += p[i] / float64(len(series))
		}
	}
	return out, nil
}

// Peak returns the frequency of the largest spectral density above f = 0,
// refined by a parabola through the peak bin and its neighbours.
func (s Spectrum) Peak() float64 {
	best, at := -1.0, -1
	for i := 1; i < len(s.PSD); i++ {
		if s.PSD[i] > best {
			best, at = s.PSD[i], i
		}
	}
	if at <= 0 {
		return 0
	}
	if at < len(s.PSD)-1 {
		a, b, c := s.PSD[at-1], s.PSD[at], s.PSD[at+1]
		if d := a - 2*b + c; d < 0 {
			off := 0.5 * (a - c) / d
			return s.Freq[at] + off*(s.Freq[at+1]-s.Freq[at])
		}
	}
	return s.Freq[at]
}

// Quadrants holds the shares of the Reynolds stress ⟨u′w′⟩ at a point by
// quadrant of (u′, w′): Q1 outward interaction (+,+), Q2 ejection (−,+), Q3
// inward interaction (−,−), Q4 sweep (+,−). Shares are of the total
// ⟨u′w′⟩ and add up to 1.
type Quadrants struct {
	Q1, Q2, Q3, Q4 float64
}

// SweepEjectionRatio returns S4/S2, the stress carried by sweeps over that
// carried by ejections.
func (q Quadrants) SweepEjectionRatio() float64 { return q.Q4 / q.Q2 }

// QuadrantShares splits the stress of paired fluctuation samples (means
// removed here) by quadrant (Lu & Willmarth 1973, J. Fluid Mech. 60:481,
// quadrant analysis without a hole).
func QuadrantShares(u, w []float64) Quadrants {
	n := len(u)
	if n == 0 || len(w) != n {
		return Quadrants{}
	}
	var mu, mw float64
	for i := range u {
		mu += u[i]
		mw += w[i]
	}
	mu /= float64(n)
	mw /= float64(n)
	var s [4]float64
	total := 0.0
	for i := range u {
		a, b := u[i]-mu, w[i]-mw
		p := a * b
		total += p
		switch {
		case a >= 0 && b >= 0:
			s[0] += p
		case a < 0 && b >= 0:
			s[1] += p
		case a < 0 && b < 0:
			s[2] += p
		default:
			s[3] += p
		}
	}
	if total == 0 {
		return Quadrants{}
	}
	return Quadrants{s[0] / total, s[1] / total, s[2] / total, s[3] / total}
}

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
