package survey

import (
	"errors"
	"strings"
	"testing"
	"time"
)

// timeParser reads one time cell through one of the readers of times,
// from CSV text held in memory, and returns the instant read.
type timeParser struct {
	name string
	// flag is set for the reader of the command line's times, where a
	// bare number is no workbook date serial but simply not a time.
	flag bool
	// untimed is set for a reader that keeps no time (a rating table,
	// whose valid_from is only checked): it returns the zero time.
	untimed bool
	read    func(cell string) (time.Time, error)
}

// quote writes a cell as a quoted CSV field (RFC 4180, 2), so that a
// decimal comma stays in its cell.
func quote(s string) string { return `"` + s + `"` }

// timeParsers are every way a time written in a file or on the command
// line is read: the streamed stage record, the tables read whole
// (gaugings, shift diagrams, rating periods, a rating table's valid_from),
// the cell reader of a table (ParseTime) and the reader of the flags'
// times (ParseISOTime).
var timeParsers = []timeParser{
	{"stage record", false, false, func(s string) (time.Time, error) {
		r, err := ParseStageRecord(strings.NewReader("time,stage\n"+quote(s)+",0.5\n"), "t.csv", StageRecordOptions{})
		if err != nil {
			return time.Time{}, err
		}
		return time.Unix(r.Stages.Time[0], 0).UTC(), nil
	}},
	{"gaugings", false, false, func(s string) (time.Time, error) {
		g, err := ParseGaugings(strings.NewReader("time,stage,discharge\n"+quote(s)+",0.5,1\n"), "t.csv")
		if err != nil {
			return time.Time{}, err
		}
		return g.Gaugings[0].Time, nil
	}},
	{"shift diagrams", false, false, func(s string) (time.Time, error) {
		d, err := ParseShiftDiagrams(strings.NewReader("time,stage,shift\n"+quote(s)+",0.5,0.1\n"), "t.csv", ShiftTableOptions{})
		if err != nil {
			return time.Time{}, err
		}
		return d.Diagrams[0].Time, nil
	}},
	{"rating periods", false, false, func(s string) (time.Time, error) {
		r, err := ParseRatingTables(strings.NewReader("valid_from,stage,discharge\n"+quote(s)+",0.5,0\n,1.0,3\n"), "t.csv", RatingTableOptions{})
		if err != nil {
			return time.Time{}, err
		}
		return r.Periods[0].From, nil
	}},
	{"rating table", false, true, func(s string) (time.Time, error) {
		_, err := ParseRatingCSV(strings.NewReader("valid_from,stage,discharge\n"+quote(s)+",0.5,0\n,1.0,3\n"), "t.csv", UnitChoice{})
		return time.Time{}, err
	}},
	{"table cell", false, false, func(s string) (time.Time, error) {
		tm, err := ParseTime(s, false, false)
		if err != nil {
			return time.Time{}, &ParseError{File: "t.csv", Row: 2, Column: 1, Name: "time", Text: s, Err: err}
		}
		return tm, nil
	}},
	{"flag", true, false, func(s string) (time.Time, error) {
		tm, err := ParseISOTime(s, 0)
		if err != nil {
			return time.Time{}, &ParseError{File: "t.csv", Row: 2, Column: 1, Name: "time", Text: s, Err: err}
		}
		return tm, nil
	}},
}

// cellCause is the cause of a time error at row 2, column 1: what follows
// the cell's position and name in the message, the same whatever reads
// the cell.
func cellCause(t *testing.T, err error) string {
	t.Helper()
	var pe *ParseError
	if !errors.As(err, &pe) || pe.Row != 2 || pe.Column != 1 {
		t.Fatalf("%v: want one ParseError at row 2, column 1", err)
	}
	return pe.Err.Error()
}

// Every reader of times accepts exactly the same ISO 8601 forms (see
// ParseISOTime) and refuses the others with the same message. The
// instants are worked by hand from the offset rule of RFC 3339, 4.2 (local
// time minus its offset from UTC is UTC), as in ISO 8601-1:2019; time.Date
// is the standard library's calendar.
func TestTimeFormsEveryReader(t *testing.T) {
	t.Parallel()
	utc := func(y int, mo time.Month, d, h, mi, s int) time.Time {
		return time.Date(y, mo, d, h, mi, s, 0, time.UTC)
	}
	for _, tc := range []struct {
		in   string
		want time.Time
		is   error // nil when read
	}{
		{"2024-03-05", utc(2024, 3, 5, 0, 0, 0), nil},
		{"2024-03-05T14:30", utc(2024, 3, 5, 14, 30, 0), nil},
		{"2024-03-05T14:30:15", utc(2024, 3, 5, 14, 30, 15), nil},
		{"2024-03-05 14:30", utc(2024, 3, 5, 14, 30, 0), nil},
		{"2024-03-05 14:30:15", utc(2024, 3, 5, 14, 30, 15), nil},
		{"2024-03-05T9:30", utc(2024, 3, 5, 9, 30, 0), nil},
		{"2024-03-05T14:30:15.000", utc(2024, 3, 5, 14, 30, 15), nil},
		{"2024-03-05T14:30:15,0", utc(2024, 3, 5, 14, 30, 15), nil},
		{"2024-03-05T14:30Z", utc(2024, 3, 5, 14, 30, 0), nil},
		{"2024-03-05t14:30:15z", utc(2024, 3, 5, 14, 30, 15), nil},
		{"2024-03-05 14:30Z", utc(2024, 3, 5, 14, 30, 0), nil},
		{"2024-03-05T14:30+10:00", utc(2024, 3, 5, 4, 30, 0), nil},
		{"2024-03-05 14:30+10:00", utc(2024, 3, 5, 4, 30, 0), nil},
		{"2024-03-05 14:30:15+10:00", utc(2024, 3, 5, 4, 30, 15), nil},
		{"2024-03-05T14:30:15-0500", utc(2024, 3, 5, 19, 30, 15), nil},
		{"2024-03-05T14:30-0500", utc(2024, 3, 5, 19, 30, 0), nil},
		{"2024-03-05T14:30:15-05", utc(2024, 3, 5, 19, 30, 15), nil},
		{"2024-03-05T14:30+0530", utc(2024, 3, 5, 9, 0, 0), nil},
		{"2024-03-05T14:30:15.000-05:00", utc(2024, 3, 5, 19, 30, 15), nil},
		{"2024-02-29T23:59:59", utc(2024, 2, 29, 23, 59, 59), nil},
		{"2024-03-05T14:30:15.250", time.Time{}, ErrSubSecond},
		{"2024-03-05T14:30:15,25Z", time.Time{}, ErrSubSecond},
		{"2024-03-05T14:30+24:00", time.Time{}, ErrISOTime},
		{"2024-03-05T14:30+10:60", time.Time{}, ErrISOTime},
		{"2024-03-05T14:30+1:00", time.Time{}, ErrISOTime},
		{"2024-03-05T14:30 +10:00", time.Time{}, ErrISOTime},
		{"2024-03-05T14:30:15.", time.Time{}, ErrISOTime},
		{"2024-03-05T14", time.Time{}, ErrISOTime},
		{"2024-03-05Z", time.Time{}, ErrISOTime},
		{"2023-02-29", time.Time{}, ErrISOTime},
		{"2024-03-05T24:00", time.Time{}, ErrISOTime},
		{"2024-3-5", time.Time{}, ErrISOTime},
		{"05/03/2024", time.Time{}, ErrISOTime},
		{"March 5", time.Time{}, ErrISOTime},
		{"45356", time.Time{}, ErrSerialInCSV},
		{"2201-01-01", time.Time{}, ErrYear},
	} {
		t.Run(tc.in, func(t *testing.T) {
			t.Parallel()
			var first string // the message of the first reader
			for _, p := range timeParsers {
				got, err := p.read(tc.in)
				if p.flag && tc.is == ErrSerialInCSV {
					if !errors.Is(err, ErrISOTime) {
						t.Errorf("%s: %v, want %v", p.name, err, ErrISOTime)
					}
					continue
				}
				switch {
				case tc.is == nil && err != nil:
					t.Errorf("%s: %v", p.name, err)
				case tc.is == nil && !p.untimed && !got.Equal(tc.want):
					t.Errorf("%s: %v, want %v", p.name, got, tc.want)
				case tc.is != nil && !errors.Is(err, tc.is):
					t.Errorf("%s: %v, want %v", p.name, err, tc.is)
				case tc.is != nil:
					msg := cellCause(t, err)
					if first == "" {
						first = msg
					} else if msg != first {
						t.Errorf("%s says %q, %s %q", p.name, msg, timeParsers[0].name, first)
					}
				}
			}
		})
	}
}

// FuzzTimeReaders: whatever a time cell holds, every reader of times
// reads the same instant or refuses it with the same message.
// Seeds in testdata/fuzz/FuzzTimeReaders.
func FuzzTimeReaders(f *testing.F) {
	f.Add("2024-03-05T14:30:15-0500")
	f.Add("2024-03-05 14:30+10:00")
	f.Add("2024-03-05T14:30:15.25")
	f.Fuzz(func(t *testing.T, s string) {
		s = strings.TrimSpace(s)
		if s == "" || strings.ContainsAny(s, "\"#") || strings.IndexFunc(s, func(r rune) bool { return r < ' ' || r >= 0x7f }) >= 0 {
			return // a cell of one plain line: not a CSV record's other parts
		}
		var (
			first    string
			firstT   time.Time
			firstErr error
		)
		_, nerr := ParseNumber(s)
		for i, p := range timeParsers {
			if p.flag && nerr == nil {
				continue // a bare number: a date serial in a file, no time on the command line
			}
			got, err := p.read(s)
			msg := ""
			if err != nil {
				msg = cellCause(t, err)
			}
			if i == 0 {
				first, firstT, firstErr = msg, got, err
				continue
			}
			if (err == nil) != (firstErr == nil) || msg != first || !p.untimed && !got.Equal(firstT) {
				t.Fatalf("%q: %s reads %v, %q; %s %v, %q", s, p.name, got, msg, timeParsers[0].name, firstT, first)
			}
		}
	})
}
