package sweep

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
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
	last := map[int]string{} // member → its last job id
	for _, j := range jobs {
		rep.Jobs = append(rep.Jobs, j.JobID)
		for _, i := range j.Members {
			last[i] = j.JobID
		}
	}
	for i, m := range man.Members {
		st := ReadFolderState(RunDir(dir, m.Name))
		ms := MemberStatus{Index: i, Name: m.Name, State: st.State, Values: m.Values, SimTime: st.SimTime, Steps: st.Steps, Error: st.Error, JobID: last[i]}
		if q, ok := queue[i]; ok && st.State != StateDone && st.State != StateFailed {
			ms.State, ms.JobID = q.State, q.JobID
		}
		if ms.JobID != "" && ms.State != StateDone {
			log := filepath.Join(dir, slurmDir, logsDir, fmt.Sprintf("%s_%d.err", ms.JobID, i))
			if fi, err := os.Stat(log); err == nil && fi.Size() > 0 {
				ms.Log = log
			}
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
