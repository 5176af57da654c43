package gauged_test

import (
	"math"
	"math/rand/v2"
	"testing"
	"time"

	"wetline/rating/gauged"
)

// In a Report, the comparison with the hydraulic rating is summarised
// over the gaugings the selection keeps, as the fit and the calibration
// take them: its summary is that of Compare over those gaugings alone,
// the others counted in LeftOut; its residuals still hold every gauging.
// Compare alone summarises every gauging.
func TestComparisonSelected(t *testing.T) {
	c := built(t, "trapezoid:bottom=10,side=2,height=3", 0.035, 0.001)
	gs := gaugeTruth(t, c, linspace(0.3, 1.5, 12), rand.New(rand.NewPCG(3, 5)))
	t0 := time.Date(2022, 1, 1, 0, 0, 0, 0, time.UTC)
	for i := range gs {
		gs[i].Time = t0.AddDate(0, i, 0)
	}
	for _, i := range []int{0, 1, 7} { // off the rating: before the period, listed
		gs[i].Discharge *= 1.6
	}
	gs[4].Exclude, gs[4].Discharge = "ice on the control", gs[4].Discharge*0.5
	sel := gauged.Selection{From: gs[2].Time, Exclude: []time.Time{gs[7].Time}}
	rep, err := gauged.Analyze(gs, gauged.Options{Hydraulic: &c, Controls: gauged.ControlOptions{Selection: sel}})
	if err != nil {
		t.Fatal(err)
	}
	var kept []gauged.Gauging
	for i, g := range gs {
		if i >= 2 && i != 4 && i != 7 {
			kept = append(kept, g)
		}
	}
	want, err := gauged.Compare(kept, c)
	if err != nil {
		t.Fatal(err)
	}
	got := rep.Comparison
	if got.LeftOut != 4 || got.Compared() != len(kept) || got.Outside != want.Outside ||
		math.Abs(got.MeanLogDeparturePercent-want.MeanLogDeparturePercent) > 1e-12 || len(got.Residuals) != len(gs) {
		t.Errorf("summary: left out %d, compared %d, outside %d, mean %g %% of %d residuals; want 4, %d, %d, %g %% of %d",
			got.LeftOut, got.Compared(), got.Outside, got.MeanLogDeparturePercent, len(got.Residuals),
			len(kept), want.Outside, want.MeanLogDeparturePercent, len(gs))
	}
	all, err := gauged.Compare(gs, c)
	if err != nil {
		t.Fatal(err)
	}
	if all.LeftOut != 0 || all.Compared() != len(gs) || !(all.MeanLogDeparturePercent > want.MeanLogDeparturePercent+5) {
		t.Errorf("Compare of every gauging: left out %d, compared %d, mean %g %%", all.LeftOut, all.Compared(), all.MeanLogDeparturePercent)
	}
}
