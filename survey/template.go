package survey

import (
	"fmt"
	"io"
	"strconv"
	"strings"

	"wetline/rating"
	"wetline/survey/workbook"
)

// TemplateOptions shape a blank field workbook. The zero value gives
// DefaultTemplateSections cross-section sheets in SI units.
type TemplateOptions struct {
	// Sections is the number of cross-section sheets, 1 to
	// MaxTemplateSections (0 = DefaultTemplateSections).
	Sections int
	// Units names the units in the headers and instructions.
	Units rating.Units
	// Rows is the number of rows below each header that carry validation
	// rules (0 = DefaultTemplateRows); a prefilled sheet gets at least as
	// many as it has points.
	Rows int
	// Surveys prefill the first cross-section sheets, one survey each
	// (points, n, bank marks, labels, notes), for a crew to check or
	// re-survey. A sheet is named after its section when that is a usable
	// sheet name, else XS-i. There are max(Sections, len(Surveys)) sheets.
	Surveys []Survey
}

// Template defaults and bounds.
const (
	DefaultTemplateSections = 3
	MaxTemplateSections     = 50
	DefaultTemplateRows     = 500
	MaxTemplateRows         = 100_000
)

// Sheet names of a field workbook besides the cross-sections.
const (
	FieldSheetReach        = "reach"
	FieldSheetGaugings     = "gaugings"
	FieldSheetInstructions = "instructions"
)

// SectionSheetName names the i-th (1-based) cross-section sheet: "XS-1".
func SectionSheetName(i int) string { return fmt.Sprintf("XS-%d", i) }

// SuggestedMarks returns the labels offered in the mark column's
// drop-down list. Only
// MarkBank means anything to the reader; any other label may be typed and
// is kept with the point.
func SuggestedMarks() []string {
	return []string{MarkBank, "thalweg", "water edge", "pin", "high-water mark"}
}

// Bounds of the template's numeric validation rules. They catch typing
// slips (a missing decimal point), not unusual sites.
const (
	templateCoordMax = 1e6   // |station|, |elevation|, |distance| in m or ft
	templateNMin     = 0.005 // lowest Manning's n accepted without a warning
	templateNMax     = 1.0   // highest Manning's n accepted without a warning
	excelSerialMax   = 2958465
)

// WriteTemplate writes a blank field workbook to w: cross-section sheets
// XS-1 … XS-n (station, elevation, n, mark, note), a reach sheet (section,
// survey, distance, ws_left, ws_right, quality, note), a gaugings sheet
// (time, stage, discharge, quality, note) and an instructions sheet, on
// which the workbook opens. Headers are in row 1, styled and frozen, with
// units in brackets; cells below carry validation rules and drop-down
// lists. Every sheet reads back through ReadTable.
func WriteTemplate(w io.Writer, opt TemplateOptions) error {
	if opt.Sections == 0 {
		opt.Sections = DefaultTemplateSections
	}
	if opt.Rows == 0 {
		opt.Rows = DefaultTemplateRows
	}
	opt.Sections = max(opt.Sections, len(opt.Surveys))
	if opt.Sections < 1 || opt.Sections > MaxTemplateSections {
		return fmt.Errorf("template: %d cross-sections: want 1 to %d", opt.Sections, MaxTemplateSections)
	}
	if opt.Rows < 1 || opt.Rows > MaxTemplateRows {
		return fmt.Errorf("template: %d rows: want 1 to %d", opt.Rows, MaxTemplateRows)
	}
	b := workbook.NewBook()
	defer b.Close()
	b.Title = "wetline field workbook"
	b.Footer = rating.Caution
	names := sectionSheetNames(opt)
	for i, name := range names {
		var data [][]any
		if i < len(opt.Surveys) {
			data = surveyRows(opt.Surveys[i])
		}
		if err := b.InputSheet(name, sectionColumns(opt.Units), max(opt.Rows, len(data)), data); err != nil {
			return err
		}
	}
	if err := b.InputSheet(FieldSheetReach, reachColumns(opt.Units), opt.Rows, nil); err != nil {
		return err
	}
	if err := b.InputSheet(FieldSheetGaugings, gaugingColumns(opt.Units), opt.Rows, nil); err != nil {
		return err
	}
	if err := instructionSheet(b, opt, names); err != nil {
		return err
	}
	if err := b.Finish(workbook.Properties{
		Title:       "wetline field workbook",
		Subject:     "cross-section survey, high-water marks and gaugings",
		Description: rating.Caution,
	}, FieldSheetInstructions); err != nil {
		return err
	}
	return b.Write(w)
}

// sectionSheetNames names the cross-section sheets: a prefilled sheet
// after its section when possible, others XS-i; all distinct.
func sectionSheetNames(opt TemplateOptions) []string {
	used := map[string]bool{
		strings.ToLower(FieldSheetReach): true, strings.ToLower(FieldSheetGaugings): true,
		strings.ToLower(FieldSheetInstructions): true,
		"history":                               true, // reserved by spreadsheet programs
	}
	names := make([]string, opt.Sections)
	for i := range names {
		if i < len(opt.Surveys) {
			if n := opt.Surveys[i].Section.Name; usableSheetName(n) && !used[strings.ToLower(n)] {
				names[i] = n
				used[strings.ToLower(n)] = true
			}
		}
	}
	k := 1
	for i := range names {
		for names[i] == "" {
			if n := SectionSheetName(k); !used[strings.ToLower(n)] {
				names[i] = n
				used[strings.ToLower(n)] = true
			}
			k++
		}
	}
	return names
}

// usableSheetName reports whether s can name a sheet: 1 to 31 characters,
// none of : \ / ? * [ ], not starting or ending with an apostrophe.
func usableSheetName(s string) bool {
	n := len([]rune(s))
	return n > 0 && n <= 31 && !strings.ContainsAny(s, ":\\/?*[]") &&
		!strings.HasPrefix(s, "'") && !strings.HasSuffix(s, "'")
}

// surveyRows lays out a survey as rows of a cross-section sheet: station,
// elevation, n of the segment to the next point (blank on the last),
// mark (bank on the first point at each bank station, else the label)
// and note.
func surveyRows(sv Survey) [][]any {
	sec := sv.Section
	rows := make([][]any, len(sec.Points))
	leftDone, rightDone := false, false
	for i, p := range sec.Points {
		var n any
		if i < len(sec.N) {
			n = sec.N[i]
		}
		mark := ""
		if i < len(sv.Labels) {
			mark = sv.Labels[i]
		}
		switch {
		case sec.HasBanks && !leftDone && p.Station == sec.LeftBank:
			mark, leftDone = MarkBank, true
		case sec.HasBanks && !rightDone && p.Station == sec.RightBank:
			mark, rightDone = MarkBank, true
		}
		note := ""
		if i < len(sv.Notes) {
			note = sv.Notes[i]
		}
		rows[i] = []any{p.Station, p.Elevation, n, mark, note}
	}
	return rows
}

// decimalRule accepts numbers from lo to hi, refusing others when strict.
func decimalRule(lo, hi float64, strict bool, msg string) *workbook.Rule {
	return &workbook.Rule{Kind: workbook.Decimal, Lo: lo, Hi: hi, Strict: strict, Title: "check the number", Message: msg}
}

// plainNumber writes v without an exponent.
func plainNumber(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) }

// listRule offers items; a strict list refuses other text.
func listRule(items []string, strict bool, msg string) *workbook.Rule {
	return &workbook.Rule{Kind: workbook.List, Items: items, Strict: strict, Title: "choose from the list", Message: msg}
}

func sectionColumns(u rating.Units) []workbook.InputColumn {
	L := u.Length()
	coord := fmt.Sprintf("a number in %s between %s and %s, with a decimal point", L, plainNumber(-templateCoordMax), plainNumber(templateCoordMax))
	return []workbook.InputColumn{
		{Column: workbook.Column{Name: ColStation, Unit: L, Format: "0.00", Width: 13}, Rule: decimalRule(-templateCoordMax, templateCoordMax, true, coord), Help: "distance from the left pin, looking downstream; never decreasing"},
		{Column: workbook.Column{Name: ColElevation, Unit: L, Format: "0.000", Width: 15}, Rule: decimalRule(-templateCoordMax, templateCoordMax, true, coord), Help: "ground elevation above the gauge datum"},
		{Column: workbook.Column{Name: ColN, Format: "0.000", Width: 9}, Rule: decimalRule(templateNMin, templateNMax, false,
			fmt.Sprintf("Manning's n is usually between %g and %g: keep this value?", templateNMin, templateNMax)), Help: "Manning's n from this point to the next; blank repeats the value above"},
		{Column: workbook.Column{Name: ColMark, Format: workbook.FormatText, Width: 16}, Rule: listRule(SuggestedMarks(), false, ""), Help: "bank marks a main-channel limit (exactly two per section); any other label is kept"},
		{Column: workbook.Column{Name: ColNote, Format: workbook.FormatText, Width: 36}},
	}
}

func reachColumns(u rating.Units) []workbook.InputColumn {
	L := u.Length()
	coord := fmt.Sprintf("a number in %s, with a decimal point", L)
	return []workbook.InputColumn{
		{Column: workbook.Column{Name: ReachColumns()[0], Format: workbook.FormatText, Width: 12}, Help: "section id, e.g. XS-1"},
		{Column: workbook.Column{Name: ReachColumns()[1], Format: workbook.FormatText, Width: 16}, Help: "sheet (or file) holding the section's survey"},
		{Column: workbook.Column{Name: ReachColumns()[2], Unit: L, Format: "0.0", Width: 14}, Rule: decimalRule(-templateCoordMax, templateCoordMax, true, coord), Help: "distance downstream from the upstream-most section, along the channel"},
		{Column: workbook.Column{Name: ReachColumns()[3], Unit: L, Format: "0.000", Width: 14}, Rule: decimalRule(-templateCoordMax, templateCoordMax, true, coord), Help: "water-surface elevation from the high-water marks on the left bank"},
		{Column: workbook.Column{Name: ReachColumns()[4], Unit: L, Format: "0.000", Width: 14}, Rule: decimalRule(-templateCoordMax, templateCoordMax, true, coord), Help: "water-surface elevation from the high-water marks on the right bank"},
		{Column: workbook.Column{Name: ReachColumns()[5], Format: workbook.FormatText, Width: 12}, Rule: listRule(rating.QualityWords(), true, "quality: one of "+strings.Join(rating.QualityWords(), ", ")), Help: "how well the marks define the water surface"},
		{Column: workbook.Column{Name: ReachColumns()[6], Format: workbook.FormatText, Width: 36}},
	}
}

func gaugingColumns(u rating.Units) []workbook.InputColumn {
	L, Q := u.Length(), u.Discharge()
	return []workbook.InputColumn{
		{Column: workbook.Column{Name: GaugingColumns()[0], Format: workbook.FormatDateTime, Width: 18}, Rule: &workbook.Rule{Kind: workbook.Date, Lo: 1, Hi: excelSerialMax, Title: "check the date",
			Message: "a date and time such as 2026-03-14 09:30 (keep it if it is one)"}, Help: "date and time of the mid-point of the measurement"},
		{Column: workbook.Column{Name: GaugingColumns()[1], Unit: L, Format: "0.000", Width: 12}, Rule: decimalRule(-templateCoordMax, templateCoordMax, true,
			fmt.Sprintf("a gauge height in %s, with a decimal point", L)), Help: "mean gauge height during the measurement"},
		{Column: workbook.Column{Name: GaugingColumns()[2], Unit: Q, Format: "0.000", Width: 17}, Rule: decimalRule(0, 1e8, true,
			fmt.Sprintf("a discharge in %s, zero or more", Q)), Help: "measured discharge"},
		{Column: workbook.Column{Name: GaugingColumns()[3], Format: workbook.FormatText, Width: 12}, Rule: listRule(rating.QualityWords(), true, "quality: one of "+strings.Join(rating.QualityWords(), ", ")), Help: "measurement grade"},
		{Column: workbook.Column{Name: GaugingColumns()[4], Format: workbook.FormatText, Width: 36}},
	}
}

// instructionSheet writes the instructions: what goes where, in which units.
func instructionSheet(b *workbook.Book, opt TemplateOptions, names []string) error {
	u := opt.Units
	L, Q := u.Length(), u.Discharge()
	lines := [][2]string{
		{"this workbook", "Field sheets for one site: a cross-section survey per XS sheet, the reach and its high-water marks, and discharge measurements. " +
			"Fill the cream cells; keep the header row (row 1) as it is. Blank rows are skipped; extra columns to the right are kept but not read."},
		{"units", fmt.Sprintf("Lengths, stations and elevations in %s; discharge in %s; Manning's n as usual (the same number in every unit system). "+
			"Write numbers with a decimal point. Elevations and gauge heights refer to one datum: say which in a note.", L, Q)},
		{strings.Join(names, ", "), "One sheet per cross-section, points from the left end to the right end looking downstream. " +
			"station: distance from the left pin; it never decreases (no overhangs). elevation: ground elevation. " +
			"n: Manning's n of the ground from this point to the next (a blank repeats the value above). " +
			"mark: 'bank' on exactly the two points that bound the main channel; other labels (thalweg, pin, water edge, ...) are kept as labels. " +
			"Add sheets by copying one; the sheet name is the section's name."},
		{FieldSheetReach, "One row per section of a slope-area reach. section: its id; survey: the sheet (or file) with its survey; " +
			"distance: distance downstream from the upstream-most section along the channel; ws_left and ws_right: water-surface elevation " +
			"on each bank from the high-water marks; quality: " + strings.Join(rating.QualityWords(), ", ") + "."},
		{FieldSheetGaugings, "One row per discharge measurement. time: date and time (yyyy-mm-dd hh:mm, local time; state the zone in a note); " +
			"stage: mean gauge height; discharge: measured discharge; quality: the measurement's grade (" + strings.Join(rating.QualityWords(), ", ") + ")."},
		{"using it", "wetline rate field.xlsx --sheet XS-1 --slope 0.001 -o rating.xlsx rates the section on sheet XS-1."},
		{"caution", rating.Caution},
	}
	s, err := b.Table(FieldSheetInstructions, []workbook.Column{{Name: "topic", Width: 18}, {Name: "what to enter", Width: 110}})
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
	for _, l := range lines {
		if err := s.Row(workbook.Styled{Style: ls, Value: l[0]}, workbook.Styled{Style: ws, Value: l[1]}); err != nil {
			return err
		}
	}
	return s.Flush()
}

// WriteSurveySheet writes a survey as a table sheet with the columns of a
// field workbook's cross-section sheet (see WriteTemplate), readable by
// ReadSection. It lives here, beside the template, so that the
// two never disagree.
func WriteSurveySheet(b *workbook.Book, name string, sv Survey, u rating.Units) error {
	cols := sectionColumns(u)
	out := make([]workbook.Column, len(cols))
	for i, c := range cols {
		out[i] = c.Column
	}
	s, err := b.Table(name, out)
	if err != nil {
		return err
	}
	for _, r := range surveyRows(sv) {
		if err := s.Row(r...); err != nil {
			return err
		}
	}
	return s.Flush()
}
