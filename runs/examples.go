package runs

import (
	"embed"
	"fmt"
	"io/fs"
	"sort"
	"strings"

	"github.com/BurntSushi/toml"
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

//go:embed examples/sweeps/*.toml
var sweepExamples embed.FS

// SweepExamples lists the names of the embedded example sweeps (sweep file
// names without .toml), sorted. The folder also holds the base cases they
// name; those are not listed.
func SweepExamples() []string {
	ents, err := fs.ReadDir(sweepExamples, "examples/sweeps")
	if err != nil {
		panic(err)
	}
	var names []string
	for _, e := range ents {
		b, err := sweepExamples.ReadFile("examples/sweeps/" + e.Name())
		if err != nil {
			panic(err)
		}
		if sweepBase(b) != "" {
			names = append(names, strings.TrimSuffix(e.Name(), ".toml"))
		}
	}
	sort.Strings(names)
	return names
}

// SweepExample returns the files of the named example sweep, by file name:
// the sweep file (NAME.toml) and the base case it names, to be written side
// by side.
func SweepExample(name string) (map[string][]byte, error) {
	b, err := sweepExamples.ReadFile("examples/sweeps/" + name + ".toml")
	base := sweepBase(b)
	if err != nil || base == "" {
		return nil, fmt.Errorf("no example sweep %q; the examples are %s", name, strings.Join(SweepExamples(), ", "))
	}
	bb, err := sweepExamples.ReadFile("examples/sweeps/" + base)
	if err != nil {
		panic("runs: example sweep " + name + " names a base case missing from the binary: " + base)
	}
	return map[string][]byte{name + ".toml": b, base: bb}, nil
}

// sweepBase returns the base case a sweep file names (its top-level base
// key), or "" for a file that is not a sweep.
func sweepBase(text []byte) string {
	var head struct {
		Base string `toml:"base"`
	}
	if _, err := toml.Decode(string(text), &head); err != nil {
		return ""
	}
	return head.Base
}
