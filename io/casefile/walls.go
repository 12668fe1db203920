package casefile

import (
	"math"
	"strconv"

	"rollerbed/io/stricttoml"
)

// Boundary conditions for [bed] condition and [top] condition.
const (
	// NoSlip: the fluid moves with the wall (its speed).
	NoSlip = "no-slip"
	// FreeSlip: no shear stress at the wall; at the top, an open channel.
	FreeSlip = "free-slip"
	// Rough: a log-law wall model over a rough bed of roughness length z0
	// (bed only).
	Rough = "rough"
)

// Bed is the [bed] table: the boundary at z = 0.
type Bed struct {
	// Condition is NoSlip, FreeSlip or Rough; default NoSlip.
	Condition string `toml:"condition"`
	// Roughness is the roughness length z0 in m, 0 < z0 < Depth; required
	// with Rough, 0 otherwise.
	Roughness float64 `toml:"roughness"`
	// Speed is the tangential speed of the bed along +x in m/s (NoSlip
	// only, 0 otherwise); default 0.
	Speed float64 `toml:"speed"`
}

// Top is the [top] table: the boundary at z = Depth.
type Top struct {
	// Condition is FreeSlip (an open channel, the default) or NoSlip (a
	// rigid lid).
	Condition string `toml:"condition"`
	// Speed is the lid speed along +x in m/s (NoSlip only, 0 otherwise);
	// default 0.
	Speed float64 `toml:"speed"`
}

func checkBed(c *Case, p *stricttoml.Problems) {
	b := &c.Bed
	if p.Parsing && !p.Has("bed.condition") {
		b.Condition = NoSlip
	}
	if !p.OK("bed.condition") || !p.OneOf("bed.condition", b.Condition, []string{NoSlip, FreeSlip, Rough}, "") {
		return
	}
	if b.Condition == Rough {
		if p.Parsing && !p.Has("bed.roughness") {
			p.Add("bed.roughness", "", `missing; required with bed.condition = "rough": the roughness length z0 in m, > 0; add e.g. roughness = 0.001 under [bed]`)
		} else if p.OK("bed.roughness") {
			depth := c.Domain.Depth
			if p.OK("domain.depth") && depth > 0 && !math.IsInf(depth, 0) {
				p.OpenRange("bed.roughness", b.Roughness, 0, depth, "roughness length z0, m, below the domain depth", "e.g. roughness = 0.001")
			} else {
				p.Positive("bed.roughness", b.Roughness, "roughness length z0, m", "e.g. roughness = 0.001")
			}
		}
	} else if p.OK("bed.roughness") {
		p.OnlyWith("bed.roughness", b.Roughness != 0, stricttoml.FormatFloat(b.Roughness), `bed.condition = "rough"`)
	}
	checkWallSpeed("bed", b.Condition, b.Speed, p)
}

func checkTop(c *Case, p *stricttoml.Problems) {
	t := &c.Top
	if p.Parsing && !p.Has("top.condition") {
		t.Condition = FreeSlip
	}
	if !p.OK("top.condition") {
		return
	}
	hint := ""
	if t.Condition == Rough {
		hint = "the rough-wall model is for the bed only"
	}
	if !p.OneOf("top.condition", t.Condition, []string{FreeSlip, NoSlip}, hint) {
		return
	}
	checkWallSpeed("top", t.Condition, t.Speed, p)
}

// checkWallSpeed checks the speed key of the bed or top table.
func checkWallSpeed(table, condition string, speed float64, p *stricttoml.Problems) {
	key := table + ".speed"
	if !p.OK(key) {
		return
	}
	if condition != NoSlip {
		p.OnlyWith(key, speed != 0, stricttoml.FormatFloat(speed), table+".condition = "+strconv.Quote(NoSlip))
		return
	}
	p.FiniteValue(key, speed, "tangential wall speed along +x, m/s", "")
}

func bedTemplate() string {
	return `[bed]
# Boundary condition at the bed (z = 0). Default "no-slip".
#   "no-slip"    the fluid moves with the bed (see speed)
#   "free-slip"  no shear stress at the bed
#   "rough"      log-law wall model over a rough bed of roughness length z0
condition = "rough"
# Roughness length z0, m. Required with condition = "rough", not allowed
# otherwise; 0 < roughness < depth.
roughness = 0.0005
# Tangential speed of the bed along +x, m/s. Only with condition = "no-slip".
# Default 0.
# speed = 0.0
`
}

func topTemplate() string {
	return `[top]
# Boundary condition at the top (z = depth). Default "free-slip".
#   "free-slip"  an open channel: the surface carries no shear stress
#   "no-slip"    a rigid lid moving at speed
condition = "free-slip"
# Speed of the lid along +x, m/s. Only with condition = "no-slip". Default 0.
# speed = 0.0
`
}
