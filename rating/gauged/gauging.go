package gauged

import (
	"fmt"
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
}

// label names a gauging in a message: its source, else its stage.
func (g Gauging) label() string {
	if g.Source != "" {
		return g.Source
	}
	return fmt.Sprintf("gauging at stage %g", g.Stage)
}
