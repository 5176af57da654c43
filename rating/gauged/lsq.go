package gauged

import (
	"errors"
	"math"
	"slices"
	"sort"
	"strings"
	"time"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"

	"wetline/rating"
)

// Method is how a rating of controls was estimated.
type Method int

// Methods. The zero value is LeastSquares.
const (
	// LeastSquares: weighted least squares in ln Q ("lsq").
	LeastSquares Method = iota
	// Bayesian: posterior of the parameters given priors and gaugings ("bayes").
	Bayesian
)

// String returns "lsq" or "bayes".
func (m Method) String() string {
	if m == Bayesian {
		return "bayes"
	}
	return "lsq"
}

// ErrMethod is returned for an unknown method word.
var ErrMethod = errors.New("method must be lsq or bayes")

// ParseMethod reads "lsq" or "bayes" (any case).
func ParseMethod(s string) (Method, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "lsq":
		return LeastSquares, nil
	case "bayes":
		return Bayesian, nil
	}
	return LeastSquares, errorf("%q: %w", s, ErrMethod)
}

// ControlSpec says what is known of one control before a fit.
type ControlSpec struct {
	// Kind is what physically controls the stage (sets the exponent range
	// and the source of a Bayesian prior).
	Kind ControlKind
	// Joint is how the control joins the one below (ignored for the first).
	Joint Joint
}

// ControlOptions configure a fit of a rating of controls. The zero value
// fits one control of unknown kind with its offset fitted, to every
// gauging.
type ControlOptions struct {
	// Controls describes the controls, lowest first: 1 to MaxControls
	// (default one control of unknown kind).
	Controls []ControlSpec
	// Breaks, when given, are the breakpoints (gauge height, length unit),
	// ascending, one fewer than the controls; nil fits them.
	Breaks []float64
	// OffsetFixed holds the first control's offset at Offset (gauge
	// height, length unit); OffsetSource says where it came from
	// (default "given").
	OffsetFixed  bool
	Offset       float64
	OffsetSource string
	// Units is the unit system of stage and discharge (for messages).
	Units rating.Units
	// Selection chooses the gaugings.
	Selection Selection
}

// ErrControlOptions is returned for controls or breakpoints a fit cannot use.
var ErrControlOptions = errors.New("controls must be 1 to 4, with breakpoints ascending, one fewer than the controls")

// ErrRunawayExponent is returned by a least-squares fit in which a
// control's exponent passes MaxFitExponent: see FitControls.
var ErrRunawayExponent = errors.New("no power law of a control fits its gaugings")

// MaxFitExponent is the largest exponent a least-squares fit gives the
// first control or a replacing one (a project choice; an added control's
// offset is its breakpoint and cannot run off). The closed forms of section and channel
// controls give 3/2 to 8/3 (ExponentRange; Chow 1959), and the widest
// range warned against ends at 3: an exponent above 10, more than three
// times that, is not a control's. Least squares reaches it only as a
// replacing control's offset runs off below its breakpoint, B → −∞ with
// C/(κ − B) held, the limit in which (h − B)^C becomes an exponential in
// stage: its gaugings rise faster from the discharge the control below
// gives at the breakpoint than any power law can. Its search then stops
// only where A = Q(κ)/(κ − B)^C underflows, at an exponent of 100 or
// more set by the arithmetic rather than by the gaugings.
const MaxFitExponent = 10.0

// ErrNoStart is returned when the controls asked for can make no rating
// through the gaugings: a replacing control whose gaugings lie below the
// discharge the control under it gives at its breakpoint, say.
var ErrNoStart = errors.New("no rating of these controls starts from the gaugings")

// specs returns the kinds and joints the options describe.
func (o ControlOptions) specs() ([]ControlKind, []Joint, error) {
	cs := o.Controls
	if len(cs) == 0 {
		n := len(o.Breaks) + 1
		cs = make([]ControlSpec, n)
	}
	if len(cs) > MaxControls || (o.Breaks != nil && len(o.Breaks) != len(cs)-1) {
		return nil, nil, errorf("%w (%d controls and %d breakpoints)", ErrControlOptions, len(cs), len(o.Breaks))
	}
	for i, b := range o.Breaks {
		if !finite(b) || (i > 0 && !(b > o.Breaks[i-1])) {
			return nil, nil, errorf("%w: breakpoints %v", ErrControlOptions, o.Breaks)
		}
	}
	if o.OffsetFixed && !finite(o.Offset) {
		return nil, nil, errorf("%w: offset %g", ErrControlOptions, o.Offset)
	}
	kinds := make([]ControlKind, len(cs))
	joints := make([]Joint, len(cs))
	for i, c := range cs {
		kinds[i], joints[i] = c.Kind, c.Joint
	}
	joints[0] = Replace
	return kinds, joints, nil
}

// FittedControl is a control of a fitted rating with its uncertainty.
type FittedControl struct {
	Control
	// ASE, BSE, CSE and FromSE are the standard errors of A, B, C and From
	// (units of each; least squares: delta method; Bayesian: posterior
	// standard deviations); NaN when held fixed or not available.
	ASE, BSE, CSE, FromSE float64
}

// ControlFit is a rating of controls fitted to gaugings, by least squares
// (FitControls) or by Bayesian inference (FitBayes).
type ControlFit struct {
	// Method is how the rating was estimated.
	Method Method
	// Units is the unit system of stages and discharges.
	Units rating.Units
	// Rating is the estimate: the least-squares solution, or the
	// posterior mode of a Bayesian fit.
	Rating Rating
	// Controls are Rating's controls with their uncertainties.
	Controls []FittedControl
	// OffsetFixed reports a first offset held fixed; OffsetSource says
	// where it came from ("fitted", "given", ...).
	OffsetFixed  bool
	OffsetSource string
	// BreaksFixed reports breakpoints that were given.
	BreaksFixed bool
	// StandardErrorLog is the weighted standard error of estimate s in
	// ln Q, √(Σwᵢrᵢ²/(n − p)) with weights normalised to mean 1, p the
	// rating's fitted parameters (Bayesian: at the posterior mode; NaN
	// when n ≤ p); StandardErrorPercent is 100·sinh(s).
	StandardErrorLog, StandardErrorPercent float64
	// StandardErrorDF is the degrees of freedom n − p of s (≤ 0 when s is
	// not defined). For a Bayesian fit p excludes the remnant error and
	// the PriorOnlyParams: the parameters of controls above every
	// gauging, which no gauging constrains (they rest on their priors, so
	// they take no degree of freedom from the gaugings).
	StandardErrorDF int
	// PriorOnlyParams is the number of free parameters of a Bayesian
	// fit's controls holding no gauging, with none above them holding
	// one, at the posterior mode (their ln A, C and breakpoint); 0 for
	// least squares, where every control holds gaugings.
	PriorOnlyParams int
	// N is the number of gaugings fitted, Params the number of parameters
	// moved by the fit.
	N, Params int
	// LowStage and HighStage are the lowest and highest gauging fitted
	// (gauge height, length unit); MaxDischarge the largest fitted discharge.
	LowStage, HighStage, MaxDischarge float64
	// Residuals holds every gauging's departure from Rating, in input
	// order, those left out marked Excluded with their reason.
	Residuals []Residual
	// Tests are the ISO 1100-2 tests of the relation on the fitted
	// gaugings' departures ln Q − ln Q_rating, in order of stage, each
	// of equal weight (RelationChecks).
	Tests RelationTests
	// Johnson is Johnson's three-point estimate of the first offset, a
	// check on the fitted one.
	Johnson JohnsonEstimate
	// Posterior is the Bayesian posterior (nil for least squares).
	Posterior *Posterior
	// Exponents are the exponents each control may take without a
	// warning: ExponentRange of its kind, or for a Bayesian fit with a
	// prior from the survey that range widened to the section's own.
	Exponents []ExponentBounds
	// NoStandardErrors says why a least-squares fit gives no standard
	// errors of its parameters ("" when it gives them): the delta method's
	// matrix JᵀWJ is singular, or the gaugings lie on the rating exactly.
	NoStandardErrors string
	// Warnings are facts a reviewer should see.
	Warnings []string

	m     *model
	d     *data
	x     []float64     // free parameters at the estimate
	scale []float64     // scale of each free parameter
	cov   *mat.SymDense // covariance of x (least squares)
	tq    float64       // Student quantile of the bands (least squares)
}

// Tolerances and grids of the least-squares fit of controls.
const (
	// JohnsonCheckFraction: Johnson's estimate and the fitted first offset
	// differing by more than this fraction of the first control's gauged
	// depth (highest gauging on it less the offset) is a warning (a
	// project choice).
	JohnsonCheckFraction = 0.25
	// offsetGrid is the number of trial offsets of a profile.
	offsetGrid = 48
	// offsetDecades spans the trial offsets below the lowest stage of a
	// control: 10^−4 to 10^2 stage spans.
	offsetLowDecade, offsetHighDecade = -4.0, 2.0
	// minSpanFraction floors the scale of stages at this fraction of the
	// largest stage magnitude (gaugings bunched at one stage).
	minSpanFraction = 0.01
	// minSpan floors a stage span or depth (length unit) where a
	// logarithm or a division needs it positive.
	minSpan = 1e-6
	// addStartShare is the share of the rating below that an added control
	// starts from at the highest gauging when its gaugings say nothing.
	addStartShare = 0.01
)

// breakCandidates bounds the trial breakpoints per break, by number of controls.
var breakCandidates = [MaxControls + 1]int{0, 0, 24, 16, 12}

// Profile of the fitted breakpoints (see lsqProblem.profile).
const (
	// profileGrid and profileGridMore bound the positions of one
	// breakpoint held at once, for two controls and for more; beyond
	// them the grid is refined around the least profileRefine minima
	// (refineBreak), by levels of about profileLevel positions each, down
	// to every position within profileFinal of the least.
	profileGrid, profileGridMore, profileRefine = 64, 24, 2
	profileLevel, profileFinal                  = 8, 2
	// profileRounds bounds the rounds over the breakpoints of three or
	// four controls one at a time; profilePasses the passes of those
	// rounds, each followed by a search of the breakpoints two at a time
	// over profilePairGrid positions each.
	profileRounds, profilePasses, profilePairGrid = 4, 3, 7
	// profileRelTol is the relative decrease of the sum of squares a
	// trial position must make to be preferred.
	profileRelTol = 1e-12
	// profileLMTol is the relative decrease of the sum of squares below
	// which a step of a held fit counts as no progress (the polish that
	// follows the profile goes on to lmRelTol).
	profileLMTol = 1e-8
	// profileLMIter bounds the iterations of a held fit, profileScreenIter
	// those of one that ranks a trial set of breakpoints.
	profileLMIter, profileScreenIter = 30, 8
)

// lsqProblem is a least-squares fit in progress.
type lsqProblem struct {
	m        *model
	d        *data
	opt      ControlOptions
	scale    []float64
	fitBreak bool
}

// FitControls fits a rating of one to MaxControls controls to gaugings by
// weighted least squares in ln Q,
//
//	minimise Σ wᵢ·(ln Qᵢ − ln Q(hᵢ; θ))²,   wᵢ ∝ 1/σᵢ²,
//
// with Q(h; θ) the rating of NewRating (each control its own offset,
// continuous at the breakpoints) and σᵢ each gauging's LogSigma. Starts:
// for every trial set of breakpoints (the given ones, or midpoints between
// gaugings leaving each control MinPerSegment of them), the first offset
// by a profile over trial offsets (Johnson's estimate among them) and each
// later control by a profile over its own offset under continuity. Fitted
// breakpoints are then sought by a profile of the sum of squares over the
// positions they may take, each control keeping MinPerSegment gaugings:
// a breakpoint is held at positions of a grid of the gauged stages and
// the midpoints between them, the other parameters fitted there, first
// at a coarse spread of positions over its whole range, then about the
// least of those by levels of a fixed number of positions, each narrower
// than the last, down to every stage and midpoint beside the least (the
// sum of squares has kinks at the gauged stages). The one breakpoint of
// two controls is profiled so over its whole range. Those of three or
// four controls start from the trial sets ranked by a short fit with the
// breakpoints held; they are profiled one at a time with the others held,
// in rounds until none moves, each pass followed by a search of two at a
// time on a coarse grid (see lsqProblem.profile). The best of these and
// of the starts are polished by Nelder–Mead and Levenberg–Marquardt with
// every parameter free, and for three or four controls the polished
// breakpoints profiled one at a time and polished again while the sum
// falls. The profile of two controls covers the breakpoint's whole range
// but fits the least coarse positions' surroundings only, and that of
// three or four searches from many starts: neither guarantees the least
// sum over every breakpoint, though each makes a far one unlikely.
// Standard errors by the delta method from s²·(JᵀWJ)⁻¹.
//
// Gaugings left out by opt.Selection, their Exclude text or zero discharge
// are not fitted but get their departures. Errors: ErrControlOptions,
// ErrThinControl (given breakpoints leaving a control fewer than
// MinPerSegment gaugings: it names each such control, its stages and the
// gaugings it holds), ErrGauging, ErrBelowZero (a gauging at or below a
// fixed offset), ErrFewGaugings, ErrNoStart (naming the control that
// cannot start), ErrRunawayExponent (a control whose exponent passes
// MaxFitExponent at the best solution: its offset runs off below, and the
// error names it, its gaugings and where the search stopped).
//
// References:
//
//	ISO 18320:2020. Hydrometry — Measurement of liquid flow in open
//	channels — Determination of the stage–discharge relationship
//	(power-law controls).
//	Kennedy, E. J. (1984). Discharge ratings at gaging stations. USGS
//	TWRI 3-A10.
//	Seber, G. A. F., Wild, C. J. (1989). Nonlinear Regression. Wiley,
//	chapter 5 (standard errors and bands by linearisation; from memory).
//	Lerman, P. M. (1980). Fitting segmented regression models by grid
//	search. Applied Statistics 29(1), 77–84 (join points by a profile
//	of the sum of squares over a grid; from memory).
func FitControls(gs []Gauging, opt ControlOptions) (*ControlFit, error) {
	p, reasons, warn, err := newLSQProblem(gs, opt)
	if err != nil {
		return nil, err
	}
	starts, err := p.starts()
	if err != nil {
		return nil, err
	}
	x, ssr, err := p.solveFrom(starts)
	if err != nil {
		return nil, err
	}
	x, ssr = p.reprofile(x, ssr)
	if j := p.runaway(x); j >= 0 {
		return nil, p.runawayError(j, x)
	}
	f := &ControlFit{Method: LeastSquares, Units: opt.Units, OffsetFixed: opt.OffsetFixed, BreaksFixed: opt.Breaks != nil,
		m: p.m, d: p.d, x: x, scale: p.scale, Warnings: warn}
	f.OffsetSource = "fitted"
	if opt.OffsetFixed {
		f.OffsetSource = opt.OffsetSource
		if f.OffsetSource == "" {
			f.OffsetSource = "given"
		}
	}
	f.finishLSQ(ssr)
	f.finishCommon(gs, opt.Selection, reasons, nil)
	return f, nil
}

// reprofile moves the breakpoints of three or four controls of the
// polished solution x (sum of squares ssr) one at a time again (rounds),
// the polish having moved every parameter at once, and polishes from
// where that ends, up to profilePasses times while the sum falls. It
// returns the better solution.
func (p *lsqProblem) reprofile(x []float64, ssr float64) ([]float64, float64) {
	if !p.fitBreak || p.m.k() < 3 || p.runaway(x) >= 0 {
		return x, ssr
	}
	for pass := 0; pass < profilePasses; pass++ {
		full := p.m.full(x)
		cur, ok := p.holdBreaks(p.m.breaksOf(full), false, full)
		if !ok {
			break
		}
		end, _ := p.rounds(cur)
		if !end.better(cur) {
			break
		}
		y, f, err := p.solveFrom([][]float64{end.full})
		if err != nil || p.runaway(y) >= 0 || !(f < ssr*(1-profileRelTol)) {
			break
		}
		x, ssr = y, f
	}
	return x, ssr
}

// newLSQProblem checks the options and gaugings and lays out the model.
func newLSQProblem(gs []Gauging, opt ControlOptions) (*lsqProblem, []string, []string, error) {
	kinds, joints, err := opt.specs()
	if err != nil {
		return nil, nil, nil, err
	}
	d, reasons, warn, err := selectGaugings(gs, opt.Selection)
	if err != nil {
		return nil, nil, nil, err
	}
	if err := farBelowOthers(gs, d, opt.Units); err != nil {
		return nil, nil, nil, err
	}
	m := newModel(kinds, joints)
	k := m.k()
	for j := 0; j < k; j++ {
		m.free = append(m.free, m.iLnA(j), m.iC(j))
	}
	if opt.OffsetFixed {
		m.base[m.iB()] = opt.Offset
		if err := aboveOffset(gs, d, opt); err != nil {
			return nil, nil, nil, err
		}
	} else {
		m.free = append(m.free, m.iB())
	}
	if opt.Breaks != nil {
		for j, b := range opt.Breaks {
			m.base[m.iBreak(j+1)] = b
		}
	} else {
		for j := 1; j < k; j++ {
			m.free = append(m.free, m.iBreak(j))
		}
	}
	sort.Ints(m.free)
	n, np := d.n(), len(m.free)
	if n < np+1 || n < k*MinPerSegment {
		return nil, nil, nil, errorf("%w: %s used for %s and %s of at least %s each",
			ErrFewGaugings, rating.Counted(n, "gauging", "gaugings"), rating.Counted(np, "parameter", "parameters"), rating.Counted(k, "control", "controls"),
			rating.Counted(MinPerSegment, "gauging", "gaugings"))
	}
	if !(d.hi > d.lo) {
		return nil, nil, nil, errorf("%w: all gaugings are at stage %g", ErrFewGaugings, d.lo)
	}
	p := &lsqProblem{m: m, d: d, opt: opt, fitBreak: opt.Breaks == nil && k > 1}
	if opt.Breaks != nil {
		if thin := thinControls(d, opt.Breaks, k, nil); thin != nil {
			return nil, nil, nil, thinControlError(d, opt.Breaks, thin, opt.Units, nil,
				sayf("least squares needs %d on every control: place the breakpoints so that each control holds %d, or fit fewer controls", MinPerSegment, MinPerSegment))
		}
	}
	p.scale = scales(m, d)
	return p, reasons, warn, nil
}

// BelowZeroError reports gaugings used by a fit at or below a first
// offset held fixed (ControlOptions.OffsetFixed): a rating
// Q = A·(h − e)^C has no discharge there. It wraps ErrBelowZero.
type BelowZeroError struct {
	// ZeroFlow is the offset held fixed, the gauge height of zero flow
	// (length unit of Units), and Source says where it came from.
	ZeroFlow float64
	Source   string
	// Count is how many of the Used gaugings lie at or below it.
	Count, Used int
	// Lowest names the lowest of them (its source, else its stage) and
	// Stage is its gauge height (length unit).
	Lowest string
	Stage  float64
	// Units label the values.
	Units rating.Units
}

func (e *BelowZeroError) Error() string {
	L := e.Units.Length()
	return sayf("%d of the %s used %s at or below the gauge height of zero flow %s %s (%s), the lowest %s at %s %s: "+
		"a rating has no discharge there (%v)", e.Count, rating.Counted(e.Used, "gauging", "gaugings"), rating.Agree(e.Count, "lies", "lie"), gh(e.ZeroFlow), L, e.Source, e.Lowest, gh(e.Stage), L, ErrBelowZero)
}

func (e *BelowZeroError) Unwrap() error { return ErrBelowZero }

// aboveOffset returns a *BelowZeroError naming the lowest of the used
// gaugings at or below a fixed offset, or nil when none is.
func aboveOffset(gs []Gauging, d *data, opt ControlOptions) error {
	e := &BelowZeroError{ZeroFlow: opt.Offset, Source: opt.OffsetSource, Used: d.n(), Units: opt.Units}
	if e.Source == "" {
		e.Source = "given"
	}
	for i, h := range d.h {
		if !(h > opt.Offset) {
			if e.Count == 0 {
				e.Lowest, e.Stage = gs[d.index[i]].label(), h
			}
			e.Count++
		}
	}
	if e.Count == 0 {
		return nil
	}
	return e
}

// scales returns the scale of each free parameter: 1 for ln A and C, the
// gauged stage span (at least 1 % of the largest stage magnitude) for
// offsets and breakpoints.
func scales(m *model, d *data) []float64 {
	span := math.Max(d.hi-d.lo, minSpanFraction*math.Max(math.Abs(d.hi), math.Abs(d.lo)))
	if !(span > 0) {
		span = 1
	}
	s := make([]float64, len(m.free))
	for j, i := range m.free {
		s[j] = 1
		if m.isStage(i) {
			s[j] = span
		}
	}
	return s
}

// segmentsHold reports that breakpoints leave every control MinPerSegment
// gaugings.
func (p *lsqProblem) segmentsHold(breaks []float64) bool {
	lo := math.Inf(-1)
	for _, b := range breaks {
		if p.d.countIn(lo, b) < MinPerSegment {
			return false
		}
		lo = b
	}
	return p.d.countIn(lo, math.Inf(1)) >= MinPerSegment
}

// residuals returns √wᵢ·(ln Qᵢ − ln Q(hᵢ)) at free parameters x, nil
// where x makes no admissible rating.
func (p *lsqProblem) residuals(x []float64) []float64 {
	full := p.m.full(x)
	if p.fitBreak {
		br := make([]float64, p.m.k()-1)
		for j := range br {
			br[j] = full[p.m.iBreak(j+1)]
		}
		if !sort.Float64sAreSorted(br) || !p.segmentsHold(br) {
			return nil
		}
	}
	r, ok := p.m.rating(full)
	if !ok {
		return nil
	}
	return p.d.departures(r)
}

// departures returns √wᵢ·(ln Qᵢ − ln Q(hᵢ)) of rating r, as logQ gives
// ln Q, nil where a gauging gets no finite ln Q. The stages being sorted,
// each control's gaugings are a run of them: a control that replaces the
// one below gives ln A + C·ln(h − B) with ln A taken once for the run.
func (d *data) departures(r Rating) []float64 {
	out := make([]float64, d.n())
	cs := r.Controls
	lo := 0
	for j, c := range cs {
		hi := len(d.h)
		if j+1 < len(cs) {
			hi = lo + sort.SearchFloat64s(d.h[lo:], cs[j+1].From)
		}
		lnA := math.Log(c.A)
		for i := lo; i < hi; i++ {
			h := d.h[i]
			var lq float64
			if j == 0 || c.Joint == Replace {
				lq = lnA + c.C*math.Log(h-c.B)
			} else {
				lq = logQ(r, h)
			}
			if math.IsInf(lq, 0) || math.IsNaN(lq) {
				return nil
			}
			out[i] = math.Sqrt(d.w[i]) * (d.y[i] - lq)
		}
		lo = hi
	}
	return out
}

// solveFrom finds the least-squares parameters from starts (full vectors,
// at least one): the best result whose exponents are all at most
// MaxFitExponent, else the best of all.
func (p *lsqProblem) solveFrom(starts [][]float64) ([]float64, float64, error) {
	obj := func(x []float64) float64 { return sumSq(p.residuals(x)) }
	var best []float64
	bestF, bestRun := math.Inf(1), true
	for _, full := range starts {
		x := p.m.freeOf(full)
		x, _ = nelderMead(obj, x, p.scale)
		x, _ = levenberg(p.residuals, x, p.scale)
		x, _ = nelderMead(obj, x, p.scale)
		x, f := levenberg(p.residuals, x, p.scale)
		run := p.runaway(x) >= 0
		if (bestRun && !run) || (run == bestRun && f < bestF) {
			best, bestF, bestRun = x, f, run
		}
	}
	if best == nil || math.IsInf(bestF, 1) {
		return nil, 0, errorf("%w: the gaugings do not determine the controls", ErrFewGaugings)
	}
	return best, bestF, nil
}

// runaway returns the index of the first control whose exponent at free
// parameters x is above MaxFitExponent, or −1. Added controls, whose
// offset is their breakpoint and cannot run off, are passed over.
func (p *lsqProblem) runaway(x []float64) int {
	full := p.m.full(x)
	for j := 0; j < p.m.k(); j++ {
		if (j == 0 || p.m.joints[j] == Replace) && full[p.m.iC(j)] > MaxFitExponent {
			return j
		}
	}
	return -1
}

// runawayError is FitControls's error for control j (from 0) of rating r
// whose exponent ran past MaxFitExponent: it names the control, its
// stages and gaugings, the exponent and offset the search reached, how
// far the offset lies below the control's lowest gauging, and the
// discharge it takes over from, and wraps ErrRunawayExponent.
func (p *lsqProblem) runawayError(j int, x []float64) error {
	r, _ := p.m.rating(p.m.full(x))
	c := r.Controls[j]
	lo, hi := math.Inf(-1), math.Inf(1)
	if j > 0 {
		lo = c.From
	}
	if j+1 < len(r.Controls) {
		hi = r.Controls[j+1].From
	}
	hs, _, _ := p.d.slice(lo, hi)
	L, Q := p.opt.Units.Length(), p.opt.Units.Discharge()
	held := ""
	if len(hs) > 0 {
		held = sayf(", %s from %s to %s %s", rating.Counted(len(hs), "gauging", "gaugings"), gh(hs[0]), gh(hs[len(hs)-1]), L)
	}
	endless := ""
	if math.Log(c.A) < runawayLogA {
		endless = " (the exponent rises without end: the search stops only where A = Q/(h − B)^C underflows)"
	}
	what := sayf("control %d%s", j+1, held)
	rises := "its gaugings rise"
	if j > 0 {
		what = sayf("control %d (from %s %s%s)", j+1, gh(c.From), L, held)
		rises = sayf("from the %s %s that control %d gives at %s %s, its gaugings rise", rating.PlainFigures(r.upTo(j-1, c.From), 4), Q, j, gh(c.From), L)
	}
	below := ""
	switch {
	case len(hs) > 0:
		below = sayf(", %s %s below its lowest gauging", rating.PlainFigures(hs[0]-c.B, 3), L)
	case j > 0:
		below = sayf(", %s %s below where it starts", rating.PlainFigures(c.From-c.B, 3), L)
	}
	return errorf("%w: %s: its least-squares exponent is %s, above %s, more than any control's, with its offset at %s %s%s%s; "+
		"%s nearly as an exponential in stage, not as a control's power law (h − B)^C: move the breakpoint, fit fewer controls, or fit by --method bayes, whose prior holds the exponent",
		ErrRunawayExponent, what, rating.PlainFigures(c.C, 3), rating.PlainFigures(MaxFitExponent, 3), rating.PlainFigures(c.B, 4), L,
		below, endless, rises)
}

// runawayLogA is the ln A below which a control's coefficient is taken to
// be near the end of the numbers (the smallest normal float is e^−708).
const runawayLogA = -600

// lsqStart is a start of the search and its sum of squares.
type lsqStart struct {
	full []float64
	ssr  float64
}

// starts returns the full vectors of the best starts, best first. With
// none, the error wraps ErrNoStart and says why: for given breakpoints,
// the control that cannot start.
func (p *lsqProblem) starts() ([][]float64, error) {
	keep := 1
	screen := p.fitBreak && p.m.k() > 2
	switch {
	case screen:
		keep = math.MaxInt
	case p.fitBreak:
		keep = multiStart
	}
	var top []lsqStart
	var why error
	sets := p.breakSets()
	for _, br := range sets {
		full, err := p.sequential(br)
		if err != nil {
			why = err
			continue
		}
		ssr := sumSq(p.residuals(p.m.freeOf(full)))
		if math.IsInf(ssr, 1) {
			why = errorf("%w: the first guess leaves a gauging without discharge (check the offsets and breakpoints)", ErrNoStart)
			continue
		}
		top = append(top, lsqStart{full, ssr})
		sort.SliceStable(top, func(a, b int) bool { return top[a].ssr < top[b].ssr })
		if len(top) > keep {
			top = top[:keep]
		}
	}
	switch {
	case len(top) > 0:
	case p.fitBreak:
		return nil, errorf("%w: none of %d trial sets of breakpoints gives a rating rising through the gaugings of every control: try fewer controls or give --breaks", ErrNoStart, len(sets))
	case why != nil:
		return nil, why
	default:
		return nil, errorf("%w: check the breakpoints and the spread of stages", ErrNoStart)
	}
	if screen {
		top = p.screen(top)
	}
	if p.fitBreak {
		return p.profile(top), nil
	}
	out := make([][]float64, len(top))
	for i, s := range top {
		out[i] = s.full
	}
	return out, nil
}

// screen ranks the starts of every trial set of breakpoints of three or
// four controls by a short held fit at each (profileScreenIter steps of
// Levenberg–Marquardt with the breakpoints held), which sets them apart
// far better than the sequential starts do. It returns the best
// multiStart of them, each moved to its held fit, best first, then the
// best multiStart by the sum of squares of their sequential starts
// (top's order).
func (p *lsqProblem) screen(top []lsqStart) []lsqStart {
	var out []lsqStart
	for _, s := range top {
		h, ok := p.holdBreaksIter(p.m.breaksOf(s.full), false, profileScreenIter, s.full)
		if ok && !h.run {
			out = append(out, lsqStart{h.full, h.ssr})
		}
	}
	sort.SliceStable(out, func(a, b int) bool { return out[a].ssr < out[b].ssr })
	return append(out[:min(len(out), multiStart)], top[:min(len(top), multiStart)]...)
}

// heldFit is a fit with the breakpoints held: its full vector, its sum of
// squares, and whether an exponent ran past MaxFitExponent.
type heldFit struct {
	full []float64
	ssr  float64
	run  bool
}

// better reports a fit preferred to o: one whose exponents stay within
// MaxFitExponent over one whose do not, else the smaller sum of squares
// by more than profileRelTol.
func (a heldFit) better(o heldFit) bool {
	if a.run != o.run {
		return !a.run
	}
	return a.ssr < o.ssr*(1-profileRelTol)
}

// breaksOf returns the breakpoints of a full vector.
func (m *model) breaksOf(full []float64) []float64 {
	br := make([]float64, m.k()-1)
	for j := range br {
		br[j] = full[m.iBreak(j+1)]
	}
	return br
}

// holdBreaks fits the controls with the breakpoints held at br, by
// Levenberg–Marquardt from each of from (full vectors, moved to br) and,
// when fresh, from sequential's start for br; ok is false when none gives
// a rating through every gauging. The fit is the profile's: its search
// ends at profileLMTol or after profileLMIter steps.
func (p *lsqProblem) holdBreaks(br []float64, fresh bool, from ...[]float64) (heldFit, bool) {
	return p.holdBreaksIter(br, fresh, profileLMIter, from...)
}

// holdBreaksIter is holdBreaks ending each search after at most maxIter
// steps.
func (p *lsqProblem) holdBreaksIter(br []float64, fresh bool, maxIter int, from ...[]float64) (heldFit, bool) {
	m := p.m
	hm := &model{kinds: m.kinds, joints: m.joints, base: append([]float64(nil), m.base...)}
	for j, b := range br {
		hm.base[m.iBreak(j+1)] = b
	}
	for _, i := range m.free {
		if !(i > m.iB() && i < m.iRemnant()) {
			hm.free = append(hm.free, i)
		}
	}
	hp := &lsqProblem{m: hm, d: p.d, opt: p.opt, scale: scales(hm, p.d)}
	starts := from
	if fresh {
		if s, err := p.sequential(br); err == nil {
			starts = append([][]float64{s}, from...)
		}
	}
	best, ok := heldFit{ssr: math.Inf(1), run: true}, false
	for _, s := range starts {
		x, f := levenbergTol(hp.residuals, hm.freeOf(s), hp.scale, profileLMTol, maxIter)
		if math.IsInf(f, 1) {
			continue
		}
		full := hm.full(x)
		h := heldFit{full: full, ssr: f, run: p.runaway(m.freeOf(full)) >= 0}
		if !ok || h.better(best) {
			best, ok = h, true
		}
	}
	return best, ok
}

// breakGrid returns the trial positions of breakpoint j (from 0) with the
// others at br, ascending: every gauged stage and every midpoint between
// neighbouring stages at which each of the two controls it divides keeps
// MinPerSegment gaugings. Between two neighbouring positions the
// gaugings each control holds do not change, so the sum of squares is
// smooth there in every parameter.
func (p *lsqProblem) breakGrid(br []float64, j int) []float64 {
	h := p.d.h
	lo, hi := math.Inf(-1), math.Inf(1)
	if j > 0 {
		lo = br[j-1]
	}
	if j+1 < len(br) {
		hi = br[j+1]
	}
	a := sort.SearchFloat64s(h, lo) + MinPerSegment - 1
	b := sort.SearchFloat64s(h, hi) - MinPerSegment
	var grid []float64
	for i := a; i < b; i++ {
		if h[i+1] > h[i] {
			grid = append(grid, 0.5*(h[i]+h[i+1]), h[i+1])
		}
	}
	return grid
}

// scanned is a held fit at position i of a breakpoint's grid.
type scanned struct {
	heldFit
	i int
}

// scanBreak profiles breakpoint j (from 0) of cur over its grid
// (breakGrid) with the other breakpoints held. It fits at every position
// when the grid has at most coarse of them, else at coarse positions
// spread evenly over it (the last among them), then refines about the
// profileRefine least local minima of those (refineBreak). A held fit at
// a coarse position starts from sequential's start and from the fit at
// the coarse position before (cur at the first); one of a refinement
// from the fit nearest it on the minimum's side. It returns the local
// minima of the held fits, best first.
func (p *lsqProblem) scanBreak(cur heldFit, j, coarse int) []heldFit {
	br := p.m.breaksOf(cur.full)
	grid := p.breakGrid(br, j)
	done := make(map[int]scanned, len(grid))
	run := func(idx []int, fresh bool, from []float64) {
		prev := from
		for _, i := range idx {
			if _, ok := done[i]; ok {
				continue
			}
			br[j] = grid[i]
			h, ok := p.holdBreaks(br, fresh, prev)
			if !ok {
				prev = from
				continue
			}
			done[i], prev = scanned{h, i}, h.full
		}
	}
	step := 1
	if len(grid) > coarse {
		step = (len(grid) + coarse - 2) / (coarse - 1)
	}
	var idx []int
	for i := 0; i < len(grid); i += step {
		idx = append(idx, i)
	}
	if n := len(grid) - 1; n >= 0 && idx[len(idx)-1] != n {
		idx = append(idx, n)
	}
	run(idx, true, cur.full)
	if step > 1 {
		minima := localMinima(done)
		if len(minima) > profileRefine {
			minima = minima[:profileRefine]
		}
		for _, m := range minima {
			refineBreak(done, len(grid), m.i, step, run)
		}
	}
	minima := localMinima(done)
	out := make([]heldFit, len(minima))
	for i, m := range minima {
		out[i] = m.heldFit
	}
	return out
}

// refineBreak narrows a profile about the held fit at position c of a
// grid of n positions, a local minimum of fits step positions apart, by
// levels: each fits about profileLevel positions evenly over the bracket
// out to the fitted positions beside the least fit so far in it
// (c ± step at the first level), then takes the least of them as the
// centre of a bracket profileLevel/2 times narrower, so that
// ⌈log(step)/log(profileLevel/2)⌉ levels bring the spacing to one
// position. The last level fits every position within profileFinal of
// the centre (gauged stages and the midpoints between them, where the
// sum of squares has its kinks and the smooth stretches between them),
// and goes on one position at a time while the least fit lies at the edge
// of those fitted, so that it ends at a least fit with both its neighbours
// on the grid fitted. run fits positions in order, each from the fit
// before it (the second argument false: no fresh start) or from the
// third argument; done holds the fits.
func refineBreak(done map[int]scanned, n, c, step int, run func([]int, bool, []float64)) {
	least := func(lo, hi int) int {
		best := -1
		for i := max(lo, 0); i <= min(hi, n-1); i++ {
			if h, ok := done[i]; ok && (best < 0 || h.better(done[best].heldFit)) {
				best = i
			}
		}
		return best
	}
	// out fits the positions of lo..hi spaced by sp outward from c, each
	// side from the fit at c.
	out := func(c, lo, hi, sp int) {
		from := done[c].full
		var down, up []int
		for i := c - sp; i >= max(lo, 0); i -= sp {
			down = append(down, i)
		}
		for i := c + sp; i <= min(hi, n-1); i += sp {
			up = append(up, i)
		}
		run(down, false, from)
		run(up, false, from)
	}
	half := step
	for half > profileFinal {
		sp := max(1, (2*half)/profileLevel)
		out(c, c-half, c+half, sp)
		if b := least(c-half, c+half); b >= 0 {
			c = b
		}
		half = sp
	}
	lo, hi := c-profileFinal, c+profileFinal
	out(c, lo, hi, 1)
	for k := 0; k < n; k++ {
		b := least(lo, hi)
		if b < 0 {
			return
		}
		switch {
		case b == lo && lo > 0:
			lo--
			run([]int{lo}, false, done[b].full)
		case b == hi && hi < n-1:
			hi++
			run([]int{hi}, false, done[b].full)
		default:
			return
		}
		c = b
	}
}

// profile searches the fitted breakpoints from the starts top (best
// first: for three or four controls, screen's) by a profile of the sum of
// squares: a breakpoint moved over its grid with the other breakpoints
// held and the rest of the parameters fitted at each position tried
// (scanBreak: profileGrid or profileGridMore coarse positions, then
// levels about the least, refineBreak), to where the sum is least. The
// one breakpoint of two controls is profiled once, over its whole range;
// those of three or four controls one after another from the best of the
// starts after a held fit, in rounds until every breakpoint has been
// scanned without a move (rounds), then two at a time on a coarse grid
// (scanPair), the passes repeating from the best so far while a pair
// moves (at most profilePasses). It returns the full vectors to polish:
// up to multiStart of the least local minima of the profile, with
// distinct breakpoints, then the starts top themselves, so that the
// polish also goes from every point it went from without the profile.
func (p *lsqProblem) profile(top []lsqStart) [][]float64 {
	k := p.m.k()
	var ends []heldFit
	if k == 2 {
		ends = p.scanBreak(heldFit{full: top[0].full, ssr: top[0].ssr}, 0, profileGrid)
	} else {
		var cur heldFit
		ok := false
		for _, s := range top {
			if h, held := p.holdBreaks(p.m.breaksOf(s.full), false, s.full); held && (!ok || h.better(cur)) {
				cur, ok = h, true
			}
		}
		for pass := 0; ok && pass < profilePasses; pass++ {
			var more []heldFit
			cur, more = p.rounds(cur)
			ends = append(ends, more...)
			moved := false
			for j1 := 0; j1 < k-1; j1++ {
				for j2 := j1 + 1; j2 < k-1; j2++ {
					m := p.scanPair(cur, j1, j2)
					if len(m) > 0 && m[0].better(cur) {
						cur, moved = m[0], true
					}
					ends = append(ends, m...)
				}
			}
			if !moved {
				break
			}
		}
		if ok {
			ends = append(ends, cur)
		}
		sort.SliceStable(ends, func(a, b int) bool { return ends[a].better(ends[b]) })
	}
	out := make([][]float64, 0, multiStart+len(top))
	for _, e := range ends {
		if len(out) == multiStart {
			break
		}
		if !slices.ContainsFunc(out, func(o []float64) bool { return slices.Equal(p.m.breaksOf(o), p.m.breaksOf(e.full)) }) {
			out = append(out, e.full)
		}
	}
	for _, s := range top {
		out = append(out, s.full)
	}
	return out
}

// rounds moves the breakpoints of cur one at a time over their grids
// (scanBreak, profileGridMore positions at a time) to the least sum of
// squares, the others held, until k − 1 scans in a row move none (at most
// profileRounds rounds over them). It returns the best held fit and the
// local minima of the scans.
func (p *lsqProblem) rounds(cur heldFit) (heldFit, []heldFit) {
	nb := p.m.k() - 1
	var ends []heldFit
	still := 0
	for s := 0; s < profileRounds*nb && still < nb; s++ {
		m := p.scanBreak(cur, s%nb, profileGridMore)
		still++
		if len(m) > 0 && m[0].better(cur) {
			cur, still = m[0], 1
		}
		ends = append(ends, m...)
	}
	return cur, ends
}

// scanPair profiles breakpoints j1 < j2 (from 0) of cur together, the
// others held: each at profilePairGrid positions spread evenly over the
// gauged stages and midpoints it may take (breakGrid with the other
// breakpoints where cur has them), every pair of positions that leaves
// each control MinPerSegment gaugings fitted from sequential's start and
// from cur. Moving two breakpoints at once finds what moving one at a time
// cannot where the sum of squares falls only as both move. It returns
// the held fits, best first, at most profileRefine of them.
func (p *lsqProblem) scanPair(cur heldFit, j1, j2 int) []heldFit {
	br := p.m.breaksOf(cur.full)
	lo := append([]float64(nil), br...)
	if j2 == j1+1 {
		// j1 may go up to where j2 may reach, j2 down to where j1 may.
		lo[j2] = math.Inf(1)
	}
	g1 := spread(p.breakGrid(lo, j1), profilePairGrid)
	hi := append([]float64(nil), br...)
	if j2 == j1+1 {
		hi[j1] = math.Inf(-1)
		if j1 > 0 {
			hi[j1] = br[j1-1]
		}
	}
	g2 := spread(p.breakGrid(hi, j2), profilePairGrid)
	var out []heldFit
	try := append([]float64(nil), br...)
	for _, a := range g1 {
		for _, b := range g2 {
			if !(b > a) {
				continue
			}
			try[j1], try[j2] = a, b
			if !p.segmentsHold(try) {
				continue
			}
			if h, ok := p.holdBreaks(try, true, cur.full); ok {
				out = append(out, h)
			}
		}
	}
	sort.SliceStable(out, func(a, b int) bool { return out[a].better(out[b]) })
	if len(out) > profileRefine {
		out = out[:profileRefine]
	}
	return out
}

// spread returns n positions of grid spread evenly over it, its first and
// last among them (all of it when it has at most n).
func spread(grid []float64, n int) []float64 {
	if len(grid) <= n {
		return grid
	}
	out := make([]float64, n)
	for i := range out {
		out[i] = grid[i*(len(grid)-1)/(n-1)]
	}
	return out
}

// localMinima returns the held fits of a scan whose sum of squares is no
// larger than that of the fits at the positions beside them on the grid
// (the nearest fitted on each side), best first, ties by position.
func localMinima(done map[int]scanned) []scanned {
	idx := make([]int, 0, len(done))
	for i := range done {
		idx = append(idx, i)
	}
	sort.Ints(idx)
	var out []scanned
	for n, i := range idx {
		h := done[i]
		if (n == 0 || !done[idx[n-1]].better(h.heldFit)) && (n+1 == len(idx) || !done[idx[n+1]].better(h.heldFit)) {
			out = append(out, h)
		}
	}
	sort.SliceStable(out, func(a, b int) bool { return out[a].better(out[b].heldFit) })
	return out
}

// breakSets returns the trial sets of breakpoints: the given ones, or
// combinations of midpoints between gaugings.
func (p *lsqProblem) breakSets() [][]float64 {
	k := p.m.k()
	if k == 1 {
		return [][]float64{nil}
	}
	if !p.fitBreak {
		return [][]float64{p.opt.Breaks}
	}
	h := p.d.h
	var mids []float64
	for i := MinPerSegment - 1; i < len(h)-MinPerSegment; i++ {
		if h[i+1] > h[i] {
			mids = append(mids, 0.5*(h[i]+h[i+1]))
		}
	}
	var cands []float64
	step := math.Max(1, float64(len(mids))/float64(breakCandidates[k]))
	for x := 0.0; int(x) < len(mids); x += step {
		cands = append(cands, mids[int(x)])
	}
	var sets [][]float64
	var walk func(from int, cur []float64)
	walk = func(from int, cur []float64) {
		if len(cur) == k-1 {
			if p.segmentsHold(cur) {
				sets = append(sets, append([]float64(nil), cur...))
			}
			return
		}
		for i := from; i < len(cands); i++ {
			walk(i+1, append(cur, cands[i]))
		}
	}
	walk(0, nil)
	return sets
}

// trialOffsets returns trial offsets below stage lo: lo − span·10^u for u
// evenly from offsetLowDecade to offsetHighDecade, with extra ones.
func trialOffsets(lo, span float64, extra ...float64) []float64 {
	out := make([]float64, 0, offsetGrid+len(extra))
	for i := 0; i < offsetGrid; i++ {
		u := offsetLowDecade + (offsetHighDecade-offsetLowDecade)*float64(i)/float64(offsetGrid-1)
		out = append(out, lo-span*math.Pow(10, u))
	}
	for _, e := range extra {
		if e < lo && finite(e) {
			out = append(out, e)
		}
	}
	return out
}

// sequential builds a start for breakpoints br: the first control by a
// profile over its offset on its own gaugings, then each later control on
// its gaugings given the ones below. The error wraps ErrNoStart and names
// the control that has too few gaugings or cannot rise through them.
func (p *lsqProblem) sequential(br []float64) ([]float64, error) {
	m, d := p.m, p.d
	k := m.k()
	full := append([]float64(nil), m.base...)
	for j, b := range br {
		full[m.iBreak(j+1)] = b
	}
	edge := func(j int) (float64, float64) {
		lo, hi := math.Inf(-1), math.Inf(1)
		if j > 0 {
			lo = br[j-1]
		}
		if j < k-1 {
			hi = br[j]
		}
		return lo, hi
	}
	span := math.Max(d.hi-d.lo, minSpan)
	lo0, hi0 := edge(0)
	h0, y0, w0 := d.slice(lo0, hi0)
	if len(h0) < 2 {
		return nil, p.thinStart(0, len(h0), br)
	}
	var offs []float64
	if p.opt.OffsetFixed {
		offs = []float64{p.opt.Offset}
	} else {
		je := johnsonFromData(d, hi0)
		offs = trialOffsets(h0[0], span, je.ZeroFlow)
	}
	best := math.Inf(1)
	for _, b := range offs {
		lnA, c, ssr, ok := powerFit(h0, y0, w0, b)
		if ok && ssr < best {
			best = ssr
			full[m.iLnA(0)], full[m.iC(0)], full[m.iB()] = lnA, c, b
		}
	}
	if math.IsInf(best, 1) {
		return nil, errorf("%w: control 1 (gauge heights %g to %g) has no power law rising through its gaugings", ErrNoStart, h0[0], h0[len(h0)-1])
	}
	for j := 1; j < k; j++ {
		lo, hi := edge(j)
		hs, ys, ws := d.slice(lo, hi)
		if len(hs) < 2 {
			return nil, p.thinStart(j, len(hs), br)
		}
		below, ok := p.m.ratingUpTo(full, j-1)
		if !ok {
			return nil, errorf("%w: controls 1 to %d make no rating below breakpoint %g", ErrNoStart, j, br[j-1])
		}
		var lnA, c float64
		if m.joints[j] == Add {
			lnA, c = addStart(below, j-1, br[j-1], hs, ys, ws)
		} else {
			q0 := below.upTo(j-1, br[j-1])
			lnA, c, ok = replaceStart(q0, br[j-1], hs, ys, ws, span)
			if !ok {
				qlo, qhi := math.Inf(1), math.Inf(-1)
				for _, y := range ys {
					qlo, qhi = math.Min(qlo, math.Exp(y)), math.Max(qhi, math.Exp(y))
				}
				return nil, errorf("%w: control %d takes over at gauge height %g from the discharge %.4g that control %d gives there, but its %s (%g to %g, discharge %.4g to %.4g) %s not rise from it: try another breakpoint or fewer controls",
					ErrNoStart, j+1, br[j-1], q0, j, rating.Counted(len(hs), "gauging", "gaugings"), hs[0], hs[len(hs)-1], qlo, qhi, rating.Agree(len(hs), "does", "do"))
			}
		}
		full[m.iLnA(j)], full[m.iC(j)] = lnA, c
		if _, ok := p.m.ratingUpTo(full, j); !ok {
			return nil, errorf("%w: control %d, from gauge height %g, makes no rating joined to control %d there (coefficient %.3g, exponent %.3g) through its %s (%g to %g): try another breakpoint or fewer controls",
				ErrNoStart, j+1, br[j-1], j, math.Exp(lnA), c, rating.Counted(len(hs), "gauging", "gaugings"), hs[0], hs[len(hs)-1])
		}
	}
	return full, nil
}

// thinStart is sequential's error for control j (from 0) holding only n
// gaugings between breakpoints br.
func (p *lsqProblem) thinStart(j, n int, br []float64) error {
	return errorf("%w: control %d holds %s, too few to start from (breakpoints %v)", ErrNoStart, j+1, rating.Counted(n, "gauging", "gaugings"), br)
}

// slice returns the stages, ln Q and weights of the gaugings with
// lo ≤ h < hi.
func (d *data) slice(lo, hi float64) (h, y, w []float64) {
	a, b := sort.SearchFloat64s(d.h, lo), sort.SearchFloat64s(d.h, hi)
	return d.h[a:b], d.y[a:b], d.w[a:b]
}

// ratingUpTo builds the rating of controls 0..j of a full vector.
func (m *model) ratingUpTo(full []float64, j int) (Rating, bool) {
	sub := &model{kinds: m.kinds[:j+1], joints: m.joints[:j+1]}
	p := make([]float64, sub.fullLen())
	for i := 0; i <= j; i++ {
		p[sub.iLnA(i)], p[sub.iC(i)] = full[m.iLnA(i)], full[m.iC(i)]
		if i > 0 {
			p[sub.iBreak(i)] = full[m.iBreak(i)]
		}
	}
	p[sub.iB()] = full[m.iB()]
	return sub.rating(p)
}

// powerFit fits ln Q = ln A + C·ln(h − b) by weighted least squares with b
// given; ok is false when b is not below every stage or the line is
// undetermined.
func powerFit(h, y, w []float64, b float64) (lnA, c, ssr float64, ok bool) {
	var sw, sx, sy float64
	x := make([]float64, len(h))
	for i := range h {
		if !(h[i] > b) {
			return 0, 0, 0, false
		}
		x[i] = math.Log(h[i] - b)
		sw += w[i]
		sx += w[i] * x[i]
		sy += w[i] * y[i]
	}
	xm, ym := sx/sw, sy/sw
	var sxx, sxy float64
	for i := range x {
		sxx += w[i] * (x[i] - xm) * (x[i] - xm)
		sxy += w[i] * (x[i] - xm) * (y[i] - ym)
	}
	if !(sxx > 0) {
		return 0, 0, 0, false
	}
	c = sxy / sxx
	lnA = ym - c*xm
	for i := range x {
		r := y[i] - lnA - c*x[i]
		ssr += w[i] * r * r
	}
	return lnA, c, ssr, c > 0
}

// replaceStart fits a replacing control through q0 at breakpoint kappa to
// gaugings above it: ln Q = ln q0 + C·ln((h − b)/(κ − b)), C by weighted
// least squares through the origin and b by a profile below κ, over the
// trial offsets whose C is at most MaxFitExponent.
func replaceStart(q0, kappa float64, h, y, w []float64, span float64) (lnA, c float64, ok bool) {
	best := math.Inf(1)
	l0 := math.Log(q0)
	for _, b := range trialOffsets(kappa, span) {
		var sxx, sxy float64
		xk := math.Log(kappa - b)
		for i := range h {
			x := math.Log(h[i]-b) - xk
			sxx += w[i] * x * x
			sxy += w[i] * x * (y[i] - l0)
		}
		if !(sxx > 0) {
			continue
		}
		cc := sxy / sxx
		if !(cc > 0) || cc > MaxFitExponent {
			continue
		}
		var ssr float64
		for i := range h {
			r := y[i] - l0 - cc*(math.Log(h[i]-b)-xk)
			ssr += w[i] * r * r
		}
		if ssr < best {
			best, c, lnA = ssr, cc, l0-cc*xk
		}
	}
	return lnA, c, !math.IsInf(best, 1)
}

// addStartExponent is the exponent an added control starts from when its
// gaugings say nothing (a wide channel, 5/3).
const addStartExponent = 5.0 / 3

// addStart fits an added control to what the gaugings above its
// breakpoint carry beyond the rating below: ln(Q − Q_below) = ln A +
// C·ln(h − κ) on the gaugings where that excess is positive; with fewer
// than two, C = 5/3 and A giving addStartShare of the rating below at the
// highest of them.
func addStart(below Rating, j int, kappa float64, h, y, w []float64) (lnA, c float64) {
	var hs, ys, ws []float64
	for i := range h {
		if ex := math.Exp(y[i]) - below.upTo(j, h[i]); ex > 0 && h[i] > kappa {
			hs, ys, ws = append(hs, h[i]), append(ys, math.Log(ex)), append(ws, w[i])
		}
	}
	if len(hs) >= 2 {
		if lnA, c, _, ok := powerFit(hs, ys, ws, kappa); ok {
			return lnA, c
		}
	}
	top := h[len(h)-1]
	c = addStartExponent
	q := addStartShare * below.upTo(j, top)
	return math.Log(q) - c*math.Log(math.Max(top-kappa, minSpan)), c
}

// finishLSQ fills the least-squares statistics: s, covariance, standard
// errors.
func (f *ControlFit) finishLSQ(ssr float64) {
	f.N, f.Params = f.d.n(), len(f.x)
	df := f.N - f.Params
	s2 := ssr / float64(df)
	f.StandardErrorLog = math.Sqrt(s2)
	f.StandardErrorPercent = 100 * math.Sinh(f.StandardErrorLog)
	f.StandardErrorDF = df
	f.tq = distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(df)}.Quantile(0.5 + FitBandLevel/2)
	r, _ := f.m.rating(f.m.full(f.x))
	f.Rating = r
	lq := func(x []float64) []float64 {
		r, ok := f.m.rating(f.m.full(x))
		if !ok {
			return nil
		}
		out := make([]float64, f.d.n())
		for i, h := range f.d.h {
			out[i] = math.Sqrt(f.d.w[i]) * logQ(r, h)
		}
		return out
	}
	f0 := lq(f.x)
	if jac := jacobian(lq, f.x, f.scale, f0); jac != nil && s2 > 0 {
		var jtj mat.SymDense
		jtj.SymOuterK(1, jac.T())
		var ch mat.Cholesky
		if ch.Factorize(&jtj) {
			var inv mat.SymDense
			if err := ch.InverseTo(&inv); err == nil {
				inv.ScaleSym(s2, &inv)
				f.cov = &inv
			}
		}
	}
	switch {
	case f.cov == nil && s2 > 0:
		f.NoStandardErrors = "the gaugings do not determine every parameter (the matrix JᵀWJ of the delta method is singular)"
		f.Warnings = append(f.Warnings, "the parameters are not all determined by the gaugings: standard errors and bands are not available")
	case f.cov == nil:
		f.NoStandardErrors = "the gaugings lie on the rating exactly (no scatter to measure)"
	}
	f.Controls = f.controlsWithSE(func(g []float64) float64 {
		if f.cov == nil {
			return math.NaN()
		}
		v := mat.NewVecDense(len(g), g)
		return math.Sqrt(mat.Inner(v, f.cov, v))
	})
}

// controlsWithSE returns the rating's controls with standard errors from
// se, which maps a gradient in the free parameters to a standard error.
func (f *ControlFit) controlsWithSE(se func([]float64) float64) []FittedControl {
	k := f.m.k()
	derived := func(x []float64) []float64 {
		r, ok := f.m.rating(f.m.full(x))
		if !ok {
			return nil
		}
		out := make([]float64, 0, 4*k)
		for _, c := range r.Controls {
			out = append(out, c.A, c.B, c.C, c.From)
		}
		return out
	}
	d0 := derived(f.x)
	jac := jacobian(derived, f.x, f.scale, d0)
	out := make([]FittedControl, k)
	for j, c := range f.Rating.Controls {
		fc := FittedControl{Control: c, ASE: math.NaN(), BSE: math.NaN(), CSE: math.NaN(), FromSE: math.NaN()}
		if jac != nil {
			for q, dst := range []*float64{&fc.ASE, &fc.BSE, &fc.CSE, &fc.FromSE} {
				g := mat.Row(nil, 4*j+q, jac)
				if !allZero(g) {
					*dst = se(g)
				}
			}
		}
		out[j] = fc
	}
	return out
}

// allZero reports a slice of zeros.
func allZero(v []float64) bool {
	for _, x := range v {
		if x != 0 {
			return false
		}
	}
	return true
}

// finishCommon fills what both methods report: residuals of every
// gauging, the tests of the relation, Johnson's check and warnings.
// sel is the selection the gaugings were fitted under, reasons why each
// was left out. ranges, when not nil, are the exponents each control may
// take without a warning (default ExponentRange of its kind).
func (f *ControlFit) finishCommon(gs []Gauging, sel Selection, reasons []string, ranges []ExponentBounds) {
	d := f.d
	f.LowStage, f.HighStage, f.MaxDischarge = d.lo, d.hi, d.qmax
	f.N = d.n()
	weight := make(map[int]float64, d.n())
	for i, idx := range d.index {
		weight[idx] = d.w[i]
	}
	f.Residuals = make([]Residual, len(gs))
	for i, g := range gs {
		r := residualOf(g, f.Rating.Discharge(g.Stage), func(q float64) float64 {
			h, err := f.Rating.Stage(q)
			if err != nil {
				return math.NaN()
			}
			return h
		})
		r.Weight = weight[i]
		if reasons[i] != "" {
			r.Excluded, r.ExcludedReason, r.Weight = true, reasons[i], 0
		}
		f.Residuals[i] = r
	}
	dep := make([]float64, d.n())
	for i, h := range d.h {
		dep[i] = d.y[i] - logQ(f.Rating, h)
	}
	f.Tests = RelationChecks(dep)
	for _, t := range []RelationTest{f.Tests.Sign, f.Tests.Runs, f.Tests.Mean} {
		if t.Failed {
			f.Warnings = append(f.Warnings, sayf("the %s test of the relation fails (p = %.3g < %g, ISO 1100-2): the rating misses the gaugings systematically", t.Name, t.P, RelationTestLevel))
		}
	}
	top := math.Inf(1)
	if len(f.Rating.Controls) > 1 {
		top = f.Rating.Controls[1].From
	}
	f.Johnson = johnsonFromData(d, top)
	if f.Johnson.OK {
		if w := f.Johnson.judge(f.Rating.Controls[0].B, math.Min(top, d.hi)-f.Rating.Controls[0].B, f.Units); w != "" {
			f.Warnings = append(f.Warnings, w)
		}
	}
	var fitted []Gauging
	for _, g := range gs {
		if sel.Holds(g) {
			fitted = append(fitted, g)
		}
	}
	f.Warnings = append(f.Warnings, zeroFlowConflicts(fitted, f.Rating.Controls[0].B, f.OffsetSource, f.Units, sel.UTCOffset)...)
	f.Warnings = append(f.Warnings, f.farGaugings(gs, sel.UTCOffset)...)
	if ranges == nil {
		for _, c := range f.Rating.Controls {
			lo, hi := ExponentRange(c.Kind)
			ranges = append(ranges, ExponentBounds{Low: lo, High: hi})
		}
	}
	f.Exponents = ranges
	f.Warnings = append(f.Warnings, f.Rating.exponentWarnings(ranges)...)
	f.Warnings = append(f.Warnings, f.stepWarnings()...)
}

// FarDepartureSigmas is the departure from the fitted rating, in the
// gauging's standard uncertainties in ln Q, beyond which a fitted gauging
// that no band marks is warned of (common practice: three standard
// deviations).
const FarDepartureSigmas = 3.0

// farListed is how many far poor gaugings below the highest are named
// one by one; more are summed up in one line naming the farthest
// farListed.
const farListed = 3

// farGaugings warns of the fitted gaugings of gs whose departure from the
// fitted rating in ln Q, r = ln Q − ln Q̂, exceeds FarDepartureSigmas·σ,
// σ the gauging's standard uncertainty (LogSigma: U/1.96, a poor
// gauging's U read as rating.PoorWeightPercent), where no band says so:
// the highest gauging, on its own, since the top of the fit and any
// extension above it rest on it; and gaugings whose band is open (poor,
// with no uncertainty of their own: Gauging.Outside never marks them),
// up to farListed by name and more summed up naming the farthest. Other
// gaugings are marked outside their band in the report's table. offset
// writes the times.
func (f *ControlFit) farGaugings(gs []Gauging, offset time.Duration) []string {
	d := f.d
	L := f.Units.Length()
	type far struct {
		i    int
		r, z float64
	}
	describe := func(x far) string {
		g := gs[d.index[x.i]]
		name := g.label()
		if !g.Time.IsZero() {
			name += " (" + TimeText(g.Time, offset) + ")"
		}
		return sayf("%s at gauge height %s %s departs %+.1f %% from the fitted rating (%+.3f in ln Q), %.1f times its standard uncertainty (σ = U/1.96 = %.3f in ln Q, U = %.3g %%)",
			name, gh(g.Stage), L, 100*math.Expm1(x.r), x.r, x.z, d.sigma[x.i], 100*CoverageFactor95*d.sigma[x.i])
	}
	var out []string
	var open []far
	for i, idx := range d.index {
		r := d.y[i] - logQ(f.Rating, d.h[i])
		if !finite(r) || !(d.sigma[i] > 0) || !(math.Abs(r) > FarDepartureSigmas*d.sigma[i]) {
			continue
		}
		x := far{i: i, r: r, z: math.Abs(r) / d.sigma[i]}
		g := gs[idx]
		switch {
		case i == d.n()-1:
			out = append(out, describe(x)+": it is the highest gauging, and the top of the fit (and any extension above it) rests on it; check the gauging before relying on the rating there")
		case g.Uncertainty <= 0 && g.Quality == rating.Poor:
			open = append(open, x)
		}
	}
	if len(open) <= farListed {
		for _, x := range open {
			out = append(out, describe(x)+": a poor gauging's band is open, so the table does not mark it; check the gauging")
		}
		return out
	}
	sort.SliceStable(open, func(a, b int) bool { return open[a].z > open[b].z })
	var names []string
	for _, x := range open[:farListed] {
		names = append(names, describe(x))
	}
	return append(out, sayf("%d poor gaugings (their band is open, so the table does not mark them) depart from the fitted rating by more than %g times their standard uncertainty; the farthest: %s; and %d more: check them",
		len(open), FarDepartureSigmas, strings.Join(names, "; "), len(open)-farListed))
}

// zeroFlowConflicts returns a warning for each gauging of gs (those of the
// fit: see finishCommon) that contradicts the gauge height of zero flow e,
// the first control's offset (length unit of u; source says where it came
// from, as "fitted"): zero discharge measured above e, where the rating
// has flow, or discharge measured at or below e, where it has none. A zero
// discharge counts as above e only where the message would write the two
// heights apart (ghDecimals); gaugings whose stage or discharge is not a
// finite number are passed over.
func zeroFlowConflicts(gs []Gauging, e float64, source string, u rating.Units, offset time.Duration) []string {
	L, Q := u.Length(), u.Discharge()
	var out []string
	for _, g := range gs {
		if !finite(g.Stage) || !finite(g.Discharge) {
			continue
		}
		name := g.label()
		if !g.Time.IsZero() {
			name += " (" + TimeText(g.Time, offset) + ")"
		}
		switch {
		case g.Discharge == 0 && g.Stage > e && gh(g.Stage) != gh(e):
			out = append(out, sayf("%s: zero discharge measured at gauge height %s %s, above the gauge height of zero flow e = %s %s (%s), where the rating has flow: "+
				"check the gauging, and whether the control had changed", name, gh(g.Stage), L, gh(e), L, source))
		case g.Discharge > 0 && !(g.Stage > e):
			out = append(out, sayf("%s: discharge %.4g %s measured at gauge height %s %s, at or below the gauge height of zero flow e = %s %s (%s), where the rating has none: "+
				"check the gauging, and whether the control had changed", name, g.Discharge, Q, gh(g.Stage), L, gh(e), L, source))
		}
	}
	return out
}
