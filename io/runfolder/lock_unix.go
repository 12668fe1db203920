//go:build unix

package runfolder

import (
	"errors"
	"os"
	"syscall"
)

// lockFile takes an exclusive advisory lock on f without waiting; held
// reports that another open file description has it.
func lockFile(f *os.File) (held bool, err error) {
	for {
		err = syscall.Flock(int(f.Fd()), syscall.LOCK_EX|syscall.LOCK_NB)
		if !errors.Is(err, syscall.EINTR) {
			break
		}
	}
	if errors.Is(err, syscall.EWOULDBLOCK) {
		return true, nil
	}
	return false, err
}
