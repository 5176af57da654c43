package plotting

import (
	"encoding/csv"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
)

// readReferenceRating reads the stage and discharge columns of a rating in
// testdata/reference (public-domain USGS data, comment lines '#').
func readReferenceRating(t *testing.T, name string) []RatingPoint {
	t.Helper()
	f, err := os.Open(filepath.Join("..", "testdata", "reference", name))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.Comment = '#'
	recs, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	var pts []RatingPoint
	for _, rec := range recs[1:] {
		h, err1 := strconv.ParseFloat(rec[0], 64)
		q, err2 := strconv.ParseFloat(rec[1], 64)
		if err1 != nil || err2 != nil {
			t.Fatalf("%s: bad row %q", name, rec)
		}
		pts = append(pts, RatingPoint{Stage: h, Discharge: q})
	}
	return pts
}

// drawnLines are the lines a rating table with a gauge height of zero
// flow e is drawn with, as handed to gonum/plot: the rating figure's
// curve of a table redrawn (tableRatingPlot, as plot draws it) and the
// line of the table on a comparison's panel (tableXY, as compare draws
// it), each as discharge against stage.
func drawnLines(pts []RatingPoint, e float64) map[string][]RatingPoint {
	tab := rating.Table{Name: "reference", Units: rating.US, Slope: math.NaN()}
	gt := gauged.RatingTable{Name: "reference", HasZeroFlow: true, ZeroFlow: e}
	for _, p := range pts {
		tab.Rows = append(tab.Rows, rating.Row{Stage: p.Stage, Discharge: p.Discharge})
		gt.Points = append(gt.Points, gauged.RatingPoint{Stage: p.Stage, Discharge: p.Discharge})
	}
	rp := tableRatingPlot(RatingFigures{Table: tab, ZeroFlow: e})
	var cmp []RatingPoint
	for _, xy := range tableXY(gt) {
		cmp = append(cmp, RatingPoint{Stage: xy.Y, Discharge: xy.X})
	}
	return map[string][]RatingPoint{"plot": panelPoints(cleanCurve(rp.Hydraulic)), "compare": cmp}
}

// panelPoints are the points addCurve hands to gonum/plot on the linear
// panel (panelXYs), as discharge against stage.
func panelPoints(pts []RatingPoint) []RatingPoint {
	var out []RatingPoint
	for _, xy := range panelXYs(pts, 0, false) {
		out = append(out, RatingPoint{Stage: xy.Y, Discharge: xy.X})
	}
	return out
}

// lineAt is the discharge of the polyline pts (by ascending stage) at
// stage h: what the line drawn through them shows there.
func lineAt(pts []RatingPoint, h float64) float64 {
	for i := 1; i < len(pts); i++ {
		a, b := pts[i-1], pts[i]
		if a.Stage <= h && h <= b.Stage {
			return a.Discharge + (b.Discharge-a.Discharge)*(h-a.Stage)/(b.Stage-a.Stage)
		}
	}
	return math.NaN()
}

// TestDrawnAsReadPatuxent: the published Patuxent River rating (USGS
// 01594440, testdata/reference; log(discharge) linear in log(GH − 2.0)
// between breakpoints, as its header says) is drawn between its rows as
// the table is read (gauged.TableRating.Discharge): every point drawn
// between breakpoints 13 and 20.85 ft lies on that reading, and the line
// at 17 ft shows its 9373 ft³/s (4350·(15/11)^b, b = ln(16497.75/4350) /
// ln(18.85/11), closed form), not the chord's 10540.
func TestDrawnAsReadPatuxent(t *testing.T) {
	pts := readReferenceRating(t, "rating-01594440.csv")
	tr, err := gauged.RatingTable{Points: gaugedPoints(pts), HasZeroFlow: true, ZeroFlow: 2.0}.Compile()
	if err != nil {
		t.Fatal(err)
	}
	want17 := 4350 * math.Pow(15.0/11, math.Log(16497.75/4350)/math.Log(18.85/11))
	if math.Abs(want17-9372.6) > 0.1 {
		t.Fatalf("closed form at 17 ft %g, want 9372.6", want17)
	}
	for name, line := range drawnLines(pts, 2.0) {
		between := 0
		for _, p := range line {
			if !(p.Stage > 13 && p.Stage < 20.85) {
				continue
			}
			between++
			q, _ := tr.Discharge(p.Stage)
			if math.Abs(p.Discharge-q) > 1e-9*q {
				t.Errorf("%s: drawn %g ft³/s at %g ft, the table reads %g", name, p.Discharge, p.Stage, q)
			}
		}
		if between < 8 {
			t.Errorf("%s: %d points drawn between the rows at 13 and 20.85 ft, want the reading followed", name, between)
		}
		if got := lineAt(line, 17); math.Abs(got-want17) > 0.001*want17 {
			t.Errorf("%s: line at 17 ft shows %.0f ft³/s, want %.0f (the table read log-linearly)", name, got, want17)
		}
	}
}

// TestDrawnAsReadExcerpt: drawn from only the end rows of the excerpt of
// the expanded rating of USGS 01541303 (testdata/reference, offset
// 2.0 ft), the line passes through the seven published rows between them
// to their rounding of 0.01 ft³/s: the reference README states that one
// power law in (GH − 2.0) through the end rows reproduces all nine.
func TestDrawnAsReadExcerpt(t *testing.T) {
	rows := readReferenceRating(t, "rating-01541303-excerpt.csv")
	ends := []RatingPoint{rows[0], rows[len(rows)-1]}
	for name, line := range drawnLines(ends, 2.0) {
		for _, r := range rows[1 : len(rows)-1] {
			if got := lineAt(line, r.Stage); !(math.Abs(got-r.Discharge) <= 0.005+1e-9) {
				t.Errorf("%s: line at %g ft shows %.4f ft³/s, the published row %.2f", name, r.Stage, got, r.Discharge)
			}
		}
	}
}

// TestDrawnRowsWithoutZeroFlow: without a gauge height of zero flow a
// table is read linearly between its rows, and drawn by its rows alone.
func TestDrawnRowsWithoutZeroFlow(t *testing.T) {
	pts := readReferenceRating(t, "rating-01594440.csv")
	tab := rating.Table{Units: rating.US, Slope: math.NaN()}
	for _, p := range pts {
		tab.Rows = append(tab.Rows, rating.Row{Stage: p.Stage, Discharge: p.Discharge})
	}
	if got := tableRatingPlot(RatingFigures{Table: tab, ZeroFlow: math.NaN()}).Hydraulic.Points; len(got) != len(pts) {
		t.Errorf("plot: %d points drawn, want the %d rows", len(got), len(pts))
	}
	if got := tableXY(gauged.RatingTable{Points: gaugedPoints(pts)}); len(got) != len(pts) {
		t.Errorf("compare: %d points drawn, want the %d rows", len(got), len(pts))
	}
}

func gaugedPoints(pts []RatingPoint) []gauged.RatingPoint {
	out := make([]gauged.RatingPoint, len(pts))
	for i, p := range pts {
		out[i] = gauged.RatingPoint{Stage: p.Stage, Discharge: p.Discharge}
	}
	return out
}

// TestDrawnFootAsRead: below the first row with flow of the excerpt of
// USGS 01541303 (testdata/reference, offset 2.0 ft), down to a dry row at
// the offset, the table is read by the power law of the rows above
// carried down (gauged.TableRating.Discharge); the linear panel's line
// follows it there, while the log–log panel, on which that law is the
// same straight line, starts at the first row with flow.
func TestDrawnFootAsRead(t *testing.T) {
	rows := readReferenceRating(t, "rating-01541303-excerpt.csv")
	pts := append([]RatingPoint{{Stage: 2.0, Discharge: 0}}, rows[0], rows[len(rows)-1])
	tr, err := gauged.RatingTable{Points: gaugedPoints(pts), HasZeroFlow: true, ZeroFlow: 2.0}.Compile()
	if err != nil {
		t.Fatal(err)
	}
	tab := rating.Table{Units: rating.US, Slope: math.NaN()}
	for _, p := range pts {
		tab.Rows = append(tab.Rows, rating.Row{Stage: p.Stage, Discharge: p.Discharge})
	}
	curve := cleanCurve(tableRatingPlot(RatingFigures{Table: tab, ZeroFlow: 2.0}).Hydraulic)
	want, _ := tr.Discharge(2.25)
	if got := lineAt(panelPoints(curve), 2.25); math.Abs(got-want) > 0.01*want {
		t.Errorf("linear panel at 2.25 ft: %.3f ft³/s, the table reads %.3f", got, want)
	}
	for _, xy := range panelXYs(curve, 2.0, true) {
		if xy.X < rows[0].Discharge {
			t.Errorf("log–log panel draws %g ft³/s at h − e = %g, below the first row with flow", xy.X, xy.Y)
		}
	}
}
