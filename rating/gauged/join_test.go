package gauged_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
)

// bandValues are a row's discharge and four band limits.
func bandValues(r gauged.ControlRow) [5]float64 {
	return [5]float64{r.Discharge, r.ParametricLower, r.ParametricUpper, r.TotalLower, r.TotalUpper}
}

var bandNames = [5]string{"discharge", "parametric lower", "parametric upper", "total lower", "total upper"}

// checkJoin checks that the table is continuous at the highest gauging
// top: the relative jump of each value from the row there to the table's
// rule a micrometre above it is below a hundredth of the value's change
// over the row step into the join. It returns the join's row index.
func checkJoin(t *testing.T, tab gauged.ControlTable, top float64, above gauged.Basis) int {
	t.Helper()
	j := -1
	for i, r := range tab.Rows {
		if r.Stage == top {
			j = i
		}
	}
	if j < 1 || j+1 >= len(tab.Rows) {
		t.Fatalf("the highest gauging %g is not a row inside the table", top)
	}
	const eps = 1e-6 // m above the join
	up, err := tab.At(top + eps)
	if err != nil {
		t.Fatal(err)
	}
	if up.Basis != above {
		t.Fatalf("%g m above the join: basis %v", eps, up.Basis)
	}
	prev, at, next := bandValues(tab.Rows[j-1]), bandValues(tab.Rows[j]), bandValues(up)
	for k, name := range bandNames {
		step := math.Abs(at[k]/prev[k] - 1)
		if jump := math.Abs(next[k]/at[k] - 1); !(jump < 0.01*step) {
			t.Errorf("%s jumps %.3g %% at the join (%g to %g), against %.3g %% over the step below", name, 100*jump, at[k], next[k], 100*step)
		}
	}
	return j
}

// The conveyance-slope extension of a least-squares fit is joined to the
// fitted rating at the highest gauging: the rating and each band are
// continuous there (see checkJoin), above the join the lower
// bands never fall and no band narrows in ln Q. The gaugings (invented)
// follow a power law the section's conveyance does not, so the mean
// slope of the upper gaugings alone would step the table at the join;
// with little scatter their slope has a trend with stage, whose standard
// error widens the bands.
func TestControlTableExtensionJoin(t *testing.T) {
	survey := built(t, "trapezoid:bottom=10,side=2,height=5", 0.035, 0.001)
	for _, tc := range []struct {
		name   string
		a, b   float64 // Q = a·(h − b)^c
		c      float64
		noise  float64 // log standard deviation of the gaugings
		stages []float64
		seed   uint64
		level  bool // S taken level above the gaugings
	}{
		{"steep law, noisy", 6, 0.05, 1.55, 0.04, linspace(0.3, 1.6, 14), 3, true},
		{"flat law, noisy", 9, -0.05, 1.35, 0.05, linspace(0.4, 1.8, 12), 5, true},
		{"few upper gaugings", 7, 0, 1.5, 0.06, linspace(0.5, 1.4, 6), 7, true},
		{"slope falling with stage", 6, 0.05, 1.4, 0.003, linspace(0.3, 1.6, 14), 9, false},
		{"slope rising with stage", 5, 0.1, 2.1, 0.003, linspace(0.3, 1.6, 14), 11, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rng := rand.New(rand.NewPCG(tc.seed, tc.seed))
			var gs []gauged.Gauging
			for _, h := range tc.stages {
				q := tc.a * math.Pow(h-tc.b, tc.c) * math.Exp(tc.noise*rng.NormFloat64())
				gs = append(gs, gauged.Gauging{Stage: h, Discharge: q, Quality: rating.Fair})
			}
			f, err := gauged.FitControls(gs, gauged.ControlOptions{})
			if err != nil {
				t.Fatal(err)
			}
			tab, err := f.Table(gauged.ControlTableOptions{Hydraulic: &survey, To: 4, Step: 0.01})
			if err != nil {
				t.Fatal(err)
			}
			if tab.Extension == nil {
				t.Fatalf("no extension: %q", tab.Warnings)
			}
			if e := tab.Extension; e.Level != tc.level {
				t.Errorf("S level %v (trend %.3g, p %.2g), want %v", e.Level, e.Trend, e.TrendP, tc.level)
			}
			j := tab.Rows[checkJoin(t, tab, f.HighStage, gauged.ConveyanceSlopeAbove)]
			// The gaugings' own S line at the join, off the fitted rating's
			// prediction band there, is warned of.
			x := tab.Extension.Join
			own := x.Conveyance * math.Exp(0.5*x.GaugedLogSlope)
			if off := own < j.TotalLower || own > j.TotalUpper; off != hasWarning(tab.Warnings, "own slope S would give") {
				t.Errorf("gaugings' own S gives %g at the join, band %g to %g: warnings %q", own, j.TotalLower, j.TotalUpper, tab.Warnings)
			}
			var prev *gauged.ControlRow
			for i := range tab.Rows {
				r := tab.Rows[i]
				if r.Stage < f.HighStage {
					continue
				}
				if prev != nil {
					const tol = 1e-12 // round-off
					if r.ParametricLower < prev.ParametricLower*(1-tol) || r.TotalLower < prev.TotalLower*(1-tol) {
						t.Errorf("lower band falls from %g to %g m: parametric %g → %g, total %g → %g", prev.Stage, r.Stage,
							prev.ParametricLower, r.ParametricLower, prev.TotalLower, r.TotalLower)
					}
					if r.Discharge < prev.Discharge || r.ParametricUpper < prev.ParametricUpper || r.TotalUpper < prev.TotalUpper {
						t.Errorf("discharge or upper band falls from %g to %g m: %+v", prev.Stage, r.Stage, r)
					}
					if math.Log(r.ParametricUpper/r.ParametricLower) < math.Log(prev.ParametricUpper/prev.ParametricLower)*(1-tol) ||
						math.Log(r.TotalUpper/r.TotalLower) < math.Log(prev.TotalUpper/prev.TotalLower)*(1-tol) {
						t.Errorf("band narrows from %g to %g m: %+v then %+v", prev.Stage, r.Stage, *prev, r)
					}
				}
				prev = &tab.Rows[i]
			}
		})
	}
}

// Checked by hand: a rectangle 20 m wide surveyed with n = 0.030 and
// gaugings (noise-free, invented) of a Manning rating of n = 0.025 at the
// same slope 0.001, from 0.3 to 1.5 m. Every gauging's effective slope is
// then the same, so S is level and above the highest gauging the table is
// the fitted discharge there scaled by the conveyance: Q(h) =
// Q̂(1.5)·K(h)/K(1.5), with K = A·R^(2/3)/n (Manning; Chow, 1959, eq. 6-9)
// for A = 20·y, P = 20 + 2·y: K(1.5) = 1193.79, K(2.0) = 1874.29 and
// K(2.5) = 2645.67 m³/s, ratios 1.57003 and 2.21619 (hand calculation).
// With exact gaugings the trend of ln S has no standard error and the
// rectangle no overbanks, so neither allowance of ConveyanceSlope.At
// widens the bands: they keep their width in ln Q from the join, and the true Manning
// discharge, 71.12 m³/s at 2.0 m and 100.40 m³/s at 2.5 m (hand
// calculation), lies within 1 % of the table.
func TestControlTableExtensionRectangle(t *testing.T) {
	survey := built(t, "rectangle:width=20,height=4", 0.030, 0.001)
	truth := built(t, "rectangle:width=20,height=4", 0.025, 0.001)
	gs := gaugeTruth(t, truth, linspace(0.3, 1.5, 13), nil)
	f, err := gauged.FitControls(gs, gauged.ControlOptions{})
	if err != nil {
		t.Fatal(err)
	}
	tab, err := f.Table(gauged.ControlTableOptions{Hydraulic: &survey, To: 2.5, Step: 0.5})
	if err != nil {
		t.Fatal(err)
	}
	if tab.Extension == nil || !tab.Extension.Level {
		t.Fatalf("extension %+v, warnings %q", tab.Extension, tab.Warnings)
	}
	checkJoin(t, tab, f.HighStage, gauged.ConveyanceSlopeAbove)
	join, err := tab.At(1.5)
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		h, ratio, truth float64
	}{
		{2.0, 1.57003, 71.12},
		{2.5, 2.21619, 100.40},
	} {
		r, err := tab.At(tc.h)
		if err != nil {
			t.Fatal(err)
		}
		const tol = 1e-5 // the hand calculation's six figures
		if want := join.Discharge * tc.ratio; r.Basis != gauged.ConveyanceSlopeAbove || relErr(r.Discharge, want) > tol {
			t.Errorf("%g m: %v %g, want %g = %g × %g", tc.h, r.Basis, r.Discharge, want, join.Discharge, tc.ratio)
		}
		if relErr(r.Discharge, tc.truth) > 0.01 {
			t.Errorf("%g m: %g, true Manning discharge %g", tc.h, r.Discharge, tc.truth)
		}
		for k, name := range bandNames[1:] {
			const roundOff = 1e-9
			if got, want := bandValues(r)[k+1]/r.Discharge, bandValues(join)[k+1]/join.Discharge; relErr(got, want) > roundOff {
				t.Errorf("%g m: %s at %g of the discharge, %g at the join", tc.h, name, got, want)
			}
		}
	}
}

// A Bayesian table with a section carries the fitted controls on above
// the highest gauging, its bands the posterior's: continuous there as
// well (see checkJoin).
func TestControlTableBayesJoin(t *testing.T) {
	truth := built(t, "trapezoid:bottom=10,side=2,height=5", 0.035, 0.001)
	survey := built(t, "trapezoid:bottom=10,side=2,height=5", 0.040, 0.0012)
	gs := gaugeTruth(t, truth, linspace(0.3, 1.5, 12), rand.New(rand.NewPCG(12, 12)))
	f, err := gauged.FitBayes(gs, gauged.BayesOptions{
		ControlOptions: gauged.ControlOptions{Controls: []gauged.ControlSpec{{Kind: gauged.ChannelControl}}},
		Hydraulic:      &survey, Chains: 2, Draws: 1000, Seed: 3,
	})
	if err != nil {
		t.Fatal(err)
	}
	tab, err := f.Table(gauged.ControlTableOptions{Hydraulic: &survey, To: 3, Step: 0.01, ShowUnconverged: true})
	if err != nil {
		t.Fatal(err)
	}
	checkJoin(t, tab, f.HighStage, gauged.FitAboveGaugings)
}
