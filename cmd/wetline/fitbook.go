package main

import (
	"errors"
	"fmt"
	"strings"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/survey/results"
	"wetline/survey/workbook"
)

// fitBook gathers the results workbook of a gaugings report: the lookup
// cells at every hundredth of stage by the table's rule (c is the
// hydraulic rating the report was made with, nil when none) and the fit
// figure. A stage range too long for a lookup sheet leaves the sheet out
// with a warning. figs are figures already drawn (nil: draw them).
func fitBook(rep *gauged.Report, c *rating.HydraulicCurve, sources []string, site, base string, figs []figureFile) (results.FitWorkbook, error) {
	fw := results.FitWorkbook{Report: rep, Version: Version, Source: strings.Join(sources, "; ")}
	cells, err := results.FitLookupCells(rep, c)
	switch {
	case errors.Is(err, results.ErrLookupRange):
		rep.Warnings = append(rep.Warnings, fmt.Sprintf("no lookup sheet: %v", err))
	case err != nil:
		return fw, fmt.Errorf("lookup sheet: %w", err)
	}
	fw.Lookup = cells
	if figs == nil {
		var w []string
		if figs, w, err = fitFigures(rep, site, base); err != nil {
			return fw, err
		}
		rep.Warnings = append(rep.Warnings, w...)
	}
	for _, f := range figs {
		fw.Pictures = append(fw.Pictures, workbook.Picture{Name: f.what, PNG: f.data})
	}
	return fw, nil
}
