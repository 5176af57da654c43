package gauged_test

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
)

// gaugeTruth samples gaugings from a hydraulic rating at gauge heights,
// with log-normal noise of each gauging's standard uncertainty when rng
// is not nil.
func gaugeTruth(t testing.TB, c rating.HydraulicCurve, stages []float64, rng *rand.Rand) []gauged.Gauging {
	t.Helper()
	var gs []gauged.Gauging
	for _, h := range stages {
		q, err := c.Discharge(h)
		if err != nil {
			t.Fatal(err)
		}
		g := gauged.Gauging{Stage: h, Discharge: q, Quality: rating.Good}
		if rng != nil {
			g.Discharge *= math.Exp(g.LogSigma() * rng.NormFloat64())
		}
		gs = append(gs, g)
	}
	return gs
}

// Least squares with a section: above the highest gauging the table
// follows the conveyance-slope extension. With gaugings taken from a
// Manning rating of n = 0.030 and a survey with n = 0.036, every gauging's
// effective slope is S·(0.036/0.030)² exactly, so S is level and the
// extension, joined to the fitted rating at the highest gauging h_j, is
// Q̂(h_j)·K(h)/K(h_j) = Q̂(h_j)·Q_true(h)/Q_true(h_j) (closed form: K_true
// and K_survey differ by the factor of n alone, Chow, 1959, eq. 6-9),
// within the fit's error at h_j of the true rating.
func TestControlTableConveyanceSlope(t *testing.T) {
	truth := built(t, "trapezoid:bottom=10,side=2,height=5", 0.030, 0.001)
	survey := built(t, "trapezoid:bottom=10,side=2,height=5", 0.036, 0.001)
	gs := gaugeTruth(t, truth, linspace(0.3, 1.5, 15), nil)
	f, err := gauged.FitControls(gs, gauged.ControlOptions{})
	if err != nil {
		t.Fatal(err)
	}
	tab, err := f.Table(gauged.ControlTableOptions{Hydraulic: &survey, Step: 0.25})
	if err != nil {
		t.Fatal(err)
	}
	if tab.Extension == nil || !tab.Extension.Level || len(tab.Extension.Points) < gauged.ConveyanceSlopeMin {
		t.Fatalf("extension %+v", tab.Extension)
	}
	wantS := 0.001 * math.Pow(0.036/0.030, 2)
	for _, p := range tab.Extension.Points {
		if relErr(p.Slope, wantS) > 1e-9 {
			t.Errorf("stage %g: effective slope %g, want %g", p.Stage, p.Slope, wantS)
		}
	}
	const tol = 1e-9    // round-off
	const fitErr = 0.01 // a power law on a trapezoid's Manning rating
	qTop, _ := truth.Discharge(f.HighStage)
	above := 0
	for _, r := range tab.Rows {
		switch {
		case r.Stage > f.HighStage:
			above++
			q, _ := truth.Discharge(r.Stage)
			want := f.Rating.Discharge(f.HighStage) * q / qTop
			if r.Basis != gauged.ConveyanceSlopeAbove || relErr(r.Discharge, want) > tol || relErr(r.Multiple, r.Discharge/f.MaxDischarge) > tol {
				t.Errorf("stage %g: %v %g (want %g), multiple %g", r.Stage, r.Basis, r.Discharge, want, r.Multiple)
			}
			if relErr(r.Discharge, q) > fitErr {
				t.Errorf("stage %g: %g, truth %g", r.Stage, r.Discharge, q)
			}
		case r.Stage < f.LowStage:
			if r.Basis != gauged.BelowGaugings || !r.Extrapolated() || !math.IsNaN(r.Multiple) {
				t.Errorf("stage %g: %+v", r.Stage, r)
			}
		default:
			if r.Basis != gauged.WithinGaugings || r.Extrapolated() {
				t.Errorf("stage %g: %+v", r.Stage, r)
			}
		}
		if r.Stage > f.Rating.Controls[0].B && !(r.TotalLower <= r.ParametricLower && r.ParametricLower <= r.Discharge && r.Discharge <= r.ParametricUpper && r.ParametricUpper <= r.TotalUpper) {
			t.Errorf("stage %g: bands out of order %+v", r.Stage, r)
		}
	}
	if above == 0 || !(tab.MaxMultiple > gauged.ExtrapolationWarnMultiple) || !hasWarning(tab.Warnings, "times the largest gauged discharge") {
		t.Errorf("%d rows above, max multiple %g, warnings %q", above, tab.MaxMultiple, tab.Warnings)
	}
	for _, r := range tab.Rows {
		got, err := tab.At(r.Stage)
		if err != nil || fmt.Sprint(got) != fmt.Sprint(r) { // printed: NaN fields compare equal
			t.Errorf("At(%g) = %+v, row %+v (%v)", r.Stage, got, r, err)
		}
	}
}

func hasWarning(ws []string, part string) bool {
	for _, w := range ws {
		if strings.Contains(w, part) {
			return true
		}
	}
	return false
}

// A Bayesian table carries both bands on every row, extrapolated ones
// included, and above the highest gauging the relative width of the band
// never falls below its width at that gauging: the top control's
// uncertainty there is the prior's, pulled by the gaugings (Le Coz et
// al., 2014).
func TestControlTableBayesBandsDoNotCollapse(t *testing.T) {
	truth := built(t, "trapezoid:bottom=10,side=2,height=5", 0.035, 0.001)
	survey := built(t, "trapezoid:bottom=10,side=2,height=5", 0.040, 0.0012)
	gs := gaugeTruth(t, truth, linspace(0.3, 1.5, 15), rand.New(rand.NewPCG(8, 8)))
	f, err := gauged.FitBayes(gs, gauged.BayesOptions{
		ControlOptions: gauged.ControlOptions{Controls: []gauged.ControlSpec{{Kind: gauged.ChannelControl}}},
		Hydraulic:      &survey, Chains: 4, Draws: 3000, Seed: 4,
	})
	if err != nil {
		t.Fatal(err)
	}
	tab, err := f.Table(gauged.ControlTableOptions{Hydraulic: &survey, Step: 0.25})
	if err != nil {
		t.Fatal(err)
	}
	width := func(r gauged.ControlRow) float64 { return (r.TotalUpper - r.TotalLower) / r.Discharge }
	var atTop float64
	for _, r := range tab.Rows {
		if r.Stage == f.HighStage {
			atTop = width(r)
		}
	}
	for _, r := range tab.Rows[1:] {
		if !(r.ParametricLower <= r.ParametricUpper && r.TotalLower <= r.ParametricLower && r.ParametricUpper <= r.TotalUpper) {
			t.Errorf("stage %g: bands %+v", r.Stage, r)
		}
		if r.Stage > f.HighStage && !(width(r) >= atTop) {
			t.Errorf("stage %g: relative width %.4f below %.4f at the highest gauging", r.Stage, width(r), atTop)
		}
	}
	last := tab.Rows[len(tab.Rows)-1]
	t.Logf("relative total width %.3f at the highest gauging, %.3f at %g m (%.1f times the largest gauged discharge)", atTop, width(last), last.Stage, last.Multiple)
	if tab.BandsWithheld || !strings.Contains(tab.BandNote, "posterior") {
		t.Errorf("withheld %v, note %q", tab.BandsWithheld, tab.BandNote)
	}
}

// Chains too short to mix disagree; their bands are withheld unless asked.
func TestControlTableWithholdsBands(t *testing.T) {
	truth := mustRating(t, []gauged.Control{{A: 5, B: 0.3, C: 1.9}})
	gs := noisy(truth, linspace(0.5, 3, 15), []rating.Quality{rating.Good}, rand.New(rand.NewPCG(6, 6)))
	f, err := gauged.FitBayes(gs, gauged.BayesOptions{Chains: 4, Draws: 8, Pilot: -1, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	if f.Posterior.Converged || !hasWarning(f.Warnings, "chains disagree") {
		t.Fatalf("short chains converged: R̂ %g", f.Posterior.RHatMax)
	}
	tab, err := f.Table(gauged.ControlTableOptions{})
	if err != nil {
		t.Fatal(err)
	}
	shown, err := f.Table(gauged.ControlTableOptions{ShowUnconverged: true})
	if err != nil {
		t.Fatal(err)
	}
	r, s := tab.Rows[len(tab.Rows)-1], shown.Rows[len(shown.Rows)-1]
	if !tab.BandsWithheld || !math.IsNaN(r.TotalUpper) || shown.BandsWithheld || math.IsNaN(s.TotalUpper) {
		t.Errorf("withheld %v %+v; shown %v %+v", tab.BandsWithheld, r, shown.BandsWithheld, s)
	}
}

// Selection: gaugings outside the rating period, listed by time or with an
// exclude reason are not fitted (the fit equals that of the rest, the same
// computation on fewer data) but keep their departures from the rating,
// marked with their reason.
func TestSelection(t *testing.T) {
	truth := mustRating(t, []gauged.Control{{A: 5, B: 0.3, C: 1.9}})
	gs := noisy(truth, linspace(0.5, 3, 20), []rating.Quality{rating.Good}, rand.New(rand.NewPCG(7, 7)))
	t0 := time.Date(2020, 1, 1, 0, 0, 0, 0, time.UTC)
	for i := range gs {
		gs[i].Time = t0.AddDate(0, i, 0)
	}
	gs[5].Exclude = "debris on the control"
	gs[9].Discharge *= 1.5
	sel := gauged.Selection{From: gs[2].Time, Exclude: []time.Time{gs[9].Time, t0.AddDate(10, 0, 0)}}
	f, err := gauged.FitControls(gs, gauged.ControlOptions{Selection: sel})
	if err != nil {
		t.Fatal(err)
	}
	var rest []gauged.Gauging
	for i, g := range gs {
		if i >= 2 && i != 5 && i != 9 {
			rest = append(rest, g)
		}
	}
	g, err := gauged.FitControls(rest, gauged.ControlOptions{})
	if err != nil {
		t.Fatal(err)
	}
	a, b := f.Rating.Controls[0], g.Rating.Controls[0]
	if f.N != len(rest) || relErr(a.A, b.A) > 1e-12 || a.B != b.B || a.C != b.C {
		t.Errorf("selected fit %+v (n %d), fit of the rest %+v (n %d)", a, f.N, b, g.N)
	}
	want := map[int]string{0: gauged.ReasonBeforePeriod, 1: gauged.ReasonBeforePeriod, 5: "debris on the control", 9: gauged.ReasonListed}
	for i, r := range f.Residuals {
		if r.Excluded != (want[i] != "") || r.ExcludedReason != want[i] || math.IsNaN(r.DeparturePercent) {
			t.Errorf("gauging %d: excluded %v %q, departure %g", i, r.Excluded, r.ExcludedReason, r.DeparturePercent)
		}
	}
	if d := f.Residuals[9].DeparturePercent; !(d > 40) {
		t.Errorf("the listed gauging's departure %.1f %%, want about +50 %%", d)
	}
	if !hasWarning(f.Warnings, "no gauging at 2030-01-01") {
		t.Errorf("warnings %q", f.Warnings)
	}
}

// What a Bayesian table says of its rows above the gaugings follows the
// top control's priors: weak ones (no survey) carry the power law on with
// no hydraulic basis, as least squares without a section does; priors
// from the survey hold it there, pulled by the gaugings. The note, and
// the warning past ExtrapolationWarnMultiple, say so.
func TestControlTableBayesAboveNote(t *testing.T) {
	truth := built(t, "trapezoid:bottom=10,side=2,height=5", 0.035, 0.001)
	survey := built(t, "trapezoid:bottom=10,side=2,height=5", 0.040, 0.0012)
	gs := gaugeTruth(t, truth, linspace(0.3, 1.5, 12), rand.New(rand.NewPCG(9, 9)))
	for _, tc := range []struct {
		name      string
		hyd       *rating.HydraulicCurve
		want, not string
	}{
		{"weak priors", nil, "no hydraulic basis", "as the gaugings pull it"},
		{"survey priors", &survey, "as the gaugings pull it", "no hydraulic basis"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			f, err := gauged.FitBayes(gs, gauged.BayesOptions{
				ControlOptions: gauged.ControlOptions{Controls: []gauged.ControlSpec{{Kind: gauged.ChannelControl}}},
				Hydraulic:      tc.hyd, Chains: 2, Draws: 300, Seed: 2,
			})
			if err != nil {
				t.Fatal(err)
			}
			tab, err := f.Table(gauged.ControlTableOptions{Hydraulic: tc.hyd, To: 3.5, ShowUnconverged: true})
			if err != nil {
				t.Fatal(err)
			}
			warn := ""
			for _, w := range tab.Warnings {
				if strings.Contains(w, "times the largest gauged discharge") {
					warn = w
				}
			}
			for what, s := range map[string]string{"note": tab.AboveNote, "warning": warn} {
				if !strings.Contains(s, tc.want) || strings.Contains(s, tc.not) {
					t.Errorf("%s %q: want %q, not %q", what, s, tc.want, tc.not)
				}
			}
		})
	}
}

// A To above the table's limit is refused, and the message names the
// limit actually used: the higher of the hydraulic rating's top (the
// section's lower end, a table's last row) and the highest gauging.
// Within TableEdge of the limit the table stops at it.
func TestControlTableToLimit(t *testing.T) {
	truth := built(t, "trapezoid:bottom=10,side=2,height=5", 0.035, 0.001)
	low := built(t, "trapezoid:bottom=10,side=2,height=2", 0.035, 0.001) // lower end below the top gauging
	high := built(t, "trapezoid:bottom=10,side=2,height=4", 0.035, 0.001)
	f, err := gauged.FitControls(gaugeTruth(t, truth, linspace(0.3, 2.5, 12), nil), gauged.ControlOptions{})
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name string
		opt  gauged.ControlTableOptions
		err  string  // part of the error, "" for none
		top  float64 // the table's last stage when no error
	}{
		{"gauging above the section", gauged.ControlTableOptions{Hydraulic: &low, To: 2.8},
			"is above the highest gauging at 2.5 m, the table's limit since it lies above the section's lower end (2 m)", 0},
		{"to the top gauging", gauged.ControlTableOptions{Hydraulic: &low, To: 2.5}, "", 2.5},
		{"section above the gaugings", gauged.ControlTableOptions{Hydraulic: &high, To: 4.5},
			"is above the section's lower end at 4 m", 0},
		{"to the section's end", gauged.ControlTableOptions{Hydraulic: &high, To: 4}, "", 4},
		{"table below the top gauging", gauged.ControlTableOptions{HydraulicTable: tableOf(t, low, 0.1), To: 3},
			"is above the highest gauging at 2.5 m, the table's limit since it lies above the hydraulic rating table's last row (2 m)", 0},
	} {
		tab, err := f.Table(tc.opt)
		if tc.err != "" {
			if !errors.Is(err, gauged.ErrBeyondSection) || !strings.Contains(err.Error(), tc.err) {
				t.Errorf("%s: error %v, want ErrBeyondSection with %q", tc.name, err, tc.err)
			}
			continue
		}
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		if last := tab.Rows[len(tab.Rows)-1].Stage; math.Abs(last-tc.top) > 1e-9 {
			t.Errorf("%s: table ends at %g, want %g", tc.name, last, tc.top)
		}
	}
}

// Chains held at different breakpoints are not joined by more draws: the
// warning asks for given breakpoints, fewer controls or priors instead.
// Two controls of nearly one power law leave the breakpoint unsettled.
func TestUnsettledBreakpointAdvice(t *testing.T) {
	truth := mustRating(t, []gauged.Control{{A: 40, B: 3.58, C: 1.57}, {A: 26.4, B: 3.30, C: 1.87, From: 4.87, Joint: gauged.Replace}})
	gs := noisy(truth, linspace(3.7, 6.5, 24), []rating.Quality{rating.Good}, rand.New(rand.NewPCG(7, 7)))
	f, err := gauged.FitBayes(gs, gauged.BayesOptions{ControlOptions: gauged.ControlOptions{Controls: make([]gauged.ControlSpec, 2)}, Chains: 4, Draws: 2000, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	p := f.Posterior
	if p.Converged || !strings.HasPrefix(p.RHatParam, "break") {
		t.Fatalf("the chains settled (R̂ %.3f for %s): this test needs gaugings that leave the breakpoint unsettled", p.RHatMax, p.RHatParam)
	}
	if !hasWarning(f.Warnings, "--breaks") || hasWarning(f.Warnings, "draw more or check") {
		t.Errorf("warnings %q: want the breakpoint advice", f.Warnings)
	}
}
