//go:build unix

package canopy

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// TestLoadProfileRefusesWhatIsNoTable: a named pipe (which would block a
// reader forever), a folder and a binary file each give one short line
// naming the file and what to give instead (common practice, no source).
func TestLoadProfileRefusesWhatIsNoTable(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "pipe.csv")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Skipf("no named pipes here: %v", err)
	}
	bin := filepath.Join(dir, "blob.csv")
	blob := append([]byte{0x7f, 'E', 'L', 'F', 0, 0, 1}, bytes.Repeat([]byte{0xff, 0x00, 0x13}, 4000)...)
	os.WriteFile(bin, blob, 0o644)
	long := filepath.Join(dir, "long.csv")
	os.WriteFile(long, []byte(strings.Repeat("x", 8000)+", 1\n"), 0o644)
	for _, c := range []struct{ path, want string }{
		{fifo, "is a named pipe, not a file"},
		{dir, "is a folder, not a file"},
		{bin, "holds binary data, not text"},
		{long, "neither numbers nor the header"},
	} {
		done := make(chan error, 1)
		go func() { _, err := LoadProfile(c.path); done <- err }()
		select {
		case err := <-done:
			if err == nil || !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), c.path) {
				t.Errorf("%s: %v, want %q", c.path, err, c.want)
			} else if msg := err.Error(); strings.Contains(msg, "\n") || len(msg) > 300 {
				t.Errorf("%s: a message of %d bytes or several lines: %.300q", c.path, len(msg), msg)
			}
		case <-time.After(10 * time.Second):
			t.Fatalf("%s: LoadProfile does not return", c.path)
		}
	}
}
