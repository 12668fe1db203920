package stricttoml

import (
	"errors"
	"runtime"
	"strings"
	"testing"
)

// deepInputs are texts that nest far beyond MaxDepth. Before the bound,
// 100 000 nested arrays (216 KB) took over 30 s and 7.2 GB in the key
// scanner, and 20 000 nested inline tables minutes and tens of GB in the
// TOML library (measured on the development machine).
type deepInput struct {
	name, text string
	line       int // where the nesting passes the bound
}

func deepInputs() []deepInput {
	return []deepInput{
		{"arrays", "[domain]\nnx = " + strings.Repeat("[", 100000) + strings.Repeat("]", 100000) + "\n", 2},
		{"inline tables", "a = " + strings.Repeat("{b = ", 20000) + "1" + strings.Repeat("}", 20000) + "\n", 1},
		{"dotted key", strings.Repeat("a.", 50000) + "a = 1\n", 1},
		{"table header", "[" + strings.Repeat("a.", 50000) + "a]\nb = 1\n", 1},
		{"arrays of tables", "x = 1\n" + strings.Repeat("[[a]]\n", 10) + "c = " + strings.Repeat("[{d = ", 5000) + "1" + strings.Repeat("}]", 5000) + "\n", 12},
		{"over lines", "a = [\n" + strings.Repeat("[\n", 300) + strings.Repeat("]\n", 300) + "]\n", MaxDepth},
	}
}

func TestReadRefusesDeepNesting(t *testing.T) {
	f := Format{Doc: "test file", Example: "the tests"}
	for _, in := range deepInputs() {
		text := in.text
		t.Run(in.name, func(t *testing.T) {
			var before, after runtime.MemStats
			runtime.ReadMemStats(&before)
			_, err := f.Read([]byte(text), "")
			runtime.ReadMemStats(&after)
			var es *Errors
			if !errors.As(err, &es) || len(es.Problems) != 1 {
				t.Fatalf("Read: %v, want one problem", err)
			}
			p := es.Problems[0]
			if p.Line != in.line || !strings.Contains(p.Msg, "nest more than 128 levels") || strings.ContainsAny(p.Error(), "\r\n") {
				t.Errorf("problem %q (line %d)", p.Error(), p.Line)
			}
			// Linear in the input: a few dozen bytes allocated per input
			// byte (the positions of the keys before the refusal), where
			// the unbounded scan allocated tens of thousands.
			if alloc := after.TotalAlloc - before.TotalAlloc; alloc > 64*uint64(len(text))+1<<20 {
				t.Errorf("allocated %d bytes for %d bytes of text", alloc, len(text))
			}
		})
	}
}

func TestReadAcceptsNestingUpToTheBound(t *testing.T) {
	f := Format{Doc: "test file", Example: "the tests"}
	for _, text := range []string{
		"a = " + strings.Repeat("[", MaxDepth-1) + strings.Repeat("]", MaxDepth-1) + "\n",
		strings.Repeat("k.", MaxDepth-1) + "k = 1\n",
		"[" + strings.Repeat("t.", MaxDepth/2-1) + "t]\n" + strings.Repeat("k.", MaxDepth/2-1) + "k = 1\n",
	} {
		if _, err := f.Read([]byte(text), ""); err != nil {
			t.Errorf("Read refused nesting within the bound: %v", err)
		}
	}
	if _, deep := Scan("a = " + strings.Repeat("[", MaxDepth) + strings.Repeat("]", MaxDepth)); deep != 1 {
		t.Errorf("Scan let one level more than MaxDepth pass (tooDeep = %d)", deep)
	}
}
