package record

import (
	"testing"
	"time"
)

// FormatOffset writes a UTC offset as ISO 8601 does, ±HH:MM, the sign of
// an offset under an hour kept (-00:30, not +00:30); the offsets are those
// of civil time (closed form: hours and minutes of the offset).
func TestFormatOffset(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		off  time.Duration
		want string
	}{
		{0, "+00:00"},
		{10 * time.Hour, "+10:00"},
		{-5 * time.Hour, "-05:00"},
		{5*time.Hour + 45*time.Minute, "+05:45"},
		{-(9*time.Hour + 30*time.Minute), "-09:30"},
		{-30 * time.Minute, "-00:30"},
		{MaxUTCOffset, "+14:00"},
		{-MaxUTCOffset, "-14:00"},
	} {
		if got := FormatOffset(tc.off); got != tc.want {
			t.Errorf("FormatOffset(%v) = %q, want %q", tc.off, got, tc.want)
		}
	}
	if got := zone(int64(-(3*time.Hour + 30*time.Minute) / time.Second)).String(); got != "UTC-03:30" {
		t.Errorf("zone name %q, want UTC-03:30", got)
	}
}
