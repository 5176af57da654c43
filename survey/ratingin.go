package survey

import (
	"errors"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/rating/reach"
)

// ReadRatingCSV reads back a rating table written by WriteRatingCSV, from
// a CSV file or a workbook sheet (by extension; sheet "" is the first).
// The unit system is u's, or the headers' when they name units and u was
// not given (see UnitNote.Resolve).
func ReadRatingCSV(path, sheet string, u UnitChoice) (rating.Table, error) {
	t, err := ReadTable(path, sheet)
	if err != nil {
		return rating.Table{}, err
	}
	return RatingFromTable(t, u)
}

// ParseRatingCSV reads a rating table from CSV text; name is used in
// messages and as the table's name.
func ParseRatingCSV(r io.Reader, name string, u UnitChoice) (rating.Table, error) {
	t, err := ParseCSV(r, name)
	if err != nil {
		return rating.Table{}, err
	}
	return RatingFromTable(t, u)
}

// ErrRatingStageOrder is the cause of a rating table whose stages do not
// increase from row to row.
var ErrRatingStageOrder = errors.New("stages of a rating table must increase from row to row")

// ErrRatingPeriods is the cause of a rating table holding several rating
// periods (a valid_from column with more than one time) where one rating
// is read.
var ErrRatingPeriods = errors.New("one rating per file is read; give each period a file of its own")

// KindFitted is the Kind of a rating table read with a column only a
// rating fit's table has (IsFitTable: basis or a band bound; not
// extrapolated, which a plain rating table may have).
const KindFitted = "fitted rating"

// KindBackwater is the Kind of a rating table whose flags column carries
// a step-backwater run's own flags (reach.FlagUnsettled,
// reach.FlagCriticalStage), as backwater writes its rating.
const KindBackwater = rating.KindBackwater

// ColRatingFlags is the column of a rating table's row flags, words
// separated by spaces (rating.FlagAboveEnd, reach.FlagUnsettled, ...).
const ColRatingFlags = "flags"

// Tolerances of the friction slope read from a rating table. Its values
// are written to six significant digits, so Q/K is good to about 1e-5 and
// (Q/K)² to slopeRoundingTol; rows whose slopes spread by no more than
// uniformSlopeTol share one slope (the friction slopes of a
// step-backwater rating differ by percents).
const (
	slopeRoundingTol = 2e-5
	uniformSlopeTol  = 1e-4
)

// RatingFromTable turns a table with the columns of RatingColumns and
// ExtraRatingColumns (stage also known as gauge_height) into a rating
// table. Stage and discharge are
// required in every row, within the bounds every rating table is read
// with (a stage within ±MaxElevation, a discharge at most
// rating.MaxDischarge; ErrImplausible at the cell beyond them), the
// stages must increase from row to row
// (ErrRatingStageOrder at the stage cell of a row that does not) and no
// discharge may be negative (gauged.ErrRatingNegative at its cell, as a
// rating table is read for the record and compare). A valid_from column
// may hold one time, not several rating periods (ErrRatingPeriods), its
// times read and checked as RatingTablesFromTable reads them (ParseISOTime's
// forms or a workbook date, ErrYear, ErrMixedOffsets: a ParseError at the
// cell; offsets count, so one instant written twice is one period); every
// other column may be missing or blank (NaN), and within its bound where
// given (ratingFields: MaxArea and the others; ErrImplausible at the
// cell beyond it). Per-subsection columns are
// not read. Bottom is stage − depth where a depth is given, else the
// lowest stage; Top is the highest stage. Slope is the friction slope
// (Q/K)² when at least two rows with flow and conveyance give the same one
// (a uniform-flow table by Manning's equation, as rate writes), as the
// shortest decimal within the table's rounding; else NaN. Each row's
// flags are the words of its flags column. Kind is KindFitted for a table
// with a rating fit's columns, KindBackwater for one whose flags include
// a step-backwater run's, else "". Every bad cell is reported, each
// naming its row and column.
func RatingFromTable(t *Table, choice UnitChoice) (rating.Table, error) {
	return RatingFromTableGiven(t, choice, ZeroFlowGiven{})
}

// RatingFromTableGiven is RatingFromTable of a table read with a gauge
// height of zero flow given (zero), as plot's --zero-flow gives one: a
// column of the table naming a zero flow is warned of as
// RatingTablesFromTable warns of it, not when it holds the value given,
// and so are the highest row without flow above the value given and the
// lowest row with flow at or below it, which contradict it (the readers
// of ratings for discharge refuse them: gauged.ErrDryAboveZeroFlow,
// gauged.ErrZeroFlowAbove).
func RatingFromTableGiven(t *Table, choice UnitChoice, zero ZeroFlowGiven) (rating.Table, error) {
	out := rating.Table{Name: ratingSection(t), Units: choice.Units, Slope: math.NaN(), Warnings: t.ownWarnings()}
	cs, cq, units, err := ratingColumns(t, choice)
	if err != nil {
		return out, err
	}
	out.Units = units
	cv := t.Column(ColRatingValidFrom)
	read := []int{cs, cq, cv}
	for _, name := range ratingRowColumns() {
		read = append(read, t.Column(name))
	}
	read = append(read, t.Column(ColRatingFlags))
	if err := t.unsavedIn(read...); err != nil {
		return out, err
	}
	out.Warnings = append(out.Warnings, zeroFlowWarnings(t, zero)...)
	vf, err := newValidFromReader(t, cv, 0)
	if err != nil {
		return out, err
	}
	periods := 0 // the rating periods of the times read, grouped as RatingTablesFromTable groups them
	var lastFrom time.Time
	cells := rowCells{t: t}
	out.Bottom, out.Top = math.Inf(1), math.Inf(-1)
	bottomFromDepth := false
	last := math.NaN() // the stage of the row before, read or not
	var rows []int     // the row of each of out.Rows
	for _, rec := range t.Records {
		if cv >= 0 {
			from, given, perr := vf.read(rec)
			switch {
			case perr != nil:
				cells.errs = append(cells.errs, perr)
			case given && (periods == 0 || !from.Equal(lastFrom)):
				periods, lastFrom = periods+1, from
			}
		}
		r := cells.ratingRow(rec, cs, cq)
		if !math.IsNaN(r.Stage) {
			prev := last
			last = r.Stage
			if !math.IsNaN(prev) && !(r.Stage > prev) {
				cells.errs = append(cells.errs, t.At(rec, cs, fmt.Errorf("%w (%g after %g)", ErrRatingStageOrder, r.Stage, prev)))
				continue
			}
		}
		if r.Discharge < 0 {
			cells.errs = append(cells.errs, t.At(rec, cq, gauged.ErrRatingNegative))
			continue
		}
		if math.IsNaN(r.Stage) || math.IsNaN(r.Discharge) {
			continue
		}
		out.Top = math.Max(out.Top, r.Stage)
		if r.Depth > 0 && !bottomFromDepth {
			out.Bottom, bottomFromDepth = r.Stage-r.Depth, true
		} else if !bottomFromDepth {
			out.Bottom = math.Min(out.Bottom, r.Stage)
		}
		out.Rows = append(out.Rows, r)
		rows = append(rows, rec.Row)
	}
	if periods > 1 {
		return out, &ParseError{File: t.File, Sheet: t.Sheet,
			Err: fmt.Errorf("holds %d rating periods (a %s column): %w", periods, ColRatingValidFrom, ErrRatingPeriods)}
	}
	if err := cells.errs.err(); err != nil {
		return out, err
	}
	out, err = finishRatingTable(t, out, rows)
	if err == nil && zero.Given {
		if w := dryAboveGiven(t, out.Rows, rows, zero); w != "" {
			out.Warnings = append(out.Warnings, w)
		}
		if w := wetBelowGiven(t, out.Rows, rows, zero); w != "" {
			out.Warnings = append(out.Warnings, w)
		}
	}
	return out, err
}

// dryAboveGiven words the warning of a table whose highest row without
// flow lies above the gauge height of zero flow given (zero), "" when
// none does (rows of t in rising stage, their rows' numbers in at).
func dryAboveGiven(t *Table, rows []rating.Row, at []int, zero ZeroFlowGiven) string {
	k := -1
	for i, r := range rows {
		// As the other commands read it (raiseToDryRow).
		if r.Discharge == 0 && r.Stage-zero.Value > dryRowRounding(r.Stage) {
			k = i
		}
	}
	if k < 0 {
		return ""
	}
	e := strconv.FormatFloat(zero.Value, 'g', -1, 64)
	return fmt.Sprintf("%s: this row, at stage %s, has no flow, yet lies above the gauge height of zero flow %s that %s gives: the two disagree "+
		"(shifts, record and compare refuse them together); give e at or above the table's last dry row, or leave %s out to take the table's own",
		where(t, at[k]), strconv.FormatFloat(rows[k].Stage, 'g', -1, 64), e, zero.flag(), zero.flag())
}

// wetBelowGiven words the warning of a table whose lowest row with flow
// lies at or below the gauge height of zero flow given (zero), "" when
// none does (rows and at as for dryAboveGiven).
func wetBelowGiven(t *Table, rows []rating.Row, at []int, zero ZeroFlowGiven) string {
	k, n := -1, 0
	for i, r := range rows {
		if r.Discharge > 0 && !(r.Stage > zero.Value) {
			if k < 0 {
				k = i
			}
			n++
		}
	}
	if k < 0 {
		return ""
	}
	more := ""
	if n > 1 {
		more = fmt.Sprintf(" (and %s above it)", rating.Counted(n-1, "row with flow", "rows with flow"))
	}
	e := strconv.FormatFloat(zero.Value, 'g', -1, 64)
	return fmt.Sprintf("%s: this row, at stage %s, carries %s, yet lies at or below the gauge height of zero flow %s that %s gives%s: the two disagree "+
		"(shifts, record and compare refuse them together); give e below the table's first row with flow, or leave %s out to take the table's own",
		where(t, at[k]), strconv.FormatFloat(rows[k].Stage, 'g', -1, 64), strconv.FormatFloat(rows[k].Discharge, 'g', -1, 64), e, zero.flag(), more, zero.flag())
}

// ratingColumns finds a rating table's stage and discharge columns and
// its unit system: the units its headers name (RatingUnits), which must
// agree with choice.
func ratingColumns(t *Table, choice UnitChoice) (cs, cq int, units rating.Units, err error) {
	if cs, err = t.Require(ColRatingStage, ColGaugeHeight); err != nil {
		return
	}
	if cq, err = t.Require("discharge"); err != nil {
		return
	}
	note, err := RatingUnits(t)
	if err != nil {
		return
	}
	units, err = note.Resolve(choice.Units, choice.Given)
	return
}

// RatingUnits is what the headers of a rating table's stage, discharge
// and geometry columns (depth, area, wetted_perimeter, top_width) say of
// its unit system; errors as Table.HeaderUnits.
func RatingUnits(t *Table) (UnitNote, error) {
	cs := t.Column(ColRatingStage)
	if cs < 0 {
		cs = t.Column(ColGaugeHeight)
	}
	return t.HeaderUnits(cs, t.Column(ColRatingDischarge), t.Column("depth"), t.Column("area"), t.Column("wetted_perimeter"), t.Column("top_width"))
}

// Sheets of a results workbook that wetline writes (survey/results): the
// summary first, as items with their values and units; the rating of rate
// and backwater, fit's fitted rating, and the rating periods a record or
// a shift check used (every period's table in one sheet, not one rating).
const (
	SheetResultsSummary = "summary"
	SheetResultsRating  = "rating"
	SheetResultsFitted  = "fitted rating"
	SheetResultsRatings = "ratings"
)

// resultsRatingSheets are the sheets of a results workbook that hold a
// rating table to redraw, in the order they are looked for: rate's and
// backwater's rating, fit's fitted rating.
func resultsRatingSheets() []string {
	return []string{SheetResultsRating, SheetResultsFitted}
}

// ErrNoRatingSheet is the cause of a results workbook, read for its rating
// table, that has none (a record's, a shift check's, a slope-area
// computation's, a fit's without a fitted table).
var ErrNoRatingSheet = errors.New("a results workbook with no rating table")

// RatingSource is a rating table read back for redrawing, with what the
// summary sheet of a results workbook says of it.
type RatingSource struct {
	// Table is the rating table as read.
	Table *Table
	// Summary reports that the workbook's first sheet was a results
	// summary and its rating sheet was read instead.
	Summary bool
	// Site is the value of the summary's site item ("" when none).
	Site string
}

// OtherRatingSheet names the first sheet of the workbook t was read from,
// other than t's own, that reads as a rating table (RatingFromTable
// without error, its headers deciding the units: stage and discharge
// columns, stages increasing), so that following the name reads it; ""
// when none does, or t is no workbook sheet.
func OtherRatingSheet(t *Table) string {
	if t.Sheet == "" {
		return ""
	}
	for _, name := range t.Sheets {
		if name == t.Sheet {
			continue
		}
		o, err := ReadTable(t.File, name)
		if err != nil || o.Column(ColRatingStage, ColGaugeHeight) < 0 || o.Column(ColRatingDischarge) < 0 {
			continue
		}
		if _, err := RatingFromTable(o, UnitChoice{}); err == nil {
			return name
		}
	}
	return ""
}

// ReadRatingSource reads a rating table as ReadTable does, but from a
// workbook with no sheet named whose first sheet is the summary of a
// results workbook (named summary, with item and value columns) it reads
// the sheet wetline writes its rating to (rate's and backwater's rating,
// else fit's fitted rating), with the site the summary's site item gives
// (the rating sheet's headers name its units). A results workbook with
// neither is ErrNoRatingSheet (a *ParseError at the workbook), saying
// which sheets hold one and, for a record's or a shift check's workbook,
// that its ratings sheet holds every rating period together. Every
// reader of a rating table given with no sheet named finds it so (see
// ReadRatingTable).
func ReadRatingSource(path, sheet string) (RatingSource, error) {
	return readRatingSource(path, sheet, "")
}

// ReadRatingTable is ReadRatingSource's table alone: the rating table of
// a file, or of a workbook's sheet, or of a results workbook's rating
// sheet when no sheet is named.
func ReadRatingTable(path, sheet string) (*Table, error) {
	src, err := ReadRatingSource(path, sheet)
	return src.Table, err
}

// readRatingSource is ReadRatingSource; in a workbook with no sheet
// named, a sheet named prefer (any case) is read when there is one (see
// readTable).
func readRatingSource(path, sheet, prefer string) (RatingSource, error) {
	t, err := readTable(path, sheet, prefer)
	if err != nil || sheet != "" || !strings.EqualFold(t.Sheet, SheetResultsSummary) {
		return RatingSource{Table: t}, err
	}
	if t.Column("item") < 0 || t.Column("value") < 0 {
		return RatingSource{Table: t}, nil
	}
	found := func(name string) string { // the workbook's name of the sheet, "" for none
		if k := slices.IndexFunc(t.Sheets, func(s string) bool { return strings.EqualFold(s, name) }); k >= 0 {
			return t.Sheets[k]
		}
		return ""
	}
	for _, name := range resultsRatingSheets() {
		if s := found(name); s != "" {
			src := RatingSource{Summary: true, Site: summaryItem(t, "site")}
			src.Table, err = ReadTable(path, s)
			return src, err
		}
	}
	err = fmt.Errorf("%w (rate and backwater write theirs to a sheet named %s, fit to one named %s)", ErrNoRatingSheet, SheetResultsRating, SheetResultsFitted)
	if s := found(SheetResultsRatings); s != "" {
		err = fmt.Errorf("%w; its %s sheet lists every rating period used together, not one table: give a rating file the summary's read from names", err, s)
	}
	return RatingSource{Table: t}, &ParseError{File: path, Err: err}
}

// summaryItem is the first value given of the items named item of a
// results summary t ("" when none).
func summaryItem(t *Table, item string) string {
	ci, cv := t.Column("item"), t.Column("value")
	for _, rec := range t.Records {
		if v := t.Cell(rec, cv); strings.EqualFold(t.Cell(rec, ci), item) && v != "" {
			return v
		}
	}
	return ""
}

// Plausibility bounds of a rating table's property columns, in the
// table's own units (SI or US customary): a value beyond ±bound is a slip
// and refused at its cell (ErrImplausible), as stages beyond
// ±MaxElevation and discharges above rating.MaxDischarge are. Depths,
// hydraulic radii and hydraulic depths are bounded as elevations
// (MaxElevation), widths and wetted perimeters as stations
// (MaxCoordinate). Each bound is some hundreds of times what the largest
// rivers reach: the Amazon near its mouth carries of the order of 2e5
// m³/s through some 1e5 m² at 1 to 2 m/s, on a slope of about 2e-5 (from
// memory); a natural channel's α is 1.1 to 2 and its Froude number below
// 1 to 2 (Chow, Open-Channel Hydraulics, 1959, sections 2-8 and 3-3;
// from memory); a flood's bed shear stress is of the order of 1e2 to 1e3
// Pa (common practice).
const (
	// MaxArea bounds a flow area (length²).
	MaxArea = 1e8
	// MaxConveyance bounds a conveyance (discharge unit at unit slope):
	// the largest discharge, rating.MaxDischarge, on a slope of 1e-8.
	MaxConveyance = 1e12
	// MaxVelocity bounds a mean velocity (length/s).
	MaxVelocity = 1e3
	// MaxCoefficient bounds the dimensionless columns: α, β and the
	// Froude number.
	MaxCoefficient = 1e3
	// MaxShearStress bounds a mean bed shear stress (Pa, or lb/ft²).
	MaxShearStress = 1e6
)

// ratingField is an optional column of a rating table, the bound of its
// values (see MaxArea) and the field of rating.Row it fills.
type ratingField struct {
	name  string
	limit float64
	set   func(r *rating.Row, v float64)
}

// ratingFields are the optional columns ratingRow reads, each with its
// bound and field: the one list both ratingRow and ratingRowColumns use.
func ratingFields() []ratingField {
	return []ratingField{
		{"depth", MaxElevation, func(r *rating.Row, v float64) { r.Depth = v }},
		{"area", MaxArea, func(r *rating.Row, v float64) { r.Area = v }},
		{"wetted_perimeter", MaxCoordinate, func(r *rating.Row, v float64) { r.WettedPerimeter = v }},
		{"top_width", MaxCoordinate, func(r *rating.Row, v float64) { r.TopWidth = v }},
		{"hydraulic_radius", MaxElevation, func(r *rating.Row, v float64) { r.HydraulicRadius = v }},
		{"conveyance", MaxConveyance, func(r *rating.Row, v float64) { r.Conveyance = v }},
		{"mean_velocity", MaxVelocity, func(r *rating.Row, v float64) { r.MeanVelocity = v }},
		{"alpha", MaxCoefficient, func(r *rating.Row, v float64) { r.Alpha = v }},
		{"froude", MaxCoefficient, func(r *rating.Row, v float64) { r.Froude = v }},
		{"hydraulic_depth", MaxElevation, func(r *rating.Row, v float64) { r.HydraulicDepth = v }},
		{"beta", MaxCoefficient, func(r *rating.Row, v float64) { r.Beta = v }},
		{"shear_stress", MaxShearStress, func(r *rating.Row, v float64) { r.ShearStress = v }},
	}
}

// ratingRowColumns are the names of the optional columns ratingRow reads.
func ratingRowColumns() []string {
	fs := ratingFields()
	names := make([]string, len(fs))
	for i, f := range fs {
		names[i] = f.name
	}
	return names
}

// ratingRow reads one row of a rating table: stage and discharge, each
// NaN when blank or bad (the error kept in c), and the hydraulics of the
// columns given (ratingFields; NaN when absent), and its flags (the words
// of a flags column, as rate and backwater write them).
func (c *rowCells) ratingRow(rec Record, cs, cq int) rating.Row {
	r := rating.Row{Stage: c.needed(rec, cs, "stage", MaxElevation), Discharge: c.needed(rec, cq, "discharge", rating.MaxDischarge),
		Flags: strings.Fields(c.t.Cell(rec, c.t.Column(ColRatingFlags)))}
	for _, f := range ratingFields() {
		f.set(&r, c.optional(rec, f.name, f.limit))
	}
	return r
}

// finishRatingTable completes a rating table read without error: its
// rows (ErrEmpty when none), uniform slope, kind, and the warning of a
// discharge that falls (rows gives each row's place in the file). A
// table with no depth column is not warned of here: nothing read from it
// rests on its bottom but the check of its datum against a section
// (rating.Table.BottomMismatch), which says so itself.
func finishRatingTable(t *Table, out rating.Table, rows []int) (rating.Table, error) {
	if len(out.Rows) == 0 {
		return out, &ParseError{File: t.File, Sheet: t.Sheet, Err: ErrEmpty}
	}
	out.Slope = uniformSlope(out.Rows)
	switch {
	case IsFitTable(t):
		out.Kind = KindFitted
	case slices.ContainsFunc(out.Rows, func(r rating.Row) bool {
		return slices.Contains(r.Flags, reach.FlagUnsettled) || slices.Contains(r.Flags, reach.FlagCriticalStage)
	}):
		out.Kind = KindBackwater
	}
	if w := fallingDischarge(t, out.Rows, rows); w != "" {
		out.Warnings = append(out.Warnings, w)
	}
	return out, nil
}

// ratingSection names the section of a rating table: its sheet's name, but
// for a sheet named only "rating" or "fitted rating" (a results
// workbook's) the workbook's name; a file's name otherwise; without the "-rating" and "-results"
// that rate's outputs add to the section's name.
func ratingSection(t *Table) string {
	name := sectionName(t)
	if t.Sheet != "" && slices.ContainsFunc(resultsRatingSheets(), func(s string) bool { return strings.EqualFold(t.Sheet, s) }) {
		base := filepath.Base(t.File)
		name = strings.TrimSuffix(base, filepath.Ext(base))
	}
	return strings.TrimSuffix(strings.TrimSuffix(name, "-results"), "-rating")
}

// fallingDischarge words the warning of a table whose discharge falls as
// stage rises (its rows in rising stage, read from the rows of t whose
// numbers are in at), "" when it never does: a rating's discharge rises
// with stage, so the table may not be a rating, or its section's
// conveyance drops where a floodplain starts to wet. The warning is at the
// first row whose discharge falls, and names the row before it.
func fallingDischarge(t *Table, rows []rating.Row, at []int) string {
	n, first := 0, -1
	for i := 1; i < len(rows); i++ {
		if rows[i].Discharge < rows[i-1].Discharge {
			if first < 0 {
				first = i
			}
			n++
		}
	}
	if n == 0 {
		return ""
	}
	a, b := rows[first-1], rows[first]
	return fmt.Sprintf("%s: discharge falls as stage rises at %s, the first from %g at %g (row %d) to %g at %g: "+
		"a rating's discharge rises with stage; check the table (a section's conveyance can drop where a floodplain starts to wet)",
		where(t, at[first]), rating.Counted(n, "row", "rows"), a.Discharge, a.Stage, at[first-1], b.Discharge, b.Stage)
}

// uniformSlope returns the friction slope (Q/K)² shared by every row with
// a positive discharge and conveyance, when there are at least two and
// their slopes agree within uniformSlopeTol, as the shortest decimal
// within slopeRoundingTol of their mean; else NaN.
func uniformSlope(rows []rating.Row) float64 {
	lo, hi, sum, n := math.Inf(1), math.Inf(-1), 0.0, 0
	for _, r := range rows {
		if !(r.Discharge > 0 && r.Conveyance > 0) {
			continue
		}
		s := (r.Discharge / r.Conveyance) * (r.Discharge / r.Conveyance)
		lo, hi, sum, n = math.Min(lo, s), math.Max(hi, s), sum+s, n+1
	}
	if n < 2 || math.IsInf(sum, 0) || !(hi-lo <= uniformSlopeTol*lo) {
		return math.NaN()
	}
	mean := sum / float64(n)
	for digits := 1; digits < 17; digits++ {
		v, _ := strconv.ParseFloat(strconv.FormatFloat(mean, 'g', digits, 64), 64)
		if math.Abs(v-mean) <= slopeRoundingTol*mean {
			return v
		}
	}
	return mean
}

// rowCells reads the numbers of a table's rows, gathering every bad cell.
type rowCells struct {
	t    *Table
	errs errorList
}

// optional is the number in the column named name, NaN when the column
// is absent, the cell blank, bad or beyond ±limit (a bad cell is
// gathered, one beyond the limit as ErrImplausible).
func (c *rowCells) optional(rec Record, name string, limit float64) float64 {
	col := c.t.Column(name)
	if col < 0 {
		return math.NaN()
	}
	v, ok, err := c.t.bounded(rec, col, strings.ReplaceAll(name, "_", " "), limit)
	if err != nil {
		c.errs = append(c.errs, err)
		return math.NaN()
	}
	if !ok {
		return math.NaN()
	}
	return v
}

// needed is the number in column col, NaN with a gathered error when the
// cell is blank, bad or beyond ±limit; what names the value in the
// message.
func (c *rowCells) needed(rec Record, col int, what string, limit float64) float64 {
	v, err := c.t.number(rec, col, what, limit)
	if err != nil {
		c.errs = append(c.errs, err)
		return math.NaN()
	}
	return v
}
