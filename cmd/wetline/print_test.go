package main

import (
	"fmt"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"wetline/rating"
	"wetline/survey"
	"wetline/survey/workbook"
)

// TestWorkbooksPrint checks the print set-up of every sheet of every kind
// of workbook wetline writes (the demo's rating, fit, record, slope-area
// and field workbooks, and backwater, shifts and both compare workbooks
// written here with their figures): the page header and footer, the house
// margins, and for a table sheet one page wide with its header rows
// repeated, landscape exactly when its columns are wider than a portrait
// page; for the plots sheet landscape at full size with a page per figure.
func TestWorkbooksPrint(t *testing.T) {
	t.Parallel()
	demo, _ := demoOutput(t)
	out := t.TempDir()
	books := []string{"tallow-xs1-results.xlsx", "tallow-fit.xlsx", "tallow-record-2025.xlsx", "reach-brindle-slopearea.xlsx", "tallow-field.xlsx"}
	for i := range books {
		books[i] = filepath.Join(demo, books[i])
	}
	written := map[string][]string{
		"backwater.xlsx": {"backwater", filepath.Join(demo, demoBWReach), "--from", "5", "--to", "50", "--step", "5",
			"--boundary", "normal:0.0012", "--at", "XS-1"},
		"shifts.xlsx":           shiftsArgs(),
		"compare-ratings.xlsx":  {"compare", recRatingA, recRatingB},
		"compare-sections.xlsx": {"compare", recSectionA, recSectionB, "--step", "0.5"},
	}
	for name, args := range written {
		book := filepath.Join(out, name)
		args = append(args, "-o", book, "--plots", filepath.Join(out, strings.TrimSuffix(name, ".xlsx")))
		if _, errs, code := runCLI(t, args...); code != 0 {
			t.Fatalf("%s: exit %d: %s", name, code, errs)
		}
		books = append(books, book)
	}
	landscape, plots := 0, 0
	for _, path := range books {
		f := openBook(t, path)
		for _, sheet := range f.GetSheetList() {
			where := filepath.Base(path) + " " + sheet
			checkPrintedPage(t, f, sheet, where)
			pl, err := f.GetPageLayout(sheet)
			if err != nil {
				t.Fatal(err)
			}
			if sheet == "plots" {
				plots++
				checkPlotsPrint(t, f, pl, where)
				continue
			}
			if *pl.Orientation == workbook.Landscape {
				landscape++
			}
			checkTablePrint(t, f, sheet, pl, where)
		}
	}
	t.Logf("%d workbooks: %d landscape table sheets, %d plots sheets", len(books), landscape, plots)
	if landscape < 8 || plots < 5 {
		t.Errorf("%d landscape table sheets and %d plots sheets checked: the workbooks lack the wide sheets or figures meant", landscape, plots)
	}
}

// checkPrintedPage checks a sheet's page header, footer and margins.
func checkPrintedPage(t *testing.T, f *excelize.File, sheet, where string) {
	t.Helper()
	hf, err := f.GetHeaderFooter(sheet)
	if err != nil || !strings.HasPrefix(hf.OddHeader, "&L") || !strings.Contains(hf.OddHeader, "&A, page &P of &N") {
		t.Errorf("%s: page header %q (%v)", where, hf.OddHeader, err)
	}
	if !strings.HasSuffix(hf.OddFooter, rating.Caution) {
		t.Errorf("%s: footer %q, want the caution", where, hf.OddFooter)
	}
	m, err := f.GetPageMargins(sheet)
	if err != nil || *m.Left != workbook.MarginSide || *m.Right != workbook.MarginSide || *m.Top != workbook.MarginTop ||
		*m.Bottom != workbook.MarginBottom {
		t.Errorf("%s: margins %v %v %v %v (%v)", where, *m.Left, *m.Right, *m.Top, *m.Bottom, err)
	}
}

// checkTablePrint checks that a table sheet prints one page wide, header
// rows repeated, landscape exactly when wider than a portrait page.
func checkTablePrint(t *testing.T, f *excelize.File, sheet string, pl excelize.PageLayoutOptions, where string) {
	t.Helper()
	if pl.FitToWidth == nil || *pl.FitToWidth != 1 || pl.FitToHeight == nil || *pl.FitToHeight != 0 {
		t.Errorf("%s: fit %v wide, %v tall; want 1 wide, any tall", where, pl.FitToWidth, pl.FitToHeight)
	}
	titles := ""
	for _, dn := range f.GetDefinedName() {
		if dn.Name == "_xlnm.Print_Titles" && dn.Scope == sheet {
			titles = dn.RefersTo
		}
	}
	// A table's header is row 1 (row 2 under a title line); a field
	// sheet's is below its site block.
	block := fmt.Sprintf("!$%d:$%d", survey.SectionHeaderRow, survey.SectionHeaderRow)
	if !strings.HasSuffix(titles, "!$1:$1") && !strings.HasSuffix(titles, "!$1:$2") && !strings.HasSuffix(titles, block) {
		t.Errorf("%s: print titles %q", where, titles)
	}
	cols, err := f.GetCols(sheet)
	if err != nil {
		t.Fatal(err)
	}
	width := 0.0
	for i := range cols {
		name, _ := excelize.ColumnNumberToName(i + 1)
		w, err := f.GetColWidth(sheet, name)
		if err != nil {
			t.Fatal(err)
		}
		width += w
	}
	wide := width*7 > workbook.PortraitWidth // 7 pixels a character
	if got := *pl.Orientation == workbook.Landscape; got != wide {
		t.Errorf("%s: %s, %g characters wide", where, *pl.Orientation, width)
	}
}

// checkPlotsPrint checks that a plots sheet prints landscape at full size
// with a page per figure (only column A: the print area).
func checkPlotsPrint(t *testing.T, f *excelize.File, pl excelize.PageLayoutOptions, where string) {
	t.Helper()
	if *pl.Orientation != workbook.Landscape || *pl.AdjustTo != 100 {
		t.Errorf("%s: %s at %d %%", where, *pl.Orientation, *pl.AdjustTo)
	}
	cells, err := f.GetPictureCells("plots")
	if err != nil || len(cells) == 0 {
		t.Fatalf("%s: pictures %v (%v)", where, cells, err)
	}
	for _, c := range cells {
		pics, err := f.GetPictures("plots", c)
		if err != nil || len(pics) != 1 || pics[0].Format.ScaleX > 1 {
			t.Errorf("%s: picture at %s: %v", where, c, err)
			continue
		}
		_, row, _ := excelize.CellNameToCoordinates(c)
		if h, _ := f.GetRowHeight("plots", row); h > workbook.MaxRowHeight || h < 100 {
			t.Errorf("%s: picture row %d is %g pt", where, row, h)
		}
	}
	area := ""
	for _, dn := range f.GetDefinedName() {
		if dn.Name == "_xlnm.Print_Area" && dn.Scope == "plots" {
			area = dn.RefersTo
		}
	}
	if !strings.HasPrefix(area, "'plots'!$A$1:$A$") {
		t.Errorf("%s: print area %q", where, area)
	}
}
