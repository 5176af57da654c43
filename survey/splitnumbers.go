package survey

import (
	"errors"
	"fmt"
	"slices"
	"strconv"

	"wetline/rating"
)

// ErrSplitNumber is the cause of a text column that holds, on most rows,
// a bare digit string after a whole number in a number column before it
// whose whole values are implausible (elevation 524, mark 8; stage 1,
// note 05): a value written with an unquoted decimal comma (524,8) split
// in two and shifted the row.
var ErrSplitNumber = errors.New("a number split in two")

// The check for numbers split by an unquoted decimal comma (Table.
// splitNumbers, and the stage record's stageBuilder.splitWarning) weighs
// the evidence of a split, a whole number then a bare digit string on
// most rows, against how often that pattern is real data:
//
//   - It refuses (ErrSplitNumber) only after a number column whose whole
//     values on most rows are implausible for the quantity: a survey's
//     elevation and n, a gauging's gauge height. Levels and gauge heights
//     are read to the millimetre or the hundredth of a foot, and n lies
//     below 1 (common practice), so 524 on most rows is not a reading.
//   - After a station, an easting or northing, a discharge, an
//     uncertainty or a stage record's stage it only warns, with the same
//     evidence: stations are often set at whole metres, discharges of a
//     large river or in cubic feet per second are written whole, an
//     uncertainty is a whole percent, and a logger in centimetres records
//     whole stages, beside a point code, a party or a vertical count or a
//     quality code that is a digit (common practice).
//   - It checks neither when the headers name US customary units (a file
//     in feet and cubic feet per second is written where the decimal mark
//     is a point), nor a text cell quoted in a CSV file (a quoted field
//     was written as one value; an unquoted comma split it, so the digits
//     after it carry no quotes).
//   - It checks only the text columns the reader reads (a survey's mark
//     and note, a gauging's quality, note and exclude, a record's quality).
//
// A CSV row with more fields than its header line stays an error
// everywhere (ErrSpilledRow), whatever the columns.

// splitPair reports two neighbouring cells that read as one number
// split at a decimal comma: a whole number, then a bare digit string.
func splitPair[S ~string | ~[]byte](whole, digits S) bool {
	if len(whole) > 0 && (whole[0] == '-' || whole[0] == '+') {
		whole = whole[1:]
	}
	return digitsOnly(whole) && digitsOnly(digits)
}

// digitsOnly reports text of the digits 0 to 9 alone, one at least.
func digitsOnly[S ~string | ~[]byte](s S) bool {
	for i := 0; i < len(s); i++ {
		if s[i] < '0' || s[i] > '9' {
			return false
		}
	}
	return len(s) > 0
}

// splitRun counts, down the rows of one table or streamed file, the rows
// whose cells in a number column and the text column after it hold a
// split number (see splitPair), keeping the first such row.
type splitRun struct {
	rows, n       int // rows counted; rows holding a split pair
	row           int // the first such row
	whole, digits string
	// increasing: the digit strings increase down the rows so far, as
	// running numbers (point or measurement numbers) do.
	increasing bool
	last       int
}

// takeSplit counts in s the cells of one row, the number whole and the
// text digits after it; a text cell quoted in a CSV file counts as no
// split.
func takeSplit[S ~string | ~[]byte](s *splitRun, row int, whole, digits S, quoted bool) {
	s.rows++
	if quoted || !splitPair(whole, digits) {
		return
	}
	if s.n++; s.n == 1 {
		s.row, s.whole, s.digits, s.increasing, s.last = row, string(whole), string(digits), true, -1
	}
	v, err := strconv.Atoi(string(digits))
	s.increasing = s.increasing && err == nil && v > s.last
	s.last = v
}

// split reports a split number on more than half of the rows counted, and
// on two at least: a decimal comma that shifted the rows. When running,
// the text column may hold running numbers, and digit strings increasing
// down the rows pass.
func (s *splitRun) split(running bool) bool {
	return s.n >= 2 && 2*s.n > s.rows && !(running && s.increasing)
}

// evidence says what a split run of number column num and text column
// text found, for its error or warning: "elevation 524 then 8 on 3 of 3
// rows: an unquoted decimal comma? 524,8 read as two values". In a CSV
// file (inCSV) the advice names quoting the text cell, which the check
// then passes (a sheet's cells hold no separators, so none is advised).
func (s *splitRun) evidence(num, text string, inCSV bool) string {
	advice := "write numbers with a decimal point"
	if inCSV {
		advice += fmt.Sprintf(", or quote the %s (\"%s\") if it is a value of its own", echo(text), s.digits)
	}
	return fmt.Sprintf("%s %s then %s on %d of %d rows: %s %s,%s read as two values: %s",
		echo(num), s.whole, s.digits, s.n, s.rows, decimalCommaHint, s.whole, s.digits, advice)
}

// splitColumns are the columns a reader has Table.splitNumbers check
// (0-based indices; negative ones are absent columns): a text column
// right after a number column of refuse (whole values implausible: the
// split is an error) or of warn (whole values common: a warning).
type splitColumns struct {
	refuse, warn []int
	// text are the text columns read; those of running may hold running
	// numbers, which pass when they increase down the rows.
	text, running []int
	// units is what the headers of the columns read say of the unit
	// system: US customary units pass.
	units UnitNote
}

// splitNumbers checks the text columns of c that come right after one of
// its number columns for a number split by an unquoted decimal comma on
// most rows (see splitRun.split and the policy above): the first after a
// refuse column is the error (ErrSplitNumber, at its first such row and
// column); each after a warn column is a warning with the same evidence.
// A text cell quoted in CSV counts as no split; headers naming US units
// pass the table.
func (t *Table) splitNumbers(c splitColumns) ([]string, error) {
	if c.units.Found && c.units.Units == rating.US {
		return nil, nil
	}
	var warnings []string
	for _, col := range c.text {
		refuse := slices.Contains(c.refuse, col-1)
		if col < 1 || !refuse && !slices.Contains(c.warn, col-1) {
			continue
		}
		var s splitRun
		for _, rec := range t.Records {
			takeSplit(&s, rec.Row, t.Cell(rec, col-1), t.Cell(rec, col), rec.quotedCell(col))
		}
		if !s.split(slices.Contains(c.running, col)) {
			continue
		}
		at := &ParseError{File: t.File, Sheet: t.Sheet, Row: s.row, Column: col + 1, Name: t.Header[col], Text: s.digits}
		evidence := s.evidence(t.Header[col-1], t.Header[col], t.Sheet == "")
		if refuse {
			at.Err = fmt.Errorf("%w: %s", ErrSplitNumber, evidence)
			return warnings, at
		}
		at.Err = errors.New(evidence)
		warnings = append(warnings, at.Error())
	}
	return warnings, nil
}
