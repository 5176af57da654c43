package rating

import (
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
