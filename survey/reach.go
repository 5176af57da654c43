package survey

import (
	"errors"
	"fmt"
	"maps"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/rating/reach"
	"wetline/subdivide"
)

// Column names of a reach table (matched case-insensitively). Section,
// survey and distance are required; ws_left and ws_right are required for
// the slope-area method (ReadReach) and optional for step-backwater
// (ReachOptions.MarksOptional); quality and note are optional. The
// columns of ReachFlowColumns and structure are optional.
const (
	ReachColSection  = "section"
	ReachColSurvey   = "survey"
	ReachColDistance = "distance"
	ReachColWSLeft   = "ws_left"
	ReachColWSRight  = "ws_right"
	ReachColQuality  = "quality"
	// ReachColLeftLength, ReachColChannelLength and ReachColRightLength
	// are the lengths of the flow paths from the section to the next one
	// downstream along the left overbank, the channel and the right
	// overbank (length unit; blank: the distance between the sections).
	ReachColLeftLength    = "left_length"
	ReachColChannelLength = "channel_length"
	ReachColRightLength   = "right_length"
	// ReachColStructure says whether the section is at a structure: one
	// of StructureWords, or one of OpenChannelWords or blank for an open
	// channel.
	ReachColStructure = "structure"
)

// StructureWords returns the words of the structure column that mark a
// section at a structure, matched case-insensitively: a kind of structure,
// or a plain yes.
func StructureWords() []string {
	return []string{"bridge", "culvert", "weir", "dam", "yes", "true", "1"}
}

// OpenChannelWords returns the words of the structure column that mean no
// structure (an open channel, as a blank cell does), matched
// case-insensitively.
func OpenChannelWords() []string { return []string{"no", "none", "false", "0"} }

// parseStructure reads a structure cell: "" for an open channel (blank or
// one of OpenChannelWords), the word as written for one of
// StructureWords, or ErrStructureWord.
func parseStructure(cell string) (string, error) {
	w := strings.ToLower(strings.TrimSpace(cell))
	switch {
	case w == "" || slices.Contains(OpenChannelWords(), w):
		return "", nil
	case slices.Contains(StructureWords(), w):
		return strings.TrimSpace(cell), nil
	}
	return "", ErrStructureWord
}

// ReachColumns returns the columns of a reach table in their usual order.
func ReachColumns() []string {
	return []string{ReachColSection, ReachColSurvey, ReachColDistance, ReachColWSLeft, ReachColWSRight, ReachColQuality, ColNote}
}

// ReachFlowColumns returns the optional columns of a reach table that
// describe the flow to the next section, in their usual order: the three
// flow lengths and the structure.
func ReachFlowColumns() []string {
	return []string{ReachColLeftLength, ReachColChannelLength, ReachColRightLength, ReachColStructure}
}

// knownReachColumn reports whether a header names a column of a reach table.
func knownReachColumn(t *Table, i int) bool {
	for _, c := range append(ReachColumns(), ReachFlowColumns()...) {
		if t.Column(c) == i {
			return true
		}
	}
	return false
}

// Causes of reach-table errors, for errors.Is.
var (
	ErrSectionID        = errors.New("the section needs an id")
	ErrDuplicateSection = errors.New("section id used twice")
	ErrNoSurvey         = errors.New("the section needs a survey (a file, or a sheet of this workbook)")
	ErrSurveyAbsent     = errors.New("no such survey file or sheet")
	// ErrSurveySheetAmbiguous is the cause of a survey naming no sheet
	// of the reach's workbook exactly but two or more that differ from
	// it, and from each other, only in case.
	ErrSurveySheetAmbiguous = errors.New("the survey names more than one sheet of the workbook (their names differ only in case)")
	ErrSurveyOutside        = errors.New("the survey lies outside the reach table's folder: keep the surveys beside the table, or give --surveys-anywhere to allow it")
	ErrDistanceBlank        = errors.New("distance is blank")
	ErrDistanceOrder        = errors.New("distances must increase downstream, row by row")
	ErrNoHighWaterMark      = errors.New("give a high-water mark in ws_left or ws_right")
	ErrMarkQuality          = errors.New("quality must be " + rating.QualityChoices())
	ErrNoNColumn            = errors.New("the survey has no n column: every section of a reach needs Manning's n")
	ErrFlowLengthValue      = errors.New("a flow length must be more than zero (blank: the distance to the next section)")
	ErrStructureWord        = fmt.Errorf("structure must be one of %s (a structure at the section), or %s or blank (an open channel)",
		strings.Join(StructureWords(), ", "), strings.Join(OpenChannelWords(), ", "))
	ErrStructure = errors.New("the section is at a structure: flow through bridges, culverts and other structures " +
		"is refused, not approximated; end the reach above it or start it below it")
)

// ReachRow is one section of a reach table.
type ReachRow struct {
	// ID names the section.
	ID string
	// Survey is the survey cell as written; Path and Sheet say where the
	// survey is read from (Sheet empty for a CSV file).
	Survey, Path, Sheet string
	// Distance is along the channel, increasing downstream (length unit).
	Distance float64
	// WSLeft and WSRight are the high-water-mark elevations; NaN when blank.
	WSLeft, WSRight float64
	// Quality is the marks' quality rating (Unrated when blank).
	Quality rating.Quality
	// Note is the note column.
	Note string
	// LeftLength, ChannelLength and RightLength are the flow lengths to
	// the next section (length unit); NaN when blank or absent.
	LeftLength, ChannelLength, RightLength float64
	// Structure is the structure column as written when it marks a
	// structure (one of StructureWords); "" for an open channel.
	Structure string
	// Row is the 1-based line or sheet row.
	Row int
}

// Reach is a slope-area reach read from a table, with each section's survey.
type Reach struct {
	// File and Sheet say where the reach table came from.
	File, Sheet string
	// Rows holds the sections, upstream first.
	Rows []ReachRow
	// Surveys holds each section's survey, aligned with Rows (filled by
	// ReadReach, empty after ReachFromTable).
	Surveys []Survey
	// Warnings are unusual but legal facts about the reach and its surveys.
	Warnings []string
	// Units is what the headers say of the unit system.
	Units UnitNote
	// Site is the site metadata read above the table.
	Site rating.Site

	t    *Table
	cols map[string]int
}

// ReachOptions say how a reach table is read. The zero value reads a
// slope-area reach: every section needs a high-water mark.
type ReachOptions struct {
	// Section configures the reading of every section's survey.
	Section SectionOptions
	// MarksOptional accepts sections without marks, and a table without
	// the ws_left and ws_right columns (a step-backwater reach).
	MarksOptional bool
}

// ReadReach reads a slope-area reach table from a CSV file or a workbook
// sheet, then every section's survey (see ReadReachWith): every section
// needs a high-water mark.
func ReadReach(path, sheet string, opt SectionOptions) (*Reach, error) {
	return ReadReachWith(path, sheet, ReachOptions{Section: opt})
}

// ReadReachWith reads a reach table from a CSV file or a workbook sheet,
// then every section's survey: a sheet of the same workbook when the reach
// is in a workbook and a sheet has that name, otherwise a file relative to
// the reach file's folder (CSV, or the first visible sheet of a workbook).
func ReadReachWith(path, sheet string, ro ReachOptions) (*Reach, error) {
	opt := ro.Section
	t, err := ReadTable(path, sheet)
	if err != nil {
		return nil, err
	}
	sheets := t.Sheets
	r, err := ReachTable(t, ro)
	if err != nil {
		if sheet == "" && t.Sheet != "" {
			err = otherReachSheet(path, t, err)
		}
		return nil, err
	}
	var errs errorList
	for i := range r.Rows {
		row := &r.Rows[i]
		named, alike := sheetNamed(sheets, row.Survey)
		switch {
		case len(alike) > 1:
			errs = append(errs, r.At(i, ReachColSurvey, fmt.Errorf("%w (%s)", ErrSurveySheetAmbiguous, strings.Join(alike, ", "))))
			continue
		case named != "" && named != t.Sheet:
			row.Path, row.Sheet = path, named
		case filepath.IsAbs(row.Survey):
			row.Path = row.Survey
		default:
			row.Path = filepath.Join(filepath.Dir(path), row.Survey)
		}
		if row.Sheet == "" && strings.Contains(row.Survey, `\`) {
			if _, err := os.Stat(row.Path); err != nil {
				if alt := slashedPath(filepath.Dir(path), row.Survey); alt != row.Path {
					if _, err := os.Stat(alt); err == nil {
						row.Path = alt
					}
				}
			}
		}
		if row.Sheet == "" && !opt.SurveysAnywhere && !within(row.Path, filepath.Dir(path)) {
			errs = append(errs, r.At(i, ReachColSurvey, fmt.Errorf("%w (%s)", ErrSurveyOutside, row.Path)))
			continue
		}
		if row.Sheet == "" {
			if st, err := os.Stat(row.Path); err != nil {
				pe := r.At(i, ReachColSurvey, fmt.Errorf("%w (looked for %s)", ErrSurveyAbsent, row.Path))
				if strings.Contains(row.Survey, `\`) {
					// shown as written: quoted, its backslashes would read doubled
					pe.Text, pe.Err = "", fmt.Errorf("%s: %w (looked for %s and %s)", row.Survey, ErrSurveyAbsent,
						row.Path, slashedPath(filepath.Dir(path), row.Survey))
				}
				errs = append(errs, pe)
				continue
			} else if st.IsDir() {
				errs = append(errs, r.At(i, ReachColSurvey, fmt.Errorf("%w (%s is a folder: name the survey file in it)", ErrSurveyAbsent, row.Path)))
				continue
			}
		}
	}
	if len(errs) > 0 {
		return nil, errs.err()
	}
	r.Surveys = make([]Survey, len(r.Rows))
	gapped := 0
	for i, row := range r.Rows {
		sv, err := ReadSection(row.Path, row.Sheet, opt)
		if err != nil {
			return nil, err
		}
		sv.Section.Name = row.ID
		r.Surveys[i] = sv
		if len(sv.Gaps) > 0 {
			gapped++
		}
	}
	for i, row := range r.Rows {
		for _, w := range r.Surveys[i].Warnings {
			if gapped > 1 && slices.ContainsFunc(r.Surveys[i].Gaps, func(g StationGap) bool { return g.Warning == w }) {
				continue // rolled up below
			}
			r.Warnings = append(r.Warnings, "section "+row.ID+": "+w)
		}
	}
	if gapped > 1 {
		r.Warnings = append(r.Warnings, r.gapsWarning(gapped))
	}
	r.Warnings = append(r.Warnings, r.sameSurveys()...)
	ids := make([]string, len(r.Rows))
	for i, row := range r.Rows {
		ids[i] = row.ID
	}
	r.Warnings = append(r.Warnings, OppositeLines(r.Surveys, ids)...)
	if !r.Site.Known() {
		r.Site = surveysSite(r.Surveys)
	}
	return r, nil
}

// RolledSections is how many sections a warning rolled up across the
// sections of a reach names before it counts the rest.
const RolledSections = 3

// gapsWarning rolls up the station-gap warnings of the n sections of the
// reach whose surveys have gaps over MaxGapFraction of their width into
// one line: the count of sections, and the first RolledSections of them
// with their number of gaps, the largest and the row after the first.
func (r *Reach) gapsWarning(n int) string {
	var named []string
	for i, sv := range r.Surveys {
		if len(sv.Gaps) == 0 {
			continue
		}
		if len(named) == RolledSections {
			named = append(named, fmt.Sprintf("%d more", n-RolledSections))
			break
		}
		largest := 0.0
		for _, g := range sv.Gaps {
			largest = math.Max(largest, g.To-g.From)
		}
		named = append(named, fmt.Sprintf("%s (%s, up to %s %s; %s)", r.Rows[i].ID, rating.Counted(len(sv.Gaps), "gap", "gaps"),
			roundLength(largest), sv.Gaps[0].Unit, (&ParseError{File: sv.File, Sheet: sv.Sheet, Row: sv.Gaps[0].Row}).Position()))
	}
	return fmt.Sprintf("%d sections have gaps between consecutive stations over %.0f %% of the section width: %s: check for missing points "+
		"(a section written by the shape command, its comment line kept, is not checked)", n, MaxGapFraction*100, rating.JoinAnd(named))
}

// sameSurveys returns a warning for every pair of sections whose surveys
// are one: read from the same file and sheet, or holding the same ground
// points (every station and elevation equal) or the same eastings and
// northings. Two sections of a reach are two places on the river; the
// same ground at both is a copying slip that takes the slope and the
// conveyance of one section for the other's, silently.
func (r *Reach) sameSurveys() []string {
	var out []string
	for j := range r.Surveys {
		for i := range j {
			if why := sameSurvey(r.Rows[i], r.Rows[j], r.Surveys[i], r.Surveys[j]); why != "" {
				out = append(out, fmt.Sprintf("sections %s and %s %s: two sections of a reach are two places on the river; "+
					"check the survey column", r.Rows[i].ID, r.Rows[j].ID, why))
			}
		}
	}
	return out
}

// sameSurvey says how the surveys a and b of rows ra and rb are the same
// ("" when they differ).
func sameSurvey(ra, rb ReachRow, a, b Survey) string {
	switch {
	case ra.Sheet == rb.Sheet && samePath(ra.Path, rb.Path):
		if ra.Sheet != "" {
			return fmt.Sprintf("read the same sheet %s", ra.Sheet)
		}
		return fmt.Sprintf("read the same survey file %s", ra.Path)
	case len(a.Projection.Easting) > 0 && slices.Equal(a.Projection.Easting, b.Projection.Easting) &&
		slices.Equal(a.Projection.Northing, b.Projection.Northing):
		return fmt.Sprintf("have the same surveyed coordinates (%s and %s)", Position(a.File, a.Sheet), Position(b.File, b.Sheet))
	case len(a.Section.Points) > 0 && slices.Equal(a.Section.Points, b.Section.Points):
		return fmt.Sprintf("have the same ground points, every station and elevation (%s and %s)",
			Position(a.File, a.Sheet), Position(b.File, b.Sheet))
	}
	return ""
}

// samePath reports whether the paths a and b name one file: the same
// path once cleaned, or the same file on disk.
func samePath(a, b string) bool {
	if filepath.Clean(a) == filepath.Clean(b) {
		return true
	}
	sa, errA := os.Stat(a)
	sb, errB := os.Stat(b)
	return errA == nil && errB == nil && os.SameFile(sa, sb)
}

// sheetNamed finds the sheet a reach table's survey names among a
// workbook's sheets: the sheet of that name, or else the one whose name
// differs from it only in case, as spreadsheet programs match sheet
// names. "" when none does; alike lists the sheets when more than one
// differs only in case (the name is then ambiguous).
func sheetNamed(sheets []string, name string) (sheet string, alike []string) {
	if slices.Contains(sheets, name) {
		return name, nil
	}
	for _, s := range sheets {
		if strings.EqualFold(s, name) {
			alike = append(alike, "'"+s+"'")
			sheet = s
		}
	}
	if len(alike) > 1 {
		return "", alike
	}
	return sheet, nil
}

// otherReachSheet adds to err, a reach table missing a column on the
// sheet t read by default (the first visible one), the name of the first
// other sheet of the workbook whose header has the columns every reach
// table needs (section, survey, distance), and how to read it; err
// unchanged when none has.
func otherReachSheet(path string, t *Table, err error) error {
	var pe *ParseError
	if !errors.Is(err, ErrMissingColumn) || !errors.As(err, &pe) {
		return err
	}
	for _, name := range t.Sheets {
		if name == t.Sheet {
			continue
		}
		o, e := ReadTable(path, name)
		if e != nil || o.Column(ReachColSection) < 0 || o.Column(ReachColSurvey) < 0 || o.Column(ReachColDistance) < 0 {
			continue
		}
		pe.Err = fmt.Errorf("%w; this sheet is not the reach table (read by default as the workbook's first): "+
			"sheet %s holds one: give --sheet %s", pe.Err, name, SheetArg(name))
		return err
	}
	return err
}

// SheetArg is a sheet's name as a shell word for a flag in a message:
// quoted when it holds a space or a character the shell reads.
func SheetArg(name string) string {
	if strings.ContainsAny(name, " '\"$&;|()<>*?!#`") {
		return "'" + strings.ReplaceAll(name, "'", `'\''`) + "'"
	}
	return name
}

// slashedPath is the path of a survey written with backslashes (as
// Windows writes folders, e.g. surveys\xs-1.csv), read as folder
// separators, relative to the reach table's folder dir.
func slashedPath(dir, survey string) string {
	alt := filepath.FromSlash(strings.ReplaceAll(survey, `\`, "/"))
	if filepath.IsAbs(alt) {
		return alt
	}
	return filepath.Join(dir, alt)
}

// surveysSite is the site of a reach table that names none: the site its
// surveys name, when every survey naming a site names the same one (as
// the sheets of one field workbook do); else nothing.
func surveysSite(svs []Survey) rating.Site {
	var site rating.Site
	for _, sv := range svs {
		switch {
		case !sv.Site.Known():
		case !site.Known():
			site = sv.Site
		case sv.Site.Name != site.Name:
			return rating.Site{}
		}
	}
	return rating.Site{Name: site.Name, ID: site.ID}
}

// ReachFromTable reads the rows of a slope-area reach table without
// reading the surveys (ReachTable with the zero ReachOptions).
func ReachFromTable(t *Table) (*Reach, error) {
	return ReachTable(t, ReachOptions{})
}

// ReachTable reads the rows of a reach table without reading the surveys.
// Every bad cell is reported, each naming its row and column; a distance
// beyond ±MaxCoordinate, a flow length above MaxCoordinate or a high-water
// mark beyond ±MaxElevation is refused as implausible (ErrImplausible).
// Flow lengths given at the last section are not used (a warning says so).
func ReachTable(t *Table, opt ReachOptions) (*Reach, error) {
	r := &Reach{File: t.File, Sheet: t.Sheet, t: t, cols: map[string]int{}, Warnings: t.ownWarnings()}
	required := ReachColumns()[:5]
	if opt.MarksOptional {
		required = ReachColumns()[:3]
	}
	for _, name := range required {
		c, err := t.Require(name)
		if err != nil {
			return nil, err
		}
		r.cols[name] = c
	}
	for _, name := range append(ReachColumns()[len(required):], ReachFlowColumns()...) {
		r.cols[name] = t.Column(name)
	}
	if err := t.unsavedIn(slices.Collect(maps.Values(r.cols))...); err != nil {
		return nil, err
	}
	var err error
	if r.Units, err = t.HeaderUnits(r.cols[ReachColDistance], r.cols[ReachColWSLeft], r.cols[ReachColWSRight],
		r.cols[ReachColLeftLength], r.cols[ReachColChannelLength], r.cols[ReachColRightLength]); err != nil {
		return nil, err
	}
	r.Site = t.Site()
	for i, h := range t.Header {
		if h != "" && !knownReachColumn(t, i) {
			r.Warnings = append(r.Warnings, fmt.Sprintf("%s: column %q is not used", where(t, t.HeaderRow), h))
		}
	}
	var errs errorList
	ids := map[string]bool{}
	order := distanceOrder{last: math.Inf(-1), falling: true}
	for _, rec := range t.Records {
		row := r.readRow(rec, opt, ids, &order, &errs)
		r.Rows = append(r.Rows, row)
	}
	errs = order.report(errs)
	errs = r.zeroFlowLengths(errs)
	if len(errs) > 0 {
		return nil, errs.err()
	}
	if len(r.Rows) == 0 {
		return nil, &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Err: ErrEmpty}
	}
	if last := r.Rows[len(r.Rows)-1]; finite(last.LeftLength) || finite(last.ChannelLength) || finite(last.RightLength) {
		r.Warnings = append(r.Warnings, fmt.Sprintf("%s: section %s is the last of the reach: its flow lengths are not used",
			where(t, last.Row), last.ID))
	}
	return r, nil
}

// zeroFlowLengths adds an error (ErrFlowLengthValue) for every flow
// length of zero at a section other than the last: a flow path to the
// next section has a length, and a zero is neither that nor the blank that
// means the distance between the sections. The last section's lengths are
// not used (ReachTable warns of them).
func (r *Reach) zeroFlowLengths(errs errorList) errorList {
	for i, row := range r.Rows[:max(len(r.Rows)-1, 0)] {
		for _, c := range []struct {
			name string
			v    float64
		}{{ReachColLeftLength, row.LeftLength}, {ReachColChannelLength, row.ChannelLength}, {ReachColRightLength, row.RightLength}} {
			if c.v == 0 {
				errs = append(errs, r.t.At(r.t.Records[i], r.cols[c.name], ErrFlowLengthValue))
			}
		}
	}
	return errs
}

// distanceOrder follows the distances of a reach table row by row, so
// that a table out of order is reported once, at its first offending row,
// rather than at every row.
type distanceOrder struct {
	last    float64     // the distance of the row above
	given   int         // rows with a distance
	bad     int         // rows whose distance does not increase
	falling bool        // every bad row's distance is below the one above
	first   *ParseError // at the first bad row's distance
	d, prev float64     // that row's distance and the one above it
}

// next takes the distance d of the next row (at the cell placed by at).
func (o *distanceOrder) next(d float64, at func(error) *ParseError) {
	o.given++
	if !(d > o.last) {
		o.bad++
		o.falling = o.falling && d < o.last
		if o.first == nil {
			o.first, o.d, o.prev = at(ErrDistanceOrder), d, o.last
		}
	}
	o.last = d
}

// report adds the one error of a table out of order to errs, in row order
// among the others: ErrDistanceOrder at the first offending row, saying
// the order expected, whether the whole table is listed downstream first
// and how many rows are out of order.
func (o *distanceOrder) report(errs errorList) errorList {
	if o.first == nil {
		return errs
	}
	what := fmt.Sprintf("(%g after %g)", o.d, o.prev)
	switch {
	case o.falling && o.bad == o.given-1:
		what += ": the table lists its sections downstream first; list the upstream section first"
	case o.bad > 1:
		what = fmt.Sprintf("(%g after %g; %d rows out of order)", o.d, o.prev, o.bad)
	}
	o.first.Err = fmt.Errorf("%w %s", ErrDistanceOrder, what)
	i := 0
	for i < len(errs) && errs[i].Row <= o.first.Row {
		i++
	}
	return slices.Insert(errs, i, o.first)
}

// readRow reads one section of a reach table, adding every bad cell to
// errs except a distance out of order, which order gathers.
func (r *Reach) readRow(rec Record, opt ReachOptions, ids map[string]bool, order *distanceOrder, errs *errorList) ReachRow {
	t := r.t
	add := func(name string, err error) {
		*errs = append(*errs, t.At(rec, r.cols[name], err))
	}
	nan := math.NaN()
	row := ReachRow{Row: rec.Row, WSLeft: nan, WSRight: nan, LeftLength: nan, ChannelLength: nan, RightLength: nan,
		ID:     t.Cell(rec, r.cols[ReachColSection]),
		Survey: t.Cell(rec, r.cols[ReachColSurvey]),
		Note:   t.Cell(rec, r.cols[ColNote])}
	if st, err := parseStructure(t.Cell(rec, r.cols[ReachColStructure])); err != nil {
		add(ReachColStructure, err)
	} else {
		row.Structure = st
	}
	switch {
	case row.ID == "":
		add(ReachColSection, ErrSectionID)
	case ids[row.ID]:
		add(ReachColSection, ErrDuplicateSection)
	}
	ids[row.ID] = true
	if row.Survey == "" {
		add(ReachColSurvey, ErrNoSurvey)
	}
	d, ok, err := t.Float(rec, r.cols[ReachColDistance])
	switch {
	case err != nil:
		*errs = append(*errs, err.(*ParseError))
	case !ok:
		add(ReachColDistance, ErrDistanceBlank)
	case math.Abs(d) > MaxCoordinate:
		add(ReachColDistance, implausible("distance", d, MaxCoordinate))
	default:
		row.Distance = d
		order.next(d, func(err error) *ParseError { return t.At(rec, r.cols[ReachColDistance], err) })
	}
	marks := 0
	for _, c := range []struct {
		name string
		v    *float64
	}{{ReachColWSLeft, &row.WSLeft}, {ReachColWSRight, &row.WSRight}} {
		v, ok, err := t.Float(rec, r.cols[c.name])
		switch {
		case err != nil:
			*errs = append(*errs, err.(*ParseError))
			marks++ // reported already
		case ok && math.Abs(v) > MaxElevation:
			add(c.name, implausible("high-water mark", v, MaxElevation))
			marks++ // reported already
		case ok:
			*c.v = v
			marks++
		}
	}
	if marks == 0 && !opt.MarksOptional {
		add(ReachColWSLeft, ErrNoHighWaterMark)
	}
	for _, c := range []struct {
		name string
		v    *float64
	}{{ReachColLeftLength, &row.LeftLength}, {ReachColChannelLength, &row.ChannelLength}, {ReachColRightLength, &row.RightLength}} {
		v, ok, err := t.Float(rec, r.cols[c.name])
		switch {
		case err != nil:
			*errs = append(*errs, err.(*ParseError))
		case ok && v < 0:
			add(c.name, ErrFlowLengthValue)
		case ok && v > MaxCoordinate:
			add(c.name, fmt.Errorf("flow length %g %w (above %g)", v, ErrImplausible, float64(MaxCoordinate)))
		case ok:
			*c.v = v
		}
	}
	if q, err := rating.ParseQuality(t.Cell(rec, r.cols[ReachColQuality])); err != nil {
		add(ReachColQuality, ErrMarkQuality)
	} else {
		row.Quality = q
	}
	return row
}

// implausible is the cause of a refused value v of the quantity what,
// beyond ±limit (wrapping ErrImplausible).
func implausible(what string, v, limit float64) error {
	return fmt.Errorf("%s %g %w (beyond ±%g)", what, v, ErrImplausible, limit)
}

// finite reports whether v is a number other than ±Inf.
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// OpenChannel refuses a reach with a section at a structure (one of
// StructureWords in the structure column), naming each such cell
// (ErrStructure).
func (r *Reach) OpenChannel() error {
	var errs errorList
	for i, row := range r.Rows {
		if row.Structure != "" {
			errs = append(errs, r.At(i, ReachColStructure, ErrStructure))
		}
	}
	return errs.err()
}

// SlopeAreaWarnings returns the warnings about what the slope-area method
// does not use of a reach table: flow lengths (read by backwater only;
// the method takes the distance between sections as the length of each
// subreach; Dalrymple and Benson 1967), naming the columns given, and
// structures marked at sections (the method assumes an open channel
// between them).
//
// References:
//
//	Dalrymple, T., and Benson, M.A., 1967, Measurement of peak discharge
//	by the slope-area method: U.S. Geological Survey Techniques of
//	Water-Resources Investigations, book 3, chapter A2.
func (r *Reach) SlopeAreaWarnings() []string {
	var out []string
	var cols, ids []string
	for _, row := range r.Rows[:max(len(r.Rows)-1, 0)] { // the last row's are warned by ReachTable
		given := false
		for _, c := range []struct {
			name string
			v    float64
		}{{ReachColLeftLength, row.LeftLength}, {ReachColChannelLength, row.ChannelLength}, {ReachColRightLength, row.RightLength}} {
			if finite(c.v) {
				given = true
				if !slices.Contains(cols, c.name) {
					cols = append(cols, c.name)
				}
			}
		}
		if given {
			ids = append(ids, row.ID)
		}
	}
	if len(ids) > 0 {
		slices.SortFunc(cols, func(a, b string) int {
			return slices.Index(ReachFlowColumns(), a) - slices.Index(ReachFlowColumns(), b)
		})
		which := "section "
		if len(ids) > 1 {
			which = "sections "
		}
		out = append(out, fmt.Sprintf("%s: the flow lengths in %s (%s%s) are read by backwater only, not here: the slope-area method takes the distance "+
			"between sections as the length of each subreach (Dalrymple and Benson 1967)",
			(&ParseError{File: r.File, Sheet: r.Sheet}).Position(), strings.Join(cols, ", "), which, strings.Join(ids, ", ")))
	}
	for _, row := range r.Rows {
		if row.Structure != "" {
			out = append(out, fmt.Sprintf("section %s is marked as at a structure (%s): "+
				"the slope-area method assumes an open channel between the sections", row.ID, row.Structure))
		}
	}
	return out
}

// At returns a ParseError at section i's cell in the named column (one of
// the Col constants); the whole row when the column is absent.
func (r *Reach) At(i int, column string, err error) *ParseError {
	col, ok := r.cols[column]
	if !ok {
		col = -1
	}
	for _, rec := range r.t.Records {
		if rec.Row == r.Rows[i].Row {
			return r.t.At(rec, col, err)
		}
	}
	return &ParseError{File: r.File, Sheet: r.Sheet, Row: r.Rows[i].Row, Err: err}
}

// Inputs lists the files read: the reach file and every survey file.
func (r *Reach) Inputs() []string {
	out := []string{r.File}
	for _, row := range r.Rows {
		if row.Path != "" && !slices.Contains(out, row.Path) {
			out = append(out, row.Path)
		}
	}
	return out
}

// ResolveUnits returns the unit system of the reach: u when given (which
// the reach table's headers must not contradict, UnitNote.Resolve), else
// what the reach table's headers say, else what the first survey whose
// headers name a unit says, else u. Without given, every survey must
// agree with it (UnitSource.Agree): a survey whose headers name no unit
// is in si units, so it is refused in a reach in us units
// (ErrUnitsUnnamed); a reach table naming no unit takes its surveys'.
// ReachSections then holds every survey to it.
func (r *Reach) ResolveUnits(u rating.Units, given bool) (rating.Units, error) {
	if given {
		return r.Units.Resolve(u, given)
	}
	src := r.unitSource()
	if !src.Note.Found {
		return u, nil
	}
	for _, sv := range r.Surveys {
		if err := src.Agree(Position(sv.File, sv.Sheet), sv.Units); err != nil {
			return u, err
		}
	}
	return src.Units(), nil
}

// unitSource is the input whose headers set the reach's units: the reach
// table when they name a unit, else its first survey that does (Note not
// Found when none does).
func (r *Reach) unitSource() UnitSource {
	src := UnitSource{File: Position(r.File, r.Sheet), Note: r.Units}
	for _, sv := range r.Surveys {
		if src.Note.Found {
			break
		}
		if sv.Units.Found {
			src = UnitSource{File: Position(sv.File, sv.Sheet), Note: sv.Units}
		}
	}
	return src
}

// UnitsNamed reports that the reach table or one of its surveys names its
// units in its headers (else the reach is in si units by default).
func (r *Reach) UnitsNamed() bool { return r.unitSource().Note.Found }

// AgreeBoundary checks that a boundary rating read for the reach is in
// the reach's unit system u (from ResolveUnits). With units given
// (--units), headers naming others are refused (ErrUnitsDisagree at the
// column). Otherwise the rules of UnitSource.Agree hold between the input
// that set the reach's units and the rating: a rating naming no unit is
// in si units, so beside a reach in us units it is ErrUnitsUnnamed, and a
// rating in us units beside a reach naming no unit likewise.
func (r *Reach) AgreeBoundary(br BoundaryRating, u rating.Units, given bool) error {
	if given {
		_, err := br.Units.Resolve(u, true)
		return err
	}
	if src := r.unitSource(); src.Note.Found {
		return src.Agree(Position(br.File, br.Sheet), br.Units)
	}
	rt := UnitSource{File: Position(br.File, br.Sheet), Note: br.Units}
	return rt.Agree(Position(r.File, r.Sheet), UnitNote{})
}

// ReachSections compiles each section's survey for the reach methods in
// unit system u (a survey whose headers say otherwise is an error), with
// its id, distance, marks (NaN where blank), flow lengths (zero where
// blank: the distance to the next section), and the standard deviation of
// its marks from their quality rating (rating.Quality.MarkSD; zero, the
// default, when blank). Geometry errors name the survey file.
func (r *Reach) ReachSections(u rating.Units) ([]reach.Section, error) {
	if len(r.Surveys) != len(r.Rows) {
		return nil, errors.New("survey: reach surveys not read")
	}
	out := make([]reach.Section, len(r.Rows))
	for i, row := range r.Rows {
		sv := r.Surveys[i]
		if _, err := sv.Units.Resolve(u, true); err != nil {
			return nil, err
		}
		if sv.Section.N == nil {
			return nil, &ParseError{File: sv.File, Sheet: sv.Sheet, Err: ErrNoNColumn}
		}
		g, err := subdivide.Compile(sv.Section)
		if err != nil {
			return nil, &ParseError{File: sv.File, Sheet: sv.Sheet, Err: err}
		}
		out[i] = reach.Section{ID: row.ID, Geometry: g, Distance: row.Distance,
			Left: row.WSLeft, Right: row.WSRight, Survey: row.Survey, Quality: row.Quality, Note: row.Note,
			SurveyNote: surveyNoteText(r.Surveys[i]),
			FlowLengths: subdivide.PerRegion{Left: zeroIfBlank(row.LeftLength), Channel: zeroIfBlank(row.ChannelLength),
				Right: zeroIfBlank(row.RightLength)}}
		out[i].MarkSD, _ = row.Quality.MarkSD(u)
	}
	return out, nil
}

// surveyNoteText is a reach section's survey note: the texts of its
// survey's input notes (how its stations were made, its headers in US
// survey feet), joined by "; ".
func surveyNoteText(sv Survey) string {
	var texts []string
	for _, n := range []InputNote{sv.ProjectionNote, sv.Units.SurveyFootNote()} {
		if n.Text != "" {
			texts = append(texts, n.Text)
		}
	}
	return strings.Join(texts, "; ")
}

func zeroIfBlank(v float64) float64 {
	if math.IsNaN(v) {
		return 0
	}
	return v
}

// PlaceError positions an error of a reach computation on the reach
// table when it concerns one section (a reach.SectionError), and returns
// other errors prefixed with the reach file.
func (r *Reach) PlaceError(err error) error {
	var se *reach.SectionError
	if errors.As(err, &se) && se.Index >= 0 && se.Index < len(r.Rows) {
		col := ReachColDistance
		switch se.Field {
		case "water_surface":
			if row := r.Rows[se.Index]; finite(row.WSLeft) && finite(row.WSRight) {
				return r.meanMarksError(se.Index, se.Err)
			}
			col = ReachColWSLeft
		case "ws_left":
			col = ReachColWSLeft
		case "ws_right":
			col = ReachColWSRight
		case "geometry":
			col = ReachColSurvey
		case "flow_lengths":
			col = ReachColChannelLength
		}
		return r.At(se.Index, col, se.Err)
	}
	return fmt.Errorf("%s: %w", (&ParseError{File: r.File, Sheet: r.Sheet}).Position(), err)
}

// meanMarksError places an error about a water surface that is the mean
// of section i's two marks: at its ws_left cell, naming both marks as
// written and the mean compared, so that the cell quoted is not taken for
// the value at fault.
func (r *Reach) meanMarksError(i int, err error) error {
	pe := r.At(i, ReachColWSLeft, nil)
	right := r.At(i, ReachColWSRight, nil)
	row := r.Rows[i]
	pe.Err = fmt.Errorf("%s %q and %s %q, the water surface their mean %s: %w", echo(pe.Name), echo(pe.Text),
		echo(right.Name), echo(right.Text), strconv.FormatFloat(rating.DecimalMean(row.WSLeft, row.WSRight), 'f', -1, 64), err)
	pe.Name, pe.Text = "", ""
	return pe
}

// within reports whether path lies in folder dir or below it, after
// resolving links where the files exist.
func within(path, dir string) bool {
	abs := func(p string) string {
		if r, err := filepath.EvalSymlinks(p); err == nil {
			p = r
		}
		a, err := filepath.Abs(p)
		if err != nil {
			return filepath.Clean(p)
		}
		return a
	}
	rel, err := filepath.Rel(abs(dir), abs(path))
	return err == nil && rel != ".." && !strings.HasPrefix(rel, ".."+string(filepath.Separator)) && !filepath.IsAbs(rel)
}

// Causes of boundary-rating errors, for errors.Is.
var (
	ErrBoundaryOrder  = errors.New("stage and discharge must both increase from row to row")
	ErrBoundaryPoints = errors.New("a boundary rating needs two or more rows with stage and discharge")
	ErrNegativeFlow   = errors.New("discharge must not be negative")
)

// BoundaryRating is a stage–discharge relation at the last section of a
// reach, read for the downstream boundary of a step-backwater
// computation.
type BoundaryRating struct {
	// File and Sheet say where it was read.
	File, Sheet string
	// Points are the rows, stage and discharge both increasing.
	Points []reach.StageDischarge
	// Rows are the 1-based lines or sheet rows of Points.
	Rows []int
	// Depths are the depths of Points (a depth column, as rate writes
	// it; NaN where blank or absent, nil for none): they say where the
	// flow starts (DryFoot).
	Depths []float64
	// Warnings are unusual but legal facts about where it was read (a
	// hidden sheet, a depth column that disagrees with the rows' flow).
	Warnings []string
	// Units is what the stage and discharge headers say of the unit
	// system (see Reach.AgreeBoundary).
	Units UnitNote
}

// Boundary returns the downstream boundary of a step-backwater
// computation that reads this rating as the project reads every rating
// table (gauged.TableRating): log-linearly in (h − e) between rows, where
// the table begins at a row without flow, e the gauge height of zero flow
// it gives itself (DryFoot: from its depth column where it has one, as the
// table rate writes, else the stage of that dry row), and linearly where
// it has no such row, which the boundary's Warnings then say, naming the
// dry first row that gives the log-linear reading. Zero discharge stands
// at e. A discharge outside the table's rows is an error wrapping
// reach.ErrBoundaryRange; the table is never extrapolated. Points stay in
// the boundary, for its description and reports.
//
// References:
//
//	Kennedy, E.J., 1984, Discharge ratings at gaging stations: USGS
//	Techniques of Water-Resources Investigations, book 3, chap. A10.
func (b BoundaryRating) Boundary() (reach.Boundary, error) {
	pts := make([]gauged.RatingPoint, len(b.Points))
	for i, p := range b.Points {
		pts[i] = gauged.RatingPoint{Stage: p.Stage, Discharge: p.Discharge}
	}
	rt := gauged.RatingTable{Name: Position(b.File, b.Sheet), Points: pts}
	foot, _, dry := b.foot()
	rt.ZeroFlow, rt.HasZeroFlow = foot.E, dry
	tr, err := rt.Compile()
	if err != nil {
		return reach.Boundary{}, &ParseError{File: b.File, Sheet: b.Sheet, Err: err}
	}
	lo, hi := pts[0].Discharge, pts[len(pts)-1].Discharge
	stage := func(q float64) (float64, error) {
		if q < lo || q > hi {
			return math.NaN(), fmt.Errorf("%w: %g is not within %g to %g", reach.ErrBoundaryRange, q, lo, hi)
		}
		if q == 0 {
			return rt.ZeroFlow, nil
		}
		return tr.Stage(q)
	}
	out := reach.Boundary{Kind: reach.StageRating, Rating: slices.Clone(b.Points), StageOf: stage}
	if !rt.HasZeroFlow {
		out.Warnings = []string{fmt.Sprintf("%s: the boundary rating has no row without flow, so it is read linearly in stage between rows; "+
			"begin it with a row of discharge 0 at its gauge height of zero flow (as the table rate writes begins, at the section's lowest point) "+
			"to read it log-linearly in (h − e)", Position(b.File, b.Sheet))}
	}
	return out, nil
}

// foot is the gauge height of zero flow the rating gives itself
// (DryFoot), and the position of a row of Points by its index.
func (b BoundaryRating) foot() (Foot, func(int) string, bool) {
	pts := make([]gauged.RatingPoint, len(b.Points))
	for i, p := range b.Points {
		pts[i] = gauged.RatingPoint{Stage: p.Stage, Discharge: p.Discharge}
	}
	f, ok := DryFoot(pts, b.Depths)
	at := func(i int) string {
		row := 0
		if i < len(b.Rows) {
			row = b.Rows[i]
		}
		return (&ParseError{File: b.File, Sheet: b.Sheet, Row: row}).Position()
	}
	return f, at, ok
}

// ZeroFlowNote is the input note of a boundary rating that Boundary
// reads log-linearly in (h − e), e the gauge height of zero flow it gives
// itself (see DryFoot and Foot.Note), naming the row it was read from;
// "" for a rating read linearly.
func (b BoundaryRating) ZeroFlowNote() string {
	f, at, ok := b.foot()
	if !ok || len(b.Rows) == 0 {
		return ""
	}
	return f.Note(at, "")
}

// ReadBoundaryRating reads a stage–discharge relation from a CSV file or
// a workbook sheet (sheet "" reads a sheet named rating when the workbook
// has one, as a results workbook of rate does, else the first): any table
// with a stage and a discharge column, such as the rating table rate
// writes. Stages are in the datum of the reach's surveys. See
// BoundaryRatingFromTable.
func ReadBoundaryRating(path, sheet string) (BoundaryRating, error) {
	src, err := readRatingSource(path, sheet, SheetResultsRating)
	if err != nil {
		return BoundaryRating{}, err
	}
	return BoundaryRatingFromTable(src.Table)
}

// BoundaryRatingFromTable reads the stage (or gauge_height) and
// discharge columns of t, and its depth column where it has one (blank
// cells allowed; see DryFoot, whose warning of the depths it adds). Stage
// and discharge are required in every row, bounded as in RatingFromTable
// (ErrImplausible at the cell), discharge not negative; of a leading run
// of rows without flow (a rating table starts at the dry bed) only the
// last is kept; from there on stage and discharge must both increase.
// Every bad cell is reported, each naming its row and column.
func BoundaryRatingFromTable(t *Table) (BoundaryRating, error) {
	out := BoundaryRating{File: t.File, Sheet: t.Sheet, Warnings: t.ownWarnings()}
	cs, cq, units, err := t.stageDischargeColumns()
	out.Units = units
	if err != nil {
		return out, err
	}
	cd := t.Column(ColRatingDepth)
	if err := t.unsavedIn(cs, cq, cd); err != nil {
		return out, err
	}
	var errs errorList
	for _, rec := range t.Records {
		h, errh := t.number(rec, cs, "stage", MaxElevation)
		q, errq := t.number(rec, cq, "discharge", rating.MaxDischarge)
		depth, errd := t.depth(rec, cd)
		errs.add(errh, errq, errd)
		if errh != nil || errq != nil || errd != nil {
			continue
		}
		n := len(out.Points)
		switch {
		case q < 0:
			errs = append(errs, t.At(rec, cq, ErrNegativeFlow))
			continue
		case n == 1 && out.Points[0].Discharge == 0 && q == 0 && h > out.Points[0].Stage:
			out.Points, out.Rows, out.Depths = out.Points[:0], out.Rows[:0], out.Depths[:0] // still dry: keep the last dry row only
		case n > 0 && !(h > out.Points[n-1].Stage):
			errs = append(errs, t.At(rec, cs, fmt.Errorf("%w (%g after %g)", ErrBoundaryOrder, h, out.Points[n-1].Stage)))
			continue
		case n > 0 && !(q > out.Points[n-1].Discharge):
			errs = append(errs, t.At(rec, cq, fmt.Errorf("%w (%g after %g)", ErrBoundaryOrder, q, out.Points[n-1].Discharge)))
			continue
		}
		out.Points = append(out.Points, reach.StageDischarge{Stage: h, Discharge: q})
		out.Rows = append(out.Rows, rec.Row)
		out.Depths = append(out.Depths, depth)
	}
	if err := errs.err(); err != nil {
		return out, err
	}
	if len(out.Points) < 2 {
		return out, &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Err: ErrBoundaryPoints}
	}
	if f, at, ok := out.foot(); ok {
		if w := f.Warning(at); w != "" {
			out.Warnings = append(out.Warnings, w)
		}
	}
	return out, nil
}
