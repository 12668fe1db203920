package casefile

import (
	"rollerbed/io/stricttoml"
)

// flexibleKeys are the [canopy] keys of flexible blades; given together,
// they make the blades bend with the flow.
var flexibleKeys = []string{"canopy.blade_modulus", "canopy.blade_thickness", "canopy.blade_density"}

// Flexible reports whether the canopy's blades bend with the flow: its
// blade modulus, thickness and density are set.
func (cp *Canopy) Flexible() bool {
	return cp.BladeModulus != 0 || cp.BladeThickness != 0 || cp.BladeDensity != 0
}

// checkFlexible checks the flexible-blade keys of [canopy]: all three or
// none, on flat blades of a given width with a fixed drag coefficient, in a
// fluid of known density that the blades do not outweigh.
func checkFlexible(c *Case, p *stricttoml.Problems) {
	cp := c.Canopy
	values := []float64{cp.BladeModulus, cp.BladeThickness, cp.BladeDensity}
	var given, missing []string
	for i, k := range flexibleKeys {
		if p.Used(k, values[i] != 0) {
			given = append(given, k)
		} else {
			missing = append(missing, k)
		}
	}
	if len(given) == 0 {
		return
	}
	first := given[0]
	const all = "flexible blades need canopy.blade_modulus (Pa), canopy.blade_thickness (m) and canopy.blade_density (kg/m³) together"
	for _, k := range missing {
		p.Add(k, "", "missing; "+all+"; add it, or remove the other two for rigid elements")
	}
	if p.OK("canopy.shape") && cp.Shape != ShapeBlade {
		p.Addf(first, stricttoml.FormatFloat(values[indexOf(flexibleKeys, first)]), "flexible settings apply to flat blades only, and canopy.shape = %q; set shape = \"blade\" or remove the blade_* keys", cp.Shape)
	}
	if p.OK("canopy.drag_law") && cp.DragLaw != DragFixed {
		p.Addf(first, stricttoml.FormatFloat(values[indexOf(flexibleKeys, first)]), "the bending law needs a fixed drag coefficient, and canopy.drag_law = %q; use drag_law = \"fixed\" or remove the blade_* keys", cp.DragLaw)
	}
	if p.OK("canopy.blade_modulus") && p.Used("canopy.blade_modulus", cp.BladeModulus != 0) {
		p.Positive("canopy.blade_modulus", cp.BladeModulus, "Young's modulus E of the blades, Pa", "seagrass blades are about 1e8 to 1e10 Pa; e.g. blade_modulus = 5.0e8")
	}
	if p.OK("canopy.blade_thickness") && p.Used("canopy.blade_thickness", cp.BladeThickness != 0) &&
		p.Positive("canopy.blade_thickness", cp.BladeThickness, "blade thickness t, m", "e.g. blade_thickness = 2.0e-4") {
		switch {
		case p.OK("canopy.diameter") && cp.Diameter == 0:
			p.Add("canopy.diameter", "", "missing; flexible blades need the blade width b in m (their stiffness E·b·t³/12 and their drag depend on it); add e.g. diameter = 0.005 under [canopy]")
		case p.OK("canopy.diameter") && cp.BladeThickness >= cp.Diameter:
			p.Addf("canopy.blade_thickness", stricttoml.FormatFloat(cp.BladeThickness), "must be less than the blade width canopy.diameter = %s m (the bending law is for thin flat blades); check the units: thickness and width are in m", stricttoml.FormatFloat(cp.Diameter))
		}
	}
	if !p.OK("canopy.blade_density") || !p.Used("canopy.blade_density", cp.BladeDensity != 0) ||
		!p.Positive("canopy.blade_density", cp.BladeDensity, "density ρ_v of the blade material, kg/m³", "seagrass blades are about 700 to 1000 kg/m³") {
		return
	}
	rho := c.Fluid.Density
	switch {
	case !p.OK("fluid.density"):
	case rho == 0:
		p.Add("fluid.density", "", "missing; flexible blades need the fluid density in kg/m³ (for their buoyancy and the drag that bends them); add e.g. density = 1025.0 under [fluid]")
	case cp.BladeDensity > rho:
		p.Addf("canopy.blade_density", stricttoml.FormatFloat(cp.BladeDensity), "is above the fluid density fluid.density = %s kg/m³: the bending law holds for buoyant or neutrally buoyant blades only (a heavier blade would lie on the bed at slack water); check the units (kg/m³), or use blade_density <= %s", stricttoml.FormatFloat(rho), stricttoml.FormatFloat(rho))
	}
}

func indexOf(list []string, s string) int {
	for i, v := range list {
		if v == s {
			return i
		}
	}
	return -1
}

const flexibleTemplate = `#
# Flexible blades (optional; all three keys or none, with shape = "blade",
# diameter as the blade width and drag_law = "fixed"). The blades then bend
# with the flow: their bent height and drag follow the local speed through
# the reconfiguration law of Luhar & Nepf (2011), quasi-statically, and
# canopy height is the blade length. Needs fluid.density.
# Young's modulus E of the blade material, Pa; > 0.
# blade_modulus = 5.0e8
# Blade thickness t, m; > 0 and less than diameter.
# blade_thickness = 2.0e-4
# Density of the blade material, kg/m³; > 0 and at most fluid.density.
# blade_density = 900.0
`
