package survey

import (
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"strings"
	"time"

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
	// gauging out of the rating fit and is shown as the reason, but for
	// the words of no (see excludeReason).
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
	// Times says how the table writes its times.
	Times TimeForm
}

// MinGaugedDischarge is the smallest discharge above zero a gauging may
// hold, in the file's units (m³/s or ft³/s): the smallest flows gauged,
// by volume or a small flume, are of the order of 1e-4 m³/s (a tenth of
// a litre a second; common practice), so a smaller one is a slip (a unit,
// a lost exponent), and one near the smallest float64 makes every ratio
// with it infinite. Zero, a dry channel, is read.
const MinGaugedDischarge = 1e-6

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
// else the first visible sheet.
func ReadGaugings(path, sheet string) (Gaugings, error) {
	t, err := readTable(path, sheet, FieldSheetGaugings)
	if err != nil {
		return Gaugings{}, err
	}
	g, err := GaugingsFromTable(t)
	return g, gaugingsSheetHint(t, sheet, err)
}

// gaugingsSheetHint adds to a missing column of gaugings read from a
// workbook with no sheet named, and no sheet named FieldSheetGaugings
// (the sheet read being the first), which sheet to name with
// --gaugings-sheet: the first other sheet holding gaugings (time, stage
// and discharge columns), or else the workbook's sheets. Other errors are
// returned as they are.
func gaugingsSheetHint(t *Table, sheet string, err error) error {
	var pe *ParseError
	if sheet != "" || t.Sheet == "" || strings.EqualFold(t.Sheet, FieldSheetGaugings) ||
		!errors.Is(err, ErrMissingColumn) || !errors.As(err, &pe) {
		return err
	}
	for _, name := range t.Sheets {
		if name == t.Sheet {
			continue
		}
		o, e := ReadTable(t.File, name)
		if e != nil {
			continue
		}
		if _, e := gaugingColsOf(o); e == nil {
			pe.Err = fmt.Errorf("%w; the workbook has no sheet named %s and this one, its first, holds no gaugings: sheet %s does: give --gaugings-sheet %s",
				pe.Err, FieldSheetGaugings, name, SheetArg(name))
			return err
		}
	}
	pe.Err = fmt.Errorf("%w; the workbook has no sheet named %s and this one, its first, holds no gaugings: name the sheet holding them with --gaugings-sheet (sheets: %s)",
		pe.Err, FieldSheetGaugings, strings.Join(t.Sheets, ", "))
	return err
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
// (percent at 95 %, above 0 and below MaxUncertaintyPercent, a percent
// sign after the number allowed, a workbook cell with a percent format
// read as the percent it shows; blank: the quality's band) and exclude (any text excludes the gauging from a fit
// and is its reason), into gaugings. Stage and discharge are read in the
// units the headers say (Gaugings.Units). Every bad cell is reported, each
// a *ParseError naming its row and column, joined: a blank or unreadable
// time (ErrBlankTime; ErrISOTime, ErrAmbiguousDate, ErrSubSecond or
// ErrSerialInCSV, see ParseTime), stage or discharge (ErrNotNumber,
// ErrThousands, ErrDecimalComma, ErrPercent, ErrImplausible
// beyond MaxElevation or rating.MaxDischarge, or a discharge above zero
// below MinGaugedDischarge), a negative discharge
// (ErrNegativeDischarge), an unknown quality word, an uncertainty that is
// not a number in range (ErrUncertainty), and a time given twice
// (ErrDuplicateTime; times with offsets compare as instants), a year
// outside MinYear to MaxYear (ErrYear), and a time written with a UTC
// offset in a table whose first time has none, or the other way round
// (ErrMixedOffsets). A time-zone column (TimeZoneColumns) gives each
// row's time its offset (see zonedTime: ErrZone, ErrZoneBlank,
// ErrZoneDisagrees at the zone cell). A first time of day alone beside a
// date column is refused once, at it (ErrDateApart). A missing column is the error of
// Table.Require, a table without rows ErrEmpty. A quality, note or
// exclude column holding a bare digit string after a whole gauge height
// on most rows is refused (ErrSplitNumber), after a whole discharge or
// uncertainty warned of (see gaugingCols.splitNumbers). Gauge
// heights spanning more than a river rises are warned of by
// Gaugings.SpanWarnings once the unit system is known.
func GaugingsFromTable(t *Table) (Gaugings, error) {
	return gaugingsFromTable(t, 0)
}

// gaugingsFromTable is GaugingsFromTable, a time written without an offset
// (or a workbook date serial) taken at UTC plus off seconds.
func gaugingsFromTable(t *Table, off int64) (Gaugings, error) {
	gs := Gaugings{File: t.File, Sheet: t.Sheet, Warnings: t.ownWarnings()}
	cols, err := gaugingColsOf(t)
	if err != nil {
		return gs, err
	}
	if gs.Units, err = t.HeaderUnits(cols.stage, cols.discharge); err != nil {
		return gs, err
	}
	split, err := cols.splitNumbers(t, gs.Units)
	if err != nil {
		return gs, err
	}
	gs.Warnings = append(gs.Warnings, split...)
	gs.Site = t.Site()
	if pe := t.dateApart(cols.time); pe != nil {
		return gs, pe
	}
	rd := &gaugingReader{t: t, cols: cols, off: off, seen: map[int64]int{}}
	for _, rec := range t.Records {
		if g, ok := rd.row(rec); ok {
			gs.Gaugings = append(gs.Gaugings, g)
		}
	}
	if len(rd.errs) > 0 {
		return gs, rd.errs.err()
	}
	gs.Times = rd.times
	if len(gs.Gaugings) == 0 {
		return gs, &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Err: ErrEmpty}
	}
	gs.Warnings = append(gs.Warnings, twinGaugingWarnings(gs.Gaugings)...)
	return gs, nil
}

// MaxGaugedSpan is the widest range of gauge heights the gaugings of one
// gauge are expected to span, in metres (MaxGaugedSpanFeet in feet): few
// rivers rise more than about 30 m at a gauge (common practice), so a
// wider span most often means gauge heights written in centimetres or
// another unit than the headers or --units say.
const (
	MaxGaugedSpan     = 50.0
	MaxGaugedSpanFeet = 160.0
)

// SpanWarnings returns the warning, if any, of gauge heights of gs that
// span more than a river rises at a gauge, in the unit system u resolved
// for them (the headers', else the one asked for: MaxGaugedSpan in si,
// MaxGaugedSpanFeet in us units), naming the lowest and highest. The
// readers leave it to their caller, which knows u.
func (gs Gaugings) SpanWarnings(u rating.Units) []string {
	if len(gs.Gaugings) == 0 {
		return nil
	}
	lo, hi := gs.Gaugings[0], gs.Gaugings[0]
	for _, g := range gs.Gaugings[1:] {
		if g.Stage < lo.Stage {
			lo = g
		}
		if g.Stage > hi.Stage {
			hi = g
		}
	}
	limit, unit := MaxGaugedSpan, "m"
	if u == rating.US {
		limit, unit = MaxGaugedSpanFeet, "ft"
	}
	if hi.Stage-lo.Stage <= limit {
		return nil
	}
	return []string{fmt.Sprintf("the gauge heights span %s %s (from %s at %s to %s at %s), more than any river rises at a gauge (%s %s): are they in centimetres, or another unit than the rating's?",
		rating.PlainFigures(hi.Stage-lo.Stage, 4), unit, rating.PlainFigures(lo.Stage, 4), lo.Source,
		rating.PlainFigures(hi.Stage, 4), hi.Source, rating.PlainFigures(limit, 3), unit)}
}

// Two gaugings this close in time, stage and discharge are most likely
// one measurement entered twice (common practice: a crew does not repeat
// a measurement to the same figures within a visit).
const (
	twinWithin        = 3 * time.Hour
	twinStage         = 0.005 // length unit
	twinDischargeFrac = 0.001 // of the discharge
)

// twinGaugingWarnings warns of pairs of gaugings a few hours apart with
// the same gauge height and discharge to the figures written: an entry
// copied twice, which would count twice in a fit.
func twinGaugingWarnings(gs []gauged.Gauging) []string {
	order := make([]int, len(gs))
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, func(i, j int) int { return gs[i].Time.Compare(gs[j].Time) })
	var out []string
	for k, i := range order {
		for _, j := range order[k+1:] {
			a, b := gs[i], gs[j]
			dt := b.Time.Sub(a.Time)
			if dt > twinWithin {
				break
			}
			if a.Exclude != "" || b.Exclude != "" || math.Abs(a.Stage-b.Stage) > twinStage ||
				math.Abs(a.Discharge-b.Discharge) > twinDischargeFrac*math.Max(a.Discharge, b.Discharge) {
				continue
			}
			out = append(out, fmt.Sprintf("the gaugings of %s and %s, %d minutes apart, have the same gauge height and discharge: one measurement entered twice? (exclude one, or it counts twice)",
				a.Source, b.Source, int(dt.Round(time.Minute)/time.Minute)))
		}
	}
	return out
}

// gaugingCols are the column indices of a gaugings table (-1 for an
// optional column that is absent).
type gaugingCols struct {
	time, stage, discharge              int
	quality, note, uncertainty, exclude int
	zone                                int
}

// gaugingColsOf finds the columns of a gaugings table: time, stage (or
// gauge_height) and discharge are required.
func gaugingColsOf(t *Table) (gaugingCols, error) {
	var c gaugingCols
	var err error
	if c.time, err = t.Require(ColGaugingTime); err != nil {
		return c, err
	}
	if c.stage, err = t.Require(ColGaugingStage, ColGaugeHeight); err != nil {
		return c, err
	}
	if c.discharge, err = t.Require(ColGaugingDischarge); err != nil {
		return c, err
	}
	c.quality, c.note = t.Column(ColGaugingQuality), t.Column(ColNote)
	c.uncertainty, c.exclude = t.Column(ColGaugingUncertainty), t.Column(ColGaugingExclude)
	if c.zone, err = zoneColumn(t); err != nil {
		return c, err
	}
	return c, t.unsavedIn(c.time, c.stage, c.discharge, c.quality, c.note, c.uncertainty, c.exclude, c.zone)
}

// splitNumbers checks a quality, note or exclude column holding on most
// rows a bare digit string after a whole number in the stage, discharge
// or uncertainty column before it: an unquoted decimal comma (0,84 or
// 4,10) that split the number and shifted the row without adding a field
// (see Table.splitNumbers). After the gauge height, read to the
// millimetre, it is an error (ErrSplitNumber); after a discharge or an
// uncertainty, often whole, a warning. A note may hold measurement
// numbers, which pass when they increase down the rows; headers naming
// US units (units) and quoted cells pass.
func (c gaugingCols) splitNumbers(t *Table, units UnitNote) ([]string, error) {
	return t.splitNumbers(splitColumns{refuse: []int{c.stage}, warn: []int{c.discharge, c.uncertainty},
		text: []int{c.quality, c.note, c.exclude}, running: []int{c.note}, units: units})
}

// gaugingReader reads the rows of a gaugings table, gathering the errors
// of every cell.
type gaugingReader struct {
	t    *Table
	cols gaugingCols
	// off is the offset in seconds of a time written without one.
	off int64
	// form is the form of the table's first time.
	form offsetForm
	// times is the form of the table's first time, as Gaugings.Times.
	times TimeForm
	// seen holds the row of every time read, by its instant (Unix
	// seconds): offsets count, so 10:00+10:00 and 00:00Z are one time.
	seen map[int64]int
	errs errorList
}

// add records the error of a cell.
func (rd *gaugingReader) add(rec Record, col int, err error) {
	rd.errs = append(rd.errs, rd.t.At(rec, col, err))
}

// row reads one gauging; false when its time, stage or discharge cannot
// be read (the other cells' errors are recorded all the same).
func (rd *gaugingReader) row(rec Record) (gauged.Gauging, bool) {
	t, c := rd.t, rd.cols
	g := gauged.Gauging{Source: where(t, rec.Row), Note: t.Cell(rec, c.note), Exclude: excludeReason(t.Cell(rec, c.exclude))}
	okAll := rd.time(rec, &g)
	var ok bool
	g.Stage, ok = rd.number(rec, c.stage, "stage", MaxElevation)
	okAll = okAll && ok
	g.Discharge, ok = rd.number(rec, c.discharge, "discharge", rating.MaxDischarge)
	okAll = okAll && ok
	switch {
	case ok && g.Discharge < 0:
		rd.add(rec, c.discharge, ErrNegativeDischarge)
	case ok && g.Discharge > 0 && g.Discharge < MinGaugedDischarge:
		rd.add(rec, c.discharge, fmt.Errorf("discharge %g %w (above 0 but below %g)", g.Discharge, ErrImplausible, MinGaugedDischarge))
		okAll = false
	}
	if c.quality >= 0 {
		q, err := rating.ParseQuality(t.Cell(rec, c.quality))
		if err != nil {
			rd.add(rec, c.quality, err)
		}
		g.Quality = q
	}
	if c.uncertainty >= 0 {
		rd.uncertainty(rec, &g)
	}
	return g, okAll
}

// time reads the gauging's time into g; false when it is blank or
// unreadable. A time read before is an error but still read.
func (rd *gaugingReader) time(rec Record, g *gauged.Gauging) bool {
	t, ct := rd.t, rd.cols.time
	s := t.Cell(rec, ct)
	if s == "" {
		rd.add(rec, ct, ErrBlankTime)
		return false
	}
	sec, zone, zoned, perr := t.readTime(rec, ct, rd.cols.zone, rd.off)
	if perr != nil {
		rd.errs = append(rd.errs, perr)
		return false
	}
	if rd.form.row == 0 {
		rd.times = TimeForm{Offsets: zoned, First: time.Duration(zone) * time.Second}
	}
	if err := rd.form.check(rec.Row, zoned); err != nil {
		rd.add(rec, ct, err)
		return false
	}
	g.Time = instant(sec, zone, zoned) // reported as written when no offset is chosen
	if prev, dup := rd.seen[sec]; dup {
		rd.add(rec, ct, fmt.Errorf("%w: the same time as row %d", ErrDuplicateTime, prev))
	} else {
		rd.seen[sec] = rec.Row
	}
	return true
}

// number reads the number in column col, what naming it; false when it
// is blank, unreadable or beyond ±limit.
func (rd *gaugingReader) number(rec Record, col int, what string, limit float64) (float64, bool) {
	v, err := rd.t.number(rec, col, what, limit)
	if err != nil {
		rd.errs = append(rd.errs, err)
		return v, false
	}
	return v, true
}

// uncertainty reads the gauging's uncertainty into g when given and in
// range.
func (rd *gaugingReader) uncertainty(rec Record, g *gauged.Gauging) {
	cu := rd.cols.uncertainty
	u, ok, err := rd.t.percent(rec, cu)
	switch {
	case err != nil:
		rd.errs = append(rd.errs, err.(*ParseError))
	case ok && !(u > 0 && u < MaxUncertaintyPercent):
		rd.add(rec, cu, fmt.Errorf("%w: %g", ErrUncertainty, u))
	case ok:
		g.Uncertainty = u
	}
}

// KeepWords returns the words of the exclude column that keep a gauging
// (as a blank cell does), matched case-insensitively: a crew writes keep or
// include where it means the gauging stays in, and a spreadsheet makes
// FALSE typed in a cell a boolean, which reads FALSE.
func KeepWords() []string {
	return []string{"no", "n", "false", "0", "none", "keep", "kept", "include", "included", "use"}
}

// excludeReason is the reason an exclude cell gives for leaving a
// gauging out, "" to keep it: a blank cell, or one of KeepWords, keeps
// the gauging; any other text is the reason.
func excludeReason(cell string) string {
	s := strings.TrimSpace(cell)
	if slices.Contains(KeepWords(), strings.ToLower(s)) {
		return ""
	}
	return s
}
