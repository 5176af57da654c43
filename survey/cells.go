package survey

import (
	"archive/zip"
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"

	"github.com/xuri/excelize/v2"
)

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
	f, err := excelize.OpenReader(bytes.NewReader(data), workbookOptions)
	if err != nil {
		return nil, &ParseError{File: name, Err: fmt.Errorf("cannot open workbook: %w", err)}
	}
	defer f.Close()
	return sheetTable(f, name, sheet)
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
