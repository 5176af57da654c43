package gauged_test

import (
	"strings"
	"testing"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
)

// A gauging that contradicts the gauge height of zero flow is warned of,
// naming it and both heights with units: zero discharge above e (where
// the rating has flow), or flow at or below e (where it has none).
// Gaugings that agree with e are not, nor gaugings outside the fit (left
// out by their own text, by time or by the rating period). The fitted
// gaugings are dated 1 to 10 January 2024.
func TestZeroFlowConflictWarnings(t *testing.T) {
	march := time.Date(2024, 3, 1, 9, 0, 0, 0, time.UTC)
	january := gauged.Selection{From: time.Date(2024, 1, 1, 0, 0, 0, 0, time.UTC), To: time.Date(2024, 1, 31, 0, 0, 0, 0, time.UTC)}
	for _, tc := range []struct {
		name   string
		extra  gauged.Gauging
		method gauged.Method
		want   []string // substrings of one warning; nil: no such warning
		sel    gauged.Selection
	}{
		{"zero discharge above e, in the period", gauged.Gauging{Stage: 0.62, Discharge: 0, Source: "g.csv:20", Time: january.From.Add(time.Hour)}, gauged.LeastSquares,
			[]string{"g.csv:20", "zero discharge measured at gauge height 0.62 m"}, january},
		{"zero discharge above e, after the period", gauged.Gauging{Stage: 0.62, Discharge: 0, Source: "g.csv:20", Time: march}, gauged.LeastSquares, nil, january},
		{"zero discharge above e, excluded by time", gauged.Gauging{Stage: 0.62, Discharge: 0, Source: "g.csv:20", Time: march}, gauged.LeastSquares, nil,
			gauged.Selection{Exclude: []time.Time{march}}},
		{"zero discharge above e, left out", gauged.Gauging{Stage: 0.62, Discharge: 0, Source: "g.csv:20", Exclude: "suspect meter"}, gauged.Bayesian, nil, gauged.Selection{}},
		{"zero discharge above e", gauged.Gauging{Stage: 0.62, Discharge: 0, Source: "g.csv:20"}, gauged.LeastSquares,
			[]string{"g.csv:20", "zero discharge measured at gauge height 0.62 m", "above the gauge height of zero flow e = 0.5 m (fitted)"}, gauged.Selection{}},
		{"zero discharge above e, bayes", gauged.Gauging{Stage: 0.62, Discharge: 0, Source: "g.csv:20"}, gauged.Bayesian,
			[]string{"g.csv:20", "zero discharge measured at gauge height 0.62 m", "m (fitted)"}, gauged.Selection{}},
		{"flow below e, left out", gauged.Gauging{Stage: 0.41, Discharge: 0.03, Source: "g.csv:21", Exclude: "suspect meter"}, gauged.LeastSquares, nil, gauged.Selection{}},
		{"zero discharge below e", gauged.Gauging{Stage: 0.41, Discharge: 0, Source: "g.csv:22"}, gauged.LeastSquares, nil, gauged.Selection{}},
		{"zero discharge at e", gauged.Gauging{Stage: 0.5, Discharge: 0, Source: "g.csv:23"}, gauged.LeastSquares, nil, gauged.Selection{}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			gs := append(zeroFlowGaugings(), tc.extra)
			co := gauged.ControlOptions{Units: rating.SI, Selection: tc.sel}
			var f *gauged.ControlFit
			var err error
			if tc.method == gauged.LeastSquares {
				f, err = gauged.FitControls(gs, co)
			} else {
				f, err = gauged.FitBayes(gs, gauged.BayesOptions{ControlOptions: co, Draws: 500, Chains: 2})
			}
			if err != nil {
				t.Fatal(err)
			}
			var found []string
			for _, w := range f.Warnings {
				if strings.Contains(w, "gauge height of zero flow e =") {
					found = append(found, w)
				}
			}
			if tc.want == nil {
				if len(found) > 0 {
					t.Errorf("warned %q", found)
				}
				return
			}
			if len(found) != 1 {
				t.Fatalf("warnings %q: want one about the zero-flow height", f.Warnings)
			}
			for _, w := range tc.want {
				if !strings.Contains(found[0], w) {
					t.Errorf("warning %q does not contain %q", found[0], w)
				}
			}
		})
	}
}
