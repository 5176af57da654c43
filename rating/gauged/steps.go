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
func (f *ControlFit) BreakSteps() []BreakStep {
	r, d := f.Rating, f.d
	var out []BreakStep
	if d == nil {
		return nil
	}
	for k := 1; k < len(r.Controls); k++ {
		kappa := r.Controls[k].From
		above := r.Discharge(kappa + StepProbe)
		carried := r.upTo(k-1, kappa+StepProbe)
		if !(carried > 0) || !(above > 0) {
			continue
		}
		s := BreakStep{Control: k + 1, Stage: kappa, Below: r.upTo(k-1, kappa), Above: above, Carried: carried, Ratio: above / carried}
		s.Limit = nearSigma(d, kappa)
		if math.Abs(math.Log(s.Ratio)) > math.Log1p(s.Limit) {
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

// stepWarnings words each step of BreakSteps for the fit's warnings.
func (f *ControlFit) stepWarnings() []string {
	var out []string
	L, Q := f.Units.Length(), f.Units.Discharge()
	for _, s := range f.BreakSteps() {
		c := f.Rating.Controls[s.Control-1]
		how := sayf("control %d replaces control %d with exponent %s and its offset %s %s below the breakpoint",
			s.Control, s.Control-1, rating.PlainFigures(c.C, 3), rating.PlainFigures(s.Stage-c.B, 2), L)
		if s.Stage-c.B < StepProbe {
			how = sayf("control %d replaces control %d with exponent %s and its offset within %s %s below the breakpoint",
				s.Control, s.Control-1, rating.PlainFigures(c.C, 3), gh(StepProbe), L)
		}
		if c.Joint == Add {
			how = sayf("control %d adds %s·(h − %s)^%s to the controls below", s.Control, rating.PlainFigures(c.A, 4), gh(s.Stage), rating.PlainFigures(c.C, 3))
		}
		out = append(out, sayf("the rating steps at the breakpoint %s %s: from %s %s at it to %s %s %s %s above it (×%s), "+
			"more than the %s %% uncertainty (95 %%) of the gaugings either side: %s, so the rating is continuous there in form only; "+
			"a rating that steps is not one to use: move or drop the breakpoint, or fit fewer controls",
			gh(s.Stage), L, rating.PlainFigures(s.Below, 4), Q, rating.PlainFigures(s.Above, 4), Q, gh(StepProbe), L,
			rating.PlainFigures(s.Ratio, 2), rating.PlainFigures(100*s.Limit, 2), how))
	}
	return out
}
