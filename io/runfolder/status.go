package runfolder

import (
	"encoding/json"
	"os"
	"path/filepath"
)

// Status is what the files of a run folder say about its run, without
// reading more than the head of summary.json.
type Status struct {
	// Empty is true when the folder is missing or holds no files.
	Empty bool
	// Checkpoint is true when the folder holds a checkpoint.
	Checkpoint bool
	// Run is the run part of summary.json; nil when there is none or it
	// does not decode.
	Run *RunSummary
}

// Finished reports whether the summary says the run ended without an error
// or an interruption.
func (s Status) Finished() bool { return s.Run != nil && s.Run.Error == "" && !s.Run.Interrupted }

// ReadStatus looks at the run folder dir.
func ReadStatus(dir string) Status {
	ents, err := os.ReadDir(dir)
	if err != nil || len(ents) == 0 {
		return Status{Empty: true}
	}
	var st Status
	for _, e := range ents {
		if IsCheckpoint(e.Name()) && e.Type().IsRegular() {
			st.Checkpoint = true
		}
	}
	var head struct {
		Run RunSummary `json:"run"`
	}
	if b, err := os.ReadFile(filepath.Join(dir, SummaryFile)); err == nil && json.Unmarshal(b, &head) == nil {
		st.Run = &head.Run
	}
	return st
}
