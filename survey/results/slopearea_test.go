package results_test

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/reach"
	"wetline/survey/results"
)

// The heading of the slope-area text report says what the subreaches give
// alone: the range and spread when all solve, else which solved and which
// have no real discharge alone (never "- to -").
func TestSlopeAreaTextSubreaches(t *testing.T) {
	nan := math.NaN()
	sub := func(from, to string, q float64) reach.Subreach {
		return reach.Subreach{From: from, To: to, Discharge: q}
	}
	for _, tc := range []struct {
		name     string
		subs     []reach.Subreach
		min, max float64
		want     string
	}{
		{"all solve", []reach.Subreach{sub("A", "B", 90), sub("B", "C", 110)}, 90, 110,
			"  subreaches    90 to 110 m3/s alone (spread 20.0 % of the peak)"},
		{"one of two", []reach.Subreach{sub("A", "B", nan), sub("B", "C", 117.2)}, nan, nan,
			"  subreaches    1 of 2 solves alone: B to C 117.2 m3/s; no real discharge alone: A to B"},
		{"two of three", []reach.Subreach{sub("A", "B", 95.5), sub("B", "C", nan), sub("C", "D", 101)}, nan, nan,
			"  subreaches    2 of 3 solve alone: A to B 95.5 m3/s, C to D 101 m3/s; no real discharge alone: B to C"},
		{"none", []reach.Subreach{sub("A", "B", nan), sub("B", "C", nan)}, nan, nan,
			"  subreaches    none has a real discharge alone (A to B, B to C): only the whole reach gives one"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			res := reach.SlopeArea{Method: reach.MethodSlopeArea, Units: rating.SI, Discharge: 100,
				Subreaches: tc.subs, SubreachMin: tc.min, SubreachMax: tc.max, SubreachSpread: (tc.max - tc.min) / 100}
			var b bytes.Buffer
			if err := results.WriteSlopeAreaText(&b, reach.Report{Result: res}); err != nil {
				t.Fatal(err)
			}
			var got string
			for _, line := range strings.Split(b.String(), "\n") {
				if strings.HasPrefix(line, "  subreaches ") {
					got = line
				}
			}
			if got != tc.want {
				t.Errorf("got  %q\nwant %q", got, tc.want)
			}
		})
	}
}
