package runs

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"time"

	"rollerbed/io/h5"
	"rollerbed/io/runfolder"
	"rollerbed/io/stricttoml"
	"rollerbed/solver"
)

// checkpoint writes the whole state of the run: the solver, the running
// statistics, the series so far and the output schedule.
func (r *run) checkpoint() error {
	var st solver.State
	r.s.Save(&st)
	arrays := map[string][]float64{
		"u": st.U, "w": st.W, "dudx": st.DUDX, "dwdx": st.DWDX,
		"schedule": {r.nextRow, r.nextSnap, r.nextCheck},
	}
	if st.V != nil {
		// A slab's spanwise velocity and y-derivatives.
		for k, v := range map[string][]float64{"v": st.V, "dvdx": st.DVDX, "dudy": st.DUDY, "dvdy": st.DVDY, "dwdy": st.DWDY} {
			arrays[k] = v
		}
	}
	for k, v := range r.prof.Export() {
		arrays[k] = v
	}
	for k, v := range r.probes.Export() {
		arrays[k] = v
	}
	r.ts.export(arrays)
	r.exportWaves(arrays)
	for i := range st.Scalars {
		name := r.s.ScalarName(i)
		arrays["scalar_"+name] = st.Scalars[i]
		arrays["scalar_"+name+"_dx"] = st.ScalarDX[i]
		if st.ScalarDY != nil {
			arrays["scalar_"+name+"_dy"] = st.ScalarDY[i]
		}
		arrays["scalar_"+name+"_levels"] = st.UptakeByLevel[i]
		arrays["scalar_"+name+"_budget"] = budgetArray(st.Budgets[i])
		arrays["scalar_"+name+"_spin_budget"] = budgetArray(r.spin[i])
		arrays["scalar_"+name+"_spin_levels"] = append([]float64(nil), r.spinLevel[i]...)
		for k, v := range r.sprof[i].Export(name) {
			arrays[k] = v
		}
	}
	spin := 0.0
	if r.spinDone {
		spin = 1
	}
	arrays["spin_done"] = []float64{spin}
	cp := &h5.Checkpoint{
		Time: st.Time, Steps: st.Steps, LastStep: st.LastStep, Gradient: st.Gradient,
		CaseText: r.sp.CaseText, Version: Version,
		Arrays:  arrays,
		Complex: map[string][]complex128{"pressure": st.Pressure},
	}
	if err := h5.WriteCheckpoint(r.opt.Dir, cp); err != nil {
		return err
	}
	r.lastCheckWall = time.Now()
	r.lastCheckpoint = filepath.Base(h5.CheckpointPath(r.opt.Dir, st.Steps))
	r.log.printf("checkpoint at t = %.6g s (step %d)", st.Time, st.Steps)
	return nil
}

// caseEdited is the error of a resume whose case.toml no longer holds the
// case the run started with (kept in its checkpoints, as started): it names
// the keys that changed and writes the started case beside the edited one,
// as runfolder.StartedCaseFile, so that the edit can be undone.
func caseEdited(dir, started, now string) error {
	was, _ := stricttoml.Scan(started)
	is, _ := stricttoml.Scan(now)
	var changes []string
	for k, p := range is {
		if q, ok := was[k]; !ok && p.Raw != "" {
			changes = append(changes, k+" (added)")
		} else if ok && q.Raw != p.Raw {
			changes = append(changes, fmt.Sprintf("%s (%s → %s)", k, q.Raw, p.Raw))
		}
	}
	for k, q := range was {
		if _, ok := is[k]; !ok && q.Raw != "" {
			changes = append(changes, k+" (removed)")
		}
	}
	sort.Strings(changes)
	what := "its text (comments or layout)"
	if len(changes) > 0 {
		what = strings.Join(changes, ", ")
	}
	keep := filepath.Join(dir, runfolder.StartedCaseFile)
	saved := "the case it started with is saved as " + keep
	if err := runfolder.WriteFileAtomic(keep, []byte(started)); err != nil {
		saved = "the case it started with is in its checkpoints"
	}
	return fmt.Errorf("cannot resume %s: %s was edited after the run started: %s. A resume continues the case the run started with, so that its numbers stay those of one run; %s: copy it back over %s to continue, or run the edited case as a new run: rollerbed run %s --out NEWDIR",
		dir, runfolder.CaseFile, what, saved, runfolder.CaseFile, filepath.Join(dir, runfolder.CaseFile))
}

// StartedCase returns the case text a run folder's newest valid checkpoint
// was made from: the case the run started with.
func StartedCase(dir string) (string, error) {
	cp, _, err := h5.ReadCheckpoint(dir)
	if err != nil {
		return "", err
	}
	return cp.CaseText, nil
}

// FinishedError is the error of a resume of a run folder whose run has
// already reached the end of its case and written its outputs: there is
// nothing to continue, and nothing in the folder was changed.
type FinishedError struct {
	Dir  string  // the run folder
	Time float64 // s, the simulated time of its newest checkpoint
}

func (e *FinishedError) Error() string {
	return fmt.Sprintf("%s is already finished at t = %.6g s; nothing to resume", e.Dir, e.Time)
}

// resume rebuilds a run from the newest valid checkpoint of its folder
// (Run has checked that the folder exists before locking it).
func (r *run) resume(res *Result) error {
	dir := r.opt.Dir
	cp, file, err := h5.ReadCheckpoint(dir)
	if _, lerr := os.Stat(filepath.Join(dir, runfolder.LogFile)); errors.Is(err, h5.ErrNoCheckpoint) && lerr != nil {
		return fmt.Errorf("cannot resume %s: it is not a run folder that can go on (it holds neither %s nor a checkpoint); start a run with: rollerbed run CASE --out DIR", dir, runfolder.LogFile)
	}
	if errors.Is(err, h5.ErrNoCheckpoint) {
		return fmt.Errorf("cannot resume %s: it holds no checkpoint (the run stopped before its first); start it afresh: rollerbed run %s --out %s --force", dir, filepath.Join(dir, runfolder.CaseFile), dir)
	}
	if err != nil {
		return fmt.Errorf("cannot resume %s: %w", dir, err)
	}
	if cp.CaseText != r.sp.CaseText {
		return caseEdited(dir, cp.CaseText, r.sp.CaseText)
	}
	if finished(cp.Time, r.sp.Duration) {
		if _, err := os.Stat(filepath.Join(dir, runfolder.SummaryFile)); err == nil {
			return &FinishedError{Dir: dir, Time: cp.Time}
		}
	}
	res.Warnings = cp.Warnings
	if r.log, err = openLog(dir, r.opt.Log, true); err != nil {
		return err
	}
	for _, w := range cp.Warnings {
		r.log.printf("warning: %s", w)
	}
	if r.s, err = NewSolver(r.sp); err != nil {
		return err
	}
	st := solver.State{Time: cp.Time, Steps: cp.Steps, LastStep: cp.LastStep, Gradient: cp.Gradient,
		U: cp.Arrays["u"], W: cp.Arrays["w"], DUDX: cp.Arrays["dudx"], DWDX: cp.Arrays["dwdx"],
		Pressure: cp.Complex["pressure"],
		V:        cp.Arrays["v"], DVDX: cp.Arrays["dvdx"], DUDY: cp.Arrays["dudy"], DVDY: cp.Arrays["dvdy"], DWDY: cp.Arrays["dwdy"]}
	for i := 0; i < r.s.Scalars(); i++ {
		name := r.s.ScalarName(i)
		b, err := arrayBudget(cp.Arrays["scalar_"+name+"_budget"])
		if err != nil {
			return fmt.Errorf("cannot resume from %s: scalar %q: %w", filepath.Base(file), name, err)
		}
		st.Scalars = append(st.Scalars, cp.Arrays["scalar_"+name])
		st.ScalarDX = append(st.ScalarDX, cp.Arrays["scalar_"+name+"_dx"])
		if r.s.ThreeD() {
			st.ScalarDY = append(st.ScalarDY, cp.Arrays["scalar_"+name+"_dy"])
		}
		st.UptakeByLevel = append(st.UptakeByLevel, cp.Arrays["scalar_"+name+"_levels"])
		st.Budgets = append(st.Budgets, b)
	}
	if err := r.s.Restore(&st); err != nil {
		return fmt.Errorf("cannot resume from %s: %w", filepath.Base(file), err)
	}
	if err := r.setupBending(); err != nil {
		return err
	}
	r.setupStats()
	if err := r.importWaves(cp.Arrays); err != nil {
		return fmt.Errorf("cannot resume from %s: %w", filepath.Base(file), err)
	}
	for i := 0; i < r.s.Scalars(); i++ {
		name := r.s.ScalarName(i)
		b, err := arrayBudget(cp.Arrays["scalar_"+name+"_spin_budget"])
		lv := cp.Arrays["scalar_"+name+"_spin_levels"]
		if err != nil || len(lv) != len(r.spinLevel[i]) {
			return fmt.Errorf("cannot resume from %s: scalar %q lacks its statistics start", filepath.Base(file), name)
		}
		r.spin[i] = b
		copy(r.spinLevel[i], lv)
		if err := r.sprof[i].Import(name, cp.Arrays); err != nil {
			return fmt.Errorf("cannot resume from %s: %w", filepath.Base(file), err)
		}
	}
	if sd := cp.Arrays["spin_done"]; len(sd) == 1 {
		r.spinDone = sd[0] == 1
	}
	if err := r.prof.Import(cp.Arrays); err != nil {
		return fmt.Errorf("cannot resume from %s: %w", filepath.Base(file), err)
	}
	if err := r.probes.Import(cp.Arrays); err != nil {
		return fmt.Errorf("cannot resume from %s: %w", filepath.Base(file), err)
	}
	if err := r.ts.load(cp.Arrays); err != nil {
		return fmt.Errorf("cannot resume from %s: %w", filepath.Base(file), err)
	}
	sched := cp.Arrays["schedule"]
	if len(sched) != 3 {
		return fmt.Errorf("cannot resume from %s: its output schedule is missing", filepath.Base(file))
	}
	r.nextRow, r.nextSnap, r.nextCheck = sched[0], sched[1], sched[2]
	if err := r.reopenFields(cp.Time, res); err != nil {
		return err
	}
	if err := r.fields.TruncateAfter(cp.Time); err != nil {
		return err
	}
	res.Resumed, res.ResumedFrom = true, cp.Time
	r.lastCheckpoint = filepath.Base(file)
	r.log.printf("resumed from %s at t = %.6g s (step %d)", filepath.Base(file), cp.Time, cp.Steps)
	return nil
}

// budgetArray and arrayBudget store a scalar budget in a checkpoint.
func budgetArray(b solver.ScalarBudget) []float64 {
	return []float64{b.Storage0, b.Storage, b.TopIn, b.BedIn, b.ElementUptake, b.Sources, b.Time,
		b.StepTopIn, b.StepBedIn, b.StepElement}
}

func arrayBudget(a []float64) (solver.ScalarBudget, error) {
	if len(a) != 10 {
		return solver.ScalarBudget{}, errors.New("the checkpoint lacks the scalar budget")
	}
	return solver.ScalarBudget{Storage0: a[0], Storage: a[1], TopIn: a[2], BedIn: a[3], ElementUptake: a[4],
		Sources: a[5], Time: a[6], StepTopIn: a[7], StepBedIn: a[8], StepElement: a[9]}, nil
}
