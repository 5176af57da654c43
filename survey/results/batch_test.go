package results

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
)

func TestWriteIndexCSV(t *testing.T) {
	var b strings.Builder
	nan := math.NaN()
	err := WriteIndexCSV(&b, []IndexEntry{
		{Section: "XS-1", Source: "a.csv", Output: "XS-1.csv", Rows: 3, StageMin: 1, StageMax: 2.5,
			BankfullStage: 2, BankfullDischarge: 12.5, Warnings: []string{"w1", "w, 2"}},
		{Section: "XS-2", Source: "b.csv", StageMin: nan, StageMax: nan, BankfullStage: nan, BankfullDischarge: nan,
			Err: "b.csv:3:2: elevation \"x\": not a number"},
		// Stages of a high site are written to the 4 decimals of its rating
		// table, not cut to six figures (1234.57); a discharge keeps six.
		{Section: "XS-3", Source: "c.csv", Output: "XS-3.csv", Rows: 2, StageMin: 1234.5678, StageMax: 1236.1234,
			BankfullStage: 1235.5001, BankfullDischarge: 123.45678},
	})
	if err != nil {
		t.Fatal(err)
	}
	want := "section,source,output,rows,stage_min,stage_max,bankfull_stage,bankfull_discharge,warnings,error\n" +
		"XS-1,a.csv,XS-1.csv,3,1,2.5,2,12.5,\"w1 | w, 2\",\n" +
		"XS-2,b.csv,,0,,,,,,\"b.csv:3:2: elevation \"\"x\"\": not a number\"\n" +
		"XS-3,c.csv,XS-3.csv,2,1234.5678,1236.1234,1235.5001,123.457,,\n"
	if b.String() != want {
		t.Errorf("got\n%s\nwant\n%s", b.String(), want)
	}
}

func TestLongRatingWriter(t *testing.T) {
	p, err := subdivide.Compile(subdivide.Section{
		Points:    []subdivide.Point{{Station: 0, Elevation: 2}, {Station: 2, Elevation: 0}, {Station: 4, Elevation: 2}},
		NByRegion: subdivide.PerRegion{Channel: 0.03},
	})
	if err != nil {
		t.Fatal(err)
	}
	// Stage 3 is above both ends (at 2): its row is flagged above_end.
	tab, err := rating.Compute(p, []float64{0, 1, 3}, rating.Options{Slope: 0.001})
	if err != nil {
		t.Fatal(err)
	}
	var b strings.Builder
	l := NewLongRatingWriter(&b)
	if err := l.Write("a,b", tab); err != nil {
		t.Fatal(err)
	}
	if err := l.Write("c", tab); err != nil {
		t.Fatal(err)
	}
	if err := l.Flush(); err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(b.String()), "\n")
	if len(lines) != 7 || !strings.HasPrefix(lines[0], "section,stage,depth,area,") || !strings.HasSuffix(lines[0], ",flags") ||
		!strings.HasPrefix(lines[1], "\"a,b\",0,0,0,") || !strings.HasPrefix(lines[5], "c,1,1,1,") ||
		!strings.HasSuffix(lines[3], ",above_end") || !strings.HasSuffix(lines[6], ",above_end") || !strings.HasSuffix(lines[2], ",") {
		t.Errorf("long table:\n%s", b.String())
	}
	if n := strings.Count(lines[0], ","); n != len(RatingColumns())+len(ExtraRatingColumns())+1 {
		t.Errorf("%d commas in the header, want %d", n, len(RatingColumns())+len(ExtraRatingColumns())+1)
	}
}

// The batch summary counts rated, failed and skipped sections, lists the
// failed ones with their errors, the rated ones' warnings and the skipped
// ones with their notes (each at most MaxListed, then how many more, the
// warnings pointing at the index that holds them all), and ends with the
// caution; the index writes a skipped section's note first among its
// warnings.
func TestBatchSummaryAndSkipped(t *testing.T) {
	nan := math.NaN()
	entry := func(name, err, skipped string) IndexEntry {
		return IndexEntry{Section: name, Source: name + ".csv", StageMin: nan, StageMax: nan, BankfullStage: nan, BankfullDischarge: nan,
			Err: err, Skipped: skipped, Warnings: []string{"w"}}
	}
	entries := []IndexEntry{entry("XS-1", "", ""), entry("XS-2", "", "blank"), entry("XS-3", "bad cell", "")}
	var b strings.Builder
	if err := WriteBatchSummary(&b, entries, "out", "out/index.csv"); err != nil {
		t.Fatal(err)
	}
	want := "rated 1 of 3 sections into out; 1 skipped\nfailed: XS-3: bad cell\nwarning: XS-1: w\nskipped: XS-2: blank\ncaution: " + rating.Caution + "\n"
	if b.String() != want {
		t.Errorf("summary\n%s\nwant\n%s", b.String(), want)
	}
	// The rated sections' warnings are listed, one a line, with an index
	// or without (one long table); failed and skipped sections' are not.
	b.Reset()
	entries[0].Warnings = []string{"w1", "w2"}
	if err := WriteBatchSummary(&b, entries, "out", ""); err != nil {
		t.Fatal(err)
	}
	want = "rated 1 of 3 sections into out; 1 skipped\nfailed: XS-3: bad cell\nwarning: XS-1: w1\nwarning: XS-1: w2\nskipped: XS-2: blank\ncaution: " + rating.Caution + "\n"
	if b.String() != want {
		t.Errorf("summary with warnings\n%s\nwant\n%s", b.String(), want)
	}
	entries[0].Warnings = []string{"w"}
	b.Reset()
	var many []IndexEntry
	for i := range MaxListed + 3 {
		many = append(many, entry(fmt.Sprintf("s%d", i), "bad", ""))
	}
	if err := WriteBatchSummary(&b, many, "out", "out/index.csv"); err != nil {
		t.Fatal(err)
	}
	if n := strings.Count(b.String(), "failed: s"); n != MaxListed || !strings.Contains(b.String(), "failed: and 3 more\n") {
		t.Errorf("%d failed listed:\n%s", n, b.String())
	}
	for i := range many {
		many[i].Err = ""
	}
	b.Reset()
	if err := WriteBatchSummary(&b, many, "out", "out/index.csv"); err != nil {
		t.Fatal(err)
	}
	if n := strings.Count(b.String(), "warning: s"); n != MaxListed ||
		!strings.Contains(b.String(), "warning: and 3 more, every one in the warnings column of out/index.csv\n") {
		t.Errorf("%d warnings listed:\n%s", n, b.String())
	}
	b.Reset()
	if err := WriteIndexCSV(&b, entries[1:2]); err != nil {
		t.Fatal(err)
	}
	if want := "XS-2,XS-2.csv,,0,,,,,skipped: blank | w,\n"; !strings.HasSuffix(b.String(), want) {
		t.Errorf("index row %q, want %q", b.String(), want)
	}
}

// Text tables and rating sheets show stages and depths to three decimals,
// or to as many as the stages need (up to LengthDecimals, as the CSV
// writes them), so that stages 0.0005 apart do not read alike.
func TestStageDecimalsShown(t *testing.T) {
	p, err := subdivide.Compile(subdivide.Section{
		Points:    []subdivide.Point{{Station: 0, Elevation: 2}, {Station: 2, Elevation: 0}, {Station: 4, Elevation: 2}},
		NByRegion: subdivide.PerRegion{Channel: 0.03},
	})
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		stages []float64
		want   []string // the stages as the text table shows them
		format string   // the rating sheet's stage format
	}{
		{[]float64{1, 1.1, 1.25}, []string{"1.000", "1.100", "1.250"}, "0.000"},
		{[]float64{1, 1.0005, 1.001}, []string{"1.0000", "1.0005", "1.0010"}, "0.0000"},
	} {
		tab, err := rating.Compute(p, tc.stages, rating.Options{Slope: 0.001})
		if err != nil {
			t.Fatal(err)
		}
		var b strings.Builder
		writeMainColumnsText(&b, tab)
		lines := strings.Split(strings.TrimSpace(b.String()), "\n")[2:]
		for i, l := range lines {
			if got := strings.Fields(l)[0]; got != tc.want[i] {
				t.Errorf("stages %v row %d shows %q, want %q", tc.stages, i, got, tc.want[i])
			}
		}
		if got := RatingSheetColumns(tab)[0].Format; got != tc.format {
			t.Errorf("stages %v: sheet format %q, want %q", tc.stages, got, tc.format)
		}
	}
}

// TestWriteBatchFailures lists every failed section, beyond MaxListed,
// one line each, and no rated or skipped one.
func TestWriteBatchFailures(t *testing.T) {
	var entries []IndexEntry
	for i := range MaxListed + 3 {
		entries = append(entries, IndexEntry{Section: fmt.Sprintf("s%d", i), Err: "x.csv:5:2: not a number"})
	}
	entries = append(entries, IndexEntry{Section: "ok"}, IndexEntry{Section: "blank", Skipped: "blank"})
	var b strings.Builder
	if err := WriteBatchFailures(&b, entries); err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSuffix(b.String(), "\n"), "\n")
	if len(lines) != MaxListed+3 || lines[0] != "failed: s0: x.csv:5:2: not a number" || strings.Contains(b.String(), "ok") {
		t.Errorf("listed:\n%s", b.String())
	}
}

// The long table writes stages and depths as the rating CSV does, to 4
// decimals: a stage of 1234.5678 m on a high site reads 1234.5678, not
// 1234.57 (six figures), which two stages 0.001 apart would share.
func TestLongRatingWriterStages(t *testing.T) {
	p, err := subdivide.Compile(subdivide.Section{
		Points:    []subdivide.Point{{Station: 0, Elevation: 1236}, {Station: 2, Elevation: 1234}, {Station: 4, Elevation: 1236}},
		NByRegion: subdivide.PerRegion{Channel: 0.03},
	})
	if err != nil {
		t.Fatal(err)
	}
	tab, err := rating.Compute(p, []float64{1234.5678, 1234.5688}, rating.Options{Slope: 0.001})
	if err != nil {
		t.Fatal(err)
	}
	var long, one strings.Builder
	l := NewLongRatingWriter(&long)
	if err := l.Write("x", tab); err != nil {
		t.Fatal(err)
	}
	if err := l.Flush(); err != nil {
		t.Fatal(err)
	}
	if err := WriteRatingCSV(&one, rating.RatingReport{Table: tab}); err != nil {
		t.Fatal(err)
	}
	lines, want := strings.Split(long.String(), "\n"), strings.Split(one.String(), "\n")
	for i, w := range []string{"x,1234.5678,0.5678,", "x,1234.5688,0.5688,"} {
		if !strings.HasPrefix(lines[i+1], w) {
			t.Errorf("row %d %q, want it to begin %q", i+1, lines[i+1], w)
		}
		// The same figures as the section's own table, column for column.
		if got, w := strings.Split(lines[i+1], ",")[1:4], strings.Split(want[i+1], ",")[:3]; fmt.Sprint(got) != fmt.Sprint(w) {
			t.Errorf("row %d: %q, the rating CSV %q", i+1, got, w)
		}
	}
}
