package gauged_test

import (
	"math/rand/v2"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
)

// threeControls is a riffle drowned by the channel, then a floodplain
// that adds (invented), with 50 gaugings over all three.
func threeControls(tb testing.TB) ([]gauged.Gauging, []gauged.ControlSpec) {
	truth := mustRating(tb, []gauged.Control{
		{Kind: gauged.SectionControl, A: 4, B: 0.30, C: 2.3},
		{Kind: gauged.ChannelControl, A: 11, C: 1.7, From: 1.1},
		{Kind: gauged.ChannelControl, Joint: gauged.Add, A: 30, C: 1.6, From: 2.6},
	})
	gs := noisy(truth, linspace(0.45, 3.6, 50), []rating.Quality{rating.Good, rating.Fair, rating.Excellent}, rand.New(rand.NewPCG(9, 9)))
	return gs, []gauged.ControlSpec{{Kind: gauged.SectionControl}, {Kind: gauged.ChannelControl}, {Kind: gauged.ChannelControl, Joint: gauged.Add}}
}

// A Bayesian fit of three controls (breakpoints fitted) to 50 gaugings:
// four chains of 20 000 kept draws each (plus the default pilot).
func BenchmarkFitBayesThreeControls(b *testing.B) {
	gs, specs := threeControls(b)
	opt := gauged.BayesOptions{ControlOptions: gauged.ControlOptions{Controls: specs}, Chains: 4, Draws: 20000, Seed: 1}
	for b.Loop() {
		f, err := gauged.FitBayes(gs, opt)
		if err != nil {
			b.Fatal(err)
		}
		b.ReportMetric(f.Posterior.RHatMax, "rhat_max")
		b.ReportMetric(f.Posterior.ESSMin, "ess_min")
	}
}
