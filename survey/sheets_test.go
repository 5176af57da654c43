package survey

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

func TestSectionSheets(t *testing.T) {
	f := excelize.NewFile()
	f.SetSheetName("Sheet1", "XS-1")
	f.SetSheetRow("XS-1", "A1", &[]any{"Station (m)", "Elevation (m)", "n"})
	f.SetSheetRow("XS-1", "A2", &[]any{0, 1, 0.03})
	f.NewSheet("notes")
	f.SetSheetRow("notes", "A1", &[]any{"what", "who"})
	f.NewSheet("XS-2")
	f.SetSheetRow("XS-2", "B3", &[]any{"station", "elevation"})
	f.NewSheet("empty")
	// A site block above the header: key rows come first.
	f.NewSheet("XS-3")
	f.SetSheetRow("XS-3", "A1", &[]any{"Site:", "Tallow Creek"})
	f.SetSheetRow("XS-3", "A2", &[]any{"surveyed"})
	f.SetSheetRow("XS-3", "A4", &[]any{"easting", "northing", "elevation"})
	f.NewSheet("keys only")
	f.SetSheetRow("keys only", "A1", &[]any{"site", "Tallow Creek"})
	path := filepath.Join(t.TempDir(), "reach.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	got, err := SectionSheets(path)
	if err != nil {
		t.Fatal(err)
	}
	if strings.Join(got, ",") != "XS-1,XS-2,XS-3" {
		t.Errorf("section sheets %q, want XS-1, XS-2, XS-3", got)
	}
}

// SurveySheets tells every sheet apart: a sheet that cannot be read (its
// XML spoiled here: a row numbered "x") has its error, naming the sheet,
// and the others are still told; SectionSheets fails on it.
func TestSurveySheetsBadSheetAlone(t *testing.T) {
	f := excelize.NewFile()
	f.SetSheetName("Sheet1", "XS-1")
	f.SetSheetRow("XS-1", "A1", &[]any{"station", "elevation"})
	f.NewSheet("XS-2")
	f.SetSheetRow("XS-2", "A1", &[]any{"station", "elevation"})
	f.NewSheet("notes")
	f.SetSheetRow("notes", "A1", &[]any{"what"})
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		t.Fatal(err)
	}
	spoiled := rewriteZip(t, buf.Bytes(), func(name string, data []byte) []byte {
		if name == "xl/worksheets/sheet2.xml" {
			return []byte(`<worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData><row r="x"><c r="A1"><v>1</v></c></row></sheetData></worksheet>`)
		}
		return data
	})
	path := filepath.Join(t.TempDir(), "spoiled.xlsx")
	if err := os.WriteFile(path, spoiled, 0o644); err != nil {
		t.Fatal(err)
	}
	got, err := SurveySheets(path)
	if err != nil {
		t.Fatal(err)
	}
	var pe *ParseError
	if len(got) != 3 || got[0] != (SheetSurvey{Sheet: "XS-1", Survey: true}) || got[2].Sheet != "notes" || got[2].Survey || got[2].Other == "" ||
		got[1].Survey || !errors.As(got[1].Err, &pe) || pe.Sheet != "XS-2" {
		t.Errorf("sheets %+v", got)
	}
	if _, err := SectionSheets(path); err == nil || !strings.Contains(err.Error(), "XS-2") {
		t.Errorf("SectionSheets: %v, want the spoiled sheet's error", err)
	}
}

// hiddenFirstBook writes a workbook whose first sheet, "old", is hidden
// and holds an old survey (bed at 9), before the visible sheet "current"
// (bed at 5).
func hiddenFirstBook(t *testing.T) string {
	t.Helper()
	f := excelize.NewFile()
	f.SetSheetName("Sheet1", "old")
	f.NewSheet("current")
	for sheet, bed := range map[string]float64{"old": 9, "current": 5} {
		f.SetSheetRow(sheet, "A1", &[]any{"station", "elevation"})
		f.SetSheetRow(sheet, "A2", &[]any{0, 10.0})
		f.SetSheetRow(sheet, "A3", &[]any{5, bed})
		f.SetSheetRow(sheet, "A4", &[]any{10, 10.0})
	}
	// excelize does not hide the active sheet: make "current" active first.
	f.SetActiveSheet(1)
	if err := f.SetSheetVisible("old", false); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "book.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	return path
}

// With no sheet named the first visible sheet is read, a hidden sheet
// before it passed over; a hidden sheet named is read with a warning.
func TestHiddenSheetChoice(t *testing.T) {
	path := hiddenFirstBook(t)
	for _, c := range []struct {
		sheet, wantSheet string
		wantBed          float64
		warned           bool
	}{
		{"", "current", 5, false},
		{"current", "current", 5, false},
		{"old", "old", 9, true},
	} {
		sv, err := ReadSection(path, c.sheet, SectionOptions{})
		if err != nil {
			t.Fatalf("sheet %q: %v", c.sheet, err)
		}
		if got := sv.Section.Points[1].Elevation; got != c.wantBed {
			t.Errorf("sheet %q: bed %g, want %g (sheet %s)", c.sheet, got, c.wantBed, c.wantSheet)
		}
		warned := false
		for _, w := range sv.Warnings {
			if strings.Contains(w, "is hidden") && strings.Contains(w, "'"+c.wantSheet+"'") {
				warned = true
			}
		}
		if warned != c.warned {
			t.Errorf("sheet %q: warnings %q, hidden warning %v, want %v", c.sheet, sv.Warnings, warned, c.warned)
		}
		tab, err := ReadTable(path, c.sheet)
		if err != nil || tab.Sheet != c.wantSheet {
			t.Errorf("ReadTable sheet %q: read %v (%v), want %s", c.sheet, tab, err, c.wantSheet)
		}
	}
	got, err := SectionSheets(path)
	if err != nil || len(got) != 1 || got[0] != "current" {
		t.Errorf("SectionSheets: %q, %v; want [current]", got, err)
	}
}

// A stage record read from a workbook whose first sheet is hidden reads
// the first visible sheet too.
func TestHiddenSheetStageRecord(t *testing.T) {
	f := excelize.NewFile()
	f.SetSheetName("Sheet1", "old")
	f.NewSheet("current")
	for sheet, stage := range map[string]float64{"old": 9, "current": 5} {
		f.SetSheetRow(sheet, "A1", &[]any{"time", "stage"})
		f.SetSheetRow(sheet, "A2", &[]any{"2026-01-01T00:00:00Z", stage})
		f.SetSheetRow(sheet, "A3", &[]any{"2026-01-01T01:00:00Z", stage})
	}
	f.SetActiveSheet(1)
	if err := f.SetSheetVisible("old", false); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "record.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		sheet  string
		want   float64
		warned bool
	}{
		{"", 5, false},
		{"old", 9, true},
	} {
		rec, err := ReadStageRecord(path, StageRecordOptions{Sheet: c.sheet})
		if err != nil {
			t.Fatalf("sheet %q: %v", c.sheet, err)
		}
		if len(rec.Stages.Stage) == 0 || rec.Stages.Stage[0] != c.want {
			t.Errorf("sheet %q: stages %v, want %g", c.sheet, rec.Stages.Stage, c.want)
		}
		if warned := len(rec.Warnings) > 0 && strings.Contains(strings.Join(rec.Warnings, " "), "is hidden"); warned != c.warned {
			t.Errorf("sheet %q: warnings %q, want hidden warning %v", c.sheet, rec.Warnings, c.warned)
		}
	}
}

// A boundary rating and shift diagrams read from a hidden sheet carry the
// hidden-sheet warning, as sections and gaugings do: the boundary rating
// from a hidden sheet named rating (read when no sheet is named), the
// shifts from a hidden sheet named. A visible sheet gives no warning.
func TestHiddenSheetRatingAndShifts(t *testing.T) {
	t.Parallel()
	f := excelize.NewFile()
	f.SetSheetName("Sheet1", "current")
	f.NewSheet("rating")
	f.NewSheet("shifts")
	for _, s := range []string{"current", "rating"} {
		f.SetSheetRow(s, "A1", &[]any{"stage", "discharge"})
		f.SetSheetRow(s, "A2", &[]any{1.0, 0})
		f.SetSheetRow(s, "A3", &[]any{2.0, 5})
	}
	f.SetSheetRow("shifts", "A1", &[]any{"time", "stage", "shift"})
	f.SetSheetRow("shifts", "A2", &[]any{"2024-03-01T00:00:00Z", 1.0, 0.1})
	f.SetActiveSheet(0)
	for _, s := range []string{"rating", "shifts"} {
		if err := f.SetSheetVisible(s, false); err != nil {
			t.Fatal(err)
		}
	}
	path := filepath.Join(t.TempDir(), "book.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	hidden := func(ws []string, sheet string) bool {
		return len(ws) == 1 && ws[0] == hiddenSheetWarning(path, sheet)
	}
	br, err := ReadBoundaryRating(path, "")
	if err != nil || br.Sheet != "rating" || !hidden(br.Warnings, "rating") {
		t.Errorf("boundary rating from sheet %q: warnings %q, %v; want the hidden-sheet warning", br.Sheet, br.Warnings, err)
	}
	if br, err := ReadBoundaryRating(path, "current"); err != nil || len(br.Warnings) != 0 {
		t.Errorf("boundary rating from a visible sheet: warnings %q, %v", br.Warnings, err)
	}
	ds, err := ReadShiftDiagrams(path, ShiftTableOptions{Sheet: "shifts"})
	if err != nil || !hidden(ds.Warnings, "shifts") {
		t.Errorf("shift diagrams: warnings %q, %v; want the hidden-sheet warning", ds.Warnings, err)
	}
}
