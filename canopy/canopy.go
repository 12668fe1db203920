package canopy

import (
	"fmt"
	"math"
)

// Canopy is the whole canopy description: where the elements are, what they
// are and how they drag. The frontal-area density is
// a(x, z) = C(x) · Profile.At(z), with the coverage C = 1 everywhere when
// Patches is empty, else the (smoothed) indicator of the patches.
//
// The drag is quadratic, −½ C_D a/(1 − φ) |u| u per unit fluid mass, with
// the drag coefficient CD, or Law(Re_d) evaluated by the solver with
// Re_d = |u| Elements.Width/ν; or linear, −Linear · u wherever a > 0 (a
// Darcy–Brinkman layer, where a only marks the canopy). Exactly one of CD,
// Law and Linear is set.
type Canopy struct {
	Profile Profile
	// Patches are the streamwise stretches holding canopy; empty for a
	// canopy covering the whole domain. They must not overlap.
	Patches []Patch
	// PatchEdge is the width w in m of the smoothed patch edges (the step of
	// Profile's top edge, applied at both ends of each patch in x, and at
	// both sides in y of a rectangle, which keeps each patch's ∫C dx equal
	// to its length exactly); 0 for sharp edges. It must not exceed the
	// shortest patch (nor the narrowest rectangle).
	PatchEdge float64
	Elements  Elements
	CD        float64 // fixed drag coefficient (dimensionless), > 0; 0 when Law or Linear is set
	Law       DragLaw // C_D(Re_d); nil for the fixed CD
	Linear    float64 // 1/s, linear drag rate, > 0; 0 for a quadratic drag
	// Flexible, when set, makes the blades bend with the flow
	// (reconfiguration.go, Bending); nil for rigid elements. It needs
	// flat blades of a given width and a fixed CD.
	Flexible *Flexible
}

// Validate checks the canopy for a domain lx long and depth deep (m): the
// profile (Profile.Validate), the patches and their edge width, the
// elements (width > 0, φ < 1 everywhere) and the drag law. The
// first mistake found comes back as an error naming the quantity, its value
// and the fix.
func (c *Canopy) Validate(lx, depth float64) error {
	return c.ValidateSlab(lx, 0, depth)
}

// ValidateSlab is Validate for a slab ly wide across the span (m); ly = 0
// is the x–z slice, where no patch may have a spanwise extent.
func (c *Canopy) ValidateSlab(lx, ly, depth float64) error {
	if !(lx > 0) || math.IsInf(lx, 0) {
		return fmt.Errorf("canopy: domain length %g m: need a finite length > 0", lx)
	}
	if ly < 0 || math.IsNaN(ly) || math.IsInf(ly, 0) {
		return fmt.Errorf("canopy: domain width %g m: need a finite width > 0 for a slab, or 0 for the slice", ly)
	}
	if err := c.Profile.Validate(depth); err != nil {
		return err
	}
	if err := validatePatches(c.Patches, c.PatchEdge, lx, ly); err != nil {
		return err
	}
	if err := c.Elements.validate(c.Profile.MeanDensity(), c.Profile.maxDensity()); err != nil {
		return err
	}
	if f := c.Flexible; f != nil {
		switch {
		case c.Elements.Shape != Blade:
			return fmt.Errorf("canopy: flexible settings apply to flat blades, not to elements of shape %v", c.Elements.Shape)
		case c.Law != nil || c.Linear != 0:
			return fmt.Errorf("canopy: flexible blades need a fixed drag coefficient C_D, not a drag law")
		}
	}
	if c.Linear != 0 {
		switch {
		case c.CD != 0 || c.Law != nil:
			return fmt.Errorf("canopy: both a linear drag rate %g 1/s and a quadratic drag (C_D or a Reynolds-number law) are set: give one", c.Linear)
		case !(c.Linear > 0) || math.IsInf(c.Linear, 1):
			return fmt.Errorf("canopy: linear drag rate %g 1/s: need a finite rate > 0", c.Linear)
		}
		return nil
	}
	switch {
	case c.Law != nil && c.CD != 0:
		return fmt.Errorf("canopy: both a fixed drag coefficient C_D = %g and a Reynolds-number drag law are set: give one", c.CD)
	case c.Law != nil && c.Elements.Width == 0:
		return fmt.Errorf("canopy: a Reynolds-number drag law needs the element %s", c.Elements.Shape.widthName())
	case c.Law == nil && (math.IsNaN(c.CD) || math.IsInf(c.CD, 0) || c.CD <= 0):
		return fmt.Errorf("canopy: drag coefficient C_D = %g: need a finite value > 0 (about 1 for cylinders), or a Reynolds-number drag law", c.CD)
	}
	return nil
}

// Height returns the canopy height h in m (Profile.Height).
func (c *Canopy) Height() float64 { return c.Profile.Height() }

// FrontalAreaIndex returns ∫a dz inside a patch (dimensionless,
// Profile.FrontalAreaIndex); the domain-mean value is this times
// CoveredFraction.
func (c *Canopy) FrontalAreaIndex() float64 { return c.Profile.FrontalAreaIndex() }

// DragLength returns 1/(C_D ā) in m for drag coefficient cd
// (Profile.DragLength).
func (c *Canopy) DragLength(cd float64) float64 { return c.Profile.DragLength(cd) }

// Regime returns the flow regime inside a patch for drag coefficient cd
// (Profile.Regime).
func (c *Canopy) Regime(cd float64) Regime { return c.Profile.Regime(cd) }

// CoveredFraction returns the fraction of a domain lx long (m) that the
// patches cover, Σ (x1 − x0)/Lx (dimensionless); 1 without patches.
func (c *Canopy) CoveredFraction(lx float64) float64 {
	return newCoverage(c.Patches, c.PatchEdge, lx).fraction()
}

// Coverage returns the horizontal coverage C(x) (dimensionless, 0 to 1) at
// x in m on a domain lx long (m): 1 inside a patch, 0 outside, smoothed
// across the edges when PatchEdge > 0; 1 everywhere without patches.
func (c *Canopy) Coverage(x, lx float64) float64 {
	return newCoverage(c.Patches, c.PatchEdge, lx).at(x)
}

// At returns the frontal-area density a(x, z) in 1/m at the point (x, z) in
// m on a domain lx long (m).
func (c *Canopy) At(x, z, lx float64) float64 {
	return c.Coverage(x, lx) * c.Profile.At(z)
}

// SolidFraction returns the solid volume fraction at the canopy-mean
// density (dimensionless): the given Elements.SolidFraction, or
// (π/4) ā d derived for cylinders, or 0 for blades without a given value.
func (c *Canopy) SolidFraction() float64 {
	mean := c.Profile.MeanDensity()
	return c.Elements.solidPerDensity(mean) * mean
}
