package survey

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// writeBook writes dir/field.xlsx with the given sheets of rows, in order
// (the first row of each is its header), and returns its path.
func writeBook(t *testing.T, dir string, sheets map[string][][]any, order []string) string {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	for i, name := range order {
		if i == 0 {
			f.SetSheetName("Sheet1", name)
		} else if _, err := f.NewSheet(name); err != nil {
			t.Fatal(err)
		}
		for r, row := range sheets[name] {
			cell, _ := excelize.CoordinatesToCellName(1, r+1)
			if err := f.SetSheetRow(name, cell, &row); err != nil {
				t.Fatal(err)
			}
		}
	}
	path := filepath.Join(dir, "field.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	return path
}

func TestReadSectionWorkbook(t *testing.T) {
	path := writeBook(t, t.TempDir(), map[string][][]any{
		"XS-1": {{"station", "elevation"}, {0, 1}, {1, 0}},
		"XS-2": {
			{"Station (m)", "Elevation (m)", "n", "Mark", "Extra"},
			{0.0, 3.0, 0.05, nil, "x"},
			{2.0, 1.0, nil, "bank"},
			{},               // a blank row in the middle
			{"4", "0", 0.03}, // numbers stored as text
			{6.0, 1.0, nil, "bank"},
			{8.0, 3.0},
		},
	}, []string{"XS-1", "XS-2"})
	sv, err := ReadSection(path, "XS-2", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	s := sv.Section
	if len(s.Points) != 5 || s.Points[2].Station != 4 || !s.HasBanks || s.RightBank != 6 || s.N[2] != 0.03 || s.Name != "XS-2" {
		t.Errorf("section %+v", s)
	}
	if sv.Rows[2] != 5 {
		t.Errorf("row of the third point = %d, want 5 (after the blank row)", sv.Rows[2])
	}
	first, err := ReadSection(path, "", SectionOptions{})
	if err != nil || first.Section.Name != "XS-1" {
		t.Errorf("default sheet: %v %+v", err, first.Section)
	}
}

func TestReadSectionWorkbookErrors(t *testing.T) {
	path := writeBook(t, t.TempDir(), map[string][][]any{
		"XS-2": {{"station", "elevation", "n"}, {0, 1, 0.03}, {1, "1,5"}, {2, 1}},
	}, []string{"XS-2"})
	_, err := ReadSection(path, "XS-2", SectionOptions{})
	if err == nil || !strings.Contains(err.Error(), "field.xlsx['XS-2']!B3: elevation \"1,5\": decimal comma") || !errors.Is(err, ErrDecimalComma) {
		t.Errorf("error %v", err)
	}
	if _, err := ReadSection(path, "XS-9", SectionOptions{}); err == nil || !strings.Contains(err.Error(), "no such sheet (sheets: XS-2)") {
		t.Errorf("missing sheet: %v", err)
	}
}

// A file named .xlsx that is not a zip archive is said to be no workbook,
// and one holding text to be perhaps a CSV file renamed; a zip archive
// that is no workbook is still refused as a damaged zip. (An Excel
// 97–2003 workbook is named as one: TestLegacyWorkbookRefused.)
func TestWorkbookNotZip(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	for _, c := range []struct {
		name string
		data []byte
		is   error
		says string
	}{
		{"renamed.xlsx", []byte("station,elevation\n0,1\n1,0\n"), ErrNotWorkbook, "renamed.xlsx: not a workbook (an .xlsx file is a zip archive); it holds text: it may be a CSV file renamed .xlsx"},
		{"latin1.xlsx", []byte("station,elevation,note\n0,1,caf\xe9\n"), ErrNotWorkbook, "it may be a CSV file renamed"},
		{"binary.xlsx", []byte("\x7fELF\x02\x01\x01\x00\x00\x00"), ErrNotWorkbook, "binary.xlsx: not a workbook (an .xlsx file is a zip archive)"},
		{"empty.xlsx", nil, ErrNotWorkbook, "empty.xlsx: not a workbook"},
		{"cut.xlsx", []byte("PK\x03\x04\x14\x00"), ErrWorkbookZip, "damaged or forged zip"},
	} {
		p := filepath.Join(dir, c.name)
		if err := os.WriteFile(p, c.data, 0o644); err != nil {
			t.Fatal(err)
		}
		_, err := ReadTable(p, "")
		if !errors.Is(err, c.is) || !strings.Contains(err.Error(), c.says) {
			t.Errorf("%s: %v, want %v saying %q", c.name, err, c.is, c.says)
		}
		if c.is == ErrNotWorkbook && (errors.Is(err, ErrWorkbookZip) || strings.Contains(err.Error(), "forged")) {
			t.Errorf("%s: %v, called a damaged zip", c.name, err)
		}
		if strings.HasPrefix(c.name, "binary") && strings.Contains(err.Error(), "CSV") {
			t.Errorf("%s: %v, said to be text", c.name, err)
		}
	}
}

// A CSV output opened in a spreadsheet and saved as a workbook keeps its
// '#' lines as rows (split at their commas): they are comments, as in the
// CSV file, their key lines the site block; and a sheet's two-cell key
// rows saved as CSV are its site block too.
func TestCommentRowsRoundTrip(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	book := writeBook(t, dir, map[string][][]any{"xs": {
		{"# site: Reedy Creek at Sawpit (invented)"},
		{"# projected by wetline", " with offsets"},
		{"station (m)", "elevation (m)", "n"},
		{0, 3, 0.035},
		{"# a note between rows"},
		{4, 0, 0.035},
		{8, 3},
	}, "stages": {
		{"# site: Reedy Creek at Sawpit (invented)"},
		{"time", "stage"},
		{"2026-03-29T00:00", 0.5},
		{"# logger swapped"},
		{"2026-03-29T00:15", 0.52},
	}}, []string{"xs", "stages"})
	sv, err := ReadSection(book, "xs", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(sv.Section.Points) != 3 || sv.Site.Name != "Reedy Creek at Sawpit (invented)" {
		t.Errorf("section: %d points, site %q", len(sv.Section.Points), sv.Site.Name)
	}
	rec, err := ReadStageRecord(book, StageRecordOptions{Sheet: "stages"})
	if err != nil {
		t.Fatal(err)
	}
	if rec.Stages.Len() != 2 || rec.Site.Name != "Reedy Creek at Sawpit (invented)" {
		t.Errorf("stage record: %d readings, site %q", rec.Stages.Len(), rec.Site.Name)
	}
	csvText := "site,Reedy Creek at Sawpit,,,\nsite id,,,,\ndatum,\"local, gauge zero 49.80\",,,\nstation (m),elevation (m),n,mark,note\n0,3,0.035,,\n4,0,0.035,,\n8,3,,,\n"
	sv, err = ParseSection(strings.NewReader(csvText), "xs.csv", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if sv.Site.Name != "Reedy Creek at Sawpit" || sv.Site.Datum != "local, gauge zero 49.80" || len(sv.Section.Points) != 3 {
		t.Errorf("CSV key rows: site %+v, %d points", sv.Site, len(sv.Section.Points))
	}
}

// A stage record's site block saved as CSV key rows is read as its site,
// as every other table's is.
func TestStageRecordCSVKeyRows(t *testing.T) {
	t.Parallel()
	rec, err := ParseStageRecord(strings.NewReader("site,Hare Creek (invented),,\nsite id,HC-1\ntime,stage\n2024-05-01T00:00,0.5\n2024-05-01T00:15,0.52\n"), "s.csv", StageRecordOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if rec.Site.Name != "Hare Creek (invented)" || rec.Site.ID != "HC-1" || rec.Stages.Len() != 2 {
		t.Errorf("site %+v, %d readings", rec.Site, rec.Stages.Len())
	}
}

// Gaugings numbered #1, #2 in their first column: in a sheet, a row below
// the header whose first cell starts with '#' but which holds other
// values is data; in CSV such a line is a comment, as the format says,
// and a warning names it.
func TestNumberedRowsNotLost(t *testing.T) {
	t.Parallel()
	rows := [][]any{{"no.", "time", "stage", "discharge"},
		{"#1", "2024-01-01T09:00", 1.0, 4.0}, {"#2", "2024-01-02T09:00", 1.2, 5.8}, {"# checked by JK"}, {"4", "2024-01-04T09:00", 1.4, 7.8}}
	book := writeBook(t, t.TempDir(), map[string][][]any{"g": rows}, []string{"g"})
	g, err := ReadGaugings(book, "")
	if err != nil {
		t.Fatal(err)
	}
	if len(g.Gaugings) != 3 {
		t.Errorf("sheet: %d gaugings, want the 3 rows with values", len(g.Gaugings))
	}
	text := "no.,time,stage,discharge\n#1,2024-01-01T09:00,1,4\n#2,2024-01-02T09:00,1.2,5.8\n# checked by JK, with a comma\n4,2024-01-04T09:00,1.4,7.8\n"
	g, err = ParseGaugings(strings.NewReader(text), "g.csv")
	if err != nil {
		t.Fatal(err)
	}
	w := strings.Join(g.Warnings, "\n")
	if len(g.Gaugings) != 1 || !strings.Contains(w, "g.csv: 2 lines below the header start with '#' and hold values, as data rows do (the first, line 2)") {
		t.Errorf("CSV: %d gaugings, warnings %q", len(g.Gaugings), w)
	}
}
