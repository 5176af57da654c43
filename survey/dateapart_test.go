package survey

import (
	"errors"
	"strings"
	"testing"
)

// Times of day in the time column beside a date column of their own (a
// field sheet's date and time written apart) are refused once, at the
// first time, saying how to combine them; not as one bad time a row. The
// data are invented.
func TestDateAndTimeApart(t *testing.T) {
	t.Parallel()
	gaugings := func(s string) error { _, err := ParseGaugings(strings.NewReader(s), "g.csv"); return err }
	shifts := func(s string) error {
		_, err := ParseShiftDiagrams(strings.NewReader(s), "g.csv", ShiftTableOptions{})
		return err
	}
	stages := func(s string) error {
		_, err := ParseStageRecord(strings.NewReader(s), "g.csv", StageRecordOptions{})
		return err
	}
	for _, tc := range []struct {
		name, csv string
		read      func(string) error
		at        string
	}{
		{"gaugings", "date,time,stage,discharge\n2024-03-04,09:15,9.9,0.14\n2024-04-11,13:40,10.1,0.7\n", gaugings,
			`g.csv:2:2: time "09:15": a time of day alone, and the date is in column 1 ("date"): combine them into one time column, as 2024-03-04T09:15`},
		{"gaugings, date after", "time,stage,discharge,Date\n9:05:30,9.9,0.14,2024-03-04\n13:40:00,10.1,0.7,2024-04-11\n", gaugings,
			`g.csv:2:1: time "9:05:30": a time of day alone, and the date is in column 4 ("Date"): combine them into one time column, as 2024-03-04T09:05:30`},
		{"shift diagrams", "date,time,stage,shift\n2024-03-04,09:15,9.9,0.02\n2024-04-11,13:40,10.1,0.03\n", shifts,
			`g.csv:2:2: time "09:15": a time of day alone, and the date is in column 1 ("date")`},
		{"stage record", "date,time,stage\n2024-03-04,09:15,9.9\n2024-03-04,09:30,9.91\n", stages,
			`g.csv:2:2: time "09:15": a time of day alone, and the date is in column 1 ("date")`},
	} {
		err := tc.read(tc.csv)
		if !errors.Is(err, ErrDateApart) || !strings.Contains(err.Error(), tc.at) {
			t.Errorf("%s: %v, want ErrDateApart saying %q", tc.name, err, tc.at)
			continue
		}
		if n := strings.Count(err.Error(), "\n"); n > 0 {
			t.Errorf("%s: %d lines, want one:\n%v", tc.name, n+1, err)
		}
	}
	// A date column beside whole times is not read, and no error.
	if err := gaugings("date,time,stage,discharge\n2024-03-04,2024-03-04T09:15,9.9,0.14\n"); err != nil {
		t.Errorf("a date column beside whole times: %v", err)
	}
}
