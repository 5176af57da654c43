package results_test

import (
	"bytes"
	"encoding/json"
	"errors"
	"io"
	"math"
	"strings"
	"testing"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/rating/record"
	"wetline/survey"
	"wetline/survey/results"
)

// testRecord computes an invented record of n readings every 15 minutes
// on a rating with a zero-flow stage, two diagrams and a gap.
func testRecord(t testing.TB, n int) *record.Result {
	t.Helper()
	rt := &gauged.RatingTable{Name: "r", HasZeroFlow: true, ZeroFlow: 0.2, HasHighGauging: true, HighGauging: 1.5,
		Points: []gauged.RatingPoint{{Stage: 0.4, Discharge: 0.6}, {Stage: 0.9, Discharge: 5.2}, {Stage: 1.6, Discharge: 17.5}, {Stage: 3, Discharge: 60}}}
	start := time.Date(2024, 1, 1, 0, 0, 0, 0, time.UTC)
	h := gauged.History{Periods: []gauged.Period{{Rating: rt}}, Shifts: []gauged.ShiftDiagram{
		{Time: start, Points: []gauged.ShiftPoint{{Stage: 0.5, Shift: -0.04}}, HasTaper: true, Taper: 1.2},
		{Time: start.AddDate(0, 1, 0), Points: []gauged.ShiftPoint{{Stage: 0.5, Shift: 0.01}}},
	}}
	r, err := h.Compile()
	if err != nil {
		t.Fatal(err)
	}
	st := &record.Stages{Name: "test", Qualities: []string{"", "ice"}, Quality: make([]uint16, 0, n)}
	for i := range n {
		sec := start.Unix() + int64(i)*900
		if i > n/2 {
			sec += 6 * 3600 // a gap half-way
		}
		st.Time = append(st.Time, sec)
		st.Stage = append(st.Stage, 0.6+0.8*math.Pow(math.Sin(float64(i)/300), 8))
		st.Quality = append(st.Quality, uint16(i%97/96))
	}
	res, err := record.Compute(st, r, record.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return res
}

// TestRecordWritersBoundedMemory: writing the unit values allocates about
// as much for eight times the readings as for one: nothing is held per
// row (the allocations of a run do not grow with the record).
func TestRecordWritersBoundedMemory(t *testing.T) {
	small, large := testRecord(t, 2000), testRecord(t, 16000)
	for _, w := range []struct {
		name  string
		write func(io.Writer, *record.Result, results.RecordTables) error
	}{{"csv", results.WriteRecordCSV}, {"json", results.WriteRecordJSON}, {"text", results.WriteRecordText}} {
		allocs := func(res *record.Result) float64 {
			return testing.AllocsPerRun(3, func() {
				if err := w.write(io.Discard, res, results.UnitTable); err != nil {
					t.Fatal(err)
				}
			})
		}
		a, b := allocs(small), allocs(large)
		// The days' rows (text, JSON tail) grow with the days, not the
		// readings: 21 against 167 days here, a few allocations each.
		const perDay = 12
		if b > a+perDay*float64(len(large.Daily)-len(small.Daily)) {
			t.Errorf("%s: %.0f allocations for %d readings, %.0f for %d", w.name, a, len(small.Units), b, len(large.Units))
		}
		if w.name == "csv" && b > a+2 {
			t.Errorf("csv: %.0f allocations for %d readings, %.0f for %d: a row allocates", a, len(small.Units), b, len(large.Units))
		}
	}
}

// TestRecordJSONNulls: undefined values are null and the document is
// valid JSON.
func TestRecordJSONNulls(t *testing.T) {
	t.Parallel()
	res := testRecord(t, 500)
	res.Units[3].Discharge = math.NaN()
	var b bytes.Buffer
	if err := results.WriteRecordJSON(&b, res, 0); err != nil {
		t.Fatal(err)
	}
	if !json.Valid(b.Bytes()) {
		t.Fatalf("not JSON:\n%.400s", b.String())
	}
	var doc struct {
		Unit []struct {
			Discharge    *float64
			Quality      *string
			RatingPeriod *int `json:"rating_period"`
		}
	}
	if err := json.Unmarshal(b.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	if doc.Unit[3].Discharge != nil || doc.Unit[2].Discharge == nil {
		t.Errorf("discharges %v %v", doc.Unit[2].Discharge, doc.Unit[3].Discharge)
	}
	// Reading 96 is marked ice (testRecord), reading 95 has no quality;
	// every reading is rated by the one period.
	if q := doc.Unit[96].Quality; q == nil || *q != "ice" || doc.Unit[95].Quality != nil {
		t.Errorf("qualities %v %v, want null and ice", doc.Unit[95].Quality, q)
	}
	if p := doc.Unit[0].RatingPeriod; p == nil || *p != 1 {
		t.Errorf("rating period %v, want 1", p)
	}
}

func TestCheckRecordWorkbook(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		readings int
		tables   results.RecordTables
		refused  bool
	}{
		{results.MaxSheetRows, 0, false},
		{results.MaxSheetRows + 1, 0, true},
		{results.MaxSheetRows + 1, results.UnitTable, true},
		{results.MaxSheetRows + 1, results.DailyTable, false},
	} {
		err := results.CheckRecordWorkbook(c.readings, 400, c.tables)
		if errors.Is(err, results.ErrSheetRows) != c.refused {
			t.Errorf("%d readings, tables %d: %v", c.readings, c.tables, err)
		}
	}
	if err := results.WriteRecordCSV(io.Discard, testRecord(t, 10), results.UnitTable|results.DailyTable); !errors.Is(err, results.ErrOneTable) {
		t.Errorf("both tables in CSV: %v", err)
	}
}

// TestProposedShiftsReadBack: the proposed diagrams, written as a shift
// table, read back as the same diagrams (to the four decimals written).
func TestProposedShiftsReadBack(t *testing.T) {
	t.Parallel()
	rt := &gauged.RatingTable{Name: "r", HasZeroFlow: true, ZeroFlow: 0.2,
		Points: []gauged.RatingPoint{{Stage: 0.4, Discharge: 0.6}, {Stage: 0.9, Discharge: 5.2}, {Stage: 1.6, Discharge: 17.5}}}
	r, err := gauged.History{Periods: []gauged.Period{{Rating: rt}}}.Compile()
	if err != nil {
		t.Fatal(err)
	}
	day := time.Date(2024, 5, 1, 0, 0, 0, 0, time.UTC)
	gs := []gauged.Gauging{
		{Time: day.Add(9 * time.Hour), Stage: 0.84, Discharge: 4.1, Quality: rating.Good},
		{Time: day.Add(12 * time.Hour), Stage: 1.12, Discharge: 7.6, Quality: rating.Fair},
		{Time: day.AddDate(0, 0, 9), Stage: 0.6, Discharge: 1.95, Quality: rating.Good},
	}
	c, err := r.CheckGaugings(gs, gauged.CheckOptions{UTCOffset: 10 * time.Hour})
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	if err := results.WriteProposedShifts(&b, &c); err != nil {
		t.Fatal(err)
	}
	ds, err := survey.ParseShiftDiagrams(strings.NewReader(b.String()), "proposed.csv", survey.ShiftTableOptions{})
	if err != nil {
		t.Fatalf("%v\n%s", err, b.String())
	}
	if len(ds.Diagrams) != len(c.Visits) {
		t.Fatalf("%d diagrams for %d visits", len(ds.Diagrams), len(c.Visits))
	}
	const writtenTol = 5e-5 // four decimals
	for i, d := range ds.Diagrams {
		p := c.Visits[i].Proposal
		if !d.Time.Equal(p.Time) || len(d.Points) != len(p.Points) {
			t.Fatalf("diagram %d: %+v, proposed %+v", i, d, p)
		}
		for k := range d.Points {
			if math.Abs(d.Points[k].Shift-p.Points[k].Shift) > writtenTol || d.Points[k].Stage != p.Points[k].Stage {
				t.Errorf("diagram %d point %d: %+v, proposed %+v", i, k, d.Points[k], p.Points[k])
			}
		}
	}
}

// BenchmarkRecordCSV writes the unit values of 30 years of 15-minute
// readings (1 051 200 rows) to io.Discard.
func BenchmarkRecordCSV(b *testing.B) {
	res := testRecord(b, 30*365*96)
	b.ReportAllocs()
	for b.Loop() {
		if err := results.WriteRecordCSV(io.Discard, res, results.UnitTable); err != nil {
			b.Fatal(err)
		}
	}
}

// TestRecordSummaryUnratedCrest: when the highest stage of a record lies
// above its rating table, with no discharge, the console summary does not
// pass the greatest rated discharge off as the peak: it names the highest
// stage, its time and how many readings above the table have none. Rating
// rows 0.4 to 3 m; the crest at 3.3 m, one more reading at 3.1 m above
// the table; one reading above in a second case. Readings hourly. The
// greatest rated, at 2.9 m, by hand log-linear in h − e between the rows
// of 1.6 and 3 m (Kennedy 1984): 17.5·(2.7/1.4)^b, b = ln(60/17.5)/ln 2,
// 56.24 m³/s.
func TestRecordSummaryUnratedCrest(t *testing.T) {
	rt := &gauged.RatingTable{Name: "r", HasZeroFlow: true, ZeroFlow: 0.2,
		Points: []gauged.RatingPoint{{Stage: 0.4, Discharge: 0.6}, {Stage: 0.9, Discharge: 5.2}, {Stage: 1.6, Discharge: 17.5}, {Stage: 3, Discharge: 60}}}
	r, err := gauged.History{Periods: []gauged.Period{{Rating: rt}}}.Compile()
	if err != nil {
		t.Fatal(err)
	}
	start := time.Date(2024, 1, 1, 0, 0, 0, 0, time.UTC).Unix()
	for _, tc := range []struct {
		name   string
		stages []float64
		want   string // the lines after "wrote …"
	}{
		{"two above", []float64{1, 2.9, 3.3, 3.1, 2.5},
			"  greatest unit discharge 56.24 m3/s at 2024-01-01T01:00:00Z, not the peak:\n" +
				"  the highest stage, 3.3 m at 2024-01-01T02:00:00Z, is one of 2 readings above the rating table, with no discharge (--extrapolate rates them)\n"},
		{"one above", []float64{1, 2.9, 3.3, 2.5},
			"  greatest unit discharge 56.24 m3/s at 2024-01-01T01:00:00Z, not the peak:\n" +
				"  the highest stage, 3.3 m at 2024-01-01T02:00:00Z, lies above the rating table, with no discharge (--extrapolate rates it)\n"},
		{"crest rated", []float64{1, 2.9, 2.5},
			"  greatest unit discharge 56.24 m3/s at 2024-01-01T01:00:00Z\n"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			st := &record.Stages{Name: "test"}
			for i, h := range tc.stages {
				st.Time = append(st.Time, start+int64(i)*3600)
				st.Stage = append(st.Stage, h)
			}
			res, err := record.Compute(st, r, record.Options{})
			if err != nil {
				t.Fatal(err)
			}
			var b bytes.Buffer
			if err := results.WriteRecordSummary(&b, res, "out.json"); err != nil {
				t.Fatal(err)
			}
			_, rest, _ := strings.Cut(b.String(), "\n")
			if got, _, _ := strings.Cut(rest, "provisional:"); got != tc.want {
				t.Errorf("summary\n%s\nwant\n%s", got, tc.want)
			}
		})
	}
}
