package gauged_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
)

// Tolerances of the tests of reports, tables and the table reference.
const (
	// interpTol bounds the relative error of log-linear interpolation
	// between rows 0.02 m apart of a Manning rating of a trapezoid against
	// the rating itself (a power law in h − e within each interval to
	// better than this; checked by the test itself on the rows it uses).
	interpTol = 2e-3
	// roundOff is the relative round-off allowed where two routes compute
	// the same number.
	roundOff = 1e-9
)

// tableOf returns a section's hydraulic rating as a table at gauge
// heights from its lowest point to its top in steps of step, its zero-flow
// stage at the lowest point (as fit reads a rating table written by rate).
func tableOf(t *testing.T, c rating.HydraulicCurve, step float64) *gauged.TableRating {
	t.Helper()
	return sectionTable(t, c, gauged.RatingTable{Name: "test-rating", HasZeroFlow: true, ZeroFlow: c.Bottom()}, c.Bottom(), c.Top(), step)
}

// ladderOf returns a section's hydraulic rating as a table that starts
// wet at from and stops at to, in steps of step, with no zero-flow stage:
// a step-backwater ladder.
func ladderOf(t *testing.T, c rating.HydraulicCurve, from, to, step float64) *gauged.TableRating {
	t.Helper()
	return sectionTable(t, c, gauged.RatingTable{Name: "ladder"}, from, to, step)
}

// sectionTable adds to rt the section's discharge at gauge heights from
// from to to in steps of step, and compiles it.
func sectionTable(t *testing.T, c rating.HydraulicCurve, rt gauged.RatingTable, from, to, step float64) *gauged.TableRating {
	t.Helper()
	for h := from; h <= to+1e-9; h += step {
		q, err := c.Discharge(h)
		if err != nil {
			t.Fatal(err)
		}
		rt.Points = append(rt.Points, gauged.RatingPoint{Stage: h, Discharge: q})
	}
	tr, err := rt.Compile()
	if err != nil {
		t.Fatal(err)
	}
	return tr
}

// A prior from a section's rating given as a table is the prior from the
// section itself (HydraulicPrior), to the table's interpolation: the same
// power law fitted over the same range, the same log-normal spread (Le
// Coz et al., 2014, as in HydraulicPrior's doc).
func TestTablePriorMatchesSection(t *testing.T) {
	c := built(t, "trapezoid:bottom=10,side=2,height=5", 0.035, 0.001)
	tab := tableOf(t, c, 0.02)
	opt := gauged.HydraulicPriorOptions{OffsetFixed: true, Offset: 0}
	want, err := gauged.HydraulicPrior(c, 0.3, 3, opt)
	if err != nil {
		t.Fatal(err)
	}
	got, err := gauged.TablePrior(tab, 0.3, 3, opt)
	if err != nil {
		t.Fatal(err)
	}
	if d := math.Abs(got.LogCoefficient.Mean - want.LogCoefficient.Mean); d > interpTol {
		t.Errorf("ln a %g, section %g", got.LogCoefficient.Mean, want.LogCoefficient.Mean)
	}
	if d := math.Abs(got.Exponent.Mean - want.Exponent.Mean); d > interpTol {
		t.Errorf("c %g, section %g", got.Exponent.Mean, want.Exponent.Mean)
	}
	if got.LogCoefficient.SD != want.LogCoefficient.SD || !strings.Contains(got.Source, "test-rating") {
		t.Errorf("sd %g (section %g), source %q", got.LogCoefficient.SD, want.LogCoefficient.SD, got.Source)
	}
	if _, err := gauged.TablePrior(tab, 0.3, 3, gauged.HydraulicPriorOptions{Part: gauged.OverbankPart}); err == nil {
		t.Error("a table has no overbank share, yet a prior came back")
	}
}

// A table that starts wet and stops short (a step-backwater ladder) gives
// the prior over the part of the control's range it covers: the same as
// the section's prior (HydraulicPrior) over that part, to the table's
// interpolation; its source says so, and a table outside the range is
// ErrPrior.
func TestTablePriorPartCovered(t *testing.T) {
	c := built(t, "trapezoid:bottom=10,side=2,height=5", 0.035, 0.001)
	tab := ladderOf(t, c, 0.8, 2.0, 0.02)
	opt := gauged.HydraulicPriorOptions{OffsetFixed: true, Offset: 0}
	lo, hi := tab.Range()
	want, err := gauged.HydraulicPrior(c, lo, hi, opt)
	if err != nil {
		t.Fatal(err)
	}
	got, err := gauged.TablePrior(tab, 0.3, 3, opt)
	if err != nil {
		t.Fatal(err)
	}
	if d := math.Abs(got.LogCoefficient.Mean - want.LogCoefficient.Mean); d > interpTol {
		t.Errorf("ln a %g, section over the table's part %g", got.LogCoefficient.Mean, want.LogCoefficient.Mean)
	}
	if d := math.Abs(got.Exponent.Mean - want.Exponent.Mean); d > interpTol {
		t.Errorf("c %g, section over the table's part %g", got.Exponent.Mean, want.Exponent.Mean)
	}
	if !strings.Contains(got.Source, "the part of the control's range 0.3 to 3 that it covers") {
		t.Errorf("source %q does not say the table covers part of the range", got.Source)
	}
	if _, err := gauged.TablePrior(tab, 2.5, 3, opt); !errors.Is(err, gauged.ErrPrior) {
		t.Errorf("a range above the table: %v, want ErrPrior", err)
	}
}

// The conveyance-slope extension on a table: with the table Q_t = K·√S₀
// computed at slope S₀ and gaugings Q = K·√S₁ (S₁ constant), every
// gauging's ratio (Q/Q_t)² is S₁/S₀ exactly, so the table's fitted ln S is
// the section's less ln S₀ (closed form), and both extensions give the
// same discharge.
func TestFitConveyanceSlopeTable(t *testing.T) {
	const s0, s1 = 0.001, 0.0016
	c := built(t, "trapezoid:bottom=10,side=2,height=5", 0.035, s0)
	truth := built(t, "trapezoid:bottom=10,side=2,height=5", 0.035, s1)
	tab := tableOf(t, c, 0.25) // rows on the gaugings' stages: no interpolation
	var h, q, w []float64
	for _, s := range []float64{1, 1.25, 1.5, 1.75, 2} {
		v, _ := truth.Discharge(s)
		h, q, w = append(h, s), append(q, v), append(w, 1)
	}
	sec, err := gauged.FitConveyanceSlope(c, h, q, w)
	if err != nil {
		t.Fatal(err)
	}
	got, err := gauged.FitConveyanceSlopeTable(tab, h, q, w)
	if err != nil {
		t.Fatal(err)
	}
	if d := got.LogSlope - (sec.LogSlope - math.Log(s0)); math.Abs(d) > roundOff || math.Abs(got.LogSlope-math.Log(s1/s0)) > roundOff {
		t.Errorf("table ln S %g, section %g − ln S₀, want ln(S₁/S₀) = %g", got.LogSlope, sec.LogSlope, math.Log(s1/s0))
	}
	r, _ := c.Row(4)
	qt, _ := tab.Discharge(4)
	a, _, _, _, _ := sec.At(4, r.Conveyance)
	b, _, _, _, _ := got.At(4, qt)
	if math.Abs(a-b) > roundOff*a {
		t.Errorf("extension at 4 m: section %g, table %g", a, b)
	}
}

// CompareTable against a power-law table interpolated log-linearly in
// (h − e), which is exact for a power law (Kennedy, 1984): gaugings 10 %
// above the law depart by 10 % exactly; one outside the table is not
// compared and named.
func TestCompareTable(t *testing.T) {
	law := func(h float64) float64 { return 4 * math.Pow(h-0.2, 1.8) }
	rt := gauged.RatingTable{Name: "law", HasZeroFlow: true, ZeroFlow: 0.2}
	for _, h := range []float64{0.5, 1, 2, 3} {
		rt.Points = append(rt.Points, gauged.RatingPoint{Stage: h, Discharge: law(h)})
	}
	tr, err := rt.Compile()
	if err != nil {
		t.Fatal(err)
	}
	gs := []gauged.Gauging{{Stage: 0.7, Discharge: 1.1 * law(0.7)}, {Stage: 2.5, Discharge: 1.1 * law(2.5)}, {Stage: 3.5, Discharge: 9, Source: "g.csv:4"}}
	cmp := gauged.CompareTable(gs, tr)
	for i := range 2 {
		if r := cmp.Residuals[i]; math.Abs(r.DeparturePercent-10) > 1e-9 {
			t.Errorf("gauging %d: departure %g %%, want 10", i, r.DeparturePercent)
		}
	}
	if !math.IsNaN(cmp.Residuals[2].DeparturePercent) || len(cmp.Warnings) != 1 || !strings.Contains(cmp.Warnings[0], "g.csv:4") {
		t.Errorf("outside the table: %+v, warnings %q", cmp.Residuals[2], cmp.Warnings)
	}
}

// Gaugings of the lower part of a compound section (channel 2 m deep,
// floodplains beyond; the truth is its Manning rating, package rating)
// fitted by Analyze with Floodplain: a second control adds at the bank
// stage, and the 95 % total band at the section's top, far above the
// gaugings, holds the truth (one seeded case; the coverage is measured by
// TestBandCoverage). Without it the single control carried on is warned
// of.
func TestAnalyzeFloodplain(t *testing.T) {
	gauge := built(t, "compound:bottom=10,side=2,depth=2,floodplain=30,outer=2,floodn=0.06,height=4", 0.035, 0.001)
	gs := gaugeTruth(t, gauge, linspace(0.3, 2.3, 20), rand.New(rand.NewPCG(4, 4)))
	opt := gauged.Options{Hydraulic: &gauge, Method: gauged.Bayesian, Floodplain: true,
		Controls: gauged.ControlOptions{Controls: []gauged.ControlSpec{{Kind: gauged.ChannelControl}}},
		Bayes:    gauged.BayesOptions{Draws: 3000, Seed: 2}}
	rep, err := gauged.Analyze(gs, opt)
	if err != nil {
		t.Fatal(err)
	}
	if !rep.FloodplainAdded || len(rep.Fit.Controls) != 2 || rep.Fit.Controls[1].Joint != gauged.Add || math.Abs(rep.BankStage-2) > 1e-5 {
		t.Fatalf("controls %+v, bank %g, added %v", rep.Fit.Controls, rep.BankStage, rep.FloodplainAdded)
	}
	t.Logf("R̂ %.3f (%s), warnings %q", rep.Fit.Posterior.RHatMax, rep.Fit.Posterior.RHatParam, rep.Warnings)
	top := rep.Table.Rows[len(rep.Table.Rows)-1]
	q, _ := gauge.Discharge(top.Stage)
	if !(top.TotalLower <= q && q <= top.TotalUpper) || !(top.Multiple > gauged.ExtrapolationWarnMultiple) {
		t.Errorf("at %g: truth %g, total band %g to %g, multiple %g", top.Stage, q, top.TotalLower, top.TotalUpper, top.Multiple)
	}
	if rep.Prior == nil || len(rep.Prior.Controls) != 2 {
		t.Errorf("prior rating %+v", rep.Prior)
	}
	opt.Floodplain = false
	one, err := gauged.Analyze(gs, opt)
	if err != nil {
		t.Fatal(err)
	}
	if len(one.Fit.Controls) != 1 || !strings.Contains(strings.Join(one.Warnings, "\n"), "does not follow the hydraulics") {
		t.Errorf("one control: %d controls, warnings %q", len(one.Fit.Controls), one.Warnings)
	}
}

// Data from a known two-control rating (a riffle drowned at 1.1 m,
// invented) fitted with one control by least squares: the F test of one
// more control finds the misfit (p below 1 %) and says so; with both
// controls it does not.
func TestAnalyzeMoreControls(t *testing.T) {
	truth := mustRating(t, []gauged.Control{{A: 4, B: 0.3, C: 2.6}, {A: 11, C: 1.4, From: 1.1}})
	gs := noisy(truth, linspace(0.45, 3, 30), []rating.Quality{rating.Excellent}, rand.New(rand.NewPCG(7, 7)))
	rep, err := gauged.Analyze(gs, gauged.Options{})
	if err != nil {
		t.Fatal(err)
	}
	m := rep.MoreControls
	if !m.Made || !m.Poor || !(m.P < gauged.PoorFitLevel) || !strings.Contains(strings.Join(rep.Warnings, "\n"), "fit more controls") {
		t.Errorf("one control: %+v, warnings %q", m, rep.Warnings)
	}
	two, err := gauged.Analyze(gs, gauged.Options{Controls: gauged.ControlOptions{Controls: make([]gauged.ControlSpec, 2)}})
	if err != nil {
		t.Fatal(err)
	}
	if two.MoreControls.Poor {
		t.Errorf("two controls: %+v", two.MoreControls)
	}
}

// The lookup rows are the table's rule (ControlTable.At) at every
// hundredth of stage from the first offset, without bands.
func TestLookupControlRows(t *testing.T) {
	c := built(t, "trapezoid:bottom=10,side=2,height=3", 0.035, 0.001)
	gs := gaugeTruth(t, c, linspace(0.3, 1.5, 12), rand.New(rand.NewPCG(1, 9)))
	rep, err := gauged.Analyze(gs, gauged.Options{Hydraulic: &c, Lookup: true})
	if err != nil {
		t.Fatal(err)
	}
	if len(rep.Lookup) < 250 {
		t.Fatalf("%d lookup rows", len(rep.Lookup))
	}
	for _, r := range rep.Lookup {
		if k := math.Round(r.Stage * 100); math.Abs(r.Stage*100-k) > 1e-6 {
			t.Fatalf("stage %g is not on a hundredth", r.Stage)
		}
		want, err := rep.Table.At(r.Stage)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(r.Discharge-want.Discharge) > roundOff*want.Discharge || r.Basis != want.Basis || !math.IsNaN(r.TotalLower) {
			t.Errorf("at %g: %+v, the table's rule %+v", r.Stage, r, want)
		}
	}
}

// A Bayesian fit with priors from the survey has a prior rating, its
// controls at the prior means (HydraulicPrior over the range the fit
// takes, as TestBayesPriorFromSection checks the means themselves);
// least squares and weak priors have none.
func TestPriorRating(t *testing.T) {
	c := built(t, "trapezoid:bottom=10,side=2,height=5", 0.035, 0.001)
	gs := gaugeTruth(t, c, linspace(0.3, 1.5, 12), nil)
	f, err := gauged.FitBayes(gs, gauged.BayesOptions{ControlOptions: gauged.ControlOptions{Controls: []gauged.ControlSpec{{Kind: gauged.ChannelControl}}},
		Hydraulic: &c, Chains: 2, Draws: 500, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	pr, ok := f.PriorRating()
	a, _ := findParam(f.Posterior, "ln_a1")
	cc, _ := findParam(f.Posterior, "c1")
	if !ok || math.Abs(math.Log(pr.Controls[0].A)-a.PriorMean) > roundOff || pr.Controls[0].C != cc.PriorMean || pr.Controls[0].B != 0 {
		t.Errorf("prior rating %+v (%v), prior means ln a %g, c %g", pr, ok, a.PriorMean, cc.PriorMean)
	}
	weak, err := gauged.FitBayes(gs, gauged.BayesOptions{Chains: 2, Draws: 500, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	if _, ok := weak.PriorRating(); ok {
		t.Error("weak priors give a prior rating")
	}
	lsq, err := gauged.FitControls(gs, gauged.ControlOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if _, ok := lsq.PriorRating(); ok {
		t.Error("least squares gives a prior rating")
	}
}

// The exponents a control may take: its kind's range, and for a
// floodplain that adds, with its prior from the survey, that range
// widened to two prior standard deviations about the overbanks' own
// exponent; least squares keeps the kinds' ranges.
func TestExponentBounds(t *testing.T) {
	c := built(t, "compound:bottom=10,side=2,depth=2,floodplain=30,outer=2,floodn=0.06,height=4", 0.035, 0.001)
	gs := gaugeTruth(t, c, linspace(0.3, 2.6, 18), nil)
	spec := gauged.ControlOptions{Controls: []gauged.ControlSpec{{Kind: gauged.ChannelControl}, {Kind: gauged.ChannelControl, Joint: gauged.Add}}}
	lsq, err := gauged.FitControls(gs, spec)
	if err != nil {
		t.Fatal(err)
	}
	lo, hi := gauged.ExponentRange(gauged.ChannelControl)
	for _, e := range lsq.Exponents {
		if e.Low != lo || e.High != hi || e.Survey {
			t.Errorf("least squares: %+v, want %g to %g", e, lo, hi)
		}
	}
	b, err := gauged.FitBayes(gs, gauged.BayesOptions{ControlOptions: spec, Hydraulic: &c, Chains: 2, Draws: 500, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	if e := b.Exponents[0]; e.Low != lo || e.High != hi || e.Survey {
		t.Errorf("Bayesian channel: %+v, want %g to %g", e, lo, hi)
	}
	p, _ := findParam(b.Posterior, "c2")
	if e := b.Exponents[1]; !e.Survey || e.Low != math.Min(lo, p.PriorMean-2*p.PriorSD) || e.High != math.Max(hi, p.PriorMean+2*p.PriorSD) {
		t.Errorf("Bayesian floodplain: %+v, prior %g ± %g", e, p.PriorMean, p.PriorSD)
	}
}

// A gauging excluded by its own text keeps its factor on n but is left
// out of the best one: with every n scaled the best factor is the
// weighted geometric mean of Qr/Qm (closed form, Calibration's doc), here
// over the other gaugings, all 10 % above the rating, so 1/1.1.
func TestCalibrateLeavesOutExcluded(t *testing.T) {
	c := built(t, "trapezoid:bottom=10,side=2,height=5", 0.035, 0.001)
	var gs []gauged.Gauging
	for _, h := range []float64{0.5, 1, 1.5, 2} {
		q, _ := c.Discharge(h)
		gs = append(gs, gauged.Gauging{Stage: h, Discharge: 1.1 * q, Quality: rating.Good})
	}
	gs[2].Discharge *= 3
	gs[2].Exclude = "ice"
	cal, err := gauged.Calibrate(gs, c, false)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(cal.Factor-1/1.1) > roundOff || !(math.Abs(cal.Points[2].Factor-1/3.3) < roundOff) {
		t.Errorf("factor %g (want %g), the excluded gauging's own %g (want %g)", cal.Factor, 1/1.1, cal.Points[2].Factor, 1/3.3)
	}
}

// The uncertainty convention names every grade's band and the coverage
// factor, as Gauging.LogSigma applies them.
func TestUncertaintyConvention(t *testing.T) {
	s := gauged.UncertaintyConvention()
	for _, w := range []string{"excellent 2 %", "good 5 %", "fair 8 %", "poor 12 %", "unrated 8 %", "U/1.96", "95 %"} {
		if !strings.Contains(s, w) {
			t.Errorf("%q lacks %q", s, w)
		}
	}
	g := gauged.Gauging{Quality: rating.Poor}
	if math.Abs(g.LogSigma()-0.12/1.96) > 1e-4 || g.UncertaintyPercent() != 12 {
		t.Errorf("poor: σ %g, U %g", g.LogSigma(), g.UncertaintyPercent())
	}
}

// A Bayesian fit on a hydraulic rating table that starts wet (a
// step-backwater ladder from 0.8 m) and stops below the highest gauging
// takes the prior of ln A and C from the part of the range the table
// covers, and no offset prior from the table's first row, which is not
// where the flow starts: the offset's prior is flat and the fitted offset
// finds the section's lowest point (0, the trapezoid's invert; the
// gaugings are the section's own rating).
func TestBayesWetTablePrior(t *testing.T) {
	c := built(t, "trapezoid:bottom=10,side=2,height=5", 0.035, 0.001)
	tab := ladderOf(t, c, 0.8, 2.0, 0.05)
	gs := gaugeTruth(t, c, linspace(0.3, 2.4, 14), nil)
	f, err := gauged.FitBayes(gs, gauged.BayesOptions{ControlOptions: gauged.ControlOptions{Controls: []gauged.ControlSpec{{Kind: gauged.ChannelControl}}},
		HydraulicTable: tab, Chains: 2, Draws: 500, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	b, _ := findParam(f.Posterior, "b1")
	a, _ := findParam(f.Posterior, "ln_a1")
	if !math.IsNaN(b.PriorMean) {
		t.Errorf("offset prior mean %g from the table's first row; want a flat prior", b.PriorMean)
	}
	if math.IsNaN(a.PriorMean) || a.PriorSD > 1 {
		t.Errorf("ln a prior %g ± %g: want the table's, not a weak one", a.PriorMean, a.PriorSD)
	}
	if got := f.Rating.Controls[0].B; math.Abs(got) > 0.05 {
		t.Errorf("fitted offset %g, want near the invert 0", got)
	}
	for _, w := range f.Warnings {
		if strings.Contains(w, "weak priors instead") {
			t.Errorf("warned %q", w)
		}
	}
}

// A prior's source states its range of gauge heights with the unit of the
// fit, from the section or from its table.
func TestPriorSourceUnits(t *testing.T) {
	c := built(t, "trapezoid:bottom=10,side=2,height=5", 0.035, 0.001)
	tab := tableOf(t, c, 0.02)
	for _, tc := range []struct {
		name  string
		units rating.Units
		want  string
	}{
		{"SI", rating.SI, "from 0.3 to 3 m ("},
		{"US", rating.US, "from 0.3 to 3 ft ("},
	} {
		t.Run(tc.name, func(t *testing.T) {
			opt := gauged.HydraulicPriorOptions{OffsetFixed: true, Offset: 0, Units: tc.units}
			fromSection, err := gauged.HydraulicPrior(c, 0.3, 3, opt)
			if err != nil {
				t.Fatal(err)
			}
			fromTable, err := gauged.TablePrior(tab, 0.3, 3, opt)
			if err != nil {
				t.Fatal(err)
			}
			for _, src := range []string{fromSection.Source, fromTable.Source} {
				if !strings.Contains(src, tc.want) {
					t.Errorf("source %q does not say %q", src, tc.want)
				}
			}
		})
	}
}
