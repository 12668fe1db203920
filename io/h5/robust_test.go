package h5

import (
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

// The environment variables that make the test binary a writer that is
// killed (see TestKilledWriterLeavesReadableFile).
const (
	childModeEnv = "ROLLERBED_H5_KILLED_WRITER"
	childFileEnv = "ROLLERBED_H5_KILLED_WRITER_FILE"
)

// killedWriter writes two snapshots without Close, then, depending on
// mode, starts a third, and kills its own process with SIGKILL.
func killedWriter(mode, path string) {
	fl, err := Create(path, testMeta(0))
	if err == nil {
		err = fl.WriteGrid(testGrid())
	}
	for s := 0; s < 2 && err == nil; s++ {
		err = fl.WriteSnapshot(float64(s+1), s+1, testFields(s))
	}
	if err != nil {
		os.Stderr.WriteString(err.Error())
		os.Exit(3)
	}
	if mode == "in the stacks" {
		// The stacks of a snapshot gone, as a kill in its flush may leave them.
		enter()
		f, err := openFile(path, true)
		if err != nil {
			os.Exit(4)
		}
		f.remove("/u")
		f.remove("/" + scaleTime)
		f.flush()
	} else if mode != "between snapshots" {
		// Half a snapshot, as WriteSnapshot leaves it when killed part way.
		enter()
		f, err := openFile(path, true)
		if err != nil {
			os.Exit(4)
		}
		fd := testFields(2)[0]
		f.createGroup("/snapshots/000002")
		f.setFloat("/snapshots/000002", "time", 3)
		f.writeF64("/snapshots/000002/"+fd.Name, fd.Data, []int{fd.Rows, fd.Cols}, 0)
		if mode == "after a flush in a snapshot" {
			f.flush()
		}
	}
	syscall.Kill(os.Getpid(), syscall.SIGKILL)
	select {}
}

func TestKilledWriterLeavesReadableFile(t *testing.T) {
	if mode := os.Getenv(childModeEnv); mode != "" {
		killedWriter(mode, os.Getenv(childFileEnv))
		return
	}
	for _, mode := range []string{"between snapshots", "in a snapshot", "after a flush in a snapshot", "in the stacks"} {
		t.Run(mode, func(t *testing.T) {
			path := filepath.Join(t.TempDir(), "fields.h5")
			cmd := exec.Command(os.Args[0], "-test.run=^TestKilledWriterLeavesReadableFile$")
			cmd.Env = append(os.Environ(), childModeEnv+"="+mode, childFileEnv+"="+path)
			out, err := cmd.CombinedOutput()
			var ee *exec.ExitError
			if !errors.As(err, &ee) || ee.Sys().(syscall.WaitStatus).Signal() != syscall.SIGKILL {
				t.Fatalf("the writer was not killed: %v\n%s", err, out)
			}

			h5dumpReadable(t, path)
			snaps, err := ListSnapshots(path)
			if err != nil || len(snaps) != 2 {
				t.Fatalf("after the kill: %d complete snapshots (%v), want 2", len(snaps), err)
			}
			for s, info := range snaps {
				for _, want := range testFields(s) {
					got, err := ReadField(path, info.Group+"/"+want.Name)
					if err != nil || !sameBits(got.Data, want.Data) {
						t.Errorf("snapshot %d field %s after the kill: %v", s, want.Name, err)
					}
				}
			}
			// The sidecar, written after each snapshot, is there without Close.
			if got := sidecarTimes(t, SidecarPath(path)); !equalFloats(got, []float64{1, 2}) {
				t.Errorf("sidecar times %v after the kill, want [1 2]", got)
			}

			// Resume: Open drops the partial group, and the run goes on.
			fl, err := Open(path)
			if err != nil {
				t.Fatal(err)
			}
			if d, times := stackShape(t, path, "u"); fmt.Sprint(d) != "[2 5 8]" || !equalFloats(times, []float64{1, 2}) {
				t.Errorf("after Open: stack /u %v, time %v, want 2 snapshots", d, times)
			}
			if err := fl.TruncateAfter(2); err != nil {
				t.Fatal(err)
			}
			if err := fl.WriteSnapshot(3, 3, testFields(2)); err != nil {
				t.Fatal(err)
			}
			if err := fl.Close(); err != nil {
				t.Fatal(err)
			}
			h5dumpReadable(t, path)
			snaps, err = ListSnapshots(path)
			if err != nil || len(snaps) != 3 || snaps[2].Index != 2 || len(snaps[2].Fields) != 3 {
				t.Fatalf("after resuming: %+v (%v), want 3 snapshots, the last with 3 fields", snaps, err)
			}
		})
	}
}

func TestCopiesBetweenWritesAreReadable(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "fields.h5")
	fl := startTestRun(t, path, 5)
	for s := 0; s < 4; s++ {
		if err := fl.WriteSnapshot(float64(s+1), s, testFields(s)); err != nil {
			t.Fatal(err)
		}
		// What a machine that stops now leaves on disk: no Close was run.
		snapDir := filepath.Join(dir, "copy", string(rune('a'+s)))
		if err := os.MkdirAll(snapDir, 0o755); err != nil {
			t.Fatal(err)
		}
		cp := filepath.Join(snapDir, "fields.h5")
		copyFile(t, path, cp)
		copyFile(t, SidecarPath(path), SidecarPath(cp))
		h5dumpReadable(t, cp)
		snaps, err := ListSnapshots(cp)
		if err != nil || len(snaps) != s+1 {
			t.Fatalf("copy after snapshot %d: %d snapshots (%v)", s, len(snaps), err)
		}
		got, err := ReadField(cp, snaps[s].Group+"/w")
		if err != nil || !sameBits(got.Data, testFields(s)[1].Data) {
			t.Errorf("copy after snapshot %d: w differs (%v)", s, err)
		}
		if n := len(sidecarTimes(t, SidecarPath(cp))); n != s+1 {
			t.Errorf("copy after snapshot %d: sidecar lists %d times", s, n)
		}
	}
	if err := fl.Close(); err != nil {
		t.Fatal(err)
	}
}

func TestViewerHoldingFileDoesNotStopRun(t *testing.T) {
	py := needH5py(t)
	path := filepath.Join(t.TempDir(), "fields.h5")
	fl := startTestRun(t, path, 0)
	if err := fl.WriteSnapshot(1, 1, testFields(0)); err != nil {
		t.Fatal(err)
	}
	// A reader that opens the file (with HDF5's default locking) and waits.
	viewer := exec.Command(py, "-c", `
import sys, h5py
f = h5py.File(sys.argv[1], "r")
print("open", flush=True)
sys.stdin.read()
`, path)
	// The viewer locks as HDF5 does by default, whatever this process set.
	for _, kv := range os.Environ() {
		if !strings.HasPrefix(kv, lockingEnv+"=") {
			viewer.Env = append(viewer.Env, kv)
		}
	}
	stdin, err := viewer.StdinPipe()
	if err != nil {
		t.Fatal(err)
	}
	stdout, err := viewer.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	if err := viewer.Start(); err != nil {
		t.Fatal(err)
	}
	defer viewer.Wait()
	defer stdin.Close()
	buf := make([]byte, 5)
	if _, err := stdout.Read(buf); err != nil || string(buf[:4]) != "open" {
		t.Fatalf("the viewer did not open the file: %v %q", err, buf)
	}
	if err := fl.WriteSnapshot(2, 2, testFields(1)); err != nil {
		t.Fatalf("writing while a viewer holds the file: %v", err)
	}
	if err := fl.Close(); err != nil {
		t.Fatal(err)
	}
}

// TestLockingFallback: where the library cannot turn file locks off per
// file, HDF5's environment switch is set before the first open, unless the
// user set it (HDF5 documents HDF5_USE_FILE_LOCKING from 1.10; from
// memory).
func TestLockingFallback(t *testing.T) {
	t.Setenv(lockingEnv, "")
	os.Unsetenv(lockingEnv)
	if lockingFallback(true) {
		t.Error("set the switch although the library turns locks off per file")
	}
	if _, set := os.LookupEnv(lockingEnv); set {
		t.Errorf("%s set with per-file locking available", lockingEnv)
	}
	if !lockingFallback(false) || os.Getenv(lockingEnv) != "FALSE" {
		t.Errorf("old library: %s = %q, want FALSE", lockingEnv, os.Getenv(lockingEnv))
	}
	t.Setenv(lockingEnv, "TRUE")
	if lockingFallback(false) || os.Getenv(lockingEnv) != "TRUE" {
		t.Errorf("a user's %s = TRUE was changed to %q", lockingEnv, os.Getenv(lockingEnv))
	}
}

// TestFolderInPlaceOfFile: a folder named like the fields file gives one
// line that says so, for readers and for resuming (common practice, no
// source).
func TestFolderInPlaceOfFile(t *testing.T) {
	path := filepath.Join(t.TempDir(), "fields.h5")
	if err := os.Mkdir(path, 0o755); err != nil {
		t.Fatal(err)
	}
	_, err1 := ListSnapshots(path)
	_, err2 := Open(path)
	_, err3 := ReadGrid(path)
	for i, err := range []error{err1, err2, err3} {
		if err == nil || !strings.Contains(err.Error(), "is a folder, not an HDF5 file") || strings.Contains(err.Error(), "\n") {
			t.Errorf("reader %d: %v", i, err)
		}
	}
}
