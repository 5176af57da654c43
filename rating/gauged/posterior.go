package gauged

import (
	"math"
	"math/rand/v2"
	"sort"
	"strings"

	"gonum.org/v1/gonum/stat"
)

// Posterior is the sampled posterior of a Bayesian rating fit.
//
// Sampling is adaptive Metropolis after Haario, Saksman & Tamminen
// (2001), in the form of a pilot then a fixed proposal: each chain starts
// with a normal random walk of covariance 2.38²/d times the Laplace
// covariance at the mode, runs pilotRounds pilot runs (Pilot iterations in
// all, discarded) each followed by setting the proposal to 2.38²/d times
// the pilot's covariance (plus ε·I), and then keeps Draws iterations with
// that proposal fixed, so the kept draws are a Markov chain with the
// posterior as its stationary law. Each step is gonum's samplemv
// MetropolisHastingser with that proposal.
type Posterior struct {
	// Parameters summarise the sampled parameters (on the scale of their
	// priors: ln_a1, c1, b1, break2, ln_remnant), then the derived
	// quantities (a1 …, the offsets b2 … of replacing controls, remnant
	// σ_r).
	Parameters []ParamSummary
	// RHatMax and ESSMin are the largest R̂ (dimensionless, 1 when the
	// chains agree) and the least effective sample size (draws) over the
	// sampled parameters; RHatParam and ESSParam name them.
	RHatMax, ESSMin     float64
	RHatParam, ESSParam string
	// Acceptance is the mean acceptance rate (fraction of proposals
	// taken, 0 to 1) of the kept draws over the chains; ChainAcceptance
	// each chain's.
	Acceptance      float64
	ChainAcceptance []float64
	// Converged reports RHatMax ≤ RHatLimit.
	Converged bool
	// Chains, Draws (kept per chain) and Pilot (per chain) echo the
	// sampling; Seed seeded it.
	Chains, Draws, Pilot int
	Seed                 uint64
	// Modes is the number of distinct local modes the chains started
	// from; ModeLogPosterior the log posterior (up to a constant) at the
	// best.
	Modes            int
	ModeLogPosterior float64
	// Likelihood states the likelihood's convention in words.
	Likelihood string
	// PriorSources says, per control, where its prior came from.
	PriorSources []string

	prior       Rating // the rating of the prior means (see ControlFit.PriorRating)
	hasPrior    bool
	informative []bool // per control, priors of ln A and C from the survey or given
	// spans are, per control, where its prior was fitted to the section's
	// hydraulic rating (see priorSpan).
	spans []priorSpan

	dim   int
	draws []chainResult
	band  []bandDraw
}

// bandDraw is one posterior draw kept for the bands: its rating, its
// remnant σ_r and the standard normal that scales the remnant in the
// total band.
type bandDraw struct {
	r       Rating
	sr, eps float64
}

// bandStream is the second seed word of the source of the remnant draws.
const bandStream = 0xba4d

// posterior summarises the chains.
func (b *bayesProblem) posterior(res []chainResult, modes []mode) *Posterior {
	m, o := b.m, b.opt
	dim := len(m.free)
	p := &Posterior{Chains: o.Chains, Draws: o.Draws, Pilot: o.Pilot, Seed: o.Seed, Modes: len(modes),
		ModeLogPosterior: modes[0].lp, dim: dim, draws: res, RHatMax: math.Inf(-1), ESSMin: math.Inf(1)}
	p.Likelihood = b.likelihoodText()
	p.PriorSources = append([]string(nil), b.sources...)
	p.informative = append([]bool(nil), b.informative...)
	p.spans = append([]priorSpan(nil), b.spans...)
	p.prior, p.hasPrior = b.priorRating()
	for _, c := range res {
		p.ChainAcceptance = append(p.ChainAcceptance, c.acceptance)
		p.Acceptance += c.acceptance / float64(len(res))
	}
	for j, i := range m.free {
		cols := make([][]float64, len(res))
		var pooled []float64
		for c := range res {
			cols[c] = column(res[c], dim, j, 0, o.Draws)
			pooled = append(pooled, cols[c]...)
		}
		s := summarise(m.paramName(i), pooled)
		s.PriorMean, s.PriorSD = b.priors[i].moments()
		s.ESS = EffectiveSize(cols)
		if len(res) > 1 {
			s.RHat = RHat(cols)
		} else {
			s.RHat = RHat([][]float64{pooled})
		}
		if s.RHat > p.RHatMax || math.IsNaN(s.RHat) {
			p.RHatMax, p.RHatParam = s.RHat, s.Name
		}
		if s.ESS < p.ESSMin {
			p.ESSMin, p.ESSParam = s.ESS, s.Name
		}
		p.Parameters = append(p.Parameters, s)
	}
	p.Converged = p.RHatMax <= RHatLimit
	p.band = b.bandDraws(res)
	p.Parameters = append(p.Parameters, b.derivedSummaries(p.band)...)
	return p
}

// bandDraws thins the pooled draws evenly to at most MaxBandDraws and
// pairs each with its rating and a seeded standard normal.
func (b *bayesProblem) bandDraws(res []chainResult) []bandDraw {
	dim := len(b.m.free)
	total := 0
	for _, c := range res {
		total += len(c.draws) / dim
	}
	step := (total + MaxBandDraws - 1) / MaxBandDraws
	rnd := rand.New(rand.NewPCG(b.opt.Seed, bandStream))
	var out []bandDraw
	n := 0
	for _, c := range res {
		for i := 0; i < len(c.draws)/dim; i++ {
			if n%step == 0 {
				x := c.draws[i*dim : (i+1)*dim]
				full := b.m.full(x)
				if r, ok := b.m.rating(full); ok {
					out = append(out, bandDraw{r: r, sr: math.Exp(full[b.m.iRemnant()]), eps: rnd.NormFloat64()})
				}
			}
			n++
		}
	}
	return out
}

// derivedSummaries summarises the coefficients, the offsets of replacing
// controls and the remnant σ_r over the band draws.
func (b *bayesProblem) derivedSummaries(band []bandDraw) []ParamSummary {
	if len(band) == 0 {
		return nil
	}
	k := b.m.k()
	var out []ParamSummary
	col := func(f func(bandDraw) float64) []float64 {
		v := make([]float64, len(band))
		for i, d := range band {
			v[i] = f(d)
		}
		return v
	}
	for j := 0; j < k; j++ {
		s := summarise(sayf("a%d", j+1), col(func(d bandDraw) float64 { return d.r.Controls[j].A }))
		s.Derived = true
		out = append(out, s)
	}
	for j := 1; j < k; j++ {
		if b.m.joints[j] == Replace {
			s := summarise(sayf("b%d", j+1), col(func(d bandDraw) float64 { return d.r.Controls[j].B }))
			s.Derived = true
			out = append(out, s)
		}
	}
	if !b.priors[b.m.iRemnant()].fixed {
		s := summarise("remnant", col(func(d bandDraw) float64 { return d.sr }))
		s.Derived = true
		out = append(out, s)
	}
	return out
}

// likelihoodText states the likelihood's convention.
func (b *bayesProblem) likelihoodText() string {
	o := b.opt
	rem := sayf("a remnant error σ_r in ln Q, log-normal prior with median %.3g and log standard deviation %.3g", o.RemnantMedian, o.RemnantLogSD)
	if o.RemnantFixed {
		rem = sayf("a remnant error σ_r held at %.3g in ln Q", o.Remnant)
	}
	return sayf("ln Q of each gauging is normal about the rating with variance σ² + σ_r²: σ is the gauging's uncertainty, "+
		"or its quality band (excellent 2 %%, good 5 %%, fair 8 %%, poor 12 %%, unrated 8 %%), read as a 95 %% expanded uncertainty, σ = U/1.96; %s", rem)
}

// rhatIs is RHatText after "R̂ ": "= 1.24", or "not determined".
func rhatIs(v float64) string {
	if t := RHatText(v); t != "not determined" {
		return "= " + t
	}
	return "not determined"
}

// RHatText words a potential scale reduction R̂ for a report: three
// significant digits, or "not determined" when it is not a finite number
// (chains that never moved, so that their variances are zero).
func RHatText(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "not determined"
	}
	return sayf("%.3g", v)
}

// warnings returns what a reviewer should know of the sampling.
func (p *Posterior) warnings() []string {
	var out []string
	if !p.Converged {
		advice := "draw more or check the controls and priors"
		if strings.HasPrefix(p.RHatParam, "break") {
			// Chains held at different breakpoints are in different
			// modes, which more draws of a random walk seldom join.
			advice = "the gaugings do not settle that breakpoint, and more draws seldom join chains held at different breakpoints: give the breakpoints (--breaks) where the control is known to change, fit fewer controls, or give priors from the section (--section)"
		}
		out = append(out, sayf("the chains disagree (R̂ %s for %s, above %g): the posterior is not established and bands are withheld unless asked; %s",
			rhatIs(p.RHatMax), p.RHatParam, RHatLimit, advice))
	}
	if p.ESSMin < MinESS {
		out = append(out, sayf("the effective sample size of %s is %.0f, below %d: draw more for stable bands", p.ESSParam, p.ESSMin, MinESS))
	}
	if p.Modes > 1 {
		out = append(out, sayf("the posterior has %d local modes within %g of the best in log density (the breakpoints): chains were started at each", p.Modes, modeGap))
	}
	return out
}

// param returns the summary named name (ok false when absent).
func (p *Posterior) param(name string) (ParamSummary, bool) {
	for _, s := range p.Parameters {
		if s.Name == name {
			return s, true
		}
	}
	return ParamSummary{}, false
}

// controlsFromPosterior returns the mode's controls with posterior
// standard deviations as their uncertainties.
func (b *bayesProblem) controlsFromPosterior(r Rating, p *Posterior) []FittedControl {
	out := make([]FittedControl, len(r.Controls))
	sd := func(name string) float64 {
		if s, ok := p.param(name); ok {
			return s.SD
		}
		return math.NaN()
	}
	for j, c := range r.Controls {
		fc := FittedControl{Control: c, ASE: sd(sayf("a%d", j+1)), CSE: sd(sayf("c%d", j+1)), BSE: math.NaN(), FromSE: math.NaN()}
		switch {
		case j == 0:
			fc.BSE = sd("b1")
			fc.FromSE = fc.BSE
		case c.Joint == Replace:
			fc.BSE, fc.FromSE = sd(sayf("b%d", j+1)), sd(sayf("break%d", j+1))
		default:
			fc.FromSE = sd(sayf("break%d", j+1))
			fc.BSE = fc.FromSE
		}
		out[j] = fc
	}
	return out
}

// PosteriorBand returns, at gauge height h, the 95 % parametric band (the
// 2.5 and 97.5 % quantiles of Q(h; θ) over the posterior draws) and the
// 95 % total band (the same draws with the remnant error added,
// Q(h; θ)·exp(σ_r·ε), ε standard normal, seeded), never narrower than
// the parametric band (where the remnant is small beside the spread of
// the relation, Monte Carlo error could make it so). NaN when the fit is
// not Bayesian.
func (f *ControlFit) PosteriorBand(h float64) (pLo, pHi, tLo, tHi float64) {
	nan := math.NaN()
	if f.Posterior == nil || len(f.Posterior.band) == 0 {
		return nan, nan, nan, nan
	}
	band := f.Posterior.band
	q := make([]float64, len(band))
	t := make([]float64, len(band))
	for i, d := range band {
		q[i] = d.r.Discharge(h)
		t[i] = q[i] * math.Exp(d.sr*d.eps)
	}
	sort.Float64s(q)
	sort.Float64s(t)
	lo, hi := 0.5-FitBandLevel/2, 0.5+FitBandLevel/2
	pLo, pHi = stat.Quantile(lo, stat.Empirical, q, nil), stat.Quantile(hi, stat.Empirical, q, nil)
	tLo, tHi = stat.Quantile(lo, stat.Empirical, t, nil), stat.Quantile(hi, stat.Empirical, t, nil)
	return pLo, pHi, math.Min(tLo, pLo), math.Max(tHi, pHi)
}

// priorRating returns the rating of the prior means, when every control's
// coefficient and exponent have an informative prior and every offset and
// breakpoint a finite prior mean.
func (b *bayesProblem) priorRating() (Rating, bool) {
	for _, ok := range b.informative {
		if !ok {
			return Rating{}, false
		}
	}
	p := append([]float64(nil), b.m.base...)
	for i, pr := range b.priors {
		if b.m.isStage(i) && !finite(pr.mean) {
			return Rating{}, false
		}
		p[i] = pr.mean
	}
	return b.m.rating(p)
}

// PriorRating returns the rating of a Bayesian fit's prior means (every
// control at the mean of its priors of ln A, C, offset and breakpoint):
// what the survey says before the gaugings. ok is false for least
// squares and when a control has weak priors (the rating would mean
// nothing) or an offset or breakpoint without a prior mean.
func (f *ControlFit) PriorRating() (Rating, bool) {
	if f.Posterior == nil || !f.Posterior.hasPrior {
		return Rating{}, false
	}
	return f.Posterior.prior, true
}
