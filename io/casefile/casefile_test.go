package casefile

import (
	"errors"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"runtime"
	"strings"
	"testing"

	"rollerbed/io/stricttoml"
	"rollerbed/solver/transform"
)

// kv is one key of a test case, dotted key and value as TOML text.
type kv struct{ key, raw string }

// baseCase is a small valid case; rows of the rule table change it.
var baseCase = []kv{
	{"title", `"rules"`},
	{"domain.length", "2.0"},
	{"domain.depth", "0.5"},
	{"domain.nx", "64"},
	{"domain.nz", "32"},
	{"fluid.viscosity", "1.0e-6"},
	{"forcing.gradient", "1.0e-5"},
	{"time.duration", "10.0"},
}

// build writes baseCase with the keys in del removed and then the keys in
// set replaced or added, as TOML with one [table] header per table, and a
// [[table]] header for each element of an array of tables (keys such as
// canopy.patch[0].start). It returns the text and the line of every key and
// table header written.
func build(set []kv, del ...string) (string, map[string]int) {
	var keys []kv
	for _, k := range baseCase {
		drop := false
		for _, d := range del {
			drop = drop || k.key == d
		}
		if !drop {
			keys = append(keys, k)
		}
	}
	for _, s := range set {
		found := false
		for i := range keys {
			if keys[i].key == s.key {
				keys[i].raw, found = s.raw, true
			}
		}
		if !found {
			keys = append(keys, s)
		}
	}
	kept := keys
	// Group by table, tables in order of first appearance, top level first.
	var tables []string
	byTable := map[string][]kv{}
	for _, k := range kept {
		t := stricttoml.ParentKey(k.key)
		if _, seen := byTable[t]; !seen {
			tables = append(tables, t)
		}
		byTable[t] = append(byTable[t], k)
	}
	var b strings.Builder
	lines := map[string]int{}
	line := 1
	emit := func(s string) {
		b.WriteString(s + "\n")
		line++
	}
	for _, k := range byTable[""] {
		lines[k.key] = line
		emit(k.key + " = " + k.raw)
	}
	for _, t := range tables {
		if t == "" {
			continue
		}
		emit("")
		lines[t] = line
		if base, _, ok := stricttoml.SplitIndex(t); ok {
			// canopy.patch[1] is the second [[canopy.patch]]; elements
			// must come in order.
			emit("[[" + base + "]]")
		} else {
			emit("[" + t + "]")
		}
		for _, k := range byTable[t] {
			lines[k.key] = line
			emit(stricttoml.LastComponent(k.key) + " = " + k.raw)
		}
	}
	return b.String(), lines
}

func TestBaseCaseIsValid(t *testing.T) {
	text, _ := build(nil)
	if _, err := Parse([]byte(text)); err != nil {
		t.Fatalf("base case:\n%s\nerror:\n%v", text, err)
	}
}

// TestRules has one row per rule: the change to a valid case, and the one
// problem it must give (key, value as written, and a part of the message).
func TestRules(t *testing.T) {
	uniform := kv{"initial.profile", `"uniform"`}
	rough := kv{"bed.condition", `"rough"`}
	lid := kv{"top.condition", `"no-slip"`}
	at := kv{"domain.cluster.at", "0.2"}
	// block is a valid uniform canopy; withBlock adds keys to it.
	block := []kv{{"canopy.height", "0.2"}, {"canopy.frontal_area", "4.0"}}
	withBlock := func(more ...kv) []kv { return append(append([]kv{}, block...), more...) }
	rows := func(raw string) kv { return kv{"canopy.profile", raw} }
	// patch gives the keys of [[canopy.patch]] element i.
	patch := func(i int, start, end string) []kv {
		base := "canopy.patch[" + string(rune('0'+i)) + "]"
		var out []kv
		if start != "" {
			out = append(out, kv{base + ".start", start})
		}
		if end != "" {
			out = append(out, kv{base + ".end", end})
		}
		return out
	}
	patches := func(groups ...[]kv) []kv {
		out := withBlock()
		for _, g := range groups {
			out = append(out, g...)
		}
		return out
	}
	slabWidth, slabNy := kv{"domain.width", "1.0"}, kv{"domain.ny", "16"}
	linear := kv{"canopy.drag_law", `"linear"`}
	cylinder := kv{"canopy.drag_law", `"cylinder"`}
	tests := []rule{
		// [domain]
		{name: "length missing", del: []string{"domain.length"}, key: "domain.length", msgPart: "missing; required: the streamwise period Lx"},
		{name: "length zero", set: []kv{{"domain.length", "0"}}, key: "domain.length", val: "0", msgPart: "must be a finite number > 0"},
		{name: "length negative", set: []kv{{"domain.length", "-2.0"}}, key: "domain.length", val: "-2.0", msgPart: "> 0 (streamwise period Lx, m)"},
		{name: "length infinite", set: []kv{{"domain.length", "inf"}}, key: "domain.length", val: "inf", msgPart: "finite"},
		{name: "length nan", set: []kv{{"domain.length", "nan"}}, key: "domain.length", val: "nan", msgPart: "finite"},
		{name: "depth missing", del: []string{"domain.depth"}, key: "domain.depth", msgPart: "missing; required: the depth H"},
		{name: "depth zero", set: []kv{{"domain.depth", "0.0"}}, key: "domain.depth", val: "0.0", msgPart: "must be a finite number > 0 (depth H"},
		{name: "nx missing", del: []string{"domain.nx"}, key: "domain.nx", msgPart: "missing; required: the number of cells along x"},
		{name: "nx too few", set: []kv{{"domain.nx", "6"}}, key: "domain.nx", val: "6", msgPart: "must be an integer from 8 to 16384 (cells along x)"},
		{name: "nx too many", set: []kv{{"domain.nx", "16386"}}, key: "domain.nx", val: "16386", msgPart: "from 8 to 16384"},
		{name: "nx odd", set: []kv{{"domain.nx", "65"}}, key: "domain.nx", val: "65", msgPart: "must be even"},
		{name: "nz missing", del: []string{"domain.nz"}, key: "domain.nz", msgPart: "missing; required: the number of cells along z"},
		{name: "nz too few", set: []kv{{"domain.nz", "3"}}, key: "domain.nz", val: "3", msgPart: "must be an integer from 8 to 8192 (cells along z); use at least 8"},
		{name: "nz too many", set: []kv{{"domain.nz", "8193"}}, key: "domain.nz", val: "8193", msgPart: "from 8 to 8192"},
		{name: "width zero", set: []kv{slabNy, {"domain.width", "0.0"}}, key: "domain.width", val: "0.0", msgPart: "must be a finite number > 0 (spanwise period Ly of the slab, m); e.g. width = 1.0, or leave out both"},
		{name: "width negative", set: []kv{slabNy, {"domain.width", "-1.0"}}, key: "domain.width", val: "-1.0", msgPart: "> 0"},
		{name: "width without ny", set: []kv{slabWidth}, key: "domain.ny", msgPart: "missing: a slab with domain.width needs the number of cells across the span"},
		{name: "ny without width", set: []kv{slabNy}, key: "domain.width", msgPart: "missing: a slab with domain.ny needs the spanwise period Ly"},
		{name: "ny odd", set: []kv{slabWidth, {"domain.ny", "33"}}, key: "domain.ny", val: "33", msgPart: "must be even (cells across the span, for the real Fourier transform); use 32 or 34"},
		{name: "ny too few", set: []kv{slabWidth, {"domain.ny", "2"}}, key: "domain.ny", val: "2", msgPart: "must be an integer from 4 to 4096 (cells across the span); use at least 4"},
		{name: "ny one", set: []kv{slabWidth, {"domain.ny", "1"}}, key: "domain.ny", val: "1", msgPart: "from 4 to 4096"},
		{name: "ny too many", set: []kv{slabWidth, {"domain.ny", "4098"}}, key: "domain.ny", val: "4098", msgPart: "from 4 to 4096"},

		// [domain.cluster]
		{name: "bed factor below 1", set: []kv{{"domain.cluster.bed", "0.5"}}, key: "domain.cluster.bed", val: "0.5", msgPart: "must be from 1 to 50 (spacing refinement at the bed; 1 = none); a factor below 1 would fold the grid"},
		{name: "bed factor above 50", set: []kv{{"domain.cluster.bed", "51"}}, key: "domain.cluster.bed", val: "51", msgPart: "one above 50 makes neighbouring cells differ too much"},
		{name: "bed width zero", set: []kv{{"domain.cluster.bed_width", "0"}}, key: "domain.cluster.bed_width", val: "0", msgPart: "must be a finite number > 0"},
		{name: "bed width negative", set: []kv{{"domain.cluster.bed_width", "-0.1"}}, key: "domain.cluster.bed_width", val: "-0.1", msgPart: "> 0"},
		{name: "at zero", set: []kv{{"domain.cluster.at", "0"}}, key: "domain.cluster.at", val: "0", msgPart: "must be > 0 and < 0.5 (height of the second cluster"},
		{name: "at at the top", set: []kv{{"domain.cluster.at", "0.5"}}, key: "domain.cluster.at", val: "0.5", msgPart: "< 0.5"},
		{name: "at negative", set: []kv{{"domain.cluster.at", "-0.1"}}, key: "domain.cluster.at", val: "-0.1", msgPart: "remove the key for no second cluster"},
		{name: "at factor below 1", set: []kv{at, {"domain.cluster.at_factor", "0.9"}}, key: "domain.cluster.at_factor", val: "0.9", msgPart: "must be from 1 to 50"},
		{name: "at factor above 50", set: []kv{at, {"domain.cluster.at_factor", "60"}}, key: "domain.cluster.at_factor", val: "60", msgPart: "must be from 1 to 50"},
		{name: "at width zero", set: []kv{at, {"domain.cluster.at_width", "0"}}, key: "domain.cluster.at_width", val: "0", msgPart: "> 0"},
		{name: "at factor without at", set: []kv{{"domain.cluster.at_factor", "2"}}, key: "domain.cluster.at_factor", val: "2", msgPart: "needs domain.cluster.at"},
		{name: "at width without at", set: []kv{{"domain.cluster.at_width", "0.01"}}, key: "domain.cluster.at_width", val: "0.01", msgPart: "needs domain.cluster.at"},

		// [fluid]
		{name: "viscosity missing", del: []string{"fluid.viscosity"}, key: "fluid.viscosity", msgPart: "unless fluid.preset names a fluid", wantLine0: true},
		{name: "viscosity zero", set: []kv{{"fluid.viscosity", "0.0"}}, key: "fluid.viscosity", val: "0.0", msgPart: "must be > 0 and < 1 (kinematic viscosity, m²/s)"},
		{name: "viscosity one", set: []kv{{"fluid.viscosity", "1.0"}}, key: "fluid.viscosity", val: "1.0", msgPart: "< 1"},
		{name: "preset unknown", set: []kv{{"fluid.preset", `"brine"`}}, del: []string{"fluid.viscosity"}, key: "fluid.preset", val: `"brine"`, msgPart: `must be one of "freshwater-5C"`},
		{name: "preset wrong case", set: []kv{{"fluid.preset", `"seawater-20c"`}}, del: []string{"fluid.viscosity"}, key: "fluid.preset", val: `"seawater-20c"`, msgPart: `did you mean "seawater-20C"?`},
		{name: "preset and viscosity", set: []kv{{"fluid.preset", `"air-20C"`}}, key: "fluid.viscosity", val: "1.0e-6", msgPart: "fluid.preset and fluid.viscosity are both given"},

		// [bed]
		{name: "bed condition unknown", set: []kv{{"bed.condition", `"smooth"`}}, key: "bed.condition", val: `"smooth"`, msgPart: `must be one of "no-slip", "free-slip", "rough"`},
		{name: "bed condition near miss", set: []kv{{"bed.condition", `"noslip"`}}, key: "bed.condition", val: `"noslip"`, msgPart: `did you mean "no-slip"?`},
		{name: "rough without roughness", set: []kv{rough}, key: "bed.roughness", msgPart: `missing; required with bed.condition = "rough"`},
		{name: "roughness without rough", set: []kv{{"bed.roughness", "0.001"}}, key: "bed.roughness", val: "0.001", msgPart: `only applies when bed.condition = "rough"`},
		{name: "roughness zero", set: []kv{rough, {"bed.roughness", "0"}}, key: "bed.roughness", val: "0", msgPart: "must be > 0 and < 0.5 (roughness length z0, m"},
		{name: "roughness above depth", set: []kv{rough, {"bed.roughness", "0.6"}}, key: "bed.roughness", val: "0.6", msgPart: "< 0.5"},
		{name: "bed speed without no-slip", set: []kv{{"bed.condition", `"free-slip"`}, {"bed.speed", "0.1"}}, key: "bed.speed", val: "0.1", msgPart: `only applies when bed.condition = "no-slip"`},
		{name: "bed speed zero on rough bed", set: []kv{rough, {"bed.roughness", "0.001"}, {"bed.speed", "0"}}, key: "bed.speed", val: "0", msgPart: "only applies when"},
		{name: "bed speed infinite", set: []kv{{"bed.speed", "-inf"}}, key: "bed.speed", val: "-inf", msgPart: "must be a finite number"},

		// [top]
		{name: "top rough", set: []kv{{"top.condition", `"rough"`}}, key: "top.condition", val: `"rough"`, msgPart: "the rough-wall model is for the bed only"},
		{name: "top condition unknown", set: []kv{{"top.condition", `"lid"`}}, key: "top.condition", val: `"lid"`, msgPart: `must be one of "free-slip", "no-slip"`},
		{name: "top speed without lid", set: []kv{{"top.speed", "0.2"}}, key: "top.speed", val: "0.2", msgPart: `only applies when top.condition = "no-slip"`},
		{name: "lid speed nan", set: []kv{lid, {"top.speed", "nan"}}, key: "top.speed", val: "nan", msgPart: "must be a finite number"},

		// [forcing]
		{name: "no forcing", del: []string{"forcing.gradient"}, key: "forcing", msgPart: "nothing drives the flow; give exactly one of forcing.gradient", wantLine0: true},
		{name: "two forcings", set: []kv{{"forcing.slope", "1e-4"}}, key: "forcing.slope", val: "1e-4", msgPart: "forcing.gradient and forcing.slope are both given"},
		{name: "three forcings", set: []kv{{"forcing.slope", "1e-4"}, {"forcing.bulk_velocity", "0.1"}}, key: "forcing.bulk_velocity", val: "0.1", msgPart: "forcing.gradient, forcing.slope and forcing.bulk_velocity are all given"},
		{name: "gradient negative", set: []kv{{"forcing.gradient", "-1e-5"}}, key: "forcing.gradient", val: "-1e-5", msgPart: "must be a finite number >= 0 (kinematic pressure gradient"},
		{name: "slope negative", set: []kv{{"forcing.slope", "-1e-5"}}, del: []string{"forcing.gradient"}, key: "forcing.slope", val: "-1e-5", msgPart: "must be >= 0 and < 0.1"},
		{name: "slope too steep", set: []kv{{"forcing.slope", "0.1"}}, del: []string{"forcing.gradient"}, key: "forcing.slope", val: "0.1", msgPart: "< 0.1"},
		{name: "bulk velocity zero", set: []kv{{"forcing.bulk_velocity", "0.0"}}, del: []string{"forcing.gradient"}, key: "forcing.bulk_velocity", val: "0.0", msgPart: "must be a finite number > 0 (depth-mean velocity"},
		{name: "bulk velocity negative", set: []kv{{"forcing.bulk_velocity", "-0.1"}}, del: []string{"forcing.gradient"}, key: "forcing.bulk_velocity", val: "-0.1", msgPart: "> 0"},

		// [initial]
		{name: "profile unknown", set: []kv{{"initial.profile", `"log"`}}, key: "initial.profile", val: `"log"`, msgPart: `must be one of "rest", "uniform", "laminar"`},
		{name: "speed without uniform", set: []kv{{"initial.speed", "0.1"}}, key: "initial.speed", val: "0.1", msgPart: `only applies when initial.profile = "uniform"`},
		{name: "uniform speed nan", set: []kv{uniform, {"initial.speed", "nan"}}, key: "initial.speed", val: "nan", msgPart: "must be a finite number"},
		{name: "perturbation negative", set: []kv{{"initial.perturbation", "-0.01"}}, key: "initial.perturbation", val: "-0.01", msgPart: "must be a finite number >= 0 (rms amplitude"},
		{name: "perturbation below bed", set: []kv{{"initial.perturbation_at", "-0.1"}}, key: "initial.perturbation_at", val: "-0.1", msgPart: "must be from 0 to 0.5"},
		{name: "perturbation above top", set: []kv{{"initial.perturbation_at", "0.6"}}, key: "initial.perturbation_at", val: "0.6", msgPart: "must be from 0 to 0.5"},
		{name: "perturbation width zero", set: []kv{{"initial.perturbation_width", "0"}}, key: "initial.perturbation_width", val: "0", msgPart: "> 0"},
		{name: "seed negative", set: []kv{{"initial.seed", "-1"}}, key: "initial.seed", val: "-1", msgPart: "must be an integer from 0"},
		{name: "laminar without walls", set: []kv{{"initial.profile", `"laminar"`}, {"bed.condition", `"free-slip"`}}, key: "initial.profile", val: `"laminar"`, msgPart: "no steady laminar profile with free-slip at both bed and top"},

		// [canopy]: the vertical profile.
		{name: "canopy without profile", set: []kv{{"canopy.shape", `"blade"`}}, key: "canopy", msgPart: "has no vertical profile; give exactly one of canopy.height with canopy.frontal_area"},
		{name: "canopy taller than the domain", set: withBlock(kv{"canopy.height", "0.6"}), key: "canopy.height", val: "0.6", msgPart: "the canopy is taller than the domain: domain.depth = 0.5 m; canopy.height must be > 0 and <= domain.depth"},
		{name: "canopy height zero", set: withBlock(kv{"canopy.height", "0"}), key: "canopy.height", val: "0", msgPart: "must be a finite number > 0 (canopy height h, m)"},
		{name: "canopy height nan", set: withBlock(kv{"canopy.height", "nan"}), key: "canopy.height", val: "nan", msgPart: "finite"},
		{name: "height without frontal area", set: []kv{{"canopy.height", "0.2"}}, key: "canopy.frontal_area", msgPart: "missing; required with canopy.height"},
		{name: "frontal area without height", set: []kv{{"canopy.frontal_area", "4.0"}}, key: "canopy.height", msgPart: "missing; required with canopy.frontal_area"},
		{name: "frontal area negative", set: withBlock(kv{"canopy.frontal_area", "-4.0"}), key: "canopy.frontal_area", val: "-4.0", msgPart: "> 0 (frontal area per unit volume a, 1/m)"},
		{name: "block and profile", set: withBlock(rows("[[0.0, 4.0], [0.2, 0.0]]")), key: "canopy.profile", val: "[[0.0, 4.0], [0.2, 0.0]]", msgPart: "canopy.height and canopy.profile are both given; give exactly one of"},
		{name: "profile and file", set: []kv{rows("[[0.0, 4.0], [0.2, 0.0]]"), {"canopy.profile_file", `"a.csv"`}}, key: "canopy.profile_file", val: `"a.csv"`, msgPart: "canopy.profile and canopy.profile_file are both given"},
		{name: "all three profiles", set: withBlock(rows("[[0.0, 4.0], [0.2, 0.0]]"), kv{"canopy.profile_file", `"a.csv"`}), key: "canopy.profile_file", val: `"a.csv"`, msgPart: "canopy.height, canopy.profile and canopy.profile_file are all given"},
		{name: "profile one row", set: []kv{rows("[[0.1, 1.0]]")}, key: "canopy.profile", val: "[[0.1, 1.0]]", msgPart: "must have at least 2 rows [z, a] (height z in m, frontal area per unit volume a in 1/m), not 1"},
		{name: "profile empty", set: []kv{rows("[]")}, key: "canopy.profile", val: "[]", msgPart: "at least 2 rows"},
		{name: "profile negative a", set: []kv{rows("[[0.0, 4.0], [0.1, -1.0], [0.2, 0.0]]")}, key: "canopy.profile[1]", val: "[0.1, -1.0]", msgPart: "a = -1 1/m is negative (the 2nd row); the frontal area per unit volume must be >= 0"},
		{name: "profile below the bed", set: []kv{rows("[[-0.1, 4.0], [0.1, 1.0]]")}, key: "canopy.profile[0]", val: "[-0.1, 4.0]", msgPart: "z = -0.1 m is below the bed (the 1st row)"},
		{name: "profile unsorted", set: []kv{rows("[[0.0, 4.0], [0.2, 4.0], [0.1, 0.0]]")}, key: "canopy.profile[2]", val: "[0.1, 0.0]", msgPart: "z = 0.1 m does not rise above z = 0.2 m of canopy.profile[1] (the 3rd row); heights must increase strictly"},
		{name: "profile repeated height", set: []kv{rows("[[0.0, 4.0], [0.0, 2.0]]")}, key: "canopy.profile[1]", val: "[0.0, 2.0]", msgPart: "does not rise above z = 0 m of canopy.profile[0]"},
		{name: "profile above the top", set: []kv{rows("[[0.0, 4.0], [0.6, 0.0]]")}, key: "canopy.profile[1]", val: "[0.6, 0.0]", msgPart: "z = 0.6 m is above the top of the domain, domain.depth = 0.5 m (the 2nd row); the canopy must fit inside the domain"},
		{name: "profile infinite a", set: []kv{rows("[[0.0, inf], [0.2, 0.0]]")}, key: "canopy.profile[0]", val: "[0.0, inf]", msgPart: "z and a must be finite numbers (the 1st row"},
		{name: "profile all zero", set: []kv{rows("[[0.0, 0], [0.2, 0]]")}, key: "canopy.profile", val: "[[0.0, 0], [0.2, 0]]", msgPart: "has a = 0 in every row, which is no canopy"},
		{name: "profile row not an array", set: []kv{rows("[[0.0, 4.0], 0.2]")}, key: "canopy.profile[1]", val: "0.2", msgPart: "must be a row [z, a] of 2 numbers, not a float; write profile = [[z, a], [z, a], ...]"},
		{name: "profile row of three", set: []kv{rows("[[0.0, 4.0, 1.0], [0.2, 1.0]]")}, key: "canopy.profile[0]", val: "[0.0, 4.0, 1.0]", msgPart: "must be a row [z, a] of 2 numbers, not 3"},
		{name: "profile row with a string", set: []kv{rows(`[[0.0, "4"], [0.2, 1.0]]`)}, key: "canopy.profile[0]", val: `[0.0, "4"]`, msgPart: "its 2nd entry is a string, not a number"},
		{name: "profile not an array", set: []kv{rows("3")}, key: "canopy.profile", val: "3", msgPart: "must be an array of rows [z, a], not an integer"},
		{name: "profile file empty", set: []kv{{"canopy.profile_file", `" "`}}, key: "canopy.profile_file", val: `" "`, msgPart: "must name a CSV file of rows z, a"},
		{name: "profile file not a string", set: []kv{{"canopy.profile_file", "1"}}, key: "canopy.profile_file", val: "1", msgPart: "must be a string"},
		{name: "edge width with profile", set: []kv{rows("[[0.0, 4.0], [0.2, 0.0]]"), {"canopy.edge_width", "0.01"}}, key: "canopy.edge_width", val: "0.01", msgPart: "only applies when the canopy is a uniform block"},
		{name: "edge width at height", set: withBlock(kv{"canopy.edge_width", "0.2"}), key: "canopy.edge_width", val: "0.2", msgPart: "must be less than canopy.height = 0.2 m"},
		{name: "edge width negative", set: withBlock(kv{"canopy.edge_width", "-0.01"}), key: "canopy.edge_width", val: "-0.01", msgPart: "must be a finite number >= 0 (smoothing of the top edge"},
		{name: "canopy not a table", set: []kv{{"canopy", "1"}}, key: "canopy", val: "1", msgPart: "must be a table, not an integer; write it as a [canopy] section"},

		// [canopy]: the elements and their drag.
		{name: "unknown shape", set: withBlock(kv{"canopy.shape", `"ribbon"`}), key: "canopy.shape", val: `"ribbon"`, msgPart: `must be one of "cylinder", "blade"`},
		{name: "shape near miss", set: withBlock(kv{"canopy.shape", `"blades"`}), key: "canopy.shape", val: `"blades"`, msgPart: `did you mean "blade"?`},
		{name: "diameter zero", set: withBlock(kv{"canopy.diameter", "0"}), key: "canopy.diameter", val: "0", msgPart: "must be a finite number > 0 (cylinder diameter d or blade width b, m)"},
		{name: "drag coefficient zero", set: withBlock(kv{"canopy.drag_coefficient", "0"}), key: "canopy.drag_coefficient", val: "0", msgPart: "must be > 0 and <= 10 (fixed drag coefficient C_D"},
		{name: "drag coefficient negative", set: withBlock(kv{"canopy.drag_coefficient", "-1.0"}), key: "canopy.drag_coefficient", val: "-1.0", msgPart: "must be > 0 and <= 10"},
		{name: "drag coefficient too large", set: withBlock(kv{"canopy.drag_coefficient", "12"}), key: "canopy.drag_coefficient", val: "12", msgPart: "must be > 0 and <= 10"},
		{name: "drag coefficient nan", set: withBlock(kv{"canopy.drag_coefficient", "nan"}), key: "canopy.drag_coefficient", val: "nan", msgPart: "must be > 0 and <= 10"},
		{name: "drag law needs diameter", set: withBlock(cylinder), key: "canopy.diameter", msgPart: `missing; required with canopy.drag_law = "cylinder": the cylinder diameter d in m`},
		{name: "drag law and drag coefficient", set: withBlock(cylinder, kv{"canopy.diameter", "0.01"}, kv{"canopy.drag_coefficient", "1.2"}), key: "canopy.drag_coefficient", val: "1.2", msgPart: `is not used with canopy.drag_law = "cylinder", which computes C_D from the element Reynolds number`},
		{name: "cylinder law on blades", set: withBlock(cylinder, kv{"canopy.diameter", "0.005"}, kv{"canopy.shape", `"blade"`}), key: "canopy.drag_law", val: `"cylinder"`, msgPart: `is the law of circular cylinders, but canopy.shape = "blade"`},
		{name: "drag law unknown", set: withBlock(kv{"canopy.drag_law", `"quadratic"`}), key: "canopy.drag_law", val: `"quadratic"`, msgPart: `must be one of "fixed", "cylinder", "linear"`},
		{name: "linear law needs rate", set: withBlock(linear), key: "canopy.linear_rate", msgPart: `missing; required with canopy.drag_law = "linear": the linear drag rate r in 1/s`},
		{name: "linear rate zero", set: withBlock(linear, kv{"canopy.linear_rate", "0"}), key: "canopy.linear_rate", val: "0", msgPart: "must be a finite number > 0 (linear drag rate r of the Darcy-Brinkman layer, 1/s)"},
		{name: "linear law and drag coefficient", set: withBlock(linear, kv{"canopy.linear_rate", "0.5"}, kv{"canopy.drag_coefficient", "1.0"}), key: "canopy.drag_coefficient", val: "1.0", msgPart: `is not used with canopy.drag_law = "linear"`},
		{name: "linear rate without linear law", set: withBlock(kv{"canopy.linear_rate", "0.5"}), key: "canopy.linear_rate", val: "0.5", msgPart: `only applies when canopy.drag_law = "linear"`},
		{name: "solid fraction too large", set: withBlock(kv{"canopy.solid_fraction", "0.6"}), key: "canopy.solid_fraction", val: "0.6", msgPart: "must be >= 0 and < 0.6 (solid volume fraction φ"},
		{name: "solid fraction negative", set: withBlock(kv{"canopy.solid_fraction", "-0.1"}), key: "canopy.solid_fraction", val: "-0.1", msgPart: "must be >= 0 and < 0.6"},

		// [[canopy.patch]]
		{name: "patch outside the domain", set: patches(patch(0, "2.5", "0.5")), key: "canopy.patch[0].start", val: "2.5", msgPart: "is outside the domain: must be >= 0 and < domain.length = 2 m (x where the 1st [[canopy.patch]] begins, m)"},
		{name: "patch start negative", set: patches(patch(0, "-0.5", "0.5")), key: "canopy.patch[0].start", val: "-0.5", msgPart: "is outside the domain"},
		{name: "patch end outside the domain", set: patches(patch(0, "0.5", "1.0"), patch(1, "1.0", "2.5")), key: "canopy.patch[1].end", val: "2.5", msgPart: "is outside the domain: must be > 0 and <= domain.length = 2 m (x where the 2nd [[canopy.patch]] ends, m)"},
		{name: "patch end zero", set: patches(patch(0, "1.0", "0")), key: "canopy.patch[0].end", val: "0", msgPart: "must be > 0 and <= domain.length"},
		{name: "patch start equals end", set: patches(patch(0, "1.0", "1.0")), key: "canopy.patch[0].end", val: "1.0", msgPart: "equals start = 1 m, which leaves the 1st [[canopy.patch]] empty"},
		{name: "patch start missing", set: patches(patch(0, "0.5", "1.0"), patch(1, "", "1.5")), key: "canopy.patch[1].start", msgPart: "missing; required in every [[canopy.patch]]: the x where the patch begins in m, 0 <= start < domain.length; add e.g. start = 0.5 under the 2nd [[canopy.patch]] header"},
		{name: "patch end missing", set: patches(patch(0, "0.5", "")), key: "canopy.patch[0].end", msgPart: "missing; required in every [[canopy.patch]]: the x where the patch ends"},
		{name: "overlapping patches", set: patches(patch(0, "0.2", "1.2"), patch(1, "1.0", "1.5")), key: "canopy.patch[1]", msgPart: "(the 2nd [[canopy.patch]], x from 1 m to 1.5 m) overlaps canopy.patch[0] (x from 0.2 m to 1.2 m) from x = 1 m to 1.2 m; patches must not overlap"},
		{name: "patch inside another", set: patches(patch(0, "0.2", "1.2"), patch(1, "1.5", "1.8"), patch(2, "0.5", "0.6")), key: "canopy.patch[2]", msgPart: "overlaps canopy.patch[0]"},
		{name: "wrapped patch overlaps", set: patches(patch(0, "1.5", "0.5"), patch(1, "0.3", "1.0")), key: "canopy.patch[1]", msgPart: "overlaps canopy.patch[0] (x from 1.5 m to 0.5 m, wrapping around x = 2 m) from x = 0.3 m to 0.5 m"},
		{name: "patch edge too wide", set: patches(patch(0, "0.5", "1.0"), []kv{{"canopy.patch[0].edge_width", "0.3"}}), key: "canopy.patch[0].edge_width", val: "0.3", msgPart: "must be at most half the length of the 1st [[canopy.patch]] (0.25 m of 0.5 m)"},
		{name: "wrapped patch edge too wide", set: patches(patch(0, "1.8", "0.2"), []kv{{"canopy.patch[0].edge_width", "0.25"}}), key: "canopy.patch[0].edge_width", val: "0.25", msgPart: "(0.2 m of 0.4 m)"},
		{name: "patch edge negative", set: patches(patch(0, "0.5", "1.0"), []kv{{"canopy.patch[0].edge_width", "-0.1"}}), key: "canopy.patch[0].edge_width", val: "-0.1", msgPart: ">= 0 (smoothing of the ends of the patch, m; 0 = sharp)"},
		{name: "unknown key in a patch", set: patches(patch(0, "0.5", "1.0"), []kv{{"canopy.patch[0].edg_width", "0.1"}}), key: "canopy.patch[0].edg_width", val: "0.1", msgPart: "unknown key in the 1st [[canopy.patch]] (canopy.patch[0]); did you mean canopy.patch[0].edge_width? (known here: start, end, edge_width, span_start, span_end)"},
		{name: "patch across the span in a slice", set: patches(patch(0, "0.5", "1.0"), []kv{{"canopy.patch[0].span_start", "0.1"}, {"canopy.patch[0].span_end", "0.3"}}), key: "canopy.patch[0].span_start", val: "0.1", msgPart: "limits the 1st [[canopy.patch]] across the span, which only a slab has; give domain.width and domain.ny"},
		{name: "patch outside the span", set: append(patches(patch(0, "0.5", "1.0"), []kv{{"canopy.patch[0].span_start", "0.1"}, {"canopy.patch[0].span_end", "1.5"}}), slabWidth, slabNy), key: "canopy.patch[0].span_end", val: "1.5", msgPart: "is outside the span: must be > 0 and <= domain.width = 1 m (y where the 1st [[canopy.patch]] ends, m)"},
		{name: "patch span start outside", set: append(patches(patch(0, "0.5", "1.0"), []kv{{"canopy.patch[0].span_start", "-0.1"}, {"canopy.patch[0].span_end", "0.5"}}), slabWidth, slabNy), key: "canopy.patch[0].span_start", val: "-0.1", msgPart: "is outside the span: must be >= 0 and < domain.width = 1 m"},
		{name: "patch span end missing", set: append(patches(patch(0, "0.5", "1.0"), []kv{{"canopy.patch[0].span_start", "0.1"}}), slabWidth, slabNy), key: "canopy.patch[0].span_end", msgPart: "missing: the 1st [[canopy.patch]] gives span_start, so it needs span_end too"},
		{name: "patch edge too wide across", set: append(patches(patch(0, "0.5", "1.5"), []kv{{"canopy.patch[0].span_start", "0.8"}, {"canopy.patch[0].span_end", "0.2"}, {"canopy.patch[0].edge_width", "0.25"}}), slabWidth, slabNy), key: "canopy.patch[0].edge_width", val: "0.25", msgPart: "must be at most half the spanwise extent of the 1st [[canopy.patch]] (0.2 m of 0.4 m)"},
		{name: "rectangles overlap", set: append(patches(patch(0, "0.5", "1.5"), patch(1, "1.0", "1.8"), []kv{{"canopy.patch[0].span_start", "0.0"}, {"canopy.patch[0].span_end", "0.6"}, {"canopy.patch[1].span_start", "0.5"}, {"canopy.patch[1].span_end", "1.0"}}), slabWidth, slabNy), key: "canopy.patch[1]", msgPart: "overlaps canopy.patch[0]"},
		{name: "patch as a table", set: withBlock(kv{"canopy.patch", "{ start = 0.1, end = 0.2 }"}), key: "canopy.patch", val: "{ start = 0.1, end = 0.2 }", msgPart: "must be an array of tables, not a table; write each element under its own [[canopy.patch]] header"},
		{name: "patch array of numbers", set: withBlock(kv{"canopy.patch", "[1, 2]"}), key: "canopy.patch", val: "[1, 2]", msgPart: "must be an array of tables, not an array holding an integer"},
		{name: "unknown canopy key", set: withBlock(kv{"canopy.lienar_rate", "0.5"}), key: "canopy.lienar_rate", val: "0.5", msgPart: "did you mean canopy.linear_rate? (known here: height, frontal_area, profile, profile_file, edge_width, shape, diameter, drag_coefficient, drag_law, linear_rate, solid_fraction, blade_modulus, blade_thickness, blade_density, [[patch]])"},

		// [turbulence]
		{name: "closure unknown", set: []kv{{"turbulence.closure", `"les"`}}, key: "turbulence.closure", val: `"les"`, msgPart: `must be one of "smagorinsky", "none"`},
		{name: "smagorinsky with closure none", set: []kv{{"turbulence.closure", `"none"`}, {"turbulence.smagorinsky", "0.2"}}, key: "turbulence.smagorinsky", val: "0.2", msgPart: `only applies when turbulence.closure = "smagorinsky"`},
		{name: "smagorinsky zero", set: []kv{{"turbulence.smagorinsky", "0"}}, key: "turbulence.smagorinsky", val: "0", msgPart: "must be > 0 and <= 0.5 (Smagorinsky constant C_s, dimensionless)"},
		{name: "smagorinsky too large", set: []kv{{"turbulence.smagorinsky", "0.6"}}, key: "turbulence.smagorinsky", val: "0.6", msgPart: `for no subgrid model set closure = "none" instead`},

		// [initial] with a canopy.
		{name: "drag-balanced without canopy", set: []kv{{"initial.profile", `"drag-balanced"`}}, key: "initial.profile", val: `"drag-balanced"`, msgPart: "needs a [canopy] table: the drag-balanced profile balances the forcing against canopy drag"},

		// [time]
		{name: "spin up negative", set: []kv{{"time.spin_up", "-1"}}, key: "time.spin_up", val: "-1", msgPart: "must be a finite number >= 0 (simulated time after which statistics start, s)"},
		{name: "spin up at the end", set: []kv{{"time.spin_up", "10"}}, key: "time.spin_up", val: "10", msgPart: "must be less than time.duration = 10 s, or no statistics would be gathered; e.g. spin_up = 2.5"},
		{name: "duration missing", del: []string{"time.duration"}, key: "time.duration", msgPart: "missing; required: the simulated time", wantLine0: true},
		{name: "duration zero", set: []kv{{"time.duration", "0"}}, key: "time.duration", val: "0", msgPart: "must be a finite number > 0 (simulated time to run, s)"},
		{name: "cfl zero", set: []kv{{"time.cfl", "0"}}, key: "time.cfl", val: "0", msgPart: "must be > 0 and <= 1.5"},
		{name: "cfl too large", set: []kv{{"time.cfl", "1.6"}}, key: "time.cfl", val: "1.6", msgPart: "unstable above about 1.7"},
		{name: "max step negative", set: []kv{{"time.max_step", "-1"}}, key: "time.max_step", val: "-1", msgPart: ">= 0 (upper bound on the adaptive step, s; 0 = none)"},
		{name: "fixed step negative", set: []kv{{"time.fixed_step", "-0.1"}}, key: "time.fixed_step", val: "-0.1", msgPart: ">= 0 (fixed step, s; 0 = adaptive)"},
		{name: "fixed step too long", set: []kv{{"time.fixed_step", "20.0"}}, key: "time.fixed_step", val: "20.0", msgPart: "must not exceed time.duration = 10 s"},
		{name: "fixed and max step", set: []kv{{"time.fixed_step", "0.01"}, {"time.max_step", "0.1"}}, key: "time.max_step", val: "0.1", msgPart: "remove one of time.max_step and time.fixed_step"},

		// [numerics]
		{name: "transform unknown", set: []kv{{"numerics.transform", `"fft"`}}, key: "numerics.transform", val: `"fft"`, msgPart: `did you mean "fftw"?`},
		{name: "workers negative", set: []kv{{"numerics.workers", "-1"}}, key: "numerics.workers", val: "-1", msgPart: "must be an integer from 0 to 256"},
		{name: "workers too many", set: []kv{{"numerics.workers", "257"}}, key: "numerics.workers", val: "257", msgPart: "0 = one per CPU core"},

		// [output]
		{name: "profile every zero", set: []kv{{"output.profile_every", "0"}}, key: "output.profile_every", val: "0", msgPart: "must be a finite number > 0"},
		{name: "profile every too long", set: []kv{{"output.profile_every", "11"}}, key: "output.profile_every", val: "11", msgPart: "must not exceed time.duration = 10 s, or no profile would be written"},
		{name: "profile every negative", set: []kv{{"output.profile_every", "-1"}}, key: "output.profile_every", val: "-1", msgPart: "must be a finite number > 0 (simulated time between mean-profile rows, s); at most time.duration = 10 s; e.g. profile_every = 0.1"},
		{name: "snapshot every negative", set: []kv{{"output.snapshot_every", "-0.5"}}, key: "output.snapshot_every", val: "-0.5", msgPart: "must be a finite number >= 0 (simulated time between snapshots in fields.h5, s; 0 = none besides the initial and final fields); at most time.duration = 10 s; e.g. snapshot_every = 0.2"},
		{name: "snapshot every too long", set: []kv{{"output.snapshot_every", "12.5"}}, key: "output.snapshot_every", val: "12.5", msgPart: "must not exceed time.duration = 10 s, or no snapshot would be written between the initial and final fields; 0 writes none between them; e.g. snapshot_every = 0.2"},
		{name: "snapshot every infinite", set: []kv{{"output.snapshot_every", "inf"}}, key: "output.snapshot_every", val: "inf", msgPart: "must be a finite number >= 0"},
		{name: "snapshot every nan", set: []kv{{"output.snapshot_every", "nan"}}, key: "output.snapshot_every", val: "nan", msgPart: "must be a finite number >= 0"},
		{name: "snapshot every as string", set: []kv{{"output.snapshot_every", `"1 s"`}}, key: "output.snapshot_every", val: `"1 s"`, msgPart: "must be a number, not a string"},
		{name: "field unknown", set: []kv{{"output.fields", `["u", "vorticty"]`}}, key: "output.fields[1]", val: `"vorticty"`, msgPart: `is not a field a snapshot can hold; must be one of "u", "w", "p", "vorticity", "nu_t"; did you mean "vorticity"?`},
		{name: "field wrong case", set: []kv{{"output.fields", `["U"]`}}, key: "output.fields[0]", val: `"U"`, msgPart: `did you mean "u"?`},
		{name: "field near nu_t", set: []kv{{"output.fields", `["u", "w", "nut"]`}}, key: "output.fields[2]", val: `"nut"`, msgPart: `did you mean "nu_t"?`},
		{name: "field far from all", set: []kv{{"output.fields", `["temperature"]`}}, key: "output.fields[0]", val: `"temperature"`, msgPart: `must be one of "u", "w", "p", "vorticity", "nu_t"; correct the name or remove the entry`},
		{name: "field empty name", set: []kv{{"output.fields", `["u", ""]`}}, key: "output.fields[1]", val: `""`, msgPart: `must be one of`},
		{name: "field repeated", set: []kv{{"output.fields", `["u", "w", "u"]`}}, key: "output.fields[2]", val: `"u"`, msgPart: "repeats output.fields[0] (the 1st entry of output.fields); list each field once: remove this entry"},
		{name: "fields empty", set: []kv{{"output.fields", "[]"}}, key: "output.fields", val: "[]", msgPart: `must list at least one field for the snapshots of fields.h5, from ["u", "w", "p", "vorticity", "nu_t"]; e.g. fields = ["u", "w", "vorticity"], or remove the key for all of them`},
		{name: "field of wrong type", set: []kv{{"output.fields", `["u", "w", 3]`}}, key: "output.fields[2]", val: "3", msgPart: `must be a string, not an integer (the 3rd entry of output.fields); put each entry in double quotes, e.g. fields = ["...", "..."]`},
		{name: "field as nested array", set: []kv{{"output.fields", `[["u"], "w"]`}}, key: "output.fields[0]", val: `["u"]`, msgPart: "must be a string, not an array"},
		{name: "field as inline table", set: []kv{{"output.fields", `["u", { name = "w" }]`}}, key: "output.fields[1]", val: `{ name = "w" }`, msgPart: "must be a string, not a table"},
		{name: "fields as string", set: []kv{{"output.fields", `"u"`}}, key: "output.fields", val: `"u"`, msgPart: `must be an array of strings, not a string; write fields = ["u"] for a list of one`},
		{name: "fields as number", set: []kv{{"output.fields", "5"}}, key: "output.fields", val: "5", msgPart: `must be an array of strings, not an integer; write fields = ["...", "..."]`},
		{name: "fields as table", set: []kv{{"output.fields", `{ u = true }`}}, key: "output.fields", val: `{ u = true }`, msgPart: "must be an array of strings, not a table"},
		{name: "compression too high", set: []kv{{"output.compression", "10"}}, key: "output.compression", val: "10", msgPart: "must be an integer from 0 to 9 (deflate level of fields.h5; 0 = none, 9 = smallest file and slowest); e.g. compression = 4"},
		{name: "compression negative", set: []kv{{"output.compression", "-1"}}, key: "output.compression", val: "-1", msgPart: "must be an integer from 0 to 9"},
		{name: "compression as float", set: []kv{{"output.compression", "4.0"}}, key: "output.compression", val: "4.0", msgPart: "must be an integer, not a float; write compression = 4 (no decimal point)"},
		{name: "checkpoint every zero", set: []kv{{"output.checkpoint_every", "0"}}, key: "output.checkpoint_every", val: "0", msgPart: "must be a finite number > 0 (simulated time between checkpoints, s); at most time.duration = 10 s; e.g. checkpoint_every = 1"},
		{name: "checkpoint every negative", set: []kv{{"output.checkpoint_every", "-5"}}, key: "output.checkpoint_every", val: "-5", msgPart: "must be a finite number > 0"},
		{name: "checkpoint every too long", set: []kv{{"output.checkpoint_every", "20"}}, key: "output.checkpoint_every", val: "20", msgPart: "must not exceed time.duration = 10 s, or no checkpoint would come due in simulated time; e.g. checkpoint_every = 1"},
		{name: "checkpoint wall zero", set: []kv{{"output.checkpoint_wall_minutes", "0"}}, key: "output.checkpoint_wall_minutes", val: "0", msgPart: "must be > 0 and <= 1440 (wall-clock time between checkpoints, minutes; 1440 = one day); e.g. checkpoint_wall_minutes = 30"},
		{name: "checkpoint wall negative", set: []kv{{"output.checkpoint_wall_minutes", "-30"}}, key: "output.checkpoint_wall_minutes", val: "-30", msgPart: "must be > 0 and <= 1440"},
		{name: "checkpoint wall over a day", set: []kv{{"output.checkpoint_wall_minutes", "1441"}}, key: "output.checkpoint_wall_minutes", val: "1441", msgPart: "must be > 0 and <= 1440"},
		{name: "checkpoint wall nan", set: []kv{{"output.checkpoint_wall_minutes", "nan"}}, key: "output.checkpoint_wall_minutes", val: "nan", msgPart: "must be > 0 and <= 1440"},
		{name: "probes zero", set: []kv{{"output.probes", "0"}}, key: "output.probes", val: "0", msgPart: "must be an integer from 1 to 64 (probes recording u and w, evenly spaced in x along the canopy top, or at mid-depth without a canopy); e.g. probes = 8"},
		{name: "probes too many", set: []kv{{"output.probes", "65"}}, key: "output.probes", val: "65", msgPart: "must be an integer from 1 to 64"},
		{name: "probes as string", set: []kv{{"output.probes", `"8"`}}, key: "output.probes", val: `"8"`, msgPart: "must be an integer, not a string; write probes = 8 without quotes"},
		{name: "unknown output key", set: []kv{{"output.snapshots_every", "1"}}, key: "output.snapshots_every", val: "1", msgPart: "unknown key in [output]; did you mean output.snapshot_every? (known here: profile_every, snapshot_every, fields, compression, checkpoint_every, checkpoint_wall_minutes, probes, phase_bins)"},
		{name: "output cadence without duration", set: []kv{{"output.snapshot_every", "5"}}, del: []string{"time.duration"}, key: "time.duration", msgPart: "missing; required: the simulated time", wantLine0: true},

		// Types.
		{name: "integer as string", set: []kv{{"domain.nx", `"256"`}}, key: "domain.nx", val: `"256"`, msgPart: "must be an integer, not a string; write nx = 256 without quotes"},
		{name: "integer as float", set: []kv{{"domain.nx", "256.0"}}, key: "domain.nx", val: "256.0", msgPart: "must be an integer, not a float; write nx = 256 (no decimal point)"},
		{name: "integer as fraction", set: []kv{{"initial.seed", "1.5"}}, key: "initial.seed", val: "1.5", msgPart: "write a whole number"},
		{name: "number as string", set: []kv{{"domain.length", `"2 m"`}}, key: "domain.length", val: `"2 m"`, msgPart: "must be a number, not a string; write a plain number"},
		{name: "number as boolean", set: []kv{{"time.duration", "true"}}, key: "time.duration", val: "true", msgPart: "must be a number, not a boolean"},
		{name: "number as array", set: []kv{{"time.duration", "[1, 2]"}}, key: "time.duration", val: "[1, 2]", msgPart: "not an array"},
		{name: "number as date", set: []kv{{"time.duration", "2024-01-01"}}, key: "time.duration", val: "2024-01-01", msgPart: "not a date or time"},
		{name: "string as number", set: []kv{{"bed.condition", "1"}}, key: "bed.condition", val: "1", msgPart: `must be a string, not an integer; put the text in double quotes`},
		{name: "title as number", set: []kv{{"title", "1"}}, key: "title", val: "1", msgPart: "must be a string"},
		{name: "table as value", set: []kv{{"domain.cluster", "2"}}, key: "domain.cluster", val: "2", msgPart: "must be a table, not an integer"},
		{name: "value as table", set: []kv{{"domain.nx", "{ a = 1 }"}}, key: "domain.nx", val: "{ a = 1 }", msgPart: "must be an integer, not a table"},

		// Unknown keys.
		{name: "unknown key in table", set: []kv{{"domain.nzz", "64"}}, key: "domain.nzz", val: "64", msgPart: "unknown key in [domain]; did you mean domain.nz? (known here: length, depth, nx, nz, width, ny, [cluster])"},
		{name: "swapped letters", set: []kv{{"domain.lenght", "2.0"}}, key: "domain.lenght", val: "2.0", msgPart: "did you mean domain.length?"},
		{name: "wrong case", set: []kv{{"domain.NZ", "64"}}, key: "domain.NZ", val: "64", msgPart: "did you mean domain.nz? (keys are case-sensitive)"},
		{name: "key in wrong table", set: []kv{{"domain.viscosity", "1e-6"}}, key: "domain.viscosity", val: "1e-6", msgPart: "did you mean fluid.viscosity?"},
		{name: "unknown top-level key", set: []kv{{"nx", "64"}}, key: "nx", val: "64", msgPart: "unknown key at the top level; did you mean domain.nx?"},
		{name: "unknown table", set: []kv{{"domian.nx", "64"}}, key: "domian", msgPart: "unknown table at the top level; did you mean domain?"},
		{name: "unknown key far from all", set: []kv{{"time.wallclock", "3600"}}, key: "time.wallclock", val: "3600", msgPart: "unknown key in [time] (known here: duration, spin_up, cfl, max_step, fixed_step)"},
		{name: "quoted unknown key", set: []kv{{`domain."n x"`, "64"}}, key: `domain."n x"`, val: "64", msgPart: "unknown key in [domain]"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) { checkRule(t, tt) })
	}
}

// rule is a change to baseCase that must give exactly one problem.
type rule struct {
	name      string
	set       []kv
	del       []string
	key, val  string
	msgPart   string
	wantLine0 bool // the problem has no line (its table is not in the file)
}

// checkRule parses baseCase changed by tt and checks its one problem: key,
// value, message, line.
func checkRule(t *testing.T, tt rule) {
	t.Helper()
	text, lines := build(tt.set, tt.del...)
	_, err := Parse([]byte(text))
	var es *Errors
	if !errors.As(err, &es) {
		t.Fatalf("Parse gave %v, want *Errors; text:\n%s", err, text)
	}
	if len(es.Problems) != 1 {
		t.Fatalf("got %d problems, want 1:\n%v\ntext:\n%s", len(es.Problems), err, text)
	}
	p := es.Problems[0]
	if p.Key != tt.key || p.Value != tt.val || !strings.Contains(p.Msg, tt.msgPart) {
		t.Errorf("problem %q\n  key %q value %q\nwant key %q value %q, message containing %q", p.Error(), p.Key, p.Value, tt.key, tt.val, tt.msgPart)
	}
	wantLine := 0
	for k := tt.key; k != "" && !tt.wantLine0; k = stricttoml.ParentKey(k) {
		if l, ok := lines[k]; ok {
			wantLine = l
			break
		}
		// A row of an array written on one line sits there.
		if base, _, ok := stricttoml.SplitIndex(k); ok {
			if l, ok := lines[base]; ok {
				wantLine = l
				break
			}
		}
	}
	if p.Line != wantLine || wantLine == 0 && !tt.wantLine0 {
		t.Errorf("problem %q: line %d, want %d; text:\n%s", p.Error(), p.Line, wantLine, text)
	}
	if !strings.Contains(p.Error(), tt.key) {
		t.Errorf("message %q does not name the key %q", p.Error(), tt.key)
	}
}

func TestDefaults(t *testing.T) {
	text, _ := build(nil)
	c, err := Parse([]byte(text))
	if err != nil {
		t.Fatal(err)
	}
	want := Case{
		Title: "rules",
		Domain: Domain{Length: 2, Depth: 0.5, Nx: 64, Nz: 32,
			Cluster: Cluster{Bed: 1, BedWidth: 0.05, AtFactor: 1, AtWidth: 0.025}},
		Fluid:      Fluid{Viscosity: 1e-6},
		Bed:        Bed{Condition: NoSlip},
		Top:        Top{Condition: FreeSlip},
		Canopy:     nil,
		Turbulence: Turbulence{Closure: ClosureSmagorinsky, Smagorinsky: 0.2},
		Forcing:    Forcing{Kind: ForcingGradient, Gradient: 1e-5},
		Initial:    Initial{Profile: ProfileRest, PerturbationAt: 0.25, PerturbationWidth: 0.5, Seed: 1},
		Time:       Time{Duration: 10, CFL: 0.5},
		Numerics:   Numerics{Transform: transform.FFTW.String()},
		Output: Output{ProfileEvery: 0.1, SnapshotEvery: 0.2, Fields: []string{"u", "w", "p", "vorticity", "nu_t"},
			Compression: 4, CheckpointEvery: 1, CheckpointWallMinutes: 30, Probes: 8},
		Text: text,
	}
	if !reflect.DeepEqual(*c, want) {
		t.Errorf("defaults:\n got %+v\nwant %+v", *c, want)
	}
}

func TestValuesKept(t *testing.T) {
	text, _ := build([]kv{
		{"domain.cluster.bed", "4"},
		{"domain.cluster.bed_width", "0.02"},
		{"domain.cluster.at", "0.2"},
		{"domain.cluster.at_factor", "2.5"},
		{"domain.cluster.at_width", "0.03"},
		{"bed.condition", `"rough"`},
		{"bed.roughness", "0.002"},
		{"top.condition", `"no-slip"`},
		{"top.speed", "-0.05"},
		{"initial.profile", `"uniform"`},
		{"initial.speed", "0.3"},
		{"initial.perturbation", "0.01"},
		{"initial.perturbation_at", "0.2"},
		{"initial.perturbation_width", "0.1"},
		{"initial.seed", "0"},
		{"time.cfl", "1.5"},
		{"time.max_step", "0.5"},
		{"numerics.transform", `"gonum"`},
		{"numerics.workers", "3"},
		{"output.profile_every", "2"},
		{"output.snapshot_every", "0"},
		{"output.fields", `["vorticity", "u"]`},
		{"output.compression", "0"},
		{"output.checkpoint_every", "10"},
		{"output.checkpoint_wall_minutes", "1440"},
		{"output.probes", "64"},
	})
	c, err := Parse([]byte(text))
	if err != nil {
		t.Fatal(err)
	}
	if want := (Cluster{Bed: 4, BedWidth: 0.02, At: 0.2, AtFactor: 2.5, AtWidth: 0.03}); c.Domain.Cluster != want {
		t.Errorf("cluster %+v, want %+v", c.Domain.Cluster, want)
	}
	if want := (Bed{Condition: Rough, Roughness: 0.002}); c.Bed != want {
		t.Errorf("bed %+v, want %+v", c.Bed, want)
	}
	if want := (Top{Condition: NoSlip, Speed: -0.05}); c.Top != want {
		t.Errorf("top %+v, want %+v", c.Top, want)
	}
	if want := (Initial{Profile: ProfileUniform, Speed: 0.3, Perturbation: 0.01, PerturbationAt: 0.2, PerturbationWidth: 0.1, Seed: 0}); c.Initial != want {
		t.Errorf("initial %+v, want %+v", c.Initial, want)
	}
	if want := (Time{Duration: 10, CFL: 1.5, MaxStep: 0.5}); c.Time != want {
		t.Errorf("time %+v, want %+v", c.Time, want)
	}
	if want := (Numerics{Transform: transform.Gonum.String(), Workers: 3}); c.Numerics != want || c.Numerics.WorkerCount() != 3 {
		t.Errorf("numerics %+v, want %+v", c.Numerics, want)
	}
	if want := (Output{ProfileEvery: 2, SnapshotEvery: 0, Fields: []string{"vorticity", "u"}, Compression: 0,
		CheckpointEvery: 10, CheckpointWallMinutes: 1440, Probes: 64}); !reflect.DeepEqual(c.Output, want) {
		t.Errorf("output %+v, want %+v", c.Output, want)
	}
}

func TestForcingKinds(t *testing.T) {
	tests := []struct {
		raw  kv
		kind ForcingKind
		pi   float64 // m/s²
	}{
		{kv{"forcing.gradient", "3e-4"}, ForcingGradient, 3e-4},
		{kv{"forcing.gradient", "0"}, ForcingGradient, 0},
		{kv{"forcing.slope", "1e-4"}, ForcingSlope, Gravity * 1e-4},
		{kv{"forcing.bulk_velocity", "0.2"}, ForcingBulkVelocity, 0},
	}
	for _, tt := range tests {
		t.Run(tt.raw.key, func(t *testing.T) {
			text, _ := build([]kv{tt.raw}, "forcing.gradient")
			c, err := Parse([]byte(text))
			if err != nil {
				t.Fatal(err)
			}
			if c.Forcing.Kind != tt.kind || math.Abs(c.Forcing.PressureGradient()-tt.pi) > 1e-15 {
				t.Errorf("kind %q Π %g, want %q %g", c.Forcing.Kind, c.Forcing.PressureGradient(), tt.kind, tt.pi)
			}
		})
	}
}

func TestPresetSetsViscosity(t *testing.T) {
	for _, name := range FluidPresets() {
		text, _ := build([]kv{{"fluid.preset", `"` + name + `"`}}, "fluid.viscosity")
		c, err := Parse([]byte(text))
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if nu, _ := FluidPreset(name); c.Fluid.Viscosity != nu || c.Fluid.Preset != name {
			t.Errorf("%s: viscosity %g preset %q, want %g", name, c.Fluid.Viscosity, c.Fluid.Preset, nu)
		}
	}
}

func TestFluidPresets(t *testing.T) {
	// Values as listed in the sources beside fluidPresets (from memory).
	want := map[string]float64{
		"freshwater-5C": 1.5182e-6, "freshwater-10C": 1.3063e-6, "freshwater-20C": 1.0034e-6,
		"seawater-5C": 1.576e-6, "seawater-10C": 1.3604e-6, "seawater-20C": 1.0507e-6,
		"air-20C": 1.51e-5,
	}
	names := FluidPresets()
	if len(names) != len(want) {
		t.Errorf("FluidPresets() = %v, want %d names", names, len(want))
	}
	for _, name := range names {
		nu, ok := FluidPreset(name)
		if !ok || nu != want[name] {
			t.Errorf("FluidPreset(%q) = %g, %v; want %g", name, nu, ok, want[name])
		}
	}
	if _, ok := FluidPreset("seawater-20c"); ok {
		t.Error("FluidPreset is case-insensitive; want exact names")
	}
}

func TestSeveralProblemsAtOnce(t *testing.T) {
	text, _ := build([]kv{{"domain.nx", `"256"`}, {"domain.nz", "3"}, {"fluid.viscosity", "-1"}, {"domain.nzz", "1"}}, "time.duration")
	_, err := Parse([]byte(text))
	var es *Errors
	if !errors.As(err, &es) {
		t.Fatalf("got %v", err)
	}
	var keys []string
	for _, p := range es.Problems {
		keys = append(keys, p.Key)
	}
	want := []string{"domain.nx", "domain.nz", "domain.nzz", "fluid.viscosity", "time.duration"}
	if !reflect.DeepEqual(keys, want) {
		t.Errorf("problem keys %v, want %v (sorted by line, missing keys last)\n%v", keys, want, err)
	}
	if n := strings.Count(err.Error(), "\n") + 1; n != len(want) {
		t.Errorf("Error() has %d lines, want %d", n, len(want))
	}
	var p *Problem
	if !errors.As(err, &p) || p.Key != "domain.nx" {
		t.Errorf("errors.As(*Problem) = %v", p)
	}
}

func TestBadTableHidesItsKeys(t *testing.T) {
	// One mistake, one line: a [domain] that is not a table must not also
	// report its keys as missing, nor defaults derived from the depth.
	text := "domain = 3\n[fluid]\nviscosity = 1e-6\n[forcing]\ngradient = 0\n[time]\nduration = 1\n"
	_, err := Parse([]byte(text))
	var es *Errors
	if !errors.As(err, &es) || len(es.Problems) != 1 || es.Problems[0].Key != "domain" || es.Problems[0].Line != 1 {
		t.Fatalf("got %v", err)
	}
}

func TestSyntaxError(t *testing.T) {
	tests := []struct {
		name, text string
		line, col  int
		msgPart    string
	}{
		{"double equals", "[domain]\nnx = = 8\n", 2, 6, "expected value but found '=' instead"},
		{"unclosed string", "title = \"abc\n", 1, 0, "strings cannot contain newlines"},
		{"duplicate table", "[domain]\nnx = 8\n[domain]\n", 3, 0, "already been defined"},
		{"duplicate key", "[time]\nduration = 1\nduration = 2\n", 3, 0, "already been defined"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := Parse([]byte(tt.text))
			var es *Errors
			if !errors.As(err, &es) || len(es.Problems) != 1 {
				t.Fatalf("got %v, want one problem", err)
			}
			p := es.Problems[0]
			if p.Line != tt.line || (tt.col > 0 && p.Col != tt.col) || !strings.Contains(p.Msg, tt.msgPart) || !strings.Contains(p.Msg, "TOML syntax error") {
				t.Errorf("got %q (line %d col %d), want line %d col %d with %q", p.Error(), p.Line, p.Col, tt.line, tt.col, tt.msgPart)
			}
		})
	}
}

func TestEmptyFile(t *testing.T) {
	for _, text := range []string{"", "# only a comment\n\n"} {
		_, err := Parse([]byte(text))
		if err == nil || !strings.Contains(err.Error(), "rollerbed init FILE") || strings.Contains(err.Error(), "\n") {
			t.Errorf("Parse(%q) = %v, want one line pointing to rollerbed init", text, err)
		}
	}
}

func TestValidate(t *testing.T) {
	text, _ := build(nil)
	base, err := Parse([]byte(text))
	if err != nil {
		t.Fatal(err)
	}
	if err := base.Validate(); err != nil {
		t.Fatalf("parsed case does not validate: %v", err)
	}
	tests := []struct {
		name string
		edit func(c *Case)
		key  string
	}{
		{"sweep to a bad depth", func(c *Case) { c.Domain.Depth = -1 }, "domain.depth"},
		{"cluster at above the top", func(c *Case) { c.Domain.Cluster.At = 0.7 }, "domain.cluster.at"},
		{"viscosity off its preset", func(c *Case) { c.Fluid.Preset = "air-20C" }, "fluid.viscosity"},
		{"roughness on a smooth bed", func(c *Case) { c.Bed.Roughness = 0.01 }, "bed.roughness"},
		{"two forcings", func(c *Case) { c.Forcing.Slope = 1e-4 }, "forcing.slope"},
		{"no forcing kind", func(c *Case) { c.Forcing.Kind = "" }, "forcing.kind"},
		{"speed without uniform", func(c *Case) { c.Initial.Speed = 0.1 }, "initial.speed"},
		{"empty bed condition", func(c *Case) { c.Bed.Condition = "" }, "bed.condition"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			c := *base
			tt.edit(&c)
			err := c.Validate()
			var es *Errors
			if !errors.As(err, &es) || len(es.Problems) != 1 || es.Problems[0].Key != tt.key || es.Problems[0].Line != 0 {
				t.Errorf("Validate() = %v, want one problem for %s without a line", err, tt.key)
			}
		})
	}
	// Changing a value within its range keeps the case valid.
	c := *base
	c.Domain.Nz = 128
	c.Forcing = Forcing{Kind: ForcingSlope, Slope: 1e-3}
	if err := c.Validate(); err != nil {
		t.Errorf("valid edit: %v", err)
	}
}

func TestLoad(t *testing.T) {
	c, err := Load(filepath.Join("testdata", "channel.toml"))
	if err != nil {
		t.Fatal(err)
	}
	text, err := os.ReadFile(filepath.Join("testdata", "channel.toml"))
	if err != nil {
		t.Fatal(err)
	}
	if c.Text != string(text) {
		t.Error("Case.Text is not the file's text")
	}
	if c.Domain.Cluster.At != 0.12 || c.Bed.Condition != Rough || c.Forcing.Kind != ForcingBulkVelocity || c.Fluid.Viscosity != 1.3063e-6 {
		t.Errorf("unexpected case %+v", c)
	}

	missing := filepath.Join(t.TempDir(), "absent.toml")
	if _, err := Load(missing); err == nil || !errors.Is(err, os.ErrNotExist) || !strings.Contains(err.Error(), "rollerbed init") {
		t.Errorf("Load(missing) = %v", err)
	}
}

func TestLoadNamesTheFile(t *testing.T) {
	path := filepath.Join(t.TempDir(), "bad.toml")
	text, _ := build([]kv{{"domain.nz", "3"}})
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	_, err := Load(path)
	if err == nil || !strings.HasPrefix(err.Error(), path+" line ") {
		t.Errorf("Load error %q does not start with the file name and line", err)
	}
}

func TestParseIsDeterministic(t *testing.T) {
	// Unknown keys of one table come from a map; their order must not vary.
	text := "[time]\nduration = 1\nzz = 1\naa = 2\nmm = 3\n[fluid]\nviscosity = 1e-6\n[forcing]\ngradient = 0\n" +
		"[domain]\nlength = 1\ndepth = 1\nnx = 8\nnz = 8\ncluster = { q = 1, b = 2, x = 3 }\n"
	_, first := Parse([]byte(text))
	for i := 0; i < 20; i++ {
		if _, err := Parse([]byte(text)); err.Error() != first.Error() {
			t.Fatalf("run %d:\n%v\nfirst:\n%v", i, err, first)
		}
	}
}

func TestProblemError(t *testing.T) {
	tests := []struct {
		p    Problem
		want string
	}{
		{Problem{Doc: "case file", Line: 12, Key: "domain.nz", Value: "3", Msg: "must be x"}, "case file line 12: domain.nz = 3: must be x"},
		{Problem{File: "a.toml", Line: 3, Col: 7, Msg: "TOML syntax error: y"}, "a.toml line 3, column 7: TOML syntax error: y"},
		{Problem{Doc: "case file", Key: "time.duration", Msg: "missing"}, "case file: time.duration: missing"},
		{Problem{File: "b.toml", Key: "forcing", Msg: "nothing"}, "b.toml: forcing: nothing"},
	}
	for _, tt := range tests {
		if got := tt.p.Error(); got != tt.want {
			t.Errorf("got %q, want %q", got, tt.want)
		}
	}
}

func TestParentKey(t *testing.T) {
	tests := []struct{ in, want string }{
		{"a", ""}, {"a.b", "a"}, {"a.b.c", "a.b"}, {`a."b.c"`, "a"}, {`"x\".y".z`, `"x\".y"`},
	}
	for _, tt := range tests {
		if got := stricttoml.ParentKey(tt.in); got != tt.want {
			t.Errorf("stricttoml.ParentKey(%q) = %q, want %q", tt.in, got, tt.want)
		}
	}
}

func TestWorkerCount(t *testing.T) {
	if got := (Numerics{}).WorkerCount(); got != runtime.NumCPU() || got < 1 {
		t.Errorf("WorkerCount() with workers = 0 is %d, want runtime.NumCPU() = %d", got, runtime.NumCPU())
	}
	if got := (Numerics{Workers: 5}).WorkerCount(); got != 5 {
		t.Errorf("WorkerCount() = %d, want 5", got)
	}
}

// TestSlabKept: a slab's width and spanwise count, and rectangles side by
// side across the span (which overlap in x but not in y), are read as
// written.
func TestSlabKept(t *testing.T) {
	text, _ := build([]kv{
		{"domain.width", "1.0"}, {"domain.ny", "16"},
		{"canopy.height", "0.2"}, {"canopy.frontal_area", "4.0"},
		{"canopy.patch[0].start", "0.5"}, {"canopy.patch[0].end", "1.5"},
		{"canopy.patch[0].span_start", "0.8"}, {"canopy.patch[0].span_end", "0.2"},
		{"canopy.patch[1].start", "1.0"}, {"canopy.patch[1].end", "1.8"},
		{"canopy.patch[1].span_start", "0.3"}, {"canopy.patch[1].span_end", "0.7"},
	})
	c, err := Parse([]byte(text))
	if err != nil {
		t.Fatal(err)
	}
	if !c.Domain.Slab() || c.Domain.Width != 1 || c.Domain.Ny != 16 {
		t.Errorf("domain %+v, want a slab 1 m wide with 16 cells", c.Domain)
	}
	ps := c.Canopy.Patches
	if len(ps) != 2 || !ps[0].Spanwise() || math.Abs(ps[0].SpanLength(1)-0.4) > 1e-15 || math.Abs(ps[1].SpanLength(1)-0.4) > 1e-15 {
		t.Errorf("patches %+v, want two rectangles 0.4 m across", ps)
	}
	if (Patch{Start: 0, End: 1}).SpanLength(1) != 1 {
		t.Error("a stripe should span the whole width")
	}
	text, _ = build(nil)
	if c, err := Parse([]byte(text)); err != nil || c.Domain.Slab() {
		t.Errorf("a case without width and ny should be the slice (err %v)", err)
	}
}
