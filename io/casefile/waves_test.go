package casefile

import (
	"testing"
)

// TestWaveAndBladeRules: the mistakes of time-varying forcing, phase bins
// and flexible blades each give one problem naming the key and the fix.
func TestWaveAndBladeRules(t *testing.T) {
	wave := func(amp, period string) []kv {
		return []kv{{"forcing.wave[0].amplitude", amp}, {"forcing.wave[0].period", period}}
	}
	bulk := []kv{{"forcing.bulk_velocity", "0.1"}}
	tide := func(amp, period string) []kv {
		return append(append([]kv{}, bulk...), kv{"forcing.tide[0].amplitude", amp}, kv{"forcing.tide[0].period", period})
	}
	noGradient := []string{"forcing.gradient"}
	blades := []kv{{"canopy.height", "0.2"}, {"canopy.frontal_area", "4.0"}, {"canopy.shape", `"blade"`},
		{"canopy.diameter", "0.005"}, {"fluid.density", "1025.0"},
		{"canopy.blade_modulus", "5.0e8"}, {"canopy.blade_thickness", "2.0e-4"}, {"canopy.blade_density", "900.0"}}
	with := func(base []kv, more ...kv) []kv { return append(append([]kv{}, base...), more...) }
	without := func(base []kv, key string) []kv {
		var out []kv
		for _, k := range base {
			if k.key != key {
				out = append(out, k)
			}
		}
		return out
	}
	tests := []rule{
		{name: "wave period zero", set: wave("0.05", "0"), key: "forcing.wave[0].period", val: "0", msgPart: "must be a finite number > 0 (period, s)"},
		{name: "wave period negative", set: wave("0.05", "-8.0"), key: "forcing.wave[0].period", val: "-8.0", msgPart: "> 0"},
		{name: "wave period missing", set: []kv{{"forcing.wave[0].amplitude", "0.05"}}, key: "forcing.wave[0].period", msgPart: "missing; required: the period, s"},
		{name: "wave amplitude zero", set: wave("0", "8.0"), key: "forcing.wave[0].amplitude", val: "0", msgPart: "must not be 0"},
		{name: "wave phase out of range", set: append(wave("0.05", "8.0"), kv{"forcing.wave[0].phase", "400.0"}), key: "forcing.wave[0].phase", val: "400.0", msgPart: "must be from -360 to 360"},
		{name: "wave under a bulk velocity", set: append(wave("0.05", "8.0"), bulk...), del: noGradient, key: "forcing.wave[0]", msgPart: "would cancel it"},
		{name: "tide under a gradient", set: tide("0.2", "600.0")[1:], key: "forcing.tide[0]", msgPart: "needs forcing.bulk_velocity"},
		{name: "tide period zero", set: tide("0.2", "0.0"), del: noGradient, key: "forcing.tide[0].period", val: "0.0", msgPart: "> 0"},
		{name: "tide_reverses without a tide", set: []kv{{"forcing.tide_reverses", "true"}}, key: "forcing.tide_reverses", val: "true", msgPart: "only applies when the forcing has [[forcing.tide]] tables"},
		{name: "negative ramp", set: []kv{{"forcing.ramp", "-5.0"}}, key: "forcing.ramp", val: "-5.0", msgPart: "must be a finite number >= 0"},
		{name: "phase bins below 2", set: append(wave("0.05", "8.0"), kv{"output.phase_bins", "1"}), key: "output.phase_bins", val: "1", msgPart: "must be an integer from 2 to 360"},
		{name: "phase bins without oscillation", set: []kv{{"output.phase_bins", "12"}}, key: "output.phase_bins", val: "12", msgPart: "only applies when the forcing has [[forcing.wave]] or [[forcing.tide]]"},
		{name: "modulus zero", set: with(without(blades, "canopy.blade_modulus"), kv{"canopy.blade_modulus", "0.0"}), key: "canopy.blade_modulus", val: "0.0", msgPart: "must be a finite number > 0 (Young's modulus E"},
		{name: "modulus negative", set: with(without(blades, "canopy.blade_modulus"), kv{"canopy.blade_modulus", "-1.0e9"}), key: "canopy.blade_modulus", val: "-1.0e9", msgPart: "> 0"},
		{name: "blades heavier than the fluid", set: with(without(blades, "canopy.blade_density"), kv{"canopy.blade_density", "1300.0"}), key: "canopy.blade_density", val: "1300.0", msgPart: "above the fluid density fluid.density = 1025"},
		{name: "blade density zero", set: with(without(blades, "canopy.blade_density"), kv{"canopy.blade_density", "0.0"}), key: "canopy.blade_density", val: "0.0", msgPart: "> 0"},
		{name: "no fluid density", set: without(blades, "fluid.density"), key: "fluid.density", msgPart: "flexible blades need the fluid density"},
		{name: "flexible cylinders", set: with(without(blades, "canopy.shape"), kv{"canopy.shape", `"cylinder"`}), key: "canopy.blade_modulus", val: "5.0e8", msgPart: `apply to flat blades only, and canopy.shape = "cylinder"`},
		{name: "flexible without a fixed C_D", set: with(blades, kv{"canopy.drag_law", `"linear"`}, kv{"canopy.linear_rate", "0.5"}), key: "canopy.blade_modulus", val: "5.0e8", msgPart: "needs a fixed drag coefficient"},
		{name: "thickness not below width", set: with(without(blades, "canopy.blade_thickness"), kv{"canopy.blade_thickness", "0.01"}), key: "canopy.blade_thickness", val: "0.01", msgPart: "must be less than the blade width canopy.diameter = 0.005"},
		{name: "flexible without width", set: without(blades, "canopy.diameter"), key: "canopy.diameter", msgPart: "flexible blades need the blade width b"},
		{name: "two of three", set: without(blades, "canopy.blade_density"), key: "canopy.blade_density", msgPart: "missing; flexible blades need"},
		{name: "fluid density negative", set: []kv{{"fluid.density", "-1000.0"}}, key: "fluid.density", val: "-1000.0", msgPart: "must be > 0 and < 20000"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) { checkRule(t, tt) })
	}
}

// TestWaveDefaults: waves and tides parse with their defaults, and the
// phase bins default to 12 under them.
func TestWaveDefaults(t *testing.T) {
	text, _ := build([]kv{{"forcing.wave[0].amplitude", "0.05"}, {"forcing.wave[0].period", "8.0"},
		{"forcing.wave[1].amplitude", "0.01"}, {"forcing.wave[1].period", "4.0"}, {"forcing.wave[1].phase", "90.0"},
		{"forcing.ramp", "16.0"}})
	c, err := Parse([]byte(text))
	if err != nil {
		t.Fatal(err)
	}
	f := c.Forcing
	if len(f.Waves) != 2 || f.Waves[1].Phase != 90 || f.Ramp != 16 || f.Waves[0].Period != 8 || !f.Oscillating() {
		t.Errorf("forcing %+v", f)
	}
	if c.Output.PhaseBins != defaultPhaseBins {
		t.Errorf("phase bins %d, want %d", c.Output.PhaseBins, defaultPhaseBins)
	}
	steady, err := Parse([]byte(mustBuild()))
	if err != nil {
		t.Fatal(err)
	}
	if steady.Output.PhaseBins != 0 || steady.Forcing.Oscillating() {
		t.Errorf("steady case: phase bins %d, oscillating %v", steady.Output.PhaseBins, steady.Forcing.Oscillating())
	}
}

func mustBuild() string {
	text, _ := build(nil)
	return text
}
