package survey

import (
	"archive/zip"
	"bytes"
	"errors"
	"io"
	"maps"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// formulaBook writes a workbook whose sheet "xs" holds a survey with a
// formula in B3 (=A3*2, written without a saved value, as a program that
// does not compute formulas writes it), sheet "stages" a stage record with
// a formula in B2, and sheet "clean" a survey without formulas. With saved
// true the formulas' values are written too (B3 = 2, B2 = 1.5), as a
// spreadsheet program saves them.
func formulaBook(t *testing.T, saved bool) string {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	f.SetSheetName("Sheet1", "xs")
	f.NewSheet("stages")
	f.NewSheet("clean")
	for _, s := range []string{"xs", "clean"} {
		f.SetSheetRow(s, "A1", &[]any{"station", "elevation"})
		f.SetSheetRow(s, "A2", &[]any{0, 3})
		f.SetSheetRow(s, "A3", &[]any{1})
		f.SetSheetRow(s, "A4", &[]any{2, 3})
	}
	f.SetCellValue("clean", "B3", 0)
	f.SetSheetRow("stages", "A1", &[]any{"time", "stage"})
	f.SetSheetRow("stages", "A2", &[]any{"2024-01-01T00:00:00Z"})
	f.SetSheetRow("stages", "A3", &[]any{"2024-01-01T01:00:00Z", 1.6})
	if err := f.SetCellFormula("xs", "B3", "A3*2"); err != nil {
		t.Fatal(err)
	}
	if err := f.SetCellFormula("stages", "B2", "1.5"); err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		t.Fatal(err)
	}
	data := buf.Bytes()
	if saved {
		data = rewriteZip(t, data, func(name string, b []byte) []byte {
			b = bytes.Replace(b, []byte("<f>A3*2</f>"), []byte("<f>A3*2</f><v>2</v>"), 1)
			return bytes.Replace(b, []byte("<f>1.5</f>"), []byte("<f>1.5</f><v>1.5</v>"), 1)
		})
	}
	path := filepath.Join(t.TempDir(), "field.xlsx")
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// rewriteZip returns the zip archive data with every entry passed through
// edit.
func rewriteZip(t *testing.T, data []byte, edit func(name string, b []byte) []byte) []byte {
	t.Helper()
	return renameZip(t, data, "", "", edit)
}

// renameZip returns the zip archive data with the entry from renamed to
// to and every entry passed through edit.
func renameZip(t *testing.T, data []byte, from, to string, edit func(name string, b []byte) []byte) []byte {
	t.Helper()
	return editZip(t, data, from, to, edit, nil)
}

// editZip returns the zip archive data with the entry from renamed to
// to, every entry passed through edit, and the entries added (in name
// order).
func editZip(t *testing.T, data []byte, from, to string, edit func(name string, b []byte) []byte, added map[string]string) []byte {
	t.Helper()
	zr, err := zip.NewReader(bytes.NewReader(data), int64(len(data)))
	if err != nil {
		t.Fatal(err)
	}
	var out bytes.Buffer
	zw := zip.NewWriter(&out)
	for _, zf := range zr.File {
		rc, err := zf.Open()
		if err != nil {
			t.Fatal(err)
		}
		b, err := io.ReadAll(rc)
		rc.Close()
		if err != nil {
			t.Fatal(err)
		}
		name := zf.Name
		if name == from {
			name = to
		}
		w, err := zw.Create(name)
		if err != nil {
			t.Fatal(err)
		}
		w.Write(edit(zf.Name, b))
	}
	for _, name := range slices.Sorted(maps.Keys(added)) {
		w, err := zw.Create(name)
		if err != nil {
			t.Fatal(err)
		}
		w.Write([]byte(added[name]))
	}
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	return out.Bytes()
}

// A formula cell with no saved value is an error at the cell in every
// reader of a sheet (it would read as blank); the other sheets of the
// workbook still read, and so does the formula once its value is saved.
func TestFormulaWithoutSavedValue(t *testing.T) {
	t.Parallel()
	unsaved, saved := formulaBook(t, false), formulaBook(t, true)
	for _, tc := range []struct {
		name string
		read func(path string) error
		at   string // where the unsaved formula is, "" when none is read
	}{
		{"table", func(p string) error { return tableSection(ReadTable(p, "xs")) }, "field.xlsx['xs']!B3: elevation"},
		{"first sheet", func(p string) error { return tableSection(ReadTable(p, "")) }, "field.xlsx['xs']!B3: elevation"},
		{"section", func(p string) error { _, err := ReadSection(p, "xs", SectionOptions{}); return err }, "field.xlsx['xs']!B3: elevation"},
		{"stage record", func(p string) error { _, err := ReadStageRecord(p, StageRecordOptions{Sheet: "stages"}); return err }, "field.xlsx['stages']!B2: stage"},
		{"another sheet", func(p string) error { _, err := ReadSection(p, "clean", SectionOptions{}); return err }, ""},
		{"from bytes", func(p string) error {
			f, err := os.Open(p)
			if err != nil {
				return err
			}
			defer f.Close()
			return tableSection(ParseWorkbook(f, "field.xlsx", "xs"))
		}, "field.xlsx['xs']!B3: elevation"},
	} {
		err := tc.read(unsaved)
		switch {
		case tc.at == "" && err != nil:
			t.Errorf("%s: %v", tc.name, err)
		case tc.at != "" && (!errors.Is(err, ErrFormulaNoValue) || !strings.Contains(err.Error(), tc.at+": a formula with no saved value: open and save the workbook in a spreadsheet program")):
			t.Errorf("%s: %v, want ErrFormulaNoValue at %s", tc.name, err, tc.at)
		}
		if err := tc.read(saved); err != nil {
			t.Errorf("%s, values saved: %v", tc.name, err)
		}
	}
	sv, err := ReadSection(saved, "xs", SectionOptions{})
	if err != nil || sv.Section.Points[1].Elevation != 2 {
		t.Errorf("saved formula read as %+v, %v; want the elevation 2", sv.Section.Points, err)
	}
}

// A formula whose saved value is empty (<v></v>, <v/>, as a program that
// writes formulas without computing them may leave it) has no saved
// value; a text formula's empty value (t="str", the result "") is one.
func TestFormulaEmptyValue(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name, cell string
		unsaved    bool
	}{
		{"empty element", `<c r="B3"><f>A3*2</f><v></v></c>`, true},
		{"empty tag", `<c r="B3"><f>A3*2</f><v/></c>`, true},
		{"spaces", `<c r="B3"><f>A3*2</f><v> </v></c>`, true},
		{"value", `<c r="B3"><f>A3*2</f><v>2</v></c>`, false},
		{"empty text result", `<c r="B3" t="str"><f>""</f><v></v></c>`, false},
	} {
		data := rewriteZip(t, readFile(t, formulaBook(t, false)), func(name string, b []byte) []byte {
			if name != "xl/worksheets/sheet1.xml" {
				return b
			}
			i, j := bytes.Index(b, []byte(`<c r="B3"`)), bytes.Index(b, []byte(`<f>A3*2</f>`))
			if i < 0 || j < 0 {
				t.Fatalf("no formula in %s", b)
			}
			end := j + bytes.Index(b[j:], []byte("</c>")) + len("</c>")
			return append(append(append([]byte(nil), b[:i]...), tc.cell...), b[end:]...)
		})
		err := tableSection(ParseWorkbook(bytes.NewReader(data), "field.xlsx", "xs"))
		switch {
		case tc.unsaved && (!errors.Is(err, ErrFormulaNoValue) || !strings.Contains(err.Error(), "field.xlsx['xs']!B3: elevation: a formula with no saved value")):
			t.Errorf("%s: %v, want ErrFormulaNoValue at B3", tc.name, err)
		case !tc.unsaved && errors.Is(err, ErrFormulaNoValue):
			t.Errorf("%s: %v", tc.name, err) // an empty text result reads blank: another error, if any
		}
	}
}

// tableSection reads a survey from a table read (or its error).
func tableSection(t *Table, err error) error {
	if err != nil {
		return err
	}
	_, err = SectionFromTable(t, SectionOptions{})
	return err
}

func readFile(t *testing.T, path string) []byte {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// FuzzScanSheet feeds worksheet XML to the scan that checks row order and
// finds formulas with no saved value: no panic, errors are ErrRowOrder or
// ErrWorkbookZip, and a cell found lies on the sheet.
func FuzzScanSheet(f *testing.F) {
	for _, s := range []string{
		`<worksheet><sheetData><row r="1"><c r="A1" t="s"><v>0</v></c><c r="B1"><f>A1*2</f></c></row></sheetData></worksheet>`,
		`<x:worksheet xmlns:x="m"><x:sheetData><x:row><x:c><x:f t="shared" si="0"/></x:c><x:c/></x:row><x:row r="3"><x:c r="C3"><x:f>1</x:f><x:v></x:v></x:c></x:row></x:sheetData></x:worksheet>`,
		`<row r="2"></row><row r="2"></row>`,
		`<c r="XFD1048576"><f>1</f></c><c r='A0'><f/></c><!-- <c><f>1</f></c> --><?xml version="1.0"?>`,
		`<c r="A1" ` + strings.Repeat("s=\"1\" ", 200) + `><f>1</f></c>`,
		`<row r="1"><c r="A1" s="2"><v>46174</v></c><c r="B1" s="1"><v>0.05</v></c></row><row r="2"><c r="A2" s="2"><v>46175.5</v></c></row><row r="4"><c r="A4" s="2"/></row>`,
		// Formulas with an empty value: empty, a tag alone, spaces, a text
		// result, a value cut off at the end of the part.
		`<row r="12"><c r="C12"><f>B12*10</f><v></v></c><c r="D12"><f>1</f><v/></c><c r="E12"><f>1</f><v xml:space="preserve">  </v></c></row>`,
		`<row r="1"><c r="A1" t="str"><f>""</f><v></v></c><c r="B1"><f>1</f><v>`,
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, sheet []byte) {
		var buf bytes.Buffer
		zw := zip.NewWriter(&buf)
		w, err := zw.CreateHeader(&zip.FileHeader{Name: "xl/worksheets/sheet1.xml", Method: zip.Store})
		if err != nil {
			t.Fatal(err)
		}
		w.Write(sheet)
		if err := zw.Close(); err != nil {
			t.Fatal(err)
		}
		zr, err := zip.NewReader(bytes.NewReader(buf.Bytes()), int64(buf.Len()))
		if err != nil {
			t.Fatal(err)
		}
		sc, err := scanSheet(zr.File[0], bookFacts{styles: map[int64]cellMark{1: markPercent, 2: markDate}, strings: 3})
		if err != nil {
			known := false
			for _, cause := range []error{ErrRowOrder, ErrWorkbookZip, ErrWorkbookDamaged, ErrCellOrder, ErrRowNumber, ErrSharedString} {
				known = known || errors.Is(err, cause)
			}
			if !known {
				t.Fatalf("error %v is none of the scan's causes", err)
			}
			return
		}
		for at := range sc.marks {
			if at.row < 1 || at.col < 1 {
				t.Fatalf("a cell marked at row %d column %d", at.row, at.col)
			}
		}
		for what, cells := range map[string]cellRuns{"date": sc.dates, "unsaved": sc.unsaved} {
			for col, runs := range cells {
				for i, r := range runs {
					if col < 1 || r.first < 1 || r.last < r.first || (i > 0 && r.first <= runs[i-1].last+1) {
						t.Fatalf("%s cells of column %d in runs %v", what, col, runs)
					}
				}
			}
		}
	})
}

// Each sheet is scanned when it is read: a sheet whose rows are out of
// order is refused at that sheet, and the other sheets of the workbook
// still read.
func TestRowOrderPerSheet(t *testing.T) {
	t.Parallel()
	f := excelize.NewFile()
	defer f.Close()
	f.SetSheetName("Sheet1", "good")
	f.NewSheet("bad")
	for _, s := range []string{"good", "bad"} {
		f.SetSheetRow(s, "A1", &[]any{"station", "elevation"})
		f.SetSheetRow(s, "A2", &[]any{0, 3})
		f.SetSheetRow(s, "A3", &[]any{1, 0})
		f.SetSheetRow(s, "A4", &[]any{2, 3})
	}
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		t.Fatal(err)
	}
	data := rewriteZip(t, buf.Bytes(), func(name string, b []byte) []byte {
		if name != "xl/worksheets/sheet2.xml" {
			return b
		}
		return bytes.Replace(b, []byte(`<row r="4"`), []byte(`<row r="2"`), 1)
	})
	p := filepath.Join(t.TempDir(), "two.xlsx")
	if err := os.WriteFile(p, data, 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := ReadSection(p, "good", SectionOptions{}); err != nil {
		t.Errorf("good sheet: %v", err)
	}
	_, err := ReadSection(p, "bad", SectionOptions{})
	var pe *ParseError
	if !errors.Is(err, ErrRowOrder) || !errors.As(err, &pe) || pe.Row != 2 || !strings.Contains(err.Error(), "two.xlsx['bad'] row 2: ") {
		t.Errorf("bad sheet: %v, want ErrRowOrder at two.xlsx['bad'] row 2", err)
	}
	if err := checkWorkbookZip(bytes.NewReader(data), int64(len(data))); !errors.Is(err, ErrRowOrder) {
		t.Errorf("checkWorkbookZip: %v, want ErrRowOrder", err)
	}
}

// BenchmarkSmallSheetBesideLarge reads a 3-row sheet of a workbook whose
// other sheet holds 200 000 rows: only the sheet read is scanned.
func BenchmarkSmallSheetBesideLarge(b *testing.B) {
	f := excelize.NewFile()
	defer f.Close()
	f.SetSheetName("Sheet1", "xs")
	f.SetSheetRow("xs", "A1", &[]any{"station", "elevation"})
	f.SetSheetRow("xs", "A2", &[]any{0, 3})
	f.SetSheetRow("xs", "A3", &[]any{1, 0})
	f.SetSheetRow("xs", "A4", &[]any{2, 3})
	f.NewSheet("big")
	sw, err := f.NewStreamWriter("big")
	if err != nil {
		b.Fatal(err)
	}
	for i := 1; i <= 200_000; i++ {
		cell, _ := excelize.CoordinatesToCellName(1, i)
		if err := sw.SetRow(cell, []any{i, 0.5}); err != nil {
			b.Fatal(err)
		}
	}
	if err := sw.Flush(); err != nil {
		b.Fatal(err)
	}
	p := filepath.Join(b.TempDir(), "big.xlsx")
	if err := f.SaveAs(p); err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		if _, err := ReadSection(p, "xs", SectionOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

// unsavedBook writes a workbook of one sheet "xs": the rows given (from
// A1), and a formula with no saved value in each cell of formulas (its
// value dropped, as a program that does not compute formulas leaves it).
func unsavedBook(t *testing.T, rows [][]any, formulas ...string) []byte {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	f.SetSheetName("Sheet1", "xs")
	for i, r := range rows {
		cell, _ := excelize.CoordinatesToCellName(1, i+1)
		f.SetSheetRow("xs", cell, &r)
	}
	for _, c := range formulas {
		if err := f.SetCellFormula("xs", c, "A2*2"); err != nil {
			t.Fatal(err)
		}
	}
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		t.Fatal(err)
	}
	return rewriteZip(t, buf.Bytes(), func(name string, b []byte) []byte {
		return regexp.MustCompile(`<f>A2\*2</f><v>[^<]*</v>`).ReplaceAll(b, []byte("<f>A2*2</f>"))
	})
}

// A formula with no saved value matters only where it is read: in a
// column the reader reads it is refused at its cell, the column named
// (it would read as blank: an elevation lost, an n carried from the row
// above, a bank mark gone); in a column it ignores (a crew's check or
// notes) or beyond the header it is of no matter. In the header or the
// site block above it, both read, it is refused.
func TestFormulaOnlyInColumnsRead(t *testing.T) {
	t.Parallel()
	survey := [][]any{
		{"station", "elevation", "n", "mark", "note", "notes", "check"},
		{0, 3.2, 0.040, "lb", "pin"}, {1, 2.1}, {2, 2.0}, {3, 3.1, nil, "rb"},
	}
	coords := [][]any{
		{"easting", "northing", "elevation", "check"},
		{500, 700, 3.2}, {501, 700, 2.1}, {502, 700, 2.0}, {503, 700, 3.1},
	}
	gaugings := [][]any{
		{"time", "stage", "discharge", "crew"},
		{"2024-03-01T10:00:00Z", 1.2, 3.4}, {"2024-03-02T10:00:00Z", 1.5, 5.1},
	}
	sited := append([][]any{{"site", nil}}, survey...)
	parse := func(data []byte) error {
		_, err := ParseWorkbook(bytes.NewReader(data), "field.xlsx", "xs")
		return err
	}
	section := func(data []byte) error {
		_, err := SectionFromTable(mustTable(t, data), SectionOptions{})
		return err
	}
	for _, tc := range []struct {
		name     string
		rows     [][]any
		formulas []string
		read     func([]byte) error
		at       string // where the error is, "" when the sheet reads
	}{
		{"station", append(slices.Clone(survey), []any{nil}), []string{"A6"}, section, "A6: station"}, // a row otherwise blank: a point lost
		{"elevation", survey, []string{"B3"}, section, "B3: elevation"},
		{"n carried", survey, []string{"C3"}, section, "C3: n"},
		{"mark", survey, []string{"D4"}, section, "D4: mark"},
		{"note", survey, []string{"E3"}, section, "E3: note"},
		{"first of two read", survey, []string{"D5", "C4", "G2"}, section, "C4: n: a formula with no saved value: open and save the workbook in a spreadsheet program (2 such cells in the columns read)"},
		{"notes ignored", survey, []string{"F3", "F4", "F5"}, section, ""},
		{"check ignored", survey, []string{"G2", "G3", "G4", "G5"}, section, ""},
		{"beyond the header", survey, []string{"J3"}, section, ""},
		{"header", survey, []string{"H1"}, parse, "H1: a formula with no saved value"},
		{"site block", sited, []string{"B1"}, parse, "B1: a formula with no saved value"},
		{"easting", append(slices.Clone(coords), []any{nil}), []string{"A6"}, section, "A6: easting"},
		{"northing", coords, []string{"B3"}, section, "B3: northing"},
		{"coordinate check ignored", coords, []string{"D3", "D4"}, section, ""},
		{"gauged stage", gaugings, []string{"B3"}, func(data []byte) error { _, err := GaugingsFromTable(mustTable(t, data)); return err }, "B3: stage"},
		{"gauging crew ignored", gaugings, []string{"D2"}, func(data []byte) error { _, err := GaugingsFromTable(mustTable(t, data)); return err }, ""},
	} {
		data := unsavedBook(t, tc.rows, tc.formulas...)
		err := tc.read(data)
		switch {
		case tc.at == "" && err != nil:
			t.Errorf("%s: %v", tc.name, err)
		case tc.at != "" && (!errors.Is(err, ErrFormulaNoValue) || !strings.Contains(err.Error(), "field.xlsx['xs']!"+tc.at)):
			t.Errorf("%s: %v, want ErrFormulaNoValue at %s", tc.name, err, tc.at)
		}
	}
}

// mustTable reads the sheet "xs" of a workbook as field.xlsx.
func mustTable(t *testing.T, data []byte) *Table {
	t.Helper()
	tb, err := ParseWorkbook(bytes.NewReader(data), "field.xlsx", "xs")
	if err != nil {
		t.Fatal(err)
	}
	return tb
}

// A stage record reads a formula with no saved value as the tables do:
// refused in its time, stage and quality columns, of no matter in another.
func TestStageRecordFormulaColumns(t *testing.T) {
	t.Parallel()
	rows := [][]any{{"time", "stage", "logger"}, {"2024-03-01T10:00:00Z", 1.2}, {"2024-03-01T11:00:00Z", 1.3}}
	for _, tc := range []struct {
		cell, at string
	}{
		{"C2", ""},
		{"B3", "B3: stage"},
	} {
		path := filepath.Join(t.TempDir(), "field.xlsx")
		if err := os.WriteFile(path, unsavedBook(t, rows, tc.cell), 0o644); err != nil {
			t.Fatal(err)
		}
		_, err := ReadStageRecord(path, StageRecordOptions{})
		switch {
		case tc.at == "" && err != nil:
			t.Errorf("%s: %v", tc.cell, err)
		case tc.at != "" && (!errors.Is(err, ErrFormulaNoValue) || !strings.Contains(err.Error(), "field.xlsx['xs']!"+tc.at)):
			t.Errorf("%s: %v, want ErrFormulaNoValue at %s", tc.cell, err, tc.at)
		}
	}
}
