package results_test

import (
	"bytes"
	"math"
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
	got, err := survey.ParseRatingCSV(&buf, "box-rating.csv", survey.UnitChoice{})
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
