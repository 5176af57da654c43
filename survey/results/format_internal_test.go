package results

import (
	"math"
	"testing"
)

// TestFixedUnsignedZero: values that round to zero in a text table are
// written without a sign; others keep theirs (the decimals as fmt writes
// them, standard library).
func TestFixedUnsignedZero(t *testing.T) {
	for _, tc := range []struct {
		name string
		got  string
		want string
	}{
		{"small negative, 3 decimals", fixed(-0.0004, 3), "0.000"},
		{"small negative, 1 decimal", fixed(-0.04, 1), "0.0"},
		{"negative zero", fixed(math.Copysign(0, -1), 2), "0.00"},
		{"negative", fixed(-0.0006, 3), "-0.001"},
		{"positive", fixed(0.0004, 3), "0.000"},
		{"undefined", fixed(math.NaN(), 3), "-"},
		{"blank or fixed, small negative", fixedOrBlank(-0.00001, 4), "0.0000"},
		{"significant digits, negative zero", sig(math.Copysign(0, -1), 4), "0"},
		{"significant digits, small negative", sig(-1e-9, 4), "-1e-09"},
	} {
		if tc.got != tc.want {
			t.Errorf("%s: %q, want %q", tc.name, tc.got, tc.want)
		}
	}
}
