package main

import (
	"strings"
	"testing"
)

// An empty --period, or one holding none of the gaugings, is an error
// naming --period. The demo's gaugings run from 2019-05-19 to 2024-03-02.
func TestFitPeriodFlag(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name, period string
		code         int
		want         string
	}{
		{"empty", "", 2, "fit: --period is empty"},
		{"blank", "  ", 2, "fit: --period is empty"},
		{"neither end", "..", 2, `fit: --period ".." has neither end`},
		{"after every gauging", "2030-01-01..", 1, "fit: --period 2030-01-01..: none of the 24 gaugings of demodata/tallow-gaugings.csv falls in it"},
		{"between two gaugings", "2021-01-14..2021-03-02", 1, "(they run from 2019-05-19T08:45:00Z to 2024-03-02T10:30:00Z)"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			_, errs, code := runCLI(t, "fit", fitDemoGaugings, "--method", "lsq", "--period", tc.period)
			if code != tc.code || !strings.Contains(errs, tc.want) {
				t.Errorf("exit %d (want %d), stderr %q, want %q", code, tc.code, errs, tc.want)
			}
		})
	}
}
