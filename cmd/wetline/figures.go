package main

import (
	"fmt"
	"path/filepath"
	"strings"

	"wetline/rating"
	"wetline/survey/batch"
)

// figureBase returns the start of the file names of a section's figures:
// the section's name (the sheet of a workbook, the base name of a CSV
// file, as survey names sections), kept to the characters safe in a file
// name (batch.SafeFileName). A figure of sheet XS-2 of field.xlsx is
// XS-2-rating.png, never field-rating.png.
func figureBase(section string) string { return batch.SafeFileName(section) }

// runFigures are the figure files a run has written, so that a run never
// writes over a figure of its own: two sections named alike get distinct
// names. The zero value is ready to use.
type runFigures struct {
	used map[string]bool // cleaned paths, lower case (file systems that fold case)
}

// place returns figs with their names made free in folder dir for this
// run, and records them: a set one of whose names the run has used already
// gets the smallest suffix -2, -3, … (before the extension) that frees
// every name of the set, so the figures of one section keep one suffix
// (a name given twice within the set takes the next free one).
func (n *runFigures) place(dir string, figs []rating.Figure) []rating.Figure {
	if n.used == nil {
		n.used = map[string]bool{}
	}
	key := func(name string) string { return strings.ToLower(filepath.Clean(filepath.Join(dir, name))) }
	named := func(name string, k int) string {
		if k < 2 {
			return name
		}
		ext := filepath.Ext(name)
		return fmt.Sprintf("%s-%d%s", strings.TrimSuffix(name, ext), k, ext)
	}
	free := func(k int) bool {
		for _, f := range figs {
			if n.used[key(named(f.Name, k))] {
				return false
			}
		}
		return true
	}
	k := 1
	for !free(k) {
		k++
	}
	out := make([]rating.Figure, len(figs))
	for i, f := range figs {
		j := k
		for n.used[key(named(f.Name, j))] { // a name given twice in the set
			j++
		}
		f.Name = named(f.Name, j)
		n.used[key(f.Name)] = true
		out[i] = f
	}
	return out
}
