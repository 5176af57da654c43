package survey

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/xuri/excelize/v2"

	"wetline/rating"
	"wetline/subdivide"
)

// Table is a rectangular table read from a CSV file or a workbook sheet:
// a header row and the non-blank data rows below it, with their positions.
type Table struct {
	File, Sheet string
	// Header holds the column names as written (trimmed), up to the last
	// named column.
	Header []string
	// HeaderRow is the 1-based line or row of the header.
	HeaderRow int
	// Records are the non-blank data rows. A row holds at most as many
	// cells as the header; trailing blank cells may be missing (Cell
	// reads them as blank).
	Records []Record
	// Date1904 is the workbook's date system (false for CSV).
	Date1904 bool
	// Sheets lists every sheet of the workbook the table was read from
	// (nil for CSV).
	Sheets []string
	// Meta holds the key lines above the table: "# key: value" comment
	// lines of a CSV file, or two-cell rows above a sheet's header, keyed
	// by the lower-case key (see MetaKeys).
	Meta map[string]string
	// Warnings are unusual but legal facts about where the table was
	// read (a hidden sheet named).
	Warnings []string
	// unsaved are the cells below the header (of a workbook sheet) that
	// hold a formula with no saved value: each reader refuses those of
	// the columns it reads (see unsavedIn).
	unsaved cellRuns
}

// Record is one data row and its 1-based line (CSV) or row (sheet).
type Record struct {
	Row   int
	Cells []string
	// quoted says which cells of a CSV row were quoted (nil when none
	// was, and in a sheet), for the check of split numbers.
	quoted []bool
}

// quotedCell reports that cell col of a CSV row was written in quotes.
func (r Record) quotedCell(col int) bool {
	return col >= 0 && col < len(r.quoted) && r.quoted[col]
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
// (by extension; sheet "" is the first visible sheet). "-" reads standard input,
// a workbook or CSV text as its first bytes say. Only regular files of at
// most the limits (see Limits) are read; text that is not a UTF-8 table
// (UTF-16, binary, a workbook named .csv, tab-separated) is refused
// saying what it is.
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
		return sheetTable(f, path, preferSheet(f.File, sheet, prefer))
	}
	data, err := readInput(path)
	if err != nil {
		return nil, err
	}
	if path == Stdin && bytes.HasPrefix(data, zipMagic) {
		f, err := openWorkbookBytes(data, path)
		if err != nil {
			return nil, err
		}
		defer f.Close()
		return sheetTable(f, path, preferSheet(f.File, sheet, prefer))
	}
	if sheet != "" {
		return nil, &ParseError{File: path, Err: errors.New("a sheet can be named only for a workbook (.xlsx)")}
	}
	return parseCSVData(data, path)
}

// preferSheet returns sheet, or when it is "" the sheet named prefer
// (any case) if the workbook has one.
func preferSheet(f *excelize.File, sheet, prefer string) string {
	if sheet == "" && prefer != "" {
		for _, s := range f.GetSheetList() {
			if strings.EqualFold(s, prefer) {
				return s
			}
		}
	}
	return sheet
}

// workbookOptions are the options every workbook is opened with: cells
// read raw (numbers as written, dates as serials), unpacked size bounded.
var workbookOptions = excelize.Options{RawCellValue: true, UnzipSizeLimit: MaxWorkbookBytes}

// openWorkbook opens a workbook file for reading. Every reader of a
// workbook file opens it here, so the file is always a regular file
// within the limits and its zip directory is checked first; each sheet is
// checked as checkWorkbookZip checks it when a reader chooses it
// (chooseSheet).
func openWorkbook(path string) (*inputBook, error) {
	data, err := readInput(path)
	if err != nil {
		return nil, err
	}
	return openWorkbookBytes(data, path)
}

// inputBook is a workbook opened to be read, with the scan of the sheets
// it reads (see sheetScanner) and its date system.
type inputBook struct {
	*excelize.File
	scans    *sheetScanner
	date1904 bool
	// links names the other workbooks this one links to (see
	// externalLinks), nil when it links to none.
	links []string
	// bookWarningsOnce leaves the workbook's own warnings (its links)
	// out of each sheet's: the caller gives them once (see OpenBook).
	bookWarningsOnce bool
}

// bookWarnings are the warnings of the workbook as a whole, which file
// names: that it links to other workbooks. Nil when there are none.
func (f *inputBook) bookWarnings(file string) []string {
	if w := linksWarning(file, f.links); w != "" {
		return []string{w}
	}
	return nil
}

// shown rewrites the raw values of a row of a sheet (row is 1-based) as
// a spreadsheet program shows them, where the two differ in a way a
// reader must know: a boolean cell reads TRUE or FALSE (never a number),
// a number cell with a percent format reads as the percent shown (0.05
// as 5%), which only a column in percent takes (see Table.percent) and
// every other number column refuses (ErrPercent), and a number cell with
// a date or time format reads as the date shown, in ISO 8601 (see
// dateShown), which a time column takes as it takes the serial and a
// number column refuses (ErrDateNotNumber).
func (f *inputBook) shown(sheet string, row int, rec []string) {
	sc := f.scans.done[sheet]
	if len(sc.marks) == 0 && len(sc.dates) == 0 {
		return
	}
	for i, raw := range rec {
		at := cellAt{int64(row), int64(i + 1)}
		if len(sc.dates) > 0 && sc.dates.has(at.row, at.col) {
			rec[i] = dateShown(raw, f.date1904)
			continue
		}
		switch sc.marks[at] {
		case markBoolean:
			switch strings.TrimSpace(raw) {
			case "1":
				rec[i] = "TRUE"
			case "0":
				rec[i] = "FALSE"
			}
		case markPercent:
			rec[i] = percentShown(raw)
		}
	}
}

// dateShown writes the raw value of a date-formatted number cell as the
// date it shows, in ISO 8601: a whole serial as its date (2026-06-01), a
// serial with a time of day as its date and time to the second
// (2026-06-01T10:15:00), a serial below 1 as a time of day alone
// (10:15:00), in the workbook's date system (date1904). Any other value
// is returned as it is.
func dateShown(raw string, date1904 bool) string {
	v, err := strconv.ParseFloat(strings.TrimSpace(raw), 64)
	switch {
	case err != nil || math.IsNaN(v) || v < 0 || v > MaxDateSerial:
		return raw
	case v < MinDateSerial:
		sec := min(int64(math.Round(v*86400)), 86399) // the last second, not the next midnight
		return time.Unix(sec, 0).UTC().Format("15:04:05")
	}
	t, err := serialTime(v, date1904, ErrISOTime)
	if err != nil {
		return raw
	}
	if t.Hour() == 0 && t.Minute() == 0 && t.Second() == 0 {
		return t.Format(time.DateOnly)
	}
	return t.Format("2006-01-02T15:04:05")
}

// percentShown writes the raw value of a percent-formatted number cell
// as the percent it shows: its decimal digits moved two places, so that
// 0.07 reads 7% (not 7.000000000000001%). A value that is not a number
// is returned as it is.
func percentShown(raw string) string {
	v, err := strconv.ParseFloat(strings.TrimSpace(raw), 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return raw
	}
	e := strconv.FormatFloat(v, 'e', -1, 64) // shortest digits: 7e-02
	i := strings.IndexByte(e, 'e')
	exp, err := strconv.Atoi(e[i+1:])
	if err != nil {
		return raw
	}
	p, err := strconv.ParseFloat(e[:i]+"e"+strconv.Itoa(exp+2), 64)
	if err != nil {
		return raw
	}
	return strconv.FormatFloat(p, 'g', -1, 64) + "%"
}

// openWorkbookBytes opens a workbook held in memory; name is used in
// messages. Its zip directory is checked here; each sheet is scanned
// when it is chosen (chooseSheet).
func openWorkbookBytes(data []byte, name string) (*inputBook, error) {
	zr, err := checkZipDirectory(bytes.NewReader(data), int64(len(data)))
	if err != nil {
		return nil, &ParseError{File: name, Err: err}
	}
	f, err := excelize.OpenReader(bytes.NewReader(data), workbookOptions)
	if err != nil {
		return nil, &ParseError{File: name, Err: fmt.Errorf("cannot open workbook: %w", err)}
	}
	b := &inputBook{File: f, scans: &sheetScanner{zr: zr}, links: externalLinks(zr)}
	if props, err := f.GetWorkbookProps(); err == nil && props.Date1904 != nil {
		b.date1904 = *props.Date1904
	}
	return b, nil
}

// ErrFormulaNoValue is the cause of a formula cell whose value was never
// saved (a program that does not compute formulas wrote the workbook): it
// would read as blank.
var ErrFormulaNoValue = errors.New("a formula with no saved value: open and save the workbook in a spreadsheet program")

// span returns how many cells of column col (1-based) lie in the rows
// from to to (inclusive) and the first of their rows (0 when none).
func (d cellRuns) span(col, from, to int64) (first, n int64) {
	for _, r := range d[col] {
		a, b := max(r.first, from), min(r.last, to)
		if a > b {
			continue
		}
		if first == 0 {
			first = a
		}
		n += b - a + 1
	}
	return first, n
}

// unsavedError is the ParseError (ErrFormulaNoValue) at the first cell,
// by row then column, of the rows from to to of a sheet holding a formula
// with no saved value (unsaved), in one of cols (0-based; a negative one,
// an absent column, is passed over), or in any column when cols is nil;
// nil when there is none. where tells in the message where the count of
// such cells was taken ("in the columns read"). header names the
// columns.
func unsavedError(file, sheet string, header []string, unsaved cellRuns, from, to int64, cols []int, where string) error {
	if len(unsaved) == 0 {
		return nil
	}
	var at cellAt
	var count int64
	seen := map[int64]bool{}
	look := func(c int64) {
		if seen[c] {
			return
		}
		seen[c] = true
		first, n := unsaved.span(c, from, to)
		if n == 0 {
			return
		}
		count += n
		if at.row == 0 || first < at.row || (first == at.row && c < at.col) {
			at = cellAt{first, c}
		}
	}
	if cols == nil {
		for c := range unsaved {
			look(c)
		}
	}
	for _, c := range cols {
		if c >= 0 {
			look(int64(c) + 1)
		}
	}
	if count == 0 {
		return nil
	}
	err := ErrFormulaNoValue
	if count > 1 {
		err = fmt.Errorf("%w (%d such cells %s)", ErrFormulaNoValue, count, where)
	}
	pe := &ParseError{File: file, Sheet: sheet, Row: int(at.row), Column: int(at.col), Err: err}
	if int(at.col) <= len(header) {
		pe.Name = header[at.col-1]
	}
	return pe
}

// unsavedIn is the ParseError (ErrFormulaNoValue) at the first cell below
// the header, in one of the columns cols (0-based, a negative one passed
// over), that holds a formula with no saved value, nil when none does. A
// reader of a workbook table calls it with every column it reads: such a
// cell would read as blank, and a blank read (an elevation, an n carried
// from the row above, a mark) is a wrong one; in a column it ignores
// (a crew's own check or notes) the cell is of no matter. A CSV table has
// none.
func (t *Table) unsavedIn(cols ...int) error {
	if cols == nil {
		return nil
	}
	return unsavedError(t.File, t.Sheet, t.Header, t.unsaved, int64(t.HeaderRow)+1, MaxSheetRows, cols, "in the columns read")
}

// ErrDuplicateColumn is the cause of a header naming a column twice.
var ErrDuplicateColumn = errors.New("the header names this column twice")

// tableBuilder collects the header and rows of a table within the limits.
type tableBuilder struct {
	t     *Table
	lim   Limits
	cells int
	// fields is the number of fields of a CSV header line when its last
	// field is named (0 when it ends in blank fields, or in a sheet): a
	// row with more fields is refused (ErrSpilledRow).
	fields int
}

func newTableBuilder(file, sheet string) (*tableBuilder, error) {
	lim, err := EnvLimits()
	if err != nil {
		return nil, err
	}
	return &tableBuilder{t: &Table{File: file, Sheet: sheet}, lim: lim}, nil
}

// header sets the header row: trailing blank names are dropped, and a
// name given twice is an error at its second cell.
func (b *tableBuilder) header(rec []string, row int) error {
	h := trimAll(rec)
	for len(h) > 0 && h[len(h)-1] == "" {
		h = h[:len(h)-1]
	}
	b.t.Header, b.t.HeaderRow = h, row
	if b.t.Sheet == "" && len(h) == len(rec) {
		b.fields = len(rec)
	}
	return duplicateColumn(b.t.File, b.t.Sheet, h, row)
}

// duplicateColumn returns a ParseError (ErrDuplicateColumn) at the second
// cell of header h (at the given row of file and sheet) whose name, as
// columns are matched (see Table.Column), repeats an earlier one; blank
// names are ignored. It returns nil when every name is distinct. When one
// of the two is n with a length unit ("N (ft)" beside "n"), the error is
// ErrNWithLength at that one (see nWithLength).
func duplicateColumn(file, sheet string, h []string, row int) error {
	seen := map[string]int{}
	for i, name := range h {
		key := normName(name)
		if key == "" {
			continue
		}
		if j, dup := seen[key]; dup {
			if err := nWithLength(file, sheet, h, row, j); err != nil {
				return err
			}
			if err := nWithLength(file, sheet, h, row, i); err != nil {
				return err
			}
			return &ParseError{File: file, Sheet: sheet, Row: row, Column: i + 1, Name: strings.TrimSpace(name),
				Err: fmt.Errorf("%w (also column %d)", ErrDuplicateColumn, j+1)}
		}
		seen[key] = i
	}
	return nil
}

// ErrBeyondHeader is the cause of a value in a column after the header's
// last named column (often an unquoted decimal comma that shifts a row).
var ErrBeyondHeader = errors.New("a value beyond the header's last column")

// ErrTitleRow is the cause of a first row holding one filled cell above
// a wider row: a title written above the header (a site's name, merged
// across the columns in a sheet), read as a header of one column, which
// would blame the real header below it as values beyond its last column.
var ErrTitleRow = errors.New("holds one cell and is not a header")

// titleRowError is the ParseError (ErrTitleRow) at the one cell, title,
// of the row taken for the header (headerRow), when the first row below
// it (row) holds cells beyond it: no table has a header of one column.
// A reader that streams its rows, and so cannot look below, gives row 0.
// It says how to keep the title: as a site key (a key–value row, or a
// "# site:" line in CSV; see MetaKeys).
func titleRowError(file, sheet string, headerRow int, title string, row int) *ParseError {
	shown := echo(strings.TrimSpace(title))
	keep := fmt.Sprintf("%s,%s (or a line %q)", MetaSite, csvCell(shown), "# "+MetaSite+": "+shown)
	if sheet != "" {
		a1, _ := excelize.CoordinatesToCellName(1, headerRow)
		b1, _ := excelize.CoordinatesToCellName(2, headerRow)
		keep = fmt.Sprintf("%s in %s, the name in %s, each in a cell of its own", MetaSite, a1, b1)
	}
	below := fmt.Sprintf(" (row %d below it holds more)", row)
	if row <= 0 {
		below = ""
	}
	return &ParseError{File: file, Sheet: sheet, Row: headerRow, Column: 1,
		Err: fmt.Errorf("a title? row %d (%q) %w%s: delete it, or write it as a site key row: %s",
			headerRow, shown, ErrTitleRow, below, keep)}
}

// headerLike reports a row that reads as a header: no filled cell of it
// is a number (a data row below a header of one column holds some).
func headerLike(rec []string) bool {
	for _, c := range rec {
		if _, err := strconv.ParseFloat(strings.TrimSpace(c), 64); err == nil {
			return false
		}
	}
	return true
}

// csvCell is text written as one CSV field: quoted when it holds a
// comma, a quote or a line end.
func csvCell(s string) string {
	if strings.ContainsAny(s, ",\"\r\n") {
		return `"` + strings.ReplaceAll(s, `"`, `""`) + `"`
	}
	return s
}

// ErrSpilledRow is the cause of a CSV row with more fields than its header
// line, whose last field is named, even when the extra fields are blank: a
// value holding an unquoted comma (most often a decimal comma, 524,8) has
// split in two and shifted the rest of the row one column right.
var ErrSpilledRow = errors.New("more fields than the header line")

// decimalCommaHint is said of a value that looks split by an unquoted
// decimal comma.
const decimalCommaHint = "an unquoted decimal comma?"

// lastSplitPair returns the 0-based index of the last cell of rec that,
// with the cell after it, reads as a number split at a decimal comma
// (see splitPair), or -1.
func lastSplitPair[S ~string | ~[]byte](rec []S) int {
	for i := len(rec) - 2; i >= 0; i-- {
		if splitPair(strings.TrimSpace(string(rec[i])), strings.TrimSpace(string(rec[i+1]))) {
			return i
		}
	}
	return -1
}

// beyondHeader returns the 0-based column of the first cell of rec at or
// after width that is not blank, or -1.
func beyondHeader[S ~string | ~[]byte](rec []S, width int) int {
	for i := width; i < len(rec); i++ {
		if len(strings.TrimSpace(string(rec[i]))) > 0 {
			return i
		}
	}
	return -1
}

// beyondHeaderError is the ParseError of a value text at 0-based column
// col of a row, after the header's last named column.
// In a CSV file (sheet "") it advises quoting a value that holds a comma,
// the usual cause; a sheet's cells hold no separators.
func beyondHeaderError(file, sheet string, row, col int, text string) *ParseError {
	advice := "name its column in the header"
	if sheet == "" {
		advice += ", or quote a value that holds a comma"
	}
	return &ParseError{File: file, Sheet: sheet, Row: row, Column: col + 1, Text: text,
		Err: fmt.Errorf("%w (%q): %s", ErrBeyondHeader, echo(strings.TrimSpace(text)), advice)}
}

// csvSyntaxError is the ParseError of an error of CSV syntax (a quote
// out of place) that encoding/csv found in data, whose first line is line
// first of the file. The error's character offset is turned into the
// field it falls in: the row is the line where that field starts, the
// column its 1-based field number, named from header when the header is
// known; the cause keeps the line and character where the fault was
// found.
func csvSyntaxError(file string, data []byte, first int, header []string, pe *csv.ParseError) *ParseError {
	at := fmt.Errorf("%w (at character %d of line %d)", pe.Err, pe.Column, first+pe.Line-1)
	line, field, ok := csvFieldAt(data, pe.StartLine, pe.Line, pe.Column)
	if !ok {
		return &ParseError{File: file, Row: first + pe.Line - 1, Err: at}
	}
	e := &ParseError{File: file, Row: first + line - 1, Column: field, Err: at}
	if field <= len(header) {
		e.Name = header[field-1]
	}
	return e
}

// csvFieldAt finds, in CSV text, the field holding the byte at 1-based
// character col of 1-based line of the record starting on line start: its
// 1-based number in the record and the line where it starts. Fields are
// read as encoding/csv reads them (RFC 4180; spaces before a field
// skipped); ok is false when the position is not in the text.
func csvFieldAt(data []byte, start, line, col int) (fieldLine, field int, ok bool) {
	i, ln := 0, 1
	for ln < start {
		j := bytes.IndexByte(data[i:], '\n')
		if j < 0 {
			return 0, 0, false
		}
		i, ln = i+j+1, ln+1
	}
	field, fieldLine = 1, ln
	atStart, quoted := true, false
	lineStart := i
	for ; i <= len(data); i++ {
		if ln > line || (ln == line && i-lineStart+1 >= col) || (i == len(data) && quoted) {
			return fieldLine, field, true
		}
		if i == len(data) {
			break
		}
		c := data[i]
		switch {
		case c == '\n':
			ln, lineStart = ln+1, i+1
			if !quoted {
				return 0, 0, false // the record ended before the position
			}
		case atStart && (c == ' ' || c == '\t'):
		case atStart && c == '"':
			quoted, atStart = true, false
		case quoted && c == '"':
			if i+1 < len(data) && data[i+1] == '"' {
				i++
			} else {
				quoted = false
			}
		case !quoted && c == ',':
			field, fieldLine, atStart = field+1, ln, true
		default:
			atStart = false
		}
	}
	return 0, 0, false
}

// quoteFinder tells which fields of the records encoding/csv reads from
// data were quoted, the records read in order: it keeps the line it has
// reached and the offset of its start, so the text is walked once.
type quoteFinder struct {
	data       []byte
	line, from int // a 1-based line and the offset in data where it starts
}

// fields returns which of the n fields of the record cr last read were
// quoted, nil when none was. encoding/csv gives a quoted field's position
// as that of its opening quote.
func (q *quoteFinder) fields(cr *csv.Reader, n int) []bool {
	var out []bool
	for i := 0; i < n; i++ {
		line, col := cr.FieldPos(i)
		for q.line < line {
			j := bytes.IndexByte(q.data[q.from:], '\n')
			if j < 0 {
				return out
			}
			q.line, q.from = q.line+1, q.from+j+1
		}
		if at := q.from + col - 1; q.line == line && at >= 0 && at < len(q.data) && q.data[at] == '"' {
			if out == nil {
				out = make([]bool, n)
			}
			out[i] = true
		}
	}
	return out
}

// extraFieldsError is the error of a row rec (at row of file and sheet)
// with cells beyond the width columns its header names: a value there
// (ErrBeyondHeader at its cell; in CSV, naming the split number before it
// when there is one), or, when fields > 0 (a CSV header line of that many
// fields, its last named), blank fields beyond them (ErrSpilledRow:
// naming the number split at a comma that shifted the row, when one is
// in it; else saying the fields are empty). nil when rec is no wider, or
// its extra fields are blank and fields is 0.
func extraFieldsError[S ~string | ~[]byte](file, sheet string, rec []S, row, width, fields int) *ParseError {
	if c := beyondHeader(rec, width); c >= 0 {
		pe := beyondHeaderError(file, sheet, row, c, string(rec[c]))
		if i := lastSplitPair(rec[:c+1]); sheet == "" && i >= 0 {
			pe.Err = fmt.Errorf("%w (%s %s,%s read as two values?)", pe.Err, decimalCommaHint,
				strings.TrimSpace(string(rec[i])), strings.TrimSpace(string(rec[i+1])))
		}
		return pe
	}
	if fields > 0 && len(rec) > fields {
		pe := &ParseError{File: file, Row: row, Column: fields + 1}
		if i := lastSplitPair(rec); i >= 0 {
			pe.Err = fmt.Errorf("%w (%d fields, the header %d): %s %s,%s read as two values? quote a value that holds a comma, and write numbers with a decimal point",
				ErrSpilledRow, len(rec), fields, decimalCommaHint, strings.TrimSpace(string(rec[i])), strings.TrimSpace(string(rec[i+1])))
			return pe
		}
		// No number split at a comma: the fields beyond are a trailing
		// run of empty ones (beyondHeader found no value there).
		extra := len(rec) - fields
		what := fmt.Sprintf("the %d fields after the header's last are empty: remove them, or name their columns in the header", extra)
		if extra == 1 {
			what = "the field after the header's last is empty: remove it, or name its column in the header"
		}
		pe.Err = fmt.Errorf("%w (%d fields, the header %d): %s", ErrSpilledRow, len(rec), fields, what)
		return pe
	}
	return nil
}

// row adds a data row, keeping only the cells under the header; a value
// after the header's last named column is an error (ErrBeyondHeader) at
// its cell, blank cells there being dropped, unless the row is a CSV row
// with more fields than a header line ending in a named column
// (ErrSpilledRow, at the first field beyond it). A first data row wider
// than a header of one cell, and reading as a header itself (headerLike),
// makes that header a title (ErrTitleRow, at it).
func (b *tableBuilder) row(rec []string, row int) error {
	if len(rec) > len(b.t.Header) && len(b.t.Header) == 1 && len(b.t.Records) == 0 && beyondHeader(rec, 1) >= 0 && headerLike(rec) {
		return titleRowError(b.t.File, b.t.Sheet, b.t.HeaderRow, b.t.Header[0], row)
	}
	if len(rec) > len(b.t.Header) {
		if pe := extraFieldsError(b.t.File, b.t.Sheet, rec, row, len(b.t.Header), b.fields); pe != nil {
			return pe
		}
		rec = rec[:len(b.t.Header)]
	}
	cells := trimAll(rec)
	for len(cells) > 0 && cells[len(cells)-1] == "" {
		cells = cells[:len(cells)-1]
	}
	b.cells += len(b.t.Header)
	pos := &ParseError{File: b.t.File, Sheet: b.t.Sheet, Row: row}
	switch {
	case len(b.t.Records) >= b.lim.Rows:
		pos.Err = fmt.Errorf("the table %w of %d rows: raise it with %s=ROWS", ErrTooManyRows, b.lim.Rows, EnvMaxRows)
		return pos
	case b.cells > b.lim.Cells:
		pos.Err = fmt.Errorf("the table %w of %d cells (%d columns): raise it with %s=CELLS", ErrTooManyCells, b.lim.Cells, len(b.t.Header), EnvMaxCells)
		return pos
	}
	b.t.Records = append(b.t.Records, Record{Row: row, Cells: cells})
	return nil
}

// ParseCSV reads a comma-separated table of UTF-8 text (text that is not,
// UTF-16, binary data, another encoding, a workbook, a tab-separated
// table, lines ended by carriage returns alone, is refused saying what it
// is; Excel's separator hint "sep=," on the first line is skipped, a hint
// of another separator refused). Lines starting with '#' are
// comments ("# key: value" lines above the header are kept in Meta), a
// byte-order mark is dropped, blank lines are skipped, and a row keeps only
// the cells under the header: blank cells after the header's last named
// column are dropped, a value there is an error at its cell
// (ErrBeyondHeader). A quote out of place is an error at the row where
// its field starts and at that field (see csvSyntaxError). A table beyond
// the limits (see Limits) is an error that says the limit, and so is a
// record longer than MaxLineBytes (ErrLongLine, at its line), refused
// before its fields are split.
func ParseCSV(r io.Reader, name string) (*Table, error) {
	if _, err := EnvLimits(); err != nil {
		return nil, err
	}
	data, err := io.ReadAll(r)
	if err != nil {
		return nil, &ParseError{File: name, Err: err}
	}
	return parseCSVData(data, name)
}

// parseCSVData is ParseCSV of text held in memory, which it does not copy.
func parseCSVData(data []byte, name string) (*Table, error) {
	b, err := newTableBuilder(name, "")
	if err != nil {
		return nil, err
	}
	data = bytes.TrimPrefix(data, []byte("\ufeff"))
	if err := sniffText(data, name); err != nil {
		return nil, err
	}
	if line := longRecord(data); line > 0 {
		return nil, longLineError(name, line)
	}
	if data, err = dropSeparatorHint(data, name); err != nil {
		return nil, err
	}
	b.t.Meta = csvMeta(data)
	cr := csv.NewReader(bytes.NewReader(data))
	cr.Comment = '#'
	cr.FieldsPerRecord = -1
	cr.TrimLeadingSpace = true
	hasQuotes, quotes := bytes.IndexByte(data, '"') >= 0, quoteFinder{data: data, line: 1}
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				return nil, csvSyntaxError(name, data, 1, b.t.Header, pe)
			}
			return nil, &ParseError{File: name, Err: err}
		}
		line, _ := cr.FieldPos(0)
		if blank(rec) {
			continue
		}
		if b.t.Header == nil {
			if len(rec) == 1 && strings.Contains(rec[0], ";") {
				return nil, &ParseError{File: name, Row: line, Err: ErrSemicolon}
			}
			if m, extra, ok := siteRow(b.t.Meta, rec, false, false); ok { // a site block's key row saved as CSV
				b.t.Meta = m
				if len(extra) > 0 {
					b.t.Warnings = append(b.t.Warnings, siteExtrasWarning(name, fieldNames(line, extra)))
				}
				continue
			}
			if err := b.header(rec, line); err != nil {
				return nil, err
			}
			continue
		}
		if err := b.row(rec, line); err != nil {
			return nil, err
		}
		if hasQuotes {
			b.t.Records[len(b.t.Records)-1].quoted = quotes.fields(cr, len(rec))
		}
	}
	if b.t.Header == nil {
		return nil, &ParseError{File: name, Err: errors.New("empty file: no header row")}
	}
	if rows := commentedData(data, b.t.HeaderRow); len(rows) > 0 {
		b.t.Warnings = append(b.t.Warnings, fmt.Sprintf("%s: %s below the header %s with '#' and %s values, as data rows do (the first, line %d), "+
			"but '#' begins a comment line, so %s not read: write a row's number without '#' if %s data", name,
			rating.Counted(len(rows), "line", "lines"), rating.Agree(len(rows), "starts", "start"), rating.Agree(len(rows), "holds", "hold"), rows[0],
			rating.Agree(len(rows), "it was", "they were"), rating.Agree(len(rows), "it is", "they are")))
	}
	return b.t, nil
}

// ErrNoVisibleSheet is the cause of a workbook, read with no sheet named,
// all of whose sheets are hidden.
var ErrNoVisibleSheet = errors.New("every sheet is hidden: name the sheet to read")

// sheetVisible reports whether a sheet of an open workbook is shown (not
// hidden or very hidden). A sheet whose state cannot be read counts as
// shown.
func sheetVisible(f *excelize.File, sheet string) bool {
	visible, err := f.GetSheetVisible(sheet)
	return err != nil || visible
}

// hiddenSheetWarning is the warning given when a hidden sheet is read
// because it was named.
func hiddenSheetWarning(path, sheet string) string {
	return fmt.Sprintf("%s['%s']: the sheet is hidden in the workbook: check it is the one meant", path, sheet)
}

// chooseSheet returns the sheet of an open workbook a reader reads:
// sheet itself when named (it must exist; a hidden one is read, with a
// warning), or else the first visible sheet, a hidden sheet before it
// being passed over (it may hold an old survey). Every reader of a
// workbook sheet chooses it here. Errors: no such sheet, no sheets,
// ErrNoVisibleSheet, and the errors of the sheet's scan (ErrRowOrder at
// the row that does not rise, ErrWorkbookZip). Its formulas with no saved
// value (the scan's unsaved cells) are the reader's to refuse, in the
// rows and columns it reads (see Table.unsavedIn).
func chooseSheet(f *inputBook, path, sheet string) (string, []string, error) {
	sheet, warnings, err := pickSheet(f.File, path, sheet)
	if err != nil {
		return sheet, warnings, err
	}
	if !f.bookWarningsOnce {
		warnings = append(warnings, f.bookWarnings(path)...)
	}
	if _, err := f.scans.scan(sheet); err != nil {
		pe := &ParseError{File: path, Sheet: sheet, Err: err}
		if se := (*scanError)(nil); errors.As(err, &se) {
			pe.Row, pe.Column = se.row, se.col
		}
		return sheet, warnings, pe
	}
	return sheet, warnings, nil
}

// linksWarning is the warning of a workbook that links to other
// workbooks (links, see externalLinks), "" when it links to none.
func linksWarning(path string, links []string) string {
	if len(links) == 0 {
		return ""
	}
	return fmt.Sprintf("%s: the workbook takes values from other workbooks (%s): they are read as last saved in it, not from those files, which are never opened", path, strings.Join(links, ", "))
}

// pickSheet is chooseSheet without the scan of the sheet.
func pickSheet(f *excelize.File, path, sheet string) (string, []string, error) {
	sheets := f.GetSheetList()
	if sheet != "" {
		if idx, _ := f.GetSheetIndex(sheet); idx < 0 {
			return "", nil, &ParseError{File: path, Sheet: sheet, Err: fmt.Errorf("no such sheet (sheets: %s)", strings.Join(sheets, ", "))}
		}
		// The sheet as the workbook names it: a name is found in any
		// case, and the sheet's scan and messages go by its own name.
		for _, s := range sheets {
			if strings.EqualFold(s, sheet) {
				sheet = s
				break
			}
		}
		if !sheetVisible(f, sheet) {
			return sheet, []string{hiddenSheetWarning(path, sheet)}, nil
		}
		return sheet, nil, nil
	}
	if len(sheets) == 0 {
		return "", nil, &ParseError{File: path, Err: errors.New("workbook has no sheets")}
	}
	for _, s := range sheets {
		if sheetVisible(f, s) {
			return s, nil, nil
		}
	}
	return "", nil, &ParseError{File: path, Err: fmt.Errorf("%w (sheets: %s)", ErrNoVisibleSheet, strings.Join(sheets, ", "))}
}

// sheetTable reads a table from a sheet of an open workbook (sheet "" is
// the first visible sheet, see chooseSheet). Cells are read raw, numbers
// as written, but as a spreadsheet shows them where the two differ (a
// boolean, a percent, a date: see inputBook.shown). A value after the
// header's last named column is an error at its cell (ErrBeyondHeader), as
// in ParseCSV. Two-cell rows above the header whose first cell is one of
// MetaKeys are kept in Meta. A formula with no saved value in the
// header or above it (the site block) is an error at its cell
// (ErrFormulaNoValue); below the header it is kept for the reader, which
// refuses those of the columns it reads (see Table.unsavedIn).
func sheetTable(f *inputBook, path, sheet string) (*Table, error) {
	sheets := f.GetSheetList()
	sheet, warnings, err := chooseSheet(f, path, sheet)
	if err != nil {
		return nil, err
	}
	b, err := newTableBuilder(path, sheet)
	if err != nil {
		return nil, err
	}
	b.t.Sheets = sheets
	b.t.Warnings = warnings
	unsaved := f.scans.done[sheet].unsaved
	b.t.Date1904 = f.date1904
	var rowWarnings []string
	b.t.Meta, rowWarnings, err = f.sheetRows(path, sheet, b.t.Meta, func(n int, rec []string, header bool) (bool, error) {
		if header {
			if err := b.header(rec, n); err != nil {
				return false, err
			}
			return false, unsavedError(path, sheet, nil, unsaved, 1, int64(n), nil, "in the header and above it")
		}
		return false, b.row(rec, n)
	})
	if err != nil {
		return nil, err
	}
	b.t.Warnings = append(b.t.Warnings, rowWarnings...)
	if b.t.Header == nil {
		if err := unsavedError(path, sheet, nil, unsaved, 1, MaxSheetRows, nil, "in the sheet"); err != nil {
			return nil, err
		}
		return nil, &ParseError{File: path, Sheet: sheet, Err: errors.New("empty sheet: no header row")}
	}
	b.t.unsaved = unsaved
	return b.t, nil
}

// sheetRows reads the rows of a sheet of an input workbook in order,
// numbered from 1 and as shown (inputBook.shown). Blank rows and the rows
// that belong to no table (siteRow: comment rows, and above the header
// the key rows of the site block, whose words it adds to meta) are passed
// over; the first other row is the header and the rest are data rows.
// each is given the header (header true) and then each data row, and may
// stop the reading. It returns meta with the sheet's warnings (the cells
// beside the site block's values, which are not read; the hidden rows
// read, see hiddenRowsWarning) and the first error: each's, or a
// ParseError where the sheet cannot be read.
func (f *inputBook) sheetRows(path, sheet string, meta map[string]string, each func(n int, rec []string, header bool) (stop bool, err error)) (map[string]string, []string, error) {
	rows, err := f.Rows(sheet)
	if err != nil {
		return meta, nil, &ParseError{File: path, Sheet: sheet, Err: err}
	}
	defer rows.Close()
	hidden := f.scans.done[sheet].hidden
	var extras []string
	var hiddenRead []int
	read := func(n int) {
		for len(hidden) > 0 && hidden[0] < int64(n) {
			hidden = hidden[1:]
		}
		if len(hidden) > 0 && hidden[0] == int64(n) {
			hiddenRead = append(hiddenRead, n)
		}
	}
	warnings := func() []string {
		var out []string
		where := fmt.Sprintf("%s['%s']", path, sheet)
		if w := siteExtrasWarning(where, extras); w != "" {
			out = append(out, w)
		}
		if w := hiddenRowsWarning(where, hiddenRead); w != "" {
			out = append(out, w)
		}
		return out
	}
	headerRead := false
	for n := 1; rows.Next(); n++ {
		rec, err := rows.Columns(excelize.Options{RawCellValue: true})
		if err != nil {
			return meta, warnings(), &ParseError{File: path, Sheet: sheet, Row: n, Err: err}
		}
		if blank(rec) {
			continue
		}
		f.shown(sheet, n, rec)
		if m, extra, ok := siteRow(meta, rec, true, headerRead); ok {
			meta = m
			for _, c := range extra {
				name, _ := excelize.CoordinatesToCellName(c+1, n)
				extras = append(extras, name)
			}
			continue
		}
		read(n)
		stop, err := each(n, rec, !headerRead)
		if err != nil {
			return meta, warnings(), err
		}
		headerRead = true
		if stop {
			break
		}
	}
	if err := rows.Error(); err != nil {
		return meta, warnings(), &ParseError{File: path, Sheet: sheet, Err: err}
	}
	return meta, warnings(), nil
}

// maxHiddenListed bounds how many hidden rows a warning lists.
const maxHiddenListed = 10

// hiddenRowsWarning is the warning of the hidden rows of a sheet that
// were read (rows, rising), "" when none were: a hidden row is data the
// crew kept, so it is read, but it may be a shot set aside. where is the
// file and sheet.
func hiddenRowsWarning(where string, rows []int) string {
	if len(rows) == 0 {
		return ""
	}
	var list []string
	for i, r := range rows {
		if i == maxHiddenListed {
			list = append(list, fmt.Sprintf("and %d more", len(rows)-maxHiddenListed))
			break
		}
		list = append(list, strconv.Itoa(r))
	}
	n := len(rows)
	return fmt.Sprintf("%s: %s %s %s hidden in the sheet but read, as every row is: delete %s if %s not meant to be read", where,
		rating.Agree(n, "row", "rows"), strings.Join(list, ", "), rating.Agree(n, "is", "are"),
		rating.Agree(n, "it", "them"), rating.Agree(n, "it is", "they are"))
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

// ErrAliasColumns is the cause of a header naming one column under two of
// its names (stage and gauge_height).
var ErrAliasColumns = errors.New("keep one")

// Require returns the index of a required column, known by any of names
// (the first is its name, the others its aliases). A missing column is a
// ParseError naming it (ErrMissingColumn); a header holding it under two
// of its names is a ParseError at the later of the two columns
// (ErrAliasColumns: "both stage and gauge_height: keep one").
func (t *Table) Require(names ...string) (int, error) {
	i := t.Column(names...)
	if i < 0 {
		return -1, t.missingColumn(names)
	}
	for _, alias := range names {
		j := t.Column(alias)
		if j < 0 || j == i {
			continue
		}
		first, second := min(i, j), max(i, j)
		return -1, &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Column: second + 1, Name: t.Header[second],
			Err: fmt.Errorf("both %s and %s: %w", echo(t.Header[first]), echo(t.Header[second]), ErrAliasColumns)}
	}
	return i, nil
}

// missingColumn is the error of Require for a column known by names that
// the header lacks (ErrMissingColumn): it names the column's aliases, and,
// for a header that is one of the names
// with a unit run on ("gauge_height_ft", "discharge cfs"), points at that
// column with the form to write ("gauge_height (ft)").
func (t *Table) missingColumn(names []string) *ParseError {
	want := fmt.Sprintf("%q", names[0])
	if len(names) > 1 {
		quoted := make([]string, len(names)-1)
		for k, n := range names[1:] {
			quoted[k] = fmt.Sprintf("%q", n)
		}
		want += " (or " + strings.Join(quoted, ", ") + ")"
	}
	if pe := t.unitRunOnError(names, want); pe != nil {
		return pe
	}
	return &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Name: names[0],
		Err: fmt.Errorf("%w: the header needs a column named %s (found: %s)", ErrMissingColumn, want, headerList(t.Header))}
}

// unitRunOnError is the ParseError (ErrMissingColumn) of a column known
// by names that the header lacks, want saying the names it needs, at the
// first header cell that is one of names with a unit run on or after a
// comma ("gauge_height_ft", "station, m"), with the form to write
// ("station (m)"); nil when no cell is so.
func (t *Table) unitRunOnError(names []string, want string) *ParseError {
	for c, h := range t.Header {
		name, unit, ok := unitRunOn(h, names)
		if !ok {
			continue
		}
		how := "run on"
		if strings.Contains(h, ",") {
			how = "after a comma"
		}
		return &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Column: c + 1, Name: names[0],
			Err: fmt.Errorf("%w: the header needs a column named %s; %q looks like %s with its unit %s: write %q (a unit goes in brackets after the name)",
				ErrMissingColumn, want, echo(h), name, how, name+" ("+unit+")")}
	}
	return nil
}

// unitRunOn reports a header that is one of names followed, after a space,
// underscore, hyphen, dot or comma, by a unit of unitWords and nothing
// else ("gauge_height_ft", "Discharge-cfs", "station, m"), returning that
// name and the unit as written.
func unitRunOn(h string, names []string) (name, unit string, ok bool) {
	h = strings.TrimSpace(h)
	if strings.ContainsAny(h, "([") {
		return "", "", false
	}
	hn := normName(h)
	for _, n := range names {
		nn := normName(n)
		if len(hn) <= len(nn)+1 || !strings.HasPrefix(hn, nn) || !strings.ContainsRune("_.,", rune(hn[len(nn)])) {
			continue
		}
		rest := strings.TrimSpace(h[len(nn)+1:])
		if _, known := unitWords[strings.ToLower(rest)]; known {
			return n, rest, true
		}
	}
	return "", "", false
}

// unreadWarning is the warning of column c, which its reader does not
// read, at the cell of rec: "this column is not read, " and why. Every
// reader that warns of an unread column words it so (a section's bank
// marks, a rating's zero-flow column).
func (t *Table) unreadWarning(rec Record, c int, why string) string {
	return t.At(rec, c, errors.New("this column is not read, "+why)).Error()
}

// ownWarnings returns a copy of the table's warnings, to begin the
// warnings of what is read from it: every reader of a table carries them
// (a hidden sheet named, hidden rows read, cells beside the site block,
// '#' lines holding values), however it was read.
func (t *Table) ownWarnings() []string {
	return slices.Clone(t.Warnings)
}

// Optional returns the index of an optional column, known by any of
// names as Require knows it, or -1 when the header has none. A header
// holding it under two of its names is an error, as for Require
// (ErrAliasColumns).
func (t *Table) Optional(names ...string) (int, error) {
	if t.Column(names...) < 0 {
		return -1, nil
	}
	return t.Require(names...)
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

var (
	decimalComma = regexp.MustCompile(`^[-+]?[0-9]*,[0-9]+$`)
	thousands    = regexp.MustCompile(`^[-+]?[1-9][0-9]{0,2}(,[0-9]{3})+(\.[0-9]*)?$`)
)

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

// bounded is Float for a value with a plausible bound: a number beyond
// ±limit is not read (ok false) and is a *ParseError at its cell wrapping
// ErrImplausible, what naming the value ("stage 1e+06 is not a plausible
// value (beyond ±100000)"). A blank cell returns ok false and no error.
func (t *Table) bounded(rec Record, col int, what string, limit float64) (v float64, ok bool, err *ParseError) {
	s := t.Cell(rec, col)
	if s == "" {
		return 0, false, nil
	}
	v, perr := ParseNumber(s)
	switch {
	case perr != nil:
		return 0, false, t.At(rec, col, perr)
	case math.Abs(v) > limit:
		return v, false, t.At(rec, col, implausible(what, v, limit))
	}
	return v, true, nil
}

// number reads a number cell that must be given, within ±limit (see
// bounded); a blank cell is a *ParseError at the cell wrapping
// ErrNotNumber ("stage is blank").
func (t *Table) number(rec Record, col int, what string, limit float64) (float64, *ParseError) {
	v, ok, err := t.bounded(rec, col, what, limit)
	if err == nil && !ok {
		err = t.At(rec, col, fmt.Errorf("%w: %s is blank", ErrNotNumber, what))
	}
	return v, err
}

// percent reads a number cell of a column in percent: a number, which a
// percent sign may follow, with or without a space (5, 5% and 5 % are
// all 5). A workbook cell with a percent format reads as the percent it
// shows (see inputBook.shown). Blank cells return ok == false and no
// error.
func (t *Table) percent(rec Record, col int) (v float64, ok bool, err error) {
	s := t.Cell(rec, col)
	if s == "" {
		return 0, false, nil
	}
	n := strings.TrimSpace(strings.TrimSuffix(s, "%"))
	v, perr := ParseNumber(n)
	if strings.HasSuffix(n, "%") {
		perr = ErrNotNumber
	}
	if perr != nil {
		return 0, false, t.At(rec, col, perr)
	}
	return v, true, nil
}

// ParseNumber reads a finite decimal number written with a decimal point.
// A comma is refused: followed by three digits it may be a thousands
// separator (ErrThousands), else it is a decimal comma (ErrDecimalComma);
// a percent sign at the end is ErrPercent (only a column in percent takes
// one, see Table.percent); a date or a time of day (2026-06-01, 6/1/2026,
// 10:15, or a date-formatted workbook cell, see inputBook.shown) is
// ErrDateNotNumber.
func ParseNumber(s string) (float64, error) {
	s = strings.TrimSpace(s)
	comma := strings.IndexByte(s, ',') >= 0 // the patterns need one: most cells skip them
	switch {
	case comma && thousands.MatchString(s):
		return 0, ErrThousands
	case comma && decimalComma.MatchString(s):
		return 0, ErrDecimalComma
	case strings.HasSuffix(s, "%"):
		if _, err := ParseNumber(strings.TrimSuffix(s, "%")); err == nil {
			return 0, ErrPercent
		}
	}
	switch strings.ToLower(strings.TrimLeft(s, "+-")) {
	case "nan", "inf", "infinity":
		return 0, subdivide.ErrNotFinite
	}
	if !decimalNumber(s) {
		if dateLike(s) {
			return 0, ErrDateNotNumber
		}
		return 0, ErrNotNumber
	}
	v, err := strconv.ParseFloat(s, 64)
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, subdivide.ErrNotFinite // too large for a number
	}
	if err != nil {
		return 0, ErrNotNumber
	}
	return v, nil
}

// datePattern matches the dates and times a spreadsheet makes of what
// was typed into a cell: ISO 8601 dates (2026-06-01, 2026-06-01T10:15),
// dates with slashes, dots or hyphens (6/1/2026, 01.06.26, 1-6-2026),
// dates with an English month name as spreadsheets export them (1-Jun,
// 1 Jun 2026, Jun-26) and times of day (10:15, 10:15:00).
var datePattern = regexp.MustCompile(`(?i)^(\d{4}-\d{2}-\d{2}([T ]\d{1,2}:\d{2}(:\d{2})?)?|\d{1,2}[/.-]\d{1,2}[/.-]\d{2,4}|\d{1,2}:\d{2}(:\d{2})?|` +
	`\d{1,2}[- ](jan|feb|mar|apr|may|jun|jul|aug|sep|oct|nov|dec)([- ]\d{1,4})?|(jan|feb|mar|apr|may|jun|jul|aug|sep|oct|nov|dec)[- ]\d{1,4})$`)

// dateLike reports text that is a date or a time of day (datePattern).
func dateLike(s string) bool { return datePattern.MatchString(s) }

// decimalNumber reports whether s is a number in decimal notation: an
// optional sign, digits with at most one decimal point, and an optional
// exponent (1.5, -.25, 3e-4). Hexadecimal floats, digit separators and
// the like, which strconv also reads, are refused: a field crew never
// means them.
func decimalNumber(s string) bool {
	i := 0
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits, point := 0, false
mantissa:
	for ; i < len(s); i++ {
		switch c := s[i]; {
		case c >= '0' && c <= '9':
			digits++
		case c == '.' && !point:
			point = true
		default:
			break mantissa
		}
	}
	if digits == 0 {
		return false
	}
	if i == len(s) {
		return true
	}
	if s[i] != 'e' && s[i] != 'E' {
		return false
	}
	i++
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		i++
	}
	start := i
	for i < len(s) && s[i] >= '0' && s[i] <= '9' {
		i++
	}
	return i > start && i == len(s)
}

// SectionSheets lists the visible sheets of a workbook that hold a survey:
// those whose header row has station and elevation columns, in workbook
// order (hidden sheets are passed over).
// A sheet that cannot be read is an error (see SurveySheets to go on).
func SectionSheets(path string) ([]string, error) {
	sheets, err := SurveySheets(path)
	if err != nil {
		return nil, err
	}
	var out []string
	for _, s := range sheets {
		if s.Err != nil {
			return nil, s.Err
		}
		if s.Survey && !s.Hidden {
			out = append(out, s.Sheet)
		}
	}
	return out, nil
}

// SheetSurvey is what SurveySheets tells of one sheet of a workbook.
type SheetSurvey struct {
	// Sheet is the sheet's name.
	Sheet string
	// Survey reports that the sheet's first non-blank row names station
	// (or easting and northing) and elevation columns.
	Survey bool
	// Err is why the sheet could not be read (a *ParseError naming the
	// sheet); Survey is then false.
	Err error
	// Hidden reports a sheet hidden in the workbook.
	Hidden bool
	// Other says why a sheet that could be read holds no survey: the
	// kind of table its header plainly makes it ("a reach table", "a
	// table of gaugings", see Sniff), or that its first row names no
	// station and elevation columns (the row's first cells quoted), or
	// that it is empty; "" for a survey.
	Other string
}

// SurveySheets tells, for every sheet of a workbook in workbook order,
// whether it holds a survey (as SectionSheets does), or why it could not
// be read: a sheet that cannot be read does not keep the others from
// being told. The error is the workbook's, when it cannot be opened.
func SurveySheets(path string) ([]SheetSurvey, error) {
	sheets, _, err := SurveySheetsWarn(path)
	return sheets, err
}

// SurveySheetsWarn is SurveySheets, and also returns the warnings of the
// workbook as a whole (that it takes values from other workbooks), which
// the sheets read from an OpenBook of it do not repeat.
func SurveySheetsWarn(path string) ([]SheetSurvey, []string, error) {
	f, err := openWorkbook(path)
	if err != nil {
		return nil, nil, err
	}
	defer f.Close()
	var out []SheetSurvey
	for _, sheet := range f.GetSheetList() {
		ok, header, err := hasSurveyHeader(f.File, sheet)
		s := SheetSurvey{Sheet: sheet, Survey: ok && err == nil, Hidden: !sheetVisible(f.File, sheet)}
		switch {
		case err != nil:
			s.Err = &ParseError{File: path, Sheet: sheet, Err: err}
		case !ok:
			s.Other = notSurvey(header)
		}
		out = append(out, s)
	}
	return out, f.bookWarnings(path), nil
}

// hasSurveyHeader reports whether the header of a sheet, its first
// non-blank row below the key rows of its site block (see metaRow), names
// station (or easting and northing) and elevation columns. The header is
// returned (nil for a sheet with none).
func hasSurveyHeader(f *excelize.File, sheet string) (bool, []string, error) {
	rows, err := f.Rows(sheet)
	if err != nil {
		return false, nil, err
	}
	defer rows.Close()
	for rows.Next() {
		rec, err := rows.Columns(excelize.Options{RawCellValue: true})
		if err != nil {
			return false, nil, err
		}
		if _, _, taken := siteRow(nil, rec, true, false); blank(rec) || taken {
			continue
		}
		t := &Table{Header: trimAll(rec)}
		coords := hasCoordinates(t)
		return (t.Column(ColStation) >= 0 || coords) && t.Column(elevationNames()...) >= 0, t.Header, nil
	}
	return false, nil, rows.Error()
}

// notSurvey says why a sheet with this header (nil for none) holds no
// survey, for SheetSurvey.Other.
func notSurvey(header []string) string {
	if header == nil {
		return "an empty sheet"
	}
	if kind := sniffTable(&Table{Header: header}).Other; kind != "" {
		return kind
	}
	for len(header) > 0 && header[len(header)-1] == "" {
		header = header[:len(header)-1]
	}
	const shown = 4
	list := headerList(header[:min(len(header), shown)])
	if len(header) > shown {
		list += ", …"
	}
	return fmt.Sprintf("its first row (%s) names no station and elevation columns", list)
}

// maxListed bounds how many header names a message lists.
const maxListed = 12

// headerList lists header names for a message, each echoed short and
// quoted, so that a name holding a comma ("station, m") reads as one.
func headerList(h []string) string {
	var parts []string
	for i, name := range h {
		if i == maxListed {
			parts = append(parts, fmt.Sprintf("and %d more", len(h)-maxListed))
			break
		}
		parts = append(parts, strconv.Quote(echo(name)))
	}
	return strings.Join(parts, ", ")
}
