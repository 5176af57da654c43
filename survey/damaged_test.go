package survey

import (
	"archive/zip"
	"bytes"
	"errors"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// damageSheet rewrites the workbook at path, passing the XML of its first
// sheet's part through edit.
func damageSheet(t *testing.T, path string, edit func(xml string) string) {
	t.Helper()
	data := rewriteZip(t, readFile(t, path), func(name string, b []byte) []byte {
		if name == "xl/worksheets/sheet1.xml" {
			return []byte(edit(string(b)))
		}
		return b
	})
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
}

// rowStart is the start of row r's element as the spreadsheet library
// writes it.
func rowStart(xml string, r string) int {
	return strings.Index(xml, `<row r="`+r+`"`)
}

// Every reader of a workbook sheet refuses a sheet whose XML does not
// parse to its end, naming the row after which it is damaged: the
// spreadsheet library stops at the damage without a word, so the rows
// after it were lost and the numbers read from the rest were wrong (a
// rating of 8 of 9 points; a record of 1000 of 2000 readings).
func TestDamagedSheetXMLRefused(t *testing.T) {
	t.Parallel()
	damages := []struct {
		name string
		edit func(xml string) string
	}{
		{"cut short", func(x string) string { return x[:rowStart(x, "5")] }},
		{"cut inside a row", func(x string) string { return x[:rowStart(x, "5")+30] }},
		{"garbage", func(x string) string { i := rowStart(x, "5"); return x[:i] + "<<<&&& garbage" + x[i:] }},
		{"undefined entity", func(x string) string { i := rowStart(x, "5"); return x[:i] + "&lol;" + x[i:] }},
	}
	readers := []struct {
		kind string
		rows [][]any
		read func(path string) error
	}{
		{"section", [][]any{{"station", "elevation", "n"}, {0, 104, 0.04}, {10, 101, 0.04}, {20, 100, 0.04}, {30, 101, 0.04}, {40, 104, 0.04}, {50, 105, 0.04}},
			func(p string) error { _, err := ReadSection(p, "s", SectionOptions{}); return err }},
		{"gaugings", [][]any{{"time", "stage", "discharge"}, {"2024-01-01", 1.0, 2.0}, {"2024-02-01", 1.2, 3.0}, {"2024-03-01", 1.4, 4.5}, {"2024-04-01", 1.6, 6.0}, {"2024-05-01", 1.8, 8.0}},
			func(p string) error { _, err := ReadGaugings(p, "s"); return err }},
		{"reach", [][]any{{"section", "survey", "distance", "ws_left", "ws_right"}, {"XS1", "xs.csv", 0, 11.0, 11.0}, {"XS2", "xs.csv", 100, 10.9, 10.9}, {"XS3", "xs.csv", 200, 10.8, 10.8}, {"XS4", "xs.csv", 300, 10.7, 10.7}, {"XS5", "xs.csv", 400, 10.6, 10.6}},
			func(p string) error { _, err := ReadReach(p, "s", SectionOptions{}); return err }},
		{"rating table", [][]any{{"stage", "discharge"}, {0.5, 1.0}, {1.0, 3.0}, {1.5, 7.0}, {2.0, 12.0}, {2.5, 20.0}},
			func(p string) error { _, err := ReadRatingTables(p, RatingTableOptions{Sheet: "s"}); return err }},
		{"stage record", [][]any{{"time", "stage"}, {"2024-01-01T00:00:00Z", 1.0}, {"2024-01-01T01:00:00Z", 1.1}, {"2024-01-01T02:00:00Z", 1.2}, {"2024-01-01T03:00:00Z", 1.3}, {"2024-01-01T04:00:00Z", 1.4}},
			func(p string) error { _, err := ReadStageRecord(p, StageRecordOptions{Sheet: "s"}); return err }},
	}
	for _, rd := range readers {
		for _, d := range damages {
			dir := t.TempDir()
			if err := os.WriteFile(filepath.Join(dir, "xs.csv"), []byte(reachSurveyCSV), 0o644); err != nil {
				t.Fatal(err)
			}
			path := writeBook(t, dir, map[string][][]any{"s": rd.rows}, []string{"s"})
			if err := rd.read(path); err != nil {
				t.Fatalf("%s: the whole sheet: %v", rd.kind, err)
			}
			damageSheet(t, path, d.edit)
			err := rd.read(path)
			if !errors.Is(err, ErrWorkbookDamaged) || !strings.Contains(err.Error(), "field.xlsx['s']: the sheet's XML is damaged after row 4") || strings.Contains(err.Error(), "\n") {
				t.Errorf("%s, %s: %v, want ErrWorkbookDamaged after row 4 on one line", rd.kind, d.name, err)
			}
		}
	}
}

// A text cell must name a string of the shared string table by its
// number: out of the table, negative or not a whole number, the
// spreadsheet library read it as blank (an n carried down from the row
// above) or as the first string, so it is refused at its cell.
func TestSharedStringOutOfTable(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct{ cell, value, want string }{
		{`<c r="C4" t="s"><v>99999</v></c>`, "C4", "refers to string 99999, and the table holds 3"},
		{`<c r="C4" t="s"><v>3</v></c>`, "C4", "refers to string 3, and the table holds 3"},
		{`<c r="B4" t="s"><v>-1</v></c>`, "B4", `its value "-1" is not a string's number`},
		{`<c r="B4" t="s"><v>1e300</v></c>`, "B4", `its value "1e300" is not a string's number`},
		{`<c r="B4" t="s"><v>0.5</v></c>`, "B4", `its value "0.5" is not a string's number`},
		{`<c r="B4" t="s"><v></v></c>`, "B4", `its value "" is not a string's number`},
		{`<c r="B4" t="s"/>`, "", ""},
	} {
		path := writeBook(t, t.TempDir(), map[string][][]any{"s": {{"station", "elevation", "n"}, {0, 104, 0.04}, {10, 100, 0.04}, {20, 101, 0.04}, {30, 104, 0.05}}}, []string{"s"})
		col := tc.cell[len(`<c r="`) : len(`<c r="`)+2]
		damageSheet(t, path, func(x string) string {
			return regexp.MustCompile(`<c r="`+col+`"[^>]*>(<v>[^<]*</v>)?</c>`).ReplaceAllString(x, tc.cell)
		})
		_, err := ReadSection(path, "s", SectionOptions{})
		if tc.value == "" { // an empty cell is blank, as written
			if errors.Is(err, ErrSharedString) {
				t.Errorf("%s: %v", tc.cell, err)
			}
			continue
		}
		if !errors.Is(err, ErrSharedString) || !strings.Contains(err.Error(), "field.xlsx['s']!"+tc.value+": ") || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: %v, want ErrSharedString at %s saying %q", tc.cell, err, tc.value, tc.want)
		}
	}
}

// Cells repeated or out of order in a row, and a row numbered beyond a
// sheet's last, are refused naming the reference written in the file;
// the spreadsheet library shifted such cells and blamed a cell the file
// does not hold (D5), or the row it counted (row 10).
func TestCellOrderAndRowNumberNamed(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name, from, to, want string
		cause                error
	}{
		{"repeated", `<c r="C3"`, `<c r="B3"><v>50</v></c><c r="C3"`, "field.xlsx['s']!B3: a row's cells are out of order or repeated: the cell B3 is written after B3", ErrCellOrder},
		{"swapped", `<c r="A3"><v>10</v></c><c r="B3"><v>100</v></c>`, `<c r="B3"><v>100</v></c><c r="A3"><v>10</v></c>`, "field.xlsx['s']!A3: a row's cells are out of order or repeated: the cell A3 is written after B3", ErrCellOrder},
		{"row beyond the last", `</sheetData>`, `<row r="2000000000"><c r="A2000000000"><v>1</v></c></row></sheetData>`, "field.xlsx['s'] row 2000000000: a row number beyond the last row of a sheet (row 2000000000 after row 5", ErrRowNumber},
	} {
		path := writeBook(t, t.TempDir(), map[string][][]any{"s": {{"station", "elevation", "n"}, {0, 104, 0.04}, {10, 100, 0.04}, {20, 101, 0.04}, {30, 104, 0.05}}}, []string{"s"})
		damageSheet(t, path, func(x string) string {
			if !strings.Contains(x, tc.from) {
				t.Fatalf("%s: no %s in %s", tc.name, tc.from, x)
			}
			return strings.Replace(x, tc.from, tc.to, 1)
		})
		_, err := ReadSection(path, "s", SectionOptions{})
		if !errors.Is(err, tc.cause) || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: %v, want %q", tc.name, err, tc.want)
		}
	}
}

// addZipEntries returns the zip archive data with the entries added.
func addZipEntries(t *testing.T, data []byte, entries map[string]string) []byte {
	t.Helper()
	keep := func(_ string, b []byte) []byte { return b }
	return editZip(t, data, "", "", keep, entries)
}

// A workbook taking a value from another workbook ([1]Sheet1!A1) holds
// the value as it was last saved: every reader warns of it once, naming
// the linked file, which is never opened.
func TestExternalLinkWarned(t *testing.T) {
	t.Parallel()
	path := writeBook(t, t.TempDir(), map[string][][]any{
		"s": {{"station", "elevation", "n"}, {0, 104, 0.04}, {10, 100, 0.04}, {20, 101, 0.04}, {30, 104, 0.05}},
		"r": {{"time", "stage"}, {"2024-01-01T00:00:00Z", 1.0}, {"2024-01-01T01:00:00Z", 1.1}},
	}, []string{"s", "r"})
	data := addZipEntries(t, readFile(t, path), map[string]string{
		"xl/externalLinks/externalLink1.xml": `<?xml version="1.0"?><externalLink xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><externalBook/></externalLink>`,
		"xl/externalLinks/_rels/externalLink1.xml.rels": `<?xml version="1.0"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">` +
			`<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/externalLinkPath" Target="file:///C:/surveys/upstream.xlsx" TargetMode="External"/></Relationships>`,
	})
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	want := "field.xlsx: the workbook takes values from other workbooks (file:///C:/surveys/upstream.xlsx): they are read as last saved"
	sv, err := ReadSection(path, "s", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	rec, err := ReadStageRecord(path, StageRecordOptions{Sheet: "r"})
	if err != nil {
		t.Fatal(err)
	}
	for what, ws := range map[string][]string{"section": sv.Warnings, "stage record": rec.Warnings} {
		n := 0
		for _, w := range ws {
			if strings.Contains(w, want) {
				n++
			}
		}
		if n != 1 {
			t.Errorf("%s: warnings %q, want %q once", what, ws, want)
		}
	}
}

// A sheet part that cannot be unpacked (here its checksum is wrong) is a
// damaged zip (ErrWorkbookZip), not damaged XML, though its XML is cut
// where the unpacking fails.
func TestUnpackErrorIsNotXMLDamage(t *testing.T) {
	t.Parallel()
	path := writeBook(t, t.TempDir(), map[string][][]any{"s": {{"station", "elevation", "n"}, {0, 104, 0.04}, {10, 100, 0.04}, {20, 104, 0.04}}}, []string{"s"})
	data := readFile(t, path)
	zr, err := zip.NewReader(bytes.NewReader(data), int64(len(data)))
	if err != nil {
		t.Fatal(err)
	}
	var out bytes.Buffer
	zw := zip.NewWriter(&out)
	for _, zf := range zr.File {
		if zf.Name != "xl/worksheets/sheet1.xml" {
			if err := zw.Copy(zf); err != nil {
				t.Fatal(err)
			}
			continue
		}
		rc, err := zf.Open()
		if err != nil {
			t.Fatal(err)
		}
		b, _ := io.ReadAll(rc)
		rc.Close()
		w, err := zw.CreateRaw(&zip.FileHeader{Name: zf.Name, Method: zip.Store, CRC32: zf.CRC32 ^ 1,
			CompressedSize64: uint64(len(b)), UncompressedSize64: uint64(len(b))})
		if err != nil {
			t.Fatal(err)
		}
		w.Write(b)
	}
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, out.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	_, err = ReadSection(path, "s", SectionOptions{})
	if !errors.Is(err, ErrWorkbookZip) || errors.Is(err, ErrWorkbookDamaged) {
		t.Errorf("%v, want ErrWorkbookZip alone", err)
	}
}
