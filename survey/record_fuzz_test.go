package survey

import (
	"errors"
	"math"
	"strings"
	"testing"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/rating/record"
)

// checkPositioned fails unless err is nil or made of ParseErrors naming
// file (a count of errors not shown aside).
func checkPositioned(t *testing.T, err error, file string) {
	t.Helper()
	for _, e := range unjoin(err) {
		var pe *ParseError
		if !errors.As(e, &pe) {
			if strings.Contains(e.Error(), "more errors not shown") {
				continue
			}
			t.Fatalf("error %q (%T) is not a ParseError", e, e)
		}
		if pe.File != file {
			t.Fatalf("error %q names file %q", e, pe.File)
		}
	}
}

// FuzzParseStageRecord: any text gives a valid record or positioned
// errors, never a panic. Seeds in testdata/fuzz/FuzzParseStageRecord.
func FuzzParseStageRecord(f *testing.F) {
	f.Add("time,stage\n2024-05-01T00:00,1.2\n2024-05-01T00:15,1.3\n", int8(0))
	f.Add("date,time,stage\n2024-05-01,00:00,1.2\n2024-05-01,00:15,1.3\n", int8(0))
	f.Add("time,stage (ft)\n2024-05-01T00:00,1.2\n", int8(0))
	f.Add("time,gauge height [m],quality\n2024-05-01T00:00,1.2,good\n", int8(3))
	f.Add("time,stage,stage\n2024-05-01T00:00,1.2,1.3\n", int8(0))
	f.Add("time,stage\n2024-05-01T00:00,1e308\n2024-05-01T00:15,-9999\n", int8(0))
	f.Add("time,stage\n0001-01-01T00:00,1\n2024-05-01T00:15,1\n", int8(0))
	f.Add("time,stage\n2024-05-01T00:00,1\n2024-05-01T00:15Z,1\n", int8(10))
	f.Add("time,stage,gauge_height\n2024-05-01T00:00,1,1\n", int8(0))
	f.Add("time,stage\n2024-05-01T00:00,0.7\xb0\n", int8(0))
	f.Add("time,stage,,\n2024-05-01T00:00,1,,\n2024-05-01T00:15,1,5\n\"2024-05-01T00:30\",1,,\"x\"\n", int8(0))
	first := time.Date(MinYear, 1, 1, 0, 0, 0, 0, time.UTC).Unix() - int64(record.MaxUTCOffset/time.Second)
	last := time.Date(MaxYear, 12, 31, 23, 59, 59, 0, time.UTC).Unix() + int64(record.MaxUTCOffset/time.Second)
	f.Fuzz(func(t *testing.T, in string, offsetHours int8) {
		off := time.Duration(offsetHours%15) * time.Hour
		r, err := ParseStageRecord(strings.NewReader(in), "f.csv", StageRecordOptions{UTCOffset: off})
		checkPositioned(t, err, "f.csv")
		if err != nil {
			return
		}
		if err := r.Stages.Validate(); err != nil {
			t.Fatalf("record read is not valid: %v", err)
		}
		for i, h := range r.Stages.Stage {
			if math.Abs(h) > MaxElevation {
				t.Errorf("reading %d: implausible stage %g accepted", i, h)
			}
			if tm := r.Stages.Time[i]; tm < first || tm > last {
				t.Errorf("reading %d: time %s outside the years %d to %d accepted", i, time.Unix(tm, 0).UTC(), MinYear, MaxYear)
			}
		}
	})
}

// FuzzCSVStream: the streaming reader reads any text exactly as
// encoding/csv does (the reference). Seeds in testdata/fuzz/FuzzCSVStream.
func FuzzCSVStream(f *testing.F) {
	f.Add("a,b\n\"1\n2\",3\n")
	f.Add("a,b\n1,2\xb0\n")
	f.Add("a,b\n\"1\n\xe9\",3\n")
	f.Add("a,b\r1,2\r")
	f.Add("a\tb\n1\t2\n")
	f.Fuzz(func(t *testing.T, in string) {
		checkStreamMatches(t, in)
	})
}

// isoLayouts are standard-library layouts that read a subset of what
// ParseISOTime reads.
var isoLayouts = []string{
	"2006-01-02T15:04:05Z07:00", "2006-01-02T15:04Z07:00", "2006-01-02T15:04:05", "2006-01-02T15:04",
	"2006-01-02 15:04:05Z07:00", "2006-01-02 15:04:05", "2006-01-02 15:04", "2006-01-02",
	"2006-01-02T15:04:05Z0700", "2006-01-02T15:04:05Z07",
}

// FuzzParseISOTime: wherever time.Parse (the reference) reads a whole
// second with one of isoLayouts, ParseISOTime reads the same instant; what
// ParseISOTime reads, formatted in RFC 3339 and read again, is the same
// instant.
// Seeds in testdata/fuzz/FuzzParseISOTime.
func FuzzParseISOTime(f *testing.F) {
	f.Add("2024-03-05T14:30+10:00")
	f.Fuzz(func(t *testing.T, s string) {
		got, err := ParseISOTime(s, 0)
		if y := got.Year(); err == nil && y >= 0 && y <= 9999 { // RFC 3339 writes four-digit years only
			again, err := ParseISOTime(got.Format(time.RFC3339), 0)
			if err != nil || !again.Equal(got) {
				t.Fatalf("%q → %v → %v, %v", s, got, again, err)
			}
		}
		if strings.Contains(s, "  ") {
			return // time.Parse takes a run of spaces for one; ParseISOTime does not
		}
		for _, l := range isoLayouts {
			want, werr := time.Parse(l, s)
			if werr != nil || want.Nanosecond() != 0 {
				continue
			}
			if _, zo := want.Zone(); zo >= 24*3600 || zo <= -24*3600 {
				continue
			}
			if y := want.Year(); y < MinYear || y > MaxYear { // the year as written
				if !errors.Is(err, ErrYear) {
					t.Fatalf("%q: %v, %v; want ErrYear", s, got, err)
				}
				continue
			}
			if err != nil || !got.Equal(want) {
				t.Fatalf("%q: %v, %v; time.Parse(%q) %v", s, got, err, l, want)
			}
		}
	})
}

// FuzzParseDecimal: the fast number reader agrees with ParseNumber bit for
// bit. Seeds in testdata/fuzz/FuzzParseDecimal.
func FuzzParseDecimal(f *testing.F) {
	f.Add("123.456")
	f.Fuzz(func(t *testing.T, s string) {
		want, werr := ParseNumber(s)
		got, gerr := parseDecimal([]byte(s))
		if (werr == nil) != (gerr == nil) || werr == nil && math.Float64bits(got) != math.Float64bits(want) {
			t.Fatalf("%q: %v, %v; ParseNumber %v, %v", s, got, gerr, want, werr)
		}
	})
}

// FuzzParseShiftDiagrams: any text gives diagrams that compile into a
// history, or positioned errors. Seeds in
// testdata/fuzz/FuzzParseShiftDiagrams.
func FuzzParseShiftDiagrams(f *testing.F) {
	f.Add("time,stage,shift,taper,abrupt\n2024-03-01,0.5,0.1,1.5,\n")
	f.Add("time,stage (ft),shift (ft),taper (m),abrupt\n2024-03-01,0.5,0.1,1.5,\n")
	f.Add("time,stage [m],shift (m)\n2024-03-01,,0.1\n")
	f.Add("time,stage,shift,taper\n2024-03-01,1e308,1e300,1e200\n")
	f.Fuzz(func(t *testing.T, in string) {
		ds, err := ParseShiftDiagrams(strings.NewReader(in), "f.csv", ShiftTableOptions{})
		checkPositioned(t, err, "f.csv")
		if err != nil {
			return
		}
		if _, err := (gauged.History{Shifts: ds.Diagrams}).Compile(); err != nil {
			t.Fatalf("diagrams read do not compile: %v", err)
		}
		for _, d := range ds.Diagrams {
			for _, p := range d.Points {
				if math.Abs(p.Stage) > MaxElevation || math.Abs(p.Shift) > MaxElevation {
					t.Fatalf("implausible point %+v accepted", p)
				}
			}
			if d.HasTaper && math.Abs(d.Taper) > MaxElevation {
				t.Fatalf("implausible taper %g accepted", d.Taper)
			}
		}
	})
}

// fuzzFallTol is the relative round-off allowed when checking that a
// rating read never falls (an interpolated value at a row's stage).
const fuzzFallTol = 1e-12

// FuzzParseRatingTables: any text gives ratings that compile into a
// history and never fall as the stage rises, or positioned errors. Seeds
// in testdata/fuzz/FuzzParseRatingTables.
func FuzzParseRatingTables(f *testing.F) {
	f.Add("stage,discharge\n0.5,1\n1,3\n", 0.2, true)
	f.Add("Stage (ft),discharge [cfs],lower_95 (ft3/s)\n0.5,1,0.9\n1,3,2.8\n", math.NaN(), false)
	f.Add("stage (ft),discharge (m3/s)\n0.5,1\n", math.NaN(), false)
	f.Add("stage,discharge\n0.5,1\n2e5,1e308\n", math.NaN(), false)
	f.Add("stage,depth,discharge\n100.3,0,0\n100.4,0.03,0.0037\n100.5,0.13,0.12\n", math.NaN(), false)
	f.Add("stage,depth,discharge\n100.3,0.2,0\n100.4,,0.0037\n100.5,0.05,0.12\n", math.NaN(), true)
	f.Fuzz(func(t *testing.T, in string, e float64, extrapolate bool) {
		rs, err := ParseRatingTables(strings.NewReader(in), "f.csv", RatingTableOptions{HasZeroFlow: !math.IsNaN(e), ZeroFlow: e, Extrapolate: extrapolate})
		checkPositioned(t, err, "f.csv")
		if err != nil {
			return
		}
		if u := rs.Units; u.Found && (u.At == nil || u.At.Column < 1 || u.Text == "") {
			t.Fatalf("header units %+v without their column", u)
		}
		r, err := gauged.History{Periods: rs.Periods}.Compile()
		if err != nil {
			t.Fatalf("ratings read do not compile: %v", err)
		}
		for _, p := range rs.Periods {
			for _, pt := range p.Rating.Points {
				if math.Abs(pt.Stage) > MaxElevation || pt.Discharge > rating.MaxDischarge {
					t.Fatalf("implausible row %+v accepted", pt)
				}
			}
		}
		for p := range rs.Periods {
			rt := r.Rating(p)
			lo, hi := rt.Range()
			prev := math.Inf(-1)
			for k := 0; k <= 20; k++ {
				q, _ := rt.Discharge(lo + (hi-lo)*float64(k)/20)
				if q < prev*(1-fuzzFallTol) {
					t.Fatalf("rating %d falls: %v after %v", p, q, prev)
				}
				prev = math.Max(prev, q)
			}
		}
	})
}
