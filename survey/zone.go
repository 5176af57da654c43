package survey

import (
	"errors"
	"fmt"
	"strings"
	"time"

	"wetline/rating/record"
)

// ColTimeZone is the name of a time-zone column: beside a time column,
// the UTC offset of each row's time (see ParseZone). Its aliases are
// TimeZoneColumns.
const ColTimeZone = "tz"

// TimeZoneColumns returns the names a time-zone column is known by, the
// first its name (matched as table columns are: "time zone", "Time-Zone"
// and "time_zone" are one name). The slice is new on every call.
func TimeZoneColumns() []string {
	return []string{ColTimeZone, "time_zone", "timezone", "utc_offset"}
}

// Causes of time-zone cells that cannot be used, for errors.Is.
var (
	// ErrZone: a time-zone cell that is neither a UTC offset nor one of
	// ZoneAbbreviations.
	ErrZone = errors.New("not a time zone")
	// ErrZoneBlank: a blank time-zone cell beside a time written without
	// an offset of its own, in a table with a time-zone column.
	ErrZoneBlank = errors.New("the time zone is blank and the time has no UTC offset of its own: give one or the other")
	// ErrZoneDisagrees: a time written with a UTC offset of its own beside
	// a time-zone cell of another offset.
	ErrZoneDisagrees = errors.New("the time's own UTC offset is not the time zone's")
)

// zoneAbbreviation is a zone abbreviation a time-zone cell may hold and
// its offset from UTC in hours.
type zoneAbbreviation struct {
	name  string
	hours int64
}

// zoneAbbreviations returns the zone abbreviations a time-zone cell may
// hold, with their offsets: UTC and GMT, and the standard and daylight
// times of North America, each of one offset only (a project choice:
// other abbreviations, such as IST or CST outside North America, name
// several zones). An array, so that a lookup allocates nothing.
func zoneAbbreviations() [13]zoneAbbreviation {
	return [13]zoneAbbreviation{
		{"UTC", 0}, {"GMT", 0},
		{"EST", -5}, {"EDT", -4}, {"CST", -6}, {"CDT", -5}, {"MST", -7}, {"MDT", -6},
		{"PST", -8}, {"PDT", -7}, {"AKST", -9}, {"AKDT", -8}, {"HST", -10},
	}
}

// ZoneAbbreviations returns the zone abbreviations ParseZone reads, in
// order. The slice is new on every call.
func ZoneAbbreviations() []string {
	zs := zoneAbbreviations()
	out := make([]string, len(zs))
	for i, z := range zs {
		out[i] = z.name
	}
	return out
}

// ParseZone reads a time-zone cell as the offset from UTC it names:
// a UTC offset as ISO 8601 writes one after a time (Z, ±hh:mm, ±hhmm,
// ±hh: +10:00, -0500), or one of ZoneAbbreviations in any case (EST is
// -05:00, EDT -04:00). Leading and trailing spaces are dropped. An offset
// beyond 14 hours either way, a zone name other than those, or a blank
// cell is ErrZone.
//
// References:
//
//	ISO 8601-1:2019, Date and time — Representations for information
//	interchange — Part 1: Basic rules (time shift from UTC).
func ParseZone(s string) (time.Duration, error) {
	off, err := zoneValue(strings.TrimSpace(s))
	return time.Duration(off) * time.Second, err
}

// zoneValue is ParseZone on trimmed text, in seconds east.
func zoneValue[T string | []byte](b T) (int64, error) {
	if len(b) > 0 && (b[0] == '+' || b[0] == '-' || (len(b) == 1 && (b[0] == 'Z' || b[0] == 'z'))) {
		off, err := zoneOffset(b, 0, 0)
		if err == nil {
			if _, err = checkOffset(time.Duration(off) * time.Second); err == nil {
				return off, nil
			}
		}
		return 0, zoneError()
	}
	var up [4]byte
	if n := len(b); n >= 3 && n <= len(up) {
		for i := range n {
			c := b[i]
			if c >= 'a' && c <= 'z' {
				c -= 'a' - 'A'
			}
			up[i] = c
		}
		for _, z := range zoneAbbreviations() {
			if z.name == string(up[:n]) {
				return z.hours * 3600, nil
			}
		}
	}
	return 0, zoneError()
}

// zoneError is ErrZone, saying what a time-zone cell may hold.
func zoneError() error {
	return fmt.Errorf("%w: write a UTC offset (+10:00, -0500, Z) or one of %s", ErrZone, strings.Join(ZoneAbbreviations(), ", "))
}

// zonedTime reads a time cell s (see cellTimeZone) of a table with a
// time-zone column, beside the row's time-zone cell z: a time without an
// offset of its own (a workbook date serial among them) is at z's offset,
// one with its own keeps it and z, when given, must agree with it. The
// time is then always zoned. A bad zone (ErrZone), a blank z beside a
// time without an offset (ErrZoneBlank) and a disagreement
// (ErrZoneDisagrees) are reported with atZone set: the error is the
// zone cell's; other errors are the time cell's.
func zonedTime[T string | []byte](s, z T, inWorkbook, date1904 bool) (sec, zone int64, atZone bool, err error) {
	var zoff int64
	given := len(z) > 0
	if given {
		if zoff, err = zoneValue(z); err != nil {
			return 0, 0, true, err
		}
	}
	sec, zone, own, err := cellTimeZone(s, inWorkbook, date1904, zoff)
	switch {
	case err != nil:
		return 0, 0, false, err
	case own && given && zone != zoff:
		return 0, 0, true, fmt.Errorf("%w: the time is at %s, the zone at %s", ErrZoneDisagrees, record.FormatOffset(time.Duration(zone)*time.Second), record.FormatOffset(time.Duration(zoff)*time.Second))
	case !own && !given:
		return 0, 0, true, ErrZoneBlank
	}
	return sec, zone, false, nil
}

// zoneColumn finds the time-zone column of t (-1 when it has none); one
// column under two of its names is refused (ErrAliasColumns).
func zoneColumn(t *Table) (int, error) {
	return t.Optional(TimeZoneColumns()...)
}

// readTime reads the time of column ct of a row (see cellTimeZone), beside
// the row's time-zone cell of column cz when the table has one (cz >= 0,
// see zonedTime); a time without an offset is otherwise at off seconds.
// zoned tells a time whose offset is written, with it or in the zone cell.
// A bad cell is a *ParseError at it.
func (t *Table) readTime(rec Record, ct, cz int, off int64) (sec, zone int64, zoned bool, err *ParseError) {
	s := t.Cell(rec, ct)
	if cz < 0 {
		sec, zone, zoned, cerr := cellTimeZone(s, t.Sheet != "", t.Date1904, off)
		if cerr != nil {
			return 0, 0, false, t.At(rec, ct, cerr)
		}
		return sec, zone, zoned, nil
	}
	sec, zone, atZone, cerr := zonedTime(s, t.Cell(rec, cz), t.Sheet != "", t.Date1904)
	if cerr != nil {
		if atZone {
			return 0, 0, false, t.At(rec, cz, cerr)
		}
		return 0, 0, false, t.At(rec, ct, cerr)
	}
	return sec, zone, true, nil
}
