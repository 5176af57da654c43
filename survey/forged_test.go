package survey

import (
	"errors"
	"os"
	"path/filepath"
	"testing"
)

// Every reader of a workbook file refuses a workbook whose zip directory
// claims sizes deflate cannot produce (testdata/forged-size.xlsx: an entry
// claiming gigabytes from a few bytes), before the spreadsheet library
// allocates what it claims.
func TestForgedWorkbookRefusedByEveryReader(t *testing.T) {
	const forged = "testdata/forged-size.xlsx"
	data, err := os.ReadFile(forged)
	if err != nil {
		t.Fatal(err)
	}
	readers := map[string]func() error{
		"ReadTable":   func() error { _, err := ReadTable(forged, ""); return err },
		"ReadSection": func() error { _, err := ReadSection(forged, "", SectionOptions{}); return err },
		"ReadGaugings": func() error {
			_, err := ReadGaugings(forged, "")
			return err
		},
		"ReadReach":     func() error { _, err := ReadReach(forged, "", SectionOptions{}); return err },
		"ReadRatingCSV": func() error { _, err := ReadRatingCSV(forged, "", UnitChoice{}); return err },
		"SectionSheets": func() error { _, err := SectionSheets(forged); return err },
		"Prepare":       func() error { _, err := Prepare(SectionRequest{Path: forged}); return err },
		"ParseWorkbook": func() error {
			f, err := os.Open(forged)
			if err != nil {
				return err
			}
			defer f.Close()
			_, err = ParseWorkbook(f, filepath.Base(forged), "")
			return err
		},
	}
	if len(data) == 0 {
		t.Fatal("empty forged workbook")
	}
	for name, read := range readers {
		if err := read(); !errors.Is(err, ErrWorkbookZip) {
			t.Errorf("%s: %v, want ErrWorkbookZip", name, err)
		}
	}
}
