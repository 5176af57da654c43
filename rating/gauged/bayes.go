package gauged

import (
	"errors"
	"math"
	"math/rand/v2"
	"sort"

	"gonum.org/v1/gonum/diff/fd"
	"gonum.org/v1/gonum/mat"

	"wetline/rating"
)

// Defaults of a Bayesian fit (project choices).
const (
	// DefaultChains is the number of chains.
	DefaultChains = 4
	// DefaultDraws is the number of draws kept per chain.
	DefaultDraws = 5000
	// DefaultPilot is the number of pilot iterations per chain (adapting
	// the proposal; discarded as burn-in).
	DefaultPilot = 3000
	// DefaultRemnantMedian is the median of the log-normal prior of the
	// remnant error σ_r (ln Q units: 3 %).
	DefaultRemnantMedian = 0.03
	// DefaultRemnantLogSD is the standard deviation of ln σ_r in that
	// prior (a factor e either way at one standard deviation).
	DefaultRemnantLogSD = 1.0
	// MinESS is the effective sample size below which a warning says to
	// draw more (common practice: a few hundred for 95 % quantiles).
	MinESS = 400
	// MaxBandDraws bounds the posterior draws the bands are computed
	// from (evenly thinned when there are more).
	MaxBandDraws = 8000
	// MaxChains bounds the number of chains.
	MaxChains = 64
	// MaxKeptDraws bounds the draws kept over all chains (chains × draws,
	// pilot iterations included): each keeps every parameter, so the
	// largest posterior (4 controls, 14 parameters) takes about 0.3 GB.
	MaxKeptDraws = 2_000_000
	// modeGap is how far, in log posterior, a local mode may lie below
	// the best one and still start a chain.
	modeGap = 4.0
	// startOffsetFraction places a start's first offset this fraction of
	// the gauged span below the lowest gauging when its prior gives none.
	startOffsetFraction = 0.1
	// hessianStep is the central-difference step of the Laplace Hessian,
	// in parameter scales; hessianWall stands for −log posterior where it
	// is infinite (a finite wall keeps the differences finite).
	hessianStep, hessianWall = 1e-4, 1e300
	// fallbackSpread is the standard deviation, in parameter scales, of
	// the proposal used when the Laplace covariance is not positive
	// definite.
	fallbackSpread = 0.1
)

// BayesOptions configure a Bayesian fit of a rating of controls. The zero
// value fits one control of unknown kind with weak priors, four chains.
type BayesOptions struct {
	// ControlOptions are the controls, breakpoints, offset, units and
	// selection, as for FitControls; given breakpoints and a fixed offset
	// are held, not sampled.
	ControlOptions
	// Priors, when given, hold one ControlPrior per control; a parameter
	// whose prior is not given (SD = 0, not Fixed) takes a prior derived
	// from Hydraulic or Crest, or a weak one.
	Priors []ControlPrior
	// Hydraulic is the gauge section's hydraulic rating (with its slope):
	// the prior of channel controls (HydraulicPrior), of the first
	// channel control's offset (the lowest point) and of the breakpoint
	// of a floodplain control that adds (BankStage). Nil: weak priors.
	Hydraulic *rating.HydraulicCurve
	// Crest is a surveyed crest section (its Datum relates it to the
	// gauge): the prior of section controls (CrestPrior) and of their
	// offset (the crest's lowest point). Nil: weak priors.
	Crest *rating.HydraulicCurve
	// HydraulicTable, used when Hydraulic is nil, is a hydraulic rating
	// given as a table at gauge heights: the prior of channel controls
	// (TablePrior) and of the first channel control's offset (the table's
	// TableBottom, when the table says where its flow starts; a table
	// whose first row carries discharge gives the offset a flat prior and
	// its A and C at the least-squares fit's first offset). It gives no
	// share of the discharge to a floodplain, so a control that adds takes
	// weak priors.
	HydraulicTable *TableRating
	// NCV, SlopeCV and CrestCV are the coefficients of variation of n,
	// slope and crest discharge (defaults DefaultNCV, DefaultSlopeCV,
	// DefaultCrestCV; ≥ 0).
	NCV, SlopeCV, CrestCV float64
	// RemnantMedian and RemnantLogSD set the log-normal prior of the
	// remnant error σ_r in ln Q (defaults DefaultRemnantMedian,
	// DefaultRemnantLogSD; > 0).
	RemnantMedian, RemnantLogSD float64
	// RemnantFixed holds σ_r at Remnant (ln Q units, ≥ 0) instead.
	RemnantFixed bool
	Remnant      float64
	// FlatPriors replaces every prior by a flat (improper) one, for
	// checks against least squares; fixed parameters stay fixed.
	FlatPriors bool
	// Chains is the number of chains (default DefaultChains, ≥ 2 for R̂).
	Chains int
	// Draws is the number of draws kept per chain (default DefaultDraws).
	Draws int
	// Pilot is the number of pilot iterations per chain (default
	// DefaultPilot; negative for none).
	Pilot int
	// Seed seeds the chains' sources; the same seed gives the same output
	// on any number of cores.
	Seed uint64
}

// ErrBayesOptions is returned for options a Bayesian fit cannot use.
var ErrBayesOptions = errors.New("unusable options for a Bayesian fit")

// prior is one parameter's prior as the sampler uses it: normal (sd
// finite), flat (sd +Inf) within [lo, hi] (±Inf when open), or fixed.
type prior struct {
	mean, sd, lo, hi float64
	fixed            bool
}

// logDensity is the prior's log density at x up to a constant.
func (p prior) logDensity(x float64) float64 {
	if x < p.lo || x > p.hi {
		return math.Inf(-1)
	}
	if math.IsInf(p.sd, 1) {
		return 0
	}
	z := (x - p.mean) / p.sd
	return -0.5 * z * z
}

// moments returns the prior's reported mean and standard deviation:
// those of the normal, of the uniform on a bounded flat prior, NaN for an
// open flat prior.
func (p prior) moments() (float64, float64) {
	switch {
	case p.fixed:
		return p.mean, 0
	case !math.IsInf(p.sd, 1):
		return p.mean, p.sd
	case finite(p.lo) && finite(p.hi):
		return 0.5 * (p.lo + p.hi), (p.hi - p.lo) / math.Sqrt(12)
	}
	return math.NaN(), math.NaN()
}

// fromParam turns a given ParamPrior into a prior.
func fromParam(pp ParamPrior) prior {
	sd := pp.SD
	return prior{mean: pp.Mean, sd: sd, lo: math.Inf(-1), hi: math.Inf(1), fixed: pp.Fixed}
}

// flat is an open flat prior.
func flat() prior { return prior{mean: math.NaN(), sd: math.Inf(1), lo: math.Inf(-1), hi: math.Inf(1)} }

// bayesProblem is a Bayesian fit in progress.
type bayesProblem struct {
	m       *model
	d       *data
	priors  []prior // one per parameter of the full vector
	opt     BayesOptions
	sources []string // per control, where its prior came from
	// spans are, per control, where its prior was fitted to the section's
	// hydraulic rating (ok false: not from it).
	spans []priorSpan
	// informative reports, per control, priors of ln A and C from the
	// survey or given (not the weak defaults).
	informative []bool
	warn        []string
}

// FitBayes fits a rating of controls (see NewRating) to gaugings by
// Bayesian inference after Le Coz et al. (2014). The likelihood treats
// each used gauging's ln Q as normal about the rating,
//
//	ln Qᵢ ~ N(ln Q(hᵢ; θ), σᵢ² + σ_r²),
//
// with σᵢ its LogSigma (its uncertainty, or its quality band, as a 95 %
// expanded uncertainty) and σ_r a remnant (structural) error of the
// rating, constant in ln Q (a relative error; Le Coz et al. use
// γ₁ + γ₂·Q), with a log-normal prior. Priors of each control come from
// opt.Priors, else from the survey (HydraulicPrior for channel controls,
// CrestPrior for section controls, the lowest point for the first offset,
// BankStage for a floodplain breakpoint), else weak ones (ln A ~ N(0,
// WeakLogCoefficientSD), the exponent by kind, offsets flat, a fitted
// breakpoint uniform over the gauged stages).
//
// The posterior mode is found by gonum/optimize's Nelder–Mead from the
// least-squares fit and the prior means; the chains then sample the
// posterior by adaptive Metropolis (see Posterior): each with its own
// source seeded from opt.Seed, started about the mode (or at other local
// modes within modeGap of it), run on separate goroutines in fixed
// chunks, so the output is the same for any GOMAXPROCS. The bands of
// ControlTable come from the draws.
//
// Errors: those of FitControls's options and gaugings, ErrBayesOptions,
// ErrThinControl for given breakpoints that leave a control on weak
// priors fewer than MinPerSegment gaugings (see givenBreaksHold),
// ErrNoStart when no start is admissible.
//
// References:
//
//	Le Coz, J., Renard, B., Bonnifait, L., Branger, F., Le Boursicaud, R.
//	(2014). Combining hydraulic knowledge and uncertain gaugings in the
//	estimation of hydrometric rating curves: a Bayesian approach.
//	Journal of Hydrology 509, 573–587.
//	Haario, H., Saksman, E., Tamminen, J. (2001). An adaptive Metropolis
//	algorithm. Bernoulli 7(2), 223–242.
//	Gelman, A., Rubin, D. B. (1992). Statistical Science 7(4), 457–472.
func FitBayes(gs []Gauging, opt BayesOptions) (*ControlFit, error) {
	if err := opt.check(); err != nil {
		return nil, err
	}
	kinds, joints, err := opt.specs()
	if err != nil {
		return nil, err
	}
	d, reasons, warn, err := selectGaugings(gs, opt.Selection)
	if err != nil {
		return nil, err
	}
	if err := farBelowOthers(gs, d, opt.Units); err != nil {
		return nil, err
	}
	if d.n() < 1 {
		return nil, errorf("%w: no gauging is used", ErrFewGaugings)
	}
	if opt.OffsetFixed {
		if err := aboveOffset(gs, d, opt.ControlOptions); err != nil {
			return nil, err
		}
	}
	if opt.Priors != nil && len(opt.Priors) != len(kinds) {
		return nil, errorf("%w: %d priors for %d controls", ErrBayesOptions, len(opt.Priors), len(kinds))
	}
	lsqStarts, lsqFull, noStart := lsqGuess(gs, opt.ControlOptions)
	b := &bayesProblem{m: newModel(kinds, joints), d: d, opt: opt, warn: warn}
	if err := b.resolvePriors(lsqFull); err != nil {
		return nil, err
	}
	if err := b.givenBreaksHold(); err != nil {
		return nil, err
	}
	if len(b.m.free) == 0 {
		return nil, errorf("%w: every parameter is held fixed: nothing to sample", ErrBayesOptions)
	}
	modes, err := b.modes(lsqFull, lsqStarts, noStart)
	if err != nil {
		return nil, err
	}
	f := &ControlFit{Method: Bayesian, Units: opt.Units, OffsetFixed: opt.OffsetFixed, BreaksFixed: opt.Breaks != nil,
		m: b.m, d: d, x: modes[0].x, scale: b.scales(), Warnings: b.warn, StandardErrorLog: math.NaN(), StandardErrorPercent: math.NaN()}
	f.OffsetSource = "fitted"
	if opt.OffsetFixed {
		f.OffsetSource = opt.OffsetSource
		if f.OffsetSource == "" {
			f.OffsetSource = "given"
		}
	}
	f.Params = len(b.m.free)
	r, _ := b.m.rating(b.m.full(f.x))
	f.Rating = r
	np := f.Params
	if !b.priors[b.m.iRemnant()].fixed {
		np-- // the remnant is not a parameter of the rating
	}
	f.PriorOnlyParams = b.priorOnlyParams(r)
	np -= f.PriorOnlyParams
	f.StandardErrorLog = b.modeScatter(f.Rating, np)
	f.StandardErrorDF = b.d.n() - np
	f.StandardErrorPercent = 100 * math.Sinh(f.StandardErrorLog)
	post := b.sample(modes, f.scale)
	f.Posterior = post
	f.Controls = b.controlsFromPosterior(r, post)
	f.Warnings = append(f.Warnings, post.warnings()...)
	f.finishCommon(gs, opt.Selection, reasons, b.exponentBounds())
	f.Warnings = append(f.Warnings, b.thinControls(r)...)
	return f, nil
}

// lsqGuess returns the least-squares fit's starting points and, when it
// converges, its full parameter vector (nil otherwise): a guess at the
// posterior mode and at priors the survey does not give. noStart is the
// reason, wrapping ErrNoStart, when the least-squares search had no start
// (nil otherwise).
func lsqGuess(gs []Gauging, opt ControlOptions) (starts [][]float64, full []float64, noStart error) {
	p, _, _, err := newLSQProblem(gs, opt)
	if err != nil {
		return nil, nil, nil
	}
	starts, err = p.starts()
	if err != nil {
		return nil, nil, err
	}
	x, _, err := p.solveFrom(starts)
	if err != nil {
		return starts, nil, nil
	}
	return starts, p.m.full(x), nil
}

// givenBreaksHold checks given breakpoints against the gaugings used: each
// control whose priors of ln A and C are weak must hold MinPerSegment of
// them, as least squares asks of every control, so a breakpoint outside the
// gauged stages leaves a weakly held control empty and is refused. A
// control with priors from the survey or given may hold fewer (it rests on
// its prior, and thinControls warns of it). The error wraps
// ErrThinControl and names each such control, its stages, the gaugings it
// holds, its priors and the gauged range.
func (b *bayesProblem) givenBreaksHold() error {
	breaks := b.opt.Breaks
	if breaks == nil {
		return nil
	}
	thin := thinControls(b.d, breaks, b.m.k(), func(j int) bool { return b.informative[j] })
	if thin == nil {
		return nil
	}
	return thinControlError(b.d, breaks, thin, b.opt.Units, func(j int) string { return "with " + b.sources[j] },
		sayf("place the breakpoints within the gauged stages so that each control holds %d, or give the control a prior from a surveyed section or crest", MinPerSegment))
}

// priorOnlyParams counts the free parameters of the controls of rating r
// (at the posterior mode) that no gauging constrains: those of each
// control holding no gauging with none above it holding one (ln A, C and
// its breakpoint). Every gauging is rated by a control below them, whose
// range they only bound from above, so they rest on their priors alone.
// An empty control with gaugings above it is counted: joined by
// continuity, it sets the offset of the control above.
func (b *bayesProblem) priorOnlyParams(r Rating) int {
	m := b.m
	free := make(map[int]bool, len(m.free))
	for _, i := range m.free {
		free[i] = true
	}
	n := 0
	for k := len(r.Controls) - 1; k > 0; k-- {
		if b.d.countIn(r.Controls[k].From, math.Inf(1)) > 0 {
			break
		}
		for _, i := range []int{m.iLnA(k), m.iC(k), m.iBreak(k)} {
			if free[i] {
				n++
			}
		}
	}
	return n
}

// thinControls warns of each control of rating r (at the posterior mode)
// holding fewer than MinPerSegment gaugings: its parameters rest on the
// prior.
func (b *bayesProblem) thinControls(r Rating) []string {
	var out []string
	n := len(r.Controls)
	for k := range n {
		lo, hi := math.Inf(-1), math.Inf(1)
		if k > 0 {
			lo = r.Controls[k].From
		}
		if k+1 < n {
			hi = r.Controls[k+1].From
		}
		if c := b.d.countIn(lo, hi); c < MinPerSegment {
			out = append(out, sayf("control %d holds %s at the posterior mode: its parameters rest on the prior (%s)", k+1, rating.Counted(c, "gauging", "gaugings"), b.sources[k]))
		}
	}
	return out
}

// modeScatter is the weighted standard error of estimate of rating r, as
// for least squares: √(Σwᵢrᵢ²/(n − p)) with weights normalised to mean 1
// (NaN when n ≤ p).
func (b *bayesProblem) modeScatter(r Rating, p int) float64 {
	d := b.d
	if d.n() <= p {
		return math.NaN()
	}
	var ss float64
	for i, h := range d.h {
		e := d.y[i] - logQ(r, h)
		ss += d.w[i] * e * e
	}
	return math.Sqrt(ss / float64(d.n()-p))
}

// check validates and defaults the options in place.
func (o *BayesOptions) check() error {
	if o.Chains == 0 {
		o.Chains = DefaultChains
	}
	if o.Draws == 0 {
		o.Draws = DefaultDraws
	}
	if o.Pilot == 0 {
		o.Pilot = DefaultPilot
	}
	if o.Pilot < 0 {
		o.Pilot = 0
	}
	if o.RemnantMedian == 0 {
		o.RemnantMedian = DefaultRemnantMedian
	}
	if o.RemnantLogSD == 0 {
		o.RemnantLogSD = DefaultRemnantLogSD
	}
	switch {
	case o.Chains < 1 || o.Draws < 4:
		return errorf("%w: %d chains of %d draws (at least 1 chain of 4 draws)", ErrBayesOptions, o.Chains, o.Draws)
	case o.Chains > MaxChains || o.Draws > MaxKeptDraws || o.Pilot > MaxKeptDraws || o.Chains*(o.Draws+o.Pilot) > MaxKeptDraws:
		return errorf("%w: %d chains of %d draws after %d pilot iterations: at most %d chains and %d draws in all", ErrBayesOptions, o.Chains, o.Draws, o.Pilot, MaxChains, MaxKeptDraws)
	case !(o.RemnantMedian > 0) || !(o.RemnantLogSD > 0) || math.IsInf(o.RemnantMedian, 0) || math.IsInf(o.RemnantLogSD, 0):
		return errorf("%w: remnant prior median %g, log sd %g", ErrBayesOptions, o.RemnantMedian, o.RemnantLogSD)
	case o.RemnantFixed && !(o.Remnant >= 0 && !math.IsInf(o.Remnant, 0)):
		return errorf("%w: fixed remnant %g", ErrBayesOptions, o.Remnant)
	case !(o.NCV >= 0) || !(o.SlopeCV >= 0) || !(o.CrestCV >= 0):
		return errorf("%w: coefficients of variation %g, %g, %g", ErrBayesOptions, o.NCV, o.SlopeCV, o.CrestCV)
	}
	for k, cp := range o.Priors {
		for _, pp := range []ParamPrior{cp.LogCoefficient, cp.Exponent, cp.Offset, cp.Break} {
			if pp.given() && (!finite(pp.Mean) || !(pp.SD >= 0)) {
				return errorf("%w: control %d has a prior of mean %g and standard deviation %g", ErrBayesOptions, k+1, pp.Mean, pp.SD)
			}
		}
	}
	return nil
}

// scales returns the scale of each free parameter (see scales), 1 for
// the remnant.
func (b *bayesProblem) scales() []float64 { return scales(b.m, b.d) }

// logPost is the log posterior density (up to a constant) at free
// parameters x; −Inf where x makes no rating or a gauging lies at or below
// the first offset.
func (b *bayesProblem) logPost(x []float64) float64 {
	p := b.m.full(x)
	var lp float64
	for j, i := range b.m.free {
		lp += b.priors[i].logDensity(x[j])
	}
	if math.IsInf(lp, -1) || math.IsNaN(lp) {
		return math.Inf(-1)
	}
	r, ok := b.m.rating(p)
	if !ok {
		return math.Inf(-1)
	}
	sr := math.Exp(p[b.m.iRemnant()])
	sr2 := sr * sr
	for i, h := range b.d.h {
		mu := logQ(r, h)
		if math.IsInf(mu, -1) || math.IsNaN(mu) {
			return math.Inf(-1)
		}
		v := b.d.sigma[i]*b.d.sigma[i] + sr2
		e := b.d.y[i] - mu
		lp -= 0.5 * (e*e/v + math.Log(v))
	}
	return lp
}

// resolvePriors sets the prior of every parameter and the free list:
// the breakpoints first (they bound the controls' ranges), then the first
// offset, each control's ln A and C, and the remnant; with FlatPriors
// every prior that is not held becomes flat. est is the least-squares
// estimate (full vector) or nil. The error is BankStage's, or
// ErrBayesOptions for a floodplain control on a section without
// overbanks.
func (b *bayesProblem) resolvePriors(est []float64) error {
	m := b.m
	b.priors = make([]prior, m.fullLen())
	b.sources = make([]string, m.k())
	b.spans = make([]priorSpan, m.k())
	b.informative = make([]bool, m.k())
	if err := b.breakPriors(); err != nil {
		return err
	}
	b.offsetPrior(est)
	b.controlPriors(est)
	b.remnantPrior()
	if b.opt.FlatPriors {
		for i := range b.priors {
			if !b.priors[i].fixed {
				b.priors[i] = flat()
			}
		}
	}
	m.free = m.free[:0]
	for i, p := range b.priors {
		m.base[i] = p.mean
		if !p.fixed {
			m.free = append(m.free, i)
		}
	}
	return nil
}

// givenPrior returns the prior the options give control j (none when
// they give no priors).
func (b *bayesProblem) givenPrior(j int) ControlPrior {
	if b.opt.Priors == nil {
		return ControlPrior{}
	}
	return b.opt.Priors[j]
}

// breakPriors sets the prior of every breakpoint: held at a given
// breakpoint, as given, at the bank stage (BankStage, with a standard
// deviation of BankPriorFraction of the bank's height above the bottom)
// for a floodplain control that adds, else uniform over the gauged
// stages.
func (b *bayesProblem) breakPriors() error {
	m, d, o := b.m, b.d, b.opt
	for j := 1; j < m.k(); j++ {
		i := m.iBreak(j)
		switch {
		case o.Breaks != nil:
			b.priors[i] = prior{mean: o.Breaks[j-1], fixed: true}
		case b.givenPrior(j).Break.given():
			b.priors[i] = fromParam(b.givenPrior(j).Break)
		case m.joints[j] == Add && o.Hydraulic != nil:
			bank, ok, err := BankStage(*o.Hydraulic)
			if err != nil {
				return err
			}
			if !ok {
				return errorf("%w: control %d adds a floodplain but the section has no overbanks: give its breakpoint", ErrBayesOptions, j+1)
			}
			b.priors[i] = prior{mean: bank, sd: BankPriorFraction * (bank - o.Hydraulic.Bottom()), lo: math.Inf(-1), hi: math.Inf(1)}
		default:
			b.priors[i] = prior{mean: math.NaN(), sd: math.Inf(1), lo: d.lo, hi: d.hi}
		}
	}
	return nil
}

// breakGuess is the best guess of breakpoint j (gauge height): its
// prior's mean, else the least-squares estimate est, else a point
// dividing the gauged stages evenly. The break priors must be set.
func (b *bayesProblem) breakGuess(j int, est []float64) float64 {
	m, d := b.m, b.d
	p := b.priors[m.iBreak(j)]
	switch {
	case finite(p.mean):
		return p.mean
	case est != nil:
		return est[m.iBreak(j)]
	}
	return d.lo + (d.hi-d.lo)*float64(j)/float64(m.k())
}

// offsetPrior sets the prior of the first offset: held when fixed, as
// given, about the survey's lowest point (standard deviation
// OffsetPriorFraction of the height from it to the first control's top),
// else flat.
func (b *bayesProblem) offsetPrior(est []float64) {
	m, d, o := b.m, b.d, b.opt
	ib := m.iB()
	bottom, hasBottom := b.surveyBottom(0)
	switch {
	case o.OffsetFixed:
		b.priors[ib] = prior{mean: o.Offset, fixed: true}
	case b.givenPrior(0).Offset.given():
		b.priors[ib] = fromParam(b.givenPrior(0).Offset)
	case hasBottom:
		to := d.hi
		if m.k() > 1 {
			to = b.breakGuess(1, est)
		}
		b.priors[ib] = prior{mean: bottom, sd: OffsetPriorFraction * math.Max(to-bottom, 0), lo: math.Inf(-1), hi: math.Inf(1)}
		if !(b.priors[ib].sd > 0) {
			b.priors[ib].sd = math.Inf(1)
		}
	default:
		b.priors[ib] = flat()
	}
}

// controlPriors sets the priors of every control's ln A and C over its
// range of gauge heights: as given, else derived from the survey
// (derivedPrior), else weak ones (with a warning when the survey gives
// none). It also records each control's prior source and whether its
// priors are informative. The offset and break priors must be set.
func (b *bayesProblem) controlPriors(est []float64) {
	m, d, o := b.m, b.d, b.opt
	k, ib := m.k(), m.iB()
	for j := 0; j < k; j++ {
		from := b.priors[ib].mean
		if j == 0 && !finite(from) {
			from = d.lo
			if est != nil {
				from = est[ib]
			}
		}
		if j > 0 {
			from = b.breakGuess(j, est)
		}
		to := d.hi
		if j+1 < k {
			to = b.breakGuess(j+1, est)
		} else if ref := referenceOf(o.Hydraulic, o.HydraulicTable); ref.ok() {
			to = math.Max(ref.top(), to)
		}
		guess := math.NaN()
		if j == 0 && est != nil {
			guess = est[ib]
		}
		derived, src, err := b.derivedPrior(j, from, to, guess)
		if err != nil {
			b.warn = append(b.warn, sayf("control %d: %v: weak priors instead", j+1, err))
		}
		gp := b.givenPrior(j)
		lnA, c := derived.LogCoefficient, derived.Exponent
		if gp.LogCoefficient.given() {
			lnA, src = gp.LogCoefficient, "given"
		}
		if gp.Exponent.given() {
			c = gp.Exponent
		}
		if gp.Source != "" {
			src = gp.Source
		}
		b.priors[m.iLnA(j)], b.priors[m.iC(j)] = fromParam(lnA), fromParam(c)
		b.sources[j] = src
		if o.FlatPriors || gp.LogCoefficient.given() && gp.Exponent.given() {
			b.spans[j] = priorSpan{} // nothing of the survey's prior is kept
		}
		b.informative[j] = (derived.Source != "" || gp.LogCoefficient.given()) && !o.FlatPriors
	}
}

// remnantPrior sets the prior of ln σ_r: held at a fixed remnant, else
// normal about ln RemnantMedian with standard deviation RemnantLogSD (a
// log-normal prior of σ_r).
func (b *bayesProblem) remnantPrior() {
	o, ir := b.opt, b.m.iRemnant()
	if o.RemnantFixed {
		b.priors[ir] = prior{mean: math.Log(o.Remnant), fixed: true}
	} else {
		b.priors[ir] = prior{mean: math.Log(o.RemnantMedian), sd: o.RemnantLogSD, lo: math.Inf(-1), hi: math.Inf(1)}
	}
}

// surveyBottom returns the survey's lowest point of control j's section
// (gauge height): the crest's for a section control with a crest, the
// gauge section's for a channel control with a section, a hydraulic
// rating table's dry foot when it has one. A table whose first row
// already carries discharge (a step-backwater ladder) does not say where
// the flow starts.
func (b *bayesProblem) surveyBottom(j int) (float64, bool) {
	switch {
	case b.m.kinds[j] == SectionControl && b.opt.Crest != nil:
		return b.opt.Crest.Bottom(), true
	case b.m.kinds[j] == ChannelControl && b.opt.Hydraulic != nil:
		return b.opt.Hydraulic.Bottom(), true
	case b.m.kinds[j] == ChannelControl && b.opt.HydraulicTable != nil && tableStartsDry(b.opt.HydraulicTable):
		return TableBottom(b.opt.HydraulicTable), true
	}
	return 0, false
}

// derivedPrior returns control j's prior of ln A and C over gauge heights
// from..to: from the survey when its kind has one, else weak. guess is
// the least-squares estimate of the first offset (NaN for none): a
// hydraulic rating table that does not say where its flow starts (its
// first row carries discharge) gives the first channel control's A and C
// at that offset when it lies below the table's lowest row, since both
// depend on the offset they go with and that row is no gauge height of
// zero flow; without one the table's offset is fitted (TablePrior).
func (b *bayesProblem) derivedPrior(j int, from, to, guess float64) (ControlPrior, string, error) {
	m, o := b.m, b.opt
	weak := ControlPrior{LogCoefficient: ParamPrior{Mean: 0, SD: WeakLogCoefficientSD}, Exponent: weakExponent(m.kinds[j])}
	weakSrc := sayf("weak priors (ln A ~ N(0, %g), C ~ N(%.3g, %g))", WeakLogCoefficientSD, weak.Exponent.Mean, weak.Exponent.SD)
	switch {
	case m.kinds[j] == ChannelControl && o.Hydraulic != nil:
		ho := HydraulicPriorOptions{NCV: o.NCV, SlopeCV: o.SlopeCV, Units: o.Units}
		switch {
		case j > 0 && m.joints[j] == Add:
			ho.Part, ho.OffsetFixed, ho.Offset = OverbankPart, true, from
		case j+1 < m.k() && m.joints[j+1] == Add:
			ho.Part = ChannelPart
		}
		if j+1 < m.k() && m.joints[j+1] == Add {
			to = math.Max(o.Hydraulic.Top(), to) // the channel carries on above the floodplain's breakpoint
		}
		if j == 0 {
			if p := b.priors[m.iB()]; finite(p.mean) {
				ho.OffsetFixed, ho.Offset = true, p.mean
			}
		}
		cp, err := HydraulicPrior(*o.Hydraulic, from, to, ho)
		if err != nil {
			return weak, weakSrc, err
		}
		b.spans[j] = priorSpan{from: from, to: to, part: ho.Part, ok: true}
		return cp, cp.Source, nil
	case m.kinds[j] == ChannelControl && o.HydraulicTable != nil:
		if j > 0 && m.joints[j] == Add {
			return weak, weakSrc, errorf("%w: a hydraulic rating table does not split the discharge between channel and floodplain", ErrPrior)
		}
		ho := HydraulicPriorOptions{NCV: o.NCV, SlopeCV: o.SlopeCV, Units: o.Units}
		atGuess := false
		if j == 0 {
			lo, _ := o.HydraulicTable.Range()
			switch p := b.priors[m.iB()]; {
			case finite(p.mean):
				ho.OffsetFixed, ho.Offset = true, p.mean
			case !tableStartsDry(o.HydraulicTable) && guess < lo:
				ho.OffsetFixed, ho.Offset, atGuess = true, guess, true
			}
		}
		cp, err := TablePrior(o.HydraulicTable, from, to, ho)
		if err != nil {
			return weak, weakSrc, err
		}
		if atGuess {
			cp.Source += ", at the least-squares fit's first offset (the table's first row carries discharge, so it does not say where the flow starts)"
		}
		return cp, cp.Source, nil
	case m.kinds[j] == SectionControl && o.Crest != nil:
		cp, err := CrestPrior(*o.Crest, from, to, o.CrestCV)
		if err != nil {
			return weak, weakSrc, err
		}
		return cp, cp.Source, nil
	}
	return weak, weakSrc, nil
}

// mode is a local maximum of the posterior.
type mode struct {
	x  []float64
	lp float64
}

// modes returns the local posterior modes found from the least-squares
// starts and the prior means, best first, keeping those within modeGap of
// the best (distinct ones only). With no admissible start the error wraps
// ErrNoStart, with noStart's reason when least squares gave one.
func (b *bayesProblem) modes(lsqFull []float64, lsqStarts [][]float64, noStart error) ([]mode, error) {
	m := b.m
	var starts [][]float64
	withRemnant := func(full []float64) []float64 {
		p := append([]float64(nil), full...)
		for i, pr := range b.priors {
			if pr.fixed {
				p[i] = pr.mean
			}
		}
		if !b.priors[m.iRemnant()].fixed {
			p[m.iRemnant()] = math.Log(b.opt.RemnantMedian)
		}
		return m.freeOf(p)
	}
	if lsqFull != nil {
		starts = append(starts, withRemnant(lsqFull))
	}
	for _, s := range lsqStarts {
		starts = append(starts, withRemnant(s))
	}
	if s, ok := b.priorStart(); ok {
		starts = append(starts, withRemnant(s))
	}
	scale := b.scales()
	neg := func(x []float64) float64 { return -b.logPost(x) }
	var found []mode
	for _, x := range starts {
		if math.IsInf(b.logPost(x), -1) {
			continue
		}
		x, _ = nelderMead(neg, x, scale)
		x, f := nelderMead(neg, x, scale)
		found = append(found, mode{x: x, lp: -f})
	}
	if len(found) == 0 {
		if noStart != nil {
			return nil, noStart
		}
		return nil, errorf("%w: the posterior is zero at every start (check the breakpoints, offsets and priors)", ErrNoStart)
	}
	sort.SliceStable(found, func(a, c int) bool { return found[a].lp > found[c].lp })
	out := []mode{found[0]}
	for _, md := range found[1:] {
		if found[0].lp-md.lp > modeGap {
			break
		}
		distinct := true
		for _, o := range out {
			if sameMode(o.x, md.x, scale) {
				distinct = false
			}
		}
		if distinct {
			out = append(out, md)
		}
	}
	return out, nil
}

// sameModeTol is the distance, in parameter scales, within which two
// modes are the same.
const sameModeTol = 1e-3

// sameMode reports two points within sameModeTol scales of each other.
func sameMode(a, b, scale []float64) bool {
	for i := range a {
		if math.Abs(a[i]-b[i]) > sameModeTol*scale[i] {
			return false
		}
	}
	return true
}

// priorStart builds a start from the priors and the gaugings: breakpoints
// and offsets at their prior means (or within the gaugings), each control
// fitted to its gaugings when it holds two, else at its prior means.
func (b *bayesProblem) priorStart() ([]float64, bool) {
	m, d := b.m, b.d
	k := m.k()
	full := append([]float64(nil), m.base...)
	for i, p := range b.priors {
		switch {
		case finite(p.mean):
			full[i] = p.mean
		case finite(p.lo) && finite(p.hi):
			full[i] = 0.5 * (p.lo + p.hi)
		}
	}
	span := math.Max(d.hi-d.lo, minSpan)
	if ib := m.iB(); !finite(full[ib]) || !(full[ib] < d.lo) {
		full[ib] = d.lo - startOffsetFraction*span
	}
	for j := 1; j < k; j++ {
		if i := m.iBreak(j); !finite(full[i]) {
			full[i] = d.lo + span*float64(j)/float64(k)
		}
	}
	for j := 0; j < k; j++ {
		lo, hi := math.Inf(-1), math.Inf(1)
		if j > 0 {
			lo = full[m.iBreak(j)]
		}
		if j+1 < k {
			hi = full[m.iBreak(j+1)]
		}
		hs, ys, ws := d.slice(lo, hi)
		if len(hs) < 2 {
			continue
		}
		if j == 0 {
			if la, c, _, ok := powerFit(hs, ys, ws, full[m.iB()]); ok {
				full[m.iLnA(0)], full[m.iC(0)] = la, c
			}
			continue
		}
		below, ok := m.ratingUpTo(full, j-1)
		if !ok {
			return nil, false
		}
		if m.joints[j] == Add {
			full[m.iLnA(j)], full[m.iC(j)] = addStart(below, j-1, lo, hs, ys, ws)
		} else if la, c, ok := replaceStart(below.upTo(j-1, lo), lo, hs, ys, ws, span); ok {
			full[m.iLnA(j)], full[m.iC(j)] = la, c
		}
	}
	return full, true
}

// laplace returns the covariance of the normal approximation at mode x:
// the inverse Hessian of −log posterior by central differences (in scaled
// coordinates), or diagonal with fallbackSpread scales when that is not
// positive definite.
func (b *bayesProblem) laplace(x, scale []float64) *mat.SymDense {
	d := len(x)
	z := make([]float64, d)
	for i := range x {
		z[i] = x[i] / scale[i]
	}
	xs := make([]float64, d)
	f := func(z []float64) float64 {
		for i := range z {
			xs[i] = z[i] * scale[i]
		}
		v := -b.logPost(xs)
		if math.IsInf(v, 1) {
			return hessianWall
		}
		return v
	}
	var h mat.SymDense
	fd.Hessian(&h, f, z, &fd.Settings{Formula: fd.Central, Step: hessianStep})
	var ch mat.Cholesky
	if ch.Factorize(&h) {
		var inv mat.SymDense
		if err := ch.InverseTo(&inv); err == nil {
			out := mat.NewSymDense(d, nil)
			ok := true
			for i := 0; i < d; i++ {
				for j := i; j < d; j++ {
					v := inv.At(i, j) * scale[i] * scale[j]
					ok = ok && finite(v)
					out.SetSym(i, j, v)
				}
			}
			if ok {
				return out
			}
		}
	}
	return diagonal(scale, fallbackSpread)
}

// sample runs the chains from the modes and summarises the posterior.
func (b *bayesProblem) sample(modes []mode, scale []float64) *Posterior {
	o := b.opt
	dim := len(modes[0].x)
	lap := b.laplace(modes[0].x, scale)
	cov0 := mat.NewSymDense(dim, nil)
	cov0.ScaleSym(amScale*amScale/float64(dim), lap)
	var lapL mat.TriDense
	var ch mat.Cholesky
	if ch.Factorize(lap) {
		ch.LTo(&lapL)
	}
	specs := make([]chainSpec, o.Chains)
	for c := range specs {
		src := rand.NewPCG(o.Seed, chainStream+uint64(c))
		start := modes[c%len(modes)].x
		if c >= len(modes) {
			start = b.overdispersed(start, &lapL, rand.New(src))
		}
		specs[c] = chainSpec{start: start, cov0: cov0, src: src, pilot: o.Pilot, draws: o.Draws}
	}
	res := runChains(logTarget(b.logPost), specs, scale)
	return b.posterior(res, modes)
}

// chainStream offsets the second seed word of the chains' sources.
const chainStream = 0x5eed

// overdispersed returns a start startSpread Laplace standard deviations
// about x with a finite posterior (x itself after startTries failures).
func (b *bayesProblem) overdispersed(x []float64, l *mat.TriDense, rnd *rand.Rand) []float64 {
	d := len(x)
	if r, _ := l.Dims(); r != d {
		return x
	}
	z := make([]float64, d)
	for t := 0; t < startTries; t++ {
		for i := range z {
			z[i] = rnd.NormFloat64()
		}
		y := make([]float64, d)
		for i := 0; i < d; i++ {
			s := x[i]
			for j := 0; j <= i; j++ {
				s += startSpread * l.At(i, j) * z[j]
			}
			y[i] = s
		}
		if !math.IsInf(b.logPost(y), -1) {
			return y
		}
	}
	return x
}

// exponentBounds returns the exponents each control may take without a
// warning: its kind's range (ExponentRange), and for a control that adds
// (a floodplain, whose width grows from nothing at the bank faster than
// any prismatic shape's) with its prior from the survey, that range
// widened to two prior standard deviations about the exponent of the
// overbanks' own rating.
func (b *bayesProblem) exponentBounds() []ExponentBounds {
	out := make([]ExponentBounds, b.m.k())
	for j := range out {
		lo, hi := ExponentRange(b.m.kinds[j])
		out[j] = ExponentBounds{Low: lo, High: hi}
		if p := b.priors[b.m.iC(j)]; j > 0 && b.m.joints[j] == Add && b.informative[j] && finite(p.mean) && finite(p.sd) {
			out[j].Low = math.Min(lo, p.mean-2*p.sd)
			out[j].High = math.Max(hi, p.mean+2*p.sd)
			out[j].Survey = true
		}
	}
	return out
}
