package survey

import (
	"errors"
	"math"
	"testing"

	"wetline/rating/gauged"
)

// TestFitRowsFromTable reads back what a fit's table says of its rows:
// the basis column (as survey/results writes it), else the extrapolated
// column, the bands (an older table's lower_95 and upper_95 as the band
// of the relation), nothing for a plain table, and a basis no fit writes
// refused at its cell.
func TestFitRowsFromTable(t *testing.T) {
	nan := math.NaN()
	for _, tc := range []struct {
		name, body string
		bases      []gauged.Basis
		band       [][4]float64 // parametric and total bounds of each row
		plain      bool
		err        error
		row, col   int
	}{
		{name: "written by fit",
			body: "stage,discharge,extrapolated,basis,lower_95,upper_95,hydraulic,parametric_lower_95,parametric_upper_95,total_lower_95,total_upper_95,gauged_multiple\n" +
				"0.2,0,true,fit below gaugings,,,0,,,,,\n0.5,1.5,false,fit,1.4,1.6,1.2,1.4,1.6,1.3,1.7,\n1,6,true,conveyance-slope,5,7,5.5,5,7,4.5,7.5,1.5\n",
			bases: []gauged.Basis{gauged.BelowGaugings, gauged.WithinGaugings, gauged.ConveyanceSlopeAbove},
			band:  [][4]float64{{nan, nan, nan, nan}, {1.4, 1.6, 1.3, 1.7}, {5, 7, 4.5, 7.5}}},
		{name: "extrapolated column only, older band columns",
			body:  "stage,discharge,extrapolated,lower_95,upper_95\n0.2,0,yes,,\n0.5,1.5,no,1.4,1.6\n1,6,yes,5,7\n",
			bases: []gauged.Basis{gauged.BelowGaugings, gauged.WithinGaugings, gauged.FitAboveGaugings},
			band:  [][4]float64{{nan, nan, nan, nan}, {1.4, 1.6, nan, nan}, {5, 7, nan, nan}}},
		{name: "plain table", body: "stage,discharge\n0.2,0\n0.5,1.5\n", plain: true},
		{name: "unknown basis", body: "stage,discharge,basis\n0.2,0,fit\n0.5,1.5,guessed\n", err: ErrFitBasis, row: 3, col: 3},
		{name: "bad bound", body: "stage,discharge,basis,total_lower_95\n0.2,0,fit,\n0.5,1.5,fit,low\n", err: ErrNotNumber, row: 3, col: 4},
	} {
		t.Run(tc.name, func(t *testing.T) {
			tab := mustCSV(t, tc.body)
			rt, err := RatingFromTable(tab, UnitChoice{})
			if err != nil {
				t.Fatal(err)
			}
			rows, err := FitRowsFromTable(tab, rt)
			if tc.err != nil {
				var pe *ParseError
				if !errors.Is(err, tc.err) || !errors.As(err, &pe) || pe.Row != tc.row || pe.Column != tc.col {
					t.Fatalf("error %v, want %v at row %d column %d", err, tc.err, tc.row, tc.col)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			if tc.plain {
				if rows != nil {
					t.Errorf("rows %v of a plain table, want none", rows)
				}
				return
			}
			if len(rows) != len(tc.bases) {
				t.Fatalf("%d rows, want %d", len(rows), len(tc.bases))
			}
			same := func(a, b float64) bool { return a == b || math.IsNaN(a) && math.IsNaN(b) }
			for i, r := range rows {
				if r.Stage != rt.Rows[i].Stage || r.Discharge != rt.Rows[i].Discharge || r.Basis != tc.bases[i] {
					t.Errorf("row %d: %g, %g, %v, want %g, %g, %v", i, r.Stage, r.Discharge, r.Basis, rt.Rows[i].Stage, rt.Rows[i].Discharge, tc.bases[i])
				}
				b := tc.band[i]
				if !same(r.ParametricLower, b[0]) || !same(r.ParametricUpper, b[1]) || !same(r.TotalLower, b[2]) || !same(r.TotalUpper, b[3]) {
					t.Errorf("row %d: bands %g–%g, %g–%g, want %v", i, r.ParametricLower, r.ParametricUpper, r.TotalLower, r.TotalUpper, b)
				}
			}
		})
	}
}
