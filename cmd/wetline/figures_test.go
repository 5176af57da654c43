package main

import (
	"encoding/csv"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"wetline/rating"
)

// writeSurveyBook writes a workbook at path with one sheet per name:
// surveyCSV(0) on a sheet whose text is "", the header alone on one whose
// text is "header", and the text as CSV otherwise.
func writeSurveyBook(t *testing.T, path string, sheets [][2]string) {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	for i, sh := range sheets {
		name, text := sh[0], sh[1]
		switch text {
		case "":
			text = surveyCSV(0)
		case "header":
			text = "station,elevation,n,mark\n"
		}
		if i == 0 {
			f.SetSheetName("Sheet1", name)
		} else if _, err := f.NewSheet(name); err != nil {
			t.Fatal(err)
		}
		recs, err := csv.NewReader(strings.NewReader(text)).ReadAll()
		if err != nil {
			t.Fatal(err)
		}
		for r, rec := range recs {
			row := make([]any, len(rec))
			for j, c := range rec {
				row[j] = c
			}
			cell, _ := excelize.CoordinatesToCellName(1, r+1)
			if err := f.SetSheetRow(name, cell, &row); err != nil {
				t.Fatal(err)
			}
		}
	}
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
}

// pngNames lists the PNG files of a folder, sorted.
func pngNames(t *testing.T, dir string) []string {
	t.Helper()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, e := range ents {
		if strings.HasSuffix(e.Name(), ".png") {
			out = append(out, e.Name())
		}
	}
	slices.Sort(out)
	return out
}

// The figures of a workbook sheet are named after the sheet, not the
// workbook file, kept to characters safe in a file name.
func TestRateFiguresNamedAfterSheet(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	book := filepath.Join(dir, "field.xlsx")
	writeSurveyBook(t, book, [][2]string{{"XS-1", ""}, {"XS-2", ""}, {"XS 3 old", ""}})
	for _, tc := range []struct {
		sheet string
		want  []string
	}{
		{"XS-2", []string{"XS-2-properties.png", "XS-2-rating.png", "XS-2-section.png"}},
		{"XS 3 old", []string{"XS_3_old-properties.png", "XS_3_old-rating.png", "XS_3_old-section.png"}},
	} {
		plots := filepath.Join(dir, "plots-"+tc.want[0][:4])
		if _, errs, code := runCLI(t, "rate", book, "--sheet", tc.sheet, "--slope", "0.001", "--plots", plots, "-o", filepath.Join(plots, "r.csv")); code != 0 {
			t.Fatalf("%s: exit %d: %s", tc.sheet, code, errs)
		}
		if got := pngNames(t, plots); !slices.Equal(got, tc.want) {
			t.Errorf("%s: figures %q, want %q", tc.sheet, got, tc.want)
		}
	}
}

// A run never writes over a figure of its own: a second set of figures
// named alike gets the smallest free suffix, the same for the whole set;
// names differing only in case count as alike; other folders are apart.
func TestRunFiguresPlace(t *testing.T) {
	t.Parallel()
	set := func(base string, kinds ...string) []rating.Figure {
		var out []rating.Figure
		for _, k := range kinds {
			out = append(out, rating.Figure{Name: base + "-" + k + ".png"})
		}
		return out
	}
	names := func(figs []rating.Figure) string {
		var s []string
		for _, f := range figs {
			s = append(s, f.Name)
		}
		return strings.Join(s, ",")
	}
	var n runFigures
	for _, tc := range []struct {
		dir  string
		figs []rating.Figure
		want string
	}{
		{"out", set("XS-2", "rating", "section"), "XS-2-rating.png,XS-2-section.png"},
		{"out", set("XS-2", "rating", "section"), "XS-2-rating-2.png,XS-2-section-2.png"},
		{"out", set("xs-2", "rating"), "xs-2-rating-3.png"},
		// One name of the set taken: the whole set moves on.
		{"out", set("XS-2", "properties", "section"), "XS-2-properties-3.png,XS-2-section-3.png"},
		{"other", set("XS-2", "rating"), "XS-2-rating.png"},
		{"out/", set("XS-1", "rating"), "XS-1-rating.png"},
		{"out", set("XS-1", "rating"), "XS-1-rating-2.png"},
		// Two figures of one set named alike are told apart too.
		{"new", append(set("a", "rating"), set("a", "rating")...), "a-rating.png,a-rating-2.png"},
	} {
		if got := names(n.place(tc.dir, tc.figs)); got != tc.want {
			t.Errorf("%s %s: placed as %s, want %s", tc.dir, names(tc.figs), got, tc.want)
		}
	}
}
