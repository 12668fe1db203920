package stricttoml

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/BurntSushi/toml"
)

// FuzzScan holds the key scanner to the TOML library: for every text the
// library accepts, Scan finds every key of MetaData.Keys, at a line of the
// text, and invents none (its extra keys are implicit tables, array
// elements, or keys inside array values). Text nesting deeper than
// MaxDepth is refused instead. Scan must never panic, on any input.
func FuzzScan(f *testing.F) {
	for _, glob := range []string{"../casefile/testdata/*.toml", "../../runs/sweep/testdata/*.toml", "../../runs/sweep/testdata/*/*.toml", "../../runs/examples/*.toml"} {
		names, _ := filepath.Glob(glob)
		for _, name := range names {
			text, err := os.ReadFile(name)
			if err != nil {
				f.Fatal(err)
			}
			f.Add(string(text))
		}
	}
	for _, s := range []string{
		"title = \"t\"\n[domain]\nnx = 256 # cells\n[domain.cluster]\nbed = 2.0\n",
		"a = [{b = 1, c = {d = 2}}, {e = 3}]\n[[x]]\ny = 1\n[[x]]\nz = 2\n[x.w]\nq = 1\n[[x.v]]\nr = 1\n",
		"p.q = {r = 1}\n[s]\nt.u = 2\n\"odd key\".'x y' = 3\n",
		"m = \"\"\"\n[not]\nk = 1\n\"\"\"\nl = '''\n x = 1'''\nn = \"a # b = 2\"\n",
		"rows = [\n  [0.0, 4.0], # one\n  [0.2, 0.0],\n]\nt = 1979-05-27T07:32:00Z\n",
		"a = [[{b = 1}], [{c = [1, {d = 2}]}]]\n",
		"\"\\u0061\" = 1\n'b.c' = 2\n[\"x\".'y']\nz = 3\n",
		// Nesting around the bound, and far beyond it.
		"a = " + strings.Repeat("[", MaxDepth-1) + strings.Repeat("]", MaxDepth-1) + "\n",
		"a = " + strings.Repeat("[", MaxDepth+1) + strings.Repeat("]", MaxDepth+1) + "\n",
		"a = " + strings.Repeat("{b = ", MaxDepth) + "1" + strings.Repeat("}", MaxDepth) + "\n",
		strings.Repeat("k.", MaxDepth+1) + "k = 1\n",
	} {
		f.Add(s)
	}
	for _, in := range deepInputs() {
		f.Add(in.text)
	}
	f.Fuzz(func(t *testing.T, text string) {
		pos, deep := Scan(text)
		if deep > 0 {
			if deep > strings.Count(text, "\n")+1 {
				t.Fatalf("refused at line %d of a text of %d lines", deep, strings.Count(text, "\n")+1)
			}
			return
		}
		var raw map[string]any
		md, err := toml.Decode(text, &raw)
		if err != nil {
			return
		}
		lines := strings.Count(text, "\n") + 1
		found := map[string]bool{}
		for k, p := range pos {
			if p.Line < 1 || p.Line > lines {
				t.Errorf("key %s at line %d of %d", k, p.Line, lines)
			}
			found[stripIndices(k)] = true
		}
		libKeys := map[string]toml.Key{}
		for _, k := range md.Keys() {
			parts := make([]string, len(k))
			for i, c := range k {
				parts[i] = Component(c)
			}
			key := KeyString(parts)
			libKeys[key] = k
			if !found[key] {
				t.Errorf("the library has key %s, the scanner does not", key)
			}
		}
		for k := range found {
			if _, ok := libKeys[k]; !ok && !underLibraryKey(k, libKeys, raw) {
				t.Errorf("the scanner found key %s, which the library does not have", k)
			}
		}
	})
}

// underLibraryKey reports whether key is an implicit table above a
// library key, or lies inside the array value of one.
func underLibraryKey(key string, libKeys map[string]toml.Key, raw map[string]any) bool {
	for k, parts := range libKeys {
		if strings.HasPrefix(k, key+".") || strings.HasPrefix(key, k+".") && isArrayAt(raw, parts) {
			return true
		}
	}
	return false
}

// isArrayAt reports whether the value at the key parts of the decoded
// document v is an inline array (in any element of an array of tables on
// the way).
func isArrayAt(v any, parts []string) bool {
	switch x := v.(type) {
	case map[string]any:
		if len(parts) == 0 {
			return false
		}
		return isArrayAt(x[parts[0]], parts[1:])
	case []map[string]any:
		for _, e := range x {
			if isArrayAt(e, parts) {
				return true
			}
		}
		return false
	case []any:
		return len(parts) == 0
	}
	return false
}

// stripIndices removes the element indices ("[0]") from a scanned key,
// outside quoted components: "a[1].b[0][2]" → "a.b".
func stripIndices(key string) string {
	var b strings.Builder
	inQuote := false
	for i := 0; i < len(key); i++ {
		c := key[i]
		switch {
		case c == '\\' && inQuote && i+1 < len(key):
			b.WriteByte(c)
			i++
			c = key[i]
		case c == '"':
			inQuote = !inQuote
		case c == '[' && !inQuote:
			for i < len(key) && key[i] != ']' {
				i++
			}
			continue
		}
		b.WriteByte(c)
	}
	return b.String()
}
