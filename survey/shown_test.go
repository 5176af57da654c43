package survey

import (
	"bytes"
	"encoding/csv"
	"errors"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"
)

// shownBook writes a workbook of one sheet, "g", of gaugings whose
// uncertainty cells (D2:D5) and first stage cell (B2) carry the number
// formats given (built-in ids; a custom code when the id is 0), and whose
// B3 is the boolean TRUE when boolean is set.
func shownBook(t *testing.T, uncertainty []any, stageFormat string, boolean bool) string {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	f.SetSheetName("Sheet1", "g")
	rows := [][]any{
		{"time", "stage (m)", "discharge (m3/s)", "uncertainty"},
		{"2026-03-02T09:15", 1.1, 2.5, 0.05},
		{"2026-04-11T14:00", 2.05, 7.6, 0.07},
		{"2026-05-20T10:30", 0.6, 0.61, 0.08},
		{"2026-06-30T08:45", 3.4, 16.2, 0.125},
	}
	for r, row := range rows {
		cell, _ := excelize.CoordinatesToCellName(1, r+1)
		if err := f.SetSheetRow("g", cell, &row); err != nil {
			t.Fatal(err)
		}
	}
	style := func(format any) int { return numberStyle(t, f, format) }
	for i, format := range uncertainty {
		cell, _ := excelize.CoordinatesToCellName(4, i+2)
		if err := f.SetCellStyle("g", cell, cell, style(format)); err != nil {
			t.Fatal(err)
		}
	}
	if stageFormat != "" {
		if err := f.SetCellStyle("g", "B2", "B2", style(stageFormat)); err != nil {
			t.Fatal(err)
		}
	}
	if boolean {
		if err := f.SetCellBool("g", "B3", true); err != nil {
			t.Fatal(err)
		}
	}
	path := filepath.Join(t.TempDir(), "g.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	return path
}

// A number cell with a percent format is read as the percent a
// spreadsheet program shows (0.05 formatted 0% shows 5 %, ECMA-376 Part 1,
// 18.8.30, built-in number formats 9 "0%" and 10 "0.00%", from memory), in
// the uncertainty column, which is in percent; a cell with no percent
// format keeps its stored value.
func TestPercentCellsInPercentColumn(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name    string
		formats []any
		want    []float64
	}{
		{"built-in 0% and 0.00%", []any{9, 10, 9, 10}, []float64{5, 7, 8, 12.5}},
		{"custom codes", []any{"0.0%", "0.0 %", `#,##0.00"" %`, "0.0%;-0.0%"}, []float64{5, 7, 8, 12.5}},
		{"not percent", []any{"0.000", `0.0"%"`, `0.0\%`, 2}, []float64{0.05, 0.07, 0.08, 0.125}},
	} {
		path := shownBook(t, tc.formats, "", false)
		g, err := ReadGaugings(path, "")
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		for i, want := range tc.want {
			if got := g.Gaugings[i].Uncertainty; math.Abs(got-want) > 1e-12 {
				t.Errorf("%s: row %d uncertainty %v, want %v", tc.name, i+2, got, want)
			}
		}
	}
}

// A percent-formatted cell in a number column that is not in percent, and
// a boolean cell anywhere a number is read, are refused at the cell; a
// boolean reads TRUE, as shown.
func TestPercentAndBooleanCellsRefused(t *testing.T) {
	t.Parallel()
	path := shownBook(t, nil, "0%", false)
	_, err := ReadGaugings(path, "")
	if !errors.Is(err, ErrPercent) || !strings.Contains(err.Error(), `g.xlsx['g']!B2: stage (m) "110%": a percent in a column that is not in percent`) {
		t.Errorf("percent stage: %v", err)
	}
	path = shownBook(t, nil, "", true)
	_, err = ReadGaugings(path, "")
	if !errors.Is(err, ErrNotNumber) || !strings.Contains(err.Error(), `g.xlsx['g']!B3: stage (m) "TRUE": not a number`) {
		t.Errorf("boolean stage: %v", err)
	}
	tab, err := ReadTable(path, "")
	if err != nil {
		t.Fatal(err)
	}
	if got := tab.Cell(tab.Records[1], 1); got != "TRUE" {
		t.Errorf("boolean cell reads %q, want TRUE", got)
	}
}

// The stage record's workbook reader sees cells as shown too.
func TestBooleanStageRecordCell(t *testing.T) {
	t.Parallel()
	f := excelize.NewFile()
	defer f.Close()
	for r, row := range [][]any{{"time", "stage"}, {"2026-01-01T00:00:00Z", 1.0}, {"2026-01-01T01:00:00Z", true}} {
		cell, _ := excelize.CoordinatesToCellName(1, r+1)
		if err := f.SetSheetRow("Sheet1", cell, &row); err != nil {
			t.Fatal(err)
		}
	}
	path := filepath.Join(t.TempDir(), "s.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	_, err := ReadStageRecord(path, StageRecordOptions{})
	if !errors.Is(err, ErrNotNumber) || !strings.Contains(err.Error(), `['Sheet1']!B3: stage "TRUE"`) {
		t.Errorf("boolean stage: %v", err)
	}
}

// percentShown moves the decimal digits two places, so the percent read is
// the decimal one shown (7, not 0.07·100 = 7.000000000000001 in binary
// floating point, IEEE 754 double rounding, from memory).
func TestPercentShown(t *testing.T) {
	t.Parallel()
	for raw, want := range map[string]string{
		"0.07": "7%", "0.05": "5%", "1": "100%", "0.125": "12.5%", "-0.003": "-0.3%",
		"1E-3": "0.1%", "0.29": "29%", "x": "x", "": "",
	} {
		if got := percentShown(raw); got != want {
			t.Errorf("percentShown(%q) = %q, want %q", raw, got, want)
		}
	}
}

// The percent number formats: ECMA-376 Part 1, 18.8.31 (numFmt), a
// percent sign scales by 100 unless quoted or escaped (from memory).
func TestPercentFormat(t *testing.T) {
	t.Parallel()
	for code, want := range map[string]bool{
		"0%": true, "0.00%": true, "0.0 %": true, "0.00%_)": true, "#,##0%;[Red]-#,##0%": true, `0%" of Q"`: true,
		"0.00": false, `0"%"`: false, `0\%`: false, "@": false, "": false, "0;0%": false,
	} {
		if got := percentFormat(code); got != want {
			t.Errorf("percentFormat(%q) = %v, want %v", code, got, want)
		}
	}
}

// In a CSV file the uncertainty column takes a trailing percent sign, with
// or without a space; any other number column refuses one.
func TestCSVPercent(t *testing.T) {
	t.Parallel()
	const head = "time,stage (m),discharge (m3/s),uncertainty\n"
	g, err := ParseGaugings(strings.NewReader(head+"2026-03-02T09:15,1.1,2.5,5%\n2026-04-11T14:00,2.05,7.6,7.5 %\n2026-05-20T10:30,0.6,0.61,8\n"), "g.csv")
	if err != nil {
		t.Fatal(err)
	}
	for i, want := range []float64{5, 7.5, 8} {
		if got := g.Gaugings[i].Uncertainty; got != want {
			t.Errorf("row %d: uncertainty %v, want %v", i+2, got, want)
		}
	}
	for _, tc := range []struct{ body, want string }{
		{"2026-03-02T09:15,1.1%,2.5,5\n", `g.csv:2:2: stage (m) "1.1%": a percent in a column that is not in percent`},
		{"2026-03-02T09:15,1.1,2.5,5%%\n", `g.csv:2:4: uncertainty "5%%": not a number`},
		{"2026-03-02T09:15,1.1,2.5,%\n", `g.csv:2:4: uncertainty "%": not a number`},
	} {
		_, err := ParseGaugings(strings.NewReader(head+tc.body), "g.csv")
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%q: %v, want %s", tc.body, err, tc.want)
		}
	}
}

// A comma followed by three digits may be a thousands separator or a
// decimal comma: refused as either, saying so; other commas are decimal
// commas.
func TestNumberCommas(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		s    string
		want error
	}{
		{"2,076", ErrThousands}, {"1,248.5", ErrThousands}, {"-12,345,678", ErrThousands}, {"999,000.", ErrThousands},
		{"1,5", ErrDecimalComma}, {"0,125", ErrDecimalComma}, {",125", ErrDecimalComma}, {"12,3456", ErrDecimalComma},
		{"1,2,3", ErrNotNumber}, {"1234,567.8,9", ErrNotNumber},
	} {
		if _, err := ParseNumber(tc.s); !errors.Is(err, tc.want) {
			t.Errorf("ParseNumber(%q): %v, want %v", tc.s, err, tc.want)
		}
	}
	_, err := ParseSection(strings.NewReader("station,elevation\n0,10\n\"1,248.5\",0\n20,10\n"), "xs.csv", SectionOptions{})
	if !strings.Contains(err.Error(), `xs.csv:3:1: station "1,248.5": looks like a thousands separator`) {
		t.Errorf("section: %v", err)
	}
}

// A date written with slashes or dots is ambiguous (day-first or
// month-first) and refused as such, giving its ISO 8601 readings.
func TestDayMonthDates(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct{ s, want string }{
		{"03/04/2026", "ambiguous (day-first or month-first): write ISO 8601 (2026-04-03 day-first, 2026-03-04 month-first)"},
		{"03.04.2026 10:00", "(2026-04-03 day-first, 2026-03-04 month-first)"},
		{"13/04/2026", "write ISO 8601 (2026-04-13)"},
		{"04/13/2026", "write ISO 8601 (2026-04-13)"},
		{"5/5/2026", "write ISO 8601 (2026-05-05)"},
		{"03/04/26", "write ISO 8601 (YYYY-MM-DD, such as 2026-04-03)"},
	} {
		_, err := ParseISOTime(tc.s, 0)
		if !errors.Is(err, ErrAmbiguousDate) || !errors.Is(err, ErrISOTime) || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%q: %v, want %s", tc.s, err, tc.want)
		}
	}
	for _, s := range []string{"03/04-2026", "2026/04/03", "3 April 2026"} {
		if _, err := ParseISOTime(s, 0); errors.Is(err, ErrAmbiguousDate) || !errors.Is(err, ErrISOTime) {
			t.Errorf("%q: %v, want ErrISOTime alone", s, err)
		}
	}
	_, err := ParseGaugings(strings.NewReader("time,stage,discharge\n03/04/2026,1,2\n"), "g.csv")
	if !strings.Contains(err.Error(), `g.csv:2:1: time "03/04/2026": ambiguous (day-first or month-first)`) {
		t.Errorf("gaugings: %v", err)
	}
	_, err = ParseStageRecord(strings.NewReader("time,stage\n03/04/2026 10:00,1\n"), "s.csv", StageRecordOptions{})
	if !errors.Is(err, ErrAmbiguousDate) {
		t.Errorf("stage record: %v", err)
	}
}

// Key lines saved by a spreadsheet program as rows of a wider table keep
// no trailing empty fields.
func TestKeyLinesTrailingFields(t *testing.T) {
	t.Parallel()
	tab, err := ParseCSV(strings.NewReader("# site: Quillback Run at Fenner ford,,\n# surveyed: 2026-11-03, ,\n# datum: local,,,\n# crew: A. Reed, B. Oduya,,\n# site id: QR-2,\nstation,elevation,,\n0,1,,\n"), "xs.csv")
	if err != nil {
		t.Fatal(err)
	}
	for k, want := range map[string]string{"site": "Quillback Run at Fenner ford", "surveyed": "2026-11-03", "datum": "local", "crew": "A. Reed, B. Oduya", "site id": "QR-2"} {
		if got := tab.Meta[k]; got != want {
			t.Errorf("%s: %q, want %q", k, got, want)
		}
	}
}

// An error of CSV quoting is placed at the row where the field starts and
// at its field number, named by the header, the character offset kept in
// the cause.
func TestCSVQuoteErrorPlace(t *testing.T) {
	t.Parallel()
	table, stages := csvTableErr, csvStagesErr
	for _, tc := range []struct {
		name, csv string
		read      func(string) error
		want      string
	}{
		{"unclosed", "station (ft),elevation (ft),n\n0,10,0.035\n0,0,0.035\n20,\"0\n20,10,0.035\n", table,
			`t.csv:4:2: elevation (ft): extraneous or missing " in quoted-field (at character 13 of line 5)`},
		{"bare", "station,elevation,n\n0,10,0.035\n0,a\"b,0.035\n", table,
			`t.csv:3:2: elevation: bare " in non-quoted-field (at character 4 of line 3)`},
		{"extraneous", "station,elevation,n\n0,10,\"0.03\"5\n", table,
			`t.csv:2:3: n: extraneous or missing " in quoted-field (at character 11 of line 2)`},
		{"in header", "station,\"elev\"ation\n0,1\n", table,
			`t.csv:1:2: extraneous or missing " in quoted-field (at character 14 of line 1)`},
		{"stage record", "time,stage\n2026-01-01T00:00,1\n2026-01-01T01:00,\"1\n", stages,
			`t.csv:3:2: stage: extraneous or missing " in quoted-field`},
	} {
		err := tc.read(tc.csv)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: %v, want %s", tc.name, err, tc.want)
		}
	}
}

// The place given for a CSV syntax error lies within the record
// encoding/csv reports it in: from its first line to the line of the
// fault, at a field number of at least 1.
func FuzzCSVSyntaxError(f *testing.F) {
	for _, s := range []string{"a,b\n1,\"2\n3,4\n", "a,b\n1,x\"y\n", "a,\"b\"c\n", "\"a\nb\"\"\"x,1\n", "a,b\r\n 1, \"2\"3\r\n"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		cr := csv.NewReader(strings.NewReader(s))
		cr.Comment, cr.FieldsPerRecord, cr.TrimLeadingSpace = '#', -1, true
		for {
			_, err := cr.Read()
			if err == io.EOF {
				return
			}
			var pe *csv.ParseError
			if !errors.As(err, &pe) {
				if err != nil {
					return
				}
				continue
			}
			e := csvSyntaxError("t.csv", []byte(s), 1, []string{"a", "b"}, pe)
			if e.Row < pe.StartLine || e.Row > pe.Line || e.Column < 0 || !errors.Is(e, pe.Err) {
				t.Fatalf("%v placed at row %d column %d", pe, e.Row, e.Column)
			}
			return
		}
	})
}

// numberStyle adds to f a cell style of a number format: a built-in id
// (int) or a custom code (string).
func numberStyle(t *testing.T, f *excelize.File, format any) int {
	t.Helper()
	st := &excelize.Style{}
	switch v := format.(type) {
	case int:
		st.NumFmt = v
	case string:
		st.CustomNumFmt = &v
	}
	id, err := f.NewStyle(st)
	if err != nil {
		t.Fatal(err)
	}
	return id
}

// dateBook writes a workbook of one sheet, "xs": a site block whose
// "surveyed" value B2 is a date cell, then a survey whose station cell
// A6 holds what a spreadsheet makes of "6/1" typed into it (the serial
// 46174 of 2026-06-01 with the date format given: a built-in id or a
// custom code), in the date system given.
func dateBook(t *testing.T, format any, date1904 bool) string {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	if date1904 {
		yes := true
		if err := f.SetWorkbookProps(&excelize.WorkbookPropsOptions{Date1904: &yes}); err != nil {
			t.Fatal(err)
		}
	}
	f.SetSheetName("Sheet1", "xs")
	rows := [][]any{
		{"site", "Test reach (invented)"},
		{"surveyed", nil},
		{"station", "elevation", "n"},
		{0, 3, 0.035},
		{4, 0, 0.035},
		{8, 3},
	}
	for r, row := range rows {
		cell, _ := excelize.CoordinatesToCellName(1, r+1)
		if err := f.SetSheetRow("xs", cell, &row); err != nil {
			t.Fatal(err)
		}
	}
	id := numberStyle(t, f, format)
	// The serials as the date system stores them: 1904's day 0 is
	// 1904-01-01, 1 462 days after 1900's (ECMA-376 Part 1, 18.17.4.1,
	// from memory).
	surveyed, typed := 46114.0, 46174.0 // 2026-04-02 and 2026-06-01
	if date1904 {
		surveyed, typed = surveyed-1462, typed-1462
	}
	f.SetCellValue("xs", "B2", surveyed)
	f.SetCellValue("xs", "A6", typed)
	for _, cell := range []string{"B2", "A6"} {
		if err := f.SetCellStyle("xs", cell, cell, id); err != nil {
			t.Fatal(err)
		}
	}
	path := filepath.Join(t.TempDir(), "xs.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	return path
}

// A number cell with a date format reads as the date shown: a date
// where a station belongs is refused at its cell (read as the serial, it
// made a station of 46 174 m and a wrong rating), and a date in the site
// block reads as that date, in ISO 8601, in both date systems.
func TestDateCellsReadAsShown(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name     string
		format   any
		date1904 bool
	}{
		{"built-in m/d/yyyy", 14, false},
		{"built-in d-mmm-yy", 15, false},
		{"custom yyyy-mm-dd", "yyyy-mm-dd", false},
		{"custom d mmm yyyy, in red", "[Red]d mmm yyyy", false},
		{"1904 date system", 14, true},
	} {
		path := dateBook(t, tc.format, tc.date1904)
		_, err := ReadSection(path, "", SectionOptions{})
		if !errors.Is(err, ErrDateNotNumber) || !strings.Contains(err.Error(), `xs.xlsx['xs']!A6: station "2026-06-01": a date where a number belongs`) {
			t.Errorf("%s: station cell: %v, want ErrDateNotNumber at A6", tc.name, err)
		}
		tab, err := ReadTable(path, "")
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		if got := tab.Meta["surveyed"]; got != "2026-04-02" {
			t.Errorf("%s: surveyed reads %q, want 2026-04-02", tc.name, got)
		}
	}
}

// Gauging times in date cells read as before: the date shown, with its
// time of day, at the offset asked for.
func TestDateCellsInTimeColumn(t *testing.T) {
	t.Parallel()
	f := excelize.NewFile()
	defer f.Close()
	rows := [][]any{
		{"time", "stage (m)", "discharge (m3/s)"},
		{time.Date(2026, 3, 2, 9, 15, 0, 0, time.UTC), 1.1, 2.5},
		{time.Date(2026, 4, 11, 0, 0, 0, 0, time.UTC), 2.05, 7.6},
		{time.Date(2026, 5, 20, 10, 30, 30, 0, time.UTC), 0.6, 0.61},
	}
	for r, row := range rows {
		cell, _ := excelize.CoordinatesToCellName(1, r+1)
		if err := f.SetSheetRow("Sheet1", cell, &row); err != nil {
			t.Fatal(err)
		}
	}
	path := filepath.Join(t.TempDir(), "g.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	g, err := ReadGaugings(path, "")
	if err != nil {
		t.Fatal(err)
	}
	for i, row := range rows[1:] {
		if want := row[0].(time.Time); !g.Gaugings[i].Time.Equal(want) {
			t.Errorf("row %d: time %v, want %v", i+2, g.Gaugings[i].Time, want)
		}
	}
}

// dateShown writes a serial as the date a spreadsheet shows (1900 date
// system: serial 1 is 1900-01-01, 46174 is 2026-06-01, from memory; a
// fraction is the time of day).
func TestDateShown(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		raw      string
		date1904 bool
		want     string
	}{
		{"46174", false, "2026-06-01"},
		{"46174.4375", false, "2026-06-01T10:30:00"},
		{"44712", true, "2026-06-01"},
		{"0.4375", false, "10:30:00"},
		{"0.99999999", false, "23:59:59"},
		{"-1", false, "-1"},
		{"x", false, "x"},
		{"", false, ""},
	} {
		if got := dateShown(tc.raw, tc.date1904); got != tc.want {
			t.Errorf("dateShown(%q, %v) = %q, want %q", tc.raw, tc.date1904, got, tc.want)
		}
	}
}

// The date and time number formats: ECMA-376 Part 1, 18.8.31 (numFmt),
// the codes y, m, d, h and s, elapsed time in brackets (from memory).
func TestDateFormat(t *testing.T) {
	t.Parallel()
	for code, want := range map[string]bool{
		"yyyy-mm-dd": true, "d mmm yyyy": true, "m/d/yy h:mm": true, "[h]:mm:ss": true, "h:mm AM/PM": true, "[H]:MM": true, "[HH]:mm:ss": true,
		"[$-409]d-mmm-yy": true, "[Red]dd/mm/yyyy": true, "mm:ss.0": true,
		"General": false, "0.00": false, "0.00E+00": false, `0.0" m"`: false, `0.0\ \m`: false, "[Red]0.00": false,
		"#,##0.00;[Red]-#,##0.00": false, "@": false, "": false, `_-* #,##0_-`: false, "0.0;d": false,
	} {
		if got := dateFormat(code); got != want {
			t.Errorf("dateFormat(%q) = %v, want %v", code, got, want)
		}
	}
}

// A date or a time of day where a number belongs, in a CSV file as in a
// workbook, is ErrDateNotNumber; a number in scientific notation is not a
// date.
func TestParseNumberDates(t *testing.T) {
	t.Parallel()
	for _, s := range []string{"2026-06-01", "2026-06-01T10:15", "6/1/2026", "01.06.26", "1-6-2026", "10:15", "10:15:00", "1-Jun", "1 Jun 2026", "Jun-26"} {
		if _, err := ParseNumber(s); !errors.Is(err, ErrDateNotNumber) {
			t.Errorf("ParseNumber(%q): %v, want ErrDateNotNumber", s, err)
		}
	}
	for _, s := range []string{"1e5", "-2.5", "12"} {
		if _, err := ParseNumber(s); err != nil {
			t.Errorf("ParseNumber(%q): %v", s, err)
		}
	}
	for _, s := range []string{"1-6", "june", "jun", "may", "XS-1", "12 m"} {
		if _, err := ParseNumber(s); !errors.Is(err, ErrNotNumber) {
			t.Errorf("ParseNumber(%q): %v, want ErrNotNumber", s, err)
		}
	}
}

// The scan of a sheet finds its date cells however the workbook is
// written: a sheet named in another case than the workbook's, a sheet
// part stored outside xl/worksheets/ (valid OOXML: the relationships say
// where), a cell whose reference names another row than its row element
// (the spreadsheet library places it by the row element).
func TestDateCellsFoundAnyway(t *testing.T) {
	t.Parallel()
	path := dateBook(t, 14, false)
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	moved := renameZip(t, data, "xl/worksheets/sheet1.xml", "xl/ws/sheet1.xml", func(name string, b []byte) []byte {
		switch name {
		case "xl/_rels/workbook.xml.rels":
			return bytes.ReplaceAll(b, []byte("worksheets/sheet1.xml"), []byte("ws/sheet1.xml"))
		case "[Content_Types].xml":
			return bytes.ReplaceAll(b, []byte("/xl/worksheets/sheet1.xml"), []byte("/xl/ws/sheet1.xml"))
		}
		return b
	})
	forged := rewriteZip(t, data, func(name string, b []byte) []byte {
		if name != "xl/worksheets/sheet1.xml" {
			return b
		}
		return bytes.Replace(b, []byte(`r="A6"`), []byte(`r="A9"`), 1)
	})
	dir := t.TempDir()
	for _, tc := range []struct {
		name  string
		data  []byte
		sheet string
	}{
		{"sheet named in upper case", data, "XS"},
		{"part outside xl/worksheets", moved, ""},
		{"cell reference on another row", forged, ""},
	} {
		p := filepath.Join(dir, "xs.xlsx")
		if err := os.WriteFile(p, tc.data, 0o644); err != nil {
			t.Fatal(err)
		}
		_, err := ReadSection(p, tc.sheet, SectionOptions{})
		if !errors.Is(err, ErrDateNotNumber) || !strings.Contains(err.Error(), `xs.xlsx['xs']!A6: station "2026-06-01"`) {
			t.Errorf("%s: %v, want ErrDateNotNumber at ['xs']!A6", tc.name, err)
		}
	}
}

// A plain number in a time column (no date format) is read as a date
// serial only when it is a date of PlainSerialMinYear or later, as a time
// a formula made is; a day of the year or an hour count would be a date
// in 1900 and is refused at its cell. A date-formatted cell reads as the
// date shown, however early. Serials: 45749.5 is 2025-04-02T12:00 and
// 92.3958 is 1900-04-01T09:29:57 (1900 date system, from memory).
func TestPlainNumberTimes(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	book := writeBook(t, dir, map[string][][]any{
		"late":  {{"time", "stage (m)", "discharge (m3/s)"}, {45749.5, 1.2, 3.4}, {45750.5, 1.3, 3.9}},
		"early": {{"time", "stage (m)", "discharge (m3/s)"}, {45749.5, 1.2, 3.4}, {92.3958, 1.3, 3.9}},
	}, []string{"late", "early"})
	g, err := ReadGaugings(book, "late")
	if err != nil {
		t.Fatal(err)
	}
	if want := time.Date(2025, 4, 2, 12, 0, 0, 0, time.UTC); !g.Gaugings[0].Time.Equal(want) {
		t.Errorf("serial 45749.5 read as %v, want %v", g.Gaugings[0].Time, want)
	}
	_, err = ReadGaugings(book, "early")
	if !errors.Is(err, ErrPlainNumberTime) || !strings.Contains(err.Error(), "['early']!A3") || !strings.Contains(err.Error(), "1900-04-01T09:29:57") {
		t.Errorf("serial 92.3958: %v, want ErrPlainNumberTime at A3", err)
	}
	_, err = ReadStageRecord(book, StageRecordOptions{Sheet: "early"})
	if !errors.Is(err, ErrPlainNumberTime) {
		t.Errorf("stage record, serial 92.3958: %v, want ErrPlainNumberTime", err)
	}
}

// An exclude cell saying no (FALSE, as a spreadsheet makes a typed false,
// no, n, 0, none) keeps its gauging; any other text leaves it out with
// that reason.
func TestExcludeWordsOfNo(t *testing.T) {
	t.Parallel()
	text := "time,stage (m),discharge (m3/s),exclude\n" +
		"2026-03-02T09:15,1.1,2.5,FALSE\n2026-03-03T09:15,1.2,2.9,no\n2026-03-04T09:15,1.3,3.2,0\n" +
		"2026-03-05T09:15,1.4,3.6,\n2026-03-06T09:15,1.5,4.1, None \n2026-03-07T09:15,1.6,4.4,debris on the weir\n"
	g, err := ParseGaugings(strings.NewReader(text), "g.csv")
	if err != nil {
		t.Fatal(err)
	}
	for i, want := range []string{"", "", "", "", "", "debris on the weir"} {
		if got := g.Gaugings[i].Exclude; got != want {
			t.Errorf("row %d: exclude %q, want %q", i+2, got, want)
		}
	}
}
