package survey

import (
	"archive/zip"
	"bytes"
	"errors"
	"io"
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
	zr, err := zip.NewReader(bytes.NewReader(buf.Bytes()), int64(buf.Len()))
	if err != nil {
		t.Fatal(err)
	}
	var out bytes.Buffer
	zw := zip.NewWriter(&out)
	for _, zf := range zr.File {
		w, _ := zw.Create(zf.Name)
		rc, _ := zf.Open()
		data, _ := io.ReadAll(rc)
		rc.Close()
		if zf.Name == "xl/worksheets/sheet2.xml" {
			data = []byte(`<worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData><row r="x"><c r="A1"><v>1</v></c></row></sheetData></worksheet>`)
		}
		w.Write(data)
	}
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "spoiled.xlsx")
	if err := os.WriteFile(path, out.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	got, err := SurveySheets(path)
	if err != nil {
		t.Fatal(err)
	}
	var pe *ParseError
	if len(got) != 3 || got[0] != (SheetSurvey{Sheet: "XS-1", Survey: true}) || got[2] != (SheetSurvey{Sheet: "notes"}) ||
		got[1].Survey || !errors.As(got[1].Err, &pe) || pe.Sheet != "XS-2" {
		t.Errorf("sheets %+v", got)
	}
	if _, err := SectionSheets(path); err == nil || !strings.Contains(err.Error(), "XS-2") {
		t.Errorf("SectionSheets: %v, want the spoiled sheet's error", err)
	}
}
