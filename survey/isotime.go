package survey

import (
	"errors"
	"fmt"
	"math"
	"regexp"
	"strings"
	"time"

	"github.com/xuri/excelize/v2"

	"wetline/rating/record"
)

// ErrAmbiguousDate is the cause of a date written day/month/year or
// month/day/year (03/04/2026, 3.4.2026): which is the day cannot be told.
// Its errors also wrap ErrISOTime.
var ErrAmbiguousDate = errors.New("ambiguous (day-first or month-first)")

// dayMonthDate matches the start of a time written as a date of three
// numbers separated by slashes or dots, the year last.
var dayMonthDate = regexp.MustCompile(`^([0-9]{1,2})([./])([0-9]{1,2})([./])([0-9]{2}|[0-9]{4})(?:$|[ T])`)

// dayMonthError is the error of a day/month/year date: it wraps
// ErrAmbiguousDate and ErrISOTime, and shows the ISO 8601 forms of its
// readings.
type dayMonthError struct {
	iso string
	// one is set when only one reading is a date (13/04/2026).
	one bool
}

func (e *dayMonthError) Error() string {
	if e.one {
		return fmt.Sprintf("a date written with the day and month as numbers is %v: write ISO 8601 (%s)", ErrAmbiguousDate, e.iso)
	}
	return fmt.Sprintf("%v: write ISO 8601 (%s)", ErrAmbiguousDate, e.iso)
}

func (e *dayMonthError) Unwrap() []error { return []error{ErrAmbiguousDate, ErrISOTime} }

// slashDate reports whether b, leading spaces dropped, has a slash or a
// dot as its second or third byte, as a day/month/year date has: the cheap
// test before dayMonth's pattern, which most texts (date serials of
// workbook cells among them) then skip.
func slashDate[T string | []byte](b T) bool {
	i := 0
	for i < len(b) && b[i] == ' ' {
		i++
	}
	for _, j := range []int{i + 1, i + 2} {
		if j < len(b) && (b[j] == '/' || b[j] == '.') {
			return true
		}
	}
	return false
}

// dayMonth returns a *dayMonthError when s starts as a date written
// day/month/year or month/day/year (slashes or dots, one separator), nil
// otherwise. With a four-digit year the error gives the ISO 8601 date of
// each reading that is a date (day-first first).
func dayMonth(s string) error {
	m := dayMonthDate.FindStringSubmatch(strings.TrimSpace(s))
	if m == nil || m[2] != m[4] {
		return nil
	}
	if len(m[5]) != 4 {
		return &dayMonthError{iso: "YYYY-MM-DD, such as 2026-04-03"}
	}
	a, b := decimalDigits(m[1]), decimalDigits(m[3])
	var forms []string
	for _, dm := range [][2]int{{a, b}, {b, a}} {
		d, mo := dm[0], dm[1]
		y := decimalDigits(m[5])
		if mo >= 1 && mo <= 12 && d >= 1 && d <= int(daysIn(int64(y), int64(mo))) {
			f := fmt.Sprintf("%s-%02d-%02d", m[5], mo, d)
			if len(forms) == 0 || forms[0] != f {
				forms = append(forms, f)
			}
		}
	}
	switch len(forms) {
	case 0:
		return &dayMonthError{iso: "YYYY-MM-DD, such as 2026-04-03"}
	case 1:
		return &dayMonthError{iso: forms[0], one: true}
	}
	return &dayMonthError{iso: forms[0] + " day-first, " + forms[1] + " month-first"}
}

// decimalDigits reads a string of decimal digits.
func decimalDigits(s string) int {
	n := 0
	for _, c := range s {
		n = n*10 + int(c-'0')
	}
	return n
}

// Causes of time errors in records and diagrams, for errors.Is.
var (
	ErrISOTime      = errors.New("not an ISO 8601 date-time (write 2024-03-05T14:30, 2024-03-05 14:30:00+10:00 or 2024-03-05)")
	ErrSubSecond    = errors.New("fractions of a second are not kept: round the time to the second")
	ErrTimeOrder    = errors.New("times must increase from row to row")
	ErrRepeatedTime = errors.New("repeated time")
	// ErrYear is the cause of a time whose year, as written, lies outside
	// MinYear to MaxYear.
	ErrYear = errors.New("is not a plausible year for a gauge record")
	// ErrMixedOffsets is the cause of a time written with a UTC offset in a
	// file whose first time has none, or the other way round.
	ErrMixedOffsets = errors.New("times with and without a UTC offset in one file")
)

// MinYear and MaxYear bound the year of every time read: the cells of
// stage records, gaugings, shift diagrams and rating periods (valid_from),
// and the times of the command line's flags, as written (before any UTC
// offset is applied; a workbook date serial by the date it stands for). A
// year outside them is a slip (a date cell left at a program's zero date,
// 0001-01-01, or a year typed with a digit too many), refused as ErrYear
// at its cell. The bound keeps every record within 401 years, so its
// daily table within 146 462 days (the days of 1800 to 2200), and every
// span between two times within int64 seconds (see record.MaxSpan).
const (
	MinYear = 1800
	MaxYear = 2200
)

// checkYear returns ErrYear, saying the bound, for a year outside MinYear
// to MaxYear.
func checkYear(y int64) error {
	if y < MinYear || y > MaxYear {
		return fmt.Errorf("year %d %w (%d to %d)", y, ErrYear, MinYear, MaxYear)
	}
	return nil
}

// ParseISOTime reads a time as every reader of times in wetline does: the
// cells of stage records, gaugings, shift diagrams and rating periods
// (valid_from), and the times of the command line (--period, --exclude,
// FILE@TIME). The forms read are those of the extended format of
// ISO 8601-1:2019 (the profile of RFC 3339, 5.6, with its relaxations
// below), and no others:
//
//	YYYY-MM-DD                      a date: its first instant, 00:00
//	YYYY-MM-DDThh:mm                a date and a time to the minute
//	YYYY-MM-DDThh:mm:ss             ... to the second
//	YYYY-MM-DDThh:mm:ss.fff         ... with a fraction of a second (',' or '.',
//	                                any number of digits), read only when zero
//
// A time of day may end in a UTC offset: Z (UTC), ±hh:mm, or the basic
// forms ±hhmm and ±hh (+10:00, -0500, +10), hours 00 to 23 and minutes 00
// to 59; a date alone takes none. A space may stand for the T, as
// spreadsheets and databases write it; t and z may be lower case (RFC 3339,
// 5.6, note); the hour may have one digit (9:30), as spreadsheets write it.
// Leading and trailing spaces are dropped. Day-first and month-first dates
// (03/04/2026, 3.4.2026) are refused as ambiguous (ErrAmbiguousDate,
// which also wraps ErrISOTime), the error giving their ISO 8601 readings.
//
// A time written without an offset is at UTC plus offset (UTC when offset
// is 0). The result is the instant, located at the offset written with it
// (a fixed zone, so that it is reported as it was written), else in UTC.
// Errors wrap ErrISOTime (no such form or no
// such date), ErrSubSecond (a fraction that is not zero: every time is
// kept to the second) or ErrYear (a year, as written, outside MinYear to
// MaxYear).
//
// References:
//
//	ISO 8601-1:2019, Date and time — Representations for information
//	interchange — Part 1: Basic rules (calendar dates, time of day, time
//	shift from UTC, date and time of day; extended and basic formats).
//	Klyne, G., and Newman, C., 2002, Date and Time on the Internet:
//	Timestamps, RFC 3339, 5.6.
func ParseISOTime(s string, offset time.Duration) (time.Time, error) {
	sec, zone, zoned, err := parseISOZone(strings.TrimSpace(s), int64(offset/time.Second))
	if err != nil {
		return time.Time{}, err
	}
	return instant(sec, zone, zoned), nil
}

// instant is the time of Unix seconds sec, located at the offset zone
// (seconds east) when it was written with the time (zoned), else in UTC.
func instant(sec, zone int64, zoned bool) time.Time {
	t := time.Unix(sec, 0).UTC()
	if zoned && zone != 0 {
		t = t.In(time.FixedZone("", int(zone)))
	}
	return t
}

// parseISOZone reads an ISO 8601 date-time (see ParseISOTime) as Unix
// seconds; off is the offset in seconds of a time written without one.
// zoned tells whether the text carries a UTC offset of its own, zone the
// offset it was read at (seconds east: the written one, else off). It is
// the one parser of times: every reader of times comes to it, through
// cellTimeZone (zonedTime) or ParseISOTime.
func parseISOZone[T string | []byte](b T, off int64) (sec, zone int64, zoned bool, err error) {
	n := len(b)
	if n < 10 || b[4] != '-' || b[7] != '-' {
		if slashDate(b) {
			if err := dayMonth(string(b)); err != nil {
				return 0, 0, false, err
			}
		}
		return 0, 0, false, ErrISOTime
	}
	y, ok1 := digits(b, 0, 4)
	mo, ok2 := digits(b, 5, 2)
	d, ok3 := digits(b, 8, 2)
	if !ok1 || !ok2 || !ok3 || mo < 1 || mo > 12 || d < 1 || d > daysIn(y, mo) {
		return 0, 0, false, ErrISOTime
	}
	days := daysFromCivil(y, mo, d)
	if n == 10 {
		if err := checkYear(y); err != nil {
			return 0, 0, false, err
		}
		return days*86400 - off, off, false, nil
	}
	if c := b[10]; c != 'T' && c != 't' && c != ' ' {
		return 0, 0, false, ErrISOTime
	}
	// The hour may have one digit, as spreadsheets write it (9:30).
	i := 12
	if i < n && b[i] != ':' {
		i++
	}
	hh, ok1 := digits(b, 11, i-11)
	if i >= n || b[i] != ':' {
		return 0, 0, false, ErrISOTime
	}
	mm, ok2 := digits(b, i+1, 2)
	if !ok1 || !ok2 || hh > 23 || mm > 59 {
		return 0, 0, false, ErrISOTime
	}
	i += 3
	var ss int64
	if i < n && b[i] == ':' {
		v, ok := digits(b, i+1, 2)
		if !ok || v > 59 {
			return 0, 0, false, ErrISOTime
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
				return 0, 0, false, ErrISOTime
			}
			if nonzero {
				return 0, 0, false, ErrSubSecond
			}
			i = j
		}
	}
	if zone, err = zoneOffset(b, i, off); err != nil {
		return 0, 0, false, err
	}
	if err := checkYear(y); err != nil {
		return 0, 0, false, err
	}
	return days*86400 + hh*3600 + mm*60 + ss - zone, zone, i < n, nil
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

// cellTimeZone reads a time cell of a record or a diagram: ISO 8601 text
// (see ParseISOTime), or in a workbook a date serial (local time at the
// offset off, in seconds), rounded to the second. zoned tells a text
// written with a UTC offset of its own (a serial has none), zone the
// offset the time was read at (seconds east: the one written with it,
// else off). In a CSV file a bare number is ErrSerialInCSV; in a workbook
// a number that would be a date before PlainSerialMinYear is
// ErrPlainNumberTime; a year outside MinYear to MaxYear is ErrYear. A
// table with a time-zone column reads its times through zonedTime.
func cellTimeZone[T string | []byte](s T, inWorkbook, date1904 bool, off int64) (sec, zone int64, zoned bool, err error) {
	sec, zone, zoned, err = parseISOZone(s, off)
	if err == nil || !errors.Is(err, ErrISOTime) {
		return sec, zone, zoned, err
	}
	v, nerr := ParseNumber(string(s))
	if nerr != nil {
		return 0, 0, false, err
	}
	if !inWorkbook {
		return 0, 0, false, ErrSerialInCSV
	}
	t, err := serialTime(v, date1904, ErrISOTime)
	if err != nil {
		return 0, 0, false, err
	}
	if t.Year() < PlainSerialMinYear {
		return 0, 0, false, fmt.Errorf("%w (as a date serial it would be %s)", ErrPlainNumberTime, t.Format("2006-01-02T15:04:05"))
	}
	return t.Unix() - off, off, false, nil
}

// PlainSerialMinYear is the first year a plain number cell (one without a
// date format: a date-formatted cell reads as the date it shows) is read
// as a date serial in a time column. A spreadsheet leaves a time made by a
// formula a plain number, and such serials of recent years are read; a
// smaller number (a day of the year, hours since the start) would be a
// date in 1900 to 1949, and is refused (ErrPlainNumberTime). 1950 is this
// project's choice, not a limit of gauge records (times back to MinYear
// are read): a time before it is taken from a date-formatted cell or ISO
// 8601 text, never from a bare number, which is far more often a count
// than a date of such a year.
const PlainSerialMinYear = 1950

// ErrPlainNumberTime is the cause of a plain number cell in a time column
// that would be a date before PlainSerialMinYear.
var ErrPlainNumberTime = errors.New("a plain number, not a date: format the cell as a date, or write the time in ISO 8601")

// serialTime turns a workbook date serial into the time it stands for
// (in UTC, rounded to the second). A serial out of range, or one that
// excelize cannot convert, wraps bad; one outside the years MinYear to
// MaxYear is ErrYear.
func serialTime(v float64, date1904 bool, bad error) (time.Time, error) {
	if v < MinDateSerial || v > MaxDateSerial {
		return time.Time{}, fmt.Errorf("%w (date serial %g is out of range)", bad, v)
	}
	t, err := excelize.ExcelDateToTime(v, date1904)
	if err != nil {
		return time.Time{}, fmt.Errorf("%w (%v)", bad, err)
	}
	t = t.Round(time.Second)
	if err := checkYear(int64(t.Year())); err != nil {
		return time.Time{}, err
	}
	return t, nil
}

// offsetForm remembers the form of a file's first time, with or without
// a UTC offset, so that a file mixing the two is refused: a time written
// without an offset is taken at the offset the command gives, and one
// file holding both forms is a file put together from two sources.
type offsetForm struct {
	row   int // the first time's row; 0 before it
	zoned bool
}

// check takes the form of the time at row and returns ErrMixedOffsets,
// naming both rows, when it differs from the first time's.
func (f *offsetForm) check(row int, zoned bool) error {
	switch {
	case f.row == 0:
		f.row, f.zoned = row, zoned
		return nil
	case zoned == f.zoned:
		return nil
	}
	with, without := f.row, row
	if zoned {
		with, without = row, f.row
	}
	return fmt.Errorf("%w: row %d has one, row %d has none", ErrMixedOffsets, with, without)
}

// formatUnixAt writes a time in Unix seconds as RFC 3339 at a UTC offset
// of off seconds (Z at zero), as the times of a file read at that offset
// are written.
func formatUnixAt(sec, off int64) string {
	if off == 0 {
		return formatUnix(sec)
	}
	return time.Unix(sec, 0).In(time.FixedZone("", int(off))).Format(time.RFC3339)
}

// formatUnix writes a time in Unix seconds as RFC 3339 in UTC;
// math.MinInt64 is "the beginning" (an open start).
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
	g, err := gaugingsFromTable(t, off)
	return g, gaugingsSheetHint(t, sheet, err)
}
