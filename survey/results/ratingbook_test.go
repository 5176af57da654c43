package results_test

import (
	"archive/zip"
	"bytes"
	"encoding/csv"
	"fmt"
	"image"
	"image/color"
	"image/png"
	"io"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"wetline/rating"
	"wetline/subdivide"
	"wetline/survey"
	"wetline/survey/results"
	"wetline/survey/workbook"
)

// sameValue is the relative tolerance between a number written to a
// workbook and read back: excelize writes 15 significant digits.
const sameValue = 1e-13

// sameStage is the relative tolerance between discharges computed at two
// representations of one stage (100.5 reached by adding steps, and
// 10050/100): the stages differ in the last bits only.
const sameStage = 1e-9

// onHundredth is how close, in hundredths, a stage read back must be to a
// hundredth to be taken as on it (stages are written with 15 digits).
const onHundredth = 1e-6

func wbNear(a, b, rel float64) bool {
	return math.Abs(a-b) <= rel*math.Max(math.Abs(a), math.Abs(b))
}

// wbTallow rates the demo survey (invented data) on its default stages and
// on every hundredth.
func wbTallow(t testing.TB) (coarse, fine rating.Table) {
	t.Helper()
	sv, err := survey.ReadSection("../../testdata/tallow-xs1.csv", "", survey.SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	p, err := subdivide.Compile(sv.Section)
	if err != nil {
		t.Fatal(err)
	}
	opt := rating.Options{Slope: 0.0012}
	coarse, err = rating.Compute(p, rating.DefaultStages(p), opt)
	if err != nil {
		t.Fatal(err)
	}
	stages, err := rating.LookupStages(p.Bottom(), p.Top())
	if err != nil {
		t.Fatal(err)
	}
	fine, err = rating.Compute(p, stages, opt)
	if err != nil {
		t.Fatal(err)
	}
	return coarse, fine
}

func TestSig3Decimals(t *testing.T) {
	for _, tc := range []struct {
		v    float64
		want int
	}{
		// The rule stated on FormatSig3.
		{0, 0}, {1234, 0}, {999.9, 0}, {123.4, 0}, {12.34, 1}, {-12.34, 1}, {1.234, 2},
		{0.1234, 3}, {0.01234, 4}, {0.001234, 5}, {0.0000001, workbook.MaxSig3Decimals},
		{math.NaN(), 0}, {math.Inf(1), 0},
	} {
		if got := workbook.Sig3Decimals(tc.v); got != tc.want {
			t.Errorf("Sig3Decimals(%g) = %d, want %d", tc.v, got, tc.want)
		}
	}
}

func TestLookupStages(t *testing.T) {
	for _, tc := range []struct {
		bottom, top float64
		first, last float64
		n           int
		wantErr     bool
	}{
		{100.3, 104.8, 100.3, 104.8, 451, false},
		{100.33, 100.5, 100.3, 100.5, 21, false},
		{-0.25, 0.011, -0.3, 0.01, 32, false},
		{2, 2, 2, 2, 1, false},
		{5, 4, 0, 0, 0, true},
		{0, 1e6, 0, 0, 0, true},
		{math.NaN(), 1, 0, 0, 0, true},
	} {
		got, err := rating.LookupStages(tc.bottom, tc.top)
		if tc.wantErr {
			if err == nil {
				t.Errorf("%g..%g: no error", tc.bottom, tc.top)
			}
			continue
		}
		if err != nil || len(got) != tc.n || got[0] != tc.first || got[len(got)-1] != tc.last {
			t.Errorf("%g..%g: %d stages %v…%v (%v), want %d from %g to %g",
				tc.bottom, tc.top, len(got), got[0], got[len(got)-1], err, tc.n, tc.first, tc.last)
		}
	}
}

// wbPNG draws a small PNG with a gradient.
func wbPNG(w, h int) []byte {
	img := image.NewNRGBA(image.Rect(0, 0, w, h))
	for y := range h {
		for x := range w {
			img.Set(x, y, color.NRGBA{uint8(x), uint8(y), 120, 255})
		}
	}
	var buf bytes.Buffer
	if err := png.Encode(&buf, img); err != nil {
		panic(err)
	}
	return buf.Bytes()
}

func writeResults(t *testing.T, rw rating.RatingReport) *excelize.File {
	t.Helper()
	var buf bytes.Buffer
	if err := results.WriteRatingWorkbook(&buf, rw); err != nil {
		t.Fatal(err)
	}
	return openWritten(t, &buf)
}

func numFmt(t *testing.T, f *excelize.File, sheet, cell string) string {
	t.Helper()
	id, err := f.GetCellStyle(sheet, cell)
	if err != nil {
		t.Fatal(err)
	}
	st, err := f.GetStyle(id)
	if err != nil {
		t.Fatal(err)
	}
	if st.CustomNumFmt == nil {
		return ""
	}
	return *st.CustomNumFmt
}

func TestRatingWorkbook(t *testing.T) {
	coarse, fine := wbTallow(t)
	sv, err := survey.ReadSection("../../testdata/tallow-xs1.csv", "", survey.SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	pics := []rating.Figure{{Caption: "rating curve", PNG: wbPNG(1600, 1000)}, {Caption: "section", PNG: wbPNG(200, 100)}}
	f := writeResults(t, rating.RatingReport{
		Table: coarse, Lookup: fine, Provenance: rating.Provenance{Program: "wetline 9.8.7"},
		Ground:   rating.Ground{Section: sv.Section, Labels: sv.Labels, Notes: sv.Notes, Source: "tallow-xs1.csv"},
		Warnings: []string{"a warning for the reader"}, Figures: pics,
	})
	if got, want := f.GetSheetList(), []string{"summary", "rating", "lookup", "subsections", "survey", "plots"}; !slices.Equal(got, want) {
		t.Fatalf("sheets %v, want %v", got, want)
	}

	// Summary: inputs, n by subsection, banks, warnings, caution, version.
	rows, err := f.GetRows("summary")
	if err != nil {
		t.Fatal(err)
	}
	items := map[string]string{}
	for _, r := range rows[1:] {
		for len(r) < 3 {
			r = append(r, "")
		}
		items[r[0]] += r[1] + "|" + r[2]
	}
	for item, want := range map[string]string{
		"section":                    "tallow-xs1|",
		"survey":                     "tallow-xs1.csv|",
		"program":                    "wetline 9.8.7|",
		"friction slope":             "0.0012|m/m",
		"main channel between banks": "stations 46 to 65.5|m",
		"warning":                    "a warning for the reader|",
		"caution":                    rating.Caution + "|",
		"n, subsection 1 (left overbank, stations 0 to 18)": "0.045|",
		"n, subsection 3 (channel, stations 46 to 65.5)":    "0.035|",
	} {
		if !strings.Contains(items[item], want) {
			t.Errorf("summary %q = %q, want %q", item, items[item], want)
		}
	}

	// Long texts get rows tall enough to show them wrapped.
	if h, err := f.GetRowHeight("summary", len(rows)); err != nil || h < 30 {
		t.Errorf("caution row height %g (%v), want two lines or more", h, err)
	}

	// Rating sheet: every value as the rating CSV writes it (stages to
	// LengthDecimals decimals, the rest to six significant digits), units
	// in the header.
	rows, err = f.GetRows("rating")
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != len(coarse.Rows)+1 {
		t.Fatalf("rating: %d rows, want %d", len(rows), len(coarse.Rows)+1)
	}
	if rows[0][0] != "stage (m)" || rows[0][7] != "discharge (m3/s)" || rows[0][2] != "area (m2)" {
		t.Errorf("rating header %q", rows[0])
	}
	for i, r := range coarse.Rows {
		for j, want := range []float64{r.Stage, r.Area, r.Discharge, r.Subs[1].Discharge} {
			col := []int{0, 2, 7, 12}[j]
			got, err := strconv.ParseFloat(rows[i+1][col], 64)
			if err != nil || got != reported(want, col == 0) {
				t.Errorf("rating row %d col %d: %q, want %g", i+2, col+1, rows[i+1][col], want)
			}
		}
		// Undefined values (the velocity of a dry section) are blank.
		if math.IsNaN(r.MeanVelocity) && rows[i+1][8] != "" {
			t.Errorf("rating row %d: dry velocity %q, want blank", i+2, rows[i+1][8])
		}
	}
	// Number formats: stage 0.000; discharge to three significant figures.
	if got := numFmt(t, f, "rating", "A2"); got != "0.000" {
		t.Errorf("stage format %q", got)
	}
	for i, r := range coarse.Rows {
		cell := fmt.Sprintf("H%d", i+2)
		want := strings.TrimSuffix("0."+strings.Repeat("0", workbook.Sig3Decimals(r.Discharge)), ".")
		if got := numFmt(t, f, "rating", cell); got != want {
			t.Errorf("discharge %g at %s: format %q, want %q", r.Discharge, cell, got, want)
		}
	}
	if panes, _ := f.GetPanes("rating"); !panes.Freeze || panes.YSplit != 1 {
		t.Errorf("rating header not frozen")
	}
	// Printing: one page wide, the header repeated on every page.
	for _, sheet := range []string{"rating", "lookup", "subsections"} {
		pl, err := f.GetPageLayout(sheet)
		if err != nil || pl.FitToWidth == nil || *pl.FitToWidth != 1 {
			t.Errorf("%s: page layout %+v %v, want one page wide", sheet, pl, err)
		}
		head := "!$1:$1"
		if sheet == "lookup" { // a title line above the header
			head = "!$1:$2"
		}
		titles := false
		for _, dn := range f.GetDefinedName() {
			if dn.Name == "_xlnm.Print_Titles" && dn.Scope == sheet && strings.HasSuffix(dn.RefersTo, head) {
				titles = true
			}
		}
		if !titles {
			t.Errorf("%s: no print titles", sheet)
		}
		hf, err := f.GetHeaderFooter(sheet)
		if err != nil || !strings.Contains(hf.OddHeader, "wetline rating: tallow-xs1") || !strings.HasSuffix(hf.OddFooter, rating.Caution) {
			t.Errorf("%s: printed header %q, footer %q (%v)", sheet, hf.OddHeader, hf.OddFooter, err)
		}
	}

	// Lookup: discharges to three significant figures, every other row
	// shaded.
	fills := 0
	for _, cell := range []string{"E3", "E4", "E5", "E6"} {
		v, err := f.GetCellValue("lookup", cell)
		if err != nil {
			t.Fatal(err)
		}
		q, err := strconv.ParseFloat(v, 64)
		if err != nil {
			t.Fatalf("lookup %s: %q", cell, v)
		}
		want := strings.TrimSuffix("0."+strings.Repeat("0", workbook.Sig3Decimals(q)), ".")
		if got := numFmt(t, f, "lookup", cell); got != want {
			t.Errorf("lookup %s = %g: format %q, want %q", cell, q, got, want)
		}
		id, _ := f.GetCellStyle("lookup", cell)
		if st, _ := f.GetStyle(id); st != nil && len(st.Fill.Color) > 0 {
			fills++
		}
	}
	if fills != 2 {
		t.Errorf("%d of 4 lookup rows shaded, want 2", fills)
	}

	// Subsections: one row per stage and subsection.
	rows, err = f.GetRows("subsections")
	if err != nil {
		t.Fatal(err)
	}
	if want := 1 + len(coarse.Rows)*len(coarse.Subsections); len(rows) != want {
		t.Errorf("subsections: %d rows, want %d", len(rows), want)
	}
	last := coarse.Rows[len(coarse.Rows)-1]
	lastRow := rows[len(rows)-1]
	if got, _ := strconv.ParseFloat(lastRow[10], 64); lastRow[2] != "right overbank" || got != reported(last.Subs[len(last.Subs)-1].Discharge, false) {
		t.Errorf("last subsection row %q", lastRow)
	}

	// Survey: reads back as the same section.
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		t.Fatal(err)
	}
	tab, err := survey.ParseWorkbook(&buf, "results.xlsx", "survey")
	if err != nil {
		t.Fatal(err)
	}
	back, err := survey.SectionFromTable(tab, survey.SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if a, b := back.Section, sv.Section; !slices.Equal(a.Points, b.Points) || !slices.Equal(a.N, b.N) ||
		a.LeftBank != b.LeftBank || a.RightBank != b.RightBank || !slices.Equal(back.Notes, sv.Notes) {
		t.Errorf("survey sheet reads back as %+v, want %+v", back.Section, sv.Section)
	}

	// Plots: both pictures, in order.
	cells, err := f.GetPictureCells("plots")
	if err != nil || len(cells) != 2 {
		t.Fatalf("picture cells %v %v", cells, err)
	}
	for i, c := range cells {
		got, err := f.GetPictures("plots", c)
		if err != nil || len(got) != 1 || !bytes.Equal(got[0].File, pics[i].PNG) {
			t.Errorf("picture at %s: %d pictures, %v", c, len(got), err)
		}
	}
}

// A calibrated rating's summary states the factor, its own standard
// error and the scatter of the gaugings apart (values as the report
// carries them, rounded by the items' formats); one gauging leaves both
// standard errors out.
func TestRatingWorkbookCalibration(t *testing.T) {
	coarse, _ := wbTallow(t)
	f := writeResults(t, rating.RatingReport{Table: coarse, Calibration: &rating.NCalibration{Source: "g.csv", Gaugings: 8, Factor: 0.86796,
		FactorStandardErrorPercent: 0.9091, StandardErrorPercent: 2.5716}})
	items := summaryItems(t, f)
	for k, v := range map[string]string{
		"n calibrated on":              "8 gaugings in g.csv: every n multiplied by the factor below|",
		"calibration factor on n":      "0.86796|",
		"standard error of the factor": "0.9091|%",
		"standard error of estimate of the calibrated rating against the gaugings": "2.5716|%",
	} {
		if items[k] != v {
			t.Errorf("summary %q = %q, want %q", k, items[k], v)
		}
	}
	f = writeResults(t, rating.RatingReport{Table: coarse, Calibration: &rating.NCalibration{Source: "g.csv", Gaugings: 1, Factor: 1.25,
		FactorStandardErrorPercent: math.NaN(), StandardErrorPercent: math.NaN()}})
	if items := summaryItems(t, f); items["calibration factor on n"] != "1.25|" || items["standard error of the factor"] != "" {
		t.Errorf("one gauging: %q", items)
	}
}

func TestRatingWorkbookMinimal(t *testing.T) {
	coarse, _ := wbTallow(t)
	f := writeResults(t, rating.RatingReport{Table: coarse})
	if got, want := f.GetSheetList(), []string{"summary", "rating", "subsections"}; !slices.Equal(got, want) {
		t.Errorf("sheets %v, want %v", got, want)
	}
}

func TestRatingWorkbookBadPicture(t *testing.T) {
	coarse, _ := wbTallow(t)
	err := results.WriteRatingWorkbook(&bytes.Buffer{}, rating.RatingReport{Table: coarse,
		Figures: []rating.Figure{{Caption: "broken", PNG: []byte("GIF89a")}}})
	if err == nil || !strings.Contains(err.Error(), `"broken"`) {
		t.Errorf("error %v, want one naming the picture", err)
	}
}

// readByStage reads a rating sheet back through ReadTable and returns its
// discharge by stage in hundredths.
func readByStage(t *testing.T, path string) map[int64]float64 {
	t.Helper()
	tab, err := survey.ReadTable(path, "rating")
	if err != nil {
		t.Fatal(err)
	}
	cs, cq := tab.Column("stage"), tab.Column("discharge")
	out := map[int64]float64{}
	for _, rec := range tab.Records {
		h, _, err1 := tab.Float(rec, cs)
		q, _, err2 := tab.Float(rec, cq)
		if err1 != nil || err2 != nil {
			t.Fatal(err1, err2)
		}
		if k := math.Round(h * 100); math.Abs(h*100-k) < onHundredth {
			out[int64(k)] = q
		}
	}
	return out
}

// TestLookupGolden checks the lookup sheet cell by cell against the
// discharges read back from the rating sheet of the same workbook, for a
// table rated at every hundredth and for the default (coarse) stages, and
// compares the lookup sheet as displayed with a golden file.
func TestLookupGolden(t *testing.T) {
	coarse, fine := wbTallow(t)
	dir := t.TempDir()
	for _, tc := range []struct {
		name  string
		table rating.Table
		tol   float64
	}{
		{"fine", fine, sameValue},
		{"coarse", coarse, sameStage},
	} {
		path := filepath.Join(dir, tc.name+".xlsx")
		if err := writeFile(path, func(w io.Writer) error {
			return results.WriteRatingWorkbook(w, rating.RatingReport{Table: tc.table, Lookup: fine})
		}); err != nil {
			t.Fatal(err)
		}
		full := readByStage(t, path)
		f := openBook(t, path)
		rows, err := f.GetRows("lookup")
		if err != nil {
			t.Fatal(err)
		}
		if rows[0][0] != results.LookupTitle(rating.SI) {
			t.Errorf("lookup title %q", rows[0])
		}
		rows = rows[1:]
		if want := []string{"stage (m)", "+0.00", "+0.01"}; !slices.Equal(rows[0][:3], want) || len(rows[0]) != 11 {
			t.Errorf("lookup header %q", rows[0])
		}
		checked := 0
		var shown strings.Builder
		for i, r := range rows[1:] {
			base, err := strconv.ParseFloat(r[0], 64)
			if err != nil {
				t.Fatalf("lookup row %d: stage %q", i+2, r[0])
			}
			fmt.Fprintf(&shown, "%5.1f", base)
			for j := 1; j <= 10; j++ {
				k := int64(math.Round(base*100)) + int64(j-1)
				cell := ""
				if j < len(r) {
					cell = r[j]
				}
				want, inFull := full[k]
				if cell == "" {
					if inFull {
						t.Errorf("lookup %.2f blank, rating sheet has %g", float64(k)/100, want)
					}
					fmt.Fprintf(&shown, " %8s", "")
					continue
				}
				got, err := strconv.ParseFloat(cell, 64)
				if err != nil {
					t.Fatalf("lookup %.2f: %q", float64(k)/100, cell)
				}
				if inFull {
					checked++
					if !wbNear(got, want, tc.tol) {
						t.Errorf("%s: lookup %.2f = %g, rating sheet %g", tc.name, float64(k)/100, got, want)
					}
				}
				fmt.Fprintf(&shown, " %8.*f", workbook.Sig3Decimals(got), got)
			}
			shown.WriteByte('\n')
		}
		if want := map[string]int{"fine": len(fine.Rows), "coarse": 40}[tc.name]; checked < want {
			t.Errorf("%s: %d lookup cells checked against the rating sheet, want at least %d", tc.name, checked, want)
		}
		if tc.name != "fine" {
			continue
		}
		golden := filepath.Join("testdata", "lookup-tallow.golden")
		if *update {
			if err := os.WriteFile(golden, []byte(shown.String()), 0o644); err != nil {
				t.Fatal(err)
			}
		}
		want, err := os.ReadFile(golden)
		if err != nil {
			t.Fatal(err)
		}
		if shown.String() != string(want) {
			t.Errorf("lookup sheet differs from %s (run go test -update to accept):\n%s", golden, shown.String())
		}
	}
}

// TestStreamedColumnsAscending checks the <col> elements of every sheet
// of a results workbook come in ascending order, as ECMA-376 Part 1,
// 18.3.1.13 lays them out, so that spreadsheet programs need no repair.
func TestStreamedColumnsAscending(t *testing.T) {
	coarse, fine := wbTallow(t)
	var buf bytes.Buffer
	if err := results.WriteRatingWorkbook(&buf, rating.RatingReport{Table: coarse, Lookup: fine}); err != nil {
		t.Fatal(err)
	}
	zr, err := zip.NewReader(bytes.NewReader(buf.Bytes()), int64(buf.Len()))
	if err != nil {
		t.Fatal(err)
	}
	colMin := regexp.MustCompile(`<col min="(\d+)"`)
	sheets := 0
	for _, zf := range zr.File {
		if !strings.HasPrefix(zf.Name, "xl/worksheets/sheet") {
			continue
		}
		sheets++
		rc, err := zf.Open()
		if err != nil {
			t.Fatal(err)
		}
		data, err := io.ReadAll(rc)
		rc.Close()
		if err != nil {
			t.Fatal(err)
		}
		last := 0
		for _, m := range colMin.FindAllSubmatch(data, -1) {
			n, _ := strconv.Atoi(string(m[1]))
			if n <= last {
				t.Errorf("%s: column %d after %d", zf.Name, n, last)
			}
			last = n
		}
		if last == 0 {
			t.Errorf("%s: no column widths", zf.Name)
		}
	}
	if sheets != 4 {
		t.Errorf("%d sheets", sheets)
	}
}

// TestLongTitle: a long section name with ampersands still prints.
func TestLongTitle(t *testing.T) {
	coarse, _ := wbTallow(t)
	coarse.Name = strings.Repeat("Mill & Tallow ", 40)
	f := writeResults(t, rating.RatingReport{Table: coarse})
	hf, err := f.GetHeaderFooter("rating")
	if err != nil || !strings.Contains(hf.OddHeader, "Mill && Tallow") || !strings.Contains(hf.OddHeader, "…") {
		t.Errorf("header %q (%v)", hf.OddHeader, err)
	}
}

// The rating sheet's headers are the CSV's column names in words with
// their units (wetted perimeter (m)), in the CSV's order, flags last; its
// flags cells are the CSV's; and CSV keeps its snake_case names.
func TestRatingSheetHeadersInWords(t *testing.T) {
	coarse, _ := wbTallow(t)
	rep := rating.RatingReport{Table: coarse}
	var csvBuf bytes.Buffer
	if err := results.WriteRatingCSV(&csvBuf, rep); err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(&csvBuf).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	f := writeResults(t, rep)
	rows, err := f.GetRows(results.SheetRating)
	if err != nil {
		t.Fatal(err)
	}
	head := rows[0]
	if len(head) != len(recs[0]) || head[len(head)-1] != "flags" {
		t.Fatalf("rating sheet header %q, CSV header %q", head, recs[0])
	}
	units := map[string]string{"stage": "m", "wetted_perimeter": "m", "area": "m2", "discharge": "m3/s", "conveyance": "m3/s",
		"mean_velocity": "m/s", "shear_stress": "Pa", "alpha": "", "flags": ""}
	for i, name := range recs[0] {
		if strings.Contains(name, " ") || strings.ToLower(name) != name {
			t.Errorf("CSV column %q is not snake_case", name)
		}
		words := strings.ReplaceAll(name, "_", " ")
		if u, ok := units[name]; ok && u != "" {
			words += " (" + u + ")"
		}
		if _, ok := units[name]; ok && head[i] != words {
			t.Errorf("column %d: header %q, want %q", i+1, head[i], words)
		}
		if w, _, _ := strings.Cut(head[i], " ("); strings.ReplaceAll(w, " ", "_") != name {
			t.Errorf("column %d: header %q does not read as %q", i+1, head[i], name)
		}
	}
	flagged := 0
	for i, rec := range recs[1:] {
		got := ""
		if len(rows[i+1]) == len(head) {
			got = rows[i+1][len(head)-1]
		}
		if want := rec[len(rec)-1]; got != want {
			t.Errorf("row %d: flags %q, CSV %q", i+2, got, want)
		}
		if got != "" {
			flagged++
		}
	}
	if flagged == 0 {
		t.Errorf("no flagged row in the demo table: the flags column is not checked")
	}
}

// TestBookTitle checks the title at the head of a results workbook's
// printed pages: the site's name when known, else the key of what the
// report is of, and the same in a written rating workbook.
func TestBookTitle(t *testing.T) {
	for _, tc := range []struct {
		name      string
		kind, key string
		site      rating.Site
		want      string
	}{
		{"site named", "rating", "tallow-xs1", rating.Site{Name: "Tallow Creek at Mill Lane"}, "wetline rating: Tallow Creek at Mill Lane"},
		{"site id only", "rating", "tallow-xs1", rating.Site{ID: "0412"}, "wetline rating: tallow-xs1"},
		{"no site", "slope-area", "reach-brindle", rating.Site{}, "wetline slope-area: reach-brindle"},
		{"neither", "shifts", "", rating.Site{}, "wetline shifts"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if got := results.BookTitle(tc.kind, tc.site, tc.key); got != tc.want {
				t.Errorf("title %q, want %q", got, tc.want)
			}
			if tc.kind != "rating" {
				return
			}
			coarse, _ := wbTallow(t)
			f := writeResults(t, rating.RatingReport{Table: coarse, Provenance: rating.Provenance{Site: tc.site}})
			for _, sheet := range f.GetSheetList() {
				hf, err := f.GetHeaderFooter(sheet)
				if err != nil || !strings.HasPrefix(hf.OddHeader, "&L"+tc.want+"&R") {
					t.Errorf("%s: page header %q (%v), want %q", sheet, hf.OddHeader, err, tc.want)
				}
			}
		})
	}
}
