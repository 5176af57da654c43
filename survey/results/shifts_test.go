package results_test

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"io"
	"slices"
	"strings"
	"testing"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/survey/results"
)

// A gauging rated by extrapolation beyond the table, and one at or below
// the zero-flow stage, are marked in the gauging rows of every format with
// the record's flag words, after the existing columns and keys. Rating
// (0.2, 0), (0.7, 2), (1.2, 8), e = 0.2, extrapolation allowed: 1.4 m lies
// above the last row (extrapolated), 0.1 m below e (rated 0,
// below_zero_flow), 0.9 m between rows (no flag). By hand from the rows.
func TestShiftsFlagLookups(t *testing.T) {
	rt := &gauged.RatingTable{Name: "r", Points: []gauged.RatingPoint{{Stage: 0.2}, {Stage: 0.7, Discharge: 2}, {Stage: 1.2, Discharge: 8}},
		HasZeroFlow: true, ZeroFlow: 0.2, Extrapolate: true}
	r, err := gauged.History{Periods: []gauged.Period{{Rating: rt}}}.Compile()
	if err != nil {
		t.Fatal(err)
	}
	at := time.Date(2024, 6, 3, 10, 0, 0, 0, time.UTC)
	gs := []gauged.Gauging{
		{Time: at, Stage: 1.4, Discharge: 12, Quality: rating.Good},
		{Time: at.Add(48 * time.Hour), Stage: 0.1, Discharge: 0.2, Quality: rating.Good},
		{Time: at.Add(96 * time.Hour), Stage: 0.9, Discharge: 3.92, Quality: rating.Good},
	}
	c, err := r.CheckGaugings(gs, gauged.CheckOptions{})
	if err != nil {
		t.Fatal(err)
	}
	want := []string{"extrapolated", "below_zero_flow", ""}

	var b bytes.Buffer
	if err := results.WriteShiftsCSV(&b, &c); err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(&b).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	cols := results.ShiftGaugingColumns()
	if cols[len(cols)-1] != "flags" || cols[len(cols)-2] != "source" || !slices.Equal(recs[0], cols) {
		t.Fatalf("columns %q", recs[0])
	}
	for i, w := range want {
		if got := recs[i+1][len(cols)-1]; got != w {
			t.Errorf("CSV row %d: flags %q, want %q", i+1, got, w)
		}
	}

	b.Reset()
	if err := results.WriteShiftsJSON(&b, &c); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Gaugings []struct{ Flags []string }
	}
	if err := json.Unmarshal(b.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	for i, w := range want {
		if got := strings.Join(doc.Gaugings[i].Flags, " "); got != w || doc.Gaugings[i].Flags == nil {
			t.Errorf("JSON gauging %d: flags %q, want %q", i+1, doc.Gaugings[i].Flags, w)
		}
	}

	b.Reset()
	if err := results.WriteShiftsText(&b, &c); err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(b.String(), "\n")
	for i, w := range want {
		stamp := gs[i].Time.Format(time.RFC3339)
		for _, l := range lines {
			if strings.HasPrefix(l, "  "+stamp) && w != "" && !strings.HasSuffix(l, " "+w) {
				t.Errorf("text row %d does not end in %q: %q", i+1, w, l)
			}
		}
	}
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
	path := t.TempDir() + "/shifts.xlsx"
	if err := writeFile(path, func(w io.Writer) error { return results.WriteShiftsWorkbook(w, &c) }); err != nil {
		t.Fatal(err)
	}
	rows, err := openBook(t, path).GetRows(results.SheetProposals)
	if err != nil {
		t.Fatal(err)
	}
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
