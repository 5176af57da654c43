package plotting

import (
	"io"
	"math"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
)

// TestFitTableRedrawn: a fit's table redrawn (its rows as
// survey.FitRowsFromTable reads them) is laid out as the fit's own
// figure lays out its table (fitRowsPlot): the fitted rows extrapolated
// where they rest on no gauging, the conveyance-slope rows as the
// extension from the row below them, both bands, each named, and the
// log–log panel's zero flow where the rows start to flow. Without its
// rows the table is one plain curve, as before.
func TestFitTableRedrawn(t *testing.T) {
	nan := math.NaN()
	rows := []gauged.ControlRow{ // an invented fit's table
		{Stage: 0.15, Discharge: 0, Basis: gauged.BelowGaugings, ParametricLower: nan, ParametricUpper: nan, TotalLower: nan, TotalUpper: nan},
		{Stage: 0.3, Discharge: 0.2, Basis: gauged.BelowGaugings, ParametricLower: 0.13, ParametricUpper: 0.31, TotalLower: 0.12, TotalUpper: 0.32},
		{Stage: 1, Discharge: 8, Basis: gauged.WithinGaugings, ParametricLower: 7.6, ParametricUpper: 8.4, TotalLower: 7.4, TotalUpper: 8.6},
		{Stage: 2, Discharge: 40, Basis: gauged.WithinGaugings, ParametricLower: 38, ParametricUpper: 42, TotalLower: 37, TotalUpper: 43},
		{Stage: 3, Discharge: 95, Basis: gauged.ConveyanceSlopeAbove, ParametricLower: 86, ParametricUpper: 104, TotalLower: 84, TotalUpper: 106},
	}
	tab := rating.Table{Name: "fit", Units: rating.SI, Slope: nan, Kind: "fitted rating"}
	for _, r := range rows {
		tab.Rows = append(tab.Rows, rating.Row{Stage: r.Stage, Discharge: r.Discharge})
	}
	rp := tableRatingPlot(RatingFigures{Table: tab, ZeroFlow: nan, Fit: rows})
	if len(rp.Hydraulic.Points) != 0 {
		t.Errorf("a plain curve of %d points beside the fitted one", len(rp.Hydraulic.Points))
	}
	wantFit := []bool{true, true, false, false}
	if len(rp.Fitted.Points) != len(wantFit) {
		t.Fatalf("fitted curve of %d points, want %d", len(rp.Fitted.Points), len(wantFit))
	}
	for i, p := range rp.Fitted.Points {
		if p.Stage != rows[i].Stage || p.Extrapolated != wantFit[i] {
			t.Errorf("fitted point %d: stage %g extrapolated %v, want %g %v", i, p.Stage, p.Extrapolated, rows[i].Stage, wantFit[i])
		}
	}
	if ext := rp.Extension.Points; len(ext) != 2 || ext[0].Stage != 2 || ext[1].Stage != 3 {
		t.Errorf("extension %v, want from the row at 2 to the one at 3", ext)
	}
	if len(rp.Band) != 4 || len(rp.TotalBand) != 4 || rp.BandLabel == "" || rp.TotalBandLabel == "" {
		t.Errorf("bands of %d and %d rows, labelled %q and %q; want 4 each, named", len(rp.Band), len(rp.TotalBand), rp.BandLabel, rp.TotalBandLabel)
	}
	if rp.Fitted.Label != "fitted rating" || !rp.HasZeroFlow || rp.ZeroFlow != 0.15 {
		t.Errorf("fitted curve %q, zero flow %g (%v); want \"fitted rating\" flowing above 0.15", rp.Fitted.Label, rp.ZeroFlow, rp.HasZeroFlow)
	}
	if _, err := Rating(io.Discard, rp); err != nil {
		t.Fatal(err)
	}
	plain := tableRatingPlot(RatingFigures{Table: tab, ZeroFlow: nan})
	if len(plain.Hydraulic.Points) != len(rows) || len(plain.Fitted.Points)+len(plain.Band) != 0 {
		t.Errorf("without its fit rows: curve of %d points, fitted %d, band %d", len(plain.Hydraulic.Points), len(plain.Fitted.Points), len(plain.Band))
	}
}

// A plain rating table marking its rows above the highest gauging (an
// extrapolated column, no basis or bands: Kind blank as the reader reads
// it) is drawn with its extrapolated rows dashed but titled and labelled
// as a rating table, never as a fitted rating.
func TestPlainTableExtrapolatedNotFitted(t *testing.T) {
	nan := math.NaN()
	rows := []gauged.ControlRow{ // an invented rating, its top row above the gaugings
		{Stage: 0.25, Discharge: 0, ParametricLower: nan, ParametricUpper: nan, TotalLower: nan, TotalUpper: nan},
		{Stage: 1, Discharge: 5.3, ParametricLower: nan, ParametricUpper: nan, TotalLower: nan, TotalUpper: nan},
		{Stage: 3, Discharge: 47, Basis: gauged.FitAboveGaugings, ParametricLower: nan, ParametricUpper: nan, TotalLower: nan, TotalUpper: nan},
	}
	tab := rating.Table{Name: "r", Units: rating.SI, Slope: nan}
	for _, r := range rows {
		tab.Rows = append(tab.Rows, rating.Row{Stage: r.Stage, Discharge: r.Discharge})
	}
	rp := tableRatingPlot(RatingFigures{Table: tab, ZeroFlow: 0.25, Fit: rows})
	if rp.What != "" || strings.Contains(rp.Subtitle, "fitted") || rp.Fitted.Label != "rating table" {
		t.Errorf("what %q, subtitle %q, curve %q; want a rating table", rp.What, rp.Subtitle, rp.Fitted.Label)
	}
	if n := len(rp.Fitted.Points); n == 0 || !rp.Fitted.Points[n-1].Extrapolated || rp.Fitted.Points[0].Extrapolated {
		t.Errorf("points %v: want the top row alone extrapolated", rp.Fitted.Points)
	}
}
