package sweep

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"rollerbed/runs"
)

// MemberStatus is where one member stands.
type MemberStatus struct {
	Index  int     `json:"index"`
	Name   string  `json:"name"`
	State  State   `json:"state"`
	Values []Value `json:"values"`
	// SimTime and Steps are the simulated time and steps its summary or
	// checkpoint reached (0 when none).
	SimTime float64 `json:"sim_time_s"`
	Steps   int     `json:"steps"`
	// Error is the error of a failed member.
	Error string `json:"error,omitempty"`
	// JobID is the Slurm array job of a queued or running member, or of
	// its last submission.
	JobID string `json:"job_id,omitempty"`
	// Log is the Slurm error log of its last submission, when there is one.
	Log string `json:"log,omitempty"`
	// Task is the Slurm array task (JOB_INDEX, as in the log names) and
	// ExitCode the exit code its last task recorded (TaskExitFile); nil
	// when none did.
	Task     string `json:"task,omitempty"`
	ExitCode *int   `json:"exit_code,omitempty"`
}

// StatusReport is the state of a sweep folder.
type StatusReport struct {
	Members []MemberStatus `json:"members"`
	Counts  map[State]int  `json:"counts"`
	// Jobs are the Slurm jobs submitted for the sweep.
	Jobs []string `json:"jobs,omitempty"`
	// QueueNote says when the Slurm queue could not be asked and the
	// states come from the run folders only; "" when it was asked, or when
	// nothing was submitted.
	QueueNote string `json:"queue_note,omitempty"`
}

// StatusOptions controls Status.
type StatusOptions struct {
	// Squeue is the squeue command; "" for "squeue" on PATH.
	Squeue string
}

// Status reports every member of the sweep folder dir: from its run folder
// (pending, started, interrupted, done, failed) and, for sweeps submitted
// to Slurm, from `squeue --me` (queued, running). It needs no Slurm
// accounting database, and works without Slurm installed, from the
// folders only, saying so.
func Status(ctx context.Context, dir string, opt StatusOptions) (*StatusReport, error) {
	man, err := ReadManifest(dir)
	if err != nil {
		return nil, err
	}
	jobs, err := ReadJobs(dir)
	if err != nil {
		return nil, err
	}
	rep := &StatusReport{Counts: map[State]int{}}
	var queue map[int]QueueTask
	if len(jobs) > 0 {
		queue, rep.QueueNote = queueStates(ctx, opt.Squeue, jobs)
	}
	last := map[int]JobRecord{} // member → its last job
	for _, j := range jobs {
		rep.Jobs = append(rep.Jobs, j.JobID)
		for _, i := range j.Members {
			last[i] = j
		}
	}
	for i, m := range man.Members {
		st := ReadFolderState(RunDir(dir, m.Name))
		ms := MemberStatus{Index: i, Name: m.Name, State: st.State, Values: m.Values, SimTime: st.SimTime, Steps: st.Steps, Error: st.Error}
		if j, ok := last[i]; ok {
			ms.JobID, ms.Task = j.JobID, fmt.Sprintf("%s_%d", j.JobID, i-j.Offset)
		}
		q, queued := queue[i]
		if queued && st.State != StateDone && st.State != StateFailed {
			ms.State, ms.JobID, ms.Task = q.State, q.JobID, q.Task
		}
		if ms.JobID != "" && ms.State != StateDone {
			log := filepath.Join(dir, slurmDir, logsDir, ms.Task+".err")
			if fi, err := os.Stat(log); err == nil && fi.Size() > 0 {
				ms.Log = log
			}
		}
		if te, ok := readTaskExit(MemberDir(dir, m.Name)); ok && !queued {
			ms.applyTaskExit(te, dir)
		}
		rep.Counts[ms.State]++
		rep.Members = append(rep.Members, ms)
	}
	return rep, nil
}

// Finished reports whether no member is left to run or waiting: every one
// is done or failed.
func (r *StatusReport) Finished() bool {
	return r.Counts[StateDone]+r.Counts[StateFailed] == len(r.Members)
}

// taskExit is what a member's TaskExitFile records.
type taskExit struct {
	Code int
	Task string // JOB_INDEX
}

// readTaskExit reads the TaskExitFile of the member folder memberDir.
func readTaskExit(memberDir string) (taskExit, bool) {
	b, err := os.ReadFile(filepath.Join(memberDir, TaskExitFile))
	if err != nil {
		return taskExit{}, false
	}
	f := strings.Fields(string(b))
	if len(f) < 2 {
		return taskExit{}, false
	}
	code, err := strconv.Atoi(f[0])
	if err != nil {
		return taskExit{}, false
	}
	return taskExit{Code: code, Task: f[1]}, true
}

// applyTaskExit turns the exit code of the member's last Slurm task into
// its state where the run folder does not tell: a task that failed
// before or outside its run (a missing binary, a crash) is failed, with
// the reason; an interrupted one (runs.ExitInterrupted) waits for a
// resubmission. A run folder that says done or failed stands.
func (ms *MemberStatus) applyTaskExit(te taskExit, dir string) {
	code := te.Code
	ms.ExitCode, ms.Task = &code, te.Task
	if ms.Log == "" {
		if fi, err := os.Stat(filepath.Join(dir, slurmDir, logsDir, te.Task+".err")); err == nil && fi.Size() > 0 {
			ms.Log = filepath.Join(dir, slurmDir, logsDir, te.Task+".err")
		}
	}
	if ms.State == StateDone || ms.State == StateFailed || code == 0 {
		return
	}
	if code == runs.ExitInterrupted {
		ms.Error = fmt.Sprintf("Slurm task %s was interrupted (exit code %d: the time limit, or a signal); `rollerbed sweep submit %s` resubmits it", te.Task, code, dir)
		return
	}
	ms.State = StateFailed
	ms.Error = fmt.Sprintf("Slurm task %s exited with code %d (%s); fix that and `rollerbed sweep submit %s` resubmits it", te.Task, code, exitReason(code), dir)
}

// exitReason says what a task's exit code usually means.
func exitReason(code int) string {
	switch {
	case code == 127:
		return "the rollerbed binary or a command of the set-up lines was not found on the node"
	case code == 126:
		return "the rollerbed binary could not be executed on the node"
	case code == 2:
		return "rollerbed refused the member's case or command line"
	case code > 128:
		return fmt.Sprintf("killed by signal %d; out of memory or cancelled, the task's log tells", code-128)
	}
	return "the task's log tells why"
}
