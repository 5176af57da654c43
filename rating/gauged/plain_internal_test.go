package gauged

import (
	"errors"
	"math"
	"testing"
)

// Messages write floats in plain decimal under %g and %v, to the
// precision's significant figures (rating.PlainFigures), and as %g
// writes them wherever %g writes no exponent; %w still wraps. Expected
// strings by hand.
func TestPlainFloatFormat(t *testing.T) {
	sentinel := errors.New("cause")
	for _, tc := range []struct {
		format string
		args   []any
		want   string
	}{
		{"%g", []any{0.0012}, "0.0012"},
		{"%g", []any{1.5e-11}, "0.000000000015"},
		{"%g", []any{1e6}, "1000000"},
		{"%g", []any{math.Nextafter(0.3, 1)}, "0.30000000000000004"},
		{"%.3g", []any{1.12e-15}, "0.00000000000000112"},
		{"%.3g", []any{2.8734}, "2.87"},
		{"%.2g", []any{700.0}, "700"},
		{"%.4g", []any{12345.6}, "12350"},
		{"%.3g", []any{-0.000012345}, "-0.0000123"},
		{"%g", []any{math.NaN()}, "NaN"},
		{"%g", []any{math.Inf(1)}, "+Inf"},
		{"%v", []any{[]float64{2.1, 3e-7}}, "[2.1 0.0000003]"},
		{"%6.2g|%-6.2g|", []any{1.5, 1.5}, "   1.5|1.5   |"},
		{"%.2f and %d", []any{1e-9, 3}, "0.00 and 3"},
	} {
		if got := sayf(tc.format, tc.args...); got != tc.want {
			t.Errorf("sayf(%q, %v) = %q, want %q", tc.format, tc.args, got, tc.want)
		}
	}
	err := errorf("%w: exponent %.3g", sentinel, 1.12e-15)
	if !errors.Is(err, sentinel) || err.Error() != "cause: exponent 0.00000000000000112" {
		t.Errorf("errorf: %v", err)
	}
	// The exponent warning of a control of exponent near zero.
	r, e := NewRating([]Control{{A: 2, B: 0.3, C: 1.12e-15, Kind: ChannelControl}})
	if e != nil {
		t.Fatal(e)
	}
	w := r.ExponentWarnings()
	if len(w) != 1 || w[0] != "control 1 (channel) has exponent 0.00000000000000112, outside 1 to 2.87 that such a control allows: check the control or its breakpoints" {
		t.Errorf("exponent warning %q", w)
	}
}
