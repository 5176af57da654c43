package gauged_test

import (
	"encoding/csv"
	"os"
	"strconv"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
)

// referenceRows reads a reference file of testdata/reference (comment
// lines start with '#') with encoding/csv: its columns by name and its
// rows. The project's own readers are not used here: tests of this
// package import nothing above it.
func referenceRows(t testing.TB, name string) (map[string]int, [][]string) {
	t.Helper()
	f, err := os.Open("../../testdata/reference/" + name)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rd := csv.NewReader(f)
	rd.Comment = '#'
	rd.FieldsPerRecord = -1
	recs, err := rd.ReadAll()
	if err != nil || len(recs) < 2 {
		t.Fatalf("%s: %v", name, err)
	}
	cols := map[string]int{}
	for i, h := range recs[0] {
		cols[strings.TrimSpace(h)] = i
	}
	return cols, recs[1:]
}

// refNumber parses a cell of a reference file.
func refNumber(t testing.TB, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(strings.TrimSpace(s), 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

// referencePairs reads the gauge heights and discharges of a reference
// rating file, as gaugings without time or quality.
func referencePairs(t testing.TB, name string) []gauged.Gauging {
	t.Helper()
	cols, rows := referenceRows(t, name)
	var gs []gauged.Gauging
	for _, r := range rows {
		gs = append(gs, gauged.Gauging{Stage: refNumber(t, r[cols["gauge_height"]]), Discharge: refNumber(t, r[cols["discharge"]])})
	}
	return gs
}

// patuxentGaugings reads the 142 measurements of USGS 01594440 with their
// rated quality.
func patuxentGaugings(t testing.TB) []gauged.Gauging {
	t.Helper()
	cols, rows := referenceRows(t, "gaugings-01594440.csv")
	var gs []gauged.Gauging
	for i, r := range rows {
		q, err := rating.ParseQuality(r[cols["quality"]])
		if err != nil {
			t.Fatalf("row %d: %v", i+2, err)
		}
		gs = append(gs, gauged.Gauging{Stage: refNumber(t, r[cols["gauge_height"]]), Discharge: refNumber(t, r[cols["discharge"]]), Quality: q})
	}
	return gs
}
