package workbook

import (
	"archive/zip"
	"bytes"
	"encoding/xml"
	"errors"
	"fmt"
	"image"
	_ "image/png" // AddPictureFromBytes and DecodeConfig need the PNG decoder
	"io"
	"math"
	"os"
	"slices"
	"strings"
	"time"

	"github.com/xuri/excelize/v2"
)

// Column describes one column of a sheet written by a Book. The header
// cell reads "Name (Unit)"; Table.Column strips the bracketed unit, so a
// sheet written with these headers reads back by Name.
type Column struct {
	// Name is the column name readers match, e.g. "stage".
	Name string
	// Unit is appended in brackets, e.g. "m" gives "stage (m)"; "" for none.
	Unit string
	// Format is an Excel number format code such as "0.000", FormatSig3
	// (chosen per value), or "" for General.
	Format string
	// Width is the column width in characters; 0 fits the header (at least
	// MinColumnWidth).
	Width float64
	// Wrap wraps the column's cells within its width, the row growing to
	// show them, so that a column of notes stays narrow on the page.
	Wrap bool
}

// Header returns the header cell text: the name and the unit in brackets.
func (c Column) Header() string {
	if c.Unit == "" {
		return c.Name
	}
	return c.Name + " (" + c.Unit + ")"
}

// Number formats understood by Column.Format besides Excel format codes.
const (
	// FormatSig3 shows a value to three significant figures, never with
	// fewer than whole units: the cell's format has
	//
	//	decimals = clamp(2 − ⌊log10 |v|⌋, 0, MaxSig3Decimals)
	//
	// so 1234 shows "1234", 123.4 "123", 12.34 "12.3", 1.234 "1.23",
	// 0.01234 "0.0123" and 0 "0". The stored value keeps full precision;
	// only the display is rounded (common practice for rating tables).
	FormatSig3 = "sig3"
	// FormatDateTime is the format of date-time cells.
	FormatDateTime = "yyyy-mm-dd hh:mm"
	// FormatText stores the column as text (the format code "@").
	FormatText = "@"
)

// MaxSig3Decimals bounds the decimals FormatSig3 shows for small values.
const MaxSig3Decimals = 5

// MinColumnWidth is the narrowest column a Book writes, in characters.
const MinColumnWidth = 9

// Sig3Decimals returns the decimals FormatSig3 shows for v.
func Sig3Decimals(v float64) int {
	if v == 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0
	}
	d := 2 - int(math.Floor(math.Log10(math.Abs(v))))
	return max(0, min(d, MaxSig3Decimals))
}

// Number returns v styled with a number format code (FormatSig3 picks the
// decimals from the value), or nil, an empty cell, when v is NaN or ±Inf.
func (b *Book) Number(format string, v float64) (any, error) {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil, nil
	}
	if format == FormatSig3 {
		format = DecimalsFormat(Sig3Decimals(v))
	}
	id, err := b.Style(format)
	if err != nil {
		return nil, err
	}
	return Styled{id, v}, nil
}

// NumberOnce is Number for a run of summary items: it keeps the first
// error in *err and, from then on, returns nil without trying.
func (b *Book) NumberOnce(format string, v float64, err *error) any {
	if *err != nil {
		return nil
	}
	x, e := b.Number(format, v)
	if e != nil {
		*err = e
	}
	return x
}

// DecimalsFormat returns the format code with d decimals: "0", "0.0", ...
func DecimalsFormat(d int) string {
	if d <= 0 {
		return "0"
	}
	return "0." + string(bytes.Repeat([]byte{'0'}, d))
}

// House colours of wetline workbooks (RGB hex).
const (
	colourHeaderFill = "23465A" // deep slate blue
	colourHeaderText = "FFFFFF"
	colourLabelFill  = "E3ECEF" // pale slate, for label cells and shaded rows
	colourInputFill  = "FFF9E8" // warm cream, for cells a crew fills in
	colourRule       = "9AB3BF" // border under the header
)

// Picture is a PNG image to embed in a workbook, with its caption.
type Picture struct {
	Name string
	PNG  []byte
}

// Book builds an xlsx workbook sheet by sheet. Table sheets are written row
// by row through excelize's StreamWriter, so memory stays bounded however
// many rows a sheet has, and Write never holds the zipped file in memory.
// A Book must be closed to remove its temporary files.
//
// Use: b := NewBook(); s, _ := b.Table("rating", cols); s.Row(...); s.Flush();
// b.Write(w); b.Close().
type Book struct {
	// Title heads every printed page (with the sheet name and page
	// number); set it before adding sheets.
	Title string
	// Footer is printed at the foot of every page (wetline's writers put
	// the caution there); set it before adding sheets.
	Footer string
	// Words writes the headers of table sheets in words: a column's Name
	// with its underscores as spaces, then its unit ("wetted perimeter
	// (m)" for wetted_perimeter). survey.Table.Column takes spaces for
	// underscores, so such a sheet still reads back by Name (but for an
	// underscore between digits, written as a decimal point: p2_5 is
	// "p2.5"). Input sheets keep the names a field crew types.
	Words   bool
	f       *excelize.File
	styles  map[string]int
	first   bool // the default sheet has not been claimed yet
	pending *SheetWriter
}

// NewBook returns an empty workbook.
func NewBook() *Book {
	return &Book{f: excelize.NewFile(), styles: map[string]int{}, first: true}
}

// Close removes the workbook's temporary files.
func (b *Book) Close() error { return b.f.Close() }

// NewSheet adds an empty sheet (the first call renames the default sheet).
func (b *Book) NewSheet(name string) error {
	if b.first {
		b.first = false
		return b.f.SetSheetName(b.f.GetSheetName(0), name)
	}
	_, err := b.f.NewSheet(name)
	return err
}

// cellAlignment is the alignment of table cells: at the top, so that the
// cells of a row line up with the first line of a wrapped note.
func cellAlignment() *excelize.Alignment { return &excelize.Alignment{Vertical: "top"} }

// Style returns the id of a cell style with a number format code ("" for
// General), cached per code.
func (b *Book) Style(format string) (int, error) {
	return b.style("num:"+format, func() *excelize.Style {
		st := &excelize.Style{Alignment: cellAlignment()}
		if format != "" {
			f := format
			st.CustomNumFmt = &f
		}
		return st
	})
}

// HeaderStyle returns the id of the header cell style.
func (b *Book) HeaderStyle() (int, error) {
	return b.style("header", func() *excelize.Style {
		return &excelize.Style{
			Font:      &excelize.Font{Bold: true, Color: colourHeaderText},
			Fill:      excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{colourHeaderFill}},
			Alignment: &excelize.Alignment{Horizontal: "center", Vertical: "center", WrapText: true},
			Border:    []excelize.Border{{Type: "bottom", Color: colourRule, Style: 2}},
		}
	})
}

// LabelStyle returns the id of the style of label cells (summary items).
func (b *Book) LabelStyle() (int, error) {
	return b.style("label", func() *excelize.Style {
		return &excelize.Style{
			Font:      &excelize.Font{Bold: true},
			Fill:      excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{colourLabelFill}},
			Alignment: &excelize.Alignment{Vertical: "top", WrapText: true},
		}
	})
}

// BandStyle returns the id of a style with a number format code ("" for
// General) on the band colour, for shading every other row of a printed
// table.
func (b *Book) BandStyle(format string) (int, error) {
	return b.style("band:"+format, func() *excelize.Style {
		st := &excelize.Style{Fill: excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{colourLabelFill}}, Alignment: cellAlignment()}
		if format != "" {
			f := format
			st.CustomNumFmt = &f
		}
		return st
	})
}

// MarkFill is the fill colour (RGB hex) of marked cells, such as the
// extrapolated rows of a fitted rating: a pale amber no other style uses.
const MarkFill = "F8DDBA"

// MarkStyle returns the id of the style of a marked cell (italic on
// MarkFill) with a number format code ("" for General), for rows or cells
// a reader must not take for measured ones, such as extrapolated
// discharges.
func (b *Book) MarkStyle(format string) (int, error) {
	return b.style("mark:"+format, func() *excelize.Style {
		st := &excelize.Style{Font: &excelize.Font{Italic: true}, Alignment: cellAlignment(),
			Fill: excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{MarkFill}}}
		if format != "" {
			f := format
			st.CustomNumFmt = &f
		}
		return st
	})
}

// Marked returns v in the marked style (see MarkStyle) with its column's
// number format, format being a format code or FormatSig3.
func (b *Book) Marked(format string, v any) (Styled, error) {
	if format == FormatSig3 {
		x, _ := v.(float64)
		format = DecimalsFormat(Sig3Decimals(x))
	}
	id, err := b.MarkStyle(format)
	return Styled{id, v}, err
}

// TitleStyle returns the id of the style of a sheet's title line: bold,
// a size larger than the cells, wrapped.
func (b *Book) TitleStyle() (int, error) {
	return b.style("title", func() *excelize.Style {
		return &excelize.Style{
			Font:      &excelize.Font{Bold: true, Size: titleFontSize},
			Alignment: &excelize.Alignment{Vertical: "center", WrapText: true},
		}
	})
}

// titleFontSize is the font size of a title line, in points (the cells'
// is 11).
const titleFontSize = 12

// WrapStyle returns the id of a wrapped-text style.
func (b *Book) WrapStyle() (int, error) { return b.WrapFormatStyle("") }

// WrapFormatStyle returns the id of a wrapped-text style with a number
// format code ("" for General).
func (b *Book) WrapFormatStyle(format string) (int, error) {
	return b.style("wrap:"+format, func() *excelize.Style {
		st := &excelize.Style{Alignment: &excelize.Alignment{Vertical: "top", WrapText: true}}
		if format != "" {
			f := format
			st.CustomNumFmt = &f
		}
		return st
	})
}

func (b *Book) style(key string, build func() *excelize.Style) (int, error) {
	if id, ok := b.styles[key]; ok {
		return id, nil
	}
	id, err := b.f.NewStyle(build())
	if err != nil {
		return 0, err
	}
	b.styles[key] = id
	return id, nil
}

// SheetWriter streams the rows of one table sheet. Its header row is
// styled and frozen; column widths and number formats come from the
// Columns.
type SheetWriter struct {
	b      *Book
	name   string
	cols   []Column
	sw     *excelize.StreamWriter
	styles []int // per column; -1 for FormatSig3
	widths []float64
	row    int // the last row written
	// headRows are the rows above the data: the header, and the title
	// when there is one.
	headRows int
	buf      []any
	cells    []excelize.Cell
}

// Table starts a table sheet named name with a header row of cols. Rows
// follow through Row; Flush ends the sheet. One table sheet is written at
// a time. A column without a Width is as wide as its header needs wrapped
// onto two lines.
func (b *Book) Table(name string, cols []Column) (*SheetWriter, error) {
	return b.TitledTable(name, "", cols)
}

// TitledTable is Table with a title line above the header row (none when
// title is ""), saying what the cells of the sheet hold; the title and
// the header are frozen and repeated on every printed page.
func (b *Book) TitledTable(name, title string, cols []Column) (*SheetWriter, error) {
	if b.pending != nil {
		return nil, fmt.Errorf("sheet %q: sheet %q is not flushed yet", name, b.pending.name)
	}
	if len(cols) == 0 {
		return nil, fmt.Errorf("sheet %q: no columns", name)
	}
	if err := b.NewSheet(name); err != nil {
		return nil, err
	}
	s := &SheetWriter{b: b, name: name, cols: cols, styles: make([]int, len(cols)), widths: make([]float64, len(cols)),
		buf: make([]any, len(cols)), cells: make([]excelize.Cell, len(cols))}
	total := 0.0
	for i, c := range cols {
		s.widths[i] = c.Width
		if c.Width == 0 {
			s.widths[i] = headerWidth(b.header(c))
		}
		total += s.widths[i]
	}
	head := 1
	if title != "" {
		head = 2
	}
	if err := b.printSetup(name, head, total); err != nil {
		return nil, err
	}
	sw, err := b.f.NewStreamWriter(name)
	if err != nil {
		return nil, err
	}
	s.sw = sw
	// The stream writer writes <col> elements in the order its list holds
	// them and each width goes to the front of that list; spreadsheet
	// programs want them ascending, so set the widths last column first.
	for i := len(cols) - 1; i >= 0; i-- {
		if err := sw.SetColWidth(i+1, i+1, s.widths[i]); err != nil {
			return nil, err
		}
	}
	for i, c := range cols {
		switch {
		case c.Format == FormatSig3:
			s.styles[i] = -1
			continue
		case c.Wrap:
			s.styles[i], err = b.WrapFormatStyle(c.Format)
		default:
			s.styles[i], err = b.Style(c.Format)
		}
		if err != nil {
			return nil, err
		}
	}
	top := fmt.Sprintf("A%d", head+1)
	if err := sw.SetPanes(&excelize.Panes{Freeze: true, YSplit: head, TopLeftCell: top, ActivePane: "bottomLeft"}); err != nil {
		return nil, err
	}
	if title != "" {
		if err := s.title(title, total); err != nil {
			return nil, err
		}
	}
	hs, err := b.HeaderStyle()
	if err != nil {
		return nil, err
	}
	row := make([]any, len(cols))
	lines := minHeaderLines
	for i, c := range cols {
		row[i] = excelize.Cell{StyleID: hs, Value: b.header(c)}
		lines = max(lines, wrappedLines(strings.Fields(b.header(c)), int(s.widths[i])-headerPadding))
	}
	if err := sw.SetRow(fmt.Sprintf("A%d", head), row, excelize.RowOpts{Height: math.Min(float64(lines)*lineHeight, MaxRowHeight)}); err != nil {
		return nil, err
	}
	s.row, s.headRows = head, head
	b.pending = s
	return s, nil
}

// title writes a sheet's title line in row 1, merged across the columns
// (total characters wide), as tall as its wrapped text.
func (s *SheetWriter) title(title string, total float64) error {
	ts, err := s.b.TitleStyle()
	if err != nil {
		return err
	}
	lines := wrappedLines(strings.Fields(title), max(int(total)-1, 1))
	h := math.Min(float64(lines)*lineHeight+lineHeight/2, MaxRowHeight)
	if err := s.sw.SetRow("A1", []any{excelize.Cell{StyleID: ts, Value: title}}, excelize.RowOpts{Height: h}); err != nil {
		return err
	}
	if len(s.cols) == 1 {
		return nil
	}
	last, err := excelize.CoordinatesToCellName(len(s.cols), 1)
	if err != nil {
		return err
	}
	return s.sw.MergeCell("A1", last)
}

// header returns the header cell text of a table sheet's column (see
// Book.Words).
func (b *Book) header(c Column) string {
	if b.Words {
		c.Name = words(c.Name)
	}
	return c.Header()
}

// words writes a column name in words: underscores become spaces, except
// one between two digits, which is a decimal point (p2_5 is p2.5).
func words(name string) string {
	r := []rune(name)
	digit := func(i int) bool { return i >= 0 && i < len(r) && r[i] >= '0' && r[i] <= '9' }
	for i, c := range r {
		if c != '_' {
			continue
		}
		r[i] = ' '
		if digit(i-1) && digit(i+1) {
			r[i] = '.'
		}
	}
	return string(r)
}

// Styled is a cell value with its own style (from Book.Style,
// Book.LabelStyle, ...) instead of its column's.
type Styled struct {
	Style int
	Value any
}

// Row writes the next row. Values are float64 (NaN and ±Inf become blank
// cells), int, string, time.Time, Styled, or nil for a blank cell; missing
// trailing values are blank.
func (s *SheetWriter) Row(values ...any) error {
	if len(values) > len(s.cols) {
		return fmt.Errorf("sheet %q: %d values for %d columns", s.name, len(values), len(s.cols))
	}
	s.row++
	row := s.buf[:len(s.cols)]
	for i := range row {
		row[i] = nil
		if i >= len(values) || values[i] == nil {
			continue
		}
		v := values[i]
		if sv, ok := v.(Styled); ok {
			if x, ok := sv.Value.(float64); ok && (math.IsNaN(x) || math.IsInf(x, 0)) {
				sv.Value = nil // a styled blank cell
			}
			s.cells[i] = excelize.Cell{StyleID: sv.Style, Value: sv.Value}
			row[i] = s.cells[i]
			continue
		}
		if x, ok := v.(float64); ok && (math.IsNaN(x) || math.IsInf(x, 0)) {
			continue
		}
		st := s.styles[i]
		if st < 0 {
			x, _ := v.(float64)
			id, err := s.b.Style(DecimalsFormat(Sig3Decimals(x)))
			if err != nil {
				return err
			}
			st = id
		}
		s.cells[i] = excelize.Cell{StyleID: st, Value: v}
		row[i] = s.cells[i]
	}
	cell, err := excelize.CoordinatesToCellName(1, s.row)
	if err != nil {
		return err
	}
	if lines := s.lines(values); lines > 1 {
		return s.sw.SetRow(cell, row, excelize.RowOpts{Height: math.Min(float64(lines)*lineHeight, MaxRowHeight)})
	}
	return s.sw.SetRow(cell, row)
}

// lineHeight is the height of one line of text in a row, in points.
const lineHeight = 15

// MaxRows is the number of rows a sheet holds (the file format's limit).
const MaxRows = 1_048_576

// MaxRowHeight is the tallest row a sheet may have, in points (the file
// format's limit); longer text is cut off in view, kept whole in the cell.
const MaxRowHeight = 409

// lines estimates how many wrapped lines the longest text of a row takes,
// taking a column's width in characters as the characters per line
// (spreadsheet programs do not size rows of a streamed sheet themselves).
func (s *SheetWriter) lines(values []any) int {
	n := 1
	for i, v := range values {
		if sv, ok := v.(Styled); ok {
			v = sv.Value
		}
		text, ok := v.(string)
		if !ok || i >= len(s.widths) {
			continue
		}
		per := max(int(s.widths[i])-1, 1)
		l := 0
		for _, para := range strings.Split(text, "\n") {
			l += max(1, (len([]rune(para))+per-1)/per)
		}
		n = max(n, l)
	}
	return n
}

// Rows returns the number of data rows written so far.
func (s *SheetWriter) Rows() int { return s.row - s.headRows }

// Flush ends the sheet.
func (s *SheetWriter) Flush() error {
	if s.b.pending == s {
		s.b.pending = nil
	}
	return s.sw.Flush()
}

// Pictures adds a sheet holding each PNG under its caption, one below the
// other, each scaled down to fit PictureWidth × PictureHeight pixels.
// Printed, every picture comes whole on a landscape page of its own under
// its caption, with the page header and footer of the other sheets.
func (b *Book) Pictures(sheet string, pics []Picture) error {
	if err := b.NewSheet(sheet); err != nil {
		return err
	}
	ls, err := b.LabelStyle()
	if err != nil {
		return err
	}
	if err := b.f.SetColWidth(sheet, "A", "A", pictureColumn); err != nil {
		return err
	}
	row := 1
	for i, p := range pics {
		cfg, format, err := image.DecodeConfig(bytes.NewReader(p.PNG))
		if err != nil || format != "png" || cfg.Width <= 0 || cfg.Height <= 0 {
			return fmt.Errorf("picture %q: not a PNG image", p.Name)
		}
		scale := PictureScale(cfg.Width, cfg.Height)
		if i > 0 { // each picture starts a printed page
			if err := b.f.InsertPageBreak(sheet, fmt.Sprintf("A%d", row)); err != nil {
				return err
			}
		}
		caption := fmt.Sprintf("A%d", row)
		if err := b.f.SetCellStr(sheet, caption, p.Name); err != nil {
			return err
		}
		if err := b.f.SetCellStyle(sheet, caption, caption, ls); err != nil {
			return err
		}
		if err := b.f.SetRowHeight(sheet, row, lineHeight*1.5); err != nil {
			return err
		}
		row++
		// One row as tall as the picture (in points, 3 per 4 pixels),
		// so that every spreadsheet program pages it alike.
		h := math.Min(math.Ceil(float64(cfg.Height)*scale*0.75)+pictureGap, MaxRowHeight)
		if err := b.f.SetRowHeight(sheet, row, h); err != nil {
			return err
		}
		if err := b.f.AddPictureFromBytes(sheet, fmt.Sprintf("A%d", row), &excelize.Picture{
			Extension: ".png", File: p.PNG,
			Format: &excelize.GraphicOptions{AltText: p.Name, ScaleX: scale, ScaleY: scale, LockAspectRatio: true,
				Positioning: "oneCell"},
		}); err != nil {
			return fmt.Errorf("picture %q: %w", p.Name, err)
		}
		row++
	}
	return b.picturePrintSetup(sheet, row-1)
}

// pictureGap is the room, in points, left below a picture in its row.
const pictureGap = 4

// pictureColumn is the width, in characters, of column A of a picture
// sheet, which holds the captions and the pictures: a character more than
// the widest picture, so that only column A prints.
const pictureColumn = PictureWidth/7 + 1

// PictureScale returns the factor (at most 1) that fits a picture of w ×
// h pixels into PictureWidth × PictureHeight.
func PictureScale(w, h int) float64 {
	return math.Min(1, math.Min(float64(PictureWidth)/float64(w), float64(PictureHeight)/float64(h)))
}

// ErrOpenSheet is returned by Write while a table sheet is not flushed.
var ErrOpenSheet = errors.New("a table sheet is not flushed")

// Write writes the workbook as xlsx to w. The same book gives the same
// bytes on every run: excelize zips its streamed sheets and the image
// types of [Content_Types].xml in map order, so the parts are zipped
// first to a temporary file, then copied to w (still compressed) in name
// order, [Content_Types].xml first with its entries sorted. The file is
// never held in memory whole.
func (b *Book) Write(w io.Writer) error {
	if b.pending != nil {
		return fmt.Errorf("sheet %q: %w", b.pending.name, ErrOpenSheet)
	}
	tmp, err := os.CreateTemp("", "wetline-book-*.xlsx")
	if err != nil {
		return err
	}
	defer os.Remove(tmp.Name())
	defer tmp.Close()
	// excelize zips into an in-memory buffer and copies it to w; handing
	// it a zip writer on the file instead leaves that buffer empty.
	b.f.SetZipWriter(func(io.Writer) excelize.ZipWriter { return datedZip{zip.NewWriter(tmp)} })
	if _, err := b.f.WriteTo(io.Discard); err != nil {
		return err
	}
	size, err := tmp.Seek(0, io.SeekCurrent)
	if err != nil {
		return err
	}
	return canonicalZip(w, tmp, size)
}

// contentTypesPart is the part naming the content type of every other.
const contentTypesPart = "[Content_Types].xml"

// canonicalZip copies the zip archive in r (size bytes) to w with its
// entries in name order, [Content_Types].xml first and rewritten by
// sortedContentTypes. Entries other than that one are copied still
// compressed.
func canonicalZip(w io.Writer, r io.ReaderAt, size int64) error {
	in, err := zip.NewReader(r, size)
	if err != nil {
		return err
	}
	files := slices.Clone(in.File)
	slices.SortFunc(files, func(a, b *zip.File) int {
		if (a.Name == contentTypesPart) != (b.Name == contentTypesPart) {
			if a.Name == contentTypesPart {
				return -1
			}
			return 1
		}
		return strings.Compare(a.Name, b.Name)
	})
	out := datedZip{zip.NewWriter(w)}
	for _, f := range files {
		if f.Name != contentTypesPart {
			if err := out.Copy(f); err != nil {
				return err
			}
			continue
		}
		rc, err := f.Open()
		if err != nil {
			return err
		}
		data, err := io.ReadAll(rc)
		rc.Close()
		if err != nil {
			return err
		}
		if data, err = sortedContentTypes(data); err != nil {
			return err
		}
		part, err := out.Create(f.Name)
		if err != nil {
			return err
		}
		if _, err := part.Write(data); err != nil {
			return err
		}
	}
	return out.Close()
}

// contentTypes is [Content_Types].xml of the Open Packaging Conventions
// (ECMA-376 part 2, §10.1.2.2): a default content type per file
// extension and an override per part.
type contentTypes struct {
	XMLName   xml.Name          `xml:"http://schemas.openxmlformats.org/package/2006/content-types Types"`
	Defaults  []contentDefault  `xml:"Default"`
	Overrides []contentOverride `xml:"Override"`
}

type contentDefault struct {
	Extension   string `xml:",attr"`
	ContentType string `xml:",attr"`
}

type contentOverride struct {
	PartName    string `xml:",attr"`
	ContentType string `xml:",attr"`
}

// sortedContentTypes returns the [Content_Types].xml document data with
// its defaults sorted by extension and its overrides by part name.
func sortedContentTypes(data []byte) ([]byte, error) {
	var ct contentTypes
	if err := xml.Unmarshal(data, &ct); err != nil {
		return nil, fmt.Errorf("%s: %w", contentTypesPart, err)
	}
	slices.SortFunc(ct.Defaults, func(a, b contentDefault) int { return strings.Compare(a.Extension, b.Extension) })
	slices.SortFunc(ct.Overrides, func(a, b contentOverride) int { return strings.Compare(a.PartName, b.PartName) })
	body, err := xml.Marshal(ct)
	if err != nil {
		return nil, err
	}
	return append([]byte(xml.Header), body...), nil
}

// datedZip is a zip writer whose entries all carry one modification
// time, 1980-01-01 00:00 UTC: the earliest an MS-DOS zip date can hold,
// so that no part carries the time of the run. Without one, the zip
// writer stores the date 1980-00-00, which is no date and which archive
// checkers report.
type datedZip struct{ *zip.Writer }

// Create adds a deflated entry dated 1980-01-01 00:00 UTC.
func (z datedZip) Create(name string) (io.Writer, error) {
	return z.CreateHeader(&zip.FileHeader{Name: name, Method: zip.Deflate, Modified: time.Date(1980, time.January, 1, 0, 0, 0, 0, time.UTC)})
}

// Sig3 returns v styled to show three significant figures (see
// FormatSig3).
func (b *Book) Sig3(v float64) (Styled, error) {
	id, err := b.Style(DecimalsFormat(Sig3Decimals(v)))
	return Styled{id, v}, err
}

// InputStyle returns the id of the style of cells a crew fills in: a
// number format code ("" for General) on the input colour.
func (b *Book) InputStyle(format string) (int, error) {
	return b.style("input:"+format, func() *excelize.Style {
		st := &excelize.Style{Fill: excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{colourInputFill}}}
		if format != "" {
			f := format
			st.CustomNumFmt = &f
		}
		return st
	})
}
