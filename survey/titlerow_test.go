package survey

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// titleBook writes a survey sheet under a title in A1 (merged across
// A1:D1 when merged is set), its header in row 2, and returns its path.
func titleBook(t *testing.T, dir string, merged bool) string {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	s := "xs"
	f.SetSheetName("Sheet1", s)
	f.SetCellValue(s, "A1", "Wren Brook at Kiln Lane XS-3")
	if merged {
		if err := f.MergeCell(s, "A1", "D1"); err != nil {
			t.Fatal(err)
		}
	}
	f.SetSheetRow(s, "A2", &[]any{"station", "elevation", "n", "mark"})
	f.SetSheetRow(s, "A3", &[]any{0, 4.2, 0.04, "lb"})
	f.SetSheetRow(s, "A4", &[]any{3, 3.1, 0.04})
	f.SetSheetRow(s, "A5", &[]any{6, 4.3, 0.04, "rb"})
	name := "title.xlsx"
	if merged {
		name = "merged.xlsx"
	}
	path := filepath.Join(dir, name)
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	return path
}

// A title above the header (one filled cell, then a wider row) is said
// to be no header, at its row, with the ways to keep it: the real header
// below it is not blamed as values beyond the header's last column.
func TestTitleRowAboveHeader(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	const survey = "station,elevation,n,mark\n0,4.2,0.04,lb\n3,3.1,0.04,\n6,4.3,0.04,rb\n"
	csvFile := func(name, text string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	for _, tc := range []struct {
		name, path, at, keep string
	}{
		{"csv", csvFile("title.csv", "Wren Brook at Kiln Lane XS-3\n"+survey), "title.csv:1:1: ", "# site: "},
		{"csv, padded", csvFile("padded.csv", "Wren Brook at Kiln Lane XS-3,,,\n\n"+survey), "padded.csv:1:1: ", "# site: "},
		{"csv, after a comment", csvFile("comment.csv", "# crew: AB\n\"Wren Brook, Kiln Lane\"\n"+survey), "comment.csv:2:1: ", "# site: "},
		{"sheet", titleBook(t, dir, false), "title.xlsx['xs']!A1: ", "B1"},
		{"sheet, merged", titleBook(t, dir, true), "merged.xlsx['xs']!A1: ", "B1"},
	} {
		_, err := ReadSection(tc.path, "", SectionOptions{})
		if !errors.Is(err, ErrTitleRow) {
			t.Errorf("%s: %v, want ErrTitleRow", tc.name, err)
			continue
		}
		msg := err.Error()
		for _, want := range []string{tc.at, "Wren Brook", "not a header", "site key", tc.keep} {
			if !strings.Contains(msg, want) {
				t.Errorf("%s: %q lacks %q", tc.name, msg, want)
			}
		}
		if errors.Is(err, ErrBeyondHeader) {
			t.Errorf("%s: %v, blames the header as beyond the header's last column", tc.name, err)
		}
	}
	// A header of one column above data is no title: the data's values
	// beyond it are refused as such.
	if _, err := ReadSection(csvFile("short.csv", "station\n0,4.2\n3,3.1\n"), "", SectionOptions{}); !errors.Is(err, ErrBeyondHeader) {
		t.Errorf("a header of one column: %v, want ErrBeyondHeader", err)
	}
	// Written as a site key, the title is the site's name.
	sv, err := ReadSection(csvFile("keyed.csv", "site,Wren Brook at Kiln Lane XS-3\n"+survey), "", SectionOptions{})
	if err != nil || sv.Site.Name != "Wren Brook at Kiln Lane XS-3" {
		t.Errorf("a site key row: %v, site %q", err, sv.Site.Name)
	}
}

// A stage record is read as a stream, so a title above its header is
// known by its one cell naming neither time nor stage; a header of one
// column that is a record's own (stage alone) is still a missing time.
func TestTitleRowAboveStageRecord(t *testing.T) {
	dir := t.TempDir()
	for _, tc := range []struct {
		body  string
		title bool
	}{
		{"Pike Run at the weir - 15-minute stages\ntime,stage\n2024-01-01T00:00,0.5\n", true},
		{"stage\n0.5\n", false},
	} {
		path := filepath.Join(dir, "rec.csv")
		if err := os.WriteFile(path, []byte(tc.body), 0o644); err != nil {
			t.Fatal(err)
		}
		_, err := ReadStageRecord(path, StageRecordOptions{})
		if got := errors.Is(err, ErrTitleRow); got != tc.title {
			t.Errorf("%q: error %v, title %v, want %v", tc.body, err, got, tc.title)
		}
		if tc.title && (err == nil || !strings.Contains(err.Error(), "rec.csv:1:1") || !strings.Contains(err.Error(), "site,Pike Run")) {
			t.Errorf("%q: error %v: want it at row 1 with the site key row to write", tc.body, err)
		}
	}
}
