package gauged_test

import (
	"testing"
	"time"

	"wetline/rating/gauged"
)

// A rating period of a selection is half-open, as rating periods are: a
// gauging at the boundary T belongs to the period T begins (T..), not to
// the one T ends (..T), so that the two halves share no gauging.
func TestSelectionHalfOpen(t *testing.T) {
	t.Parallel()
	T := time.Date(2023, 6, 21, 10, 0, 0, 0, time.FixedZone("", -7*3600))
	before, after := gauged.Selection{To: T}, gauged.Selection{From: T}
	for _, tc := range []struct {
		name        string
		at          time.Time
		early, late string // reasons under ..T and T..
	}{
		{"a second before", T.Add(-time.Second), "", gauged.ReasonBeforePeriod},
		{"at the boundary", T, gauged.ReasonAfterPeriod, ""},
		{"at the boundary, written in UTC", T.UTC(), gauged.ReasonAfterPeriod, ""},
		{"a second after", T.Add(time.Second), gauged.ReasonAfterPeriod, ""},
	} {
		g := gauged.Gauging{Time: tc.at, Stage: 1, Discharge: 2}
		if r := before.Reason(g); r != tc.early {
			t.Errorf("%s: ..T says %q, want %q", tc.name, r, tc.early)
		}
		if r := after.Reason(g); r != tc.late {
			t.Errorf("%s: T.. says %q, want %q", tc.name, r, tc.late)
		}
	}
}
