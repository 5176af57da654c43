package results_test

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/survey/results"
)

// The text report of a comparison of two ratings says which table is
// extrapolated above its highest gauging within the common range, and
// over which stages; "neither" only when both highest gaugings are known
// and neither table lies above its own. A is Q = 10·h on 0–10 m, B is
// Q = 11·h on 1–12 m: the common range is 1–10 m (by hand from the rows).
func TestRatingComparisonExtrapolationWords(t *testing.T) {
	nan := math.NaN()
	for _, tc := range []struct {
		name         string
		highA, highB float64 // NaN: not known
		want         string
	}{
		{"A", 8, 11, "A is extrapolated above its highest gauging from 8 to 10 m; B is not"},
		{"B, A unknown", nan, 6.5, "B is extrapolated above its highest gauging from 6.5 to 10 m; A's highest gauging is not known"},
		{"both", 8, 6.5, "A is extrapolated above its highest gauging from 8 to 10 m, B from 6.5 to 10 m"},
		{"neither", 10, 11, "neither table is extrapolated above its highest gauging"},
		{"neither known", nan, nan, "neither table's highest gauging is known"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			table := func(name string, high float64, pts []gauged.RatingPoint) *gauged.TableRating {
				rt := gauged.RatingTable{Name: name, Points: pts}
				if !math.IsNaN(high) {
					rt.HasHighGauging, rt.HighGauging = true, high
				}
				r, err := rt.Compile()
				if err != nil {
					t.Fatal(err)
				}
				return r
			}
			a := table("a.csv", tc.highA, []gauged.RatingPoint{{Stage: 0, Discharge: 0}, {Stage: 10, Discharge: 100}})
			b := table("b.csv", tc.highB, []gauged.RatingPoint{{Stage: 1, Discharge: 11}, {Stage: 12, Discharge: 132}})
			c, err := gauged.CompareRatings(a, b, gauged.CompareOptions{Units: rating.SI})
			if err != nil {
				t.Fatal(err)
			}
			var buf bytes.Buffer
			if err := results.WriteRatingComparisonText(&buf, &c); err != nil {
				t.Fatal(err)
			}
			want := "Common range of stage: 1 to 10 m, within the rows of both tables; " + tc.want + "\n"
			if !strings.Contains(buf.String(), want) {
				t.Errorf("report does not contain %q:\n%s", want, buf.String())
			}
		})
	}
}
