package runfolder

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"time"
)

// Lock is one process's exclusive hold on a run or sweep folder, taken
// before it writes anything there and kept until Release (or until the
// process ends, however it ends: the operating system drops the lock of a
// killed process, so a lock left by one is taken over at once). While it
// is held, LockFile names the holder: process id, host, start time and
// command line.
type Lock struct {
	f    *os.File
	path string
}

// InUseError is the error of TakeLock when another process holds the
// folder.
type InUseError struct {
	Dir    string
	Holder string // what LockFile says of the holder, on one line; "" if unreadable
}

func (e *InUseError) Error() string {
	who := "another process"
	if e.Holder != "" {
		who = e.Holder
	}
	return fmt.Sprintf("runfolder: %s is in use by %s; wait until it ends, or stop it (it leaves a checkpoint to resume from) — two writers would spoil the folder", e.Dir, who)
}

// ErrInUse matches an *InUseError with errors.Is.
var ErrInUse = errors.New("runfolder: folder in use")

// Is makes errors.Is(err, ErrInUse) true for an *InUseError.
func (e *InUseError) Is(target error) bool { return target == ErrInUse }

// TakeLock creates dir if need be and takes its lock, or returns an
// *InUseError naming the holder when another process has it. On systems
// without advisory file locks it returns a lock that excludes nothing.
func TakeLock(dir string) (*Lock, error) {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, fmt.Errorf("runfolder: cannot create %s: %w", dir, err)
	}
	path := filepath.Join(dir, LockFile)
	f, err := os.OpenFile(path, os.O_RDWR|os.O_CREATE, 0o644)
	if err != nil {
		return nil, fmt.Errorf("runfolder: cannot lock %s: %w", dir, err)
	}
	held, err := lockFile(f)
	if err != nil {
		f.Close()
		return nil, fmt.Errorf("runfolder: cannot lock %s: %w", dir, err)
	}
	if held {
		holder := readHolder(path)
		f.Close()
		return nil, &InUseError{Dir: dir, Holder: holder}
	}
	host, _ := os.Hostname()
	line := fmt.Sprintf("rollerbed process %d on %s since %s (%s)\n", os.Getpid(), host,
		time.Now().UTC().Format(time.RFC3339), strings.Join(quoteArgs(os.Args), " "))
	if err := f.Truncate(0); err == nil {
		f.WriteAt([]byte(line), 0)
	}
	return &Lock{f: f, path: path}, nil
}

// Release gives the folder up. The lock file stays: what a later TakeLock
// finds there is overwritten.
func (l *Lock) Release() error {
	if l == nil || l.f == nil {
		return nil
	}
	l.f.Truncate(0)
	err := l.f.Close() // closing the descriptor drops the lock
	l.f = nil
	return err
}

// readHolder returns the first line of a lock file, at most 300 bytes.
func readHolder(path string) string {
	b, err := os.ReadFile(path)
	if err != nil {
		return ""
	}
	line, _, _ := strings.Cut(string(b), "\n")
	if len(line) > 300 {
		line = line[:300] + "…"
	}
	return strings.TrimSpace(line)
}

// quoteArgs quotes the arguments that hold spaces, for a readable command
// line.
func quoteArgs(args []string) []string {
	out := make([]string, len(args))
	for i, a := range args {
		out[i] = a
		if strings.ContainsAny(a, " \t\"'") {
			out[i] = strconv.Quote(a)
		}
	}
	return out
}
