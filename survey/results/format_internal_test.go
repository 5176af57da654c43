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
