package casefile

import "rollerbed/io/stricttoml"

// Subgrid closures for [turbulence] closure.
const (
	// ClosureSmagorinsky: the Smagorinsky eddy viscosity ν_t = ℓ² |S| with
	// Mason–Thomson wall damping, 1/ℓ² = 1/(C_s Δ)² + 1/(κ (z + z0))² and
	// Δ = (Δx Δz)^½.
	ClosureSmagorinsky = "smagorinsky"
	// ClosureNone: no subgrid model, a direct simulation; the grid must
	// resolve the smallest eddies.
	ClosureNone = "none"
)

// Turbulence is the [turbulence] table: the subgrid closure.
type Turbulence struct {
	// Closure is ClosureSmagorinsky (the default) or ClosureNone.
	Closure string `toml:"closure"`
	// Smagorinsky is the Smagorinsky constant C_s, dimensionless,
	// 0 < C_s <= 0.5; default 0.2 with ClosureSmagorinsky, and 0 with
	// ClosureNone.
	Smagorinsky float64 `toml:"smagorinsky"`
}

// Default and limit of the Smagorinsky constant. C_s = 0.2 gave a robust
// calculation of the two-dimensional plane shear mixing layer, with its
// observed growth rate, in Leith 1990 (Phys. Fluids A 2:297–299, there
// with stochastic backscatter added); for comparison Lilly 1967 (Proc. IBM
// Sci. Comput. Symp. Environ. Sci., p. 195) derived about 0.17 for
// isotropic turbulence, and Deardorff 1970 (J. Fluid Mech. 41:453) used
// about 0.1 in sheared channel flow (both from memory). The upper bound of
// 0.5 is far above these and only catches slips (common practice, no
// source).
const (
	defaultSmagorinsky = 0.2
	maxSmagorinsky     = 0.5
)

func checkTurbulence(c *Case, p *stricttoml.Problems) {
	t := &c.Turbulence
	if p.Parsing && !p.Has("turbulence.closure") {
		t.Closure = ClosureSmagorinsky
	}
	if !p.OK("turbulence.closure") || !p.OneOf("turbulence.closure", t.Closure, []string{ClosureSmagorinsky, ClosureNone}, "") {
		return
	}
	const key = "turbulence.smagorinsky"
	if t.Closure == ClosureNone {
		if p.OK(key) {
			p.OnlyWith(key, t.Smagorinsky != 0, stricttoml.FormatFloat(t.Smagorinsky), `turbulence.closure = "smagorinsky"`)
		}
		return
	}
	if p.Parsing && !p.Has(key) {
		t.Smagorinsky = defaultSmagorinsky
	}
	if p.OK(key) && !(t.Smagorinsky > 0 && t.Smagorinsky <= maxSmagorinsky) {
		p.Add(key, stricttoml.FormatFloat(t.Smagorinsky), `must be > 0 and <= 0.5 (Smagorinsky constant C_s, dimensionless); 0.1 to 0.2 is usual, e.g. smagorinsky = 0.2; for no subgrid model set closure = "none" instead`)
	}
}

func turbulenceTemplate() string {
	return `[turbulence]
# Subgrid closure. Default "smagorinsky".
#   "smagorinsky"  eddy viscosity ν_t = ℓ²·|S|, 1/ℓ² = 1/(C_s·Δ)² + 1/(κ·(z + z0))²
#                  with Δ = (Δx·Δz)^½ (Smagorinsky, Mason-Thomson wall damping)
#   "none"         no subgrid model: a direct simulation, for a grid fine
#                  enough to resolve the smallest eddies
closure = "smagorinsky"
# Smagorinsky constant C_s, dimensionless. Only with closure = "smagorinsky".
# Default 0.2 (Leith 1990, a two-dimensional mixing layer; Lilly 1967 derived
# 0.17, Deardorff 1970 used about 0.1 in sheared flow); 0 < smagorinsky <= 0.5.
# smagorinsky = 0.2
`
}
