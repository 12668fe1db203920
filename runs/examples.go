package runs

import (
	"embed"
	"fmt"
	"io/fs"
	"sort"
	"strings"
)

//go:embed examples/*.toml
var examples embed.FS

// Demo returns the text of the built-in demo case.
func Demo() []byte {
	b, err := examples.ReadFile("examples/demo.toml")
	if err != nil {
		panic("runs: demo case missing from the binary: " + err.Error())
	}
	return b
}

// Examples lists the names of the embedded example cases (file names
// without .toml), sorted.
func Examples() []string {
	ents, err := fs.ReadDir(examples, "examples")
	if err != nil {
		panic(err)
	}
	var names []string
	for _, e := range ents {
		names = append(names, strings.TrimSuffix(e.Name(), ".toml"))
	}
	sort.Strings(names)
	return names
}

// Example returns the text of the named example case.
func Example(name string) ([]byte, error) {
	b, err := examples.ReadFile("examples/" + name + ".toml")
	if err != nil {
		return nil, fmt.Errorf("no example case %q; the examples are %s", name, strings.Join(Examples(), ", "))
	}
	return b, nil
}
