package sweep

import (
	"context"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"rollerbed/io/runfolder"
	"runtime"
	"sort"
	"sync"
	"time"

	"rollerbed/io/casefile"
	"rollerbed/runs"
)

// RunOptions controls a local sweep run.
type RunOptions struct {
	// Jobs is the number of members run at once; 0 chooses: cores /
	// FixedWorkers when the members fix numerics.workers, else as many as
	// there are cores (at most one per member left).
	Jobs int
	// Cores is the number of cores to share; 0 for runtime.NumCPU().
	Cores int
	// Report, when set, is called with the overall progress when a member
	// ends and about every ReportEvery (default 10 s). Calls do not
	// overlap.
	Report      func(Report)
	ReportEvery time.Duration
	// Event, when set, is called with one line for each member that
	// starts, resumes, is skipped or ends. Calls do not overlap.
	Event func(string)
	// MemberProgress, when set, is called with each running member's
	// progress about every MemberProgressEvery (called from the member's
	// goroutine).
	MemberProgress      func(index int, p runs.Progress)
	MemberProgressEvery time.Duration
	// Squeue is the squeue command asked about members submitted to
	// Slurm (which are then left to Slurm); "" for "squeue" on PATH.
	Squeue string
}

// Report is the overall progress of a local sweep run.
type Report struct {
	Total, Done, Running, Failed, Waiting int
	// Interrupted counts members stopped with a checkpoint in this run
	// (after a cancel).
	Interrupted int
	// Fraction is the share of the sweep's simulated time done, 0 to 1.
	Fraction float64
	// ETA is the estimated wall time left; 0 when not known yet.
	ETA     time.Duration
	Elapsed time.Duration
}

// String formats the report as one progress line.
func (r Report) String() string {
	s := fmt.Sprintf("sweep: %d/%d done, %d running, %d failed, %d waiting", r.Done, r.Total, r.Running, r.Failed, r.Waiting)
	if r.Interrupted > 0 {
		s += fmt.Sprintf(", %d interrupted", r.Interrupted)
	}
	s += fmt.Sprintf("; %.0f%%", 100*r.Fraction)
	if r.ETA > 0 {
		s += ", ETA " + r.ETA.Round(time.Second).String()
	} else if r.Done+r.Failed < r.Total {
		s += ", ETA not known yet"
	}
	return s
}

// RunResult is the outcome of a local sweep run.
type RunResult struct {
	Jobs          int // members run at once
	WorkersPerRun int // solver workers of each run
	// Members by how this run left them (indices, ascending).
	Skipped     []int // finished before this run
	Finished    []int // finished in this run
	Resumed     []int // of those run now, the ones resumed from a checkpoint
	Failed      []int // failed in this run or before
	Interrupted []int // stopped by the cancel, with a checkpoint
	NotStarted  []int // never started because of the cancel
	InQueue     []int // queued or running in a Slurm job of the sweep, left to it
	Errors      map[int]string
	// QueueNote says when the Slurm queue of a submitted sweep could not
	// be asked ("" otherwise).
	QueueNote string
}

// Complete reports whether every member is done.
func (r *RunResult) Complete() bool {
	return len(r.Failed) == 0 && len(r.Interrupted) == 0 && len(r.NotStarted) == 0 && len(r.InQueue) == 0
}

// Run runs the members of the sweep folder dir that are not done on this
// machine, Jobs at a time, each in its own run folder members/NNNN/run/
// through runs.Run in this process. A member that finished before is
// skipped; one with a checkpoint resumes from it; the rest start afresh. A
// failed member (a blow-up) is not rerun, and members of a sweep submitted
// to Slurm that are queued or running there are left to Slurm. Cancelling ctx stops every
// running member after its current step, with a checkpoint, and starts no
// more; run again to continue.
//
// Unless the members fix numerics.workers, each run gets max(1, cores /
// Jobs) solver workers, so the runs together use the cores without
// oversubscribing them. Worker counts change no numbers (the solver's
// split over workers only reorders independent work), and the case text
// stays as planned, so a member may resume under another --jobs.
func Run(ctx context.Context, dir string, opt RunOptions) (*RunResult, error) {
	man, err := ReadManifest(dir)
	if err != nil {
		return nil, err
	}
	// One runner per sweep folder; each member's run also locks its own
	// run folder, against a Slurm task or a single run on it.
	lock, err := runfolder.TakeLock(dir)
	if err != nil {
		return nil, err
	}
	defer lock.Release()
	cores := opt.Cores
	if cores <= 0 {
		cores = runtime.NumCPU()
	}
	res := &RunResult{Errors: map[int]string{}}
	var inSlurm map[int]QueueTask
	var note string
	if jobs, err := ReadJobs(dir); err != nil {
		return nil, err
	} else if len(jobs) > 0 {
		inSlurm, note = queueStates(ctx, opt.Squeue, jobs)
	}
	var todo []int
	frac := make([]float64, len(man.Members))
	for i, m := range man.Members {
		st := ReadFolderState(RunDir(dir, m.Name))
		if q, ok := inSlurm[i]; ok && st.State != StateDone && st.State != StateFailed {
			res.InQueue = append(res.InQueue, i)
			res.Errors[i] = fmt.Sprintf("%s in Slurm job %s", q.State, q.JobID)
			continue
		}
		switch st.State {
		case StateDone:
			res.Skipped = append(res.Skipped, i)
			frac[i] = 1
		case StateFailed:
			res.Failed = append(res.Failed, i)
			res.Errors[i] = st.Error
			frac[i] = 1
		default:
			todo = append(todo, i)
		}
	}
	jobs := opt.Jobs
	switch {
	case jobs > 0:
	case man.FixedWorkers > 0:
		jobs = max(1, cores/man.FixedWorkers)
	default:
		jobs = max(1, min(cores, len(todo)))
	}
	res.Jobs = jobs
	res.WorkersPerRun = man.FixedWorkers
	if man.FixedWorkers == 0 {
		res.WorkersPerRun = max(1, cores/jobs)
	}
	res.QueueNote = note
	p := &localRun{dir: dir, man: man, opt: opt, res: res, frac: frac, started: time.Now(), running: map[int]bool{}}
	p.waiting = len(todo)
	for _, i := range res.Skipped {
		p.event("member %s: done before, skipped%s", man.Members[i].Name, valuesSuffix(man.Members[i]))
	}
	for _, i := range res.InQueue {
		p.event("member %s: %s; left to Slurm", man.Members[i].Name, res.Errors[i])
	}
	for _, i := range res.Failed {
		p.event("member %s: failed before (%s); not rerun: fix the case and plan again, or delete %s to retry it",
			man.Members[i].Name, res.Errors[i], RunDir(dir, man.Members[i].Name))
	}
	if len(todo) == 0 {
		p.report()
		return res, nil
	}
	p.fracStart = sum(frac)

	queue := make(chan int)
	var wg sync.WaitGroup
	for w := 0; w < jobs; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range queue {
				p.runMember(ctx, i)
			}
		}()
	}
	stopTicker := make(chan struct{})
	tickerDone := make(chan struct{})
	go func() {
		defer close(tickerDone)
		every := opt.ReportEvery
		if every <= 0 {
			every = 10 * time.Second
		}
		t := time.NewTicker(every)
		defer t.Stop()
		for {
			select {
			case <-t.C:
				p.report()
			case <-stopTicker:
				return
			}
		}
	}()
	for _, i := range todo {
		if ctx.Err() != nil {
			p.mu.Lock()
			res.NotStarted = append(res.NotStarted, i)
			p.waiting--
			p.mu.Unlock()
			continue
		}
		select {
		case queue <- i:
		case <-ctx.Done():
			p.mu.Lock()
			res.NotStarted = append(res.NotStarted, i)
			p.waiting--
			p.mu.Unlock()
		}
	}
	close(queue)
	wg.Wait()
	close(stopTicker)
	<-tickerDone
	for _, s := range [][]int{res.Finished, res.Resumed, res.Failed, res.Interrupted, res.NotStarted} {
		sort.Ints(s)
	}
	return res, nil
}

func sum(v []float64) float64 {
	s := 0.0
	for _, x := range v {
		s += x
	}
	return s
}

// localRun is the shared state of a sweep run on this machine.
type localRun struct {
	dir string
	man *Manifest
	opt RunOptions
	res *RunResult

	mu        sync.Mutex
	frac      []float64 // share of each member's simulated time done
	fracStart float64
	started   time.Time
	running   map[int]bool
	waiting   int
}

func (p *localRun) event(format string, a ...any) {
	if p.opt.Event != nil {
		p.opt.Event(fmt.Sprintf(format, a...))
	}
}

// report calls opt.Report; the caller must not hold p.mu.
func (p *localRun) report() {
	if p.opt.Report == nil {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	p.reportLocked()
}

func (p *localRun) reportLocked() {
	if p.opt.Report == nil {
		return
	}
	r := Report{Total: len(p.man.Members), Running: len(p.running), Waiting: p.waiting,
		Done: len(p.res.Skipped) + len(p.res.Finished), Failed: len(p.res.Failed), Interrupted: len(p.res.Interrupted),
		Elapsed: time.Since(p.started)}
	total := sum(p.frac)
	r.Fraction = total / float64(max(1, len(p.frac)))
	if gained := total - p.fracStart; gained > 0 {
		left := float64(len(p.frac)) - total
		r.ETA = time.Duration(float64(r.Elapsed) * left / gained)
	}
	p.opt.Report(r)
}

func valuesSuffix(m MemberRecord) string {
	if len(m.Values) == 0 {
		return ""
	}
	s := " ("
	for i, v := range m.Values {
		if i > 0 {
			s += ", "
		}
		s += v.Key + " = " + v.Text
	}
	return s + ")"
}

// runMember runs one member to its end, a cancel or an error.
func (p *localRun) runMember(ctx context.Context, i int) {
	m := p.man.Members[i]
	p.mu.Lock()
	if ctx.Err() != nil {
		p.res.NotStarted = append(p.res.NotStarted, i)
		p.waiting--
		p.mu.Unlock()
		return
	}
	p.waiting--
	p.running[i] = true
	p.mu.Unlock()

	res, resumed, err := p.start(ctx, i)

	p.mu.Lock()
	delete(p.running, i)
	switch {
	case err != nil:
		p.res.Failed = append(p.res.Failed, i)
		p.res.Errors[i] = err.Error()
		p.frac[i] = 1
		p.event("member %s: failed: %v", m.Name, err)
	case res.Interrupted:
		p.res.Interrupted = append(p.res.Interrupted, i)
		p.event("member %s: interrupted at t = %.6g s, checkpoint in %s", m.Name, res.SimTime, RunDir(p.dir, m.Name))
	default:
		p.res.Finished = append(p.res.Finished, i)
		if resumed {
			p.res.Resumed = append(p.res.Resumed, i)
		}
		p.frac[i] = 1
		p.event("member %s: finished, %d steps in %s%s", m.Name, res.Steps, res.WallTime.Round(time.Millisecond), valuesSuffix(m))
	}
	p.reportLocked()
	p.mu.Unlock()
}

// start runs member i: resuming it when its folder holds a checkpoint,
// afresh otherwise.
func (p *localRun) start(ctx context.Context, i int) (*runs.Result, bool, error) {
	m := p.man.Members[i]
	runDir := RunDir(p.dir, m.Name)
	st := ReadFolderState(runDir)
	resume := st.State == StateInterrupted
	path := filepath.Join(MemberDir(p.dir, m.Name), runfolder.CaseFile)
	if resume {
		// Resume from the case text kept in the run folder, as
		// `rollerbed run --resume` does.
		if _, err := os.Stat(filepath.Join(runDir, runfolder.CaseFile)); err == nil {
			path = filepath.Join(runDir, runfolder.CaseFile)
		}
	}
	c, err := casefile.Load(path)
	if err != nil {
		return nil, false, err
	}
	sp, err := runs.FromCase(c, filepath.Dir(path))
	if err != nil {
		return nil, false, err
	}
	if p.man.FixedWorkers == 0 {
		sp.Solver.Workers = p.res.WorkersPerRun
	}
	// A folder with files but no checkpoint is a run stopped before its
	// first checkpoint: start it afresh over what it left.
	opt := runs.Options{Dir: runDir, Resume: resume, Force: !resume && st.State == StateStarted}
	verb := "started"
	if resume {
		verb = fmt.Sprintf("resumed from its checkpoint (t = %.6g s)", st.SimTime)
		if st.SimTime == 0 {
			verb = "resumed from its checkpoint"
		}
	}
	p.mu.Lock()
	p.event("member %s: %s%s", m.Name, verb, valuesSuffix(m))
	p.mu.Unlock()
	every := p.opt.MemberProgressEvery
	if every <= 0 {
		every = time.Second
	}
	opt.ProgressEvery = every
	opt.Progress = func(pr runs.Progress) {
		if pr.EndTime > 0 {
			p.mu.Lock()
			p.frac[i] = min(1, pr.SimTime/pr.EndTime)
			p.mu.Unlock()
		}
		if p.opt.MemberProgress != nil {
			p.opt.MemberProgress(i, pr)
		}
	}
	res, err := runs.Run(ctx, sp, opt)
	if res == nil && err == nil {
		err = errors.New("the run returned no result")
	}
	if err != nil {
		return res, resume, err
	}
	return res, resume, nil
}
