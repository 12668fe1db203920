package canopy

import "math"

// The smoothed edges of the canopy (its top, the ends of patches) all use one
// smooth step, the falling logistic
//
//	S(d) = ½ (1 − tanh(d / s)),  s = w/2,
//
// with d the signed distance past the edge (m) and w the edge width (m): S
// falls from ½(1 + tanh 2) = 0.982 at d = −w to ½(1 − tanh 2) = 0.018 at
// d = +w, through ½ at the edge.
// Because S − ½ is odd in d, what S removes inside the edge it adds outside,
// so areas are kept to first order in w. Width 0 is the sharp step.

// bandWidth is how many half-widths s from the edge the step is taken as
// exactly 0 or 1: ½(1 − tanh 20) ≈ 4e-18, below double precision relative
// to 1 (derived).
const bandWidth = 20.0

// fall returns S(d) for half-width s > 0.
func fall(d, s float64) float64 {
	return 0.5 * (1 - math.Tanh(d/s))
}

// window returns the smoothed indicator of the interval [−c, c] at ξ,
//
//	P(ξ) = ½ (tanh((ξ + c)/s) − tanh((ξ − c)/s)),
//
// for half-width s > 0; its integral over the real line is exactly 2c for
// every s (derived).
func window(xi, c, s float64) float64 {
	return 0.5 * (math.Tanh((xi+c)/s) - math.Tanh((xi-c)/s))
}

// windowPrimitive returns an antiderivative of window in ξ:
//
//	F(ξ) = (s/2) (ln cosh((ξ + c)/s) − ln cosh((ξ − c)/s)),
//
// written with ln cosh y = |y| + ln(1 + e^(−2|y|)) − ln 2 so that it stays
// accurate far from the edges; for s = 0 it is the clamp of ξ to [−c, c].
// F(±∞) = ±c.
func windowPrimitive(xi, c, s float64) float64 {
	sharp := 0.5 * (math.Abs(xi+c) - math.Abs(xi-c))
	if s == 0 {
		return sharp
	}
	up := math.Log1p(math.Exp(-2 * math.Abs(xi+c) / s))
	down := math.Log1p(math.Exp(-2 * math.Abs(xi-c) / s))
	return sharp + 0.5*s*(up-down)
}
