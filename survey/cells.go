package survey

import (
	"archive/zip"
	"bufio"
	"bytes"
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"maps"
	"math"
	"path"
	"slices"
	"sort"
	"strconv"
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

// checkWorkbookZip checks a workbook's zip directory before the workbook
// is opened: the file must be a zip archive (ErrNotWorkbook when it is
// not, saying when it looks like a text file renamed), the unpacked size
// claimed by each entry must be one deflate can produce from its packed
// size, and all entries together must stay within MaxWorkbookBytes. The
// spreadsheet library allocates what an entry claims, so a small damaged
// file could otherwise take gigabytes of memory. The rows of every sheet
// must rise (ErrRowOrder). Readers check the directory when they open a
// workbook and each sheet when they choose it (chooseSheet); this checks
// every sheet at once.
func checkWorkbookZip(r io.ReaderAt, size int64) error {
	zr, err := checkZipDirectory(r, size)
	if err != nil {
		return err
	}
	count, err := sharedStringCount(zr)
	if err != nil {
		return err
	}
	return scanEverySheet(zr, bookFacts{styles: markedStyles(zr), strings: count})
}

// bookFacts are what the scan of a sheet needs to know of its workbook:
// the styles marked by markedStyles, and how many strings the shared
// string table holds (see sharedStringCount).
type bookFacts struct {
	styles  map[int64]cellMark
	strings int64
}

// cellMark tells how a cell's raw value differs from what a spreadsheet
// program shows of it.
type cellMark uint8

const (
	// markBoolean is a boolean cell (t="b"): stored 1 or 0, shown TRUE or
	// FALSE.
	markBoolean cellMark = iota + 1
	// markPercent is a number cell with a percent format: stored 0.05,
	// shown 5%.
	markPercent
	// markDate is a number cell with a date or time format: stored as
	// the date serial 46174, shown as the date 2026-06-01. Date cells are
	// kept in sheetScan.dates, not in its marks.
	markDate
)

// cellAt is a cell's 1-based row and column.
type cellAt struct{ row, col int64 }

// sheetScan is what the check of a workbook's zip archive found of one
// sheet: its formula cells with no saved value (which a program writing
// formulas without computing them may leave in a whole column), and its
// cells whose raw value is not what is shown: booleans and percents cell
// by cell, dates (which may fill a column of a million readings); the
// unsaved and date cells as runs of rows.
type sheetScan struct {
	unsaved cellRuns
	marks   map[cellAt]cellMark
	dates   cellRuns
	// hidden are the rows hidden in the sheet (their row element's
	// hidden attribute true), rising.
	hidden []int64
}

// cellRuns holds cells of a sheet: for each 1-based column, its runs of
// consecutive rows, in rising order.
type cellRuns map[int64][]rowRun

// rowRun is the rows first to last (1-based, inclusive).
type rowRun struct{ first, last int64 }

// add notes a cell; the rows of a column must come in rising order.
func (d *cellRuns) add(row, col int64) {
	if *d == nil {
		*d = cellRuns{}
	}
	runs := (*d)[col]
	if n := len(runs); n > 0 && runs[n-1].last+1 >= row {
		runs[n-1].last = max(runs[n-1].last, row)
		return
	}
	(*d)[col] = append(runs, rowRun{row, row})
}

// has reports a cell at row and col.
func (d cellRuns) has(row, col int64) bool {
	runs := d[col]
	i := sort.Search(len(runs), func(i int) bool { return runs[i].last >= row })
	return i < len(runs) && runs[i].first <= row
}

// checkZipDirectory checks a workbook's size, its zip signature and the
// sizes its zip directory claims, as checkWorkbookZip tells, and returns
// the archive; it reads no sheet.
func checkZipDirectory(r io.ReaderAt, size int64) (*zip.Reader, error) {
	if size > MaxWorkbookBytes {
		return nil, fmt.Errorf("%w: larger than %d bytes", ErrWorkbookZip, int64(MaxWorkbookBytes))
	}
	if err := zipSignature(r, size); err != nil {
		return nil, err
	}
	zr, err := zip.NewReader(r, size)
	if err != nil {
		return nil, fmt.Errorf("%w: %w", ErrWorkbookZip, err)
	}
	var total uint64
	for _, f := range zr.File {
		limit := f.CompressedSize64*MaxDeflateRatio + 1024
		if f.Method == zip.Store {
			limit = f.CompressedSize64
		}
		if f.UncompressedSize64 > limit {
			return nil, fmt.Errorf("%w: %s claims %d bytes from %d", ErrWorkbookZip, f.Name, f.UncompressedSize64, f.CompressedSize64)
		}
		total += f.UncompressedSize64
		if total > MaxWorkbookBytes {
			return nil, fmt.Errorf("%w: unpacks to more than %d bytes", ErrWorkbookZip, int64(MaxWorkbookBytes))
		}
	}
	if book := workbookPart(zr); !slices.ContainsFunc(zr.File, func(f *zip.File) bool { return f.Name == book }) {
		return nil, fmt.Errorf("%w (%s)", ErrNoWorkbookPart, book)
	}
	return zr, nil
}

// ErrNoWorkbookPart is the cause of a zip archive read as a workbook that
// holds no workbook part (the part its package relationships name as
// the office document, normally xl/workbook.xml; ECMA-376 part 2): some
// other zip file, or a workbook with its main part lost.
var ErrNoWorkbookPart = errors.New("not a workbook: the zip archive holds no workbook part")

// workbookPart returns the name of a workbook's main part, as its
// package relationships (_rels/.rels) name it, xl/workbook.xml when they
// do not.
func workbookPart(zr *zip.Reader) string {
	var rels struct {
		Rel []struct {
			Type   string `xml:"Type,attr"`
			Target string `xml:"Target,attr"`
		} `xml:"Relationship"`
	}
	book := "xl/workbook.xml"
	if err := readXML(zr, "_rels/.rels", &rels); err == nil {
		for _, r := range rels.Rel {
			if strings.HasSuffix(r.Type, "/officeDocument") {
				book = path.Clean(strings.TrimPrefix(r.Target, "/"))
			}
		}
	}
	return book
}

// isWorksheetPart reports a zip entry that holds a worksheet.
func isWorksheetPart(name string) bool {
	return strings.HasPrefix(name, "xl/worksheets/") && strings.HasSuffix(name, ".xml")
}

// scanEverySheet scans every sheet of an archive (with the workbook's
// facts) for the errors of scanSheet: each sheet's part as the
// workbook's relationships name it, or, when they cannot be read, every
// part under xl/worksheets/, and then a sheet with something to tell (a
// formula with no saved value, a boolean, percent or date cell) is an
// error too (ErrWorkbookZip), as what it holds cannot be placed.
func scanEverySheet(zr *zip.Reader, facts bookFacts) error {
	names, perr := sheetParts(zr)
	if perr != nil {
		for _, f := range zr.File {
			if !isWorksheetPart(f.Name) {
				continue
			}
			sc, err := scanSheet(f, facts)
			if err != nil {
				return err
			}
			if len(sc.unsaved) > 0 || len(sc.marks) > 0 || len(sc.dates) > 0 {
				return fmt.Errorf("%w: %w", ErrWorkbookZip, perr)
			}
		}
		return nil
	}
	files := partFiles(zr, names)
	for _, name := range slices.Sorted(maps.Keys(files)) { // the first error the same each run
		if f := files[name]; f != nil {
			if _, err := scanSheet(f, facts); err != nil {
				return err
			}
		}
	}
	return nil
}

// sheetScanner scans the sheets of a workbook's archive as they are read,
// each once: reading one sheet of a workbook costs the scan of that sheet
// alone, however large the others are.
type sheetScanner struct {
	zr     *zip.Reader
	facts  bookFacts            // the workbook's, read with the first sheet
	styled bool                 // facts has been read
	parts  map[string]*zip.File // sheet name to its part, found with the first sheet
	done   map[string]sheetScan // the sheets scanned, by name
}

// scan returns what the scan of sheet found (see scanSheet), scanning it
// the first time. A sheet with no part of its own has nothing to tell;
// when the workbook's relationships do not name the sheets' parts, none
// has (see findParts).
func (s *sheetScanner) scan(sheet string) (sheetScan, error) {
	if sc, ok := s.done[sheet]; ok {
		return sc, nil
	}
	if !s.styled {
		count, err := sharedStringCount(s.zr)
		if err != nil {
			return sheetScan{}, err
		}
		s.facts = bookFacts{styles: markedStyles(s.zr), strings: count}
		s.styled = true
	}
	if s.parts == nil {
		if err := s.findParts(); err != nil {
			return sheetScan{}, err
		}
	}
	var sc sheetScan
	if f := s.parts[sheet]; f != nil {
		var err error
		if sc, err = scanSheet(f, s.facts); err != nil {
			return sheetScan{}, err
		}
	}
	if s.done == nil {
		s.done = map[string]sheetScan{}
	}
	s.done[sheet] = sc
	return sc, nil
}

// findParts finds the part of every sheet. When the relationships do not
// tell them, every worksheet part is scanned as scanEverySheet does, which
// refuses the workbook if any holds something to tell (it could not be
// placed), so no sheet is left with a part to scan.
func (s *sheetScanner) findParts() error {
	names, err := sheetParts(s.zr)
	if err != nil {
		if err := scanEverySheet(s.zr, s.facts); err != nil {
			return err
		}
		s.parts = map[string]*zip.File{}
		return nil
	}
	s.parts = partFiles(s.zr, names)
	return nil
}

// partFiles maps each sheet name to its part's entry in the archive,
// wherever the relationships put it (nil when it is missing).
func partFiles(zr *zip.Reader, parts map[string]string) map[string]*zip.File {
	files := map[string]*zip.File{}
	for _, f := range zr.File {
		files[f.Name] = f
	}
	out := map[string]*zip.File{}
	for name, part := range parts {
		out[name] = files[part]
	}
	return out
}

// ErrNotWorkbook is the cause of a file read as a workbook that is not a
// zip archive.
var ErrNotWorkbook = errors.New("not a workbook (an .xlsx file is a zip archive)")

// zipSignature refuses data that does not start as a zip archive does
// (zipMagic), saying when it looks like text that it may be a CSV file
// renamed, and naming an Excel 97–2003 workbook (compoundMagic).
func zipSignature(r io.ReaderAt, size int64) error {
	head := make([]byte, min(size, 4096))
	n, err := r.ReadAt(head, 0)
	if err != nil && err != io.EOF {
		return fmt.Errorf("%w: %w", ErrWorkbookZip, err)
	}
	head = head[:n]
	if bytes.HasPrefix(head, zipMagic) {
		if openDocument(head) {
			return ErrOpenDocument
		}
		return nil
	}
	if bytes.HasPrefix(head, compoundMagic) {
		return ErrLegacyWorkbook
	}
	if textLike(head) {
		return fmt.Errorf("%w; it holds text: it may be a CSV file renamed .xlsx, so give it its .csv name", ErrNotWorkbook)
	}
	return ErrNotWorkbook
}

// textLike reports data of text: not empty, and no control bytes other
// than tabs and line ends (text of any 8-bit encoding or UTF-8 passes).
func textLike(b []byte) bool {
	for _, c := range b {
		if (c < 0x20 && c != '\t' && c != '\n' && c != '\r') || c == 0x7f {
			return false
		}
	}
	return len(b) > 0
}

// ErrRowOrder is the cause of a sheet whose rows are out of order or
// repeated, which a spreadsheet program never writes and a reader could
// only guess at.
var ErrRowOrder = errors.New("a sheet's rows are out of order or repeated")

// ErrCellOrder is the cause of a row whose cells are out of order or
// repeated (a cell reference written twice), which a spreadsheet program
// never writes: the spreadsheet library would shift the cells to other
// columns.
var ErrCellOrder = errors.New("a row's cells are out of order or repeated")

// ErrRowNumber is the cause of a row numbered beyond a sheet's last row.
var ErrRowNumber = errors.New("a row number beyond the last row of a sheet")

// MaxSheetRows is the number of rows a sheet can hold (ECMA-376 and
// every spreadsheet program: 2²⁰, from memory).
const MaxSheetRows = 1 << 20

// ErrSharedString is the cause of a text cell (t="s") whose value is not
// the index of a string in the workbook's table of shared strings: a
// whole number from 0 to one less than the strings the table holds. The
// spreadsheet library reads such a cell as blank, or as another string.
var ErrSharedString = errors.New("a text cell that refers to no string of the workbook's shared strings (the workbook is damaged)")

// ErrWorkbookDamaged is the cause of a sheet whose XML does not parse to
// its end (cut short, garbage written into it, an entity it does not
// define). The spreadsheet library stops reading such a sheet at the
// damage without saying so, so every row after it would be lost.
var ErrWorkbookDamaged = errors.New("the sheet's XML is damaged")

// scanError is an error of a sheet's scan at a row (its r attribute) and,
// when it is a cell's, a column (1-based; 0 for a whole row), for the
// ParseError of the sheet. Row 0 is no row (the error is the sheet's).
type scanError struct {
	row, col int
	err      error
}

func (e *scanError) Error() string { return e.err.Error() }
func (e *scanError) Unwrap() error { return e.err }

// scanSheet checks a worksheet's XML and reads what a reader must know
// of its cells. The XML must parse to its end (ErrWorkbookDamaged, see
// xmlDamage). Then it is read as a sequence of tags, without decoding
// it: the numbers of its rows (their r attributes) must rise strictly
// (ErrRowOrder) and stay within MaxSheetRows (ErrRowNumber), the cell
// references of a row must rise strictly (ErrCellOrder), and the value
// of a text cell (t="s") must be the number of a string of the shared
// string table (ErrSharedString, see facts.strings); each such error is
// a *scanError naming its row and cell. The cells holding a formula (an
// f element) but no saved value (no v element, or an empty one, <v/> or
// <v></v>, but for a formula of text, t="str", whose result may be "")
// are returned, with the boolean cells and the number cells whose style
// is marked in facts.styles (see markedStyles), and the hidden rows.
func scanSheet(f *zip.File, facts bookFacts) (sheetScan, error) {
	// The XML is parsed beside the tag scan, on another core; its error,
	// the damage, comes first.
	damage := make(chan error, 1)
	go func() { damage <- xmlDamage(f) }()
	out, err := scanTags(f, facts)
	if derr := <-damage; derr != nil {
		return sheetScan{}, derr
	}
	return out, err
}

// scanTags is scanSheet's tag scan.
func scanTags(f *zip.File, facts bookFacts) (sheetScan, error) {
	var out sheetScan
	rc, err := f.Open()
	if err != nil {
		return out, fmt.Errorf("%w: %s: %w", ErrWorkbookZip, f.Name, err)
	}
	defer rc.Close()
	sc := tagScanner{br: bufio.NewReaderSize(&textRunReader{r: rc}, 64<<10)}
	var last, row, col int64
	var lastRef []byte // the reference of the row's last cell, as written
	inCell, formula, value, text, shared := false, false, false, false, false
	mark := func(m cellMark) {
		if out.marks == nil {
			out.marks = map[cellAt]cellMark{}
		}
		out.marks[cellAt{row, col}] = m
	}
	for {
		tag, err := sc.next()
		if err == io.EOF {
			return out, nil
		}
		if errors.Is(err, ErrLongCell) {
			return out, &scanError{row: int(row), err: fmt.Errorf("%w (%s)", err, f.Name)}
		}
		if err != nil {
			return out, fmt.Errorf("%w: %s: %w", ErrWorkbookZip, f.Name, err)
		}
		switch name := string(tag.name); {
		case name == "row" && !tag.end:
			n := attrNumber(tag.attrs, "r")
			if n > 0 && n <= last {
				return out, &scanError{row: int(n), err: fmt.Errorf("%w (%s: row %d after row %d)", ErrRowOrder, f.Name, n, last)}
			}
			if n > MaxSheetRows {
				return out, &scanError{row: int(n), err: fmt.Errorf("%w (row %d after row %d; a sheet holds %d rows)", ErrRowNumber, n, last, MaxSheetRows)}
			}
			if n > 0 {
				last, row = n, n
			} else {
				row++
			}
			if row > MaxSheetRows {
				return out, &scanError{row: int(row), err: fmt.Errorf("%w (row %d after row %d; a sheet holds %d rows)", ErrRowNumber, row, last, MaxSheetRows)}
			}
			col, lastRef = 0, nil
			if h := string(attrValue(tag.attrs, "hidden")); h == "1" || h == "true" {
				out.hidden = append(out.hidden, row)
			}
		case name == "c" && !tag.end:
			col++
			// The column from the cell's reference; the row is its row
			// element's, as the spreadsheet library places the cell.
			ref := attrValue(tag.attrs, "r")
			if c, _, ok := cellReference(ref); ok {
				if c <= col-1 && row > 0 {
					return out, &scanError{row: int(row), col: int(c), err: fmt.Errorf("%w: the cell %s is written after %s", ErrCellOrder, echo(string(ref)), echo(string(lastRef)))}
				}
				col = c
			}
			lastRef = append(lastRef[:0], ref...)
			if lastRef == nil {
				lastRef = []byte{}
			}
			// A cell outside a row is not read, and not told.
			inCell, formula, value = !tag.self && row > 0, false, false
			if !inCell {
				break
			}
			t := string(attrValue(tag.attrs, "t"))
			text, shared = t == "str", t == "s"
			styles := facts.styles
			switch {
			case t == "b":
				mark(markBoolean)
			case (t == "" || t == "n") && len(styles) > 0:
				switch styles[attrNumber(tag.attrs, "s")] {
				case markPercent:
					mark(markPercent)
				case markDate:
					out.dates.add(row, col)
				}
			}
		case name == "f" && !tag.end:
			formula = inCell
		case name == "v" && !tag.end:
			// An empty value (<v/>, <v></v>) is no saved value, as a
			// program that writes formulas without computing them
			// leaves it, but for a text result (t="str"), which a
			// formula giving "" saves empty.
			if !inCell {
				break
			}
			if tag.self {
				value = value || text
				if shared {
					return out, sharedStringError(row, col, "", facts.strings)
				}
				break
			}
			if shared {
				v, err := sc.text(maxTagBytes)
				if err != nil {
					return out, fmt.Errorf("%w: %s: %w", ErrWorkbookZip, f.Name, err)
				}
				if !sharedIndex(v, facts.strings) {
					return out, sharedStringError(row, col, string(v), facts.strings)
				}
				value = true
				break
			}
			empty, err := sc.blankText()
			if err != nil {
				return out, fmt.Errorf("%w: %s: %w", ErrWorkbookZip, f.Name, err)
			}
			value = value || !empty || text
		case name == "c" && tag.end:
			if inCell && formula && !value {
				out.unsaved.add(row, col)
			}
			inCell = false
		}
	}
}

// ErrLongCell is the cause of a sheet, or a workbook's shared strings,
// holding more text between two tags than a cell can: a workbook's cell
// holds at most 32 767 characters, and a formula 8 192 (Microsoft, Excel
// specifications and limits), each character at most 10 bytes of XML as
// a character reference, so a run of maxTextRun bytes is no workbook a
// spreadsheet program wrote. Read, such a cell would take memory many
// times its size.
var ErrLongCell = errors.New("a cell longer than a workbook's cell can be (32 767 characters): the workbook is damaged or forged")

// maxTextRun bounds the bytes of a workbook part's XML between two tags
// (see ErrLongCell).
const maxTextRun = 1 << 20

// textRunReader reads a workbook part's XML, failing with ErrLongCell
// once more than maxTextRun bytes follow one '<' without another.
type textRunReader struct {
	r   io.Reader
	run int // the bytes since the last '<'
}

func (t *textRunReader) Read(p []byte) (int, error) {
	n, err := t.r.Read(p)
	for off := 0; off < n; {
		end := n
		if i := bytes.IndexByte(p[off:n], '<'); i >= 0 {
			end = off + i
		}
		if t.run+end-off > maxTextRun {
			// The bytes up to the limit, within the run, and no more: the
			// reader stops inside the cell that is too long.
			return off + maxTextRun - t.run + 1, ErrLongCell
		}
		if end == n {
			t.run += n - off
			break
		}
		t.run, off = 0, end+1
	}
	return n, err
}

// xmlDamage parses a worksheet's XML to its end as the spreadsheet
// library does (encoding/xml, strict), and returns an ErrWorkbookDamaged
// (a *scanError with no row) saying after which row the XML stops
// parsing, nil when it parses to its end. The library's row reader stops
// at the first such error without telling it, so the rows after it
// would be lost without a word; the tag scan of scanSheet does not parse
// the XML, so it cannot tell.
func xmlDamage(f *zip.File) error {
	rc, err := f.Open()
	if err != nil {
		return fmt.Errorf("%w: %s: %w", ErrWorkbookZip, f.Name, err)
	}
	defer rc.Close()
	d := xml.NewDecoder(bufio.NewReaderSize(&textRunReader{r: rc}, 64<<10))
	var done, open int64 // the last row ended, the row begun
	for {
		tok, err := d.Token()
		if err == io.EOF {
			return nil
		}
		if errors.Is(err, ErrLongCell) {
			return &scanError{row: int(open), err: fmt.Errorf("%w (%s)", err, f.Name)}
		}
		if se := (*xml.SyntaxError)(nil); err != nil && !errors.As(err, &se) {
			return fmt.Errorf("%w: %s: %w", ErrWorkbookZip, f.Name, err) // the part cannot be unpacked
		}
		if err != nil {
			where := "before its first row"
			if done == 0 && open > 0 {
				where = fmt.Sprintf("in row %d", open)
			}
			if done > 0 {
				where = fmt.Sprintf("after row %d", done)
			}
			return &scanError{err: fmt.Errorf("%w %s (%s: %w)", ErrWorkbookDamaged, where, f.Name, err)}
		}
		switch t := tok.(type) {
		case xml.StartElement:
			if t.Name.Local == "row" {
				open++
				for _, a := range t.Attr {
					if a.Name.Local == "r" {
						if n, err := strconv.ParseInt(a.Value, 10, 64); err == nil && n > 0 {
							open = n
						}
					}
				}
			}
		case xml.EndElement:
			if t.Name.Local == "row" {
				done = open
			}
		}
	}
}

// sharedIndex reports whether the text of a text cell's value (t="s") is
// the index of a string of a shared string table holding count strings:
// digits alone (white space around them allowed), less than count.
func sharedIndex(v []byte, count int64) bool {
	v = bytes.TrimSpace(v)
	if len(v) == 0 || len(v) > 18 {
		return false
	}
	var n int64
	for _, c := range v {
		if c < '0' || c > '9' {
			return false
		}
		n = n*10 + int64(c-'0')
	}
	return n < count
}

// sharedStringError is the ErrSharedString of the cell at row and col
// whose value is v, in a workbook whose table holds count strings.
func sharedStringError(row, col int64, v string, count int64) error {
	what := fmt.Sprintf("its value %q is not a string's number", echo(v))
	if sharedIndex([]byte(v), math.MaxInt64) {
		what = fmt.Sprintf("it refers to string %s", strings.TrimSpace(v))
	}
	return &scanError{row: int(row), col: int(col), err: fmt.Errorf("%w: %s, and the table holds %d (numbered from 0)", ErrSharedString, what, count)}
}

// sharedStringCount returns how many strings the shared string table of
// a workbook holds (its si elements; the count it claims is not trusted),
// 0 when it has none or it cannot be read. The part is found as the
// workbook's relationships name it (normally xl/sharedStrings.xml). A
// string longer than a cell can hold is an error (ErrLongCell), found
// before the spreadsheet library would read it whole.
func sharedStringCount(zr *zip.Reader) (int64, error) {
	name := relatedPart(zr, "/sharedStrings", "xl/sharedStrings.xml")
	f, err := zr.Open(name)
	if err != nil {
		return 0, nil
	}
	defer f.Close()
	sc := tagScanner{br: bufio.NewReaderSize(&textRunReader{r: f}, 64<<10)}
	var n int64
	for {
		tag, err := sc.next()
		if errors.Is(err, ErrLongCell) {
			return n, fmt.Errorf("%w (%s, string %d)", err, name, n)
		}
		if err != nil {
			return n, nil
		}
		if !tag.end && string(tag.name) == "si" {
			n++
		}
	}
}

// xmlTag is one tag of XML text: its name without a namespace prefix
// (valid until the next tag is read), whether it ends an element (</c>),
// and for the start tags of rows, cells and values whether it is empty
// (<c/>) and the text of its attributes.
type xmlTag struct {
	name      []byte
	end, self bool
	attrs     []byte
}

// maxTagBytes bounds how much of one tag tagScanner keeps: the name and
// the first attributes, where a sheet's row and cell references are.
const maxTagBytes = 512

// maxNameBytes bounds the name of a tag that tagScanner tells, with its
// namespace prefix; longer names are returned empty.
const maxNameBytes = 32

// tagScanner reads the tags of XML text one after another, skipping the
// text between them and, but for rows and cells, the tags' attributes.
type tagScanner struct {
	br  *bufio.Reader
	buf []byte
}

// next returns the next tag; io.EOF at the end. Processing instructions,
// comments, declarations and names longer than maxNameBytes are returned
// with an empty name.
func (s *tagScanner) next() (xmlTag, error) {
	for {
		_, err := s.br.ReadSlice('<')
		if err == nil {
			break
		}
		if err != bufio.ErrBufferFull {
			return xmlTag{}, err
		}
	}
	head, err := s.br.Peek(maxNameBytes)
	if len(head) == 0 {
		return xmlTag{}, err
	}
	var tag xmlTag
	if head[0] == '/' {
		tag.end, head = true, head[1:]
	}
	end := nameEnd(head)
	if end < 0 || (len(head) > 0 && (head[0] == '?' || head[0] == '!')) {
		return tag, nil
	}
	name := head[:end]
	if i := bytes.IndexByte(name, ':'); i >= 0 {
		name = name[i+1:]
	}
	if tag.end || (string(name) != "row" && string(name) != "c" && string(name) != "v") {
		tag.name = name
		return tag, nil
	}
	// A row or a cell: its attributes, to the end of the tag.
	s.buf = s.buf[:0]
	for {
		b, err := s.br.ReadSlice('>')
		if room := maxTagBytes - len(s.buf); room > 0 {
			s.buf = append(s.buf, b[:min(len(b), room)]...)
		}
		if err == nil {
			break
		}
		if err != bufio.ErrBufferFull {
			return xmlTag{}, err
		}
	}
	t := bytes.TrimSuffix(s.buf, []byte(">"))
	if len(t) > 0 && t[len(t)-1] == '/' {
		tag.self, t = true, t[:len(t)-1]
	}
	start := nameEnd(t)
	if start < 0 {
		start = len(t)
	}
	tag.name, tag.attrs = t[:start], t[start:]
	if i := bytes.IndexByte(tag.name, ':'); i >= 0 {
		tag.name = tag.name[i+1:]
	}
	return tag, nil
}

// blankText reads the text after the tag just read, up to the next tag,
// and reports whether it is empty or white space alone. The next tag is
// left to be read.
func (s *tagScanner) blankText() (bool, error) {
	blank := true
	for {
		b, err := s.br.ReadSlice('<')
		if err == nil {
			b = b[:len(b)-1]
		}
		blank = blank && len(bytes.TrimSpace(b)) == 0
		switch {
		case err == nil:
			return blank, s.br.UnreadByte()
		case err == io.EOF:
			return blank, nil
		case err != bufio.ErrBufferFull:
			return false, err
		}
	}
}

// text reads the text after the tag just read, up to the next tag, and
// returns at most its first limit bytes. The next tag is left to be read.
func (s *tagScanner) text(limit int) ([]byte, error) {
	s.buf = s.buf[:0]
	for {
		b, err := s.br.ReadSlice('<')
		if err == nil {
			b = b[:len(b)-1]
		}
		if room := limit - len(s.buf); room > 0 {
			s.buf = append(s.buf, b[:min(len(b), room)]...)
		}
		switch {
		case err == nil:
			return s.buf, s.br.UnreadByte()
		case err == io.EOF:
			return s.buf, nil
		case err != bufio.ErrBufferFull:
			return nil, err
		}
	}
}

// nameEnd returns the index of the first byte of b that ends a tag's
// name (white space, '/' or '>'), -1 when none does.
func nameEnd(b []byte) int {
	for i, c := range b {
		switch c {
		case ' ', '\t', '\r', '\n', '/', '>':
			return i
		}
	}
	return -1
}

// cellReference reads a cell reference such as B14 into its 1-based
// column and row; ok is false when ref is not one (or beyond 2⁴⁰).
func cellReference(ref []byte) (col, row int64, ok bool) {
	i := 0
	for ; i < len(ref) && col <= 1<<40; i++ {
		c := ref[i] | 0x20 // lower case
		if c < 'a' || c > 'z' {
			break
		}
		col = col*26 + int64(c-'a'+1)
	}
	if i == 0 || i == len(ref) {
		return 0, 0, false
	}
	for ; i < len(ref); i++ {
		c := ref[i]
		if c < '0' || c > '9' || row > 1<<40 {
			return 0, 0, false
		}
		row = row*10 + int64(c-'0')
	}
	return col, row, row > 0
}

// attrValue returns the value of the attribute named name in the
// attribute text of a tag, nil when it has none.
func attrValue(attrs []byte, name string) []byte {
	for i := 0; i+len(name)+2 < len(attrs); i++ {
		c := attrs[i]
		if c != ' ' && c != '\t' && c != '\n' && c != '\r' {
			continue
		}
		rest := attrs[i+1:]
		if !bytes.HasPrefix(rest, []byte(name)) || rest[len(name)] != '=' {
			continue
		}
		q := rest[len(name)+1]
		if q != '"' && q != '\'' {
			continue
		}
		v := rest[len(name)+2:]
		if j := bytes.IndexByte(v, q); j >= 0 {
			return v[:j]
		}
		return v
	}
	return nil
}

// attrNumber reads an attribute of decimal digits (0 when it is absent
// or does not start with a digit; a value past 2⁴⁰ stops there).
func attrNumber(attrs []byte, name string) int64 {
	var n int64
	for _, c := range attrValue(attrs, name) {
		if c < '0' || c > '9' {
			break
		}
		n = n*10 + int64(c-'0')
		if n > 1<<40 {
			break
		}
	}
	return n
}

// sheetParts maps the name of each sheet of a workbook to its worksheet
// part in the archive, as the workbook part (named by the package's
// relationships, normally xl/workbook.xml) and its own relationships say.
func sheetParts(zr *zip.Reader) (map[string]string, error) {
	var rels struct {
		Rel []struct {
			ID     string `xml:"Id,attr"`
			Type   string `xml:"Type,attr"`
			Target string `xml:"Target,attr"`
		} `xml:"Relationship"`
	}
	part := func(dir, target string) string {
		if strings.HasPrefix(target, "/") {
			return strings.TrimPrefix(target, "/")
		}
		return path.Join(dir, target)
	}
	book := workbookPart(zr)
	var wb struct {
		Sheets []struct {
			Name string `xml:"name,attr"`
			ID   string `xml:"id,attr"`
		} `xml:"sheets>sheet"`
	}
	if err := readXML(zr, book, &wb); err != nil {
		return nil, err
	}
	rels.Rel = nil
	if err := readXML(zr, path.Join(path.Dir(book), "_rels", path.Base(book)+".rels"), &rels); err != nil {
		return nil, err
	}
	targets := map[string]string{}
	for _, r := range rels.Rel {
		targets[r.ID] = part(path.Dir(book), r.Target)
	}
	out := map[string]string{}
	for _, s := range wb.Sheets {
		if t, ok := targets[s.ID]; ok {
			out[s.Name] = t
		}
	}
	return out, nil
}

// externalLinks names the other workbooks a workbook links to (a
// formula such as [1]Sheet1!A1, whose value is saved as it was when the
// workbook was last saved): one name for each external link part
// (xl/externalLinks/*.xml), the target of its relationship as written
// (a path or URL, echoed short), or "a workbook not named" when it has
// none. Nil when it links to none. Nothing linked is ever opened.
func externalLinks(zr *zip.Reader) []string {
	var out []string
	for _, f := range zr.File {
		dir, base := path.Split(f.Name)
		if dir != "xl/externalLinks/" || !strings.HasSuffix(base, ".xml") {
			continue
		}
		var rels struct {
			Rel []struct {
				Target string `xml:"Target,attr"`
				Mode   string `xml:"TargetMode,attr"`
			} `xml:"Relationship"`
		}
		name := "a workbook not named"
		if err := readXML(zr, dir+"_rels/"+base+".rels", &rels); err == nil {
			for _, r := range rels.Rel {
				if r.Mode == "External" && r.Target != "" {
					name = echo(r.Target)
					break
				}
			}
		}
		if !slices.Contains(out, name) {
			out = append(out, name)
		}
	}
	return out
}

// readXML decodes the XML part name of a zip archive into v.
func readXML(zr *zip.Reader, name string, v any) error {
	f, err := zr.Open(name)
	if err != nil {
		return err
	}
	defer f.Close()
	return xml.NewDecoder(f).Decode(v)
}

// markedStyles returns the cell styles (indices into the cellXfs of the
// workbook's styles part) whose number format shows a number as other
// than a number: markPercent for a percent (the built-in formats 9 and
// 10, or a custom code whose first section ends in an unquoted, unescaped
// percent sign), markDate for a date or a time of day (the built-in
// formats 14 to 22 and 45 to 47, the built-in East Asian date formats 27
// to 36 and 50 to 58 and Thai 71 to 81, or a custom code that dateFormat reads as one). A
// workbook with no styles part, or one that cannot be read, has none.
//
// References:
//
//	ECMA-376, Office Open XML File Formats, 5th ed. (2016), Part 1,
//	18.8.30 numFmt (built-in number formats) and 18.8.31 numFmts.
func markedStyles(zr *zip.Reader) map[int64]cellMark {
	var st struct {
		NumFmts []struct {
			ID   int64  `xml:"numFmtId,attr"`
			Code string `xml:"formatCode,attr"`
		} `xml:"numFmts>numFmt"`
		Xfs []struct {
			NumFmtID int64 `xml:"numFmtId,attr"`
		} `xml:"cellXfs>xf"`
	}
	if err := readXML(zr, stylesPart(zr), &st); err != nil {
		return nil
	}
	formats := map[int64]cellMark{9: markPercent, 10: markPercent}
	for _, r := range [][2]int64{{14, 22}, {27, 36}, {45, 47}, {50, 58}, {71, 81}} {
		for id := r[0]; id <= r[1]; id++ {
			formats[id] = markDate
		}
	}
	for _, nf := range st.NumFmts {
		switch {
		case percentFormat(nf.Code):
			formats[nf.ID] = markPercent
		case dateFormat(nf.Code):
			formats[nf.ID] = markDate
		default:
			delete(formats, nf.ID)
		}
	}
	var out map[int64]cellMark
	for i, xf := range st.Xfs {
		if m := formats[xf.NumFmtID]; m != 0 {
			if out == nil {
				out = map[int64]cellMark{}
			}
			out[int64(i)] = m
		}
	}
	return out
}

// dateFormat reports whether a number format code shows a number as a
// date or a time of day: its first section (see formatSection) holds one
// of the codes y, m, d, h or s, in any case. "General", number, currency
// and scientific formats hold none: a format's literal letters are quoted
// or escaped, and G, e, n, r, a, l and E are not among the five.
func dateFormat(code string) bool {
	return strings.ContainsAny(strings.ToLower(formatSection(code)), "ymdhs")
}

// stylesPart returns the name of a workbook's styles part, as the
// workbook's relationships name it (normally xl/styles.xml).
func stylesPart(zr *zip.Reader) string {
	return relatedPart(zr, "/styles", "xl/styles.xml")
}

// relatedPart returns the name of the part the workbook's relationships
// name with a type ending in kind ("/styles"), def when they name none.
func relatedPart(zr *zip.Reader, kind, def string) string {
	var rels struct {
		Rel []struct {
			Type   string `xml:"Type,attr"`
			Target string `xml:"Target,attr"`
		} `xml:"Relationship"`
	}
	if err := readXML(zr, "xl/_rels/workbook.xml.rels", &rels); err == nil {
		for _, r := range rels.Rel {
			if strings.HasSuffix(r.Type, kind) {
				if strings.HasPrefix(r.Target, "/") {
					return strings.TrimPrefix(r.Target, "/")
				}
				return path.Join("xl", r.Target)
			}
		}
	}
	return def
}

// percentFormat reports whether a number format code shows a number as a
// percent: its first section (see formatSection) ends in a percent sign,
// one neither quoted ("%") nor escaped (\%).
func percentFormat(code string) bool {
	return strings.HasSuffix(formatSection(code), "%")
}

// formatSection returns the codes of the first section of a number format
// (the one for positive numbers, up to the first unquoted ';'): quoted
// text and spaces are dropped, an escaped character stands as a zero byte
// (a literal, never a code), a spacing or fill character (_x, *x) is
// dropped with the character after it, and a bracket ([Red], [$-409]) is
// dropped, but for an elapsed time ([h], [mm], [ss]), which stands as its
// letters.
//
// References:
//
//	ECMA-376, Office Open XML File Formats, 5th ed. (2016), Part 1,
//	18.8.31 numFmts (the syntax of number format codes; from memory).
func formatSection(code string) string {
	var b strings.Builder
	quoted := false
	for i := 0; i < len(code); i++ {
		c := code[i]
		switch {
		case quoted:
			quoted = c != '"'
		case c == '"':
			quoted = true
		case c == '\\':
			b.WriteByte(0)
			i++
		case c == '_' || c == '*':
			i++
		case c == ';':
			return b.String()
		case c == '[':
			j := strings.IndexByte(code[i:], ']')
			if j < 0 {
				return b.String()
			}
			if inner := code[i+1 : i+j]; inner != "" && strings.Trim(strings.ToLower(inner), "hms") == "" {
				b.WriteString(inner)
			}
			i += j
		case c != ' ':
			b.WriteByte(c)
		}
	}
	return b.String()
}
