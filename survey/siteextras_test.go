package survey

import (
	"errors"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// titledBook writes a survey sheet whose site block has a title merged
// over G1:I2 and a page number in G3 beside its values, and a data row
// with a value in E, beyond the header's last column when beyond is set.
func titledBook(t *testing.T, beyond bool) string {
	t.Helper()
	f := excelize.NewFile()
	s := "XS-1"
	f.SetSheetName("Sheet1", s)
	f.SetSheetRow(s, "A1", &[]any{"site", "Otter Rill at Ferny Ford"})
	f.SetSheetRow(s, "A2", &[]any{"site id", "OR-02"})
	f.SetSheetRow(s, "A3", &[]any{"surveyed", "2026-11-14"})
	f.SetCellValue(s, "G1", "OTTER RILL FIELD BOOK")
	if err := f.MergeCell(s, "G1", "I2"); err != nil {
		t.Fatal(err)
	}
	f.SetCellValue(s, "G3", "page 1")
	f.SetSheetRow(s, "A5", &[]any{"station", "elevation", "n"})
	f.SetSheetRow(s, "A6", &[]any{0, 2, 0.035})
	f.SetSheetRow(s, "A7", &[]any{5, 0})
	f.SetSheetRow(s, "A8", &[]any{10, 2})
	if beyond {
		f.SetCellValue(s, "E7", "soft")
	}
	path := filepath.Join(t.TempDir(), "titled.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	return path
}

// A key row of the site block keeps its key and value with cells to the
// right of them, which are named in one warning; a value beyond the
// header in a data row is still refused at its cell.
func TestSiteBlockCellsBeside(t *testing.T) {
	tb, err := ReadTable(titledBook(t, false), "")
	if err != nil {
		t.Fatal(err)
	}
	if tb.Meta[MetaSite] != "Otter Rill at Ferny Ford" || tb.Meta[MetaSurveyed] != "2026-11-14" || len(tb.Records) != 3 {
		t.Errorf("meta %q, %d records; want the site block read and 3 points", tb.Meta, len(tb.Records))
	}
	var beside []string
	for _, w := range tb.Warnings {
		if strings.Contains(w, "site block") {
			beside = append(beside, w)
		}
	}
	if len(beside) != 1 || !strings.Contains(beside[0], "G1, G3") {
		t.Errorf("warnings %q, want one naming G1, G3", tb.Warnings)
	}
	sheets, err := SectionSheets(titledBook(t, false))
	if err != nil || len(sheets) != 1 {
		t.Errorf("section sheets %q, %v; want XS-1", sheets, err)
	}
	_, err = ReadTable(titledBook(t, true), "")
	var pe *ParseError
	if !errors.As(err, &pe) || !errors.Is(err, ErrBeyondHeader) || pe.Row != 7 {
		t.Errorf("a value beyond the header in a data row: %v, want ErrBeyondHeader at row 7", err)
	}
}

// A site block's key row saved as CSV keeps its key with fields after
// its value, and says which.
func TestSiteBlockFieldsBesideCSV(t *testing.T) {
	tb, err := ParseCSV(strings.NewReader("site,Otter Rill,,,title\nstation,elevation\n0,1\n1,0\n"), "x.csv")
	if err != nil {
		t.Fatal(err)
	}
	if tb.Meta[MetaSite] != "Otter Rill" || len(tb.Warnings) != 1 || !strings.Contains(tb.Warnings[0], "line 1 field 5") {
		t.Errorf("meta %q, warnings %q", tb.Meta, tb.Warnings)
	}
}

// A header whose first column is named as a site key (a logger's or a
// multi-site export's `site` column) is a header, not a key row: its names
// follow one another, while a crew's title beside a block stands apart.
func TestHeaderFirstColumnNamedAsKey(t *testing.T) {
	for _, c := range []struct{ in, col string }{
		{"site,time,stage,discharge\nTallow Ck,2024-01-01T10:00,1.3,0.9\n", "stage"},
		{"datum,station,elevation\nAHD,0,1\nAHD,1,0\n", "station"},
	} {
		tb, err := ParseCSV(strings.NewReader(c.in), "x.csv")
		if err != nil {
			t.Fatal(err)
		}
		if tb.Column(c.col) < 0 || len(tb.Meta) != 0 || len(tb.Records) == 0 {
			t.Errorf("%q: header %q, meta %q, %d rows", c.in, tb.Header, tb.Meta, len(tb.Records))
		}
	}
}

// A hidden row is read, and the rows hidden are named in one warning of
// the sheet, for a table and a stage record alike.
func TestHiddenRowsRead(t *testing.T) {
	f := excelize.NewFile()
	s := "XS-1"
	f.SetSheetName("Sheet1", s)
	f.SetSheetRow(s, "A1", &[]any{"station", "elevation"})
	for i, p := range [][2]float64{{0, 2}, {4, 0.5}, {5, 0}, {6, 0.4}, {10, 2}} {
		cell, _ := excelize.CoordinatesToCellName(1, i+2)
		f.SetSheetRow(s, cell, &[]any{p[0], p[1]})
	}
	f.SetRowVisible(s, 3, false)
	f.SetRowVisible(s, 5, false)
	f.SetRowVisible(s, 9, false) // blank: not read, not told
	path := filepath.Join(t.TempDir(), "hidden.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	tb, err := ReadTable(path, "")
	if err != nil {
		t.Fatal(err)
	}
	if len(tb.Records) != 5 {
		t.Errorf("%d records, want the 5 rows, hidden ones too", len(tb.Records))
	}
	if len(tb.Warnings) != 1 || !strings.Contains(tb.Warnings[0], "rows 3, 5 are hidden") {
		t.Errorf("warnings %q, want one naming rows 3, 5", tb.Warnings)
	}

	g := excelize.NewFile()
	g.SetSheetRow("Sheet1", "A1", &[]any{"time", "stage"})
	g.SetSheetRow("Sheet1", "A2", &[]any{"2026-11-14T10:00:00Z", 1.2})
	g.SetSheetRow("Sheet1", "A3", &[]any{"2026-11-14T10:15:00Z", 1.3})
	g.SetRowVisible("Sheet1", 3, false)
	path = filepath.Join(t.TempDir(), "stage.xlsx")
	if err := g.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	rec, err := ReadStageRecord(path, StageRecordOptions{})
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	for _, w := range rec.Warnings {
		if strings.Contains(w, "row 3 is hidden") {
			n++
		}
	}
	if n != 1 {
		t.Errorf("stage record warnings %q, want one naming row 3", rec.Warnings)
	}
}
