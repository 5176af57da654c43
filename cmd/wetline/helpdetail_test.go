package main

import (
	"strings"
	"testing"
)

// TestHelpCarriesFlagDetail checks the help of each command gives, in its
// flag's line, the detail the README leaves to it ("All flags: wetline
// help CMD"): what a flag's output holds, what it refuses and warns of.
func TestHelpCarriesFlagDetail(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		command, flag, want string
	}{
		{"rate", "calibrate", "not the CSV"},
		{"rate", "calibrate", "outside 0.005 to 1 is refused"},
		{"rate", "format", "lookup sheet at every hundredth of stage"},
		{"rate", "step", "a shallower section warned of"},
		{"rate", "output", "replaced only if it holds just an earlier batch's index.csv and tables"},
		{"rate", "no-extend", "which is warned of"},
		{"rate", "line", "one starting on the right bank is reversed, warned"},
		{"solve", "discharge", "minimum or maximum of specific energy"},
		{"solve", "stage", "at a pipe's crown, the full-flow one"},
		{"fit", "breaks", "each control needs 3 gaugings"},
		{"fit", "method", "1.96·|φ(h) − φ(h_j)|·σ"},
		{"slopearea", "no-extend", "which is warned of"},
		{"backwater", "verify", "the mean and largest departure on standard error"},
		{"backwater", "no-extend", "which is warned of"},
		{"shifts", "proposed", "headers naming the unit"},
		{"shifts", "visit-gap", "split where a rating period begins"},
		{"record", "daily", "midnight to midnight, both included"},
		{"record", "gaugings", "counted in one warning"},
		{"compare", "step", "at its multiples"},
	} {
		out, errs, code := runCLI(t, tc.command, "--help")
		if code != 0 {
			t.Fatalf("%s --help: exit %d: %s", tc.command, code, errs)
		}
		var line string
		for _, l := range strings.Split(out, "\n") {
			l = strings.TrimSpace(l)
			if _, short, _ := strings.Cut(l, ", "); strings.HasPrefix(l, "--"+tc.flag+" ") || strings.HasPrefix(l, "-") && strings.HasPrefix(short, "--"+tc.flag+" ") {
				line = l
			}
		}
		if !strings.Contains(line, tc.want) {
			t.Errorf("%s --help: the line of --%s does not say %q: %q", tc.command, tc.flag, tc.want, line)
		}
	}
}
