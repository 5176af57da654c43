package main

import (
	"context"
	"fmt"
	"io"
	"path/filepath"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/survey"
	"wetline/survey/output"
	"wetline/survey/results"
)

// Demo gauging facts: the invented measurements and the staff gauge's zero.
const (
	demoGaugings = "tallow-gaugings.csv"
	demoDatum    = 100.0 // elevation of the staff gauge's zero, m
)

// demoFit writes the demo site's gaugings and the report that compares
// them with the hydraulic rating, back-calculates n, fits a power-law
// rating and extends it on the section's hydraulics.
func demoFit(ctx context.Context, e *env, dir string) error {
	gpath, err := copyDemoFile(e, dir, demoGaugings, "discharge measurements at the staff gauge (invented)")
	if err != nil {
		return err
	}
	spath := filepath.Join(dir, demoSurvey)
	sf := sectionFlags{units: "si"}
	l, err := sf.load(spath)
	if err != nil {
		return err
	}
	gs, err := survey.ReadGaugings(gpath, "")
	if err != nil {
		return err
	}
	hyd := &rating.HydraulicCurve{Geometry: l.geom, Datum: demoDatum,
		Options: rating.Options{Slope: demoSlope, Units: l.units, Geometry: l.geomOpt}}
	rep, err := gauged.Analyze(gs.Gaugings, gauged.Options{
		Site: l.survey.Section.Name, Units: l.units, Hydraulic: hyd,
	})
	if err != nil {
		return err
	}
	rep.Warnings = append(append([]string(nil), l.warnings...), rep.Warnings...)
	inputs := []string{gpath, spath}
	for _, f := range []struct {
		name, what string
		write      func(io.Writer) error
	}{
		{"tallow-fit.txt", fmt.Sprintf("gaugings against the rating, n back-calculated, power-law fit (standard error %.1f %%)", rep.Fit.StandardErrorPercent),
			func(w io.Writer) error { return results.WriteGaugingReportText(w, rep) }},
		{"tallow-fit.json", "the same report as JSON",
			func(w io.Writer) error { return results.WriteGaugingReportJSON(w, rep) }},
		{"tallow-fit-table.csv", "lookup table from the fit, extrapolated rows marked",
			func(w io.Writer) error { return results.WriteGaugingReportCSV(w, rep) }},
	} {
		if err := output.WriteFile(filepath.Join(dir, f.name), inputs, f.write); err != nil {
			return err
		}
		fmt.Fprintf(e.stdout, "  %-28s %s\n", f.name, f.what)
	}
	figs, w, err := fitFigures(rep, demoSite, "tallow")
	if err != nil {
		return err
	}
	rep.Warnings = append(rep.Warnings, w...)
	if err := writeFigures(e.stdout, dir, figs, inputs); err != nil {
		return err
	}
	book, err := fitBook(rep, hyd, []string{demoGaugings, demoSurvey}, "", "tallow", figs)
	if err != nil {
		return err
	}
	const bookName = "tallow-fit.xlsx"
	if err := output.WriteFile(filepath.Join(dir, bookName), inputs, func(w io.Writer) error {
		return results.WriteFitWorkbook(w, book)
	}); err != nil {
		return err
	}
	fmt.Fprintf(e.stdout, "  %-28s %s\n", bookName, "results workbook: fit, gaugings with residuals, fitted rating and lookup by hundredths (extrapolated shaded), n by stage, figure")
	printWarnings(e.stdout, rep.Warnings)
	return nil
}
