package record

import (
	"errors"
	"math"
	"strings"
	"testing"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
)

// lengthTol is the tolerance on a stage interpolated by hand (round-off
// of one product and one sum of numbers near 1).
const lengthTol = 1e-12

// gaugeRecord is a record of five readings with a gap of 6 h between 02:00
// and 08:00: h = 1.00 at 00:00, 1.20 at 01:00, 1.10 at 02:00, 1.40 at 08:00
// and 1.30 at 09:00 (1 January 2024, UTC).
func gaugeRecord() *Stages { return stages(0, 1.00, 1, 1.20, 2, 1.10, 8, 1.40, 9, 1.30) }

// gaugingAt is a gauging at hours (see at) read at gauge height h, with its
// row in an invented gaugings file.
func gaugingAt(hours, h float64, source string) gauged.Gauging {
	return gauged.Gauging{Time: time.Unix(at(hours), 0), Stage: h, Discharge: 10 * h, Source: source}
}

// TestRecordedStageAtGauging: the recorded stage at a gauging's time, by
// hand (closed form of the line through the readings either side,
// h = hᵢ + (t − tᵢ)/(tᵢ₊₁ − tᵢ)·(hᵢ₊₁ − hᵢ)); a gauging in a gap longer than
// the maximum gap has none, one in a gap of exactly the maximum is
// bridged, as the record bridges it.
func TestRecordedStageAtGauging(t *testing.T) {
	nan := math.NaN()
	for _, tc := range []struct {
		name          string
		hours         float64
		maxGap        time.Duration
		want          float64 // NaN: in a gap
		before, after int
	}{
		{"at the first reading", 0, 0, 1.00, 0, 0},
		{"a quarter of the way from 00:00 to 01:00", 0.25, 0, 1.00 + 0.25*0.20, 0, 1}, // 1.05
		{"at a reading", 1, 0, 1.20, 1, 1},
		{"halfway from 01:00 to 02:00", 1.5, 0, 1.20 + 0.5*(1.10-1.20), 1, 2}, // 1.15
		{"in the gap of 6 h, longer than 2 h", 5, 0, nan, 2, 3},
		{"in a gap of 6 h, as long as the maximum", 5, 6 * time.Hour, 1.10 + 3.0/6*(1.40-1.10), 2, 3}, // 1.25
		{"three quarters of the way from 08:00 to 09:00", 8.75, 0, 1.40 + 0.75*(1.30-1.40), 3, 4},     // 1.325
		{"at the last reading", 9, 0, 1.30, 4, 4},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := rater(t, gauged.History{Periods: []gauged.Period{{Rating: linear("q=10h", 10)}}})
			g := gaugingAt(tc.hours, 1.2, "g.csv:2")
			res := compute(t, gaugeRecord(), r, Options{MaxGap: tc.maxGap, Gaugings: []gauged.Gauging{g}})
			if res.Gaugings == nil || len(res.GaugeStages) != 1 || res.GaugingsLeftOut != 0 {
				t.Fatalf("checked %+v, stages %+v, left out %d", res.Gaugings, res.GaugeStages, res.GaugingsLeftOut)
			}
			s := res.GaugeStages[0]
			if s.Before != tc.before || s.After != tc.after {
				t.Errorf("readings either side %d, %d, want %d, %d", s.Before, s.After, tc.before, tc.after)
			}
			if math.IsNaN(tc.want) {
				if !s.InGap || !math.IsNaN(s.Recorded) || !math.IsNaN(s.Difference) || s.Beyond {
					t.Errorf("in a gap: %+v", s)
				}
				if !hasWarning(res.Warnings, "g.csv:2: gauging of 2024-01-01T05:00:00Z: no recorded stage", "gap of 6h between the readings of 2024-01-01T02:00:00Z and 2024-01-01T08:00:00Z, longer than 2h") {
					t.Errorf("no warning of the gap: %q", res.Warnings)
				}
				return
			}
			if s.InGap || math.Abs(s.Recorded-tc.want) > lengthTol || math.Abs(s.Difference-(1.2-tc.want)) > lengthTol {
				t.Errorf("recorded %v, difference %v, want %v, %v", s.Recorded, s.Difference, tc.want, 1.2-tc.want)
			}
		})
	}
}

// hasWarning reports whether one warning holds every part.
func hasWarning(ws []string, parts ...string) bool {
	for _, w := range ws {
		all := true
		for _, p := range parts {
			all = all && strings.Contains(w, p)
		}
		if all {
			return true
		}
	}
	return false
}

// TestGaugingsOutsideSpan: gaugings before the record's first reading or
// after its last are left out of the check and counted in one warning;
// the one within it is checked.
func TestGaugingsOutsideSpan(t *testing.T) {
	r := rater(t, gauged.History{Periods: []gauged.Period{{Rating: linear("q=10h", 10)}}})
	gs := []gauged.Gauging{
		gaugingAt(-24*400, 1.0, "g.csv:2"), // a year and more before
		gaugingAt(-0.25, 1.0, "g.csv:3"),   // a quarter hour before the first reading
		gaugingAt(1, 1.2, "g.csv:4"),       // at a reading
		gaugingAt(9.25, 1.3, "g.csv:5"),    // a quarter hour after the last
		gaugingAt(24*400, 1.3, "g.csv:6"),  // a year and more after
	}
	res := compute(t, gaugeRecord(), r, Options{Gaugings: gs})
	if res.Gaugings == nil || len(res.Gaugings.Gaugings) != 1 || res.Gaugings.Gaugings[0].Source != "g.csv:4" || len(res.GaugeStages) != 1 {
		t.Fatalf("checked %+v", res.Gaugings)
	}
	if res.GaugingsLeftOut != 4 {
		t.Errorf("left out %d, want 4", res.GaugingsLeftOut)
	}
	n := 0
	for _, w := range res.Warnings {
		if strings.Contains(w, "outside the record's span") {
			n++
		}
		for _, src := range []string{"g.csv:2", "g.csv:3", "g.csv:5", "g.csv:6"} {
			if strings.Contains(w, src) {
				t.Errorf("a gauging left out is named: %q", w)
			}
		}
	}
	want := "4 of 5 gaugings lie outside the record's span, from 2024-01-01T00:00:00Z to 2024-01-01T09:00:00Z, and are not checked against it (2 before its first reading, 2 after its last)"
	if n != 1 || !hasWarning(res.Warnings, want) {
		t.Errorf("%d warnings of the span, want one %q: %q", n, want, res.Warnings)
	}
	// One left out of two: the verbs agree with the one.
	res = compute(t, gaugeRecord(), r, Options{Gaugings: gs[1:3]})
	if want := "1 of 2 gaugings lies outside the record's span, from 2024-01-01T00:00:00Z to 2024-01-01T09:00:00Z, and is not checked against it (1 before its first reading, 0 after its last)"; !hasWarning(res.Warnings, want) {
		t.Errorf("one left out: warnings %q, want %q", res.Warnings, want)
	}
	// None within the span: nothing checked, the count stated.
	res = compute(t, gaugeRecord(), r, Options{Gaugings: gs[:2]})
	if res.Gaugings != nil || res.GaugeStages != nil || res.GaugingsLeftOut != 2 || !hasWarning(res.Warnings, "2 of 2 gaugings lie outside") {
		t.Errorf("none within: %+v %+v %d %q", res.Gaugings, res.GaugeStages, res.GaugingsLeftOut, res.Warnings)
	}
}

// TestStageTolerance: a gauging's gauge height is flagged when it differs
// from the recorded stage (1.05 m at 00:15, by hand as above) by more than
// the tolerance: by default 0.02 m in SI and 0.06 ft in US units (common
// practice), else as given; a difference equal to the tolerance is not.
func TestStageTolerance(t *testing.T) {
	r := rater(t, gauged.History{Periods: []gauged.Period{{Rating: linear("q=10h", 10)}}})
	for _, tc := range []struct {
		name   string
		h, tol float64
		units  rating.Units
		beyond bool
	}{
		{"+0.01 m, default", 1.06, 0, rating.SI, false},
		{"+0.02 m, default: equal, not beyond", 1.07, 0, rating.SI, false},
		{"+0.03 m, default", 1.08, 0, rating.SI, true},
		{"-0.03 m, default", 1.02, 0, rating.SI, true},
		{"+0.03 m, tolerance 0.05 m", 1.08, 0.05, rating.SI, false},
		{"+0.06 m, tolerance 0.05 m", 1.11, 0.05, rating.SI, true},
		{"+0.05 ft, US default 0.06 ft", 1.10, 0, rating.US, false},
		{"+0.07 ft, US default 0.06 ft", 1.12, 0, rating.US, true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			g := gaugingAt(0.25, tc.h, "g.csv:7")
			res := compute(t, gaugeRecord(), r, Options{Gaugings: []gauged.Gauging{g}, StageTolerance: tc.tol, UnitSystem: tc.units})
			s := res.GaugeStages[0]
			if s.Beyond != tc.beyond {
				t.Errorf("beyond %v, want %v (difference %v, tolerance %v)", s.Beyond, tc.beyond, s.Difference, res.StageTolerance)
			}
			warned := hasWarning(res.Warnings, "g.csv:7: gauging of 2024-01-01T00:15:00Z read gauge height")
			if warned != tc.beyond {
				t.Errorf("warned %v, want %v: %q", warned, tc.beyond, res.Warnings)
			}
		})
	}
	// The warning names the time, the source, both stages, the readings
	// either side and the difference.
	res := compute(t, gaugeRecord(), r, Options{Gaugings: []gauged.Gauging{gaugingAt(0.25, 1.08, "g.csv:7")}})
	want := "g.csv:7: gauging of 2024-01-01T00:15:00Z read gauge height 1.08 m where the record gives 1.050 m " +
		"(linear between the readings of 2024-01-01T00:00:00Z (1 m) and 2024-01-01T01:00:00Z (1.2 m)): gauging − record = +0.030 m, more than the tolerance 0.02 m"
	if !hasWarning(res.Warnings, want) {
		t.Errorf("warnings %q, want %q", res.Warnings, want)
	}
	for _, bad := range []float64{-0.02, math.NaN(), math.Inf(1)} {
		if _, err := Compute(gaugeRecord(), r, Options{StageTolerance: bad}); !errors.Is(err, ErrStageTolerance) {
			t.Errorf("tolerance %v: %v", bad, err)
		}
	}
}
