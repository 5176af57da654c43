package survey_test

import (
	"bytes"
	"errors"
	"os"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"wetline/survey"
)

// checkReadError fails unless err is nil or made of ParseErrors that name
// the file (and the sheet when sheet != "").
func checkReadError(t *testing.T, err error, sheet string) {
	t.Helper()
	if err == nil {
		return
	}
	var errs []error
	if j, ok := err.(interface{ Unwrap() []error }); ok {
		errs = j.Unwrap()
	} else {
		errs = []error{err}
	}
	for _, e := range errs {
		var pe *survey.ParseError
		if !errors.As(e, &pe) {
			if strings.Contains(e.Error(), "more errors not shown") {
				continue
			}
			t.Fatalf("error %q (%T) is not a ParseError", e, e)
		}
		if pe.File != "fuzz.xlsx" || (sheet != "" && pe.Sheet != sheet) {
			t.Fatalf("error %q names file %q sheet %q", e, pe.File, pe.Sheet)
		}
	}
}

// FuzzParseWorkbook feeds raw bytes to the workbook reader: it must return
// a table or a ParseError, never panic. The seed corpus (testdata/fuzz)
// holds small workbooks: a blank template and a filled section.
func FuzzParseWorkbook(f *testing.F) {
	f.Add([]byte("PK\x03\x04"))
	f.Add([]byte("station,elevation\n0,1\n"))
	f.Fuzz(func(t *testing.T, raw []byte) {
		tab, err := survey.ParseWorkbook(bytes.NewReader(raw), "fuzz.xlsx", "")
		checkReadError(t, err, "")
		if err != nil {
			return
		}
		for _, rec := range tab.Records {
			if len(rec.Cells) > len(tab.Header) || rec.Row <= tab.HeaderRow {
				t.Fatalf("record %+v after header row %d of %d columns", rec, tab.HeaderRow, len(tab.Header))
			}
		}
		_, err = survey.SectionFromTable(tab, survey.SectionOptions{})
		checkReadError(t, err, tab.Sheet)
	})
}

// FuzzSheetCells writes arbitrary cell text into a section sheet (each
// argument a column, rows split at '|'), then reads it as a survey and
// as date-times: errors must name the sheet and a cell below the header.
func FuzzSheetCells(f *testing.F) {
	f.Add("0|5|10", "3|1|3.5", "0.04||0.05", "||", false)
	f.Add("0|1,5|2", "1|2|x", "0.03|-1|", "bank|bank|bank", true)
	f.Add("4.0| 8 |12e0", "9.1|NaN|Inf", "|0.2|", "thalweg|Bank|", false)
	f.Add("45000|2026-03-14 09:30|1e9", "", "", "", true)
	f.Fuzz(func(t *testing.T, st, el, n, mark string, date1904 bool) {
		cols := [][]string{strings.Split(st, "|"), strings.Split(el, "|"), strings.Split(n, "|"), strings.Split(mark, "|")}
		rows := 0
		for _, c := range cols {
			rows = max(rows, len(c))
		}
		if rows > 50 {
			return
		}
		wb := excelize.NewFile()
		defer wb.Close()
		if err := wb.SetSheetName("Sheet1", "XS-1"); err != nil {
			t.Fatal(err)
		}
		if date1904 {
			d := true
			if err := wb.SetWorkbookProps(&excelize.WorkbookPropsOptions{Date1904: &d}); err != nil {
				t.Fatal(err)
			}
		}
		if err := wb.SetSheetRow("XS-1", "A1", &[]any{"station (m)", "elevation (m)", "n", "mark"}); err != nil {
			t.Fatal(err)
		}
		for j, c := range cols {
			for i, s := range c {
				cell, _ := excelize.CoordinatesToCellName(j+1, i+2)
				if err := wb.SetCellStr("XS-1", cell, s); err != nil {
					return // text excelize refuses to store (too long)
				}
			}
		}
		var buf bytes.Buffer
		if err := wb.Write(&buf); err != nil {
			t.Fatal(err)
		}
		tab, err := survey.ParseWorkbook(&buf, "fuzz.xlsx", "XS-1")
		if err != nil {
			t.Fatalf("reading a workbook just written: %v", err)
		}
		_, err = survey.SectionFromTable(tab, survey.SectionOptions{})
		checkReadError(t, err, "XS-1")
		var pe *survey.ParseError
		if errors.As(err, &pe) && pe.Column > 0 && pe.Row < 2 {
			t.Fatalf("cell error %q above the data", err)
		}
		for _, rec := range tab.Records {
			_, _, err := tab.Time(rec, 0)
			checkReadError(t, err, "XS-1")
		}
	})
}

// TestForgedZipSize: a workbook whose zip directory claims an entry of
// 587 MB packed into a few hundred bytes (found by FuzzParseWorkbook) is
// refused before the spreadsheet library allocates what it claims.
func TestForgedZipSize(t *testing.T) {
	path := "testdata/forged-size.xlsx"
	if _, err := survey.ReadTable(path, ""); !errors.Is(err, survey.ErrWorkbookZip) {
		t.Errorf("ReadTable: %v, want ErrWorkbookZip", err)
	}
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	_, err = survey.ParseWorkbook(bytes.NewReader(data), "fuzz.xlsx", "")
	if !errors.Is(err, survey.ErrWorkbookZip) {
		t.Errorf("ParseWorkbook: %v, want ErrWorkbookZip", err)
	}
	checkReadError(t, err, "")
}
