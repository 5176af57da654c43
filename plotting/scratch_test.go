package plotting_test

import (
	"bytes"
	"testing"

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
