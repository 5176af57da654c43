package survey

import (
	"errors"
	"fmt"
	"math"
	"time"

	"github.com/xuri/excelize/v2"

	"wetline/rating/record"
)

// Causes of time errors in records and diagrams, for errors.Is.
var (
	ErrISOTime      = errors.New("not an ISO 8601 date-time (write 2024-03-05T14:30, 2024-03-05 14:30:00+10:00 or 2024-03-05)")
	ErrSubSecond    = errors.New("fractions of a second are not kept: round the time to the second")
	ErrTimeOrder    = errors.New("times must increase from row to row")
	ErrRepeatedTime = errors.New("repeated time")
)

// ParseISOTime reads an ISO 8601 date-time: a date (2024-03-05), or a date
// and a time to the minute or second (2024-03-05T14:30, 2024-03-05
// 14:30:15; 'T' or a space between them; a one-digit hour is allowed, as
// spreadsheets write it), with an optional offset (Z,
// +10:00, -0500, +10). A time written without an offset is at UTC plus
// offset (UTC when offset is 0). Fractions of a second are allowed only
// when zero. The result is in UTC. Errors wrap ErrISOTime or ErrSubSecond.
func ParseISOTime(s string, offset time.Duration) (time.Time, error) {
	sec, err := parseISO(s, int64(offset/time.Second))
	if err != nil {
		return time.Time{}, err
	}
	return time.Unix(sec, 0).UTC(), nil
}

// parseISO reads an ISO 8601 date-time (see ParseISOTime) as Unix seconds;
// off is the offset in seconds of a time written without one.
func parseISO[T string | []byte](b T, off int64) (int64, error) {
	n := len(b)
	if n < 10 || b[4] != '-' || b[7] != '-' {
		return 0, ErrISOTime
	}
	y, ok1 := digits(b, 0, 4)
	mo, ok2 := digits(b, 5, 2)
	d, ok3 := digits(b, 8, 2)
	if !ok1 || !ok2 || !ok3 || mo < 1 || mo > 12 || d < 1 || d > daysIn(y, mo) {
		return 0, ErrISOTime
	}
	days := daysFromCivil(y, mo, d)
	if n == 10 {
		return days*86400 - off, nil
	}
	if c := b[10]; c != 'T' && c != 't' && c != ' ' {
		return 0, ErrISOTime
	}
	// The hour may have one digit, as spreadsheets write it (9:30).
	i := 12
	if i < n && b[i] != ':' {
		i++
	}
	hh, ok1 := digits(b, 11, i-11)
	if i >= n || b[i] != ':' {
		return 0, ErrISOTime
	}
	mm, ok2 := digits(b, i+1, 2)
	if !ok1 || !ok2 || hh > 23 || mm > 59 {
		return 0, ErrISOTime
	}
	i += 3
	var ss int64
	if i < n && b[i] == ':' {
		v, ok := digits(b, i+1, 2)
		if !ok || v > 59 {
			return 0, ErrISOTime
		}
		ss, i = v, i+3
		if i < n && (b[i] == '.' || b[i] == ',') {
			j := i + 1
			nonzero := false
			for j < n && b[j] >= '0' && b[j] <= '9' {
				nonzero = nonzero || b[j] != '0'
				j++
			}
			if j == i+1 {
				return 0, ErrISOTime
			}
			if nonzero {
				return 0, ErrSubSecond
			}
			i = j
		}
	}
	zone, err := zoneOffset(b, i, off)
	if err != nil {
		return 0, err
	}
	return days*86400 + hh*3600 + mm*60 + ss - zone, nil
}

// zoneOffset reads the zone designator at b[i:] (none, Z, ±hh[[:]mm]) as
// seconds east of UTC; off when there is none.
func zoneOffset[T string | []byte](b T, i int, off int64) (int64, error) {
	n := len(b)
	switch {
	case i == n:
		return off, nil
	case (b[i] == 'Z' || b[i] == 'z') && i+1 == n:
		return 0, nil
	case b[i] != '+' && b[i] != '-':
		return 0, ErrISOTime
	}
	sign := int64(1)
	if b[i] == '-' {
		sign = -1
	}
	hh, ok := digits(b, i+1, 2)
	if !ok || hh > 23 {
		return 0, ErrISOTime
	}
	var mm int64
	switch j := i + 3; {
	case j == n:
	case b[j] == ':' && j+3 == n, b[j] != ':' && j+2 == n:
		if b[j] == ':' {
			j++
		}
		if mm, ok = digits(b, j, 2); !ok || mm > 59 {
			return 0, ErrISOTime
		}
	default:
		return 0, ErrISOTime
	}
	return sign * (hh*3600 + mm*60), nil
}

// digits reads the w decimal digits at b[i:].
func digits[T string | []byte](b T, i, w int) (int64, bool) {
	if i+w > len(b) {
		return 0, false
	}
	var v int64
	for k := i; k < i+w; k++ {
		c := b[k]
		if c < '0' || c > '9' {
			return 0, false
		}
		v = 10*v + int64(c-'0')
	}
	return v, true
}

// daysIn is the number of days in month m of year y (proleptic Gregorian).
func daysIn(y, m int64) int64 {
	switch m {
	case 2:
		if y%4 == 0 && (y%100 != 0 || y%400 == 0) {
			return 29
		}
		return 28
	case 4, 6, 9, 11:
		return 30
	}
	return 31
}

// daysFromCivil is the number of days from 1970-01-01 to the date y-m-d of
// the proleptic Gregorian calendar.
//
// References:
//
//	Hinnant, H., 2013, chrono-Compatible Low-Level Date Algorithms
//	(days_from_civil), https://howardhinnant.github.io/date_algorithms.html.
func daysFromCivil(y, m, d int64) int64 {
	if m <= 2 {
		y--
	}
	era := y
	if era < 0 {
		era -= 399
	}
	era /= 400
	yoe := y - era*400
	mp := (m + 9) % 12 // March = 0
	doy := (153*mp+2)/5 + d - 1
	doe := yoe*365 + yoe/4 - yoe/100 + doy
	return era*146097 + doe - 719468
}

// checkOffset checks a UTC offset as the record does (record.ErrUTCOffset)
// and returns it in seconds.
func checkOffset(off time.Duration) (int64, error) {
	if off%time.Second != 0 || off > record.MaxUTCOffset || off < -record.MaxUTCOffset {
		return 0, fmt.Errorf("%w: %v", record.ErrUTCOffset, off)
	}
	return int64(off / time.Second), nil
}

// cellTime reads a time cell of a record or a diagram: ISO 8601 text, or in
// a workbook a date serial (local time at the offset off, in seconds),
// rounded to the second. In a CSV file a bare number is ErrSerialInCSV.
func cellTime(s string, inWorkbook, date1904 bool, off int64) (int64, error) {
	sec, err := parseISO(s, off)
	if err == nil || errors.Is(err, ErrSubSecond) {
		return sec, err
	}
	v, nerr := ParseNumber(s)
	if nerr != nil {
		return 0, ErrISOTime
	}
	if !inWorkbook {
		return 0, ErrSerialInCSV
	}
	if v < MinDateSerial || v > MaxDateSerial {
		return 0, fmt.Errorf("%w (date serial %g is out of range)", ErrISOTime, v)
	}
	t, err := excelize.ExcelDateToTime(v, date1904)
	if err != nil {
		return 0, fmt.Errorf("%w (%v)", ErrISOTime, err)
	}
	t = t.Round(time.Second)
	return t.Unix() - off, nil
}

// formatUnix writes Unix seconds as ISO 8601 in UTC, for messages.
func formatUnix(sec int64) string {
	if sec == math.MinInt64 {
		return "the beginning"
	}
	return time.Unix(sec, 0).UTC().Format(time.RFC3339)
}

// ReadGaugingsAt reads gaugings as ReadGaugings does, except that a time
// written without an offset (or a workbook date cell) is taken at UTC plus
// offset, as the stage record and the shift diagrams of the same gauge are
// read; ReadGaugings takes such times as UTC. Repeated times are found
// among the instants so read. Errors are ReadGaugings', and
// record.ErrUTCOffset for an offset out of range.
func ReadGaugingsAt(path, sheet string, offset time.Duration) (Gaugings, error) {
	t, err := readTable(path, sheet, FieldSheetGaugings)
	if err != nil {
		return Gaugings{}, err
	}
	off, err := checkOffset(offset)
	if err != nil {
		return Gaugings{}, &ParseError{File: t.File, Sheet: t.Sheet, Err: err}
	}
	if ct := t.Column(ColGaugingTime); ct >= 0 && off != 0 {
		inWorkbook := t.Sheet != ""
		for _, rec := range t.Records {
			s := t.Cell(rec, ct)
			utc, err1 := cellTime(s, inWorkbook, t.Date1904, 0)
			local, err2 := cellTime(s, inWorkbook, t.Date1904, off)
			if err1 == nil && err2 == nil && utc != local { // written without an offset
				rec.Cells[ct] = time.Unix(local, 0).UTC().Format(time.RFC3339)
			}
		}
	}
	g, err := GaugingsFromTable(t)
	g.Warnings = append(t.Warnings, g.Warnings...)
	return g, err
}
