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
	// (points, n, bank marks, labels, notes, and its Site in the site
	// block), for a crew to check or re-survey; their headers' units must
	// be Units. A sheet is named after its section when that is a usable
	// sheet name, else XS-i. There are max(Sections, len(Surveys)) sheets.
	Surveys []Survey
	// Site fills the site blocks: every field it gives (a name, a date)
	// is written on every sheet with a site block, over what a prefilled
	// survey says of it; its blank fields leave the survey's.
	Site rating.Site
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
	// FieldSheetCoordinates is the blank cross-section sheet for a survey
	// by eastings and northings (total station or GNSS).
	FieldSheetCoordinates  = "coordinates"
	FieldSheetReach        = "reach"
	FieldSheetGaugings     = "gaugings"
	FieldSheetInstructions = "instructions"
)

// SectionHeaderRow is the 1-based row of the column headers on the field
// workbook's cross-section, coordinate and gaugings sheets: below the site
// block, which holds one key row per metadata key (MetaKeys), data from
// the row after. The reach sheet has its headers in row 1.
const SectionHeaderRow = 6

// SectionSheetName names the i-th (1-based) cross-section sheet: "XS-1".
func SectionSheetName(i int) string { return fmt.Sprintf("XS-%d", i) }

// SuggestedMarks returns the labels offered in the mark column's
// drop-down list of a cross-section sheet. Only a bank mark (MarkBank, or
// another of BankWords) means anything to the reader; any other label may
// be typed and is kept with the point.
func SuggestedMarks() []string {
	return []string{MarkBank, "thalweg", "water edge", "pin", "high-water mark"}
}

// Bounds of the template's numeric validation rules. They catch typing
// slips (a missing decimal point), not unusual sites. Stations, distances
// and flow lengths are bounded by MaxCoordinate, elevations (ground,
// high-water marks, gauge heights) by MaxElevation and times by MaxYear,
// the limits the readers refuse beyond, so that every survey the readers
// take can be prefilled.
const (
	templateNMin = 0.005 // lowest Manning's n accepted without a warning
	templateNMax = 1.0   // highest Manning's n accepted without a warning
)

// templateTimeMax is the date serial of the last second of MaxYear
// (2200-12-31T23:59:59, serial 109 940 less a second): the days from
// serial 0 (1899-12-30) to the first day after MaxYear, less a second.
func templateTimeMax() float64 {
	return float64(daysFromCivil(MaxYear+1, 1, 1)-daysFromCivil(1899, 12, 30)) - 1.0/86400
}

// WriteTemplate writes a blank field workbook to w: cross-section sheets
// XS-1 … XS-n (station, elevation, n, mark, note), a coordinate sheet
// (easting, northing, elevation, n, mark, note), a reach sheet (section,
// survey, distance, ws_left, ws_right, quality, the flow lengths
// left_length, channel_length, right_length, structure, note), a gaugings
// sheet (time, stage, discharge, quality, uncertainty, exclude, note) and
// an instructions sheet, on which the workbook opens. The cross-section,
// coordinate and gaugings sheets start with a site block, a key and a
// value per row for each of MetaKeys (filled from a prefilled survey's
// Site, or from Site), with their headers below it in SectionHeaderRow;
// the reach sheet has its headers in row 1. Headers are styled and frozen, with
// units in brackets; cells below carry validation rules and drop-down
// lists. Every sheet reads back through ReadTable, the cross-section and
// coordinate sheets through ReadSection with their site in Survey.Site,
// the gaugings sheet through ReadGaugings with its site in Gaugings.Site.
// A prefilled survey whose headers name a unit system other than Units is
// refused (ErrUnitsDisagree).
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
	for _, sv := range opt.Surveys {
		if _, err := sv.Units.Resolve(opt.Units, true); err != nil {
			return err
		}
	}
	b := workbook.NewBook()
	defer b.Close()
	b.Title = "wetline field workbook"
	b.Footer = rating.Caution
	names := sectionSheetNames(opt)
	for i, name := range names {
		var data [][]any
		site := opt.Site
		if i < len(opt.Surveys) {
			data = surveyRows(opt.Surveys[i])
			site = opt.Site.Merge(opt.Surveys[i].Site)
		}
		if err := b.KeyedInputSheet(name, siteRows(site), sectionColumns(opt.Units), max(opt.Rows, len(data)), data); err != nil {
			return err
		}
	}
	if err := b.KeyedInputSheet(FieldSheetCoordinates, siteRows(opt.Site), coordinateSheetColumns(opt.Units), opt.Rows, nil); err != nil {
		return err
	}
	if err := b.InputSheet(FieldSheetReach, reachColumns(opt.Units), opt.Rows, nil); err != nil {
		return err
	}
	if err := b.KeyedInputSheet(FieldSheetGaugings, siteRows(opt.Site), gaugingColumns(opt.Units), opt.Rows, nil); err != nil {
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

// siteValues returns a site's values by metadata key (see MetaKeys).
func siteValues(s rating.Site) map[string]string {
	return map[string]string{MetaSite: s.Name, MetaSiteID: s.ID, MetaSurveyed: s.Surveyed, MetaDatum: s.Datum, MetaCrew: s.Crew}
}

// siteHelp returns the prompt shown on a metadata key's value cell.
func siteHelp(key string) string {
	switch key {
	case MetaSite:
		return "the site's name: river and place"
	case MetaSiteID:
		return "the number or code the site is filed under"
	case MetaSurveyed:
		return "date of the survey, yyyy-mm-dd (kept as text)"
	case MetaDatum:
		return "the datum of the elevations: benchmark and its elevation, or the gauge datum"
	case MetaCrew:
		return "who surveyed, and with which instrument"
	}
	return ""
}

// siteRows are the key rows of a site block: each of MetaKeys with the
// site's value and its prompt.
func siteRows(s rating.Site) []workbook.KeyRow {
	values := siteValues(s)
	var rows []workbook.KeyRow
	for _, k := range MetaKeys() {
		rows = append(rows, workbook.KeyRow{Key: k, Value: values[k], Help: siteHelp(k)})
	}
	return rows
}

// sectionSheetNames names the cross-section sheets: a prefilled sheet
// after its section when possible, others XS-i; all distinct.
func sectionSheetNames(opt TemplateOptions) []string {
	used := map[string]bool{
		strings.ToLower(FieldSheetReach): true, strings.ToLower(FieldSheetGaugings): true,
		strings.ToLower(FieldSheetInstructions): true, strings.ToLower(FieldSheetCoordinates): true,
		"history": true, // reserved by spreadsheet programs
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
	coord := fmt.Sprintf("a number in %s between %s and %s, with a decimal point", L, plainNumber(-MaxCoordinate), plainNumber(MaxCoordinate))
	return []workbook.InputColumn{
		{Column: workbook.Column{Name: ColStation, Unit: L, Format: "0.00##", Width: 13}, Rule: decimalRule(-MaxCoordinate, MaxCoordinate, true, coord), Help: "distance from the left pin, looking downstream; never decreasing"},
		elevationColumn(L, "ground elevation on the survey's datum (named in the site block)"),
		{Column: workbook.Column{Name: ColN, Format: "0.000#", Width: 9}, Rule: decimalRule(templateNMin, templateNMax, false,
			fmt.Sprintf("Manning's n is usually between %g and %g: keep this value?", templateNMin, templateNMax)), Help: "Manning's n from this point to the next; blank repeats the value above"},
		{Column: workbook.Column{Name: ColMark, Format: workbook.FormatText, Width: 16}, Rule: listRule(SuggestedMarks(), false, ""), Help: "bank, or another bank word of the instructions sheet, marks a main-channel limit (exactly two per section); any other label is kept"},
		{Column: workbook.Column{Name: ColNote, Format: workbook.FormatText, Width: 36}},
	}
}

// elevationRule accepts an elevation in unit L within ±MaxElevation, the
// bound ReadSection and ReadGaugings refuse beyond.
func elevationRule(L, what string) *workbook.Rule {
	return decimalRule(-MaxElevation, MaxElevation, true,
		fmt.Sprintf("%s in %s between %s and %s, with a decimal point", what, L, plainNumber(-MaxElevation), plainNumber(MaxElevation)))
}

// elevationColumn is the elevation column of a cross-section or coordinate
// sheet in unit L, with its prompt.
func elevationColumn(L, help string) workbook.InputColumn {
	return workbook.InputColumn{Column: workbook.Column{Name: ColElevation, Unit: L, Format: "0.000#", Width: 15},
		Rule: elevationRule(L, "an elevation on the survey's datum"), Help: help}
}

// coordinateSheetColumns are the columns of the coordinate sheet: a
// survey by eastings and northings, read as ReadSection projects it.
func coordinateSheetColumns(u rating.Units) []workbook.InputColumn {
	L := u.Length()
	grid := fmt.Sprintf("a grid coordinate in %s between %s and %s, with a decimal point", L, plainNumber(-MaxCoordinate), plainNumber(MaxCoordinate))
	return []workbook.InputColumn{
		{Column: workbook.Column{Name: ColEasting, Unit: L, Format: "0.000#", Width: 15}, Rule: decimalRule(-MaxCoordinate, MaxCoordinate, true, grid), Help: "grid easting of the point"},
		{Column: workbook.Column{Name: ColNorthing, Unit: L, Format: "0.000#", Width: 15}, Rule: decimalRule(-MaxCoordinate, MaxCoordinate, true, grid), Help: "grid northing of the point"},
		elevationColumn(L, "ground elevation on the survey's datum (named in the site block)"),
		{Column: workbook.Column{Name: ColN, Format: "0.000#", Width: 9}, Rule: decimalRule(templateNMin, templateNMax, false,
			fmt.Sprintf("Manning's n is usually between %g and %g: keep this value?", templateNMin, templateNMax)), Help: "Manning's n from this point to the next point surveyed; blank repeats the value above"},
		{Column: workbook.Column{Name: ColMark, Format: workbook.FormatText, Width: 16}, Rule: listRule(SuggestedCoordinateMarks(), false, ""),
			Help: "left pin and right pin: the end pins of the section line, left and right looking downstream (one each); bank: a main-channel limit (two per section)"},
		{Column: workbook.Column{Name: ColNote, Format: workbook.FormatText, Width: 36}},
	}
}

// SuggestedCoordinateMarks returns the labels offered in the mark column
// of the coordinate sheet: the end pins (MarkLeftPin, MarkRightPin), which
// fix the section line and its left end, MarkBank, and labels kept with
// the point.
func SuggestedCoordinateMarks() []string {
	return []string{MarkLeftPin, MarkRightPin, MarkBank, "thalweg", "water edge", "high-water mark"}
}

// structureWords returns the words the reach sheet's structure column
// takes: exactly those the reach reader takes (StructureWords, then
// OpenChannelWords); a blank cell, an open channel, is taken too.
func structureWords() []string { return append(StructureWords(), OpenChannelWords()...) }

func reachColumns(u rating.Units) []workbook.InputColumn {
	L := u.Length()
	coord := fmt.Sprintf("a number in %s between %s and %s, with a decimal point", L, plainNumber(-MaxCoordinate), plainNumber(MaxCoordinate))
	length := fmt.Sprintf("a flow length in %s, more than zero and at most %s, with a decimal point", L, plainNumber(MaxCoordinate))
	lengthHelp := func(path string) string {
		return "length of the flow path along the " + path + " to the next section downstream; blank: the distance between the sections"
	}
	return []workbook.InputColumn{
		{Column: workbook.Column{Name: ReachColSection, Format: workbook.FormatText, Width: 12}, Help: "section id, e.g. XS-1"},
		{Column: workbook.Column{Name: ReachColSurvey, Format: workbook.FormatText, Width: 16}, Help: "sheet (or file) holding the section's survey"},
		{Column: workbook.Column{Name: ReachColDistance, Unit: L, Format: "0.0##", Width: 14}, Rule: decimalRule(-MaxCoordinate, MaxCoordinate, true, coord), Help: "distance downstream from the upstream-most section, along the channel"},
		{Column: workbook.Column{Name: ReachColWSLeft, Unit: L, Format: "0.000#", Width: 14}, Rule: elevationRule(L, "a water-surface elevation on the survey's datum"), Help: "water-surface elevation from the high-water marks on the left bank"},
		{Column: workbook.Column{Name: ReachColWSRight, Unit: L, Format: "0.000#", Width: 14}, Rule: elevationRule(L, "a water-surface elevation on the survey's datum"), Help: "water-surface elevation from the high-water marks on the right bank"},
		{Column: workbook.Column{Name: ReachColQuality, Format: workbook.FormatText, Width: 12}, Rule: qualityRule(), Help: "how well the marks define the water surface"},
		{Column: workbook.Column{Name: ReachColLeftLength, Unit: L, Format: "0.0##", Width: 16}, Rule: decimalRule(0, MaxCoordinate, true, length), Help: lengthHelp("left overbank")},
		{Column: workbook.Column{Name: ReachColChannelLength, Unit: L, Format: "0.0##", Width: 19}, Rule: decimalRule(0, MaxCoordinate, true, length), Help: lengthHelp("main channel")},
		{Column: workbook.Column{Name: ReachColRightLength, Unit: L, Format: "0.0##", Width: 17}, Rule: decimalRule(0, MaxCoordinate, true, length), Help: lengthHelp("right overbank")},
		{Column: workbook.Column{Name: ReachColStructure, Format: workbook.FormatText, Width: 12}, Rule: listRule(structureWords(), true, ErrStructureWord.Error()),
			Help: "blank or none for an open channel; bridge, culvert, weir or dam for a section at a structure: backwater refuses to compute flow through it and slopearea warns of it"},
		{Column: workbook.Column{Name: ColNote, Format: workbook.FormatText, Width: 36}},
	}
}

// qualityRule is the drop-down list of a quality column: every word
// rating.ParseQuality takes (rating.AcceptedQualityWords), others refused.
func qualityRule() *workbook.Rule {
	return listRule(rating.AcceptedQualityWords(), true, "quality: "+rating.QualityChoices())
}

// quoted writes words as the instructions list them: each in single
// quotes, joined by commas ('lb', 'rb'). Every list of the words a reader
// takes is written so, and only those: a test reads them back.
func quoted(words []string) string {
	q := make([]string, len(words))
	for i, w := range words {
		q[i] = "'" + w + "'"
	}
	return strings.Join(q, ", ")
}

// qualityText is what the instructions say a quality cell takes.
func qualityText() string {
	return quoted(rating.QualityWords()) + " (or " + quoted(rating.QualityLetters()) + "; any case; blank for none)"
}

// Bounds of the gaugings sheet's uncertainty rule. The reader takes
// percentages strictly between 0 and MaxUncertaintyPercent; a spreadsheet
// rule bounds a closed interval, so the rule's ends sit this far inside.
const templateOpenEnd = 1e-9 // percent

func gaugingColumns(u rating.Units) []workbook.InputColumn {
	L, Q := u.Length(), u.Discharge()
	return []workbook.InputColumn{
		{Column: workbook.Column{Name: ColGaugingTime, Format: workbook.FormatDateTime, Width: 18}, Rule: &workbook.Rule{Kind: workbook.Date, Lo: 1, Hi: templateTimeMax(), Title: "check the date",
			Message: "a date and time such as 2026-03-14 09:30 (keep it if it is one)"}, Help: "date and time of the mid-point of the measurement"},
		{Column: workbook.Column{Name: ColGaugingStage, Unit: L, Format: "0.000#", Width: 12}, Rule: elevationRule(L, "a gauge height"), Help: "mean gauge height during the measurement"},
		{Column: workbook.Column{Name: ColGaugingDischarge, Unit: Q, Format: "0.000#", Width: 17}, Rule: decimalRule(0, 1e8, true,
			fmt.Sprintf("a discharge in %s, zero or more", Q)), Help: "measured discharge"},
		{Column: workbook.Column{Name: ColGaugingQuality, Format: workbook.FormatText, Width: 12}, Rule: qualityRule(), Help: "measurement grade"},
		{Column: workbook.Column{Name: ColGaugingUncertainty, Unit: "%", Format: "0.0##", Width: 15}, Rule: decimalRule(templateOpenEnd, MaxUncertaintyPercent-templateOpenEnd, true,
			fmt.Sprintf("a percentage above 0 and below %g", MaxUncertaintyPercent)),
			Help: "expanded uncertainty of the discharge at the 95 % level, in percent; blank: the band of the quality grade"},
		{Column: workbook.Column{Name: ColGaugingExclude, Format: workbook.FormatText, Width: 24}, Help: "any text leaves the gauging out of rating fits and is shown as the reason; blank or " + strings.Join(KeepWords(), ", ") + " keeps it"},
		{Column: workbook.Column{Name: ColNote, Format: workbook.FormatText, Width: 36}},
	}
}

// instructionSheet writes the instructions: what goes where, in which units.
func instructionSheet(b *workbook.Book, opt TemplateOptions, names []string) error {
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
	for _, l := range instructionLines(opt, names) {
		if err := s.Row(workbook.Styled{Style: ls, Value: l[0]}, workbook.Styled{Style: ws, Value: l[1]}); err != nil {
			return err
		}
	}
	return s.Flush()
}

// instructionLines are the topics of the instructions sheet and what each
// says. The words each column takes are written from the readers' own
// lists (BankWords, PinWords, rating.QualityWords and QualityLetters,
// StructureWords, OpenChannelWords, KeepWords), each word quoted (see
// quoted); the cross-section sheets' topic is names joined.
func instructionLines(opt TemplateOptions, names []string) [][2]string {
	u := opt.Units
	L, Q := u.Length(), u.Discharge()
	return [][2]string{
		{"this workbook", "Field sheets for one site: a cross-section survey per XS sheet (or by grid coordinates on the coordinates sheet), " +
			"the reach and its high-water marks, and discharge measurements. " +
			"Fill the cream cells; keep the header rows as they are. Blank rows are skipped. " +
			"Cells to the right of a site-block value, past a blank cell (a title, a page number), are not read, with a warning; " +
			"in the rows below the header a value to the right of the last headed column is refused: write remarks in the " + ColNote + " column."},
		{"site block", fmt.Sprintf("The first %d rows of each cross-section sheet, the coordinate sheet and the gaugings sheet name the site: %s. "+
			"Write each value beside its key (a date as yyyy-mm-dd); the column headers follow in row %d, the points or gaugings below them.",
			len(MetaKeys()), strings.Join(MetaKeys(), ", "), SectionHeaderRow)},
		{"units", fmt.Sprintf("Lengths, stations and elevations in %s; discharge in %s; Manning's n as usual (the same number in every unit system). "+
			"Write numbers with a decimal point. Elevations and gauge heights refer to one datum: name it in the site block.", L, Q)},
		{strings.Join(names, ", "), "One sheet per cross-section, points from the left end to the right end looking downstream. " +
			"station: distance from the left pin; it never decreases (no overhangs). elevation: ground elevation. " +
			"n: Manning's n of the ground from this point to the next (a blank repeats the value above). " +
			"mark: 'bank' on exactly the two points that bound the main channel, or another bank word (" + quoted(BankWords()[1:]) +
			"; in any case; a word naming a side must be on that side); other labels (thalweg, pin, water edge, ...) are kept as labels. " +
			"Add sheets by copying one; the sheet name is the section's name."},
		{FieldSheetCoordinates, "A cross-section surveyed by total station or GNSS: easting, northing and elevation of each point, in the order surveyed. " +
			"wetline projects the points onto the section line to make stations. mark: the end pins (left and right looking downstream) fix the line and its left end, " +
			"the left one marked " + quoted(leftPinWords()) + ", the right one " + quoted(rightPinWords()) + " (in any case; dots, spaces, hyphens and underscores aside); " +
			"without them the line is fitted through the points and the left end is the first point surveyed (or told by the flow direction given to wetline). " +
			"n: Manning's n from this point to the next point surveyed; 'bank' as on the XS sheets. Rename the sheet to the section's name."},
		{FieldSheetReach, "One row per section of a reach. section: its id; survey: the sheet (or file) with its survey; " +
			"distance: distance downstream from the upstream-most section along the channel; ws_left and ws_right: water-surface elevation " +
			"on each bank from the high-water marks (for a slope-area reach); quality: " + qualityText() + ". " +
			"left_length, channel_length, right_length: lengths of the flow paths along the left overbank, the channel and the right overbank to the next section " +
			"(blank: the distance between the sections). structure: blank, " + quoted(OpenChannelWords()) + " for an open channel; " + quoted(StructureWords()) +
			" for a section at a structure (any case; flow through a structure is refused, not approximated)."},
		{FieldSheetGaugings, "One row per discharge measurement. time: date and time (yyyy-mm-dd hh:mm). A time without a UTC offset is read at the offset wetline is given (--utc-offset ±HH:MM), else as UTC. " +
			"To give each row its own zone (standard and daylight time), add a column headed " + ColTimeZone + " (read, unlike other extra columns) and fill it on every row: " +
			"a UTC offset (+10:00, -0500, Z) or one of " + strings.Join(ZoneAbbreviations(), ", ") + ". " +
			"stage: mean gauge height; discharge: measured discharge; quality: the measurement's grade, " + qualityText() + "; " +
			fmt.Sprintf("uncertainty: the expanded uncertainty at the 95 %% level in percent, above 0 and below %g (blank: the grade's band); ", MaxUncertaintyPercent) +
			"exclude: any text leaves the gauging out of rating fits and is shown as the reason; blank or " + quoted(KeepWords()) + " (any case) keeps it."},
		{"using it", "wetline rate field.xlsx --sheet XS-1 --slope 0.001 -o rating.xlsx rates the section on sheet XS-1."},
		{"caution", rating.Caution},
	}
}

// WriteSurveySheet writes a survey as a table sheet with the columns of a
// field workbook's cross-section sheet (see WriteTemplate), readable by
// ReadSection, its header in row 1 (no site block). It lives here, beside the template, so that the
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
