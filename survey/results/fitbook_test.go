package results_test

import (
	"bytes"
	"math"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/rating/reach"
	"wetline/survey/results"
	"wetline/survey/workbook"
)

// openWritten opens a workbook written to a buffer, with raw cell values.
func openWritten(t *testing.T, buf *bytes.Buffer) *excelize.File {
	t.Helper()
	f, err := excelize.OpenReader(bytes.NewReader(buf.Bytes()), excelize.Options{RawCellValue: true})
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { f.Close() })
	return f
}

// cellFill returns a cell's fill colour ("" for none).
func cellFill(t *testing.T, f *excelize.File, sheet, cell string) string {
	t.Helper()
	id, err := f.GetCellStyle(sheet, cell)
	if err != nil {
		t.Fatal(err)
	}
	st, err := f.GetStyle(id)
	if err != nil {
		t.Fatal(err)
	}
	if len(st.Fill.Color) == 0 {
		return ""
	}
	return st.Fill.Color[0]
}

// Marked lookup cells take the marked style whatever their row; others
// keep the shading of every other row; a stage not on a hundredth is
// ignored and a hundredth without a cell is blank.
func TestWriteLookupCellsMarked(t *testing.T) {
	var cells []results.LookupCell
	for k := 95; k <= 123; k++ {
		h := float64(k) / 100
		cells = append(cells, results.LookupCell{Stage: h, Discharge: float64(k), Marked: k < 97 || k > 120})
	}
	cells = append(cells, results.LookupCell{Stage: 1.234, Discharge: -1, Marked: true}) // not on a hundredth
	b := workbook.NewBook()
	defer b.Close()
	if err := results.WriteLookupCells(b, "lookup", rating.SI, cells); err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := b.Write(&buf); err != nil {
		t.Fatal(err)
	}
	f := openWritten(t, &buf)
	rows, err := f.GetRows("lookup")
	if err != nil {
		t.Fatal(err)
	}
	// Title, header, 0.9, 1.0, 1.1, 1.2.
	if len(rows) != 6 || rows[0][0] != results.LookupTitle(rating.SI) || rows[1][1] != "+0.00" || rows[2][0] != "0.9" || rows[5][0] != "1.2" {
		t.Fatalf("rows %q", rows)
	}
	if !strings.Contains(rows[0][0], "discharge (m3/s)") {
		t.Errorf("lookup title %q does not say the cells are discharge in m3/s", rows[0][0])
	}
	for r := 2; r < len(rows); r++ {
		tenth, _ := strconv.ParseFloat(rows[r][0], 64)
		for j := 1; j <= 10; j++ {
			k := int(math.Round(tenth*100)) + j - 1
			cell, _ := excelize.CoordinatesToCellName(j+1, r+1)
			v := ""
			if j < len(rows[r]) {
				v = rows[r][j]
			}
			if k < 95 || k > 123 {
				if v != "" {
					t.Errorf("stage %d/100: %q, want blank", k, v)
				}
				continue
			}
			if v != strconv.Itoa(k) {
				t.Errorf("stage %d/100: %q", k, v)
			}
			fill := cellFill(t, f, "lookup", cell)
			banded := (k/10)%2 != 0 // every other row, as WriteLookupSheet
			switch {
			case k < 97 || k > 120:
				if fill != workbook.MarkFill {
					t.Errorf("stage %d/100: fill %q, want the marked fill", k, fill)
				}
			case banded && (fill == "" || fill == workbook.MarkFill), !banded && fill != "":
				t.Errorf("stage %d/100: fill %q (banded row %v)", k, fill, banded)
			}
		}
	}
}

// A fit without a section: no n by stage, no plots; the table ends at the
// highest gauging; the lookup sheet follows the fitted power law, which
// for noise-free gaugings is the law they were drawn from.
func TestWriteFitWorkbookNoSection(t *testing.T) {
	law := func(h float64) float64 { return 8 * math.Pow(h-0.3, 2) } // closed form, invented
	var gs []gauged.Gauging
	t0 := time.Date(2024, 1, 1, 9, 0, 0, 0, time.UTC)
	for i, h := range []float64{0.5, 0.7, 0.9, 1.2, 1.6, 2.0} {
		gs = append(gs, gauged.Gauging{Time: t0.AddDate(0, i, 0), Stage: h, Discharge: law(h), Quality: rating.Good})
	}
	rep, err := gauged.Analyze(gs, gauged.Options{Site: "test", Units: rating.SI, Lookup: true})
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := results.WriteFitWorkbook(&buf, rep); err != nil {
		t.Fatal(err)
	}
	f := openWritten(t, &buf)
	want := []string{results.SheetSummary, results.SheetGaugings, results.SheetFitTable, results.SheetBands, results.SheetLookup}
	if got := f.GetSheetList(); !slices.Equal(got, want) {
		t.Fatalf("sheets %q, want %q", got, want)
	}
	// Noise-free data: the fit recovers the law to about 1e-6 relative
	// (the fit's own tests), so the lookup agrees to this tolerance.
	const recovered = 1e-5
	last := 0.0
	for _, c := range rep.Lookup {
		if q := law(c.Stage); math.Abs(c.Discharge-q) > recovered*math.Max(q, 1e-3) {
			t.Errorf("stage %.2f: %g, want %g", c.Stage, c.Discharge, q)
		}
		if c.Extrapolated() != (c.Stage < 0.5) {
			t.Errorf("stage %.2f: extrapolated %v", c.Stage, c.Extrapolated())
		}
		last = c.Stage
	}
	if last != 2.0 {
		t.Errorf("lookup ends at %g, want the highest gauging 2.0", last)
	}
	rows, err := f.GetRows(results.SheetFitTable)
	if err != nil {
		t.Fatal(err)
	}
	if l := rows[len(rows)-1]; l[0] != "2" || len(l) > 2 && l[2] != "" {
		t.Errorf("last table row %q", l)
	}
	// The summary's site is the site's name when one is known, and the
	// report's own label (the gaugings' file) follows it.
	if items := summaryItems(t, f); items["site"] != "test|" {
		t.Errorf("site %q, want the report's label when no site is known", items["site"])
	}
	rep.Provenance.Site = rating.Site{Name: "Tallow Creek at Mill Lane (invented)"}
	buf.Reset()
	if err := results.WriteFitWorkbook(&buf, rep); err != nil {
		t.Fatal(err)
	}
	items := summaryItems(t, openWritten(t, &buf))
	if items["site"] != "Tallow Creek at Mill Lane (invented)|" || items["gaugings file"] != "test|" || items["section"] != "" {
		t.Errorf("site %q, gaugings file %q, section %q", items["site"], items["gaugings file"], items["section"])
	}
}

// A slope-area report without a Monte Carlo analysis or figures: no
// uncertainty or plots sheet, and the summary says so.
func TestWriteSlopeAreaWorkbookMinimal(t *testing.T) {
	rep := reach.Report{Result: reach.SlopeArea{
		Method: reach.MethodSlopeArea, Units: rating.SI, Discharge: 12.5, Fall: 0.2, Length: 100,
		Sections:   []reach.SectionResult{{ID: "A", WaterSurface: 10.2}, {ID: "B", Distance: 100, WaterSurface: 10}},
		Subreaches: []reach.Subreach{{From: "A", To: "B", Length: 100, Fall: 0.2, Discharge: 12.5}},
		Checks:     []reach.Check{{Name: "froude A", Value: 1.2, Limit: 1, Relation: "<", Source: "test"}},
	}}
	var buf bytes.Buffer
	if err := results.WriteSlopeAreaWorkbook(&buf, rep); err != nil {
		t.Fatal(err)
	}
	f := openWritten(t, &buf)
	want := []string{results.SheetSummary, results.SheetReachInputs, results.SheetSections, results.SheetSubsections, results.SheetSubreaches, results.SheetChecks}
	if got := f.GetSheetList(); !slices.Equal(got, want) {
		t.Fatalf("sheets %q, want %q", got, want)
	}
	rows, _ := f.GetRows(results.SheetSummary)
	items := map[string]string{}
	for _, r := range rows {
		if len(r) > 1 {
			items[r[0]] = r[1]
		}
	}
	if items["peak discharge"] != "12.5" || items["band"] != "no Monte Carlo analysis was run" ||
		items["caution"] != rating.Caution || items["indirect estimate"] != rating.IndirectNote || items["quality checks passed"] == "" {
		t.Errorf("summary %q", items)
	}
	if fill := cellFill(t, f, results.SheetChecks, "E2"); fill != workbook.MarkFill {
		t.Errorf("failed check: fill %q, want the marked fill", fill)
	}
}

// The gaugings sheet of a fit workbook gives every time as the wall clock
// at the report's offset, UTC without one, whatever offset each was read
// with, and the summary names that zone. Gaugings of Q = 8·(h − 0.3)^2
// (invented) read at −05:00 and −04:00 (a change of clocks between them):
// 2022-04-02 22:30−05:00 is 2022-04-03 03:30 UTC and 2022-06-05
// 18:30−04:00 is 22:30 UTC (hand conversion); at −05:00 they are 22:30
// and 17:30.
func TestFitWorkbookTimesInOneZone(t *testing.T) {
	est, edt := time.FixedZone("", -5*3600), time.FixedZone("", -4*3600)
	read := []time.Time{
		time.Date(2022, 4, 2, 22, 30, 0, 0, est), time.Date(2022, 6, 5, 18, 30, 0, 0, edt),
		time.Date(2022, 7, 1, 9, 0, 0, 0, edt), time.Date(2022, 11, 20, 9, 0, 0, 0, est),
	}
	var gs []gauged.Gauging
	for i, tm := range read {
		h := 0.5 + 0.3*float64(i)
		gs = append(gs, gauged.Gauging{Time: tm, Stage: h, Discharge: 8 * math.Pow(h-0.3, 2), Quality: rating.Good})
	}
	for _, tc := range []struct {
		offset time.Duration
		zone   string
		want   []string
	}{
		{0, "UTC", []string{"2022-04-03 03:30", "2022-06-05 22:30", "2022-07-01 13:00", "2022-11-20 14:00"}},
		{-5 * time.Hour, "UTC-05:00", []string{"2022-04-02 22:30", "2022-06-05 17:30", "2022-07-01 08:00", "2022-11-20 09:00"}},
	} {
		rep, err := gauged.Analyze(gs, gauged.Options{Site: "test", Units: rating.SI, UTCOffset: tc.offset, Method: gauged.LeastSquares})
		if err != nil {
			t.Fatal(err)
		}
		var buf bytes.Buffer
		if err := results.WriteFitWorkbook(&buf, rep); err != nil {
			t.Fatal(err)
		}
		f := openWritten(t, &buf)
		rows, err := f.GetRows(results.SheetGaugings)
		if err != nil {
			t.Fatal(err)
		}
		if len(rows) != len(gs)+1 || rows[0][0] != "time" {
			t.Fatalf("offset %v: rows %q", tc.offset, rows)
		}
		for i, w := range tc.want {
			serial, err := strconv.ParseFloat(rows[i+1][0], 64)
			if err != nil {
				t.Fatalf("offset %v: time cell %q: %v", tc.offset, rows[i+1][0], err)
			}
			got, err := excelize.ExcelDateToTime(serial, false)
			if err != nil {
				t.Fatal(err)
			}
			if s := got.Round(time.Second).Format("2006-01-02 15:04"); s != w {
				t.Errorf("offset %v: gauging %d shows %s, want %s", tc.offset, i+1, s, w)
			}
		}
		items := summaryItems(t, f)
		if items["times in"] != tc.zone+"|" {
			t.Errorf("offset %v: summary says times in %q, want %q", tc.offset, items["times in"], tc.zone)
		}
	}
}
