package main

import (
	"encoding/csv"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// hiddenBook writes a workbook with a visible sheet "notes" and a hidden
// sheet named sheet holding the rows of the CSV file src (comment lines
// left out), and returns its path.
func hiddenBook(t *testing.T, src, sheet string) string {
	t.Helper()
	in, err := os.Open(src)
	if err != nil {
		t.Fatal(err)
	}
	defer in.Close()
	r := csv.NewReader(in)
	r.Comment, r.FieldsPerRecord = '#', -1
	rows, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	f := excelize.NewFile()
	defer f.Close()
	f.SetSheetName("Sheet1", "notes")
	f.SetSheetRow("notes", "A1", &[]any{"what"})
	f.NewSheet(sheet)
	for i, row := range rows {
		cells := make([]any, len(row))
		for j, c := range row {
			cells[j] = c
		}
		cell, _ := excelize.CoordinatesToCellName(1, i+1)
		if err := f.SetSheetRow(sheet, cell, &cells); err != nil {
			t.Fatal(err)
		}
	}
	f.SetActiveSheet(0)
	if err := f.SetSheetVisible(sheet, false); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "book.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	return path
}

// Shift diagrams read from a hidden sheet (record and shifts) and a
// boundary rating read from a hidden sheet named rating (backwater) put
// the hidden-sheet warning in the report, as a hidden survey or gaugings
// sheet does.
func TestHiddenSheetWarned(t *testing.T) {
	t.Parallel()
	shifts := hiddenBook(t, recShifts, "shifts")
	path := bwPlain(t)
	dir := filepath.Dir(path)
	ratingCSV := filepath.Join(dir, "xs3-rating.csv")
	if _, errs, code := runCLI(t, "rate", filepath.Join(dir, "tallow-xs3.csv"), "--slope", "0.0012", "--stages", "100.5,101,101.5,102,102.5,103", "-o", ratingCSV); code != 0 {
		t.Fatal(errs)
	}
	rating := hiddenBook(t, ratingCSV, "rating")
	for _, tc := range []struct {
		name string
		args []string
		book string
	}{
		{"record", []string{"record", recStages, "--rating", recRatingA, "--zero-flow", "0.2", "--shifts", shifts, "--shifts-sheet", "shifts", "--format", "text"}, shifts + "['shifts']"},
		{"shifts", []string{"shifts", recGaugings, "--rating", recRatingA, "--zero-flow", "0.2", "--shifts", shifts, "--shifts-sheet", "shifts", "--format", "text"}, shifts + "['shifts']"},
		{"backwater", []string{"backwater", path, "--discharges", "10", "--boundary", "rating:" + rating, "--format", "text"}, rating + "['rating']"},
	} {
		out, errs, code := runCLI(t, tc.args...)
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", tc.name, code, errs)
		}
		if want := tc.book + ": the sheet is hidden in the workbook"; !strings.Contains(out, want) {
			t.Errorf("%s: the report does not say %q:\n%s", tc.name, want, out)
		}
	}
}
