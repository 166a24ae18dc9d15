package safeout

import (
	"os"
	"os/signal"
	"sort"
	"sync"
	"syscall"
)

// cleanup records the temporary files and folders and the lock files this
// process has created and not yet removed, so that an interrupted run
// (SIGINT, SIGTERM) removes them before it exits. Its mutex also guards the
// few renames that put an output in place: an interruption waits for them,
// so it never leaves a half-replaced output.
var cleanup = struct {
	mu    sync.Mutex
	temps map[string]bool
	locks map[string]bool
}{temps: map[string]bool{}, locks: map[string]bool{}}

// commitGate is held across the commits of one output made of several
// files or folders (see HoldInterruptions) and taken by the signal handler
// before it cleans up, so that an interruption lands before the first of
// them or after the last, never between.
var commitGate sync.Mutex

// HoldInterruptions defers the handling of an interruption (HandleSignals)
// until release is called: an output made of several commits (a report's
// plots/, its page and the folder's marker) is then either wholly old or
// wholly new when a signal arrives while it is committed. Hold it only
// around the commits themselves, which take milliseconds, not around
// work: a signal waits for the hold. Holds do not nest; release may be
// called more than once.
func HoldInterruptions() (release func()) {
	commitGate.Lock()
	var once sync.Once
	return func() { once.Do(commitGate.Unlock) }
}

// trackTemp records a temporary path; the caller holds cleanup.mu.
func trackTemp(p string) { cleanup.temps[p] = true }

// untrackTemp forgets a temporary path once it has been removed or renamed
// into place.
func untrackTemp(p string) {
	cleanup.mu.Lock()
	delete(cleanup.temps, p)
	cleanup.mu.Unlock()
}

// removeTemps removes every recorded temporary path and lock file; the
// caller holds cleanup.mu. A folder is first renamed aside so that a worker
// still writing into it cannot recreate entries while it is removed.
func removeTemps() {
	paths := make([]string, 0, len(cleanup.temps))
	for p := range cleanup.temps {
		paths = append(paths, p)
	}
	sort.Strings(paths)
	for _, p := range paths {
		gone := p + ".removing"
		if os.Rename(p, gone) != nil {
			gone = p
		}
		os.RemoveAll(gone)
		delete(cleanup.temps, p)
	}
	for p := range cleanup.locks {
		os.Remove(p)
		delete(cleanup.locks, p)
	}
}

// HandleSignals makes SIGINT, SIGTERM and SIGHUP (the terminal or the
// remote session closed) remove this process's temporary files and lock
// files, then call interrupted, which tells the user and returns the exit
// code the process ends with. Outputs already put in place are kept;
// nothing half-written is left, and no output is put in place after the
// signal (a group of commits under HoldInterruptions is completed first).
// A signal ignored when weft started (nohup, a background job of a
// script) stays ignored: handling it would undo what the caller asked
// for. stop restores the default handling.
func HandleSignals(interrupted func(os.Signal) (exitCode int)) (stop func()) {
	ch := make(chan os.Signal, 1)
	for _, sig := range []os.Signal{os.Interrupt, syscall.SIGTERM, syscall.SIGHUP} {
		if !signal.Ignored(sig) {
			signal.Notify(ch, sig)
		}
	}
	done := make(chan struct{})
	go func() {
		select {
		case sig := <-ch:
			// Both held until exit: no output is committed any more,
			// and a group of commits under way (HoldInterruptions)
			// finishes first.
			commitGate.Lock()
			cleanup.mu.Lock()
			removeTemps()
			os.Exit(interrupted(sig))
		case <-done:
		}
	}()
	return func() {
		signal.Stop(ch)
		close(done)
	}
}
