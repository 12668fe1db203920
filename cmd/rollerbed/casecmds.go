package main

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"os/signal"
	"path/filepath"
	"sort"
	"strings"
	"syscall"
	"text/tabwriter"
	"time"

	"rollerbed/io/casefile"
	"rollerbed/io/diskspace"
	"rollerbed/io/h5"
	"rollerbed/io/livepage"
	"rollerbed/io/runfolder"
	"rollerbed/runs"
	"rollerbed/solver"
)

func cmdInit(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("init", "FILE", "Writes a commented case file documenting every key, to edit and run.\nRefuses to overwrite an existing file.", stdout, stderr)
	pos, code, ok := fs.parse(args)
	if !ok {
		return code
	}
	if code, ok := fs.wantArgs(pos, 1, "one FILE to write, e.g. `rollerbed init meadow.toml`"); !ok {
		return code
	}
	if err := casefile.WriteTemplate(pos[0]); err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	fmt.Fprintf(stdout, "wrote %s; check it with `rollerbed check %s`\n", pos[0], pos[0])
	return exitOK
}

// loadCase reads CASE, or the built-in demo when path is empty. A sweep
// file given as CASE is named as such, with the command it takes.
func loadCase(path string) (*casefile.Case, *runs.Spec, error) {
	var c *casefile.Case
	var err error
	if path == "" {
		c, err = casefile.Parse(runs.Demo())
	} else {
		c, err = casefile.Load(path)
	}
	if err != nil {
		if k := wrongKind(path, kindCase); k != nil {
			return nil, nil, k
		}
		return nil, nil, err
	}
	sp, err := runs.FromCase(c, filepath.Dir(path))
	if err != nil {
		return nil, nil, err
	}
	return c, sp, nil
}

func cmdCheck(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("check", "CASE", "Validates a case file and prints the derived numbers: grid spacings, Reynolds number,\nthe step the Courant limit allows, estimated run time, memory and output size.", stdout, stderr)
	out := fs.String("out", ".", "`DIR` whose free disk space to compare the output size with")
	pos, code, ok := fs.parse(args)
	if !ok {
		return code
	}
	if code, ok := fs.wantArgs(pos, 1, "one CASE file to check, e.g. `rollerbed check meadow.toml`"); !ok {
		return code
	}
	_, sp, err := loadCase(pos[0])
	if err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	est, free, err := estimate(pos[0], sp, *out)
	if err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	c := sp.Solver
	w := tabwriter.NewWriter(stdout, 0, 4, 2, ' ', 0)
	fmt.Fprintf(w, "case\t%s\tvalid\n", pos[0])
	if sp.Title != "" {
		fmt.Fprintf(w, "title\t%s\n", sp.Title)
	}
	if c.Ny > 1 {
		fmt.Fprintf(w, "grid\t%d × %d × %d cells\t%.4g m × %.4g m × %.4g m (x × y × z, a slab)\n", c.Nx, c.Ny, c.Nz, c.Lx, c.Ly, c.H)
	} else {
		fmt.Fprintf(w, "grid\t%d × %d cells\t%.4g m × %.4g m\n", c.Nx, c.Nz, c.Lx, c.H)
	}
	fmt.Fprintf(w, "Δx\t%.4g m\t%d Fourier modes kept (2/3 rule)\n", est.Dx, est.KeptModes)
	if c.Ny > 1 {
		fmt.Fprintf(w, "Δy\t%.4g m\t%d spanwise Fourier modes kept (2/3 rule)\n", est.Dy, est.KeptModesY)
	}
	fmt.Fprintf(w, "Δz\t%.4g to %.4g m\tneighbour ratio up to %.3f\n", est.DzMin, est.DzMax, est.SpacingRatio)
	fmt.Fprintf(w, "viscosity\t%.5g m²/s\n", c.Viscosity)
	fmt.Fprintf(w, "velocity scale\t%.4g m/s\tfrom the initial state and the forcing\n", est.VelocityScale)
	fmt.Fprintf(w, "Reynolds number\t%.4g\tvelocity scale × depth / viscosity\n", est.Reynolds)
	if sp.FixedStep > 0 {
		fmt.Fprintf(w, "time step\t%.4g s\tfixed; Courant number about %.2g at the velocity scale (stable below %.2g)\n", est.Step, est.Courant, runs.StableCourant)
	} else {
		fmt.Fprintf(w, "time step\t%.4g s\tat Courant number %.2g and the velocity scale; it adapts as the flow changes\n", est.Step, est.Courant)
	}
	fmt.Fprintf(w, "steps\t%d\tfor %.4g s simulated\n", est.Steps, sp.Duration)
	how := "measured here"
	if !est.CostMeasured {
		how = "measured here on fewer columns, scaled as N log N"
	}
	fmt.Fprintf(w, "cost per step\t%s\t%s, %d worker(s)\n", est.StepCost.Round(time.Microsecond), how, max(c.Workers, 1))
	fmt.Fprintf(w, "estimated run time\t%s\n", runs.DurationText(est.WallTime))
	fmt.Fprintf(w, "memory\t%s\tpeak, from a formula fitted to measured runs\n", diskspace.Format(est.MemoryBytes))
	if free >= 0 {
		fmt.Fprintf(w, "output size\t%s\t%s free in %s\n", diskspace.Format(est.OutputBytes), diskspace.Format(free), *out)
	} else {
		fmt.Fprintf(w, "output size\t%s\n", diskspace.Format(est.OutputBytes))
	}
	w.Flush()
	for _, warn := range append(runs.Warnings(sp), runs.FitWarnings(sp, est)...) {
		fmt.Fprintln(stderr, "warning: "+warn)
	}
	return exitOK
}

// estimate estimates a run of the case at path and refuses, with the key
// and the fix, one that does not fit this machine: its memory, its number
// of steps, or its output in the free disk space of the folder outDir
// (free is -1 when that cannot be measured).
func estimate(path string, sp *runs.Spec, outDir string) (est *runs.Estimate, free int64, err error) {
	est, err = runs.EstimateRun(sp)
	free = -1
	if err == nil {
		if f, ok := diskspace.Free(outDir); ok {
			free = int64(min(f, math.MaxInt64))
			if est.OutputBytes > free {
				err = &casefile.Errors{Problems: []*casefile.Problem{{Key: "output.snapshot_every", Value: fmt.Sprint(sp.Output.SnapshotEvery),
					Msg: fmt.Sprintf("the run would write about %s, more than the %s free in %s; write fewer snapshots (a larger output.snapshot_every), fewer output.fields, or free disk space", diskspace.Format(est.OutputBytes), diskspace.Format(free), outDir)}}}
			}
		}
	}
	var ce *casefile.Errors
	if errors.As(err, &ce) && path != "" {
		for _, p := range ce.Problems {
			if p.File == "" {
				p.File = path
			}
		}
	}
	return est, free, err
}

// restoreCase makes sure the run folder dir to resume holds its case file
// path: one that is missing is written back from the folder's checkpoint,
// which holds the case the run started with. It returns why the folder
// cannot be resumed, or "".
func restoreCase(dir, path string, stderr io.Writer) string {
	if _, err := os.Stat(path); !errors.Is(err, fs.ErrNotExist) {
		return ""
	}
	if st, err := os.Stat(dir); err != nil || !st.IsDir() {
		return fmt.Sprintf("cannot resume %s: no such run folder; start a run with: rollerbed run CASE --out %s", dir, dir)
	}
	text, err := runs.StartedCase(dir)
	switch {
	case errors.Is(err, h5.ErrNoCheckpoint):
		return fmt.Sprintf("cannot resume %s: it is not a run folder that can go on (it holds neither %s nor a checkpoint); start a run with: rollerbed run CASE --out %s", dir, runfolder.CaseFile, dir)
	case err != nil:
		return fmt.Sprintf("cannot resume %s: its %s is missing and its checkpoint cannot be read: %v", dir, runfolder.CaseFile, err)
	}
	if err := runfolder.WriteFileAtomic(path, []byte(text)); err != nil {
		return fmt.Sprintf("cannot resume %s: its %s is missing and cannot be written back from the checkpoint: %v", dir, runfolder.CaseFile, err)
	}
	fmt.Fprintf(stderr, "note: %s was missing; it is written back from the checkpoint, which holds the case the run started with\n", path)
	return ""
}

// runArgs is the usage line of the run command.
const runArgs = "[CASE] --out DIR [--force] | --resume DIR"

func cmdRun(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("run", runArgs,
		"Runs a case file (without CASE: the built-in demo) and writes the run folder DIR.\n"+
			"With --resume DIR it continues an interrupted run from its newest valid checkpoint,\n"+
			"using the "+runfolder.CaseFile+" kept in DIR. Ctrl-C (or SIGTERM) stops after the current step,\n"+
			"writes a checkpoint and says how to resume. At the end it writes the figures into\n"+
			"DIR/figures (as `rollerbed report DIR` does) unless --no-figures is given, and\n"+
			"DIR/"+runfolder.ReportFile+", one self-contained file with the summary, figures and case.\n"+
			"--watch ADDR serves a live page of the run while it goes (see `rollerbed help watch`).\n\n"+
			"Exit codes: 0 finished (or already finished), 1 failed (a blow-up, a write error),\n"+
			"2 a mistake in the command line or the case file, 75 interrupted: resume it.", stdout, stderr)
	out := fs.String("out", "", "run folder `DIR` to write")
	resume := fs.String("resume", "", "run folder `DIR` to continue")
	force := fs.Bool("force", false, "write into an existing, non-empty run folder")
	quiet := fs.Bool("quiet", false, "print no progress, only the result")
	noFigures := fs.Bool("no-figures", false, "write no figures at the end ('rollerbed report DIR' writes them later)")
	watch := fs.String("watch", "", "serve a live page of the run on `ADDR` (e.g. "+livepage.DefaultAddress+"), kept up after the end until Ctrl-C")
	wf := addWatchFlags(fs)
	pos, code, ok := fs.parse(args)
	if !ok {
		return code
	}
	switch {
	case *out == "" && *resume == "":
		return fs.usageError("missing --out DIR, the run folder to write (or --resume DIR to continue one)")
	case *out != "" && *resume != "":
		return fs.usageError("--out and --resume do not go together: --out starts a new run, --resume continues the one in its folder")
	case *resume != "" && len(pos) > 0:
		return fs.usageError("--resume takes no CASE (got %s): it continues with the %s kept in %s", strings.Join(pos, " "), runfolder.CaseFile, *resume)
	case *resume != "" && *force:
		return fs.usageError("--force does not go with --resume: --resume keeps what the folder holds")
	case len(pos) > 1:
		return fs.usageError("takes at most one CASE, got %d: %s", len(pos), strings.Join(pos, " "))
	}
	dir, path := *out, ""
	if len(pos) == 1 {
		path = pos[0]
	}
	if *resume != "" {
		dir, path = *resume, filepath.Join(*resume, runfolder.CaseFile)
		if msg := restoreCase(dir, path, stderr); msg != "" {
			return fail(stderr, exitUsage, "%s", msg)
		}
	}
	_, sp, err := loadCase(path)
	if err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	if path == "" {
		fmt.Fprintf(stdout, "running the built-in demo: %s\n", sp.Title)
	}
	if *resume == "" {
		est, _, err := estimate(path, sp, dir)
		if err != nil {
			return fail(stderr, exitUsage, "%v", err)
		}
		for _, w := range append(runs.Warnings(sp), runs.FitWarnings(sp, est)...) {
			fmt.Fprintln(stderr, "warning: "+w)
		}
	}
	opt := runs.Options{Dir: dir, Force: *force, Resume: *resume != ""}
	var page *livepage.Server
	var lastView *livepage.View // the page's newest view
	if *watch != "" {
		if page, err = startPage("--watch", *watch, *wf.remote, dir, stdout); err != nil {
			return fail(stderr, exitUsage, "%v", err)
		}
		defer page.Close()
		opt.Watch = func(f *runs.Frame) {
			lastView = frameView(f)
			page.Publish(lastView)
		}
		opt.WatchEvery, opt.WatchScalar = watchEvery, *wf.scalar
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	var pp *progressPrinter
	if !*quiet {
		pp = newProgressPrinter(stderr)
		opt.Progress, opt.ProgressEvery = pp.show, pp.every()
	}
	res, err := runs.Run(ctx, sp, opt)
	if pp != nil {
		pp.done()
	}
	var done *runs.FinishedError
	if errors.As(err, &done) {
		fmt.Fprintf(stdout, "%s is already finished: it reached t = %.6g s, the end of its case; nothing to resume.\nIts results: rollerbed report %s\n", dir, done.Time, dir)
		return exitOK
	}
	var werr *runs.WriteError
	if res == nil && errors.As(err, &werr) {
		return fail(stderr, exitFail, "%v", err)
	}
	if res == nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	for _, w := range res.Warnings {
		fmt.Fprintln(stderr, "warning: "+w)
	}
	var blow *solver.BlowUpError
	if errors.As(err, &blow) {
		kept := "no checkpoint was written before it"
		if res.Checkpoint != "" {
			kept = "the last good checkpoint, " + res.Checkpoint + ", is kept there"
		}
		return fail(stderr, exitFail, "%v\nwhat was computed up to then is in %s; %s", err, dir, kept)
	}
	if err != nil {
		return fail(stderr, exitFail, "%v", err)
	}
	printResult(stdout, dir, res)
	if !*noFigures {
		if err := writeFigures(dir, "", stdout, stderr); err != nil {
			fmt.Fprintf(stderr, "warning: the figures: %v\n", err)
		}
	}
	if err := writeRunReport(dir, stdout); err != nil {
		fmt.Fprintf(stderr, "warning: %v\n", err)
	}
	if page != nil && lastView != nil && !res.Interrupted {
		lastView.Links = livepage.FolderLinks(dir)
		page.Publish(lastView)
		serveUntilInterrupted(page, stdout)
	}
	if res.Interrupted {
		fmt.Fprintln(stderr, interruptedHint(res.SimTime, dir, os.Getenv(runs.SweepTaskEnv)))
		return exitInterrupted
	}
	return exitOK
}

// interruptedHint says how an interrupted run at t (s) in folder dir goes
// on: resumed on its own, or, when it ran as a task of the sweep folder
// sweep, by resubmitting the sweep.
func interruptedHint(t float64, dir, sweep string) string {
	if sweep != "" {
		return fmt.Sprintf("interrupted at t = %.6g s; a checkpoint is in %s. Resubmit the unfinished members of the sweep, this one resuming, with:\n  rollerbed sweep submit %s", t, dir, sweep)
	}
	return fmt.Sprintf("interrupted at t = %.6g s; a checkpoint is in %s. Continue with:\n  rollerbed run --resume %s", t, dir, dir)
}

func printResult(stdout io.Writer, dir string, res *runs.Result) {
	w := tabwriter.NewWriter(stdout, 0, 4, 2, ' ', 0)
	state := "finished"
	if res.Interrupted {
		state = "interrupted"
	}
	if res.Resumed {
		state += fmt.Sprintf(" (resumed from t = %.6g s)", res.ResumedFrom)
	}
	fmt.Fprintf(w, "run\t%s\t%s\n", state, dir)
	fmt.Fprintf(w, "steps\t%d\t%.4g s simulated in %s\n", res.Steps, res.SimTime, res.WallTime.Round(time.Millisecond))
	fmt.Fprintf(w, "bulk velocity\t%.5g m/s\n", res.Bulk)
	fmt.Fprintf(w, "pressure gradient\t%.5g m/s²\n", res.Gradient)
	fmt.Fprintf(w, "max divergence\t%.2g\trelative to the largest velocity gradient\n", res.MaxDivergence)
	if f := res.Summary; f != nil {
		row := func(name string, v *float64, unit string) {
			if v != nil {
				fmt.Fprintf(w, "%s\t%.4g %s\n", name, *v, unit)
			}
		}
		fl := f.Flow
		row("U at canopy top", fl.UTop, "m/s")
		row("U1 / U2", fl.U1, "m/s (lower edge)")
		row("", fl.U2, "m/s (upper edge)")
		row("momentum thickness", fl.MomentumThickness, "m")
		row("shear length Ls", fl.ShearLength, "m")
		row("penetration depth", fl.PenetrationDepth, "m")
		row("roller frequency", fl.RollerFrequency, "Hz")
		row("Strouhal f θ/Ū", fl.Strouhal, "")
		row("roller spacing", fl.RollerSpacing, "m")
		row("sweep/ejection", fl.SweepEjectionRatio, "")
		names := make([]string, 0, len(f.Scalars))
		for name := range f.Scalars {
			names = append(names, name)
		}
		sort.Strings(names)
		for _, name := range names {
			sc := f.Scalars[name]
			fmt.Fprintf(w, "%s uptake\t%.4g elements + %.4g bed = %.4g\tunit·m/s per bed area\n", name, sc.ElementUptake, sc.BedUptake, sc.TotalUptake)
			row(name+" exchange velocity", sc.ExchangeVelocity, "m/s")
			row(name+" boundary-layer share", sc.BoundaryLayerShare, "of the element resistance")
			fmt.Fprintf(w, "%s budget imbalance\t%.2g\trelative\n", name, sc.Imbalance)
		}
	}
	w.Flush()
}

func cmdVersion(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("version", "[--json]", "Prints the program version, then the build's revision, the Go, HDF5 and FFTW\n"+
		"versions and the host: what fields.h5 and summary.json record as their provenance.", stdout, stderr)
	asJSON := fs.Bool("json", false, "print the version and provenance as one JSON object (as in summary.json)")
	pos, code, ok := fs.parse(args)
	if !ok {
		return code
	}
	if code, ok := fs.wantArgs(pos, 0, "no arguments"); !ok {
		return code
	}
	p := runs.Provenance()
	if *asJSON {
		enc := json.NewEncoder(stdout)
		enc.SetIndent("", "  ")
		if err := enc.Encode(p); err != nil {
			return fail(stderr, exitFail, "%v", err)
		}
		return exitOK
	}
	fmt.Fprintln(stdout, "rollerbed", p.Version)
	tw := tabwriter.NewWriter(stdout, 0, 0, 2, ' ', 0)
	for _, f := range p.Facts() {
		if f.Key != "version" && f.Key != "command_line" {
			fmt.Fprintf(tw, "%s\t%s\n", f.Label, *f.Value)
		}
	}
	if err := tw.Flush(); err != nil {
		return fail(stderr, exitFail, "%v", err)
	}
	return exitOK
}
