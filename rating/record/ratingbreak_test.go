package record

import (
	"strings"
	"testing"
	"time"

	"wetline/rating/gauged"
)

// TestRatingBreakSteps: a rating period begins at 09:00 on the record.
// Hand computation on the linear ratings Q = k·h:
//
//	on a reading at 09:00, h = 2: Q = 10·2 = 20 before, 12·2 = 24 after:
//	  100·(24 − 20)/20 = +20.0 %, warned;
//	between readings at 08:00 (h = 2) and 10:00 (h = 4), 09:00 is halfway:
//	  h = 3, Q = 30 before, 36 after: +20.0 %, warned;
//	k from 10 to 8 at h = 2: 20 to 16, −20.0 %, warned;
//	k from 10 to 10.4 at h = 2: 20 to 20.8, +4.0 %, within 5 %, not warned;
//	the change in a gap longer than the maximum gap, or after the last
//	reading: no stage there, not warned.
func TestRatingBreakSteps(t *testing.T) {
	for _, tc := range []struct {
		name   string
		k      float64
		st     *Stages
		maxGap time.Duration
		want   string // "" for no warning
	}{
		{"on a reading", 12, stages(8, 2, 9, 2, 10, 2), 2 * time.Hour,
			"the discharge steps by +20.0 % where rating period 2 begins, at 2024-01-01T09:00:00Z: at the gauge height 2 m there, 20 m3/s on the rating before (one, shift 0 m) and 24 m3/s on the new one (two, shift 0 m), beyond ±5 %"},
		{"between readings", 12, stages(8, 2, 10, 4), 2 * time.Hour,
			"the discharge steps by +20.0 % where rating period 2 begins, at 2024-01-01T09:00:00Z: at the gauge height 3 m there, 30 m3/s on the rating before (one, shift 0 m) and 36 m3/s on the new one (two, shift 0 m)"},
		{"downward", 8, stages(8, 2, 9, 2, 10, 2), 2 * time.Hour, "the discharge steps by -20.0 % where rating period 2 begins"},
		{"within the threshold", 10.4, stages(8, 2, 9, 2, 10, 2), 2 * time.Hour, ""},
		{"in a gap", 12, stages(8, 2, 10, 4), time.Hour, ""},
		{"after the record", 12, stages(6, 2, 7, 2, 8, 2), 2 * time.Hour, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			h := gauged.History{Periods: []gauged.Period{{Rating: linear("one", 10)}, {From: time.Unix(at(9), 0), Rating: linear("two", tc.k)}}}
			res := compute(t, tc.st, rater(t, h), Options{MaxGap: tc.maxGap})
			var got []string
			for _, w := range res.Warnings {
				if strings.HasPrefix(w, "the discharge steps by") {
					got = append(got, w)
				}
			}
			switch {
			case tc.want == "" && len(got) > 0:
				t.Errorf("warned: %q", got)
			case tc.want != "" && (len(got) != 1 || !strings.HasPrefix(got[0], tc.want)):
				t.Errorf("warnings %q, want one beginning %q", got, tc.want)
			}
		})
	}
}
