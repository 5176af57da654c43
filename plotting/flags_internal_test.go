package plotting

import (
	"io"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"wetline/rating"
)

// flaggedLadder is an invented step-backwater rating read back from its
// CSV: six discharges, the first and the last two still depending on the
// boundary, the second at critical depth, the last above an end of the
// section.
func flaggedLadder() rating.Table {
	rows := []rating.Row{
		{Stage: 100.2, Discharge: 1, Flags: []string{"unsettled"}},
		{Stage: 100.4, Discharge: 3, Flags: []string{"critical_stage"}},
		{Stage: 100.6, Discharge: 6},
		{Stage: 100.7, Discharge: 9},
		{Stage: 100.8, Discharge: 12, Flags: []string{"unsettled"}},
		{Stage: 101.0, Discharge: 16, Flags: []string{"above_end", "unsettled"}},
	}
	return rating.Table{Name: "XS-1", Units: rating.SI, Slope: math.NaN(), Kind: rating.KindBackwater, Rows: rows}
}

// TestTableRatingPlotBackwater: a step-backwater table redrawn is titled
// and labelled as one, carries that method's caution, and marks its
// unsettled, critical and above-end rows as backwater's figures mark them,
// counted in a foot note; a table of rate's flagged only above an end is
// a Manning rating with its squares.
func TestTableRatingPlotBackwater(t *testing.T) {
	rp := tableRatingPlot(RatingFigures{Table: flaggedLadder(), Subtitle: "redrawn from xs1-bw.csv", ZeroFlow: math.NaN()})
	if rp.What != "step-backwater rating" || rp.Hydraulic.Label != "step-backwater rating" {
		t.Errorf("title ends %q, curve %q: want step-backwater rating", rp.What, rp.Hydraulic.Label)
	}
	if !strings.HasPrefix(rp.Subtitle, "step-backwater rating, SI units; redrawn from") {
		t.Errorf("subtitle %q", rp.Subtitle)
	}
	if rp.Caution != DefaultBackwaterCaution {
		t.Errorf("caution %q", rp.Caution)
	}
	var got []string
	for _, m := range rp.Flagged {
		got = append(got, m.Flag+":"+strings.Repeat("x", len(m.Points)))
	}
	if want := "unsettled:xxx critical_stage:x above_end:x"; strings.Join(got, " ") != want {
		t.Errorf("marks %q, want %q", strings.Join(got, " "), want)
	}
	want := "rows flagged in the table: 3 unsettled at 100.20 and 100.80 to 101.00 m (ringed: still depending on the boundary); " +
		"1 critical_stage at 100.40 m (crossed: stage at critical depth); 1 above_end at 101.00 m (squares: above an end of the section)"
	if len(rp.Notes) != 1 || rp.Notes[0] != want {
		t.Errorf("notes %q,\nwant %q", rp.Notes, want)
	}

	rate := rating.Table{Name: "XS-1", Units: rating.US, Slope: 0.001, Rows: []rating.Row{
		{Stage: 1, Discharge: 0}, {Stage: 2, Discharge: 10}, {Stage: 3, Discharge: 30, Flags: []string{"above_end"}}}}
	rp = tableRatingPlot(RatingFigures{Table: rate, ZeroFlow: math.NaN()})
	if rp.What != "" || rp.Hydraulic.Label != "hydraulic rating (Manning)" || rp.Caution != "" {
		t.Errorf("rate's table: title %q, curve %q, caution %q", rp.What, rp.Hydraulic.Label, rp.Caution)
	}
	if len(rp.Flagged) != 1 || rp.Flagged[0].Flag != "above_end" || !strings.Contains(rp.Notes[0], "1 above_end at 3.00 ft") {
		t.Errorf("rate's table: marks %v, notes %q", rp.Flagged, rp.Notes)
	}
}

// TestFlagNoteRuns: more runs than maxRunsNamed are summed up.
func TestFlagNoteRuns(t *testing.T) {
	var rows []rating.Row
	for i := range 8 {
		r := rating.Row{Stage: 10 + float64(i), Discharge: float64(i + 1)}
		if i%2 == 0 {
			r.Flags = []string{"unsettled"}
		}
		rows = append(rows, r)
	}
	got := FlagNote(FlagMarks(rating.Table{Rows: rows}), rating.SI)
	if want := "4 unsettled at 4 runs from 10.00 to 16.00 m"; !strings.Contains(got, want) {
		t.Errorf("note %q, want %q in it", got, want)
	}
}

// TestFlagMarksInside: the mark of a flagged last row, at the highest
// stage and discharge, is drawn whole inside the linear panel (a square
// of 3.5 points' radius, a ring of 4, a cross of 4.5), measured as
// TestCompareRatingsMarkersInside measures.
func TestFlagMarksInside(t *testing.T) {
	const radius = 4.5 // points: the largest mark, the cross
	tab := flaggedLadder()
	r := tableRatingPlot(RatingFigures{Table: tab, ZeroFlow: math.NaN()})
	d, _ := cleanRatingLines(r)
	lin := linearRatingPanel(r, d, names(r.Units), 0, false)
	addFlagMarks(lin, r.Flagged, 0, false)
	err := render(io.Discard, Size{}, figure{title: "t"}, func(c draw.Canvas) error {
		lin.Draw(c)
		dc := lin.DataCanvas(c)
		trX, trY := lin.Transforms(&dc)
		rad := vg.Points(radius)
		for _, m := range r.Flagged {
			for _, q := range m.Points {
				x, y := trX(q.Discharge), trY(q.Stage)
				if x+rad > dc.Max.X || y+rad > dc.Max.Y {
					t.Errorf("the %s mark of %g at %g leaves the data area", m.Flag, q.Discharge, q.Stage)
				}
			}
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
}
