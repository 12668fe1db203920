package canopy

import (
	"fmt"
	"math"
	"strings"
)

// DragLaw is a drag coefficient C_D (dimensionless) as a function of the
// element Reynolds number Re_d = |u| d/ν, with |u| the local speed (m/s), d
// the element width (m) and ν the kinematic viscosity (m²/s). It is the
// form the solver calls (solver.Drag.Law) at every canopy cell and stage, so
// it must be cheap, must not allocate, and must return a finite value for
// every Re >= 0 (Re = 0 in still water included).
type DragLaw func(re float64) float64

// The range of WhiteCylinder; outside it the coefficient is held at its
// value at the nearer end.
const (
	WhiteMinRe = 1.0 // dimensionless, lower end of the fit
	WhiteMaxRe = 2e5 // dimensionless, upper end: the drag crisis follows
)

// WhiteCylinder is the curve fit for a single smooth circular cylinder in
// steady cross-flow
//
//	C_D ≈ 1 + 10 Re_d^(−2/3),  1 < Re_d < 2×10⁵,
//
// from White, Viscous Fluid Flow (McGraw-Hill, 2nd ed. 1991, §3-9; the
// equation number, 3-225 in that edition, is from memory; the form and
// range as quoted from it by several secondary sources). It gives 11 at
// Re = 1, 1.46 at 100, 1.1 at 1000 and 1.003 at 2×10⁵; the measured drag
// curve sits near 1.2 from 10⁴ to 10⁵ (from memory), so the fit is some
// 15 % low there.
//
// Outside the range the coefficient is clamped to the end values:
// C_D(Re < 1) = 11, so at very low speed the drag stays quadratic in |u|
// and underestimates the viscous (Stokes–Oseen) drag, which grows as 1/Re;
// C_D(Re > 2×10⁵) = 1 + 10 (2×10⁵)^(−2/3) ≈ 1.0029, which ignores the drop
// of the drag crisis. A NaN Re gives NaN.
//
// The law is for isolated cylinders; in dense arrays the drag of each
// element differs (sheltering, blockage). It applies to blades only as a
// rough guide; give blades a fixed C_D.
func WhiteCylinder(re float64) float64 {
	switch {
	case re < WhiteMinRe:
		re = WhiteMinRe
	case re > WhiteMaxRe:
		re = WhiteMaxRe
	}
	c := math.Cbrt(re)
	return 1 + 10/(c*c)
}

// ParseDragLaw returns the drag law named name (case and surrounding space
// ignored): "white-cylinder" for WhiteCylinder.
func ParseDragLaw(name string) (DragLaw, error) {
	switch strings.ToLower(strings.TrimSpace(name)) {
	case "white-cylinder":
		return WhiteCylinder, nil
	}
	return nil, fmt.Errorf("canopy: drag law %q: need \"white-cylinder\", or give a fixed drag coefficient instead", name)
}

// DragLength returns the canopy drag length scale 1/(C_D ā) in m, with ā
// the height-averaged density FrontalAreaIndex/h (1/m) and cd the drag
// coefficient; +Inf for a profile without density or for cd <= 0.
func (p Profile) DragLength(cd float64) float64 {
	a := p.MeanDensity()
	if !(cd > 0) || a == 0 {
		return math.Inf(1)
	}
	return 1 / (cd * a)
}
