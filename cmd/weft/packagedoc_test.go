package main

import (
	"go/parser"
	"go/token"
	"os"
	"regexp"
	"strings"
	"testing"
)

// The package comment (main.go) is the map of this package for a
// contributor: every file it names must exist, and every package under
// internal/ must be named in it. It named predictalike.go and predictCSV
// after both had moved to internal/prediction, and left out prediction
// and catalogue.
func TestPackageDocNamesWhatExists(t *testing.T) {
	f, err := parser.ParseFile(token.NewFileSet(), "main.go", nil, parser.ParseComments|parser.PackageClauseOnly)
	if err != nil {
		t.Fatal(err)
	}
	doc := f.Doc.Text()
	for _, name := range regexp.MustCompile(`[a-z_]+\.go\b`).FindAllString(doc, -1) {
		if _, err := os.Stat(name); err != nil {
			t.Errorf("the package comment names %s, which is not in cmd/weft", name)
		}
	}
	entries, err := os.ReadDir("internal")
	if err != nil {
		t.Fatal(err)
	}
	words := strings.Fields(strings.NewReplacer(",", " ", "(", " ", ")", " ").Replace(doc))
	named := map[string]bool{}
	for _, w := range words {
		named[w] = true
	}
	for _, e := range entries {
		if e.IsDir() && !named[e.Name()] {
			t.Errorf("package internal/%s is not named in the package comment", e.Name())
		}
	}
}
