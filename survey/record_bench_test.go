package survey_test

import (
	"bufio"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"wetline/rating/gauged"
	"wetline/rating/record"
	"wetline/survey"
)

// Size of the benchmark record: 30 years of 15-minute stages.
var (
	benchStart = time.Date(1995, 1, 1, 0, 0, 0, 0, time.UTC)
	benchEnd   = time.Date(2025, 1, 1, 0, 0, 0, 0, time.UTC)
)

const benchStep = 15 * time.Minute

// writeBenchRecord writes an invented 30-year record of 15-minute stages
// (1 051 968 rows: a seasonal base flow with random storms, a few quality
// words) as CSV, and returns its path.
func writeBenchRecord(b *testing.B) string {
	b.Helper()
	path := filepath.Join(b.TempDir(), "stage-30y.csv")
	f, err := os.Create(path)
	if err != nil {
		b.Fatal(err)
	}
	w := bufio.NewWriterSize(f, 1<<20)
	fmt.Fprintln(w, "time,stage (m),quality")
	rng := rand.New(rand.NewPCG(1, 1))
	storm := 0.0
	for t := benchStart; t.Before(benchEnd); t = t.Add(benchStep) {
		season := 0.25 * math.Sin(2*math.Pi*float64(t.YearDay())/365.25)
		if rng.Float64() < 1.0/2000 { // a storm every three weeks or so
			storm += 0.5 + 2.5*rng.Float64()
		}
		storm *= 0.995 // recession over a day or two
		h := 0.6 + season + storm + 0.003*rng.NormFloat64()
		q := ""
		if rng.Float64() < 0.001 {
			q = "estimated"
		}
		fmt.Fprintf(w, "%s,%.3f,%s\n", t.Format("2006-01-02T15:04:05"), h, q)
	}
	if err := w.Flush(); err != nil {
		b.Fatal(err)
	}
	if err := f.Close(); err != nil {
		b.Fatal(err)
	}
	return path
}

// benchHistory is ten rating periods of three years, each a power-law
// table Q = C·(h − e)^b every 0.1 m to 5 m with its zero-flow stage, and
// 200 shift diagrams (one every 55 days, two points and a taper, every
// tenth abrupt).
func benchHistory() gauged.History {
	var h gauged.History
	for p := range 10 {
		e := 0.15 + 0.01*float64(p)
		c, x := 8+0.3*float64(p), 1.6+0.02*float64(p)
		rt := &gauged.RatingTable{Name: fmt.Sprintf("rating %d", p+1), HasZeroFlow: true, ZeroFlow: e, HasHighGauging: true, HighGauging: 2.5}
		for s := e + 0.05; s <= 5.0001; s += 0.1 {
			rt.Points = append(rt.Points, gauged.RatingPoint{Stage: s, Discharge: c * math.Pow(s-e, x)})
		}
		from := time.Time{}
		if p > 0 {
			from = benchStart.AddDate(3*p, 0, 0)
		}
		h.Periods = append(h.Periods, gauged.Period{From: from, Rating: rt})
	}
	for k := range 200 {
		s := 0.04 * math.Sin(float64(k))
		h.Shifts = append(h.Shifts, gauged.ShiftDiagram{
			Time:   benchStart.Add(time.Duration(k) * 55 * 24 * time.Hour).Add(10 * time.Hour),
			Points: []gauged.ShiftPoint{{Stage: 0.5, Shift: s}, {Stage: 1.2, Shift: s / 2}}, HasTaper: true, Taper: 2.0,
			Abrupt: k%10 == 9,
		})
	}
	return h
}

// BenchmarkStageRecordRead reads and parses the 30-year CSV record.
func BenchmarkStageRecordRead(b *testing.B) {
	path := writeBenchRecord(b)
	var n int
	for b.Loop() {
		r, err := survey.ReadStageRecord(path, survey.StageRecordOptions{})
		if err != nil {
			b.Fatal(err)
		}
		n = r.Stages.Len()
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/reading")
}

// BenchmarkStageRecordCompute computes the unit and daily values of the
// same record with ten rating periods and 200 shift diagrams.
func BenchmarkStageRecordCompute(b *testing.B) {
	path := writeBenchRecord(b)
	r, err := survey.ReadStageRecord(path, survey.StageRecordOptions{})
	if err != nil {
		b.Fatal(err)
	}
	rater, err := benchHistory().Compile()
	if err != nil {
		b.Fatal(err)
	}
	var res *record.Result
	for b.Loop() {
		res, err = record.Compute(&r.Stages, rater, record.Options{})
		if err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(len(res.Units)), "ns/reading")
	if len(res.Units) != 1_051_968 || len(res.Daily) != 10_958 {
		b.Fatalf("%d unit values, %d days", len(res.Units), len(res.Daily))
	}
}

// BenchmarkStageRecordWorkbook reads 100 000 fifteen-minute readings from
// a workbook sheet whose times are date cells (a date-time number
// format), as a spreadsheet keeps a logger's download.
func BenchmarkStageRecordWorkbook(b *testing.B) {
	const n = 100_000
	f := excelize.NewFile()
	defer f.Close()
	style, err := f.NewStyle(&excelize.Style{NumFmt: 22}) // m/d/yy h:mm
	if err != nil {
		b.Fatal(err)
	}
	sw, err := f.NewStreamWriter("Sheet1")
	if err != nil {
		b.Fatal(err)
	}
	if err := sw.SetRow("A1", []any{"time", "stage (m)"}); err != nil {
		b.Fatal(err)
	}
	for i := range n {
		cell, _ := excelize.CoordinatesToCellName(1, i+2)
		serial := 45292 + float64(i)/96 // 2024-01-01 in the 1900 date system, in quarter hours
		if err := sw.SetRow(cell, []any{excelize.Cell{StyleID: style, Value: serial}, 1 + 0.5*math.Sin(float64(i)/500)}); err != nil {
			b.Fatal(err)
		}
	}
	if err := sw.Flush(); err != nil {
		b.Fatal(err)
	}
	path := filepath.Join(b.TempDir(), "stages.xlsx")
	if err := f.SaveAs(path); err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		r, err := survey.ReadStageRecord(path, survey.StageRecordOptions{})
		if err != nil {
			b.Fatal(err)
		}
		if r.Stages.Len() != n {
			b.Fatalf("%d readings", r.Stages.Len())
		}
	}
}
