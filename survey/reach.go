package survey

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"wetline/rating"
	"wetline/rating/reach"
	"wetline/subdivide"
)

// Column names of a reach table (matched case-insensitively). Section,
// survey, distance, ws_left and ws_right are required; quality and note
// are optional.
const (
	ReachColSection  = "section"
	ReachColSurvey   = "survey"
	ReachColDistance = "distance"
	ReachColWSLeft   = "ws_left"
	ReachColWSRight  = "ws_right"
	ReachColQuality  = "quality"
)

// ReachColumns returns the columns of a reach table in their usual order.
func ReachColumns() []string {
	return []string{ReachColSection, ReachColSurvey, ReachColDistance, ReachColWSLeft, ReachColWSRight, ReachColQuality, ColNote}
}

// Causes of reach-table errors, for errors.Is.
var (
	ErrSectionID        = errors.New("the section needs an id")
	ErrDuplicateSection = errors.New("section id used twice")
	ErrNoSurvey         = errors.New("the section needs a survey (a file, or a sheet of this workbook)")
	ErrSurveyAbsent     = errors.New("no such survey file or sheet")
	ErrSurveyOutside    = errors.New("the survey lies outside the reach table's folder: keep the surveys beside the table (or allow it explicitly)")
	ErrDistanceBlank    = errors.New("distance is blank")
	ErrDistanceOrder    = errors.New("distances must increase downstream, row by row")
	ErrNoHighWaterMark  = errors.New("give a high-water mark in ws_left or ws_right")
	ErrMarkQuality      = fmt.Errorf("quality must be one of %s, or blank", strings.Join(rating.QualityWords(), ", "))
	ErrNoNColumn        = errors.New("the survey has no n column: every section of a reach needs Manning's n")
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

// ReadReach reads a reach table from a CSV file or a workbook sheet, then
// every section's survey: a sheet of the same workbook when the reach is in
// a workbook and a sheet has that name, otherwise a file relative to the
// reach file's folder (CSV, or the first sheet of a workbook).
func ReadReach(path, sheet string, opt SectionOptions) (*Reach, error) {
	t, err := ReadTable(path, sheet)
	if err != nil {
		return nil, err
	}
	sheets := t.Sheets
	r, err := ReachFromTable(t)
	if err != nil {
		return nil, err
	}
	var errs errorList
	for i := range r.Rows {
		row := &r.Rows[i]
		switch {
		case slices.Contains(sheets, row.Survey) && row.Survey != t.Sheet:
			row.Path, row.Sheet = path, row.Survey
		case filepath.IsAbs(row.Survey):
			row.Path = row.Survey
		default:
			row.Path = filepath.Join(filepath.Dir(path), row.Survey)
		}
		if row.Sheet == "" && !opt.SurveysAnywhere && !within(row.Path, filepath.Dir(path)) {
			errs = append(errs, r.At(i, ReachColSurvey, fmt.Errorf("%w (%s)", ErrSurveyOutside, row.Path)))
			continue
		}
		if row.Sheet == "" {
			if st, err := os.Stat(row.Path); err != nil || st.IsDir() {
				errs = append(errs, r.At(i, ReachColSurvey, fmt.Errorf("%w (looked for %s)", ErrSurveyAbsent, row.Path)))
				continue
			}
		}
	}
	if len(errs) > 0 {
		return nil, errs.err()
	}
	r.Surveys = make([]Survey, len(r.Rows))
	for i, row := range r.Rows {
		sv, err := ReadSection(row.Path, row.Sheet, opt)
		if err != nil {
			return nil, err
		}
		sv.Section.Name = row.ID
		r.Surveys[i] = sv
		for _, w := range sv.Warnings {
			r.Warnings = append(r.Warnings, "section "+row.ID+": "+w)
		}
	}
	return r, nil
}

// ReachFromTable reads the rows of a reach table without reading the
// surveys. Every bad cell is reported, each naming its row and column.
func ReachFromTable(t *Table) (*Reach, error) {
	r := &Reach{File: t.File, Sheet: t.Sheet, t: t, cols: map[string]int{}}
	for _, name := range ReachColumns()[:5] {
		c, err := t.Require(name)
		if err != nil {
			return nil, err
		}
		r.cols[name] = c
	}
	var err error
	if r.Units, err = t.HeaderUnits(r.cols[ReachColDistance], r.cols[ReachColWSLeft], r.cols[ReachColWSRight]); err != nil {
		return nil, err
	}
	r.Site = t.Site()
	r.cols[ReachColQuality] = t.Column(ReachColQuality)
	r.cols[ColNote] = t.Column(ColNote)
	for i, h := range t.Header {
		if h != "" && !slices.ContainsFunc(ReachColumns(), func(c string) bool { return t.Column(c) == i }) {
			r.Warnings = append(r.Warnings, fmt.Sprintf("%s: column %q is not used", where(t, t.HeaderRow), h))
		}
	}
	var errs errorList
	add := func(rec Record, name string, err error) {
		errs = append(errs, t.At(rec, r.cols[name], err))
	}
	ids := map[string]bool{}
	lastDist := math.Inf(-1)
	for _, rec := range t.Records {
		row := ReachRow{Row: rec.Row, WSLeft: math.NaN(), WSRight: math.NaN(),
			ID:     t.Cell(rec, r.cols[ReachColSection]),
			Survey: t.Cell(rec, r.cols[ReachColSurvey]),
			Note:   t.Cell(rec, r.cols[ColNote])}
		switch {
		case row.ID == "":
			add(rec, ReachColSection, ErrSectionID)
		case ids[row.ID]:
			add(rec, ReachColSection, ErrDuplicateSection)
		}
		ids[row.ID] = true
		if row.Survey == "" {
			add(rec, ReachColSurvey, ErrNoSurvey)
		}
		d, ok, err := t.Float(rec, r.cols[ReachColDistance])
		switch {
		case err != nil:
			errs = append(errs, err.(*ParseError))
		case !ok:
			add(rec, ReachColDistance, ErrDistanceBlank)
		case !(d > lastDist):
			add(rec, ReachColDistance, fmt.Errorf("%w (%g after %g)", ErrDistanceOrder, d, lastDist))
		}
		if ok {
			row.Distance = d
			lastDist = d
		}
		marks := 0
		for _, c := range []struct {
			name string
			v    *float64
		}{{ReachColWSLeft, &row.WSLeft}, {ReachColWSRight, &row.WSRight}} {
			v, ok, err := t.Float(rec, r.cols[c.name])
			switch {
			case err != nil:
				errs = append(errs, err.(*ParseError))
				marks++ // reported already
			case ok:
				*c.v = v
				marks++
			}
		}
		if marks == 0 {
			add(rec, ReachColWSLeft, ErrNoHighWaterMark)
		}
		if q, err := rating.ParseQuality(t.Cell(rec, r.cols[ReachColQuality])); err != nil {
			add(rec, ReachColQuality, ErrMarkQuality)
		} else {
			row.Quality = q
		}
		r.Rows = append(r.Rows, row)
	}
	if len(errs) > 0 {
		return nil, errs.err()
	}
	if len(r.Rows) == 0 {
		return nil, &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Err: ErrEmpty}
	}
	return r, nil
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

// ReachSections compiles each section's survey for the slope-area method
// in unit system u (a survey whose headers say otherwise is an error),
// with its id, distance and marks, and the standard deviation of its marks
// from their quality rating (rating.Quality.MarkSD; zero, the default, when
// blank). Geometry errors name the survey file.
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
			Left: row.WSLeft, Right: row.WSRight, Survey: row.Survey, Quality: row.Quality, Note: row.Note}
		out[i].MarkSD, _ = row.Quality.MarkSD(u)
	}
	return out, nil
}

// PlaceError positions an error of the slope-area computation on the
// reach table when it concerns one section (a reach.SectionError), and
// returns other errors prefixed with the reach file.
func (r *Reach) PlaceError(err error) error {
	var se *reach.SectionError
	if errors.As(err, &se) && se.Index >= 0 && se.Index < len(r.Rows) {
		col := ReachColDistance
		switch se.Field {
		case "water_surface":
			col = ReachColWSLeft
		case "geometry":
			col = ReachColSurvey
		}
		return r.At(se.Index, col, se.Err)
	}
	return fmt.Errorf("%s: %w", (&ParseError{File: r.File, Sheet: r.Sheet}).Position(), err)
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
