package gauged_test

import (
	"errors"
	"math"
	"strings"
	"testing"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
)

// Without a section, a gauging with flow whose gauge height lies below the
// lowest of the other gaugings used by more than
// gauged.FarBelowOthersMultiple times their stage span is refused by both
// fit methods, naming it: a missing-value code −99999.9999 carrying
// 45.2 m³/s among gaugings at 0.4 to 3 m is; a genuine low-flow gauging
// 0.3 m under others at 5 to 6 m is fitted, and so is one 0.77 m under
// others within 0.05 m of one another (the span is taken as at least 1 m). The gaugings follow
// Q = a (h − e)^b exactly, so every fit that starts finds its rating.
func TestFitGaugingFarBelowOthers(t *testing.T) {
	law := func(hs []float64, a, e, b float64) []gauged.Gauging {
		var gs []gauged.Gauging
		t0 := time.Date(2024, 1, 1, 9, 0, 0, 0, time.UTC)
		for i, h := range hs {
			gs = append(gs, gauged.Gauging{Stage: h, Discharge: a * math.Pow(h-e, b), Quality: rating.Good,
				Time: t0.AddDate(0, i, 0), Source: "g.csv:" + string(rune('2'+i))})
		}
		return gs
	}
	slip := append(law([]float64{0.4, 0.8, 1.3, 1.9, 2.4, 3.0}, 10, 0.2, 1.7),
		gauged.Gauging{Stage: -99999.9999, Discharge: 45.2, Quality: rating.Good, Source: "g.csv:9"})
	for _, tc := range []struct {
		name    string
		gs      []gauged.Gauging
		refused bool
	}{
		{"missing-value code", slip, true},
		{"genuine low flow", law([]float64{4.7, 5.0, 5.2, 5.4, 5.6, 5.8, 6.0}, 20, 4.5, 1.6), false},
		// A short period whose other gaugings lie within 0.05 m (as three
		// of the USGS 01594440 gaugings of 2001 do, in feet): their span is
		// taken as at least 1 m, so a low flow 0.77 below them is fitted.
		{"others close together", law([]float64{4.52, 5.29, 5.30, 5.34, 5.31}, 20, 4.0, 1.6), false},
		{"missing-value code, left out", append(slip[:len(slip)-1:len(slip)-1],
			gauged.Gauging{Stage: -99999.9999, Discharge: 45.2, Quality: rating.Good, Source: "g.csv:9", Exclude: "slip"}), false},
	} {
		for _, m := range []gauged.Method{gauged.LeastSquares, gauged.Bayesian} {
			_, err := gauged.Analyze(tc.gs, gauged.Options{Method: m, Units: rating.SI,
				Bayes: gauged.BayesOptions{Draws: 200, Chains: 2, Seed: 1}})
			far := errors.Is(err, gauged.ErrGaugingFarBelowOthers)
			if far != tc.refused || !tc.refused && err != nil ||
				tc.refused && !strings.Contains(err.Error(), "g.csv:9: gauge height -99999.9999 with 45.2 m3/s is 100000 m below") {
				t.Errorf("%s, %v: %v", tc.name, m, err)
			}
		}
	}
}
