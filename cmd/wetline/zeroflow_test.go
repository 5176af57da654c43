package main

import (
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
