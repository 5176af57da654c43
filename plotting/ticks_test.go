package plotting_test

import (
	"fmt"
	"strings"
	"testing"

	"wetline/plotting"
)

// TestLogTicks125 checks the labels against the definition of a 1-2-5
// log scale (closed form: the marks are m·10^k inside the range).
func TestLogTicks125(t *testing.T) {
	for _, tc := range []struct {
		min, max float64
		want     string // labelled marks
		minor    int    // unlabelled marks
	}{
		{0.3, 4, "0.5 1 2", 8},             // inside one decade and a bit: plot.LogTicks labels only 1
		{2, 8, "2 5", 5},                   // inside one decade: no power of ten at all
		{1, 100, "1 2 5 10 20 50 100", 12}, // two decades
		{1, 800, "1 5 10 50 100 500", 20},  // 2.9 decades: 2s unlabelled
		{20, 50000, "100 1000 10000", 28},  // 3.4 decades: powers of ten only
		{1e-3, 1e3, "0.001 0.01 0.1 1 10 100 1000", 48},
		{0, 10, "", 0},  // a log axis cannot hold zero
		{-1, 10, "", 0}, // nor a negative value
		{5, 1, "", 0},   // reversed range
	} {
		var labels []string
		minor := 0
		for _, tk := range (plotting.LogTicks125{}).Ticks(tc.min, tc.max) {
			if tk.Label == "" {
				minor++
				continue
			}
			labels = append(labels, tk.Label)
		}
		if got := strings.Join(labels, " "); got != tc.want || minor != tc.minor {
			t.Errorf("Ticks(%g, %g) = %q and %d minor, want %q and %d", tc.min, tc.max, got, minor, tc.want, tc.minor)
		}
	}
}

func ExampleLogTicks125() {
	for _, tk := range (plotting.LogTicks125{}).Ticks(0.4, 3) {
		if tk.Label != "" {
			fmt.Print(tk.Label, " ")
		}
	}
	fmt.Println()
	// Output: 0.5 1 2
}
