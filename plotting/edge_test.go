package plotting_test

import (
	"io"
	"math"
	"testing"

	"wetline/plotting"
	"wetline/rating"
	"wetline/subdivide"
)

// TestEdgeCases draws degenerate but legal inputs: each must draw or
// return an error, never panic.
func TestEdgeCases(t *testing.T) {
	small := plotting.Size{Width: 400, Height: 300, DPI: 72}
	nan := math.NaN()
	for _, tc := range []struct {
		name string
		draw func() error
	}{
		{"one-row properties", func() error {
			_, err := plotting.Properties(io.Discard, plotting.PropertiesPlot{Size: small,
				Rows: []plotting.PropertyRow{{Stage: 1, Area: 2, TopWidth: 3, HydraulicRadius: 0.5, Conveyance: 9, Alpha: 1, MeanVelocity: nan}}})
			return err
		}},
		{"undefined properties", func() error {
			_, err := plotting.Properties(io.Discard, plotting.PropertiesPlot{Size: small,
				Rows: []plotting.PropertyRow{{Stage: 1, Area: nan, TopWidth: nan, HydraulicRadius: nan, Conveyance: nan, Alpha: nan, MeanVelocity: nan}}})
			if err == nil {
				t.Error("no error for a table without values")
			}
			return nil
		}},
		{"one-point curve", func() error {
			_, err := plotting.Rating(io.Discard, plotting.RatingPlot{Size: small, Units: rating.US,
				Hydraulic: plotting.Curve{Points: []plotting.RatingPoint{{Stage: 3, Discharge: 4}}}, ZeroFlow: 2, HasZeroFlow: true})
			return err
		}},
		{"equal discharges", func() error {
			_, err := plotting.Rating(io.Discard, plotting.RatingPlot{Size: small,
				Gaugings: []plotting.Gauging{{Stage: 3, Discharge: 4}, {Stage: 3, Discharge: 4}}, ZeroFlow: 2, HasZeroFlow: true})
			return err
		}},
		{"huge and tiny discharges", func() error {
			_, err := plotting.Rating(io.Discard, plotting.RatingPlot{Size: small,
				Hydraulic: plotting.Curve{Points: []plotting.RatingPoint{{Stage: 0, Discharge: 0}, {Stage: 1e-6, Discharge: 1e-12}, {Stage: 1e4, Discharge: 1e12}}}})
			return err
		}},
		{"flat section", func() error {
			_, err := plotting.CrossSection(io.Discard, plotting.SectionPlot{Size: small,
				Section: subdivide.Section{Points: []subdivide.Point{{Station: 0, Elevation: 5}, {Station: 10, Elevation: 5}}},
				Water:   []plotting.WaterSurface{{Stage: 5, Shade: true}, {Stage: 6, Shade: true}, {Stage: nan}}})
			return err
		}},
		{"water far above the ends", func() error {
			_, err := plotting.CrossSection(io.Discard, plotting.SectionPlot{Size: small,
				Section: subdivide.Section{Points: []subdivide.Point{{Station: 0, Elevation: 2}, {Station: 5, Elevation: 0}, {Station: 10, Elevation: 2}},
					N: []float64{0.03, 0.05}},
				Water: []plotting.WaterSurface{{Stage: 40, Shade: true}}, Geometry: subdivide.Options{}})
			return err
		}},
		{"single reach section", func() error {
			r := plotting.ReachPlot{Size: small, Sections: []plotting.ReachSection{{ID: "only", Bed: 1, WaterSurface: 2,
				Marks: []plotting.HighWaterMark{{Side: "middle", Elevation: 2.1}, {Side: plotting.Left, Elevation: nan}}}}}
			if _, err := plotting.ReachProfile(io.Discard, r); err != nil {
				return err
			}
			r.Sections[0].Ground = []subdivide.Point{{Station: 0, Elevation: 3}, {Station: 1, Elevation: 1}, {Station: 2, Elevation: 3}}
			_, err := plotting.ReachSections(io.Discard, r)
			return err
		}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if err := tc.draw(); err != nil {
				t.Fatal(err)
			}
		})
	}
}
