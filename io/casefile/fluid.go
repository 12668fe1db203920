package casefile

import (
	"fmt"
	"strings"

	"rollerbed/io/stricttoml"
)

// Fluid is the [fluid] table.
type Fluid struct {
	// Viscosity is the kinematic viscosity ν in m²/s, 0 < ν < 1. Required
	// unless Preset is given; Parse fills it from the preset.
	Viscosity float64 `toml:"viscosity"`
	// Preset is the name of a fluid from FluidPresets, or "" for none.
	Preset string `toml:"preset"`
	// Density is the fluid density ρ in kg/m³, 0 < ρ <= 2e4; 0 (the
	// default) when not given. Required with flexible blades.
	Density float64 `toml:"density"`
}

// fluidPreset is one named fluid.
type fluidPreset struct {
	name string
	nu   float64 // kinematic viscosity, m²/s
	note string  // shown in the template
}

// fluidPresets are the named fluids, at atmospheric pressure.
//
//   - Fresh water: ITTC Recommended Procedure 7.5-02-01-03, "Fresh Water and
//     Seawater Properties" (2011), values from memory.
//   - Seawater of absolute salinity 35 g/kg: Sharqawy, Lienhard & Zubair
//     (2010), "Thermophysical properties of seawater: a review of existing
//     correlations and data", Desalination and Water Treatment 16:354–380,
//     values from memory.
//   - Air: Sutherland's law for dry air at 20 °C and 101.325 kPa, value from
//     memory.
var fluidPresets = []fluidPreset{
	{"freshwater-5C", 1.5182e-6, "fresh water, 5 °C"},
	{"freshwater-10C", 1.3063e-6, "fresh water, 10 °C"},
	{"freshwater-20C", 1.0034e-6, "fresh water, 20 °C"},
	{"seawater-5C", 1.576e-6, "seawater 35 g/kg, 5 °C"},
	{"seawater-10C", 1.3604e-6, "seawater 35 g/kg, 10 °C"},
	{"seawater-20C", 1.0507e-6, "seawater 35 g/kg, 20 °C"},
	{"air-20C", 1.51e-5, "dry air, 20 °C, 1 atm"},
}

// FluidPreset returns the kinematic viscosity in m²/s of the named fluid
// and whether the name is known. Sources are given beside the table.
func FluidPreset(name string) (nu float64, ok bool) {
	for _, f := range fluidPresets {
		if f.name == name {
			return f.nu, true
		}
	}
	return 0, false
}

// FluidPresets returns the names FluidPreset knows, in a fixed order.
func FluidPresets() []string {
	names := make([]string, len(fluidPresets))
	for i, f := range fluidPresets {
		names[i] = f.name
	}
	return names
}

func checkFluid(c *Case, p *stricttoml.Problems) {
	f := &c.Fluid
	const viscosityDesc = "kinematic viscosity, m²/s"
	if p.Parsing {
		switch {
		case p.Has("fluid.preset") && p.Has("fluid.viscosity"):
			p.Add("fluid.viscosity", "", "fluid.preset and fluid.viscosity are both given; the preset sets the viscosity, so keep one of them")
			return
		case p.Has("fluid.preset"):
			// filled in below once the name is checked
		case !p.Has("fluid.viscosity"):
			p.Addf("fluid.viscosity", "", "missing; required: the %s, 0 < viscosity < 1, unless fluid.preset names a fluid; add e.g. viscosity = 1.0e-6 or preset = %q under [fluid]", viscosityDesc, "freshwater-20C")
			return
		}
	}
	if f.Preset != "" || p.Has("fluid.preset") {
		if !p.OK("fluid.preset") || !p.OneOf("fluid.preset", f.Preset, FluidPresets(), "or remove preset and give viscosity (m²/s)") {
			return
		}
		nu, _ := FluidPreset(f.Preset)
		if p.Parsing {
			f.Viscosity = nu
		} else if f.Viscosity != nu {
			p.Addf("fluid.viscosity", stricttoml.FormatFloat(f.Viscosity), "differs from the %g m²/s of fluid.preset = %q; set Preset to \"\" when setting the viscosity directly", nu, f.Preset)
			return
		}
	}
	if p.OK("fluid.viscosity") {
		p.OpenRange("fluid.viscosity", f.Viscosity, 0, 1, viscosityDesc, "e.g. 1.0e-6 for water, 1.5e-5 for air")
	}
	if p.OK("fluid.density") && p.Used("fluid.density", f.Density != 0) {
		p.OpenRange("fluid.density", f.Density, 0, maxFluidDensity, "fluid density, kg/m³", "e.g. 1025.0 for seawater, 1.2 for air")
	}
}

// maxFluidDensity bounds fluid.density well above any liquid's, to catch
// slips of unit (common practice, no source).
const maxFluidDensity = 2e4

func fluidTemplate() string {
	var b strings.Builder
	b.WriteString(`[fluid]
# Give preset or viscosity, not both.
# A named fluid; sets the kinematic viscosity (m²/s):
`)
	for _, f := range fluidPresets {
		fmt.Fprintf(&b, "#   %-16s %-10s %s\n", f.name, stricttoml.FormatFloat(f.nu), f.note)
	}
	b.WriteString(`preset = "seawater-20C"
# Kinematic viscosity ν, m²/s. Required unless preset is given;
# 0 < viscosity < 1.
# viscosity = 1.0e-6
# Density ρ, kg/m³. Needed only by flexible blades; 0 < density <= 20000.
# density = 1025.0
`)
	return b.String()
}
