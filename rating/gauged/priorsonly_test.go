package gauged_test

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"wetline/rating/gauged"
)

// A Bayesian fit whose floodplain control starts above every gauging
// (its breakpoint at the section's bank stage) counts none of that
// control's three parameters in the degrees of freedom: they rest on the
// prior. By hand, from the fit's own residuals at the posterior mode
// (every gauging of one quality, so every weight is 1), the standard
// error of estimate is s = √(Σ rᵢ² / (n − 3)), 3 the parameters of the
// channel control (ln A, C and the offset), and its degrees of freedom
// n − 3 (the definition of the weighted standard error of estimate with
// p fitted parameters, from memory).
func TestBayesStandardErrorSkipsEmptyControls(t *testing.T) {
	c := built(t, "compound:bottom=10,side=2,depth=2,floodplain=30,outer=2,floodn=0.06,height=4", 0.035, 0.001)
	gs := gaugeTruth(t, c, linspace(0.3, 1.7, 10), rand.New(rand.NewPCG(7, 1)))
	spec := gauged.ControlOptions{Controls: []gauged.ControlSpec{{Kind: gauged.ChannelControl}, {Kind: gauged.ChannelControl, Joint: gauged.Add}}}
	f, err := gauged.FitBayes(gs, gauged.BayesOptions{ControlOptions: spec, Hydraulic: &c, Chains: 2, Draws: 500, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	if from := f.Rating.Controls[1].From; !(from > 1.7) {
		t.Fatalf("control 2 starts at %g, not above every gauging (1.7)", from)
	}
	var ss float64
	for _, r := range f.Residuals {
		ss += r.LogResidual * r.LogResidual
	}
	n := len(gs)
	want := math.Sqrt(ss / float64(n-3))
	if f.StandardErrorDF != n-3 || math.Abs(f.StandardErrorLog-want) > 1e-9*want {
		t.Errorf("standard error %g with %d degrees of freedom; by hand %g with %d", f.StandardErrorLog, f.StandardErrorDF, want, n-3)
	}
	if f.PriorOnlyParams != 3 || f.Params != 7 {
		t.Errorf("%d parameters on the prior alone of %d, want 3 of 7", f.PriorOnlyParams, f.Params)
	}
	held := false
	for _, w := range f.Warnings {
		held = held || strings.Contains(w, "control 2 holds 0 gaugings")
	}
	if !held {
		t.Errorf("no warning that control 2 holds no gauging: %q", f.Warnings)
	}
}
