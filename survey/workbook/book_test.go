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

// The same book gives the same bytes however often it is written:
// excelize zips streamed sheets and image content types in map order,
// which Write puts in name order.
func TestWriteReproducible(t *testing.T) {
	pic := testPNG(40, 30)
	write := func() []byte {
		b := NewBook()
		defer b.Close()
		for _, name := range []string{"a", "b", "c", "d", "e"} {
			s, err := b.Table(name, []Column{{Name: "stage", Unit: "m"}, {Name: "discharge", Unit: "m3/s"}})
			if err != nil {
				t.Fatal(err)
			}
			for i := range 50 {
				if err := s.Row(float64(i)/10, float64(i*i)); err != nil {
					t.Fatal(err)
				}
			}
			if err := s.Flush(); err != nil {
				t.Fatal(err)
			}
		}
		if err := b.Pictures("figures", []Picture{{Name: "rating", PNG: pic}}); err != nil {
			t.Fatal(err)
		}
		var buf bytes.Buffer
		if err := b.Write(&buf); err != nil {
			t.Fatal(err)
		}
		return buf.Bytes()
	}
	first := write()
	for i := range 8 {
		if again := write(); !bytes.Equal(first, again) {
			t.Fatalf("write %d differs from the first (%d against %d bytes)", i+2, len(again), len(first))
		}
	}
	z, err := zip.NewReader(bytes.NewReader(first), int64(len(first)))
	if err != nil {
		t.Fatal(err)
	}
	if z.File[0].Name != "[Content_Types].xml" {
		t.Errorf("first entry %s, want [Content_Types].xml", z.File[0].Name)
	}
	f, err := excelize.OpenReader(bytes.NewReader(first))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if got := f.GetSheetList(); len(got) != 6 {
		t.Errorf("sheets %v, want 6", got)
	}
	if v, err := f.GetCellValue("e", "B51"); err != nil || v != "2401" {
		t.Errorf("e!B51 = %q, %v; want 2401", v, err)
	}
}
