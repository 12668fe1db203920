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
	} {
		text, _ := build(set)
		f.Add([]byte(text))
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
