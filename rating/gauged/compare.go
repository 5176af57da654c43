package gauged

import (
	"errors"
	"fmt"
	"math"

	"wetline/rating"
)

// Comparison is a set of gaugings measured against a hydraulic rating.
type Comparison struct {
	// Residuals holds each gauging against the rating (Fitted is the rated
	// discharge at the gauging's gauge height), in input order.
	Residuals []Residual
	// Datum is the elevation of the gauge's zero used.
	Datum float64
	// Outside counts the departures outside their quality bands.
	Outside int
	// MeanLogDeparturePercent is the geometric mean departure of the
	// gaugings with discharge above zero, 100·(exp(mean ln(Q/Qr)) − 1).
	MeanLogDeparturePercent float64
	// Warnings are facts a reviewer should see.
	Warnings []string
}

// Compare measures every gauging against the hydraulic rating c: the rated
// discharge at its gauge height, the percent departure 100·(Q − Qr)/Qr,
// the stage shift that would make the rating pass through it, and whether
// the departure lies outside its quality band (see Quality.Outside).
func Compare(gs []Gauging, c rating.HydraulicCurve) (Comparison, error) {
	cmp := Comparison{Datum: c.Datum, Residuals: make([]Residual, len(gs))}
	var sum float64
	n := 0
	var errs []error
	for i, g := range gs {
		q, err := c.Discharge(g.Stage)
		if err != nil {
			errs = append(errs, fmt.Errorf("%s: gauge height %g (elevation %g): %w", g.label(), g.Stage, g.Stage+c.Datum, err))
			continue
		}
		if g.Stage < c.Bottom() {
			cmp.Warnings = append(cmp.Warnings, fmt.Sprintf("%s: gauge height %g is below the section's lowest point (%g on the gauge): check --datum", g.label(), g.Stage, c.Bottom()))
		}
		if g.Stage > c.Top() {
			cmp.Warnings = append(cmp.Warnings, fmt.Sprintf("%s: gauge height %g is above the lower end of the section (%g on the gauge)", g.label(), g.Stage, c.Top()))
		}
		r := residualOf(g, q, func(q float64) float64 {
			h, err := c.Stage(q)
			if err != nil {
				return math.NaN()
			}
			return h
		})
		if r.OutsideBand {
			cmp.Outside++
		}
		if !math.IsNaN(r.LogResidual) {
			sum += r.LogResidual
			n++
		}
		cmp.Residuals[i] = r
	}
	if len(errs) > 0 {
		return cmp, errors.Join(errs...)
	}
	cmp.MeanLogDeparturePercent = math.NaN()
	if n > 0 {
		cmp.MeanLogDeparturePercent = 100 * (math.Exp(sum/float64(n)) - 1)
	}
	return cmp, nil
}
