package survey

import (
	"errors"
	"fmt"
	"strings"

	"github.com/xuri/excelize/v2"
)

// ParseError reports a problem at a place in an input file. Row and Column
// are 1-based; zero means the whole file or the whole row.
type ParseError struct {
	File   string // path as given
	Sheet  string // workbook sheet, empty for CSV
	Row    int    // line in a CSV file, row in a sheet
	Column int    // field number in a CSV record, column in a sheet
	Name   string // the column's name, e.g. "elevation"
	Text   string // the offending cell text, if any
	Err    error
}

// Error formats the position in the manner of compilers for CSV
// (xs2.csv:14:2: elevation "1,5": not a number) and as a cell reference for
// workbooks (field.xlsx['XS-2']!B14: ...).
func (e *ParseError) Error() string {
	var b strings.Builder
	b.WriteString(e.Position())
	b.WriteString(": ")
	if e.Name != "" {
		b.WriteString(echo(e.Name))
		if e.Text != "" {
			fmt.Fprintf(&b, " %q", echo(e.Text))
		}
		b.WriteString(": ")
	}
	if e.Err != nil {
		b.WriteString(e.Err.Error())
	}
	return b.String()
}

// Position formats where the error is, without the cause.
func (e *ParseError) Position() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Sheet != "" {
		fmt.Fprintf(&b, "['%s']", e.Sheet)
		if e.Row > 0 && e.Column > 0 {
			cell, err := excelize.CoordinatesToCellName(e.Column, e.Row)
			if err == nil {
				b.WriteString("!" + cell)
			}
		} else if e.Row > 0 {
			fmt.Fprintf(&b, " row %d", e.Row)
		}
	} else if e.Row > 0 {
		fmt.Fprintf(&b, ":%d", e.Row)
		if e.Column > 0 {
			fmt.Fprintf(&b, ":%d", e.Column)
		}
	}
	return b.String()
}

func (e *ParseError) Unwrap() error { return e.Err }

// Causes, for errors.Is. Causes that concern the geometry of a section
// are subdivide's own (subdivide.ErrOverhang, subdivide.ErrTooFewPoints,
// subdivide.ErrNotFinite), so errors.Is finds them however the section
// was read.
var (
	ErrNotNumber     = errors.New("not a number")
	ErrDecimalComma  = errors.New("decimal comma: write numbers with a decimal point")
	ErrMissingColumn = errors.New("missing column")
	ErrEmpty         = errors.New("no data rows")
	ErrSemicolon     = errors.New("the file is separated by semicolons; save it as comma-separated values with decimal points")
	ErrBankMarks     = errors.New("exactly two points must be marked bank")
	ErrNotPositive   = errors.New("must be a positive number")
)

// Causes of numbers refused for what they hold besides digits, for
// errors.Is.
var (
	// ErrThousands is the cause of a number whose comma is followed by
	// three digits (2,076 or 1,248.5): a thousands separator, or a decimal
	// comma, which is not guessed.
	ErrThousands = errors.New("looks like a thousands separator: write numbers without one (and with a decimal point)")
	// ErrPercent is the cause of a percent (5%, or a workbook cell with a
	// percent format) in a number column that is not in percent.
	ErrPercent = errors.New("a percent in a column that is not in percent: write the number itself")
	// ErrDateNotNumber is the cause of a date or a time of day in a number
	// column: most often a spreadsheet has turned what was typed (6/1,
	// 1-6, 10:15) into a date.
	ErrDateNotNumber = errors.New("a date where a number belongs (a spreadsheet may have turned the value typed into a date): format the cell as a number and type the value again")
)

// MaxReported bounds how many row errors one file reports.
const MaxReported = 20

// errorList joins parse errors, one per line, keeping at most MaxReported.
type errorList []*ParseError

// add appends the errors that are not nil.
func (l *errorList) add(errs ...*ParseError) {
	for _, e := range errs {
		if e != nil {
			*l = append(*l, e)
		}
	}
}

func (l errorList) err() error {
	if len(l) == 0 {
		return nil
	}
	errs := make([]error, 0, len(l))
	for i, e := range l {
		if i == MaxReported {
			errs = append(errs, fmt.Errorf("%s: %d more errors not shown", e.File, len(l)-MaxReported))
			break
		}
		errs = append(errs, e)
	}
	if len(errs) == 1 {
		return errs[0]
	}
	return errors.Join(errs...)
}
