package casefile

import (
	"math"
	"strings"

	"rollerbed/io/stricttoml"
)

// Gravity is the standard acceleration of gravity g in m/s², by which a
// slope becomes a pressure gradient (standard value of the 3rd CGPM, 1901).
const Gravity = 9.80665

// ForcingKind says which key of [forcing] drives the flow; its values are
// the key names.
type ForcingKind string

// The forcing kinds.
const (
	// ForcingGradient: a constant kinematic pressure gradient Π (m/s²).
	ForcingGradient ForcingKind = "gradient"
	// ForcingSlope: a constant Π = Gravity·Slope.
	ForcingSlope ForcingKind = "slope"
	// ForcingBulkVelocity: Π adjusted every step to hold the depth-mean
	// velocity at BulkVelocity.
	ForcingBulkVelocity ForcingKind = "bulk_velocity"
)

// Forcing is the [forcing] table: what drives the flow along +x. Exactly one
// of its keys is given; Kind says which, and the other two are 0.
type Forcing struct {
	// Kind is set by Parse from the key given; it is not a key itself.
	Kind ForcingKind `toml:"-"`
	// Gradient is the kinematic pressure gradient Π in m/s², >= 0 (0 lets
	// the flow decay).
	Gradient float64 `toml:"gradient"`
	// Slope is the energy slope S, dimensionless, 0 <= S < 0.1.
	Slope float64 `toml:"slope"`
	// BulkVelocity is the depth-mean velocity to hold, in m/s, > 0.
	BulkVelocity float64 `toml:"bulk_velocity"`
}

// PressureGradient returns the constant kinematic pressure gradient Π in
// m/s² of a gradient or slope forcing (Gravity·Slope for a slope), and 0 for
// a bulk-velocity forcing, where the solver sets Π as it runs.
func (f Forcing) PressureGradient() float64 {
	switch f.Kind {
	case ForcingGradient:
		return f.Gradient
	case ForcingSlope:
		return Gravity * f.Slope
	}
	return 0
}

var forcingKinds = []ForcingKind{ForcingGradient, ForcingSlope, ForcingBulkVelocity}

func (f *Forcing) value(k ForcingKind) float64 {
	switch k {
	case ForcingGradient:
		return f.Gradient
	case ForcingSlope:
		return f.Slope
	case ForcingBulkVelocity:
		return f.BulkVelocity
	}
	return math.NaN()
}

func checkForcing(c *Case, p *stricttoml.Problems) {
	f := &c.Forcing
	const choose = "give exactly one of forcing.gradient (pressure gradient, m/s²), forcing.slope (energy slope, dimensionless) or forcing.bulk_velocity (depth-mean velocity, m/s)"
	if p.Parsing {
		var given []string
		for _, k := range forcingKinds {
			if p.Has("forcing." + string(k)) {
				given = append(given, "forcing."+string(k))
			}
		}
		switch len(given) {
		case 0:
			p.Add("forcing", "", "nothing drives the flow; "+choose+" under [forcing]")
			return
		case 1:
			f.Kind = ForcingKind(strings.TrimPrefix(given[0], "forcing."))
		default:
			p.MoreThanOne(given, choose)
			return
		}
	}
	kinds := make([]string, len(forcingKinds))
	for i, k := range forcingKinds {
		kinds[i] = string(k)
	}
	if !p.OneOf("forcing.kind", string(f.Kind), kinds, "Forcing.Kind names the key in use") {
		return
	}
	for _, k := range forcingKinds {
		if k != f.Kind && f.value(k) != 0 {
			p.Add("forcing."+string(k), stricttoml.FormatFloat(f.value(k)), "must be 0 when the forcing is "+string(f.Kind)+"; "+choose)
		}
	}
	key := "forcing." + string(f.Kind)
	if !p.OK(key) {
		return
	}
	switch f.Kind {
	case ForcingGradient:
		p.AtLeast(key, f.Gradient, 0, "kinematic pressure gradient Π along +x, m/s²", "0 lets the flow decay; e.g. gradient = 1.0e-5")
	case ForcingSlope:
		if f.Slope >= 0 && f.Slope < 0.1 {
			return
		}
		p.Add(key, stricttoml.FormatFloat(f.Slope), "must be >= 0 and < 0.1 (energy slope S, dimensionless: metres of fall per metre); e.g. slope = 1.0e-4")
	case ForcingBulkVelocity:
		p.Positive(key, f.BulkVelocity, "depth-mean velocity to hold, m/s", "for a decaying run use forcing.gradient = 0")
	}
}

func forcingTemplate() string {
	return `[forcing]
# What drives the flow along +x. Give exactly one of these three keys.
#
# Kinematic pressure gradient Π (pressure gradient over density), m/s²; >= 0.
# 0 lets the flow decay.
# gradient = 1.0e-5
# Energy slope S, dimensionless (m of fall per m); Π = g·S, where the
# standard gravity g is 9.80665 m/s². 0 <= slope < 0.1.
slope = 1.0e-4
# Depth-mean velocity to hold, m/s; Π is adjusted every step; > 0.
# bulk_velocity = 0.1
`
}
