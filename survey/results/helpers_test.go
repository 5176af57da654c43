package results_test

import (
	"io"
	"math"
	"os"
	"strconv"
	"testing"

	"github.com/xuri/excelize/v2"

	"wetline/survey/results"
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

// writeFile writes a file for a test (the safe writer is another
// package's job).
func writeFile(path string, write func(io.Writer) error) error {
	f, err := os.Create(path)
	if err != nil {
		return err
	}
	if err := write(f); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}

// reported is v as the reports write it, read back: a length to
// results.LengthDecimals decimals, any other value to six significant
// digits. A workbook cell holds exactly this number.
func reported(v float64, length bool) float64 {
	s := results.FormatFloat(v)
	if length {
		s = results.FormatLength(v)
	}
	r, err := strconv.ParseFloat(s, 64)
	if err != nil {
		return math.NaN()
	}
	return r
}
