package main

import (
	"fmt"
	"os"

	"rollerbed/io/stricttoml"
)

// The two kinds of TOML file the command reads.
const (
	kindCase  = "case"
	kindSweep = "sweep"
)

// fileKind tells a case file from a sweep file by its top-level keys: a
// sweep file names a base case and its axes, a case file has a [domain]
// table. It returns "" when the file is unreadable or neither.
func fileKind(path string) string {
	text, err := os.ReadFile(path)
	if err != nil {
		return ""
	}
	pos, _ := stricttoml.Scan(string(text))
	_, base := pos["base"]
	_, axis := pos["axis"]
	_, domain := pos["domain"]
	switch {
	case (base || axis) && !domain:
		return kindSweep
	case domain && !base && !axis:
		return kindCase
	}
	return ""
}

// wrongKind returns, for a file that failed to load as want, the message
// that names its real kind and the command for it, or nil when the file is
// not plainly of the other kind.
func wrongKind(path, want string) error {
	switch got := fileKind(path); {
	case got == want || got == "":
		return nil
	case got == kindSweep:
		return fmt.Errorf("%s is a sweep file (it has base and [[axis]]), not a case file: plan its members with `rollerbed sweep plan %s --out DIR`, or check its base case with `rollerbed check`", path, path)
	default:
		return fmt.Errorf("%s is a case file (it has [domain]), not a sweep file: check it with `rollerbed check %s`, run it with `rollerbed run %s --out DIR`, or vary it by naming it in a sweep file (base = %q)", path, path, path, path)
	}
}
