package record

import (
	"math"
	"strings"
	"testing"
	"time"

	"wetline/rating/gauged"
)

// quarterHours is a record of 15-minute readings over the given hours
// from 1 January 2024 00:00 UTC, the stage at hour x being h(x).
func quarterHours(hours float64, h func(x float64) float64) *Stages {
	s := &Stages{Name: "test"}
	for k := 0; float64(k)*0.25 <= hours; k++ {
		x := float64(k) * 0.25
		s.Time = append(s.Time, at(x))
		s.Stage = append(s.Stage, h(x))
	}
	return s
}

// TestDatumSteps: a one-interval step in steady flow that holds is warned
// of as a likely datum or sensor change; a flood rise, however fast, that
// falls again is not, nor a step within the stage tolerance, one near the
// record's end or one across an unbridged gap. The flood is invented: a
// small stream rising 0.6 m in 30 minutes (or in one 15-minute interval)
// and falling back over 6 hours, as small streams do (common practice).
// Rating Q = 10·h, stage tolerance 0.02 m (the default).
func TestDatumSteps(t *testing.T) {
	r := rater(t, gauged.History{Periods: []gauged.Period{{Rating: linear("q=10h", 10)}}})
	steady := func(v float64) func(float64) float64 { return func(float64) float64 { return v } }
	stepAt := func(x0, lo, hi float64) func(float64) float64 {
		return func(x float64) float64 {
			if x < x0 {
				return lo
			}
			return hi
		}
	}
	// flood rises from base by 0.6 m over rise hours from 12:00, then
	// falls back linearly over 6 hours.
	flood := func(base, rise float64) func(float64) float64 {
		return func(x float64) float64 {
			switch {
			case x <= 12:
				return base
			case x <= 12+rise:
				return base + 0.6*(x-12)/rise
			case x <= 18+rise:
				return base + 0.6*(1-(x-12-rise)/6)
			}
			return base
		}
	}
	// noisy adds ±2 mm alternating from reading to reading.
	noisy := func(f func(float64) float64) func(float64) float64 {
		return func(x float64) float64 {
			if int(math.Round(x*4))%2 == 0 {
				return f(x) + 0.002
			}
			return f(x) - 0.002
		}
	}
	for _, tc := range []struct {
		name  string
		st    *Stages
		steps int
		want  []string // parts of the first warning
	}{
		{"datum step in steady flow", quarterHours(48, stepAt(24, 0.596, 1.596)), 1,
			[]string{"steps by +1 m in one interval, from 0.596 m at 2024-01-01T23:45:00Z to 1.596 m at 2024-01-02T00:00:00Z",
				"within 0 m", "from 5.96 to 15.96 m3/s", "change of gauge datum or sensor"}},
		{"step down with logger noise", quarterHours(48, noisy(stepAt(24, 1.2, 1.1))), 1, []string{"steps by -0.096 m", "within 0.004 m"}},
		{"no step", quarterHours(48, steady(0.6)), 0, nil},
		{"flood rising 0.6 m in 30 minutes", quarterHours(48, flood(0.6, 0.5)), 0, nil},
		{"flood rising 0.6 m in 15 minutes", quarterHours(48, flood(0.6, 0.25)), 0, nil},
		{"step within the tolerance", quarterHours(48, stepAt(24, 0.6, 0.615)), 0, nil},
		{"step 2 h before the end", quarterHours(26, stepAt(24, 0.6, 1.6)), 0, nil},
		{"step across a gap", stages(0, 0.6, 6, 0.6, 12, 0.6, 24, 1.6, 30, 1.6, 36, 1.6), 0, nil},
	} {
		res := compute(t, tc.st, r, Options{MaxGap: 6 * time.Hour})
		var got []string
		for _, w := range res.Warnings {
			if strings.Contains(w, "the stage steps") {
				got = append(got, w)
			}
		}
		if len(got) != tc.steps {
			t.Errorf("%s: %d step warnings, want %d: %q", tc.name, len(got), tc.steps, got)
			continue
		}
		for _, p := range tc.want {
			if !strings.Contains(got[0], p) {
				t.Errorf("%s: warning lacks %q: %s", tc.name, p, got[0])
			}
		}
	}
}
