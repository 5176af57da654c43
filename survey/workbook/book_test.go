package workbook

import (
	"bytes"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// A note of a thousand characters in a narrow column wants a row taller
// than the file format allows (409 points): the row is capped and the
// workbook written, the note kept whole.
func TestLongNoteRowCapped(t *testing.T) {
	b := NewBook()
	defer b.Close()
	s, err := b.Table("notes", []Column{{Name: "note", Width: 10}})
	if err != nil {
		t.Fatal(err)
	}
	note := strings.Repeat("washed-out bank pin ", 60)
	if err := s.Row(note); err != nil {
		t.Fatal(err)
	}
	if err := s.Flush(); err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := b.Write(&buf); err != nil {
		t.Fatalf("workbook with a long note: %v", err)
	}
	f, err := excelize.OpenReader(&buf)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if v, _ := f.GetCellValue("notes", "A2"); v != note {
		t.Errorf("note cut to %d characters", len(v))
	}
	if h, _ := f.GetRowHeight("notes", 2); h > MaxRowHeight {
		t.Errorf("row height %g above %d", h, MaxRowHeight)
	}
}
