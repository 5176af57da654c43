package results

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestAppendMatchesFormat: the row writers' appenders write every value as
// FormatFloat and FormatLength do (an independent implementation through
// strconv's string functions).
func TestAppendMatchesFormat(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(1, 1))
	values := []float64{0, math.Copysign(0, -1), math.NaN(), math.Inf(1), math.Inf(-1), 1, -1, 0.00004, -0.00004, 0.00005, 1e12, -1e12, 123456.789, 1e-300}
	for range 20000 {
		values = append(values, (rng.Float64()-0.5)*math.Pow(10, float64(rng.IntN(20)-8)))
	}
	for _, v := range values {
		if got, want := string(appendFloat6(nil, v)), FormatFloat(v); got != want {
			t.Errorf("appendFloat6(%v) = %q, FormatFloat %q", v, got, want)
		}
		if got, want := string(appendLength([]byte("x,"), v)), "x,"+FormatLength(v); got != want {
			t.Errorf("appendLength(%v) = %q, FormatLength %q", v, got, want)
		}
	}
}
