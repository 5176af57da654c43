package survey

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"wetline/subdivide"

	"github.com/xuri/excelize/v2"
)

// Table is a rectangular table read from a CSV file or a workbook sheet:
// a header row and the non-blank data rows below it, with their positions.
type Table struct {
	File, Sheet string
	// Header holds the column names as written (trimmed).
	Header []string
	// HeaderRow is the 1-based line or row of the header.
	HeaderRow int
	// Records are the non-blank data rows, each padded to the header width.
	Records []Record
	// Date1904 is the workbook's date system (false for CSV).
	Date1904 bool
	// Sheets lists every sheet of the workbook the table was read from
	// (nil for CSV).
	Sheets []string
}

// Record is one data row and its 1-based line (CSV) or row (sheet).
type Record struct {
	Row   int
	Cells []string
}

// IsWorkbook reports whether a path names a spreadsheet workbook.
func IsWorkbook(path string) bool {
	switch strings.ToLower(filepath.Ext(path)) {
	case ".xlsx", ".xlsm":
		return true
	}
	return false
}

// MaxWorkbookBytes bounds the unpacked size of a workbook read as input.
const MaxWorkbookBytes = 1 << 30

// ReadTable reads a table from a CSV file, or from a sheet of a workbook
// (by extension; sheet "" is the first sheet).
func ReadTable(path, sheet string) (*Table, error) {
	return readTable(path, sheet, "")
}

// readTable is ReadTable; in a workbook with no sheet named, a sheet named
// prefer (any case) is read when there is one.
func readTable(path, sheet, prefer string) (*Table, error) {
	if IsWorkbook(path) {
		f, err := openWorkbook(path)
		if err != nil {
			return nil, err
		}
		defer f.Close()
		if sheet == "" && prefer != "" {
			for _, s := range f.GetSheetList() {
				if strings.EqualFold(s, prefer) {
					sheet = s
				}
			}
		}
		return sheetTable(f, path, sheet)
	}
	if sheet != "" {
		return nil, &ParseError{File: path, Err: errors.New("a sheet can be named only for a workbook (.xlsx)")}
	}
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	return ParseCSV(bytes.NewReader(data), path)
}

// workbookOptions are the options every workbook is opened with: cells
// read raw (numbers as written, dates as serials), unpacked size bounded.
var workbookOptions = excelize.Options{RawCellValue: true, UnzipSizeLimit: MaxWorkbookBytes}

// openWorkbook opens a workbook file for reading. Every reader of a
// workbook file opens it here, so the zip directory is always checked
// first (CheckWorkbookZip).
func openWorkbook(path string) (*excelize.File, error) {
	if err := checkWorkbookFile(path); err != nil {
		return nil, &ParseError{File: path, Err: err}
	}
	f, err := excelize.OpenFile(path, workbookOptions)
	if err != nil {
		return nil, &ParseError{File: path, Err: fmt.Errorf("cannot open workbook: %w", err)}
	}
	return f, nil
}

// ParseCSV reads a comma-separated table. Lines starting with '#' are
// comments, a byte-order mark is dropped, blank lines are skipped and
// ragged rows are padded to the header.
func ParseCSV(r io.Reader, name string) (*Table, error) {
	br := bufio.NewReader(r)
	if bom, err := br.Peek(3); err == nil && string(bom) == "\ufeff" {
		br.Discard(3)
	}
	cr := csv.NewReader(br)
	cr.Comment = '#'
	cr.FieldsPerRecord = -1
	cr.TrimLeadingSpace = true
	cr.ReuseRecord = false
	t := &Table{File: name}
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				return nil, &ParseError{File: name, Row: pe.Line, Column: pe.Column, Err: pe.Err}
			}
			return nil, &ParseError{File: name, Err: err}
		}
		line, _ := cr.FieldPos(0)
		if t.Header == nil {
			if blank(rec) {
				continue
			}
			t.Header = trimAll(rec)
			t.HeaderRow = line
			if len(rec) == 1 && strings.Contains(rec[0], ";") {
				return nil, &ParseError{File: name, Row: line, Err: ErrSemicolon}
			}
			continue
		}
		if blank(rec) {
			continue
		}
		t.Records = append(t.Records, Record{Row: line, Cells: pad(trimAll(rec), len(t.Header))})
	}
	if t.Header == nil {
		return nil, &ParseError{File: name, Err: errors.New("empty file: no header row")}
	}
	return t, nil
}

// sheetTable reads a table from a sheet of an open workbook (sheet "" is
// the first). Cells are read raw: numbers as written, dates as serials.
func sheetTable(f *excelize.File, path, sheet string) (*Table, error) {
	sheets := f.GetSheetList()
	if sheet == "" {
		if len(sheets) == 0 {
			return nil, &ParseError{File: path, Err: errors.New("workbook has no sheets")}
		}
		sheet = sheets[0]
	} else if idx, _ := f.GetSheetIndex(sheet); idx < 0 {
		return nil, &ParseError{File: path, Sheet: sheet, Err: fmt.Errorf("no such sheet (sheets: %s)", strings.Join(sheets, ", "))}
	}
	t := &Table{File: path, Sheet: sheet, Sheets: sheets}
	if props, err := f.GetWorkbookProps(); err == nil && props.Date1904 != nil {
		t.Date1904 = *props.Date1904
	}
	rows, err := f.Rows(sheet)
	if err != nil {
		return nil, &ParseError{File: path, Sheet: sheet, Err: err}
	}
	defer rows.Close()
	n := 0
	for rows.Next() {
		n++
		rec, err := rows.Columns(excelize.Options{RawCellValue: true})
		if err != nil {
			return nil, &ParseError{File: path, Sheet: sheet, Row: n, Err: err}
		}
		if blank(rec) {
			continue
		}
		if t.Header == nil {
			t.Header = trimAll(rec)
			t.HeaderRow = n
			continue
		}
		t.Records = append(t.Records, Record{Row: n, Cells: pad(trimAll(rec), len(t.Header))})
	}
	if err := rows.Error(); err != nil {
		return nil, &ParseError{File: path, Sheet: sheet, Err: err}
	}
	if t.Header == nil {
		return nil, &ParseError{File: path, Sheet: sheet, Err: errors.New("empty sheet: no header row")}
	}
	return t, nil
}

func blank(rec []string) bool {
	for _, c := range rec {
		if strings.TrimSpace(c) != "" {
			return false
		}
	}
	return true
}

func trimAll(rec []string) []string {
	out := make([]string, len(rec))
	for i, c := range rec {
		out[i] = strings.TrimSpace(c)
	}
	return out
}

func pad(rec []string, n int) []string {
	for len(rec) < n {
		rec = append(rec, "")
	}
	return rec
}

// Column returns the index of the first header matching any of names
// (case-insensitively, spaces and underscores alike), or -1.
func (t *Table) Column(names ...string) int {
	for _, want := range names {
		for i, h := range t.Header {
			if normName(h) == normName(want) {
				return i
			}
		}
	}
	return -1
}

func normName(s string) string {
	s = strings.ToLower(strings.TrimSpace(s))
	// A unit in brackets after the name is allowed: "stage (m)".
	if i := strings.IndexAny(s, "(["); i > 0 {
		s = strings.TrimSpace(s[:i])
	}
	return strings.NewReplacer(" ", "_", "-", "_").Replace(s)
}

// Require returns the index of a required column, or a ParseError naming it.
func (t *Table) Require(names ...string) (int, error) {
	if i := t.Column(names...); i >= 0 {
		return i, nil
	}
	return -1, &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Name: names[0],
		Err: fmt.Errorf("%w: the header needs a column named %q (found: %s)", ErrMissingColumn, names[0], strings.Join(t.Header, ", "))}
}

// At returns a ParseError positioned at a cell of a record.
func (t *Table) At(rec Record, col int, err error) *ParseError {
	pe := &ParseError{File: t.File, Sheet: t.Sheet, Row: rec.Row, Err: err}
	if col >= 0 {
		pe.Column = col + 1
		if col < len(t.Header) {
			pe.Name = t.Header[col]
		}
		if col < len(rec.Cells) {
			pe.Text = rec.Cells[col]
		}
	}
	return pe
}

// Cell returns the trimmed text of a record's cell, "" when col < 0.
func (t *Table) Cell(rec Record, col int) string {
	if col < 0 || col >= len(rec.Cells) {
		return ""
	}
	return rec.Cells[col]
}

var decimalComma = regexp.MustCompile(`^[-+]?[0-9]*,[0-9]+$`)

// Float parses a number cell. Blank cells return ok == false and no error.
func (t *Table) Float(rec Record, col int) (v float64, ok bool, err error) {
	s := t.Cell(rec, col)
	if s == "" {
		return 0, false, nil
	}
	v, perr := ParseNumber(s)
	if perr != nil {
		return 0, false, t.At(rec, col, perr)
	}
	return v, true, nil
}

// ParseNumber reads a finite decimal number written with a decimal point.
func ParseNumber(s string) (float64, error) {
	s = strings.TrimSpace(s)
	if decimalComma.MatchString(s) {
		return 0, ErrDecimalComma
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		return 0, ErrNotNumber
	}
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, subdivide.ErrNotFinite
	}
	return v, nil
}

// SectionSheets lists the sheets of a workbook that hold a survey: those
// whose header row has station and elevation columns, in workbook order.
func SectionSheets(path string) ([]string, error) {
	f, err := openWorkbook(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	var out []string
	for _, sheet := range f.GetSheetList() {
		ok, err := hasSurveyHeader(f, sheet)
		if err != nil {
			return nil, &ParseError{File: path, Sheet: sheet, Err: err}
		}
		if ok {
			out = append(out, sheet)
		}
	}
	return out, nil
}

// hasSurveyHeader reports whether the first non-blank row of a sheet names
// station and elevation columns.
func hasSurveyHeader(f *excelize.File, sheet string) (bool, error) {
	rows, err := f.Rows(sheet)
	if err != nil {
		return false, err
	}
	defer rows.Close()
	for rows.Next() {
		rec, err := rows.Columns(excelize.Options{RawCellValue: true})
		if err != nil {
			return false, err
		}
		if blank(rec) {
			continue
		}
		t := &Table{Header: trimAll(rec)}
		return t.Column(ColStation) >= 0 && t.Column(ColElevation) >= 0, nil
	}
	return false, rows.Error()
}
