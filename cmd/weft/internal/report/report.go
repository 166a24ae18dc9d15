// Package report draws the fit report of an output folder: report.html, a
// self-contained page, and each plot as SVG (and, on request, PNG) under
// plots/. It reads only what a fit wrote into the folder (the model card
// and the tables, see Parse), so a report can be rebuilt without refitting,
// and it owns the tables it reads (WriteFitTable, WriteHeldoutTable,
// WriteCurveTable, WriteRawTable) and the selection table written beside
// them (WriteSelectionTable), in tables.go and curvetable.go.
//
// Parse (load.go) reads a folder; Build (report.go) draws it: the page's
// sections are built by small functions in view.go and sections.go
// (leftout.go reads from the card why candidates were not
// cross-validated) into the template report.html (html.go), the plots in
// plots*.go (curves.go the model curves and R², palette.go the colours),
// the formulas as MathML in mathml.go and numbers in format.go. export.go
// holds what the cohort report reuses of the drawing.
//
// The verdict is written in two places: its own section, the verdict in
// words with the reason, the decider, the untested strips and the table of
// fibre layouts (Input.verdictSection, view.go; verdictText, html.go), and
// the sentence before the chosen model in the methods paragraph
// (Input.verdictWords, with fibrelessRivalWords for a verdict left
// undecided by a Fung-type preset, sections.go).
package report

import "path"

// File is one file of the report: Rel is "report.html" or "plots/NAME",
// with '/' as separator.
type File struct {
	Rel  string
	Data []byte
}

// Options are how a report is drawn.
type Options struct {
	// Strain plots against Green strain E = ½(λ² − 1) instead of stretch.
	Strain bool
	// PNG also writes every plot as PNG (pngDPI, with its resolution in
	// the file); the page itself needs only the SVGs.
	PNG bool
	// Software is the version of the program drawing the report, e.g.
	// "(devel)" or "v1.2.0, revision 0123456789ab"; "" leaves it out.
	Software string
}

// figures lists the report's figures in the order they appear.
func (in *Input) figures(strain bool) []*figure {
	t := in.table
	var figs []*figure
	add := func(f *figure) {
		if f != nil {
			figs = append(figs, f)
		}
	}
	if t.hasNormal() {
		add(in.fitGridFigure(strain))
	}
	add(in.rawFigure())
	if t.hasShear() {
		add(in.shearFigure(strain))
	}
	add(in.presetsFigure(strain))
	if t.hasNormal() {
		add(in.residualFigure(false, strain))
	}
	if t.hasShear() {
		add(in.residualFigure(true, strain))
	}
	add(in.splitFigure(strain))
	add(in.profileFigure())
	add(in.paretoFigure())
	return figs
}

// Build draws every figure and writes report.html; it returns the files in
// a fixed order (report.html first, then plots/ by figure order, SVG
// before PNG).
func Build(in *Input, o Options) ([]File, error) {
	figs, err := renderAll(in.figures(o.Strain), o.PNG)
	if err != nil {
		return nil, err
	}
	html, err := reportHTML(in, figs, o)
	if err != nil {
		return nil, err
	}
	files := []File{{Rel: "report.html", Data: html}}
	for _, f := range figs {
		files = append(files, File{Rel: path.Join("plots", f.name+".svg"), Data: f.svg})
		if f.png != nil {
			files = append(files, File{Rel: path.Join("plots", f.name+".png"), Data: f.png})
		}
	}
	return files, nil
}
