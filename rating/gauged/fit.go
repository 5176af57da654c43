package gauged

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"sort"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/optimize"
	"gonum.org/v1/gonum/stat/distuv"

	"wetline/rating"
)

// Limits and tolerances of the power-law fit.
const (
	// MaxSegments is the largest number of segments a fit may have.
	MaxSegments = 3
	// MinPerSegment is the fewest gaugings a segment must hold (a project
	// choice: two determine a line, a third gives it a residual).
	MinPerSegment = 3
	// FitBandLevel is the level of the band around the mean relation.
	FitBandLevel = 0.95
	// PoorFitLevel is the significance level at which an F test of one more
	// segment declares the fit poor (common practice for nested models).
	PoorFitLevel = 0.01
	// PoorZeroFlowSE is the standard error of a fitted e, as a fraction of
	// the gauged stage range, above which e is reported as poorly
	// determined (a project choice).
	PoorZeroFlowSE = 0.25
	// fitDerivStep is the relative step of the central differences that give
	// the Jacobian for standard errors and the band.
	fitDerivStep = 1e-6
	// fitZeroSSR is the residual sum of squares (ln units², per gauging) below
	// which data are taken to be free of noise and no F test is made.
	fitZeroSSR = 1e-20
	// fitRelTol is the relative improvement of the objective below which
	// the simplex search counts an iteration as no progress.
	fitRelTol = 1e-13
	// fitStall is the number of iterations without progress that ends it.
	fitStall = 40
	// gridZeroFlow is the number of trial zero-flow stages in the start grid.
	gridZeroFlow = 48
	// gridZeroFlowBreaks is the number of trial zero-flow stages when
	// breakpoints are searched as well.
	gridZeroFlowBreaks = 13
	// multiStart is the number of best grid points the search starts from.
	multiStart = 4
	// gridBreaks bounds the trial breakpoints per break in the start grid.
	gridBreaks = 24
)

// Errors of the fit.
var (
	ErrFewGaugings = errors.New("too few gaugings for the fit")
	ErrBelowZero   = errors.New("stage is at or below the gauge height of zero flow")
	ErrSegments    = errors.New("segments must be 1 to 3, with breakpoints ascending and inside the gaugings")
)

// FitOptions configure a power-law rating fit. The zero value fits one
// segment with the gauge height of zero flow fitted.
type FitOptions struct {
	// Segments is the number of segments, 1 to MaxSegments (default 1, or
	// len(Breaks)+1 when Breaks are given).
	Segments int
	// Breaks, when given, are the breakpoints (gauge height), ascending,
	// one fewer than Segments; nil fits them. A gauging on a breakpoint
	// belongs to the segment above it, as one on a control's breakpoint
	// belongs to the control above (ControlOptions.Breaks).
	Breaks []float64
	// ZeroFlowFixed holds e at ZeroFlow instead of fitting it.
	ZeroFlowFixed bool
	// ZeroFlow is the fixed gauge height of zero flow (length unit).
	ZeroFlow float64
	// ZeroFlowSource says where a fixed e came from, for reports
	// (default "given").
	ZeroFlowSource string
	// Units is the unit system of stage and discharge (for messages).
	Units rating.Units
	// noTest skips the F test for one more segment.
	noTest bool
}

// PowerSegment is one segment of a fitted rating,
//
//	Q = C·(h − e)^b   for From ≤ h ≤ To,
//
// with h the gauge height and e the gauge height of zero flow.
type PowerSegment struct {
	// From and To bound the segment (gauge height): From is e for the first
	// segment, else the breakpoint below; To is the breakpoint above, or
	// the highest gauging for the last segment.
	From, To float64
	// Coefficient C (discharge unit per length unit^b) and its standard error.
	Coefficient, CoefficientSE float64
	// ZeroFlow is e (length unit), shared by all segments.
	ZeroFlow float64
	// Exponent b and its standard error.
	Exponent, ExponentSE float64
}

// Residual is a gauging's departure from a fitted or rated curve.
type Residual struct {
	Gauging
	// Fitted is the curve's discharge at the gauging's stage.
	Fitted float64
	// DeparturePercent is 100·(Q − Fitted)/Fitted.
	DeparturePercent float64
	// LogResidual is ln Q − ln Fitted (NaN when not defined).
	LogResidual float64
	// Shift is the stage shift s with curve(h + s) = Q: what must be added
	// to the gauge height for the curve to pass through the gauging.
	Shift float64
	// Weight is the gauging's normalised weight in the fit (0 when left out).
	Weight float64
	// OutsideBand reports a departure outside the gauging's quality band.
	OutsideBand bool
	// Excluded reports a gauging left out of the fit (zero discharge).
	Excluded bool
	// ExcludedReason says why it was left out (the controls engine:
	// FitControls, FitBayes); empty otherwise.
	ExcludedReason string
}

// Fit is a power-law stage–discharge relation fitted to gaugings.
//
// Form (ISO 18320:2020, Hydrometry — Measurement of liquid flow in open
// channels — Determination of the stage–discharge relationship, the power
// law of the control; Kennedy, 1984, Discharge ratings at gaging stations,
// USGS TWRI Book 3 Chapter A10, the rating curve as straight segments on
// logarithmic paper with the gauge height of zero flow as offset):
//
//	ln Q = ln C₁ + b₁·x + Σₖ (bₖ₊₁ − bₖ)·max(0, x − κₖ),   x = ln(h − e), κₖ = ln(Bₖ − e)
//
// so that every segment is Q = Cⱼ·(h − e)^bⱼ, one offset e for all
// segments (as in agency ratings that are logarithmic between breakpoints
// with one offset), and the curve is continuous at the breakpoints Bₖ:
// Cⱼ₊₁ = Cⱼ·(Bⱼ − e)^(bⱼ − bⱼ₊₁).
//
// Given e and the breakpoints, the weighted least-squares problem in ln Q is
// linear and solved exactly (QR); e and the breakpoints are found by
// gonum/optimize's Nelder–Mead search on that profile, from the best point
// of a grid. Weights are the quality bands' 1/σ² (Quality.Weight),
// normalised to mean 1.
type Fit struct {
	// Units is the unit system of stages and discharges.
	Units rating.Units
	// Segments are the fitted segments, lowest first.
	Segments []PowerSegment
	// ZeroFlow is the gauge height of zero flow e and ZeroFlowSE its
	// standard error (NaN when fixed).
	ZeroFlow, ZeroFlowSE float64
	// ZeroFlowFixed reports a fixed e; ZeroFlowSource says where it came
	// from ("fitted", "given", "survey control", ...).
	ZeroFlowFixed  bool
	ZeroFlowSource string
	// Breaks are the breakpoints (gauge height) and BreaksSE their
	// standard errors (NaN when given); BreaksFixed reports given ones.
	Breaks, BreaksSE []float64
	BreaksFixed      bool
	// StandardErrorLog is the weighted standard error of estimate s in
	// natural-log units, √(Σwᵢrᵢ²/(n − p)), with p fitted parameters.
	StandardErrorLog float64
	// StandardErrorPercent is s in percent: the mean of the upward and
	// downward departures one standard error away, 100·(eˢ − e⁻ˢ)/2.
	StandardErrorPercent float64
	// N is the number of gaugings fitted; Params the number of parameters.
	N, Params int
	// LowStage and HighStage are the lowest and highest gauging fitted.
	LowStage, HighStage float64
	// Residuals holds every gauging's departure, in input order.
	Residuals []Residual
	// PoorFit reports that one more segment fits significantly better
	// (F test at PoorFitLevel); MoreSegmentsF and MoreSegmentsP are that
	// test's statistic and p-value (NaN when not made).
	PoorFit                      bool
	MoreSegmentsF, MoreSegmentsP float64
	// Warnings are facts a reviewer should see.
	Warnings []string

	// theta holds the fitted parameters: [e if fitted], β₀…β_K, [breaks if fitted].
	theta []float64
	// cov is the covariance of theta (nil when singular).
	cov *mat.SymDense
	// tq is the two-sided Student t quantile for the band.
	tq float64
}

// fitProblem is the data of a fit, sorted by stage.
type fitProblem struct {
	h, y, w  []float64 // stage, ln Q, weight
	segments int
	opt      FitOptions
	lo, hi   float64 // lowest and highest stage
}

// FitPowerLaw fits a rating of one to three power-law segments,
//
//	Q = Cⱼ·(h − e)^bⱼ   for Bⱼ₋₁ ≤ h ≤ Bⱼ,
//
// continuous at the breakpoints Bⱼ and with one gauge height of zero flow
// e for all segments, to gaugings by weighted least squares in ln Q (see
// Fit for the form, the weights and the search). Stages, e and the
// breakpoints are gauge heights (length unit of opt.Units), discharges
// are in its discharge unit and each Cⱼ in discharge unit per length
// unit^bⱼ. Gaugings with zero discharge are left out with a warning.
// When the breakpoints are fitted and there are fewer than MaxSegments
// segments, a fit of one more segment is tried and compared by an F test
// (Fit.MoreSegmentsF, Fit.MoreSegmentsP); a significant gain at
// PoorFitLevel marks the fit poor, with a warning.
//
// Preconditions: opt.Segments is 0 (one segment, or len(opt.Breaks)+1) or
// 1 to MaxSegments; given breakpoints ascend, one fewer than the
// segments, each segment holding MinPerSegment gaugings (a gauging on a
// breakpoint counted once, in the segment above it).
//
// Errors: ErrSegments for a bad number of segments or bad breakpoints;
// an error naming each gauging with a non-finite stage or discharge or a
// negative discharge, and each at or below a fixed e (ErrBelowZero),
// joined; ErrFewGaugings for fewer gaugings than the parameters and
// segments need, for gaugings all at one stage, or when no admissible
// start or segments exist.
//
// References:
//
//	ISO 18320:2020. Hydrometry — Measurement of liquid flow in open
//	channels — Determination of the stage–discharge relationship.
//	International Organization for Standardization, Geneva.
//	Kennedy, E. J. (1984). Discharge ratings at gaging stations. U.S.
//	Geological Survey Techniques of Water-Resources Investigations,
//	Book 3, Chapter A10.
//	Nelder, J. A., Mead, R. (1965). A simplex method for function
//	minimization. The Computer Journal 7(4), 308–313.
func FitPowerLaw(gs []Gauging, opt FitOptions) (*Fit, error) {
	k, err := segmentCount(opt)
	if err != nil {
		return nil, err
	}
	f := newFit(opt)
	p := &fitProblem{segments: k, opt: opt}
	if err := p.load(gs, f); err != nil {
		return nil, err
	}
	if err := p.admissible(f); err != nil {
		return nil, err
	}
	theta, ssr, err := p.solve()
	if err != nil {
		return nil, err
	}
	f.theta = theta
	f.finish(p, ssr, gs)
	if !opt.noTest && opt.Breaks == nil && k < MaxSegments && f.N >= (k+1)*MinPerSegment && f.N > f.Params+3 && ssr > fitZeroSSR*float64(f.N) {
		f.testMoreSegments(gs, opt, k, ssr)
	}
	return f, nil
}

// segmentCount returns the number of segments opt asks for, checking it
// and the order of given breakpoints (ErrSegments).
func segmentCount(opt FitOptions) (int, error) {
	k := opt.Segments
	if k == 0 {
		k = len(opt.Breaks) + 1
	}
	if k < 1 || k > MaxSegments || (opt.Breaks != nil && len(opt.Breaks) != k-1) {
		return 0, fmt.Errorf("%w (asked for %d segments and %d breakpoints)", ErrSegments, k, len(opt.Breaks))
	}
	for i := 1; i < len(opt.Breaks); i++ {
		if !(opt.Breaks[i] > opt.Breaks[i-1]) {
			return 0, fmt.Errorf("%w: %g then %g", ErrSegments, opt.Breaks[i-1], opt.Breaks[i])
		}
	}
	return k, nil
}

// newFit returns an empty fit with the settings of opt: whether e and
// the breakpoints are held, where a held e came from, and NaN for every
// statistic not yet computed.
func newFit(opt FitOptions) *Fit {
	f := &Fit{Units: opt.Units, ZeroFlowFixed: opt.ZeroFlowFixed, BreaksFixed: opt.Breaks != nil,
		MoreSegmentsF: math.NaN(), MoreSegmentsP: math.NaN(), ZeroFlowSE: math.NaN()}
	f.ZeroFlowSource = "fitted"
	if opt.ZeroFlowFixed {
		f.ZeroFlowSource = opt.ZeroFlowSource
		if f.ZeroFlowSource == "" {
			f.ZeroFlowSource = "given"
		}
	}
	return f
}

// load takes the gaugings with discharge above zero into p, sorted by
// stage, with ln Q and quality weights normalised to mean 1; it warns in
// f of each gauging with zero discharge and returns the errors of the
// unusable ones, joined.
func (p *fitProblem) load(gs []Gauging, f *Fit) error {
	opt := p.opt
	type idx struct {
		h float64
		i int
	}
	var order []idx
	var errs []error
	for i, g := range gs {
		switch {
		case math.IsNaN(g.Stage) || math.IsInf(g.Stage, 0) || math.IsNaN(g.Discharge) || math.IsInf(g.Discharge, 0) || g.Discharge < 0:
			errs = append(errs, fmt.Errorf("%s: stage %g, discharge %g: not a usable gauging", g.label(), g.Stage, g.Discharge))
		case g.Discharge == 0:
			f.Warnings = append(f.Warnings, fmt.Sprintf("%s: zero discharge at stage %g: left out of the fit (a logarithmic fit needs Q > 0)", g.label(), g.Stage))
		case opt.ZeroFlowFixed && g.Stage <= opt.ZeroFlow:
			errs = append(errs, fmt.Errorf("%s: stage %g: %w %g (%s)", g.label(), g.Stage, ErrBelowZero, opt.ZeroFlow, f.ZeroFlowSource))
		default:
			order = append(order, idx{g.Stage, i})
		}
	}
	if len(errs) > 0 {
		return errors.Join(errs...)
	}
	sort.SliceStable(order, func(a, b int) bool { return order[a].h < order[b].h })
	var wsum float64
	for _, o := range order {
		g := gs[o.i]
		p.h = append(p.h, g.Stage)
		p.y = append(p.y, math.Log(g.Discharge))
		p.w = append(p.w, g.Quality.Weight())
		wsum += g.Quality.Weight()
	}
	for i := range p.w {
		p.w[i] *= float64(len(p.w)) / wsum
	}
	return nil
}

// admissible checks that the loaded gaugings can determine the fit:
// enough of them for the parameters and segments (ErrFewGaugings), more
// than one stage, and given breakpoints inside them that leave every
// segment MinPerSegment gaugings (ErrSegments). It sets the stage range
// of p and f and f's counts.
func (p *fitProblem) admissible(f *Fit) error {
	n, k := len(p.h), p.segments
	f.N = n
	f.Params = p.nParams()
	if n < f.Params+1 || n < k*MinPerSegment {
		return fmt.Errorf("%w: %d gaugings with discharge above zero for %d parameters and %d segments of at least %d gaugings each",
			ErrFewGaugings, n, f.Params, k, MinPerSegment)
	}
	p.lo, p.hi = p.h[0], p.h[n-1]
	if !(p.hi > p.lo) {
		return fmt.Errorf("%w: all gaugings are at stage %g", ErrFewGaugings, p.lo)
	}
	f.LowStage, f.HighStage = p.lo, p.hi
	prev := p.lo
	for i, b := range p.opt.Breaks {
		last := i == len(p.opt.Breaks)-1
		if !(b > p.lo && b < p.hi) || p.countBetween(prev, b) < MinPerSegment || (last && p.count(b) < MinPerSegment) {
			return fmt.Errorf("%w: breakpoint %g leaves a segment with fewer than %d of the gaugings (%g to %g)", ErrSegments, b, MinPerSegment, p.lo, p.hi)
		}
		prev = b
	}
	return nil
}

// testMoreSegments fits k+1 segments to the same gaugings and compares
// the two by the F test of nested models,
//
//	F = ((SSR_k − SSR_k+1)/(p_k+1 − p_k)) / (SSR_k+1/(n − p_k+1)),
//
// setting MoreSegmentsF and MoreSegmentsP, and PoorFit with a warning
// when P < PoorFitLevel. ssr is the k-segment fit's residual sum of
// squares. Nothing is set when the larger fit fails or is no better.
func (f *Fit) testMoreSegments(gs []Gauging, opt FitOptions, k int, ssr float64) {
	more := opt
	more.Segments, more.noTest = k+1, true
	g, err := FitPowerLaw(gs, more)
	if err != nil {
		return
	}
	ssr2 := g.StandardErrorLog * g.StandardErrorLog * float64(g.N-g.Params)
	d1, d2 := float64(g.Params-f.Params), float64(g.N-g.Params)
	if !(ssr2 > 0 && ssr2 < ssr) {
		return
	}
	fs := ((ssr - ssr2) / d1) / (ssr2 / d2)
	f.MoreSegmentsF = fs
	f.MoreSegmentsP = distuv.F{D1: d1, D2: d2}.Survival(fs)
	if f.MoreSegmentsP < PoorFitLevel {
		f.PoorFit = true
		f.Warnings = append(f.Warnings, fmt.Sprintf(
			"%s %s these gaugings poorly: %d segments cut the standard error from %.1f %% to %.1f %% (F = %.1f, p = %.2g < %g); the control likely changes with stage: fit more segments",
			rating.Counted(k, "segment", "segments"), rating.Agree(k, "fits", "fit"), k+1, f.StandardErrorPercent, g.StandardErrorPercent, fs, f.MoreSegmentsP, PoorFitLevel))
	}
}

// nParams is the number of fitted parameters.
func (p *fitProblem) nParams() int {
	n := p.segments + 1
	if !p.opt.ZeroFlowFixed {
		n++
	}
	if p.opt.Breaks == nil {
		n += p.segments - 1
	}
	return n
}

// count returns the number of gaugings at or above stage b: those of the
// segment above breakpoint b, a gauging on it included (see countBetween).
func (p *fitProblem) count(b float64) int {
	return len(p.h) - sort.SearchFloat64s(p.h, b)
}

// linear solves the weighted least-squares problem in ln Q for a given e
// and breakpoints; it returns β and the residual sum of squares, or +Inf
// when the geometry is not admissible.
func (p *fitProblem) linear(e float64, breaks []float64) ([]float64, float64) {
	n, m := len(p.h), p.segments+1
	if !(e < p.lo) || math.IsInf(e, 0) {
		return nil, math.Inf(1)
	}
	prev := p.lo
	kappa := make([]float64, len(breaks))
	for j, b := range breaks {
		// Each segment must hold MinPerSegment gaugings.
		if !(b > prev) || p.countBetween(prev, b) < MinPerSegment {
			return nil, math.Inf(1)
		}
		prev = b
		kappa[j] = math.Log(b - e)
	}
	if len(breaks) > 0 && p.count(prev) < MinPerSegment {
		return nil, math.Inf(1)
	}
	a := mat.NewDense(n, m, nil)
	yv := mat.NewVecDense(n, nil)
	for i, h := range p.h {
		sw := math.Sqrt(p.w[i])
		x := math.Log(h - e)
		a.Set(i, 0, sw)
		a.Set(i, 1, sw*x)
		for j, k := range kappa {
			a.Set(i, 2+j, sw*math.Max(0, x-k))
		}
		yv.SetVec(i, sw*p.y[i])
	}
	var beta mat.VecDense
	if err := beta.SolveVec(a, yv); err != nil {
		return nil, math.Inf(1)
	}
	var r mat.VecDense
	r.MulVec(a, &beta)
	r.SubVec(yv, &r)
	ssr := mat.Dot(&r, &r)
	if math.IsNaN(ssr) {
		return nil, math.Inf(1)
	}
	return beta.RawVector().Data, ssr
}

// countBetween counts the gaugings with lo ≤ h < hi: those of the
// segment from lo (the lowest gauging, or the breakpoint below) up to
// breakpoint hi. A gauging on a breakpoint belongs to the segment above
// it, as one on a control's breakpoint belongs to the control above
// (controlSpan), and is counted once.
func (p *fitProblem) countBetween(lo, hi float64) int {
	return sort.SearchFloat64s(p.h, hi) - sort.SearchFloat64s(p.h, lo)
}

// solve finds e and the breakpoints, then β; theta is laid out as in Fit.
func (p *fitProblem) solve() ([]float64, float64, error) {
	span := p.hi - p.lo
	// Free variables of the search: z = ln(lo − e) when e is fitted, and
	// each fitted breakpoint as a fraction of the stage span.
	unpack := func(v []float64) (float64, []float64) {
		e := p.opt.ZeroFlow
		i := 0
		if !p.opt.ZeroFlowFixed {
			e = p.lo - math.Exp(v[0])
			i = 1
		}
		breaks := p.opt.Breaks
		if breaks == nil {
			breaks = make([]float64, p.segments-1)
			for j := range breaks {
				breaks[j] = p.lo + v[i+j]*span
			}
		}
		return e, breaks
	}
	obj := func(v []float64) float64 {
		e, b := unpack(v)
		_, ssr := p.linear(e, b)
		return ssr
	}
	dim := p.segments - 1
	if p.opt.Breaks != nil {
		dim = 0
	}
	if !p.opt.ZeroFlowFixed {
		dim++
	}
	var best []float64
	if dim > 0 {
		starts := p.startGrid(obj)
		if len(starts) == 0 {
			return nil, 0, fmt.Errorf("%w: no admissible start (check the breakpoints and the spread of stages)", ErrFewGaugings)
		}
		bestF := math.Inf(1)
		for _, x := range starts {
			// Two passes from each start: a restart from the first
			// optimum guards against a collapsed simplex.
			for pass := 0; pass < 2; pass++ {
				res, err := optimize.Minimize(optimize.Problem{Func: obj}, x, &optimize.Settings{
					Converger:       &optimize.FunctionConverge{Relative: fitRelTol, Iterations: fitStall},
					MajorIterations: 20000,
					FuncEvaluations: 100000,
				}, &optimize.NelderMead{SimplexSize: 0.05})
				if res == nil {
					return nil, 0, fmt.Errorf("rating fit: %w", err)
				}
				if res.F <= obj(x) {
					x = res.X
				}
			}
			if f := obj(x); f < bestF {
				bestF, best = f, x
			}
		}
	}
	e, breaks := unpack(best)
	beta, ssr := p.linear(e, breaks)
	if beta == nil {
		return nil, 0, fmt.Errorf("%w: the gaugings do not determine the segments", ErrFewGaugings)
	}
	var theta []float64
	if !p.opt.ZeroFlowFixed {
		theta = append(theta, e)
	}
	theta = append(theta, beta...)
	if p.opt.Breaks == nil {
		theta = append(theta, breaks...)
	}
	return theta, ssr, nil
}

// startGrid returns the best points of a grid over the search variables
// (best first: one, or multiStart when breakpoints are searched, since
// several starts guard against the local minima of segmented fits).
func (p *fitProblem) startGrid(obj func([]float64) float64) [][]float64 {
	zs := p.trialOffsets()
	keep := 1
	if p.opt.Breaks == nil && p.segments > 1 {
		keep = multiStart
	}
	best := bestStarts{keep: keep}
	sets := p.trialBreakSets()
	if zs == nil {
		for _, b := range sets {
			best.try(obj, b)
		}
		return best.points()
	}
	for _, z := range zs {
		for _, b := range sets {
			best.try(obj, append([]float64{z}, b...))
		}
	}
	return best.points()
}

// trialOffsets are the trial values of ln(lo − e) for a fitted gauge
// height of zero flow: lo − e from 10⁻⁴ to 10² stage spans, evenly in the
// logarithm (nil when e is held fixed).
func (p *fitProblem) trialOffsets() []float64 {
	if p.opt.ZeroFlowFixed {
		return nil
	}
	span := p.hi - p.lo
	ng := gridZeroFlow
	if p.opt.Breaks == nil && p.segments > 1 {
		ng = gridZeroFlowBreaks
	}
	zs := make([]float64, ng)
	for i := range zs {
		zs[i] = math.Log(span * math.Pow(10, -4+6*float64(i)/float64(ng-1)))
	}
	return zs
}

// trialBreakSets are the trial sets of breakpoints, as fractions of the
// stage span: mid-points between gauged stages leaving MinPerSegment
// gaugings to each segment, thinned to about gridBreaks, one or two at a
// time; one empty set when the breaks are given or there is one segment.
func (p *fitProblem) trialBreakSets() [][]float64 {
	if p.opt.Breaks != nil || p.segments == 1 {
		return [][]float64{nil}
	}
	span := p.hi - p.lo
	var mids, cands []float64
	for i := MinPerSegment - 1; i < len(p.h)-MinPerSegment; i++ {
		if p.h[i+1] > p.h[i] {
			mids = append(mids, (0.5*(p.h[i]+p.h[i+1])-p.lo)/span)
		}
	}
	step := math.Max(1, float64(len(mids))/gridBreaks)
	for x := 0.0; int(x) < len(mids); x += step {
		cands = append(cands, mids[int(x)])
	}
	var sets [][]float64
	if p.segments == 2 {
		for _, c := range cands {
			sets = append(sets, []float64{c})
		}
		return sets
	}
	for i, c := range cands {
		for _, d := range cands[i+1:] {
			sets = append(sets, []float64{c, d})
		}
	}
	return sets
}

// bestStarts keeps the keep trial points of least objective, ascending.
type bestStarts struct {
	keep int
	x    [][]float64
	f    []float64
}

// try evaluates obj at v and keeps v if it is among the best so far.
func (b *bestStarts) try(obj func([]float64) float64, v []float64) {
	f := obj(v)
	if math.IsInf(f, 1) || (len(b.f) == b.keep && f >= b.f[len(b.f)-1]) {
		return
	}
	i := sort.Search(len(b.f), func(i int) bool { return b.f[i] > f })
	b.x = slices.Insert(b.x, i, append([]float64(nil), v...))
	b.f = slices.Insert(b.f, i, f)
	if len(b.f) > b.keep {
		b.x, b.f = b.x[:b.keep], b.f[:b.keep]
	}
}

// points returns the points kept, best first.
func (b *bestStarts) points() [][]float64 {
	return append([][]float64{}, b.x...)
}

// split returns e, β and the breakpoints held in theta.
func (f *Fit) split(th []float64, k int) (e float64, beta, breaks []float64) {
	i := 0
	e = f.ZeroFlow
	if !f.ZeroFlowFixed {
		e = th[0]
		i = 1
	}
	beta = th[i : i+k+1]
	if f.BreaksFixed {
		breaks = f.Breaks
	} else {
		breaks = th[i+k+1:]
	}
	return e, beta, breaks
}

// logQ is the model ln Q at stage h for parameters th (NaN for h ≤ e).
func (f *Fit) logQ(th []float64, k int, h float64) float64 {
	e, beta, breaks := f.split(th, k)
	if !(h > e) {
		return math.NaN()
	}
	x := math.Log(h - e)
	y := beta[0] + beta[1]*x
	for j, b := range breaks {
		if b > e {
			y += beta[2+j] * math.Max(0, x-math.Log(b-e))
		}
	}
	return y
}

// segmentsOf turns parameters into segments (C, b, range).
func (f *Fit) segmentsOf(th []float64, k int) []PowerSegment {
	e, beta, breaks := f.split(th, k)
	segs := make([]PowerSegment, k)
	lnC, b := beta[0], beta[1]
	from := e
	for j := 0; j < k; j++ {
		if j > 0 {
			nb := b + beta[1+j]
			lnC += (b - nb) * math.Log(breaks[j-1]-e)
			b = nb
			from = breaks[j-1]
		}
		to := f.HighStage
		if j < k-1 {
			to = breaks[j]
		}
		segs[j] = PowerSegment{From: from, To: to, Coefficient: math.Exp(lnC), ZeroFlow: e, Exponent: b,
			CoefficientSE: math.NaN(), ExponentSE: math.NaN()}
	}
	return segs
}

// finish fills the segments, standard errors and residuals from the
// fitted parameters f.theta and their residual sum of squares ssr.
func (f *Fit) finish(p *fitProblem, ssr float64, gs []Gauging) {
	k := p.segments
	f.setParameters(p)
	df := f.N - f.Params
	s2 := ssr / float64(df)
	f.StandardErrorLog = math.Sqrt(s2)
	f.StandardErrorPercent = 100 * math.Sinh(f.StandardErrorLog)
	f.tq = distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(df)}.Quantile(0.5 + FitBandLevel/2)
	f.setCovariance(p, s2)
	f.BreaksSE = make([]float64, len(f.Breaks))
	for i := range f.BreaksSE {
		f.BreaksSE[i] = math.NaN()
	}
	if f.cov == nil && s2 > 0 {
		f.Warnings = append(f.Warnings, "the parameters are not all determined by the gaugings: standard errors and the confidence band are not available")
	}
	if f.cov != nil {
		f.setStandardErrors(k)
	}
	f.warnShape()
	f.setResiduals(gs)
}

// setParameters sets e, the breakpoints and the segments from f.theta
// (the held values of p's options where they are not fitted).
func (f *Fit) setParameters(p *fitProblem) {
	k := p.segments
	if f.ZeroFlowFixed {
		f.ZeroFlow = p.opt.ZeroFlow
	}
	if f.BreaksFixed {
		f.Breaks = append([]float64(nil), p.opt.Breaks...)
	}
	e, _, breaks := f.split(f.theta, k)
	f.ZeroFlow = e
	f.Breaks = append([]float64(nil), breaks...)
	f.Segments = f.segmentsOf(f.theta, k)
}

// setCovariance sets f.cov to s²·(JᵀWJ)⁻¹, with J the Jacobian of ln Q in
// theta at p's stages and W their weights; it stays nil when JᵀWJ is
// singular or s² is not positive.
func (f *Fit) setCovariance(p *fitProblem, s2 float64) {
	k := p.segments
	np := len(f.theta)
	jtj := mat.NewSymDense(np, nil)
	grads := make([][]float64, len(p.h))
	for i, h := range p.h {
		grads[i] = f.gradient(k, h)
	}
	for a := 0; a < np; a++ {
		for b := a; b < np; b++ {
			var s float64
			for i := range p.h {
				s += p.w[i] * grads[i][a] * grads[i][b]
			}
			jtj.SetSym(a, b, s)
		}
	}
	var ch mat.Cholesky
	if ch.Factorize(jtj) && s2 > 0 {
		var inv mat.SymDense
		if err := ch.InverseTo(&inv); err == nil {
			inv.ScaleSym(s2, &inv)
			f.cov = &inv
		}
	}
}

// setStandardErrors sets the standard errors of a fitted e and fitted
// breakpoints from the covariance, and those of every segment's C and b
// by the delta method. f.cov must be set.
func (f *Fit) setStandardErrors(k int) {
	i := 0
	if !f.ZeroFlowFixed {
		f.ZeroFlowSE = math.Sqrt(f.cov.At(0, 0))
		i = 1
	}
	if !f.BreaksFixed {
		for j := range f.Breaks {
			q := i + k + 1 + j
			f.BreaksSE[j] = math.Sqrt(f.cov.At(q, q))
		}
	}
	for j := range f.Segments {
		gc, gb := f.segmentGradients(j, k)
		f.Segments[j].CoefficientSE = math.Sqrt(f.quad(gc))
		f.Segments[j].ExponentSE = math.Sqrt(f.quad(gb))
	}
}

// segmentGradients returns the gradients in theta of segment j's C and b
// (derived from theta), by central differences.
func (f *Fit) segmentGradients(j, k int) (gc, gb []float64) {
	np := len(f.theta)
	gc = make([]float64, np)
	gb = make([]float64, np)
	for a := 0; a < np; a++ {
		d := f.step(a, k)
		th := append([]float64(nil), f.theta...)
		th[a] += d
		up := f.segmentsOf(th, k)[j]
		th[a] -= 2 * d
		dn := f.segmentsOf(th, k)[j]
		gc[a] = (up.Coefficient - dn.Coefficient) / (2 * d)
		gb[a] = (up.Exponent - dn.Exponent) / (2 * d)
	}
	return gc, gb
}

// warnShape warns of a fitted e the gaugings barely determine (standard
// error above PoorZeroFlowSE of the gauged range) and of a segment whose
// discharge does not rise with stage.
func (f *Fit) warnShape() {
	if span := f.HighStage - f.LowStage; !f.ZeroFlowFixed && f.ZeroFlowSE > PoorZeroFlowSE*span {
		f.Warnings = append(f.Warnings, fmt.Sprintf(
			"the gaugings barely determine the gauge height of zero flow (e = %.3g ± %.2g, more than %.0f %% of the gauged range): fix it from the control or fit fewer segments",
			f.ZeroFlow, f.ZeroFlowSE, 100*PoorZeroFlowSE))
	}
	for j, b := range f.Segments {
		if !(b.Exponent > 0) {
			f.Warnings = append(f.Warnings, fmt.Sprintf("segment %d has exponent %.3g ≤ 0: discharge does not rise with stage there", j+1, b.Exponent))
		}
	}
}

// setResiduals sets every gauging's departure from the fit, in input
// order, with its weight normalised as in the fit (those with zero
// discharge marked excluded).
func (f *Fit) setResiduals(gs []Gauging) {
	f.Residuals = make([]Residual, len(gs))
	wi := 0
	var wsum float64
	for _, g := range gs {
		if g.Discharge > 0 {
			wsum += g.Quality.Weight()
			wi++
		}
	}
	for i, g := range gs {
		r := residualOf(g, f.Discharge(g.Stage), f.Stage)
		if g.Discharge > 0 {
			r.Weight = g.Quality.Weight() * float64(wi) / wsum
		} else {
			r.Excluded = true
		}
		f.Residuals[i] = r
	}
}

// residualOf measures a gauging against a curve's discharge q at its stage;
// inverse returns the curve's stage for a discharge (NaN when none).
func residualOf(g Gauging, q float64, inverse func(float64) float64) Residual {
	r := Residual{Gauging: g, Fitted: q, DeparturePercent: math.NaN(), LogResidual: math.NaN(), Shift: math.NaN()}
	if q > 0 {
		r.DeparturePercent = 100 * (g.Discharge - q) / q
		r.OutsideBand = g.Outside(r.DeparturePercent)
	}
	if q > 0 && g.Discharge > 0 {
		r.LogResidual = math.Log(g.Discharge) - math.Log(q)
	}
	if g.Discharge > 0 {
		r.Shift = inverse(g.Discharge) - g.Stage
	}
	return r
}

// step is the central-difference step of parameter a.
func (f *Fit) step(a, k int) float64 {
	scale := 1.0
	i := 0
	if !f.ZeroFlowFixed {
		i = 1
	}
	if a < i || a >= i+k+1 {
		scale = math.Max(f.HighStage-f.LowStage, math.Abs(f.theta[a]))
	} else {
		scale = math.Max(1, math.Abs(f.theta[a]))
	}
	return fitDerivStep * scale
}

// gradient is ∂lnQ/∂θ at stage h by central differences.
func (f *Fit) gradient(k int, h float64) []float64 {
	g := make([]float64, len(f.theta))
	th := append([]float64(nil), f.theta...)
	for a := range th {
		d := f.step(a, k)
		th[a] = f.theta[a] + d
		up := f.logQ(th, k, h)
		th[a] = f.theta[a] - d
		dn := f.logQ(th, k, h)
		th[a] = f.theta[a]
		g[a] = (up - dn) / (2 * d)
	}
	return g
}

// quad is gᵀ·cov·g.
func (f *Fit) quad(g []float64) float64 {
	v := mat.NewVecDense(len(g), g)
	return mat.Inner(v, f.cov, v)
}

// Discharge returns the fitted discharge at gauge height h: 0 at or below
// e. Above the highest gauging it continues the last segment.
func (f *Fit) Discharge(h float64) float64 {
	if !(h > f.ZeroFlow) {
		return 0
	}
	return math.Exp(f.logQ(f.theta, len(f.Segments), h))
}

// Band returns the FitBandLevel band of the mean relation at h,
//
//	exp(ln Q̂ ± t·√(gᵀ·Σ·g)),
//
// with g the gradient of ln Q̂ in the parameters, Σ their covariance and t
// Student's quantile with n − p degrees of freedom (the delta method;
// Seber & Wild, 1989, Nonlinear Regression, Wiley, chapter 5, from
// memory). NaN when the covariance is not available, or h is below
// BandFloor (at or below e), where the linearised band does not hold.
func (f *Fit) Band(h float64) (lo, hi float64) {
	if f.cov == nil || !(h > f.ZeroFlow) || h < f.BandFloor() {
		return math.NaN(), math.NaN()
	}
	k := len(f.Segments)
	y := f.logQ(f.theta, k, h)
	hw := f.tq * math.Sqrt(f.quad(f.gradient(k, h)))
	return math.Exp(y - hw), math.Exp(y + hw)
}

// BandFloor is the lowest gauge height (length unit) at which Band gives
// a band: e + t·SE(e), the upper end of the 95 % band of the gauge height
// of zero flow (e itself when e is fixed or its standard error is not
// available). Below it the delta method's upper bound rises as h falls
// to e (see ControlFit.BandFloor, the same floor for the fits the
// commands make).
func (f *Fit) BandFloor() float64 {
	if f.ZeroFlowFixed || math.IsNaN(f.ZeroFlowSE) || math.IsInf(f.ZeroFlowSE, 0) {
		return f.ZeroFlow
	}
	return f.ZeroFlow + f.tq*f.ZeroFlowSE
}

// Stage returns the gauge height at which the fitted curve carries q > 0
// (NaN when q ≤ 0 or the curve does not rise there).
func (f *Fit) Stage(q float64) float64 {
	if !(q > 0) {
		return math.NaN()
	}
	lq := math.Log(q)
	for j, s := range f.Segments {
		if !(s.Exponent > 0) {
			return math.NaN()
		}
		h := s.ZeroFlow + math.Exp((lq-math.Log(s.Coefficient))/s.Exponent)
		if j == len(f.Segments)-1 || h <= f.Breaks[j] {
			return h
		}
	}
	return math.NaN()
}
