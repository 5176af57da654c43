package survey

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// A zip archive with no workbook part is refused as not a workbook,
// naming the file and the part, by the file reader and the reader of a
// workbook in memory; the spreadsheet library said only "EOF".
func TestZipWithoutWorkbookPart(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	book := writeBook(t, dir, map[string][][]any{"s": {{"station", "elevation"}, {0, 1}, {1, 0}}}, []string{"s"})
	data := renameZip(t, readFile(t, book), "xl/workbook.xml", "xl/other.xml", func(_ string, b []byte) []byte { return b })
	path := filepath.Join(dir, "nobook.xlsx")
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	_, ferr := ReadTable(path, "")
	_, merr := ParseWorkbook(bytes.NewReader(data), path, "")
	for reader, err := range map[string]error{"file": ferr, "memory": merr} {
		if !errors.Is(err, ErrNoWorkbookPart) || !strings.HasPrefix(err.Error(), path+": not a workbook") || !strings.Contains(err.Error(), "xl/workbook.xml") {
			t.Errorf("%s: %v, want ErrNoWorkbookPart naming %s and xl/workbook.xml", reader, err, path)
		}
	}
	if _, err := ReadTable(book, ""); err != nil {
		t.Errorf("the workbook itself: %v", err)
	}
}
