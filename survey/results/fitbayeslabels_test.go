package results_test

import (
	"bytes"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/subdivide"
	"wetline/survey/results"
)

// A Bayesian report says that its test of one more control is a
// least-squares one (both ratings fitted by weighted least squares), in
// the text report, the workbook and the warning of a poor fit; a
// least-squares report keeps its plain line.
func TestFitMoreControlsSaysLeastSquares(t *testing.T) {
	gs := labelGaugings([]float64{0.5, 0.6, 0.7, 0.8, 0.9, 1.0, 1.2, 1.4, 1.6, 1.8, 2.0, 2.2, 2.4, 2.6})
	for _, tc := range []struct {
		name      string
		method    gauged.Method
		text, not string
		item      string
	}{
		{"Bayesian", gauged.Bayesian, "  one more control, a least-squares test (1 control against 2, both fitted by weighted least squares, not this Bayesian fit): F = ",
			"  one more control: F", "one more control (a least-squares test, not of the Bayesian fit)"},
		{"least squares", gauged.LeastSquares, "  one more control: F = ", "least-squares test", "one more control"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rep, err := gauged.Analyze(gs, gauged.Options{Site: "test", Units: rating.SI, Method: tc.method, Bayes: gauged.BayesOptions{Chains: 2, Draws: 200, Seed: 1}})
			if err != nil {
				t.Fatal(err)
			}
			if !rep.MoreControls.Made {
				t.Fatal("no test of one more control made")
			}
			var text, book bytes.Buffer
			if err := results.WriteFitText(&text, rep); err != nil {
				t.Fatal(err)
			}
			if s := text.String(); !strings.Contains(s, tc.text) || strings.Contains(s, tc.not) {
				t.Errorf("text lacks %q or has %q", tc.text, tc.not)
			}
			if err := results.WriteFitWorkbook(&book, rep); err != nil {
				t.Fatal(err)
			}
			if _, ok := summaryItems(t, openWritten(t, &book))[tc.item]; !ok {
				t.Errorf("workbook has no item %q", tc.item)
			}
		})
	}
}

// A Bayesian fit whose floodplain control starts above every gauging
// counts the parameters of that control neither in the degrees of freedom
// (10 gaugings less the 3 of the channel control: 7) nor silently: the
// parameter count says they rest on their priors.
func TestFitPriorOnlyParameterWords(t *testing.T) {
	sh, err := subdivide.ParseShape("compound:bottom=10,side=2,depth=2,floodplain=30,outer=2,floodn=0.06,height=4")
	if err != nil {
		t.Fatal(err)
	}
	g, err := sh.Build(subdivide.PerRegion{Channel: 0.035})
	if err != nil {
		t.Fatal(err)
	}
	c := rating.HydraulicCurve{Geometry: g, Options: rating.Options{Slope: 0.001}}
	gs := labelGaugings([]float64{0.5, 0.6, 0.7, 0.8, 0.9, 1.0, 1.2, 1.4, 1.6, 1.8})
	rep, err := gauged.Analyze(gs, gauged.Options{Site: "test", Units: rating.SI, Method: gauged.Bayesian, Hydraulic: &c,
		Controls: gauged.ControlOptions{Controls: []gauged.ControlSpec{{Kind: gauged.ChannelControl}, {Kind: gauged.ChannelControl, Joint: gauged.Add}}},
		Bayes:    gauged.BayesOptions{Chains: 2, Draws: 200, Seed: 1}})
	if err != nil {
		t.Fatal(err)
	}
	var text bytes.Buffer
	if err := results.WriteFitText(&text, rep); err != nil {
		t.Fatal(err)
	}
	for _, w := range []string{"10 gaugings, 7 parameters (6 of the rating and the remnant error; 3 of controls above every gauging rest on their priors alone and take no degree of freedom)",
		" in ln Q, 7 degrees of freedom)"} {
		if !strings.Contains(text.String(), w) {
			t.Errorf("text lacks %q", w)
		}
	}
}
