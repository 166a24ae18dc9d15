//go:build !unix

package safeout

import "os"

// lockFile cannot lock on this platform; the lock file is created
// exclusively instead (see Acquire).
func lockFile(f *os.File) (busy bool, err error) { return false, nil }

// lockIsExclusive is false: Acquire then creates the lock file with
// O_EXCL, so a lock file left by a killed run must be deleted by hand (the
// message says so).
const lockIsExclusive = false
