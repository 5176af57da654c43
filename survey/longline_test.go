package survey

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"regexp"
	"runtime"
	"strings"
	"testing"
)

// longLines are CSV tables with one record longer than MaxLineBytes, and
// the line it starts on.
func longLines() []struct {
	name string
	data []byte
	line int
} {
	over := MaxLineBytes + 1
	return []struct {
		name string
		data []byte
		line int
	}{
		{"commas", []byte("time,stage\n2026-06-01T00:00Z,1.2\n" + strings.Repeat(",", over) + "\n"), 3},
		{"long cell", []byte("time,stage,note\n2026-06-01T00:00Z,1.2," + strings.Repeat("x", over) + "\n"), 2},
		{"quoted cell over lines", []byte("# site: invented\ntime,stage,note\n2026-06-01T00:00Z,1.2,\"" +
			strings.Repeat("a line of a note\n", over/17+1) + "\"\n"), 3},
		{"no line end", []byte("time,stage\n" + strings.Repeat("1", over)), 2},
	}
}

// A record longer than MaxLineBytes is refused at the line it starts on,
// by the table reader and by the stage record's stream, before its fields
// are split; a record of MaxLineBytes is read.
func TestLongLineRefused(t *testing.T) {
	dir := t.TempDir()
	for _, c := range longLines() {
		path := filepath.Join(dir, strings.ReplaceAll(c.name, " ", "-")+".csv")
		if err := os.WriteFile(path, c.data, 0o644); err != nil {
			t.Fatal(err)
		}
		_, terr := ReadTable(path, "")
		_, serr := ParseStageRecord(bytes.NewReader(c.data), path, StageRecordOptions{})
		for reader, err := range map[string]error{"table": terr, "stream": serr} {
			var pe *ParseError
			if !errors.Is(err, ErrLongLine) || !errors.As(err, &pe) || pe.File != path || pe.Row != c.line {
				t.Errorf("%s (%s): %v, want ErrLongLine at %s:%d", c.name, reader, err, path, c.line)
			}
		}
	}
	fits := []byte("time,stage,note\n2026-06-01T00:00Z,1.2,\"" + strings.Repeat("x", MaxLineBytes-len("2026-06-01T00:00Z,1.2,\"\"")) + "\"\n")
	tab, err := ParseCSV(bytes.NewReader(fits), "fits.csv")
	if err != nil || len(tab.Records) != 1 {
		t.Errorf("a record of MaxLineBytes: %v, want it read", err)
	}
	if _, err := ParseStageRecord(bytes.NewReader(fits), "fits.csv", StageRecordOptions{}); err != nil {
		t.Errorf("a record of MaxLineBytes (stream): %v, want it read", err)
	}
}

// allocated returns the bytes f allocates.
func allocated(f func()) uint64 {
	var before, after runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&before)
	f()
	runtime.ReadMemStats(&after)
	return after.TotalAlloc - before.TotalAlloc
}

// One line of 16 million commas is refused for the memory of its bytes,
// not of its fields: splitting it took over 50 bytes a comma (24-byte
// field headers, more than once), 2.4 GB for a 30 MB file.
func TestLongLineMemory(t *testing.T) {
	if raceEnabled {
		t.Skip("the race detector's shadow memory inflates allocation; the bound holds for the program as built")
	}
	const size = 16 << 20
	data := []byte("time,stage\n2026-06-01T00:00Z,1.2\n" + strings.Repeat(",", size) + "\n")
	path := filepath.Join(t.TempDir(), "commas.csv")
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	var err error
	table := allocated(func() { _, err = ReadTable(path, "") })
	if !errors.Is(err, ErrLongLine) {
		t.Fatalf("table: %v, want ErrLongLine", err)
	}
	// The file is read whole once; its bytes are all the reader keeps.
	if limit := uint64(2 * len(data)); table > limit {
		t.Errorf("table: allocated %d bytes for a %d-byte file, want at most %d", table, len(data), limit)
	}
	stream := allocated(func() { _, err = ParseStageRecord(bytes.NewReader(data), path, StageRecordOptions{}) })
	if !errors.Is(err, ErrLongLine) {
		t.Fatalf("stream: %v, want ErrLongLine", err)
	}
	// The stream holds a line of at most MaxLineBytes and its buffer.
	if limit := uint64(8 * MaxLineBytes); stream > limit {
		t.Errorf("stream: allocated %d bytes, want at most %d", stream, limit)
	}
}

// A workbook cell, or shared string, with more text than a cell can hold
// (32 767 characters, Microsoft's Excel specifications and limits) is
// refused by the sheet's scan at its row, before the spreadsheet library
// reads it whole (a 400 MB cell took 1.9 GB); a full cell is read.
func TestLongCellRefused(t *testing.T) {
	t.Parallel()
	long := strings.Repeat("&amp;", maxTextRun/5+1)
	for _, c := range []struct {
		name, part, want string
		edit             func(string) string
	}{
		{"inline string", "xl/worksheets/sheet1.xml", "field.xlsx['s'] row 3: ", func(x string) string {
			return regexp.MustCompile(`<c r="C3"[^>]*>(<v>[^<]*</v>)?</c>`).ReplaceAllString(x, `<c r="C3" t="inlineStr"><is><t>`+long+`</t></is></c>`)
		}},
		{"shared string", "xl/sharedStrings.xml", "field.xlsx['s']: ", func(x string) string {
			return strings.Replace(x, "<t>n</t>", "<t>"+long+"</t>", 1)
		}},
	} {
		path := writeBook(t, t.TempDir(), map[string][][]any{"s": {{"station", "elevation", "n"}, {0, 104, 0.04}, {10, 100, 0.04}, {20, 101, 0.04}}}, []string{"s"})
		data := rewriteZip(t, readFile(t, path), func(name string, b []byte) []byte {
			if name == c.part {
				edited := c.edit(string(b))
				if edited == string(b) {
					t.Fatalf("%s: %s not edited", c.name, name)
				}
				return []byte(edited)
			}
			return b
		})
		if err := os.WriteFile(path, data, 0o644); err != nil {
			t.Fatal(err)
		}
		_, err := ReadTable(path, "s")
		if !errors.Is(err, ErrLongCell) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %v, want ErrLongCell at %q", c.name, err, c.want)
		}
	}
	full := strings.Repeat("é", 32767)
	path := writeBook(t, t.TempDir(), map[string][][]any{"s": {{"station", "elevation", "note"}, {0, 104, full}, {10, 100, "<&>" + full[:1000]}}}, []string{"s"})
	tab, err := ReadTable(path, "s")
	if err != nil || len(tab.Records) != 2 || tab.Records[0].Cells[2] != full {
		t.Errorf("a cell of 32 767 characters: %v, want it read", err)
	}
}
