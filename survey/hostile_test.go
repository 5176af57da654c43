package survey

import (
	"archive/zip"
	"bytes"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"

	"wetline/subdivide"
)

// Files that are not what they claim to be are refused saying what they
// are, at once, with the file named.
func TestHostileInputs(t *testing.T) {
	dir := t.TempDir()
	write := func(name string, data []byte) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, data, 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	book, err := os.ReadFile("testdata/fuzz/FuzzParseWorkbook/filled-section")
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name string
		data []byte
		want error
	}{
		{"utf16.csv", []byte("\xff\xfes\x00t\x00a\x00t\x00i\x00o\x00n\x00"), ErrUTF16},
		{"utf16-nobom.csv", []byte("s\x00t\x00a\x00t\x00i\x00o\x00n\x00,\x00e\x00"), ErrUTF16},
		{"binary.csv", []byte("station,elevation\n\x00\x01\x02\x03\xfe"), ErrBinary},
		{"tabs.csv", []byte("station\televation\n0\t1\n"), ErrTabs},
		{"book.csv", append([]byte("PK\x03\x04"), book...), ErrWorkbookNamed},
		{"dup.csv", []byte("station,elevation,Station\n0,1,2\n1,0,3\n"), ErrDuplicateColumn},
		{"hex.csv", []byte("station,elevation\n0x1p3,1\n1,0\n"), ErrNotNumber},
		{"firstn.csv", []byte("station,elevation,n\n0,1,\n1,0,0.04\n2,1,\n"), ErrFirstNBlank},
		{"huge.csv", []byte("station,elevation\n0,1e308\n1,0\n"), ErrImplausible},
		{"inf.csv", []byte("station,elevation\n0,1e999\n1,0\n"), subdivide.ErrNotFinite},
	} {
		path := write(c.name, c.data)
		_, err := ReadSection(path, "", SectionOptions{})
		if !errors.Is(err, c.want) || !strings.Contains(err.Error(), c.name) {
			t.Errorf("%s: %v, want %v naming the file", c.name, err, c.want)
		}
	}
}

// A header padded with two thousand commas costs no more than the
// columns used: rows keep only the cells under the named columns.
func TestPaddedHeaderKeepsUsedColumns(t *testing.T) {
	var b strings.Builder
	b.WriteString("station,elevation" + strings.Repeat(",", 2000) + "\n")
	for i := range 1000 {
		b.WriteString("1,2\n")
		_ = i
	}
	tab, err := ParseCSV(strings.NewReader(b.String()), "wide.csv")
	if err != nil {
		t.Fatal(err)
	}
	if len(tab.Header) != 2 {
		t.Errorf("header of %d columns, want the 2 named", len(tab.Header))
	}
	for _, r := range tab.Records {
		if len(r.Cells) > 2 {
			t.Fatalf("row %d holds %d cells", r.Row, len(r.Cells))
		}
	}
}

// Tables beyond the row limit are refused with the limit and how to
// raise it.
func TestRowLimit(t *testing.T) {
	t.Setenv(EnvMaxRows, "100")
	var b strings.Builder
	b.WriteString("station,elevation\n")
	for range 150 {
		b.WriteString("1,2\n")
	}
	_, err := ParseCSV(strings.NewReader(b.String()), "long.csv")
	if !errors.Is(err, ErrTooManyRows) || !strings.Contains(err.Error(), EnvMaxRows) || !strings.Contains(err.Error(), "100 rows") {
		t.Errorf("long table: %v", err)
	}
}

// A stage record is bounded by its own limit of readings, not by the
// table's rows (a decade of readings a minute apart is 5.3 million): beyond
// it the record is refused at the first row over, naming the limit and how
// to raise it, and reading stops there (a workbook sheet is read by the
// same builder).
func TestStageRecordReadingLimit(t *testing.T) {
	t.Setenv(EnvMaxReadings, "100")
	t.Setenv(EnvMaxRows, "10") // the table's limit does not apply
	var b strings.Builder
	b.WriteString("time,stage\n")
	start := time.Date(2024, 1, 1, 0, 0, 0, 0, time.UTC)
	for i := range 150 {
		fmt.Fprintf(&b, "%s,1.5\n", start.Add(time.Duration(i)*time.Minute).Format("2006-01-02T15:04"))
	}
	_, err := ParseStageRecord(strings.NewReader(b.String()), "long.csv", StageRecordOptions{})
	var pe *ParseError
	if !errors.Is(err, ErrTooManyRows) || !errors.As(err, &pe) || pe.Row != 102 || !strings.Contains(err.Error(), EnvMaxReadings) || !strings.Contains(err.Error(), "100 readings") {
		t.Errorf("150 readings over a limit of 100: %v, want ErrTooManyRows at line 102", err)
	}
	t.Setenv(EnvMaxReadings, "150")
	if r, err := ParseStageRecord(strings.NewReader(b.String()), "long.csv", StageRecordOptions{}); err != nil || r.Stages.Len() != 150 {
		t.Errorf("150 readings at the limit: %v", err)
	}
}

// Devices, pipes and folders are refused without reading them; a pipe
// without a writer does not make the reader wait.
func TestSpecialFilesRefused(t *testing.T) {
	if runtime.GOOS == "windows" {
		t.Skip("no devices or pipes")
	}
	dir := t.TempDir()
	fifo := filepath.Join(dir, "pipe.csv")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Skip("no named pipes:", err)
	}
	for _, p := range []string{"/dev/zero", "/dev/urandom", fifo, dir} {
		done := make(chan error, 1)
		go func() { _, err := ReadSection(p, "", SectionOptions{}); done <- err }()
		select {
		case err := <-done:
			if !errors.Is(err, ErrNotRegularInput) {
				t.Errorf("%s: %v, want ErrNotRegularInput", p, err)
			}
		case <-time.After(5 * time.Second):
			t.Fatalf("%s: the reader waits", p)
		}
	}
}

// A file larger than the byte limit is refused before it is read.
func TestByteLimit(t *testing.T) {
	t.Setenv(EnvMaxBytes, "64")
	p := filepath.Join(t.TempDir(), "big.csv")
	if err := os.WriteFile(p, []byte("station,elevation\n"+strings.Repeat("1,2\n", 100)), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := ReadSection(p, "", SectionOptions{}); !errors.Is(err, ErrTooLarge) || !strings.Contains(err.Error(), EnvMaxBytes) {
		t.Errorf("big file: %v", err)
	}
}

// A workbook with a sheet whose rows are out of order is refused.
func TestWorkbookAmbiguities(t *testing.T) {
	for _, c := range []struct {
		seed string
		want error
	}{
		{"rows-out-of-order", ErrRowOrder},
	} {
		data, err := os.ReadFile("testdata/fuzz/FuzzParseWorkbook/" + c.seed)
		if err != nil {
			t.Fatal(err)
		}
		raw := corpusBytes(t, data)
		p := filepath.Join(t.TempDir(), "b.xlsx")
		if err := os.WriteFile(p, raw, 0o644); err != nil {
			t.Fatal(err)
		}
		if _, err := ReadTable(p, ""); !errors.Is(err, c.want) {
			t.Errorf("%s: %v, want %v", c.seed, err, c.want)
		}
	}
}

// corpusBytes decodes a fuzz corpus file holding one []byte value.
func corpusBytes(t *testing.T, data []byte) []byte {
	t.Helper()
	lines := strings.SplitN(string(data), "\n", 3)
	if len(lines) < 2 || lines[0] != "go test fuzz v1" {
		t.Fatal("not a corpus file")
	}
	lit := strings.TrimSuffix(strings.TrimPrefix(lines[1], "[]byte("), ")")
	s, err := strconv.Unquote(lit)
	if err != nil {
		t.Fatal(err)
	}
	return []byte(s)
}

// Text a spreadsheet saves in another encoding, with tabs, with carriage
// returns alone or under Excel's separator hint is refused saying so, at
// the line (and field) where it shows; the hint "sep=," is skipped.
func TestTextEncodingsAndSeparators(t *testing.T) {
	for _, c := range []struct {
		name, text string
		want       error
		row, col   int
	}{
		{"windows-1252 in a note", "station,elevation,note\n0,10,caf\xe9\n5,5,x\n10,10,y\n", ErrNotUTF8, 2, 3},
		{"windows-1252 in the header", "station,\xe9levation\n0,10\n", ErrNotUTF8, 1, 2},
		{"windows-1252 after a quoted comma", "station,elevation,note\n0,10,\"a, b\"\n5,5,\"\xb0\"\n10,10,\n", ErrNotUTF8, 3, 3},
		{"windows-1252 beyond the first 4096 bytes", "station,elevation\n" + strings.Repeat("1,2\n", 1100) + "3,4\xe9\n", ErrNotUTF8, 1102, 2},
		{"tabs", "# survey\nstation\televation\n0\t10\n", ErrTabs, 2, 0},
		{"carriage returns alone", "station,elevation\r0,10\r5,5\r10,10\r", ErrCROnly, 0, 0},
		{"semicolon hint", "sep=;\nstation;elevation\n0;10\n", ErrSeparatorHint, 1, 0},
	} {
		_, err := ParseCSV(strings.NewReader(c.text), "s.csv")
		var pe *ParseError
		if !errors.Is(err, c.want) || !errors.As(err, &pe) || pe.Row != c.row || pe.Column != c.col {
			t.Errorf("%s: %v, want %v at %d:%d", c.name, err, c.want, c.row, c.col)
		}
	}
	for _, text := range []string{"sep=,\nstation,elevation\n0,10\n5,5\n10,10\n", "SEP=,\r\nstation,elevation\r\n0,10\r\n5,5\r\n10,10\r\n"} {
		tab, err := ParseCSV(strings.NewReader(text), "s.csv")
		if err != nil || tab.HeaderRow != 2 || len(tab.Records) != 3 || tab.Records[0].Row != 3 {
			t.Errorf("separator hint %q: %+v, %v; want the header at line 2 and three rows from line 3", text, tab, err)
		}
	}
}

// A limit variable set to a value that is not a whole number above zero is
// an error naming the variable and the value, from EnvLimits and from every
// reader before it reads the file; unset or empty, the default holds.
func TestLimitVariables(t *testing.T) {
	p := filepath.Join(t.TempDir(), "xs.csv")
	if err := os.WriteFile(p, []byte("station,elevation\n0,1\n1,0\n2,1\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	readers := map[string]func() error{
		"ReadTable":   func() error { _, err := ReadTable(p, ""); return err },
		"ReadSection": func() error { _, err := ReadSection(p, "", SectionOptions{}); return err },
		"ParseCSV":    func() error { _, err := ParseCSV(strings.NewReader("station,elevation\n0,1\n"), "s.csv"); return err },
		"ParseWorkbook": func() error {
			_, err := ParseWorkbook(strings.NewReader("PK\x03\x04"), "s.xlsx", "")
			return err
		},
		"ReadStageRecord": func() error {
			_, err := ReadStageRecord(p, StageRecordOptions{})
			return err
		},
	}
	for _, name := range []string{EnvMaxBytes, EnvMaxRows, EnvMaxCells, EnvMaxReadings} {
		for _, value := range []string{"abc", "-1", "0", "1e6", "1.5", " 100", "99999999999999999999"} {
			t.Run(name+"="+value, func(t *testing.T) {
				t.Setenv(name, value)
				want := fmt.Sprintf("%s %q: not a whole number above zero", name, value)
				if _, err := EnvLimits(); !errors.Is(err, ErrLimitValue) || !strings.HasPrefix(err.Error(), want) {
					t.Errorf("EnvLimits: %v, want %s", err, want)
				}
				for r, read := range readers {
					if err := read(); !errors.Is(err, ErrLimitValue) || !strings.HasPrefix(err.Error(), want) {
						t.Errorf("%s: %v, want %s", r, err, want)
					}
				}
			})
		}
	}
	for _, c := range []struct {
		value string
		rows  int
	}{{"", DefaultMaxRows}, {"100", 100}, {"+2000000", 2_000_000}} {
		t.Setenv(EnvMaxRows, c.value)
		l, err := EnvLimits()
		if err != nil || l.Rows != c.rows || l.Bytes != DefaultMaxBytes || l.Cells != DefaultMaxCells {
			t.Errorf("%s=%q: limits %+v, %v; want %d rows", EnvMaxRows, c.value, l, err, c.rows)
		}
	}
}

// A JSON report given where a table belongs is named as JSON, by every
// CSV reader (the in-memory and the streamed); a header that merely starts
// with a bracket is a table.
func TestJSONInput(t *testing.T) {
	dir := t.TempDir()
	for name, text := range map[string]string{
		"object.csv": "{\n  \"units\": \"si\",\n  \"rows\": []\n}\n",
		"array.csv":  "  [{\"stage\": 1}]\n",
		"empty.csv":  "{}",
	} {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		if _, err := ReadTable(p, ""); !errors.Is(err, ErrJSONInput) {
			t.Errorf("%s, table: %v, want ErrJSONInput", name, err)
		}
		if _, err := ReadStageRecord(p, StageRecordOptions{}); !errors.Is(err, ErrJSONInput) {
			t.Errorf("%s, stage record: %v, want ErrJSONInput", name, err)
		}
	}
	tab, err := ParseCSV(strings.NewReader("[m] station,elevation\n0,1\n"), "b.csv")
	if err != nil || tab.Header[0] != "[m] station" {
		t.Errorf("a header starting with a bracket: %v, %v", tab, err)
	}
}

// An OpenDocument spreadsheet, under its own name or renamed .xlsx, is
// named as one, not sent to rename it: its first entry, stored, is its
// mimetype (OASIS OpenDocument 1.2, part 3, 3.3).
func TestOpenDocumentRefused(t *testing.T) {
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	w, err := zw.CreateHeader(&zip.FileHeader{Name: "mimetype", Method: zip.Store})
	if err != nil {
		t.Fatal(err)
	}
	w.Write([]byte("application/vnd.oasis.opendocument.spreadsheet"))
	if w, err = zw.Create("content.xml"); err != nil {
		t.Fatal(err)
	}
	w.Write([]byte("<office:document-content/>"))
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	for _, name := range []string{"xs.ods", "xs.xlsx"} {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, buf.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
		if _, err := ReadTable(p, ""); !errors.Is(err, ErrOpenDocument) {
			t.Errorf("%s: %v, want ErrOpenDocument", name, err)
		}
	}
}

// An Excel 97–2003 workbook (.xls), an OLE2 compound file, is named as
// one whatever its name says, not called UTF-16 text or a damaged zip:
// its first eight bytes are the compound file's signature (Microsoft,
// [MS-CFB] Compound File Binary File Format, section 2.2).
func TestLegacyWorkbookRefused(t *testing.T) {
	head := make([]byte, 512)
	copy(head, []byte{0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1})
	dir := t.TempDir()
	for _, name := range []string{"xs.xls", "xs.csv", "xs.xlsx"} {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, head, 0o644); err != nil {
			t.Fatal(err)
		}
		if _, err := ReadTable(p, ""); !errors.Is(err, ErrLegacyWorkbook) {
			t.Errorf("%s: %v, want ErrLegacyWorkbook", name, err)
		}
	}
	if _, err := ParseStageRecord(bytes.NewReader(head), "record.csv", StageRecordOptions{}); !errors.Is(err, ErrLegacyWorkbook) {
		t.Errorf("a stage record: %v, want ErrLegacyWorkbook", err)
	}
}
