package stricttoml

import (
	"strings"
	"testing"

	"github.com/BurntSushi/toml"
)

func TestScanPositions(t *testing.T) {
	tests := []struct {
		name string
		text string
		want map[string]Pos // only these are checked
	}{
		{
			name: "tables and keys",
			text: "title = \"t\"\n\n[domain]\nnx = 256 # cells\nnz=64\n[domain.cluster]\nbed = 2.0\n",
			want: map[string]Pos{
				"title": {1, `"t"`}, "domain": {3, ""}, "domain.nx": {4, "256"}, "domain.nz": {5, "64"},
				"domain.cluster": {6, ""}, "domain.cluster.bed": {7, "2.0"},
			},
		},
		{
			name: "comments and strings hide keys",
			text: "# nx = 1\n[time] # [domain]\ns = \"a # b = 2\"\nm = \"\"\"\nnx = 3\n[domain]\n\"\"\"\nl = '''\n x = 1'''\nduration = 5\n",
			want: map[string]Pos{
				"time": {2, ""}, "time.s": {3, `"a # b = 2"`}, "time.m": {4, `""" …`}, "time.l": {8, "''' …"},
				"time.duration": {10, "5"},
			},
		},
		{
			name: "escaped quotes in strings",
			text: "a = \"x\\\"y = 1\"\nb = \"\"\"q\\\"\"\"\"\"\nc = 3\n",
			want: map[string]Pos{"a": {1, `"x\"y = 1"`}, "b": {2, `"""q\"""""`}, "c": {3, "3"}},
		},
		{
			name: "dotted and quoted keys",
			text: "domain.nx = 8\n\"domain\" . 'nz' = 16\n[fluid]\n\"odd key\" = 1\nsub.deep.k = 2\n",
			want: map[string]Pos{
				"domain": {1, ""}, "domain.nx": {1, "8"}, "domain.nz": {2, "16"},
				`fluid."odd key"`: {4, "1"}, "fluid.sub": {5, ""}, "fluid.sub.deep.k": {5, "2"},
			},
		},
		{
			name: "inline tables and arrays",
			text: "[domain]\ncluster = { bed = 2, at = 0.1 }\nlist = [\n  1, # one\n  { k = 2 },\n]\nnz = 8\n",
			want: map[string]Pos{
				"domain.cluster": {2, "{ bed = 2, at = 0.1 }"}, "domain.cluster.bed": {2, "2"}, "domain.cluster.at": {2, "0.1"},
				"domain.list": {3, "[ …"}, "domain.nz": {7, "8"},
			},
		},
		{
			name: "arrays of tables",
			text: "[[scalar]]\nname = \"o2\"\n[[scalar]]\nname = \"no3\"\n[scalar.uptake]\nk = 1\n[[scalar.site]]\nz = 0.1\n",
			want: map[string]Pos{
				"scalar": {1, ""}, "scalar[0].name": {2, `"o2"`}, "scalar[1].name": {4, `"no3"`},
				"scalar[1].uptake.k": {6, "1"}, "scalar[1].site[0].z": {8, "0.1"},
			},
		},
		{
			name: "CRLF line ends and datetimes",
			text: "[time]\r\nduration = 5\r\nwhen = 1979-05-27 07:32:00Z\r\ncfl = 0.5\r\n",
			want: map[string]Pos{"time.duration": {2, "5"}, "time.when": {3, "1979-05-27 07:32:00Z"}, "time.cfl": {4, "0.5"}},
		},
		{
			name: "long value",
			text: "title = \"" + strings.Repeat("é", 40) + "\"\n",
			want: map[string]Pos{"title": {1, "\"" + strings.Repeat("é", 29) + " …"}},
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var m map[string]any
			md, err := toml.Decode(tt.text, &m)
			if err != nil {
				t.Fatalf("test text is not valid TOML: %v", err)
			}
			got, _ := Scan(tt.text)
			for k, want := range tt.want {
				if got[k] != want {
					t.Errorf("%s: got %+v, want %+v", k, got[k], want)
				}
			}
			// Every key the library knows outside arrays is found.
			for _, k := range md.Keys() {
				if strings.Contains(tt.text, "[[") || strings.Contains(tt.text, "list") {
					break
				}
				if _, ok := got[KeyString(componentsOf(k))]; !ok {
					t.Errorf("key %s not found by the scanner", k)
				}
			}
		})
	}
}

func componentsOf(k toml.Key) []string {
	parts := make([]string, len(k))
	for i, c := range k {
		parts[i] = Component(c)
	}
	return parts
}

func TestScannerToleratesBrokenText(t *testing.T) {
	// The scanner only sees text the TOML library accepted, but it must not
	// hang or panic on anything.
	for _, text := range []string{"", "[", "[[", "a", "a =", "a = \"", "a = '''", "a = [", "a = {", "a = { b", "\"", "a.\"", "= 1", "[a.]", "a = \"\\u12\"", "\"\\U0001F600\" = 1"} {
		Scan(text)
	}
}

func TestUnescapeBasic(t *testing.T) {
	tests := []struct{ in, want string }{
		{`plain`, "plain"}, {`a\"b`, `a"b`}, {`\\`, `\`}, {`\t\n`, "\t\n"}, {`\u00e9`, "é"},
		{`\U0001F600`, "😀"}, {`\x41`, "A"}, {`\e`, "\x1b"}, {`\u12`, "u12"}, {`\`, `\`},
	}
	for _, tt := range tests {
		if got := unescapeBasic(tt.in); got != tt.want {
			t.Errorf("unescapeBasic(%q) = %q, want %q", tt.in, got, tt.want)
		}
	}
}

func TestScanArrayElements(t *testing.T) {
	const text = "[canopy]\nprofile = [\n  [0.0, 4.0],\n  [0.2, 0.0],\n]\npatch = [{ start = 0.1, end = 0.4 },\n  { start = 1.0, end = 1.5 }]\n"
	got, _ := Scan(text)
	want := map[string]Pos{
		"canopy.profile":        {2, "[ …"},
		"canopy.profile[0]":     {3, "[0.0, 4.0]"},
		"canopy.profile[1]":     {4, "[0.2, 0.0]"},
		"canopy.profile[1][0]":  {4, "0.2"},
		"canopy.patch[0]":       {6, "{ start = 0.1, end = 0.4 }"},
		"canopy.patch[0].end":   {6, "0.4"},
		"canopy.patch[1].start": {7, "1.0"},
		"canopy.patch[1]":       {7, "{ start = 1.0, end = 1.5 }"},
		"canopy.patch":          {6, "[{ start = 0.1, end = 0.4 }, …"},
		"canopy.patch[1].end":   {7, "1.5"},
		"canopy.profile[0][1]":  {3, "4.0"},
		"canopy.patch[0].start": {6, "0.1"},
		"canopy":                {1, ""},
		"canopy.profile[1][1]":  {4, "0.0"},
		"canopy.profile[0][0]":  {3, "0.0"},
	}
	for k, w := range want {
		if got[k] != w {
			t.Errorf("%s: got %+v, want %+v", k, got[k], w)
		}
	}
}
