package survey

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strings"

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
	// ColGaugingUncertainty (optional) is the measurement's expanded
	// uncertainty at the 95 % level, in percent of the discharge; it
	// overrides the quality's band in a fit.
	ColGaugingUncertainty = "uncertainty"
	// ColGaugingExclude (optional): any text other than blanks leaves the
	// gauging out of the rating fit and is shown as the reason.
	ColGaugingExclude = "exclude"
)

// GaugingColumns returns the usual columns of a gaugings table in their
// order (the field workbook's gaugings sheet adds uncertainty and exclude
// before note).
func GaugingColumns() []string {
	return []string{ColGaugingTime, ColGaugingStage, ColGaugingDischarge, ColGaugingQuality, ColNote}
}

// Gaugings is a list of discharge measurements read from a file.
type Gaugings struct {
	// Gaugings are in file order; each Source names its file and row.
	Gaugings []gauged.Gauging
	// File and Sheet say where the gaugings came from.
	File, Sheet string
	// Warnings are unusual but legal facts about the data.
	Warnings []string
	// Units is what the headers say of the unit system.
	Units UnitNote
	// Site is the site metadata read above the table.
	Site rating.Site
}

// Causes of gauging errors, for errors.Is.
var (
	ErrNegativeDischarge = errors.New("discharge must not be negative")
	ErrDuplicateTime     = errors.New("duplicate time")
	ErrUncertainty       = errors.New("uncertainty must be a percentage above 0 and below 100")
)

// MaxUncertaintyPercent bounds a gauging's uncertainty column: an
// expanded uncertainty of 100 % or more says nothing of the discharge (a
// project choice; a log-normal error of that size is not a measurement).
const MaxUncertaintyPercent = 100.0

// ReadGaugings reads gaugings from a CSV file or a workbook sheet. For a
// workbook with no sheet named, the sheet FieldSheetGaugings is read if present,
// else the first sheet.
func ReadGaugings(path, sheet string) (Gaugings, error) {
	t, err := readTable(path, sheet, FieldSheetGaugings)
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
// gauge_height) and discharge, and optional quality, note, uncertainty
// (percent at 95 %, above 0 and below MaxUncertaintyPercent; blank: the
// quality's band) and exclude (any text excludes the gauging from a fit
// and is its reason), into gaugings. Every bad cell is reported, each
// naming its row and column: a blank or unreadable time, stage or
// discharge, a negative discharge, an unknown quality word, an
// uncertainty that is not a number in range, and a time given twice.
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
	if gs.Units, err = t.HeaderUnits(cs, cq); err != nil {
		return gs, err
	}
	gs.Site = t.Site()
	cqual := t.Column(ColGaugingQuality)
	cnote := t.Column(ColNote)
	cunc, cexcl := t.Column(ColGaugingUncertainty), t.Column(ColGaugingExclude)
	var errs errorList
	add := func(rec Record, col int, err error) {
		errs = append(errs, t.At(rec, col, err))
	}
	type instant struct {
		sec  int64
		nsec int
	}
	seen := map[instant]int{} // time → row; offsets count, so 10:00+01:00 is 09:00Z
	number := func(rec Record, col int, what string, limit float64) (float64, bool) {
		v, ok, err := t.Float(rec, col)
		switch {
		case err != nil:
			errs = append(errs, err.(*ParseError))
			return 0, false
		case !ok:
			add(rec, col, fmt.Errorf("%w: %s is blank", ErrNotNumber, what))
		case math.Abs(v) > limit:
			add(rec, col, fmt.Errorf("%s %g %w (beyond ±%g)", what, v, ErrImplausible, limit))
			return v, false
		}
		return v, ok
	}
	for _, rec := range t.Records {
		g := gauged.Gauging{Source: where(t, rec.Row), Note: t.Cell(rec, cnote), Exclude: strings.TrimSpace(t.Cell(rec, cexcl))}
		okAll := true
		if s := t.Cell(rec, ct); s == "" {
			add(rec, ct, fmt.Errorf("%w: time is blank", ErrBadTime))
			okAll = false
		} else if tm, err := ParseTime(s, t.Sheet != "", t.Date1904); err != nil {
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
		g.Stage, ok = number(rec, cs, "stage", MaxElevation)
		okAll = okAll && ok
		g.Discharge, ok = number(rec, cq, "discharge", rating.MaxDischarge)
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
		if cunc >= 0 {
			u, ok, err := t.Float(rec, cunc)
			switch {
			case err != nil:
				errs = append(errs, err.(*ParseError))
			case ok && !(u > 0 && u < MaxUncertaintyPercent):
				add(rec, cunc, fmt.Errorf("%w: %g", ErrUncertainty, u))
			case ok:
				g.Uncertainty = u
			}
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
