package survey

import (
	"errors"
	"sync"
)

// OpenBook is a workbook file opened once to read many of its sheets: a
// batch rating every sheet of a workbook reads the file, checks its zip
// directory and parses its workbook part once, not once a sheet (which
// made the time of a batch grow with the square of its sheets). It is
// safe for use by several goroutines; sheets are read one at a time.
//
// The warnings of the workbook as a whole (that it takes values from
// other workbooks) are not repeated with each sheet read from it: the
// caller gives them once, as SurveySheetsWarn returns them when it lists
// the sheets.
type OpenBook struct {
	path string
	mu   sync.Mutex
	book *inputBook
}

// OpenWorkbookFile opens a workbook file for reading sheet by sheet
// (see OpenBook), with the checks of every workbook reader. The error is
// the workbook's, when it cannot be opened.
func OpenWorkbookFile(path string) (*OpenBook, error) {
	f, err := openWorkbook(path)
	if err != nil {
		return nil, err
	}
	f.bookWarningsOnce = true
	return &OpenBook{path: path, book: f}, nil
}

// Path is the workbook's file, as given.
func (b *OpenBook) Path() string { return b.path }

// ErrBookClosed is the cause of a sheet read from an OpenBook after it
// was closed.
var ErrBookClosed = errors.New("the workbook was closed")

// ReadTable reads a table from a sheet of the workbook, as the function
// ReadTable does.
func (b *OpenBook) ReadTable(sheet string) (*Table, error) {
	b.mu.Lock()
	defer b.mu.Unlock()
	if b.book == nil {
		return nil, &ParseError{File: b.path, Sheet: sheet, Err: ErrBookClosed}
	}
	return sheetTable(b.book, b.path, sheet)
}

// Close releases the workbook; sheets can no longer be read from it.
func (b *OpenBook) Close() error {
	b.mu.Lock()
	defer b.mu.Unlock()
	if b.book == nil {
		return nil
	}
	err := b.book.Close()
	b.book = nil
	return err
}
