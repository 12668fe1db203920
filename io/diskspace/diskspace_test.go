package diskspace

import (
	"path/filepath"
	"runtime"
	"testing"
)

func TestFormat(t *testing.T) {
	for _, tc := range []struct {
		n    int64
		want string
	}{
		{0, "0 B"},
		{1023, "1023 B"},
		{1024, "1.0 KiB"},
		{3 << 19, "1.5 MiB"},
		{5 << 30, "5.0 GiB"},
	} {
		if got := Format(tc.n); got != tc.want {
			t.Errorf("Format(%d) = %q, want %q", tc.n, got, tc.want)
		}
	}
}

// TestFreeWalksUp: a folder that does not exist yet is measured on its
// nearest existing parent's disk (common practice, no source).
func TestFreeWalksUp(t *testing.T) {
	dir := t.TempDir()
	free, ok := Free(dir)
	switch runtime.GOOS {
	case "linux", "darwin", "freebsd":
		if !ok || free == 0 {
			t.Fatalf("Free(%s) = %d, %t: want the room on the test disk", dir, free, ok)
		}
	default:
		if ok {
			t.Fatalf("Free(%s) = %d, true on %s, where statfs is not used", dir, free, runtime.GOOS)
		}
		return
	}
	below, ok := Free(filepath.Join(dir, "not", "yet"))
	if !ok {
		t.Fatal("Free of a folder still to be made: not measured")
	}
	// Other processes write to the same disk: allow them 64 MiB.
	if d := int64(below) - int64(free); d > 64<<20 || d < -64<<20 {
		t.Errorf("Free below a missing folder = %d, on its parent %d", below, free)
	}
}
