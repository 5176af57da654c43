package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// A --zero-flow that lies at or above what it must lie below is one line
// naming the flag, its value, the row at fault and why, the file once.
// The demo's lowest gauging is at 0.46 m (demodata/tallow-gaugings.csv
// row 17); the first row of testdata/record/rating-a.csv is 0.40 m with
// 0.6 m3/s (row 3).
func TestZeroFlowFlagErrors(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name string
		args []string
		file string
		want []string
	}{
		{"fit above every gauging", []string{"fit", fitDemoGaugings, "--zero-flow", "5"}, "tallow-gaugings.csv",
			[]string{"fit: --zero-flow 5: 24 of the 24 gaugings used lie at or below it, the lowest demodata/tallow-gaugings.csv:17 at 0.46 m, where a rating has no discharge",
				"at or below the gauge height of zero flow"}},
		{"fit above the lowest, lsq", []string{"fit", fitDemoGaugings, "--zero-flow", "0.5", "--method", "lsq"}, "tallow-gaugings.csv",
			[]string{"fit: --zero-flow 0.5: 1 of the 24 gaugings used", "tallow-gaugings.csv:17 at 0.46 m"}},
		{"record", []string{"record", recStages, "--rating", recRatingA, "--zero-flow", "0.5"}, "rating-a.csv",
			[]string{"record: --zero-flow 0.5: ", "rating-a.csv:3:1", "above a row with flow"}},
		{"record, at the first row", []string{"record", recStages, "--rating", recRatingA, "--zero-flow", "0.40"}, "rating-a.csv",
			[]string{"record: --zero-flow 0.4: ", "rating-a.csv:3:1", "is at or above a row with flow"}},
		{"shifts, the second rating", []string{"shifts", recGaugings, "--rating", recRatingA, "--rating", recRatingB + "@2024-05-02", "--zero-flow", "0.2,0.35"}, "rating-b.csv",
			[]string{"shifts: --zero-flow 0.35: ", "rating-b.csv:3:1", "above a row with flow"}},
		{"record, with --datum", []string{"record", recStages, "--rating", recRatingA, "--datum", "0.1", "--zero-flow", "50.5"}, "rating-a.csv",
			[]string{"record: --zero-flow 50.5: ", "rating-a.csv:3:1", "above a row with flow",
				"with --datum 0.1 the table's stages less 0.1 are gauge heights, and --zero-flow is a gauge height too: elevation 50.5 is gauge height 50.4"}},
		{"compare", []string{"compare", recRatingA, recRatingB, "--zero-flow", "0.5"}, "rating-a.csv",
			[]string{"compare: --zero-flow 0.5: ", "rating-a.csv:3:1", "above a row with flow"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			_, errs, code := runCLI(t, tc.args...)
			if code != 1 {
				t.Fatalf("exit %d, want 1: %s", code, errs)
			}
			msg := strings.TrimSpace(errs)
			if strings.Contains(msg, "\n") || strings.Count(msg, tc.file) != 1 {
				t.Errorf("want one line naming %s once: %q", tc.file, msg)
			}
			for _, w := range tc.want {
				if !strings.Contains(msg, w) {
					t.Errorf("error %q does not contain %q", msg, w)
				}
			}
		})
	}
}

// TestZeroFlowColumnNamesTheFlag: the warning of a rating table's unread
// column of zero flows names the flag that gives the table's zero flow in
// that command (fit's --hydraulic-zero-flow, as fit's --zero-flow is the
// fitted offset), is not given when plot's --zero-flow is the column's one
// value, and names the value given when it is another. The table is
// invented, its offset column 0.32 m on every row.
func TestZeroFlowColumnNamesTheFlag(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	table := filepath.Join(dir, "offset-rating.csv")
	if err := os.WriteFile(table, []byte("stage,discharge,offset\n0.35,0.005,0.32\n0.5,0.22,0.32\n1.0,2.9,0.32\n2.0,16.5,0.32\n3.0,42.0,0.32\n4.0,80.0,0.32\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	const unread = "offset: this column is not read"
	for _, tc := range []struct {
		name string
		args []string
		want string // "" for no warning of the column
	}{
		{"plot", []string{"plot", table, "-o", dir}, "(it holds 0.32): give the table's with --zero-flow (one value a rating file)"},
		{"plot, the column's value given", []string{"plot", table, "--zero-flow", "0.32", "-o", dir}, ""},
		{"plot, another given", []string{"plot", table, "--zero-flow", "0.3", "-o", dir}, "(it holds 0.32), where --zero-flow gives 0.3 (one value a rating file): check which is the table's"},
		{"fit", []string{"fit", fitDemoGaugings, "--hydraulic-rating", table, "--compare-only"}, "(it holds 0.32): give the table's with --hydraulic-zero-flow (one value a rating file)"},
		{"fit, the column's value given", []string{"fit", fitDemoGaugings, "--hydraulic-rating", table, "--hydraulic-zero-flow", "0.32", "--compare-only"}, ""},
		{"record", []string{"record", recStages, "--rating", table, "--zero-flow", "0.3"}, "(it holds 0.32), where --zero-flow gives 0.3"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			out, errs, code := runCLI(t, tc.args...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			all := out + errs
			switch {
			case tc.want == "" && strings.Contains(all, unread):
				t.Errorf("the column holding the value given is warned of:\n%s", all)
			case tc.want != "" && !strings.Contains(all, unread+", yet names a gauge height of zero flow "+tc.want):
				t.Errorf("output:\n%s\nwant %q", all, tc.want)
			}
		})
	}
}

// The warning of readings rated outside the table names the flag that
// asked for the extrapolation: the rating table does not ask for it.
func TestExtrapolatedWarningNamesTheFlag(t *testing.T) {
	t.Parallel()
	out := filepath.Join(t.TempDir(), "unit.csv")
	_, errs, code := runCLI(t, "record", recStages, "--rating", recRatingA, "--extrapolate", "-o", out)
	if code != 0 || !strings.Contains(errs, "are outside the rating table: discharge extrapolated, as --extrapolate asks") {
		t.Errorf("exit %d, stderr %q: want the warning naming --extrapolate", code, errs)
	}
}
