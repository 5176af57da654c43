package survey

import (
	"errors"
	"strings"
	"time"
)

// Causes of a time cell that cannot be read, for errors.Is.
var (
	ErrBadTime     = errors.New("not a date-time: write ISO 8601 (2024-03-05T14:30 or 2024-03-05)")
	ErrSerialInCSV = errors.New("a bare number is a date only in a workbook cell: write ISO 8601 in a CSV file")
)

// timeLayouts are the ISO 8601 forms a time cell may take, tried in
// order. Day-first and month-first forms (03/04/2026) are left out on
// purpose: they are ambiguous.
var timeLayouts = [...]string{
	time.RFC3339Nano,
	"2006-01-02T15:04:05Z07:00",
	"2006-01-02T15:04Z07:00",
	"2006-01-02 15:04:05Z07:00",
	"2006-01-02T15:04:05",
	"2006-01-02T15:04",
	"2006-01-02 15:04:05",
	"2006-01-02 15:04",
	"2006-01-02",
}

// zonedLayouts is the number of timeLayouts, at their head, that carry a
// UTC offset.
const zonedLayouts = 4

// MinDateSerial and MaxDateSerial bound a workbook date serial taken as a
// time (1900-01-01 to 9999-12-31 in the 1900 date system).
const (
	MinDateSerial = 1
	MaxDateSerial = 2958465
)

// ParseTime reads a date-time cell: ISO 8601 text (a time without an
// offset is returned as written, in UTC), or, for a cell of a workbook
// (inWorkbook), the workbook's date serial number in its date system
// (date1904), rounded to the second. A bare number in a CSV file is
// ErrSerialInCSV; a year outside MinYear to MaxYear (as written) is
// ErrYear; anything else unreadable is ErrBadTime.
func ParseTime(s string, inWorkbook, date1904 bool) (time.Time, error) {
	t, _, err := parseTime(s, inWorkbook, date1904)
	return t, err
}

// parseTime is ParseTime, also telling whether the text carries a UTC
// offset of its own (zoned; a serial has none).
func parseTime(s string, inWorkbook, date1904 bool) (t time.Time, zoned bool, err error) {
	s = strings.TrimSpace(s)
	for i, l := range timeLayouts {
		if t, err := time.Parse(l, s); err == nil {
			if err := checkYear(int64(t.Year())); err != nil {
				return time.Time{}, false, err
			}
			return t, i < zonedLayouts, nil
		}
	}
	v, err := ParseNumber(s)
	if err != nil {
		return time.Time{}, false, ErrBadTime
	}
	if !inWorkbook {
		return time.Time{}, false, ErrSerialInCSV
	}
	t, err = serialTime(v, date1904, ErrBadTime)
	return t, false, err
}

// Time parses a date-time cell of a record (see ParseTime; a sheet's
// cells are workbook cells). Blank cells return ok == false and no error;
// a bad cell is a *ParseError at it.
func (t *Table) Time(rec Record, col int) (v time.Time, ok bool, err error) {
	s := t.Cell(rec, col)
	if s == "" {
		return time.Time{}, false, nil
	}
	tm, perr := ParseTime(s, t.Sheet != "", t.Date1904)
	if perr != nil {
		return time.Time{}, false, t.At(rec, col, perr)
	}
	return tm, true, nil
}
