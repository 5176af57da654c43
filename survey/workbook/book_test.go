package workbook

import (
	"archive/zip"
	"bytes"
	"strings"
	"testing"
	"time"

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

// TestEntriesDated: every part of a written workbook carries a real
// MS-DOS date (month and day from 1; PKWARE APPNOTE.TXT, section 4.4.6,
// from memory), 1980-01-01 00:00.
func TestEntriesDated(t *testing.T) {
	write := func() []byte {
		b := NewBook()
		defer b.Close()
		s, err := b.Table("t", []Column{{Name: "stage"}})
		if err != nil {
			t.Fatal(err)
		}
		if err := s.Row(1.25); err != nil {
			t.Fatal(err)
		}
		if err := s.Flush(); err != nil {
			t.Fatal(err)
		}
		var buf bytes.Buffer
		if err := b.Write(&buf); err != nil {
			t.Fatal(err)
		}
		return buf.Bytes()
	}
	data := write()
	z, err := zip.NewReader(bytes.NewReader(data), int64(len(data)))
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range z.File {
		month, day := f.ModifiedDate>>5&0xf, f.ModifiedDate&0x1f
		if month < 1 || day < 1 || !f.Modified.Equal(time.Date(1980, 1, 1, 0, 0, 0, 0, time.UTC)) {
			t.Errorf("%s: DOS date %#x (month %d, day %d), modified %v", f.Name, f.ModifiedDate, month, day, f.Modified)
		}
	}
	if len(z.File) == 0 {
		t.Fatal("no entries")
	}
}
