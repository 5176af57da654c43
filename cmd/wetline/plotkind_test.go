package main

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/survey"
)

// bwLadderCSV is an invented step-backwater rating in backwater's CSV
// columns (the subsection discharges left out): six discharges at one
// section, the first and the last two still depending on the boundary,
// the second at critical depth, the last above an end of the section.
const bwLadderCSV = `stage,depth,area,wetted_perimeter,top_width,hydraulic_radius,conveyance,discharge,mean_velocity,alpha,froude,flags
100.2,0.2,0.9,4.7,4.6,0.19,12.1,1,1.11,1,0.8,unsettled
100.4,0.4,1.9,5.4,5.2,0.35,28.8,3,1.58,1,1,critical_stage
100.6,0.6,3.0,6.1,5.8,0.49,51.0,6,2.00,1,0.89,
100.7,0.7,3.6,6.4,6.1,0.56,64.2,9,2.50,1,0.96,
100.8,0.8,4.2,6.8,6.4,0.62,78.3,12,2.86,1,0.99,unsettled
101.0,1.0,5.6,7.5,7.0,0.75,112.0,16,2.86,1,0.93,above_end unsettled
`

// TestPlotBackwaterFlags: plot of a saved step-backwater table says which
// rows carry backwater's flags (the figure marks them, as backwater's own
// figures do), where before nothing did.
func TestPlotBackwaterFlags(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	table := filepath.Join(dir, "xs1-bw.csv")
	if err := os.WriteFile(table, []byte(bwLadderCSV), 0o644); err != nil {
		t.Fatal(err)
	}
	_, errs, code := runCLI(t, "plot", table, "--units", "si", "-o", filepath.Join(dir, "figs"))
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	want := "warning: " + table + ": rows flagged in the table: 3 unsettled at 100.20 and 100.80 to 101.00 m (ringed: still depending on the boundary); " +
		"1 critical_stage at 100.40 m (crossed: stage at critical depth); 1 above_end at 101.00 m (squares: above an end of the section)"
	if !strings.Contains(errs, want) {
		t.Errorf("stderr:\n%s\nwant:\n%s", errs, want)
	}
	tab, err := survey.ReadRatingCSV(table, "", survey.UnitChoice{})
	if err != nil || tab.Kind != rating.KindBackwater {
		t.Errorf("kind %q (%v), want %q", tab.Kind, err, rating.KindBackwater)
	}
}

// TestPlotResultsWorkbook: plot of a results workbook, no sheet named,
// reads its rating sheet (the first, the summary, is no table), whose
// headers name its units, for the site its summary gives. The workbook is
// rate's of an invented rectangular channel in feet.
func TestPlotResultsWorkbook(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	book := filepath.Join(dir, "mill-ford-results.xlsx")
	if _, errs, code := runCLI(t, "rate", "--shape", "rectangle:width=12", "--n", "0.035", "--slope", "0.002", "--units", "us",
		"--site", "Mill Ford Run (invented)", "-o", book); code != 0 {
		t.Fatalf("rate: exit %d: %s", code, errs)
	}
	src, err := survey.ReadRatingSource(book, "")
	if err != nil {
		t.Fatal(err)
	}
	if !src.Summary || src.Table.Sheet != "rating" || src.Site != "Mill Ford Run (invented)" {
		t.Errorf("read summary %v sheet %q site %q", src.Summary, src.Table.Sheet, src.Site)
	}
	out := filepath.Join(dir, "figs")
	_, errs, code := runCLI(t, "plot", book, "-o", out)
	if code != 0 {
		t.Fatalf("plot: exit %d: %s", code, errs)
	}
	if strings.Contains(errs, "names no unit") {
		t.Errorf("units assumed though the headers name them:\n%s", errs)
	}
	if _, err := os.Stat(filepath.Join(out, "mill-ford-rating.png")); err != nil {
		t.Errorf("no rating figure: %v\n%s", err, errs)
	}
	// A sheet named is read as named: the summary is no rating table.
	if _, errs, code := runCLI(t, "plot", book, "--table-sheet", "summary", "-o", out); code != 1 || !strings.Contains(errs, "missing column") {
		t.Errorf("plot --table-sheet summary: exit %d: %s", code, errs)
	}
	// A first sheet that is no summary and no table: the error names the
	// sheet that holds one, and the flag to read it.
	f := openBook(t, book)
	if err := f.SetSheetName("summary", "field notes"); err != nil {
		t.Fatal(err)
	}
	renamed := filepath.Join(dir, "renamed.xlsx")
	if err := f.SaveAs(renamed); err != nil {
		t.Fatal(err)
	}
	_, errs, code = runCLI(t, "plot", renamed, "-o", out)
	if want := "missing column: the header needs a column named \"stage\" (or \"gauge_height\") (found: \"item\", \"value\", \"unit\"); sheet rating holds a rating table: give --table-sheet rating"; code != 1 || !strings.Contains(errs, want) {
		t.Errorf("plot of a workbook whose first sheet is no table: exit %d: %s\nwant %q", code, errs, want)
	}
}

// TestFigureSite: a redrawn rating is titled by --site, else its
// section's site, else the site a results workbook's summary holds, not
// the file's name.
func TestFigureSite(t *testing.T) {
	t.Parallel()
	withSite := &survey.Prepared{Site: rating.Site{Name: "Mill Ford Run at the weir"}}
	for _, tc := range []struct {
		name, summary string
		p             *survey.Prepared
		flag, want    string
	}{
		{"summary", "Mill Ford Run (invented)", nil, "", "Mill Ford Run (invented)"},
		{"section's site", "Mill Ford Run (invented)", withSite, "", "Mill Ford Run at the weir"},
		{"section without one", "Mill Ford Run (invented)", &survey.Prepared{}, "", "Mill Ford Run (invented)"},
		{"--site", "Mill Ford Run (invented)", withSite, "Upper Mill Ford", "Upper Mill Ford"},
		{"none", "", nil, "", ""},
	} {
		if got := figureSite(tc.summary, tc.p, tc.flag); got != tc.want {
			t.Errorf("%s: site %q, want %q", tc.name, got, tc.want)
		}
	}
}

// TestPlotResultsWorkbookKinds: plot of a results workbook, no sheet
// named, reads the sheet wetline writes its rating to: fit's fitted
// rating (its gaugings sheet, the first with stage and discharge columns,
// is no rating table: its stages do not increase); a record's workbook
// has none to redraw, and says so, pointing away from its ratings sheet
// (every period together). With its summary renamed, the hint names only
// a sheet that reads as a rating table: fit's fitted rating, none of a
// record's (its unit values are a hydrograph). The inputs are the tests'
// invented gaugings, stage record and rating.
func TestPlotResultsWorkbookKinds(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	fitBook, recBook := filepath.Join(dir, "fit.xlsx"), filepath.Join(dir, "rec.xlsx")
	for _, args := range [][]string{
		{"fit", fitDemoGaugings, "--method", "lsq", "--site", "Tallow (invented)", "-o", fitBook},
		{"record", recStages, "--rating", recRatingA, "--units", "si", "-o", recBook},
	} {
		if _, errs, code := runCLI(t, args...); code != 0 {
			t.Fatalf("%s: exit %d: %s", args[0], code, errs)
		}
	}
	src, err := survey.ReadRatingSource(fitBook, "")
	if err != nil || !src.Summary || src.Table.Sheet != "fitted rating" || src.Site != "Tallow (invented)" {
		t.Fatalf("fit workbook: %v, summary %v, sheet %q, site %q", err, src.Summary, sheetOf(src), src.Site)
	}
	out := filepath.Join(dir, "figs")
	if _, errs, code := runCLI(t, "plot", fitBook, "-o", out); code != 0 {
		t.Errorf("plot of a fit workbook: exit %d: %s", code, errs)
	}
	_, errs, code := runCLI(t, "plot", recBook, "-o", out)
	if want := recBook + ": a results workbook with no rating table"; code != 1 || !strings.Contains(errs, want) ||
		!strings.Contains(errs, "its ratings sheet lists every rating period used together") || strings.Contains(errs, "--table-sheet") {
		t.Errorf("plot of a record workbook: exit %d: %s\nwant %q", code, errs, want)
	}
	if _, err := survey.ReadRatingSource(recBook, ""); !errors.Is(err, survey.ErrNoRatingSheet) {
		t.Errorf("record workbook: %v, want %v", err, survey.ErrNoRatingSheet)
	}
	for _, tc := range []struct {
		name, book, hint string // hint "" for none
	}{
		{"fit", fitBook, "; sheet 'fitted rating' holds a rating table: give --table-sheet 'fitted rating'"},
		{"record", recBook, ""},
	} {
		f := openBook(t, tc.book)
		if err := f.SetSheetName("summary", "notes"); err != nil {
			t.Fatal(err)
		}
		renamed := filepath.Join(dir, "renamed-"+tc.name+".xlsx")
		if err := f.SaveAs(renamed); err != nil {
			t.Fatal(err)
		}
		_, errs, code := runCLI(t, "plot", renamed, "-o", out)
		if code != 1 || !strings.Contains(errs, "missing column") || tc.hint == "" && strings.Contains(errs, "holds a rating table") ||
			tc.hint != "" && !strings.Contains(errs, tc.hint) {
			t.Errorf("%s, summary renamed: exit %d: %s\nwant hint %q", tc.name, code, errs, tc.hint)
		}
	}
}

// sheetOf is the sheet of a rating source's table ("" for none).
func sheetOf(src survey.RatingSource) string {
	if src.Table == nil {
		return ""
	}
	return src.Table.Sheet
}
