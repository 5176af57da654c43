package results

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strings"

	"wetline/rating"
	"wetline/subdivide"
	"wetline/survey"
	"wetline/survey/workbook"
)

// Sheet names of a results workbook, in order.
const (
	SheetSummary     = survey.SheetResultsSummary
	SheetRating      = survey.SheetResultsRating
	SheetLookup      = "lookup"
	SheetSubsections = "subsections"
	SheetSurvey      = "survey"
	SheetPlots       = "plots"
)

// ErrWorkbookRows is the cause of a table too long for a workbook sheet.
var ErrWorkbookRows = errors.New("too many rows for a workbook sheet")

// CheckRatingWorkbook returns an error when a rating of stages stages and
// subs subsections would not fit the sheets of a results workbook: the
// rating sheet holds a row per stage, the subsections sheet a row per
// stage and subsection. Commands check it before computing.
func CheckRatingWorkbook(stages, subs int) error {
	rows := stages * max(subs, 1)
	if rows+1 > workbook.MaxRows {
		return fmt.Errorf("%w: %d stages × %s is %d rows, and a sheet holds %d: ask for fewer stages or write CSV",
			ErrWorkbookRows, stages, rating.Counted(subs, "subsection", "subsections"), rows, workbook.MaxRows-1)
	}
	return nil
}

// WriteRatingWorkbook writes a results workbook to w. Sheets:
//
//   - summary: section, source, program version, units, slope, banks,
//     Manning's n by subsection, the calibration of n on gaugings when
//     made (the factor, its standard error and the standard error of
//     estimate against the gaugings), stage range, bankfull stage and
//     discharge (BankfullOf), warnings and the caution;
//   - rating: the full table, one row per stage, the columns of
//     WriteRatingCSV in words with units in brackets, flags last; stage
//     0.000, discharges to three significant figures (FormatSig3);
//   - lookup: discharge by stage in the printed layout of hydrometry under
//     a title naming the discharge unit (LookupTitle), one row per tenth
//     of a unit of stage and ten columns for the hundredths.
//     Each cell is the hydraulics computed at that exact stage (taken from
//     rep.Lookup, no interpolation), so it agrees with the rating sheet
//     wherever both hold the same stage; a cell whose stage was not
//     computed (above the section's top) is blank;
//   - subsections: per stage and subsection, its n, area, wetted
//     perimeter, top width, conveyance, discharge and velocity;
//   - survey: the ground points as read (station, elevation, n, mark,
//     note), when given;
//   - plots: the pictures, when given.
//
// Every table sheet is streamed, so memory stays bounded for any number of
// rows.
func WriteRatingWorkbook(w io.Writer, rep rating.RatingReport) error {
	b := newBook("rating", rep.Provenance.Site, rep.Table.Name)
	defer b.Close()
	if err := writeSummary(b, rep); err != nil {
		return err
	}
	if err := WriteRatingSheet(b, SheetRating, rep.Table); err != nil {
		return err
	}
	if len(rep.Lookup.Rows) > 0 {
		if err := WriteLookupSheet(b, SheetLookup, rep.Lookup); err != nil {
			return err
		}
	}
	if err := WriteSubsectionSheet(b, SheetSubsections, rep.Table); err != nil {
		return err
	}
	if g := rep.Ground; len(g.Section.Points) > 0 {
		sv := survey.Survey{Section: reportedStations(g.Section), Labels: g.Labels, Notes: g.Notes}
		if err := survey.WriteSurveySheet(b, SheetSurvey, sv, rep.Table.Units); err != nil {
			return err
		}
	}
	return finishBook(w, b, rep.Figures)
}

// reportedStations returns a copy of sec whose stations and bank
// stations are written as lengths (reportedNumber): stations projected
// from coordinates are computed, and the survey sheet holds them as the
// projected survey's CSV writes them.
func reportedStations(sec subdivide.Section) subdivide.Section {
	pts := make([]subdivide.Point, len(sec.Points))
	for i, p := range sec.Points {
		pts[i] = subdivide.Point{Station: reportedNumber(p.Station, true), Elevation: p.Elevation}
	}
	sec.Points = pts
	sec.LeftBank, sec.RightBank = reportedNumber(sec.LeftBank, true), reportedNumber(sec.RightBank, true)
	return sec
}

// RatingSheetColumns returns the columns of a rating sheet for t: the
// names of WriteRatingCSV (flags last) with units and number formats.
func RatingSheetColumns(t rating.Table) []workbook.Column {
	u := t.Units
	L, A, Q := u.Length(), u.Area(), u.Discharge()
	sf := "0." + strings.Repeat("0", stageDecimals(t))
	cols := []workbook.Column{
		{Name: "stage", Unit: L, Format: sf},
		{Name: "depth", Unit: L, Format: sf},
		{Name: "area", Unit: A, Format: workbook.FormatSig3},
		{Name: "wetted_perimeter", Unit: L, Format: "0.00"},
		{Name: "top_width", Unit: L, Format: "0.00"},
		{Name: "hydraulic_radius", Unit: L, Format: "0.000"},
		{Name: "conveyance", Unit: u.Conveyance(), Format: workbook.FormatSig3},
		{Name: "discharge", Unit: Q, Format: workbook.FormatSig3},
		{Name: "mean_velocity", Unit: u.Velocity(), Format: "0.00"},
		{Name: "alpha", Format: "0.000"},
		{Name: "froude", Format: "0.00"},
	}
	for i := range t.Subsections {
		cols = append(cols, workbook.Column{Name: SubsectionColumn(t, i), Unit: Q, Format: workbook.FormatSig3})
	}
	return append(cols,
		workbook.Column{Name: "hydraulic_depth", Unit: L, Format: "0.000"},
		workbook.Column{Name: "beta", Format: "0.000"},
		workbook.Column{Name: "shear_stress", Unit: u.Stress(), Format: "0.0"},
		workbook.Column{Name: "flags", Format: workbook.FormatText, Width: flagsWidth})
}

// flagsWidth is the width, in characters, of a rating sheet's flags
// column: the longest flag; more flags wrap below.
const flagsWidth = 17

// WriteRatingSheet writes t as a table sheet (see RatingSheetColumns),
// each number as WriteRatingCSV writes it.
func WriteRatingSheet(b *workbook.Book, name string, t rating.Table) error {
	s, err := reportTable(b, name, RatingSheetColumns(t))
	if err != nil {
		return err
	}
	for i := range s.length { // the lengths of the CSV: stage and depth
		s.length[i] = lengthColumn[i]
	}
	ws, err := b.WrapStyle()
	if err != nil {
		return err
	}
	vals := make([]any, 0, len(RatingSheetColumns(t)))
	for _, r := range t.Rows {
		vals = vals[:0]
		for _, v := range rowValues(r) {
			vals = append(vals, v)
		}
		if len(r.Flags) > 0 {
			vals = append(vals, workbook.Styled{Style: ws, Value: strings.Join(r.Flags, " ")})
		}
		if err := s.Row(vals...); err != nil {
			return err
		}
	}
	return s.Flush()
}

// WriteLookupSheet writes the lookup layout of a table rated at
// hundredths (see LookupStages): column 1 the stage at each tenth, columns
// 2 to 11 the discharge at that stage plus 0.00 to 0.09, every other row
// shaded for reading across. Rows of t whose stage is not on a hundredth
// are ignored.
func WriteLookupSheet(b *workbook.Book, name string, t rating.Table) error {
	cells := make([]LookupCell, len(t.Rows))
	for i, r := range t.Rows {
		cells[i] = LookupCell{Stage: r.Stage, Discharge: r.Discharge}
	}
	return WriteLookupCells(b, name, t.Units, cells)
}

// LookupCell is one value of a lookup sheet: the discharge at a stage on
// a hundredth, and whether the cell is marked (extrapolated, say).
type LookupCell struct {
	Stage, Discharge float64
	Marked           bool
}

// WriteLookupCells writes the lookup layout of WriteLookupSheet from
// cells in any order: one row per tenth of stage, ten columns for the
// hundredths, every other row shaded, marked cells in the marked style
// (Book.MarkStyle) whatever their row. A hundredth without a cell is
// blank; cells whose stage is not on a hundredth are ignored. u gives the
// stage unit.
func WriteLookupCells(b *workbook.Book, name string, u rating.Units, cells []LookupCell) error {
	L := u.Length()
	cols := []workbook.Column{{Name: "stage", Unit: L, Format: "0.0"}}
	for j := range 10 {
		cols = append(cols, workbook.Column{Name: fmt.Sprintf("+0.0%d", j), Format: workbook.FormatSig3, Width: 10})
	}
	q := map[int64]LookupCell{}
	lo, hi := int64(math.MaxInt64), int64(math.MinInt64)
	for _, c := range cells {
		k, ok := rating.Hundredths(c.Stage)
		if !ok {
			continue
		}
		q[k] = c
		lo, hi = min(lo, k), max(hi, k)
	}
	s, err := reportTitledTable(b, name, LookupTitle(u), cols)
	if err != nil {
		return err
	}
	if len(q) > 0 {
		first := floorDiv(lo, 10) * 10
		vals := make([]any, 11)
		for base := first; base <= hi; base += 10 {
			band := floorDiv(base, 10)%2 != 0 // shade every other row
			if err := lookupCell(b, &vals[0], float64(base)/100, true, "0.0", band); err != nil {
				return err
			}
			for j := int64(0); j < 10; j++ {
				c, ok := q[base+j]
				format := workbook.DecimalsFormat(workbook.Sig3Decimals(c.Discharge))
				if ok && c.Marked {
					id, err := b.MarkStyle(format)
					if err != nil {
						return err
					}
					vals[j+1] = workbook.Styled{Style: id, Value: c.Discharge}
					continue
				}
				if err := lookupCell(b, &vals[j+1], c.Discharge, ok, format, band); err != nil {
					return err
				}
			}
			if err := s.Row(vals...); err != nil {
				return err
			}
		}
	}
	return s.Flush()
}

// LookupTitle is the title line of a lookup sheet: what its cells hold,
// in which unit, and how to read them.
func LookupTitle(u rating.Units) string {
	return fmt.Sprintf("discharge (%s) at each stage: the stage (%s) of the row plus the hundredths at the head of the column",
		u.Discharge(), u.Length())
}

// lookupCell sets *dst to a lookup value (ok) or a blank, on the band
// colour when band is set.
func lookupCell(b *workbook.Book, dst *any, v float64, ok bool, format string, band bool) error {
	if !band {
		*dst = nil
		if ok {
			*dst = v
		}
		return nil
	}
	id, err := b.BandStyle(format)
	if err != nil {
		return err
	}
	if ok {
		*dst = workbook.Styled{Style: id, Value: v}
	} else {
		*dst = workbook.Styled{Style: id, Value: nil}
	}
	return nil
}

func floorDiv(a, b int64) int64 {
	q := a / b
	if (a%b != 0) && ((a < 0) != (b < 0)) {
		q--
	}
	return q
}

// subsectionColumns are the columns of a subsection sheet: first names
// where the subsection is (a stage, a section), then its number, region,
// stations, n and hydraulics.
func subsectionColumns(first workbook.Column, u rating.Units) []workbook.Column {
	L := u.Length()
	return []workbook.Column{
		first,
		{Name: "subsection", Format: "0"},
		{Name: "region", Width: 15},
		{Name: "from_station", Unit: L, Format: "0.00"},
		{Name: "to_station", Unit: L, Format: "0.00"},
		{Name: "n", Format: "0.000"},
		{Name: "area", Unit: u.Area(), Format: workbook.FormatSig3},
		{Name: "wetted_perimeter", Unit: L, Format: "0.00"},
		{Name: "top_width", Unit: L, Format: "0.00"},
		{Name: "conveyance", Unit: u.Conveyance(), Format: workbook.FormatSig3},
		{Name: "discharge", Unit: u.Discharge(), Format: workbook.FormatSig3},
		{Name: "velocity", Unit: u.Velocity(), Format: "0.00"},
	}
}

// WriteSubsectionSheet writes one row per stage and subsection.
func WriteSubsectionSheet(b *workbook.Book, name string, t rating.Table) error {
	u := t.Units
	L := u.Length()
	s, err := reportTable(b, name, subsectionColumns(workbook.Column{Name: "stage", Unit: L, Format: "0.000"}, u))
	if err != nil {
		return err
	}
	for _, r := range t.Rows {
		if err := writeSubsectionRows(s, r.Stage, r.Subs); err != nil {
			return err
		}
	}
	return s.Flush()
}

// writeSubsectionRows writes the subsections of one stage or section as
// rows of subsectionColumns, each after key (the stage, or the section's
// id) and numbered from 1.
func writeSubsectionRows(s *reportSheet, key any, subs []rating.SubRow) error {
	for i, sr := range subs {
		if err := s.Row(key, i+1, sr.Region.String(), sr.From, sr.To, sr.N,
			sr.Area, sr.WettedPerimeter, sr.TopWidth, sr.Conveyance, sr.Discharge, sr.Velocity); err != nil {
			return err
		}
	}
	return nil
}

// SummaryColumns returns the columns of a summary sheet: item, value, unit.
func SummaryColumns() []workbook.Column {
	return []workbook.Column{
		{Name: "item", Width: 34},
		{Name: "value", Width: 70},
		{Name: "unit", Width: 10},
	}
}

// SummaryItem is one row of a summary sheet. Value is a string, a number
// (shown as written; a Styled value keeps its own format) or nil.
type SummaryItem struct {
	Item  string
	Value any
	Unit  string
}

// WriteSummarySheet writes a summary sheet (SummaryColumns()): the items in
// order, then one row per warning ("warnings: none" when there are none),
// then the caution (rating.Caution), which every report carries. Items whose
// value is "" or nil are left out. A number is stored as the reports write
// it (reportedCell): a length when the item's unit is one.
func WriteSummarySheet(b *workbook.Book, name string, items []SummaryItem, warnings []string) error {
	s, err := b.Table(name, SummaryColumns())
	if err != nil {
		return err
	}
	ls, err := b.LabelStyle()
	if err != nil {
		return err
	}
	ws, err := b.WrapStyle()
	if err != nil {
		return err
	}
	row := func(it SummaryItem) error {
		if it.Value == nil || it.Value == "" {
			return nil
		}
		v := reportedCell(it.Value, isLengthUnit(it.Unit))
		if str, ok := v.(string); ok {
			v = workbook.Styled{Style: ws, Value: str}
		}
		return s.Row(workbook.Styled{Style: ls, Value: it.Item}, v, it.Unit)
	}
	for _, it := range items {
		if err := row(it); err != nil {
			return err
		}
	}
	if len(warnings) == 0 {
		if err := row(SummaryItem{"warnings", "none", ""}); err != nil {
			return err
		}
	}
	for _, w := range warnings {
		if err := row(SummaryItem{"warning", w, ""}); err != nil {
			return err
		}
	}
	if err := row(SummaryItem{"caution", rating.Caution, ""}); err != nil {
		return err
	}
	return s.Flush()
}

// writeSummary writes the summary sheet of a results workbook.
func writeSummary(b *workbook.Book, rep rating.RatingReport) error {
	t := rep.Table
	u := t.Units
	items := []SummaryItem{
		{"section", t.Name, ""},
		{"survey", rep.Ground.Source, ""},
		{"program", programName(rep.Provenance), ""},
		{"method", "Manning's equation by subsection, conveyance summed (Chow, 1959)", ""},
		{"units", fmt.Sprintf("%s: length %s, discharge %s", u, u.Length(), u.Discharge()), ""},
		{"friction slope", t.Slope, u.Length() + "/" + u.Length()},
		{"site", rep.Provenance.Site.String(), ""},
		{"stages", stagesWords(t), ""},
		{"lowest ground", t.Bottom, u.Length()},
		{"lower end of the section", t.Top, u.Length()},
	}
	if l, r, ok := subdivide.ChannelLimits(t.Subsections); ok {
		items = append(items, SummaryItem{"main channel between banks", fmt.Sprintf("stations %s to %s", FormatLength(l), FormatLength(r)), u.Length()})
	} else {
		items = append(items, SummaryItem{"main channel between banks", "no banks: the whole section is channel", ""})
	}
	for i, sub := range t.Subsections {
		items = append(items, SummaryItem{fmt.Sprintf("n, subsection %d (%s, stations %s to %s)", i+1, sub.Region, FormatLength(sub.From), FormatLength(sub.To)), sub.N, ""})
	}
	if c := rep.Calibration; c != nil {
		which := "every n"
		if c.ChannelOnly {
			which = "the channel's n"
		}
		var err error
		num := func(format string, v float64) any { return b.NumberOnce(format, v, &err) }
		items = append(items,
			SummaryItem{"n calibrated on", fmt.Sprintf("%s in %s: %s multiplied by the factor below", rating.Counted(c.Gaugings, "gauging", "gaugings"), c.Source, which), ""},
			SummaryItem{"calibration factor on n", num("0.0000", c.Factor), ""},
			SummaryItem{"standard error of the factor", num("0.00", c.FactorStandardErrorPercent), "%"},
			SummaryItem{"standard error of estimate of the calibrated rating against the gaugings", num("0.00", c.StandardErrorPercent), "%"})
		if err != nil {
			return err
		}
	}
	if lo, hi, ok := t.Extremes(); ok {
		q, err := b.Sig3(hi.Discharge)
		if err != nil {
			return err
		}
		items = append(items,
			SummaryItem{"stages rated", fmt.Sprintf("%d, from %.3f to %.3f", len(t.Rows), lo.Stage, hi.Stage), u.Length()},
			SummaryItem{"discharge at the highest stage", q, u.Discharge()})
	}
	bank, err := bankfullItems(b, rep)
	if err != nil {
		return err
	}
	items = append(items, bank...)
	if len(rep.Lookup.Rows) > 0 {
		items = append(items, SummaryItem{"lookup sheet", "discharge at every hundredth of stage, each computed at that stage (not interpolated)", ""})
	}
	return WriteSummarySheet(b, SheetSummary, append(items, inputNoteItems(rep.Provenance)...), rep.Warnings)
}

// newBook starts a results workbook of a kind of report ("rating",
// "fit", ...) whose printed pages carry its title (BookTitle) at the head
// and the caution at the foot.
func newBook(kind string, site rating.Site, key string) *workbook.Book {
	b := workbook.NewBook()
	b.Title, b.Footer, b.Words = BookTitle(kind, site, key), rating.Caution, true
	return b
}

// finishBook ends a results workbook: it adds the plots sheet with the
// report's figures when there are any (none: no plots sheet) and writes
// the book to w.
func finishBook(w io.Writer, b *workbook.Book, figs []rating.Figure) error {
	if len(figs) > 0 {
		if err := b.Pictures(SheetPlots, pictures(figs)); err != nil {
			return err
		}
	}
	return b.Write(w)
}

// writeSheets writes sheets of a results workbook in order, each by its
// function of the report, and stops at the first that fails.
func writeSheets[R any](b *workbook.Book, rep R, sheets ...func(*workbook.Book, R) error) error {
	for _, write := range sheets {
		if err := write(b, rep); err != nil {
			return err
		}
	}
	return nil
}

// BookTitle is the title printed at the head of every page of a results
// workbook of a kind of report: "wetline KIND: " and the site's name when
// one is known (given with --site or read from an input's site key), else
// key (the section, reach or file the report is of); "wetline KIND" when
// neither is known.
func BookTitle(kind string, site rating.Site, key string) string {
	title := "wetline " + kind
	switch {
	case site.Name != "":
		return title + ": " + site.Name
	case key != "":
		return title + ": " + key
	}
	return title
}

// stagesWords says what a table's stages are.
func stagesWords(t rating.Table) string {
	if t.GaugeHeights {
		return fmt.Sprintf("gauge heights: elevation = gauge height %s %s", rating.DatumTerm(t.Datum), t.Units.Length())
	}
	return "elevations in the survey's datum"
}
