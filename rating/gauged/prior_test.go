package gauged_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/subdivide"
)

// built returns the hydraulic rating of a built shape with Manning's n
// and slope (gauge height = depth above the invert).
func built(t testing.TB, spec string, n, slope float64) rating.HydraulicCurve {
	t.Helper()
	s, err := subdivide.ParseShape(spec)
	if err != nil {
		t.Fatal(err)
	}
	g, err := s.Build(subdivide.PerRegion{Channel: n})
	if err != nil {
		t.Fatal(err)
	}
	return rating.HydraulicCurve{Geometry: g, Options: rating.Options{Slope: slope}}
}

// The prior of a channel control scales exactly as conveyance and slope:
// n times 2 takes ln 2 from ln a₀ (K ∝ 1/n, Chow, 1959, eq. 6-9), slope
// times 4 adds ½·ln 4 (Q ∝ √S); its standard deviation is
// √(¼σ²_lnS + σ²_lnf) with σ = √(ln(1 + cv²)) (the log-normal; Le Coz et
// al., 2014), and the prior's power law follows the section's hydraulic
// rating over its range within the misfit of one power law with its
// offset at the lowest point (at most 6.5 % on this trapezoid; checked
// to 7 %).
func TestHydraulicPrior(t *testing.T) {
	const spec = "trapezoid:bottom=10,side=2,height=5"
	base := built(t, spec, 0.035, 0.001)
	opt := gauged.HydraulicPriorOptions{NCV: 0.25, SlopeCV: 0.4, OffsetFixed: true, Offset: 0}
	p0, err := gauged.HydraulicPrior(base, 0, 4, opt)
	if err != nil {
		t.Fatal(err)
	}
	rough, _ := gauged.HydraulicPrior(built(t, spec, 0.070, 0.001), 0, 4, opt)
	steep, _ := gauged.HydraulicPrior(built(t, spec, 0.035, 0.004), 0, 4, opt)
	const tol = 1e-9 // round-off of the same fit
	if d := p0.LogCoefficient.Mean - rough.LogCoefficient.Mean; math.Abs(d-math.Log(2)) > tol {
		t.Errorf("n doubled: ln a falls by %.12g, want ln 2", d)
	}
	if d := steep.LogCoefficient.Mean - p0.LogCoefficient.Mean; math.Abs(d-0.5*math.Log(4)) > tol {
		t.Errorf("slope ×4: ln a rises by %.12g, want ln 2", d)
	}
	want := math.Sqrt(0.25*math.Log1p(0.16) + math.Log1p(0.0625))
	if math.Abs(p0.LogCoefficient.SD-want) > 1e-15 || p0.Exponent.SD != gauged.HydraulicExponentSD {
		t.Errorf("sd %g (want %g), exponent sd %g", p0.LogCoefficient.SD, want, p0.Exponent.SD)
	}
	a, c := math.Exp(p0.LogCoefficient.Mean), p0.Exponent.Mean
	for _, h := range linspace(0.4, 4, 10) {
		q, _ := base.Discharge(h)
		if d := a*math.Pow(h, c)/q - 1; math.Abs(d) > 0.07 {
			t.Errorf("depth %g: prior law departs %.1f %% from the hydraulic rating", h, 100*d)
		}
	}
}

// Critical flow over a rectangular crest of width W: E_min = 3/2·y_c and
// Q = W·√g·y_c^(3/2), so Q = W·√g·(2/3)^(3/2)·E^(3/2) exactly (Chow,
// 1959, section 4-2), which CrestPrior must give back (its fit and the
// critical-depth solvers to 1e-5).
func TestCrestPriorRectangle(t *testing.T) {
	const w = 6.0
	crest := built(t, "rectangle:width=6,height=3", 0.03, 0.001)
	crest.Datum = -0.25 // the crest's lowest point at gauge height 0.25
	p, err := gauged.CrestPrior(crest, 0.25, 1.5, 0)
	if err != nil {
		t.Fatal(err)
	}
	wantA := w * math.Sqrt(rating.SI.Gravity()) * math.Pow(2.0/3, 1.5)
	if relErr(math.Exp(p.LogCoefficient.Mean), wantA) > 1e-5 || math.Abs(p.Exponent.Mean-1.5) > 1e-5 || p.Offset.Mean != 0.25 {
		t.Errorf("crest prior a %.6g (want %.6g), c %.6g, b %g", math.Exp(p.LogCoefficient.Mean), wantA, p.Exponent.Mean, p.Offset.Mean)
	}
	if math.Abs(p.LogCoefficient.SD-math.Sqrt(math.Log1p(gauged.DefaultCrestCV*gauged.DefaultCrestCV))) > 1e-15 {
		t.Errorf("sd %g", p.LogCoefficient.SD)
	}
}

// With Options.NoExtend the crest section holds no stage above its ends,
// yet the upstream stage h = z + E_min may stand above them: only the
// critical depth y_c = (2/3)·E_min must lie inside (closed form for a
// rectangle, Chow, 1959, section 3-2). The rectangle 6 m wide and 3 m
// high, its lowest point at gauge height 0.25: up to gauge height 3.4
// (y_c = 2.1 m) and 4.3 (y_c = 2.7 m) the prior is that of
// TestCrestPriorRectangle; at 5.0 (y_c = 3.17 m, above the walls) it
// is an error of the section.
func TestCrestPriorNoExtend(t *testing.T) {
	const w = 6.0
	wantA := w * math.Sqrt(rating.SI.Gravity()) * math.Pow(2.0/3, 1.5)
	crest := built(t, "rectangle:width=6,height=3", 0.03, 0.001)
	crest.Datum = -0.25
	crest.Options.Geometry = subdivide.Options{NoExtend: true}
	for _, to := range []float64{3.4, 4.3} {
		p, err := gauged.CrestPrior(crest, 0.25, to, 0)
		if err != nil {
			t.Errorf("to %g: %v", to, err)
			continue
		}
		if relErr(math.Exp(p.LogCoefficient.Mean), wantA) > 1e-5 || math.Abs(p.Exponent.Mean-1.5) > 1e-5 {
			t.Errorf("to %g: crest prior a %.6g (want %.6g), c %.6g (want 1.5)", to, math.Exp(p.LogCoefficient.Mean), wantA, p.Exponent.Mean)
		}
	}
	if _, err := gauged.CrestPrior(crest, 0.25, 5.0, 0); !errors.Is(err, rating.ErrNoRoot) {
		t.Errorf("to 5.0, critical depth above the walls: %v, want rating.ErrNoRoot", err)
	}
}

// The bank stage of a built compound section is its main channel's depth
// (the shape's definition: floodplains at the channel's top), exactly:
// a bank at 2 m is 2, not the dry side of the bisection's last bracket.
func TestBankStage(t *testing.T) {
	c := built(t, "compound:bottom=10,side=2,depth=2,floodplain=30,outer=2,height=4", 0.035, 0.001)
	c.Datum = 100
	h, ok, err := gauged.BankStage(c)
	if err != nil || !ok || h != 2-100 {
		t.Errorf("bank stage %g (%v, %v), want %g", h, ok, err, 2.0-100)
	}
	if _, ok, _ := gauged.BankStage(built(t, "trapezoid:bottom=10,side=2,height=5", 0.035, 0.001)); ok {
		t.Error("a trapezoid has no overbanks")
	}
}

// A Bayesian fit with a section takes the channel control's prior from the
// section's hydraulic rating (HydraulicPrior over the control's range, the
// offset at the section's lowest point), and states it in the posterior
// summary.
func TestBayesPriorFromSection(t *testing.T) {
	truth := built(t, "trapezoid:bottom=10,side=2,height=5", 0.035, 0.001)
	var gs []gauged.Gauging
	for _, h := range linspace(0.3, 1.5, 12) {
		q, _ := truth.Discharge(h)
		gs = append(gs, gauged.Gauging{Stage: h, Discharge: q, Quality: rating.Good})
	}
	f, err := gauged.FitBayes(gs, gauged.BayesOptions{
		ControlOptions: gauged.ControlOptions{Controls: []gauged.ControlSpec{{Kind: gauged.ChannelControl}}},
		Hydraulic:      &truth, Chains: 2, Draws: 1000, Seed: 3,
	})
	if err != nil {
		t.Fatal(err)
	}
	want, err := gauged.HydraulicPrior(truth, 0, truth.Top(), gauged.HydraulicPriorOptions{OffsetFixed: true, Offset: 0})
	if err != nil {
		t.Fatal(err)
	}
	a, _ := findParam(f.Posterior, "ln_a1")
	b, _ := findParam(f.Posterior, "b1")
	if a.PriorMean != want.LogCoefficient.Mean || a.PriorSD != want.LogCoefficient.SD || b.PriorMean != 0 {
		t.Errorf("prior of ln a %g ± %g (want %g ± %g), of b %g ± %g", a.PriorMean, a.PriorSD, want.LogCoefficient.Mean, want.LogCoefficient.SD, b.PriorMean, b.PriorSD)
	}
}

// A rating of a riffle (crest surveyed), the channel and its floodplain,
// priors all from the survey: the riffle's from critical flow over the
// crest, the channel's and the floodplain's from the gauge section, the
// floodplain's breakpoint at the bank stage. Gaugings reach only part way
// up the channel; the fit runs, its chains agree, each prior states its
// source and the floodplain's breakpoint prior sits at the bank (2 m, the
// built section's channel depth).
func TestBayesPriorsFromSurvey(t *testing.T) {
	crest := built(t, "rectangle:width=8,height=3", 0.03, 0.001)
	crest.Datum = -0.2 // crest lowest point at gauge height 0.2
	gauge := built(t, "compound:bottom=10,side=2,depth=2,floodplain=30,outer=2,floodn=0.06,height=4", 0.035, 0.001)
	riffle, err := gauged.CrestPrior(crest, 0.2, 0.9, 0)
	if err != nil {
		t.Fatal(err)
	}
	truth := mustRating(t, []gauged.Control{
		{Kind: gauged.SectionControl, A: math.Exp(riffle.LogCoefficient.Mean) * 0.9, B: 0.2, C: 1.6},
		{Kind: gauged.ChannelControl, A: 14, C: 1.8, From: 0.9},
	})
	gs := noisy(truth, linspace(0.3, 1.7, 24), []rating.Quality{rating.Good, rating.Fair}, rand.New(rand.NewPCG(10, 10)))
	f, err := gauged.FitBayes(gs, gauged.BayesOptions{
		ControlOptions: gauged.ControlOptions{Controls: []gauged.ControlSpec{
			{Kind: gauged.SectionControl}, {Kind: gauged.ChannelControl}, {Kind: gauged.ChannelControl, Joint: gauged.Add}}},
		Priors:    []gauged.ControlPrior{{}, {Break: gauged.ParamPrior{Mean: 0.9, SD: 0.1}}, {}},
		Hydraulic: &gauge, Crest: &crest, Chains: 4, Draws: 4000, Seed: 5,
	})
	if err != nil {
		t.Fatal(err)
	}
	p := f.Posterior
	t.Logf("R̂ %.3f (%s), ESS %.0f (%s), acceptance %.2f; warnings %q", p.RHatMax, p.RHatParam, p.ESSMin, p.ESSParam, p.Acceptance, f.Warnings)
	if k, _ := findParam(p, "break3"); math.Abs(k.PriorMean-2) > 1e-5 || math.Abs(k.PriorSD-gauged.BankPriorFraction*2) > 1e-5 {
		t.Errorf("floodplain breakpoint prior %g ± %g, want the bank at 2", k.PriorMean, k.PriorSD)
	}
	if b, _ := findParam(p, "b1"); b.PriorMean != 0.2 {
		t.Errorf("first offset prior %g, want the crest at 0.2", b.PriorMean)
	}
	if a, _ := findParam(p, "ln_a1"); math.Abs(a.PriorMean-riffle.LogCoefficient.Mean) > 1e-9 {
		t.Errorf("riffle prior ln a %g, want %g (critical flow over the crest)", a.PriorMean, riffle.LogCoefficient.Mean)
	}
	if !p.Converged {
		t.Errorf("chains disagree: R̂ %.3f for %s", p.RHatMax, p.RHatParam)
	}
	tab, err := f.Table(gauged.ControlTableOptions{Hydraulic: &gauge})
	if err != nil {
		t.Fatal(err)
	}
	top := tab.Rows[len(tab.Rows)-1]
	if !(top.TotalLower > 0 && top.TotalUpper > top.TotalLower) || top.Basis != gauged.FitAboveGaugings {
		t.Errorf("top row %+v", top)
	}
	t.Logf("top row: %.1f m3/s in [%.1f, %.1f] at %.1f times the largest gauging; hydraulic %.1f", top.Discharge, top.TotalLower, top.TotalUpper, top.Multiple, top.Hydraulic)
}
