package record

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"
	"time"

	"gonum.org/v1/gonum/integrate"

	"wetline/rating/gauged"
)

// Tolerances of the package's tests.
const (
	// meanTol is the tolerance on hand-computed daily means (round-off on
	// sums of a few products near 100).
	meanTol = 1e-9
	// coverageTol is the tolerance on a fraction of a day (one division).
	coverageTol = 1e-15
	// integralTol is the relative tolerance between two trapezoidal sums of
	// the same record taken in a different order.
	integralTol = 1e-9
)

// at is a time on 1 January 2024 (UTC) given in hours (may exceed 24).
func at(hours float64) int64 {
	return time.Date(2024, 1, 1, 0, 0, 0, 0, time.UTC).Unix() + int64(hours*3600)
}

// linear is the rating Q = k·h on 0 ≤ h ≤ 10 m.
func linear(name string, k float64) *gauged.RatingTable {
	return &gauged.RatingTable{Name: name, Points: []gauged.RatingPoint{{Stage: 0, Discharge: 0}, {Stage: 10, Discharge: 10 * k}}}
}

func rater(t *testing.T, h gauged.History) *gauged.Rater {
	t.Helper()
	r, err := h.Compile()
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func stages(pairs ...float64) *Stages {
	s := &Stages{Name: "test"}
	for i := 0; i < len(pairs); i += 2 {
		s.Time = append(s.Time, at(pairs[i]))
		s.Stage = append(s.Stage, pairs[i+1])
	}
	return s
}

func compute(t *testing.T, st *Stages, r *gauged.Rater, opt Options) *Result {
	t.Helper()
	res, err := Compute(st, r, opt)
	if err != nil {
		t.Fatal(err)
	}
	return res
}

// TestDailyMeanUnevenWithGap: readings at uneven intervals with a gap, on
// the rating Q = 10·h, maximum gap 4 h. Trapezoids by hand:
//
//	00:00 h=1 Q=10 → 03:00 h=3 Q=30:  ½(10+30)·3 h =  60
//	03:00 Q=30     → 05:00 h=2 Q=20:  ½(30+20)·2 h =  50
//	05:00          → 14:00: a gap of 9 h > 4 h, not bridged
//	14:00 h=4 Q=40 → 18:00 h=2 Q=20:  ½(40+20)·4 h = 120
//	18:00 Q=20     → 21:00 h=3 Q=30:  ½(20+30)·3 h =  75
//	21:00 Q=30     → 24:00 h=1 Q=10:  ½(30+10)·3 h =  60
//	mean = 365/(3 + 2 + 4 + 3 + 3) = 365/15 = 24.333; coverage 15/24.
//
// The discharge of the mean of the day's six stages, (1+3+2+4+2+3)/6 = 2.5,
// would be 25.
func TestDailyMeanUnevenWithGap(t *testing.T) {
	r := rater(t, gauged.History{Periods: []gauged.Period{{Rating: linear("q=10h", 10)}}})
	res := compute(t, stages(0, 1, 3, 3, 5, 2, 14, 4, 18, 2, 21, 3, 24, 1), r, Options{MaxGap: 4 * time.Hour})
	if len(res.Daily) != 2 {
		t.Fatalf("%d days, want 2", len(res.Daily))
	}
	d := res.Daily[0]
	if math.Abs(d.Mean-365.0/15) > meanTol || math.Abs(d.Coverage-15.0/24) > coverageTol || d.Min != 10 || d.Max != 40 ||
		d.MaxTime.Unix() != at(14) || d.MinTime.Unix() != at(0) || d.Readings != 6 || d.Flags != Gap|Partial {
		t.Errorf("day 1: %+v (flags %v)", d, d.Flags)
	}
	if !d.Date.Equal(time.Date(2024, 1, 1, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("date %v", d.Date)
	}
	// The second day holds one reading at its midnight and nothing else.
	if d2 := res.Daily[1]; !math.IsNaN(d2.Mean) || d2.Coverage != 0 || d2.Readings != 1 || d2.Max != 10 || d2.Flags != Partial {
		t.Errorf("day 2: %+v", d2)
	}
	if res.Units[3].Flags != Gap || res.Units[2].Flags != 0 {
		t.Errorf("unit flags %v %v", res.Units[2].Flags, res.Units[3].Flags)
	}
	if len(res.Warnings) != 1 {
		t.Errorf("warnings %q", res.Warnings)
	}
}

// TestDayAcrossRatingPeriods: a day crossing a rating period's beginning.
// Rating one Q = 10·h until 09:00, rating two Q = 20·h from then.
// Readings 00:00 h=2, 06:00 h=2, 12:00 h=4, 18:00 h=4, 24:00 h=4.
//
//	00–06: rating one, ½(20+20)·6 = 120
//	06–09: the stage at 09:00 is 3 (linear in time); rating one there: 30;
//	       ½(20+30)·3 = 75
//	09–12: rating two at 3: 60, at 12:00 (h=4): 80; ½(60+80)·3 = 210
//	12–24: 80·12 = 960
//	mean = (120 + 75 + 210 + 960)/24 = 1365/24 = 56.875, coverage 1.
//
// Without the split, the trapezoid 06–12 would be ½(20+80)·6 = 300 and the
// mean (120 + 300 + 960)/24 = 57.5.
func TestDayAcrossRatingPeriods(t *testing.T) {
	h := gauged.History{Periods: []gauged.Period{
		{Rating: linear("one", 10)},
		{From: time.Unix(at(9), 0), Rating: linear("two", 20)},
	}}
	res := compute(t, stages(0, 2, 6, 2, 12, 4, 18, 4, 24, 4), rater(t, h), Options{MaxGap: 6 * time.Hour})
	d := res.Daily[0]
	if math.Abs(d.Mean-56.875) > meanTol || d.Coverage != 1 || d.Flags != 0 {
		t.Errorf("day: %+v", d)
	}
	if q := res.Units[2].Discharge; q != 80 || res.Units[1].Discharge != 20 {
		t.Errorf("unit discharges %v %v", res.Units[1].Discharge, q)
	}
	if res.Periods[0].Readings != 2 || res.Periods[1].Readings != 3 || !res.Periods[0].To.Equal(time.Unix(at(9), 0)) {
		t.Errorf("periods %+v", res.Periods)
	}
}

// TestAbruptShiftInRecord: an abrupt diagram at 12:00 splits the day as a
// period's beginning does. Rating Q = 10·h; diagram A at 00:00 constant
// +0.5, diagram B at 12:00 abrupt constant −0.5; constant stage 2 m read
// every 8 h (00, 08, 16, 24):
//
//	00–08: Q = 10·2.5 = 25 → 200;  08–12: 25 → 100;  12–16: 15 → 60;  16–24: 15 → 120
//	mean = 480/24 = 20.
func TestAbruptShiftInRecord(t *testing.T) {
	h := gauged.History{
		Periods: []gauged.Period{{Rating: linear("q=10h", 10)}},
		Shifts: []gauged.ShiftDiagram{
			{Time: time.Unix(at(0), 0), Points: []gauged.ShiftPoint{{Stage: 1, Shift: 0.5}}},
			{Time: time.Unix(at(12), 0), Points: []gauged.ShiftPoint{{Stage: 1, Shift: -0.5}}, Abrupt: true},
		},
	}
	res := compute(t, stages(0, 2, 8, 2, 16, 2, 24, 2), rater(t, h), Options{MaxGap: 8 * time.Hour})
	if d := res.Daily[0]; math.Abs(d.Mean-20) > meanTol || d.Coverage != 1 {
		t.Errorf("day: %+v", d)
	}
	if u := res.Units[2]; u.Shift != -0.5 || u.Effective != 1.5 || u.Discharge != 15 {
		t.Errorf("16:00: %+v", u)
	}
}

// TestFlags: readings before every period, in a period without a rating,
// outside the table, below zero flow and above the highest gauging are
// flagged, and only the first three lack a discharge.
func TestFlags(t *testing.T) {
	rt := &gauged.RatingTable{Name: "r", Points: []gauged.RatingPoint{{Stage: 0.5, Discharge: 1}, {Stage: 3, Discharge: 30}},
		HasZeroFlow: true, ZeroFlow: 0.2, HasHighGauging: true, HighGauging: 2}
	h := gauged.History{Periods: []gauged.Period{
		{From: time.Unix(at(1), 0), Rating: rt},
		{From: time.Unix(at(5), 0)},
		{From: time.Unix(at(6), 0), Rating: rt},
	}}
	res := compute(t, stages(0, 1, 1, 1, 2, 0.1, 3, 2.5, 4, 3.5, 5, 1, 6, 1), rater(t, h), Options{})
	want := []Flag{NoRating, 0, BelowZeroFlow, AboveGaugings, OutsideRating | AboveGaugings, NoRating, 0}
	for i, u := range res.Units {
		noQ := u.Flags&(NoRating|OutsideRating) != 0
		if u.Flags != want[i] || noQ != math.IsNaN(u.Discharge) {
			t.Errorf("reading %d: flags %q, Q %v; want %q", i, u.Flags, u.Discharge, want[i])
		}
	}
	if res.Units[2].Discharge != 0 {
		t.Errorf("below zero flow: Q %v", res.Units[2].Discharge)
	}
	d := res.Daily[0]
	// Covered: 01–02 and 02–03 (two hours); 00–01 and 03–06 have an end without a discharge.
	if math.Abs(d.Coverage-2.0/24) > coverageTol || d.Flags&(NoRating|OutsideRating|BelowZeroFlow|AboveGaugings|Partial) != NoRating|OutsideRating|BelowZeroFlow|AboveGaugings|Partial {
		t.Errorf("day: coverage %v flags %q", d.Coverage, d.Flags)
	}
	if len(res.Warnings) != 4 || !strings.HasPrefix(res.Warnings[0], "1 of 7 readings lies at or below the gauge height of zero flow") {
		t.Errorf("warnings %q", res.Warnings)
	}
}

// TestLowReadingWarnings: readings at or below the gauge height of zero
// flow (those flagged BelowZeroFlow, one rule for the flag and the count)
// are counted with the lowest of them, and readings below the table's lowest
// row by more than its stage range (0.5 to 3 m: below −2 m) are
// missing-value codes, left out as missing readings and warned of once. The -9999 of the cases stands for a logger's
// missing-value code (common practice).
func TestLowReadingWarnings(t *testing.T) {
	withE := &gauged.RatingTable{Name: "r", Points: []gauged.RatingPoint{{Stage: 0.5, Discharge: 1}, {Stage: 3, Discharge: 30}},
		HasZeroFlow: true, ZeroFlow: 0.2}
	noE := &gauged.RatingTable{Name: "r", Points: []gauged.RatingPoint{{Stage: 0.5, Discharge: 1}, {Stage: 3, Discharge: 30}}}
	for _, tc := range []struct {
		name  string
		rt    *gauged.RatingTable
		st    *Stages
		below string // the warning on readings below zero flow ("" none)
		far   string // the warning on readings far below the table ("" none)
	}{
		{"all rated", withE, stages(0, 1, 1, 2, 2, 1), "", ""},
		{"at zero flow", withE, stages(0, 1, 1, 0.2, 2, 1),
			"1 of 3 readings lies at or below the gauge height of zero flow of its rating and is rated 0 (the lowest 0.2 at 2024-01-01T01:00:00Z)", ""},
		{"just below zero flow", withE, stages(0, 1, 1, 0.1, 2, 0.15, 3, 1),
			"2 of 4 readings lie at or below the gauge height of zero flow of their rating and are rated 0 (the lowest 0.1 at 2024-01-01T01:00:00Z)", ""},
		{"at and below zero flow", withE, stages(0, 1, 1, 0.2, 2, 0.15, 3, 0.2, 4, 1),
			"3 of 5 readings lie at or below the gauge height of zero flow of their rating and are rated 0 (the lowest 0.15 at 2024-01-01T02:00:00Z)", ""},
		// A missing-value code is left out: the other three are rated.
		{"a missing-value code", withE, stages(0, 1, 1, -9999, 2, 0.1, 3, 1),
			"1 of 3 readings lies at or below the gauge height of zero flow of its rating and is rated 0 (the lowest 0.1 at 2024-01-01T02:00:00Z)",
			"1 reading lies below the lowest row of its rating table by more than the table's whole stage range " +
				"(the first -9999 at 2024-01-01T01:00:00Z): read as missing-value codes (such as -9999), left out as missing readings"},
		// 0.5 − 2.5 = −2: −2 itself is not far below, −2.01 is.
		{"at the bound", withE, stages(0, 1, 1, -2, 2, 1), "1 of 3 readings lies at or below the gauge height of zero flow", ""},
		{"beyond the bound", withE, stages(0, 1, 1, -2.01, 2, 1), "",
			"1 reading lies below the lowest row of its rating table"},
		{"no zero flow: outside the table", noE, stages(0, 1, 1, -9999, 2, -999), "",
			"2 readings lie below the lowest row of their rating table by more than the table's whole stage range (the first -9999"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			res := compute(t, tc.st, rater(t, gauged.History{Periods: []gauged.Period{{Rating: tc.rt}}}), Options{})
			flagged := 0
			for _, u := range res.Units {
				if u.Flags&BelowZeroFlow != 0 {
					flagged++
				}
			}
			if want := fmt.Sprintf("%d of ", flagged); flagged > 0 && !strings.HasPrefix(tc.below, want) {
				t.Errorf("%d readings flagged below zero flow, the case counts %q", flagged, tc.below)
			}
			for _, c := range []struct{ want, key string }{{tc.below, "below the gauge height of zero flow"}, {tc.far, "below the lowest row"}} {
				i := slices.IndexFunc(res.Warnings, func(w string) bool { return strings.Contains(w, c.key) })
				switch {
				case c.want == "" && i >= 0:
					t.Errorf("unexpected warning %q", res.Warnings[i])
				case c.want != "" && (i < 0 || !strings.HasPrefix(res.Warnings[i], c.want)):
					t.Errorf("warnings %q, want one beginning %q", res.Warnings, c.want)
				}
			}
		})
	}
}

// TestDaysInOffset: with days taken at UTC+10:00, midnight falls at 14:00
// UTC. Readings every 6 h from 00:00 UTC on 1 January, Q = 10·h with h the
// hour of the day in UTC/6 (0, 1, 2, 3, 0, ...). The local day of
// 1 January runs from 14:00 UTC on 31 December; it holds the readings of
// 00:00 and 06:00 and 12:00 UTC, and its covered part is 00:00–14:00 UTC:
//
//	00–06: ½(0+10)·6 = 30;  06–12: ½(10+20)·6 = 90;
//	12–14: Q at 14:00 is 20 + (30−20)·2/6 = 23.333; ½(20+23.333)·2 = 43.333
//	mean = 163.333/14 = 11.667, coverage 14/24.
func TestDaysInOffset(t *testing.T) {
	r := rater(t, gauged.History{Periods: []gauged.Period{{Rating: linear("q=10h", 10)}}})
	st := stages(0, 0, 6, 1, 12, 2, 18, 3, 24, 0)
	res := compute(t, st, r, Options{UTCOffset: 10 * time.Hour, MaxGap: 6 * time.Hour})
	d := res.Daily[0]
	if y, m, dd := d.Date.Date(); y != 2024 || m != 1 || dd != 1 || d.Date.Hour() != 0 {
		t.Fatalf("first day %v", d.Date)
	}
	want := (30 + 90 + 0.5*(20+20+10.0/3)*2) / 14
	if math.Abs(d.Mean-want) > meanTol || math.Abs(d.Coverage-14.0/24) > coverageTol || d.Readings != 3 {
		t.Errorf("day: %+v, want mean %v", d, want)
	}
	if _, err := Compute(st, r, Options{UTCOffset: 15 * time.Hour}); !errors.Is(err, ErrUTCOffset) {
		t.Errorf("offset 15 h: %v", err)
	}
}

// TestDailyMeansIntegrate: over a random record without gaps, the daily
// means weighted by their covered time add up to the integral of the unit
// discharges, computed independently by gonum's integrate.Trapezoidal over
// all readings at once.
func TestDailyMeansIntegrate(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	rt := &gauged.RatingTable{Name: "r", HasZeroFlow: true, ZeroFlow: 0.1,
		Points: []gauged.RatingPoint{{Stage: 0.3, Discharge: 0.5}, {Stage: 0.8, Discharge: 4}, {Stage: 1.5, Discharge: 16}, {Stage: 3, Discharge: 70}}}
	r := rater(t, gauged.History{Periods: []gauged.Period{{Rating: rt}}})
	st := &Stages{}
	tm := at(7.3)
	h := 1.0
	for range 2000 {
		tm += int64(300 + rng.IntN(1500))
		h = math.Min(2.9, math.Max(0.35, h+0.05*rng.NormFloat64()))
		st.Time, st.Stage = append(st.Time, tm), append(st.Stage, h)
	}
	res := compute(t, st, r, Options{MaxGap: time.Hour})
	xs, ys := make([]float64, len(res.Units)), make([]float64, len(res.Units))
	for i, u := range res.Units {
		xs[i], ys[i] = float64(u.Time-st.Time[0]), u.Discharge
	}
	want := integrate.Trapezoidal(xs, ys)
	var got, covered float64
	for _, d := range res.Daily {
		got += d.Mean * d.Coverage * daySeconds
		covered += d.Coverage * daySeconds
	}
	if math.Abs(got-want) > integralTol*want || covered != xs[len(xs)-1] {
		t.Errorf("Σ daily = %v over %v s, trapezoidal %v over %v s", got, covered, want, xs[len(xs)-1])
	}
}

func TestStagesValidate(t *testing.T) {
	for _, tc := range []struct {
		name string
		st   *Stages
		idx  int
		is   error
	}{
		{"empty", &Stages{}, -1, ErrNoReadings},
		{"lengths", &Stages{Time: []int64{1, 2}, Stage: []float64{1}}, -1, ErrStagesLength},
		{"repeated time", &Stages{Time: []int64{1, 1}, Stage: []float64{1, 1}}, 1, ErrStagesOrder},
		{"NaN stage", &Stages{Time: []int64{1, 2}, Stage: []float64{1, math.NaN()}}, 1, ErrStageValue},
		{"quality index", &Stages{Time: []int64{1}, Stage: []float64{1}, Quality: []uint16{2}, Qualities: []string{"", "ice"}}, 0, ErrQualityIndex},
		{"span", &Stages{Time: []int64{0, 1, MaxSpan + 1}, Stage: []float64{1, 1, 1}}, 2, ErrStagesSpan},
		{"before year 1", &Stages{Time: []int64{minTime - 1, 0}, Stage: []float64{1, 1}}, 0, ErrStagesTime},
		{"after year 9999", &Stages{Time: []int64{0, maxTime + 1}, Stage: []float64{1, 1}}, 1, ErrStagesTime},
		{"at the ends of int64", &Stages{Time: []int64{math.MinInt64, math.MaxInt64}, Stage: []float64{1, 1}}, 0, ErrStagesTime},
	} {
		err := tc.st.Validate()
		var se *StagesError
		if !errors.Is(err, tc.is) || !errors.As(err, &se) || se.Index != tc.idx {
			t.Errorf("%s: %v, want %v at %d", tc.name, err, tc.is, tc.idx)
		}
	}
}

func TestFlagWords(t *testing.T) {
	if s := (Gap | AboveGaugings | Partial).String(); s != "above_gaugings gap partial" {
		t.Errorf("flags %q", s)
	}
	if len(FlagWords()) != 8 || Flag(0).String() != "" {
		t.Errorf("words %q", FlagWords())
	}
}

// TestRecordGaugings: gaugings given with the record are measured against
// the history, their departure from the record being their departure from
// the shifted rating; the rater's warnings are stated once.
func TestRecordGaugings(t *testing.T) {
	h := gauged.History{
		Periods: []gauged.Period{{Rating: linear("q=10h", 10)}},
		Shifts: []gauged.ShiftDiagram{
			{Time: time.Unix(at(-48), 0), Points: []gauged.ShiftPoint{{Stage: 1, Shift: 0.5}}},
		},
	}
	// Q = 10·(2 + 0.5) = 25 at 2 m; a gauging of 26 departs by +4 %.
	gs := []gauged.Gauging{{Time: time.Unix(at(6), 0), Stage: 2, Discharge: 26, Source: "g:2"}}
	res := compute(t, stages(0, 2, 6, 2, 12, 2), rater(t, h), Options{Gaugings: gs})
	c := res.Gaugings
	if c == nil || len(c.Gaugings) != 1 {
		t.Fatalf("gaugings %+v", c)
	}
	if g := c.Gaugings[0]; math.Abs(g.Shifted-25) > meanTol || math.Abs(g.ShiftedDeparture-4) > meanTol || g.Applied != 0.5 {
		t.Errorf("gauging %+v", g)
	}
	if compute(t, stages(0, 2, 6, 2), rater(t, h), Options{}).Gaugings != nil {
		t.Error("gaugings without any given")
	}
}

// TestFormatSeconds: a length of time in seconds is written as
// FormatDuration writes the time.Duration wherever a Duration holds it, on
// seeded random lengths up to 200 years and on the edges; below two days
// as the standard library's Duration.String (the reference) without zero
// minutes or seconds; beyond 292 years, where a Duration overflows, by
// hand: 146 461 days, and 500 · 365.25 days = 182 625 days.
func TestFormatSeconds(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	secs := []int64{0, 1, 59, 60, 61, 3599, 3600, 3601, 3660, 86400, 90061}
	for range 2000 {
		secs = append(secs, rng.Int64N(200*36525*864))
		secs = append(secs, rng.Int64N(100000))
	}
	for _, s := range secs {
		if got, want := formatSeconds(s), FormatDuration(time.Duration(s)*time.Second); got != want {
			t.Fatalf("%d s: %q, want %q", s, got, want)
		}
	}
	if got := formatSeconds(146461 * 86400); got != "146461 days" {
		t.Errorf("146 461 days: %q", got)
	}
	if got := formatSeconds(MaxSpan + 61); got != "182625 days 1m1s" {
		t.Errorf("MaxSpan + 61 s: %q", got)
	}
}

// TestLongestSpan: a record from 1800-01-01 to 2200-12-31 (401 years, the
// widest the readers take) is computed: its daily table has one value a
// day, 401·365 + 97 leap days − 1 = 146 461 days apart plus the first,
// 146 462 (Gregorian rule: every fourth year but 1800, 1900, 2100 and
// 2200); its gap, from 00:15 on the first day to the last day's midnight,
// is stated in days, 146 461 days − 15 min = 146 460 days 23 h 45 min,
// where a time.Duration (at most 292 years) would overflow, and hours
// (3515063h45m) are not read at a glance.
func TestLongestSpan(t *testing.T) {
	r := rater(t, gauged.History{Periods: []gauged.Period{{Rating: linear("q=10h", 10)}}})
	st := &Stages{Name: "long", Time: []int64{
		time.Date(1800, 1, 1, 0, 0, 0, 0, time.UTC).Unix(), time.Date(1800, 1, 1, 0, 15, 0, 0, time.UTC).Unix(),
		time.Date(2200, 12, 31, 0, 0, 0, 0, time.UTC).Unix(),
	}, Stage: []float64{1, 1, 1}}
	res := compute(t, st, r, Options{})
	if len(res.Daily) != 401*365+97 {
		t.Errorf("%d daily values, want %d", len(res.Daily), 401*365+97)
	}
	if last := res.Daily[len(res.Daily)-1].Date; !last.Equal(time.Date(2200, 12, 31, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("last day %v", last)
	}
	if w := strings.Join(res.Warnings, "\n"); !strings.Contains(w, "1 gap longer than 2h is not bridged (the longest 146460 days 23h45m, from 1800-01-01T00:15:00Z)") {
		t.Errorf("warnings %q", res.Warnings)
	}
}

func TestFormatDuration(t *testing.T) {
	for _, c := range []struct {
		d    time.Duration
		want string
	}{{2 * time.Hour, "2h"}, {90 * time.Minute, "1h30m"}, {45 * time.Minute, "45m"}, {44*time.Hour + 45*time.Minute, "44h45m"}, {30 * time.Second, "30s"}, {time.Hour + 5*time.Second, "1h0m5s"},
		// From two days on, days of 24 h and the rest (by hand).
		{47*time.Hour + 59*time.Minute, "47h59m"}, {48 * time.Hour, "2 days"}, {75*time.Hour + 30*time.Minute, "3 days 3h30m"},
		{time.Duration(100000*24+21)*time.Hour + 59*time.Minute, "100000 days 21h59m"}} {
		if got := FormatDuration(c.d); got != c.want {
			t.Errorf("%v: %q, want %q", c.d, got, c.want)
		}
	}
}

// TestDailyExtremesAtMidnight: a day's least and greatest discharges
// include the discharge interpolated at its midnights when the record is
// bridged across them, at the midnight's time. Rating Q = 10·h, days in UTC.
// Hand values:
//
//	rising across midnight: 06:00 h=1 (Q 10), 18:00 h=1 (Q 10), 30:00 h=3
//	  (Q 30), bridged (gap 12 h ≤ 12 h): at 24:00 Q = 10 + (30−10)·6/12 = 20.
//	  Day 1: min 10 at 06:00, max 20 at 24:00; day 2: min 20 at 00:00,
//	  max 30 at 06:00.
//	reading at midnight: 12:00 h=1 (Q 10), 24:00 h=2 (Q 20), 36:00 h=2. The
//	  reading at 24:00 ends day 1: day 1 max 20 at 24:00; day 2 min = max =
//	  20 at 00:00 (the earliest time of a tie).
//	across a gap: 12:00 h=1, 30:00 h=3 with a 6 h maximum gap: nothing is
//	  interpolated, day 1 min = max = 10 at 12:00, day 2 min = max = 30 at
//	  06:00.
func TestDailyExtremesAtMidnight(t *testing.T) {
	r := rater(t, gauged.History{Periods: []gauged.Period{{Rating: linear("q=10h", 10)}}})
	type ext struct {
		min, max     float64
		minAt, maxAt float64 // hours after 1 January 00:00 UTC
	}
	for _, tc := range []struct {
		name   string
		st     *Stages
		maxGap time.Duration
		want   []ext
	}{
		{"rising across midnight", stages(6, 1, 18, 1, 30, 3), 12 * time.Hour, []ext{{10, 20, 6, 24}, {20, 30, 24, 30}}},
		{"reading at midnight", stages(12, 1, 24, 2, 36, 2), 12 * time.Hour, []ext{{10, 20, 12, 24}, {20, 20, 24, 24}}},
		{"across a gap", stages(12, 1, 30, 3), 6 * time.Hour, []ext{{10, 10, 12, 12}, {30, 30, 30, 30}}},
	} {
		res := compute(t, tc.st, r, Options{MaxGap: tc.maxGap})
		if len(res.Daily) != len(tc.want) {
			t.Fatalf("%s: %d days, want %d", tc.name, len(res.Daily), len(tc.want))
		}
		for i, w := range tc.want {
			d := res.Daily[i]
			if math.Abs(d.Min-w.min) > meanTol || math.Abs(d.Max-w.max) > meanTol ||
				d.MinTime.Unix() != at(w.minAt) || d.MaxTime.Unix() != at(w.maxAt) {
				t.Errorf("%s: day %d: min %v at %v, max %v at %v; want %+v", tc.name, i+1, d.Min, d.MinTime, d.Max, d.MaxTime, w)
			}
		}
	}
}

// TestCountWords: the record's count warnings read right for one and for
// more: "1 gap longer than 2h is", "2 gaps longer than 2h are", "1 of 3
// readings lies above", on the rating Q = 2·h from 0 to 10 m.
func TestCountWords(t *testing.T) {
	r := rater(t, gauged.History{Periods: []gauged.Period{{Rating: linear("r", 2)}}})
	for _, tc := range []struct {
		name string
		st   *Stages
		want string
	}{
		{"one gap", stages(0, 1, 1, 1, 5, 1), "1 gap longer than 2h is not bridged (the longest 4h, from 2024-01-01T01:00:00Z)"},
		{"two gaps", stages(0, 1, 3, 1, 6, 1), "2 gaps longer than 2h are not bridged (the longest 3h, from 2024-01-01T00:00:00Z)"},
		{"one reading above", stages(0, 1, 1, 11, 2, 1), "1 of 3 readings lies above the top row of its rating table: gauge height (shift applied) 11 m at"},
		{"two readings above", stages(0, 12, 1, 11, 2, 1), "2 of 3 readings lie above the top row of their rating table: gauge heights (shifts applied) 11 to 12 m, from"},
		{"one reading far below", stages(0, 1, 1, -9999, 2, 1), "1 reading lies below the lowest row of its rating table"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			res := compute(t, tc.st, r, Options{})
			if !slices.ContainsFunc(res.Warnings, func(w string) bool { return strings.HasPrefix(w, tc.want) }) {
				t.Errorf("warnings %q, want one beginning %q", res.Warnings, tc.want)
			}
		})
	}
}

// TestDailyExtremesAtBreak: the two sides of an abrupt shift break between
// readings are discharges of the record (the mean integrates them), so
// they count into the day's least and greatest. Rating Q = 10·h; diagram
// at 00:00 constant 0, abrupt diagram at 06:00 constant s; readings every
// 8 h, a maximum gap of 8 h. By hand:
//
//	rising, s = −1: 00:00 h=1 Q=10; 08:00 h=3 Q=20; 16:00 and 24:00 Q=20.
//	  At 06:00 h = 1 + 2·6/8 = 2.5: Q = 25 before the break, 15 after.
//	  Greatest 25 at 06:00 (the readings' greatest is 20), least 10 at
//	  00:00; mean (½(10+25)·6 + ½(15+20)·2 + 20·16)/24 = 460/24.
//	falling, s = +1: 00:00 h=3 Q=30; 08:00 h=1 Q=20; 16:00 and 24:00 Q=20.
//	  At 06:00 h = 1.5: Q = 15 before, 25 after. Least 15 at 06:00 (the
//	  readings' least is 20), greatest 30 at 00:00; mean
//	  (½(30+15)·6 + ½(25+20)·2 + 20·16)/24 = 500/24.
func TestDailyExtremesAtBreak(t *testing.T) {
	for _, tc := range []struct {
		name                   string
		st                     *Stages
		shift                  float64
		min, max               float64
		minAt, maxAt, meanArea float64
	}{
		{"rising, break lowers", stages(0, 1, 8, 3, 16, 3, 24, 3), -1, 10, 25, 0, 6, 460},
		{"falling, break raises", stages(0, 3, 8, 1, 16, 1, 24, 1), 1, 15, 30, 6, 0, 500},
		// On a reading the reading stands for the break: 06:00 h=3 gives
		// Q = 20 with the new shift (the old side, 30, is no unit value);
		// mean (½(10+30)·6 + 20·18)/24 = 480/24.
		{"break on a reading", stages(0, 1, 6, 3, 12, 3, 18, 3, 24, 3), -1, 10, 20, 0, 6, 480},
	} {
		h := gauged.History{
			Periods: []gauged.Period{{Rating: linear("q=10h", 10)}},
			Shifts: []gauged.ShiftDiagram{
				{Time: time.Unix(at(0), 0), Points: []gauged.ShiftPoint{{Stage: 1, Shift: 0}}},
				{Time: time.Unix(at(6), 0), Points: []gauged.ShiftPoint{{Stage: 1, Shift: tc.shift}}, Abrupt: true},
			},
		}
		d := compute(t, tc.st, rater(t, h), Options{MaxGap: 8 * time.Hour}).Daily[0]
		if math.Abs(d.Min-tc.min) > meanTol || math.Abs(d.Max-tc.max) > meanTol || d.MinTime.Unix() != at(tc.minAt) || d.MaxTime.Unix() != at(tc.maxAt) ||
			math.Abs(d.Mean-tc.meanArea/24) > meanTol {
			t.Errorf("%s: min %v at %v, max %v at %v, mean %v; want %+v", tc.name, d.Min, d.MinTime, d.Max, d.MaxTime, d.Mean, tc)
		}
	}
}

// TestReadingsOutsideRating: a record whose readings nearly all lie
// outside the rating table (gauge heights in cm on a rating in m) is
// warned of with both ranges; one with no discharge at all is refused
// (ErrNoDischarge), with the same words. Rating 0 to 10 m.
func TestReadingsOutsideRating(t *testing.T) {
	r := rater(t, gauged.History{Periods: []gauged.Period{{Rating: linear("q=10h", 10)}}})
	_, err := Compute(stages(0, 62, 1, 63, 2, 64.5), r, Options{})
	if !errors.Is(err, ErrNoDischarge) || !strings.Contains(err.Error(), "3 of 3 readings with a rating lie outside their rating table: their gauge heights (shifts applied) run from 62 to 64.5 m, the rating table from 0 to 10 m") ||
		!strings.Contains(err.Error(), "same unit") {
		t.Errorf("all outside: %v", err)
	}
	pairs := []float64{0, 5}
	for k := 1; k <= 20; k++ {
		pairs = append(pairs, float64(k), 60+float64(k))
	}
	res := compute(t, stages(pairs...), r, Options{MaxGap: 24 * time.Hour})
	if !hasWarning(res.Warnings, "20 of 21 readings with a rating lie outside", "from 61 to 80 m", "same gauge datum") {
		t.Errorf("nearly all outside: %q", res.Warnings)
	}
	res = compute(t, stages(0, 5, 1, 5, 2, 12), r, Options{})
	if hasWarning(res.Warnings, "with a rating lie outside") {
		t.Errorf("one outside of three: %q", res.Warnings)
	}
	none := rater(t, gauged.History{Periods: []gauged.Period{{From: time.Unix(at(100), 0), Rating: linear("q=10h", 10)}}})
	if _, err := Compute(stages(0, 5, 1, 5), none, Options{}); !errors.Is(err, ErrNoDischarge) || !strings.Contains(err.Error(), "2 of 2 readings have no rating in force") {
		t.Errorf("no rating: %v", err)
	}
	// Every reading far below the table (missing-value codes, or gauge
	// heights on a rating of elevations): refused, never a panic.
	if _, err := Compute(stages(0, -9999, 1, -9999), r, Options{}); !errors.Is(err, ErrNoDischarge) || !strings.Contains(err.Error(), "every reading is missing") {
		t.Errorf("all missing-value codes: %v", err)
	}
}

// TestMissingReadings: the record's missing readings (times without a
// gauge height) and the readings read as missing-value codes are listed in
// Result.Missing, flagged Missing with no discharge, merged into the unit
// table in time order by UnitRows, and change no daily value: the day is
// that of the readings alone (on Q = 10·h: 00:00 h=1 to 02:00 h=3, mean
// ½(10+30)·2 h / 2 h = 20 by hand).
func TestMissingReadings(t *testing.T) {
	r := rater(t, gauged.History{Periods: []gauged.Period{{Rating: linear("q=10h", 10)}}})
	st := stages(0, 1, 1.5, -9999, 2, 3)
	st.Missing = []int64{at(0.5), at(3)}
	res := compute(t, st, r, Options{})
	if len(res.Units) != 2 || len(res.Missing) != 3 || res.UnitRowCount() != 5 {
		t.Fatalf("%d units, %d missing", len(res.Units), len(res.Missing))
	}
	var times []int64
	for u := range res.UnitRows() {
		times = append(times, u.Time)
		missing := u.Time != at(0) && u.Time != at(2)
		if missing != (u.Flags == Missing) || missing && (!math.IsNaN(u.Discharge) || u.Period != -1) {
			t.Errorf("row at %d: %+v", u.Time, u)
		}
	}
	if want := []int64{at(0), at(0.5), at(1.5), at(2), at(3)}; !slices.Equal(times, want) {
		t.Errorf("unit rows at %v, want %v", times, want)
	}
	if code := res.Missing[1]; code.Stage != -9999 {
		t.Errorf("the code's row %+v, want its stage as read", code)
	}
	if d := res.Daily[0]; math.Abs(d.Mean-20) > integralTol || d.Readings != 2 {
		t.Errorf("day %+v, want mean 20 of 2 readings", d)
	}
	if s := Missing.String(); s != "missing" {
		t.Errorf("flag %q", s)
	}
	st.Missing = []int64{at(3), at(0.5)}
	if _, err := Compute(st, r, Options{}); !errors.Is(err, ErrStagesOrder) {
		t.Errorf("missing readings out of order: %v, want %v", err, ErrStagesOrder)
	}
}

// TestMissingReadingQuality: a missing reading written with a quality
// keeps it in the unit values (Stages.MissingQuality), as a reading read
// as a missing-value code keeps its own; a record whose missing readings
// carry no qualities lists them with none; qualities that do not match
// the missing readings, or are not among Qualities, are refused.
func TestMissingReadingQuality(t *testing.T) {
	r := rater(t, gauged.History{Periods: []gauged.Period{{Rating: linear("q=10h", 10)}}})
	st := stages(0, 1, 1.5, -9999, 2, 3)
	st.Qualities = []string{"", "A", "B"}
	st.Quality = []uint16{1, 2, 1}
	st.Missing = []int64{at(0.5), at(3)}
	st.MissingQuality = []uint16{1, 0}
	res := compute(t, st, r, Options{})
	var got []string
	for u := range res.UnitRows() {
		got = append(got, res.Qualities[u.Quality])
	}
	if want := []string{"A", "A", "B", "A", ""}; !slices.Equal(got, want) {
		t.Errorf("qualities of the unit rows %q, want %q", got, want)
	}
	st.MissingQuality = nil
	res = compute(t, st, r, Options{})
	if q := res.Missing[0].Quality; q != 0 {
		t.Errorf("missing reading without a quality given: quality %d, want 0", q)
	}
	for _, tc := range []struct {
		name string
		q    []uint16
	}{{"one short", []uint16{1}}, {"not among Qualities", []uint16{1, 3}}} {
		st.MissingQuality = tc.q
		if _, err := Compute(st, r, Options{}); !errors.Is(err, ErrStagesLength) && !errors.Is(err, ErrQualityIndex) {
			t.Errorf("%s: %v", tc.name, err)
		}
	}
}

// TestDailyExtremesAtMidnightBreak: a day runs midnight to midnight, both
// ends included, and its least and greatest are taken over the discharges
// its mean integrates: at a rating break at the midnight that ends it (a
// new period or an abrupt diagram), the discharge before the break; the
// discharge from the break, the reading's unit value, opens the next day.
// Maximum gap 12 h; by hand:
//
//	new period on a reading: Q = 10·h, from 24:00 Q = 5·h; 00:00 h=3
//	  Q=30, 12:00 h=2 Q=20, 24:00 h=2.5 Q=25 before the break (12.5 from
//	  it), 36:00 h=2 Q=10. Day 1: least 20 at 12:00, greatest 30 at
//	  00:00, mean (½(30+20)·12 + ½(20+25)·12)/24 = 570/24; day 2: least
//	  10 at 36:00, greatest 12.5 at 24:00, mean ½(12.5+10)·12/12.
//	abrupt diagram on a reading: Q = 10·h, shift 0 from 00:00, +1 from
//	  24:00 abrupt; 00:00 h=1 Q=10, 12:00 h=2 Q=20, 24:00 h=2.5 Q=25
//	  before the break (35 from it), 36:00 h=2 Q=30. Day 1: least 10 at
//	  00:00, greatest 25 at 24:00, mean (½(10+20)·12 + ½(20+25)·12)/24 =
//	  450/24; day 2: least 30 at 36:00, greatest 35 at 24:00, mean
//	  ½(35+30)·12/12.
//	abrupt diagram between readings: readings 00:00 h=1, 10:00 h=1, 20:00
//	  h=1.8, 28:00 h=2, 36:00 h=2; at 24:00 h=1.9, Q = 19 before, 29
//	  after. Day 1: least 10 at 00:00, greatest 19 at 24:00, mean (10·10
//	  + ½(10+18)·10 + ½(18+19)·4)/24 = 314/24; day 2: least 29 at 24:00,
//	  greatest 30 at 28:00, mean (½(29+30)·4 + 30·8)/12.
func TestDailyExtremesAtMidnightBreak(t *testing.T) {
	shifted := func(s float64) gauged.History {
		return gauged.History{
			Periods: []gauged.Period{{Rating: linear("q=10h", 10)}},
			Shifts: []gauged.ShiftDiagram{
				{Time: time.Unix(at(0), 0), Points: []gauged.ShiftPoint{{Stage: 1, Shift: 0}}},
				{Time: time.Unix(at(24), 0), Points: []gauged.ShiftPoint{{Stage: 1, Shift: s}}, Abrupt: true},
			},
		}
	}
	type day struct {
		min, max, minAt, maxAt, area float64
	}
	for _, tc := range []struct {
		name string
		h    gauged.History
		st   *Stages
		want []day
	}{
		{"new period on a reading", gauged.History{Periods: []gauged.Period{
			{Rating: linear("q=10h", 10)}, {From: time.Unix(at(24), 0), Rating: linear("q=5h", 5)},
		}}, stages(0, 3, 12, 2, 24, 2.5, 36, 2), []day{{20, 30, 12, 0, 570}, {10, 12.5, 36, 24, 0.5 * (12.5 + 10) * 12}}},
		{"abrupt diagram on a reading", shifted(1), stages(0, 1, 12, 2, 24, 2.5, 36, 2), []day{{10, 25, 0, 24, 450}, {30, 35, 36, 24, 0.5 * (35 + 30) * 12}}},
		{"abrupt diagram between readings", shifted(1), stages(0, 1, 10, 1, 20, 1.8, 28, 2, 36, 2), []day{{10, 19, 0, 24, 314}, {29, 30, 24, 28, 0.5*(29+30)*4 + 30*8}}},
	} {
		res := compute(t, tc.st, rater(t, tc.h), Options{MaxGap: 12 * time.Hour})
		for i, w := range tc.want {
			d := res.Daily[i]
			covered := d.Coverage * 24
			if math.Abs(d.Min-w.min) > meanTol || math.Abs(d.Max-w.max) > meanTol || d.MinTime.Unix() != at(w.minAt) || d.MaxTime.Unix() != at(w.maxAt) ||
				math.Abs(d.Mean-w.area/covered) > meanTol {
				t.Errorf("%s: day %d: min %v at %v, max %v at %v, mean %v; want %+v", tc.name, i+1, d.Min, d.MinTime, d.Max, d.MaxTime, d.Mean, w)
			}
		}
	}
}

// TestOutsideTableSides: readings with no discharge outside their rating
// table are counted apart below its lowest row and above its top row, each
// with the span of their gauge heights (shifts applied) and of their
// times, and pointed to the option that rates them. Table 0.5 to 3 m,
// zero flow 0.2 m; a shift of +0.1 m from 00:00 to 03:00 in a second case.
func TestOutsideTableSides(t *testing.T) {
	rt := &gauged.RatingTable{Name: "r", Points: []gauged.RatingPoint{{Stage: 0.5, Discharge: 1}, {Stage: 3, Discharge: 30}},
		HasZeroFlow: true, ZeroFlow: 0.2}
	for _, tc := range []struct {
		name         string
		shifts       []gauged.ShiftDiagram
		st           *Stages
		below, above string // the warnings ("" none)
		belowN       int
		aboveN       int
		highest      float64 // the highest recorded stage above the table
		highestAt    float64 // its time, hours
	}{
		{"both sides", nil, stages(0, 0.3, 1, 0.45, 2, 1, 3, 3.2, 4, 3.6, 5, 3.1, 6, 1),
			"2 of 7 readings lie below the lowest row of their rating table: gauge heights (shifts applied) 0.3 to 0.45 m, from 2024-01-01T00:00:00Z to 2024-01-01T01:00:00Z; no discharge (the rating does not allow extrapolation: --extrapolate rates them)",
			"3 of 7 readings lie above the top row of their rating table: gauge heights (shifts applied) 3.1 to 3.6 m, from 2024-01-01T03:00:00Z to 2024-01-01T05:00:00Z; no discharge (the rating does not allow extrapolation: --extrapolate rates them)",
			2, 3, 3.6, 4},
		{"one above, shifted", []gauged.ShiftDiagram{{Time: time.Unix(at(0), 0), Points: []gauged.ShiftPoint{{Stage: 1, Shift: 0.1}}}},
			stages(0, 1, 1, 2.95, 2, 1), "",
			"1 of 3 readings lies above the top row of its rating table: gauge height (shift applied) 3.05 m at 2024-01-01T01:00:00Z; no discharge (the rating does not allow extrapolation: --extrapolate rates them)",
			0, 1, 2.95, 1},
	} {
		t.Run(tc.name, func(t *testing.T) {
			res := compute(t, tc.st, rater(t, gauged.History{Periods: []gauged.Period{{Rating: rt}}, Shifts: tc.shifts}), Options{})
			for _, c := range []struct{ want, key string }{{tc.below, "below the lowest row"}, {tc.above, "above the top row"}} {
				i := slices.IndexFunc(res.Warnings, func(w string) bool { return strings.Contains(w, c.key) })
				switch {
				case c.want == "" && i >= 0:
					t.Errorf("unexpected warning %q", res.Warnings[i])
				case c.want != "" && (i < 0 || res.Warnings[i] != c.want):
					t.Errorf("warnings %q, want %q", res.Warnings, c.want)
				}
			}
			if slices.ContainsFunc(res.Warnings, func(w string) bool { return strings.Contains(w, "outside the rating table") }) {
				t.Errorf("warnings %q lump both sides", res.Warnings)
			}
			if res.BelowTable.Readings != tc.belowN || res.AboveTable.Readings != tc.aboveN ||
				tc.aboveN > 0 && (res.AboveTable.HighestStage != tc.highest || res.AboveTable.HighestAt != at(tc.highestAt)) {
				t.Errorf("below %+v, above %+v", res.BelowTable, res.AboveTable)
			}
		})
	}
}
