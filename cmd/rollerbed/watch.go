package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"strings"
	"syscall"
	"time"

	"rollerbed/io/h5"
	"rollerbed/io/livepage"
	"rollerbed/io/runfolder"
	"rollerbed/runs"
)

// watchEvery is how often a run hands a frame to its live page (wall
// time), and how often `watch` looks at a run folder's files.
const watchEvery = time.Second

// watchFlags are the options of the live page that run and watch share.
type watchFlags struct {
	remote *bool
	scalar *string
}

func addWatchFlags(fs *commandFlags) watchFlags {
	return watchFlags{
		remote: fs.Bool("watch-remote", false, "allow a page address that other machines can reach (anyone who reaches it sees the run)"),
		scalar: fs.String("watch-scalar", "", "the scalar `NAME` the live page maps besides the vorticity (default: the first)"),
	}
}

// startPage binds addr, given with the option flag, and starts the live
// page of run folder dir, saying where it is on stdout. Mistakes in the
// address come back as errors that name the option.
func startPage(flag, addr string, remote bool, dir string, stdout io.Writer) (*livepage.Server, error) {
	ln, err := livepage.Listen(addr, remote)
	if errors.Is(err, livepage.ErrRemote) {
		return nil, fmt.Errorf("%s %s: %w with --watch-remote", flag, addr, err)
	}
	if err != nil {
		return nil, fmt.Errorf("%s %s: %w", flag, addr, err)
	}
	srv := livepage.Start(ln, dir)
	fmt.Fprintf(stdout, "live page: %s (open it in a browser)\n", srv.URL())
	return srv, nil
}

// frameView turns a frame of a running case into the live page's View.
func frameView(f *runs.Frame) *livepage.View {
	v := &livepage.View{Title: f.Title, Source: "live run", State: livepage.Running,
		Time: f.SimTime, EndTime: f.EndTime, Steps: f.Steps, ETA: f.ETA, StepsPerSecond: f.StepsPerSecond,
		Grid:    h5.GridInfo{X: f.X, Zc: f.Zc, Zf: f.Zf, Lx: f.Lx, H: f.H},
		Frontal: f.Frontal, CanopyHeight: f.CanopyHeight,
		Fields:   []livepage.Field{{Name: "vorticity", Label: "ω [1/s]", Signed: true, Data: f.Vorticity}},
		ProfileZ: f.Zc, ProfileU: f.MeanU,
		ProfileWhat: "The x-mean velocity now (the time mean of profiles.png is written at the end).",
		Metrics:     livepage.Metrics(f.Flow, f.Scalars), Warnings: f.Warnings}
	if f.Scalar != nil {
		v.Fields = append(v.Fields, livepage.Field{Name: f.ScalarName, Label: f.ScalarName + " [unit]", Data: f.Scalar})
	}
	switch {
	case !f.Done:
	case f.Error != "":
		v.State, v.Note = livepage.Failed, f.Error
	case f.Interrupted:
		v.State, v.Note = livepage.Interrupted, "stopped after writing a checkpoint; resume it with rollerbed run --resume"
	default:
		v.State, v.ETA = livepage.Finished, 0
	}
	if f.Done {
		v.Note = strings.TrimSpace(v.Note + " The metrics are those of summary.json.")
	} else {
		v.Note = "The metrics come from the statistics gathered so far and settle as the run goes on."
	}
	return v
}

// serveUntilInterrupted keeps the page of a stopped run up until Ctrl-C
// or SIGTERM, so that its last picture stays on the screen.
func serveUntilInterrupted(srv *livepage.Server, stdout io.Writer) {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	fmt.Fprintf(stdout, "the live page stays at %s until Ctrl-C\n", srv.URL())
	<-ctx.Done()
}

// watchArgs is the usage line of the watch command.
const watchArgs = "RUNDIR [--addr ADDR]"

func cmdWatch(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("watch", watchArgs,
		"Serves the live page of the run folder RUNDIR, read from its files: the newest\n"+
			"snapshot's vorticity (and a scalar) with the canopy outline, the simulated time and\n"+
			"progress, the x-mean velocity profile, the metrics of "+runfolder.SummaryFile+" once the run has\n"+
			"written it, the warnings and links to "+runfolder.ReportFile+" and the figures. Works for a run\n"+
			"that goes on elsewhere (the page follows its files) and for a finished one. The page\n"+
			"needs no internet; it is served until Ctrl-C on the loopback address unless\n"+
			"--watch-remote allows others.", stdout, stderr)
	addr := fs.String("addr", livepage.DefaultAddress, "`ADDR` (HOST:PORT) to serve the page on; port 0 picks a free one")
	wf := addWatchFlags(fs)
	pos, code, ok := fs.parse(args)
	if !ok {
		return code
	}
	if code, ok := fs.wantArgs(pos, 1, "one run folder RUNDIR"); !ok {
		return code
	}
	dir := pos[0]
	if err := runfolder.Check(dir); err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	srv, err := startPage("--addr", *addr, *wf.remote, dir, stdout)
	if err != nil {
		return fail(stderr, exitUsage, "%v", err)
	}
	defer srv.Close()
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	fmt.Fprintln(stdout, "following", dir, "until Ctrl-C")
	if err := livepage.Follow(ctx, &livepage.Folder{Dir: dir, Scalar: *wf.scalar}, watchEvery, srv.Publish); err != nil {
		return fail(stderr, exitFail, "%v", err)
	}
	return exitOK
}
