package gauged

import (
	"math"
	"sort"

	"wetline/rating"
)

// StepProbe is how far above a breakpoint (length unit: 0.1 mm, or
// 0.0001 ft, finer than any gauge is read) a fitted rating is set against
// the rating below carried on, to find a step there (see BreakSteps).
const StepProbe = 1e-4

// BreakStep is a step of a fitted rating at one of its breakpoints.
type BreakStep struct {
	// Control is the control (1-based) that starts at the breakpoint
	// Stage (gauge height, length unit).
	Control int
	Stage   float64
	// Below is the discharge of the controls below at the breakpoint,
	// Above the rating's discharge StepProbe above it, and Carried the
	// controls below carried on to that stage (discharge unit).
	Below, Above, Carried float64
	// Ratio is Above/Carried; Limit is the 95 % uncertainty of the
	// gaugings either side (the larger of the nearest fitted gauging below
	// the breakpoint and the nearest above, as a fraction) that the step
	// exceeds.
	Ratio, Limit float64
}

// BreakSteps returns the breakpoints at which the fit's rating steps: where
// StepProbe above the breakpoint its discharge departs from the controls
// below carried on by more than the 95 % uncertainty U of the gaugings
// either side, |ln(Above/Carried)| > ln(1 + U). NewRating makes a rating
// continuous at every breakpoint in form, but a replacing control whose
// exponent tends to zero puts its offset B = κ − (Q(κ)/A)^(1/C) within a
// hair of its breakpoint κ, and an added control of such an exponent adds
// nearly A at once: the rating then rises by a factor within a fraction of
// a millimetre, a step no channel makes. A continuous rating changes over
// StepProbe by its slope only (0.02 % for Q ∝ (h − B)² with h − B = 1 m).
// Both discharges are compared in logarithms, ln A + C·ln(h − B), so
// that a control of large exponent whose power (h − B)^C overflows just
// above its range is not taken for a step.
func (f *ControlFit) BreakSteps() []BreakStep {
	r, d := f.Rating, f.d
	var out []BreakStep
	if d == nil {
		return nil
	}
	for k := 1; k < len(r.Controls); k++ {
		kappa := r.Controls[k].From
		lnAbove := r.logUpTo(k, kappa+StepProbe)
		lnCarried := r.logUpTo(k-1, kappa+StepProbe)
		if !finite(lnAbove) || !finite(lnCarried) {
			continue
		}
		s := BreakStep{Control: k + 1, Stage: kappa, Below: r.upTo(k-1, kappa), Above: math.Exp(lnAbove), Carried: math.Exp(lnCarried),
			Ratio: math.Exp(lnAbove - lnCarried)}
		s.Limit = nearSigma(d, kappa)
		if math.Abs(lnAbove-lnCarried) > math.Log1p(s.Limit) {
			out = append(out, s)
		}
	}
	return out
}

// nearSigma is the larger 95 % uncertainty, as a fraction (k·σ in
// ln Q), of the fitted gaugings nearest below and nearest at or above
// stage h (the one side when the other has none), k = CoverageFactor95.
func nearSigma(d *data, h float64) float64 {
	i := sort.SearchFloat64s(d.h, h)
	u := 0.0
	if i > 0 {
		u = d.sigma[i-1]
	}
	if i < len(d.h) {
		u = math.Max(u, d.sigma[i])
	}
	return CoverageFactor95 * u
}

// stepWarnings words each step of BreakSteps for the fit's warnings,
// from its cause: a replacing control whose offset lies so near its
// breakpoint that over StepProbe its depth h − B grows by a large factor
// (raised to its exponent), or an added control that adds nearly its
// coefficient at once.
func (f *ControlFit) stepWarnings() []string {
	var out []string
	L, Q := f.Units.Length(), f.Units.Discharge()
	for _, s := range f.BreakSteps() {
		c := f.Rating.Controls[s.Control-1]
		depth := s.Stage - c.B
		grow := (depth + StepProbe) / depth
		how := sayf("control %d takes over from control %d as %s·(h − B)^%s with its offset B %s %s below the breakpoint, "+
			"so over those %s %s its depth h − B grows ×%s and its discharge ×%s",
			s.Control, s.Control-1, rating.PlainFigures(c.A, 4), rating.PlainFigures(c.C, 3), rating.PlainFigures(depth, 2), L,
			gh(StepProbe), L, rating.PlainFigures(grow, 3), rating.PlainFigures(math.Pow(grow, c.C), 3))
		if c.Joint == Add {
			how = sayf("control %d adds %s·(h − %s)^%s to the controls below, %s %s within those %s %s",
				s.Control, rating.PlainFigures(c.A, 4), gh(s.Stage), rating.PlainFigures(c.C, 3),
				rating.PlainFigures(s.Above-s.Carried, 4), Q, gh(StepProbe), L)
		}
		out = append(out, sayf("the rating steps at the breakpoint %s %s: %s %s above it, it gives %s %s where the controls below, carried on, give %s %s (×%s), "+
			"more than the %s %% uncertainty (95 %%) of the gaugings either side: %s; the rating is continuous there in form only, "+
			"and one that steps is not one to use: move or drop the breakpoint, or fit fewer controls",
			gh(s.Stage), L, gh(StepProbe), L, rating.PlainFigures(s.Above, 4), Q, rating.PlainFigures(s.Carried, 4), Q,
			rating.PlainFigures(s.Ratio, 3), rating.PlainFigures(100*s.Limit, 2), how))
	}
	return out
}
