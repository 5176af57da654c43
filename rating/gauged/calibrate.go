package gauged

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/optimize"

	"wetline/rating"
	"wetline/subdivide"
)

// NPoint is the roughness back-calculated from one gauging.
type NPoint struct {
	Gauging
	// Rated is the hydraulic discharge at the gauging with the survey's n.
	Rated float64
	// Factor is the factor on n that makes the computed discharge equal the
	// measured one (NaN when no factor can).
	Factor float64
	// N is Factor times the n of the scaled subsection carrying the most
	// conveyance at the gauging (Subsection, 0-based).
	N          float64
	Subsection int
	// aboveEnds reports a gauge height above an end of the section.
	aboveEnds bool
}

// Calibration is Manning's n back-calculated from gaugings with a known
// slope.
//
// Conveyance is inversely proportional to n (Manning's equation; Chow, 1959,
// eq. 6-9), so multiplying the scaled subsections' n by f gives
//
//	Q(f) = Qs/f + Qo
//
// with Qs the discharge of the scaled subsections and Qo that of the
// others at the survey's n. Each gauging's factor solves Q(f) = Qm exactly:
// f = Qs/(Qm − Qo), defined when Qm > Qo. The best single factor minimises
// Σ wᵢ·(ln Qmᵢ − ln Qᵢ(f))² with the quality weights: in closed form
// ln f = Σwᵢ ln(Qrᵢ/Qmᵢ)/Σwᵢ when every n is scaled, by gonum's
// Nelder–Mead search on ln f otherwise.
//
// Two standard errors follow, both from the residuals rᵢ = ln Qmᵢ −
// ln Qᵢ(f) of the n gaugings used, with n − 1 degrees of freedom. The
// scatter of the gaugings about the calibrated rating (the standard error
// of estimate, weights normalised to mean one, as in Fit) is
//
//	s = √(n·Σwᵢrᵢ² / ((n − 1)·Σwᵢ)).
//
// The factor's own standard error is that of a one-parameter weighted
// least-squares estimate of ln f: with gᵢ = ∂ln Qᵢ/∂ln f = −(Qsᵢ/f)/Qᵢ(f),
// the share of the discharge the scaled subsections carry (−1 when every
// n is scaled),
//
//	SE(ln f) = √(Σwᵢrᵢ² / ((n − 1)·Σwᵢgᵢ²)),
//
// which for every n scaled is the standard error of the weighted mean of
// ln(Qr/Qm), s/√n with equal weights. Both are given in percent as
// 100·sinh of the value in ln units, as Fit gives its standard error.
type Calibration struct {
	// ChannelOnly reports that only the channel's n was scaled.
	ChannelOnly bool
	// Factor is the best single factor on n.
	Factor float64
	// FactorStandardErrorPercent is the standard error of the factor, in
	// percent of it (SE(ln f) above; NaN from one gauging).
	FactorStandardErrorPercent float64
	// StandardErrorPercent is the weighted standard error of the calibrated
	// rating against the gaugings, as in Fit (n − 1 degrees of freedom):
	// their scatter about it (NaN from one gauging).
	StandardErrorPercent float64
	// Points holds each gauging's back-calculated n: one per gauging, in
	// input order.
	Points []NPoint
	// Used is the number of gaugings the best factor was fitted on (those
	// with a factor of their own and not excluded).
	Used int
	// Warnings are facts a reviewer should see.
	Warnings []string
}

// ErrCalibrate is returned when no gauging can calibrate n.
var ErrCalibrate = errors.New("no gauging can calibrate n")

// Calibrate back-calculates Manning's n from gaugings on the hydraulic
// rating c (see Calibration): for each gauging, the factor on the scaled
// subsections' n (every subsection's, or the channel's alone with
// channelOnly) that makes the computed discharge equal the measured one,
// and the best single factor over the gaugings, with weights 1/σ² from
// each gauging's LogSigma. Gauge heights are in c's length unit (c.Datum
// relates them to the survey's elevations), discharges in its discharge
// unit; factors are dimensionless. Gaugings with zero discharge, a dry
// scaled part or a measured discharge not above what the unscaled part
// carries get no factor, with a warning; a gauging whose Exclude is not
// blank keeps its own factor but is left out of the best one.
//
// Errors: the errors of c at each gauging's gauge height, joined (naming
// the gauging); ErrCalibrate when no gauging can calibrate n; an error of
// gonum/optimize when the search for the channel's factor fails.
//
// References:
//
//	Chow, V. T. (1959). Open-Channel Hydraulics. McGraw-Hill, New York
//	(Manning's equation, conveyance ∝ 1/n).
//	Nelder, J. A., Mead, R. (1965). A simplex method for function
//	minimization. The Computer Journal 7(4), 308–313.
//	Draper, N. R., Smith, H. (1998). Applied Regression Analysis, 3rd ed.
//	Wiley, New York, chapters 9 and 24 (weighted least squares; the
//	standard error of a nonlinear estimate from the gradient, as used
//	for the factor's standard error; from memory).
func Calibrate(gs []Gauging, c rating.HydraulicCurve, channelOnly bool) (Calibration, error) {
	return calibrate(gs, c, channelOnly, Selection{})
}

// calibrate is Calibrate with the best factor taken over the gaugings sel
// selects.
func calibrate(gs []Gauging, c rating.HydraulicCurve, channelOnly bool, sel Selection) (Calibration, error) {
	cal := Calibration{ChannelOnly: channelOnly, Factor: math.NaN(), FactorStandardErrorPercent: math.NaN(), StandardErrorPercent: math.NaN()}
	if channelOnly && !hasOverbanks(c) {
		cal.Warnings = append(cal.Warnings, "the section has no bank stations: all of it is channel, so every n is scaled")
	}
	scaled := rating.ScaledN{Factor: 1, ChannelOnly: channelOnly}
	var parts []calibrationPart
	var errs []error
	above, highest := 0, math.Inf(-1)
	for _, g := range gs {
		pt, part, warning, err := nPointOf(g, c, scaled, sel)
		if err != nil {
			errs = append(errs, err)
			continue
		}
		if pt.aboveEnds {
			above, highest = above+1, math.Max(highest, g.Stage)
		}
		if warning != "" {
			cal.Warnings = append(cal.Warnings, warning)
		}
		if part != nil {
			parts = append(parts, *part)
		}
		cal.Points = append(cal.Points, pt)
	}
	if len(errs) > 0 {
		return cal, errors.Join(errs...)
	}
	if above > 0 {
		u := c.Options.Units
		cal.Warnings = append(cal.Warnings, sayf(
			"%s %s above an end of the section (gauge heights up to %.3f %s; the lower end is at gauge height %.3f %s): %s rated on vertical walls added there; check the datum (elevation = gauge height + datum)",
			rating.Counted(above, "gauging", "gaugings"), rating.Agree(above, "lies", "lie"), highest, u.Length(), c.Top(), u.Length(), rating.Agree(above, "it was", "they were")))
	}
	cal.Used = len(parts)
	if len(parts) == 0 {
		if len(cal.Warnings) > 0 {
			return cal, errorf("%w (check --datum: elevation = gauge height + datum), e.g. %s", ErrCalibrate, cal.Warnings[len(cal.Warnings)-1])
		}
		return cal, ErrCalibrate
	}
	swl, sw := weightedLogRatio(parts)
	lf := swl / sw
	if channelOnly {
		var err error
		if lf, err = searchLogFactor(parts, lf); err != nil {
			return cal, err
		}
	}
	cal.Factor = math.Exp(lf)
	if n := len(parts); n > 1 {
		ssr := calibrationSSR(parts, lf)
		// Weights normalised to mean one, as in Fit.
		s := math.Sqrt(ssr * float64(n) / sw / float64(n-1))
		cal.StandardErrorPercent = 100 * math.Sinh(s)
		cal.FactorStandardErrorPercent = 100 * math.Sinh(math.Sqrt(ssr/float64(n-1)/calibrationLeverage(parts, lf)))
	}
	return cal, nil
}

// calibrationLeverage is Σwᵢgᵢ² at ln f = lf, with gᵢ = ∂ln Qᵢ/∂ln f the
// share of gauging i's computed discharge that the scaled subsections
// carry (its sign dropped: it is squared).
func calibrationLeverage(parts []calibrationPart, lf float64) float64 {
	f := math.Exp(lf)
	var s float64
	for _, p := range parts {
		g := (p.qs / f) / (p.qs/f + p.qo)
		s += p.w * g * g
	}
	return s
}

// hasOverbanks reports a subsection of c outside the channel.
func hasOverbanks(c rating.HydraulicCurve) bool {
	has := false
	for _, s := range c.Geometry.Subsections() {
		if s.Region != subdivide.Channel {
			has = true
		}
	}
	return has
}

// calibrationPart is a gauging's share of the best factor: the discharge
// qs of the scaled subsections and qo of the others at the survey's n,
// the measured qm, the rated discharge and the weight w.
type calibrationPart struct{ qs, qo, qm, rated, w float64 }

// nPointOf back-calculates one gauging's factor on n: its point, its
// part in the best factor (nil when it has none or is left out of it),
// and a warning when it gets no factor. The error is c's at its gauge
// height.
func nPointOf(g Gauging, c rating.HydraulicCurve, scaled rating.ScaledN, sel Selection) (NPoint, *calibrationPart, string, error) {
	pt := NPoint{Gauging: g, Factor: math.NaN(), N: math.NaN(), Rated: math.NaN(), Subsection: -1}
	r, err := c.Row(g.Stage)
	if err != nil {
		return pt, nil, "", errorf("%s: gauge height %g: %w", g.label(), g.Stage, err)
	}
	pt.Rated = r.Discharge
	pt.aboveEnds = r.ExtendedLeft > 0 || r.ExtendedRight > 0
	var qs, qo, kmax float64
	for i, s := range r.Subs {
		if scaled.Scales(s.Region) {
			qs += s.Discharge
			if s.Conveyance > kmax {
				kmax, pt.Subsection = s.Conveyance, i
			}
		} else {
			qo += s.Discharge
		}
	}
	switch {
	case !(g.Discharge > 0):
		return pt, nil, sayf("%s: zero discharge: left out of the calibration", g.label()), nil
	case !(qs > 0):
		return pt, nil, sayf("%s: gauge height %g: the scaled subsections are dry: no factor on n", g.label(), g.Stage), nil
	case !(g.Discharge > qo):
		return pt, nil, sayf("%s: the measured %g is not above the %g the unscaled subsections carry: no factor on the channel's n fits", g.label(), g.Discharge, qo), nil
	}
	pt.Factor = qs / (g.Discharge - qo)
	pt.N = pt.Factor * r.Subs[pt.Subsection].N
	if sel.Reason(g) != "" {
		return pt, nil, "", nil
	}
	w := 1 / (g.LogSigma() * g.LogSigma())
	return pt, &calibrationPart{qs: qs, qo: qo, qm: g.Discharge, rated: r.Discharge, w: w}, "", nil
}

// weightedLogRatio returns Σwᵢ·ln(Qrᵢ/Qmᵢ) and Σwᵢ over the parts: their
// ratio is the best ln f when every n is scaled.
func weightedLogRatio(parts []calibrationPart) (swl, sw float64) {
	for _, p := range parts {
		swl += p.w * math.Log(p.rated/p.qm)
		sw += p.w
	}
	return swl, sw
}

// calibrationSSR is Σwᵢ·(ln Qmᵢ − ln(Qsᵢ/f + Qoᵢ))² at ln f = lf.
func calibrationSSR(parts []calibrationPart, lf float64) float64 {
	f := math.Exp(lf)
	var s float64
	for _, p := range parts {
		d := math.Log(p.qm) - math.Log(p.qs/f+p.qo)
		s += p.w * d * d
	}
	return s
}

// searchLogFactor minimises calibrationSSR over ln f by Nelder–Mead from
// lf, returning lf itself unless the search does better.
func searchLogFactor(parts []calibrationPart, lf float64) (float64, error) {
	res, err := optimize.Minimize(optimize.Problem{Func: func(x []float64) float64 { return calibrationSSR(parts, x[0]) }},
		[]float64{lf}, &optimize.Settings{
			Converger:       &optimize.FunctionConverge{Relative: fitRelTol, Iterations: fitStall},
			MajorIterations: 5000,
		}, &optimize.NelderMead{SimplexSize: 0.05})
	if res == nil {
		return lf, errorf("calibration: %w", err)
	}
	if res.F <= calibrationSSR(parts, lf) {
		return res.X[0], nil
	}
	return lf, nil
}
