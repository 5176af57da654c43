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
