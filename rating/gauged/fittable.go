package gauged

import (
	"errors"
	"fmt"
	"math"

	"wetline/rating"
)

// Basis says what a row of a fitted lookup table rests on.
type Basis int

// Bases of a lookup-table row. Only WithinGaugings is not extrapolated.
const (
	// WithinGaugings: the fitted curve, between the lowest and highest gauging.
	WithinGaugings Basis = iota
	// BelowGaugings: the fitted curve below the lowest gauging, down to e.
	BelowGaugings
	// HydraulicAbove: the hydraulic rating above the highest gauging,
	// scaled to meet the fitted curve there.
	HydraulicAbove
	// FitAboveGaugings: a rating of controls carried above the highest
	// gauging (its top control; for a Bayesian fit, as the posterior
	// allows). Used by ControlTable.
	FitAboveGaugings
	// ConveyanceSlopeAbove: the conveyance-slope extension above the
	// highest gauging (see ConveyanceSlope). Used by ControlTable.
	ConveyanceSlopeAbove
)

func (b Basis) String() string {
	switch b {
	case BelowGaugings:
		return "fit below gaugings"
	case HydraulicAbove:
		return "scaled hydraulic"
	case FitAboveGaugings:
		return "fit above gaugings"
	case ConveyanceSlopeAbove:
		return "conveyance-slope"
	}
	return "fit"
}

// FitRow is one row of a fitted lookup table.
type FitRow struct {
	// Stage is the gauge height (length unit); Discharge the table's value.
	Stage, Discharge float64
	// Lower and Upper bound the FitBandLevel band of the mean fitted
	// relation (NaN on hydraulic rows and where not available).
	Lower, Upper float64
	// Hydraulic is the unscaled hydraulic discharge (NaN without a section).
	Hydraulic float64
	// Basis says what the row rests on.
	Basis Basis
}

// Extrapolated reports a row outside the range of the gaugings.
func (r FitRow) Extrapolated() bool { return r.Basis != WithinGaugings }

// TableOptions configure a lookup table. The zero value lays out about
// MaxDefaultRows round stages from e to the highest gauging, or to the
// section's lower end when a hydraulic rating is given.
type TableOptions struct {
	// Step is the stage step (length unit, > 0; default a round step).
	Step float64
	// To is the highest stage (gauge height; 0 = default). It may not lie
	// above the section's lower end, nor above the highest gauging without
	// a section.
	To float64
	// Hydraulic, when set, carries the table above the highest gauging.
	Hydraulic *rating.HydraulicCurve
}

// FitTable is a compact stage–discharge lookup table from a fit.
type FitTable struct {
	// Rows ascend in stage.
	Rows []FitRow
	// ScaleFactor is the factor on the hydraulic rating above the highest
	// gauging: the fitted discharge divided by the hydraulic discharge at
	// ScaleStage, the highest gauging's gauge height (NaN without a
	// section). ScaleNote says so in words, or says that the table stops
	// at the highest gauging.
	ScaleFactor, ScaleStage float64
	ScaleNote               string
	// Warnings are facts a reviewer should see.
	Warnings []string
}

// ErrBeyondSection is returned for a table asked to go past the section's
// ends, or above the gaugings without a section to extrapolate on.
var ErrBeyondSection = errors.New("refusing to extrapolate")

// stageMerge is the fraction of a step within which a grid stage is
// dropped next to a stage the table must hold (a gauging, the top).
const stageMerge = 0.05

// LookupTable lays out the fitted rating as a table of discharge against
// gauge height (the units of f.Units). Between the lowest and highest
// gauging it is the fit, with its FitBandLevel band; below, the fit down
// to e (extrapolated rows); above, with a hydraulic rating, that rating
// times
//
//	F = Q_fit(h_top) / Q_hydraulic(h_top)
//
// at the highest gauging h_top, so that the two meet there and the shape
// above follows the section's hydraulics (the approach of extending a
// rating by a hydraulic computation described by Kennedy, 1984, USGS
// TWRI 3-A10, among the methods of extrapolating ratings, from memory); it
// stops at the section's lower end and never goes past it.
// Without a section the table ends at the highest gauging. The rows are
// e, the lowest and highest gauging, the top, and round stages of
// opt.Step (default a round step giving about rating.MaxDefaultRows rows)
// between them, ascending; a scaled hydraulic rating that falls with
// stage is warned of.
//
// Errors: ErrBeyondSection for opt.To above the top (the section's lower
// end, or the highest gauging without a section) or for a section dry at
// the highest gauging; rating.ErrStages for opt.To not above e,
// rating.ErrStepTooFine for a step giving more than rating.MaxStages rows;
// the errors of the hydraulic rating.
//
// References:
//
//	ISO 18320:2020. Hydrometry — Measurement of liquid flow in open
//	channels — Determination of the stage–discharge relationship.
//	International Organization for Standardization, Geneva.
//	Kennedy, E. J. (1984). Discharge ratings at gaging stations. U.S.
//	Geological Survey Techniques of Water-Resources Investigations,
//	Book 3, Chapter A10.
func LookupTable(f *Fit, opt TableOptions) (FitTable, error) {
	t := FitTable{ScaleFactor: math.NaN(), ScaleStage: f.HighStage}
	lo, u, c := f.ZeroFlow, f.Units, opt.Hydraulic
	top, err := t.scaleAbove(f, c)
	if err != nil {
		return t, err
	}
	if opt.To != 0 {
		if opt.To > top {
			why := "the highest gauging (give a section to extrapolate on its hydraulics)"
			if c != nil {
				why = "the section's lower end"
			}
			return t, fmt.Errorf("%w: stage %g %s is above %s at %g %s", ErrBeyondSection, opt.To, u.Length(), why, top, u.Length())
		}
		if !(opt.To > lo) {
			return t, fmt.Errorf("%w: stage %g is not above the gauge height of zero flow %g", rating.ErrStages, opt.To, lo)
		}
		top = opt.To
	}
	step := opt.Step
	if !(step > 0) || math.IsInf(step, 0) {
		step = rating.NiceStep((top - lo) / rating.MaxDefaultRows)
	}
	if (top-lo)/step > rating.MaxStages {
		return t, fmt.Errorf("%w: %.3g stages from %s to %s is more than %d", rating.ErrStepTooFine, (top-lo)/step, gh(lo), gh(top), rating.MaxStages)
	}
	for _, h := range fitTableStages(f, lo, top, step) {
		r, err := t.rule(f, c, h)
		if err != nil {
			return t, err
		}
		t.Rows = append(t.Rows, r)
	}
	if c != nil && t.ScaleFactor > 0 {
		t.warnFalling(u)
	}
	return t, nil
}

// scaleAbove sets the factor on the hydraulic rating c above the highest
// gauging and the note saying so (or that the table ends at the highest
// gauging), and returns the table's highest possible stage: c's top, or
// the highest gauging without a section or when c's top lies below it.
// The error is c's, or ErrBeyondSection when c is dry at the highest
// gauging.
func (t *FitTable) scaleAbove(f *Fit, c *rating.HydraulicCurve) (float64, error) {
	u := f.Units
	if c == nil {
		t.ScaleNote = fmt.Sprintf("no section given: the table ends at the highest gauging (%g %s), with no extrapolation above it", f.HighStage, u.Length())
		return f.HighStage, nil
	}
	ct := c.Top()
	if ct < f.HighStage {
		t.Warnings = append(t.Warnings, fmt.Sprintf(
			"the highest gauging (%g %s) is above the section's lower end (%s %s on the gauge): no extrapolation above it",
			f.HighStage, u.Length(), gh(ct), u.Length()))
		return f.HighStage, nil
	}
	qh, err := c.Discharge(f.HighStage)
	if err != nil {
		return ct, err
	}
	if !(qh > 0) {
		return ct, fmt.Errorf("%w: the section is dry at the highest gauging (%g %s): check --datum", ErrBeyondSection, f.HighStage, u.Length())
	}
	t.ScaleFactor = f.Discharge(f.HighStage) / qh
	t.ScaleNote = fmt.Sprintf(
		"above the highest gauging (%g %s) the table follows the hydraulic rating times %.4f, the fitted discharge %.4g over the hydraulic discharge %.4g %s at that gauge height",
		f.HighStage, u.Length(), t.ScaleFactor, f.Discharge(f.HighStage), qh, u.Discharge())
	return ct, nil
}

// fitTableStages returns the stages of the table from lo to top, ascending:
// the stages it must hold (lo, top, and the lowest and highest gauging
// when not above top) and the multiples of step between lo and top, less
// those within stageMerge of a step of a stage it must hold.
func fitTableStages(f *Fit, lo, top, step float64) []float64 {
	must := []float64{lo, top}
	if f.LowStage <= top {
		must = append(must, f.LowStage)
	}
	if f.HighStage <= top {
		must = append(must, f.HighStage)
	}
	return stageGrid(must, lo, top, step)
}

// warnFalling warns of the first row of the scaled hydraulic rating
// whose discharge falls below the row before.
func (t *FitTable) warnFalling(u rating.Units) {
	prev := 0.0
	for _, r := range t.Rows {
		if r.Basis == HydraulicAbove && r.Discharge < prev {
			t.Warnings = append(t.Warnings, fmt.Sprintf("the scaled hydraulic rating falls at %g %s: check the section above the gaugings", r.Stage, u.Length()))
			break
		}
		prev = r.Discharge
	}
}

// rule returns the table's row at gauge height h: the fitted curve (with
// its band) up to the highest gauging, Basis BelowGaugings below the
// lowest one, and above the highest gauging, with a section, the
// hydraulic discharge times ScaleFactor.
func (t *FitTable) rule(f *Fit, c *rating.HydraulicCurve, h float64) (FitRow, error) {
	r := FitRow{Stage: h, Hydraulic: math.NaN(), Lower: math.NaN(), Upper: math.NaN()}
	if c != nil {
		q, err := c.Discharge(h)
		if err != nil {
			return r, err
		}
		r.Hydraulic = q
	}
	switch {
	case h > f.HighStage && c != nil:
		r.Basis = HydraulicAbove
		r.Discharge = t.ScaleFactor * r.Hydraulic
	default:
		if h < f.LowStage {
			r.Basis = BelowGaugings
		}
		r.Discharge = f.Discharge(h)
		r.Lower, r.Upper = f.Band(h)
	}
	return r, nil
}

// TableEdge is how far, in length units, At accepts a stage beyond the
// table's first or last row, and ControlFit.Table a To above the
// section's lower end (round-off of a stage written in hundredths, or of
// a datum subtracted).
const TableEdge = 1e-9

// At evaluates the table's rule at any gauge height h between its first
// and last rows, exactly as LookupTable does for its own rows: f is the
// fit and c the hydraulic rating the table was laid out with (nil when
// none). It is how a finer table (every hundredth of stage, say) is made
// without interpolating between rows. A stage outside the table is an
// ErrBeyondSection error.
func (t *FitTable) At(f *Fit, c *rating.HydraulicCurve, h float64) (FitRow, error) {
	if len(t.Rows) == 0 || math.IsNaN(h) || h < t.Rows[0].Stage-TableEdge || h > t.Rows[len(t.Rows)-1].Stage+TableEdge {
		return FitRow{}, fmt.Errorf("%w: stage %g is outside the table", ErrBeyondSection, h)
	}
	return t.rule(f, c, h)
}
