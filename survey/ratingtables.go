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
)

// Column names of a rating table read for the record. Only stage (or
// gauge_height) and discharge are required; valid_from splits one table
// into rating periods; extrapolated (as a rating fit's table writes it)
// marks rows outside the gaugings; depth (as rate writes it) says where a
// table's flow starts (DryFoot). Other columns are ignored.
const (
	ColRatingStage        = "stage"
	ColRatingDischarge    = "discharge"
	ColRatingValidFrom    = "valid_from"
	ColRatingExtrapolated = "extrapolated"
	// ColRatingDepth is the depth of each row, stage less the section's
	// lowest point, as rate writes it: it says where a table's flow starts
	// (see DryFoot).
	ColRatingDepth = "depth"
)

// ErrNegativeDepth is the cause of a depth cell below zero: a depth is
// stage less the section's lowest point.
var ErrNegativeDepth = errors.New("a depth, stage less the section's lowest point, is never below zero")

// depth reads rec's cell of the depth column cd (-1: none): NaN when
// blank or absent, a *ParseError for a bad cell, one beyond
// ±MaxElevation or one below zero (ErrNegativeDepth).
func (t *Table) depth(rec Record, cd int) (float64, *ParseError) {
	if cd < 0 {
		return math.NaN(), nil
	}
	v, ok, err := t.bounded(rec, cd, "depth", MaxElevation)
	if !ok {
		v = math.NaN()
	}
	if err == nil && v < 0 {
		return math.NaN(), t.At(rec, cd, fmt.Errorf("%q: %w", t.Cell(rec, cd), ErrNegativeDepth))
	}
	return v, err
}

// RatingTableOptions configure the reading of rating tables. The zero
// value reads a table of gauge heights with no zero-flow stage, no
// extrapolation, in force from the beginning of any record.
type RatingTableOptions struct {
	// Sheet is the workbook sheet to read ("" = the first).
	Sheet string
	// HasZeroFlow and ZeroFlow give the gauge height of zero flow e
	// (length unit) of every rating read; a row without flow above it is
	// refused (gauged.ErrDryAboveZeroFlow), as a row with flow at or
	// below it is (gauged.ErrZeroFlowAbove). Without them a rating whose
	// first row has no flow takes its e from the table itself, as a
	// hydraulic rating written from a section begins with its dry foot:
	// the stage less the depth of its first row with flow where it has a
	// depth column, else the stage of the last of its leading rows
	// without flow (see DryFoot), said in an input note
	// (RatingTables.Notes); a rating with neither is read linearly in
	// stage between rows, with a warning.
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

// ErrExtrapolatedWord is the cause of an extrapolated cell that is neither
// a yes word (yes, y, true, 1) nor a no word (no, n, false, 0, blank).
var ErrExtrapolatedWord = errors.New("an extrapolated cell is yes, y, true or 1 on a row above the highest gauging, no, n, false, 0 or blank on the others")

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
// and a depth column's say of its unit system (Table.HeaderUnits); units
// is that note, as far as it was read, also when err is not nil.
func (t *Table) stageDischargeColumns() (cs, cq int, units UnitNote, err error) {
	if cs, err = t.Require(ColRatingStage, ColGaugeHeight); err != nil {
		return cs, cq, units, err
	}
	if cq, err = t.Require(ColRatingDischarge); err != nil {
		return cs, cq, units, err
	}
	units, err = t.HeaderUnits(cs, cq, t.Column(ColRatingDepth))
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
	cv, cx, cd := t.Column(ColRatingValidFrom), t.Column(ColRatingExtrapolated), t.Column(ColRatingDepth)
	if err := t.unsavedIn(cs, cq, cv, cx, cd); err != nil {
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
		depth, errd := t.depth(rec, cd)
		var errx *ParseError
		if cx >= 0 && !yesWord(t.Cell(rec, cx)) && !noWord(t.Cell(rec, cx)) {
			errx = t.At(rec, cx, fmt.Errorf("%q: %w", t.Cell(rec, cx), ErrExtrapolatedWord))
		}
		errs.add(errh, errq, errd, errx)
		if errh == nil && errq == nil && errd == nil && errx == nil {
			g.points = append(g.points, gauged.RatingPoint{Stage: rating.DecimalDifference(h, opt.Datum), Discharge: q})
			g.depths = append(g.depths, depth)
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
	depths       []float64 // NaN where blank or without a depth column
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
	raised := raiseToDryRow(rt)
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
	at := func(i int) string { return where(t, g.recs[i].Row) }
	f, ok := TableFoot(g.points, g.depths)
	if ok && IsFitTable(t) {
		f = f.OfFit()
	}
	switch {
	case rt.HasZeroFlow:
		rt.ZeroFlowSource = "given by " + flag
		if raised {
			*notes = append(*notes, fmt.Sprintf("%s: the gauge height of zero flow %s given by %s lies below the table's last row without flow, %s, within the table's rounding: e = %s, that row; the table is read log-linearly in (h − e) between rows",
				name, plainLength(opt.ZeroFlow), flag, plainLength(rt.ZeroFlow), plainLength(rt.ZeroFlow)))
		} else {
			*notes = append(*notes, fmt.Sprintf("%s: the gauge height of zero flow e = %s is given by %s: the table is read log-linearly in (h − e) between rows",
				name, plainLength(rt.ZeroFlow), flag))
		}
		if w := f.GivenWarning(rt.ZeroFlow, flag, at); ok && w != "" {
			*warn = append(*warn, w)
		}
	case ok:
		rt.HasZeroFlow, rt.ZeroFlow, rt.ZeroFlowSource = true, f.E, f.Source()
		*notes = append(*notes, f.Note(at, flag))
		if w := f.Warning(at); w != "" {
			*warn = append(*warn, w)
		}
	case len(g.points) > 0 && g.points[0].Discharge == 0:
		*warn = append(*warn, fmt.Sprintf("%s: the first row has no flow at stage %g: give the gauge height of zero flow to interpolate log-linearly in (h − e)",
			where(t, g.recs[0].Row), g.points[0].Stage))
	case len(g.points) > 0:
		if w := f.Warning(at); w != "" {
			*warn = append(*warn, w)
		}
		*warn = append(*warn, fmt.Sprintf("%s: the table has no row without flow and %s is not given, so it is read linearly in stage between rows; "+
			"give %s E, its gauge height of zero flow, to read it log-linearly in (h − e)", name, flag, flag))
	}
	return gauged.Period{From: g.from, Rating: rt}, nil
}

// raiseToDryRow raises a given gauge height of zero flow that lies below
// the table's last leading row without flow by no more than a unit of the
// last decimal of the table's finest stage (dryRowRounding) to that row's
// stage, and reports whether it did: a fit's table writes its offset to
// six significant digits, so its own offset, given in full, may lie just
// below the row. A given e farther below is left to Validate
// (ErrDryAboveZeroFlow).
func raiseToDryRow(rt *gauged.RatingTable) bool {
	if !rt.HasZeroFlow {
		return false
	}
	last := -1
	for i, p := range rt.Points {
		if p.Discharge != 0 {
			break
		}
		last = i
	}
	if last < 0 {
		return false
	}
	dry := rt.Points[last].Stage
	if !(dry > rt.ZeroFlow) || dry-rt.ZeroFlow > dryRowRounding(dry) {
		return false
	}
	rt.ZeroFlow = dry
	return true
}

// dryRowRounding is how far below a table's dry row at stage dry a given
// gauge height of zero flow may lie and still be that row: half a unit of
// its sixth significant digit, the precision at which results CSV tables
// write their numbers (a fit's first row is its offset so written), with
// 1e-12 of its size for the float64 reading of both. A table's coarser
// looking stages (0.6 for 0.6000) buy no more: rate writes its stages
// exactly to 0.1 mm.
func dryRowRounding(dry float64) float64 {
	size := math.Max(1, math.Abs(dry))
	if dry == 0 {
		return 1e-12
	}
	return 0.5*math.Pow10(int(math.Floor(math.Log10(math.Abs(dry))))-5) + 1e-12*size
}

// Foot is the gauge height of zero flow a rating table gives itself when
// its first row has no flow (see DryFoot), and what it was read from.
type Foot struct {
	// E is the gauge height of zero flow (length unit).
	E float64
	// FromDepth reports that E is a row's stage less its depth; else E is
	// the stage of the table's last dry row at its foot.
	FromDepth bool

	dry, wet           int     // the last leading row without flow; the first with flow (-1: none)
	dryStage, wetStage float64 // their stages
	depth              int     // the first row with flow and a depth (-1: none)
	depthStage, depthD float64 // its stage and depth
	depthE             float64 // its stage less its depth
	doubt              footDoubt
	other              int     // the row whose stage less depth disagrees with row depth's (footDepthsDisagree)
	otherE             float64 // its stage less its depth
	tolerance          float64 // the table's rounding of a stage less a depth (length unit)
	fit                bool    // the table is a fit's, e its fitted offset (OfFit)
}

// footDoubt is what a rating table's depth column says against the
// gauge height of zero flow DryFoot reads from it.
type footDoubt uint8

const (
	footAgrees footDoubt = iota
	// footDepthsDisagree: two rows with flow give stages less depths
	// apart by more than the table's rounding; the first row's is kept.
	footDepthsDisagree
	// footDepthBelowDry: stage less depth lies below the last dry row,
	// which has no flow; e is that row's stage.
	footDepthBelowDry
	// footDepthAtFlow: stage less depth lies at or above the first row
	// with flow; e is the last dry row's stage.
	footDepthAtFlow
)

// maxFootDecimals bounds the decimals read in a stage or depth for the
// table's rounding: more are float noise (a workbook's computed cell).
const maxFootDecimals = 9

// decimals is the number of decimals of v's shortest decimal form, at
// most maxFootDecimals.
func decimals(v float64) int {
	_, frac, _ := strings.Cut(strconv.FormatFloat(math.Abs(v), 'f', -1, 64), ".")
	return min(len(frac), maxFootDecimals)
}

// footTolerance is how far two stages less depths of a table written to d
// decimals may lie apart: each of the four lengths is rounded by up to
// half a unit of its last decimal, 2·10^−d in all. A table's lengths are
// taken to be written to the decimals of its finest stage or depth (rate
// writes every length to 0.1 mm or 0.0001 ft, trailing zeros dropped), so
// the tolerance is never smaller than its rounding. A stage less a depth
// may lie below a stage written by up to three of those half units, 3/4 of
// the tolerance.
func footTolerance(d int) float64 { return 2 * math.Pow10(-d) }

// DryFoot returns the gauge height of zero flow e a rating table gives
// itself when its first row has no flow, as a hydraulic rating written
// from a section begins (length unit). Where the table gives a depth with
// its rows with flow (depths, parallel to points, NaN where blank or
// absent; a depth column as rate writes it, stage less the section's
// lowest point), e is the stage less the depth of the first row with flow
// that has one: the lowest point, which a table on stages of its own
// choosing (rate --from/--to/--step or --stages) straddles between its
// last dry row and its first row with flow. Every row with flow and a
// depth must give the same e within the table's rounding (footTolerance);
// one that does not is warned of (Foot.Warning), the first row's e kept.
// Without a depth, or with one that puts e below the last dry row or at or
// above a row with flow (a depth not counted from where the flow starts,
// warned of too), e is the stage of the last of the leading rows without
// flow: exact when that row is on the lowest point, as on rate's own
// stages; else the flow starts somewhere between it and the first row
// with flow, which the table does not say. A stage less depth below the
// last dry row by no more than the table's rounding is that row's stage.
// ok is false when the first row has flow, or the table has fewer than
// two rows (no interval to read).
func DryFoot(points []gauged.RatingPoint, depths []float64) (f Foot, ok bool) {
	if len(points) < 2 || points[0].Discharge != 0 {
		return Foot{}, false
	}
	k := 0
	for k+1 < len(points) && points[k+1].Discharge == 0 {
		k++
	}
	f = Foot{E: points[k].Stage, dry: k, dryStage: points[k].Stage, wet: -1, wetStage: math.NaN(), depth: -1, other: -1}
	if k+1 == len(points) {
		return f, true // every row dry
	}
	f.wet, f.wetStage = k+1, points[k+1].Stage
	if !f.readDepths(points, depths, decimals(f.dryStage)) {
		return f, true
	}
	switch {
	case !(f.depthE < f.wetStage):
		f.doubt = footDepthAtFlow
		return f, true
	case f.depthE < f.dryStage-0.75*f.tolerance:
		f.doubt = footDepthBelowDry
		return f, true
	}
	f.E, f.FromDepth = math.Max(f.depthE, f.dryStage), true
	f.checkDepths(points, depths)
	return f, true
}

// WetFoot returns the gauge height of zero flow e that a rating table
// whose first row already has flow gives itself through its depth column
// (depths as for DryFoot), as a table rate writes from above the section's
// lowest point (rate --from) does: the stage less the depth of the first
// row with a depth, which must lie below the first row's stage, every row
// with a depth giving the same e within the table's rounding (else warned
// of, the first kept; Foot.Warning). ok is false for a table whose first
// row has no flow (see DryFoot), of fewer than two rows, or without a
// depth; and for a depth putting e at or above the first row, which the
// Foot's Warning then words.
func WetFoot(points []gauged.RatingPoint, depths []float64) (f Foot, ok bool) {
	if len(points) < 2 || !(points[0].Discharge > 0) {
		return Foot{}, false
	}
	f = Foot{dry: -1, dryStage: math.NaN(), wet: 0, wetStage: points[0].Stage, depth: -1, other: -1}
	if !f.readDepths(points, depths, 0) {
		return f, false
	}
	if !(f.depthE < f.wetStage) {
		f.doubt = footDepthAtFlow
		return f, false
	}
	f.E, f.FromDepth = f.depthE, true
	f.checkDepths(points, depths)
	return f, true
}

// TableFoot is DryFoot of a table whose first row has no flow, else
// WetFoot: the gauge height of zero flow a rating table gives itself,
// as every reader of a rating table for discharge takes it when no flag
// gives one.
func TableFoot(points []gauged.RatingPoint, depths []float64) (Foot, bool) {
	if len(points) > 0 && points[0].Discharge == 0 {
		return DryFoot(points, depths)
	}
	return WetFoot(points, depths)
}

// readDepths finds the first row with flow and a depth, from f.wet on,
// and the table's rounding (the finest decimals of its stages and depths
// read, at least d): false when no row with flow has a depth.
func (f *Foot) readDepths(points []gauged.RatingPoint, depths []float64, d int) bool {
	for i := f.wet; i < len(points); i++ {
		if i < len(depths) && finite(depths[i]) {
			d = max(d, decimals(points[i].Stage), decimals(depths[i]))
			if f.depth < 0 {
				f.depth = i
			}
		}
	}
	if f.depth < 0 {
		return false
	}
	f.tolerance = footTolerance(d)
	f.depthStage, f.depthD = points[f.depth].Stage, depths[f.depth]
	f.depthE = rating.DecimalDifference(f.depthStage, f.depthD)
	return true
}

// checkDepths marks the first later row whose stage less depth is not the
// first row's within the table's rounding (footDepthsDisagree).
func (f *Foot) checkDepths(points []gauged.RatingPoint, depths []float64) {
	for i := f.depth + 1; i < len(points) && i < len(depths); i++ {
		if !finite(depths[i]) {
			continue
		}
		if e := rating.DecimalDifference(points[i].Stage, depths[i]); math.Abs(e-f.depthE) > f.tolerance {
			f.doubt, f.other, f.otherE = footDepthsDisagree, i, e
			break
		}
	}
}

// OfFit marks a foot read from a rating fit's table (IsFitTable): a fit's
// table begins at its fitted offset, a row without flow, so when that
// first row is the table's only dry row and no depth says otherwise, e is
// the fit's offset, which Note and Source then say.
func (f Foot) OfFit() Foot {
	f.fit = f.dry == 0 && !f.FromDepth
	return f
}

// Source says where the foot's e was read, in the words of a report's
// zero_flow_source: the table's depth column, the fit's offset, or the
// table's last dry row.
func (f Foot) Source() string {
	switch {
	case f.fit:
		return "the fit's offset, the table's first row"
	case f.FromDepth:
		return "the table's depth column"
	}
	return "the table's last dry row"
}

// GivenWarning words the warning of a gauge height of zero flow e given
// by flag that differs from the one the table's depth column gives (a
// sound one: FromDepth) by more than the table's rounding; "" when they
// agree or the table gives none (at as for Note).
func (f Foot) GivenWarning(e float64, flag string, at func(int) string) string {
	if !f.FromDepth || f.depth < 0 || !(math.Abs(e-f.depthE) > f.tolerance) {
		return ""
	}
	row := "first row with flow"
	if f.depth != f.wet {
		row = "first row with flow and a depth"
	}
	return fmt.Sprintf("%s: %s gives the gauge height of zero flow e = %s, but the table's depth column puts the flow's start at %s (the stage less the depth of its %s, %s − %s), "+
		"apart by more than the table's rounding (%s): the table is read with e = %s as given, and its discharges near zero flow depend on e: check which is the section's",
		at(f.depth), flag, plainLength(e), plainLength(f.depthE), row, plainLength(f.depthStage), plainLength(f.depthD), plainLength(f.tolerance), plainLength(e))
}

// TableDryFoot is TableFoot of a rating table as RatingFromTable reads it
// (its rows' stages, discharges and depths): the gauge height of zero flow
// the table gives itself (from its dry first rows, or from its depth
// column when its first row has flow), for a reader that takes e as every
// rating-table reader does without a flag giving it.
func TableDryFoot(t rating.Table) (Foot, bool) {
	pts := make([]gauged.RatingPoint, len(t.Rows))
	depths := make([]float64, len(t.Rows))
	for i, r := range t.Rows {
		pts[i] = gauged.RatingPoint{Stage: r.Stage, Discharge: r.Discharge}
		depths[i] = r.Depth
	}
	return TableFoot(pts, depths)
}

// plainLength writes a length of the foot's note or warning as read.
func plainLength(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// Note is the input note of a rating table that takes its gauge height
// of zero flow from its foot, saying where e was read: at gives the
// position ("file:row") of a row by its index, and flag names the flag
// not given that would give e ("" when there is none).
func (f Foot) Note(at func(int) string, flag string) string {
	given := ""
	if flag != "" {
		given = " (" + flag + " not given)"
	}
	const read = "the table is read log-linearly in (h − e) between rows"
	row := "first row with flow"
	if f.depth != f.wet {
		row = "first row with flow and a depth"
	}
	switch {
	case f.FromDepth && f.E == f.dryStage:
		in := ""
		if flag != "" {
			in = "; " + flag + " not given"
		}
		return fmt.Sprintf("%s: the gauge height of zero flow e = %s is the stage of the table's last dry row at its foot, where its depth column puts the flow's start (the stage less the depth of its %s, %s − %s%s): %s",
			at(f.dry), plainLength(f.E), row, plainLength(f.depthStage), plainLength(f.depthD), in, read)
	case f.FromDepth && f.dry < 0:
		return fmt.Sprintf("%s: the gauge height of zero flow e = %s is the stage less the depth of the table's %s (%s − %s), below its first row, at %s, which already has flow%s: %s",
			at(f.depth), plainLength(f.E), row, plainLength(f.depthStage), plainLength(f.depthD), plainLength(f.wetStage), given, read)
	case f.FromDepth:
		where := ""
		if f.depth != f.wet {
			where = " and below its first row with flow at " + plainLength(f.wetStage)
		}
		return fmt.Sprintf("%s: the gauge height of zero flow e = %s is the stage less the depth of the table's %s (%s − %s), above its last dry row at %s%s%s: %s",
			at(f.depth), plainLength(f.E), row, plainLength(f.depthStage), plainLength(f.depthD), plainLength(f.dryStage), where, given, read)
	}
	note := fmt.Sprintf("%s: the gauge height of zero flow e = %s is the stage of the table's last dry row at its foot%s: %s",
		at(f.dry), plainLength(f.E), given, read)
	switch {
	case f.fit:
		note += "; a fit's table begins at its fitted offset, so e is the fit's offset (its report's zero_flow stage, to the figures the table writes)"
	case f.wet < 0:
	case f.depth < 0:
		note += fmt.Sprintf("; the flow starts at or above that row and below the first row with flow, at %s, and the table gives no depth to say where "+
			"(a table rate writes has a depth column, and on rate's own stages a row on the section's lowest point)", plainLength(f.wetStage))
	default:
		note += fmt.Sprintf("; the flow starts at or above that row and below the first row with flow, at %s, and the table's depth column does not say where (see its warning)",
			plainLength(f.wetStage))
	}
	return note
}

// Warning words what the table's depth column says against the gauge
// height of zero flow read (see DryFoot), at the row it concerns (at as
// for Note); "" when it agrees, or the table gives no depth.
func (f Foot) Warning(at func(int) string) string {
	switch f.doubt {
	case footDepthsDisagree:
		return fmt.Sprintf("%s: stage less depth is %s here but %s at the first row with flow and a depth (%s), apart by more than the table's rounding (%s): "+
			"the depths are not all counted from one lowest point; e = %s, the first row's, is used: check the depth column",
			at(f.other), plainLength(f.otherE), plainLength(f.depthE), at(f.depth), plainLength(f.tolerance), plainLength(f.E))
	case footDepthBelowDry:
		return fmt.Sprintf("%s: stage less depth, %s − %s = %s, lies below the table's last dry row at %s (%s), which has no flow: "+
			"the depth is not counted from where the flow starts (rate counts it from the section's lowest point, which may be the floor of a pocket behind higher ground that holds no flow), "+
			"so the gauge height of zero flow is that row's stage; if the section has no such pocket, check the depth column",
			at(f.depth), plainLength(f.depthStage), plainLength(f.depthD), plainLength(f.depthE), plainLength(f.dryStage), at(f.dry))
	case footDepthAtFlow:
		return fmt.Sprintf("%s: stage less depth, %s − %s = %s, is not below the stage of the table's first row with flow, %s: "+
			"the depth is not counted from where the flow starts, so the gauge height of zero flow is the stage of the last dry row, %s: check the depth column",
			at(f.depth), plainLength(f.depthStage), plainLength(f.depthD), plainLength(f.depthE), plainLength(f.wetStage), plainLength(f.dryStage))
	}
	return ""
}

// yesWord reads a yes/true cell.
func yesWord(s string) bool {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "yes", "y", "true", "1":
		return true
	}
	return false
}

// noWord reports a written no: no, n, false, 0 or blank, in any case.
func noWord(s string) bool {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "", "no", "n", "false", "0":
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
