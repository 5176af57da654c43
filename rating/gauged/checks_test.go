package gauged_test

import (
	"errors"
	"math"
	"strings"
	"testing"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/subdivide"
)

// Johnson's three-point method is exact for an exact power law: with
// Q₂ = √(Q₁Q₃), (G₂ − e)² = (G₁ − e)(G₃ − e) (closed form; Rantz, 1982,
// WSP 2175, from memory).
func TestJohnsonExact(t *testing.T) {
	for _, tc := range []struct{ a, e, c, h1, h3 float64 }{
		{4, 0.2, 1.8, 0.5, 2.6},
		{120, 101.35, 2.4, 101.5, 104.2},
		{0.8, -1.5, 1.55, -1.2, 3.0},
	} {
		q := func(h float64) float64 { return tc.a * math.Pow(h-tc.e, tc.c) }
		h2 := tc.e + math.Pow(math.Sqrt(q(tc.h1)*q(tc.h3))/tc.a, 1/tc.c)
		e, err := gauged.JohnsonZeroFlow(tc.h1, h2, tc.h3)
		const tol = 1e-9 // round-off, relative to the stage span
		if err != nil || math.Abs(e-tc.e) > tol*(tc.h3-tc.h1+math.Abs(tc.e)) {
			t.Errorf("e = %.12g, %v; want %g", e, err, tc.e)
		}
	}
	if _, err := gauged.JohnsonZeroFlow(1, 2, 3); !errors.Is(err, gauged.ErrJohnson) {
		t.Errorf("straight line: err = %v", err)
	}
	if _, err := gauged.JohnsonZeroFlow(1, 3, 2); !errors.Is(err, gauged.ErrJohnson) {
		t.Errorf("not rising: err = %v", err)
	}
}

// From gaugings of an exact power law the fit reports Johnson's estimate,
// read from local quadratics drawn through them, near the true offset (the
// quadratics stand in for the hand-drawn curve: within 2 % of the gauged
// depth, a project tolerance).
func TestJohnsonFromFit(t *testing.T) {
	var gs []gauged.Gauging
	for _, h := range linspace(0.5, 2.6, 15) {
		gs = append(gs, gauged.Gauging{Stage: h, Discharge: 4 * math.Pow(h-0.2, 1.8), Quality: rating.Good})
	}
	f, err := gauged.FitControls(gs, gauged.ControlOptions{})
	if err != nil {
		t.Fatal(err)
	}
	j := f.Johnson
	t.Logf("Johnson estimate %.5f, true offset 0.2", j.ZeroFlow)
	if !j.OK || math.Abs(j.ZeroFlow-0.2) > 0.02*(2.6-0.2) || relErr(j.Q2, math.Sqrt(j.Q1*j.Q3)) > 1e-12 {
		t.Errorf("Johnson %+v", j)
	}
}

// The ISO tests of a relation on constructed departures with p-values in
// closed form: binomial sums for the sign and runs tests, and for the
// t-test Student's t with 1 and 2 degrees of freedom, whose two-sided
// tails are 1 − (2/π)·atan|t| and 1 − |t|/√(2 + t²).
func TestRelationTests(t *testing.T) {
	const tol = 1e-12 // round-off of the distribution functions
	for _, tc := range []struct {
		name string
		dep  []float64
		test func([]float64) gauged.RelationTest
		stat float64
		p    float64
	}{
		{"sign, all ten positive", []float64{1, 2, 1, 3, 1, 1, 2, 1, 1, 4}, gauged.SignTest, 10, 2 * math.Pow(0.5, 10)},
		{"sign, 8 of 10 positive", []float64{1, 1, -1, 1, 1, 1, -1, 1, 1, 1}, gauged.SignTest, 8, 2 * (45.0 + 10 + 1) / 1024},
		{"sign, balanced", []float64{1, -1, 1, -1, 0, 1, -1}, gauged.SignTest, 3, 1},
		{"runs, alternating", []float64{1, -1, 1, -1, 1, -1, 1, -1, 1, -1}, gauged.RunsTest, 9, 1},
		{"runs, two runs of five", []float64{1, 2, 1, 3, 1, -1, -2, -1, -1, -3}, gauged.RunsTest, 1, (1.0 + 9) / 512},
		{"mean, two departures", []float64{1, 3}, gauged.MeanDepartureTest, 2, 1 - 2/math.Pi*math.Atan(2)},
		{"mean, three departures", []float64{1, 2, 6}, gauged.MeanDepartureTest, 3 * math.Sqrt(3) / math.Sqrt(7),
			1 - (3*math.Sqrt(3)/math.Sqrt(7))/math.Sqrt(2+27.0/7)},
	} {
		r := tc.test(tc.dep)
		if math.Abs(r.Statistic-tc.stat) > tol || math.Abs(r.P-tc.p) > tol {
			t.Errorf("%s: statistic %.15g p %.15g, want %.15g and %.15g", tc.name, r.Statistic, r.P, tc.stat, tc.p)
		}
		if r.Failed != (tc.p < gauged.RelationTestLevel) {
			t.Errorf("%s: failed %v at p %g", tc.name, r.Failed, r.P)
		}
	}
	if r := gauged.MeanDepartureTest([]float64{2}); !math.IsNaN(r.P) {
		t.Errorf("one departure: p %g", r.P)
	}
}

// Potential scale reduction on a small example worked by hand from the
// formula of Gelman & Rubin (1992) on split chains (Gelman et al., 2013,
// BDA3, section 11.4): halves [1 2] [3 4] [2 3] [4 5], W = 0.5, B/n = 5/3,
// V = ½·0.5 + 5/3, R̂ = √(V/W).
func TestRHatByHand(t *testing.T) {
	got := gauged.RHat([][]float64{{1, 2, 3, 4}, {2, 3, 4, 5}})
	want := math.Sqrt((0.25 + 5.0/3) / 0.5)
	if math.Abs(got-want) > 1e-12 {
		t.Errorf("R̂ = %.15g, want %.15g", got, want)
	}
	if got := gauged.RHat([][]float64{{3, 3, 3, 3}, {3, 3, 3, 3}}); got != 1 {
		t.Errorf("constant chains: %g", got)
	}
}

// A gauging is outside its band by its own uncertainty when it gives one,
// else by its quality's band (excellent 2 %, good 5 %, fair 8 %;
// Turnipseed and Sauer 2010, USGS TM 3-A8); an unrated gauging is held to the fair
// band it is weighted with; a poor one's band is open above, so it is
// never outside.
func TestGaugingOutside(t *testing.T) {
	for _, tc := range []struct {
		name string
		g    gauged.Gauging
		d    float64
		want bool
	}{
		{"good within 5 %", gauged.Gauging{Quality: rating.Good}, 4.9, false},
		{"good beyond 5 %", gauged.Gauging{Quality: rating.Good}, -5.1, true},
		{"unrated beyond 8 %", gauged.Gauging{}, 14.1, true},
		{"unrated within 8 %", gauged.Gauging{}, -7.9, false},
		{"poor far off", gauged.Gauging{Quality: rating.Poor}, 40, false},
		{"uncertainty 3 % over good", gauged.Gauging{Quality: rating.Good, Uncertainty: 3}, 4, true},
		{"uncertainty 12 % over good", gauged.Gauging{Quality: rating.Good, Uncertainty: 12}, -9, false},
		{"uncertainty on an unrated gauging", gauged.Gauging{Uncertainty: 5}, 6, true},
		{"uncertainty on a poor gauging", gauged.Gauging{Quality: rating.Poor, Uncertainty: 20}, 25, true},
	} {
		if got := tc.g.Outside(tc.d); got != tc.want {
			t.Errorf("%s: Outside(%g) = %v, want %v", tc.name, tc.d, got, tc.want)
		}
		// Without its own uncertainty, the gauging is judged as its
		// quality is: one rule, not two.
		if tc.g.Uncertainty == 0 {
			if got := tc.g.Quality.Outside(tc.d); got != tc.want {
				t.Errorf("%s: Quality.Outside(%g) = %v, want %v", tc.name, tc.d, got, tc.want)
			}
		}
	}
}

// A gauging above the section's lower end is warned of with that end's
// gauge height as the gauge is read (4 decimals): a rectangle 3.1 m high
// on a gauge whose zero is at 49.8 m has its top at 52.9 − 49.8 = 3.1 on
// the gauge, which binary floating point makes 3.1000000000000014.
func TestCompareWarningGaugeHeight(t *testing.T) {
	c := built(t, "rectangle:width=5,height=3", 0.035, 0.001)
	g, err := subdivide.Compile(subdivide.Section{Points: subdivide.XZ(0, 52.9, 0, 49.8, 5, 49.8, 5, 52.9), N: []float64{0.035, 0.035, 0.035}})
	if err != nil {
		t.Fatal(err)
	}
	c.Geometry, c.Datum = g, 49.8
	cmp, err := gauged.Compare([]gauged.Gauging{{Stage: 3.5, Discharge: 40, Quality: rating.Good}}, c)
	if err != nil {
		t.Fatal(err)
	}
	w := strings.Join(cmp.Warnings, "\n")
	if !strings.Contains(w, "is above the lower end of the section (3.1 on the gauge)") {
		t.Errorf("warnings %q", w)
	}
}

// Unmatched names the times to exclude that are no gauging's, each with
// the nearest gauging's time; a time written at another offset that is
// the same instant matches.
func TestSelectionUnmatched(t *testing.T) {
	at := func(h int) time.Time { return time.Date(2024, 5, 1, h, 0, 0, 0, time.UTC) }
	gs := []gauged.Gauging{{Time: at(8)}, {Time: at(12)}}
	sel := gauged.Selection{Exclude: []time.Time{at(11), at(8).In(time.FixedZone("", 10*3600)), at(1)}}
	got := sel.Unmatched(gs)
	if len(got) != 2 || !got[0].Time.Equal(at(11)) || !got[0].Nearest.Equal(at(12)) || !got[1].Time.Equal(at(1)) || !got[1].Nearest.Equal(at(8)) {
		t.Errorf("unmatched %+v", got)
	}
}

// Reference: testdata/reference/gaugings-01594440.csv (USGS 01594440).
// The mean departure test of a weighted least-squares fit is made on its
// unweighted departures in ln Q, as ISO 1100-2 gives it for gaugings: on
// one control fitted to the 142 measurements t = −2.11 (p = 0.037), a
// failure. The weighted mean of the same departures is
// zero by the normal equation of ln A, so a weighted test would read
// t = 0 and p = 1 on every least-squares fit; the test must not be that.
func TestMeanDepartureTestIsUnweighted(t *testing.T) {
	gs := patuxentGaugings(t)
	f, err := gauged.FitControls(gs, gauged.ControlOptions{Units: rating.US})
	if err != nil {
		t.Fatal(err)
	}
	var dep []float64
	var sw, swr float64
	for _, r := range f.Residuals {
		if r.Excluded {
			continue
		}
		dep = append(dep, r.LogResidual)
		sw, swr = sw+r.Weight, swr+r.Weight*r.LogResidual
	}
	if !(math.Abs(swr/sw) < 1e-4) {
		t.Errorf("weighted mean departure %.3g, want 0 (normal equation of ln A)", swr/sw)
	}
	m := f.Tests.Mean
	if math.Abs(m.Statistic+2.11) > 0.01 || !m.Failed || m.N != 142 {
		t.Errorf("mean departure test %+v, want t = −2.11 on 142 departures, failed", m)
	}
	if u := gauged.MeanDepartureTest(dep); math.Abs(u.Statistic-m.Statistic) > 1e-9 {
		t.Errorf("reported t %.4f, the unweighted departures' %.4f", m.Statistic, u.Statistic)
	}
}
