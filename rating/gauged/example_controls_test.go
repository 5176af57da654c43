package gauged_test

import (
	"fmt"
	"math"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/subdivide"
)

// A riffle drowned by the channel at 1.1 m: continuity fixes the
// channel control's own offset.
func ExampleNewRating() {
	r, err := gauged.NewRating([]gauged.Control{
		{Kind: gauged.SectionControl, A: 4, B: 0.30, C: 2.3},
		{Kind: gauged.ChannelControl, Joint: gauged.Replace, A: 11, C: 1.7, From: 1.1},
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("channel offset %.4f m\n", r.Controls[1].B)
	for _, h := range []float64{0.8, 1.1, 2.0} {
		fmt.Printf("Q(%.1f m) = %.3f m3/s\n", h, r.Discharge(h))
	}
	// Output:
	// channel offset 0.6922 m
	// Q(0.8 m) = 0.812 m3/s
	// Q(1.1 m) = 2.394 m3/s
	// Q(2.0 m) = 17.359 m3/s
}

// Least squares finds both offsets and the breakpoint from gaugings that
// follow the riffle-and-channel rating exactly.
func ExampleFitControls() {
	truth, _ := gauged.NewRating([]gauged.Control{
		{A: 4, B: 0.30, C: 2.3},
		{A: 11, C: 1.7, From: 1.1},
	})
	var gs []gauged.Gauging
	for i := 0; i < 24; i++ {
		h := 0.45 + 0.12*float64(i)
		gs = append(gs, gauged.Gauging{Stage: h, Discharge: truth.Discharge(h), Quality: rating.Good})
	}
	f, err := gauged.FitControls(gs, gauged.ControlOptions{Controls: []gauged.ControlSpec{{Kind: gauged.SectionControl}, {Kind: gauged.ChannelControl}}})
	if err != nil {
		fmt.Println(err)
		return
	}
	for j, c := range f.Controls {
		fmt.Printf("control %d (%s): Q = %.3f·(h − %.3f)^%.3f from %.3f m\n", j+1, c.Kind, c.A, c.B, c.C, c.From)
	}
	fmt.Printf("standard error %.1f %%\n", f.StandardErrorPercent)
	// Output:
	// control 1 (section): Q = 4.000·(h − 0.300)^2.300 from 0.300 m
	// control 2 (channel): Q = 11.000·(h − 0.692)^1.700 from 1.100 m
	// standard error 0.0 %
}

// A Bayesian fit of a channel control whose prior comes from the
// section's hydraulic rating; the gaugings reach 1.5 m, the table goes to
// the section's top at 3 m with both bands on every row.
func ExampleFitBayes() {
	shape := "trapezoid:bottom=10,side=2,height=3"
	truth := section(shape, 0.035, 0.001)
	survey := section(shape, 0.040, 0.001) // n surveyed a little high
	var gs []gauged.Gauging
	for i := 0; i < 10; i++ {
		h := 0.3 + 0.13*float64(i)
		q, _ := truth.Discharge(h)
		gs = append(gs, gauged.Gauging{Stage: h, Discharge: q, Quality: rating.Good})
	}
	f, err := gauged.FitBayes(gs, gauged.BayesOptions{
		ControlOptions: gauged.ControlOptions{Controls: []gauged.ControlSpec{{Kind: gauged.ChannelControl}}},
		Hydraulic:      &survey, Draws: 2000, Seed: 1,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("converged:", f.Posterior.Converged)
	t, err := f.Table(gauged.ControlTableOptions{Hydraulic: &survey, Step: 1})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, r := range t.Rows[1:] {
		q, _ := truth.Discharge(r.Stage)
		fmt.Printf("%.2f m: truth %5.1f, total band %5.1f to %5.1f m3/s (%s)\n", r.Stage, q, r.TotalLower, r.TotalUpper, r.Basis)
	}
	// Output:
	// converged: true
	// 0.30 m: truth   1.2, total band   1.2 to   1.3 m3/s (fit)
	// 1.00 m: truth   9.6, total band   9.3 to   9.9 m3/s (fit)
	// 1.47 m: truth  18.8, total band  18.0 to  19.5 m3/s (fit)
	// 2.00 m: truth  32.8, total band  30.3 to  34.3 m3/s (fit above gaugings)
	// 3.00 m: truth  70.0, total band  59.5 to  72.6 m3/s (fit above gaugings)
}

func section(spec string, n, slope float64) rating.HydraulicCurve {
	s, err := subdivide.ParseShape(spec)
	if err != nil {
		panic(err)
	}
	g, err := s.Build(subdivide.PerRegion{Channel: n})
	if err != nil {
		panic(err)
	}
	return rating.HydraulicCurve{Geometry: g, Options: rating.Options{Slope: slope}}
}

// Johnson's three-point estimate on Q = 4·(h − 0.2)^1.8: the stages of
// 1 and 16 m³/s and of their geometric mean 4 m³/s.
func ExampleJohnsonZeroFlow() {
	g := func(q float64) float64 { return 0.2 + math.Pow(q/4, 1/1.8) }
	e, err := gauged.JohnsonZeroFlow(g(1), g(4), g(16))
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("e = %.4f m\n", e)
	// Output: e = 0.2000 m
}

// The ISO tests on departures that change sign only once: balanced in
// sign, but one long run each way.
func ExampleRelationChecks() {
	t := gauged.RelationChecks([]float64{0.02, 0.03, 0.01, 0.02, 0.04, -0.01, -0.03, -0.02, -0.02, -0.04})
	for _, r := range []gauged.RelationTest{t.Sign, t.Runs, t.Mean} {
		fmt.Printf("%s: statistic %.3g, p = %.4f, failed %v\n", r.Name, r.Statistic, r.P, r.Failed)
	}
	// Output:
	// sign: statistic 5, p = 1.0000, failed false
	// runs: statistic 1, p = 0.0195, failed true
	// mean departure: statistic 0, p = 1.0000, failed false
}
