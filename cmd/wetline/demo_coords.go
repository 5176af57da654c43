package main

import (
	"fmt"
	"io"
	"slices"

	"wetline/rating"
	"wetline/survey"
	"wetline/survey/results"
)

// The coordinate-survey part of the demo: a total-station survey across
// Larch Brook at the footbridge (invented), taken from the right-bank pin
// to the left-bank pin, with the site, date and datum in its key lines.
const (
	demoCoordSurvey  = "larch-xs-coords.csv"
	demoCoordStation = "larch-xs-stations.csv"
	demoCoordResults = "larch-xs-results.xlsx"
	demoCoordSlope   = 0.003 // water-surface slope of the invented reach, m/m
)

// coordinates writes the coordinate survey, its projection onto the line
// between the pins (for the crew to check) with the plan figure, and the
// rating computed from the coordinates directly, as a results workbook.
func (d *demo) coordinates() error {
	if err := d.copy(demoCoordSurvey, "total-station survey: easting, northing, elevation, n, pins (right bank first)"); err != nil {
		return err
	}
	if err := d.e.files.Commit(); err != nil {
		return err
	}
	pr, err := survey.Project(d.path(demoCoordSurvey), "", survey.CoordinateOptions{}, survey.UnitChoice{})
	if err != nil {
		return err
	}
	pr.Provenance.Program = program()
	proj := pr.Survey.Projection
	if err := d.put(demoCoordStation, fmt.Sprintf("the survey projected to stations along the pins' line, farthest point %.2f m off it", proj.MaxOffset),
		func(w io.Writer) error { return results.WriteProjectionCSV(w, pr) }); err != nil {
		return err
	}
	if err := drawPlan(&pr, survey.CoordinateOptions{}); err != nil {
		return err
	}
	if err := d.figures(pr.Figures); err != nil {
		return err
	}
	d.warn(pr.Warnings)
	p, err := survey.Prepare(survey.SectionRequest{Path: d.path(demoCoordSurvey)})
	if err != nil {
		return err
	}
	rep, err := rating.Rate(p.Geometry, rating.DefaultStages(p.Geometry),
		rating.RateOptions{Options: rating.Options{Slope: demoCoordSlope}, Lookup: true})
	if err != nil {
		return err
	}
	rep.Provenance = rating.Provenance{Program: program(), Inputs: p.Inputs, Site: p.Site, Notes: p.Notes}
	rep.Ground = p.Ground
	rep.Warnings = slices.Concat(p.Warnings, rep.Warnings)
	if err := drawRating(&rep, demoCoordSurvey, rep.Provenance.Site.Name); err != nil {
		return err
	}
	return d.put(demoCoordResults, fmt.Sprintf("rated from the coordinates at slope %g: summary with site and survey date, rating, lookup, figures", demoCoordSlope),
		func(w io.Writer) error { return results.WriteRatingWorkbook(w, rep) })
}
