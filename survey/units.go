package survey

import (
	"errors"
	"fmt"
	"slices"
	"strings"

	"wetline/rating"
)

// Causes of units in headers that cannot be used, for errors.Is.
var (
	// ErrUnknownUnit: a header names a unit wetline does not know.
	ErrUnknownUnit = errors.New("unknown unit: write m or ft (m3/s or ft3/s for a discharge)")
	// ErrMixedUnits: two headers name units of different systems.
	ErrMixedUnits = errors.New("columns are in different unit systems")
	// ErrUnitsDisagree: the headers' unit system is not the one asked for.
	ErrUnitsDisagree = errors.New("the header's unit is not the unit system asked for")
	// ErrUnitsUnnamed: a file whose headers name no unit is read with one
	// whose headers name us units, and no unit system was asked for.
	ErrUnitsUnnamed = errors.New("without --units, a file whose headers name no unit is in si units")
)

// unitWords maps the units a header may name, lower case without spaces,
// to their unit system.
var unitWords = map[string]rating.Units{
	"m": rating.SI, "metre": rating.SI, "metres": rating.SI, "meter": rating.SI, "meters": rating.SI,
	"m2": rating.SI, "m²": rating.SI, "m^2": rating.SI, "sqm": rating.SI,
	"m3/s": rating.SI, "m³/s": rating.SI, "m^3/s": rating.SI, "cms": rating.SI, "cumecs": rating.SI,
	"m/s": rating.SI, "m/m": rating.SI, "pa": rating.SI,
	"ft": rating.US, "feet": rating.US, "foot": rating.US, "ft.": rating.US,
	"ft2": rating.US, "ft²": rating.US, "ft^2": rating.US, "sqft": rating.US,
	"ft3/s": rating.US, "ft³/s": rating.US, "ft^3/s": rating.US, "cfs": rating.US,
	"ft/s": rating.US, "ft/ft": rating.US, "lb/ft2": rating.US,
}

// surveyFootWords are the ways GNSS and survey exports write the US
// survey foot in a header, as headerUnit returns them: "(US ft)",
// "(ftUS)", "(US survey ft)", "(usft)" and the spellings alike (common
// practice of data collectors). A survey's headers may name it (see
// Table.surveyHeaderUnits): it is read as feet, with an input note.
var surveyFootWords = []string{"usft", "ftus", "ussurveyft", "ussurveyfeet", "ussurveyfoot", "usfeet", "usfoot"}

// The US survey foot and the international foot, in metres:
// 1200/3937 m exactly by the Mendenhall order of 1893, and 0.3048 m
// exactly since 1959; the survey foot was retired by NIST's notice of
// 2020, effective 2023 (from memory). Their lengths differ by 2 parts
// per million (SurveyFootPPM), 0.06 mm over a 30 m section.
const (
	SurveyFootMetres        = 1200.0 / 3937
	InternationalFootMetres = 0.3048
	SurveyFootPPM           = 2
)

// isSurveyFoot reports a unit of headerUnit's naming the US survey foot
// (one of surveyFootWords).
func isSurveyFoot(text string) bool { return slices.Contains(surveyFootWords, text) }

// isLengthUnit reports a unit of headerUnit's that is a length (m, ft,
// and their spellings in unitWords, and the US survey foot).
func isLengthUnit(text string) bool {
	if isSurveyFoot(text) {
		return true
	}
	u, ok := unitWords[text]
	if !ok {
		return false
	}
	switch text {
	case u.Length(), "metre", "metres", "meter", "meters", "feet", "foot", "ft.":
		return true
	}
	return false
}

// headerUnit returns the unit written in brackets after a column name
// ("stage (m)", "discharge [cfs]"), lower case without spaces; "" when
// none is written.
func headerUnit(h string) string {
	i := strings.IndexAny(h, "([")
	if i < 0 {
		return ""
	}
	u := strings.TrimRight(strings.TrimSpace(h[i+1:]), ")]")
	return strings.ToLower(strings.Join(strings.Fields(u), ""))
}

// UnitNote is what a table's headers say of its unit system.
type UnitNote struct {
	// Found reports that a header names a unit; Units is its system.
	Found bool
	Units rating.Units
	// At is the first column naming a unit (position only), and Text the
	// unit as written there.
	At   *ParseError
	Text string
	// SurveyFoot is the first column naming the US survey foot (position
	// only; nil for none), read as feet (see SurveyFootNote).
	SurveyFoot *ParseError
}

// SurveyFootNote is the input note of headers naming the US survey foot
// (zero when none does): read as feet, which the survey foot exceeds by 2
// parts per million, negligible for stations and elevations along one
// section.
func (n UnitNote) SurveyFootNote() InputNote {
	if n.SurveyFoot == nil {
		return InputNote{}
	}
	return InputNote{At: n.SurveyFoot.Position(), Text: fmt.Sprintf(
		"the header names US survey feet (%s): read as feet (ft); the survey foot, 1200/3937 m, is %d parts per million longer than the international foot, %g m, negligible for stations and elevations along one section; nothing is converted",
		echo(n.SurveyFoot.Name), SurveyFootPPM, InternationalFootMetres)}
}

// HeaderUnits reads the units written in the headers of columns cols
// (indices; negative ones are absent columns and skipped). An unknown
// unit, or units of two systems, is an error naming the column. The US
// survey foot is read in a survey's headers only (surveyHeaderUnits):
// elsewhere it is an unknown unit, with advice.
func (t *Table) HeaderUnits(cols ...int) (UnitNote, error) {
	return t.headerUnits(false, cols...)
}

// surveyHeaderUnits is HeaderUnits for a survey's headers, which may name
// the US survey foot (one of surveyFootWords): it is read as feet, and
// UnitNote.SurveyFoot is its first column.
func (t *Table) surveyHeaderUnits(cols ...int) (UnitNote, error) {
	return t.headerUnits(true, cols...)
}

func (t *Table) headerUnits(surveyFoot bool, cols ...int) (UnitNote, error) {
	var n UnitNote
	var foot *ParseError
	for _, c := range cols {
		if c < 0 || c >= len(t.Header) {
			continue
		}
		text := headerUnit(t.Header[c])
		if text == "" {
			continue
		}
		at := &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Column: c + 1, Name: t.Header[c]}
		u, ok := unitWords[text]
		switch {
		case isSurveyFoot(text) && surveyFoot:
			u, ok = rating.US, true
			if foot == nil {
				foot = &ParseError{File: at.File, Sheet: at.Sheet, Row: at.Row, Column: at.Column, Name: at.Name, Text: text}
			}
		case isSurveyFoot(text):
			at.Err = fmt.Errorf("%w (%q: the US survey foot is read in a survey's headers; write ft here, 2 parts per million apart)", ErrUnknownUnit, echo(text))
			return n, at
		}
		if !ok {
			at.Err = fmt.Errorf("%w (%q)", ErrUnknownUnit, echo(text))
			return n, at
		}
		if n.Found && u != n.Units {
			at.Err = fmt.Errorf("%w: %s here, %s in %s", ErrMixedUnits, text, n.Text, n.At.Name)
			return n, at
		}
		if !n.Found {
			n = UnitNote{Found: true, Units: u, At: at, Text: text}
		}
	}
	n.SurveyFoot = foot
	return n, nil
}

// Resolve returns the unit system to use for data whose headers say n:
// the one asked for when given, which the headers must not contradict
// (ErrUnitsDisagree, naming the column and both units), else the headers'
// when they name one, else u.
func (n UnitNote) Resolve(u rating.Units, given bool) (rating.Units, error) {
	switch {
	case !n.Found:
		return u, nil
	case given && n.Units != u:
		at := *n.At
		at.Err = fmt.Errorf("%w: the header says %s (%s units) but %s units were asked for", ErrUnitsDisagree, n.Text, n.Units, u)
		return u, &at
	}
	return n.Units, nil
}

// UnitSource is the input that sets the unit system of the inputs read
// with it when no unit system was asked for: its file and what its headers
// say. Naming no unit, it is in the default system, si, as a single input
// would be read.
type UnitSource struct {
	File string
	Note UnitNote
}

// Units returns the source's unit system: its headers', else si.
func (s UnitSource) Units() rating.Units {
	if s.Note.Found {
		return s.Note.Units
	}
	return rating.SI
}

// Agree checks that the input file, whose headers say n, is in the
// source's unit system when no unit system was asked for, each input
// naming no unit being in si units. Units of the other system in both
// headers are ErrUnitsDisagree at n's column; headers naming no unit
// beside ones naming us units are ErrUnitsUnnamed (at n's column when n
// names the units).
func (s UnitSource) Agree(file string, n UnitNote) error {
	u := s.Units()
	switch {
	case n.Found && n.Units == u, !n.Found && u == rating.SI:
		return nil
	case n.Found && s.Note.Found:
		_, err := n.Resolve(u, true)
		return fmt.Errorf("%w (%s units set by the headers of %s)", err, u, s.File)
	case n.Found:
		at := *n.At
		at.Err = fmt.Errorf("%w: the header says %s (%s units) but the headers of %s name no unit: give --units %s if it is in %s units too",
			ErrUnitsUnnamed, n.Text, n.Units, s.File, n.Units, n.Units)
		return &at
	}
	return fmt.Errorf("%s: %w, but %s says %s (%s units) in column %q: give --units %s if %s is in %s units too",
		file, ErrUnitsUnnamed, s.Note.At.Position(), s.Note.Text, u, s.Note.At.Name, u, file, u)
}

// UnitsAssumedNote is the input note of a table that names no unit in its
// headers (as the CSV tables wetline writes of a rating do) read with no
// unit system asked for or named by another input: it was read in si
// units, the default, and --units us reads it in feet. file names the
// table (with its sheet).
func UnitsAssumedNote(file string) string {
	return fmt.Sprintf("%s: names no unit: read in SI units (%s, %s), the default; give --units us for a table in feet (%s, %s)",
		file, rating.SI.Length(), rating.SI.Discharge(), rating.US.Length(), rating.US.Discharge())
}

// UnitChoice is the unit system asked for, and whether it was asked for
// explicitly (else the headers decide).
type UnitChoice struct {
	Units rating.Units
	Given bool
}
