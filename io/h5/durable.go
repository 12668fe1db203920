package h5

import (
	"fmt"

	"rollerbed/io/diskspace"
)

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
		"free some space (or move the run folder to a larger disk): what was written before is intact",
		what, dir, diskspace.Format(need+spaceMargin), diskspace.Format(int64(free)))
}
