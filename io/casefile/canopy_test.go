package casefile

import (
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"rollerbed/io/stricttoml"
)

// TestCanopyAccepted has one row per canopy setting that must parse, with
// the Canopy it must give (defaults filled in) on the base case, whose
// slice is 2 m long and 0.5 m deep.
func TestCanopyAccepted(t *testing.T) {
	block := []kv{{"canopy.height", "0.2"}, {"canopy.frontal_area", "4"}}
	withBlock := func(more ...kv) []kv { return append(append([]kv{}, block...), more...) }
	// def is the block with every default filled in.
	def := Canopy{Height: 0.2, FrontalArea: 4, Shape: ShapeCylinder, DragLaw: DragFixed, DragCoefficient: 1}
	with := func(edit func(c *Canopy)) Canopy {
		c := def
		edit(&c)
		return c
	}
	tests := []struct {
		name string
		set  []kv
		want Canopy
	}{
		{"uniform block with defaults", block, def},
		{"emergent canopy (height = depth)", withBlock(kv{"canopy.height", "0.5"}), with(func(c *Canopy) { c.Height = 0.5 })},
		{"smoothed top edge", withBlock(kv{"canopy.edge_width", "0.05"}), with(func(c *Canopy) { c.EdgeWidth = 0.05 })},
		{"blades with a width", withBlock(kv{"canopy.shape", `"blade"`}, kv{"canopy.diameter", "0.005"}), with(func(c *Canopy) { c.Shape, c.Diameter = ShapeBlade, 0.005 })},
		{"fixed drag coefficient", withBlock(kv{"canopy.drag_coefficient", "2.5"}), with(func(c *Canopy) { c.DragCoefficient = 2.5 })},
		{"fixed law named", withBlock(kv{"canopy.drag_law", `"fixed"`}), def},
		{"cylinder law", withBlock(kv{"canopy.drag_law", `"cylinder"`}, kv{"canopy.diameter", "0.006"}),
			with(func(c *Canopy) { c.DragLaw, c.DragCoefficient, c.Diameter = DragCylinder, 0, 0.006 })},
		{"linear law", withBlock(kv{"canopy.drag_law", `"linear"`}, kv{"canopy.linear_rate", "0.5"}),
			with(func(c *Canopy) { c.DragLaw, c.DragCoefficient, c.LinearRate = DragLinear, 0, 0.5 })},
		{"solid fraction", withBlock(kv{"canopy.solid_fraction", "0.1"}), with(func(c *Canopy) { c.SolidFraction = 0.1 })},
		{"profile rows, integers as numbers", []kv{{"canopy.profile", "[[0, 4], [0.2, 4], [0.5, 0]]"}},
			Canopy{Profile: [][2]float64{{0, 4}, {0.2, 4}, {0.5, 0}}, Shape: ShapeCylinder, DragLaw: DragFixed, DragCoefficient: 1}},
		{"profile file", []kv{{"canopy.profile_file", `"meadow.csv"`}},
			Canopy{ProfileFile: "meadow.csv", Shape: ShapeCylinder, DragLaw: DragFixed, DragCoefficient: 1}},
		{"patches that touch", withBlock(kv{"canopy.patch[0].start", "0.5"}, kv{"canopy.patch[0].end", "1.0"}, kv{"canopy.patch[1].start", "1.0"}, kv{"canopy.patch[1].end", "1.5"}),
			with(func(c *Canopy) { c.Patches = []Patch{{Start: 0.5, End: 1}, {Start: 1, End: 1.5}} })},
		{"wrap-around patch", withBlock(kv{"canopy.patch[0].start", "1.8"}, kv{"canopy.patch[0].end", "0.2"}, kv{"canopy.patch[0].edge_width", "0.2"}, kv{"canopy.patch[1].start", "0.2"}, kv{"canopy.patch[1].end", "1.8"}),
			with(func(c *Canopy) { c.Patches = []Patch{{Start: 1.8, End: 0.2, EdgeWidth: 0.2}, {Start: 0.2, End: 1.8}} })},
		{"patch over the whole slice", withBlock(kv{"canopy.patch[0].start", "0"}, kv{"canopy.patch[0].end", "2"}),
			with(func(c *Canopy) { c.Patches = []Patch{{Start: 0, End: 2}} })},
		{"inline array of patches", withBlock(kv{"canopy.patch", "[{ start = 0.1, end = 0.4 }, { start = 1.9, end = 0.05 }]"}),
			with(func(c *Canopy) { c.Patches = []Patch{{Start: 0.1, End: 0.4}, {Start: 1.9, End: 0.05}} })},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			text, _ := build(tt.set)
			c, err := Parse([]byte(text))
			if err != nil {
				t.Fatalf("%v\ntext:\n%s", err, text)
			}
			if c.Canopy == nil || !reflect.DeepEqual(*c.Canopy, tt.want) {
				t.Errorf("canopy\n got %+v\nwant %+v", c.Canopy, tt.want)
			}
			if err := c.Validate(); err != nil {
				t.Errorf("parsed case does not validate: %v", err)
			}
		})
	}
}

func TestTurbulenceAndSpinUpAccepted(t *testing.T) {
	tests := []struct {
		name   string
		set    []kv
		turb   Turbulence
		spinUp float64
	}{
		{"defaults", nil, Turbulence{Closure: ClosureSmagorinsky, Smagorinsky: 0.2}, 0},
		{"own constant", []kv{{"turbulence.smagorinsky", "0.1"}}, Turbulence{Closure: ClosureSmagorinsky, Smagorinsky: 0.1}, 0},
		{"largest constant", []kv{{"turbulence.smagorinsky", "0.5"}}, Turbulence{Closure: ClosureSmagorinsky, Smagorinsky: 0.5}, 0},
		{"direct simulation", []kv{{"turbulence.closure", `"none"`}}, Turbulence{Closure: ClosureNone}, 0},
		{"spin-up", []kv{{"time.spin_up", "2.5"}}, Turbulence{Closure: ClosureSmagorinsky, Smagorinsky: 0.2}, 2.5},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			text, _ := build(tt.set)
			c, err := Parse([]byte(text))
			if err != nil {
				t.Fatal(err)
			}
			if c.Turbulence != tt.turb || c.Time.SpinUp != tt.spinUp {
				t.Errorf("turbulence %+v spin-up %g, want %+v %g", c.Turbulence, c.Time.SpinUp, tt.turb, tt.spinUp)
			}
		})
	}
}

func TestDragBalancedWithCanopy(t *testing.T) {
	text, _ := build([]kv{{"canopy.height", "0.2"}, {"canopy.frontal_area", "4"}, {"initial.profile", `"drag-balanced"`}})
	c, err := Parse([]byte(text))
	if err != nil {
		t.Fatal(err)
	}
	if c.Initial.Profile != ProfileDragBalanced {
		t.Errorf("profile %q", c.Initial.Profile)
	}
	// A broken [canopy] gives one problem, not a second one about the
	// drag-balanced profile that needs it.
	text, _ = build([]kv{{"canopy", "3"}, {"initial.profile", `"drag-balanced"`}})
	_, err = Parse([]byte(text))
	var es *Errors
	if !errors.As(err, &es) || len(es.Problems) != 1 || es.Problems[0].Key != "canopy" {
		t.Errorf("got %v, want one problem for canopy", err)
	}
}

// TestArrayLines checks that problems inside multi-line arrays and arrays
// of tables carry the line of the row or key itself.
func TestArrayLines(t *testing.T) {
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
profile = [
  [0.00, 4.0],   # line 18
  [0.10, 4.0],
  [0.05, 2.0],   # line 20: not above the row before
  [0.30, 0.0],
]

[[canopy.patch]]
start = 0.2
end = 1.0

[[canopy.patch]]
# a comment
start = 3.0     # line 30: outside the domain
end = 1.5

[[canopy.patch]]
start = 1.2
end = 1.9
edge_width = -1 # line 36
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
		{"canopy.profile[2]", "[0.05, 2.0]", 20},
		{"canopy.patch[1].start", "3.0", 30},
		{"canopy.patch[2].edge_width", "-1", 36},
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
}

func TestSplitIndex(t *testing.T) {
	tests := []struct {
		in   string
		base string
		i    int
		ok   bool
	}{
		{"canopy.patch[1]", "canopy.patch", 1, true},
		{"canopy.profile[12]", "canopy.profile", 12, true},
		{"canopy.profile[2][0]", "canopy.profile[2]", 0, true},
		{"canopy.patch[1].start", "", 0, false},
		{"canopy.patch", "", 0, false},
		{`canopy."a[1]"`, "", 0, false},
		{"canopy.patch[x]", "", 0, false},
		{"canopy.patch[-1]", "", 0, false},
		{"[1]", "", 0, false},
	}
	for _, tt := range tests {
		base, i, ok := stricttoml.SplitIndex(tt.in)
		if base != tt.base || i != tt.i || ok != tt.ok {
			t.Errorf("stricttoml.SplitIndex(%q) = %q, %d, %v; want %q, %d, %v", tt.in, base, i, ok, tt.base, tt.i, tt.ok)
		}
	}
}

func TestOrdinal(t *testing.T) {
	want := map[int]string{1: "1st", 2: "2nd", 3: "3rd", 4: "4th", 11: "11th", 12: "12th", 13: "13th", 21: "21st", 22: "22nd", 101: "101st", 111: "111th"}
	for n, w := range want {
		if got := stricttoml.Ordinal(n); got != w {
			t.Errorf("stricttoml.Ordinal(%d) = %q, want %q", n, got, w)
		}
	}
}

func TestPatchLength(t *testing.T) {
	tests := []struct {
		p    Patch
		want float64 // m, on a slice 2 m long
	}{
		{Patch{Start: 0.5, End: 1.5}, 1},
		{Patch{Start: 1.5, End: 0.5}, 1},
		{Patch{Start: 0, End: 2}, 2},
	}
	for _, tt := range tests {
		if got := tt.p.Length(2); got != tt.want {
			t.Errorf("%+v.Length(2) = %g, want %g", tt.p, got, tt.want)
		}
	}
}

// TestProfileFileResolved checks that Load stores canopy.profile_file
// relative to the folder of the case file, and Parse keeps it as written.
func TestProfileFileResolved(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "cases")
	if err := os.Mkdir(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	abs := filepath.Join(t.TempDir(), "abs.csv")
	tests := []struct {
		name, file, want string
	}{
		{"beside the case", "meadow.csv", filepath.Join(dir, "meadow.csv")},
		{"in a sub-folder", "profiles/meadow.csv", filepath.Join(dir, "profiles", "meadow.csv")},
		{"in the parent folder", "../meadow.csv", filepath.Join(filepath.Dir(dir), "meadow.csv")},
		{"absolute", abs, abs},
	}
	for i, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			text, _ := build([]kv{{"canopy.profile_file", `'` + tt.file + `'`}})
			path := filepath.Join(dir, "case"+string(rune('a'+i))+".toml")
			if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
				t.Fatal(err)
			}
			c, err := Load(path)
			if err != nil {
				t.Fatal(err)
			}
			if c.Canopy.ProfileFile != tt.want {
				t.Errorf("Load: profile_file %q, want %q", c.Canopy.ProfileFile, tt.want)
			}
			if err := c.Validate(); err != nil {
				t.Errorf("loaded case does not validate: %v", err)
			}
			c, err = Parse([]byte(text))
			if err != nil || c.Canopy.ProfileFile != tt.file {
				t.Errorf("Parse: profile_file %q (%v), want %q as written", c.Canopy.ProfileFile, err, tt.file)
			}
		})
	}
}

// TestValidateCanopy edits a parsed case with a valid canopy the way a
// sweep would, and expects one problem, without a line, for the key named.
func TestValidateCanopy(t *testing.T) {
	text, _ := build([]kv{{"canopy.height", "0.2"}, {"canopy.frontal_area", "4"}, {"initial.profile", `"drag-balanced"`}})
	base, err := Parse([]byte(text))
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name string
		edit func(c *Case)
		key  string
	}{
		{"canopy taller than the domain", func(c *Case) { c.Canopy.Height = 0.7 }, "canopy.height"},
		{"deeper canopy than a shallower domain", func(c *Case) { c.Domain.Depth = 0.15; c.Initial.PerturbationAt = 0.1 }, "canopy.height"},
		{"no profile", func(c *Case) { c.Canopy.Height, c.Canopy.FrontalArea = 0, 0 }, "canopy"},
		{"block without frontal area", func(c *Case) { c.Canopy.FrontalArea = 0 }, "canopy.frontal_area"},
		{"block and profile", func(c *Case) { c.Canopy.Profile = [][2]float64{{0, 1}, {0.1, 0}} }, "canopy.profile"},
		{"profile too short", func(c *Case) { c.Canopy.Height, c.Canopy.FrontalArea, c.Canopy.Profile = 0, 0, [][2]float64{} }, "canopy.profile"},
		{"profile unsorted", func(c *Case) {
			c.Canopy.Height, c.Canopy.FrontalArea, c.Canopy.Profile = 0, 0, [][2]float64{{0, 1}, {0.2, 1}, {0.1, 0}}
		}, "canopy.profile[2]"},
		{"empty shape", func(c *Case) { c.Canopy.Shape = "" }, "canopy.shape"},
		{"empty drag law", func(c *Case) { c.Canopy.DragLaw = "" }, "canopy.drag_law"},
		{"drag coefficient zero", func(c *Case) { c.Canopy.DragCoefficient = 0 }, "canopy.drag_coefficient"},
		{"cylinder law with a C_D", func(c *Case) { c.Canopy.DragLaw, c.Canopy.Diameter = DragCylinder, 0.01 }, "canopy.drag_coefficient"},
		{"cylinder law without diameter", func(c *Case) { c.Canopy.DragLaw, c.Canopy.DragCoefficient = DragCylinder, 0 }, "canopy.diameter"},
		{"linear law without rate", func(c *Case) { c.Canopy.DragLaw, c.Canopy.DragCoefficient = DragLinear, 0 }, "canopy.linear_rate"},
		{"linear rate with fixed law", func(c *Case) { c.Canopy.LinearRate = 1 }, "canopy.linear_rate"},
		{"overlapping patches", func(c *Case) { c.Canopy.Patches = []Patch{{Start: 0, End: 1}, {Start: 1.5, End: 0.5}} }, "canopy.patch[1]"},
		{"empty patch", func(c *Case) { c.Canopy.Patches = []Patch{{}} }, "canopy.patch[0].end"},
		{"patch past a shorter domain", func(c *Case) { c.Canopy.Patches = []Patch{{Start: 0.5, End: 1.5}}; c.Domain.Length = 1 }, "canopy.patch[0].end"},
		{"drag-balanced without canopy", func(c *Case) { c.Canopy = nil }, "initial.profile"},
		{"smagorinsky with closure none", func(c *Case) { c.Turbulence.Closure = ClosureNone }, "turbulence.smagorinsky"},
		{"empty closure", func(c *Case) { c.Turbulence.Closure = "" }, "turbulence.closure"},
		{"no smagorinsky constant", func(c *Case) { c.Turbulence.Smagorinsky = 0 }, "turbulence.smagorinsky"},
		{"spin-up past the end", func(c *Case) { c.Time.SpinUp = 11 }, "time.spin_up"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			c := *base
			cp := *base.Canopy
			c.Canopy = &cp
			tt.edit(&c)
			err := c.Validate()
			var es *Errors
			if !errors.As(err, &es) || len(es.Problems) != 1 || es.Problems[0].Key != tt.key || es.Problems[0].Line != 0 {
				t.Errorf("Validate() = %v, want one problem for %s without a line", err, tt.key)
			}
		})
	}
	// Sweeping values within their ranges keeps the case valid.
	c := *base
	c.Canopy = &Canopy{Profile: [][2]float64{{0, 6}, {0.3, 0}}, Shape: ShapeBlade, Diameter: 0.004, DragLaw: DragLinear, LinearRate: 2,
		Patches: []Patch{{Start: 1.5, End: 0.5, EdgeWidth: 0.1}, {Start: 0.5, End: 1}}}
	c.Turbulence = Turbulence{Closure: ClosureNone}
	if err := c.Validate(); err != nil {
		t.Errorf("valid edit: %v", err)
	}
	if base.Canopy.Height != 0.2 {
		t.Error("the edits reached the parsed case")
	}
}

func TestMeadowFixture(t *testing.T) {
	c, err := Load(filepath.Join("testdata", "meadow.toml"))
	if err != nil {
		t.Fatal(err)
	}
	want := Canopy{
		Profile:  [][2]float64{{0, 3}, {0.1, 5}, {0.2, 4}, {0.25, 0}},
		Shape:    ShapeCylinder,
		Diameter: 0.006,
		DragLaw:  DragCylinder,
		Patches:  []Patch{{Start: 0.2, End: 1.2, EdgeWidth: 0.05}, {Start: 1.7, End: 0.1, EdgeWidth: 0.02}},
	}
	if c.Canopy == nil || !reflect.DeepEqual(*c.Canopy, want) {
		t.Errorf("canopy\n got %+v\nwant %+v", c.Canopy, want)
	}
	if c.Turbulence.Smagorinsky != 0.17 || c.Time.SpinUp != 30 || c.Initial.Profile != ProfileDragBalanced {
		t.Errorf("turbulence %+v, spin-up %g, profile %q", c.Turbulence, c.Time.SpinUp, c.Initial.Profile)
	}
	if !strings.Contains(c.Text, "[[canopy.patch]]") {
		t.Error("Case.Text lost the file")
	}
}
