package h5

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"syscall"

	"rollerbed/io/diskspace"
)

// syncFile forces the contents of path to stable storage.
func syncFile(path string) error {
	f, err := os.Open(path)
	if err != nil {
		return err
	}
	if err := f.Sync(); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}

// syncDir forces the entries of folder dir (new, renamed or removed files)
// to stable storage. Filesystems that cannot sync a folder are accepted.
func syncDir(dir string) error {
	d, err := os.Open(dir)
	if err != nil {
		return err
	}
	err = d.Sync()
	if errors.Is(err, syscall.EINVAL) || errors.Is(err, syscall.ENOTSUP) {
		err = nil
	}
	if cerr := d.Close(); err == nil {
		err = cerr
	}
	return err
}

// writeFileAtomic replaces path with data: a temporary file in the same
// folder is written, synced and renamed over path, and the folder synced,
// so that readers see either the old or the new contents, never a part.
func writeFileAtomic(path string, data []byte) error {
	dir := filepath.Dir(path)
	f, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return err
	}
	tmp := f.Name()
	fail := func(err error) error {
		f.Close()
		os.Remove(tmp)
		return err
	}
	if _, err := f.Write(data); err != nil {
		return fail(err)
	}
	if err := f.Chmod(0o644); err != nil {
		return fail(err)
	}
	if err := f.Sync(); err != nil {
		return fail(err)
	}
	if err := f.Close(); err != nil {
		os.Remove(tmp)
		return err
	}
	if err := os.Rename(tmp, path); err != nil {
		os.Remove(tmp)
		return err
	}
	return syncDir(dir)
}

// freeSpace reports the bytes an unprivileged writer may still use on the
// filesystem holding dir; ok is false where that cannot be told. Tests
// replace it to simulate a full disk.
var freeSpace = diskspace.Free

// spaceMargin is the room kept free beyond an estimate of what a write
// needs: HDF5 metadata, the XDMF sidecar, and what else the run writes.
const spaceMargin = 4 << 20

// checkSpace returns an error naming what when dir has less than need
// bytes (plus a margin) free.
func checkSpace(dir string, need int64, what string) error {
	free, ok := freeSpace(dir)
	if !ok || free >= uint64(need)+spaceMargin {
		return nil
	}
	return fmt.Errorf("h5: not enough disk space for %s in %s: it needs about %s and %s is free; "+
		"free some space (or move the run folder to a larger disk) and resume: what was written before is intact",
		what, dir, diskspace.Format(need+spaceMargin), diskspace.Format(int64(free)))
}
