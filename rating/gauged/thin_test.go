package gauged_test

import (
	"errors"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
)

// Given breakpoints that leave a control fewer than MinPerSegment of the
// gaugings used are refused with ErrThinControl, by least squares for any
// control and by a Bayesian fit for a control on weak priors; the message
// names each such control, its stages, how many gaugings it holds and at
// which stages. Gaugings on Q = 5·(h − 0.3)² at 0.5 to 2.9 m every 0.2 m
// (invented; 13 of them).
func TestThinControlNamed(t *testing.T) {
	var gs []gauged.Gauging
	for i := range 13 {
		h := 0.5 + 0.2*float64(i)
		gs = append(gs, gauged.Gauging{Stage: h, Discharge: 5 * (h - 0.3) * (h - 0.3), Quality: rating.Good})
	}
	for _, tc := range []struct {
		name   string
		breaks []float64
		want   []string // in the message
	}{
		{"two gaugings above", []float64{2.6},
			[]string{"control 2 (from 2.6 m up) holds 2 of the 13 gaugings used, from 2.7 to 2.9 m", "breakpoint given at 2.6 m", "0.5 to 2.9 m"}},
		{"one gauging below", []float64{0.6},
			[]string{"control 1 (below 0.6 m) holds 1 of the 13 gaugings used, at 0.5 m", "fewer than 3 "}},
		{"a middle control with two", []float64{1, 1.4},
			[]string{"control 2 (from 1 to 1.4 m) holds 2 of the 13 gaugings used, from 1.1 to 1.3 m", "breakpoints given at 1 and 1.4 m"}},
		{"above every gauging", []float64{3},
			[]string{"control 2 (from 3 m up) holds 0 of the 13 gaugings used", "used: fewer than 3"}},
		{"two thin controls", []float64{0.6, 2.6},
			[]string{"control 1 (below 0.6 m) holds 1", "; control 3 (from 2.6 m up) holds 2", "fewer than 3 each"}},
	} {
		k := len(tc.breaks) + 1
		_, err := gauged.FitControls(gs, gauged.ControlOptions{Controls: make([]gauged.ControlSpec, k), Breaks: tc.breaks})
		if !errors.Is(err, gauged.ErrThinControl) {
			t.Errorf("%s, least squares: %v, want ErrThinControl", tc.name, err)
			continue
		}
		for _, w := range tc.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s, least squares: %q lacks %q", tc.name, err, w)
			}
		}
		_, err = gauged.FitBayes(gs, gauged.BayesOptions{ControlOptions: gauged.ControlOptions{Controls: make([]gauged.ControlSpec, k), Breaks: tc.breaks},
			Chains: 2, Draws: 100, Seed: 1})
		if !errors.Is(err, gauged.ErrThinControl) || !strings.Contains(err.Error(), tc.want[0]) || !strings.Contains(err.Error(), "weak priors") {
			t.Errorf("%s, Bayesian: %v, want ErrThinControl naming %q and its weak priors", tc.name, err, tc.want[0])
		}
	}
	// Breakpoints leaving every control 3 or more are fitted.
	if _, err := gauged.FitControls(gs, gauged.ControlOptions{Controls: make([]gauged.ControlSpec, 2), Breaks: []float64{1.4}}); err != nil {
		t.Errorf("breakpoint leaving 5 and 8: %v", err)
	}
}
