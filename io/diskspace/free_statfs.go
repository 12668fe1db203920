//go:build linux || darwin || freebsd

package diskspace

import (
	"path/filepath"
	"syscall"
)

// Free returns the bytes available to unprivileged users on the
// filesystem holding dir, or on that of its nearest existing parent when
// dir does not exist yet; ok is false when no folder on the path can be
// measured.
func Free(dir string) (bytes uint64, ok bool) {
	for d := dir; ; d = filepath.Dir(d) {
		var st syscall.Statfs_t
		if err := syscall.Statfs(d, &st); err == nil {
			return uint64(st.Bavail) * uint64(st.Bsize), true
		}
		if d == filepath.Dir(d) {
			return 0, false
		}
	}
}
