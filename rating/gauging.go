package rating

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"time"
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
	Quality Quality
	// Note is free text carried to reports.
	Note string
	// Source says where the gauging came from ("gaugings.csv:12"), for
	// messages; empty when built in code.
	Source string
}

// label names a gauging in a message: its source, else its stage.
func (g Gauging) label() string {
	if g.Source != "" {
		return g.Source
	}
	return fmt.Sprintf("gauging at stage %g", g.Stage)
}

// Quality is the rated accuracy of a discharge measurement. The zero value
// is Unrated.
//
// The bands are the agency's measurement-quality ratings: excellent within
// 2 %, good within 5 %, fair within 8 %, poor over 8 % of the true
// discharge (U.S. Geological Survey, as stated in the reference data
// ../shared/reference/README.md; Turnipseed & Sauer, 2010, USGS TM 3-A8,
// describe the same ratings).
type Quality int

// Measurement qualities.
const (
	Unrated Quality = iota
	Excellent
	Good
	Fair
	Poor
)

// Quality bands in percent of the measured discharge.
const (
	ExcellentBandPercent = 2.0
	GoodBandPercent      = 5.0
	FairBandPercent      = 8.0
	// PoorBandPercent is the lower limit of a poor measurement's error: a
	// poor gauging's band is open above, so its departures are never flagged.
	PoorBandPercent = 8.0
	// PoorWeightPercent is the error assumed for a poor gauging when
	// weighting a fit: 1.5 times the fair band (a project choice; the agency
	// gives no upper bound).
	PoorWeightPercent = 12.0
)

// ErrQuality is returned for an unknown quality word.
var ErrQuality = errors.New("quality must be excellent, good, fair or poor (or E, G, F, P, or blank)")

// ParseQuality reads a quality word: excellent, good, fair, poor, their
// first letters, or blank for Unrated; any case.
func ParseQuality(s string) (Quality, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "":
		return Unrated, nil
	case "excellent", "e":
		return Excellent, nil
	case "good", "g":
		return Good, nil
	case "fair", "f":
		return Fair, nil
	case "poor", "p":
		return Poor, nil
	}
	return Unrated, ErrQuality
}

func (q Quality) String() string {
	switch q {
	case Excellent:
		return "excellent"
	case Good:
		return "good"
	case Fair:
		return "fair"
	case Poor:
		return "poor"
	}
	return ""
}

// BandPercent is the quality's error band in percent: 2, 5, 8, 8 (poor:
// the lower limit of an open band) and NaN for Unrated.
func (q Quality) BandPercent() float64 {
	switch q {
	case Excellent:
		return ExcellentBandPercent
	case Good:
		return GoodBandPercent
	case Fair:
		return FairBandPercent
	case Poor:
		return PoorBandPercent
	}
	return math.NaN()
}

// Outside reports whether a departure (percent) lies outside the quality's
// band. Poor and Unrated gaugings have no closed band and are never
// outside.
func (q Quality) Outside(departurePercent float64) bool {
	switch q {
	case Excellent, Good, Fair:
		return math.Abs(departurePercent) > q.BandPercent()
	}
	return false
}

// WeightPercent is the error in percent used to weight a gauging in a fit:
// the band for excellent, good and fair, PoorWeightPercent for poor, and
// the fair band for an unrated gauging (a project choice).
func (q Quality) WeightPercent() float64 {
	switch q {
	case Excellent, Good, Fair:
		return q.BandPercent()
	case Poor:
		return PoorWeightPercent
	}
	return FairBandPercent
}

// Weight is the relative weight of a gauging in a log-space fit,
// 1/σ² with σ the WeightPercent: a log residual's spread is proportional
// to the relative error of the measurement.
func (q Quality) Weight() float64 {
	s := q.WeightPercent()
	return 1 / (s * s)
}
