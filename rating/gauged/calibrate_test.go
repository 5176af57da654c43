package gauged_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/subdivide"
)

// pts builds a ground line from station, elevation pairs.
func pts(v ...float64) []subdivide.Point {
	out := make([]subdivide.Point, 0, len(v)/2)
	for i := 0; i+1 < len(v); i += 2 {
		out = append(out, subdivide.Point{Station: v[i], Elevation: v[i+1]})
	}
	return out
}

// compound is a channel 20 m wide and 2 m deep between banks, with
// overbanks 30 m wide rising 0.5 m, all of n nChan in the channel and nOver
// on the overbanks.
func compound(t *testing.T, nChan, nOver float64) *subdivide.Profile {
	t.Helper()
	ground := pts(0, 13, 0, 12.5, 30, 12, 32, 10, 48, 10, 50, 12, 80, 12.5, 80, 13)
	n := []float64{nOver, nOver, nChan, nChan, nChan, nOver, nOver}
	p, err := subdivide.Compile(subdivide.Section{Name: "test", Points: ground, N: n, HasBanks: true, LeftBank: 30, RightBank: 50})
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// sample takes gaugings from the hydraulic rating of g at gauge heights
// (datum 9.5 m: elevation = gauge height + 9.5).
func sample(t *testing.T, g subdivide.Geometry, heights []float64) []gauged.Gauging {
	t.Helper()
	c := rating.HydraulicCurve{Geometry: g, Options: rating.Options{Slope: 0.001}, Datum: 9.5}
	var gs []gauged.Gauging
	for _, h := range heights {
		q, err := c.Discharge(h)
		if err != nil {
			t.Fatal(err)
		}
		gs = append(gs, gauged.Gauging{Stage: h, Discharge: q, Quality: rating.Good})
	}
	return gs
}

// A rating computed with a known n and sampled as gaugings gives that n
// back (closed form: conveyance is proportional to 1/n, Chow, 1959, eq. 6-9).
func TestCalibrateKnownN(t *testing.T) {
	const tol = 1e-9 // round-off; the inversion is exact
	heights := []float64{1.0, 1.6, 2.2, 2.7, 3.1}
	for _, tc := range []struct {
		name        string
		truth, surv *subdivide.Profile
		channelOnly bool
		wantFactor  float64
		wantN       float64
	}{
		{"all n", compound(t, 0.030, 0.060), compound(t, 0.045, 0.090), false, 2.0 / 3.0, 0.030},
		{"channel only", compound(t, 0.030, 0.060), compound(t, 0.040, 0.060), true, 0.75, 0.030},
	} {
		t.Run(tc.name, func(t *testing.T) {
			gs := sample(t, tc.truth, heights)
			c := rating.HydraulicCurve{Geometry: tc.surv, Options: rating.Options{Slope: 0.001}, Datum: 9.5}
			cal, err := gauged.Calibrate(gs, c, tc.channelOnly)
			if err != nil {
				t.Fatal(err)
			}
			if relErr(cal.Factor, tc.wantFactor) > tol {
				t.Errorf("factor = %.12g, want %g", cal.Factor, tc.wantFactor)
			}
			for _, p := range cal.Points {
				if relErr(p.Factor, tc.wantFactor) > tol || relErr(p.N, tc.wantN) > tol {
					t.Errorf("gauge height %g: factor %g, n %g; want %g, %g", p.Stage, p.Factor, p.N, tc.wantFactor, tc.wantN)
				}
			}
			// The survey rescaled by the factor reproduces the gaugings.
			sc := rating.HydraulicCurve{Geometry: rating.ScaledN{Geometry: tc.surv, Factor: cal.Factor, ChannelOnly: tc.channelOnly},
				Options: c.Options, Datum: c.Datum}
			for _, g := range gs {
				q, _ := sc.Discharge(g.Stage)
				if relErr(q, g.Discharge) > tol {
					t.Errorf("gauge height %g: calibrated %g, gauged %g", g.Stage, q, g.Discharge)
				}
			}
		})
	}
}

// Channel-only calibration cannot fit a gauging the overbanks alone exceed.
func TestCalibrateChannelOnlyNoSolution(t *testing.T) {
	surv := compound(t, 0.030, 0.020)
	gs := sample(t, compound(t, 0.030, 0.060), []float64{1.5, 3.4})
	gs[1].Discharge = 1 // far below what the overbanks carry at 3.4
	gs[1].Source = "g.csv:3"
	cal, err := gauged.Calibrate(gs, rating.HydraulicCurve{Geometry: surv, Options: rating.Options{Slope: 0.001}, Datum: 9.5}, true)
	if err != nil {
		t.Fatal(err)
	}
	if !math.IsNaN(cal.Points[1].Factor) || len(cal.Warnings) == 0 || !strings.Contains(cal.Warnings[0], "g.csv:3") {
		t.Errorf("factor %g, warnings %q", cal.Points[1].Factor, cal.Warnings)
	}
}

// A rectangular channel's rating is Manning's closed form
// Q = (1/n)·B·y·(B·y/(B + 2y))^(2/3)·√S (Chow, 1959, eq. 6-9 with A = By,
// P = B + 2y); a gauging 10 % above it departs +10 %, its shift moves the
// rating through it, and a good gauging is flagged outside its 5 % band.
func TestCompareRectangle(t *testing.T) {
	p, err := subdivide.Compile(subdivide.Section{Points: pts(0, 105, 0, 100, 8, 100, 8, 105), N: []float64{0.03, 0.03, 0.03}})
	if err != nil {
		t.Fatal(err)
	}
	c := rating.HydraulicCurve{Geometry: p, Options: rating.Options{Slope: 0.002}, Datum: 99.0}
	manning := func(y float64) float64 {
		return 1 / 0.03 * 8 * y * math.Pow(8*y/(8+2*y), 2.0/3) * math.Sqrt(0.002)
	}
	gs := []gauged.Gauging{
		{Stage: 2.5, Discharge: 1.10 * manning(1.5), Quality: rating.Good},
		{Stage: 3.0, Discharge: 0.97 * manning(2.0), Quality: rating.Good},
	}
	cmp, err := gauged.Compare(gs, c)
	if err != nil {
		t.Fatal(err)
	}
	const tol = 1e-9 // round-off
	r := cmp.Residuals[0]
	if relErr(r.Fitted, manning(1.5)) > tol || math.Abs(r.DeparturePercent-10) > 1e-7 || !r.OutsideBand {
		t.Errorf("first: rated %g (want %g), departure %g %%, outside %v", r.Fitted, manning(1.5), r.DeparturePercent, r.OutsideBand)
	}
	if q := manning(1.5 + r.Shift); relErr(q, gs[0].Discharge) > 1e-6 || !(r.Shift > 0) {
		t.Errorf("shift %g gives %g, want %g", r.Shift, q, gs[0].Discharge)
	}
	if r := cmp.Residuals[1]; r.OutsideBand || !(r.Shift < 0) || cmp.Outside != 1 {
		t.Errorf("second: %+v, outside count %d", r, cmp.Outside)
	}
}

// A section whose stage range holds none of the gaugings is refused
// (ErrGaugingsOutsideSection): the compound section's ground runs from
// elevation 10 to 13 m; gaugings at gauge heights 1.0 to 3.1 m with the
// datum left at 0 are at elevations 1.0 to 3.1, all below its lowest
// point. With the datum 9.5 they lie at 10.5 to 12.6 m, inside it.
func TestAnalyzeGaugingsOutsideSection(t *testing.T) {
	p := compound(t, 0.03, 0.05)
	gs := sample(t, p, []float64{1.0, 1.6, 2.2, 2.7, 3.1})
	c := rating.HydraulicCurve{Geometry: p, Options: rating.Options{Slope: 0.001}}
	_, err := gauged.Analyze(gs, gauged.Options{Hydraulic: &c, CompareOnly: true})
	if !errors.Is(err, gauged.ErrGaugingsOutsideSection) || !strings.Contains(err.Error(), "1 to 3.1") || !strings.Contains(err.Error(), "10 to 13") {
		t.Errorf("datum 0: %v, want %v naming the ranges", err, gauged.ErrGaugingsOutsideSection)
	}
	c.Datum = 9.5
	if _, err := gauged.Analyze(gs, gauged.Options{Hydraulic: &c, CompareOnly: true}); err != nil {
		t.Errorf("datum 9.5: %v", err)
	}
}

// The factor's standard error is that of the weighted mean of ln(Qr/Qm)
// with the calibration's weights, distinct from the gaugings' scatter
// about the calibrated rating. Gaugings on a 5 m rectangle (n 0.04, S
// 0.001, invented), each measured at Qr·e^(−xᵢ), so ln(Qr/Qm) = xᵢ.
// Hand calculations:
//
//	equal weights (all good), x = 0.10, 0.14, 0.06, 0.10: mean 0.10,
//	  factor e^0.10 = 1.105171; residuals 0, −0.04, 0.04, 0, Σr² = 0.0032;
//	  SE(ln f) = √(0.0032/(3·4)) = 0.0163299, 100·sinh = 1.63307 %;
//	  scatter √(0.0032/3) = 0.0326599, 100·sinh = 3.26657 %.
//	two good (5 %) at x = 0.10, 0.12, one poor (12 %) at 0.30: weights in
//	  the ratio (12/5)² = 5.76 : 5.76 : 1, Σw = 12.52, mean 1.5672/12.52 =
//	  0.1251757, factor 1.133348; Σw(x − mean)² = 0.0343686;
//	  SE(ln f) = √(0.0343686/(2·12.52)) = 0.0370479, 100·sinh = 3.70564 %;
//	  scatter √(3·0.0343686/(2·12.52)) = 0.0641689, 100·sinh = 6.42129 %.
func TestCalibrateFactorStandardError(t *testing.T) {
	const handTol = 1e-5 // relative: the hand values' six digits
	c := built(t, "rectangle:width=5,height=3", 0.04, 0.001)
	for _, tc := range []struct {
		name                      string
		x                         []float64
		q                         []rating.Quality
		factor, factorSE, scatter float64
	}{
		{"equal weights", []float64{0.10, 0.14, 0.06, 0.10}, []rating.Quality{rating.Good, rating.Good, rating.Good, rating.Good}, 1.105171, 1.63307, 3.26657},
		{"quality weights", []float64{0.10, 0.12, 0.30}, []rating.Quality{rating.Good, rating.Good, rating.Poor}, 1.133348, 3.70564, 6.42129},
	} {
		var gs []gauged.Gauging
		for i, x := range tc.x {
			h := 0.4 + 0.5*float64(i)
			qr, err := c.Discharge(h)
			if err != nil {
				t.Fatal(err)
			}
			gs = append(gs, gauged.Gauging{Stage: h, Discharge: qr * math.Exp(-x), Quality: tc.q[i]})
		}
		for _, channelOnly := range []bool{false, true} { // no overbanks: the channel is all of it
			cal, err := gauged.Calibrate(gs, c, channelOnly)
			if err != nil {
				t.Fatal(err)
			}
			if relErr(cal.Factor, tc.factor) > handTol || relErr(cal.FactorStandardErrorPercent, tc.factorSE) > handTol ||
				relErr(cal.StandardErrorPercent, tc.scatter) > handTol {
				t.Errorf("%s (channel only %v): factor %.7g ± %.6g %%, scatter %.6g %%; want %g ± %g %%, %g %%", tc.name, channelOnly,
					cal.Factor, cal.FactorStandardErrorPercent, cal.StandardErrorPercent, tc.factor, tc.factorSE, tc.scatter)
			}
		}
	}
	one, err := gauged.Calibrate([]gauged.Gauging{{Stage: 1, Discharge: 5, Quality: rating.Good}}, c, false)
	if err != nil || !math.IsNaN(one.FactorStandardErrorPercent) || !math.IsNaN(one.StandardErrorPercent) {
		t.Errorf("one gauging: %+v, %v; want no standard errors", one, err)
	}
}

// Scaling the channel's n alone, the factor's standard error takes each
// gauging's sensitivity ∂ln Q/∂ln f, the channel's share of its discharge:
// checked against SE(ln f) = √(Σwr²/((n − 1)·Σwg²)) evaluated in the test,
// g by central differences of the calibrated rating itself (an
// independent computation). Gaugings from the compound section with n
// 0.030 in the channel and 0.060 on the overbanks (invented), the survey
// at 0.040 in the channel, perturbed by a seeded ±3 % so that they
// scatter.
func TestCalibrateChannelOnlyFactorStandardError(t *testing.T) {
	const diffTol = 1e-6 // relative: central differences of step 1e-5 in ln f
	gs := sample(t, compound(t, 0.030, 0.060), []float64{1.0, 1.6, 2.2, 2.7, 3.1, 3.4})
	for i := range gs {
		gs[i].Discharge *= 1 + 0.03*math.Sin(float64(5*i+1))
	}
	surv := compound(t, 0.040, 0.060)
	c := rating.HydraulicCurve{Geometry: surv, Options: rating.Options{Slope: 0.001}, Datum: 9.5}
	cal, err := gauged.Calibrate(gs, c, true)
	if err != nil {
		t.Fatal(err)
	}
	lnQ := func(lf, h float64) float64 {
		sc := rating.HydraulicCurve{Geometry: rating.ScaledN{Geometry: surv, Factor: math.Exp(lf), ChannelOnly: true}, Options: c.Options, Datum: c.Datum}
		q, err := sc.Discharge(h)
		if err != nil {
			t.Fatal(err)
		}
		return math.Log(q)
	}
	const step = 1e-5
	lf := math.Log(cal.Factor)
	var ssr, swg2 float64
	for _, g := range gs {
		w := 1 / (g.LogSigma() * g.LogSigma())
		r := math.Log(g.Discharge) - lnQ(lf, g.Stage)
		d := (lnQ(lf+step, g.Stage) - lnQ(lf-step, g.Stage)) / (2 * step)
		ssr += w * r * r
		swg2 += w * d * d
	}
	want := 100 * math.Sinh(math.Sqrt(ssr/float64(len(gs)-1)/swg2))
	if relErr(cal.FactorStandardErrorPercent, want) > diffTol {
		t.Errorf("channel only: factor standard error %.8g %%, want %.8g %%", cal.FactorStandardErrorPercent, want)
	}
}
