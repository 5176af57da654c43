package results_test

import (
	"bytes"
	"encoding/csv"
	"math"
	"strconv"
	"testing"

	"wetline/rating/gauged"
	"wetline/survey/results"
)

// A comparison's rows are written at the stage their discharges were
// computed at. Both tables follow the power law Q = 3·(h − 0.61)^(5/3),
// which the log-linear reading in (h − e) with e = 0.61 reproduces exactly
// between rows (README "Reading a rating table": Q = Q₀·((h − e)/(h₀ −
// e))^b through both rows); B begins at 0.612938, as a fit's table begins
// at its offset written to six significant figures, so the common range
// starts there, and A's discharge written on that row must be the power
// law at the stage written (closed form).
func TestRatingComparisonStageAsComputed(t *testing.T) {
	q := func(h float64) float64 { return 3 * math.Pow(h-0.61, 5.0/3) }
	table := func(name string, e float64, stages ...float64) *gauged.TableRating {
		rt := gauged.RatingTable{Name: name, HasZeroFlow: true, ZeroFlow: e, Points: []gauged.RatingPoint{{Stage: stages[0]}}}
		for _, h := range stages[1:] {
			rt.Points = append(rt.Points, gauged.RatingPoint{Stage: h, Discharge: q(h)})
		}
		tr, err := rt.Compile()
		if err != nil {
			t.Fatal(err)
		}
		return tr
	}
	a := table("a", 0.61, 0.6, 0.7, 0.8, 0.9)
	b := table("b", 0.612938, 0.612938, 0.7, 0.8, 0.9)
	c, err := gauged.CompareRatings(a, b, gauged.CompareOptions{})
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := results.WriteRatingComparisonCSV(&buf, &c); err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(&buf).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range rows[1:] {
		h, _ := strconv.ParseFloat(r[0], 64)
		qa, _ := strconv.ParseFloat(r[1], 64)
		if want := q(h); math.Abs(qa-want) > 1e-5*want {
			t.Errorf("row %q: discharge_a %g, but the power law at the stage written, %g, gives %g", r, qa, h, want)
		}
	}
	if rows[1][0] != "0.612938" {
		t.Errorf("first stage written %q, want 0.612938, the stage compared at", rows[1][0])
	}
}
