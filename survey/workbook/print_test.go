package workbook

import (
	"archive/zip"
	"bytes"
	"encoding/xml"
	"fmt"
	"image"
	"image/color"
	"image/png"
	"io"
	"math"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// writeBook writes b and opens the result.
func writeBook(t *testing.T, b *Book) (*excelize.File, []byte) {
	t.Helper()
	var buf bytes.Buffer
	if err := b.Write(&buf); err != nil {
		t.Fatal(err)
	}
	f, err := excelize.OpenReader(bytes.NewReader(buf.Bytes()))
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { f.Close() })
	return f, buf.Bytes()
}

// definedName returns what a sheet's defined name refers to, "" when
// there is none.
func definedName(f *excelize.File, sheet, name string) string {
	for _, dn := range f.GetDefinedName() {
		if dn.Name == name && dn.Scope == sheet {
			return dn.RefersTo
		}
	}
	return ""
}

// checkPageHead checks the printed page header, footer and margins of a
// sheet.
func checkPageHead(t *testing.T, f *excelize.File, sheet, title, footer string) {
	t.Helper()
	hf, err := f.GetHeaderFooter(sheet)
	if err != nil || !strings.HasPrefix(hf.OddHeader, "&L"+title) || !strings.Contains(hf.OddHeader, "&A, page &P of &N") ||
		!strings.HasSuffix(hf.OddFooter, footer) {
		t.Errorf("%s: header %q, footer %q (%v)", sheet, hf.OddHeader, hf.OddFooter, err)
	}
	m, err := f.GetPageMargins(sheet)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		what      string
		got, want float64
	}{
		{"left", *m.Left, MarginSide}, {"right", *m.Right, MarginSide}, {"top", *m.Top, MarginTop},
		{"bottom", *m.Bottom, MarginBottom}, {"header", *m.Header, MarginHeader}, {"footer", *m.Footer, MarginFooter},
	} {
		if c.got != c.want {
			t.Errorf("%s: %s margin %g in, want %g", sheet, c.what, c.got, c.want)
		}
	}
}

// Table sheets print one page wide and any number of pages tall, the
// header (and title) rows repeated, in landscape when wider than a
// portrait page, with the book's title, sheet name and page number at
// the head and the footer at the foot, on the house margins.
func TestTablePrintSetup(t *testing.T) {
	wide := make([]Column, 18)
	for i := range wide {
		wide[i] = Column{Name: fmt.Sprintf("quantity_%d", i), Unit: "m3/s"}
	}
	tests := []struct {
		name, title string
		cols        []Column
		orient      string
		titles      string
	}{
		{"narrow", "", []Column{{Name: "stage", Unit: "m"}, {Name: "discharge", Unit: "m3/s"}}, Portrait, "$1:$1"},
		{"wide", "", wide, Landscape, "$1:$1"},
		// 99 characters at 7 pixels is 693 pixels: still portrait.
		{"just portrait", "", []Column{{Name: "a", Width: 50}, {Name: "b", Width: 49}}, Portrait, "$1:$1"},
		{"just landscape", "", []Column{{Name: "a", Width: 50}, {Name: "b", Width: 50}}, Landscape, "$1:$1"},
		{"titled", "discharge (m3/s) by stage", []Column{{Name: "stage", Unit: "m"}}, Portrait, "$1:$2"},
		{"it's quoted", "", []Column{{Name: "stage"}}, Portrait, "$1:$1"},
	}
	b := NewBook()
	defer b.Close()
	b.Title, b.Footer = "wetline test & check", "a caution"
	for _, tc := range tests {
		s, err := b.TitledTable(tc.name, tc.title, tc.cols)
		if err != nil {
			t.Fatal(err)
		}
		if err := s.Row(1.0); err != nil {
			t.Fatal(err)
		}
		if err := s.Flush(); err != nil {
			t.Fatal(err)
		}
	}
	f, _ := writeBook(t, b)
	for _, tc := range tests {
		pl, err := f.GetPageLayout(tc.name)
		if err != nil {
			t.Fatal(err)
		}
		if *pl.Orientation != tc.orient || pl.FitToWidth == nil || *pl.FitToWidth != 1 || pl.FitToHeight == nil || *pl.FitToHeight != 0 {
			t.Errorf("%s: orientation %s, fit %v wide %v tall; want %s, 1 wide, any tall", tc.name, *pl.Orientation, pl.FitToWidth, pl.FitToHeight, tc.orient)
		}
		if props, err := f.GetSheetProps(tc.name); err != nil || props.FitToPage == nil || !*props.FitToPage {
			t.Errorf("%s: not fitted to the page (%v)", tc.name, err)
		}
		want := "'" + strings.ReplaceAll(tc.name, "'", "''") + "'!" + tc.titles
		if got := definedName(f, tc.name, "_xlnm.Print_Titles"); got != want {
			t.Errorf("%s: print titles %q, want %q", tc.name, got, want)
		}
		checkPageHead(t, f, tc.name, "wetline test && check", "a caution")
		panes, err := f.GetPanes(tc.name)
		head := 1
		if tc.title != "" {
			head = 2
		}
		if err != nil || !panes.Freeze || panes.YSplit != head {
			t.Errorf("%s: panes %+v (%v), want %d rows frozen", tc.name, panes, err, head)
		}
	}
	// The title line spans the columns above the header.
	if v, _ := f.GetCellValue("titled", "A1"); v != "discharge (m3/s) by stage" {
		t.Errorf("title %q", v)
	}
	if v, _ := f.GetCellValue("titled", "A2"); v != "stage (m)" {
		t.Errorf("header under the title %q", v)
	}
	if v, _ := f.GetCellValue("titled", "A3"); v != "1" {
		t.Errorf("first data row %q", v)
	}
}

// Input sheets (the field template's) print like table sheets.
func TestInputSheetPrintSetup(t *testing.T) {
	b := NewBook()
	defer b.Close()
	b.Title, b.Footer = "field workbook", "fill in the gaps"
	cols := []InputColumn{{Column: Column{Name: "station", Unit: "m", Width: 13}}, {Column: Column{Name: "ws_left", Unit: "m", Width: 14}}}
	if err := b.InputSheet("XS-1", cols, 10, nil); err != nil {
		t.Fatal(err)
	}
	f, _ := writeBook(t, b)
	if v, _ := f.GetCellValue("XS-1", "B1"); v != "ws_left (m)" {
		t.Errorf("input header %q, want the name a crew types", v)
	}
	pl, _ := f.GetPageLayout("XS-1")
	if *pl.Orientation != Portrait || *pl.FitToWidth != 1 {
		t.Errorf("input sheet: %s, %d wide", *pl.Orientation, *pl.FitToWidth)
	}
	if got := definedName(f, "XS-1", "_xlnm.Print_Titles"); got != "'XS-1'!$1:$1" {
		t.Errorf("print titles %q", got)
	}
	checkPageHead(t, f, "XS-1", "field workbook", "fill in the gaps")
}

// testPNG draws a w × h PNG.
func testPNG(w, h int) []byte {
	img := image.NewNRGBA(image.Rect(0, 0, w, h))
	for y := range h {
		for x := range w {
			img.Set(x, y, color.NRGBA{uint8(x), uint8(y), 90, 255})
		}
	}
	var buf bytes.Buffer
	if err := png.Encode(&buf, img); err != nil {
		panic(err)
	}
	return buf.Bytes()
}

// rowBreaks returns the rows a sheet's manual page breaks follow, read
// from the sheet's XML (excelize has no getter for them).
func rowBreaks(t *testing.T, data []byte, sheetFile string) []int {
	t.Helper()
	zr, err := zip.NewReader(bytes.NewReader(data), int64(len(data)))
	if err != nil {
		t.Fatal(err)
	}
	for _, zf := range zr.File {
		if zf.Name != sheetFile {
			continue
		}
		rc, err := zf.Open()
		if err != nil {
			t.Fatal(err)
		}
		raw, err := io.ReadAll(rc)
		rc.Close()
		if err != nil {
			t.Fatal(err)
		}
		var ws struct {
			RowBreaks struct {
				Brk []struct {
					ID  int  `xml:"id,attr"`
					Man bool `xml:"man,attr"`
				} `xml:"brk"`
			} `xml:"rowBreaks"`
		}
		if err := xml.Unmarshal(raw, &ws); err != nil {
			t.Fatal(err)
		}
		var out []int
		for _, b := range ws.RowBreaks.Brk {
			if b.Man {
				out = append(out, b.ID)
			}
		}
		return out
	}
	t.Fatalf("no %s in the workbook", sheetFile)
	return nil
}

// A picture sheet prints each picture whole on a landscape page of its
// own, at full size: pictures scaled into the picture box (aspect kept,
// small ones not enlarged), each in a row as tall as itself under its
// caption, a manual page break before every caption but the first, only
// column A printed, and the page header and footer of the other sheets.
func TestPicturesPrint(t *testing.T) {
	pics := []Picture{
		{Name: "rating, default size", PNG: testPNG(1600, 1000)},
		{Name: "tall section", PNG: testPNG(600, 1200)},
		{Name: "small plan", PNG: testPNG(300, 200)},
	}
	b := NewBook()
	defer b.Close()
	b.Title, b.Footer = "wetline rating: XS-2", "a caution"
	if err := b.Pictures("plots", pics); err != nil {
		t.Fatal(err)
	}
	f, data := writeBook(t, b)
	cells, err := f.GetPictureCells("plots")
	if err != nil || len(cells) != len(pics) {
		t.Fatalf("picture cells %v (%v)", cells, err)
	}
	wantScale := []float64{0.54, 0.45, 1} // 1600×1000 to 864×540; 600×1200 to 270×540
	for i, p := range pics {
		row := 2*i + 2
		if cells[i] != fmt.Sprintf("A%d", row) {
			t.Errorf("picture %d at %s, want A%d", i+1, cells[i], row)
		}
		if v, _ := f.GetCellValue("plots", fmt.Sprintf("A%d", row-1)); v != p.Name {
			t.Errorf("caption of picture %d: %q", i+1, v)
		}
		got, err := f.GetPictures("plots", cells[i])
		if err != nil || len(got) != 1 {
			t.Fatalf("picture %d: %v", i+1, err)
		}
		cfg, _, _ := image.DecodeConfig(bytes.NewReader(p.PNG))
		sx, sy := got[0].Format.ScaleX, got[0].Format.ScaleY
		if math.Abs(sx-wantScale[i]) > 1e-12 || sx != sy {
			t.Errorf("picture %d scaled %g × %g, want %g", i+1, sx, sy, wantScale[i])
		}
		w, h := float64(cfg.Width)*sx, float64(cfg.Height)*sy
		if w > PictureWidth || h > PictureHeight {
			t.Errorf("picture %d shown %g × %g pixels, outside the box", i+1, w, h)
		}
		// The row holds the picture (points are 3/4 of a pixel at 96/in).
		if rh, _ := f.GetRowHeight("plots", row); rh < h*0.75 || rh > MaxRowHeight {
			t.Errorf("picture %d: row height %g pt for a picture %g pt tall", i+1, rh, h*0.75)
		}
	}
	// Column A as wide as the box (7 pixels a character).
	if cw, _ := f.GetColWidth("plots", "A"); cw*7 < PictureWidth {
		t.Errorf("column A %g characters, narrower than the pictures", cw)
	}
	if got, want := rowBreaks(t, data, "xl/worksheets/sheet1.xml"), []int{2, 4}; fmt.Sprint(got) != fmt.Sprint(want) {
		t.Errorf("page breaks after rows %v, want %v", got, want)
	}
	pl, err := f.GetPageLayout("plots")
	if err != nil || *pl.Orientation != Landscape || *pl.AdjustTo != 100 {
		t.Errorf("plots: %s at %d %%, want landscape at full size (%v)", *pl.Orientation, *pl.AdjustTo, err)
	}
	if props, _ := f.GetSheetProps("plots"); props.FitToPage != nil && *props.FitToPage {
		t.Errorf("plots fitted to the page: its page breaks would be ignored")
	}
	if got := definedName(f, "plots", "_xlnm.Print_Area"); got != "'plots'!$A$1:$A$6" {
		t.Errorf("print area %q", got)
	}
	checkPageHead(t, f, "plots", "wetline rating: XS-2", "a caution")
}

// The tallest picture row and its caption fit the printable height of a
// landscape page of the smaller of A4 and US Letter paper.
func TestPicturePageFits(t *testing.T) {
	const a4Landscape = 8.27 // inches tall
	printable := (a4Landscape - MarginTop - MarginBottom) * 72
	if used := lineHeight*1.5 + float64(MaxRowHeight); used > printable {
		t.Errorf("caption and picture take %g pt of %g pt", used, printable)
	}
	if h := math.Ceil(PictureHeight*0.75) + pictureGap; h > MaxRowHeight {
		t.Errorf("a picture of the box's height needs a row of %g pt, above %d", h, MaxRowHeight)
	}
	const letterLandscape = 11.0 // inches wide
	if w := columnPixels(pictureColumn); w > (letterLandscape-2*MarginSide)*96 {
		t.Errorf("column A is %g pixels, wider than a landscape Letter page", w)
	}
}

// Headers in words: underscores as spaces, a decimal point between
// digits; automatic widths wrap a header onto three lines at most.
func TestHeaderWords(t *testing.T) {
	for _, tc := range []struct {
		name, words string
	}{
		{"wetted_perimeter", "wetted perimeter"},
		{"p2_5", "p2.5"},
		{"total_lower_95", "total lower 95"},
		{"discharge_1_left", "discharge 1 left"},
		{"_x_", " x "},
		{"stage", "stage"},
	} {
		if got := words(tc.name); got != tc.words {
			t.Errorf("words(%q) = %q, want %q", tc.name, got, tc.words)
		}
	}
	for _, tc := range []struct {
		header string
		width  float64
	}{
		{"stage (m)", MinColumnWidth},
		{"wetted perimeter (m)", 11},       // "wetted" / "perimeter" / "(m)"
		{"discharge 3 channel (m3/s)", 11}, // "discharge" / "3 channel" / "(m3/s)"
		{"parametric upper 95 (m3/s)", 12}, // "parametric" / "upper 95" / "(m3/s)"
		{"a b c d e f g h i j k l", 9},     // 4 letters in 7 characters a line, 3 lines
		{"supercalifragilistic", 22},       // one long word
		{"velocity head change (m)", 12},   // "velocity head" needs 13: "velocity" / "head change" / "(m)"
	} {
		if got := headerWidth(tc.header); got != tc.width {
			t.Errorf("headerWidth(%q) = %g, want %g", tc.header, got, tc.width)
		}
	}
	b := NewBook()
	defer b.Close()
	b.Words = true
	s, err := b.Table("t", []Column{{Name: "wetted_perimeter", Unit: "m"}, {Name: "p97_5"}})
	if err != nil {
		t.Fatal(err)
	}
	if err := s.Flush(); err != nil {
		t.Fatal(err)
	}
	f, _ := writeBook(t, b)
	rows, _ := f.GetRows("t")
	if len(rows) != 1 || strings.Join(rows[0], "|") != "wetted perimeter (m)|p97.5" {
		t.Errorf("header %q", rows)
	}
	if h, _ := f.GetRowHeight("t", 1); h != 3*lineHeight {
		t.Errorf("header row %g pt, want three lines", h)
	}
}

// A wrapped column's cells wrap within its width, keep its number format,
// and the row grows to the lines its longest text takes; cells align at
// the top, level with a wrapped note's first line.
func TestWrapColumn(t *testing.T) {
	b := NewBook()
	defer b.Close()
	s, err := b.Table("g", []Column{{Name: "stage", Format: "0.000"}, {Name: "note", Width: 11, Wrap: true, Format: FormatText}})
	if err != nil {
		t.Fatal(err)
	}
	if err := s.Row(1.5, "flood; measured from the footbridge"); err != nil { // 35 characters, 10 a line
		t.Fatal(err)
	}
	if err := s.Flush(); err != nil {
		t.Fatal(err)
	}
	f, _ := writeBook(t, b)
	style := func(cell string) *excelize.Style {
		id, err := f.GetCellStyle("g", cell)
		if err != nil {
			t.Fatal(err)
		}
		st, err := f.GetStyle(id)
		if err != nil {
			t.Fatal(err)
		}
		return st
	}
	if st := style("B2"); st.Alignment == nil || !st.Alignment.WrapText || st.CustomNumFmt == nil || *st.CustomNumFmt != FormatText {
		t.Errorf("note cell style %+v", st)
	}
	if st := style("A2"); st.Alignment == nil || st.Alignment.Vertical != "top" || st.Alignment.WrapText {
		t.Errorf("stage cell style %+v", st)
	}
	if h, _ := f.GetRowHeight("g", 2); h != 4*lineHeight {
		t.Errorf("row height %g pt, want 4 lines", h)
	}
}

// Key rows above an input sheet's header push the header, its rules, the
// data, the frozen panes and the printed titles down below them; the
// value cells are text spanning the sheet, with their prompts.
func TestKeyedInputSheet(t *testing.T) {
	b := NewBook()
	defer b.Close()
	keys := []KeyRow{{Key: "site", Value: "Heron Weir", Help: "the site"}, {Key: "surveyed", Help: "a date"}}
	cols := []InputColumn{
		{Column: Column{Name: "station", Width: 10}, Rule: &Rule{Kind: Decimal, Lo: -10, Hi: 10}},
		{Column: Column{Name: "elevation", Width: 10}},
		{Column: Column{Name: "note", Width: 20}},
	}
	if err := b.KeyedInputSheet("xs", keys, cols, 4, [][]any{{1.5, 2.5, "pin"}}); err != nil {
		t.Fatal(err)
	}
	f, _ := writeBook(t, b)
	cell := func(ref string) string {
		v, err := f.GetCellValue("xs", ref)
		if err != nil {
			t.Fatal(err)
		}
		return v
	}
	for ref, want := range map[string]string{"A1": "site", "B1": "Heron Weir", "A2": "surveyed", "A3": "station", "B3": "elevation", "A4": "1.5", "C4": "pin"} {
		if got := cell(ref); got != want {
			t.Errorf("%s = %q, want %q", ref, got, want)
		}
	}
	if got := definedName(f, "xs", "_xlnm.Print_Titles"); got != "'xs'!$3:$3" {
		t.Errorf("print titles %q", got)
	}
	dvs, err := f.GetDataValidations("xs")
	if err != nil || len(dvs) != 3 || dvs[0].Sqref != "A4:A7" || dvs[1].Sqref != "B1" || dvs[1].PromptTitle == nil || *dvs[1].PromptTitle != "site" {
		t.Errorf("rules %+v %v", dvs, err)
	}
	merged, err := f.GetMergeCells("xs")
	if err != nil || len(merged) != 2 || merged[0].GetStartAxis() != "B1" || merged[0].GetEndAxis() != "C1" {
		t.Errorf("merged %v %v", merged, err)
	}
	id, err := f.GetCellStyle("xs", "B2")
	if err != nil {
		t.Fatal(err)
	}
	if st, err := f.GetStyle(id); err != nil || st.CustomNumFmt == nil || *st.CustomNumFmt != FormatText {
		t.Errorf("B2 style %+v %v, want text", st, err)
	}
}
