package runs

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"slices"
	"time"

	"rollerbed/canopy"
	"rollerbed/io/h5"
	"rollerbed/io/runfolder"
	"rollerbed/solver"
	"rollerbed/solver/stats"
)

// Progress is what a run reports while it steps.
type Progress struct {
	SimTime, EndTime float64       // s
	Steps            int           // steps taken
	StepsPerSecond   float64       // wall-clock rate of this session
	ETA              time.Duration // estimated wall time left
	Dt               float64       // s, last step
}

// Options controls a run.
type Options struct {
	Dir    string // run folder
	Force  bool   // write into an existing, non-empty folder
	Resume bool   // continue from the newest valid checkpoint in Dir
	// Progress, when set, is called about every ProgressEvery of wall time.
	Progress      func(Progress)
	ProgressEvery time.Duration
	// Log, when set, also receives the lines written to run.log.
	Log io.Writer
	// Watch, when set, receives a Frame of the run about every WatchEvery
	// of wall time (less often when making frames would take more than
	// about 2 % of the run's time) and once more when the run has stopped.
	// It is called on the run's goroutine and must return at once (hand
	// the frame on); WatchScalar names the scalar the frames show ("" for
	// the first).
	Watch       func(*Frame)
	WatchEvery  time.Duration
	WatchScalar string
}

// Result is the outcome of a run.
type Result struct {
	Steps         int
	SimTime       float64 // s
	WallTime      time.Duration
	Interrupted   bool
	Resumed       bool    // continued from a checkpoint
	ResumedFrom   float64 // s, simulated time of that checkpoint
	MaxDivergence float64 // relative to the velocity-gradient scale
	Bulk          float64 // m/s, depth-mean velocity at the end
	Gradient      float64 // m/s², mean pressure gradient at the end
	Summary       *Summary
	Warnings      []string // e.g. damaged checkpoints passed over
	// Checkpoint is the file name of the newest checkpoint in the run
	// folder when the run stopped; "" when none was written.
	Checkpoint string
	// FrameTime is the wall time the run spent making and handing on
	// frames for Options.Watch.
	FrameTime time.Duration
}

// ExitInterrupted is the exit status of a run stopped by a signal (a
// batch system's time limit, Ctrl-C) after writing a checkpoint, so that
// scripts and schedulers can tell "resume me" from "broken": EX_TEMPFAIL
// of sysexits.h, "try again later".
const ExitInterrupted = 75

// SweepTaskEnv is the environment variable a sweep's batch task sets to its
// sweep folder, so that a run interrupted there says how the sweep goes on
// (resubmit it) instead of how a lone run does (resume it).
const SweepTaskEnv = "ROLLERBED_SWEEP"

// ErrFolderNotEmpty reports a run folder that already holds files (see
// runfolder.ErrInUse for one that another process is writing).
var ErrFolderNotEmpty = errors.New("run folder is not empty")

// PrepareDir creates the run folder, refusing a non-empty one unless force.
// The folder's lock file (runfolder.LockFile) does not count.
func PrepareDir(dir string, force bool) error {
	ents, err := os.ReadDir(dir)
	ents = slices.DeleteFunc(ents, func(e os.DirEntry) bool { return e.Name() == runfolder.LockFile })
	switch {
	case err == nil && len(ents) > 0 && !force:
		return fmt.Errorf("%s: %w; choose another --out folder, add --force to overwrite it, or --resume to continue it", dir, ErrFolderNotEmpty)
	case err == nil:
	case errors.Is(err, os.ErrNotExist):
		if err := os.MkdirAll(dir, 0o755); err != nil {
			return fmt.Errorf("cannot create run folder: %w", err)
		}
	default:
		return fmt.Errorf("cannot use run folder %s: %w", dir, err)
	}
	// Probe that the folder takes files before any work is done.
	probe := filepath.Join(dir, ".rollerbed-probe")
	if err := os.WriteFile(probe, nil, 0o644); err != nil {
		return fmt.Errorf("run folder %s is not writable: %w", dir, err)
	}
	return os.Remove(probe)
}

// WriteError is a failure to write the run folder (a full disk, lost
// permissions), after which the run can go on once the cause is mended.
type WriteError struct{ err error }

func (e *WriteError) Error() string { return e.err.Error() }
func (e *WriteError) Unwrap() error { return e.err }

// writing marks err, if any, as a failure to write the run folder.
func writing(err error) error {
	if err == nil {
		return nil
	}
	return &WriteError{err}
}

// nextStep adds to a failure to write the run folder how to go on once
// its cause is mended: resume from the newest checkpoint when the run has
// one, else start again, since there is nothing to resume. Other errors
// pass unchanged.
func (r *run) nextStep(err error) error {
	var we *WriteError
	if !errors.As(err, &we) {
		return err
	}
	if r.lastCheckpoint != "" {
		return fmt.Errorf("%w; once that is mended, continue from %s with: rollerbed run --resume %s", err, r.lastCheckpoint, r.opt.Dir)
	}
	return fmt.Errorf("%w; once that is mended, start the run again (no checkpoint was written, so there is nothing to resume)", err)
}

// blowUpFix says which keys of the case to change after a blow-up: the
// fixed step when the case sets one, else the adaptive step's controls.
func (r *run) blowUpFix() string {
	if r.sp.FixedStep > 0 {
		return fmt.Sprintf("lower time.fixed_step (now %g s), or remove it to let the step adapt to the flow", r.sp.FixedStep)
	}
	c := r.sp.Solver
	fix := fmt.Sprintf("lower time.cfl (now %g)", c.CFL)
	if c.MaxStep > 0 {
		fix += fmt.Sprintf(" or time.max_step (now %g s)", c.MaxStep)
	} else {
		fix += " or set time.max_step"
	}
	return fix + ", or refine the grid where the flow is fastest"
}

// finished tells whether simulated time t has reached the end time of a
// run, up to round-off in the sum of the steps.
func finished(t, end float64) bool { return t >= end*(1-1e-12) }

// run is one run in progress.
type run struct {
	sp     *Spec
	opt    Options
	s      *solver.Solver
	prof   *stats.Profiles
	sprof  []*stats.ScalarProfiles
	probes *stats.Probes
	// spin holds each scalar's budget and uptake by level when the
	// statistics started, so rates cover the statistics period.
	spin      []solver.ScalarBudget
	spinLevel [][]float64
	spinDone  bool
	ts        timeSeries
	fields    *h5.Fields
	// bend bends flexible blades with the flow (nil for rigid elements);
	// phases and bentSum (s·m per bin) are the statistics by phase (nil
	// for a steady forcing).
	bend    *canopy.Bending
	phases  *stats.Phases
	bentSum []float64
	log     *runLog

	nextRow, nextSnap, nextCheck float64 // s, simulated
	lastCheckWall                time.Time
	lastCheckpoint               string // file name of the newest checkpoint written or resumed from
	courantWarned                bool   // a fixed step's Courant number was found above the limit
	started                      time.Time
	watch                        watcher
	stepsAtStart                 int
	timeAtStart                  float64
}

// Run carries out a spec and writes its run folder. Cancelling ctx stops it
// after the current step and writes a checkpoint to resume from; the result
// then says it was interrupted.
func Run(ctx context.Context, sp *Spec, opt Options) (*Result, error) {
	r := &run{sp: sp, opt: opt, started: time.Now()}
	res := &Result{}
	if err := CheckMemory(sp); err != nil {
		return nil, err
	}
	if opt.Resume {
		if _, err := os.Stat(opt.Dir); err != nil {
			return nil, fmt.Errorf("cannot resume: %w", err)
		}
	}
	// One writer per folder, from before the first file is touched until
	// the last is written.
	lock, err := runfolder.TakeLock(opt.Dir)
	if err != nil {
		return nil, err
	}
	defer lock.Release()
	defer r.close()
	if opt.Resume {
		if err := r.resume(res); err != nil {
			return nil, r.nextStep(err)
		}
	} else if err := r.start(); err != nil {
		return nil, r.nextStep(err)
	}
	r.stepsAtStart, r.timeAtStart = r.s.Steps(), r.s.Time()
	r.lastCheckWall = time.Now()

	runErr := r.loop(ctx, res)
	s := r.s
	res.Steps, res.SimTime, res.WallTime = s.Steps(), s.Time(), time.Since(r.started)
	div, scale := s.Divergence()
	if scale > 0 {
		res.MaxDivergence = div / scale
	}
	res.Bulk, res.Gradient = s.Bulk(), s.Gradient()

	var blow *solver.BlowUpError
	var werr error
	if runErr == nil || !errors.As(runErr, &blow) {
		// A clean end or an interruption: a checkpoint to continue from.
		werr = writing(r.checkpoint())
	} else {
		blow.Fix = r.blowUpFix()
		r.log.printf("stopped: %v", runErr)
		if r.lastCheckpoint != "" {
			r.log.printf("the last good checkpoint, %s, stays in %s", r.lastCheckpoint, opt.Dir)
		}
	}
	res.Checkpoint, res.FrameTime = r.lastCheckpoint, r.watch.spent
	sum, serr := r.writeOutputs(res, runErr)
	res.Summary = sum
	r.sendLastFrame(res, sum, runErr)
	if errors.Join(werr, serr) != nil {
		return res, r.nextStep(errors.Join(runErr, werr, writing(serr)))
	}
	return res, r.nextStep(runErr)
}

// start prepares a fresh run folder and the initial state.
func (r *run) start() error {
	sp, opt := r.sp, r.opt
	if err := PrepareDir(opt.Dir, opt.Force); err != nil {
		return err
	}
	if opt.Force {
		for _, name := range []string{runfolder.FieldsFile, h5.SidecarPath(runfolder.FieldsFile)} {
			os.Remove(filepath.Join(opt.Dir, name))
		}
		if err := h5.RemoveCheckpoints(opt.Dir); err != nil {
			return err
		}
	}
	if err := runfolder.WriteFileAtomic(filepath.Join(opt.Dir, runfolder.CaseFile), []byte(sp.CaseText)); err != nil {
		return writing(err)
	}
	var err error
	if r.log, err = openLog(opt.Dir, opt.Log, false); err != nil {
		return writing(err)
	}
	if r.s, err = NewSolver(sp); err != nil {
		return err
	}
	if err := r.setupBending(); err != nil {
		return err
	}
	r.setupStats()
	if err := r.createFields(); err != nil {
		return writing(err)
	}
	if sp.Solver.Ny > 1 {
		r.log.printf("started %q: %d × %d × %d cells (a slab), %.6g s to simulate", sp.Title, sp.Solver.Nx, sp.Solver.Ny, sp.Solver.Nz, sp.Duration)
	} else {
		r.log.printf("started %q: %d × %d cells, %.6g s to simulate", sp.Title, sp.Solver.Nx, sp.Solver.Nz, sp.Duration)
	}
	r.ts.add(r.s)
	r.nextRow = r.sp.Output.ProfileEvery
	if r.sp.Output.SnapshotEvery > 0 {
		if err := r.snapshot(); err != nil {
			return writing(err)
		}
		r.nextSnap = r.sp.Output.SnapshotEvery
	}
	r.nextCheck = r.sp.Output.CheckpointEvery
	return nil
}

func (r *run) setupStats() {
	g := r.s.Grid()
	r.prof = stats.NewProfiles(g, r.sp.Solver.Viscosity, r.sp.SpinUp)
	r.sprof = nil
	for i, sc := range r.sp.Solver.Scalars {
		r.sprof = append(r.sprof, stats.NewScalarProfiles(g, i, r.sp.Solver.Viscosity, sc.Diffusivity, sc.TurbulentSchmidt, r.sp.SpinUp))
	}
	r.spin = make([]solver.ScalarBudget, len(r.sprof))
	r.spinLevel = make([][]float64, len(r.sprof))
	for i := range r.spinLevel {
		r.spinLevel[i] = make([]float64, g.Nz)
	}
	r.markSpinUp()
	n := max(r.sp.Output.Probes, 1)
	z := g.H / 2
	if r.sp.Canopy != nil {
		z = r.sp.Canopy.Height()
	}
	xs, zs := make([]float64, n), make([]float64, n)
	for i := range xs {
		xs[i], zs[i] = g.Lx*float64(i)/float64(n), z
	}
	if g.Ny > 1 {
		// In a slab the probes run along a diagonal, so that their
		// spectrum and quadrant shares average over y as well as x.
		ys := make([]float64, n)
		for i := range ys {
			ys[i] = g.Ly * float64(i) / float64(n)
		}
		r.probes = stats.NewProbesAcross(g, xs, ys, zs)
		return
	}
	r.probes = stats.NewProbes(g, xs, zs)
	r.setupPhases()
}

func (r *run) close() {
	if r.fields != nil {
		r.fields.Close()
	}
	if r.s != nil {
		r.s.Close()
	}
	if r.log != nil {
		r.log.close()
	}
}

// loop steps to the end time, writing rows, snapshots and checkpoints on
// their cadences.
func (r *run) loop(ctx context.Context, res *Result) error {
	s, sp, out := r.s, r.sp, r.sp.Output
	var lastReport time.Time // zero: the first step reports at once
	estimate := int(math.Min(1e6, sp.Duration/math.Max(s.NextStep(), 1e-12))) + 16
	r.probes.Reserve(min(estimate, 1<<20))
	for !finished(s.Time(), sp.Duration) {
		if ctx.Err() != nil {
			res.Interrupted = true
			r.log.printf("interrupted at t = %.6g s (step %d)", s.Time(), s.Steps())
			return nil
		}
		dt := sp.FixedStep
		if !(dt > 0) {
			dt = s.NextStep()
		}
		if left := sp.Duration - s.Time(); dt > left {
			dt = left // land exactly on the end time
		}
		if err := s.StepBy(dt); err != nil {
			return err
		}
		r.afterStep(dt)
		if sp.FixedStep > 0 && !r.courantWarned {
			if c := s.LastCourant(); c > StableCourant {
				r.courantWarned = true
				w := fmt.Sprintf("time.fixed_step = %g s reached a Courant number of %.2g at t = %.6g s, above the stability limit %.2g of the time scheme: the results may be wrong even if the run does not blow up; lower time.fixed_step, or remove it to let the step adapt",
					sp.FixedStep, c, s.Time(), StableCourant)
				res.Warnings = append(res.Warnings, w)
				r.log.printf("warning: %s", w)
			}
		}
		r.prof.Add(s, dt)
		for _, p := range r.sprof {
			p.Add(s, dt)
		}
		r.markSpinUp()
		r.probes.Add(s)
		t := s.Time()
		if out.ProfileEvery > 0 && t >= r.nextRow*(1-1e-12) {
			r.ts.add(s)
			r.nextRow = nextAfter(r.nextRow, out.ProfileEvery, t)
		}
		if out.SnapshotEvery > 0 && t >= r.nextSnap*(1-1e-12) {
			if err := r.snapshot(); err != nil {
				return writing(err)
			}
			r.nextSnap = nextAfter(r.nextSnap, out.SnapshotEvery, t)
		}
		due := out.CheckpointEvery > 0 && t >= r.nextCheck*(1-1e-12)
		if out.CheckpointEvery > 0 && due {
			r.nextCheck = nextAfter(r.nextCheck, out.CheckpointEvery, t)
		}
		if out.CheckpointWall > 0 && time.Since(r.lastCheckWall) >= out.CheckpointWall {
			due = true
		}
		if due && t < sp.Duration*(1-1e-12) {
			if err := r.checkpoint(); err != nil {
				return writing(err)
			}
		}
		if r.opt.Progress != nil && time.Since(lastReport) >= r.opt.ProgressEvery {
			lastReport = time.Now()
			r.opt.Progress(r.progress())
		}
		if r.watchDue() {
			r.sendFrame(res)
		}
	}
	if r.opt.Progress != nil {
		r.opt.Progress(r.progress())
	}
	r.log.printf("finished at t = %.6g s after %d steps", s.Time(), s.Steps())
	return nil
}

// nextAfter advances a cadence mark past t.
func nextAfter(mark, every, t float64) float64 {
	for mark <= t*(1+1e-12) {
		mark += every
	}
	return mark
}

func (r *run) progress() Progress {
	s := r.s
	el := time.Since(r.started)
	p := Progress{SimTime: s.Time(), EndTime: r.sp.Duration, Steps: s.Steps(), Dt: s.LastStep()}
	done := s.Steps() - r.stepsAtStart
	if sec := el.Seconds(); sec > 0 {
		p.StepsPerSecond = float64(done) / sec
	}
	if adv := s.Time() - r.timeAtStart; adv > 0 {
		left := el.Seconds() * (r.sp.Duration - s.Time()) / adv
		p.ETA = time.Duration(math.Max(left, 0) * float64(time.Second))
	}
	return p
}

// timeSeries collects bulk quantities at the profile cadence.
type timeSeries struct {
	t, dt, bulk, grad, courant []float64
	bent                       []float64       // m, mean bent height of flexible blades
	bend                       *canopy.Bending // nil for rigid elements
}

func (ts *timeSeries) add(s *solver.Solver) {
	ts.t = append(ts.t, s.Time())
	ts.dt = append(ts.dt, s.LastStep())
	ts.bulk = append(ts.bulk, s.Bulk())
	ts.grad = append(ts.grad, s.Gradient())
	ts.courant = append(ts.courant, s.CourantNumber(s.LastStep()))
	if ts.bend != nil {
		ts.bent = append(ts.bent, ts.bend.MeanHeight())
	}
}

func (ts *timeSeries) table() runfolder.TimeSeriesTable {
	return runfolder.TimeSeriesTable{T: ts.t, Dt: ts.dt, Bulk: ts.bulk, Gradient: ts.grad, Courant: ts.courant, BentHeight: ts.bent}
}

func (ts *timeSeries) export(m map[string][]float64) {
	m["series_t"], m["series_dt"], m["series_bulk"] = ts.t, ts.dt, ts.bulk
	m["series_gradient"], m["series_courant"] = ts.grad, ts.courant
	if ts.bend != nil {
		m["series_bent_height"] = ts.bent
	}
}

func (ts *timeSeries) load(m map[string][]float64) error {
	ts.t, ts.dt, ts.bulk = m["series_t"], m["series_dt"], m["series_bulk"]
	ts.grad, ts.courant = m["series_gradient"], m["series_courant"]
	n := len(ts.t)
	if len(ts.dt) != n || len(ts.bulk) != n || len(ts.grad) != n || len(ts.courant) != n {
		return errors.New("the checkpoint's time series are incomplete")
	}
	if ts.bend != nil {
		if ts.bent = m["series_bent_height"]; len(ts.bent) != n {
			return errors.New("the checkpoint's time series lack the bent height")
		}
	}
	return nil
}

// markSpinUp records the scalar budgets once the spin-up is over, so that
// uptake rates cover the statistics period only.
func (r *run) markSpinUp() {
	if r.spinDone || r.s.Time() < r.sp.SpinUp {
		return
	}
	for i := range r.spin {
		r.spin[i] = r.s.Budget(i)
		copy(r.spinLevel[i], r.s.UptakeByLevel(i))
	}
	r.spinDone = true
}
