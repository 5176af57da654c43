package survey

import (
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"

	"wetline/rating"
	"wetline/subdivide"
)

// Survey is a surveyed cross-section read from a file, with what was said
// about its points.
type Survey struct {
	// Section is the ground line, n and banks, ready for subdivide.Compile.
	Section subdivide.Section
	// Labels holds each point's mark other than "bank" ("" for none).
	Labels []string
	// Notes holds each point's note column ("" for none).
	Notes []string
	// Rows holds each point's 1-based row (line) in the file.
	Rows []int
	// File and Sheet say where the survey came from.
	File, Sheet string
	// Warnings are unusual but legal facts about the data.
	Warnings []string
	// Units is what the headers say of the unit system.
	Units UnitNote
	// Site is the site metadata read above the table.
	Site rating.Site
}

// SectionOptions adjust how a survey is read. The zero value reads marks.
type SectionOptions struct {
	// IgnoreBankMarks skips the check of bank marks (banks given elsewhere).
	IgnoreBankMarks bool
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

// SectionFromTable turns a table with station and elevation columns (and
// optional n, mark and note columns) into a survey. Every bad cell is
// reported, each naming its row and column.
func SectionFromTable(t *Table, opt SectionOptions) (Survey, error) {
	sv := Survey{File: t.File, Sheet: t.Sheet}
	sv.Section.Name = sectionName(t)
	cs, err := t.Require(ColStation)
	if err != nil {
		return sv, err
	}
	ce, err := t.Require(ColElevation)
	if err != nil {
		return sv, err
	}
	if sv.Units, err = t.HeaderUnits(cs, ce); err != nil {
		return sv, err
	}
	sv.Site = t.Site()
	cn := t.Column(ColN, "manning_n", "mannings_n")
	cm := t.Column(ColMark)
	cnote := t.Column(ColNote)
	var errs errorList
	add := func(rec Record, col int, err error) {
		errs = append(errs, t.At(rec, col, err))
	}
	var banks []int // indices of points marked bank
	var bankRows []Record
	nCur := math.NaN()
	var ns []float64
	for _, rec := range t.Records {
		x, okx, err := t.Float(rec, cs)
		if err != nil {
			errs = append(errs, err.(*ParseError))
		} else if !okx {
			add(rec, cs, fmt.Errorf("%w: station is blank", ErrNotNumber))
		}
		z, okz, err := t.Float(rec, ce)
		if err != nil {
			errs = append(errs, err.(*ParseError))
		} else if !okz {
			add(rec, ce, fmt.Errorf("%w: elevation is blank", ErrNotNumber))
		}
		if cn >= 0 {
			n, ok, err := t.Float(rec, cn)
			switch {
			case err != nil:
				errs = append(errs, err.(*ParseError))
			case ok && !(n > 0):
				add(rec, cn, fmt.Errorf("roughness %w", ErrNotPositive))
			case ok:
				nCur = n
				if n > HighN {
					sv.Warnings = append(sv.Warnings, t.At(rec, cn, fmt.Errorf("roughness %g is above %.2f: check it", n, HighN)).Error())
				}
			}
		}
		i := len(sv.Section.Points)
		if i > 0 && okx && x < sv.Section.Points[i-1].Station {
			add(rec, cs, subdivide.ErrOverhang)
		}
		sv.Section.Points = append(sv.Section.Points, subdivide.Point{Station: x, Elevation: z})
		ns = append(ns, nCur)
		sv.Rows = append(sv.Rows, rec.Row)
		mark := strings.TrimSpace(t.Cell(rec, cm))
		if strings.EqualFold(mark, MarkBank) {
			banks = append(banks, i)
			bankRows = append(bankRows, rec)
			mark = ""
		}
		sv.Labels = append(sv.Labels, mark)
		sv.Notes = append(sv.Notes, t.Cell(rec, cnote))
	}
	if len(errs) > 0 {
		return sv, errs.err()
	}
	pts := sv.Section.Points
	if len(pts) < 2 {
		return sv, &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Err: fmt.Errorf("%w, found %d", subdivide.ErrTooFewPoints, len(pts))}
	}
	if pts[len(pts)-1].Station == pts[0].Station {
		return sv, &ParseError{File: t.File, Sheet: t.Sheet, Row: t.Records[len(t.Records)-1].Row, Column: cs + 1, Name: t.Header[cs],
			Err: subdivide.ErrZeroWidth}
	}
	if cn >= 0 {
		// n of point i applies to the segment i → i+1. A blank first cell
		// takes the first value given below it.
		first := math.NaN()
		for _, n := range ns {
			if !math.IsNaN(n) {
				first = n
				break
			}
		}
		if math.IsNaN(first) {
			return sv, &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Column: cn + 1, Name: t.Header[cn],
				Err: fmt.Errorf("the n column is empty")}
		}
		sv.Section.N = make([]float64, len(pts)-1)
		for i := range sv.Section.N {
			if math.IsNaN(ns[i]) {
				sv.Section.N[i] = first
			} else {
				sv.Section.N[i] = ns[i]
			}
		}
	}
	if !opt.IgnoreBankMarks && cm >= 0 && len(banks) > 0 {
		if len(banks) != 2 {
			rec := bankRows[len(bankRows)-1]
			return sv, t.At(rec, cm, fmt.Errorf("%w, found %d", ErrBankMarks, len(banks)))
		}
		sv.Section.HasBanks = true
		sv.Section.LeftBank = pts[banks[0]].Station
		sv.Section.RightBank = pts[banks[1]].Station
		if !(sv.Section.LeftBank < sv.Section.RightBank) {
			return sv, t.At(bankRows[1], cm, fmt.Errorf("%w: the two bank marks are at the same station", ErrBankMarks))
		}
	}
	width := pts[len(pts)-1].Station - pts[0].Station
	for i := 1; i < len(pts); i++ {
		if gap := pts[i].Station - pts[i-1].Station; gap > MaxGapFraction*width {
			sv.Warnings = append(sv.Warnings, fmt.Sprintf("%s: gap of %g between stations %g and %g is over %.0f %% of the section width: check for missing points",
				where(t, sv.Rows[i]), gap, pts[i-1].Station, pts[i].Station, MaxGapFraction*100))
		}
	}
	return sv, nil
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
