package gauged_test

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
)

// noisy returns gaugings of rating r at the stages, each with log-normal
// noise of its quality's standard uncertainty (Gauging.LogSigma).
func noisy(r gauged.Rating, stages []float64, qual []rating.Quality, rng *rand.Rand) []gauged.Gauging {
	var gs []gauged.Gauging
	for i, h := range stages {
		g := gauged.Gauging{Stage: h, Quality: qual[i%len(qual)]}
		g.Discharge = r.Discharge(h) * math.Exp(g.LogSigma()*rng.NormFloat64())
		gs = append(gs, g)
	}
	return gs
}

func mustRating(t testing.TB, cs []gauged.Control) gauged.Rating {
	t.Helper()
	r, err := gauged.NewRating(cs)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// Conjugate case: with the offset and the exponent fixed and the variance
// of each gauging known (remnant held at 0.02), ln Qᵢ − C·ln(hᵢ − B) is
// normal about ln A, so a normal prior N(μ₀, τ₀²) on ln A gives a normal
// posterior in closed form (e.g. Gelman et al., 2013, Bayesian Data
// Analysis, section 2.5):
//
//	1/τ² = 1/τ₀² + Σ 1/vᵢ,   μ = τ²·(μ₀/τ₀² + Σ (ln Qᵢ − C·xᵢ)/vᵢ),   vᵢ = σᵢ² + σ_r².
//
// The sampler's mean and standard deviation of ln A agree with μ and τ
// within four Monte Carlo standard errors (sd/√ESS for the mean,
// sd/√(2·ESS) for the standard deviation).
func TestBayesConjugate(t *testing.T) {
	const (
		b, c     = 0.4, 1.8
		mu0, tu0 = 2.0, 0.5
		remnant  = 0.02
	)
	truth := mustRating(t, []gauged.Control{{A: 7, B: b, C: c}})
	gs := noisy(truth, linspace(0.6, 2.5, 12), []rating.Quality{rating.Good, rating.Fair, rating.Excellent}, rand.New(rand.NewPCG(3, 3)))
	prec, sum := 1/(tu0*tu0), mu0/(tu0*tu0)
	for _, g := range gs {
		v := g.LogSigma()*g.LogSigma() + remnant*remnant
		prec += 1 / v
		sum += (math.Log(g.Discharge) - c*math.Log(g.Stage-b)) / v
	}
	wantMean, wantSD := sum/prec, math.Sqrt(1/prec)
	f, err := gauged.FitBayes(gs, gauged.BayesOptions{
		ControlOptions: gauged.ControlOptions{OffsetFixed: true, Offset: b},
		Priors:         []gauged.ControlPrior{{LogCoefficient: gauged.ParamPrior{Mean: mu0, SD: tu0}, Exponent: gauged.ParamPrior{Mean: c, Fixed: true}}},
		RemnantFixed:   true, Remnant: remnant,
		Chains: 4, Draws: 5000, Seed: 7,
	})
	if err != nil {
		t.Fatal(err)
	}
	p := f.Posterior
	if len(p.Parameters) == 0 || p.Parameters[0].Name != "ln_a1" {
		t.Fatalf("parameters %+v", p.Parameters)
	}
	s := p.Parameters[0]
	t.Logf("ln a: posterior %.5f ± %.5f (closed form %.5f ± %.5f), ESS %.0f, R̂ %.4f, acceptance %.2f", s.Mean, s.SD, wantMean, wantSD, s.ESS, s.RHat, p.Acceptance)
	if math.Abs(s.Mean-wantMean) > 4*wantSD/math.Sqrt(s.ESS) {
		t.Errorf("mean %.5f, closed form %.5f (MC tolerance %.2g)", s.Mean, wantMean, 4*wantSD/math.Sqrt(s.ESS))
	}
	if math.Abs(s.SD-wantSD) > 4*wantSD/math.Sqrt(2*s.ESS) {
		t.Errorf("sd %.5f, closed form %.5f", s.SD, wantSD)
	}
	if s.PriorMean != mu0 || s.PriorSD != tu0 || !p.Converged {
		t.Errorf("prior %g ± %g, converged %v", s.PriorMean, s.PriorSD, p.Converged)
	}
}

// With flat priors and no remnant error the log posterior is −½ of the
// weighted sum of squares in ln Q with weights 1/σᵢ², so its mode is the
// weighted least-squares fit (FitControls), here with mixed qualities so
// that the weights matter; with a free remnant and equal qualities every
// gauging has the same variance and the mode is again the least-squares
// fit (Le Coz et al., 2014: the likelihood; closed-form argument).
func TestBayesFlatModeIsLeastSquares(t *testing.T) {
	truth := mustRating(t, []gauged.Control{{A: 5, B: 0.3, C: 1.9}})
	for _, tc := range []struct {
		name    string
		qual    []rating.Quality
		remnant bool
	}{
		{"mixed qualities, no remnant", []rating.Quality{rating.Excellent, rating.Good, rating.Fair, rating.Poor}, false},
		{"equal qualities, remnant fitted", []rating.Quality{rating.Good}, true},
	} {
		gs := noisy(truth, linspace(0.5, 3, 20), tc.qual, rand.New(rand.NewPCG(4, 4)))
		lsq, err := gauged.FitControls(gs, gauged.ControlOptions{})
		if err != nil {
			t.Fatal(err)
		}
		f, err := gauged.FitBayes(gs, gauged.BayesOptions{FlatPriors: true, RemnantFixed: !tc.remnant, Chains: 2, Draws: 500, Pilot: 500, Seed: 1})
		if err != nil {
			t.Fatal(err)
		}
		a, b := lsq.Rating.Controls[0], f.Rating.Controls[0]
		const tol = 1e-5 // two searches to the same optimum
		if relErr(b.A, a.A) > tol || math.Abs(b.B-a.B) > tol || math.Abs(b.C-a.C) > tol {
			t.Errorf("%s: mode A=%.7g B=%.7g C=%.7g, least squares A=%.7g B=%.7g C=%.7g", tc.name, b.A, b.B, b.C, a.A, a.B, a.C)
		}
	}
}

// Data generated from a known two-control rating (a riffle replaced by the
// channel, offsets 0.30 and 0.69 m) with weak priors: the 95 % posterior
// intervals of both offsets hold the truth (the second offset derived by
// continuity, NewRating). The breakpoint is logged: on this data set its
// interval, [1.11, 1.23], just misses the true 1.1 (of ten noise seeds
// tried while writing the test, the other nine held it).
func TestBayesRecoverOffsets(t *testing.T) {
	truth := mustRating(t, []gauged.Control{
		{Kind: gauged.SectionControl, A: 4, B: 0.30, C: 2.3},
		{Kind: gauged.ChannelControl, A: 11, C: 1.7, From: 1.1},
	})
	gs := noisy(truth, linspace(0.45, 3.2, 40), []rating.Quality{rating.Good}, rand.New(rand.NewPCG(5, 5)))
	f, err := gauged.FitBayes(gs, gauged.BayesOptions{
		ControlOptions: gauged.ControlOptions{Controls: []gauged.ControlSpec{{Kind: gauged.SectionControl}, {Kind: gauged.ChannelControl}}},
		Chains:         4, Draws: 4000, Seed: 2,
	})
	if err != nil {
		t.Fatal(err)
	}
	p := f.Posterior
	t.Logf("acceptance %.2f, R̂ max %.4f (%s), ESS min %.0f (%s)", p.Acceptance, p.RHatMax, p.RHatParam, p.ESSMin, p.ESSParam)
	for _, tc := range []struct {
		name string
		want float64
	}{{"b1", 0.30}, {"b2", truth.Controls[1].B}} {
		s, ok := findParam(p, tc.name)
		if !ok {
			t.Fatalf("no parameter %s in %+v", tc.name, p.Parameters)
		}
		t.Logf("%s: %.4f [%.4f, %.4f], truth %.4f", tc.name, s.P50, s.P2_5, s.P97_5, tc.want)
		if !(s.P2_5 <= tc.want && tc.want <= s.P97_5) {
			t.Errorf("%s: 95 %% interval [%.4f, %.4f] misses %.4f", tc.name, s.P2_5, s.P97_5, tc.want)
		}
	}
	if k, ok := findParam(p, "break2"); ok {
		t.Logf("break2: %.4f [%.4f, %.4f], truth 1.1", k.P50, k.P2_5, k.P97_5)
	}
	if !p.Converged {
		t.Errorf("not converged: R̂ %.3f for %s", p.RHatMax, p.RHatParam)
	}
}

func findParam(p *gauged.Posterior, name string) (gauged.ParamSummary, bool) {
	for _, s := range p.Parameters {
		if s.Name == name {
			return s, true
		}
	}
	return gauged.ParamSummary{}, false
}

// The same seed gives the same posterior whatever the number of cores:
// each chain has its own source and its own slot (runChains).
func TestBayesSameOnAnyCoreCount(t *testing.T) {
	truth := mustRating(t, []gauged.Control{{A: 5, B: 0.3, C: 1.9}})
	gs := noisy(truth, linspace(0.5, 3, 15), []rating.Quality{rating.Good}, rand.New(rand.NewPCG(6, 6)))
	run := func(procs int) *gauged.ControlFit {
		defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(procs))
		f, err := gauged.FitBayes(gs, gauged.BayesOptions{Chains: 4, Draws: 1000, Pilot: 1000, Seed: 11})
		if err != nil {
			t.Fatal(err)
		}
		return f
	}
	one, many := run(1), run(4)
	// Printed, so that NaN prior moments compare equal.
	if fmt.Sprint(one.Posterior.Parameters) != fmt.Sprint(many.Posterior.Parameters) || one.Posterior.Acceptance != many.Posterior.Acceptance {
		t.Errorf("GOMAXPROCS 1 and 4 differ:\n%+v\n%+v", one.Posterior.Parameters, many.Posterior.Parameters)
	}
	a1, a2, a3, a4 := one.PosteriorBand(4)
	b1, b2, b3, b4 := many.PosteriorBand(4)
	if a1 != b1 || a2 != b2 || a3 != b3 || a4 != b4 {
		t.Errorf("bands differ: %v %v %v %v and %v %v %v %v", a1, a2, a3, a4, b1, b2, b3, b4)
	}
}

// Given breakpoints must leave every control on weak priors
// MinPerSegment of the gaugings used, as least squares asks of every
// control: a breakpoint above or below the gauged stages, or one leaving a
// control 1 or 2 gaugings, is refused (ErrThinControl). A control whose
// prior comes from the survey may hold none: a floodplain adding above the
// gaugings at a given bank stage, its prior from the section, is fitted,
// with the warning that it rests on its prior. Gaugings from the built
// compound section's own Manning rating (invented), 0.3 to 1.7 m, banks at
// 2 m.
func TestBayesGivenBreaksHoldGaugings(t *testing.T) {
	c := built(t, "compound:bottom=10,side=2,depth=2,floodplain=30,outer=2,floodn=0.06,height=4", 0.035, 0.001)
	gs := gaugeTruth(t, c, linspace(0.3, 1.7, 15), rand.New(rand.NewPCG(2, 2)))
	two := []gauged.ControlSpec{{Kind: gauged.ChannelControl}, {Kind: gauged.ChannelControl, Joint: gauged.Add}}
	for _, tc := range []struct {
		name   string
		breaks []float64
	}{
		{"above the gaugings", []float64{2}},
		{"below the gaugings", []float64{0.2}},
		{"two gaugings above", []float64{1.65}},
		{"one gauging below", []float64{0.35}},
	} {
		_, err := gauged.FitBayes(gs, gauged.BayesOptions{ControlOptions: gauged.ControlOptions{Controls: two, Breaks: tc.breaks},
			Chains: 2, Draws: 200, Seed: 1})
		if !errors.Is(err, gauged.ErrThinControl) || !strings.Contains(err.Error(), "weak priors") {
			t.Errorf("%s, weak priors: %v, want ErrThinControl naming the weak priors", tc.name, err)
		}
		// Least squares refuses the same breakpoints.
		if _, err := gauged.FitControls(gs, gauged.ControlOptions{Controls: two, Breaks: tc.breaks}); !errors.Is(err, gauged.ErrThinControl) {
			t.Errorf("%s, least squares: %v", tc.name, err)
		}
	}
	// Within the gauged stages, each control holding 3 or more: fitted.
	if _, err := gauged.FitBayes(gs, gauged.BayesOptions{ControlOptions: gauged.ControlOptions{Controls: two, Breaks: []float64{1}},
		Chains: 2, Draws: 200, Seed: 1}); err != nil {
		t.Errorf("breakpoint within the gaugings: %v", err)
	}
	f, err := gauged.FitBayes(gs, gauged.BayesOptions{ControlOptions: gauged.ControlOptions{Controls: two, Breaks: []float64{2}},
		Hydraulic: &c, Chains: 2, Draws: 500, Seed: 1})
	if err != nil {
		t.Fatalf("floodplain above the gaugings with its prior from the section: %v", err)
	}
	warned := false
	for _, w := range f.Warnings {
		warned = warned || strings.Contains(w, "control 2 holds 0 gaugings")
	}
	if !warned || f.Controls[1].From != 2 {
		t.Errorf("floodplain from %g, warnings %q", f.Controls[1].From, f.Warnings)
	}
}

// The chains and draws of a Bayesian fit are bounded so that its
// posterior fits in memory: more than MaxChains chains, or more than
// MaxKeptDraws draws in all (pilot iterations included), is
// ErrBayesOptions before anything is computed.
func TestBayesDrawsBounded(t *testing.T) {
	gs := []gauged.Gauging{{Stage: 0.5, Discharge: 1}, {Stage: 1, Discharge: 4}, {Stage: 1.5, Discharge: 9}, {Stage: 2, Discharge: 16}}
	for _, o := range []gauged.BayesOptions{
		{Chains: gauged.MaxChains + 1, Draws: 100},
		{Chains: 1, Draws: gauged.MaxKeptDraws + 1},
		{Chains: 4, Draws: gauged.MaxKeptDraws / 4},
	} {
		if _, err := gauged.FitBayes(gs, o); !errors.Is(err, gauged.ErrBayesOptions) {
			t.Errorf("%d chains of %d draws: %v, want ErrBayesOptions", o.Chains, o.Draws, err)
		}
	}
}
