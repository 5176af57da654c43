package survey

import (
	"errors"
	"fmt"
	"slices"
	"strconv"
)

// ErrSplitNumber is the cause of a text column that holds, on most rows,
// a bare digit string after a whole number in the number column before it
// (elevation 524, mark 8; discharge 4, note 10; stage 1, quality 05): a
// value written with an unquoted decimal comma (524,8) split in two and
// shifted the row.
var ErrSplitNumber = errors.New("a number split in two")

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
// text digits after it.
func takeSplit[S ~string | ~[]byte](s *splitRun, row int, whole, digits S) {
	s.rows++
	if !splitPair(whole, digits) {
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

// cause is the error (ErrSplitNumber) of a split run whose number column
// is named num.
func (s *splitRun) cause(num string) error {
	return fmt.Errorf("%w: %s %s then %s, as on %d of %d rows: %s %s,%s read as two values; quote a value that holds a comma, and write numbers with a decimal point",
		ErrSplitNumber, echo(num), s.whole, s.digits, s.n, s.rows, decimalCommaHint, s.whole, s.digits)
}

// splitNumbers returns the error (ErrSplitNumber, at its first row and
// column) of the first of the text columns that comes right after one of
// the numeric columns and holds a split number on most rows (see
// splitRun.split); the text columns in running may hold running numbers.
// Negative indices are absent columns. nil when none does.
func (t *Table) splitNumbers(numeric, text, running []int) error {
	for _, c := range text {
		if c < 1 || !slices.Contains(numeric, c-1) {
			continue
		}
		var s splitRun
		for _, rec := range t.Records {
			takeSplit(&s, rec.Row, t.Cell(rec, c-1), t.Cell(rec, c))
		}
		if s.split(slices.Contains(running, c)) {
			return &ParseError{File: t.File, Sheet: t.Sheet, Row: s.row, Column: c + 1, Name: t.Header[c], Text: s.digits,
				Err: s.cause(t.Header[c-1])}
		}
	}
	return nil
}
