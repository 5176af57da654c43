package results

import (
	"strconv"

	"wetline/rating"
	"wetline/survey/workbook"
)

// reportedNumber returns v as the reports write it (see the package
// doc): a length to LengthDecimals decimals (FormatLength), any other
// value to six significant digits (FormatFloat), read back as the nearest
// float64. A workbook cell so holds the figure the CSV of the same result
// writes, 0.6 rather than the 0.6000000000000006 of the arithmetic.
// NaN and ±Inf are returned as they are (blank cells).
func reportedNumber(v float64, length bool) float64 {
	s := FormatFloat(v)
	if length {
		s = FormatLength(v)
	}
	r, err := strconv.ParseFloat(s, 64)
	if err != nil { // "" for an undefined value
		return v
	}
	return r
}

// reportedCell is reportedNumber for a cell value of a workbook row: a
// float64, or a workbook.Styled holding one; any other value is returned
// unchanged.
func reportedCell(v any, length bool) any {
	switch x := v.(type) {
	case float64:
		return reportedNumber(x, length)
	case workbook.Styled:
		if f, ok := x.Value.(float64); ok {
			x.Value = reportedNumber(f, length)
		}
		return x
	}
	return v
}

// isLengthUnit reports whether unit is the unit of length of a unit
// system: its numbers are written as lengths.
func isLengthUnit(unit string) bool {
	return unit != "" && (unit == rating.SI.Length() || unit == rating.US.Length())
}

// reportSheet is a table sheet of a results workbook whose numbers are
// stored as the reports write them (reportedCell): lengths in the columns
// whose unit is a length, every other number to six significant digits.
// The column's number format then only chooses how many of those figures
// show.
type reportSheet struct {
	*workbook.SheetWriter
	length []bool // column i holds lengths
	buf    []any
}

// newReportSheet wraps the writer of a sheet of columns cols.
func newReportSheet(s *workbook.SheetWriter, cols []workbook.Column) *reportSheet {
	length := make([]bool, len(cols))
	for i, c := range cols {
		length[i] = isLengthUnit(c.Unit)
	}
	return &reportSheet{SheetWriter: s, length: length}
}

// reportTable starts a table sheet (workbook.Book.Table) whose numbers
// are stored as the reports write them.
func reportTable(b *workbook.Book, name string, cols []workbook.Column) (*reportSheet, error) {
	s, err := b.Table(name, cols)
	if err != nil {
		return nil, err
	}
	return newReportSheet(s, cols), nil
}

// reportTitledTable is reportTable under a title line
// (workbook.Book.TitledTable).
func reportTitledTable(b *workbook.Book, name, title string, cols []workbook.Column) (*reportSheet, error) {
	s, err := b.TitledTable(name, title, cols)
	if err != nil {
		return nil, err
	}
	return newReportSheet(s, cols), nil
}

// Row writes the next row (workbook.SheetWriter.Row), each number as the
// reports write it.
func (s *reportSheet) Row(values ...any) error {
	s.buf = s.buf[:0]
	for i, v := range values {
		s.buf = append(s.buf, reportedCell(v, i < len(s.length) && s.length[i]))
	}
	return s.SheetWriter.Row(s.buf...)
}
