package canopy

import (
	"fmt"
	"math"
	"strings"
)

// Shape is the cross-section of the canopy elements.
type Shape int

const (
	// Cylinder: rigid round stems or dowels of diameter d, axis vertical.
	Cylinder Shape = iota
	// Blade: flat blades of width b facing the flow (seagrass, kelp-like
	// fronds), thickness negligible next to b.
	Blade
)

// String returns "cylinder" or "blade".
func (s Shape) String() string {
	switch s {
	case Cylinder:
		return "cylinder"
	case Blade:
		return "blade"
	}
	return fmt.Sprintf("Shape(%d)", int(s))
}

// ParseShape returns the shape named name, "cylinder" or "blade" (case and
// surrounding space ignored).
func ParseShape(name string) (Shape, error) {
	switch strings.ToLower(strings.TrimSpace(name)) {
	case "cylinder":
		return Cylinder, nil
	case "blade":
		return Blade, nil
	}
	return 0, fmt.Errorf("canopy: element shape %q: need \"cylinder\" or \"blade\"", name)
}

// SurfaceRatio returns a_s/a, the element surface area per unit frontal
// area (dimensionless), so that the surface area per unit volume is
// a_s = SurfaceRatio · a in 1/m (derived): a cylinder of diameter
// d presents frontal area d per unit length and has surface π d per unit
// length, so a_s/a = π d/d = π; a flat blade of width b facing the flow
// presents frontal area b and has two faces, surface 2 b (edges neglected),
// so a_s/a = 2.
func (s Shape) SurfaceRatio() float64 {
	if s == Blade {
		return 2
	}
	return math.Pi
}

// widthName names what Elements.Width means for the shape.
func (s Shape) widthName() string {
	if s == Blade {
		return "blade width b"
	}
	return "cylinder diameter d"
}

// Elements describes the canopy elements.
//
// The solid volume fraction φ is the volume the elements occupy per unit
// volume. For elements of fixed cross-section it is proportional to a: a
// cylinder has cross-section π d²/4 per unit length and frontal area d, so
// φ = (π/4) a d (derived; see CylinderSolidFraction). A given SolidFraction
// is read as φ at the canopy-mean density ā = FrontalAreaIndex/h and scaled
// the same way, φ(x, z) = φ · a(x, z)/ā, so it vanishes with a at the
// smoothed edges. When SolidFraction is nil, φ is derived for cylinders and
// taken as 0 for blades (thin blades fill little volume; common practice,
// no source).
//
// φ enters the drag: the momentum equations are written for the fluid, so
// the drag per unit fluid mass is ½ C_D a/(1 − φ) |u| u, the frontal area
// of a unit total volume acting on its fluid share 1 − φ (Nepf 2012, Annu.
// Rev. Fluid Mech. 44:123, writes the canopy drag per unit fluid mass with
// this factor; from memory; common practice in canopy-flow models).
type Elements struct {
	Shape Shape
	// Width is the element width in m: the diameter d of a cylinder, the
	// width b of a blade. It sets the element Reynolds number |u| d/ν of a
	// drag law and the solid fraction of cylinders. 0 means not given: no
	// drag law may then be used, and cylinders get no derived φ.
	Width float64
	// SolidFraction is φ at the canopy-mean density (0 <= φ < 1,
	// dimensionless); nil derives it (cylinders) or neglects it (blades).
	SolidFraction *float64
}

// CylinderSolidFraction returns φ = (π/4) a d (dimensionless) for cylinders
// of diameter d (m) at frontal-area density a (1/m) (derived: cross-section
// π d²/4 over frontal width d per unit length).
func CylinderSolidFraction(a, d float64) float64 {
	return math.Pi / 4 * a * d
}

// solidPerDensity returns κ = φ/a in m for a profile of mean density ā
// (1/m): π d/4 for cylinders without a given φ, φ/ā for a given φ, 0
// otherwise.
func (e Elements) solidPerDensity(mean float64) float64 {
	switch {
	case e.SolidFraction != nil && mean > 0:
		return *e.SolidFraction / mean
	case e.SolidFraction != nil:
		return 0
	case e.Shape == Cylinder:
		return math.Pi / 4 * e.Width
	}
	return 0
}

// validate checks the elements for a profile of mean density mean and
// largest density peak (1/m).
func (e Elements) validate(mean, peak float64) error {
	switch {
	case e.Shape != Cylinder && e.Shape != Blade:
		return fmt.Errorf("canopy: element shape %v: need cylinder or blade", e.Shape)
	case math.IsNaN(e.Width) || math.IsInf(e.Width, 0) || e.Width < 0:
		return fmt.Errorf("canopy: element width %g m: need the %s > 0 in m (or 0 when not known)", e.Width, e.Shape.widthName())
	}
	if f := e.SolidFraction; f != nil && (math.IsNaN(*f) || *f < 0 || *f >= 1) {
		return fmt.Errorf("canopy: solid volume fraction φ = %g: need 0 <= φ < 1 (solid volume per unit volume)", *f)
	}
	if phi := e.solidPerDensity(mean) * peak; !(phi < 1) {
		how := fmt.Sprintf("φ = (π/4) a d with d = %g m", e.Width)
		if e.SolidFraction != nil {
			how = fmt.Sprintf("φ = %g a/ā with ā = %.4g 1/m", *e.SolidFraction, mean)
		}
		return fmt.Errorf("canopy: the solid volume fraction reaches %.4g where a = %g 1/m (%s): need φ < 1; check the density and the element width", phi, peak, how)
	}
	return nil
}
