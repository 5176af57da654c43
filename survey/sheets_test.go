package survey

import (
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

func TestSectionSheets(t *testing.T) {
	f := excelize.NewFile()
	f.SetSheetName("Sheet1", "XS-1")
	f.SetSheetRow("XS-1", "A1", &[]any{"Station (m)", "Elevation (m)", "n"})
	f.SetSheetRow("XS-1", "A2", &[]any{0, 1, 0.03})
	f.NewSheet("notes")
	f.SetSheetRow("notes", "A1", &[]any{"what", "who"})
	f.NewSheet("XS-2")
	f.SetSheetRow("XS-2", "B3", &[]any{"station", "elevation"})
	f.NewSheet("empty")
	// A site block above the header: key rows come first.
	f.NewSheet("XS-3")
	f.SetSheetRow("XS-3", "A1", &[]any{"Site:", "Tallow Creek"})
	f.SetSheetRow("XS-3", "A2", &[]any{"surveyed"})
	f.SetSheetRow("XS-3", "A4", &[]any{"easting", "northing", "elevation"})
	f.NewSheet("keys only")
	f.SetSheetRow("keys only", "A1", &[]any{"site", "Tallow Creek"})
	path := filepath.Join(t.TempDir(), "reach.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	got, err := SectionSheets(path)
	if err != nil {
		t.Fatal(err)
	}
	if strings.Join(got, ",") != "XS-1,XS-2,XS-3" {
		t.Errorf("section sheets %q, want XS-1, XS-2, XS-3", got)
	}
}
