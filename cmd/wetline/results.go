package main

import (
	"context"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"

	"wetline/rating"
	"wetline/survey"
)

// ratingBook gathers the results workbook of a rating: the table as
// computed, the same section rated at every hundredth of stage over the
// table's range for the lookup sheet, and the summary facts. A range too
// long for a lookup sheet leaves the sheet out with a warning.
func ratingBook(l *loaded, t rating.Table, warnings []string) (survey.RatingWorkbook, []string, error) {
	rw := survey.RatingWorkbook{Table: t, Version: Version, Source: l.survey.File}
	if l.survey.Sheet != "" {
		rw.Source += " ['" + l.survey.Sheet + "']"
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, r := range t.Rows {
		lo, hi = min(lo, r.Stage), max(hi, r.Stage)
	}
	if len(t.Rows) > 0 {
		stages, err := survey.LookupStages(lo, hi)
		if err != nil {
			warnings = append(warnings, fmt.Sprintf("no lookup sheet: %v", err))
		} else {
			fine, err := rating.Compute(l.geom, stages, rating.Options{Slope: t.Slope, Units: t.Units, Geometry: l.geomOpt})
			if err != nil {
				return rw, warnings, fmt.Errorf("lookup table: %w", err)
			}
			rw.Lookup = fine
		}
	}
	rw.Warnings = warnings
	return rw, warnings, nil
}

// demoWorkbook writes the gauge section's results workbook.
func demoWorkbook(ctx context.Context, e *env, dir string) error {
	path := filepath.Join(dir, demoSurvey)
	if _, err := os.Stat(path); err != nil {
		if path, err = copyDemoFile(e, dir, demoSurvey, "surveyed cross-section at the gauge"); err != nil {
			return err
		}
	}
	sf := sectionFlags{units: "si"}
	l, err := sf.load(path)
	if err != nil {
		return err
	}
	t, err := rating.Compute(l.geom, rating.DefaultStages(l.geom), rating.Options{Slope: demoSlope, Units: l.units})
	if err != nil {
		return err
	}
	warnings := append(append([]string(nil), l.warnings...), t.Warnings...)
	rw, _, err := ratingBook(l, t, warnings)
	if err != nil {
		return err
	}
	const name = "tallow-xs1-results.xlsx"
	if err := survey.WriteFile(filepath.Join(dir, name), []string{path}, func(w io.Writer) error {
		return survey.WriteRatingWorkbook(w, rw)
	}); err != nil {
		return err
	}
	fmt.Fprintf(e.stdout, "  %-28s %s\n", name, "results workbook: summary, rating, lookup by hundredths, subsections")
	return nil
}
