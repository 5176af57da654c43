package results_test

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/survey/results"
)

// The console summary gives the top row's total band, says the bands are
// withheld when they are (a Bayesian run whose chains disagree), and never
// writes a band of dashes.
func TestFitSummaryBand(t *testing.T) {
	nan := math.NaN()
	for _, tc := range []struct {
		name     string
		table    gauged.ControlTable
		want     string
		notWants string
	}{
		{"band", gauged.ControlTable{Rows: []gauged.ControlRow{{Stage: 2, Discharge: 40, TotalLower: 36, TotalUpper: 44, Multiple: nan}}},
			"table to 2.000 m: 40 m3/s, total 95 % band 36 to 44", "withheld"},
		{"withheld", gauged.ControlTable{BandsWithheld: true, Rows: []gauged.ControlRow{{Stage: 2, Discharge: 40, TotalLower: nan, TotalUpper: nan, Multiple: nan}}},
			"table to 2.000 m: 40 m3/s, bands withheld (the chains disagree)", "- to -"},
		{"none", gauged.ControlTable{Rows: []gauged.ControlRow{{Stage: 2, Discharge: 40, TotalLower: nan, TotalUpper: nan, Multiple: nan}}},
			"table to 2.000 m: 40 m3/s, no total band there", "- to -"},
	} {
		rep := &gauged.Report{Units: rating.SI, Table: &tc.table}
		var b bytes.Buffer
		if err := results.WriteFitSummary(&b, rep, "out"); err != nil {
			t.Fatal(err)
		}
		if s := b.String(); !strings.Contains(s, tc.want) || strings.Contains(s, tc.notWants) {
			t.Errorf("%s: summary %q, want %q and no %q", tc.name, s, tc.want, tc.notWants)
		}
	}
}
