package rating

import (
	"errors"
	"math"
	"testing"
)

// Messages write floats in plain decimal under %g and %v, to the
// precision's significant figures (rating.PlainFigures), and as %g
// writes them wherever %g writes no exponent; %w still wraps. Expected
// strings by hand.
func TestSayf(t *testing.T) {
	sentinel := errors.New("cause")
	for _, tc := range []struct {
		format string
		args   []any
		want   string
	}{
		{"%g", []any{0.0012}, "0.0012"},
		{"%g", []any{1.5e-11}, "1.5×10^-11"},
		{"%g", []any{1.5e-9}, "0.0000000015"},
		{"%g", []any{1e6}, "1000000"},
		{"%g", []any{math.Nextafter(0.3, 1)}, "0.30000000000000004"},
		{"%.3g", []any{1.12e-15}, "1.12×10^-15"},
		{"%.4g", []any{2.971e4}, "29710"},
		{"%.3g", []any{2.8734}, "2.87"},
		{"%.2g", []any{700.0}, "700"},
		{"%.4g", []any{12345.6}, "12350"},
		{"%.3g", []any{-0.000012345}, "-0.0000123"},
		{"%g", []any{math.NaN()}, "NaN"},
		{"%g", []any{math.Inf(1)}, "+Inf"},
		{"%v", []any{[]float64{2.1, 3e-7}}, "[2.1 0.0000003]"},
		{"%6.2g|%-6.2g|", []any{1.5, 1.5}, "   1.5|1.5   |"},
		// Width in characters: "1.5×10^-11" is 10 of them (11 bytes).
		{"%12g|", []any{1.5e-11}, "  1.5×10^-11|"},
		{"%-12g|", []any{1.5e-11}, "1.5×10^-11  |"},
		// Precision 0 is one significant figure, as fmt's %.0g (3).
		{"%.0g", []any{2.71828}, "3"},
		// The 0 flag pads with zeros after the sign, as fmt's %08.3g
		// ("00002.72", "-0002.72", "+0002.72").
		{"%08.3g", []any{2.71828}, "00002.72"},
		{"%08.3g", []any{-2.71828}, "-0002.72"},
		{"%+08.3g", []any{2.71828}, "+0002.72"},
		{"%-08.3g|", []any{2.71828}, "2.72    |"},
		{"%.2f and %d", []any{1e-9, 3}, "0.00 and 3"},
	} {
		if got := Sayf(tc.format, tc.args...); got != tc.want {
			t.Errorf("Sayf(%q, %v) = %q, want %q", tc.format, tc.args, got, tc.want)
		}
	}
	err := Errorf("%w: exponent %.3g", sentinel, 1.12e-15)
	if !errors.Is(err, sentinel) || err.Error() != "cause: exponent 1.12×10^-15" {
		t.Errorf("Errorf: %v", err)
	}
}
