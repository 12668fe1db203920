package runs

import (
	"fmt"
	"io"
	"os"
	"path/filepath"
	"rollerbed/io/runfolder"
	"time"
)

// runLog writes timestamped lines to run.log in the run folder (and to an
// optional second writer).
type runLog struct {
	f    *os.File
	also io.Writer
}

func openLog(dir string, also io.Writer, appendTo bool) (*runLog, error) {
	flags := os.O_CREATE | os.O_WRONLY | os.O_TRUNC
	if appendTo {
		flags = os.O_CREATE | os.O_WRONLY | os.O_APPEND
	}
	f, err := os.OpenFile(filepath.Join(dir, runfolder.LogFile), flags, 0o644)
	if err != nil {
		return nil, fmt.Errorf("cannot write the run log in %s: %w", dir, err)
	}
	return &runLog{f: f, also: also}, nil
}

func (l *runLog) printf(format string, a ...any) {
	if l == nil {
		return
	}
	line := time.Now().Format(time.RFC3339) + " " + fmt.Sprintf(format, a...) + "\n"
	l.f.WriteString(line)
	if l.also != nil {
		io.WriteString(l.also, line)
	}
}

func (l *runLog) close() {
	if l != nil {
		l.f.Close()
	}
}
