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

	"wetline/rating"
	"wetline/subdivide"
)

// Survey is a surveyed cross-section read from a file, with what was said
// about its points.
type Survey struct {
	// Section is the ground line, n and banks, ready for subdivide.Compile.
	Section subdivide.Section
	// Labels holds each point's mark other than a bank mark (one of
	// BankWords; "" for none).
	Labels []string
	// Marks holds each point's mark as written (trimmed), a bank mark
	// too: "LB" keeps the side it names (see Survey.Mark).
	Marks []string
	// Notes holds each point's note column ("" for none).
	Notes []string
	// Rows holds each point's 1-based row (line) in the file.
	Rows []int
	// File and Sheet say where the survey came from.
	File, Sheet string
	// Warnings are unusual but legal facts about the data.
	Warnings []string
	// Gaps holds each gap between consecutive stations over
	// MaxGapFraction of the width, each also one of Warnings.
	Gaps []StationGap
	// Units is what the headers say of the unit system.
	Units UnitNote
	// Site is the site metadata read above the table.
	Site rating.Site
	// Projection says how the stations were made when the survey gave
	// eastings and northings (zero value, Line "", for a survey by
	// station).
	Projection Projection
	// ProjectionNote says how the stations were made from eastings and
	// northings (zero for a survey by station): a fact of the input, for
	// a report's inputs, not among the warnings.
	ProjectionNote InputNote
}

// StationGap is a gap between two consecutive stations of a survey over
// MaxGapFraction of the section width.
type StationGap struct {
	// Row is the 1-based row (line) of the point after the gap; From and
	// To its stations, and Unit their length unit.
	Row      int
	From, To float64
	Unit     string
	// Warning is the gap's line among the survey's Warnings.
	Warning string
}

// InputNotes are the survey's input notes as lines with their positions:
// how its stations were made (ProjectionNote), and that its headers name
// the US survey foot, read as feet (UnitNote.SurveyFootNote); none for a
// survey by station in metres or feet.
func (s Survey) InputNotes() []string {
	var out []string
	for _, n := range []InputNote{s.ProjectionNote, s.Units.SurveyFootNote()} {
		if t := n.String(); t != "" {
			out = append(out, t)
		}
	}
	return out
}

// Mark returns the mark of point i as written, a bank mark too (the
// crew's word, "RB" or "left bank", which a survey written from this one
// keeps so that the side it names is not lost), "" when none or when i
// is not a point of Marks.
func (s Survey) Mark(i int) string {
	if i < 0 || i >= len(s.Marks) {
		return ""
	}
	return s.Marks[i]
}

// SectionOptions adjust how a survey is read. The zero value reads marks.
type SectionOptions struct {
	// IgnoreBankMarks skips the check of bank marks (banks given elsewhere).
	IgnoreBankMarks bool
	// SurveysAnywhere lets a reach table name survey files outside its
	// own folder (by default they must lie in it or below it).
	SurveysAnywhere bool
	// Coordinates say how a survey of eastings and northings becomes
	// stations (see CoordinateOptions).
	Coordinates CoordinateOptions
	// NGiven says that n is given elsewhere (--n), replacing the n
	// column's: an n column with every cell blank, or with its first cell
	// blank, is then accepted and left unused, not refused with
	// ErrEmptyNColumn or ErrFirstNBlank.
	NGiven bool
}

// HighN is the Manning's n above which a value is warned about: higher
// values occur (dense brush, debris) but are often a typing slip
// (common practice).
const HighN = 0.20

// MaxGapFraction is the fraction of the section width above which a gap
// between consecutive stations is warned about (common practice).
const MaxGapFraction = 0.25

// Column names of a survey table (matched case-insensitively).
const (
	ColStation   = "station"
	ColElevation = "elevation"
	ColN         = "n"
	ColMark      = "mark"
	ColNote      = "note"
	MarkBank     = "bank"
)

// ReadSection reads a survey from a CSV file or a workbook sheet.
func ReadSection(path, sheet string, opt SectionOptions) (Survey, error) {
	t, err := ReadTable(path, sheet)
	if err != nil {
		return Survey{}, err
	}
	return SectionFromTable(t, opt)
}

// ParseSection reads a survey from CSV text; name is used in messages.
func ParseSection(r io.Reader, name string, opt SectionOptions) (Survey, error) {
	t, err := ParseCSV(r, name)
	if err != nil {
		return Survey{}, err
	}
	return SectionFromTable(t, opt)
}

// elevationNames are the names of the elevation column of a survey: its
// name and its aliases (z, and elev or elev. as crews abbreviate it).
func elevationNames() []string { return []string{ColElevation, "z", "elev", "elev."} }

// markTiers are the names of the mark column of a survey, in tiers: its
// name or the headers field crews give a point's code (code, point code,
// pt code), then a description (description, desc; common practice of
// data collectors). None is a name of another column of a survey. An
// export often carries a point code and a description side by side;
// either may hold the crew's bank codes, and markColumn reads the one
// that does.
func markTiers() [][]string {
	return [][]string{{ColMark, "code", "point code", "pt code"}, {"description", "desc"}}
}

// markColumn returns the index of t's mark column (-1 when it has none):
// of the columns of markTiers present (at most one a tier), the first holding a
// bank mark (one of BankWords), else the first holding an end pin's mark
// (one of PinWords), else the first. A numeric feature code (10, 20, 30)
// beside a description holding LTOB and RTOB thus leaves the banks in
// the description read, and a code holding them is read before a
// description of free text. Two names of one tier (mark and code) are
// refused as one column under two names (ErrAliasColumns).
func markColumn(t *Table) (int, error) {
	var present []int
	for _, tier := range markTiers() {
		c, err := t.Optional(tier...)
		if err != nil {
			return c, err
		}
		if c >= 0 {
			present = append(present, c)
		}
	}
	for _, holds := range []func(string) bool{isBankMark, isPinMark} {
		for _, c := range present {
			for _, rec := range t.Records {
				if holds(t.Cell(rec, c)) {
					return c, nil
				}
			}
		}
	}
	if len(present) == 0 {
		return -1, nil
	}
	return present[0], nil
}

// otherMarkColumn returns the index of the column of markTiers present in
// t that is not the mark column cm (-1 for none): of a code and a
// description, the one not read as the marks. Its text is the crew's
// (thalweg, rew, rebar) and is kept as the points' note.
func otherMarkColumn(t *Table, cm int) int {
	if cm < 0 {
		return -1
	}
	for _, tier := range markTiers() {
		if c := t.Column(tier...); c >= 0 && c != cm {
			return c
		}
	}
	return -1
}

// isBankMark reports a mark read as a bank's (one of BankWords).
func isBankMark(mark string) bool { _, ok := readBankMark(mark); return ok }

// isPinMark reports a mark read as an end pin's (one of PinWords).
func isPinMark(mark string) bool { _, ok := readPinMark(mark); return ok }

// freeMarkNames returns the names of markTiers whose tier has no column
// in t: a column renamed to one of them is read as the mark column when
// it holds the bank marks (see markColumn), where a name of a tier
// present would be refused as that column's alias.
func freeMarkNames(t *Table) []string {
	var out []string
	for _, tier := range markTiers() {
		if t.Column(tier...) < 0 {
			out = append(out, tier...)
		}
	}
	return out
}

// markColumnOr is markColumn for positioning an error in a table already
// read through it: -1 when it has none or its names are ambiguous.
func markColumnOr(t *Table) int {
	c, err := markColumn(t)
	if err != nil {
		return -1
	}
	return c
}

// ErrNWithLength is the cause of a header naming an n column with a
// length unit ("N (ft)"): Manning's n has no unit, so the column is not
// n, and is most often a northing.
var ErrNWithLength = errors.New("a column named n with a length unit is not Manning's n, which has no unit")

// nWithLength returns a ParseError (ErrNWithLength) at column col of
// header h when it names n with a length unit ("N (ft)", "n [m]"), nil
// otherwise. Such a column is refused, not read as northings: a one-letter
// name is not taken for a coordinate, so nothing is guessed; the error
// asks for northing (or y), and for easting (or x) for an E column with a
// length unit beside it.
func nWithLength(file, sheet string, h []string, row, col int) *ParseError {
	if col < 0 || col >= len(h) || normName(h[col]) != ColN || !isLengthUnit(headerUnit(h[col])) {
		return nil
	}
	advice := fmt.Sprintf("name it %s (or y) if it holds northings", ColNorthing)
	for _, name := range h {
		if normName(name) == "e" && isLengthUnit(headerUnit(name)) {
			advice += fmt.Sprintf(", and name %s %s (or x)", echo(name), ColEasting)
			break
		}
	}
	return &ParseError{File: file, Sheet: sheet, Row: row, Column: col + 1, Name: h[col],
		Err: fmt.Errorf("%w: %s", ErrNWithLength, advice)}
}

// Plausible bounds of survey values: beyond them a value is a typing
// slip or a unit mistake, not a river. Lengths are in the survey's unit.
const (
	// MaxCoordinate bounds |station| (a projected coordinate may be large).
	MaxCoordinate = 1e8
	// MaxElevation bounds |elevation| (no ground lies 100 km up or down).
	MaxElevation = 1e5
	// MinN and MaxN bound Manning's n: rating.MinN and rating.MaxN.
	MinN, MaxN = rating.MinN, rating.MaxN
)

// Causes of implausible survey values, for errors.Is.
var (
	ErrImplausible  = errors.New("is not a plausible value")
	ErrFirstNBlank  = errors.New("n is blank on the first point: there is no value above to carry; give the n of the ground from this point to the next")
	ErrEmptyNColumn = errors.New("the n column is empty")
)

// SectionFromTable turns a table with station and elevation columns (and
// optional n, mark and note columns) into a survey. A table with easting
// and northing columns instead of station (x, y and z are accepted for
// easting, northing and elevation) is a coordinate survey: its points are
// projected onto the section line as opt.Coordinates say (see
// CoordinateOptions), put in station order, and every other column is
// kept; each point's distance off the line is in Survey.Projection, and
// points farther off than the tolerance are warned about. Every bad cell is
// reported, each naming its row and column: a blank, unreadable or
// implausible station, elevation or n (see MaxCoordinate, MaxElevation,
// MinN, MaxN), a station less than the one before, a blank n on the first
// point of an n column or an n column with every cell blank (unless
// opt.NGiven), a count of bank marks (any of BankWords) other than two
// (ErrBankMarks), a bank mark naming the side it is not on (ErrBankSide:
// "right bank" left of the other bank mark; in a coordinate survey whose
// left bank the pins, the flow direction or the line given set, marks
// that all lie the other way are ErrSidesDisagree, naming what set it).
// The text of a code or description column not read as the marks is
// kept in the notes (see otherMarkColumn). A mark that looks like a
// bank's but is not one of BankWords (bankfull, LB toe) is warned about
// at its cell, unless opt.IgnoreBankMarks. A mark or note column holding
// a bare digit string after a whole elevation or n on most rows is
// refused (ErrSplitNumber), after a whole station, easting or northing
// warned of (see Table.splitNumbers).
func SectionFromTable(t *Table, opt SectionOptions) (Survey, error) {
	r, err := newSectionReader(t)
	if err != nil {
		return r.sv, err
	}
	split, err := t.splitNumbers(splitColumns{refuse: []int{r.ce, r.cn}, warn: []int{r.cs, r.cx, r.cy},
		text: []int{r.cm, r.cnote}, running: []int{r.cm, r.cnote}, units: r.sv.Units})
	if err != nil {
		return r.sv, err
	}
	r.sv.Warnings = append(r.sv.Warnings, split...)
	for _, rec := range t.Records {
		r.point(rec)
	}
	r.reversed()
	if len(r.errs) > 0 {
		return r.sv, r.errs.err()
	}
	r.nGiven = opt.NGiven
	if r.coords {
		if err := r.project(opt.Coordinates); err != nil {
			return r.sv, err
		}
	}
	if err := r.shape(); err != nil {
		return r.sv, err
	}
	if err := r.roughness(); err != nil {
		return r.sv, err
	}
	if !opt.IgnoreBankMarks {
		r.unreadBankWarnings()
		r.bankLikeWarnings()
		if err := r.banks(); err != nil {
			return r.sv, err
		}
	}
	r.gaps(opt)
	return r.sv, nil
}

// sectionReader reads the rows of a survey table.
type sectionReader struct {
	t              *Table
	sv             Survey
	cs, ce, cn, cm int
	cnote          int
	// cother is the column of a code or a description not read as the
	// marks (see otherMarkColumn), read into the notes; -1 for none.
	cother int
	// copt are the options a coordinate survey was projected with.
	copt     CoordinateOptions
	errs     errorList
	ns       []float64 // n given on each row (NaN blank)
	bankAt   []int     // indices of points marked bank
	bankRows []Record
	bankLike []Record // rows whose mark looks like a bank's but is not one of BankWords
	// coords reports a coordinate survey, whose easting and northing
	// columns are cx and cy and whose points' coordinates are east, north.
	coords      bool
	cx, cy      int
	east, north []float64
	records     []Record
	// nGiven: n comes from elsewhere, so an all-blank n column is unused.
	nGiven bool
	// steps counts the steps between two stations read; decreases holds
	// the index in errs of the error of each step that decreases, and
	// prevOK says the station of the row before was read.
	steps     int
	decreases []int
	prevOK    bool
}

// newSectionReader finds the columns and the units of a survey table.
func newSectionReader(t *Table) (*sectionReader, error) {
	r := &sectionReader{t: t, sv: Survey{File: t.File, Sheet: t.Sheet, Site: t.Site(), Warnings: t.ownWarnings()}}
	r.sv.Section.Name = sectionName(t)
	var err error
	r.cs, r.cx, r.cy = t.Column(ColStation), -1, -1
	if r.cs < 0 {
		cx, cy, ok, err := coordinateColumns(t)
		if err != nil {
			return r, err
		}
		if ok {
			r.cx, r.cy, r.coords = cx, cy, true
		}
	}
	if !r.coords && r.cs < 0 {
		if err := nWithLength(t.File, t.Sheet, t.Header, t.HeaderRow, t.Column(ColN)); err != nil {
			return r, err
		}
		if c := t.Column("e"); c >= 0 && isLengthUnit(headerUnit(t.Header[c])) {
			return r, &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Column: c + 1, Name: t.Header[c],
				Err: fmt.Errorf("%w: the header needs a column named %q, or %q and %q for a coordinate survey: name this column %q (or %q) if it holds eastings",
					ErrMissingColumn, ColStation, ColEasting, ColNorthing, ColEasting, "x")}
		}
		want := fmt.Sprintf("%q, or %q and %q for a coordinate survey", ColStation, ColEasting, ColNorthing)
		if pe := t.unitRunOnError([]string{ColStation}, want); pe != nil {
			return r, pe
		}
		return r, &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Name: ColStation,
			Err: fmt.Errorf("%w: the header needs a column named %s (found: %s)", ErrMissingColumn, want, headerList(t.Header))}
	}
	if r.ce, err = t.Require(elevationNames()...); err != nil {
		return r, err
	}
	if r.sv.Units, err = t.surveyHeaderUnits(r.cs, r.cx, r.cy, r.ce); err != nil {
		return r, err
	}
	if r.cn, err = t.Optional(ColN, "manning_n", "mannings_n"); err != nil {
		return r, err
	}
	if r.cn >= 0 {
		if err := nWithLength(t.File, t.Sheet, t.Header, t.HeaderRow, r.cn); err != nil {
			return r, err
		}
	}
	if r.cm, err = markColumn(t); err != nil {
		return r, err
	}
	r.cnote = t.Column(ColNote)
	r.cother = otherMarkColumn(t, r.cm)
	return r, t.unsavedIn(r.cs, r.cx, r.cy, r.ce, r.cn, r.cm, r.cnote, r.cother)
}

// reversed replaces the errors of decreasing stations by one when all or
// nearly all steps decrease (at least MinReversedSteps of them, and
// ReversedFraction of the steps): the survey runs from right to left
// bank, looking downstream, rather than holding points out of place. The
// one error is at the first decreasing station.
func (r *sectionReader) reversed() {
	n := len(r.decreases)
	if n < MinReversedSteps || float64(n) < ReversedFraction*float64(r.steps) {
		return
	}
	first := r.errs[r.decreases[0]]
	pts := r.sv.Section.Points
	e := &ParseError{File: first.File, Sheet: first.Sheet, Row: first.Row, Column: first.Column, Name: first.Name, Text: first.Text,
		Err: fmt.Errorf("%w: the stations decrease throughout (%d of %d steps, from %s to %s): the survey runs from right to left? "+
			"Stations count from the left bank looking downstream: write the points in the reverse order, or their stations from the left end",
			subdivide.ErrOverhang, n, r.steps, roundLength(pts[0].Station), roundLength(pts[len(pts)-1].Station))}
	kept := errorList{}
	for i, pe := range r.errs {
		switch {
		case i == r.decreases[0]:
			kept = append(kept, e)
		case !slices.Contains(r.decreases, i):
			kept = append(kept, pe)
		}
	}
	r.errs = kept
}

// MinReversedSteps and ReversedFraction say when a survey's decreasing
// stations are one fault, a survey from right to left, rather than
// points out of place: at least MinReversedSteps steps decrease, and at
// least ReversedFraction of the steps (common practice: one or two
// stations out of place are typing slips).
const (
	MinReversedSteps = 3
	ReversedFraction = 0.8
)

// add records an error at a cell.
func (r *sectionReader) add(rec Record, col int, err error) {
	r.errs = append(r.errs, r.t.At(rec, col, err))
}

// number reads a required number cell within ±limit.
func (r *sectionReader) number(rec Record, col int, what string, limit float64) (float64, bool) {
	v, err := r.t.number(rec, col, what, limit)
	if err != nil {
		r.errs = append(r.errs, err)
		return 0, false
	}
	return v, true
}

// point reads one surveyed point.
func (r *sectionReader) point(rec Record) {
	var x float64
	okx := false
	if r.coords {
		e, _ := r.number(rec, r.cx, "easting", MaxCoordinate)
		n, _ := r.number(rec, r.cy, "northing", MaxCoordinate)
		r.east, r.north, r.records = append(r.east, e), append(r.north, n), append(r.records, rec)
	} else {
		x, okx = r.number(rec, r.cs, "station", MaxCoordinate)
	}
	z, _ := r.number(rec, r.ce, "elevation", MaxElevation)
	n := math.NaN()
	if r.cn >= 0 {
		v, ok, err := r.t.Float(rec, r.cn)
		switch {
		case err != nil:
			r.errs = append(r.errs, err.(*ParseError))
		case ok && !(v > 0):
			r.add(rec, r.cn, fmt.Errorf("roughness %w", ErrNotPositive))
		case ok && (v < MinN || v > MaxN):
			hint := ""
			if r.cn > 0 && splitPair(r.t.Cell(rec, r.cn-1), r.t.Cell(rec, r.cn)) {
				hint = fmt.Sprintf(" (%s %s,%s read as two values)", decimalCommaHint, r.t.Cell(rec, r.cn-1), r.t.Cell(rec, r.cn))
			}
			r.add(rec, r.cn, fmt.Errorf("roughness %g %w for Manning's n (%g to %g)%s", v, ErrImplausible, MinN, MaxN, hint))
		case ok:
			n = v
			if v > HighN {
				r.sv.Warnings = append(r.sv.Warnings, r.t.At(rec, r.cn, fmt.Errorf("roughness %g is above %.2f: check it", v, HighN)).Error())
			}
		}
	}
	pts := r.sv.Section.Points
	if i := len(pts); i > 0 && okx && r.prevOK {
		r.steps++
		if x < pts[i-1].Station {
			r.decreases = append(r.decreases, len(r.errs))
			r.add(rec, r.cs, fmt.Errorf("%w (station %s after %s at row %d: one of the two is out of place)",
				subdivide.ErrOverhang, roundLength(x), roundLength(pts[i-1].Station), r.sv.Rows[i-1]))
		}
	}
	r.prevOK = okx
	r.sv.Section.Points = append(pts, subdivide.Point{Station: x, Elevation: z})
	r.ns = append(r.ns, n)
	r.sv.Rows = append(r.sv.Rows, rec.Row)
	mark := strings.TrimSpace(r.t.Cell(rec, r.cm))
	r.sv.Marks = append(r.sv.Marks, mark)
	if _, bank := readBankMark(mark); bank {
		r.bankAt = append(r.bankAt, len(pts))
		r.bankRows = append(r.bankRows, rec)
		mark = ""
	} else if bankLike(mark) {
		r.bankLike = append(r.bankLike, rec)
	}
	r.sv.Labels = append(r.sv.Labels, mark)
	r.sv.Notes = append(r.sv.Notes, joinNotes(r.t.Cell(rec, r.cnote), r.t.Cell(rec, r.cother)))
}

// joinNotes is a point's note from its note column and the text of the
// code or description not read as its mark: either when the other is
// blank, else both, the note first, joined by "; ".
func joinNotes(note, other string) string {
	switch {
	case strings.TrimSpace(other) == "":
		return note
	case strings.TrimSpace(note) == "":
		return strings.TrimSpace(other)
	}
	return strings.TrimSpace(note) + "; " + strings.TrimSpace(other)
}

// shape checks the ground line has two points and some width.
func (r *sectionReader) shape() error {
	t, pts := r.t, r.sv.Section.Points
	if len(pts) < 2 {
		return &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Err: fmt.Errorf("%w, found %d", subdivide.ErrTooFewPoints, len(pts))}
	}
	if pts[len(pts)-1].Station == pts[0].Station {
		col := r.cs
		if r.coords {
			col = r.cx
		}
		return &ParseError{File: t.File, Sheet: t.Sheet, Row: t.Records[len(t.Records)-1].Row, Column: col + 1, Name: t.Header[col],
			Err: subdivide.ErrZeroWidth}
	}
	return nil
}

// roughness sets n of each segment: n of point i applies to the segment
// i → i+1, and a blank cell carries the value above.
func (r *sectionReader) roughness() error {
	if r.cn < 0 {
		return nil
	}
	t := r.t
	empty := true
	for _, n := range r.ns {
		empty = empty && math.IsNaN(n)
	}
	if r.nGiven && (empty || math.IsNaN(r.ns[0])) {
		return nil // n comes from elsewhere: nothing to carry
	}
	if empty {
		return &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Column: r.cn + 1, Name: t.Header[r.cn], Err: ErrEmptyNColumn}
	}
	if math.IsNaN(r.ns[0]) {
		return t.At(t.Records[0], r.cn, ErrFirstNBlank)
	}
	sec := &r.sv.Section
	sec.N = make([]float64, len(sec.Points)-1)
	cur := r.ns[0]
	for i := range sec.N {
		if !math.IsNaN(r.ns[i]) {
			cur = r.ns[i]
		}
		sec.N[i] = cur
	}
	return nil
}

// banks sets the bank stations from the two points with a bank mark (one
// of BankWords), which must name their own sides when they name one.
func (r *sectionReader) banks() error {
	if r.cm < 0 || len(r.bankAt) == 0 {
		return nil
	}
	t, pts, sec := r.t, r.sv.Section.Points, &r.sv.Section
	if len(r.bankAt) == 1 {
		rec := r.bankRows[0]
		return t.At(rec, r.cm, fmt.Errorf("%w, found 1: %s", ErrBankMarks, missingBank(t.Cell(rec, r.cm), pts[r.bankAt[0]].Station)))
	}
	if len(r.bankAt) != 2 {
		return t.At(r.bankRows[len(r.bankRows)-1], r.cm, fmt.Errorf("%w, found %d", ErrBankMarks, len(r.bankAt)))
	}
	sec.HasBanks = true
	sec.LeftBank, sec.RightBank = pts[r.bankAt[0]].Station, pts[r.bankAt[1]].Station
	if !(sec.LeftBank < sec.RightBank) {
		return t.At(r.bankRows[1], r.cm, fmt.Errorf("%w: the two bank marks are at the same station", ErrBankMarks))
	}
	a, b := r.bankRows[0], r.bankRows[1]
	if r.coords {
		if err := r.sidesDisagree(a, b, t.Cell(a, r.cm), t.Cell(b, r.cm)); err != nil {
			return err
		}
	}
	return bankSideError(t, a, b, r.cm, t.Cell(a, r.cm), t.Cell(b, r.cm), sec.LeftBank, sec.RightBank)
}

// unreadBankWarnings warns, when no point is marked bank, of each column
// the reader does not read whose cells hold bank marks (one of
// BankWords): its banks are lost unless it is named as the mark column.
func (r *sectionReader) unreadBankWarnings() {
	if len(r.bankAt) > 0 {
		return
	}
	t := r.t
	read := []int{r.cs, r.cx, r.cy, r.ce, r.cn, r.cm, r.cnote, r.cother}
	for c := range t.Header {
		if slices.Contains(read, c) {
			continue
		}
		var words []string
		var first Record
		for _, rec := range t.Records {
			if _, bank := readBankMark(t.Cell(rec, c)); bank {
				if len(words) == 0 {
					first = rec
				}
				words = append(words, t.Cell(rec, c))
			}
		}
		if len(words) == 0 {
			continue
		}
		var advice string
		switch names := freeMarkNames(t); {
		case len(names) == 0:
			advice = fmt.Sprintf("write its bank marks in %s if it marks the points", echo(t.Header[r.cm]))
		case len(names) == 1:
			advice = fmt.Sprintf("name it %s if it marks the points", names[0])
		default:
			advice = fmt.Sprintf("name it %s (or %s) if it marks the points", names[0], strings.Join(names[1:], ", "))
		}
		r.sv.Warnings = append(r.sv.Warnings, t.unreadWarning(first, c, fmt.Sprintf(
			"yet holds %s (%s), and no bank was found: %s",
			rating.Counted(len(words), "bank mark", "bank marks"), strings.Join(words, ", "), advice)))
	}
}

// missingBank says which bank is missing when the one bank mark of a
// survey is mark, at station x: the side it does not name, or the other
// bank when it names no side.
func missingBank(mark string, x float64) string {
	side, _ := readBankMark(mark)
	switch side {
	case leftBank:
		return fmt.Sprintf("the left bank is marked (station %s), the right bank is missing: mark the right bank's point", roundLength(x))
	case rightBank:
		return fmt.Sprintf("the right bank is marked (station %s), the left bank is missing: mark the left bank's point", roundLength(x))
	}
	return fmt.Sprintf("the other bank is missing (one bank is marked, station %s): mark the other bank's point", roundLength(x))
}

// bankLikeWarnings warns, at its cell, of each mark that looks like a
// bank's (see bankLike) but is not read as a bank mark.
func (r *sectionReader) bankLikeWarnings() {
	for _, rec := range r.bankLike {
		r.sv.Warnings = append(r.sv.Warnings, r.t.At(rec, r.cm, fmt.Errorf(
			"not read as a bank mark (the bank marks are %s): write one of them if the point bounds the main channel", strings.Join(BankWords(), ", "))).Error())
	}
}

// gaps warns of a gap between stations over MaxGapFraction of the width,
// except in a section written by the shape command (its comment says
// BuiltPrefix), whose straight sides and level beds are exact.
func (r *sectionReader) gaps(opt SectionOptions) {
	if _, built := r.t.Meta[MetaBuilt]; built {
		return
	}
	pts := r.sv.Section.Points
	width := pts[len(pts)-1].Station - pts[0].Station
	u := lengthUnit(r.sv.Units, opt.Coordinates.Feet)
	for i := 1; i < len(pts); i++ {
		if gap := pts[i].Station - pts[i-1].Station; gap > MaxGapFraction*width {
			g := StationGap{Row: r.sv.Rows[i], From: pts[i-1].Station, To: pts[i].Station, Unit: u}
			g.Warning = fmt.Sprintf("%s: gap of %s %s between stations %s and %s is over %.0f %% of the section width: check for missing points",
				where(r.t, g.Row), roundLength(gap), u, roundLength(g.From), roundLength(g.To), MaxGapFraction*100)
			r.sv.Gaps = append(r.sv.Gaps, g)
			r.sv.Warnings = append(r.sv.Warnings, g.Warning)
		}
	}
}

// lengthUnit names the length unit of a survey whose headers say note
// (feet asked for when they say nothing: --units us).
func lengthUnit(note UnitNote, feet bool) string {
	if note.Found {
		return note.Units.Length()
	}
	if feet {
		return rating.US.Length()
	}
	return rating.SI.Length()
}

// roundLength writes a length for a message, to the millimetre (or
// thousandth of a foot), without trailing zeros.
func roundLength(v float64) string {
	return strconv.FormatFloat(math.Round(v*1000)/1000, 'f', -1, 64)
}

func where(t *Table, row int) string {
	return (&ParseError{File: t.File, Sheet: t.Sheet, Row: row}).Position()
}

// sectionName names a section by its sheet, or by its file's base name.
func sectionName(t *Table) string {
	if t.Sheet != "" {
		return t.Sheet
	}
	base := filepath.Base(t.File)
	return strings.TrimSuffix(base, filepath.Ext(base))
}
