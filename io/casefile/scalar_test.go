package casefile

import (
	"errors"
	"math"
	"path/filepath"
	"reflect"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"rollerbed/canopy"
)

// Keys of the scalar tests, on the base case (ν = 1e-6 m²/s, a no-slip
// bed, the Smagorinsky closure).
var (
	// oneScalar is a valid [[scalar]] with every default.
	oneScalar = []kv{{"scalar[0].name", `"o2"`}, {"scalar[0].diffusivity", "2e-9"}}
	// bladeCanopy and cylinderCanopy are valid canopies with an element
	// size; bareBlades has none.
	bladeCanopy    = []kv{{"canopy.height", "0.2"}, {"canopy.frontal_area", "4"}, {"canopy.shape", `"blade"`}, {"canopy.diameter", "0.005"}}
	cylinderCanopy = []kv{{"canopy.height", "0.2"}, {"canopy.frontal_area", "4"}, {"canopy.diameter", "0.006"}}
	bareBlades     = []kv{{"canopy.height", "0.2"}, {"canopy.frontal_area", "4"}, {"canopy.shape", `"blade"`}}
)

// keys joins groups of keys into one list for build.
func keys(groups ...[]kv) []kv {
	var out []kv
	for _, g := range groups {
		out = append(out, g...)
	}
	return out
}

// sc is a key of [[scalar]] element 0.
func sc(name, raw string) kv { return kv{"scalar[0]." + name, raw} }

// TestScalarRules has one row per rule of [[scalar]]: the change to a
// valid case, and the one problem it must give (key, value as written,
// part of the message), at the line of the key or of its table header.
func TestScalarRules(t *testing.T) {
	with := func(more ...kv) []kv { return keys(oneScalar, more) }
	blades := func(more ...kv) []kv { return keys(bladeCanopy, oneScalar, more) }
	cylinders := func(more ...kv) []kv { return keys(cylinderCanopy, oneScalar, more) }
	second := func(name string) []kv {
		return keys(oneScalar, []kv{{"scalar[1].name", name}, {"scalar[1].diffusivity", "1e-9"}})
	}
	plate := sc("uptake", `"plate-laminar"`)
	capacity := sc("capacity", "1e-5")
	mat := sc("bed", `"mat"`)
	power := sc("uptake", `"power-law"`)
	tests := []rule{
		// name
		{name: "name missing", set: []kv{sc("diffusivity", "2e-9")}, key: "scalar[0].name", msgPart: `missing; required in every [[scalar]]: the name of the scalar (it names the field in fields.h5, in output.fields and in the tables), which must start with a lowercase letter and hold only lowercase letters, digits and _, at most 32 characters; add e.g. name = "oxygen" under the 1st [[scalar]] header`},
		{name: "name upper case", set: with(sc("name", `"O2"`)), key: "scalar[0].name", val: `"O2"`, msgPart: `must start with a lowercase letter and hold only lowercase letters, digits and _, at most 32 characters (it names the field in fields.h5, in output.fields and in the tables); e.g. name = "o2"`},
		{name: "name with a hyphen", set: with(sc("name", `"no-3"`)), key: "scalar[0].name", val: `"no-3"`, msgPart: `e.g. name = "no_3"`},
		{name: "name with a space", set: with(sc("name", `"Dissolved oxygen"`)), key: "scalar[0].name", val: `"Dissolved oxygen"`, msgPart: `e.g. name = "dissolved_oxygen"`},
		{name: "name starting with a digit", set: with(sc("name", `"13c"`)), key: "scalar[0].name", val: `"13c"`, msgPart: `e.g. name = "c13c"`},
		{name: "name empty", set: with(sc("name", `""`)), key: "scalar[0].name", val: `""`, msgPart: `e.g. name = "tracer"`},
		{name: "name too long", set: with(sc("name", `"`+strings.Repeat("a", 33)+`"`)), key: "scalar[0].name", val: `"` + strings.Repeat("a", 33) + `"`, msgPart: `at most 32 characters`},
		{name: "name not a string", set: with(sc("name", "2")), key: "scalar[0].name", val: "2", msgPart: "must be a string, not an integer"},
		{name: "name of a flow field", set: with(sc("name", `"u"`)), key: "scalar[0].name", val: `"u"`, msgPart: `is the name of a flow field (u, w, p, vorticity, nu_t), which fields.h5 and output.fields already use; give the scalar another name, e.g. name = "u_tracer"`},
		{name: "name nu_t", set: with(sc("name", `"nu_t"`)), key: "scalar[0].name", val: `"nu_t"`, msgPart: "is the name of a flow field"},
		{name: "name of a slab flow field", set: with(sc("name", `"q_criterion"`)), key: "scalar[0].name", val: `"q_criterion"`, msgPart: `is the name of a flow field of a slab (v, q_criterion), which fields.h5 uses`},
		{name: "name of the span coordinate", set: with(sc("name", `"y"`)), key: "scalar[0].name", val: `"y"`, msgPart: "is kept by fields.h5 for its coordinates"},
		{name: "duplicate names", set: second(`"o2"`), key: "scalar[1].name", val: `"o2"`, msgPart: "repeats scalar[0].name (the 1st [[scalar]]); each scalar needs a name of its own: rename one of them"},

		// diffusivity and schmidt
		{name: "neither diffusivity nor schmidt", set: []kv{sc("name", `"o2"`)}, key: "scalar[0].diffusivity", msgPart: "missing; required: the molecular diffusivity D in m²/s, 0 < D < 0.001, or instead the Schmidt number Sc = ν/D as schmidt; add e.g. diffusivity = 1.76e-9 (oxygen in water at 20 °C) under the 1st [[scalar]] header"},
		{name: "diffusivity and schmidt", set: with(sc("schmidt", "500")), key: "scalar[0].schmidt", val: "500", msgPart: "scalar[0].diffusivity and scalar[0].schmidt are both given; give exactly one"},
		{name: "diffusivity zero", set: with(sc("diffusivity", "0")), key: "scalar[0].diffusivity", val: "0", msgPart: "must be > 0 and < 0.001 (molecular diffusivity D, m²/s); e.g. diffusivity = 1.76e-9"},
		{name: "diffusivity negative", set: with(sc("diffusivity", "-2e-9")), key: "scalar[0].diffusivity", val: "-2e-9", msgPart: "must be > 0 and < 0.001"},
		{name: "diffusivity too large", set: with(sc("diffusivity", "1e-3")), key: "scalar[0].diffusivity", val: "1e-3", msgPart: "must be > 0 and < 0.001"},
		{name: "diffusivity nan", set: with(sc("diffusivity", "nan")), key: "scalar[0].diffusivity", val: "nan", msgPart: "must be > 0 and < 0.001"},
		{name: "diffusivity as string", set: with(sc("diffusivity", `"2e-9 m2/s"`)), key: "scalar[0].diffusivity", val: `"2e-9 m2/s"`, msgPart: "must be a number, not a string"},
		{name: "diffusivity too small to derive Sc", set: with(sc("diffusivity", "1e-310")), key: "scalar[0].diffusivity", val: "1e-310", msgPart: "is too small: Sc = ν/D"},
		{name: "schmidt zero", set: []kv{sc("name", `"o2"`), sc("schmidt", "0")}, key: "scalar[0].schmidt", val: "0", msgPart: "must be a finite number > 0 (Schmidt number Sc = ν/D, dimensionless)"},
		{name: "schmidt infinite", set: []kv{sc("name", `"o2"`), sc("schmidt", "inf")}, key: "scalar[0].schmidt", val: "inf", msgPart: "must be a finite number > 0"},
		{name: "schmidt too small", set: []kv{sc("name", `"o2"`), sc("schmidt", "1e-4")}, key: "scalar[0].schmidt", val: "1e-4", msgPart: "gives a diffusivity D = ν/Sc = 0.01 m²/s with fluid.viscosity = 1e-6 m²/s; D must be > 0 and < 0.001 m²/s, so Sc must be > 0.001"},

		// turbulent_schmidt, initial, source
		{name: "turbulent schmidt zero", set: with(sc("turbulent_schmidt", "0")), key: "scalar[0].turbulent_schmidt", val: "0", msgPart: "must be > 0 and <= 10 (turbulent Schmidt number Sc_t of the subgrid flux ν_t/Sc_t, dimensionless); values of 0.5 to 1 are in use"},
		{name: "turbulent schmidt too large", set: with(sc("turbulent_schmidt", "11")), key: "scalar[0].turbulent_schmidt", val: "11", msgPart: "must be > 0 and <= 10"},
		{name: "turbulent schmidt without closure", set: with(sc("turbulent_schmidt", "0.7"), kv{"turbulence.closure", `"none"`}), key: "scalar[0].turbulent_schmidt", val: "0.7", msgPart: `only applies when turbulence.closure = "smagorinsky"`},
		{name: "initial negative", set: with(sc("initial", "-0.1")), key: "scalar[0].initial", val: "-0.1", msgPart: "must be a finite number >= 0 (uniform initial concentration, unit of the scalar)"},
		{name: "initial infinite", set: with(sc("initial", "inf")), key: "scalar[0].initial", val: "inf", msgPart: "must be a finite number >= 0"},
		{name: "source infinite", set: with(sc("source", "-inf")), key: "scalar[0].source", val: "-inf", msgPart: "must be a finite number (uniform volume source, unit of the scalar per s; < 0 for a sink)"},
		{name: "source nan", set: with(sc("source", "nan")), key: "scalar[0].source", val: "nan", msgPart: "must be a finite number"},

		// top
		{name: "top unknown", set: with(sc("top", `"fixd"`)), key: "scalar[0].top", val: `"fixd"`, msgPart: `must be one of "fixed", "flux", "none"; did you mean "fixed"?`},
		{name: "top mat", set: with(sc("top", `"mat"`)), key: "scalar[0].top", val: `"mat"`, msgPart: "a mat is for the bed only"},
		{name: "top flux without value", set: with(sc("top", `"flux"`)), key: "scalar[0].top_value", msgPart: `missing; required with scalar[0].top = "flux": the downward supply into the domain through the top in unit·m/s`},
		{name: "top flux infinite", set: with(sc("top", `"flux"`), sc("top_value", "inf")), key: "scalar[0].top_value", val: "inf", msgPart: "must be a finite number (downward supply through the top"},
		{name: "top fixed negative", set: with(sc("top_value", "-1")), key: "scalar[0].top_value", val: "-1", msgPart: "must be a finite number >= 0 (concentration held at the top"},
		{name: "top value without top", set: with(sc("top", `"none"`), sc("top_value", "0.2")), key: "scalar[0].top_value", val: "0.2", msgPart: `only applies when scalar[0].top = "fixed" or "flux"`},
		{name: "top value from a bad initial", set: with(sc("initial", "-1")), key: "scalar[0].initial", val: "-1", msgPart: ">= 0"},

		// bed
		{name: "bed unknown", set: with(sc("bed", `"matt"`)), key: "scalar[0].bed", val: `"matt"`, msgPart: `must be one of "none", "mat", "flux", "fixed"; did you mean "mat"?`},
		{name: "bed mat without capacity", set: with(mat), key: "scalar[0].bed_capacity", msgPart: `missing; required with scalar[0].bed = "mat": the uptake capacity k_s,bed of the mat in m/s, > 0, or inf for a perfect sink; add e.g. bed_capacity = 1.0e-5 under the 1st [[scalar]] header`},
		{name: "bed capacity zero", set: with(mat, sc("bed_capacity", "0")), key: "scalar[0].bed_capacity", val: "0", msgPart: "must be > 0, or inf for a perfect sink (uptake capacity k_s,bed of the mat, m/s)"},
		{name: "bed capacity nan", set: with(mat, sc("bed_capacity", "nan")), key: "scalar[0].bed_capacity", val: "nan", msgPart: "must be > 0, or inf"},
		{name: "bed capacity minus infinity", set: with(mat, sc("bed_capacity", "-inf")), key: "scalar[0].bed_capacity", val: "-inf", msgPart: "must be > 0, or inf"},
		{name: "bed capacity without mat", set: with(sc("bed_capacity", "1e-5")), key: "scalar[0].bed_capacity", val: "1e-5", msgPart: `only applies when scalar[0].bed = "mat"`},
		{name: "mat on a free-slip bed", set: with(mat, sc("bed_capacity", "1e-5"), kv{"bed.condition", `"free-slip"`}), key: "scalar[0].bed", val: `"mat"`, msgPart: `needs a bed with shear stress`},
		{name: "bed flux without value", set: with(sc("bed", `"flux"`)), key: "scalar[0].bed_value", msgPart: `missing; required with scalar[0].bed = "flux": the flux out of the fluid into the bed in unit·m/s`},
		{name: "bed flux nan", set: with(sc("bed", `"flux"`), sc("bed_value", "nan")), key: "scalar[0].bed_value", val: "nan", msgPart: "must be a finite number (flux out of the fluid into the bed"},
		{name: "bed fixed without value", set: with(sc("bed", `"fixed"`)), key: "scalar[0].bed_value", msgPart: `missing; required with scalar[0].bed = "fixed": the concentration held at the bed`},
		{name: "bed fixed negative", set: with(sc("bed", `"fixed"`), sc("bed_value", "-0.1")), key: "scalar[0].bed_value", val: "-0.1", msgPart: "must be a finite number >= 0 (concentration held at the bed"},
		{name: "bed value without condition", set: with(sc("bed_value", "0.1")), key: "scalar[0].bed_value", val: "0.1", msgPart: `only applies when scalar[0].bed = "flux" or "fixed"`},
		{name: "bed value with mat", set: with(mat, sc("bed_capacity", "1e-5"), sc("bed_value", "0.1")), key: "scalar[0].bed_value", val: "0.1", msgPart: "only applies when"},

		// uptake
		{name: "uptake unknown", set: blades(sc("uptake", `"hilbert"`)), key: "scalar[0].uptake", val: `"hilbert"`, msgPart: `must be one of "none", "hilpert", "churchill-bernstein", "plate-laminar", "plate", "power-law"; did you mean "hilpert"?`},
		{name: "uptake near miss", set: blades(sc("uptake", `"plate_laminar"`)), key: "scalar[0].uptake", val: `"plate_laminar"`, msgPart: `did you mean "plate-laminar"?`},
		{name: "uptake without canopy", set: with(plate, capacity), key: "scalar[0].uptake", val: `"plate-laminar"`, msgPart: `needs a [canopy] table: the canopy elements take up the scalar; add a [canopy] table, or set uptake = "none"`},
		{name: "power law without canopy", set: with(power, capacity), key: "scalar[0].uptake", val: `"power-law"`, msgPart: "needs a [canopy] table"},
		{name: "cylinder correlation on blades", set: blades(sc("uptake", `"hilpert"`), capacity), key: "scalar[0].uptake", val: `"hilpert"`, msgPart: `is a correlation for circular cylinders, but canopy.shape = "blade"; for blades use uptake = "plate-laminar" or "plate"`},
		{name: "churchill-bernstein on blades", set: blades(sc("uptake", `"churchill-bernstein"`), capacity), key: "scalar[0].uptake", val: `"churchill-bernstein"`, msgPart: "is a correlation for circular cylinders"},
		{name: "plate correlation on cylinders", set: cylinders(sc("uptake", `"plate"`), capacity), key: "scalar[0].uptake", val: `"plate"`, msgPart: `is a correlation for flat plates (blades), but canopy.shape = "cylinder"; for cylinders use uptake = "hilpert" or "churchill-bernstein"`},
		{name: "cylinder correlation needs diameter", set: keys([]kv{{"canopy.height", "0.2"}, {"canopy.frontal_area", "4"}}, oneScalar, []kv{sc("uptake", `"churchill-bernstein"`), capacity}), key: "canopy.diameter", msgPart: `missing; required with scalar[0].uptake = "churchill-bernstein": the cylinder diameter d in m, > 0, which sets the element Reynolds number |u|·d/ν of the uptake correlation; add e.g. diameter = 0.006 under [canopy]`},
		{name: "plate correlation needs diameter", set: keys(bareBlades, oneScalar, []kv{plate, capacity}), key: "canopy.diameter", msgPart: `missing; required with scalar[0].uptake = "plate-laminar": the blade width b in m`},
		{name: "capacity missing", set: blades(plate), key: "scalar[0].capacity", msgPart: `missing; required with scalar[0].uptake = "plate-laminar": the uptake capacity k_s of the element surfaces in m/s, > 0, or inf for a perfect sink; add e.g. capacity = 1.0e-5 under the 1st [[scalar]] header`},
		{name: "capacity zero", set: blades(plate, sc("capacity", "0")), key: "scalar[0].capacity", val: "0", msgPart: "must be > 0, or inf for a perfect sink (uptake capacity k_s of the element surfaces, m/s); e.g. capacity = 1.0e-5"},
		{name: "capacity negative", set: blades(plate, sc("capacity", "-1e-5")), key: "scalar[0].capacity", val: "-1e-5", msgPart: "must be > 0, or inf"},
		{name: "capacity nan", set: blades(plate, sc("capacity", "nan")), key: "scalar[0].capacity", val: "nan", msgPart: "must be > 0, or inf"},
		{name: "capacity without uptake", set: blades(capacity), key: "scalar[0].capacity", val: "1e-5", msgPart: `only applies when scalar[0].uptake names an uptake law (the canopy elements take up the scalar)`},
		{name: "power law without alpha", set: blades(power, capacity, sc("power_exponent", "0.5")), key: "scalar[0].power_alpha", msgPart: `missing; required with scalar[0].uptake = "power-law": the coefficient α of the power law k_bl = α·|u|^n in m^(1-n)·s^(n-1), > 0`},
		{name: "power law without exponent", set: blades(power, capacity, sc("power_alpha", "3e-5")), key: "scalar[0].power_exponent", msgPart: `missing; required with scalar[0].uptake = "power-law": the exponent n of the power law k_bl = α·|u|^n, dimensionless, 0 <= n <= 2`},
		{name: "power alpha zero", set: blades(power, capacity, sc("power_alpha", "0"), sc("power_exponent", "0.5")), key: "scalar[0].power_alpha", val: "0", msgPart: "must be a finite number > 0 (coefficient α of the power law k_bl = α·|u|^n, m^(1-n)·s^(n-1))"},
		{name: "power exponent too large", set: blades(power, capacity, sc("power_alpha", "3e-5"), sc("power_exponent", "2.5")), key: "scalar[0].power_exponent", val: "2.5", msgPart: "must be from 0 to 2 (exponent n of the power law"},
		{name: "power exponent negative", set: blades(power, capacity, sc("power_alpha", "3e-5"), sc("power_exponent", "-0.5")), key: "scalar[0].power_exponent", val: "-0.5", msgPart: "must be from 0 to 2"},
		{name: "power alpha with a correlation", set: blades(plate, capacity, sc("power_alpha", "3e-5")), key: "scalar[0].power_alpha", val: "3e-5", msgPart: `only applies when scalar[0].uptake = "power-law"`},
		{name: "power exponent without uptake", set: with(sc("power_exponent", "0.5")), key: "scalar[0].power_exponent", val: "0.5", msgPart: "only applies when scalar[0].uptake names an uptake law"},

		// surface_concentration
		{name: "surface concentration negative", set: blades(plate, capacity, sc("surface_concentration", "-0.1")), key: "scalar[0].surface_concentration", val: "-0.1", msgPart: "must be a finite number >= 0 (concentration c_w at the element and mat surfaces, unit of the scalar)"},
		{name: "surface concentration without sink", set: with(sc("surface_concentration", "0.1")), key: "scalar[0].surface_concentration", val: "0.1", msgPart: `only applies when the scalar is taken up: scalar[0].uptake names an uptake law, or scalar[0].bed = "mat"`},

		// the array itself, unknown keys and output.fields
		{name: "unknown scalar key", set: with(sc("capacty", "1e-5")), key: "scalar[0].capacty", val: "1e-5", msgPart: "unknown key in the 1st [[scalar]] (scalar[0]); did you mean scalar[0].capacity? (known here: name, diffusivity, schmidt, turbulent_schmidt, initial, source, top, top_value, bed, bed_value, bed_capacity, uptake, capacity, power_alpha, power_exponent, surface_concentration)"},
		{name: "scalar key in another table", set: with(kv{"canopy.capacity", "1e-5"}, kv{"canopy.height", "0.2"}, kv{"canopy.frontal_area", "4"}), key: "canopy.capacity", val: "1e-5", msgPart: "did you mean scalar.capacity?"},
		{name: "scalar as a table", set: []kv{{"scalar", `{ name = "o2", diffusivity = 2e-9 }`}}, key: "scalar", val: `{ name = "o2", diffusivity = 2e-9 }`, msgPart: "must be an array of tables, not a table; write each element under its own [[scalar]] header"},
		{name: "output field near a scalar", set: with(sc("name", `"oxygen"`), kv{"output.fields", `["u", "oxygn"]`}), key: "output.fields[1]", val: `"oxygn"`, msgPart: `must be one of "u", "w", "p", "vorticity", "nu_t", "oxygen"; did you mean "oxygen"?`},
		{name: "output field of a missing scalar", set: []kv{{"output.fields", `["u", "o2"]`}}, key: "output.fields[1]", val: `"o2"`, msgPart: `must be one of "u", "w", "p", "vorticity", "nu_t"; correct the name`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) { checkRule(t, tt) })
	}
}

// TestScalarAccepted has one row per scalar setting that must parse, with
// the Scalars it must give (defaults filled in) on the base case, where
// ν = 1e-6 m²/s.
func TestScalarAccepted(t *testing.T) {
	nu := 1e-6 // a variable, so that ν/D rounds as in Parse
	// def is oneScalar with every default filled in.
	def := Scalar{Name: "o2", Diffusivity: 2e-9, Schmidt: nu / 2e-9, TurbulentSchmidt: 1, Top: ScalarFixed, Bed: ScalarNoFlux, Uptake: UptakeNone}
	with := func(edit func(s *Scalar)) []Scalar {
		s := def
		edit(&s)
		return []Scalar{s}
	}
	inf := math.Inf(1)
	tests := []struct {
		name string
		set  []kv
		want []Scalar
	}{
		{"defaults", oneScalar, []Scalar{def}},
		{"schmidt instead of diffusivity", []kv{sc("name", `"o2"`), sc("schmidt", "500")},
			with(func(s *Scalar) { s.Schmidt, s.Diffusivity = 500, nu/500 })},
		{"diffusivity as an integer", []kv{sc("name", `"o2"`), sc("schmidt", "1")},
			with(func(s *Scalar) { s.Schmidt, s.Diffusivity = 1, nu })},
		{"own turbulent schmidt", keys(oneScalar, []kv{sc("turbulent_schmidt", "0.5")}), with(func(s *Scalar) { s.TurbulentSchmidt = 0.5 })},
		{"largest turbulent schmidt", keys(oneScalar, []kv{sc("turbulent_schmidt", "10")}), with(func(s *Scalar) { s.TurbulentSchmidt = 10 })},
		{"no closure, no turbulent schmidt", keys(oneScalar, []kv{{"turbulence.closure", `"none"`}}), with(func(s *Scalar) { s.TurbulentSchmidt = 0 })},
		{"top value defaults to initial", keys(oneScalar, []kv{sc("initial", "0.25")}), with(func(s *Scalar) { s.Initial, s.TopValue = 0.25, 0.25 })},
		{"own top value", keys(oneScalar, []kv{sc("initial", "0.25"), sc("top_value", "0.3")}), with(func(s *Scalar) { s.Initial, s.TopValue = 0.25, 0.3 })},
		{"top flux, a loss", keys(oneScalar, []kv{sc("top", `"flux"`), sc("top_value", "-1e-7")}), with(func(s *Scalar) { s.Top, s.TopValue = ScalarFlux, -1e-7 })},
		{"closed top", keys(oneScalar, []kv{sc("top", `"none"`), sc("initial", "1")}), with(func(s *Scalar) { s.Top, s.Initial = ScalarNoFlux, 1 })},
		{"volume sink", keys(oneScalar, []kv{sc("source", "-1e-6")}), with(func(s *Scalar) { s.Source = -1e-6 })},
		{"bed mat", keys(oneScalar, []kv{sc("bed", `"mat"`), sc("bed_capacity", "2e-6"), sc("surface_concentration", "0.01")}),
			with(func(s *Scalar) { s.Bed, s.BedCapacity, s.SurfaceConcentration = ScalarMat, 2e-6, 0.01 })},
		{"bed mat, perfect sink (inf)", keys(oneScalar, []kv{sc("bed", `"mat"`), sc("bed_capacity", "inf")}),
			with(func(s *Scalar) { s.Bed, s.BedCapacity = ScalarMat, inf })},
		{"bed mat on a rough bed", keys(oneScalar, []kv{sc("bed", `"mat"`), sc("bed_capacity", "+inf"), {"bed.condition", `"rough"`}, {"bed.roughness", "0.001"}}),
			with(func(s *Scalar) { s.Bed, s.BedCapacity = ScalarMat, inf })},
		{"bed flux, a release", keys(oneScalar, []kv{sc("bed", `"flux"`), sc("bed_value", "-2e-8")}), with(func(s *Scalar) { s.Bed, s.BedValue = ScalarFlux, -2e-8 })},
		{"bed fixed", keys(oneScalar, []kv{sc("bed", `"fixed"`), sc("bed_value", "0")}), with(func(s *Scalar) { s.Bed = ScalarFixed })},
		{"blades, plate-laminar", keys(bladeCanopy, oneScalar, []kv{sc("uptake", `"plate-laminar"`), sc("capacity", "1e-5")}),
			with(func(s *Scalar) { s.Uptake, s.Capacity = canopy.TransferPlateLaminar, 1e-5 })},
		{"blades, plate, perfect sink (inf)", keys(bladeCanopy, oneScalar, []kv{sc("uptake", `"plate"`), sc("capacity", "inf")}),
			with(func(s *Scalar) { s.Uptake, s.Capacity = canopy.TransferPlate, inf })},
		{"cylinders, hilpert", keys(cylinderCanopy, oneScalar, []kv{sc("uptake", `"hilpert"`), sc("capacity", "1e-5")}),
			with(func(s *Scalar) { s.Uptake, s.Capacity = canopy.TransferHilpert, 1e-5 })},
		{"cylinders, churchill-bernstein, cylinder drag law", keys(cylinderCanopy, oneScalar, []kv{{"canopy.drag_law", `"cylinder"`}, sc("uptake", `"churchill-bernstein"`), sc("capacity", "1e-5")}),
			with(func(s *Scalar) { s.Uptake, s.Capacity = canopy.TransferChurchillBernstein, 1e-5 })},
		{"power law on elements without a size", keys(bareBlades, oneScalar, []kv{sc("uptake", `"power-law"`), sc("capacity", "1e-5"), sc("power_alpha", "3e-5"), sc("power_exponent", "0")}),
			with(func(s *Scalar) { s.Uptake, s.Capacity, s.PowerAlpha = canopy.TransferPowerLaw, 1e-5, 3e-5 })},
		{"power law, largest exponent", keys(bareBlades, oneScalar, []kv{sc("uptake", `"power-law"`), sc("capacity", "1e-5"), sc("power_alpha", "3e-5"), sc("power_exponent", "2")}),
			with(func(s *Scalar) {
				s.Uptake, s.Capacity, s.PowerAlpha, s.PowerExponent = canopy.TransferPowerLaw, 1e-5, 3e-5, 2
			})},
		{"uptake none named, without canopy", keys(oneScalar, []kv{sc("uptake", `"none"`)}), []Scalar{def}},
		{"two scalars", keys(oneScalar, []kv{{"scalar[1].name", `"dye_2"`}, {"scalar[1].schmidt", "1000"}}),
			[]Scalar{def, {Name: "dye_2", Diffusivity: nu / 1000, Schmidt: 1000, TurbulentSchmidt: 1, Top: ScalarFixed, Bed: ScalarNoFlux, Uptake: UptakeNone}}},
		{"inline array of tables", []kv{{"scalar", `[{ name = "o2", diffusivity = 2e-9 }, { name = "no3", diffusivity = 1e-9, top = "none" }]`}},
			[]Scalar{def, {Name: "no3", Diffusivity: 1e-9, Schmidt: nu / 1e-9, TurbulentSchmidt: 1, Top: ScalarNoFlux, Bed: ScalarNoFlux, Uptake: UptakeNone}}},
		{"no scalars, written as an empty array", []kv{{"scalar", "[]"}}, []Scalar{}},
		{"no scalars", nil, nil},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			text, _ := build(tt.set)
			c, err := Parse([]byte(text))
			if err != nil {
				t.Fatalf("%v\ntext:\n%s", err, text)
			}
			if !reflect.DeepEqual(c.Scalars, tt.want) {
				t.Errorf("scalars\n got %+v\nwant %+v", c.Scalars, tt.want)
			}
			if err := c.Validate(); err != nil {
				t.Errorf("parsed case does not validate: %v", err)
			}
		})
	}
}

// TestScalarLines checks that problems inside [[scalar]] tables, and
// inside an inline array of them, carry the line of the key itself, or of
// the element's header for a missing key, and name the element from 0.
func TestScalarLines(t *testing.T) {
	const text = `[domain]
length = 2.0
depth = 0.5
nx = 64
nz = 32

[fluid]
viscosity = 1.0e-6

[forcing]
gradient = 1.0e-5

[time]
duration = 10.0

[canopy]
height = 0.2
frontal_area = 4.0
shape = "blade"
diameter = 0.005

[[scalar]]
name = "o2"
diffusivity = 2e-9
uptake = "plate-laminar"
capacity = 1e-5

[[scalar]]           # line 28: bed_capacity is missing
name = "no3"
# a comment
schmidt = 600
uptake = "plate"
capacity = -1e-5     # line 33
bed = "mat"

[[scalar]]
name = "o2"          # line 37: a repeat
diffusivity = 2e-9
`
	_, err := Parse([]byte(text))
	var es *Errors
	if !errors.As(err, &es) {
		t.Fatalf("got %v", err)
	}
	want := []struct {
		key, val string
		line     int
	}{
		{"scalar[1].bed_capacity", "", 28},
		{"scalar[1].capacity", "-1e-5", 33},
		{"scalar[2].name", `"o2"`, 37},
	}
	if len(es.Problems) != len(want) {
		t.Fatalf("got %d problems, want %d:\n%v", len(es.Problems), len(want), err)
	}
	for i, w := range want {
		p := es.Problems[i]
		if p.Key != w.key || p.Value != w.val || p.Line != w.line {
			t.Errorf("problem %d: %q (line %d), want key %s = %s at line %d", i, p.Error(), p.Line, w.key, w.val, w.line)
		}
	}

	// The same mistakes in an inline array at the top of the file, one
	// element a line.
	inline := `scalar = [
  { name = "o2", diffusivity = 2e-9 },
  { name = "no3", schmidt = 600, bed = "mat" },
  { name = "o2", diffusivity = 2e-9 },
]

` + text[:strings.Index(text, "[[scalar]]")]
	const header = 1
	_, err = Parse([]byte(inline))
	if !errors.As(err, &es) || len(es.Problems) != 2 {
		t.Fatalf("inline array: got %v, want 2 problems\n%s", err, inline)
	}
	for i, w := range []struct {
		key  string
		line int
	}{{"scalar[1].bed_capacity", header + 2}, {"scalar[2].name", header + 3}} {
		if p := es.Problems[i]; p.Key != w.key || p.Line != w.line {
			t.Errorf("inline array, problem %d: %q at line %d, want %s at line %d", i, p.Error(), p.Line, w.key, w.line)
		}
	}
}

// codeScalar returns a valid scalar for codeCase (ν = 1e-6 m²/s), built in
// code with every field set.
func codeScalar() Scalar {
	return Scalar{Name: "oxygen", Diffusivity: 2e-9, Schmidt: 500, TurbulentSchmidt: 1, Initial: 0.2,
		Top: ScalarFixed, TopValue: 0.2, Bed: ScalarMat, BedCapacity: 1e-5, Uptake: UptakeNone}
}

// TestValidateScalars edits a valid case built in code the way a sweep
// would, and expects one problem, without a line, for the key named.
func TestValidateScalars(t *testing.T) {
	base := codeCase()
	base.Scalars = []Scalar{codeScalar()}
	if err := base.Validate(); err != nil {
		t.Fatalf("case built in code does not validate: %v", err)
	}
	blades := &Canopy{Height: 0.2, FrontalArea: 4, Shape: ShapeBlade, Diameter: 0.005, DragCoefficient: 1, DragLaw: DragFixed}
	tests := []struct {
		name string
		edit func(c *Case, s *Scalar)
		key  string
	}{
		{"diffusivity swept without schmidt", func(c *Case, s *Scalar) { s.Diffusivity = 1e-9 }, "scalar[0].schmidt"},
		{"viscosity swept without schmidt", func(c *Case, s *Scalar) { c.Fluid.Viscosity = 1.3e-6 }, "scalar[0].schmidt"},
		{"no schmidt", func(c *Case, s *Scalar) { s.Schmidt = 0 }, "scalar[0].schmidt"},
		{"no diffusivity", func(c *Case, s *Scalar) { s.Diffusivity = 0 }, "scalar[0].diffusivity"},
		{"empty name", func(c *Case, s *Scalar) { s.Name = "" }, "scalar[0].name"},
		{"flow field name", func(c *Case, s *Scalar) { s.Name = FieldVorticity }, "scalar[0].name"},
		{"empty top", func(c *Case, s *Scalar) { s.Top = "" }, "scalar[0].top"},
		{"empty bed", func(c *Case, s *Scalar) { s.Bed = "" }, "scalar[0].bed"},
		{"empty uptake", func(c *Case, s *Scalar) { s.Uptake = "" }, "scalar[0].uptake"},
		{"no turbulent schmidt", func(c *Case, s *Scalar) { s.TurbulentSchmidt = 0 }, "scalar[0].turbulent_schmidt"},
		{"turbulent schmidt without closure", func(c *Case, s *Scalar) {
			c.Turbulence = Turbulence{Closure: ClosureNone}
		}, "scalar[0].turbulent_schmidt"},
		{"top value with a closed top", func(c *Case, s *Scalar) { s.Top = ScalarNoFlux }, "scalar[0].top_value"},
		{"no mat capacity", func(c *Case, s *Scalar) { s.BedCapacity = 0 }, "scalar[0].bed_capacity"},
		{"mat capacity without mat", func(c *Case, s *Scalar) { s.Bed = ScalarNoFlux }, "scalar[0].bed_capacity"},
		{"uptake without canopy", func(c *Case, s *Scalar) { s.Uptake, s.Capacity = canopy.TransferPlate, 1e-5 }, "scalar[0].uptake"},
		{"uptake without capacity", func(c *Case, s *Scalar) { c.Canopy, s.Uptake = blades, canopy.TransferPlate }, "scalar[0].capacity"},
		{"uptake on blades without width", func(c *Case, s *Scalar) {
			cp := *blades
			cp.Diameter = 0
			c.Canopy, s.Uptake, s.Capacity = &cp, canopy.TransferPlateLaminar, 1e-5
		}, "canopy.diameter"},
		{"power law without alpha (n = 0 is valid)", func(c *Case, s *Scalar) {
			c.Canopy, s.Uptake, s.Capacity = blades, canopy.TransferPowerLaw, 1e-5
		}, "scalar[0].power_alpha"},
		{"surface concentration without a sink", func(c *Case, s *Scalar) { s.Bed, s.BedCapacity, s.SurfaceConcentration = ScalarNoFlux, 0, 0.1 }, "scalar[0].surface_concentration"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			c := codeCase()
			c.Scalars = []Scalar{codeScalar()}
			tt.edit(c, &c.Scalars[0])
			err := c.Validate()
			var es *Errors
			if !errors.As(err, &es) || len(es.Problems) != 1 || es.Problems[0].Key != tt.key || es.Problems[0].Line != 0 {
				t.Errorf("Validate() = %v, want one problem for %s without a line", err, tt.key)
			}
		})
	}

	// Sweeping values within their ranges keeps the case valid.
	c := codeCase()
	s := codeScalar()
	s.Diffusivity, s.Schmidt = 1e-9, 1000
	s.Uptake, s.Capacity, s.BedCapacity = canopy.TransferPlate, math.Inf(1), math.Inf(1)
	second := codeScalar()
	second.Name, second.Bed, second.BedCapacity = "dye", ScalarFlux, 0
	second.Schmidt = c.Fluid.Viscosity / second.Diffusivity
	c.Canopy = blades
	c.Scalars = []Scalar{s, second}
	if err := c.Validate(); err != nil {
		t.Errorf("valid edit: %v", err)
	}
	// A repeated name is one problem, on the second.
	c.Scalars[1].Name = "oxygen"
	var es *Errors
	if err := c.Validate(); !errors.As(err, &es) || len(es.Problems) != 1 || es.Problems[0].Key != "scalar[1].name" {
		t.Errorf("repeated name: Validate() = %v", err)
	}
}

func TestFieldNamesWithScalars(t *testing.T) {
	c := codeCase()
	c.Scalars = []Scalar{{Name: "oxygen"}, {Name: "u"}, {Name: ""}, {Name: "no3"}, {Name: "oxygen"}}
	c.Scalars = append(c.Scalars, Scalar{Name: "NO3"}, Scalar{Name: "dye"})
	want := []string{"u", "w", "p", "vorticity", "nu_t", "oxygen", "no3", "dye"}
	if got := c.FieldNames(); !reflect.DeepEqual(got, want) {
		t.Errorf("FieldNames() = %v, want %v (flow fields, then each valid scalar name once)", got, want)
	}

	// Parse: the default output.fields holds every field, scalars too,
	// and output.fields may list scalars.
	two := keys(oneScalar, []kv{{"scalar[1].name", `"dye"`}, {"scalar[1].diffusivity", "1e-9"}})
	text, _ := build(two)
	parsed, err := Parse([]byte(text))
	if err != nil {
		t.Fatal(err)
	}
	if want := []string{"u", "w", "p", "vorticity", "nu_t", "o2", "dye"}; !reflect.DeepEqual(parsed.Output.Fields, want) {
		t.Errorf("default output.fields = %v, want %v", parsed.Output.Fields, want)
	}
	for _, raw := range []string{`["dye"]`, `["o2", "u"]`, `["vorticity", "dye", "o2"]`} {
		text, _ := build(keys(two, []kv{{"output.fields", raw}}))
		if _, err := Parse([]byte(text)); err != nil {
			t.Errorf("fields = %s: %v", raw, err)
		}
	}
	// A scalar listed twice is one problem.
	text, _ = build(keys(two, []kv{{"output.fields", `["dye", "u", "dye"]`}}))
	_, err = Parse([]byte(text))
	var es *Errors
	if !errors.As(err, &es) || len(es.Problems) != 1 || es.Problems[0].Key != "output.fields[2]" {
		t.Errorf("repeated scalar field: got %v", err)
	}
	// A bad scalar name is reported once, not again in output.fields.
	text, _ = build(keys(oneScalar, []kv{sc("name", `"O2"`), {"output.fields", `["O2"]`}}))
	_, err = Parse([]byte(text))
	if !errors.As(err, &es) || len(es.Problems) != 1 || es.Problems[0].Key != "scalar[0].name" {
		t.Errorf("bad scalar name listed in output.fields: got %v", err)
	}
}

// TestTemplateScalarExample uncomments the [[scalar]] example of the
// template (the lines "# key = value", not the alternatives shown as
// "#   key = value") and checks that it parses to the oxygen scalar it
// describes, and that each alternative can stand in for its key.
func TestTemplateScalarExample(t *testing.T) {
	tmpl := Template()
	block := scalarTemplate()
	if !strings.Contains(tmpl, block) {
		t.Fatal("the template does not hold the [[scalar]] block")
	}
	example := regexp.MustCompile(`(?m)^# (\[\[scalar\]\]|[a-z_]+ = .*)$`)
	uncommented := example.ReplaceAllString(block, "$1")
	if n := len(example.FindAllString(block, -1)); n != 13 {
		t.Errorf("the example sets %d lines, want the header and 12 keys", n)
	}
	c, err := Parse([]byte(strings.Replace(tmpl, block, uncommented, 1)))
	if err != nil {
		t.Fatalf("the uncommented [[scalar]] example does not parse:\n%v", err)
	}
	nu := c.Fluid.Viscosity
	want := []Scalar{{Name: "oxygen", Diffusivity: 1.76e-9, Schmidt: nu / 1.76e-9, TurbulentSchmidt: 1, Initial: 0.23,
		Top: ScalarFixed, TopValue: 0.23, Bed: ScalarMat, BedCapacity: 2e-6, Uptake: canopy.TransferPlateLaminar, Capacity: 1e-5}}
	if !reflect.DeepEqual(c.Scalars, want) {
		t.Errorf("example scalar\n got %+v\nwant %+v", c.Scalars, want)
	}
	if c.Output.Fields[len(c.Output.Fields)-1] != "oxygen" {
		t.Errorf("default output.fields %v does not end with the scalar", c.Output.Fields)
	}
	// The Schmidt number shown matches the diffusivity in the template's
	// fluid to the digits shown.
	if sc := want[0].Schmidt; math.Abs(sc-597) > 0.5 {
		t.Errorf("Sc = ν/D = %g for the example, the template shows 597", sc)
	}

	// Each alternative stands in for a key of the example.
	alternative := regexp.MustCompile(`(?m)^#   ([a-z_]+) = (.*)$`)
	swaps := map[string][][2]string{
		"schmidt":        {{"diffusivity = 1.76e-9", ""}},
		"bed_value":      {{`bed = "mat"`, `bed = "fixed"`}, {"bed_capacity = 2.0e-6", ""}},
		"power_alpha":    {{`uptake = "plate-laminar"`, `uptake = "power-law"`}},
		"power_exponent": {},
	}
	alts := alternative.FindAllStringSubmatch(block, -1)
	if len(alts) != len(swaps) {
		t.Errorf("the block shows %d alternatives, want %d: %q", len(alts), len(swaps), alts)
	}
	text := uncommented
	for _, m := range alts {
		edits, ok := swaps[m[1]]
		if !ok {
			t.Errorf("unexpected alternative %q", m[0])
			continue
		}
		text = strings.Replace(text, m[0], m[1]+" = "+m[2], 1)
		for _, e := range edits {
			text = strings.Replace(text, e[0]+"\n", e[1]+"\n", 1)
		}
	}
	if _, err := Parse([]byte(strings.Replace(tmpl, block, text, 1))); err != nil {
		t.Errorf("the alternatives shown do not parse:\n%v\n%s", err, text)
	}
}

func TestScalarFixture(t *testing.T) {
	c, err := Load(filepath.Join("testdata", "scalars.toml"))
	if err != nil {
		t.Fatal(err)
	}
	nu := c.Fluid.Viscosity
	want := []Scalar{
		{Name: "oxygen", Diffusivity: 2.1e-9, Schmidt: nu / 2.1e-9, TurbulentSchmidt: 0.7, Initial: 0.28, Top: ScalarFixed, TopValue: 0.28,
			Bed: ScalarMat, BedCapacity: math.Inf(1), Uptake: canopy.TransferHilpert, Capacity: 4e-6, SurfaceConcentration: 0.02},
		{Name: "nitrate", Diffusivity: nu / 700, Schmidt: 700, TurbulentSchmidt: 1, Initial: 0.01, Top: ScalarFlux, TopValue: 1e-7,
			Bed: ScalarFlux, BedValue: -5e-8, Uptake: canopy.TransferPowerLaw, Capacity: math.Inf(1), PowerAlpha: 2e-5, PowerExponent: 0.6},
		{Name: "dye", Diffusivity: 5e-10, Schmidt: nu / 5e-10, TurbulentSchmidt: 1, Source: 1e-4, Top: ScalarNoFlux, Bed: ScalarFixed, BedValue: 0, Uptake: UptakeNone},
	}
	if !reflect.DeepEqual(c.Scalars, want) {
		t.Errorf("scalars\n got %+v\nwant %+v", c.Scalars, want)
	}
	if want := []string{"u", "vorticity", "oxygen", "dye"}; !reflect.DeepEqual(c.Output.Fields, want) {
		t.Errorf("output.fields %v, want %v", c.Output.Fields, want)
	}
}

func TestValidScalarName(t *testing.T) {
	tests := []struct {
		name string
		ok   bool
		fix  string
	}{
		{"o2", true, "o2"}, {"no3_flux", true, "no3_flux"}, {"a", true, "a"}, {strings.Repeat("x", 32), true, strings.Repeat("x", 32)},
		{"", false, "tracer"}, {"O2", false, "o2"}, {"_x", false, "x"}, {"1", false, "c1"}, {"nh4+", false, "nh4"},
		{"é", false, "tracer"}, {"two  words", false, "two_words"}, {strings.Repeat("y", 33), false, strings.Repeat("y", 32)},
		{"po4-p", false, "po4_p"},
	}
	for _, tt := range tests {
		if got := validScalarName(tt.name); got != tt.ok {
			t.Errorf("validScalarName(%q) = %v, want %v", tt.name, got, tt.ok)
		}
		fix := scalarNameFor(tt.name)
		if fix != tt.fix || !validScalarName(fix) {
			t.Errorf("scalarNameFor(%q) = %q, want %q, a valid name", tt.name, fix, tt.fix)
		}
	}
}

// TestUptakeLawsAreCanopys checks that [[scalar]] uptake accepts exactly
// the element transfer laws of package canopy (and "none"), each with the
// element shape its correlation is for, and that the template documents
// each of them.
func TestUptakeLawsAreCanopys(t *testing.T) {
	for _, law := range canopy.ElementTransfers() {
		shape := ShapeCylinder
		if sh, ok := canopy.TransferShape(law); ok {
			shape = sh.String()
		}
		set := []kv{{"canopy.height", "0.2"}, {"canopy.frontal_area", "4"}, {"canopy.shape", strconv.Quote(shape)}, {"canopy.diameter", "0.005"},
			{"scalar[0].name", `"o2"`}, {"scalar[0].diffusivity", "2e-9"}, {"scalar[0].uptake", strconv.Quote(law)}, {"scalar[0].capacity", "1e-5"}}
		if law == canopy.TransferPowerLaw {
			set = append(set, kv{"scalar[0].power_alpha", "3e-5"}, kv{"scalar[0].power_exponent", "0.5"})
		}
		text, _ := build(set)
		if _, err := Parse([]byte(text)); err != nil {
			t.Errorf("uptake = %q: %v", law, err)
		}
		if !strings.Contains(Template(), `#   "`+law+`"`) {
			t.Errorf("the template does not describe uptake = %q", law)
		}
	}
}

// TestScalarNameReserved: the names fields.h5 keeps for its coordinates
// and the velocity vector are refused at check time, with the key.
func TestScalarNameReserved(t *testing.T) {
	for _, name := range ReservedNames {
		text := "[domain]\nlength = 1.0\ndepth = 0.5\nnx = 32\nnz = 16\n[fluid]\nviscosity = 1.0e-6\n[forcing]\nbulk_velocity = 0.1\n[time]\nduration = 1.0\n[[scalar]]\nname = \"" + name + "\"\ndiffusivity = 1.0e-9\n"
		_, err := Parse([]byte(text))
		if err == nil || !strings.Contains(err.Error(), "scalar[0].name = \""+name+"\": is kept by fields.h5") {
			t.Errorf("name %q: %v", name, err)
		}
	}
}
