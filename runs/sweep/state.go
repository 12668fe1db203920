package sweep

import "rollerbed/io/runfolder"

// State is where a member stands.
type State string

// Member states. From the run folder alone a member is pending, started,
// interrupted, done or failed; the Slurm queue adds queued and running,
// and a local run (Run) running.
const (
	// StatePending: no run folder yet.
	StatePending State = "pending"
	// StateQueued: waiting in the Slurm queue.
	StateQueued State = "queued"
	// StateRunning: stepping now (in the Slurm queue as running, or in
	// this process's local run).
	StateRunning State = "running"
	// StateStarted: the run folder has files but neither a checkpoint nor
	// a summary: running somewhere now, or stopped before its first
	// checkpoint (it then starts afresh).
	StateStarted State = "started"
	// StateInterrupted: stopped with a checkpoint to resume from.
	StateInterrupted State = "interrupted"
	// StateDone: finished; summary.json says so.
	StateDone State = "done"
	// StateFailed: stopped with an error (a blow-up); summary.json holds
	// it. A failed member is not run again: fix the case and plan anew, or
	// delete its run folder to retry it.
	StateFailed State = "failed"
)

// FolderState is the state of a run folder and, for a failed or
// interrupted run, the message or simulated time that goes with it.
type FolderState struct {
	State State
	// Error is the error of a failed run.
	Error string
	// SimTime and Steps come from summary.json when there is one.
	SimTime float64
	Steps   int
	// Checkpoint is true when the folder holds a checkpoint.
	Checkpoint bool
}

// ReadFolderState looks at a member's run folder.
func ReadFolderState(runDir string) FolderState {
	st := runfolder.ReadStatus(runDir)
	if st.Empty {
		return FolderState{State: StatePending}
	}
	fs := FolderState{Checkpoint: st.Checkpoint}
	if r := st.Run; r != nil {
		fs.SimTime, fs.Steps = r.SimTime, r.Steps
		switch {
		case r.Error != "":
			fs.State, fs.Error = StateFailed, r.Error
			return fs
		case !r.Interrupted:
			fs.State = StateDone
			return fs
		}
	}
	switch {
	case fs.Checkpoint:
		fs.State = StateInterrupted
	default:
		fs.State = StateStarted
	}
	return fs
}
