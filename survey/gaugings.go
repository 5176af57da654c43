package survey

import (
	"errors"
	"fmt"
	"io"
	"strings"
	"time"

	"github.com/xuri/excelize/v2"

	"wetline/rating"
	"wetline/rating/gauged"
)

// Column names of a gaugings table (matched case-insensitively; a unit in
// brackets after the name is allowed).
const (
	ColGaugingTime      = "time"
	ColGaugingStage     = "stage"
	ColGaugeHeight      = "gauge_height"
	ColGaugingDischarge = "discharge"
	ColGaugingQuality   = "quality"
)

// GaugingsSheet is the sheet a workbook's gaugings are read from when no
// sheet is named and the workbook has a sheet of that name.
const GaugingsSheet = "gaugings"

// Gaugings is a list of discharge measurements read from a file.
type Gaugings struct {
	// Gaugings are in file order; each Source names its file and row.
	Gaugings []gauged.Gauging
	// File and Sheet say where the gaugings came from.
	File, Sheet string
	// Warnings are unusual but legal facts about the data.
	Warnings []string
}

// Causes of gauging errors, for errors.Is.
var (
	ErrNegativeDischarge = errors.New("discharge must not be negative")
	ErrBadTime           = errors.New("not a date-time: write ISO 8601 (2024-03-05T14:30 or 2024-03-05)")
	ErrDuplicateTime     = errors.New("duplicate time")
	ErrSerialInCSV       = errors.New("a bare number is a date only in a workbook cell: write ISO 8601 in a CSV file")
)

// timeLayouts are the ISO 8601 forms a time cell may take.
var timeLayouts = []string{
	time.RFC3339Nano,
	"2006-01-02T15:04:05Z07:00",
	"2006-01-02T15:04Z07:00",
	"2006-01-02T15:04:05",
	"2006-01-02T15:04",
	"2006-01-02 15:04:05Z07:00",
	"2006-01-02 15:04:05",
	"2006-01-02 15:04",
	"2006-01-02",
}

// MinDateSerial and MaxDateSerial bound a workbook date serial taken as a
// time (1900-01-01 to 9999-12-31 in the 1900 date system).
const (
	MinDateSerial = 1
	MaxDateSerial = 2958465
)

// ParseGaugingTime reads a gauging time: ISO 8601 text, or, for a cell of a
// workbook (inWorkbook), the workbook's date serial number in its date
// system (date1904).
func ParseGaugingTime(s string, inWorkbook, date1904 bool) (time.Time, error) {
	s = strings.TrimSpace(s)
	for _, l := range timeLayouts {
		if t, err := time.Parse(l, s); err == nil {
			return t, nil
		}
	}
	v, err := ParseNumber(s)
	if err != nil {
		return time.Time{}, ErrBadTime
	}
	if !inWorkbook {
		return time.Time{}, ErrSerialInCSV
	}
	if v < MinDateSerial || v > MaxDateSerial {
		return time.Time{}, fmt.Errorf("%w (date serial %g is out of range)", ErrBadTime, v)
	}
	t, err := excelize.ExcelDateToTime(v, date1904)
	if err != nil {
		return time.Time{}, fmt.Errorf("%w (%v)", ErrBadTime, err)
	}
	return t, nil
}

// ReadGaugings reads gaugings from a CSV file or a workbook sheet. For a
// workbook with no sheet named, the sheet GaugingsSheet is read if present,
// else the first sheet.
func ReadGaugings(path, sheet string) (Gaugings, error) {
	if IsWorkbook(path) && sheet == "" {
		f, err := excelize.OpenFile(path, excelize.Options{RawCellValue: true, UnzipSizeLimit: MaxWorkbookBytes})
		if err != nil {
			return Gaugings{}, &ParseError{File: path, Err: fmt.Errorf("cannot open workbook: %w", err)}
		}
		defer f.Close()
		for _, s := range f.GetSheetList() {
			if strings.EqualFold(s, GaugingsSheet) {
				sheet = s
			}
		}
		t, err := SheetTable(f, path, sheet)
		if err != nil {
			return Gaugings{}, err
		}
		return GaugingsFromTable(t)
	}
	t, err := ReadTable(path, sheet)
	if err != nil {
		return Gaugings{}, err
	}
	return GaugingsFromTable(t)
}

// ParseGaugings reads gaugings from CSV text; name is used in messages.
func ParseGaugings(r io.Reader, name string) (Gaugings, error) {
	t, err := ParseCSV(r, name)
	if err != nil {
		return Gaugings{}, err
	}
	return GaugingsFromTable(t)
}

// GaugingsFromTable turns a table with columns time, stage (or
// gauge_height) and discharge, and optional quality and note, into
// gaugings. Every bad cell is reported, each naming its row and column:
// a blank or unreadable time, stage or discharge, a negative discharge, an
// unknown quality word, and a time given twice.
func GaugingsFromTable(t *Table) (Gaugings, error) {
	gs := Gaugings{File: t.File, Sheet: t.Sheet}
	ct, err := t.Require(ColGaugingTime)
	if err != nil {
		return gs, err
	}
	cs, err := t.Require(ColGaugingStage, ColGaugeHeight)
	if err != nil {
		return gs, err
	}
	cq, err := t.Require(ColGaugingDischarge)
	if err != nil {
		return gs, err
	}
	cqual := t.Column(ColGaugingQuality)
	cnote := t.Column(ColNote)
	var errs errorList
	add := func(rec Record, col int, err error) {
		errs = append(errs, t.At(rec, col, err))
	}
	type instant struct {
		sec  int64
		nsec int
	}
	seen := map[instant]int{} // time → row; offsets count, so 10:00+01:00 is 09:00Z
	number := func(rec Record, col int, what string) (float64, bool) {
		v, ok, err := t.Float(rec, col)
		if err != nil {
			errs = append(errs, err.(*ParseError))
			return 0, false
		}
		if !ok {
			add(rec, col, fmt.Errorf("%w: %s is blank", ErrNotNumber, what))
		}
		return v, ok
	}
	for _, rec := range t.Records {
		g := gauged.Gauging{Source: where(t, rec.Row), Note: t.Cell(rec, cnote)}
		okAll := true
		if s := t.Cell(rec, ct); s == "" {
			add(rec, ct, fmt.Errorf("%w: time is blank", ErrBadTime))
			okAll = false
		} else if tm, err := ParseGaugingTime(s, t.Sheet != "", t.Date1904); err != nil {
			add(rec, ct, err)
			okAll = false
		} else {
			g.Time = tm
			key := instant{tm.Unix(), tm.Nanosecond()}
			if prev, dup := seen[key]; dup {
				add(rec, ct, fmt.Errorf("%w: the same time as row %d", ErrDuplicateTime, prev))
			} else {
				seen[key] = rec.Row
			}
		}
		var ok bool
		g.Stage, ok = number(rec, cs, "stage")
		okAll = okAll && ok
		g.Discharge, ok = number(rec, cq, "discharge")
		okAll = okAll && ok
		if ok && g.Discharge < 0 {
			add(rec, cq, ErrNegativeDischarge)
		}
		if cqual >= 0 {
			q, err := rating.ParseQuality(t.Cell(rec, cqual))
			if err != nil {
				add(rec, cqual, err)
			}
			g.Quality = q
		}
		if okAll {
			gs.Gaugings = append(gs.Gaugings, g)
		}
	}
	if len(errs) > 0 {
		return gs, errs.err()
	}
	if len(gs.Gaugings) == 0 {
		return gs, &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Err: ErrEmpty}
	}
	return gs, nil
}
