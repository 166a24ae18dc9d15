// Package safeout writes weft's outputs so that a user's files are never
// lost. It is the one place that creates, replaces or removes anything at
// an output path, but for the folder 'weft fit -o' makes to hold several
// specimens' folders, which is created empty and removed again only if it
// is still empty:
//
//   - every output goes to a temporary sibling (".NAME.weft-tmp-…") and is
//     renamed into place only when it is complete, so a reader sees the old
//     output or the new one, never a mixture or a half-written file;
//   - a lock file ".NAME.weft-lock" beside the output makes a second run
//     writing the same path fail at once instead of replacing the first
//     one's result; the state of the path is checked again just before the
//     final rename, and whatever appeared meanwhile is kept;
//   - nothing existing is replaced unless the caller passes force; even
//     then a file is replaced only when it is a regular file, and a folder
//     only when weft wrote it (its marker file, MarkerName, lists every file
//     in it) and it holds nothing else;
//   - files and folders are created with the permissions the umask allows;
//   - problems with an output path are found by the Prepare functions
//     before the caller does its work;
//   - an interrupted run (HandleSignals) removes its temporary files and
//     lock files and leaves the outputs already in place.
//
// The package says what is wrong, never what to type: every error it
// returns about an output path is an *Error carrying the problem, the path
// the user gave and the details, and the command line adds its advice
// (Error.Advice) and decides the exit code from it (a failed write to
// standard output is the writer's own error).
package safeout
