package results_test

import (
	"testing"

	"github.com/xuri/excelize/v2"
)

// openBook opens a workbook written by a test, reading cells raw, and
// closes it when the test ends.
func openBook(t *testing.T, path string) *excelize.File {
	t.Helper()
	f, err := excelize.OpenFile(path, excelize.Options{RawCellValue: true})
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { f.Close() })
	return f
}
