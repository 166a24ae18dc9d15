// Package summary prints the short human summaries that 'weft fit' and
// 'weft cohort' write to standard output: for one specimen (PrintFit) the
// data, the model, its parameters with their intervals, the goodness of
// fit, who carries the load, the forms compared and the cautions; for a
// cohort (PrintCohort) the common form, the statistics per parameter and
// group with the group comparisons, and the cautions. The files the
// commands write hold everything; these summaries are for reading at a
// terminal.
package summary
