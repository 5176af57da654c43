package gauged

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

// replacingRating returns the rating of controls that each replace the one
// below, control j with offset b[j] and exponent c[j], from breakpoint
// from[j−1]; the first has coefficient a0, each later one the coefficient
// that makes it continuous at its breakpoint (NewRating).
func replacingRating(t *testing.T, a0 float64, b, c, from []float64) Rating {
	t.Helper()
	cs := []Control{{A: a0, B: b[0], C: c[0]}}
	for j := 1; j < len(b); j++ {
		r, err := NewRating(cs)
		if err != nil {
			t.Fatal(err)
		}
		q := r.upTo(j-1, from[j-1])
		cs = append(cs, Control{Joint: Replace, A: q / math.Pow(from[j-1]-b[j], c[j]), C: c[j], From: from[j-1]})
	}
	r, err := NewRating(cs)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// The breakpoints of three and four controls fitted by least squares give
// a weighted sum of squares no larger than the fit with the breakpoints
// held where the gaugings were made from, and no larger than the polish
// (every parameter free) from each trial set of breakpoints: least squares
// is the least sum over every breakpoint (ISO 18320:2020, the parameters
// minimising the sum of squared departures in ln Q), so no fit from any
// start may beat the one reported. Two polishes into one basin end where
// their steps stop lowering the sum, which they do a little apart: the
// trial sets are allowed polishTol of the sum more (a 10⁻⁴ share of it,
// far below what the scatter of the gaugings could tell apart; a project
// choice). Seeded synthetic gaugings of a pool
// control, a riffle, a channel and a floodplain (invented), 5 % scatter in
// ln Q.
func TestFitControlsBreaksBeatTrialSets(t *testing.T) {
	const polishTol = 1e-4
	cases := []struct {
		k       int
		n       int
		b, c    []float64
		from    []float64
		seeds   []uint64
		lo, top float64
	}{
		{3, 60, []float64{0.12, 0.35, -0.6}, []float64{1.7, 2.3, 3.1}, []float64{0.9, 1.9}, []uint64{1}, 0.2, 3.6},
		{4, 72, []float64{0.12, 0.35, -0.6, 1.2}, []float64{1.7, 2.3, 3.1, 1.6}, []float64{0.9, 1.7, 2.7}, []uint64{1}, 0.2, 3.9},
	}
	for _, c := range cases {
		truth := replacingRating(t, 11, c.b, c.c, c.from)
		for _, seed := range c.seeds {
			t.Run(fmt.Sprintf("%d controls, seed %d", c.k, seed), func(t *testing.T) {
				rng := rand.New(rand.NewPCG(seed, 20261204))
				gs := make([]Gauging, c.n)
				for i := range gs {
					h := c.lo + (c.top-c.lo)*rng.Float64()
					gs[i] = Gauging{Stage: h, Discharge: truth.Discharge(h) * math.Exp(0.05*rng.NormFloat64())}
				}
				opt := ControlOptions{Controls: make([]ControlSpec, c.k)}
				f, err := FitControls(gs, opt)
				if err != nil {
					t.Fatal(err)
				}
				got := f.StandardErrorLog * f.StandardErrorLog * float64(f.StandardErrorDF)
				held := opt
				held.Breaks = c.from
				g, err := FitControls(gs, held)
				if err != nil {
					t.Fatal(err)
				}
				if want := g.StandardErrorLog * g.StandardErrorLog * float64(g.StandardErrorDF); got > want*(1+1e-9) {
					t.Errorf("fitted breakpoints %.4f: weighted sum of squares %.6f, more than %.6f with them held at %v", f.Rating.breaks(), got, want, c.from)
				}
				if testing.Short() {
					return
				}
				p, _, _, err := newLSQProblem(gs, opt)
				if err != nil {
					t.Fatal(err)
				}
				for _, br := range p.breakSets() {
					s, err := p.sequential(br)
					if err != nil {
						continue
					}
					x, ssr, err := p.solveFrom([][]float64{s})
					if err != nil || p.runaway(x) >= 0 {
						continue
					}
					if got > ssr*(1+polishTol) {
						t.Errorf("fitted breakpoints %.4f: weighted sum of squares %.6f, more than %.6f polished from the trial set %.4f (to %.4f)",
							f.Rating.breaks(), got, ssr, br, p.m.breaksOf(p.m.full(x)))
					}
				}
			})
		}
	}
}

// breaks returns the breakpoints of a rating.
func (r Rating) breaks() []float64 {
	var out []float64
	for _, c := range r.Controls[1:] {
		out = append(out, c.From)
	}
	return out
}
