package main

import (
	"bytes"
	"fmt"
	"math"

	"wetline/plotting"
	"wetline/rating/gauged"
)

// fitFigures draws the rating figure of a gaugings report in memory: the
// gaugings by quality against the hydraulic rating and the fitted rating
// (extrapolated rows dashed) with its confidence band. Stages are gauge
// heights.
func fitFigures(rep *gauged.Report, site, base string) ([]figureFile, []string, error) {
	rp := plotting.RatingPlot{Site: site, Section: rep.Site, Units: rep.Units}
	var sub []string
	if rep.Curve != nil {
		c := plotting.Curve{Label: fmt.Sprintf("hydraulic rating (Manning, slope %g)", rep.Slope)}
		for _, p := range rep.Curve {
			c.Points = append(c.Points, plotting.RatingPoint{Stage: p.Stage, Discharge: p.Hydraulic})
		}
		rp.Hydraulic = c
		sub = append(sub, fmt.Sprintf("gauge heights; gauge zero at elevation %g %s", rep.Datum, rep.Units.Length()))
	}
	if t := rep.Table; t != nil {
		c := plotting.Curve{Label: "fitted rating Q = C(h − e)^b"}
		for _, r := range t.Rows {
			c.Points = append(c.Points, plotting.RatingPoint{Stage: r.Stage, Discharge: r.Discharge, Extrapolated: r.Extrapolated()})
			if !math.IsNaN(r.Lower) && !math.IsNaN(r.Upper) {
				rp.Band = append(rp.Band, plotting.BandPoint{Stage: r.Stage, Low: r.Lower, High: r.Upper})
			}
		}
		rp.Fitted = c
		rp.BandLabel = "95 % band of the fitted mean relation"
		if t.ScaleNote != "" {
			rp.Notes = append(rp.Notes, t.ScaleNote)
		}
	}
	if f := rep.Fit; f != nil {
		rp.ZeroFlow, rp.HasZeroFlow = f.ZeroFlow, true
		sub = append(sub, fmt.Sprintf("%d-segment power-law fit, standard error %.1f %%", len(f.Segments), f.StandardErrorPercent))
	}
	for _, g := range rep.Gaugings {
		rp.Gaugings = append(rp.Gaugings, plotting.Gauging{Stage: g.Stage, Discharge: g.Discharge, Quality: g.Quality.String()})
	}
	for i, s := range sub {
		if i > 0 {
			rp.Subtitle += "; "
		}
		rp.Subtitle += s
	}
	var buf bytes.Buffer
	res, err := plotting.Rating(&buf, rp)
	if err != nil {
		return nil, nil, fmt.Errorf("fit figure: %w", err)
	}
	var warnings []string
	for _, w := range res.Warnings {
		warnings = append(warnings, "fit figure: "+w)
	}
	return []figureFile{{name: base + "-fit.png", what: "gaugings against the hydraulic and fitted ratings, with the fit's band", data: buf.Bytes()}}, warnings, nil
}
