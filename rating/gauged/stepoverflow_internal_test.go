package gauged

import (
	"math"
	"testing"
)

// A control of large exponent whose power (h − B)^C overflows just
// above its range is no step. The controls are those a least-squares fit
// of the Patuxent gaugings (testdata/reference/gaugings-01594440.csv,
// USGS 01594440) with breakpoints 7 and 12 ft reached before the fit
// refused a runaway exponent: control 2 has C = 122 and, by continuity,
// B = −323.5 ft, so (12.0001 + 323.5)^122 exceeds the largest float
// (10^308) and the discharge carried on was +Inf, once read as a step
// "from 3499 to 3499 ft3/s (×0)". In logarithms it is
// ln A + C·ln(h − B), finite, and the rating rises by its slope only
// over 0.1 mm.
func TestBreakStepsIgnoreOverflow(t *testing.T) {
	r, err := NewRating([]Control{
		{A: 41.573494468314564, B: 2.2476576691976575, C: 1.6681347700118045},
		{A: 1.9463273855099213e-305, C: 122.04898228005001, From: 7},
		{A: 11.598709945016145, C: 2.4731824118218526, From: 12},
	})
	if err != nil {
		t.Fatal(err)
	}
	if q := r.upTo(1, 12+StepProbe); !math.IsInf(q, 1) {
		t.Fatalf("control 2 carried to 12.0001 ft gives %g: the case needs the overflow", q)
	}
	d := &data{h: []float64{11.9, 12.1}, sigma: []float64{0.05 / CoverageFactor95, 0.05 / CoverageFactor95}}
	f := &ControlFit{Rating: r, d: d}
	if s := f.BreakSteps(); len(s) != 0 {
		t.Errorf("steps %+v, want none", s)
	}
	if w := f.stepWarnings(); len(w) != 0 {
		t.Errorf("warnings %q", w)
	}
	if l := r.logUpTo(1, 12+StepProbe); math.Abs(l-math.Log(r.Discharge(12))) > 1e-3 {
		t.Errorf("ln Q of control 2 at 12.0001 ft = %g, want about ln %g", l, r.Discharge(12))
	}
}
