// Package planning is what 'weft plan' reads and writes around the
// planning of the next test (package aniso ranks the tests): the fit
// rebuilt from an output folder (Rebuild, folder.go), the plan as a table
// or JSON (NewReport, Print), the top test's target path as CSV (PathCSV)
// and its plot (Plot). Rebuild's errors about the folder's files are
// *InputError (bad input); a folder whose files parse but do not hold one
// fit gives *RebuildError, which the command reports as a failed check
// (both in errors.go).
package planning
