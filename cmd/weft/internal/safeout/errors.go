package safeout

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"strings"
)

// Problem is what is wrong with an output path.
type Problem int

// The problems an *Error reports. The text each one gives is in
// Error.Error.
const (
	// Busy: another run holds the output's lock (LockFile names the lock
	// file to delete by hand where locks do not die with their holder).
	Busy Problem = iota
	// LockFailed: the lock file could not be created in Folder (Err).
	LockFailed
	// Unwritable: the temporary folder could not be created in Folder (Err).
	Unwritable
	// NoParent: Folder, which would hold Path, does not exist.
	NoParent
	// ParentNotFolder: Folder, which would hold Path, is not a folder.
	ParentNotFolder
	// CannotCreate: Path could not be created (Err).
	CannotCreate
	// Unusable: what is at Path could not be examined (Err).
	Unusable
	// Unreadable: a file or folder at Path could not be read (Err).
	Unreadable
	// NotFolder: Path should be a folder to write into but is Found.
	NotFolder
	// Exists: Path exists and force was not given.
	Exists
	// NotRegular: the output file Path exists and is Found, which is never
	// replaced.
	NotRegular
	// NotOutputFolder: the output folder Path exists and is Found, not a
	// folder weft wrote.
	NotOutputFolder
	// HoldsWorkDir: the folder Path is the working folder or contains it.
	HoldsWorkDir
	// HoldsInput: the input Input lies inside the folder Path.
	HoldsInput
	// NoMarker: the folder Path has no marker and is no folder weft wrote.
	NoMarker
	// Foreign: the folder Path holds Entries, which weft did not write.
	Foreign
	// NotWholeFolder: Path (".", ".." or a root) names a folder that
	// cannot be replaced as a whole.
	NotWholeFolder
	// Appeared: something appeared at Path while the run worked.
	Appeared
	// WriteFailed: writing Path failed (Err).
	WriteFailed
	// ReplaceFailed: moving the old output at Path aside failed (Err).
	ReplaceFailed
	// IsInput: the output file Path is the input Input of the same run
	// (the same file, however either path was typed), which replacing
	// would destroy.
	IsInput
)

// Target is the kind of output an Error is about.
type Target int

const (
	// TargetFile is an output file.
	TargetFile Target = iota
	// TargetFolder is an output folder, replaced as a whole.
	TargetFolder
	// TargetPlots is the plots/ folder inside an output folder, replaced
	// on its own when a report is rebuilt.
	TargetPlots
)

// Error is a problem with an output path. Callers tell problems apart with
// errors.As and the Problem field.
type Error struct {
	// Problem is what is wrong.
	Problem Problem
	// Target is the kind of output.
	Target Target
	// Path is the output path as the user gave it (cleaned).
	Path string
	// Folder is the folder concerned when it is not Path: the one that
	// would hold Path.
	Folder string
	// Found says what is at Path when it is not what was wanted ("a
	// symbolic link", "a named pipe", …; see KindOf).
	Found string
	// Input is the input file lying inside Path (HoldsInput) or being
	// Path (IsInput), as the user gave it.
	Input string
	// Entries are up to five entries of Path weft did not write
	// (Foreign), slash-separated, folders with a trailing slash.
	Entries []string
	// LockFile is, for Busy on platforms whose locks outlive a killed
	// holder, the lock file to delete when no run is writing; empty
	// elsewhere.
	LockFile string
	// Err is the operating system's error, when there is one.
	Err error
	// Late is true when the problem was found after the work, as the
	// output was being put in place: nothing was replaced and the run's
	// results are lost. When false the problem was found before the work
	// and lies with the output path the user gave.
	Late bool
	// Advice is what the user can do about it, set by the caller that
	// knows how the user named the output (a command-line flag, say). It
	// follows the description of the problem and starts with its own
	// separator ("; …" or " — …"). Empty by default.
	Advice string
}

// Error describes the problem, then the advice, then for a problem found
// late that nothing was replaced.
func (e *Error) Error() string {
	msg := e.what() + e.Advice
	if e.Late && e.Problem != WriteFailed && e.Problem != ReplaceFailed {
		msg += "; it was not replaced"
		if e.Target != TargetFile {
			msg += " and the new results were not written"
		}
	}
	return msg
}

// Unwrap returns the operating system's error, if any.
func (e *Error) Unwrap() error { return e.Err }

// what says what is wrong, naming the path the user gave.
func (e *Error) what() string {
	p := e.Path
	switch e.Problem {
	case Busy:
		return p + " is being written by another weft run"
	case LockFailed:
		return fmt.Sprintf("cannot write in %s (%s); check that the folder exists and is writable", e.Folder, Reason(e.Err))
	case Unwritable:
		return fmt.Sprintf("cannot write in %s (%s); check that the folder is writable", e.Folder, Reason(e.Err))
	case NoParent:
		return fmt.Sprintf("cannot create %s: the folder %s does not exist", p, e.Folder)
	case ParentNotFolder:
		return fmt.Sprintf("cannot create %s: %s is not a folder", p, e.Folder)
	case CannotCreate:
		return fmt.Sprintf("cannot create %s (%s)", p, Reason(e.Err))
	case Unusable:
		return fmt.Sprintf("cannot use %s (%s)", p, Reason(e.Err))
	case Unreadable:
		return fmt.Sprintf("cannot read %s (%s)", p, Reason(e.Err))
	case NotFolder:
		return fmt.Sprintf("%s exists and is %s, not a folder", p, e.Found)
	case Exists:
		return p + " exists"
	case NotRegular:
		return fmt.Sprintf("%s exists and is %s; weft replaces only regular files", p, e.Found)
	case NotOutputFolder:
		if e.Target == TargetPlots {
			return fmt.Sprintf("%s exists and is %s, not weft's plots folder; it is kept", p, e.Found)
		}
		return fmt.Sprintf("%s exists and is %s, not an output folder of weft", p, e.Found)
	case HoldsWorkDir:
		return p + " is the current folder or contains it; weft does not replace the folder it runs in"
	case HoldsInput:
		return fmt.Sprintf("the input %s lies inside %s; replacing the folder would delete it", e.Input, p)
	case NoMarker:
		return fmt.Sprintf("%s was not written by weft (it has no %s file listing weft's files)", p, MarkerName)
	case Foreign:
		what := "the folder"
		if e.Target == TargetPlots {
			what = "plots/"
		}
		return fmt.Sprintf("%s holds files weft did not write (%s); replacing %s would delete them, so it is kept", p, strings.Join(e.Entries, ", "), what)
	case NotWholeFolder:
		return p + " names an existing folder that weft cannot replace as a whole"
	case Appeared:
		return p + " appeared while weft was running"
	case WriteFailed:
		return fmt.Sprintf("cannot write %s (%s)", p, Reason(e.Err))
	case ReplaceFailed:
		return fmt.Sprintf("cannot replace %s (%s)", p, Reason(e.Err))
	case IsInput:
		if p == e.Input {
			return p + " is also an input of this run; replacing it would destroy what is being read"
		}
		return fmt.Sprintf("%s is the input %s of this run; replacing it would destroy what is being read", p, e.Input)
	}
	return "cannot write " + p
}

// Reason is the operating system's reason for err without the path, so
// that a message can name the path the user gave instead of a temporary
// one.
func Reason(err error) string {
	if err == nil {
		return "unknown error"
	}
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err.Error()
	}
	var le *os.LinkError
	if errors.As(err, &le) {
		return le.Err.Error()
	}
	return err.Error()
}

// KindOf names what a file of mode m is, for messages: "a symbolic link",
// "a folder", "a device", "a named pipe", "a socket" or "a file".
func KindOf(m fs.FileMode) string {
	switch {
	case m&fs.ModeSymlink != 0:
		return "a symbolic link"
	case m.IsDir():
		return "a folder"
	case m&fs.ModeDevice != 0:
		return "a device"
	case m&fs.ModeNamedPipe != 0:
		return "a named pipe"
	case m&fs.ModeSocket != 0:
		return "a socket"
	case m.IsRegular():
		return "a file"
	}
	return "not a regular file"
}
