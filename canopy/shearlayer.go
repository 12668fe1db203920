package canopy

import (
	"errors"
	"math"
	"sort"
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
