package survey

import (
	"errors"
	"fmt"
	"io"
	"maps"
	"math"
	"slices"
	"strings"
	"time"

	"wetline/rating/gauged"
)

// Column names of a shift-diagram table. Rows of one diagram share a time
// and follow each other; taper and abrupt are optional, given on any row
// of their diagram.
const (
	ColShiftTime   = "time"
	ColShiftStage  = "stage"
	ColShift       = "shift"
	ColShiftTaper  = "taper"
	ColShiftAbrupt = "abrupt"
)

// ShiftColumns returns the columns of a shift-diagram table in the order
// a writer puts them. The slice is new on every call.
func ShiftColumns() []string {
	return []string{ColShiftTime, ColShiftStage, ColShift, ColShiftTaper, ColShiftAbrupt}
}

// ShiftTableOptions configure the reading of shift diagrams. The zero
// value reads the first visible sheet of a workbook and takes times written
// without an offset as UTC.
type ShiftTableOptions struct {
	// Sheet is the workbook sheet to read ("" = the first).
	Sheet string
	// UTCOffset is the offset of times written without one (default 0,
	// UTC; whole seconds within record.MaxUTCOffset).
	UTCOffset time.Duration
}

// ShiftDiagrams are shift diagrams read from a file.
type ShiftDiagrams struct {
	// Diagrams are in time order; each Source names its file and first row.
	Diagrams []gauged.ShiftDiagram
	// File and Sheet say where the diagrams came from.
	File, Sheet string
	// Units is what the stage, shift and taper headers say of the unit
	// system ("shift (ft)"); nothing is converted.
	Units UnitNote
	// Warnings are unusual but legal facts about where they were read (a
	// hidden sheet).
	Warnings []string
}

// ErrAbruptWord is the cause of an abrupt cell that is not a yes or a no.
var ErrAbruptWord = errors.New("abrupt must be yes or no (or blank for no)")

// ReadShiftDiagrams reads shift diagrams from a CSV file or a workbook
// sheet (by extension). See ShiftDiagramsFromTable.
func ReadShiftDiagrams(path string, opt ShiftTableOptions) (ShiftDiagrams, error) {
	t, err := ReadTable(path, opt.Sheet)
	if err != nil {
		return ShiftDiagrams{}, err
	}
	return ShiftDiagramsFromTable(t, opt)
}

// ParseShiftDiagrams reads shift diagrams from CSV text; name is used in
// messages.
func ParseShiftDiagrams(r io.Reader, name string, opt ShiftTableOptions) (ShiftDiagrams, error) {
	t, err := ParseCSV(r, name)
	if err != nil {
		return ShiftDiagrams{}, err
	}
	return ShiftDiagramsFromTable(t, opt)
}

// ShiftDiagramsFromTable reads a table of ShiftColumns: time, stage and
// shift, optional taper (the gauge height at which the diagram's shift
// reaches zero) and abrupt (yes: the diagram takes effect at its time
// instead of being prorated from the one before). A diagram of one row may
// leave its stage blank: a shift constant in stage. Stages, taper stages
// and shifts are bounded by ±MaxElevation, as stages are wherever they are
// read (ErrImplausible at the cell). Diagrams are gathered
// and checked by gauged.DiagramsFromRows. Every bad cell is reported with
// its position (a year outside MinYear to MaxYear is ErrYear, a time
// whose offset, or lack of one, differs from the first time's
// ErrMixedOffsets; a time-zone column gives each row's time its offset, see
// zonedTime), and so is the row that makes a diagram fall faster
// than the stage rises (gauged.ErrShiftSlope). A first time of day alone
// beside a date column is refused once, at it (ErrDateApart). Units written in the stage,
// shift and taper headers are reported in Units; an unknown unit
// (ErrUnknownUnit) or units of two systems (ErrMixedUnits) is an error
// naming the column.
func ShiftDiagramsFromTable(t *Table, opt ShiftTableOptions) (ShiftDiagrams, error) {
	out := ShiftDiagrams{File: t.File, Sheet: t.Sheet, Warnings: t.ownWarnings()}
	off, err := checkOffset(opt.UTCOffset)
	if err != nil {
		return out, &ParseError{File: t.File, Sheet: t.Sheet, Err: err}
	}
	cols := map[string]int{}
	for _, c := range []string{ColShiftTime, ColShift} {
		if cols[c], err = t.Require(c); err != nil {
			return out, err
		}
	}
	if cols[ColShiftStage], err = t.Require(ColShiftStage, ColGaugeHeight); err != nil {
		return out, err
	}
	cols[ColShiftTaper], cols[ColShiftAbrupt] = t.Column(ColShiftTaper), t.Column(ColShiftAbrupt)
	if cols[ColTimeZone], err = zoneColumn(t); err != nil {
		return out, err
	}
	if out.Units, err = t.HeaderUnits(cols[ColShiftStage], cols[ColShift], cols[ColShiftTaper]); err != nil {
		return out, err
	}
	if err := t.unsavedIn(slices.Collect(maps.Values(cols))...); err != nil {
		return out, err
	}
	if pe := t.dateApart(cols[ColShiftTime]); pe != nil {
		return out, pe
	}
	var errs errorList
	var rows []gauged.ShiftRow
	var recs []Record
	var form offsetForm
	for _, rec := range t.Records {
		r, ok := shiftRow(t, rec, cols, off, &form, &errs)
		if ok {
			rows, recs = append(rows, r), append(recs, rec)
		}
	}
	ds, err := gauged.DiagramsFromRows(rows)
	for _, e := range unjoin(err) {
		var re *gauged.ShiftRowError
		if !errors.As(e, &re) {
			return out, e
		}
		col := cols[re.Field]
		if re.Field == ColShiftTaper && col < 0 {
			col = cols[ColShift]
		}
		errs = append(errs, t.At(recs[re.Row], col, re.Err))
	}
	if err := errs.err(); err != nil {
		return out, err
	}
	if len(ds) == 0 {
		return out, &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Err: ErrEmpty}
	}
	out.Diagrams = ds
	return out, nil
}

// shiftRow reads one row of a shift table, adding its bad cells to errs;
// form is the form of the table's first time.
func shiftRow(t *Table, rec Record, cols map[string]int, off int64, form *offsetForm, errs *errorList) (gauged.ShiftRow, bool) {
	r := gauged.ShiftRow{Source: where(t, rec.Row), Stage: math.NaN()}
	ok := true
	bad := func(col int, err error) {
		*errs = append(*errs, t.At(rec, col, err))
		ok = false
	}
	ct := cols[ColShiftTime]
	switch s := t.Cell(rec, ct); {
	case s == "":
		bad(ct, ErrBlankTime)
	default:
		sec, _, zoned, perr := t.readTime(rec, ct, cols[ColTimeZone], off)
		switch {
		case perr != nil:
			*errs = append(*errs, perr)
			ok = false
		default:
			if err := form.check(rec.Row, zoned); err != nil {
				bad(ct, err)
			}
		}
		r.Time = time.Unix(sec, 0).UTC()
	}
	number := func(col int, what string, need bool) (float64, bool) {
		v, has, err := t.bounded(rec, col, what, MaxElevation)
		switch {
		case err != nil:
			*errs = append(*errs, err)
			ok = false
		case !has && need:
			bad(col, fmt.Errorf("%w: %s is blank", ErrNotNumber, t.Header[col]))
		}
		return v, has
	}
	r.Shift, _ = number(cols[ColShift], ColShift, true)
	if v, has := number(cols[ColShiftStage], ColShiftStage, false); has {
		r.Stage = v
	}
	if c := cols[ColShiftTaper]; c >= 0 {
		r.Taper, r.HasTaper = number(c, ColShiftTaper, false)
	}
	if c := cols[ColShiftAbrupt]; c >= 0 {
		switch strings.ToLower(t.Cell(rec, c)) {
		case "", "no", "n", "false", "0":
		case "yes", "y", "true", "1":
			r.Abrupt = true
		default:
			bad(c, ErrAbruptWord)
		}
	}
	return r, ok
}

// unjoin returns the errors joined in err (err itself when not joined, none
// when nil).
func unjoin(err error) []error {
	if err == nil {
		return nil
	}
	if j, ok := err.(interface{ Unwrap() []error }); ok {
		return j.Unwrap()
	}
	return []error{err}
}
