package survey

import (
	"errors"
	"fmt"
	"strconv"
	"strings"
	"time"

	"github.com/xuri/excelize/v2"
)

// ErrNotTime is the cause of a cell that is neither a date serial nor a
// date written in one of TimeLayouts.
var ErrNotTime = errors.New("not a date and time (write yyyy-mm-dd hh:mm)")

// TimeLayouts are the text forms of a date-time cell that Table.Time reads,
// tried in order. Day-first and month-first forms (03/04/2026) are left out
// on purpose: they are ambiguous.
var TimeLayouts = []string{
	time.RFC3339,
	"2006-01-02T15:04:05",
	"2006-01-02T15:04",
	"2006-01-02 15:04:05",
	"2006-01-02 15:04",
	"2006-01-02",
}

// Bounds of a spreadsheet date serial Table.Time accepts: 1 is 1900-01-01
// (or 1904-01-02) and 2958465 is 9999-12-31.
const (
	minDateSerial = 1
	maxDateSerial = 2958465
)

// Time parses a date-time cell: a spreadsheet date serial number (in the
// workbook's 1900 or 1904 date system; CSV uses 1900) or text in one of
// TimeLayouts. Times without a zone are returned in UTC, as written.
// Blank cells return ok == false and no error.
func (t *Table) Time(rec Record, col int) (v time.Time, ok bool, err error) {
	s := t.Cell(rec, col)
	if s == "" {
		return time.Time{}, false, nil
	}
	if x, perr := strconv.ParseFloat(s, 64); perr == nil {
		if !(x >= minDateSerial && x <= maxDateSerial) {
			return time.Time{}, false, t.At(rec, col, fmt.Errorf("%w: date serial %s is out of range", ErrNotTime, s))
		}
		tm, cerr := excelize.ExcelDateToTime(x, t.Date1904)
		if cerr != nil {
			return time.Time{}, false, t.At(rec, col, fmt.Errorf("%w: %v", ErrNotTime, cerr))
		}
		// Serials carry no seconds reliably: round to the nearest second.
		return tm.Round(time.Second), true, nil
	}
	text := strings.TrimSpace(s)
	for _, layout := range TimeLayouts {
		if tm, perr := time.Parse(layout, text); perr == nil {
			return tm, true, nil
		}
	}
	return time.Time{}, false, t.At(rec, col, ErrNotTime)
}
