package casefile

import (
	"errors"
	"reflect"
	"regexp"
	"strings"
	"testing"

	"rollerbed/solver/transform"
)

// codeCase returns a valid case of 600 s built in code, as a sweep or a
// test of another package would build one, without Parse.
func codeCase() *Case {
	return &Case{
		Title: "built in code",
		Domain: Domain{Length: 2, Depth: 0.5, Nx: 64, Nz: 32,
			Cluster: Cluster{Bed: 1, BedWidth: 0.05, AtFactor: 1, AtWidth: 0.025}},
		Fluid:      Fluid{Viscosity: 1e-6},
		Bed:        Bed{Condition: NoSlip},
		Top:        Top{Condition: FreeSlip},
		Turbulence: Turbulence{Closure: ClosureSmagorinsky, Smagorinsky: 0.2},
		Forcing:    Forcing{Kind: ForcingGradient, Gradient: 1e-5},
		Initial:    Initial{Profile: ProfileRest, PerturbationAt: 0.25, PerturbationWidth: 0.5, Seed: 1},
		Time:       Time{Duration: 600, CFL: 0.5},
		Numerics:   Numerics{Transform: transform.FFTW.String()},
		Output: Output{ProfileEvery: 6, SnapshotEvery: 12, Fields: []string{FieldU, FieldW, FieldVorticity},
			Compression: 4, CheckpointEvery: 60, CheckpointWallMinutes: 30, Probes: 8},
	}
}

func TestValidateOutput(t *testing.T) {
	if err := codeCase().Validate(); err != nil {
		t.Fatalf("case built in code does not validate: %v", err)
	}
	tests := []struct {
		name     string
		edit     func(o *Output)
		key, val string
		msgPart  string
	}{
		{"profile every zero", func(o *Output) { o.ProfileEvery = 0 }, "output.profile_every", "0", "must be a finite number > 0 (simulated time between mean-profile rows, s); at most time.duration = 600 s; e.g. profile_every = 6"},
		{"snapshot every negative", func(o *Output) { o.SnapshotEvery = -1 }, "output.snapshot_every", "-1", "must be a finite number >= 0"},
		{"snapshot every above duration", func(o *Output) { o.SnapshotEvery = 601 }, "output.snapshot_every", "601", "must not exceed time.duration = 600 s"},
		{"no fields", func(o *Output) { o.Fields = nil }, "output.fields", "[]", "must list at least one field"},
		{"empty fields", func(o *Output) { o.Fields = []string{} }, "output.fields", "[]", "must list at least one field"},
		{"unknown field", func(o *Output) { o.Fields = []string{"u", "pressure"} }, "output.fields[1]", `"pressure"`, `must be one of "u", "w", "p", "vorticity", "nu_t"`},
		{"repeated field", func(o *Output) { o.Fields = []string{"w", "p", "p"} }, "output.fields[2]", `"p"`, "repeats output.fields[1] (the 2nd entry of output.fields)"},
		{"compression 10", func(o *Output) { o.Compression = 10 }, "output.compression", "10", "must be an integer from 0 to 9"},
		{"checkpoint every zero", func(o *Output) { o.CheckpointEvery = 0 }, "output.checkpoint_every", "0", "must be a finite number > 0"},
		{"checkpoint every above duration", func(o *Output) { o.CheckpointEvery = 700 }, "output.checkpoint_every", "700", "must not exceed time.duration = 600 s, or no checkpoint would come due in simulated time; e.g. checkpoint_every = 60"},
		{"checkpoint wall zero", func(o *Output) { o.CheckpointWallMinutes = 0 }, "output.checkpoint_wall_minutes", "0", "must be > 0 and <= 1440"},
		{"checkpoint wall two days", func(o *Output) { o.CheckpointWallMinutes = 2880 }, "output.checkpoint_wall_minutes", "2880", "must be > 0 and <= 1440"},
		{"probes zero", func(o *Output) { o.Probes = 0 }, "output.probes", "0", "must be an integer from 1 to 64"},
		{"probes too many", func(o *Output) { o.Probes = 100 }, "output.probes", "100", "must be an integer from 1 to 64"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			c := codeCase()
			tt.edit(&c.Output)
			err := c.Validate()
			var es *Errors
			if !errors.As(err, &es) || len(es.Problems) != 1 {
				t.Fatalf("Validate() = %v, want one problem for %s", err, tt.key)
			}
			p := es.Problems[0]
			if p.Key != tt.key || p.Value != tt.val || p.Line != 0 || !strings.Contains(p.Msg, tt.msgPart) {
				t.Errorf("problem %q (line %d)\nwant key %q value %q without a line, message containing %q", p.Error(), p.Line, tt.key, tt.val, tt.msgPart)
			}
		})
	}

	// Validate applies no defaults: a zero Output is wrong wherever zero is
	// not an allowed value (compression 0 and snapshot_every 0 are).
	c := codeCase()
	c.Output = Output{}
	var es *Errors
	if err := c.Validate(); !errors.As(err, &es) {
		t.Fatalf("zero Output: Validate() = %v", err)
	}
	var keys []string
	for _, p := range es.Problems {
		keys = append(keys, p.Key)
	}
	want := []string{"output.profile_every", "output.fields", "output.checkpoint_every", "output.checkpoint_wall_minutes", "output.probes"}
	if !reflect.DeepEqual(keys, want) {
		t.Errorf("zero Output: problems for %v, want %v\n%v", keys, want, es)
	}

	// A bad duration hides the comparisons with it, but not the rules of
	// the output keys themselves.
	c = codeCase()
	c.Time.Duration = -1
	c.Output.Probes = 0
	if err := c.Validate(); !errors.As(err, &es) || len(es.Problems) != 2 || es.Problems[0].Key != "time.duration" || es.Problems[1].Key != "output.probes" {
		t.Errorf("bad duration: Validate() = %v, want problems for time.duration and output.probes", err)
	}
}

func TestOutputDefaults(t *testing.T) {
	tests := []struct {
		duration string
		want     Output
	}{
		{"10.0", Output{ProfileEvery: 0.1, SnapshotEvery: 0.2, Fields: []string{"u", "w", "p", "vorticity", "nu_t"},
			Compression: 4, CheckpointEvery: 1, CheckpointWallMinutes: 30, Probes: 8}},
		{"600", Output{ProfileEvery: 6, SnapshotEvery: 12, Fields: []string{"u", "w", "p", "vorticity", "nu_t"},
			Compression: 4, CheckpointEvery: 60, CheckpointWallMinutes: 30, Probes: 8}},
	}
	for _, tt := range tests {
		t.Run(tt.duration, func(t *testing.T) {
			text, _ := build([]kv{{"time.duration", tt.duration}})
			c, err := Parse([]byte(text))
			if err != nil {
				t.Fatal(err)
			}
			if !reflect.DeepEqual(c.Output, tt.want) {
				t.Errorf("output defaults %+v, want %+v", c.Output, tt.want)
			}
			// The default list is the case's own: changing it changes no
			// other case.
			c.Output.Fields[0] = "changed"
			again, err := Parse([]byte(text))
			if err != nil || again.Output.Fields[0] != FieldU {
				t.Errorf("default fields shared between cases: %v, %v", again.Output.Fields, err)
			}
		})
	}
}

func TestFieldNames(t *testing.T) {
	c := codeCase()
	want := []string{"u", "w", "p", "vorticity", "nu_t"}
	got := c.FieldNames()
	if !reflect.DeepEqual(got, want) {
		t.Fatalf("FieldNames() = %v, want %v", got, want)
	}
	got[0] = "changed"
	if again := c.FieldNames(); again[0] != FieldU {
		t.Errorf("FieldNames() shares its slice: %v", again)
	}
	// Every allowed name is accepted on its own, and in any order or all
	// together.
	for _, raw := range []string{`["u"]`, `["w"]`, `["p"]`, `["vorticity"]`, `["nu_t"]`, `['nu_t', "u"]`,
		`["u", "w", "p", "vorticity", "nu_t",]`} {
		text, _ := build([]kv{{"output.fields", raw}})
		if _, err := Parse([]byte(text)); err != nil {
			t.Errorf("fields = %s: %v", raw, err)
		}
	}
}

// TestFieldEntryLines checks that problems of entries of a multi-line
// fields array carry the lines of the entries themselves, and that a bad
// entry raises one problem only.
func TestFieldEntryLines(t *testing.T) {
	text, _ := build(nil)
	text += `
[output]
fields = [
  "u",
  3,          # line 5 of the table: not a string
  "vorticty", # a typo
  "w",
  "u",        # a repeat
]
probes = 0
`
	header := strings.Count(text[:strings.Index(text, "[output]")], "\n") + 1
	want := []struct {
		key  string
		line int
	}{
		{"output.fields[1]", header + 3},
		{"output.fields[2]", header + 4},
		{"output.fields[4]", header + 6},
		{"output.probes", header + 8},
	}
	_, err := Parse([]byte(text))
	var es *Errors
	if !errors.As(err, &es) || len(es.Problems) != len(want) {
		t.Fatalf("got %v, want %d problems", err, len(want))
	}
	for i, w := range want {
		if p := es.Problems[i]; p.Key != w.key || p.Line != w.line {
			t.Errorf("problem %d: %q at line %d, want %s at line %d", i, p.Error(), p.Line, w.key, w.line)
		}
	}
}

// TestTemplateOutputValues checks that the values the [output] block of the
// template shows commented out are valid and match its defaults for the
// template's duration.
func TestTemplateOutputValues(t *testing.T) {
	tmpl := Template()
	block := outputTemplate()
	assign := regexp.MustCompile(`^# ([a-z_]+ = .*)$`)
	var shown []string
	for _, line := range strings.Split(block, "\n") {
		// phase_bins applies only under waves or tides, which the
		// template's demo does not have.
		if m := assign.FindStringSubmatch(line); m != nil && !strings.HasPrefix(m[1], "phase_bins") {
			shown = append(shown, m[1])
		}
	}
	if len(shown) != 7 {
		t.Fatalf("the [output] block shows %d keys, want 7: %q", len(shown), shown)
	}
	defaults, err := Parse([]byte(tmpl))
	if err != nil {
		t.Fatal(err)
	}
	text := strings.Replace(tmpl, block, "[output]\n"+strings.Join(shown, "\n")+"\n", 1)
	c, err := Parse([]byte(text))
	if err != nil {
		t.Fatalf("the values shown in [output] do not parse:\n%v", err)
	}
	if !reflect.DeepEqual(c.Output, defaults.Output) {
		t.Errorf("values shown %+v differ from the defaults %+v", c.Output, defaults.Output)
	}
}
