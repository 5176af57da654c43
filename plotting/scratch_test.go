package plotting_test

import (
	"bytes"
	"fmt"
	"math"
	"testing"
	"wetline/subdivide"

	"wetline/plotting"
)

func TestScratch(t *testing.T) {
	sv := demoSection(t)
	tab := demoTable(t, sv.Section)
	keep(t, "rating.png", draw(t, func(b *bytes.Buffer) error {
		_, err := plotting.Rating(b, plotting.RatingPlot{Site: "Tallow Creek at Mill Lane", Section: sv.Section.Name,
			Hydraulic: plotting.CurveFromTable(tab, "")})
		return err
	}))
	keep(t, "section.png", draw(t, func(b *bytes.Buffer) error {
		_, err := plotting.CrossSection(b, plotting.SectionPlot{Site: "Tallow Creek at Mill Lane", Section: sv.Section, Marks: sv.Labels,
			Water: []plotting.WaterSurface{{Stage: 102.5, Label: "bankfull", Shade: true}, {Stage: 103.4, Label: "flood"}}})
		return err
	}))
}

func TestScratch2(t *testing.T) {
	sv := demoSection(t)
	tab := demoTable(t, sv.Section)
	bf, ok := plotting.Bankfull(sv.Section)
	keep(t, "props.png", draw(t, func(b *bytes.Buffer) error {
		_, err := plotting.Properties(b, plotting.PropertiesPlot{Site: "Tallow Creek at Mill Lane", Section: sv.Section.Name,
			Rows: plotting.PropertiesFromTable(tab), Bankfull: bf, HasBankfull: ok})
		return err
	}))
}

func TestScratch3(t *testing.T) {
	sv := demoSection(t)
	tab := demoTable(t, sv.Section)
	var secs []plotting.ReachSection
	for i, d := range []float64{0, 85, 190} {
		var g []subdivide.Point
		for _, p := range sv.Section.Points {
			g = append(g, subdivide.Point{Station: p.Station*(1+0.1*float64(i)) + 3*float64(i), Elevation: p.Elevation - 0.0015*d + 0.2*float64(i%2)})
		}
		ws := 103.2 - 0.0016*d
		secs = append(secs, plotting.ReachSection{ID: fmt.Sprintf("XS-%d", i+1), Distance: d, Ground: g, WaterSurface: ws,
			VelocityHead: 0.08 + 0.02*float64(i),
			Marks:        []plotting.HighWaterMark{{Side: "left", Elevation: ws + 0.04}, {Side: "right", Elevation: ws - 0.05}}})
	}
	rp := plotting.ReachPlot{Site: "Tallow Creek", Reach: "Mill Lane reach", Sections: secs}
	keep(t, "reach.png", draw(t, func(b *bytes.Buffer) error { _, err := plotting.ReachProfile(b, rp); return err }))
	keep(t, "reachxs.png", draw(t, func(b *bytes.Buffer) error { _, err := plotting.ReachSections(b, rp); return err }))
	// A fitted curve with a band and gaugings, some below zero flow.
	var fit plotting.Curve
	var band []plotting.BandPoint
	for _, r := range tab.Rows {
		q := 14 * math.Pow(math.Max(r.Stage-100.35, 0), 1.9)
		fit.Points = append(fit.Points, plotting.RatingPoint{Stage: r.Stage, Discharge: q, Extrapolated: r.Stage > 103})
		band = append(band, plotting.BandPoint{Stage: r.Stage, Low: q * 0.9, High: q * 1.1})
	}
	gs := []plotting.Gauging{{100.2, 0.01, "poor"}, {100.6, 1.2, "good"}, {101.0, 5.5, "excellent"}, {101.5, 14, "fair"}, {102.1, 38, "good"}, {102.6, 70, ""}, {102.9, 96, "poor"}}
	keep(t, "rating2.png", draw(t, func(b *bytes.Buffer) error {
		res, err := plotting.Rating(b, plotting.RatingPlot{Site: "Tallow Creek at Mill Lane", Section: sv.Section.Name,
			Subtitle: "hydraulic rating at slope 0.0012 against invented gaugings", Hydraulic: plotting.CurveFromTable(tab, ""), Fitted: fit, Band: band, Gaugings: gs})
		t.Log(res)
		return err
	}))
}
