package main

import (
	"encoding/json"
	"fmt"
	"io"
	"text/tabwriter"

	"rollerbed/solver/transform"
	"rollerbed/validation"
)

func cmdVerify(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("verify", "[--json] [--keep DIR] [--full] [NAME...]",
		"Runs the verification cases (all, or those named) and compares each with its exact or\npublished reference. Exits 1 when a check fails.", stdout, stderr)
	asJSON := fs.Bool("json", false, "print the checks as a JSON array")
	keep := fs.String("keep", "", "keep each case's run folder under `DIR`")
	full := fs.Bool("full", false, "run the fuller (slower) sizes")
	list := fs.Bool("list", false, "list the cases and exit")
	backend := fs.String("transform", "fftw", "transform backend `NAME`: fftw or gonum")
	workers := fs.Int("workers", 1, "`N` goroutines per run")
	names, code, ok := fs.parse(args)
	if !ok {
		return code
	}
	if *list {
		w := tabwriter.NewWriter(stdout, 0, 4, 2, ' ', 0)
		for _, c := range validation.Cases() {
			fmt.Fprintf(w, "%s\t%s\n", c.Name, c.Summary)
		}
		w.Flush()
		return exitOK
	}
	b, err := transform.ParseBackend(*backend)
	if err != nil {
		return fail(stderr, exitUsage, "--transform %q: %v", *backend, err)
	}
	checks, err := validation.Run(names, validation.Options{Full: *full, Keep: *keep, Backend: b, Workers: *workers})
	if err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	failed := 0
	for _, c := range checks {
		if !c.Pass {
			failed++
		}
	}
	if *asJSON {
		enc := json.NewEncoder(stdout)
		enc.SetIndent("", "  ")
		if checks == nil {
			checks = []validation.Check{}
		}
		if err := enc.Encode(checks); err != nil {
			return fail(stderr, exitFail, "%v", err)
		}
	} else {
		w := tabwriter.NewWriter(stdout, 0, 4, 2, ' ', 0)
		fmt.Fprintln(w, "case\tquantity\tmeasured\texpected\ttolerance\tresult\tsource")
		for _, c := range checks {
			res := "pass"
			if !c.Pass {
				res = "FAIL"
			}
			fmt.Fprintf(w, "%s\t%s\t%.6g\t%.6g\t%.3g %s\t%s\t%s\n", c.Name, c.Quantity, c.Measured, c.Expected, c.Tolerance, c.Kind, res, c.Source)
		}
		w.Flush()
		fmt.Fprintf(stdout, "\n%d passed, %d failed\n", len(checks)-failed, failed)
	}
	if failed > 0 {
		return exitFail
	}
	return exitOK
}
