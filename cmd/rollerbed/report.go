package main

import (
	"fmt"
	"io"

	"rollerbed/io/htmlreport"
	"rollerbed/io/report"
	"rollerbed/io/runfolder"
)

// reportArgs and reportSummary describe the report command in the usage.
const (
	reportArgs    = "RUNDIR [--no-figures] [--animate FIELD]"
	reportSummary = "print a run's summary table and rebuild its figures"
)

func cmdReport(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("report", reportArgs,
		"Prints the numbers of RUNDIR/summary.json as a table with their units, and rebuilds\n"+
			"the figures in RUNDIR/figures: vorticity.png, profiles.png, spectrum.png,\n"+
			"timeseries.png, uptake.png and scalars.png (runs with scalars) and the animation\n"+
			"rollers.gif, from the first snapshot on, and RUNDIR/"+runfolder.ReportFile+": one self-contained\n"+
			"file with the summary table, the figures with captions, the warnings, the case and the\n"+
			"cautions, to open without a server or send on. Works on a finished, interrupted or\n"+
			"still running run folder; a figure the folder has no data for yet is skipped with a\n"+
			"note. Exits 1 when the summary or a figure cannot be made.", stdout, stderr)
	noFigures := fs.Bool("no-figures", false, "print the summary table only")
	animate := fs.String("animate", report.Vorticity, "the snapshot `FIELD` that rollers.gif animates: vorticity, u, w, p, nu_t or a scalar's name (e.g. a dye)")
	pos, code, ok := fs.parse(args)
	if !ok {
		return code
	}
	if code, ok := fs.wantArgs(pos, 1, "one run folder RUNDIR (to put runs side by side: `rollerbed compare`)"); !ok {
		return code
	}
	dir := pos[0]
	if err := runfolder.Check(dir); err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	status := exitOK
	if es, err := runfolder.ReadEntries(dir); err != nil {
		status = fail(stderr, exitFail, "%v", err)
	} else {
		fmt.Fprintf(stdout, "summary of %s\n\n", dir)
		if err := runfolder.WriteSummaryTable(stdout, es); err != nil {
			return fail(stderr, exitFail, "%v", err)
		}
	}
	if *noFigures {
		return status
	}
	if err := writeFigures(dir, *animate, stdout, stderr); err != nil {
		return fail(stderr, exitFail, "%v", err)
	}
	if err := writeRunReport(dir, stdout); err != nil {
		return fail(stderr, exitFail, "%v", err)
	}
	return status
}

// writeRunReport writes report.html of run folder dir from its summary
// and figures and says where on stdout.
func writeRunReport(dir string, stdout io.Writer) error {
	path, err := htmlreport.Write(dir)
	if err != nil {
		return fmt.Errorf("%s: %w", runfolder.ReportFile, err)
	}
	fmt.Fprintf(stdout, "\nreport (one file, figures inside): %s\n", path)
	return nil
}

// writeFigures writes the figures of run folder dir, animating the named
// field (vorticity when ""), lists them on stdout and the figures left out
// on stderr.
func writeFigures(dir, animate string, stdout, stderr io.Writer) error {
	paths, notes, err := report.WriteFiguresWith(dir, report.Options{Animate: animate})
	if len(paths) > 0 {
		fmt.Fprintln(stdout, "\nfigures:")
		for _, p := range paths {
			fmt.Fprintln(stdout, "  "+p)
		}
	}
	for _, n := range notes {
		fmt.Fprintln(stderr, "note: "+n.String())
	}
	return err
}
