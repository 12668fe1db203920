package runs

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"time"

	"rollerbed/io/h5"
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
	for k, v := range r.prof.Export() {
		arrays[k] = v
	}
	for k, v := range r.probes.Export() {
		arrays[k] = v
	}
	r.ts.export(arrays)
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
	r.log.printf("checkpoint at t = %.6g s (step %d)", st.Time, st.Steps)
	return nil
}

// resume rebuilds a run from the newest valid checkpoint of its folder.
func (r *run) resume(res *Result) error {
	dir := r.opt.Dir
	if _, err := os.Stat(dir); err != nil {
		return fmt.Errorf("cannot resume: %w", err)
	}
	cp, file, err := h5.ReadCheckpoint(dir)
	if errors.Is(err, h5.ErrNoCheckpoint) {
		return fmt.Errorf("cannot resume %s: it holds no checkpoint; start the run afresh with --force", dir)
	}
	if err != nil {
		return fmt.Errorf("cannot resume %s: %w", dir, err)
	}
	if cp.CaseText != r.sp.CaseText {
		return fmt.Errorf("cannot resume %s: its checkpoint was made from another case text; resume with the case.toml in the run folder, or start afresh with --force", dir)
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
		Pressure: cp.Complex["pressure"]}
	if err := r.s.Restore(&st); err != nil {
		return fmt.Errorf("cannot resume from %s: %w", filepath.Base(file), err)
	}
	r.setupStats()
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
	if err := r.openFields(true); err != nil {
		return err
	}
	if err := r.fields.TruncateAfter(cp.Time); err != nil {
		return err
	}
	res.Resumed, res.ResumedFrom = true, cp.Time
	r.log.printf("resumed from %s at t = %.6g s (step %d)", filepath.Base(file), cp.Time, cp.Steps)
	return nil
}
