package batch_test

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"wetline/rating"
	"wetline/survey/batch"
	"wetline/survey/output"
)

// Size of the batch benchmark: sections, points per section, and the
// stage range giving benchStages stages.
const (
	benchSections = 10_000
	benchPointsN  = 500
	benchStages   = 201 // 100 to 105 m in steps of 0.025 m
)

// writeBenchSurveys writes invented valley sections (bottom near 100 m,
// ends near 105 m, bank marks, n column) as CSV files into dir.
func writeBenchSurveys(tb testing.TB, dir string, n int) {
	rng := rand.New(rand.NewPCG(1, 1))
	var b strings.Builder
	for k := 0; k < n; k++ {
		b.Reset()
		b.WriteString("station,elevation,n,mark\n")
		w := 60 + 60*rng.Float64()
		c := w * (0.3 + 0.4*rng.Float64())
		phase := 10 * rng.Float64()
		for i := 0; i < benchPointsN; i++ {
			x := w * float64(i) / (benchPointsN - 1)
			u := (x - c) / (w / 2)
			z := 100.2 + 4.9*u*u + 0.05*math.Sin(x/3+phase)
			if i == 0 || i == benchPointsN-1 {
				z = 105.05
			}
			mark, nv := "", 0.06
			if math.Abs(u) < 0.35 {
				nv = 0.035
			}
			if i == benchPointsN*2/5 || i == benchPointsN*3/5 {
				mark = "bank"
			}
			fmt.Fprintf(&b, "%.3f,%.3f,%g,%s\n", x, z, nv, mark)
		}
		if err := os.WriteFile(filepath.Join(dir, fmt.Sprintf("xs%05d.csv", k)), []byte(b.String()), 0o644); err != nil {
			tb.Fatal(err)
		}
	}
}

// BenchmarkBatch rates 10 000 sections of 500 points at 201 stages on all
// cores. "read" only reads and checks the surveys (parse, validate,
// compile); "rate" reads and rates them (no output); "rate+write" is the
// whole command writing a folder of tables and an index. Reported:
// section-stages per second per core, and for rate the ratio of compute
// time (rate minus read) to read time.
func BenchmarkBatch(b *testing.B) {
	dir := b.TempDir()
	in := filepath.Join(dir, "in")
	if err := os.Mkdir(in, 0o755); err != nil {
		b.Fatal(err)
	}
	writeBenchSurveys(b, in, benchSections)
	jobs, _, err := batch.List([]string{in}, "", "csv")
	if err != nil {
		b.Fatal(err)
	}
	opt := batch.Options{Stages: rating.StageSpec{From: 100, To: 105, FromSet: true, ToSet: true, Step: 0.025}, Rating: rating.Options{Slope: 0.001}}
	cores := float64(runtime.GOMAXPROCS(0))
	pool := func(opt batch.Options) time.Duration {
		start := time.Now()
		err := batch.Run(context.Background(), jobs, opt, func(i int, r batch.Result) error {
			if r.Entry.Err != "" {
				return fmt.Errorf("%s: %s", r.Entry.Section, r.Entry.Err)
			}
			if !opt.ReadOnly && r.Entry.Rows != benchStages {
				return fmt.Errorf("%s: %d rows", r.Entry.Section, r.Entry.Rows)
			}
			return nil
		})
		if err != nil {
			b.Fatal(err)
		}
		return time.Since(start)
	}
	perCore := func(b *testing.B, d time.Duration) {
		b.ReportMetric(benchSections*benchStages/d.Seconds()/cores, "section-stages/s/core")
	}
	readOnly := opt
	readOnly.ReadOnly = true
	b.Run("read", func(b *testing.B) {
		var d time.Duration
		for b.Loop() {
			d = pool(readOnly)
		}
		perCore(b, d)
	})
	b.Run("rate", func(b *testing.B) {
		var read, rated time.Duration
		for b.Loop() {
			read = pool(readOnly)
			rated = pool(opt)
		}
		perCore(b, rated)
		b.ReportMetric((rated-read).Seconds()/read.Seconds(), "compute/read")
	})
	b.Run("rate+write", func(b *testing.B) {
		var d time.Duration
		for b.Loop() {
			start := time.Now()
			files := output.New()
			sum, err := batch.Folder(context.Background(), files, filepath.Join(dir, "out"), "csv", jobs, opt)
			if err == nil {
				err = sum.Err("")
			}
			if err == nil {
				err = files.Commit()
			}
			if err != nil {
				b.Fatal(err)
			}
			d = time.Since(start)
		}
		perCore(b, d)
	})
}

// BenchmarkAllSheets reads and rates every sheet of an invented workbook
// of 300 (and 1200) small surveys, 11 points each, at 41 stages, as
// `rate BOOK --all-sheets` does: listing the sheets, then rating each.
// Reading a workbook once for all its sheets keeps the time linear in
// the number of sheets.
func BenchmarkAllSheets(b *testing.B) {
	for _, n := range []int{300, 1200} {
		b.Run(fmt.Sprintf("sheets=%d", n), func(b *testing.B) { benchAllSheets(b, n) })
	}
}

func benchAllSheets(b *testing.B, benchSheets int) {
	path := filepath.Join(b.TempDir(), "sheets.xlsx")
	f := excelize.NewFile()
	for k := 0; k < benchSheets; k++ {
		name := fmt.Sprintf("XS%03d", k+1)
		if k == 0 {
			if err := f.SetSheetName("Sheet1", name); err != nil {
				b.Fatal(err)
			}
		} else if _, err := f.NewSheet(name); err != nil {
			b.Fatal(err)
		}
		rows := [][]any{{"station", "elevation", "n"}}
		for i := 0; i <= 10; i++ {
			x := float64(i) * 6
			u := (x - 30) / 30
			rows = append(rows, []any{x, 100.2 + 4.8*u*u + 0.01*float64(k%7), 0.04})
		}
		for r, row := range rows {
			cell, _ := excelize.CoordinatesToCellName(1, r+1)
			if err := f.SetSheetRow(name, cell, &row); err != nil {
				b.Fatal(err)
			}
		}
	}
	if err := f.SaveAs(path); err != nil {
		b.Fatal(err)
	}
	opt := batch.Options{Stages: rating.StageSpec{From: 100.5, To: 104.5, FromSet: true, ToSet: true, Step: 0.1}, Rating: rating.Options{Slope: 0.001}}
	for b.Loop() {
		jobs, _, err := batch.List([]string{path}, "", "csv")
		if err != nil {
			b.Fatal(err)
		}
		if len(jobs) != benchSheets {
			b.Fatalf("%d jobs, want %d", len(jobs), benchSheets)
		}
		err = batch.Run(context.Background(), jobs, opt, func(i int, r batch.Result) error {
			if r.Entry.Err != "" {
				return fmt.Errorf("%s: %s", r.Entry.Section, r.Entry.Err)
			}
			return nil
		})
		if err != nil {
			b.Fatal(err)
		}
	}
}
