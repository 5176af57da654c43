package results

import (
	"math"
	"math/rand/v2"
	"testing"
	"time"

	"wetline/rating/record"
	"wetline/survey"
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

// TestZoneCell: the tz cell of a record workbook's ratings and shifts
// sheets is record.FormatOffset's ±HH:MM (or "UTC"), and reads back with
// survey.ParseZone as the zone's offset, west and part-hour offsets
// among them (invented zones; offsets of civil time are whole minutes).
func TestZoneCell(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		off  time.Duration
		want string
	}{
		{0, "UTC"},
		{10 * time.Hour, "+10:00"},
		{-5 * time.Hour, "-05:00"},
		{-30 * time.Minute, "-00:30"},
		{5*time.Hour + 45*time.Minute, "+05:45"},
		{-(9*time.Hour + 30*time.Minute), "-09:30"},
	} {
		z := time.FixedZone("", int(tc.off/time.Second))
		got := zoneCell(z)
		if got != tc.want {
			t.Errorf("zoneCell(%v) = %q, want %q", tc.off, got, tc.want)
		}
		if tc.off != 0 && got != record.FormatOffset(tc.off) {
			t.Errorf("zoneCell(%v) = %q, record.FormatOffset %q", tc.off, got, record.FormatOffset(tc.off))
		}
		if back, err := survey.ParseZone(got); err != nil || back != tc.off {
			t.Errorf("ParseZone(%q) = %v, %v; want %v", got, back, err, tc.off)
		}
	}
}
