package main

import (
	"context"
	"fmt"
	"io"
	"path/filepath"
	"wetline/survey/output"
	"wetline/survey/results"
)

// Demo slope-area reach: Brindle Creek below Quarry Road, an invented
// post-flood survey of three sections.
const (
	demoReach       = "reach-brindle.csv"
	demoReachReport = "reach-brindle-slopearea"
)

var demoReachSurveys = []string{"reach-brindle-xs1.csv", "reach-brindle-xs2.csv", "reach-brindle-xs3.csv"}

// demoSlopeArea writes the reach table, its three surveys and the
// slope-area report as text and JSON.
func demoSlopeArea(ctx context.Context, e *env, dir string) error {
	path, err := copyDemoFile(e, dir, demoReach, "reach table: sections, distances, high-water marks")
	if err != nil {
		return err
	}
	for i, name := range demoReachSurveys {
		if _, err := copyDemoFile(e, dir, name, fmt.Sprintf("surveyed section XS-%d of the reach", i+1)); err != nil {
			return err
		}
	}
	f := slopeAreaFlags{units: "si", side: "mean", draws: 5000, seed: 1, nCV: 0.15}
	f.markSpread, f.markSD = saNaN(), saNaN()
	rep, inputs, err := slopeArea(path, &f)
	if err != nil {
		return err
	}
	for _, o := range []struct {
		ext, what string
		write     func(io.Writer) error
	}{
		{".txt", "slope-area report for review", func(w io.Writer) error { return results.WriteSlopeAreaText(w, rep) }},
		{".json", "the same report as JSON", func(w io.Writer) error { return results.WriteSlopeAreaJSON(w, rep) }},
	} {
		name := demoReachReport + o.ext
		if err := output.WriteFile(filepath.Join(dir, name), inputs, o.write); err != nil {
			return err
		}
		fmt.Fprintf(e.stdout, "  %-28s %s\n", name, o.what)
	}
	figs, w, err := slopeAreaFigures(rep, "Brindle Creek below Quarry Road (invented)")
	if err != nil {
		return err
	}
	rep.Warnings = append(rep.Warnings, w...)
	if err := writeFigures(e.stdout, dir, figs, inputs); err != nil {
		return err
	}
	bookName := demoReachReport + ".xlsx"
	if err := output.WriteFile(filepath.Join(dir, bookName), inputs, func(w io.Writer) error {
		return results.WriteSlopeAreaWorkbook(w, rep, pictures(figs))
	}); err != nil {
		return err
	}
	fmt.Fprintf(e.stdout, "  %-28s %s\n", bookName, "results workbook: summary, inputs, sections, subreaches, checks, uncertainty, figures")
	r := rep.Result
	fmt.Fprintf(e.stdout, "  peak discharge %s %s", sig3(r.Discharge), r.Units.Discharge())
	if u := rep.Uncertainty; u != nil {
		fmt.Fprintf(e.stdout, ", 90 %% band %s to %s %s", sig3(u.P05), sig3(u.P95), r.Units.Discharge())
	}
	fmt.Fprintln(e.stdout)
	printWarnings(e.stdout, rep.Warnings)
	return nil
}
