package results_test

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"io"
	"math"
	"slices"
	"strings"
	"testing"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/survey/results"
)

// Each gauging's flags are written in the gauging rows of every format
// (CSV, JSON, text, workbook) with the record's flag words, and an
// excluded gauging's reason after them. Rating (0.2, 0), (0.7, 2),
// (1.2, 8), e = 0.2, extrapolation allowed, highest gauging 1.1 m; by hand
// from the rows (above 0.7 m Q = 2·((h − 0.2)/0.5)²):
//
//	1.4 m lies above the last row and the highest gauging: above_gaugings
//	  extrapolated;
//	0.1 m lies below e (rated 0): below_zero_flow;
//	1.15 m lies between rows, above the highest gauging (Q 7.22):
//	  above_gaugings, as the record flags it;
//	0.9 m measuring 3.92 lies on the rating: no flag, shift 0;
//	0.9 m an hour later measuring 5.0, excluded ("meter fault"): excluded;
//	  its departure 100·(5 − 3.92)/3.92 = 27.6 % is not marked outside its
//	  band, and the visit's diagram is drawn through the first 0.9 m gauging
//	  alone (shift 0), not the mean of 0 and its +0.0906.
func TestShiftsFlags(t *testing.T) {
	rt := &gauged.RatingTable{Name: "r", Points: []gauged.RatingPoint{{Stage: 0.2}, {Stage: 0.7, Discharge: 2}, {Stage: 1.2, Discharge: 8}},
		HasZeroFlow: true, ZeroFlow: 0.2, Extrapolate: true, HasHighGauging: true, HighGauging: 1.1}
	r, err := gauged.History{Periods: []gauged.Period{{Rating: rt}}}.Compile()
	if err != nil {
		t.Fatal(err)
	}
	at := time.Date(2024, 6, 3, 10, 0, 0, 0, time.UTC)
	day := 24 * time.Hour
	gs := []gauged.Gauging{
		{Time: at, Stage: 1.4, Discharge: 12, Quality: rating.Good},
		{Time: at.Add(2 * day), Stage: 0.1, Discharge: 0.2, Quality: rating.Good},
		{Time: at.Add(4 * day), Stage: 1.15, Discharge: 7.22, Quality: rating.Good},
		{Time: at.Add(6 * day), Stage: 0.9, Discharge: 3.92, Quality: rating.Good},
		{Time: at.Add(6*day + time.Hour), Stage: 0.9, Discharge: 5.0, Quality: rating.Good, Exclude: "meter fault"},
	}
	c, err := r.CheckGaugings(gs, gauged.CheckOptions{})
	if err != nil {
		t.Fatal(err)
	}
	want := []struct{ flags, exclude string }{
		{"above_gaugings extrapolated", ""}, {"below_zero_flow", ""}, {"above_gaugings", ""}, {"", ""}, {"excluded", "meter fault"},
	}
	if g := c.Gaugings[4]; g.Outside || g.OutsideShifted || math.Abs(g.Departure-100*1.08/3.92) > 1e-9 {
		t.Errorf("excluded gauging: outside %v/%v, departure %v", g.Outside, g.OutsideShifted, g.Departure)
	}
	if v := c.Visits[len(c.Visits)-1]; len(v.Gaugings) != 2 || len(v.Proposal.Points) != 1 || math.Abs(v.Proposal.Points[0].Shift) > 1e-9 {
		t.Errorf("last visit %+v: want both 0.9 m gaugings and a diagram of shift 0", v)
	}

	var b bytes.Buffer
	if err := results.WriteShiftsCSV(&b, &c); err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(&b).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	cols := results.ShiftGaugingColumns()
	fc, ec := slices.Index(cols, "flags"), slices.Index(cols, "exclude")
	if fc < 0 || ec != fc+1 || cols[fc-1] != "source" || !slices.Equal(recs[0], cols) {
		t.Fatalf("columns %q", recs[0])
	}
	for i, w := range want {
		if got := recs[i+1]; got[fc] != w.flags || got[ec] != w.exclude {
			t.Errorf("CSV row %d: flags %q, exclude %q; want %q, %q", i+1, got[fc], got[ec], w.flags, w.exclude)
		}
	}

	b.Reset()
	if err := results.WriteShiftsJSON(&b, &c); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Gaugings []struct {
			Flags   []string
			Exclude string
		}
	}
	if err := json.Unmarshal(b.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	for i, w := range want {
		if g := doc.Gaugings[i]; strings.Join(g.Flags, " ") != w.flags || g.Flags == nil || g.Exclude != w.exclude {
			t.Errorf("JSON gauging %d: flags %q, exclude %q; want %q, %q", i+1, g.Flags, g.Exclude, w.flags, w.exclude)
		}
	}

	b.Reset()
	if err := results.WriteShiftsText(&b, &c); err != nil {
		t.Fatal(err)
	}
	text := b.String()
	for i, w := range want {
		stamp := gs[i].Time.Format(time.RFC3339)
		for _, l := range strings.Split(text, "\n") {
			if strings.HasPrefix(l, "  "+stamp+" ") && strings.Contains(l, " good ") && w.flags != "" && !strings.HasSuffix(l, " "+w.flags) {
				t.Errorf("text row %d does not end in %q: %q", i+1, w.flags, l)
			}
		}
	}
	if !strings.Contains(text, "Excluded gaugings") || !strings.Contains(text, "  "+gs[4].Time.Format(time.RFC3339)+"      meter fault") {
		t.Errorf("the text does not list the excluded gauging with its reason:\n%s", text)
	}

	rows := shiftsSheetRows(t, &c, results.SheetGaugings)
	fx := slices.Index(rows[0], "flags")
	if fx < 0 || len(rows) != 1+len(gs) {
		t.Fatalf("sheet rows %q", rows)
	}
	for i, w := range want {
		got := ""
		if row := rows[i+1]; fx < len(row) {
			got = row[fx]
		}
		if got != w.flags {
			t.Errorf("sheet row %d: flags %q, want %q", i+1, got, w.flags)
		}
	}
	ex := slices.Index(rows[0], "exclude")
	if ex < 0 {
		t.Fatalf("the gaugings sheet has no exclude column: %q", rows[0])
	}
	for i, w := range want {
		got := ""
		if row := rows[i+1]; ex < len(row) {
			got = row[ex]
		}
		if got != w.exclude {
			t.Errorf("sheet row %d: exclude %q, want %q", i+1, got, w.exclude)
		}
	}
}

// shiftsSheetRows writes the shifts workbook of c and returns the rows
// of one of its sheets.
func shiftsSheetRows(t *testing.T, c *gauged.ShiftCheck, sheet string) [][]string {
	t.Helper()
	path := t.TempDir() + "/shifts.xlsx"
	if err := writeFile(path, func(w io.Writer) error { return results.WriteShiftsWorkbook(w, c) }); err != nil {
		t.Fatal(err)
	}
	rows, err := openBook(t, path).GetRows(sheet)
	if err != nil {
		t.Fatal(err)
	}
	return rows
}

// The proposed diagrams of a shifts workbook name the rating period in
// force at their visit: the rating_period the CSV gives the visit's
// gaugings. Two periods of one table (rows (0.2, 0), (0.7, 2), (1.2, 8),
// e = 0.2), the second from three days after the first visit; one visit
// in each.
func TestShiftsWorkbookProposalPeriods(t *testing.T) {
	rt := &gauged.RatingTable{Name: "r", Points: []gauged.RatingPoint{{Stage: 0.2}, {Stage: 0.7, Discharge: 2}, {Stage: 1.2, Discharge: 8}},
		HasZeroFlow: true, ZeroFlow: 0.2}
	at := time.Date(2024, 6, 3, 10, 0, 0, 0, time.UTC)
	r, err := gauged.History{Periods: []gauged.Period{{Rating: rt}, {From: at.Add(72 * time.Hour), Rating: rt}}}.Compile()
	if err != nil {
		t.Fatal(err)
	}
	gs := []gauged.Gauging{
		{Time: at, Stage: 0.9, Discharge: 3.92, Quality: rating.Good},
		{Time: at.Add(96 * time.Hour), Stage: 0.9, Discharge: 4.2, Quality: rating.Good},
	}
	c, err := r.CheckGaugings(gs, gauged.CheckOptions{})
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	if err := results.WriteShiftsCSV(&b, &c); err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(&b).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := slices.Index(recs[0], "rating_period")
	rows := shiftsSheetRows(t, &c, results.SheetProposals)
	at2 := slices.Index(rows[0], "rating period")
	if col < 0 || at2 < 0 || len(rows) != 1+len(gs) {
		t.Fatalf("CSV columns %q, sheet rows %q", recs[0], rows)
	}
	for i, tc := range []struct{ visit, want string }{{"first", "1"}, {"second", "2"}} {
		got := ""
		if row := rows[i+1]; at2 < len(row) {
			got = row[at2]
		}
		if got != tc.want || recs[i+1][col] != tc.want {
			t.Errorf("%s visit: sheet rating period %q, CSV %q, want %q", tc.visit, got, recs[i+1][col], tc.want)
		}
	}
}

// The summary counts the gaugings outside their bands on the base rating
// and on the shifted one in words that do not read as no shifts applied.
func TestShiftsSummaryOutsideCounts(t *testing.T) {
	c := gauged.ShiftCheck{
		Gaugings: []gauged.GaugingShift{{Outside: true}, {Outside: true}, {}},
		History:  gauged.History{Shifts: []gauged.ShiftDiagram{{Points: []gauged.ShiftPoint{{Stage: 1, Shift: 0.1}}}}},
	}
	var b bytes.Buffer
	if err := results.WriteShiftsSummary(&b, &c, "s.csv"); err != nil {
		t.Fatal(err)
	}
	if want := "wrote s.csv: 3 gaugings in 0 visits, 2 outside their bands on the base rating, 0 once shifted; "; !strings.HasPrefix(b.String(), want) {
		t.Errorf("summary %q, want it to begin %q", b.String(), want)
	}
}
