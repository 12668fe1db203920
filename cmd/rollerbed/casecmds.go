package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"path/filepath"
	"rollerbed/io/runfolder"
	"sort"
	"syscall"
	"text/tabwriter"
	"time"

	"rollerbed/io/casefile"
	"rollerbed/runs"
	"rollerbed/solver"
)

func cmdInit(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("init", "FILE", "Writes a commented case file documenting every key, to edit and run.\nRefuses to overwrite an existing file.", stderr)
	pos, code, ok := parseOrExit(fs, args)
	if !ok {
		return code
	}
	if len(pos) != 1 {
		fs.Usage()
		return exitUsage
	}
	if err := casefile.WriteTemplate(pos[0]); err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	fmt.Fprintf(stdout, "wrote %s; check it with `rollerbed check %s`\n", pos[0], pos[0])
	return exitOK
}

// loadCase reads CASE, or the built-in demo when path is empty.
func loadCase(path string) (*casefile.Case, *runs.Spec, error) {
	var c *casefile.Case
	var err error
	if path == "" {
		c, err = casefile.Parse(runs.Demo())
	} else {
		c, err = casefile.Load(path)
	}
	if err != nil {
		return nil, nil, err
	}
	sp, err := runs.FromCase(c, filepath.Dir(path))
	if err != nil {
		return nil, nil, err
	}
	return c, sp, nil
}

func cmdCheck(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("check", "CASE", "Validates a case file and prints the derived numbers: grid spacings, Reynolds number,\nthe step the Courant limit allows, estimated run time, memory and output size.", stderr)
	out := fs.String("out", ".", "folder whose free disk space to compare the output size with")
	pos, code, ok := parseOrExit(fs, args)
	if !ok {
		return code
	}
	if len(pos) != 1 {
		fs.Usage()
		return exitUsage
	}
	_, sp, err := loadCase(pos[0])
	if err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	est, err := runs.EstimateRun(sp)
	if err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	c := sp.Solver
	w := tabwriter.NewWriter(stdout, 0, 4, 2, ' ', 0)
	fmt.Fprintf(w, "case\t%s\tvalid\n", pos[0])
	if sp.Title != "" {
		fmt.Fprintf(w, "title\t%s\n", sp.Title)
	}
	fmt.Fprintf(w, "grid\t%d × %d cells\t%.4g m × %.4g m\n", c.Nx, c.Nz, c.Lx, c.H)
	fmt.Fprintf(w, "Δx\t%.4g m\t%d Fourier modes kept (2/3 rule)\n", est.Dx, est.KeptModes)
	fmt.Fprintf(w, "Δz\t%.4g to %.4g m\tneighbour ratio up to %.3f\n", est.DzMin, est.DzMax, est.SpacingRatio)
	fmt.Fprintf(w, "viscosity\t%.5g m²/s\n", c.Viscosity)
	fmt.Fprintf(w, "velocity scale\t%.4g m/s\tfrom the initial state and the forcing\n", est.VelocityScale)
	fmt.Fprintf(w, "Reynolds number\t%.4g\tvelocity scale × depth / viscosity\n", est.Reynolds)
	fmt.Fprintf(w, "time step\t%.4g s\tat Courant number %.2g\n", est.Step, c.CFL)
	fmt.Fprintf(w, "steps\t%d\tfor %.4g s simulated\n", est.Steps, sp.Duration)
	fmt.Fprintf(w, "cost per step\t%s\tmeasured here, %d worker(s)\n", est.StepCost.Round(time.Microsecond), max(c.Workers, 1))
	fmt.Fprintf(w, "estimated run time\t%s\n", est.WallTime.Round(time.Second))
	fmt.Fprintf(w, "memory\t%s\n", bytesText(est.MemoryBytes))
	free, ferr := freeBytes(*out)
	if ferr == nil {
		fmt.Fprintf(w, "output size\t%s\t%s free in %s\n", bytesText(est.OutputBytes), bytesText(free), *out)
	} else {
		fmt.Fprintf(w, "output size\t%s\n", bytesText(est.OutputBytes))
	}
	w.Flush()
	for _, warn := range warnings(sp, est, free, ferr == nil) {
		fmt.Fprintln(stderr, "warning: "+warn)
	}
	return exitOK
}

// warnings lists what in a valid case is likely to go wrong.
func warnings(sp *runs.Spec, est *runs.Estimate, free int64, haveFree bool) []string {
	ws := runs.Warnings(sp)
	if haveFree && est.OutputBytes > free {
		ws = append(ws, fmt.Sprintf("the output (%s) does not fit in the free disk space (%s)", bytesText(est.OutputBytes), bytesText(free)))
	}
	if est.Steps > 50_000_000 {
		ws = append(ws, fmt.Sprintf("%d steps is very many; check time.duration and the grid", est.Steps))
	}
	return ws
}

func bytesText(b int64) string {
	switch {
	case b >= 1<<30:
		return fmt.Sprintf("%.1f GiB", float64(b)/(1<<30))
	case b >= 1<<20:
		return fmt.Sprintf("%.1f MiB", float64(b)/(1<<20))
	case b >= 1<<10:
		return fmt.Sprintf("%.1f KiB", float64(b)/(1<<10))
	}
	return fmt.Sprintf("%d B", b)
}

func freeBytes(dir string) (int64, error) {
	for d := dir; ; d = filepath.Dir(d) {
		var st syscall.Statfs_t
		if err := syscall.Statfs(d, &st); err == nil {
			return int64(st.Bavail) * int64(st.Bsize), nil
		}
		if d == filepath.Dir(d) {
			return 0, errors.New("no folder to measure")
		}
	}
}

func cmdRun(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("run", "[CASE] --out DIR [--force] [--quiet] | --resume DIR",
		"Runs a case file (without CASE: the built-in demo) and writes the run folder DIR.\n"+
			"With --resume DIR it continues an interrupted run from its newest valid checkpoint,\n"+
			"using the "+runfolder.CaseFile+" kept in DIR. Ctrl-C (or SIGTERM) stops after the current step,\n"+
			"writes a checkpoint and says how to resume.", stderr)
	out := fs.String("out", "", "run folder to write")
	resume := fs.String("resume", "", "run folder to continue")
	force := fs.Bool("force", false, "write into an existing, non-empty run folder")
	quiet := fs.Bool("quiet", false, "print no progress, only the result")
	pos, code, ok := parseOrExit(fs, args)
	if !ok {
		return code
	}
	if len(pos) > 1 || (*out == "") == (*resume == "") || (*resume != "" && len(pos) > 0) {
		fs.Usage()
		return exitUsage
	}
	dir, path := *out, ""
	if len(pos) == 1 {
		path = pos[0]
	}
	if *resume != "" {
		dir, path = *resume, filepath.Join(*resume, runfolder.CaseFile)
	}
	_, sp, err := loadCase(path)
	if err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	if path == "" {
		fmt.Fprintf(stdout, "running the built-in demo: %s\n", sp.Title)
	}
	if *resume == "" {
		for _, w := range runs.Warnings(sp) {
			fmt.Fprintln(stderr, "warning: "+w)
		}
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	opt := runs.Options{Dir: dir, Force: *force, Resume: *resume != ""}
	var pp *progressPrinter
	if !*quiet {
		pp = newProgressPrinter(stderr)
		opt.Progress, opt.ProgressEvery = pp.show, pp.every()
	}
	res, err := runs.Run(ctx, sp, opt)
	if pp != nil {
		pp.done()
	}
	if res == nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	for _, w := range res.Warnings {
		fmt.Fprintln(stderr, "warning: "+w)
	}
	var blow *solver.BlowUpError
	if errors.As(err, &blow) {
		return fail(stderr, exitFail, "%v\nwhat was computed up to then is in %s; the last good checkpoint is kept there", err, dir)
	}
	if err != nil {
		return fail(stderr, exitFail, "%v", err)
	}
	printResult(stdout, dir, res)
	if res.Interrupted {
		fmt.Fprintf(stderr, "interrupted at t = %.6g s; a checkpoint is in %s. Continue with:\n  rollerbed run --resume %s\n", res.SimTime, dir, dir)
		return exitFail
	}
	return exitOK
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
	fmt.Fprintln(stdout, "rollerbed", runs.Version)
	return exitOK
}
