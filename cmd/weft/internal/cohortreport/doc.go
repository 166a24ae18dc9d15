// Package cohortreport turns a cohort fit (aniso.FitCohort) into what a
// study reports: the table of specimens and their parameters (cohort.csv),
// the statistics per parameter and group with the group comparisons
// (cohort.json), and a self-contained page (report.html) whose figures
// reuse the fit report's drawing (package report). The statistics are in
// stats.go.
package cohortreport
