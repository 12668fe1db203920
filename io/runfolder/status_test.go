package runfolder

import (
	"os"
	"path/filepath"
	"testing"
)

// TestReadStatus tells the stages of a run folder apart by its files.
func TestReadStatus(t *testing.T) {
	cases := []struct {
		name       string
		files      map[string]string
		empty      bool
		checkpoint bool
		run        bool
		finished   bool
	}{
		{"missing", nil, true, false, false, false},
		{"started", map[string]string{LogFile: "x"}, false, false, false, false},
		{"checkpoint", map[string]string{CheckpointPrefix + "000000012" + CheckpointSuffix: ""}, false, true, false, false},
		{"done", map[string]string{SummaryFile: `{"run": {"steps": 3, "interrupted": false}}`}, false, false, true, true},
		{"interrupted", map[string]string{SummaryFile: `{"run": {"interrupted": true}}`}, false, false, true, false},
		{"failed", map[string]string{SummaryFile: `{"run": {"error": "blow-up"}}`}, false, false, true, false},
		{"damaged", map[string]string{SummaryFile: `{"run": `}, false, false, false, false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			dir := filepath.Join(t.TempDir(), "run")
			if c.files != nil {
				os.Mkdir(dir, 0o755)
			}
			for name, text := range c.files {
				if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
					t.Fatal(err)
				}
			}
			st := ReadStatus(dir)
			if st.Empty != c.empty || st.Checkpoint != c.checkpoint || (st.Run != nil) != c.run || st.Finished() != c.finished {
				t.Errorf("got %+v (finished %v)", st, st.Finished())
			}
		})
	}
}
