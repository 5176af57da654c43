package gauged_test

import (
	"errors"
	"strconv"
	"strings"
	"testing"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
)

// zeroFlowGaugings are noise-free gaugings of Q = 4·(h − 0.5)^2 (a closed
// form: a fit of one control gives back e = 0.5 exactly), each with a
// source naming its row.
func zeroFlowGaugings() []gauged.Gauging {
	gs := law(0.5, 4, []float64{2}, nil, linspace(0.8, 3, 10), rating.Good)
	for i := range gs {
		gs[i].Source = "g.csv:" + strconv.Itoa(i+2)
		gs[i].Time = time.Date(2024, 1, 1+i, 9, 0, 0, 0, time.UTC)
	}
	return gs
}

// A gauge height of zero flow held at or above gaugings to be fitted is
// one error naming how many, the lowest and both heights with units.
func TestBelowZeroError(t *testing.T) {
	for _, tc := range []struct {
		name          string
		offset        float64
		method        gauged.Method
		count         int
		lowest, words string
	}{
		{"above all, lsq", 5, gauged.LeastSquares, 10, "g.csv:2", "10 of the 10 gaugings used lie at or below the gauge height of zero flow 5 m (given), the lowest g.csv:2 at 0.8 m"},
		{"at the lowest, bayes", 0.8, gauged.Bayesian, 1, "g.csv:2", "1 of the 10 gaugings used lies at or below the gauge height of zero flow 0.8 m (given), the lowest g.csv:2 at 0.8 m"},
		{"between, lsq", 1.1, gauged.LeastSquares, 2, "g.csv:2", "2 of the 10"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			co := gauged.ControlOptions{OffsetFixed: true, Offset: tc.offset, Units: rating.SI}
			var err error
			if tc.method == gauged.LeastSquares {
				_, err = gauged.FitControls(zeroFlowGaugings(), co)
			} else {
				_, err = gauged.FitBayes(zeroFlowGaugings(), gauged.BayesOptions{ControlOptions: co, Draws: 200, Chains: 2})
			}
			var bz *gauged.BelowZeroError
			if !errors.As(err, &bz) || !errors.Is(err, gauged.ErrBelowZero) {
				t.Fatalf("err = %v, want a *BelowZeroError", err)
			}
			if bz.Count != tc.count || bz.Used != 10 || bz.Lowest != tc.lowest || bz.Stage != 0.8 || bz.ZeroFlow != tc.offset {
				t.Errorf("error %+v: want %d of 10, the lowest %s at 0.8", bz, tc.count, tc.lowest)
			}
			if msg := err.Error(); !strings.Contains(msg, tc.words) || strings.Contains(msg, "\n") {
				t.Errorf("message %q: want one line containing %q", msg, tc.words)
			}
		})
	}
}
