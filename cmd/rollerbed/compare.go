package main

import (
	"encoding/json"
	"fmt"
	"io"
	"path/filepath"

	"rollerbed/io/htmlreport"
	"rollerbed/io/report"
	"rollerbed/io/runfolder"
)

// compareArgs and compareSummary describe the compare command in the usage.
const (
	compareArgs    = "RUNDIR RUNDIR... [--json] [--out DIR]"
	compareSummary = "compare the summaries of runs side by side, with overlay figures"
)

// comparison is the JSON that compare --json prints.
type comparison struct {
	*runfolder.Comparison
	Figures []string `json:"figures"`          // overlay figures written
	Notes   []string `json:"notes"`            // figures or runs left out, and why
	Report  string   `json:"report,omitempty"` // report.html written
}

func cmdCompare(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("compare", compareArgs,
		"Prints every numeric key of the runs' summary.json side by side: one row per key\n"+
			"with its unit, one column per run, and after each run but the first a column\n"+
			"\"÷ first\" with its value over the first run's; \"–\" marks a value a run lacks, and\n"+
			"a ratio not taken: to a first value that is round-off (at most 1e-9 of the largest\n"+
			"value of that quantity in the runs), or of a key that measures round-off itself\n"+
			"(flow.max_divergence, budget_relative_imbalance).\n"+
			"Writes overlay figures of the mean velocity profiles (profiles.png), of the\n"+
			"spectra of w at each run's probes (spectra.png) and, for runs with scalars, of the\n"+
			"mean concentration profiles (scalars.png) and the element uptake by height\n"+
			"(uptake.png) into the --out folder, and "+runfolder.ReportFile+" there: the table and the figures\n"+
			"in one self-contained file.", stdout, stderr)
	asJSON := fs.Bool("json", false, "print the comparison as JSON (runs, rows of key, unit, values, ratio_to_first)")
	out := fs.String("out", "", "`DIR` for the overlay figures (default: figures/compare in the first run folder)")
	noFigures := fs.Bool("no-figures", false, "print the comparison only")
	dirs, code, ok := fs.parse(args)
	if !ok {
		return code
	}
	if len(dirs) < 2 {
		return fs.usageError("needs two or more run folders, got %d, e.g. `rollerbed compare runs/a runs/b` (one run's summary: `rollerbed report DIR`)", len(dirs))
	}
	for _, d := range dirs {
		if err := runfolder.Check(d); err != nil {
			return fail(stderr, exitUsage, "%v", err)
		}
	}
	cmp, err := runfolder.Compare(dirs)
	if err != nil {
		return fail(stderr, exitFail, "%v", err)
	}
	res := comparison{Comparison: cmp, Figures: []string{}, Notes: []string{}}
	status := exitOK
	if !*noFigures {
		dir := *out
		if dir == "" {
			dir = filepath.Join(dirs[0], runfolder.FiguresDir, "compare")
		}
		paths, notes, err := report.CompareFigures(dirs, dir)
		res.Figures = append(res.Figures, paths...)
		for _, n := range notes {
			res.Notes = append(res.Notes, n.String())
			fmt.Fprintln(stderr, "note: "+n.String())
		}
		if err != nil {
			status = fail(stderr, exitFail, "%v", err)
		}
		rep, err := htmlreport.WriteComparison(cmp, paths, dir)
		if err != nil {
			status = fail(stderr, exitFail, "%s: %v", runfolder.ReportFile, err)
		} else {
			res.Report = rep
		}
	}
	if *asJSON {
		enc := json.NewEncoder(stdout)
		enc.SetIndent("", "  ")
		if err := enc.Encode(res); err != nil {
			return fail(stderr, exitFail, "%v", err)
		}
		return status
	}
	if err := cmp.WriteTable(stdout); err != nil {
		return fail(stderr, exitFail, "%v", err)
	}
	if len(res.Figures) > 0 {
		fmt.Fprintln(stdout, "\nfigures:")
		for _, p := range res.Figures {
			fmt.Fprintln(stdout, "  "+p)
		}
	}
	if res.Report != "" {
		fmt.Fprintf(stdout, "\nreport (one file, figures inside): %s\n", res.Report)
	}
	return status
}
