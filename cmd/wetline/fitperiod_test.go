package main

import (
	"strings"
	"testing"
)

// An empty --period, one holding none of the gaugings (for a fit or a
// comparison alone) or too few for the fit, is an error naming --period.
// The demo's gaugings run from 2019-05-19 to 2024-03-02; three of them
// (2023-10-02, 2023-11-21, 2024-03-02) fall after 2023-10-01, too few for
// the three parameters of one power law fitted by least squares.
func TestFitPeriodFlag(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name, period string
		code         int
		want         string
		extra        []string // default --method lsq
	}{
		{"compare only, after every gauging", "2030-01-01..", 1, "fit: --period 2030-01-01..: none of the 24 gaugings of demodata/tallow-gaugings.csv falls in it",
			[]string{"--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100", "--compare-only"}},
		{"three gaugings", "2023-10-01..", 1, "fit: --period 2023-10-01..: demodata/tallow-gaugings.csv: too few gaugings for the fit: 3 gaugings used", nil},
		{"empty", "", 2, "fit: --period is empty", nil},
		{"blank", "  ", 2, "fit: --period is empty", nil},
		{"neither end", "..", 2, `fit: --period ".." has neither end`, nil},
		{"after every gauging", "2030-01-01..", 1, "fit: --period 2030-01-01..: none of the 24 gaugings of demodata/tallow-gaugings.csv falls in it", nil},
		{"between two gaugings", "2021-01-14..2021-03-02", 1, "(they run from 2019-05-19T08:45:00Z to 2024-03-02T10:30:00Z)", nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			extra := tc.extra
			if extra == nil {
				extra = []string{"--method", "lsq"}
			}
			_, errs, code := runCLI(t, append([]string{"fit", fitDemoGaugings, "--period", tc.period}, extra...)...)
			if code != tc.code || !strings.Contains(errs, tc.want) {
				t.Errorf("exit %d (want %d), stderr %q, want %q", code, tc.code, errs, tc.want)
			}
		})
	}
}
