package stability

import (
	"errors"
	"fmt"
	"math"
)

// Wall is the boundary condition on the disturbance stream function φ at a
// wall.
type Wall int

const (
	// NoSlip is an impermeable no-slip wall: φ = φ' = 0 (u' = v' = 0).
	NoSlip Wall = iota
	// FreeSlip is an impermeable stress-free wall: φ = φ″ = 0
	// (v' = 0, ∂u'/∂y = 0).
	FreeSlip
)

// String returns "no-slip" or "free-slip".
func (w Wall) String() string {
	switch w {
	case NoSlip:
		return "no-slip"
	case FreeSlip:
		return "free-slip"
	}
	return fmt.Sprintf("Wall(%d)", int(w))
}

// Profile is a parallel base flow U(y) between walls at y = Y1 < Y2, all in
// the units in which the caller states α (1/length) and Re (velocity ×
// length / viscosity).
type Profile struct {
	// U is the base-flow velocity and D2U its second derivative d²U/dy².
	U, D2U func(y float64) float64
	// Y1 and Y2 are the bottom and top walls, Y1 < Y2.
	Y1, Y2 float64
	// Bottom and Top are the conditions at y = Y1 and y = Y2. They are
	// ignored by the inviscid (Rayleigh) problem, which needs only φ = 0.
	Bottom, Top Wall
	// Stretch is the strength b ≥ 0 of the sinh map between the Chebyshev
	// variable ξ ∈ [−1, 1] and y,
	//
	//	y = (Y1+Y2)/2 + (Y2−Y1)/2 · sinh(bξ)/sinh(b),
	//
	// which clusters the collocation points around the mid-point (Y1+Y2)/2,
	// shrinking the spacing there by the factor b/sinh(b). Zero is the plain
	// affine map; at most 50 is accepted. A mixing layer on a tall domain
	// needs it (see TanhStretch); a channel does not.
	Stretch float64
}

// Poiseuille returns plane Poiseuille flow U = 1 − y² on [−1, 1] between
// no-slip walls: lengths are scaled with the channel half-width and
// velocities with the centre-line speed, so Re = U_c h/ν.
func Poiseuille() Profile {
	return Profile{
		U:      func(y float64) float64 { return 1 - y*y },
		D2U:    func(float64) float64 { return -2 },
		Y1:     -1,
		Y2:     1,
		Bottom: NoSlip,
		Top:    NoSlip,
	}
}

// Tanh returns the hyperbolic-tangent mixing layer U = tanh(y) on
// [−zmax, zmax] between free-slip walls: lengths are scaled with the
// half-thickness δ (U = U0 tanh(y/δ) dimensionally) and velocities with U0,
// so Re = U0 δ/ν, and the vorticity thickness is 2δ.
//
// The collocation points are clustered around y = 0 with the Stretch
// returned by TanhStretch(zmax). With it, n = 80 gives the growth rate at
// α = 0.4446 to about 1e-11 for zmax up to 20, inviscid or viscous with
// Re ≥ 1000 (see the package tests).
// Walls at finite ±zmax perturb the growth rate of the free mixing layer by
// a relative amount of order exp(−2α zmax).
func Tanh(zmax float64) Profile {
	return Profile{
		U: math.Tanh,
		D2U: func(y float64) float64 {
			t := math.Tanh(y)
			return -2 * t * (1 - t*t)
		},
		Y1:      -zmax,
		Y2:      zmax,
		Bottom:  FreeSlip,
		Top:     FreeSlip,
		Stretch: TanhStretch(zmax),
	}
}

// TanhStretch returns the Stretch b that Tanh uses for a half-height zmax
// (in units of δ): the root of sinh(b)/b = zmax for zmax > 1, zero
// otherwise. It makes the mid-point slope dy/dξ = zmax·b/sinh(b) equal to 1,
// so the shear layer |y| ≲ 1 is resolved as finely as the centre of an
// unmapped grid on [−1, 1], while the points spread out towards the walls
// where the disturbance decays like exp(−α|y|).
func TanhStretch(zmax float64) float64 {
	if !(zmax > 1) || math.IsInf(zmax, 0) {
		return 0
	}
	// Newton on f(b) = log(sinh b / b) − log zmax, convex and increasing for
	// b > 0, from a start above the root.
	b := math.Log(2*zmax) + math.Log(math.Log(2*zmax)+1)
	for i := 0; i < 50; i++ {
		f := math.Log(math.Sinh(b)/b) - math.Log(zmax)
		df := 1/math.Tanh(b) - 1/b
		db := f / df
		b -= db
		if math.Abs(db) < 1e-14*b {
			break
		}
	}
	return b
}

// MinN and MaxN bound the Chebyshev degree n accepted by Solve.
const (
	MinN = 8
	MaxN = 1024
)

// check reports the first mistake in the problem data, if any.
func check(p Profile, alpha, re float64, n int) error {
	switch {
	case p.U == nil || p.D2U == nil:
		return errors.New("stability: profile needs both U and D2U")
	case math.IsNaN(p.Y1) || math.IsNaN(p.Y2) || math.IsInf(p.Y1, 0) || math.IsInf(p.Y2, 0):
		return fmt.Errorf("stability: walls must be finite, got Y1 = %g, Y2 = %g", p.Y1, p.Y2)
	case !(p.Y1 < p.Y2):
		return fmt.Errorf("stability: need Y1 < Y2, got Y1 = %g, Y2 = %g", p.Y1, p.Y2)
	case p.Bottom != NoSlip && p.Bottom != FreeSlip:
		return fmt.Errorf("stability: unknown bottom wall condition %v", p.Bottom)
	case p.Top != NoSlip && p.Top != FreeSlip:
		return fmt.Errorf("stability: unknown top wall condition %v", p.Top)
	case !(p.Stretch >= 0) || math.IsInf(p.Stretch, 0) || p.Stretch > 50:
		return fmt.Errorf("stability: Stretch must be in [0, 50], got %g", p.Stretch)
	case !(alpha > 0) || math.IsInf(alpha, 0):
		return fmt.Errorf("stability: wavenumber must be positive and finite, got %g", alpha)
	case !(re > 0):
		return fmt.Errorf("stability: Reynolds number must be positive (or +Inf), got %g", re)
	case n < MinN || n > MaxN:
		return fmt.Errorf("stability: Chebyshev degree n must be in [%d, %d], got %d", MinN, MaxN, n)
	}
	return nil
}
