//go:build unix

package safeout

import (
	"errors"
	"os"
	"syscall"
)

// lockFile takes an exclusive advisory lock on the open lock file f without
// waiting. busy is true when another process holds it. File systems that
// cannot lock are treated as unlocked: the final re-check still refuses to
// replace what appeared meanwhile.
func lockFile(f *os.File) (busy bool, err error) {
	err = syscall.Flock(int(f.Fd()), syscall.LOCK_EX|syscall.LOCK_NB)
	switch {
	case err == nil:
		return false, nil
	case errors.Is(err, syscall.EWOULDBLOCK):
		return true, nil
	case errors.Is(err, syscall.ENOLCK), errors.Is(err, syscall.ENOTSUP), errors.Is(err, syscall.EINVAL):
		return false, nil
	}
	return false, err
}

// lockIsExclusive says whether lockFile excludes other processes by itself.
// With flock the kernel drops the lock when its holder dies, so a lock file
// left behind by a killed run does not block the next one.
const lockIsExclusive = true
