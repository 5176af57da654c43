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

// Reference: testdata/reference/gaugings-01594440.csv (USGS 01594440,
// Patuxent River near Bowie, MD). One rule decides which given
// breakpoints least squares fits: a control whose exponent passes
// MaxFitExponent is refused, naming the control and the exponent it
// reached. With breakpoints 7 and 12 ft the second control's exponent
// ran to 122 (offset −323 ft) before its coefficient underflowed, and was
// fitted with a warning, while 7 and 13 ft were refused for an exponent of
// 282 that was only the start's at an offset 1757 ft down, and 6 and
// 10 ft for 615. Now 7,12 and 7,13 are refused for control 2 (14.8 at a
// true least-squares minimum for 7,13); 6,10 has a minimum at 6.2 and is
// fitted, warned of as outside 1 to 3; a Bayesian fit, whose prior holds
// the exponent, fits all three.
func TestFitRunawayExponentOneRule(t *testing.T) {
	gs := patuxentGaugings(t)
	for _, tc := range []struct {
		breaks []float64
		want   string // "" for a fit
	}{
		{[]float64{7, 12}, "control 2 (from 7 ft, 22 gaugings from 7.02 to 11.63 ft): its least-squares exponent is "},
		{[]float64{7, 13}, "control 2 (from 7 ft, 27 gaugings from 7.02 to 12.67 ft): its least-squares exponent is 14."},
		{[]float64{6, 10}, ""},
	} {
		f, err := gauged.FitControls(gs, gauged.ControlOptions{Breaks: tc.breaks, Units: rating.US})
		switch {
		case tc.want != "":
			if !errors.Is(err, gauged.ErrRunawayExponent) || !strings.Contains(err.Error(), tc.want) || !strings.Contains(err.Error(), "above 10") {
				t.Errorf("lsq %v: err = %v, want one containing %q", tc.breaks, err, tc.want)
			}
		case err != nil:
			t.Errorf("lsq %v: %v", tc.breaks, err)
		default:
			for j, c := range f.Rating.Controls {
				if c.C > gauged.MaxFitExponent {
					t.Errorf("lsq %v: control %d has exponent %g", tc.breaks, j+1, c.C)
				}
			}
		}
		b, err := gauged.FitBayes(gs, gauged.BayesOptions{ControlOptions: gauged.ControlOptions{Breaks: tc.breaks, Units: rating.US}, Chains: 2, Draws: 300, Seed: 1})
		if err != nil {
			t.Errorf("bayes %v: %v", tc.breaks, err)
			continue
		}
		for j, c := range b.Rating.Controls {
			if c.C > 5 {
				t.Errorf("bayes %v: control %d has exponent %g at the mode", tc.breaks, j+1, c.C)
			}
		}
	}
}

// An invented scenario: seven gaugings from 1.5 to 1.66 m rising as
// Q = 0.3·e^(2h) (an exponential, closed form), which no power law of
// one control fits; least squares runs the exponent away and is
// refused. The offset is measured from the control's lowest gauging
// (1.5 m), not from the control's start, which for the first control is
// the offset itself ("0 m below where it starts" before).
func TestFitRunawayExponentSaysDepthBelowGaugings(t *testing.T) {
	var gs []gauged.Gauging
	for i, h := range []float64{1.5, 1.52, 1.55, 1.58, 1.6, 1.63, 1.66} {
		gs = append(gs, gauged.Gauging{Time: time.Date(2024, time.Month(i+1), 10, 10, 0, 0, 0, time.UTC), Stage: h,
			Discharge: 0.3 * math.Exp(2*h), Quality: rating.Good})
	}
	_, err := gauged.FitControls(gs, gauged.ControlOptions{Units: rating.SI})
	if !errors.Is(err, gauged.ErrRunawayExponent) {
		t.Fatalf("err = %v, want ErrRunawayExponent", err)
	}
	msg := err.Error()
	if strings.Contains(msg, "0 m below where it starts") || !strings.Contains(msg, "m below its lowest gauging") {
		t.Errorf("err = %v, want the offset's depth below the lowest gauging", err)
	}
}
