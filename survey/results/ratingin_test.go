package results_test

import (
	"bytes"
	"errors"
	"math"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
	"wetline/survey"
	"wetline/survey/results"
)

// TestRatingRoundTrip writes a computed table with WriteRatingCSV and
// reads it back: every value survives to the 6 significant digits the
// writer keeps.
func TestRatingRoundTrip(t *testing.T) {
	// A rectangular channel 4 wide, bed at 10 (closed-form geometry).
	p, err := subdivide.Compile(subdivide.Section{Name: "box", N: []float64{0.03, 0.03, 0.03},
		Points: []subdivide.Point{{Station: 0, Elevation: 13}, {Station: 0, Elevation: 10}, {Station: 4, Elevation: 10}, {Station: 4, Elevation: 13}}})
	if err != nil {
		t.Fatal(err)
	}
	want, err := rating.Compute(p, []float64{10, 10.5, 11, 12.25}, rating.Options{Slope: 0.001})
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := results.WriteRatingCSV(&buf, rating.RatingReport{Table: want}); err != nil {
		t.Fatal(err)
	}
	got, err := survey.ParseRatingCSV(&buf, "box-rating.csv", rating.SI)
	if err != nil {
		t.Fatal(err)
	}
	if got.Name != "box" || len(got.Rows) != len(want.Rows) || got.Bottom != 10 || got.Top != 12.25 {
		t.Fatalf("got name %q, %d rows, bottom %g, top %g", got.Name, len(got.Rows), got.Bottom, got.Top)
	}
	// FormatFloat keeps 6 significant digits.
	const rel = 5e-6
	for i, w := range want.Rows {
		g := got.Rows[i]
		for _, pair := range [][2]float64{{g.Stage, w.Stage}, {g.Discharge, w.Discharge}, {g.Area, w.Area},
			{g.TopWidth, w.TopWidth}, {g.HydraulicRadius, w.HydraulicRadius}, {g.Conveyance, w.Conveyance}, {g.Alpha, w.Alpha}} {
			a, b := pair[0], pair[1]
			if math.IsNaN(b) != math.IsNaN(a) || math.Abs(a-b) > rel*math.Abs(b) {
				t.Errorf("row %d: read %v, wrote %v", i, a, b)
			}
		}
	}
}

func TestRatingFromTableErrors(t *testing.T) {
	for _, tc := range []struct {
		name, csv, want string
		is              error
	}{
		{"no discharge column", "stage,area\n1,2\n", `needs a column named "discharge"`, survey.ErrMissingColumn},
		{"blank stage", "stage,discharge\n1,2\n,3\n", "t.csv:3:1: stage", survey.ErrNotNumber},
		{"bad discharge", "stage,discharge\n1,x\n", `t.csv:2:2: discharge "x"`, survey.ErrNotNumber},
		{"bad optional", "stage,discharge,alpha\n1,2,1;2\n", `t.csv:2:3: alpha`, survey.ErrNotNumber},
		{"empty", "stage,discharge\n", "no data rows", survey.ErrEmpty},
	} {
		_, err := survey.ParseRatingCSV(strings.NewReader(tc.csv), "t.csv", rating.SI)
		if err == nil || !strings.Contains(err.Error(), tc.want) || !errors.Is(err, tc.is) {
			t.Errorf("%s: error %v, want %q (%v)", tc.name, err, tc.want, tc.is)
		}
	}
}

func FuzzParseRatingCSV(f *testing.F) {
	for _, s := range []string{
		"stage,discharge\n1,2\n",
		"stage,depth,area,discharge,alpha\n10,0,0,0,\n10.5,0.5,2,1.2,1.0\n",
		"stage,discharge\n1,nan\n",
		"\ufeffstage;discharge\n1;2\n",
		"# c\nStage (m),Discharge (m3/s)\n1,2,3\n",
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		tab, err := survey.ParseRatingCSV(strings.NewReader(s), "f.csv", rating.SI)
		if err != nil {
			return
		}
		for _, r := range tab.Rows {
			if math.IsNaN(r.Stage) || math.IsInf(r.Stage, 0) || math.IsNaN(r.Discharge) {
				t.Fatalf("row with an undefined stage or discharge: %+v", r)
			}
		}
	})
}
