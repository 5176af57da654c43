package gauged_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
)

// A fit's comparison holds its calibration to the n calibrate holds a
// section to (PlausibleN, 0.005 to 1): gaugings of the compound section
// (n 0.03 and 0.05) measured at a hundredth of their discharge give a
// factor of 100 (conveyance ∝ 1/n, Chow, 1959, eq. 6-9), n 3 to 5, and
// the calibration is left out with calibrate's refusal as a warning; at
// their discharge the factor is 1 and the calibration is reported.
func TestAnalyzeImplausibleN(t *testing.T) {
	p := compound(t, 0.03, 0.05)
	c := rating.HydraulicCurve{Geometry: p, Options: rating.Options{Slope: 0.001}, Datum: 9.5}
	for _, tc := range []struct {
		name  string
		scale float64 // of the sampled discharges
		want  string  // in a warning; "" for a calibration reported
	}{
		{"plausible", 1, ""},
		{"a hundredth of the flow", 0.01, "calibrated n outside the plausible range: the best factor on n, 100 from 5 gaugings, makes n 3 to 5, not 0.005 to 1"},
	} {
		gs := sample(t, p, []float64{1.0, 1.6, 2.2, 2.7, 3.1})
		for i := range gs {
			gs[i].Discharge *= tc.scale
		}
		r, err := gauged.Analyze(gs, gauged.Options{Hydraulic: &c, CompareOnly: true})
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		warnings := strings.Join(r.Warnings, "\n")
		switch {
		case tc.want == "" && (r.Calibration == nil || math.Abs(r.Calibration.Factor-1) > 1e-9):
			t.Errorf("%s: calibration %+v, warnings %s", tc.name, r.Calibration, warnings)
		case tc.want != "" && (r.Calibration != nil || !strings.Contains(warnings, tc.want)):
			t.Errorf("%s: calibration %+v, warnings %s; want none and %q", tc.name, r.Calibration, warnings, tc.want)
		}
	}
}

// A best factor that is not a finite number above zero scales no n: the
// check says so rather than naming an n of +Inf.
func TestPlausibleNFactorNotFinite(t *testing.T) {
	p := compound(t, 0.03, 0.05)
	c := rating.HydraulicCurve{Geometry: p, Options: rating.Options{Slope: 0.001}, Datum: 9.5}
	for _, f := range []float64{math.Inf(1), math.NaN(), 0} {
		err := gauged.PlausibleN.Check(gauged.Calibration{Factor: f, Used: 9}, c)
		if !errors.Is(err, gauged.ErrImplausibleN) || !strings.Contains(err.Error(), "scales no n") || strings.Contains(err.Error(), "makes n") {
			t.Errorf("factor %g: %v", f, err)
		}
	}
}

// A gauging with flow further below the section's lowest point than the
// section is high is refused before any fit starts, by least squares and
// by Bayesian inference alike, naming it: the compound section runs
// from 10 to 13 m, 0.5 to 3.5 on the gauge at datum 9.5, so a gauging at
// −2.6 lies 3.1 m below its lowest point (refused), one at −2.4 2.9 m
// below (compared, with Compare's warning), and one left out or without
// flow is not checked.
func TestAnalyzeGaugingFarBelowSection(t *testing.T) {
	p := compound(t, 0.03, 0.05)
	c := rating.HydraulicCurve{Geometry: p, Options: rating.Options{Slope: 0.001}, Datum: 9.5}
	for _, tc := range []struct {
		name    string
		g       gauged.Gauging
		refused bool
	}{
		{"far below", gauged.Gauging{Stage: -2.6, Discharge: 45.2, Quality: rating.Good, Source: "g.csv:7"}, true},
		{"below, within the section's height", gauged.Gauging{Stage: -2.4, Discharge: 45.2, Quality: rating.Good, Source: "g.csv:7"}, false},
		{"far below, left out", gauged.Gauging{Stage: -2.6, Discharge: 45.2, Quality: rating.Good, Source: "g.csv:7", Exclude: "slip"}, false},
		{"far below, dry", gauged.Gauging{Stage: -2.6, Discharge: 0, Quality: rating.Good, Source: "g.csv:7"}, false},
	} {
		for _, m := range []gauged.Method{gauged.LeastSquares, gauged.Bayesian} {
			gs := append(sample(t, p, []float64{1.0, 1.6, 2.2, 2.7, 3.1}), tc.g)
			for i := range gs[:5] {
				gs[i].Time = gs[i].Time.AddDate(0, i, 0)
			}
			_, err := gauged.Analyze(gs, gauged.Options{Hydraulic: &c, Method: m, CompareOnly: !tc.refused,
				Bayes: gauged.BayesOptions{Draws: 100, Chains: 2, Seed: 1}})
			far := errors.Is(err, gauged.ErrGaugingFarBelowSection)
			if far != tc.refused || tc.refused && !strings.Contains(err.Error(), "g.csv:7: gauge height -2.6") {
				t.Errorf("%s, %v: %v", tc.name, m, err)
			}
		}
	}
}

// R̂ that is not a finite number (chains that never moved) is worded
// "not determined", not +Inf.
func TestRHatText(t *testing.T) {
	for _, tc := range []struct {
		v    float64
		want string
	}{{1.2381, "1.24"}, {1, "1"}, {math.Inf(1), "not determined"}, {math.NaN(), "not determined"}} {
		if got := gauged.RHatText(tc.v); got != tc.want {
			t.Errorf("RHatText(%g) = %q, want %q", tc.v, got, tc.want)
		}
	}
}

// A hydraulic rating off the gaugings by more than FarOffFactor on their
// geometric mean is warned of; one within it is not. The gaugings are the
// section's own Manning discharges (Chow, 1959, eq. 6-9) scaled by 3 and
// by 1.5, so the geometric mean departure is exactly +200 % and +50 %.
func TestAnalyzeFarOffHydraulicRating(t *testing.T) {
	p := compound(t, 0.03, 0.05)
	c := rating.HydraulicCurve{Geometry: p, Options: rating.Options{Slope: 0.001}, Datum: 9.5}
	for _, tc := range []struct {
		scale float64
		warn  bool
	}{{3, true}, {1.5, false}, {1.0 / 3, true}} {
		gs := sample(t, p, []float64{1.0, 1.6, 2.2, 2.7, 3.1})
		for i := range gs {
			gs[i].Discharge *= tc.scale
		}
		r, err := gauged.Analyze(gs, gauged.Options{Hydraulic: &c, CompareOnly: true})
		if err != nil {
			t.Fatal(err)
		}
		got := strings.Contains(strings.Join(r.Warnings, "\n"), "the hydraulic rating departs from the gaugings by")
		if got != tc.warn {
			t.Errorf("scale %g: warned %v, want %v (%q)", tc.scale, got, tc.warn, r.Warnings)
		}
		if want := 100 * (tc.scale - 1); math.Abs(r.Comparison.MeanLogDeparturePercent-want) > 1e-6 {
			t.Errorf("scale %g: geometric mean departure %g %%, want %g", tc.scale, r.Comparison.MeanLogDeparturePercent, want)
		}
	}
}
