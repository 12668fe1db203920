package casefile

import (
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

// FuzzParse checks that Parse never panics, that every failure is a list
// of one-line problems, and that every case it accepts validates again and
// parses to the same Case a second time.
func FuzzParse(f *testing.F) {
	files, _ := filepath.Glob(filepath.Join("testdata", "*.toml"))
	for _, name := range files {
		text, err := os.ReadFile(name)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(text)
	}
	f.Add([]byte(Template()))
	text, _ := build(nil)
	f.Add([]byte(text))
	// Canopy shapes the decoder walks: rows, arrays of tables, both inline.
	for _, set := range [][]kv{
		{{"canopy.profile", "[[0, 4], [0.2, 4.0], [0.25, 0]]"}, {"initial.profile", `"drag-balanced"`}},
		{{"canopy.profile", `[[0.0, 1.0], [0.1], "x", [0.2, [1]]]`}},
		{{"canopy.height", "0.2"}, {"canopy.frontal_area", "4"}, {"canopy.patch", "[{ start = 1.8, end = 0.2 }, { start = 0.2, end = 1.8, edge_width = 0.1 }]"}},
		{{"canopy.height", "0.2"}, {"canopy.frontal_area", "4"}, {"canopy.patch[0].start", "0.5"}, {"canopy.patch[0].end", "1.0"}, {"canopy.patch[1].start", "0.9"}, {"canopy.patch[1].end", "0.1"}},
		{{"canopy.profile_file", `"meadow.csv"`}, {"canopy.drag_law", `"linear"`}, {"canopy.linear_rate", "0.5"}, {"turbulence.closure", `"none"`}},
		{{"canopy.height", "0.2"}, {"canopy.frontal_area", "4"}, {"canopy.drag_law", `"cylinder"`}, {"canopy.diameter", "0.006"}, {"time.spin_up", "2"}},
		// Arrays of strings: good, empty, repeated, mistyped entries.
		{{"output.fields", `["nu_t", "u"]`}, {"output.snapshot_every", "0"}, {"output.compression", "9"}, {"output.probes", "64"}},
		{{"output.fields", `[]`}, {"output.checkpoint_every", "11"}, {"output.checkpoint_wall_minutes", "0"}},
		{{"output.fields", `["u", "u", 3, ["w"], { p = 1 }, "vorticty"]`}, {"output.compression", "10"}, {"output.probes", "0"}},
		{{"output.fields", `"u"`}, {"output.snapshot_every", "-1"}, {"output.checkpoint_wall_minutes", "1440"}},
		// Arrays of scalar tables: good ones with inf capacities and
		// derived diffusivities, and broken ones.
		{{"canopy.height", "0.2"}, {"canopy.frontal_area", "4"}, {"canopy.shape", `"blade"`}, {"canopy.diameter", "0.005"},
			{"scalar[0].name", `"o2"`}, {"scalar[0].diffusivity", "1.76e-9"}, {"scalar[0].uptake", `"plate-laminar"`}, {"scalar[0].capacity", "inf"},
			{"scalar[0].bed", `"mat"`}, {"scalar[0].bed_capacity", "1e-5"}, {"scalar[0].surface_concentration", "0.01"},
			{"scalar[1].name", `"no3"`}, {"scalar[1].schmidt", "700"}, {"scalar[1].top", `"flux"`}, {"scalar[1].top_value", "-1e-7"},
			{"scalar[1].bed", `"flux"`}, {"scalar[1].bed_value", "2e-8"}, {"output.fields", `["u", "o2", "no3"]`}},
		{{"canopy.height", "0.2"}, {"canopy.frontal_area", "4"}, {"canopy.diameter", "0.006"},
			{"scalar[0].name", `"dye"`}, {"scalar[0].schmidt", "1e3"}, {"scalar[0].uptake", `"power-law"`}, {"scalar[0].capacity", "+inf"},
			{"scalar[0].power_alpha", "3e-5"}, {"scalar[0].power_exponent", "0.5"}, {"scalar[0].top", `"none"`}, {"scalar[0].source", "1e-4"},
			{"scalar[1].name", `"heat"`}, {"scalar[1].diffusivity", "1.4e-7"}, {"scalar[1].uptake", `"hilpert"`}, {"scalar[1].capacity", "1e-5"},
			{"scalar[1].bed", `"fixed"`}, {"scalar[1].bed_value", "0"}, {"turbulence.closure", `"none"`}},
		{{"scalar", `[{ name = "o2", diffusivity = 2e-9 }, { name = "o2", schmidt = 1e-300, uptake = "plate" }]`}},
		{{"scalar", "[]"}, {"output.fields", `["u", "o2"]`}},
		{{"scalar[0].name", `"U"`}, {"scalar[0].diffusivity", "2e-9"}, {"scalar[0].schmidt", "nan"}, {"scalar[0].bed", `"matt"`}, {"scalar[0].capacity", "-inf"},
			{"scalar[1].name", `"nu_t"`}, {"scalar[1].diffusivity", "5e-324"}, {"scalar[1].top", `"flux"`}, {"scalar[1].turbulent_schmidt", "0"}, {"output.fields", `["U", "nu_t"]`}},
		{{"scalar", `{ name = "o2" }`}},
		// Waves, tides, phase bins and flexible blades: good and broken.
		{{"forcing.wave[0].amplitude", "0.05"}, {"forcing.wave[0].period", "8"}, {"forcing.wave[1].amplitude", "-0.01"}, {"forcing.wave[1].period", "4"},
			{"forcing.wave[1].phase", "-90"}, {"forcing.ramp", "16"}, {"output.phase_bins", "24"}},
		{{"forcing.bulk_velocity", "0"}, {"forcing.tide", "[{ amplitude = 0.2, period = 600 }, { amplitude = 0, period = -1, phase = 720 }]"},
			{"forcing.tide_reverses", "true"}, {"output.phase_bins", "1"}},
		{{"canopy.height", "0.2"}, {"canopy.frontal_area", "4"}, {"canopy.shape", `"blade"`}, {"canopy.diameter", "0.005"}, {"fluid.density", "1025"},
			{"canopy.blade_modulus", "5e8"}, {"canopy.blade_thickness", "2e-4"}, {"canopy.blade_density", "900"}},
		{{"canopy.height", "0.2"}, {"canopy.frontal_area", "4"}, {"canopy.blade_modulus", "-1"}, {"canopy.blade_density", "2000"}, {"fluid.density", "nan"},
			{"forcing.wave", `{ amplitude = 1 }`}},
	} {
		text, _ := build(set)
		f.Add([]byte(text))
	}
	// Nesting beyond stricttoml.MaxDepth, refused before the TOML library
	// parses it.
	for _, s := range []string{
		"[domain]\nnx = " + strings.Repeat("[", 100000) + strings.Repeat("]", 100000) + "\n",
		"[canopy]\npatch = " + strings.Repeat("[{ start = ", 20000) + "1" + strings.Repeat("}]", 20000) + "\n",
		strings.Repeat("domain.", 30000) + "nx = 8\n",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, text []byte) {
		c, err := Parse(text)
		if err != nil {
			var es *Errors
			if !errors.As(err, &es) || len(es.Problems) == 0 {
				t.Fatalf("Parse error %v is not a non-empty *Errors", err)
			}
			for _, p := range es.Problems {
				if p.Msg == "" || p.Line < 0 {
					t.Errorf("problem without message or with a bad line: %+v", p)
				}
				if strings.ContainsAny(p.Error(), "\r\n") {
					t.Errorf("problem is not one line: %q", p.Error())
				}
			}
			return
		}
		if c.Text != string(text) {
			t.Fatal("Case.Text is not the input")
		}
		if err := c.Validate(); err != nil {
			t.Fatalf("parsed case does not validate:\n%v\ninput:\n%s", err, text)
		}
		again, err := Parse(text)
		if err != nil || !reflect.DeepEqual(c, again) {
			t.Fatalf("second parse differs: %v", err)
		}
	})
}
