package results_test

import (
	"bytes"
	"math"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/rating/reach"
	"wetline/subdivide"
	"wetline/survey/results"
	"wetline/survey/workbook"
)

// headerUnit returns the unit in brackets at the end of a header cell
// ("friction loss (m)" gives "m"), "" for none.
func headerUnit(h string) string {
	if !strings.HasSuffix(h, ")") {
		return ""
	}
	i := strings.LastIndex(h, " (")
	if i < 0 {
		return ""
	}
	return h[i+2 : len(h)-1]
}

// checkCellsReported checks every number of every sheet of f (but the
// pictures') is stored as the reports write it: a length (a column whose
// header's unit is m or ft; on the summary sheet, an item whose unit is;
// on a rating sheet, the stage and depth, as in the rating CSV) to
// results.LengthDecimals decimals, any other number to six significant
// digits. Date-time cells are left alone. It returns the numbers checked.
func checkCellsReported(t *testing.T, f *excelize.File) int {
	t.Helper()
	length := func(u string) bool { return u == rating.SI.Length() || u == rating.US.Length() }
	checked := 0
	for _, sheet := range f.GetSheetList() {
		if sheet == results.SheetPlots {
			continue
		}
		rows, err := f.GetRows(sheet)
		if err != nil {
			t.Fatal(err)
		}
		head := 0 // the header row; a lookup sheet has a title above it
		if sheet == results.SheetLookup {
			head = 1
		}
		if len(rows) <= head {
			continue
		}
		for i, r := range rows[head+1:] {
			for j, cell := range r {
				v, err := strconv.ParseFloat(cell, 64)
				if err != nil {
					continue
				}
				isLength := j < len(rows[head]) && length(headerUnit(rows[head][j]))
				switch sheet {
				case results.SheetRating: // as WriteRatingCSV: stage and depth
					isLength = j < 2
				case results.SheetSummary:
					isLength = len(r) > 2 && length(r[2])
				}
				if v == reported(v, isLength) {
					checked++
					continue
				}
				name, err := excelize.CoordinatesToCellName(j+1, head+i+2)
				if err != nil {
					t.Fatal(err)
				}
				if numFmt(t, f, sheet, name) == workbook.FormatDateTime {
					continue
				}
				t.Errorf("%s!%s = %s, want it written %g (length %v)", sheet, name, cell, reported(v, isLength), isLength)
			}
		}
	}
	return checked
}

// saRect returns a rectangular channel of width b, bed at bed, with
// Manning's n.
func saRect(t *testing.T, b, bed, n float64) subdivide.Geometry {
	t.Helper()
	g, err := subdivide.Compile(subdivide.Section{
		Points: []subdivide.Point{{Station: 0, Elevation: bed + 5}, {Station: 0, Elevation: bed}, {Station: b, Elevation: bed}, {Station: b, Elevation: bed + 5}},
		N:      []float64{n, n, n},
	})
	if err != nil {
		t.Fatal(err)
	}
	return g
}

// A slope-area workbook stores every computed number as the reports write
// it, not with the float noise of the arithmetic: a friction loss
// computed as 0.6000000000000006 (written 0.600000000000001 before) is
// 0.6, and every number of every sheet of a computed reach (three
// rectangles, invented, with a Monte Carlo band) is a length to four
// decimals or another number to six significant figures.
func TestSlopeAreaWorkbookCellsReported(t *testing.T) {
	t.Run("noisy friction loss", func(t *testing.T) {
		const noisy = 0.6000000000000006 // 0.6 and float noise, as a sum of losses gives it
		rep := reach.Report{Result: reach.SlopeArea{
			Method: reach.MethodSlopeArea, Units: rating.SI, Discharge: 12.5, Fall: 0.6, Length: 100,
			Sections:   []reach.SectionResult{{ID: "A", WaterSurface: 10.6, Area: 20.200000000000003}, {ID: "B", Distance: 100, WaterSurface: 10}},
			Subreaches: []reach.Subreach{{From: "A", To: "B", Length: 100, Fall: 0.6, Discharge: 12.5, FrictionLoss: noisy}},
		}}
		var buf bytes.Buffer
		if err := results.WriteSlopeAreaWorkbook(&buf, rep); err != nil {
			t.Fatal(err)
		}
		f := openWritten(t, &buf)
		for _, c := range []struct{ sheet, cell, want string }{
			{results.SheetSubreaches, "H2", "0.6"}, // friction loss (m)
			{results.SheetSections, "E2", "20.2"},  // area (m2)
		} {
			if got, err := f.GetCellValue(c.sheet, c.cell); err != nil || got != c.want {
				t.Errorf("%s!%s = %q (%v), want %q", c.sheet, c.cell, got, err, c.want)
			}
		}
		checkCellsReported(t, f)
	})
	t.Run("computed reach", func(t *testing.T) {
		secs := []reach.Section{
			{ID: "upper", Geometry: saRect(t, 10, 100, 0.03), Distance: 0, Left: 102.0, Right: 102.04},
			{ID: "middle", Geometry: saRect(t, 12, 99.95, 0.03), Distance: 150, Left: 101.91, Right: 101.93},
			{ID: "lower", Geometry: saRect(t, 14, 99.9, 0.03), Distance: 310, Left: 101.8, Right: math.NaN()},
		}
		rep, err := reach.Estimate(secs, reach.EstimateOptions{Draws: 200, MonteCarlo: reach.MonteCarloOptions{Seed: 1}})
		if err != nil {
			t.Fatal(err)
		}
		var buf bytes.Buffer
		if err := results.WriteSlopeAreaWorkbook(&buf, rep); err != nil {
			t.Fatal(err)
		}
		if n := checkCellsReported(t, openWritten(t, &buf)); n < 50 {
			t.Errorf("%d numbers checked, want the sheets' numbers", n)
		}
	})
}

// Every workbook of a report stores its numbers as the reports write
// them: the rating workbook of the demo section (invented), a fit to six
// gaugings scattered about Q = 8·(h − 0.3)^2 (invented), the
// step-backwater workbook of bwReport and the record workbook of
// testRecord.
func TestWorkbookCellsReported(t *testing.T) {
	coarse, fine := wbTallow(t)
	var bw, rec bytes.Buffer
	if err := results.WriteBackwaterWorkbook(&bw, bwReport(t, 0)); err != nil {
		t.Fatal(err)
	}
	if err := results.WriteRecordWorkbook(&rec, testRecord(t, 2000), results.DailyTable|results.UnitTable); err != nil {
		t.Fatal(err)
	}
	law := func(h float64) float64 { return 8 * math.Pow(h-0.3, 2) } // invented
	var gs []gauged.Gauging
	t0 := time.Date(2024, 1, 1, 9, 0, 0, 0, time.UTC)
	for i, h := range []float64{0.5, 0.7, 0.9, 1.2, 1.6, 2.0} {
		gs = append(gs, gauged.Gauging{Time: t0.AddDate(0, i, 0), Stage: h, Discharge: law(h) * (1 + 0.03*math.Sin(float64(3*i))), Quality: rating.Good})
	}
	fit, err := gauged.Analyze(gs, gauged.Options{Site: "test", Units: rating.SI, Lookup: true})
	if err != nil {
		t.Fatal(err)
	}
	var fb bytes.Buffer
	if err := results.WriteFitWorkbook(&fb, fit); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name string
		f    *excelize.File
	}{
		{"rating", writeResults(t, rating.RatingReport{Table: coarse, Lookup: fine})},
		{"fit", openWritten(t, &fb)},
		{"backwater", openWritten(t, &bw)},
		{"record", openWritten(t, &rec)},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if n := checkCellsReported(t, tc.f); n < 50 {
				t.Errorf("%d numbers checked, want the sheets' numbers", n)
			}
		})
	}
}
