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

// A posterior whose R̂ is not a finite number (chains that never moved)
// says "R̂ max not determined" in the text report, never +Inf.
func TestFitTextRHatNotDetermined(t *testing.T) {
	gs := labelGaugings([]float64{0.5, 0.6, 0.7, 0.8, 0.9, 1.0, 1.2, 1.4, 1.6, 1.8})
	rep, err := gauged.Analyze(gs, gauged.Options{Site: "test", Units: rating.SI, Method: gauged.Bayesian, Bayes: gauged.BayesOptions{Chains: 2, Draws: 200, Seed: 1}})
	if err != nil {
		t.Fatal(err)
	}
	rep.Fit.Posterior.RHatMax = math.Inf(1)
	var text bytes.Buffer
	if err := results.WriteFitText(&text, rep); err != nil {
		t.Fatal(err)
	}
	if s := text.String(); !strings.Contains(s, "R̂ max not determined (") || strings.Contains(s, "Inf") {
		t.Errorf("text lacks \"R̂ max not determined\" or has Inf:\n%s", s)
	}
}
