package main

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"

	"wetline/plotting"
	"wetline/survey/results"
)

// slopeAreaFigures draws the reach profile and the sections overlaid, in
// memory, for a slope-area report.
func slopeAreaFigures(rep results.SlopeAreaReport, site string) ([]figureFile, []string, error) {
	r := rep.Result
	base := "reach"
	if rep.Reach != nil {
		base = strings.TrimSuffix(filepath.Base(rep.Reach.File), filepath.Ext(rep.Reach.File))
	}
	reachName := base
	if site != "" {
		reachName = "" // the site names the reach; keep the title on one line
	}
	rp := plotting.ReachPlot{Site: site, Reach: reachName, Units: r.Units,
		Subtitle: fmt.Sprintf("%s; water surface from %s", r.Method, sideWords(rep))}
	for _, s := range r.Sections {
		rs := plotting.ReachSection{ID: s.ID, Distance: s.Distance, Ground: s.Ground, Bed: s.Bottom,
			WaterSurface: s.WaterSurface, VelocityHead: s.VelocityHead}
		if !math.IsNaN(s.Left) {
			rs.Marks = append(rs.Marks, plotting.HighWaterMark{Side: plotting.Left, Elevation: s.Left})
		}
		if !math.IsNaN(s.Right) {
			rs.Marks = append(rs.Marks, plotting.HighWaterMark{Side: plotting.Right, Elevation: s.Right})
		}
		rp.Sections = append(rp.Sections, rs)
	}
	note := fmt.Sprintf("peak discharge %s %s", sig3(r.Discharge), r.Units.Discharge())
	if u := rep.Uncertainty; u != nil {
		note += fmt.Sprintf(", 90 %% band %s to %s %s (Monte Carlo, %d draws)", sig3(u.P05), sig3(u.P95), r.Units.Discharge(), u.Draws)
	}
	rp.Notes = []string{note}
	var figs []figureFile
	var warnings []string
	for _, f := range []struct {
		suffix, what string
		draw         func(io.Writer, plotting.ReachPlot) (plotting.Result, error)
	}{
		{"profile", "reach profile: thalweg, high-water marks, water surface and energy grade line", plotting.ReachProfile},
		{"sections", "the reach's sections overlaid at their thalwegs, with water surfaces", plotting.ReachSections},
	} {
		var buf bytes.Buffer
		res, err := f.draw(&buf, rp)
		if err != nil {
			return nil, nil, fmt.Errorf("%s figure: %w", f.suffix, err)
		}
		for _, w := range res.Warnings {
			warnings = append(warnings, f.suffix+" figure: "+w)
		}
		figs = append(figs, figureFile{name: base + "-" + f.suffix + ".png", what: f.what, data: buf.Bytes()})
	}
	return figs, warnings, nil
}

// sideWords says which marks set the water surface.
func sideWords(rep results.SlopeAreaReport) string {
	switch s := fmt.Sprint(rep.Result.Side); s {
	case "left", "right":
		return "the " + s + " marks"
	}
	return "the mean of the left and right marks"
}
