package survey

import (
	"errors"
	"fmt"
	"regexp"
	"strings"
)

// ColDate is the name of a column holding the date alone, written apart
// from the time of day in the time column: no reader reads it, and one
// beside times of day is refused (ErrDateApart).
const ColDate = "date"

// ErrDateApart is the cause of a time column whose first time is a time
// of day alone (09:15) in a table with a date column of its own: each
// time needs its date, in the one cell (2024-03-04T09:15). It is said
// once, at the first time, not as a bad time on every row.
var ErrDateApart = errors.New("a time of day alone")

var (
	timeOfDay = regexp.MustCompile(`^([0-9]{1,2}):([0-5][0-9])(:[0-5][0-9])?$`)
	isoDay    = regexp.MustCompile(`^[0-9]{4}-[0-9]{2}-[0-9]{2}`)
)

// dateColumn returns the index of header's date column (ColDate, as
// columns are matched) other than the time column ct, or -1.
func dateColumn(header []string, ct int) int {
	for i, h := range header {
		if i != ct && normName(h) == ColDate {
			return i
		}
	}
	return -1
}

// dateApartError is the error (ErrDateApart) of the time cell tc of the
// first row read, beside the date cell dc of the date column cd of
// header (see dateColumn; -1 for none): nil unless tc is a time of day
// alone and the table has a date column. It shows the two combined, as
// the time column takes them, from the row's own date when that is
// written in ISO 8601.
func dateApartError(header []string, cd int, tc, dc string) error {
	m := timeOfDay.FindStringSubmatch(strings.TrimSpace(tc))
	if cd < 0 || m == nil {
		return nil
	}
	day := "YYYY-MM-DD"
	if d := isoDay.FindString(strings.TrimSpace(dc)); d != "" {
		day = d
	}
	hour := m[1]
	if len(hour) == 1 {
		hour = "0" + hour
	}
	return fmt.Errorf("%w, and the date is in column %d (%q): combine them into one time column, as %sT%s:%s%s",
		ErrDateApart, cd+1, echo(header[cd]), day, hour, m[2], m[3])
}

// dateApart is dateApartError for a table read whole, at the time cell
// (column ct) of its first row with a time; nil when there is none or
// the times are not written apart from a date column.
func (t *Table) dateApart(ct int) *ParseError {
	cd := dateColumn(t.Header, ct)
	if cd < 0 {
		return nil
	}
	for _, rec := range t.Records {
		if t.Cell(rec, ct) == "" {
			continue
		}
		if err := dateApartError(t.Header, cd, t.Cell(rec, ct), t.Cell(rec, cd)); err != nil {
			return t.At(rec, ct, err)
		}
		return nil
	}
	return nil
}
