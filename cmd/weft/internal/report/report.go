// Package report draws the fit report of an output folder: report.html, a
// self-contained page, and each plot as SVG and PNG under plots/. It reads
// only what a fit wrote into the folder (the model card and the fit table,
// see Parse), so a report can be rebuilt without refitting, and it owns the
// tables it reads (WriteFitTable, WriteHeldoutTable) and the selection table
// written beside them.
package report

import "path"

// File is one file of the report: Rel is "report.html" or "plots/NAME",
// with '/' as separator.
type File struct {
	Rel  string
	Data []byte
}

// figures lists the report's figures in the order they appear.
func (in *Input) figures(strain bool) []*figure {
	t := in.table
	var figs []*figure
	if t.hasNormal() {
		figs = append(figs, in.fitGridFigure(strain))
	}
	for i := range t.protocols {
		figs = append(figs, in.fitFigure(i, strain))
	}
	if t.hasNormal() {
		figs = append(figs, in.residualFigure(false, strain))
	}
	if t.hasShear() {
		figs = append(figs, in.residualFigure(true, strain))
	}
	if in.split != nil && len(in.split.Protocols) > 0 {
		figs = append(figs, in.shareFigure())
	}
	if terms := t.activeTerms(); len(terms) > 0 {
		for i := range t.protocols {
			figs = append(figs, in.splitFigure(i, strain, terms))
		}
	}
	for _, f := range []*figure{in.profileFigure(), in.paretoFigure(), in.crossFigure()} {
		if f != nil {
			figs = append(figs, f)
		}
	}
	return figs
}

// Build draws every figure and writes report.html, plotted against stretch
// or, with strain, against Green strain; it returns the files in a fixed
// order (report.html first, then plots/ by figure order, SVG before PNG).
func Build(in *Input, strain bool) ([]File, error) {
	figs, err := renderAll(in.figures(strain))
	if err != nil {
		return nil, err
	}
	html, err := reportHTML(in, figs, strain)
	if err != nil {
		return nil, err
	}
	files := []File{{Rel: "report.html", Data: html}}
	for _, f := range figs {
		files = append(files, File{Rel: path.Join("plots", f.name+".svg"), Data: f.svg}, File{Rel: path.Join("plots", f.name+".png"), Data: f.png})
	}
	return files, nil
}
