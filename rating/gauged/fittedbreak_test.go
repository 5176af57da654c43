package gauged_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"sort"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
)

// weightedSSR is a least-squares fit's weighted sum of squares
// Σ wᵢ·(ln Qᵢ − ln Q̂ᵢ)², from s² = Σwᵢrᵢ²/(n − p).
func weightedSSR(f *gauged.ControlFit) float64 {
	return f.StandardErrorLog * f.StandardErrorLog * float64(f.StandardErrorDF)
}

// heldBreakGrid returns n breakpoints spread evenly over the admissible
// range of one breakpoint between two controls: above the third lowest
// stage, up to the third highest, so that each control holds
// gauged.MinPerSegment gaugings.
func heldBreakGrid(gs []gauged.Gauging, n int) []float64 {
	hs := make([]float64, len(gs))
	for i, g := range gs {
		hs[i] = g.Stage
	}
	sort.Float64s(hs)
	lo, hi := hs[gauged.MinPerSegment-1], hs[len(hs)-gauged.MinPerSegment]
	out := make([]float64, n)
	for i := range out {
		out[i] = lo + (hi-lo)*float64(i+1)/float64(n)
	}
	return out
}

// The fitted breakpoint of two controls is the least-squares one: the
// weighted sum of squares of the fit with the breakpoint fitted is no
// larger than that of the fit with the breakpoint held at any point of a
// grid over its admissible range (each control holding MinPerSegment
// gaugings). That is the definition of the least-squares estimate
// (ISO 18320:2020, the parameters minimising the sum of squared
// departures in ln Q), checked pointwise over the grid.
//
// Reference: testdata/reference/gaugings-01594440.csv, a copy of
// /work/shared/reference/gaugings-01594440.csv (USGS 01594440 Patuxent
// River near Bowie, MD: 142 field measurements, public domain, from
// DOI-USGS/dataretrieval-python tests/data/waterdata_measurements.txt),
// and seeded synthetic sets of a riffle drowned by the channel
// (invented).
func TestFitControlsBreakIsLeastSquares(t *testing.T) {
	type set struct {
		name  string
		gs    []gauged.Gauging
		units rating.Units
	}
	sets := []set{{"USGS 01594440", patuxentGaugings(t), rating.US}}
	truth := mustRating(t, []gauged.Control{
		{Kind: gauged.SectionControl, A: 4.5, B: 0.25, C: 1.6},
		{Kind: gauged.ChannelControl, A: 4.5 * math.Pow(1.10-0.25, 1.6) / math.Pow(1.10-0.05, 2.1), C: 2.1, From: 1.10},
	})
	quals := []rating.Quality{rating.Good, rating.Fair, rating.Excellent, rating.Poor, rating.Good}
	for _, seed := range []uint64{1, 2, 3, 4} {
		rng := rand.New(rand.NewPCG(seed, 20261204))
		stages := make([]float64, 36)
		for i := range stages {
			stages[i] = 0.32 + 2.4*rng.Float64()
		}
		sets = append(sets, set{fmt.Sprintf("riffle and channel, seed %d", seed), noisy(truth, stages, quals, rng), rating.SI})
	}
	const grid = 60
	for _, s := range sets {
		t.Run(s.name, func(t *testing.T) {
			opt := gauged.ControlOptions{Controls: make([]gauged.ControlSpec, 2), Units: s.units}
			f, err := gauged.FitControls(s.gs, opt)
			if err != nil {
				t.Fatal(err)
			}
			got := weightedSSR(f)
			held, least, at := 0, math.Inf(1), math.NaN()
			for _, b := range heldBreakGrid(s.gs, grid) {
				ho := opt
				ho.Breaks = []float64{b}
				g, err := gauged.FitControls(s.gs, ho)
				if err != nil {
					continue // no rating of two controls joins there
				}
				held++
				if w := weightedSSR(g); w < least {
					least, at = w, b
				}
			}
			if held < grid/2 {
				t.Errorf("only %d of %d held breakpoints fit", held, grid)
			}
			if got > least*(1+1e-9) {
				t.Errorf("breakpoint fitted at %.4f: weighted sum of squares %.6f, more than %.6f with it held at %.4f",
					f.Rating.Controls[1].From, got, least, at)
			}
		})
	}
}
