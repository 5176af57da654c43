package survey

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"regexp"
	"strconv"
	"strings"
	"sync"
	"syscall"
	"unicode/utf8"
)

// Limits bound what is read from one input file, so that a hostile or
// mistaken file cannot take the machine's memory. The defaults can be
// raised for one run with the environment variables named below (see
// EnvLimits).
type Limits struct {
	// Bytes bounds the size of a file read (default DefaultMaxBytes;
	// WETLINE_MAX_BYTES).
	Bytes int64
	// Rows bounds the rows of a table (default DefaultMaxRows;
	// WETLINE_MAX_ROWS).
	Rows int
	// Cells bounds the cells of a table, rows times used columns (default
	// DefaultMaxCells; WETLINE_MAX_CELLS).
	Cells int
	// Readings bounds the rows of a stage record, which is read into
	// compact arrays rather than as a table (default DefaultMaxReadings;
	// WETLINE_MAX_READINGS).
	Readings int
}

// Default limits of an input file.
const (
	DefaultMaxBytes = 512 << 20 // 512 MiB
	DefaultMaxRows  = 1_000_000
	DefaultMaxCells = 10_000_000
	// DefaultMaxReadings is ten years of readings a minute apart (5.3
	// million) with room to spare: 10 million readings took 825 MB at
	// peak to read (the record's 1-minute benchmark scaled, 2-core Xeon).
	DefaultMaxReadings = 10_000_000
)

// Environment variables that raise the limits for one run.
const (
	EnvMaxBytes    = "WETLINE_MAX_BYTES"
	EnvMaxRows     = "WETLINE_MAX_ROWS"
	EnvMaxCells    = "WETLINE_MAX_CELLS"
	EnvMaxReadings = "WETLINE_MAX_READINGS"
)

// Causes of an input that is refused before it is read, for errors.Is.
var (
	ErrNotRegularInput = errors.New("not a regular file (a device, a pipe or a folder): give a file, or - for standard input")
	ErrTooLarge        = errors.New("is larger than the limit")
	ErrTooManyRows     = errors.New("has more rows than the limit")
	ErrTooManyCells    = errors.New("has more cells than the limit")
	ErrUTF16           = errors.New("is UTF-16 text: save it as UTF-8 (CSV UTF-8) and read it again")
	ErrBinary          = errors.New("is not a text table (it holds binary data)")
	ErrWorkbookNamed   = errors.New("is a workbook with another file name: rename it .xlsx")
	ErrTabs            = errors.New("is separated by tabs: save it as comma-separated values")
	ErrNotUTF8         = errors.New("is not UTF-8 text (a byte of another encoding, such as Windows-1252): save it as UTF-8 (CSV UTF-8) and read it again")
	ErrCROnly          = errors.New("ends its lines with carriage returns only (no line feeds): save it with Windows or Unix line endings")
	ErrSeparatorHint   = errors.New("names a separator other than a comma on its first line: save it as comma-separated values")
	ErrStdinTwice      = errors.New("standard input (-) can be read only once")
	ErrJSONInput       = errors.New("is JSON, not a table: give the CSV table (or the workbook) the report was written beside")
	ErrOpenDocument    = errors.New("is an OpenDocument spreadsheet (.ods), which is not read: save it as an Excel workbook (.xlsx) or as CSV")
	ErrLegacyWorkbook  = errors.New("is an Excel 97–2003 workbook (.xls), which is not read: save it as an Excel workbook (.xlsx) or as CSV")
	ErrLongLine        = errors.New("a line longer than the limit")
)

// MaxLineBytes bounds one record of a CSV file: a line, with the lines a
// quoted cell joins to it. A row of a survey, gaugings or a stage record
// is under a hundred bytes, and a workbook's cell holds at most 32 767
// characters (Microsoft, Excel specifications and limits), so a record
// of a mebibyte is no table's row; refusing it as it is read keeps one
// long line (a file of commas, say) from taking memory many times its
// size in fields.
const MaxLineBytes = 1 << 20

// longLineError is the ParseError (ErrLongLine) of a CSV record starting
// at line of file name that is longer than MaxLineBytes.
func longLineError(name string, line int) *ParseError {
	return &ParseError{File: name, Row: line,
		Err: fmt.Errorf("%w of %d bytes (1 MiB) for one CSV record: no table's row is so long, so the file is damaged or not a table", ErrLongLine, MaxLineBytes)}
}

// longRecord returns the line where the first record of CSV text longer
// than MaxLineBytes starts, or 0. A record ends at a line end outside
// double quotes, quotes counted as encoding/csv pairs them in a table
// that parses (an escaped quote, "", counts twice); a quote out of place
// may join the rest of the file into one record, which is then refused
// here at the line of that quote.
func longRecord(data []byte) int {
	line, start := 1, 0
	if bytes.IndexByte(data, '"') < 0 {
		for start < len(data) {
			end := bytes.IndexByte(data[start:], '\n')
			if end < 0 {
				end = len(data) - start
			}
			if end > MaxLineBytes {
				return line
			}
			start += end + 1
			line++
		}
		return 0
	}
	recLine, quoted := 1, false
	for i := 0; ; i++ {
		j := bytes.IndexAny(data[i:], "\"\n")
		if j < 0 {
			i = len(data)
		} else {
			i += j
		}
		if i-start > MaxLineBytes {
			return recLine
		}
		switch {
		case i == len(data):
			return 0
		case data[i] == '"':
			quoted = !quoted
		default:
			line++
			if !quoted {
				start, recLine = i+1, line
			}
		}
	}
}

// ErrLimitValue is the cause of a limit variable (EnvMaxBytes, EnvMaxRows,
// EnvMaxCells, EnvMaxReadings) set to a value that cannot be used.
var ErrLimitValue = errors.New("not a whole number above zero")

// EnvLimits returns the limits in force: the defaults, raised (or lowered)
// by the environment variables EnvMaxBytes, EnvMaxRows, EnvMaxCells and
// EnvMaxReadings,
// read at each call. A variable unset or empty leaves its default; one set
// to anything but a whole number above zero (decimal digits, as 2000000)
// is an error naming the variable and the value, wrapping ErrLimitValue
// (WETLINE_MAX_ROWS "abc": not a whole number above zero). Every reader
// calls it before it opens a file and fails with its error; a program may
// call it first, to report the mistake before any file is read.
func EnvLimits() (Limits, error) {
	size, err := envLimit(EnvMaxBytes, DefaultMaxBytes)
	if err != nil {
		return Limits{}, err
	}
	rows, err := envLimit(EnvMaxRows, DefaultMaxRows)
	if err != nil {
		return Limits{}, err
	}
	cells, err := envLimit(EnvMaxCells, DefaultMaxCells)
	if err != nil {
		return Limits{}, err
	}
	readings, err := envLimit(EnvMaxReadings, DefaultMaxReadings)
	if err != nil {
		return Limits{}, err
	}
	return Limits{Bytes: size, Rows: int(rows), Cells: int(cells), Readings: int(readings)}, nil
}

// envLimit reads one limit variable (see EnvLimits), def when it is unset
// or empty. The value must fit an int.
func envLimit(name string, def int64) (int64, error) {
	s := os.Getenv(name)
	if s == "" {
		return def, nil
	}
	v, err := strconv.ParseInt(s, 10, strconv.IntSize)
	switch {
	case errors.Is(err, strconv.ErrRange) && !strings.HasPrefix(s, "-"):
		return 0, fmt.Errorf("%s %q: %w (at most %d)", name, s, ErrLimitValue, int64(math.MaxInt))
	case err != nil || v <= 0:
		return 0, fmt.Errorf("%s %q: %w", name, s, ErrLimitValue)
	}
	return v, nil
}

// Stdin is the name that reads standard input.
const Stdin = "-"

// openInput opens a file to read. "-" is standard input. Anything but a
// regular file is refused without blocking (a pipe is opened without
// waiting for a writer), and so is a file larger than the limit. The
// reader returned gives at most the limit plus one byte, so a standard
// input too long is seen as such. A file that cannot be opened is a
// ParseError naming it, its cause the system's (x.csv: no such file or
// directory; errors.Is finds fs.ErrNotExist).
func openInput(path string) (io.ReadCloser, int64, error) {
	lim, err := EnvLimits()
	if err != nil {
		return nil, 0, err
	}
	if path == Stdin {
		if data, ok := stdin.buffered(); ok {
			return io.NopCloser(bytes.NewReader(data)), int64(len(data)), nil
		}
		return io.NopCloser(io.LimitReader(os.Stdin, lim.Bytes+1)), -1, nil
	}
	f, err := os.OpenFile(path, os.O_RDONLY|syscall.O_NONBLOCK, 0)
	if pe := (*os.PathError)(nil); errors.As(err, &pe) {
		return nil, 0, &ParseError{File: path, Err: pe.Err} // x.csv: no such file or directory
	}
	if err != nil {
		return nil, 0, err
	}
	st, err := f.Stat()
	if err != nil {
		f.Close()
		return nil, 0, err
	}
	if !st.Mode().IsRegular() {
		f.Close()
		return nil, 0, &ParseError{File: path, Err: ErrNotRegularInput}
	}
	if st.Size() > lim.Bytes {
		f.Close()
		return nil, 0, &ParseError{File: path, Err: fmt.Errorf("%w of %d bytes (%d bytes): raise it with %s=BYTES", ErrTooLarge, lim.Bytes, st.Size(), EnvMaxBytes)}
	}
	return f, st.Size(), nil
}

// stdinBuffer holds standard input once a reader has read it whole, so
// a command that reads "-" twice (once to tell a survey from a rating,
// once to read it; a second sheet of a workbook) reads the same bytes.
// Standard input can be read only once: a second read of the stream
// itself would find it empty.
type stdinBuffer struct {
	mu   sync.Mutex
	read bool
	data []byte
	err  error
}

// stdin is the process's standard input, read at most once.
var stdin stdinBuffer

// buffered returns standard input when it has been read whole.
func (b *stdinBuffer) buffered() ([]byte, bool) {
	b.mu.Lock()
	defer b.mu.Unlock()
	return b.data, b.read && b.err == nil
}

// all reads standard input whole the first time (at most limit+1 bytes,
// so one too long is seen as such) and returns the same bytes, or the
// same error, every time after.
func (b *stdinBuffer) all(limit int64) ([]byte, error) {
	b.mu.Lock()
	defer b.mu.Unlock()
	if !b.read {
		b.read = true
		b.data, b.err = io.ReadAll(io.LimitReader(os.Stdin, limit+1))
	}
	return b.data, b.err
}

// readInput reads a whole input file (see openInput). Standard input is
// read once and kept (see stdinBuffer).
func readInput(path string) ([]byte, error) {
	lim, err := EnvLimits()
	if err != nil {
		return nil, err
	}
	if path == Stdin {
		data, err := stdin.all(lim.Bytes)
		if err != nil {
			return nil, &ParseError{File: path, Err: err}
		}
		if int64(len(data)) > lim.Bytes {
			return nil, &ParseError{File: path, Err: fmt.Errorf("%w of %d bytes: raise it with %s=BYTES", ErrTooLarge, lim.Bytes, EnvMaxBytes)}
		}
		return data, nil
	}
	r, size, err := openInput(path)
	if err != nil {
		return nil, err
	}
	defer r.Close()
	var buf bytes.Buffer
	if size >= 0 {
		buf.Grow(int(size) + bytes.MinRead) // read at once, not by doubling
	}
	_, err = buf.ReadFrom(r)
	data := buf.Bytes()
	if err != nil {
		return nil, &ParseError{File: path, Err: err}
	}
	if int64(len(data)) > lim.Bytes {
		return nil, &ParseError{File: path, Err: fmt.Errorf("%w of %d bytes: raise it with %s=BYTES", ErrTooLarge, lim.Bytes, EnvMaxBytes)}
	}
	return data, nil
}

// zipMagic starts every zip file, and so every xlsx workbook.
var zipMagic = []byte("PK\x03\x04")

// compoundMagic starts every OLE2 compound file, and so every Excel
// 97–2003 workbook (.xls) (Microsoft, [MS-CFB] Compound File Binary File
// Format, section 2.2, the header signature).
var compoundMagic = []byte{0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1}

// sniffBytes is how much of the head of a file sniffKind and tabbedHead
// look at.
const sniffBytes = 4096

// sniffText refuses data that is not a UTF-8 text table, saying what it
// is: a workbook, UTF-16 text, binary data, text of another encoding (at
// its line and field), lines ended by carriage returns alone. The first
// line is also checked for tabs where commas belong (at its line).
func sniffText(data []byte, name string) error {
	head := data[:min(len(data), sniffBytes)]
	if err := sniffKind(head, name); err != nil {
		return err
	}
	if err := utf8Error(data, name, 1); err != nil {
		return err
	}
	if bytes.IndexByte(data, '\n') < 0 && bytes.IndexByte(data, '\r') >= 0 {
		return &ParseError{File: name, Err: ErrCROnly}
	}
	return tabbedHead(head, name)
}

// sniffKind refuses a file whose head (its first sniffBytes, after a
// byte-order mark) shows it is no text table: a workbook (an Excel
// 97–2003 one among them), UTF-16 text, binary data (at the line and
// field of its first NUL byte) or JSON.
func sniffKind(head []byte, name string) error {
	fail := func(err error) error { return &ParseError{File: name, Err: err} }
	switch {
	case bytes.HasPrefix(head, zipMagic) && openDocument(head):
		return fail(ErrOpenDocument)
	case bytes.HasPrefix(head, zipMagic):
		return fail(ErrWorkbookNamed)
	case bytes.HasPrefix(head, compoundMagic):
		return fail(ErrLegacyWorkbook)
	case bytes.HasPrefix(head, []byte{0xFF, 0xFE}), bytes.HasPrefix(head, []byte{0xFE, 0xFF}):
		return fail(ErrUTF16)
	case bytes.IndexByte(head, 0) >= 0:
		if utf16Like(head) {
			return fail(ErrUTF16)
		}
		row, col := textPosition(head, bytes.IndexByte(head, 0))
		return &ParseError{File: name, Row: row, Column: col, Err: fmt.Errorf("%w: a NUL byte in this field", ErrBinary)}
	case jsonLike(head):
		return fail(ErrJSONInput)
	}
	return nil
}

// openDocument reports the head of a zip archive that is an OpenDocument
// file: its first entry, stored, is the mimetype naming an OpenDocument
// type (OASIS OpenDocument 1.2, part 3, 3.3).
func openDocument(head []byte) bool {
	return bytes.Contains(head[:min(len(head), 200)], []byte("application/vnd.oasis.opendocument"))
}

// jsonLike reports text that opens as a JSON object or array does: a
// brace or a bracket, then (spaces aside) a quoted key, a value or the
// close. No table's header starts so.
func jsonLike(head []byte) bool {
	t := bytes.TrimLeft(head, " \t\r\n")
	if len(t) < 2 || (t[0] != '{' && t[0] != '[') {
		return false
	}
	rest := bytes.TrimLeft(t[1:], " \t\r\n")
	if len(rest) == 0 {
		return false
	}
	switch c := rest[0]; {
	case t[0] == '{':
		return c == '"' || c == '}'
	default:
		return c == '{' || c == '[' || c == '"' || c == ']' || c == '-' || (c >= '0' && c <= '9')
	}
}

// utf8Error returns nil for UTF-8 text, else a ParseError (ErrNotUTF8) at
// the line and field of the first byte that is not, counting the lines of
// data from line (the line data starts on).
func utf8Error(data []byte, name string, line int) error {
	if utf8.Valid(data) {
		return nil
	}
	row, col := textPosition(data, invalidUTF8(data))
	return &ParseError{File: name, Row: line + row - 1, Column: col, Err: ErrNotUTF8}
}

// tabbedHead refuses a head whose first line that is neither blank nor a
// comment holds tabs and no comma (ErrTabs at that line).
func tabbedHead(head []byte, name string) error {
	for i, line := range bytes.Split(head, []byte("\n")) {
		line = bytes.TrimSpace(line)
		if len(line) == 0 || line[0] == '#' {
			continue
		}
		if bytes.IndexByte(line, '\t') >= 0 && bytes.IndexByte(line, ',') < 0 {
			return &ParseError{File: name, Row: i + 1, Err: ErrTabs}
		}
		break
	}
	return nil
}

// invalidUTF8 returns the offset of the first byte of data that is not
// part of a valid UTF-8 sequence (len(data) if there is none).
func invalidUTF8(data []byte) int {
	for i := 0; i < len(data); {
		r, n := utf8.DecodeRune(data[i:])
		if r == utf8.RuneError && n <= 1 {
			return i
		}
		i += n
	}
	return len(data)
}

// textPosition returns the 1-based line and CSV field of byte offset off
// of comma-separated text: fields are counted by the commas before it on
// its record, commas and line ends inside double quotes not counting as
// separators (the line is the physical line).
func textPosition(data []byte, off int) (line, field int) {
	line, field = 1, 1
	quoted := false
	for _, c := range data[:min(off, len(data))] {
		switch {
		case c == '"':
			quoted = !quoted
		case c == '\n':
			line++
			if !quoted {
				field = 1
			}
		case c == ',' && !quoted:
			field++
		}
	}
	return line, field
}

// excelSeparatorHint is the first line Excel reads as the separator of
// the lines below ("sep=," and the like).
var excelSeparatorHint = regexp.MustCompile(`(?i)^sep=(.)?\s*$`)

// dropSeparatorHint drops a first line "sep=," (see separatorHint),
// keeping its line end so that the line count holds and the header below
// it is read.
func dropSeparatorHint(data []byte, name string) ([]byte, error) {
	end := bytes.IndexByte(data, '\n')
	if end < 0 {
		end = len(data)
	}
	hint, err := separatorHint(bytes.TrimRight(data[:end], "\r"), name)
	if err != nil || !hint {
		return data, err
	}
	return data[end:], nil
}

// separatorHint reports whether line, the first line of a CSV file
// without its line end, is Excel's separator hint "sep=," (to be
// skipped); a hint of another separator is a ParseError at line 1
// (ErrSeparatorHint). Every CSV reader checks its first line here.
func separatorHint(line []byte, name string) (bool, error) {
	m := excelSeparatorHint.FindSubmatch(line)
	if m == nil {
		return false, nil
	}
	if string(m[1]) != "," {
		return false, &ParseError{File: name, Row: 1, Err: fmt.Errorf("%w (%s)", ErrSeparatorHint, bytes.TrimSpace(line))}
	}
	return true, nil
}

// utf16Like reports text whose every other byte is zero: UTF-16 without a
// byte-order mark.
func utf16Like(b []byte) bool {
	zeros := 0
	for i := 1; i < len(b); i += 2 {
		if b[i] == 0 {
			zeros++
		}
	}
	return zeros > len(b)/4
}

// maxEcho bounds how much of a cell or header a message repeats.
const maxEcho = 40

// echo returns text fit to repeat in a one-line message: control
// characters shown as escapes, and long text cut with its length said.
func echo(s string) string {
	cut := ""
	if r := []rune(s); len(r) > maxEcho {
		cut = fmt.Sprintf("… (%d characters)", len(r))
		s = string(r[:maxEcho])
	}
	var b strings.Builder
	for _, r := range s {
		if r < 0x20 || r == 0x7f || (r >= 0x80 && r < 0xa0) || r == utf8.RuneError {
			b.WriteString(strconv.QuoteRuneToASCII(r))
			continue
		}
		b.WriteRune(r)
	}
	return b.String() + cut
}
