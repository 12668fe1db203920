package main

import (
	"context"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"path/filepath"
	"reflect"
	"rollerbed/io/runfolder"
	"runtime"
	"sort"
	"strings"
	"syscall"
	"text/tabwriter"
	"time"

	"rollerbed/runs"
	"rollerbed/runs/sweep"
)

// sweepCommands are the sub-commands of `rollerbed sweep`.
var sweepCommands = []struct {
	name, args, summary string
	run                 func(args []string, stdout, stderr io.Writer) int
}{
	{"plan", "SWEEP.toml --out DIR [--force]", "expand a sweep file into member cases, each checked, in the sweep folder DIR", sweepPlan},
	{"run", "DIR [--jobs N] [--quiet]", "run the unfinished members on this machine, N at a time; resumable", sweepRun},
	{"submit", "DIR [--dry-run] [--time ...]", "write a Slurm job array for the unfinished members and submit it with sbatch", sweepSubmit},
	{"status", "DIR [--json]", "show each member: pending, queued, running, interrupted, done or failed", sweepStatus},
	{"collect", "DIR [--plot Y:X]...", "gather the members' summaries into DIR/sweep.csv, and figures of Y against X", sweepCollect},
	{"example", "[NAME] [--out FOLDER]", "list the example sweeps, or write one with its base case", sweepExample},
}

func cmdSweep(args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		fmt.Fprintln(stderr, "rollerbed sweep: missing a sub-command")
		sweepUsage(stderr)
		return exitUsage
	}
	switch args[0] {
	case "-h", "--help", "-help":
		sweepUsage(stdout)
		return exitOK
	case "help":
		if len(args) > 1 {
			return cmdSweep(append(args[1:2], "--help"), stdout, stderr)
		}
		sweepUsage(stdout)
		return exitOK
	}
	for _, c := range sweepCommands {
		if c.name == args[0] {
			return c.run(args[1:], stdout, stderr)
		}
	}
	fmt.Fprintf(stderr, "rollerbed sweep: unknown sub-command %q\n\n", args[0])
	sweepUsage(stderr)
	return exitUsage
}

func sweepUsage(w io.Writer) {
	fmt.Fprintln(w, "rollerbed sweep: families of runs from one base case, on this machine or as a Slurm job array")
	fmt.Fprintln(w, "\nUsage:")
	for _, c := range sweepCommands {
		fmt.Fprintf(w, "  rollerbed sweep %-8s %-34s %s\n", c.name, c.args, c.summary)
	}
	fmt.Fprintln(w, `
A sweep file names a base case and the keys to vary:

  title = "canopy density"
  base = "flume.toml"            # a case file, relative to this file
  combine = "product"            # or "zip"
  replicates = 2                 # initial.seed = base seed + 0, 1 (or seeds = [...])
  [[axis]]
  key = "canopy.frontal_area"
  log = { from = 0.625, to = 25.0, count = 7 }   # or linear = {...}, values = [...]
  [slurm]                        # for sweep submit; all optional
  time_limit = "01:00:00"
  cpus_per_task = 1
  memory = "1G"
  max_concurrent = 8
  setup = ["module load hdf5"]   # shell lines each task runs first

'rollerbed sweep example NAME' writes a complete example to start from.
Run 'rollerbed sweep SUB-COMMAND --help' for a sub-command's options.`)
}

func sweepFlags(name, args, summary string, stdout, stderr io.Writer) *commandFlags {
	return newFlags("sweep "+name, args, summary, stdout, stderr)
}

func sweepPlan(args []string, stdout, stderr io.Writer) int {
	fs := sweepFlags("plan", "SWEEP.toml --out DIR [--force]",
		"Reads a sweep file and its base case, makes every member's case (the base case with the\n"+
			"member's values) and checks each like `rollerbed check`. Only when all pass does it write\n"+
			"DIR/members/NNNN/"+runfolder.CaseFile+" for each member and DIR/manifest.json.", stdout, stderr)
	out := fs.String("out", "", "the sweep folder `DIR` to write (new or empty)")
	force := fs.Bool("force", false, "replace a previous plan in DIR, deleting its runs")
	pos, code, ok := fs.parse(args)
	if !ok {
		return code
	}
	if code, ok := fs.wantArgs(pos, 1, "one SWEEP.toml file to plan"); !ok {
		return code
	}
	if *out == "" {
		return fs.usageError("missing --out DIR, the sweep folder to write")
	}
	f, err := sweep.Load(pos[0])
	if err != nil {
		if k := wrongKind(pos[0], kindSweep); k != nil {
			err = k
		}
		return fail(stderr, exitUsage, "%v", err)
	}
	pl, err := sweep.NewPlan(f)
	if err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	if err := pl.Write(*out, *force); err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	for _, w := range pl.Warnings {
		fmt.Fprintln(stderr, "warning: "+w)
	}
	what := "nothing varied"
	if len(pl.Keys) > 0 {
		sep := " × "
		if f.Combine == sweep.CombineZip {
			sep = " with "
		}
		what = strings.Join(pl.Keys, sep)
	}
	fmt.Fprintf(stdout, "planned %d members in %s (%s), every one checked\n", len(pl.Members), *out, what)
	w := tabwriter.NewWriter(stdout, 0, 4, 2, ' ', 0)
	const show = 40
	for i, m := range pl.Members {
		if i == show {
			fmt.Fprintf(w, "...\t%d more, listed in %s\n", len(pl.Members)-show, filepath.Join(*out, "manifest.json"))
			break
		}
		fmt.Fprintf(w, "  %s\t%s\n", m.Name, valuesText(m.Values))
	}
	w.Flush()
	fmt.Fprintf(stdout, "next: rollerbed sweep run %s   (this machine)\n      rollerbed sweep submit %s   (a Slurm cluster)\n", *out, *out)
	return exitOK
}

func valuesText(vals []sweep.Value) string {
	if len(vals) == 0 {
		return "(the base case)"
	}
	parts := make([]string, len(vals))
	for i, v := range vals {
		parts[i] = v.Key + " = " + v.Text
	}
	return strings.Join(parts, ", ")
}

func names(idx []int) string {
	s := make([]string, len(idx))
	for i, n := range idx {
		s[i] = sweep.MemberName(n)
	}
	return strings.Join(s, ", ")
}

func sweepRun(args []string, stdout, stderr io.Writer) int {
	fs := sweepFlags("run", "DIR [--jobs N] [--quiet]",
		"Runs the members of the sweep folder DIR on this machine, N at a time, each in this process\n"+
			"and in its own run folder DIR/members/NNNN/run/. Members done before are skipped, members\n"+
			"with a checkpoint resume from it, the rest start. Unless the members fix numerics.workers,\n"+
			"each run gets max(1, cores/N) solver workers. Ctrl-C (or SIGTERM) stops every running\n"+
			"member after its current step with a checkpoint; run the same command again to continue.", stdout, stderr)
	jobs := fs.Int("jobs", 0, "`N` members run at once (default: cores / workers per run)")
	quiet := fs.Bool("quiet", false, "print no progress lines, only the result")
	pos, code, ok := fs.parse(args)
	if !ok {
		return code
	}
	if code, ok := fs.wantArgs(pos, 1, "one sweep folder DIR (written by `rollerbed sweep plan`)"); !ok {
		return code
	}
	if *jobs < 0 {
		return fs.usageError("--jobs = %d: give a number of members to run at once, 1 or more (0: as many as the cores allow)", *jobs)
	}
	dir := pos[0]
	man, err := sweep.ReadManifest(dir)
	if err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	cores := runtime.NumCPU()
	if man.FixedWorkers > 0 && *jobs > 0 && *jobs*man.FixedWorkers > cores {
		fmt.Fprintf(stderr, "warning: %d runs at once × numerics.workers = %d is more than the %d cores here; the runs will slow each other down (try --jobs %d)\n",
			*jobs, man.FixedWorkers, cores, max(1, cores/man.FixedWorkers))
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	opt := sweep.RunOptions{Jobs: *jobs}
	if !*quiet {
		opt.Event = func(s string) { fmt.Fprintln(stderr, s) }
		opt.Report = func(r sweep.Report) { fmt.Fprintln(stderr, r.String()) }
	}
	started := time.Now()
	res, err := sweep.Run(ctx, dir, opt)
	if err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	fmt.Fprintf(stdout, "sweep %s: %d members, %d at a time with %d solver worker(s) each\n", dir, len(man.Members), res.Jobs, res.WorkersPerRun)
	fmt.Fprintf(stdout, "  finished now   %d", len(res.Finished))
	if len(res.Resumed) > 0 {
		fmt.Fprintf(stdout, " (%d resumed from checkpoints)", len(res.Resumed))
	}
	fmt.Fprintf(stdout, " in %s\n", time.Since(started).Round(time.Millisecond))
	if len(res.Skipped) > 0 {
		fmt.Fprintf(stdout, "  done before    %d (skipped)\n", len(res.Skipped))
	}
	if res.QueueNote != "" {
		fmt.Fprintln(stderr, "note: "+res.QueueNote)
	}
	if len(res.InQueue) > 0 {
		fmt.Fprintf(stdout, "  left to Slurm  %s (queued or running there)\n", names(res.InQueue))
	}
	for _, i := range res.Failed {
		fmt.Fprintf(stdout, "  failed         %s: %s\n", sweep.MemberName(i), res.Errors[i])
	}
	if len(res.Interrupted)+len(res.NotStarted) > 0 {
		if len(res.Interrupted) > 0 {
			fmt.Fprintf(stdout, "  interrupted    %s (checkpointed)\n", names(res.Interrupted))
		}
		if len(res.NotStarted) > 0 {
			fmt.Fprintf(stdout, "  not started    %d\n", len(res.NotStarted))
		}
		fmt.Fprintf(stderr, "interrupted; the finished members are kept and the interrupted ones resume from their checkpoints. Continue with:\n  rollerbed sweep run %s\n", dir)
		return exitInterrupted
	}
	if len(res.InQueue) > 0 && len(res.Failed) == 0 {
		fmt.Fprintf(stderr, "%d member(s) are still with Slurm; follow them with: rollerbed sweep status %s\n", len(res.InQueue), dir)
		return exitFail
	}
	if len(res.Failed) > 0 {
		fmt.Fprintf(stderr, "%d member(s) failed; the others are done. A failed member is not rerun: fix the case and plan again, or delete its run folder to retry it\n", len(res.Failed))
		return exitFail
	}
	fmt.Fprintf(stdout, "all members done; gather them with: rollerbed sweep collect %s\n", dir)
	return exitOK
}

// submitSettings are the options of `sweep submit` that set a [slurm]
// key for this submission and the later ones.
var submitSettings = []struct {
	flag, key, usage string
	isInt            bool
}{
	{"time", "time_limit", "the time `LIMIT` per member, as Slurm writes it: 90 (minutes), 01:30:00, 1-12:00:00", false},
	{"mem", "memory", "the memory `SIZE` per member, e.g. 4G or 500M", false},
	{"cpus", "cpus_per_task", "`N` cores per member", true},
	{"partition", "partition", "the partition `NAME` to submit to", false},
	{"max-concurrent", "max_concurrent", "at most `N` members running at once (0: no cap)", true},
	{"binary", "binary", "the rollerbed binary `PATH` the compute nodes run (default: this binary)", false},
}

// setupFlags collects repeated --setup lines.
type setupFlags []string

func (s *setupFlags) String() string     { return strings.Join(*s, "; ") }
func (s *setupFlags) Set(v string) error { *s = append(*s, v); return nil }

func sweepSubmit(args []string, stdout, stderr io.Writer) int {
	fs := sweepFlags("submit", "DIR [--dry-run] [--slurm-from SWEEP.toml] [--time LIMIT] [--mem SIZE] ...",
		"Writes DIR/slurm/array.sh, a Slurm job array with one task per unfinished member (the task\n"+
			"index is the member index; members done, failed or already queued are left out), and submits\n"+
			"it with sbatch, recording the job id in DIR/slurm/jobs.json. Each task runs `rollerbed run`\n"+
			"with this binary (or --binary), resuming from a checkpoint when the member has one; logs go\n"+
			"to DIR/slurm/logs/. The [slurm] table sets the time limit, cores, memory, the cap on tasks at\n"+
			"once, the partition and set-up lines: the plan's at first, then those of the last submission;\n"+
			"--slurm-from takes the [slurm] table of a sweep file anew (the members stay as planned) and\n"+
			"the options below change single keys, for this submission and the later ones. Members past\n"+
			"the cluster's MaxArraySize go in further arrays of the same script. Submit again after a time\n"+
			"limit or a failure: only the unfinished members go.", stdout, stderr)
	dry := fs.Bool("dry-run", false, "write the script, do not submit it (nor keep the settings it was given)")
	from := fs.String("slurm-from", "", "take the [slurm] table of the sweep file `SWEEP.toml` (e.g. the edited one the plan was made from)")
	strs := map[string]*string{}
	ints := map[string]*int{}
	for _, o := range submitSettings {
		if o.isInt {
			ints[o.flag] = fs.Int(o.flag, 0, o.usage)
		} else {
			strs[o.flag] = fs.String(o.flag, "", o.usage)
		}
	}
	var setup setupFlags
	fs.Var(&setup, "setup", "a set-up `LINE` the script runs before the member, e.g. \"module load hdf5\" (repeatable; replaces [slurm] setup; --setup '' for none)")
	pos, code, ok := fs.parse(args)
	if !ok {
		return code
	}
	if code, ok := fs.wantArgs(pos, 1, "one sweep folder DIR (written by `rollerbed sweep plan`)"); !ok {
		return code
	}
	dir := pos[0]
	given := map[string]bool{}
	fs.Visit(func(f *flag.Flag) { given[f.Name] = true })
	settings, source, err := sweep.CurrentSlurm(dir)
	if err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	if *from != "" {
		f, err := sweep.Load(*from)
		if err != nil {
			return fail(stderr, exitUsage, "--slurm-from %s: %v", *from, err)
		}
		if f.Slurm == nil {
			return fail(stderr, exitUsage, "--slurm-from %s: the sweep file has no [slurm] table; add one, e.g. [slurm] with time_limit = \"01:00:00\" and memory = \"1G\"", *from)
		}
		settings, source = f.Slurm, "the [slurm] table of "+*from
	}
	changed := *from != "" || given["setup"]
	for _, o := range submitSettings {
		if !given[o.flag] {
			continue
		}
		changed = true
		if settings == nil {
			settings = &sweep.Slurm{CPUsPerTask: 1}
		}
		var v any
		if o.isInt {
			v = *ints[o.flag]
		} else {
			v = *strs[o.flag]
		}
		if err := settings.Set(o.key, v); err != nil {
			return fs.usageError("--%s %v", o.flag, err)
		}
		source += ", --" + o.flag
	}
	if given["setup"] {
		if settings == nil {
			settings = &sweep.Slurm{CPUsPerTask: 1}
		}
		if err := settings.Set("setup", []string(setup)); err != nil {
			return fs.usageError("--setup %v", err)
		}
		source += ", --setup"
	}
	source = strings.TrimPrefix(source, ", ")
	if !changed {
		if note := sweepFileNote(dir, settings); note != "" {
			fmt.Fprintln(stderr, "note: "+note)
		}
	}
	exe, err := os.Executable()
	if err == nil {
		exe, err = filepath.EvalSymlinks(exe)
	}
	if err != nil && (settings == nil || settings.Binary == "") {
		return fail(stderr, exitFail, "cannot find this binary for the array tasks: %v; name one with --binary PATH", err)
	}
	sub, err := sweep.Submit(context.Background(), dir, sweep.SubmitOptions{Executable: exe, DryRun: *dry, Slurm: settings})
	if sub != nil {
		for _, n := range []string{sub.QueueNote, sub.LimitNote} {
			if n != "" {
				fmt.Fprintln(stderr, "note: "+n)
			}
		}
		for _, w := range sub.Warnings {
			fmt.Fprintln(stderr, "warning: "+w)
		}
	}
	if err != nil {
		code := exitUsage
		if sub != nil && sub.Script != "" {
			code = exitFail
		}
		return fail(stderr, code, "%v", err)
	}
	if len(sub.Done)+len(sub.Failed)+len(sub.InQueue) > 0 {
		fmt.Fprintf(stdout, "left out: %d done, %d failed, %d already queued or running\n", len(sub.Done), len(sub.Failed), len(sub.InQueue))
	}
	if source != "" {
		fmt.Fprintf(stdout, "Slurm settings from %s: %s\n", source, slurmText(sub.Slurm, sub.Binary))
	}
	if len(sub.Parts) > 1 {
		fmt.Fprintf(stdout, "the cluster's MaxArraySize is %d, so the %d member(s) go in %d job arrays of %s, each with its offset as the script's argument:\n",
			sub.MaxArraySize, len(sub.Members), len(sub.Parts), sub.Script)
	}
	if *dry {
		if len(sub.Parts) == 1 {
			fmt.Fprintf(stdout, "wrote %s for %d member(s) (--array=%s); not submitted (--dry-run). Submit with:\n  sbatch %s\n", sub.Script, len(sub.Members), sub.Parts[0].Array, sub.Script)
			return exitOK
		}
		fmt.Fprintf(stdout, "not submitted (--dry-run). Submit with:\n")
		for _, p := range sub.Parts {
			fmt.Fprintf(stdout, "  sbatch --array=%s %s %d   # members %s to %s\n", p.Array, sub.Script, p.Offset, sweep.MemberName(p.Members[0]), sweep.MemberName(p.Members[len(p.Members)-1]))
		}
		return exitOK
	}
	if len(sub.Parts) == 1 {
		fmt.Fprintf(stdout, "submitted job %s: %d member(s), --array=%s (script %s)\n", sub.Parts[0].JobID, len(sub.Members), sub.Parts[0].Array, sub.Script)
	} else {
		for _, p := range sub.Parts {
			fmt.Fprintf(stdout, "  submitted job %s: %d member(s), %s to %s, --array=%s, offset %d\n", p.JobID, len(p.Members),
				sweep.MemberName(p.Members[0]), sweep.MemberName(p.Members[len(p.Members)-1]), p.Array, p.Offset)
		}
	}
	fmt.Fprintf(stdout, "follow with: rollerbed sweep status %s\n", dir)
	return exitOK
}

// slurmText writes Slurm settings as the sbatch options they become.
func slurmText(s *sweep.Slurm, binary string) string {
	var opts []string
	for _, o := range []struct{ opt, v string }{{"--time", s.TimeLimit}, {"--mem", s.Memory}, {"--partition", s.Partition}} {
		if o.v != "" {
			opts = append(opts, o.opt+"="+o.v)
		}
	}
	opts = append(opts, fmt.Sprintf("--cpus-per-task=%d", max(1, s.CPUsPerTask)))
	opts = append(opts, s.Extra...)
	parts := []string{strings.Join(opts, " ")}
	if s.MaxConcurrent > 0 {
		parts = append(parts, fmt.Sprintf("at most %d at once", s.MaxConcurrent))
	}
	if len(s.Setup) > 0 {
		parts = append(parts, fmt.Sprintf("%d set-up line(s)", len(s.Setup)))
	}
	return strings.Join(parts, ", ") + "; binary " + binary
}

// sweepFileNote says when the sweep file a plan was made from now holds
// another [slurm] table than the one a submission uses, and how to take
// it; "" otherwise (or when the file is gone or does not parse).
func sweepFileNote(dir string, use *sweep.Slurm) string {
	man, err := sweep.ReadManifest(dir)
	if err != nil || man.SweepFile == "" {
		return ""
	}
	f, err := sweep.Load(man.SweepFile)
	if err != nil || reflect.DeepEqual(f.Slurm, man.Slurm) || reflect.DeepEqual(f.Slurm, use) {
		return ""
	}
	return fmt.Sprintf("%s has another [slurm] table than this submission uses; take it with --slurm-from %s (the members stay as planned)", man.SweepFile, man.SweepFile)
}

func sweepStatus(args []string, stdout, stderr io.Writer) int {
	fs := sweepFlags("status", "DIR [--json]",
		"Shows where each member of the sweep folder DIR stands, from its run folder and, for a sweep\n"+
			"submitted to Slurm, from `squeue --me` (no accounting database needed). Without Slurm\n"+
			"installed the states come from the run folders only, and it says so.", stdout, stderr)
	asJSON := fs.Bool("json", false, "print the report as JSON")
	pos, code, ok := fs.parse(args)
	if !ok {
		return code
	}
	if code, ok := fs.wantArgs(pos, 1, "one sweep folder DIR (written by `rollerbed sweep plan`)"); !ok {
		return code
	}
	rep, err := sweep.Status(context.Background(), pos[0], sweep.StatusOptions{})
	if err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	if *asJSON {
		b, _ := json.MarshalIndent(rep, "", "  ")
		fmt.Fprintln(stdout, string(b))
		return exitOK
	}
	if rep.QueueNote != "" {
		fmt.Fprintln(stderr, "note: "+rep.QueueNote)
	}
	w := tabwriter.NewWriter(stdout, 0, 4, 2, ' ', 0)
	fmt.Fprintln(w, "member\tstate\tvalues\tdetail")
	for _, m := range rep.Members {
		var detail []string
		if m.Steps > 0 {
			detail = append(detail, fmt.Sprintf("t = %.4g s, %d steps", m.SimTime, m.Steps))
		}
		if m.Task != "" && (m.State == sweep.StateQueued || m.State == sweep.StateRunning) {
			detail = append(detail, "task "+m.Task)
		}
		if m.Error != "" {
			detail = append(detail, m.Error)
		}
		if m.Log != "" {
			detail = append(detail, "log "+m.Log)
		}
		fmt.Fprintf(w, "%s\t%s\t%s\t%s\n", m.Name, m.State, valuesText(m.Values), strings.Join(detail, "; "))
	}
	w.Flush()
	var counts []string
	for _, s := range []sweep.State{sweep.StateDone, sweep.StateRunning, sweep.StateQueued, sweep.StateStarted, sweep.StateInterrupted, sweep.StatePending, sweep.StateFailed} {
		if n := rep.Counts[s]; n > 0 {
			counts = append(counts, fmt.Sprintf("%d %s", n, s))
		}
	}
	fmt.Fprintf(stdout, "%d members: %s\n", len(rep.Members), strings.Join(counts, ", "))
	if len(rep.Jobs) > 0 {
		fmt.Fprintf(stdout, "Slurm jobs: %s\n", strings.Join(rep.Jobs, ", "))
	}
	return exitOK
}

// plotFlags collects repeated --plot flags.
type plotFlags []sweep.PlotSpec

func (p *plotFlags) String() string { return fmt.Sprint(*p) }
func (p *plotFlags) Set(s string) error {
	spec, err := sweep.ParsePlotSpec(s)
	if err != nil {
		return err
	}
	*p = append(*p, spec)
	return nil
}

func sweepCollect(args []string, stdout, stderr io.Writer) int {
	fs := sweepFlags("collect", "DIR [--plot Y:X]...",
		"Gathers the summary.json of every done member of the sweep folder DIR into DIR/sweep.csv:\n"+
			"one row per member, its index, the varied values, then every numeric summary key (flattened,\n"+
			"e.g. flow.penetration_depth_m). Each --plot Y:X draws DIR/figures/Y-vs-X.png of the members'\n"+
			"Y against X, with the published scaling where one applies: penetration depth against\n"+
			"0.23/(C_D a) (Nepf et al. 2007), roller spacing against 8.1 Ls (Raupach et al. 1996).", stdout, stderr)
	var plots plotFlags
	fs.Var(&plots, "plot", "a figure `Y:X`, e.g. flow.penetration_depth_m:canopy.frontal_area (repeatable)")
	pos, code, ok := fs.parse(args)
	if !ok {
		return code
	}
	if code, ok := fs.wantArgs(pos, 1, "one sweep folder DIR (written by `rollerbed sweep plan`)"); !ok {
		return code
	}
	dir := pos[0]
	col, err := sweep.Collect(dir)
	if err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	if err := col.CheckPlots(plots); err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	path := filepath.Join(dir, sweep.CSVName)
	if err := col.WriteCSV(path); err != nil {
		return fail(stderr, exitFail, "%v", err)
	}
	fmt.Fprintf(stdout, "wrote %s: %d members, %d varied and %d summary columns\n", path, len(col.Rows), len(col.Keys), len(col.Columns))
	if len(col.Missing) > 0 {
		fmt.Fprintf(stderr, "warning: %d member(s) are not done (%s); their rows hold only the varied values. See `rollerbed sweep status %s`\n",
			len(col.Missing), names(col.Missing), dir)
	}
	figs, err := col.Plot(plots)
	for _, f := range figs {
		ref := "no published scaling for this metric"
		if f.Reference != "" {
			ref = "with " + f.Reference
		}
		fmt.Fprintf(stdout, "wrote %s: %d members, %s\n", f.Path, f.Points, ref)
		if f.Note != "" {
			fmt.Fprintln(stderr, "note: "+f.Note)
		}
	}
	if err != nil {
		return fail(stderr, exitFail, "%v", err)
	}
	return exitOK
}

func sweepExample(args []string, stdout, stderr io.Writer) int {
	fs := sweepFlags("example", "[NAME] [--out FOLDER]",
		"Without NAME lists the example sweeps built into rollerbed. With NAME writes the sweep file\n"+
			"and its base case into FOLDER (default: the working folder), refusing to overwrite files.", stdout, stderr)
	out := fs.String("out", ".", "`FOLDER` to write the example into")
	pos, code, ok := fs.parse(args)
	if !ok {
		return code
	}
	if len(pos) > 1 {
		return fs.usageError("takes at most one NAME, got %d: %s", len(pos), strings.Join(pos, " "))
	}
	if len(pos) == 0 {
		for _, n := range runs.SweepExamples() {
			files, _ := runs.SweepExample(n)
			title := ""
			if f, err := sweep.Parse(files[n+".toml"], ""); err == nil {
				title = f.Title
			}
			fmt.Fprintf(stdout, "%-22s %s\n", n, title)
		}
		return exitOK
	}
	files, err := runs.SweepExample(pos[0])
	if err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	var order []string
	for name := range files {
		order = append(order, name)
		if _, err := os.Stat(filepath.Join(*out, name)); err == nil {
			return fail(stderr, exitUsage, "%s already exists; choose another --out folder", filepath.Join(*out, name))
		} else if !errors.Is(err, os.ErrNotExist) {
			return fail(stderr, exitUsage, "%v", err)
		}
	}
	sort.Strings(order)
	if err := os.MkdirAll(*out, 0o755); err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	for _, name := range order {
		if err := os.WriteFile(filepath.Join(*out, name), files[name], 0o644); err != nil {
			return fail(stderr, exitFail, "%v", err)
		}
		fmt.Fprintf(stdout, "wrote %s\n", filepath.Join(*out, name))
	}
	sw := filepath.Join(*out, pos[0]+".toml")
	fmt.Fprintf(stdout, "plan it with: rollerbed sweep plan %s --out %s\n", sw, strings.TrimSuffix(sw, ".toml"))
	return exitOK
}
