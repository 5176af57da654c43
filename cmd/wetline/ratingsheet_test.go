package main

import (
	"path/filepath"
	"strings"
	"testing"
)

// Every command reading a rating table from a workbook with no sheet named
// finds a results workbook's rating sheet past its summary, as plot does:
// shifts and record --rating, fit --hydraulic-rating, compare. The inputs
// are the demo's invented gaugings and the tests' stage record.
func TestRatingFromResultsWorkbook(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	book := filepath.Join(dir, "fit.xlsx")
	if _, errs, code := runCLI(t, "fit", fitDemoGaugings, "--method", "lsq", "-o", book); code != 0 {
		t.Fatalf("fit: exit %d: %s", code, errs)
	}
	for _, args := range [][]string{
		{"shifts", fitDemoGaugings, "--rating", book, "-o", filepath.Join(dir, "sh.csv")},
		{"record", recStages, "--rating", book, "-o", filepath.Join(dir, "rec.csv")},
		{"fit", fitDemoGaugings, "--hydraulic-rating", book, "--method", "lsq", "-o", filepath.Join(dir, "f.csv")},
		{"compare", book, book, "-o", filepath.Join(dir, "c.csv")},
	} {
		if _, errs, code := runCLI(t, args...); code != 0 || strings.Contains(errs, "missing column") {
			t.Errorf("%s: exit %d: %s", strings.Join(args[:3], " "), code, errs)
		}
	}
}
