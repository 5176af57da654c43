package survey

import (
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/xuri/excelize/v2"

	"wetline/rating"
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

// Column names of the reach and gaugings sheets of a field workbook, in
// order (matched case-insensitively, a bracketed unit after the name
// allowed). They are the contract between the field workbook and the
// commands reading it; add columns after them, never between.
var (
	FieldReachColumns   = []string{"section", "survey", "distance", "ws_left", "ws_right", "quality", "note"}
	FieldGaugingColumns = []string{"time", "stage", "discharge", "quality", "note"}
)

// FieldQualities are the grades of a gauging or a high-water mark, best
// first.
var FieldQualities = []string{"excellent", "good", "fair", "poor"}

// SuggestedMarks are offered in the mark column's drop-down list. Only
// MarkBank means anything to the reader; any other label may be typed and
// is kept with the point.
var SuggestedMarks = []string{MarkBank, "thalweg", "water edge", "pin", "high-water mark"}

// Bounds of the template's numeric validation rules. They catch typing
// slips (a missing decimal point), not unusual sites.
const (
	templateCoordMax = 1e6   // |station|, |elevation|, |distance| in m or ft
	templateNMin     = 0.005 // lowest Manning's n accepted without a warning
	templateNMax     = 1.0   // highest Manning's n accepted without a warning
	excelSerialMax   = 2958465
)

// templateColumn is a column of a field sheet with its validation rule.
type templateColumn struct {
	Column
	check func(dv *excelize.DataValidation) error // nil: no rule
	help  string                                  // input prompt
}

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
	b := NewBook()
	defer b.Close()
	b.Title = "wetline field workbook"
	names := sectionSheetNames(opt)
	for i, name := range names {
		var data [][]any
		if i < len(opt.Surveys) {
			data = surveyRows(opt.Surveys[i])
		}
		if err := fieldSheet(b, name, sectionColumns(opt.Units), max(opt.Rows, len(data)), data); err != nil {
			return err
		}
	}
	if err := fieldSheet(b, FieldSheetReach, reachColumns(opt.Units), opt.Rows, nil); err != nil {
		return err
	}
	if err := fieldSheet(b, FieldSheetGaugings, gaugingColumns(opt.Units), opt.Rows, nil); err != nil {
		return err
	}
	if err := instructionSheet(b, opt, names); err != nil {
		return err
	}
	f := b.File()
	idx, err := f.GetSheetIndex(FieldSheetInstructions)
	if err != nil {
		return err
	}
	f.SetActiveSheet(idx)
	if err := f.SetDocProps(&excelize.DocProperties{
		Title:       "wetline field workbook",
		Subject:     "cross-section survey, high-water marks and gaugings",
		Description: Caution,
	}); err != nil {
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

func decimalRule(lo, hi float64, style excelize.DataValidationErrorStyle, msg string) func(*excelize.DataValidation) error {
	return func(dv *excelize.DataValidation) error {
		if err := dv.SetRange(plainNumber(lo), plainNumber(hi), excelize.DataValidationTypeDecimal, excelize.DataValidationOperatorBetween); err != nil {
			return err
		}
		dv.SetError(style, "check the number", msg)
		return nil
	}
}

// plainNumber writes v as a formula constant without an exponent.
func plainNumber(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) }

func listRule(items []string, strict bool, msg string) func(*excelize.DataValidation) error {
	return func(dv *excelize.DataValidation) error {
		if err := dv.SetDropList(items); err != nil {
			return err
		}
		if strict {
			dv.SetError(excelize.DataValidationErrorStyleStop, "choose from the list", msg)
		}
		// Not strict: the list only suggests; any text is accepted.
		return nil
	}
}

func sectionColumns(u rating.Units) []templateColumn {
	L := u.Length()
	coord := fmt.Sprintf("a number in %s between %s and %s, with a decimal point", L, plainNumber(-templateCoordMax), plainNumber(templateCoordMax))
	return []templateColumn{
		{Column{Name: ColStation, Unit: L, Format: "0.00", Width: 13},
			decimalRule(-templateCoordMax, templateCoordMax, excelize.DataValidationErrorStyleStop, coord),
			"distance from the left pin, looking downstream; never decreasing"},
		{Column{Name: ColElevation, Unit: L, Format: "0.000", Width: 15},
			decimalRule(-templateCoordMax, templateCoordMax, excelize.DataValidationErrorStyleStop, coord),
			"ground elevation above the gauge datum"},
		{Column{Name: ColN, Format: "0.000", Width: 9},
			decimalRule(templateNMin, templateNMax, excelize.DataValidationErrorStyleWarning,
				fmt.Sprintf("Manning's n is usually between %g and %g: keep this value?", templateNMin, templateNMax)),
			"Manning's n from this point to the next; blank repeats the value above"},
		{Column{Name: ColMark, Format: FormatText, Width: 16},
			listRule(SuggestedMarks, false, ""),
			"bank marks a main-channel limit (exactly two per section); any other label is kept"},
		{Column{Name: ColNote, Format: FormatText, Width: 36}, nil, ""},
	}
}

func reachColumns(u rating.Units) []templateColumn {
	L := u.Length()
	coord := fmt.Sprintf("a number in %s, with a decimal point", L)
	return []templateColumn{
		{Column{Name: FieldReachColumns[0], Format: FormatText, Width: 12}, nil, "section id, e.g. XS-1"},
		{Column{Name: FieldReachColumns[1], Format: FormatText, Width: 16}, nil, "sheet (or file) holding the section's survey"},
		{Column{Name: FieldReachColumns[2], Unit: L, Format: "0.0", Width: 14},
			decimalRule(-templateCoordMax, templateCoordMax, excelize.DataValidationErrorStyleStop, coord),
			"distance downstream from the upstream-most section, along the channel"},
		{Column{Name: FieldReachColumns[3], Unit: L, Format: "0.000", Width: 14},
			decimalRule(-templateCoordMax, templateCoordMax, excelize.DataValidationErrorStyleStop, coord),
			"water-surface elevation from the high-water marks on the left bank"},
		{Column{Name: FieldReachColumns[4], Unit: L, Format: "0.000", Width: 14},
			decimalRule(-templateCoordMax, templateCoordMax, excelize.DataValidationErrorStyleStop, coord),
			"water-surface elevation from the high-water marks on the right bank"},
		{Column{Name: FieldReachColumns[5], Format: FormatText, Width: 12},
			listRule(FieldQualities, true, "quality: one of "+strings.Join(FieldQualities, ", ")),
			"how well the marks define the water surface"},
		{Column{Name: FieldReachColumns[6], Format: FormatText, Width: 36}, nil, ""},
	}
}

func gaugingColumns(u rating.Units) []templateColumn {
	L, Q := u.Length(), u.Discharge()
	return []templateColumn{
		{Column{Name: FieldGaugingColumns[0], Format: FormatDateTime, Width: 18},
			func(dv *excelize.DataValidation) error {
				if err := dv.SetRange(1, excelSerialMax, excelize.DataValidationTypeDate, excelize.DataValidationOperatorBetween); err != nil {
					return err
				}
				dv.SetError(excelize.DataValidationErrorStyleWarning, "check the date",
					"a date and time such as 2026-03-14 09:30 (keep it if it is one)")
				return nil
			},
			"date and time of the mid-point of the measurement"},
		{Column{Name: FieldGaugingColumns[1], Unit: L, Format: "0.000", Width: 12},
			decimalRule(-templateCoordMax, templateCoordMax, excelize.DataValidationErrorStyleStop,
				fmt.Sprintf("a gauge height in %s, with a decimal point", L)),
			"mean gauge height during the measurement"},
		{Column{Name: FieldGaugingColumns[2], Unit: Q, Format: "0.000", Width: 17},
			decimalRule(0, 1e8, excelize.DataValidationErrorStyleStop,
				fmt.Sprintf("a discharge in %s, zero or more", Q)),
			"measured discharge"},
		{Column{Name: FieldGaugingColumns[3], Format: FormatText, Width: 12},
			listRule(FieldQualities, true, "quality: one of "+strings.Join(FieldQualities, ", ")),
			"measurement grade"},
		{Column{Name: FieldGaugingColumns[4], Format: FormatText, Width: 36}, nil, ""},
	}
}

// InputStyle returns the id of the style of cells a crew fills in: a
// number format code ("" for General) on the input colour.
func (b *Book) InputStyle(format string) (int, error) {
	return b.style("input:"+format, func() *excelize.Style {
		st := &excelize.Style{Fill: excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{colourInputFill}}}
		if format != "" {
			f := format
			st.CustomNumFmt = &f
		}
		return st
	})
}

// fieldSheet writes a sheet with a styled, frozen header in row 1,
// input-coloured columns, a validation rule per column on rows
// 2 … rows+1, and data (if any) from row 2.
func fieldSheet(b *Book, name string, cols []templateColumn, rows int, data [][]any) error {
	if err := b.NewSheet(name); err != nil {
		return err
	}
	f := b.File()
	hs, err := b.HeaderStyle()
	if err != nil {
		return err
	}
	for i, c := range cols {
		col, err := excelize.ColumnNumberToName(i + 1)
		if err != nil {
			return err
		}
		is, err := b.InputStyle(c.Format)
		if err != nil {
			return err
		}
		if err := f.SetColStyle(name, col, is); err != nil {
			return err
		}
		if err := f.SetColWidth(name, col, col, c.Width); err != nil {
			return err
		}
		if err := f.SetCellValue(name, col+"1", c.Header()); err != nil {
			return err
		}
		if err := f.SetCellStyle(name, col+"1", col+"1", hs); err != nil {
			return err
		}
		if c.check == nil {
			continue
		}
		dv := excelize.NewDataValidation(true)
		dv.Sqref = fmt.Sprintf("%s2:%s%d", col, col, rows+1)
		if err := c.check(dv); err != nil {
			return fmt.Errorf("%s column %s: %w", name, c.Name, err)
		}
		if c.help != "" {
			dv.SetInput(c.Name, c.help)
		}
		if err := f.AddDataValidation(name, dv); err != nil {
			return err
		}
	}
	for i, r := range data {
		if err := f.SetSheetRow(name, "A"+strconv.Itoa(i+2), &r); err != nil {
			return err
		}
	}
	if err := b.printSetup(name); err != nil {
		return err
	}
	if err := f.SetRowHeight(name, 1, 30); err != nil {
		return err
	}
	return f.SetPanes(name, &excelize.Panes{Freeze: true, YSplit: 1, TopLeftCell: "A2", ActivePane: "bottomLeft"})
}

// instructionSheet writes the instructions: what goes where, in which units.
func instructionSheet(b *Book, opt TemplateOptions, names []string) error {
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
			"on each bank from the high-water marks; quality: " + strings.Join(FieldQualities, ", ") + "."},
		{FieldSheetGaugings, "One row per discharge measurement. time: date and time (yyyy-mm-dd hh:mm, local time; state the zone in a note); " +
			"stage: mean gauge height; discharge: measured discharge; quality: the measurement's grade (" + strings.Join(FieldQualities, ", ") + ")."},
		{"using it", "wetline rate field.xlsx --sheet XS-1 --slope 0.001 -o rating.xlsx rates the section on sheet XS-1."},
		{"caution", Caution},
	}
	s, err := b.Table(FieldSheetInstructions, []Column{{Name: "topic", Width: 18}, {Name: "what to enter", Width: 110}})
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
		if err := s.Row(Styled{ls, l[0]}, Styled{ws, l[1]}); err != nil {
			return err
		}
	}
	return s.Flush()
}
