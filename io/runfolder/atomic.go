package runfolder

import (
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"syscall"
)

// WriteFileAtomic replaces path with data: a temporary file in the same
// folder is written, synced and renamed over path, and the folder is
// synced, so that readers see either the old or the new contents, never a
// part, and the new name survives a power cut. The file gets mode 0644.
func WriteFileAtomic(path string, data []byte) error {
	dir := filepath.Dir(path)
	f, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return fmt.Errorf("runfolder: cannot write in %s: %w", dir, err)
	}
	tmp := f.Name()
	fail := func(err error) error {
		f.Close()
		os.Remove(tmp)
		return fmt.Errorf("runfolder: writing %s: %w", path, err)
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
		return fmt.Errorf("runfolder: writing %s: %w", path, err)
	}
	if err := os.Rename(tmp, path); err != nil {
		os.Remove(tmp)
		return fmt.Errorf("runfolder: writing %s: %w", path, err)
	}
	if err := SyncDir(dir); err != nil {
		return fmt.Errorf("runfolder: writing %s: %w", path, err)
	}
	return nil
}

// WriteJSON writes v as indented JSON with a final newline, atomically.
func WriteJSON(path string, v any) error {
	b, err := json.MarshalIndent(v, "", "  ")
	if err != nil {
		return fmt.Errorf("runfolder: encoding %s: %w", path, err)
	}
	return WriteFileAtomic(path, append(b, '\n'))
}

// SyncFile forces the contents of path to stable storage.
func SyncFile(path string) error {
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

// SyncDir forces the entries of folder dir (new, renamed or removed files)
// to stable storage. Filesystems that cannot sync a folder are accepted.
func SyncDir(dir string) error {
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
