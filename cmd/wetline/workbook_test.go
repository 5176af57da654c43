package main

import (
	"bytes"
	"context"
	"errors"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"wetline/rating"
	"wetline/survey"
)

const wbTallowCSV = "../../testdata/tallow-xs1.csv"

// runArgs runs the program with buffers and returns its output and error.
func runWB(t *testing.T, args ...string) (stdout, stderr string, err error) {
	t.Helper()
	var o, e bytes.Buffer
	err = run(context.Background(), newEnv(&o, &e, commandTable()), args)
	return o.String(), e.String(), err
}

func TestTemplateCommand(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	out := filepath.Join(dir, "field.xlsx")
	_, stderr, err := runWB(t, "template", "-o", out, "--sections", "2", "--units", "us")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(stderr, "2 cross-section sheets") || !strings.Contains(stderr, "ft3/s") {
		t.Errorf("summary %q", stderr)
	}
	f, err := excelize.OpenFile(out)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if got, want := f.GetSheetList(), []string{"XS-1", "XS-2", "coordinates", "reach", "gaugings", "instructions"}; !slices.Equal(got, want) {
		t.Errorf("sheets %v, want %v", got, want)
	}
	for _, args := range [][]string{
		{"template"},
		{"template", "-o", filepath.Join(dir, "field.csv")},
		{"template", "-o", out, "--sections", "0"},
		{"template", "-o", out, "--rows", "-1"},
		{"template", "-o", out, "--units", "furlongs"},
		{"template", "-o", out, "extra"},
	} {
		_, _, err := runWB(t, args...)
		var ue usageError
		if !errors.As(err, &ue) {
			t.Errorf("%q: %v, want a usage error", args, err)
		}
	}
}

// fillFromCSV writes the records of a survey CSV into a sheet of a field
// workbook the way a crew's tablet would: some numbers as text, a blank
// row in the middle, an extra column.
func fillFromCSV(t *testing.T, path, sheet, csvPath string) {
	t.Helper()
	tab, err := survey.ReadTable(csvPath, "")
	if err != nil {
		t.Fatal(err)
	}
	f, err := excelize.OpenFile(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if err := f.SetCellStr(sheet, "F"+strconv.Itoa(survey.SectionHeaderRow), "surveyor"); err != nil {
		t.Fatal(err)
	}
	row := survey.SectionHeaderRow + 1
	for i, rec := range tab.Records {
		if i == 7 {
			row++ // leave a blank row
		}
		for j, name := range []string{"station", "elevation", "n", "mark", "note"} {
			s := tab.Cell(rec, tab.Column(name))
			cell, _ := excelize.CoordinatesToCellName(j+1, row)
			var err error
			v, perr := strconv.ParseFloat(s, 64)
			switch {
			case s == "":
			case perr == nil && i%3 != 0:
				err = f.SetCellFloat(sheet, cell, v, -1, 64)
			default:
				err = f.SetCellStr(sheet, cell, s) // text, numbers too
			}
			if err != nil {
				t.Fatal(err)
			}
		}
		if err := f.SetCellStr(sheet, "F"+strconv.Itoa(row), "crew B"); err != nil {
			t.Fatal(err)
		}
		row++
	}
	if err := f.Save(); err != nil {
		t.Fatal(err)
	}
}

// TestFilledTemplateRoundTrip: template → filled by the test → rate gives
// the same table as rating the equivalent CSV, as CSV and as a workbook.
func TestFilledTemplateRoundTrip(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	field := filepath.Join(dir, "field.xlsx")
	if _, _, err := runWB(t, "template", "-o", field); err != nil {
		t.Fatal(err)
	}
	fillFromCSV(t, field, "XS-2", wbTallowCSV)

	fromCSV, _, err := runWB(t, "rate", wbTallowCSV, "--slope", "0.0012")
	if err != nil {
		t.Fatal(err)
	}
	fromBook, _, err := runWB(t, "rate", field, "--sheet", "XS-2", "--slope", "0.0012")
	if err != nil {
		t.Fatal(err)
	}
	if fromCSV != fromBook || len(fromCSV) < 1000 {
		t.Errorf("rating from the workbook differs from the CSV's:\n%s\nvs\n%s", fromBook, fromCSV)
	}

	// A template prefilled from the CSV rates the same too.
	pre := filepath.Join(dir, "prefilled.xlsx")
	if _, _, err := runWB(t, "template", "-o", pre, "--survey", wbTallowCSV); err != nil {
		t.Fatal(err)
	}
	fromPre, _, err := runWB(t, "rate", pre, "--sheet", "tallow-xs1", "--slope", "0.0012")
	if err != nil {
		t.Fatal(err)
	}
	if fromPre != fromCSV {
		t.Errorf("rating from the prefilled workbook differs from the CSV's")
	}

	// The same through results workbooks: identical rating sheets.
	outCSV, outBook := filepath.Join(dir, "a.xlsx"), filepath.Join(dir, "b.xlsx")
	if _, _, err := runWB(t, "rate", wbTallowCSV, "--slope", "0.0012", "-o", outCSV); err != nil {
		t.Fatal(err)
	}
	if _, _, err := runWB(t, "rate", field, "--sheet", "XS-2", "--slope", "0.0012", "--format", "xlsx", "-o", outBook); err != nil {
		t.Fatal(err)
	}
	for _, sheet := range []string{"rating", "lookup", "subsections"} {
		a, b := wbSheetRows(t, outCSV, sheet), wbSheetRows(t, outBook, sheet)
		if !slices.EqualFunc(a, b, slices.Equal) {
			t.Errorf("sheet %s differs between the CSV and the workbook input", sheet)
		}
	}
	// The results workbook's survey sheet rates the same again.
	again, _, err := runWB(t, "rate", outBook, "--sheet", "survey", "--slope", "0.0012")
	if err != nil {
		t.Fatal(err)
	}
	if again != fromCSV {
		t.Errorf("rating from the results workbook's survey sheet differs from the CSV's")
	}
	// The summary names the sheet read.
	if s := wbSheetRows(t, outBook, "summary"); !strings.Contains(strings.Join(s[2], " "), "field.xlsx['XS-2']") {
		t.Errorf("summary source %q", s[2])
	}
}

func wbSheetRows(t *testing.T, path, sheet string) [][]string {
	t.Helper()
	f, err := excelize.OpenFile(path, excelize.Options{RawCellValue: true})
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := f.GetRows(sheet)
	if err != nil {
		t.Fatal(err)
	}
	return rows
}

// TestRateWorkbookErrors: a bad cell in a field workbook is named by
// sheet and cell; xlsx output needs a file; output is atomic.
func TestRateWorkbookErrors(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	field := filepath.Join(dir, "field.xlsx")
	if _, _, err := runWB(t, "template", "-o", field); err != nil {
		t.Fatal(err)
	}
	fillFromCSV(t, field, "XS-2", wbTallowCSV)
	f, err := excelize.OpenFile(field)
	if err != nil {
		t.Fatal(err)
	}
	if err := f.SetCellStr("XS-2", "C19", "0.O35"); err != nil { // the 12th point, below a blank row
		t.Fatal(err)
	}
	if err := f.Save(); err != nil {
		t.Fatal(err)
	}
	f.Close()
	out := filepath.Join(dir, "r.xlsx")
	_, _, err = runWB(t, "rate", field, "--sheet", "XS-2", "--slope", "0.001", "-o", out)
	if err == nil || !strings.Contains(err.Error(), field+`['XS-2']!C19: n "0.O35": not a number`) {
		t.Errorf("error %v, want one naming 'XS-2'!C19", err)
	}
	if _, serr := os.Stat(out); serr == nil {
		t.Errorf("partial output %s left behind", out)
	}
	var e bytes.Buffer
	if st := exitStatus(err, &e); st != 1 {
		t.Errorf("exit status %d, want 1", st)
	}

	_, _, err = runWB(t, "rate", wbTallowCSV, "--slope", "0.001", "--format", "xlsx")
	var ue usageError
	if !errors.As(err, &ue) {
		t.Errorf("xlsx to standard output: %v, want a usage error", err)
	}
}

// TestRateWorkbookNoLookup: a stage range too long for a lookup sheet
// leaves the sheet out with a warning.
func TestRateWorkbookNoLookup(t *testing.T) {
	t.Parallel()
	out := filepath.Join(t.TempDir(), "results.xlsx")
	_, stderr, err := runWB(t, "rate", wbTallowCSV, "--slope", "0.0012", "--stages", "100.3,101,3000", "-o", out)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(stderr, "warning: no lookup table") {
		t.Errorf("console %q lacks the lookup warning", stderr)
	}
	f, err := excelize.OpenFile(out)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if got := f.GetSheetList(); slices.Contains(got, "lookup") {
		t.Errorf("sheets %v: want no lookup", got)
	}
}

func TestRateWorkbookSummary(t *testing.T) {
	t.Parallel()
	out := filepath.Join(t.TempDir(), "results.xlsx")
	_, stderr, err := runWB(t, "rate", wbTallowCSV, "--slope", "0.0012", "--n", "0.05,0.035,0.07", "-o", out)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(stderr, "wrote "+out) || !strings.Contains(stderr, rating.Caution) {
		t.Errorf("console summary %q", stderr)
	}
	rows := wbSheetRows(t, out, "summary")
	text := ""
	for _, r := range rows {
		text += strings.Join(r, "|") + "\n"
	}
	for _, want := range []string{
		"program|wetline " + Version,
		"friction slope|0.0012|m/m",
		"main channel between banks|stations 46 to 65.5|m",
		"n, subsection 1 (left overbank, stations 0 to 46)|0.05",
		"n, subsection 2 (channel, stations 46 to 65.5)|0.035",
		"warning|at 14 stages water stands in pockets behind higher ground",
		"caution|" + rating.Caution,
	} {
		if !strings.Contains(text, want) {
			t.Errorf("summary lacks %q:\n%s", want, text)
		}
	}
}

func TestDemoWritesWorkbook(t *testing.T) {
	t.Parallel()
	dir, stdout := demoOutput(t)
	if !strings.Contains(stdout, "tallow-xs1-results.xlsx") {
		t.Errorf("demo output %q", stdout)
	}
	if _, err := os.Stat(filepath.Join(dir, "tallow-field.xlsx")); err != nil {
		t.Error(err)
	}
	rows := wbSheetRows(t, filepath.Join(dir, "tallow-xs1-results.xlsx"), "lookup")
	if len(rows) < 40 {
		t.Errorf("demo lookup sheet has %d rows", len(rows))
	}
}

// A workbook that could not hold the table is refused before any work:
// 200 001 stages (100 to 120 at 0.0001) of the demo section's six
// subsections need 1.2 million rows of the subsections sheet, more than a
// sheet holds (1 048 576).
func TestRateWorkbookTooLongRefusedFirst(t *testing.T) {
	t.Parallel()
	out := filepath.Join(t.TempDir(), "r.xlsx")
	_, errs, code := runCLI(t, "rate", wbTallowCSV, "--slope", "0.001", "--from", "100", "--to", "120", "--step", "0.0001", "-o", out)
	if code != 2 || !strings.Contains(errs, "too many rows for a workbook sheet") {
		t.Errorf("exit %d: %s", code, errs)
	}
	if _, err := os.Stat(out); !os.IsNotExist(err) {
		t.Error("a workbook was written")
	}
}
