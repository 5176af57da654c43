package results

import (
	"errors"
	"math"
	"strconv"
	"testing"
)

// TestCheckStagesApart: stages are written with LengthDecimals decimals, so
// two stages that round to the same text are refused, and every list
// accepted reads back strictly increasing (as a rating table must).
func TestCheckStagesApart(t *testing.T) {
	if LengthResolution != math.Pow10(-LengthDecimals) {
		t.Fatalf("LengthResolution %g, want 10^-%d", LengthResolution, LengthDecimals)
	}
	for _, tt := range []struct {
		stages []float64
		alike  bool
	}{
		{[]float64{1, 1.0001, 1.0002}, false},
		{[]float64{1, 1.00001}, true},                           // both "1"
		{[]float64{0.00005, 0.00015}, true},                     // both "0.0001": 0.00005 lies just above its half, 0.00015 just below
		{[]float64{101.2, 101.20004, 101.3}, true},              // both "101.2"
		{[]float64{-0.00004, 0.00004}, true},                    // both "0"
		{[]float64{2.00014, 2.00016}, false},                    // "2.0001", "2.0002"
		{[]float64{5}, false},                                   // one stage
		{[]float64{100, 100.5, 101, 101.5, 102, 103.25}, false}, // a plain table
	} {
		err := CheckStagesApart(tt.stages)
		if got := errors.Is(err, ErrStagesAlike); got != tt.alike {
			t.Errorf("%v: error %v, want alike %v", tt.stages, err, tt.alike)
		}
		if err != nil {
			continue
		}
		for i := 1; i < len(tt.stages); i++ {
			a, _ := strconv.ParseFloat(FormatLength(tt.stages[i-1]), 64)
			b, _ := strconv.ParseFloat(FormatLength(tt.stages[i]), 64)
			if !(b > a) {
				t.Errorf("%v: accepted, but %g is written before %g", tt.stages, a, b)
			}
		}
	}
}

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
		{"significant digits, small negative", sig(-1e-9, 4), "-0.000000001"}, // plain decimal, no exponent, as every report writes
		{"significant digits, large", sig(13621, 4), "13620"},                 // a large river's discharge, not 1.362e+04
	} {
		if tc.got != tc.want {
			t.Errorf("%s: %q, want %q", tc.name, tc.got, tc.want)
		}
	}
}
