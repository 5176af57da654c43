package gauged

import (
	"errors"
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
	// Outside counts the departures outside their quality bands, of the
	// gaugings summarised: every one after Compare, those a fit's
	// selection keeps in a Report (see LeftOut).
	Outside int
	// MeanLogDeparturePercent is the geometric mean departure of the
	// gaugings summarised with discharge above zero,
	// 100·(exp(mean ln(Q/Qr)) − 1).
	MeanLogDeparturePercent float64
	// LeftOut counts the gaugings left out of the summary (Outside,
	// MeanLogDeparturePercent, Compared): in a Report those the selection
	// leaves out of the fit and the calibration (Selection.Reason), so
	// that the summary speaks of the same gaugings; Residuals still holds
	// every one.
	LeftOut int
	// left marks the residuals left out of the summary.
	left []bool
	// Warnings are facts a reviewer should see.
	Warnings []string
}

// Compared counts the gaugings that have a rated discharge to be compared
// with (the others lie beyond the hydraulic rating).
func (c Comparison) Compared() int {
	n := 0
	for i, r := range c.Residuals {
		if !c.isLeft(i) && !math.IsNaN(r.Fitted) {
			n++
		}
	}
	return n
}

// Compare measures every gauging against the hydraulic rating c: the rated
// discharge at its gauge height, the percent departure 100·(Q − Qr)/Qr,
// the stage shift that would make the rating pass through it, and whether
// the departure lies outside its band (see Gauging.Outside).
func Compare(gs []Gauging, c rating.HydraulicCurve) (Comparison, error) {
	cmp := Comparison{Datum: c.Datum, Residuals: make([]Residual, len(gs))}
	var errs []error
	for i, g := range gs {
		q, err := c.Discharge(g.Stage)
		if err != nil {
			errs = append(errs, errorf("%s: gauge height %g (elevation %g): %w", g.label(), g.Stage, g.Stage+c.Datum, err))
			continue
		}
		if g.Stage < c.Bottom() {
			cmp.Warnings = append(cmp.Warnings, sayf("%s: gauge height %g is below the section's lowest point (%s on the gauge): check --datum", g.label(), g.Stage, gh(c.Bottom())))
		}
		if g.Stage > c.Top() {
			cmp.Warnings = append(cmp.Warnings, sayf("%s: gauge height %g is above the lower end of the section (%s on the gauge)", g.label(), g.Stage, gh(c.Top())))
		}
		cmp.Residuals[i] = residualOf(g, q, stageOrNaN(c.Stage))
	}
	if len(errs) > 0 {
		return cmp, errors.Join(errs...)
	}
	cmp.summarise()
	return cmp, nil
}

// isLeft reports residual i left out of the summary.
func (c Comparison) isLeft(i int) bool { return i < len(c.left) && c.left[i] }

// summariseOver summarises the comparison again over the gaugings sel
// keeps (Selection.Reason is ""), as the fit and the calibration take
// them, the others counted in LeftOut.
func (cmp *Comparison) summariseOver(sel Selection) {
	cmp.left, cmp.LeftOut = make([]bool, len(cmp.Residuals)), 0
	for i, r := range cmp.Residuals {
		if sel.Reason(r.Gauging) != "" {
			cmp.left[i] = true
			cmp.LeftOut++
		}
	}
	cmp.summarise()
}

// summarise counts the residuals outside their quality band and sets the
// mean log departure, in percent, over the residuals compared (NaN when
// none was), leaving out those marked left out.
func (cmp *Comparison) summarise() {
	var sum float64
	n := 0
	cmp.Outside = 0
	for i, r := range cmp.Residuals {
		if cmp.isLeft(i) {
			continue
		}
		if r.OutsideBand {
			cmp.Outside++
		}
		if !math.IsNaN(r.LogResidual) {
			sum += r.LogResidual
			n++
		}
	}
	cmp.MeanLogDeparturePercent = math.NaN()
	if n > 0 {
		cmp.MeanLogDeparturePercent = 100 * (math.Exp(sum/float64(n)) - 1)
	}
}

// FarOffFactor is the factor by which a hydraulic rating's geometric mean
// departure from the gaugings it is compared with makes it far off, worth
// a warning before an extension or prior rests on it (a project choice:
// such a departure says more of a wrong datum, slope or n than of the
// control).
const FarOffFactor = 2

// farOffWarning words the warning of a comparison whose geometric mean
// departure lies beyond FarOffFactor either way, "" otherwise.
func (cmp Comparison) farOffWarning() string {
	m := cmp.MeanLogDeparturePercent
	if math.IsNaN(m) {
		return ""
	}
	if r := 1 + m/100; r < FarOffFactor && r > 1/float64(FarOffFactor) {
		return ""
	}
	return sayf("the hydraulic rating departs from the gaugings by %+.0f %% on their geometric mean (%d of %d compared outside their quality bands), beyond a factor of %d: "+
		"check --datum, --slope and the section's n before resting the comparison, an extension or a prior on it",
		m, cmp.Outside, cmp.Compared(), FarOffFactor)
}

// stageOrNaN turns an inverse rating into one that gives NaN where it
// has no stage.
func stageOrNaN(stage func(q float64) (float64, error)) func(float64) float64 {
	return func(q float64) float64 {
		h, err := stage(q)
		if err != nil {
			return math.NaN()
		}
		return h
	}
}
