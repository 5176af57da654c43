package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// Reference: testdata/reference/rating-01594440.csv (USGS 01594440,
// Patuxent River near Bowie, MD): its first row, 2.99 ft, carries
// 30 ft3/s, and its README gives the gauge height of zero flow as 2.0 ft,
// below that row. --zero-flow control on it without --hydraulic-zero-flow
// is an error naming both flags, not an offset at the first row; with
// --hydraulic-zero-flow 2 the offset is 2.
func TestFitZeroFlowControlWetFootTable(t *testing.T) {
	t.Parallel()
	const (
		gaugings = "../../testdata/reference/gaugings-01594440.csv"
		table    = "../../testdata/reference/rating-01594440.csv"
	)
	out := filepath.Join(t.TempDir(), "fit.csv")
	_, _, err := fitRun(t, "fit", gaugings, "--units", "us", "--hydraulic-rating", table, "--zero-flow", "control", "--method", "lsq", "-o", out)
	if err == nil || !strings.Contains(err.Error(), "--zero-flow control") || !strings.Contains(err.Error(), "--hydraulic-zero-flow") ||
		!strings.Contains(err.Error(), "2.99 ft, carries 30 ft3/s") {
		t.Errorf("error %v: want one naming --zero-flow control, --hydraulic-zero-flow and the wet first row", err)
	}
	if _, serr := os.Stat(out); serr == nil {
		t.Error("output written despite the error")
	}
	text, errs, err := fitRun(t, "fit", gaugings, "--units", "us", "--hydraulic-rating", table, "--hydraulic-zero-flow", "2", "--zero-flow", "control", "--method", "lsq")
	if err != nil || !strings.Contains(text, "B = 2.0000 ft") {
		t.Errorf("with --hydraulic-zero-flow 2: %v %s; want the offset held at 2 ft", err, errs)
	}
}
