package rating

import (
	"math"
	"strconv"

	"wetline/subdivide"
)

// ShiftTolerance is the width (length unit) to which a stage is found by
// bisection when a rating is inverted (a shift, a stage for a discharge).
const ShiftTolerance = 1e-7

// HydraulicCurve is the hydraulic rating of a section read at gauge
// heights: the stage (elevation) for gauge height h is h + Datum.
type HydraulicCurve struct {
	// Geometry is the section.
	Geometry subdivide.Geometry
	// Options hold the slope, units and wetting options.
	Options Options
	// Datum is the elevation of the gauge's zero in the survey's datum
	// (length unit): elevation = gauge height + Datum.
	Datum float64
}

// Row returns the hydraulics at gauge height h.
func (c HydraulicCurve) Row(h float64) (Row, error) {
	w, err := c.Geometry.At(h+c.Datum, c.Options.Geometry)
	if err != nil {
		return Row{}, err
	}
	return Hydraulics(w, c.Geometry.Bottom(), c.Options.Slope, c.Options.Units)
}

// Discharge returns the hydraulic discharge at gauge height h.
func (c HydraulicCurve) Discharge(h float64) (float64, error) {
	r, err := c.Row(h)
	return r.Discharge, err
}

// Bottom is the gauge height of the section's lowest point.
func (c HydraulicCurve) Bottom() float64 { return DecimalDifference(c.Geometry.Bottom(), c.Datum) }

// Top is the gauge height of the lower end of the section.
func (c HydraulicCurve) Top() float64 { return DecimalDifference(c.Geometry.Top(), c.Datum) }

// Stage returns the gauge height at which the curve carries q in uniform
// flow at its slope: the lowest of the normal stages NormalStages finds,
// where the rating first reaches q on a rising branch. A closed conduit
// given a discharge between its full-flow and its greatest part-full one
// has a second normal stage above, on the falling branch, and a compound
// section merged into one subsection just above bankfull may have
// several; the lowest is returned, to ShiftTolerance. The
// search goes above the section's top as NormalStages' does (between
// vertical walls, unless Options.Geometry.NoExtend). The curve's
// subsections are those of its geometry (Options.Composite plays no part,
// as in Row). Errors are those of NormalStages: ErrSlope without a slope,
// ErrTarget for q not positive and finite, ErrNoRoot when no stage
// carries q.
func (c HydraulicCurve) Stage(q float64) (float64, error) {
	opt := c.Options
	opt.Composite = Split
	roots, err := NormalStages(c.Geometry, q, opt)
	if err != nil {
		return math.NaN(), err
	}
	r := roots[0]
	h := r.Stage - c.Datum
	if r.Jump {
		return h, nil
	}
	// The root is bisected on to ShiftTolerance, the width of every
	// inversion of a rating, inside the bracket its own tolerance gives
	// (it is on a rising branch: nothing flows at the lowest point).
	w := 2 * DepthTolerance * math.Max(r.Depth, ShiftTolerance)
	lo, hi := h-w, h+w
	qlo, errLo := c.Discharge(lo)
	qhi, errHi := c.Discharge(hi)
	if errLo != nil || errHi != nil || !(qlo < q && qhi >= q) {
		return h, nil
	}
	for i := 0; i < maxShiftBisect && hi-lo > ShiftTolerance; i++ {
		mid := 0.5 * (lo + hi)
		qm, err := c.Discharge(mid)
		if err != nil {
			return h, nil
		}
		if qm < q {
			lo = mid
		} else {
			hi = mid
		}
	}
	return 0.5 * (lo + hi), nil
}

// maxShiftBisect bounds the bisection steps of HydraulicCurve.Stage.
const maxShiftBisect = 64

// DatumTerm words the datum term of "elevation = gauge height ± D": "+ 10"
// or "- 10" for d = ±10 (length unit, to six significant digits; the
// caller writes the unit).
func DatumTerm(d float64) string {
	sign := "+"
	if d < 0 {
		sign, d = "-", -d
	}
	return sign + " " + strconv.FormatFloat(d, 'g', 6, 64)
}
