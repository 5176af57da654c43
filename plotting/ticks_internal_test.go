package plotting

import (
	"math"
	"testing"
)

// TestLinearTicksExtremes marks axes at the ends of a float64: a span
// that overflows gets no marks, and one reaching the largest float64 a
// handful (its step 2e307: closed form, 1.8e308/7 rounded to 1, 2 or 5).
func TestLinearTicksExtremes(t *testing.T) {
	for _, tc := range []struct {
		min, max float64
		most     int // marks at most; 0: none
	}{
		{-1e308, 1e308, 0},
		{-math.MaxFloat64, math.MaxFloat64, 0},
		{0, math.MaxFloat64, 20},
		{100, math.MaxFloat64, 20},
		{-math.MaxFloat64, 0, 20},
	} {
		got := linearTicks{}.Ticks(tc.min, tc.max)
		if len(got) > tc.most || tc.most > 0 && len(got) == 0 {
			t.Errorf("Ticks(%g, %g): %d marks, want 1 to %d", tc.min, tc.max, len(got), tc.most)
		}
		for _, m := range got {
			if !finite(m.Value) {
				t.Errorf("Ticks(%g, %g): mark at %g", tc.min, tc.max, m.Value)
			}
		}
	}
}
