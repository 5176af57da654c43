package gauged

import (
	"errors"
	"math"
	"strconv"

	"wetline/rating"
	"wetline/subdivide"
)

// ParamPrior is the prior of one parameter: normal with mean Mean and
// standard deviation SD (in the parameter's unit), or held at Mean.
// SD = 0 means "not given" (the fit derives a prior or takes a weak
// default); SD = +Inf is a flat (improper) prior.
type ParamPrior struct {
	Mean, SD float64
	// Fixed holds the parameter at Mean.
	Fixed bool
}

// given reports a prior that was set.
func (p ParamPrior) given() bool { return p.Fixed || p.SD != 0 }

// ControlPrior holds the priors of one control's parameters.
type ControlPrior struct {
	// LogCoefficient is the prior of ln A (A in discharge unit per length
	// unit^C).
	LogCoefficient ParamPrior
	// Exponent is the prior of C.
	Exponent ParamPrior
	// Offset is the prior of the first control's offset B (gauge height,
	// length unit); later controls' offsets follow from continuity or
	// their breakpoint.
	Offset ParamPrior
	// Break is the prior of a later control's breakpoint (gauge height,
	// length unit); ignored for the first control.
	Break ParamPrior
	// Source says where the prior came from, for reports.
	Source string
}

// Defaults of the priors (all project choices unless marked).
const (
	// DefaultNCV is the coefficient of variation of Manning's n about the
	// survey's values for a channel control's prior.
	DefaultNCV = 0.20
	// DefaultSlopeCV is the coefficient of variation of the friction
	// slope about the one given.
	DefaultSlopeCV = 0.30
	// DefaultCrestCV is the coefficient of variation of a section
	// control's critical-flow discharge (approach velocity, losses and the
	// survey of the crest).
	DefaultCrestCV = 0.20
	// HydraulicExponentSD is the standard deviation of a control's
	// exponent about that of its hydraulic rating (n varies with stage).
	HydraulicExponentSD = 0.15
	// OffsetPriorFraction sets the standard deviation of an offset prior
	// from the survey: this fraction of the control's depth range.
	OffsetPriorFraction = 0.10
	// BankPriorFraction sets the standard deviation of a floodplain
	// breakpoint's prior at the bank stage: this fraction of the bank's
	// height above the section's lowest point.
	BankPriorFraction = 0.10
	// WeakLogCoefficientSD is the standard deviation of the weak prior of
	// ln A, centred on 0.
	WeakLogCoefficientSD = 10.0
	// WeakExponentSD is the standard deviation of the weak prior of an
	// exponent about its kind's typical value (see weakExponent).
	WeakExponentSD = 0.5
	// WeakUnknownExponentSD is that of an unspecified control, centred on 2.
	WeakUnknownExponentSD = 1.0
	// priorCurvePoints is the number of stages at which a hydraulic or
	// crest rating is sampled to fit a prior.
	priorCurvePoints = 40
)

// weakExponent returns the weak prior of the exponent of a control kind:
// section N(2, 0.5) (1.5 rectangular to 2.5 triangular crest, critical
// flow), channel N(5/3, 0.5) (wide channel, Manning), unknown N(2, 1).
func weakExponent(k ControlKind) ParamPrior {
	switch k {
	case SectionControl:
		return ParamPrior{Mean: 2, SD: WeakExponentSD}
	case ChannelControl:
		return ParamPrior{Mean: 5.0 / 3, SD: WeakExponentSD}
	}
	return ParamPrior{Mean: 2, SD: WeakUnknownExponentSD}
}

// logSD returns the standard deviation of ln X for a log-normal X with
// coefficient of variation cv: √(ln(1 + cv²)).
func logSD(cv float64) float64 { return math.Sqrt(math.Log1p(cv * cv)) }

// Part selects which share of a section's hydraulic discharge a prior is
// fitted to.
type Part int

// Parts of a section's discharge.
const (
	// WholeSection: the discharge of the whole section.
	WholeSection Part = iota
	// ChannelPart: the main channel's subsections (between the banks).
	ChannelPart
	// OverbankPart: the overbank subsections (a floodplain control that adds).
	OverbankPart
)

// HydraulicPriorOptions configure HydraulicPrior. The zero value uses the
// default coefficients of variation, the whole section and a fitted offset.
type HydraulicPriorOptions struct {
	// NCV is the coefficient of variation of Manning's n (default
	// DefaultNCV; ≥ 0).
	NCV float64
	// SlopeCV is the coefficient of variation of the slope (default
	// DefaultSlopeCV; ≥ 0).
	SlopeCV float64
	// Part is the share of the discharge fitted (default WholeSection).
	Part Part
	// OffsetFixed holds the offset of the fit at Offset (gauge height).
	OffsetFixed bool
	Offset      float64
	// Units label the range in the prior's Source (default SI).
	Units rating.Units
}

// ErrPrior is returned when a prior cannot be derived from a section.
var ErrPrior = errors.New("no prior from this section")

// HydraulicPrior returns the prior of a channel control from the section's
// own hydraulic rating c over gauge heights from..to. The power law
// Q = a₀·(h − b)^c is fitted in ln Q to the hydraulic discharge (of
// opt.Part) at priorCurvePoints stages, the offset b no lower than the
// section's lowest point (fitPointsAbove); multiplying every n by a factor f
// divides the conveyance by f, and Q ∝ √S, so with ln f and ln(S/S₀)
// normal about 0 the coefficient is exactly log-normal:
//
//	ln a = ln a₀ + ½·ln(S/S₀) − ln f,   sd(ln a) = √(¼·σ²_lnS + σ²_lnf),
//
// σ_lnX = √(ln(1 + cv²)). The exponent's prior is N(c, HydraulicExponentSD)
// and the offset's N(b, OffsetPriorFraction·(to − lowest point)). Errors
// wrap ErrPrior (a range that is dry or empty) or come from the section.
//
// References:
//
//	Le Coz, J., Renard, B., Bonnifait, L., Branger, F., Le Boursicaud, R.
//	(2014). Combining hydraulic knowledge and uncertain gaugings in the
//	estimation of hydrometric rating curves: a Bayesian approach.
//	Journal of Hydrology 509, 573–587.
//	Chow, V. T. (1959). Open-Channel Hydraulics. McGraw-Hill, eq. 6-9
//	(conveyance proportional to 1/n).
func HydraulicPrior(c rating.HydraulicCurve, from, to float64, opt HydraulicPriorOptions) (ControlPrior, error) {
	q := func(h float64) (float64, error) {
		r, err := c.Row(h)
		if err != nil {
			return 0, err
		}
		if opt.Part == WholeSection {
			return r.Discharge, nil
		}
		var s float64
		for _, sub := range r.Subs {
			if (sub.Region == subdivide.Channel) == (opt.Part == ChannelPart) {
				s += sub.Discharge
			}
		}
		return s, nil
	}
	return curvePrior(q, c.Bottom(), from, to, opt, "hydraulic rating of the section")
}

// CrestPrior returns the prior of a section control from critical flow
// over a surveyed crest section (its Datum relates it to the gauge): for
// a discharge Q the stage upstream of the crest is taken as the crest's
// lowest point plus the least specific energy of Q in the crest section,
//
//	h(Q) = z_crest + E_min(Q),   E = y + α·V²/(2g),
//
// neglecting the approach velocity head (from memory, after Le Coz et
// al., 2014). The power law Q = a₀·(h − z_crest)^c is fitted in ln Q over
// gauge heights from..to (the offset held at the crest's lowest point);
// the prior is ln a ~ N(ln a₀, √(ln(1 + cv²))) with cv the crest's
// coefficient of variation (default DefaultCrestCV when 0),
// C ~ N(c, HydraulicExponentSD) and B ~ N(z_crest,
// OffsetPriorFraction·(to − z_crest)). For a rectangular crest of width W
// it gives a₀ = W·√g·(2/3)^(3/2) and c = 3/2 (Chow, 1959, section 4-2).
// Errors wrap ErrPrior or come from the critical-depth solvers of package
// rating.
//
// References:
//
//	Le Coz, J., et al. (2014). Journal of Hydrology 509, 573–587.
//	Chow, V. T. (1959). Open-Channel Hydraulics. McGraw-Hill, chapter 3
//	(specific energy) and section 4-2 (critical flow).
func CrestPrior(crest rating.HydraulicCurve, from, to, cv float64) (ControlPrior, error) {
	if cv == 0 {
		cv = DefaultCrestCV
	}
	z := crest.Bottom()
	from = math.Max(from, z)
	if !(to > from) || !(cv >= 0) {
		return ControlPrior{}, errorf("%w: crest range %g to %g (crest at %g), cv %g", ErrPrior, from, to, z, cv)
	}
	opt := crest.Options
	head := func(q float64) (float64, error) {
		e, err := rating.MinSpecificEnergy(crest.Geometry, q, opt)
		return z + e.Energy, err
	}
	qTo, err := crestDischarge(head, to)
	if err != nil {
		return ControlPrior{}, err
	}
	var h, y []float64
	for i := 0; i < priorCurvePoints; i++ {
		q := qTo * math.Pow(10, crestDecades*(float64(i)/(priorCurvePoints-1)-1))
		v, err := head(q)
		if err != nil {
			return ControlPrior{}, err
		}
		if v >= from && v > z {
			h, y = append(h, v), append(y, math.Log(q))
		}
	}
	lnA, c, b, err := fitPoints(h, y, true, z)
	if err != nil {
		return ControlPrior{}, err
	}
	return ControlPrior{
		LogCoefficient: ParamPrior{Mean: lnA, SD: logSD(cv)},
		Exponent:       ParamPrior{Mean: c, SD: HydraulicExponentSD},
		Offset:         ParamPrior{Mean: b, SD: OffsetPriorFraction * (to - z)},
		Source: sayf("critical flow over the crest section from %.4g to %.4g %s (Q = %.4g·(h − %.4g)^%.3g, cv %.2g)",
			from, to, crest.Options.Units.Length(), math.Exp(lnA), b, c, cv),
	}, nil
}

// crestDecades is the span, in decades of discharge, over which a crest
// rating is sampled below the discharge at the top of its range.
const crestDecades = 3.0

// crestBisect bounds the bracketing and bisection steps of crestDischarge.
const crestBisect = 200

// crestDischarge returns the discharge whose upstream stage head(Q) is h,
// by bracketing and bisection in ln Q. A discharge the crest section
// refuses (its critical stage above the section's top, which it does not
// extend: rating.ErrNoRoot or subdivide.ErrAboveEnds) counts as above h,
// since head rises with Q, so the steps of the bracketing cannot
// overshoot into it; when the bracket's upper end is a discharge the
// section refused, h is not reached below the section's top, and that
// refusal is returned, wrapped.
func crestDischarge(head func(float64) (float64, error), h float64) (float64, error) {
	// reach tells whether the head of e^lnQ reaches h, or the section
	// refuses it (refused, the error).
	reach := func(lnQ float64) (ok bool, refused, err error) {
		v, err := head(math.Exp(lnQ))
		switch {
		case errors.Is(err, rating.ErrNoRoot) || errors.Is(err, subdivide.ErrAboveEnds):
			return true, err, nil
		case err != nil:
			return false, nil, err
		}
		return v >= h, nil, nil
	}
	lo, hi := 0.0, 0.0
	var hiRefused error
	for i := 0; ; i++ {
		ok, refused, err := reach(hi)
		if err != nil {
			return 0, err
		}
		if ok {
			hiRefused = refused
			break
		}
		if i == crestBisect {
			return 0, errorf("%w: no discharge reaches stage %g over the crest", ErrPrior, h)
		}
		hi += 2
	}
	lo = hi - 2
	for i := 0; ; i++ {
		ok, refused, err := reach(lo)
		if err != nil {
			return 0, err
		}
		if !ok {
			break
		}
		if i == crestBisect {
			return 0, errorf("%w: stage %g is at the crest", ErrPrior, h)
		}
		hi, hiRefused, lo = lo, refused, lo-2
	}
	for i := 0; i < crestBisect && hi-lo > bisectLogTol; i++ {
		mid := 0.5 * (lo + hi)
		ok, refused, err := reach(mid)
		if err != nil {
			return 0, err
		}
		if ok {
			hi, hiRefused = mid, refused
		} else {
			lo = mid
		}
	}
	if hiRefused != nil {
		return 0, errorf("stage %g over the crest needs a critical depth above the crest section's top: %w", h, hiRefused)
	}
	return math.Exp(0.5 * (lo + hi)), nil
}

// bisectLogTol is the width in ln Q to which crestDischarge bisects.
const bisectLogTol = 1e-10

// fitCurve fits ln Q = ln a + c·ln(h − b) to a curve sampled at
// priorCurvePoints stages evenly over (from, to] (see fitPoints).
func fitCurve(q func(float64) (float64, error), from, to float64, bFixed bool, b0, bLow float64) (lnA, c, b float64, err error) {
	var h, y []float64
	for i := 1; i <= priorCurvePoints; i++ {
		s := from + (to-from)*float64(i)/priorCurvePoints
		v, err := q(s)
		if err != nil {
			return 0, 0, 0, err
		}
		if v > 0 && (!bFixed || s > b0) {
			h, y = append(h, s), append(y, math.Log(v))
		}
	}
	if !bFixed {
		return fitPointsAbove(h, y, bLow)
	}
	return fitPoints(h, y, bFixed, b0)
}

// fitPointsAbove is fitPoints with the offset fitted but kept at or above
// bLow (the section's lowest point: a channel's flow cannot cease below
// its bed; NaN for no bound). Over a range far above the bed, an
// unbounded fit can trade the offset against the exponent without limit
// (as Q = 0.0000000039·(h + 6.9)^10.3 for an overbank control from
// 2 to 4.8 m), a curve that fits the points and means nothing as a prior;
// held at the bed, the offset gives the exponent of the section's own
// shape there.
func fitPointsAbove(h, y []float64, bLow float64) (lnA, c, b float64, err error) {
	lnA, c, b, err = fitPoints(h, y, false, 0)
	if err != nil || math.IsNaN(bLow) || b >= bLow || len(h) == 0 || !(h[0] > bLow) {
		return lnA, c, b, err
	}
	return fitPoints(h, y, true, bLow)
}

// fitPoints fits ln Q = ln a + c·ln(h − b) to points (h ascending, y =
// ln Q), b held at b0 or fitted: a profile over trial offsets below the
// lowest stage, then Levenberg–Marquardt.
func fitPoints(h, y []float64, bFixed bool, b0 float64) (lnA, c, b float64, err error) {
	if len(h) < 3 {
		return 0, 0, 0, errorf("%w: fewer than 3 points with discharge", ErrPrior)
	}
	from, to := h[0], h[len(h)-1]
	w := make([]float64, len(h))
	for i := range w {
		w[i] = 1
	}
	if bFixed {
		lnA, c, _, ok := powerFit(h, y, w, b0)
		if !ok {
			return 0, 0, 0, errorf("%w: no power law through the rating from %g to %g", ErrPrior, from, to)
		}
		return lnA, c, b0, nil
	}
	best := math.Inf(1)
	for _, bt := range trialOffsets(h[0], to-from) {
		if la, cc, ssr, ok := powerFit(h, y, w, bt); ok && ssr < best {
			best, lnA, c, b = ssr, la, cc, bt
		}
	}
	if math.IsInf(best, 1) {
		return 0, 0, 0, errorf("%w: no power law through the rating from %g to %g", ErrPrior, from, to)
	}
	res := func(x []float64) []float64 {
		out := make([]float64, len(h))
		for i := range h {
			if !(h[i] > x[2]) {
				return nil
			}
			out[i] = y[i] - x[0] - x[1]*math.Log(h[i]-x[2])
		}
		return out
	}
	x, _ := levenberg(res, []float64{lnA, c, b}, []float64{1, 1, to - from})
	return x[0], x[1], x[2], nil
}

// bankStageSteps and bankStageTol set the search for the stage at which
// an overbank first wets: a scan, then bisection to this tolerance
// (length unit).
const (
	bankStageSteps    = 400
	bankStageTol      = 1e-6
	bankStageDecimals = 6 // the decimals of bankStageTol
)

// BankStage returns the gauge height at which water first reaches an
// overbank subsection of the section (the lower bank), by a scan of the
// section's depth and bisection to 1e-6 of the length unit, written to
// that resolution; ok is false for a section without overbanks.
func BankStage(c rating.HydraulicCurve) (h float64, ok bool, err error) {
	g := c.Geometry
	wet := func(stage float64) (bool, error) {
		w, err := g.At(stage, c.Options.Geometry)
		if err != nil {
			return false, err
		}
		for _, s := range w.Subs {
			if s.Region != subdivide.Channel && s.Area > 0 {
				return true, nil
			}
		}
		return false, nil
	}
	lo, top := g.Bottom(), g.Top()
	prev := lo
	for i := 1; i <= bankStageSteps; i++ {
		s := lo + (top-lo)*float64(i)/bankStageSteps
		on, err := wet(s)
		if err != nil {
			return 0, false, err
		}
		if on {
			a, b := prev, s
			for b-a > bankStageTol {
				m := 0.5 * (a + b)
				on, err := wet(m)
				if err != nil {
					return 0, false, err
				}
				if on {
					b = m
				} else {
					a = m
				}
			}
			// The bracket is bankStageTol wide: its midpoint, written to
			// that resolution, is the stage (a bank surveyed at 102.0 m is
			// 102, not 101.9999997), as a gauge height to the datum's
			// decimals.
			mid, err := strconv.ParseFloat(strconv.FormatFloat(0.5*(a+b), 'f', bankStageDecimals, 64), 64)
			if err != nil {
				return 0, false, err
			}
			return rating.DecimalDifference(mid, c.Datum), true, nil
		}
		prev = s
	}
	return 0, false, nil
}
