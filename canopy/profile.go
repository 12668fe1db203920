package canopy

import (
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/gonum/integrate/quad"
)

// Profile is the vertical frontal-area density a(z) in 1/m: frontal area of
// the elements per unit volume, inside a patch.
//
// The points (Z[j], A[j]) are joined by straight lines. A table may start
// at the bed (Z[0] = 0); one that starts above it describes a canopy whose
// lowest measured density holds to the bed: below the first point a keeps
// the value A[0] down to z = 0, so a single point (h, a0) is a uniform
// block. Above the last
// point a = 0, so the top of the canopy is a sharp edge unless the last A is
// 0 (a tapered top) or Edge smooths it.
//
// With Edge = w > 0 the top edge at h = Height() is smoothed by the step
// S(z) = ½ (1 − tanh((z − h)/(w/2))): the smoothed density is a(z)·S(z)
// below h and a(h⁻)·S(z) above it, with a(h⁻) the density just below the
// top. S − ½ is odd about h, so what the edge removes below h it puts back
// above it, and the frontal area index is kept to first order in w (derived):
// for a uniform top layer ∫₀^∞ a dz exceeds the sharp value only by the bed
// term (w/4) ln(1 + e^(−4h/w)) a(h⁻), below 5e-5 h a(h⁻) for w ≤ h/2; where
// the profile slopes at the top, with a′ the slope just below h in 1/m², the
// excess is π² w² a′/192.
//
// The zero Profile has no points and fails Validate.
type Profile struct {
	Z    []float64 // m, heights above the bed, strictly increasing, 0 <= Z[0]
	A    []float64 // 1/m, frontal-area density at Z, >= 0
	Edge float64   // m, width w of the smoothed top edge; 0 for a sharp top
}

// Block returns a uniform canopy of height h (m) and density a0 (1/m):
// a = a0 for 0 <= z <= h and 0 above, with a sharp top.
func Block(h, a0 float64) Profile {
	return Profile{Z: []float64{h}, A: []float64{a0}}
}

// Table returns the piecewise-linear profile through the points (z[j], a[j])
// (m, 1/m), copying both slices; see Profile for how it is extended below the
// first and above the last point.
func Table(z, a []float64) Profile {
	return Profile{Z: append([]float64(nil), z...), A: append([]float64(nil), a...)}
}

// Validate checks the profile for a domain of the given depth (m): at least
// one point, as many densities as heights, every z finite with
// 0 <= z <= depth and strictly increasing (z > 0 for a single point), every a finite and >= 0, and a top
// edge width 0 <= w <= h with h + w <= depth.
func (p Profile) Validate(depth float64) error {
	if !(depth > 0) || math.IsInf(depth, 0) {
		return fmt.Errorf("canopy: domain depth %g m: need a finite depth > 0", depth)
	}
	n := len(p.Z)
	switch {
	case n == 0:
		return fmt.Errorf("canopy: the profile has no points: give a block (height and density) or a table of (z [m], a [1/m]) points")
	case len(p.A) != n:
		return fmt.Errorf("canopy: the profile has %d heights and %d densities: give one a [1/m] for each z [m]", n, len(p.A))
	}
	for j := range n {
		z, a := p.Z[j], p.A[j]
		switch {
		case math.IsNaN(z) || math.IsInf(z, 0) || z < 0 || (z == 0 && n == 1):
			return fmt.Errorf("canopy: profile point %d: z = %g m: need a finite height at or above the bed, z >= 0 (a canopy of one point needs z > 0: it is a block of that height)", j+1, z)
		case z > depth:
			return fmt.Errorf("canopy: profile point %d: z = %g m is above the domain top %g m: lower the canopy or deepen the domain", j+1, z, depth)
		case j > 0 && !(z > p.Z[j-1]):
			return fmt.Errorf("canopy: profile point %d: z = %g m is not above the previous z = %g m: heights must increase strictly", j+1, z, p.Z[j-1])
		case math.IsNaN(a) || math.IsInf(a, 0) || a < 0:
			return fmt.Errorf("canopy: profile point %d (z = %g m): a = %g 1/m: need a finite density >= 0", j+1, z, a)
		}
	}
	w, h := p.Edge, p.Height()
	switch {
	case math.IsNaN(w) || math.IsInf(w, 0) || w < 0:
		return fmt.Errorf("canopy: top edge width %g m: need a finite width >= 0 (0 for a sharp top)", w)
	case w > 0 && h > 0 && w > h:
		return fmt.Errorf("canopy: top edge width %g m is more than the canopy height %g m: use a width <= h (a few grid cells is typical)", w, h)
	case w > 0 && h+w > depth:
		return fmt.Errorf("canopy: the smoothed top edge reaches z = h + w = %g m, above the domain top %g m: use a width <= %.6g m, a sharp top (width 0) for a canopy reaching the top, or a deeper domain", h+w, depth, math.Max(0, depth-h))
	}
	return nil
}

// Height returns the canopy height h in m, the top of the non-zero density
// of the sharp profile: the last z if its a is non-zero, else the first z
// after the last non-zero a (where the linear taper reaches 0). It is 0 for
// a profile without density. A smoothed top spreads about this height.
func (p Profile) Height() float64 {
	j := p.topIndex()
	if j < 0 {
		return 0
	}
	return p.Z[j]
}

// topIndex returns the index of the point at Height, or −1 when the profile
// is empty, inconsistent or has no density.
func (p Profile) topIndex() int {
	n := len(p.Z)
	if n == 0 || len(p.A) != n {
		return -1
	}
	for j := n - 1; j >= 0; j-- {
		if p.A[j] > 0 {
			if j+1 < n {
				return j + 1
			}
			return j
		}
	}
	return -1
}

// FrontalAreaIndex returns ∫₀^h a dz of the sharp profile (dimensionless):
// frontal area per unit bed area inside a patch. The smoothed top keeps it
// to first order in the edge width (see Profile).
func (p Profile) FrontalAreaIndex() float64 {
	return p.sharpIntegral(0, math.Inf(1))
}

// MeanDensity returns the height-averaged density ā = FrontalAreaIndex/h in
// 1/m, 0 for a profile without density.
func (p Profile) MeanDensity() float64 {
	h := p.Height()
	if h == 0 {
		return 0
	}
	return p.FrontalAreaIndex() / h
}

// At returns a(z) in 1/m, with the smoothed top when Edge > 0; 0 below the
// bed (z < 0).
func (p Profile) At(z float64) float64 {
	if z < 0 || p.topIndex() < 0 {
		return 0
	}
	if p.Edge == 0 {
		return p.sharpAt(z)
	}
	h := p.Height()
	if z < h {
		return p.sharpAt(z) * fall(z-h, p.Edge/2)
	}
	return p.A[p.topIndex()] * fall(z-h, p.Edge/2)
}

// sharpAt returns the unsmoothed a(z) for z >= 0.
func (p Profile) sharpAt(z float64) float64 {
	n := len(p.Z)
	switch {
	case n == 0 || len(p.A) != n || z > p.Z[n-1]:
		return 0
	case z <= p.Z[0]:
		return p.A[0]
	}
	j := sort.SearchFloat64s(p.Z, z) // Z[j−1] < z <= Z[j]
	return lerp(p.Z[j-1], p.Z[j], p.A[j-1], p.A[j], z)
}

// lerp returns the value at z of the straight line through (l, fl), (r, fr).
func lerp(l, r, fl, fr, z float64) float64 {
	return fl + (fr-fl)*(z-l)/(r-l)
}

// Integral returns ∫ a dz over [z0, z1] (z in m, result dimensionless) of
// the profile as At gives it, smoothed top included; the part below the bed
// counts 0, and z1 may be +Inf. It is exact to round-off for a sharp top
// and accurate to about 1e-14 relative with a smoothed one (Gauss–Legendre
// panels a quarter of the edge width wide across the edge).
func (p Profile) Integral(z0, z1 float64) float64 {
	if p.Edge == 0 {
		return p.sharpIntegral(z0, z1)
	}
	return p.smoothIntegral(z0, z1)
}

// sharpIntegral integrates the unsmoothed profile over [z0, z1] exactly.
func (p Profile) sharpIntegral(z0, z1 float64) float64 {
	n := len(p.Z)
	if n == 0 || len(p.A) != n {
		return 0
	}
	z0, z1 = math.Max(z0, 0), math.Min(z1, p.Z[n-1])
	if !(z1 > z0) {
		return 0
	}
	sum := linearPart(z0, z1, 0, p.Z[0], p.A[0], p.A[0])
	for j := 0; j+1 < n; j++ {
		sum += linearPart(z0, z1, p.Z[j], p.Z[j+1], p.A[j], p.A[j+1])
	}
	return sum
}

// linearPart integrates the line through (l, fl), (r, fr) over
// [l, r] ∩ [z0, z1].
func linearPart(z0, z1, l, r, fl, fr float64) float64 {
	lo, hi := math.Max(z0, l), math.Min(z1, r)
	if !(hi > lo) {
		return 0
	}
	return (hi - lo) * 0.5 * (lerp(l, r, fl, fr, lo) + lerp(l, r, fl, fr, hi))
}

// smoothIntegral integrates the profile with its smoothed top over
// [z0, z1]: exactly where the step is 1 (more than bandWidth half-widths
// below the top), by Gauss–Legendre panels across the edge.
func (p Profile) smoothIntegral(z0, z1 float64) float64 {
	top := p.topIndex()
	if top < 0 {
		return 0
	}
	h, s := p.Z[top], p.Edge/2
	z0, z1 = math.Max(z0, 0), math.Min(z1, h+bandWidth*s)
	if !(z1 > z0) {
		return 0
	}
	sum := p.smoothPiece(z0, z1, 0, p.Z[0], p.A[0], p.A[0], h, s)
	for j := 0; j < top; j++ {
		sum += p.smoothPiece(z0, z1, p.Z[j], p.Z[j+1], p.A[j], p.A[j+1], h, s)
	}
	above := h + bandWidth*s
	return sum + p.smoothPiece(z0, z1, h, above, p.A[top], p.A[top], h, s)
}

// smoothPiece integrates (line through (l, fl), (r, fr)) · S(z − h) over
// [l, r] ∩ [z0, z1].
func (p Profile) smoothPiece(z0, z1, l, r, fl, fr, h, s float64) float64 {
	lo, hi := math.Max(z0, l), math.Min(z1, r)
	if !(hi > lo) {
		return 0
	}
	sum := 0.0
	if band := h - bandWidth*s; lo < band {
		// Far below the edge the step is 1 to double precision.
		b := math.Min(hi, band)
		sum += (b - lo) * 0.5 * (lerp(l, r, fl, fr, lo) + lerp(l, r, fl, fr, b))
		lo = b
	}
	if !(hi > lo) {
		return sum
	}
	panels := math.Ceil((hi - lo) / (0.5 * s))
	m := int(panels)
	width := (hi - lo) / panels
	for k := range m {
		a := lo + float64(k)*width
		b := a + width
		if k == m-1 {
			b = hi
		}
		mid, half := 0.5*(a+b), 0.5*(b-a)
		for q, t := range gaussNodes {
			z := mid + half*t
			sum += half * gaussWeights[q] * lerp(l, r, fl, fr, z) * fall(z-h, s)
		}
	}
	return sum
}

// gaussNodes and gaussWeights are the 8-point Gauss–Legendre rule on
// [−1, 1]; on a panel a quarter of the edge width wide it integrates the
// smooth step to round-off (the poles of tanh lie π w/4 off the real axis).
var gaussNodes, gaussWeights = legendreRule(8)

func legendreRule(n int) (x, w []float64) {
	x, w = make([]float64, n), make([]float64, n)
	quad.Legendre{}.FixedLocations(x, w, -1, 1)
	return x, w
}

// maxDensity returns the largest a of the profile in 1/m (the smoothed
// profile never exceeds it).
func (p Profile) maxDensity() float64 {
	m := 0.0
	for _, a := range p.A {
		m = math.Max(m, a)
	}
	return m
}
