package gauged

import (
	"errors"
	"math"
	"sort"

	"gonum.org/v1/gonum/stat/distuv"

	"wetline/rating"
)

// Settings of the conveyance-slope extension.
const (
	// ConveyanceSlopeMin is the fewest gaugings the slope is fitted to.
	ConveyanceSlopeMin = 3
	// SlopeTrendLevel is the significance level of the t test of a trend
	// of ln S with stage: without a significant trend S is taken as
	// constant (it usually levels off at high stages; Kennedy, 1984).
	SlopeTrendLevel = 0.05
	// slopeFlat is the change of ln S over the upper gaugings below which
	// S is constant whatever the test says (round-off of exact data).
	slopeFlat = 1e-9
)

// SlopePoint is one gauging's effective friction slope.
type SlopePoint struct {
	// Stage is the gauge height (length unit), Discharge the measured
	// discharge and Conveyance the section's conveyance there (discharge
	// unit); Slope = (Discharge/Conveyance)² (dimensionless).
	Stage, Discharge, Conveyance, Slope float64
}

// ConveyanceSlope is the extension of a rating above the gaugings by the
// conveyance-slope method: every gauging in the upper range gives an
// effective slope S_i = (Q_i/K(h_i))², ln S is fitted against stage by
// weighted least squares (a straight line, or a constant when the trend is
// not significant) and extended, and
//
//	Q(h) = K(h)·√S(h).
//
// Because S is fitted to several gaugings, the extension does not rest on
// the top gauging alone; since K carries the survey's n, S absorbs the
// error of n as well as the friction slope.
//
// Joined to a fitted rating (Join, as a ControlTable does), the S curve is
// drawn through the fitted rating's own S at the highest gauging, h_j,
// and keeps the fitted trend of ln S:
//
//	ln S(h) = 2·ln(Q̂(h_j)/K(h_j)) + Trend·(h − h_j),
//	Q(h) = Q̂(h_j)·(K(h)/K(h_j))·exp(½·Trend·(h − h_j)),
//
// which with S level is Q̂(h_j)·K(h)/K(h_j): the rating is continuous at
// the join. Kennedy (1984) draws the S curve through the gaugings' S
// values and carries it up, the extended rating meeting the rating drawn
// through the same gaugings; taking S at the join from the fitted rating
// is that curve passing through the rating where the gaugings end, not a
// mean of them beside it (which would step the table at the join).
type ConveyanceSlope struct {
	// Points are the gaugings used, ascending in stage.
	Points []SlopePoint
	// Level reports S taken as constant (Trend 0).
	Level bool
	// LogSlope and Trend describe ln S = LogSlope + Trend·(h − Centre)
	// (Trend per length unit; Centre the weighted mean stage of the
	// points); LogSlopeSE and TrendSE are their standard errors (TrendSE
	// NaN when S is level).
	LogSlope, Trend, Centre float64
	LogSlopeSE, TrendSE     float64
	// LineTrendSE is the standard error of the trend of the straight line
	// of ln S fitted before the test, level or not (NaN with fewer than
	// two distinct stages): how far the gaugings bound a trend even when
	// S is taken as level. The joined bands widen by it (see At).
	LineTrendSE float64
	// LineTrendT is Student's FitBandLevel quantile the slope's allowance
	// takes with LineTrendSE, on LineTrendDF = n − 2 degrees of freedom
	// (n the gaugings in Points).
	LineTrendT  float64
	LineTrendDF int
	// NCV is the coefficient of variation of a factor on the overbanks' n
	// relative to the channel's (DefaultNCV) and NLogSD its σ_lnf =
	// √(ln(1 + cv²)): the joined bands widen by the change of the
	// overbanks' share of conveyance it moves (see At). Both are 0, and
	// there is no such allowance, on a reference without overbank
	// subsections: a table, or a section without bank stations (all
	// channel, its overbanks' share always 0).
	NCV, NLogSD float64
	// TrendP is the two-sided p-value of the t test of the trend (NaN
	// when ln S changes by less than slopeFlat over the points: S is then
	// taken as constant).
	TrendP float64
	// ScatterLog is the weighted standard deviation of ln S_i about the fit.
	ScatterLog float64
	// Join is where the extension meets the fitted rating (nil: not
	// joined, the gaugings' own S line is carried up).
	Join *ConveyanceJoin

	tq  float64   // Student quantile of the bands
	ref reference // the conveyance the extension rests on
}

// ConveyanceJoin is where a conveyance-slope extension meets the fitted
// rating: at the highest gauging.
type ConveyanceJoin struct {
	// Stage is the highest gauging's gauge height (length unit);
	// Discharge the fitted rating's discharge there and Conveyance the
	// section's conveyance there (discharge unit).
	Stage, Discharge, Conveyance float64
	// LogSlope is ln S at the join, 2·ln(Discharge/Conveyance): the slope
	// the fitted rating implies there (dimensionless).
	LogSlope float64
	// ParametricHalf and TotalHalf are the half-widths in ln Q of the
	// fitted rating's parametric and total 95 % bands at the join.
	ParametricHalf, TotalHalf float64
	// GaugedLogSlope is ln S of the gaugings' own line at the join, for
	// comparison with LogSlope.
	GaugedLogSlope float64
	// OverbankShare is φ_ob(h_j), the overbank subsections' share of the
	// section's conveyance at the join (0 for a table reference or a
	// section without bank stations).
	OverbankShare float64
}

// Joined returns the extension joined to a fitted rating at gauge height
// h (the highest gauging), where the rating gives discharge q with the
// parametric and total half-widths pHalf and tHalf in ln Q and the
// section has conveyance k (see ConveyanceSlope). q and k must be > 0.
//
// References:
//
//	Kennedy, E. J. (1984). Discharge ratings at gaging stations. USGS
//	TWRI 3-A10 (the conveyance-slope method: S curve drawn through the
//	gaugings' S and carried up, Q = K·√S; cited from memory).
func (s ConveyanceSlope) Joined(h, q, k, pHalf, tHalf float64) ConveyanceSlope {
	s.Join = &ConveyanceJoin{Stage: h, Discharge: q, Conveyance: k, LogSlope: 2 * math.Log(q/k),
		ParametricHalf: pHalf, TotalHalf: tHalf, GaugedLogSlope: s.gaugedLogSlopeAt(h),
		OverbankShare: s.ref.overbankShare(h)}
	return s
}

// ErrExtension is returned when the conveyance-slope extension cannot be made.
var ErrExtension = errors.New("no conveyance-slope extension")

// FitConveyanceSlope fits the conveyance-slope extension (see
// ConveyanceSlope) to gaugings with conveyances from the section's
// hydraulic rating c. stages, discharges and weights (relative, > 0) are
// the gaugings' in ascending stage. Fewer than ConveyanceSlopeMin gaugings,
// or a stage with no conveyance, is ErrExtension.
//
// References:
//
//	Kennedy, E. J. (1984). Discharge ratings at gaging stations. USGS
//	Techniques of Water-Resources Investigations, book 3, chapter A10
//	(extrapolation of rating curves: the conveyance-slope method).
func FitConveyanceSlope(c rating.HydraulicCurve, stages, discharges, weights []float64) (ConveyanceSlope, error) {
	return fitConveyanceSlope(reference{sec: &c}, stages, discharges, weights)
}

// FitConveyanceSlopeTable is FitConveyanceSlope on a hydraulic rating
// given as a table at gauge heights, which has discharges but no
// conveyance: its discharge Q_t(h) = K(h)·√S₀ stands in for the
// conveyance, so each gauging's "slope" is the ratio (Q_i/Q_t(h_i))² =
// S_i/S₀, fitted and extended as S is, and Q(h) = Q_t(h)·√(S(h)/S₀), the
// same extension as with K for a table computed at slope S₀.
//
// References:
//
//	Kennedy, E. J. (1984). Discharge ratings at gaging stations. USGS
//	TWRI 3-A10 (the conveyance-slope method).
func FitConveyanceSlopeTable(t *TableRating, stages, discharges, weights []float64) (ConveyanceSlope, error) {
	return fitConveyanceSlope(reference{tab: t}, stages, discharges, weights)
}

// fitConveyanceSlope fits the extension on the reference's conveyance.
func fitConveyanceSlope(c reference, stages, discharges, weights []float64) (ConveyanceSlope, error) {
	n := len(stages)
	if len(discharges) != n || len(weights) != n {
		panic("gauged: FitConveyanceSlope: slices of different lengths")
	}
	s := ConveyanceSlope{TrendP: math.NaN(), LineTrendSE: math.NaN(), ref: c}
	if c.hasOverbanks() {
		s.NCV, s.NLogSD = DefaultNCV, logSD(DefaultNCV)
	}
	if n < ConveyanceSlopeMin {
		return s, errorf("%w: %s in the upper range, at least %d needed", ErrExtension, rating.Counted(n, "gauging", "gaugings"), ConveyanceSlopeMin)
	}
	x, y, w := make([]float64, n), make([]float64, n), make([]float64, n)
	for i, h := range stages {
		_, k, err := c.at(h)
		if err != nil {
			return s, err
		}
		if !(k > 0) || !(discharges[i] > 0) {
			return s, errorf("%w: no conveyance or discharge at stage %g", ErrExtension, h)
		}
		sl := math.Pow(discharges[i]/k, 2)
		s.Points = append(s.Points, SlopePoint{Stage: h, Discharge: discharges[i], Conveyance: k, Slope: sl})
		x[i], y[i], w[i] = h, math.Log(sl), weights[i]
	}
	l := weightedLine(x, y, w)
	s.Centre = l.centre
	ym, trend, ss, sxx, sw := l.mean, l.trend, l.ss, l.sxx, float64(n)
	s2 := ss / float64(n-2)
	span := x[n-1] - x[0]
	if sxx > 0 {
		s.LineTrendSE = math.Sqrt(s2 / sxx)
	}
	s.LineTrendDF = n - 2
	s.LineTrendT = distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(n - 2)}.Quantile(0.5 + FitBandLevel/2)
	switch {
	case math.Abs(trend)*span <= slopeFlat:
		// No change of ln S over the points worth the name: constant.
	case s2 > 0:
		se := math.Sqrt(s2 / sxx)
		tt := trend / se
		s.TrendP = 2 * distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(n - 2)}.Survival(math.Abs(tt))
	default:
		s.TrendP = 0 // an exact line
	}
	df := n - 2
	if !(s.TrendP < SlopeTrendLevel) {
		s.Level, trend, df = true, 0, n-1
		ss = 0
		for i := range y {
			ss += w[i] * (y[i] - ym) * (y[i] - ym)
		}
		s2 = ss / float64(df)
	}
	s.LogSlope, s.Trend = ym, trend
	s.ScatterLog = math.Sqrt(s2)
	s.LogSlopeSE = s.ScatterLog / math.Sqrt(sw)
	s.TrendSE = math.NaN()
	if !s.Level {
		s.TrendSE = s.ScatterLog / math.Sqrt(sxx)
	}
	s.tq = distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(df)}.Quantile(0.5 + FitBandLevel/2)
	return s, nil
}

// lineFit is a weighted least-squares line y = mean + trend·(x − centre):
// centre and mean are the weighted means of x and y, sxx the weighted sum
// of squares of x about centre and ss that of the residuals, the weights
// normalised to mean 1.
type lineFit struct {
	centre, mean, trend, sxx, ss float64
}

// weightedLine fits a line to the points (x, y) with weights w by least
// squares; w is normalised in place to mean 1. A zero sxx (all x equal)
// gives a level line.
//
// References:
//
//	Draper, N.R., and Smith, H., 1998, Applied Regression Analysis, 3rd ed.:
//	Wiley (weighted least squares; cited from memory).
func weightedLine(x, y, w []float64) lineFit {
	n := len(x)
	var sw, sx, sy float64
	for i := range x {
		sw += w[i]
		sx += w[i] * x[i]
		sy += w[i] * y[i]
	}
	l := lineFit{centre: sx / sw, mean: sy / sw}
	for i := range w {
		w[i] *= float64(n) / sw
	}
	var sxy float64
	for i := range x {
		l.sxx += w[i] * (x[i] - l.centre) * (x[i] - l.centre)
		sxy += w[i] * (x[i] - l.centre) * (y[i] - l.mean)
	}
	if l.sxx > 0 {
		l.trend = sxy / l.sxx
	}
	for i := range x {
		r := y[i] - l.mean - l.trend*(x[i]-l.centre)
		l.ss += w[i] * r * r
	}
	return l
}

// LogSlopeAt is the fitted ln S at gauge height h: through the join when
// the extension is joined, else the gaugings' own line.
func (s ConveyanceSlope) LogSlopeAt(h float64) float64 {
	if j := s.Join; j != nil {
		return j.LogSlope + s.Trend*(h-j.Stage)
	}
	return s.gaugedLogSlopeAt(h)
}

// gaugedLogSlopeAt is the gaugings' own ln S line at gauge height h.
func (s ConveyanceSlope) gaugedLogSlopeAt(h float64) float64 {
	return s.LogSlope + s.Trend*(h-s.Centre)
}

// At returns the extension at gauge height h with conveyance k: the
// discharge K·√S(h) with its FitBandLevel parametric and prediction
// (total) bands, in ln Q since Q ∝ √S:
//
//	ln Q = ln K + ½·ln S(h).
//
// Not joined, the bands are those of the fitted line of ln S (its
// standard errors, the prediction band adding the scatter of ln S),
// half-width t·½·√(SE²(h) [+ s²]). Joined (see Joined), they start from
// the fitted rating's bands at the join, so the table is continuous
// there, and widen above it by two allowances added in quadrature to
// w_j, the fitted rating's parametric or total half-width at the join:
//
//	half-width √(w_j² + a_S² + a_n²),
//	a_S = t·½·(h − h_j)·SE(trend),
//	a_n = z·|φ_ob(h) − φ_ob(h_j)|·σ_lnf.
//
// a_S is the slope's: the gaugings bound the trend of ln S only to the
// standard error of the straight line fitted to them (LineTrendSE, t
// Student's quantile with n − 2 degrees of freedom), whether or not S is
// then taken as level. a_n is that of Manning's n off the channel: the
// extension scales the discharge at the join by K(h)/K(h_j), and a factor
// f on the overbanks' n relative to the channel's divides their
// conveyance by f, so ∂ln(K(h)/K(h_j))/∂ln f = −(φ_ob(h) − φ_ob(h_j)),
// φ_ob the overbank subsections' share of the section's conveyance; f is
// taken as log-normal with coefficient of variation DefaultNCV (as the
// priors are, after Le Coz et al., 2014), σ_lnf = √(ln(1 + cv²)) (NLogSD)
// and z the normal quantile of FitBandLevel. A table reference has no
// subsections, and a section without bank stations no overbanks: neither
// has an a_n. A k that is not > 0 gives zero discharge and
// NaN bands.
//
// References:
//
//	Le Coz, J., Renard, B., Bonnifait, L., Branger, F., Le Boursicaud, R.
//	(2014). Combining hydraulic knowledge and uncertain gaugings in the
//	estimation of hydrometric rating curves: a Bayesian approach.
//	Journal of Hydrology 509, 573–587 (n log-normal about the survey's).
//	Chow, V. T. (1959). Open-Channel Hydraulics. McGraw-Hill, eq. 6-9
//	(conveyance proportional to 1/n).
func (s ConveyanceSlope) At(h, k float64) (q, pLo, pHi, tLo, tHi float64) {
	if !(k > 0) {
		return 0, math.NaN(), math.NaN(), math.NaN(), math.NaN()
	}
	lq := math.Log(k) + 0.5*s.LogSlopeAt(h)
	var hp, ht float64
	if j := s.Join; j != nil {
		aS, aN := s.allowances(h)
		hp = math.Sqrt(j.ParametricHalf*j.ParametricHalf + aS*aS + aN*aN)
		ht = math.Sqrt(j.TotalHalf*j.TotalHalf + aS*aS + aN*aN)
	} else {
		v := s.LogSlopeSE * s.LogSlopeSE
		if !s.Level {
			v += (h - s.Centre) * (h - s.Centre) * s.TrendSE * s.TrendSE
		}
		hp = s.tq * 0.5 * math.Sqrt(v)
		ht = s.tq * 0.5 * math.Sqrt(v+s.ScatterLog*s.ScatterLog)
	}
	return math.Exp(lq), math.Exp(lq - hp), math.Exp(lq + hp), math.Exp(lq - ht), math.Exp(lq + ht)
}

// allowances returns the half-widths in ln Q that a joined extension's
// bands add at gauge height h above the join for the slope (aS) and for
// Manning's n off the channel (aN); see At. Both are 0 at or below the
// join.
func (s ConveyanceSlope) allowances(h float64) (aS, aN float64) {
	j := s.Join
	if j == nil || !(h > j.Stage) {
		return 0, 0
	}
	if se := s.LineTrendSE; se > 0 {
		aS = s.LineTrendT * 0.5 * (h - j.Stage) * se
	}
	if s.NLogSD > 0 {
		aN = bandZ * math.Abs(s.ref.overbankShare(h)-j.OverbankShare) * s.NLogSD
	}
	return aS, aN
}

// bandZ is the standard normal quantile of the FitBandLevel bands.
var bandZ = distuv.UnitNormal.Quantile(0.5 + FitBandLevel/2)

// upperGaugings returns the stages, discharges and weights of the gaugings
// the extension is fitted to: the top n of them when n > 0, else those on
// the rating's top control (at or above its breakpoint) or, with one
// control, the upper half of the gauged stages; never fewer than
// ConveyanceSlopeMin (when there are that many).
func upperGaugings(d *data, r Rating, n int) (h, q, w []float64) {
	first := 0
	switch {
	case n > 0:
		first = d.n() - n
	case len(r.Controls) > 1:
		first = sort.SearchFloat64s(d.h, r.Controls[len(r.Controls)-1].From)
	default:
		first = sort.SearchFloat64s(d.h, 0.5*(d.lo+d.hi))
	}
	first = max(0, min(first, d.n()-ConveyanceSlopeMin))
	for i := first; i < d.n(); i++ {
		h = append(h, d.h[i])
		q = append(q, math.Exp(d.y[i]))
		w = append(w, d.w[i])
	}
	return h, q, w
}
