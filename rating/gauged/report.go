package gauged

import (
	"errors"
	"fmt"
	"math"
	"wetline/rating"
)

// Options configure a gaugings report. The zero value fits one
// power-law segment with e fitted and no section.
type Options struct {
	// Site names the site or section in reports.
	Site string
	// Units is the unit system of stages and discharges.
	Units rating.Units
	// Hydraulic is the section's hydraulic rating at gauge heights (its
	// Datum relates gauge height to elevation); nil without a section.
	Hydraulic *rating.HydraulicCurve
	// ChannelOnly back-calculates only the channel's n.
	ChannelOnly bool
	// CompareOnly compares the gaugings with the hydraulic rating and
	// fits nothing (needs Hydraulic).
	CompareOnly bool
	// ZeroFlowControl fixes e at the section's lowest point (needs
	// Hydraulic); it overrides Fit's zero-flow fields.
	ZeroFlowControl bool
	// Fit configures the power-law fit.
	Fit FitOptions
	// Table configures the lookup table (its Hydraulic is set from above).
	Table TableOptions
	// Lookup also evaluates the table's rule at every hundredth of stage
	// (Report.Lookup), for a printed lookup sheet.
	Lookup bool
}

// CurvePoint is the hydraulic rating at one gauge height.
type CurvePoint struct {
	// Stage is the gauge height (length unit).
	Stage float64
	// Hydraulic is the discharge with the survey's n; Calibrated with n
	// times the calibration factor (NaN without a calibration).
	Hydraulic, Calibrated float64
}

// Report holds everything a report on gaugings shows: the
// comparison with the hydraulic rating, the back-calculated n, the fit,
// the lookup table and the hydraulic curve, for text, JSON, CSV, workbook
// and plot writers alike. Fields that do not apply are nil.
type Report struct {
	// Site, Units and Datum (elevation of the gauge's zero in the survey's
	// datum; NaN without a section) describe the data.
	Site  string
	Units rating.Units
	Datum float64
	// Slope is the friction slope of the hydraulic rating (NaN without).
	Slope float64
	// Gaugings are the measurements, in input order.
	Gaugings []Gauging
	// Comparison and Calibration need a section.
	Comparison  *Comparison
	Calibration *Calibration
	// Fit and Table are nil in comparison-only mode.
	Fit   *Fit
	Table *FitTable
	// Curve is the hydraulic rating from the section's lowest point to its
	// lower end, at round gauge heights (nil without a section).
	Curve []CurvePoint
	// Warnings gathers the warnings of every part.
	Warnings []string
	// Hydraulic is the section's hydraulic rating the report was made
	// with (nil without a section).
	Hydraulic *rating.HydraulicCurve
	// Lookup is the table's rule at every hundredth of stage from e to the
	// table's top (see Options.Lookup); nil when not asked for.
	Lookup []FitRow
	// Provenance says what the report was computed from.
	Provenance rating.Provenance
	// Figures are the report's pictures (none until drawn).
	Figures []rating.Figure
}

// Analyze compares, calibrates and fits gaugings as opt says.
func Analyze(gs []Gauging, opt Options) (*Report, error) {
	r := &Report{Hydraulic: opt.Hydraulic, Site: opt.Site, Units: opt.Units, Datum: math.NaN(), Slope: math.NaN(), Gaugings: gs}
	c := opt.Hydraulic
	if c == nil && (opt.CompareOnly || opt.ZeroFlowControl) {
		return nil, fmt.Errorf("comparison with a hydraulic rating and e from the survey's control need a section")
	}
	if c != nil {
		r.Datum, r.Slope = c.Datum, c.Options.Slope
		cmp, err := Compare(gs, *c)
		if err != nil {
			return nil, err
		}
		r.Comparison = &cmp
		r.Warnings = append(r.Warnings, cmp.Warnings...)
		cal, err := Calibrate(gs, *c, opt.ChannelOnly)
		if err != nil && !errors.Is(err, ErrCalibrate) {
			return nil, err
		}
		r.Warnings = append(r.Warnings, cal.Warnings...)
		if err == nil {
			r.Calibration = &cal
		} else {
			r.Warnings = append(r.Warnings, err.Error())
		}
		if err := r.curve(c); err != nil {
			return nil, err
		}
	}
	if opt.CompareOnly {
		return r, nil
	}
	fo := opt.Fit
	fo.Units = opt.Units
	if opt.ZeroFlowControl {
		fo.ZeroFlowFixed, fo.ZeroFlow = true, c.Bottom()
		fo.ZeroFlowSource = "survey control (the section's lowest point)"
	}
	f, err := FitPowerLaw(gs, fo)
	if err != nil {
		return nil, err
	}
	r.Fit = f
	r.Warnings = append(r.Warnings, f.Warnings...)
	to := opt.Table
	to.Hydraulic = c
	t, err := LookupTable(f, to)
	if err != nil {
		return nil, err
	}
	r.Table = &t
	if opt.Lookup {
		r.Lookup, err = LookupRows(f, c, &t)
		if errors.Is(err, rating.ErrLookupRange) {
			r.Warnings = append(r.Warnings, fmt.Sprintf("no lookup table: %v", err))
		} else if err != nil {
			return nil, err
		}
	}
	r.Warnings = append(r.Warnings, t.Warnings...)
	return r, nil
}

// curve fills the hydraulic curve at round gauge heights.
func (r *Report) curve(c *rating.HydraulicCurve) error {
	lo, hi := c.Bottom(), c.Top()
	step := rating.NiceStep((hi - lo) / rating.MaxDefaultRows)
	hs := []float64{lo}
	for i := math.Floor(lo/step) + 1; i*step < hi; i++ {
		hs = append(hs, i*step)
	}
	hs = append(hs, hi)
	elev := make([]float64, len(hs))
	for i, h := range hs {
		elev[i] = h + c.Datum
	}
	t, err := rating.Compute(c.Geometry, elev, c.Options)
	if err != nil {
		return err
	}
	r.Warnings = append(r.Warnings, t.Warnings...)
	var ct rating.Table
	if r.Calibration != nil {
		sc := rating.ScaledN{Geometry: c.Geometry, Factor: r.Calibration.Factor, ChannelOnly: r.Calibration.ChannelOnly}
		if ct, err = rating.Compute(sc, elev, c.Options); err != nil {
			return err
		}
	}
	for i, h := range hs {
		p := CurvePoint{Stage: h, Hydraulic: t.Rows[i].Discharge, Calibrated: math.NaN()}
		if ct.Rows != nil {
			p.Calibrated = ct.Rows[i].Discharge
		}
		r.Curve = append(r.Curve, p)
	}
	return nil
}
