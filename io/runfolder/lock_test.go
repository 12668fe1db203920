//go:build unix

package runfolder

import (
	"bufio"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"strings"
	"syscall"
	"testing"
	"time"
)

// lockChildEnv makes the test binary a child that takes the lock of the
// folder it names, says so and waits to be killed (see TestLockAcrossProcesses).
const lockChildEnv = "ROLLERBED_RUNFOLDER_LOCK_CHILD"

func TestMain(m *testing.M) {
	if dir := os.Getenv(lockChildEnv); dir != "" {
		l, err := TakeLock(dir)
		if err != nil {
			fmt.Println("error:", err)
			os.Exit(3)
		}
		fmt.Println("locked")
		time.Sleep(time.Minute)
		l.Release()
		os.Exit(0)
	}
	os.Exit(m.Run())
}

// TestLockAcrossProcesses: a folder locked by another process is refused
// at once, naming that process; once the process is killed (no clean
// release) the lock is taken over (common practice, no source).
func TestLockAcrossProcesses(t *testing.T) {
	dir := t.TempDir()
	child := exec.Command(os.Args[0], "-test.run=^$")
	child.Env = append(os.Environ(), lockChildEnv+"="+dir)
	out, err := child.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	if err := child.Start(); err != nil {
		t.Fatal(err)
	}
	defer child.Process.Kill()
	line, _ := bufio.NewReader(out).ReadString('\n')
	if strings.TrimSpace(line) != "locked" {
		t.Fatalf("the child did not lock: %q", line)
	}
	start := time.Now()
	_, err = TakeLock(dir)
	var inUse *InUseError
	if !errors.As(err, &inUse) || !errors.Is(err, ErrInUse) {
		t.Fatalf("second writer: %v, want an *InUseError", err)
	}
	if !strings.Contains(inUse.Holder, fmt.Sprintf("process %d ", child.Process.Pid)) || strings.Contains(err.Error(), "\n") {
		t.Errorf("the refusal does not name the holder on one line: %q", err)
	}
	if time.Since(start) > 5*time.Second {
		t.Errorf("the refusal took %v; it should come at once", time.Since(start))
	}
	child.Process.Signal(syscall.SIGKILL)
	child.Wait()
	l, err := TakeLock(dir)
	if err != nil {
		t.Fatalf("after the holder was killed: %v", err)
	}
	defer l.Release()
	if h := readHolder(dir + "/" + LockFile); !strings.Contains(h, fmt.Sprintf("process %d ", os.Getpid())) {
		t.Errorf("the lock file names %q, not this process", h)
	}
}

// TestLockInOneProcess: a second hold in the same process is refused too,
// and Release lets the next one in.
func TestLockInOneProcess(t *testing.T) {
	dir := t.TempDir()
	l, err := TakeLock(dir)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := TakeLock(dir); !errors.Is(err, ErrInUse) {
		t.Errorf("second hold: %v", err)
	}
	if err := l.Release(); err != nil {
		t.Fatal(err)
	}
	l2, err := TakeLock(dir)
	if err != nil {
		t.Fatalf("after Release: %v", err)
	}
	l2.Release()
}
