package gauged_test

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"wetline/rating"
	"wetline/rating/gauged"
)

// TestBandFloor: a least-squares fit gives no band below B₁ + t·SE(B₁),
// where the delta method's upper bound Q·exp(t·C·SE(B₁)/(h − B₁)) turns
// and rises as h falls to B₁ (its minimum over h is at h − B₁ = t·SE(B₁):
// d/dh [C ln(h − B) + tCσ/(h − B)] = 0 there, closed form), and says so
// once; above the floor the bands are given and the upper one does not
// fall as the stage rises. Gaugings: invented, from Q = 5·(h − 0.3)^1.7
// with seeded noise of a good gauging's band.
func TestBandFloor(t *testing.T) {
	gs := floorGaugings()
	f, err := gauged.FitControls(gs, gauged.ControlOptions{})
	if err != nil {
		t.Fatal(err)
	}
	c := f.Controls[0]
	tq := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(f.StandardErrorDF)}.Quantile(0.5 + gauged.FitBandLevel/2)
	floor := f.BandFloor()
	if !(c.BSE > 0) || math.Abs(floor-(c.B+tq*c.BSE)) > 1e-12 {
		t.Fatalf("floor %g, want B %g + t %g · SE %g", floor, c.B, tq, c.BSE)
	}
	tab, err := f.Table(gauged.ControlTableOptions{Step: 0.002})
	if err != nil {
		t.Fatal(err)
	}
	var below, above int
	prev := 0.0
	for _, r := range tab.Rows {
		switch {
		case r.Stage <= c.B:
		case r.Stage < floor:
			below++
			if !math.IsNaN(r.ParametricUpper) || !math.IsNaN(r.TotalLower) {
				t.Errorf("at %g, below the floor %g: bands %g, %g", r.Stage, floor, r.ParametricUpper, r.TotalLower)
			}
		default:
			above++
			if !(r.ParametricLower <= r.Discharge && r.Discharge <= r.ParametricUpper) {
				t.Errorf("at %g: discharge %g outside its band %g to %g", r.Stage, r.Discharge, r.ParametricLower, r.ParametricUpper)
			}
			if r.ParametricUpper < prev {
				t.Errorf("at %g the upper band falls to %g from %g", r.Stage, r.ParametricUpper, prev)
			}
			prev = r.ParametricUpper
		}
	}
	if below == 0 || above == 0 {
		t.Fatalf("%d rows below the floor, %d above: the table does not test it", below, above)
	}
	n := 0
	for _, w := range tab.Warnings {
		if strings.Contains(w, "no bands below gauge height") {
			n++
		}
	}
	if n != 1 {
		t.Errorf("warnings %q: want one on the band floor", tab.Warnings)
	}
}

// TestFitBandFloor: the segment fit of the library (FitPowerLaw) has the
// same floor, e + t·SE(e): below it no band (unfloored, the upper bound
// was 6783 m³/s at 1 mm above e on these gaugings, closed form as in
// TestBandFloor); above it the band holds the fitted discharge.
func TestFitBandFloor(t *testing.T) {
	gs := floorGaugings()
	f, err := gauged.FitPowerLaw(gs, gauged.FitOptions{})
	if err != nil {
		t.Fatal(err)
	}
	floor := f.BandFloor()
	if !(f.ZeroFlowSE > 0) || !(floor > f.ZeroFlow) {
		t.Fatalf("floor %g, e %g ± %g: want a floor above e", floor, f.ZeroFlow, f.ZeroFlowSE)
	}
	for _, h := range []float64{f.ZeroFlow + 0.001, f.ZeroFlow + 0.003, (f.ZeroFlow + floor) / 2} {
		if lo, hi := f.Band(h); !math.IsNaN(lo) || !math.IsNaN(hi) {
			t.Errorf("at %g, below the floor %g: band %g to %g", h, floor, lo, hi)
		}
	}
	for _, h := range []float64{floor + 0.01, 1, 2} {
		lo, hi := f.Band(h)
		if q := f.Discharge(h); !(lo <= q && q <= hi) {
			t.Errorf("at %g: discharge %g outside its band %g to %g", h, q, lo, hi)
		}
	}
}

// floorGaugings are the band-floor tests' gaugings: invented, from
// Q = 5·(h − 0.3)^1.7 with seeded noise of a good gauging's band.
func floorGaugings() []gauged.Gauging {
	rng := rand.New(rand.NewPCG(7, 11))
	var gs []gauged.Gauging
	for i := range 12 {
		h := 0.45 + 0.18*float64(i)
		g := gauged.Gauging{Stage: h, Discharge: 5 * math.Pow(h-0.3, 1.7), Quality: rating.Good}
		g.Discharge *= math.Exp(g.LogSigma() * rng.NormFloat64())
		gs = append(gs, g)
	}
	return gs
}
