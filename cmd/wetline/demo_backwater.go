package main

import (
	"fmt"
	"io"
	"math"

	"wetline/plotting"
	"wetline/rating"
	"wetline/rating/reach"
	"wetline/survey"
	"wetline/survey/results"
)

// The step-backwater part of the demo: the Tallow Creek reach around the
// gauge (the sections the batch step copied into tallow-reach/).
const (
	demoBWReach  = "tallow-reach.csv"
	demoBWReport = "tallow-backwater"
	demoBWAt     = "XS-1" // the gauge section
	// The ladder of discharges, m³/s, and the flood whose marks verify
	// the reach.
	demoBWFrom, demoBWTo, demoBWStep = 2.0, 60.0, 2.0
	demoBWVerify                     = 38.0
)

// backwater writes the reach table around the gauge and its step-backwater
// report, the rating at the gauge as a rating table, and the figures: the
// profiles, and the backwater rating beside the uniform-flow rating of the
// gauge section at the demo slope.
func (d *demo) backwater() error {
	if err := d.copy(demoBWReach, "reach table around the gauge: distances, flow lengths by path, marks of the 9 February flood"); err != nil {
		return err
	}
	if err := d.e.files.Commit(); err != nil {
		return err
	}
	qs, err := rating.StageRange(demoBWFrom, demoBWTo, demoBWStep)
	if err != nil {
		return err
	}
	opt := reach.BackwaterReportOptions{Backwater: reach.BackwaterOptions{At: demoBWAt}, Verify: demoBWVerify}
	rep, err := backwater(d.path(demoBWReach), "", qs, reach.Boundary{Kind: reach.NormalDepth, Slope: demoSlope}, "", opt, survey.ReachOptions{MarksOptional: true}, false)
	if err != nil {
		return err
	}
	uniform, err := d.rateSurvey(d.path(demoSurvey), "", false)
	if err != nil {
		return err
	}
	for _, o := range []struct {
		name, what string
		write      func(io.Writer, reach.BackwaterReport) error
	}{
		{demoBWReport + ".txt", fmt.Sprintf("step-backwater report: %d profiles from normal depth at XS-3, rating at the gauge, verification", len(qs)), results.WriteBackwaterText},
		{demoBWReport + ".json", "the same report as JSON", results.WriteBackwaterJSON},
		{"tallow-xs1-backwater-rating.csv", "the backwater rating at the gauge as a rating table (for plot and fit)", results.WriteBackwaterCSV},
	} {
		if err := d.put(o.name, o.what, func(w io.Writer) error { return o.write(w, rep) }); err != nil {
			return err
		}
	}
	compare := uniformCurve(uniform.Table, demoBWTo)
	figs, w, err := plotting.DrawBackwater(plotting.BackwaterFigures{Site: demoSite, Base: demoBWReport, Report: rep,
		Compare: []plotting.Curve{compare}})
	if err != nil {
		return err
	}
	if err := d.figures(figs); err != nil {
		return err
	}
	dep, err := uniformDeparture(rep, demoSlope)
	if err != nil {
		return err
	}
	d.list = append(d.list, "  "+dep)
	if v := rep.Verification; v != nil {
		d.list = append(d.list, fmt.Sprintf("  the 9 February marks (%g m3/s) lie within %.3f m of the computed profile (mean departure %+.3f m)",
			v.Discharge, math.Abs(v.MaxDeparture), v.MeanDeparture))
	}
	d.warn(append(rep.Warnings, w...))
	return nil
}

// uniformCurve is the uniform-flow rating of a table up to a little above
// discharge qmax, as a curve to compare.
func uniformCurve(t rating.Table, qmax float64) plotting.Curve {
	c := plotting.Curve{Label: fmt.Sprintf("uniform flow at slope %g (tallow-xs1-rating.csv)", t.Slope)}
	for _, r := range t.Rows {
		c.Points = append(c.Points, plotting.RatingPoint{Stage: r.Stage, Discharge: r.Discharge})
		if r.Discharge > qmax {
			break
		}
	}
	return c
}

// uniformDeparture says how far the backwater rating stands from uniform
// flow at the section's own normal stages at slope s (rating.NormalStages),
// over the discharges computed.
func uniformDeparture(rep reach.BackwaterReport, s float64) (string, error) {
	rt := rep.Result.Rating
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, rd := range rt.Rows {
		roots, err := rating.NormalStages(rt.Geometry, rd.Discharge, rating.Options{Slope: s, Geometry: rt.GeometryOptions})
		if err != nil {
			return "", err
		}
		d := rd.Stage - roots[len(roots)-1].Stage
		lo, hi = math.Min(lo, d), math.Max(hi, d)
	}
	return fmt.Sprintf("at the gauge the backwater rating stands %+.2f to %+.2f m from uniform flow at slope %g", lo, hi, s), nil
}
