package results_test

import (
	"archive/zip"
	"bytes"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"runtime"
	"runtime/debug"
	"runtime/metrics"
	"sync"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"wetline/rating"
	"wetline/subdivide"
	"wetline/survey/results"
	"wetline/survey/workbook"
)

// largeRows is the size of the large-table checks.
const largeRows = 100_000

// maxStreamHeap bounds the heap a streamed sheet may add while it is
// written, whatever its length: excelize keeps up to StreamChunkSize
// (16 MiB) of sheet XML in memory before spilling to a temporary file, and
// a bytes.Buffer grows by doubling, so about twice that plus the zip
// writer's buffers.
const maxStreamHeap = 3 * excelize.StreamChunkSize

// bigTable makes a synthetic table of n rows with three subsections
// (values are smooth functions of stage; the Subs slice is shared to keep
// the table itself small).
func bigTable(n int) rating.Table {
	subs := []subdivide.Subsection{
		{From: 0, To: 10, N: 0.05, Region: subdivide.LeftOverbank},
		{From: 10, To: 30, N: 0.035, Region: subdivide.Channel},
		{From: 30, To: 50, N: 0.06, Region: subdivide.RightOverbank},
	}
	t := rating.Table{Name: "synthetic", Slope: 0.001, Bottom: 0, Top: 5, Subsections: subs, Rows: make([]rating.Row, n)}
	subRows := make([]rating.SubRow, 3)
	for i, s := range subs {
		subRows[i] = rating.SubRow{SubWetted: subdivide.SubWetted{Subsection: s, Area: 3, WettedPerimeter: 4, TopWidth: 3.5},
			Conveyance: 100, Discharge: 3.2, Velocity: 1.1}
	}
	for i := range t.Rows {
		h := 5 * float64(i) / float64(n)
		q := 12 * math.Pow(h, 1.7)
		t.Rows[i] = rating.Row{Stage: h, Depth: h, Area: 20 * h, WettedPerimeter: 20 + 2*h, TopWidth: 20, HydraulicRadius: h,
			HydraulicDepth: h, Conveyance: q / 0.0316, Discharge: q, MeanVelocity: math.NaN(), Alpha: 1.1, Beta: 1.03,
			Froude: 0.4, ShearStress: 9.8 * h, Subs: subRows}
	}
	return t
}

// peakHeap runs f and returns the largest growth of heap objects seen
// while it ran, sampled every millisecond. The collector runs at
// GOGC=10 meanwhile, so that the figure is close to the live heap rather
// than to uncollected garbage.
func peakHeap(f func()) (peak uint64) {
	defer debug.SetGCPercent(debug.SetGCPercent(10))
	runtime.GC()
	sample := []metrics.Sample{{Name: "/memory/classes/heap/objects:bytes"}}
	read := func() uint64 {
		metrics.Read(sample)
		return sample[0].Value.Uint64()
	}
	base := read()
	done := make(chan struct{})
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		tick := time.NewTicker(time.Millisecond)
		defer tick.Stop()
		for {
			if v := read(); v > base && v-base > peak {
				peak = v - base
			}
			select {
			case <-done:
				return
			case <-tick.C:
			}
		}
	}()
	f()
	close(done)
	wg.Wait()
	return peak
}

// TestLargeRatingSheetBoundedMemory writes a 100 000-row rating sheet to a
// file and checks the heap it needed stays under maxStreamHeap.
func TestLargeRatingSheetBoundedMemory(t *testing.T) {
	if testing.Short() {
		t.Skip("writes a 100 000-row sheet")
	}
	if raceEnabled {
		t.Skip("the race detector's shadow memory inflates the heap; the bound holds for the program as built")
	}
	table := bigTable(largeRows)
	path := filepath.Join(t.TempDir(), "large.xlsx")
	var err error
	peak := peakHeap(func() {
		err = writeFile(path, func(w io.Writer) error {
			b := workbook.NewBook()
			defer b.Close()
			if err := results.WriteRatingSheet(b, "rating", table); err != nil {
				return err
			}
			return b.Write(w)
		})
	})
	if err != nil {
		t.Fatal(err)
	}
	st, _ := os.Stat(path)
	t.Logf("%d rows: file %.1f MB, peak heap growth %.1f MB", largeRows, float64(st.Size())/1e6, float64(peak)/1e6)
	if peak > maxStreamHeap {
		t.Errorf("peak heap growth %.1f MB, want under %.1f MB", float64(peak)/1e6, float64(maxStreamHeap)/1e6)
	}
	// The last row is there: find it in the sheet's XML without loading
	// the sheet.
	zr, err := zip.OpenReader(path)
	if err != nil {
		t.Fatal(err)
	}
	defer zr.Close()
	found := false
	for _, zf := range zr.File {
		if zf.Name != "xl/worksheets/sheet1.xml" {
			continue
		}
		rc, err := zf.Open()
		if err != nil {
			t.Fatal(err)
		}
		data, err := io.ReadAll(rc)
		rc.Close()
		if err != nil {
			t.Fatal(err)
		}
		found = bytes.Contains(data, []byte(fmt.Sprintf(`<row r="%d"`, largeRows+1)))
	}
	if !found {
		t.Errorf("row %d not found in the sheet", largeRows+1)
	}
}

// BenchmarkRatingWorkbook100k writes a whole results workbook (summary,
// 100 000-row rating sheet, 300 000-row subsection sheet) and reports the
// peak heap growth per workbook.
func BenchmarkRatingWorkbook100k(b *testing.B) {
	table := bigTable(largeRows)
	b.ReportAllocs()
	var peak uint64
	for b.Loop() {
		p := peakHeap(func() {
			if err := results.WriteRatingWorkbook(io.Discard, rating.RatingReport{Table: table}); err != nil {
				b.Fatal(err)
			}
		})
		peak = max(peak, p)
	}
	b.ReportMetric(float64(peak)/1e6, "peak-heap-MB")
}

// BenchmarkRatingSheet100k writes only the 100 000-row rating sheet.
func BenchmarkRatingSheet100k(b *testing.B) {
	table := bigTable(largeRows)
	b.ReportAllocs()
	var peak uint64
	for b.Loop() {
		p := peakHeap(func() {
			bk := workbook.NewBook()
			defer bk.Close()
			if err := results.WriteRatingSheet(bk, "rating", table); err != nil {
				b.Fatal(err)
			}
			if err := bk.Write(io.Discard); err != nil {
				b.Fatal(err)
			}
		})
		peak = max(peak, p)
	}
	b.ReportMetric(float64(peak)/1e6, "peak-heap-MB")
}
