package survey

import (
	"errors"
	"strings"
	"time"
)

// ErrSerialInCSV is the cause of a bare number in a time cell of a CSV
// file, for errors.Is.
var ErrSerialInCSV = errors.New("a bare number is a date only in a workbook cell: write ISO 8601 in a CSV file")

// MinDateSerial and MaxDateSerial bound a workbook date serial taken as a
// time (1900-01-01 to 9999-12-31 in the 1900 date system).
const (
	MinDateSerial = 1
	MaxDateSerial = 2958465
)

// ParseTime reads a date-time cell: ISO 8601 text in one of the forms
// ParseISOTime reads (a time without an offset is taken as UTC), or, for a
// cell of a workbook (inWorkbook), the workbook's date serial number in
// its date system (date1904), rounded to the second. The result is located
// as ParseISOTime's: at the offset written with the time, else in UTC. A bare number in a CSV file is ErrSerialInCSV; otherwise the errors
// are ParseISOTime's (ErrISOTime, ErrSubSecond, ErrYear).
func ParseTime(s string, inWorkbook, date1904 bool) (time.Time, error) {
	sec, zone, zoned, err := cellTimeZone(strings.TrimSpace(s), inWorkbook, date1904, 0)
	if err != nil {
		return time.Time{}, err
	}
	return instant(sec, zone, zoned), nil
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
