package rating

import (
	"errors"
	"fmt"
	"math"
	"strconv"

	"wetline/subdivide"
)

// ShiftTolerance is the width (length unit) to which a stage is found by
// bisection when a rating is inverted (a shift, a stage for a discharge).
const ShiftTolerance = 1e-7

// shiftMaxBisect bounds the bisection steps of an inversion.
const shiftMaxBisect = 200

// shiftMaxExpand bounds how many section depths an inversion searches above
// the section's lower end (on extended ends) for a large discharge.
const shiftMaxExpand = 10

// ErrNoStageForDischarge is returned when no stage of a rating carries a discharge.
var ErrNoStageForDischarge = errors.New("no stage of the rating carries this discharge")

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

// Stage returns the gauge height at which the curve carries q > 0, by
// bisection between the bottom and the top of the section (and above the
// top, on extended ends, when the options allow), to ShiftTolerance. The
// curve is taken to rise with stage.
func (c HydraulicCurve) Stage(q float64) (float64, error) {
	if !(q > 0) || math.IsInf(q, 0) {
		return math.NaN(), fmt.Errorf("discharge %g: %w", q, ErrNoStageForDischarge)
	}
	lo, hi := c.Bottom(), c.Top()
	depth := hi - lo
	if !(depth > 0) {
		depth = 1
	}
	for i := 0; ; i++ {
		qh, err := c.Discharge(hi)
		if err != nil {
			return math.NaN(), err
		}
		if qh >= q {
			break
		}
		if i == shiftMaxExpand || c.Options.Geometry.NoExtend {
			return math.NaN(), fmt.Errorf("discharge %g is above %g at gauge height %g: %w", q, qh, hi, ErrNoStageForDischarge)
		}
		lo, hi = hi, hi+depth
	}
	for i := 0; i < shiftMaxBisect && hi-lo > ShiftTolerance; i++ {
		mid := 0.5 * (lo + hi)
		qm, err := c.Discharge(mid)
		if err != nil {
			return math.NaN(), err
		}
		if qm < q {
			lo = mid
		} else {
			hi = mid
		}
	}
	return 0.5 * (lo + hi), nil
}

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
