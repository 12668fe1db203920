package casefile

import (
	"math"
	"strconv"
	"strings"

	"rollerbed/canopy"
	"rollerbed/io/stricttoml"
)

// Gravity is the standard acceleration of gravity g in m/s², by which a
// slope becomes a pressure gradient (canopy.Gravity).
const Gravity = canopy.Gravity

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
// of gradient, slope and bulk_velocity is given (the steady part); Kind says
// which, and the other two are 0. Waves add oscillating parts to a gradient
// or slope, Tides to a bulk velocity, and Ramp starts the whole forcing
// smoothly from 0.
type Forcing struct {
	// Kind is set by Parse from the key given; it is not a key itself.
	Kind ForcingKind `toml:"-"`
	// Gradient is the kinematic pressure gradient Π in m/s², >= 0 (0 lets
	// the flow decay).
	Gradient float64 `toml:"gradient"`
	// Slope is the energy slope S, dimensionless, 0 <= S < 0.1.
	Slope float64 `toml:"slope"`
	// BulkVelocity is the depth-mean velocity to hold, in m/s, > 0; with
	// Tides the steady part of it, any finite value (0 for a pure tide).
	BulkVelocity float64 `toml:"bulk_velocity"`
	// Ramp is the time in s over which the whole forcing rises smoothly
	// from 0 at the start of the run, ½(1 − cos(π t/ramp)); >= 0, default
	// 0 (none).
	Ramp float64 `toml:"ramp"`
	// Waves are the [[forcing.wave]] tables: oscillating parts of the
	// pressure gradient (amplitudes in m/s²), with gradient or slope only.
	// Problems name them from 0: forcing.wave[0] is the first.
	Waves []Oscillation `toml:"wave"`
	// Tides are the [[forcing.tide]] tables: oscillating parts of the
	// depth-mean velocity (amplitudes in m/s), with bulk_velocity only.
	Tides []Oscillation `toml:"tide"`
	// TideReverses lets the tidal flow run both ways; false (the default)
	// holds it along +x, |bulk_velocity + Σ tides|, slack twice a period.
	// With tides only.
	TideReverses bool `toml:"tide_reverses"`
}

// Oscillation is one [[forcing.wave]] or [[forcing.tide]] table, the part
// Amplitude·cos(2π t/Period + Phase) of the forcing, t in s from the start
// of the run.
type Oscillation struct {
	// Amplitude is in m/s² for a wave (pressure gradient), in m/s for a
	// tide (depth-mean velocity); finite and not 0. Required.
	Amplitude float64 `toml:"amplitude"`
	// Period is in s, > 0. Required.
	Period float64 `toml:"period"`
	// Phase is the phase at t = 0 in degrees, from -360 to 360; default 0
	// (the part is at its peak at the start).
	Phase float64 `toml:"phase"`
}

// Oscillating reports whether the forcing has waves or tides.
func (f Forcing) Oscillating() bool { return len(f.Waves) > 0 || len(f.Tides) > 0 }

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
	checkOscillations(c, p)
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
		if len(f.Tides) > 0 {
			p.FiniteValue(key, f.BulkVelocity, "steady part of the depth-mean velocity under the tide, m/s", "0 for a pure tide")
		} else {
			p.Positive(key, f.BulkVelocity, "depth-mean velocity to hold, m/s", "for a decaying run use forcing.gradient = 0")
		}
	}
}

// checkOscillations checks the ramp, the waves and the tides, and that each
// kind suits the steady part.
func checkOscillations(c *Case, p *stricttoml.Problems) {
	f := &c.Forcing
	if p.OK("forcing.ramp") {
		p.AtLeast("forcing.ramp", f.Ramp, 0, "time over which the forcing rises from 0 at the start, s", "0 for none; e.g. ramp = 60")
	}
	for i, o := range f.Waves {
		checkOscillation(oscKey("wave", i), o, "m/s²", "e.g. amplitude = 0.05 (the pressure gradient under waves, m/s²)", p)
	}
	for i, o := range f.Tides {
		checkOscillation(oscKey("tide", i), o, "m/s", "e.g. amplitude = 0.3 (the tidal depth-mean velocity, m/s)", p)
	}
	if len(f.Waves) > 0 && f.Kind == ForcingBulkVelocity {
		p.Add(oscKey("wave", 0), "", "an oscillating pressure gradient cannot act under forcing.bulk_velocity, which holds the depth-mean velocity and would cancel it; drive the flow with forcing.gradient or forcing.slope, or give the oscillation as [[forcing.tide]]")
	}
	if len(f.Tides) > 0 && f.Kind != ForcingBulkVelocity && f.Kind != "" {
		p.Add(oscKey("tide", 0), "", "a tide varies the depth-mean velocity and needs forcing.bulk_velocity (its steady part, 0 for a pure tide) instead of forcing."+string(f.Kind)+"; or give the oscillation as [[forcing.wave]]")
	}
	if len(f.Tides) == 0 && p.OK("forcing.tide_reverses") {
		p.OnlyWith("forcing.tide_reverses", f.TideReverses, strconv.FormatBool(f.TideReverses), "the forcing has [[forcing.tide]] tables")
	}
}

// oscKey names [[forcing.<kind>]] element i.
func oscKey(kind string, i int) string { return "forcing." + kind + "[" + strconv.Itoa(i) + "]" }

func checkOscillation(key string, o Oscillation, unit, example string, p *stricttoml.Problems) {
	if p.Require(key+".amplitude", "the amplitude, "+unit, "amplitude = 0.1") && p.OK(key+".amplitude") {
		if p.FiniteValue(key+".amplitude", o.Amplitude, "amplitude, "+unit, example) && o.Amplitude == 0 {
			p.Add(key+".amplitude", "0", "must not be 0 (amplitude, "+unit+"); remove the table for a steady forcing")
		}
	}
	if p.Require(key+".period", "the period, s", "period = 8.0") && p.OK(key+".period") {
		p.Positive(key+".period", o.Period, "period, s", "e.g. period = 8 for waves, 44712 for the semidiurnal tide")
	}
	if p.OK(key + ".phase") {
		p.FloatRange(key+".phase", o.Phase, -360, 360, "phase at the start, degrees", "")
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
# Depth-mean velocity to hold, m/s; Π is adjusted every step; > 0 (with
# tides: any value, the steady part; 0 for a pure tide).
# bulk_velocity = 0.1
#
# Time over which the whole forcing rises smoothly from 0 at the start,
# ½(1 - cos(π t/ramp)), s. Default 0 (none); >= 0. Start from rest with it.
# ramp = 0.0
# Whether a tide reverses the flow: true lets the depth-mean velocity
# bulk_velocity + Σ tides change sign; false (the default) holds the flow
# along +x at its absolute value, slack twice a period. Only with tides.
# tide_reverses = true
#
# Optional oscillating parts, each amplitude·cos(2π t/period + phase).
# Waves add to the pressure gradient (with gradient or slope); tides add to
# the depth-mean velocity (with bulk_velocity). Repeat a block for each
# part; messages count them from 0. The first part's period sets the phases
# of the phase-averaged statistics (output.phase_bins).
# [[forcing.wave]]
# Amplitude of the pressure gradient, m/s²; not 0. Required.
# amplitude = 0.05
# Period, s; > 0. Required.
# period = 8.0
# Phase at the start, degrees; default 0; -360 to 360.
# phase = 0.0
#
# [[forcing.tide]]
# Amplitude of the depth-mean velocity, m/s; not 0. Required.
# amplitude = 0.3
# Period, s; > 0 (the semidiurnal lunar tide: 44712 s). Required.
# period = 44712.0
# phase = 0.0
`
}
