package survey

import (
	"archive/zip"
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"
	"time"

	"github.com/xuri/excelize/v2"
)

// ErrNotTime is the cause of a cell that is neither a date serial nor a
// date written in one of TimeLayouts.
var ErrNotTime = errors.New("not a date and time (write yyyy-mm-dd hh:mm)")

// TimeLayouts are the text forms of a date-time cell that Table.Time reads,
// tried in order. Day-first and month-first forms (03/04/2026) are left out
// on purpose: they are ambiguous.
var TimeLayouts = []string{
	time.RFC3339,
	"2006-01-02T15:04:05",
	"2006-01-02T15:04",
	"2006-01-02 15:04:05",
	"2006-01-02 15:04",
	"2006-01-02",
}

// Bounds of a spreadsheet date serial Table.Time accepts: 1 is 1900-01-01
// (or 1904-01-02) and 2958465 is 9999-12-31.
const (
	minDateSerial = 1
	maxDateSerial = 2958465
)

// Time parses a date-time cell: a spreadsheet date serial number (in the
// workbook's 1900 or 1904 date system; CSV uses 1900) or text in one of
// TimeLayouts. Times without a zone are returned in UTC, as written.
// Blank cells return ok == false and no error.
func (t *Table) Time(rec Record, col int) (v time.Time, ok bool, err error) {
	s := t.Cell(rec, col)
	if s == "" {
		return time.Time{}, false, nil
	}
	if x, perr := strconv.ParseFloat(s, 64); perr == nil {
		if !(x >= minDateSerial && x <= maxDateSerial) {
			return time.Time{}, false, t.At(rec, col, fmt.Errorf("%w: date serial %s is out of range", ErrNotTime, s))
		}
		tm, cerr := excelize.ExcelDateToTime(x, t.Date1904)
		if cerr != nil {
			return time.Time{}, false, t.At(rec, col, fmt.Errorf("%w: %v", ErrNotTime, cerr))
		}
		// Serials carry no seconds reliably: round to the nearest second.
		return tm.Round(time.Second), true, nil
	}
	text := strings.TrimSpace(s)
	for _, layout := range TimeLayouts {
		if tm, perr := time.Parse(layout, text); perr == nil {
			return tm, true, nil
		}
	}
	return time.Time{}, false, t.At(rec, col, ErrNotTime)
}

// ParseWorkbook reads a table from a sheet of a workbook read from r
// (sheet "" is the first); name is used in messages. It is ReadTable for
// a workbook that is not in a file.
func ParseWorkbook(r io.Reader, name, sheet string) (*Table, error) {
	data, err := io.ReadAll(io.LimitReader(r, MaxWorkbookBytes+1))
	if err != nil {
		return nil, &ParseError{File: name, Err: err}
	}
	if err := CheckWorkbookZip(bytes.NewReader(data), int64(len(data))); err != nil {
		return nil, &ParseError{File: name, Err: err}
	}
	f, err := excelize.OpenReader(bytes.NewReader(data), excelize.Options{RawCellValue: true, UnzipSizeLimit: MaxWorkbookBytes})
	if err != nil {
		return nil, &ParseError{File: name, Err: fmt.Errorf("cannot open workbook: %w", err)}
	}
	defer f.Close()
	return SheetTable(f, name, sheet)
}

// MaxDeflateRatio bounds the ratio of unpacked to packed size of one zip
// entry. Deflate cannot do better than about 1032:1 (RFC 1951: a 258-byte
// match costs at least two bits, from memory), so an entry claiming more
// has a forged size.
const MaxDeflateRatio = 1100

// ErrWorkbookZip is the cause of a workbook whose zip directory cannot be
// trusted.
var ErrWorkbookZip = errors.New("not a usable workbook (damaged or forged zip directory)")

// CheckWorkbookZip checks a workbook's zip directory before the workbook
// is opened: the unpacked size claimed by each entry must be one deflate
// can produce from its packed size, and all entries together must stay
// within MaxWorkbookBytes. The spreadsheet library allocates what an entry
// claims, so a small damaged file could otherwise take gigabytes of memory.
func CheckWorkbookZip(r io.ReaderAt, size int64) error {
	if size > MaxWorkbookBytes {
		return fmt.Errorf("%w: larger than %d bytes", ErrWorkbookZip, int64(MaxWorkbookBytes))
	}
	zr, err := zip.NewReader(r, size)
	if err != nil {
		return fmt.Errorf("%w: %v", ErrWorkbookZip, err)
	}
	var total uint64
	for _, f := range zr.File {
		limit := f.CompressedSize64*MaxDeflateRatio + 1024
		if f.Method == zip.Store {
			limit = f.CompressedSize64
		}
		if f.UncompressedSize64 > limit {
			return fmt.Errorf("%w: %s claims %d bytes from %d", ErrWorkbookZip, f.Name, f.UncompressedSize64, f.CompressedSize64)
		}
		total += f.UncompressedSize64
		if total > MaxWorkbookBytes {
			return fmt.Errorf("%w: unpacks to more than %d bytes", ErrWorkbookZip, int64(MaxWorkbookBytes))
		}
	}
	return nil
}

// checkWorkbookFile runs CheckWorkbookZip on a file.
func checkWorkbookFile(path string) error {
	f, err := os.Open(path)
	if err != nil {
		return err
	}
	defer f.Close()
	st, err := f.Stat()
	if err != nil {
		return err
	}
	return CheckWorkbookZip(f, st.Size())
}
