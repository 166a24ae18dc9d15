// Package cohortreport turns a cohort fit (aniso.FitCohort) into what a
// study reports: the table of specimens and their parameters (cohort.csv),
// the statistics per parameter and group with the group comparisons
// (cohort.json), and a self-contained page (report.html) whose figures
// reuse the fit report's drawing (package report). Cards (cards.go)
// builds each specimen's card, the population's and the mean-parameter
// one from the fit, with the summary's input; Build (summary.go)
// gathers the statistics, which are in stats.go, and how the population
// model's stress compares with the specimens' (population.go);
// Summary.CSV and Summary.JSON write the tables (tables.go);
// Summary.Report the page, the template cohort.html (html.go), with its
// plots (plots.go).
package cohortreport
