package rating

import (
	"math"
	"strconv"
	"testing"
)

// Stages laid out from a decimal start in decimal steps are the numbers
// a user would type: each equals strconv.ParseFloat of its decimal form
// (closed form: the decimal sum is exact; the float64 is its nearest).
func TestSteppedStagesAreDecimals(t *testing.T) {
	for _, c := range []struct {
		from, step float64
		n          int
		last       string
	}{
		{100.3, 0.1, 33, "103.6"},
		{0, 0.01, 700, "7"},
		{-1.25, 0.05, 50, "1.25"},
		{5.2, 0.2, 10, "7.2"},
	} {
		got := steppedStages(c.from, c.step, c.n)
		want, _ := strconv.ParseFloat(c.last, 64)
		if got[c.n] != want {
			t.Errorf("%g + %d × %g = %.17g, want %s", c.from, c.n, c.step, got[c.n], c.last)
		}
		for i, h := range got {
			if s := strconv.FormatFloat(h, 'f', -1, 64); len(s) > 12 {
				t.Errorf("stage %d of %g step %g written %s: float noise", i, c.from, c.step, s)
			}
		}
	}
	if h := multiple(1036, 0.1); h != 103.6 {
		t.Errorf("1036 × 0.1 = %.17g, want 103.6", h)
	}
}

// An elevation less a datum is the decimal difference, as typed (the
// float64 difference of 100.7915 and 100 is 0.7914999999999992, IEEE 754).
func TestDecimalDifference(t *testing.T) {
	for _, c := range []struct{ a, b, want float64 }{
		{100.7915, 100, 0.7915},
		{102.3, 100.1, 2.2},
		{5, 7.25, -2.25},
		{1.0 / 3, 0, 1.0 / 3}, // not a short decimal: the float64 difference
		{1e17, 1, 1e17 - 1},
	} {
		if got := DecimalDifference(c.a, c.b); got != c.want {
			t.Errorf("DecimalDifference(%v, %v) = %v, want %v", c.a, c.b, got, c.want)
		}
	}
}

// Discharges in summaries and footnotes are written in plain decimal to
// four significant figures, never with an exponent (hand-rounded values).
func TestPlainFigures(t *testing.T) {
	for _, tc := range []struct {
		v    float64
		n    int
		want string
	}{
		{1362.4, 4, "1362"},
		{1177.6, 4, "1178"},
		{1180, 4, "1180"},
		{1558.04, 4, "1558"},
		{13621, 4, "13620"},
		{3620.3, 4, "3620"},
		{0.052341, 4, "0.05234"},
		{0.0523, 4, "0.0523"},
		{81.0849, 4, "81.08"},
		{17.96, 4, "17.96"},
		{1.5e-7, 4, "0.00000015"},
		{-2.5, 4, "-2.5"},
		{0, 4, "0"},
		{math.Copysign(0, -1), 4, "0"},
		{1362.4, 3, "1360"},
		{math.NaN(), 4, "-"},
		{math.Inf(1), 4, "-"},
		{3.3e33, 2, "3.3×10^33"},
		{-2e16, 4, "-2×10^16"},
		{9.99e14, 3, "999000000000000"},
		{1.9463e-300, 5, "1.9463×10^-300"},
		{-4e-11, 2, "-4×10^-11"},
		{1e-10, 4, "0.0000000001"},
		{3.9e-9, 2, "0.0000000039"},
	} {
		if got := PlainFigures(tc.v, tc.n); got != tc.want {
			t.Errorf("PlainFigures(%g, %d) = %q, want %q", tc.v, tc.n, got, tc.want)
		}
	}
}

// Means and differences of elevations typed as decimals are the decimals
// a hand calculation gives, with no binary noise (hand-computed values).
func TestDecimalMeanAndDifference(t *testing.T) {
	for _, tc := range []struct {
		name      string
		got, want float64
	}{
		{"mean 407.45, 407.38", DecimalMean(407.45, 407.38), 407.415},
		{"mean 406.50, 406.42", DecimalMean(406.50, 406.42), 406.46},
		{"mean 101.5, 101.5", DecimalMean(101.5, 101.5), 101.5},
		{"mean -0.3, 0.1", DecimalMean(-0.3, 0.1), -0.1},
		{"fall of the means", DecimalDifference(DecimalMean(407.45, 407.38), DecimalMean(405.95, 406.02)), 1.43},
	} {
		if tc.got != tc.want {
			t.Errorf("%s: %.17g, want %.17g", tc.name, tc.got, tc.want)
		}
	}
}
