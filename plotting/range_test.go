package plotting_test

import (
	"errors"
	"io"
	"math"
	"strings"
	"testing"

	"wetline/plotting"
)

// TestUndrawableRanges draws values at the ends of a float64: a panel
// whose axis span overflows is left out with a warning (or, when no
// other panel is left, the figure is refused with ErrRange), and one
// that reaches the largest float64 is drawn; neither may loop.
func TestUndrawableRanges(t *testing.T) {
	small := plotting.Size{Width: 400, Height: 300, DPI: 72}
	nan := math.NaN()
	rows := func(area, k [3]float64) []plotting.PropertyRow {
		var out []plotting.PropertyRow
		for i, h := range []float64{100.5, 101, 101.5} {
			out = append(out, plotting.PropertyRow{Stage: h, Area: area[i], TopWidth: nan, HydraulicRadius: nan,
				Conveyance: k[i], Alpha: nan, MeanVelocity: nan})
		}
		return out
	}
	for _, tc := range []struct {
		name    string
		rows    []plotting.PropertyRow
		err     error  // nil: drawn
		warning string // in a warning of a drawn figure
	}{
		{"largest float64", rows([3]float64{nan, nan, nan}, [3]float64{100, math.MaxFloat64, 900}), nil, ""},
		{"span overflows beside a good panel", rows([3]float64{2, 5, 9}, [3]float64{100, 1e308, -1e308}),
			nil, "Conveyance K: values span a range that cannot be drawn; panel left out"},
		{"span overflows alone", rows([3]float64{nan, nan, nan}, [3]float64{100, 1e308, -1e308}), plotting.ErrRange, ""},
		{"infinite span", rows([3]float64{nan, nan, nan}, [3]float64{-math.MaxFloat64, 0, math.MaxFloat64}), plotting.ErrRange, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			res, err := plotting.Properties(io.Discard, plotting.PropertiesPlot{Size: small, Rows: tc.rows})
			switch {
			case tc.err != nil && !errors.Is(err, tc.err):
				t.Fatalf("err %v, want %v", err, tc.err)
			case tc.err == nil && err != nil:
				t.Fatalf("err %v", err)
			}
			if tc.warning != "" && !strings.Contains(strings.Join(res.Warnings, "\n"), tc.warning) {
				t.Errorf("warnings %q, want %q", res.Warnings, tc.warning)
			}
		})
	}
}

// TestUndrawableRatingRange refuses a rating figure whose discharges
// span more than a float64 holds (ErrRange), rather than drawing it.
func TestUndrawableRatingRange(t *testing.T) {
	_, err := plotting.Rating(io.Discard, plotting.RatingPlot{Size: plotting.Size{Width: 400, Height: 300, DPI: 72},
		Hydraulic: plotting.Curve{Points: []plotting.RatingPoint{{Stage: -1e308, Discharge: 1}, {Stage: 1e308, Discharge: 5}}}})
	if !errors.Is(err, plotting.ErrRange) {
		t.Fatalf("err %v, want ErrRange", err)
	}
}
