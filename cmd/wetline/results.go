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
	"wetline/survey/output"
	"wetline/survey/results"
	"wetline/survey/workbook"
)

// ratingBook gathers the results workbook of a rating: the table as
// computed, the same section rated at every hundredth of stage over the
// table's range for the lookup sheet, and the summary facts. A range too
// long for a lookup sheet leaves the sheet out with a warning.
func ratingBook(l *loaded, t rating.Table, warnings []string) (results.RatingWorkbook, []string, error) {
	rw := results.RatingWorkbook{Table: t, Version: Version, Source: l.survey.File, Survey: l.survey}
	if l.survey.Sheet != "" {
		rw.Source += " ['" + l.survey.Sheet + "']"
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, r := range t.Rows {
		lo, hi = min(lo, r.Stage), max(hi, r.Stage)
	}
	if len(t.Rows) > 0 {
		stages, err := results.LookupStages(lo, hi)
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
	// The figures go into the workbook as pictures.
	name := l.survey.Section.Name
	if name == "" {
		name = t.Name
	}
	figs, figWarnings, err := drawFigures(figureInput{base: name, table: t, loaded: l, zeroFlow: math.NaN(),
		opt: rating.Options{Geometry: l.geomOpt}, subtitle: "section " + name})
	if err != nil {
		return rw, warnings, err
	}
	warnings = append(warnings, figWarnings...)
	for _, f := range figs {
		rw.Pictures = append(rw.Pictures, workbook.Picture{Name: f.what, PNG: f.data})
	}
	rw.Warnings = warnings
	return rw, warnings, nil
}

// demoWorkbook writes the gauge section's survey into a field workbook,
// rates the section read back from that workbook, and writes the results
// workbook.
func demoWorkbook(ctx context.Context, e *env, dir string) error {
	csvPath := filepath.Join(dir, demoSurvey)
	if _, err := os.Stat(csvPath); err != nil {
		if csvPath, err = copyDemoFile(e, dir, demoSurvey, "surveyed cross-section at the gauge"); err != nil {
			return err
		}
	}
	sv, err := survey.ReadSection(csvPath, "", survey.SectionOptions{})
	if err != nil {
		return err
	}
	const fieldName, resultsName = "tallow-field.xlsx", "tallow-xs1-results.xlsx"
	field := filepath.Join(dir, fieldName)
	if err := output.WriteFile(field, []string{csvPath}, func(w io.Writer) error {
		return survey.WriteTemplate(w, survey.TemplateOptions{Surveys: []survey.Survey{sv}})
	}); err != nil {
		return err
	}
	fmt.Fprintf(e.stdout, "  %-28s %s\n", fieldName, "field workbook: the survey on sheet "+sv.Section.Name+", blank sheets, reach, gaugings")
	sf := sectionFlags{units: "si", sheet: sv.Section.Name}
	l, err := sf.load(field)
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
	if err := output.WriteFile(filepath.Join(dir, resultsName), l.inputs, func(w io.Writer) error {
		return results.WriteRatingWorkbook(w, rw)
	}); err != nil {
		return err
	}
	fmt.Fprintf(e.stdout, "  %-28s %s\n", resultsName, "results workbook (rated from the field workbook): summary, rating, lookup by hundredths, subsections, figures")
	return nil
}
