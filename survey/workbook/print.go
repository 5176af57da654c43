package workbook

import (
	"fmt"
	"strings"

	"github.com/xuri/excelize/v2"
)

// Printed pages. Every sheet of a Book prints with the book's title at
// the head of the page, the sheet name and page number beside it, and the
// footer at the foot, on margins that suit both A4 and US Letter paper.
// Table and input sheets print one page wide and as many pages tall as
// needed, their header rows repeated on every page, in landscape when
// their columns are wider than a portrait page. Picture sheets print in
// landscape at full size, one whole picture per page.

// Margins of every printed page, in inches (common practice for A4 and
// US Letter: half an inch at the sides, three quarters at head and foot
// to leave room for the page header and footer lines).
const (
	MarginSide   = 0.5
	MarginTop    = 0.75
	MarginBottom = 0.75
	// MarginHeader and MarginFooter are the distances from the paper's
	// edge to the page header and the footer line.
	MarginHeader = 0.3
	MarginFooter = 0.3
)

// Page orientations of a printed sheet, as excelize names them.
const (
	Portrait  = "portrait"
	Landscape = "landscape"
)

// PortraitWidth is the width, in pixels at 96 per inch, that a portrait
// page prints between its side margins on the narrower of A4 and US
// Letter paper (8.27 in less two side margins). A table sheet wider than
// this prints landscape.
const PortraitWidth = 698

// PictureWidth and PictureHeight bound a picture in a picture sheet, in
// pixels at 96 per inch: a picture larger than the box is scaled down to
// fit it whole, so that it prints at full size on one landscape page of
// A4 or US Letter paper with its caption (10 in × 6.8 in between the
// margins of the smaller page, less the caption row), within the tallest
// row the file format allows.
const (
	PictureWidth  = 880
	PictureHeight = 540
)

// maxPrintTitle bounds the title printed at the head of a page (the
// whole header may hold 255 characters).
const maxPrintTitle = 100

// pageHead sets the printed page header (the title on the left, the sheet
// and page number on the right) and footer of a sheet, and its margins.
func (b *Book) pageHead(sheet string) error {
	title := []rune(b.Title)
	if len(title) > maxPrintTitle {
		title = append(title[:maxPrintTitle-1], '…')
	}
	esc := strings.NewReplacer("&", "&&")
	if err := b.f.SetHeaderFooter(sheet, &excelize.HeaderFooterOptions{
		OddHeader: "&L" + esc.Replace(string(title)) + "&R&A, page &P of &N",
		OddFooter: "&L&7" + esc.Replace(b.Footer),
	}); err != nil {
		return err
	}
	side, top, bottom, head, foot := MarginSide, MarginTop, MarginBottom, MarginHeader, MarginFooter
	return b.f.SetPageMargins(sheet, &excelize.PageLayoutMarginsOptions{
		Left: &side, Right: &side, Top: &top, Bottom: &bottom, Header: &head, Footer: &foot,
	})
}

// printSetup sets up the printing of a table or input sheet whose first
// headRows rows are its header and whose columns are widths characters
// wide in all: one page wide, as many pages tall as needed, the header
// rows repeated on every page, in landscape when wider than a portrait
// page. For a streamed sheet it must run before the stream writer is
// created.
func (b *Book) printSetup(sheet string, headRows int, widths float64) error {
	return b.printSetupRows(sheet, 1, headRows, widths)
}

// printSetupRows is printSetup with the rows repeated on every page from
// first to last (1-based).
func (b *Book) printSetupRows(sheet string, first, last int, widths float64) error {
	if err := b.pageHead(sheet); err != nil {
		return err
	}
	fit, one, zero := true, 1, 0
	if err := b.f.SetSheetProps(sheet, &excelize.SheetPropsOptions{FitToPage: &fit}); err != nil {
		return err
	}
	orient := Portrait
	if columnPixels(widths) > PortraitWidth {
		orient = Landscape
	}
	if err := b.f.SetPageLayout(sheet, &excelize.PageLayoutOptions{Orientation: &orient, FitToWidth: &one, FitToHeight: &zero}); err != nil {
		return err
	}
	return b.f.SetDefinedName(&excelize.DefinedName{
		Name: "_xlnm.Print_Titles", RefersTo: fmt.Sprintf("'%s'!$%d:$%d", strings.ReplaceAll(sheet, "'", "''"), first, last), Scope: sheet,
	})
}

// columnPixels is the width in pixels of columns widths characters wide
// in all: a width counts digits of the default font, 7 pixels each, its
// padding included (ECMA-376 Part 1, 18.3.1.13).
func columnPixels(widths float64) float64 { return widths * 7 }

// picturePrintSetup sets up the printing of a picture sheet whose
// pictures fill column A down to row last: landscape at full size (never
// scaled to fit, which would make spreadsheet programs ignore its page
// breaks), column A only.
func (b *Book) picturePrintSetup(sheet string, last int) error {
	if err := b.pageHead(sheet); err != nil {
		return err
	}
	orient, full := Landscape, uint(100)
	if err := b.f.SetPageLayout(sheet, &excelize.PageLayoutOptions{Orientation: &orient, AdjustTo: &full}); err != nil {
		return err
	}
	return b.f.SetDefinedName(&excelize.DefinedName{
		Name: "_xlnm.Print_Area", RefersTo: fmt.Sprintf("'%s'!$A$1:$A$%d", strings.ReplaceAll(sheet, "'", "''"), max(last, 1)), Scope: sheet,
	})
}

// headerLines is the number of lines an automatic column width wraps its
// header onto; the header row is as tall as its most wrapped header, and
// at least minHeaderLines lines.
const (
	headerLines    = 3
	minHeaderLines = 2
)

// headerPadding is the room, in characters, left beside the longest line
// of a wrapped header (its bold text is wider than the digits widths are
// counted in).
const headerPadding = 2

// headerWidth is the automatic width of a column with header text: the
// narrowest that wraps it, word by word, onto headerLines lines, and at
// least MinColumnWidth.
func headerWidth(text string) float64 {
	words := strings.Fields(text)
	w := 0
	for _, word := range words {
		w = max(w, len([]rune(word)))
	}
	for wrappedLines(words, w) > headerLines {
		w++
	}
	return float64(max(w+headerPadding, MinColumnWidth))
}

// wrappedLines counts the lines words take wrapped greedily at width
// characters (a word longer than the width takes a line of its own).
func wrappedLines(words []string, width int) int {
	n, line := 1, 0
	for _, word := range words {
		l := len([]rune(word))
		switch {
		case line == 0:
			line = l
		case line+1+l <= width:
			line += 1 + l
		default:
			n, line = n+1, l
		}
	}
	return n
}
