package main

import (
	"encoding/json"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// TestGaugeHeightStagesAreGridValues: the stages of a table in gauge
// heights are the values it was laid out at, so a script matching stages
// finds them in JSON as the CSV writes them: the ends of rate --datum are
// the lowest point and the lower end less the datum as decimals (100.3 −
// 100 is 0.3, not 0.29999999999999716), the rows between are multiples of
// the step (0.6, not 0.6000000000000001), in rate and in fit tables.
func TestGaugeHeightStagesAreGridValues(t *testing.T) {
	t.Parallel()
	dir, _ := demoOutput(t)
	for _, tc := range []struct {
		name string
		args []string
		rows string // the JSON key of the table's rows
		skip int    // leading rows not on the grid (a fitted zero flow)
	}{
		{"rate", []string{"rate", demoSurveyPath, "--slope", "0.0012", "--datum", "100"}, "rows", 0},
		{"rate range", []string{"rate", demoSurveyPath, "--slope", "0.0012", "--datum", "100", "--step", "0.2"}, "rows", 0},
		{"fit table", []string{"fit", filepath.Join(dir, "tallow-gaugings.csv"), "--method", "lsq", "--section", demoSurveyPath, "--slope", "0.0012", "--datum", "100"}, "table", 1},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			out, errs, code := runCLI(t, append(tc.args, "--format", "json")...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			var doc map[string]json.RawMessage
			if err := json.Unmarshal([]byte(out), &doc); err != nil {
				t.Fatal(err)
			}
			var rows []struct{ Stage json.Number }
			if err := json.Unmarshal(doc[tc.rows], &rows); err != nil || len(rows) < 3 {
				t.Fatalf("%s: %d rows, %v", tc.rows, len(rows), err)
			}
			for i, r := range rows[tc.skip:] {
				// The survey's elevations and the gaugings' gauge heights
				// have at most three decimals, the datum none, the steps one.
				if _, frac, _ := strings.Cut(r.Stage.String(), "."); len(frac) > 3 {
					t.Errorf("row %d: stage %s is not the value laid out", i+tc.skip, r.Stage)
				}
			}
			first, _ := strconv.ParseFloat(rows[tc.skip].Stage.String(), 64)
			if tc.rows == "rows" && first != 0.3 {
				t.Errorf("first stage %v, want 0.3 (lowest point 100.3 less the datum 100)", first)
			}
		})
	}
}
