package stricttoml

import (
	"errors"
	"reflect"
	"strings"
	"testing"
)

// testDoc is a small document kind with every kind of key the decoder
// knows.
type testDoc struct {
	Name   string       `toml:"name" example:"name = \"flume\""`
	Count  int          `toml:"count"`
	Scale  float64      `toml:"scale"`
	On     bool         `toml:"on"`
	Tags   []string     `toml:"tags"`
	Seeds  []int64      `toml:"seeds"`
	Rows   [][2]float64 `toml:"rows" row:"[z, a]"`
	Raw    any          `toml:"raw"`
	Inner  testInner    `toml:"inner"`
	Opt    *testInner   `toml:"opt"`
	Items  []testInner  `toml:"item"`
	Hidden string       `toml:"-"`
}

type testInner struct {
	Width float64 `toml:"width"`
	Label string  `toml:"label"`
}

var testFormat = Format{Doc: "test file", Example: "the test template"}

func TestDecode(t *testing.T) {
	text := `name = "a"
count = 3
scale = 2
on = true
tags = ["x", "y"]
seeds = [4, 5]
rows = [[0, 1.5], [0.2, 0]]
raw = [1, "two"]
[inner]
width = 0.1
[[item]]
label = "p"
[[item]]
width = 2.0
`
	doc, err := testFormat.Read([]byte(text), "t.toml")
	if err != nil {
		t.Fatal(err)
	}
	var d testDoc
	doc.Decode(&d)
	if err := doc.Problems.Err(); err != nil {
		t.Fatal(err)
	}
	want := testDoc{Name: "a", Count: 3, Scale: 2, On: true, Tags: []string{"x", "y"}, Seeds: []int64{4, 5},
		Rows: [][2]float64{{0, 1.5}, {0.2, 0}}, Raw: []any{int64(1), "two"}, Inner: testInner{Width: 0.1},
		Items: []testInner{{Label: "p"}, {Width: 2}}}
	if !reflect.DeepEqual(d, want) {
		t.Errorf("decoded\n%+v\nwant\n%+v", d, want)
	}
	for key, has := range map[string]bool{"name": true, "inner.width": true, "item[1].width": true, "opt": false, "item[0].width": false} {
		if doc.Problems.Has(key) != has {
			t.Errorf("Has(%s) = %v, want %v", key, !has, has)
		}
	}
}

func TestDecodeProblems(t *testing.T) {
	for _, tc := range []struct {
		name, text string
		want       []string // the problems, in order
	}{
		{"wrong types", "name = 3\ncount = 2.0\nscale = \"1.5\"\non = \"yes\"\n", []string{
			`test file line 1: name = 3: must be a string, not an integer; put the text in double quotes, e.g. name = "flume"`,
			`test file line 2: count = 2.0: must be an integer, not a float; write count = 2 (no decimal point)`,
			`test file line 3: scale = "1.5": must be a number, not a string; write scale = 1.5 without quotes`,
			`test file line 4: on = "yes": must be true or false, not a string; write on = true or on = false, without quotes`,
		}},
		{"quoted non-finite", "scale = \"nan\"\n", []string{
			`test file line 1: scale = "nan": must be a number, not a string; write a plain number, e.g. scale = 1.0`,
		}},
		{"entries", "tags = [\"x\", 2]\nseeds = [1, \"2\"]\nrows = [[0, 1], [2]]\n", []string{
			`test file line 1: tags[1] = 2: must be a string, not an integer (the 2nd entry of tags); put each entry in double quotes, e.g. tags = ["...", "..."]`,
			`test file line 2: seeds[1] = "2": must be an integer, not a string (the 2nd entry of seeds); write e.g. seeds = [1, 2, 3]`,
			`test file line 3: rows[1] = [2]: must be a row [z, a] of 2 numbers, not 1`,
		}},
		{"unknown keys, case-sensitive", "Name = \"a\"\n[inner]\nwidht = 1.0\nlabel = \"b\"\nscale = 1\n", []string{
			`test file line 1: Name = "a": unknown key at the top level; did you mean name? (keys are case-sensitive) (known here: name, count, scale, on, tags, seeds, rows, raw, [inner], [opt], [[item]])`,
			`test file line 3: inner.widht = 1.0: unknown key in [inner]; did you mean inner.width? (known here: width, label)`,
			`test file line 5: inner.scale = 1: unknown key in [inner]; did you mean scale? (known here: width, label)`,
		}},
		{"tables", "inner = 3\nitem = { width = 1 }\n[[opt]]\n", []string{
			`test file line 1: inner = 3: must be a table, not an integer; write it as a [inner] section with its keys below`,
			`test file line 2: item = { width = 1 }: must be an array of tables, not a table; write each element under its own [[item]] header (two brackets)`,
			`test file line 3: opt: must be a table, not an array of tables; write it as a [opt] section with its keys below`,
		}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			doc, err := testFormat.Read([]byte(tc.text), "")
			if err != nil {
				t.Fatal(err)
			}
			var d testDoc
			doc.Decode(&d)
			var es *Errors
			if err := doc.Problems.Err(); !errors.As(err, &es) {
				t.Fatalf("no problems: %v", err)
			}
			got := strings.Split(es.Error(), "\n")
			if !reflect.DeepEqual(got, tc.want) {
				t.Errorf("problems\n%s\nwant\n%s", strings.Join(got, "\n"), strings.Join(tc.want, "\n"))
			}
		})
	}
}

func TestReadSyntaxError(t *testing.T) {
	_, err := testFormat.Read([]byte("a = 1\nb = \n"), "t.toml")
	var es *Errors
	if !errors.As(err, &es) || len(es.Problems) != 1 {
		t.Fatalf("Read: %v, want one problem", err)
	}
	p := es.Problems[0]
	if p.File != "t.toml" || p.Line != 2 || !strings.HasPrefix(p.Msg, "TOML syntax error") || !strings.HasSuffix(p.Msg, "compare with the test template") {
		t.Errorf("problem %+v", p)
	}
}

func TestProblemsOneLinePerKey(t *testing.T) {
	p := NewProblems("test file")
	p.Add("a.b", "1", "first")
	p.Add("a.b", "1", "second, dropped")
	p.Add("a", "", "the table")
	p.Add("a.c", "2", "under a bad table? no: a was not bad when a.b was added")
	p.Suppress("d")
	p.Add("d.e", "", "dropped: d is suppressed")
	p.Derive("f", "a.b")
	p.Add("f", "", "dropped: f is derived from a.b")
	var es *Errors
	if !errors.As(p.Err(), &es) {
		t.Fatal("no problems")
	}
	var msgs []string
	for _, q := range es.Problems {
		msgs = append(msgs, q.Msg)
	}
	if want := []string{"first", "the table"}; !reflect.DeepEqual(msgs, want) {
		t.Errorf("problems %q, want %q", msgs, want)
	}
	if got := es.Problems[0].Error(); got != "test file: a.b = 1: first" {
		t.Errorf("Error() = %q", got)
	}
}
