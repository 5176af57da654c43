package survey

import (
	"errors"
	"fmt"
	"io"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
)

// Column names of a rating table read for the record. Only stage (or
// gauge_height) and discharge are required; valid_from splits one table
// into rating periods; extrapolated (as a rating fit's table writes it)
// marks rows outside the gaugings. Other columns are ignored.
const (
	ColRatingStage        = "stage"
	ColRatingDischarge    = "discharge"
	ColRatingValidFrom    = "valid_from"
	ColRatingExtrapolated = "extrapolated"
)

// RatingTableOptions configure the reading of rating tables. The zero
// value reads a table of gauge heights with no zero-flow stage, no
// extrapolation, in force from the beginning of any record.
type RatingTableOptions struct {
	// Sheet is the workbook sheet to read ("" = the first).
	Sheet string
	// HasZeroFlow and ZeroFlow give the gauge height of zero flow e
	// (length unit) of every rating read. Without them a rating whose
	// first row has no flow takes its e from the table itself, as a
	// hydraulic rating written from a section begins with its dry foot:
	// the stage of the last of its leading rows without flow (see
	// DryFoot), said in an input note (RatingTables.Notes); a rating with
	// neither is read linearly in stage between rows, with a warning.
	HasZeroFlow bool
	ZeroFlow    float64
	// ZeroFlowFlag is the flag that gives the gauge height of zero flow,
	// named in the warning of a column of zero flows ("" for
	// "--zero-flow").
	ZeroFlowFlag string
	// HasHighGauging and HighGauging give the gauge height of the highest
	// gauging (length unit); without them it is taken from an
	// extrapolated column when there is one.
	HasHighGauging bool
	HighGauging    float64
	// Extrapolate lets the ratings extrapolate beyond their rows.
	Extrapolate bool
	// Datum is subtracted from the table's stages (length unit; default 0):
	// a table of elevations, as a section's hydraulic rating is written,
	// is then read at gauge heights.
	Datum float64
	// From is when the rating of a table without a valid_from column comes
	// into force (the zero time: from the beginning of any record).
	From time.Time
	// UTCOffset is the offset of valid_from times written without one
	// (default 0, UTC; whole seconds within record.MaxUTCOffset).
	UTCOffset time.Duration
}

// RatingTables are the rating periods read from a file.
type RatingTables struct {
	// Periods are in time order, each with its rating table.
	Periods []gauged.Period
	// FromAt gives, for each of Periods, where its time was read: the
	// position of its valid_from cell ("file:row"), "" for a period whose
	// time is RatingTableOptions.From.
	FromAt []string
	// File and Sheet say where the ratings came from.
	File, Sheet string
	// Warnings are unusual but legal facts about the data.
	Warnings []string
	// Notes are input notes, lines with their positions: the gauge
	// height of zero flow a rating took from its dry first row.
	Notes []string
	// Units is what the stage and discharge headers say of the unit
	// system ("stage (ft)", "discharge (ft3/s)"); the caller resolves it
	// against the units asked for (UnitNote.Resolve). Stages, ZeroFlow,
	// HighGauging and Datum are in that system: nothing is converted.
	Units UnitNote
}

// ErrValidFromBlank is the cause of a first rating row without a time in a
// table that has a valid_from column.
var ErrValidFromBlank = errors.New("the first row of a table with a valid_from column needs a time")

// validFromReader reads the times of a valid_from column (col) as
// RatingTablesFromTable and RatingFromTable read them: cellTimeZone at the
// offset off (seconds), or zonedTime beside a time-zone column, every time
// of one form (ErrMixedOffsets).
type validFromReader struct {
	t    *Table
	col  int
	zone int // the time-zone column, -1 for none (see zonedTime)
	off  int64
	form offsetForm
}

// newValidFromReader reads the times of t's valid_from column col at the
// offset off (seconds), beside its time-zone column if it has one; a
// header naming that column twice is refused (ErrAliasColumns).
func newValidFromReader(t *Table, col int, off int64) (*validFromReader, error) {
	zone, err := zoneColumn(t)
	if err != nil {
		return nil, err
	}
	if err := t.unsavedIn(zone); err != nil {
		return nil, err
	}
	return &validFromReader{t: t, col: col, zone: zone, off: off}, nil
}

// read returns the time of rec's valid_from cell; given is false when the
// cell is blank. A bad time is a *ParseError at the cell (ErrISOTime,
// ErrSubSecond, ErrSerialInCSV, ErrYear, ErrMixedOffsets).
func (r *validFromReader) read(rec Record) (from time.Time, given bool, err *ParseError) {
	t := r.t
	s := t.Cell(rec, r.col)
	if s == "" {
		return time.Time{}, false, nil
	}
	sec, _, zoned, perr := t.readTime(rec, r.col, r.zone, r.off)
	if perr != nil {
		return time.Time{}, true, perr
	}
	if cerr := r.form.check(rec.Row, zoned); cerr != nil {
		return time.Time{}, true, t.At(rec, r.col, cerr)
	}
	return time.Unix(sec, 0).UTC(), true, nil
}

// ReadRatingTables reads rating tables from a CSV file or a workbook sheet
// (by extension; a results workbook's rating sheet when no sheet is
// named, see ReadRatingSource). See RatingTablesFromTable.
func ReadRatingTables(path string, opt RatingTableOptions) (RatingTables, error) {
	t, err := ReadRatingTable(path, opt.Sheet)
	if err != nil {
		return RatingTables{}, err
	}
	return RatingTablesFromTable(t, opt)
}

// ParseRatingTables reads rating tables from CSV text; name is used in
// messages and names the ratings.
func ParseRatingTables(r io.Reader, name string, opt RatingTableOptions) (RatingTables, error) {
	t, err := ParseCSV(r, name)
	if err != nil {
		return RatingTables{}, err
	}
	return RatingTablesFromTable(t, opt)
}

// stageDischargeColumns finds the stage (or gauge_height) and discharge
// columns of a table of a rating, both required, and what their headers
// say of its unit system (Table.HeaderUnits); units is that note, as far
// as it was read, also when err is not nil.
func (t *Table) stageDischargeColumns() (cs, cq int, units UnitNote, err error) {
	if cs, err = t.Require(ColRatingStage, ColGaugeHeight); err != nil {
		return cs, cq, units, err
	}
	if cq, err = t.Require(ColRatingDischarge); err != nil {
		return cs, cq, units, err
	}
	units, err = t.HeaderUnits(cs, cq)
	return cs, cq, units, err
}

// RatingTablesFromTable reads one rating from a table with stage and
// discharge columns (any table wetline writes of a rating, or one an office
// keeps), or, when the table has a valid_from column, one rating per
// valid_from time (a blank valid_from, or the same instant as the row
// above, continues the rating above; the times all with a UTC offset or
// all without, ErrMixedOffsets at the first that differs, each of the
// years MinYear to MaxYear, ErrYear; a time-zone column gives each its
// offset, see zonedTime). Stage and discharge are bounded as
// in RatingFromTable (ErrImplausible at the cell). Rows
// must ascend in stage with discharge rising once above zero (see
// gauged.RatingTable.Validate); periods must ascend in time. Units written
// in the stage and discharge headers are reported in Units; an unknown
// unit (ErrUnknownUnit) or units of two systems (ErrMixedUnits) is an
// error at the column. Every bad cell is reported with its position.
func RatingTablesFromTable(t *Table, opt RatingTableOptions) (RatingTables, error) {
	out := RatingTables{File: t.File, Sheet: t.Sheet, Warnings: t.ownWarnings()}
	off, err := checkOffset(opt.UTCOffset)
	if err != nil {
		return out, &ParseError{File: t.File, Sheet: t.Sheet, Err: err}
	}
	cs, cq, units, err := t.stageDischargeColumns()
	out.Units = units
	if err != nil {
		return out, err
	}
	cv, cx := t.Column(ColRatingValidFrom), t.Column(ColRatingExtrapolated)
	if err := t.unsavedIn(cs, cq, cv, cx); err != nil {
		return out, err
	}
	out.Warnings = append(out.Warnings, zeroFlowWarnings(t, ZeroFlowGiven{Given: opt.HasZeroFlow, Value: opt.ZeroFlow, Flag: opt.ZeroFlowFlag})...)
	var errs errorList
	var groups []ratingGroup
	vf, err := newValidFromReader(t, cv, off)
	if err != nil {
		return out, err
	}
	for _, rec := range t.Records {
		if cv >= 0 {
			if from, given, perr := vf.read(rec); given {
				switch {
				case perr != nil:
					errs = append(errs, perr)
					groups = append(groups, ratingGroup{from: from, fromRec: rec})
				case len(groups) > 0 && groups[len(groups)-1].from.Equal(from):
					// The time of the row above, written again: the same period.
				default:
					groups = append(groups, ratingGroup{from: from, fromRec: rec})
				}
			} else if len(groups) == 0 {
				errs = append(errs, t.At(rec, cv, ErrValidFromBlank))
				groups = append(groups, ratingGroup{fromRec: rec})
			}
		} else if len(groups) == 0 {
			groups = append(groups, ratingGroup{from: opt.From, fromRec: rec})
		}
		g := &groups[len(groups)-1]
		h, errh := t.number(rec, cs, "stage", MaxElevation)
		q, errq := t.number(rec, cq, "discharge", rating.MaxDischarge)
		errs.add(errh, errq)
		if errh == nil && errq == nil {
			g.points = append(g.points, gauged.RatingPoint{Stage: rating.DecimalDifference(h, opt.Datum), Discharge: q})
			g.recs = append(g.recs, rec)
			g.extrapolated = append(g.extrapolated, cx >= 0 && yesWord(t.Cell(rec, cx)))
		}
	}
	if err := errs.err(); err != nil {
		return out, err
	}
	if len(groups) == 0 {
		return out, &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Err: ErrEmpty}
	}
	for i, g := range groups {
		p, err := g.period(t, cs, cq, cx >= 0, opt, &out.Warnings, &out.Notes)
		if err != nil {
			errs = append(errs, err)
			continue
		}
		if i > 0 && !p.From.After(groups[i-1].from) {
			errs = append(errs, t.At(g.fromRec, cv, fmt.Errorf("%w: %s is not after %s", gauged.ErrPeriodOrder,
				p.From.Format(time.RFC3339), groups[i-1].from.Format(time.RFC3339))))
		}
		out.Periods = append(out.Periods, p)
		at := ""
		if cv >= 0 {
			at = where(t, g.fromRec.Row)
		}
		out.FromAt = append(out.FromAt, at)
	}
	return out, errs.err()
}

// ratingGroup is the rows of one rating in a table.
type ratingGroup struct {
	from         time.Time
	fromRec      Record
	points       []gauged.RatingPoint
	recs         []Record
	extrapolated []bool
}

// period makes the group's rating period, or the error at its row.
func (g ratingGroup) period(t *Table, cs, cq int, hasX bool, opt RatingTableOptions, warn, notes *[]string) (gauged.Period, *ParseError) {
	name := ratingName(t)
	if !g.from.IsZero() {
		// The time as the table or the caller wrote it: at its offset.
		name += " from " + g.from.In(time.FixedZone("", int(opt.UTCOffset/time.Second))).Format(time.RFC3339)
	}
	rt := &gauged.RatingTable{Name: name, Points: g.points, HasZeroFlow: opt.HasZeroFlow, ZeroFlow: opt.ZeroFlow,
		HasHighGauging: opt.HasHighGauging, HighGauging: opt.HighGauging, Extrapolate: opt.Extrapolate}
	if hasX && !opt.HasHighGauging {
		for i, x := range g.extrapolated {
			if !x && (!rt.HasHighGauging || g.points[i].Stage > rt.HighGauging) {
				rt.HasHighGauging, rt.HighGauging = true, g.points[i].Stage
			}
		}
		if !rt.HasHighGauging && len(g.points) > 0 {
			*warn = append(*warn, fmt.Sprintf("%s: every row is marked extrapolated: no gauging supports the table anywhere, so treat all its discharges as extrapolated (results cannot flag them, as no highest gauging is known)", name))
		}
	}
	err := rt.Validate()
	var re *gauged.RatingError
	if errors.As(err, &re) {
		rec, col := g.fromRec, cs
		if re.Point >= 0 {
			rec = g.recs[re.Point]
		}
		if re.Field == "discharge" {
			col = cq
		}
		if re.Point < 0 && re.Field != "stage" {
			return gauged.Period{}, &ParseError{File: t.File, Sheet: t.Sheet, Row: rec.Row, Err: fmt.Errorf("rating %s: %w", name, re)}
		}
		return gauged.Period{}, t.At(rec, col, re.Err)
	}
	flag := opt.ZeroFlowFlag
	if flag == "" {
		flag = "--zero-flow"
	}
	if e, ok := DryFoot(g.points); ok && !rt.HasZeroFlow {
		rt.HasZeroFlow, rt.ZeroFlow = true, e
		k := 0
		for k+1 < len(g.points) && g.points[k+1].Discharge == 0 {
			k++
		}
		*notes = append(*notes, DryFootNote(where(t, g.recs[k].Row), e, flag))
	}
	switch {
	case rt.HasZeroFlow:
	case len(g.points) > 0 && g.points[0].Discharge == 0:
		*warn = append(*warn, fmt.Sprintf("%s: the first row has no flow at stage %g: give the gauge height of zero flow to interpolate log-linearly in (h − e)",
			where(t, g.recs[0].Row), g.points[0].Stage))
	case len(g.points) > 0:
		*warn = append(*warn, fmt.Sprintf("%s: the table has no row without flow and %s is not given, so it is read linearly in stage between rows; "+
			"give %s E, its gauge height of zero flow, to read it log-linearly in (h − e)", name, flag, flag))
	}
	return gauged.Period{From: g.from, Rating: rt}, nil
}

// DryFootNote is the input note of a rating table that takes its gauge
// height of zero flow e from the last dry row at its foot (see DryFoot), at the
// position at (the row), flag naming the flag not given that would give
// e ("" when there is none).
func DryFootNote(at string, e float64, flag string) string {
	given := ""
	if flag != "" {
		given = " (" + flag + " not given)"
	}
	return fmt.Sprintf("%s: the gauge height of zero flow e = %s is the stage of the table's last dry row at its foot%s: the table is read log-linearly in (h − e) between rows",
		at, strconv.FormatFloat(e, 'g', -1, 64), given)
}

// DryFoot returns the gauge height of zero flow a rating table gives
// itself when its first row has no flow: the stage of the last of its
// leading rows without flow, below the first row with flow (length unit).
// A hydraulic rating written from a section begins so, at the section's
// lowest point (and, below it, at stages where it holds no water). ok is
// false when the first row has flow, or the table has fewer than two
// rows (no interval to read).
func DryFoot(points []gauged.RatingPoint) (e float64, ok bool) {
	if len(points) < 2 || points[0].Discharge != 0 {
		return 0, false
	}
	e = points[0].Stage
	for _, p := range points {
		if p.Discharge > 0 {
			break
		}
		e = p.Stage
	}
	return e, true
}

// TableDryFoot is DryFoot of a rating table as RatingFromTable reads it
// (its rows' stages and discharges): the gauge height of zero flow the
// table gives itself when its first row has no flow, for a reader that
// takes e as every rating-table reader does without a flag giving it.
func TableDryFoot(t rating.Table) (e float64, ok bool) {
	pts := make([]gauged.RatingPoint, len(t.Rows))
	for i, r := range t.Rows {
		pts[i] = gauged.RatingPoint{Stage: r.Stage, Discharge: r.Discharge}
	}
	return DryFoot(pts)
}

// yesWord reads a yes/true cell.
func yesWord(s string) bool {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "yes", "y", "true", "1":
		return true
	}
	return false
}

// ratingName names a rating by its sheet, or by its file's base name.
func ratingName(t *Table) string {
	if t.Sheet != "" {
		return filepath.Base(t.File) + "['" + t.Sheet + "']"
	}
	return filepath.Base(t.File)
}

// TableKind says what a table holds, told by its columns.
type TableKind int

// Kinds of table.
const (
	// KindUnknown: neither a rating nor a survey.
	KindUnknown TableKind = iota
	// KindRating: a stage (or gauge_height) and a discharge column.
	KindRating
	// KindSection: a station and an elevation column (a surveyed section).
	KindSection
	// KindBoth: the columns of both, so the table cannot be told.
	KindBoth
)

func (k TableKind) String() string {
	switch k {
	case KindRating:
		return "rating table"
	case KindSection:
		return "surveyed section"
	case KindBoth:
		return "table with the columns of both a rating and a survey"
	}
	return "table that is neither a rating nor a survey"
}

// KindOf tells a rating table from a surveyed section by its columns:
// stage (or gauge_height) and discharge make a rating, station and
// elevation a survey.
func KindOf(t *Table) TableKind {
	rating := t.Column(ColRatingStage, ColGaugeHeight) >= 0 && t.Column(ColRatingDischarge) >= 0
	coords := hasCoordinates(t)
	section := (t.Column(ColStation) >= 0 || coords) && t.Column(elevationNames()...) >= 0
	switch {
	case rating && section:
		return KindBoth
	case rating:
		return KindRating
	case section:
		return KindSection
	}
	return KindUnknown
}

// zeroFlowNames returns the names (as normName writes them) of a column
// that gives a rating's gauge height of zero flow, its offset, row by row:
// a rating written as descriptor rows with an offset column. wetline reads
// no such column (see zeroFlowWarnings); "offset" followed by a number
// (offset1, offset_2) is one too. The slice is new on every call.
func zeroFlowNames() []string {
	return []string{"offset", "e", "gzf", "pzf", "ctf", "zero_flow", "zero_flow_stage",
		"gauge_height_of_zero_flow", "gage_height_of_zero_flow", "gh_of_zero_flow", "stage_of_zero_flow",
		"point_of_zero_flow", "cease_to_flow"}
}

// isZeroFlowName reports a header naming a gauge height of zero flow (see
// zeroFlowNames).
func isZeroFlowName(h string) bool {
	n := normName(h)
	if slices.Contains(zeroFlowNames(), n) {
		return true
	}
	rest, ok := strings.CutPrefix(n, "offset")
	rest = strings.TrimPrefix(rest, "_")
	return ok && rest != "" && strings.Trim(rest, "0123456789") == ""
}

// ZeroFlowGiven is the gauge height of zero flow given with a rating
// table read (length unit, when Given) and the flag it is given with ("",
// and for every value, "--zero-flow"): what the warning of a column of
// zero flows in the table says (see zeroFlowWarnings).
type ZeroFlowGiven struct {
	Given bool
	Value float64
	Flag  string
}

// flag is the flag giving the zero flow: Flag, or "--zero-flow".
func (z ZeroFlowGiven) flag() string {
	if z.Flag == "" {
		return "--zero-flow"
	}
	return z.Flag
}

// zeroFlowWarnings warns of each column of a rating table that names a
// gauge height of zero flow (see zeroFlowNames): it is not read, its
// values (the distinct ones, in order) are said, and how zero flow is
// given instead, by zero's flag. A column holding the one value zero
// gives is not warned of; one holding another says the value given.
func zeroFlowWarnings(t *Table, zero ZeroFlowGiven) []string {
	var out []string
	flag := zero.flag()
	for c, h := range t.Header {
		if !isZeroFlowName(h) {
			continue
		}
		var values []string
		seen := map[string]bool{}
		for _, rec := range t.Records {
			if v := t.Cell(rec, c); v != "" && !seen[v] {
				seen[v] = true
				values = append(values, v)
			}
		}
		if len(values) == 0 {
			continue
		}
		if len(values) == 1 && zero.Given {
			if v, err := ParseNumber(values[0]); err == nil && v == zero.Value {
				continue
			}
		}
		why := fmt.Sprintf("yet names a gauge height of zero flow (it holds %s): give the table's with %s (one value a rating file)", strings.Join(values, ", "), flag)
		if zero.Given {
			given := strconv.FormatFloat(zero.Value, 'g', -1, 64)
			why = fmt.Sprintf("yet names a gauge height of zero flow (it holds %s), where %s gives %s (one value a rating file): check which is the table's", strings.Join(values, ", "), flag, given)
		}
		if len(values) > 1 {
			why += "; a rating whose periods have their own zero flow takes a file each (--rating FILE@TIME), and one with an offset for each segment is read rightly only from rows close enough that the offset does not matter between them (its expanded table)"
		}
		out = append(out, t.unreadWarning(Record{Row: t.HeaderRow}, c, why))
	}
	return out
}
