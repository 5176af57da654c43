package survey

import (
	"archive/zip"
	"bufio"
	"errors"
	"fmt"
	"io"
	"strings"
)

// ParseWorkbook reads a table from a sheet of a workbook read from r
// (sheet "" is the first); name is used in messages. It is ReadTable for
// a workbook that is not in a file.
func ParseWorkbook(r io.Reader, name, sheet string) (*Table, error) {
	lim, err := EnvLimits()
	if err != nil {
		return nil, err
	}
	data, err := io.ReadAll(io.LimitReader(r, lim.Bytes+1))
	if err != nil {
		return nil, &ParseError{File: name, Err: err}
	}
	if int64(len(data)) > lim.Bytes {
		return nil, &ParseError{File: name, Err: fmt.Errorf("%w of %d bytes: raise it with %s=BYTES", ErrTooLarge, lim.Bytes, EnvMaxBytes)}
	}
	f, err := openWorkbookBytes(data, name)
	if err != nil {
		return nil, err
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
	for _, f := range zr.File {
		if strings.HasPrefix(f.Name, "xl/worksheets/") && strings.HasSuffix(f.Name, ".xml") {
			if err := checkRowOrder(f); err != nil {
				return err
			}
		}
	}
	return nil
}

// ErrRowOrder is the cause of a sheet whose rows are out of order or
// repeated, which a spreadsheet program never writes and a reader could
// only guess at.
var ErrRowOrder = errors.New("a sheet's rows are out of order or repeated")

// checkRowOrder scans a worksheet's XML for its row elements and checks
// their numbers (the r attribute) rise strictly.
func checkRowOrder(f *zip.File) error {
	rc, err := f.Open()
	if err != nil {
		return fmt.Errorf("%w: %s: %v", ErrWorkbookZip, f.Name, err)
	}
	defer rc.Close()
	sc := rowScanner{br: bufio.NewReaderSize(rc, 64<<10)}
	last := int64(0)
	for {
		n, ok, err := sc.next()
		if err != nil {
			return fmt.Errorf("%w: %s: %v", ErrWorkbookZip, f.Name, err)
		}
		if !ok {
			return nil
		}
		if n > 0 && n <= last {
			return fmt.Errorf("%w (%s: row %d after row %d)", ErrRowOrder, f.Name, n, last)
		}
		if n > 0 {
			last = n
		}
	}
}

// rowScanner finds the row elements of worksheet XML without decoding
// it: each "<row" start tag and its r attribute (0 when absent).
type rowScanner struct {
	br *bufio.Reader
}

// next returns the number of the next row element; ok is false at the end.
func (s *rowScanner) next() (n int64, ok bool, err error) {
	for {
		if _, err := s.br.ReadSlice('<'); err == io.EOF {
			return 0, false, nil
		} else if err != nil && err != bufio.ErrBufferFull {
			return 0, false, err
		}
		tag, err := s.br.Peek(4)
		if err == io.EOF {
			return 0, false, nil
		}
		if err != nil {
			return 0, false, err
		}
		if string(tag[:3]) != "row" || (tag[3] != ' ' && tag[3] != '>' && tag[3] != '/' && tag[3] != '\t' && tag[3] != '\n' && tag[3] != '\r') {
			continue
		}
		attrs, err := s.br.ReadSlice('>')
		if err != nil && err != bufio.ErrBufferFull {
			return 0, false, err
		}
		return rowNumber(attrs), true, nil
	}
}

// rowNumber reads the r attribute of a row start tag.
func rowNumber(tag []byte) int64 {
	for i := 0; i+3 < len(tag); i++ {
		c := tag[i]
		if (c == ' ' || c == '\t' || c == '\n' || c == '\r') && tag[i+1] == 'r' && tag[i+2] == '=' && (tag[i+3] == '"' || tag[i+3] == '\'') {
			var n int64
			for j := i + 4; j < len(tag) && tag[j] >= '0' && tag[j] <= '9'; j++ {
				n = n*10 + int64(tag[j]-'0')
				if n > 1<<40 {
					return n
				}
			}
			return n
		}
	}
	return 0
}
