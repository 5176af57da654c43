package gauged

import (
	"time"

	"wetline/rating"
)

// Gauging is one discharge measurement: the gauge height read during the
// measurement and the discharge measured.
type Gauging struct {
	// Time is when the measurement was made. A time written without an
	// offset is read as UTC: only the order and equality of times matter.
	Time time.Time
	// Stage is the gauge height (length unit of the unit system), read on the
	// gauge's own datum; Options.Datum relates it to survey elevations.
	Stage float64
	// Discharge is the measured discharge (discharge unit), ≥ 0.
	Discharge float64
	// Quality is the measurement's rated quality (Unrated when not given).
	Quality rating.Quality
	// Note is free text carried to reports.
	Note string
	// Source says where the gauging came from ("gaugings.csv:12"), for
	// messages; empty when built in code.
	Source string
	// Uncertainty is the measurement's expanded uncertainty at the 95 %
	// level, in percent of the discharge (> 0); 0 means none given, and the
	// quality's band stands in for it (see Gauging.LogSigma).
	Uncertainty float64
	// Exclude, when not blank, leaves the gauging out of the rating fits of
	// the controls engine (FitControls, FitBayes) and out of the shift
	// diagrams Rater.CheckGaugings proposes, and is shown as the reason;
	// the gauging still gets its departure from the rating.
	Exclude string
}

// CoverageFactor95 is the coverage factor of a 95 % expanded uncertainty
// of a normally distributed error, the normal quantile of 0.975 (ISO/IEC
// Guide 98-3:2008, Uncertainty of measurement, clause 6.3, from memory):
// a standard uncertainty is U/1.96.
const CoverageFactor95 = 1.959963984540054

// LogSigma is the gauging's standard uncertainty in ln Q: its Uncertainty,
// or else its quality's band (Quality.WeightPercent: excellent 2, good 5,
// fair 8, poor rating.PoorWeightPercent = 12 and unrated the fair band, 8:
// project choices for the two open cases), read as an expanded uncertainty
// at the 95 % level,
//
//	σ = (U/100) / 1.96,
//
// a relative error taken as an error in ln Q (first order). The convention
// follows ISO practice of stating measurement uncertainty at the 95 %
// level; the band values are the agency's measurement grades (Turnipseed &
// Sauer, 2010, USGS TM 3-A8).
func (g Gauging) LogSigma() float64 {
	u := g.Uncertainty
	if !(u > 0) {
		u = g.Quality.WeightPercent()
	}
	return u / 100 / CoverageFactor95
}

// label names a gauging in a message: its source, else its stage.
func (g Gauging) label() string {
	if g.Source != "" {
		return g.Source
	}
	return sayf("gauging at stage %g", g.Stage)
}
