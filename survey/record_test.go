package survey

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"wetline/rating"
	"wetline/rating/record"
	"wetline/subdivide"
)

func utcUnix(y int, m time.Month, d, hh, mm, ss int) int64 {
	return time.Date(y, m, d, hh, mm, ss, 0, time.UTC).Unix()
}

func TestParseStageRecord(t *testing.T) {
	const in = "\ufeff# logger 7, Tallow Creek\r\n" +
		"Time,Stage (m),Quality,battery\r\n" +
		"2024-05-01T00:00Z,0.512,,12.1\r\n" +
		"\r\n" +
		"2024-05-01 00:15:00Z, 0.515 ,ice,12.1\r\n" +
		"\"2024-05-01T10:30+10:00\",\"0.52\",\"ice, partial\",12.0\r\n" +
		"2024-05-01T00:45:00.000Z,,,\r\n" +
		"2024-05-01T01:00+00:00,0.53,estimated,\r\n"
	r, err := ParseStageRecord(strings.NewReader(in), "s.csv", StageRecordOptions{})
	if err != nil {
		t.Fatal(err)
	}
	st := r.Stages
	want := []int64{utcUnix(2024, 5, 1, 0, 0, 0), utcUnix(2024, 5, 1, 0, 15, 0), utcUnix(2024, 5, 1, 0, 30, 0), utcUnix(2024, 5, 1, 1, 0, 0)}
	if fmt.Sprint(st.Time) != fmt.Sprint(want) || fmt.Sprint(st.Stage) != "[0.512 0.515 0.52 0.53]" {
		t.Errorf("times %v stages %v", st.Time, st.Stage)
	}
	if q := []string{st.QualityOf(0), st.QualityOf(1), st.QualityOf(2), st.QualityOf(3)}; strings.Join(q, "|") != "|ice|ice, partial|estimated" {
		t.Errorf("qualities %q", q)
	}
	if r.Blank != 1 || len(r.Warnings) != 1 || st.Validate() != nil {
		t.Errorf("blank %d warnings %q", r.Blank, r.Warnings)
	}
	// Times without an offset are at the offset given; times with one keep
	// their instant.
	for _, tc := range []struct {
		in   string
		want []int64
	}{
		{"time,gauge_height\n2024-05-01T10:00,1\n2024-05-01T10:15,1\n", []int64{utcUnix(2024, 5, 1, 0, 0, 0), utcUnix(2024, 5, 1, 0, 15, 0)}},
		{"time,gauge_height\n2024-05-01T10:00Z,1\n2024-05-01T10:15+00:00,1\n", []int64{utcUnix(2024, 5, 1, 10, 0, 0), utcUnix(2024, 5, 1, 10, 15, 0)}},
	} {
		r, err = ParseStageRecord(strings.NewReader(tc.in), "s.csv", StageRecordOptions{UTCOffset: 10 * time.Hour})
		if err != nil {
			t.Fatal(err)
		}
		if fmt.Sprint(r.Stages.Time) != fmt.Sprint(tc.want) || r.Stages.Quality != nil {
			t.Errorf("%q: times %v, want %v", tc.in, r.Stages.Time, tc.want)
		}
	}
}

// Bad stage records: each error names file:row:column and, for times out
// of order, the row before.
func TestParseStageRecordErrors(t *testing.T) {
	const head = "time,stage\n"
	for _, tc := range []struct {
		name, in string
		want     []string
		is       error
	}{
		{"bad time", head + "2024-05-01T00:00,1\n2024-13-01T00:15,1\n", []string{"s.csv:3:1", `time "2024-13-01T00:15"`}, ErrISOTime},
		{"repeated", head + "2024-05-01T00:00Z,1\n2024-05-01T10:00+10:00,1\n", []string{"s.csv:3:1", "row 2"}, ErrRepeatedTime},
		{"unsorted", head + "2024-05-01T00:30,1\n2024-05-01T00:15,1\n", []string{"s.csv:3:1", "before 2024-05-01T00:30:00Z, the time of row 2"}, ErrTimeOrder},
		{"unsorted after a comment", head + "2024-05-01T00:30,1\n# moved\n\n2024-05-01T00:15,1\n", []string{"s.csv:5:1", "row 2"}, ErrTimeOrder},
		{"decimal comma", head + "2024-05-01T00:30,\"1,5\"\n", []string{"s.csv:2:2", `stage "1,5"`}, ErrDecimalComma},
		{"not a number", head + "2024-05-01T00:30,abc\n", []string{"s.csv:2:2"}, ErrNotNumber},
		{"infinite", head + "2024-05-01T00:30,1e999\n", []string{"s.csv:2:2"}, subdivide.ErrNotFinite},
		{"blank time", head + ",1\n", []string{"s.csv:2:1", "blank"}, ErrBlankTime},
		{"sub-second", head + "2024-05-01T00:30:00.5Z,1\n", []string{"s.csv:2:1"}, ErrSubSecond},
		{"serial in CSV", head + "45000.5,1\n", []string{"s.csv:2:1"}, ErrSerialInCSV},
		{"no stage column", "time,level\n2024-05-01,1\n", []string{"s.csv:1", "stage"}, ErrMissingColumn},
		{"semicolons", "time;stage\n2024-05-01;1\n", []string{"s.csv:1"}, ErrSemicolon},
		{"no rows", head + "# nothing\n", []string{"no data rows"}, ErrEmpty},
		{"only blank stages", head + "2024-05-01,\n", []string{"no data rows: the stage of its one row with a time is blank"}, ErrEmpty},
		{"bare quote", head + "2024-05-01,1\"2\n", []string{"s.csv:2:"}, csv.ErrBareQuote},
		{"duplicate stage column", "time,stage,Stage (m)\n2024-05-01,1,2\n", []string{"s.csv:1:3", "the header names this column twice (also column 2)"}, ErrDuplicateColumn},
		{"duplicate time column", "time,stage,time\n2024-05-01,1,2024-05-02\n", []string{"s.csv:1:3", "(also column 1)"}, ErrDuplicateColumn},
		{"huge stage", head + "2024-05-01T00:00,1\n2024-05-01T00:15,1e308\n", []string{"s.csv:3:2", "stage 1e+308 is not a plausible value (beyond ±100000)"}, ErrImplausible},
		{"huge negative stage", head + "2024-05-01T00:00,-100001\n", []string{"s.csv:2:2"}, ErrImplausible},
		{"two bad rows", head + "x,1\n2024-05-01,y\n", []string{"s.csv:2:1", "s.csv:3:2"}, ErrISOTime},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParseStageRecord(strings.NewReader(tc.in), "s.csv", StageRecordOptions{})
			if err == nil {
				t.Fatal("no error")
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not say %q", err, w)
				}
			}
			if !errors.Is(err, tc.is) {
				t.Errorf("error %q is not %v", err, tc.is)
			}
		})
	}
	// Times read at an offset are quoted at it; a step back of an hour or
	// less in times written without an offset is told as a clock set back.
	dst := head + "2025-04-06T02:45,1\n2025-04-06T02:00,1\n"
	_, err0 := ParseStageRecord(strings.NewReader(dst), "s.csv", StageRecordOptions{UTCOffset: 10 * time.Hour})
	if !errors.Is(err0, ErrTimeOrder) || !strings.Contains(err0.Error(), "2025-04-06T02:00:00+10:00 is before 2025-04-06T02:45:00+10:00, the time of row 2 (a clock set back an hour") {
		t.Errorf("clock set back: %v", err0)
	}
	// A file of many bad rows reports MaxReported and counts the rest.
	var b strings.Builder
	b.WriteString(head)
	for i := range 100 {
		fmt.Fprintf(&b, "2024-05-01T%02d:%02d,bad\n", i/60, i%60)
	}
	_, err := ParseStageRecord(strings.NewReader(b.String()), "s.csv", StageRecordOptions{})
	if err == nil || !strings.Contains(err.Error(), "80 more errors not shown") || strings.Count(err.Error(), "\n") != MaxReported {
		t.Errorf("many errors: %v", err)
	}
	if _, err := ParseStageRecord(strings.NewReader(head), "s.csv", StageRecordOptions{UTCOffset: 15 * time.Hour}); !errors.Is(err, record.ErrUTCOffset) {
		t.Errorf("offset 15 h: %v", err)
	}
}

// A stage record in a workbook: date serials (at the offset given) and
// text times, errors as cell references.
func TestReadStageRecordWorkbook(t *testing.T) {
	path := filepath.Join(t.TempDir(), "stage.xlsx")
	wb := excelize.NewFile()
	rows := [][]any{
		{"time", "stage (m)", "quality"},
		{45413.0, 0.51, ""},           // 2024-05-01 00:00 local
		{45413.25, 0.55, "E"},         // 06:00
		{"2024-05-01T14:00", 0.6, ""}, // text at the same offset
	}
	for i, r := range rows {
		cell, _ := excelize.CoordinatesToCellName(1, i+1)
		if err := wb.SetSheetRow("Sheet1", cell, &r); err != nil {
			t.Fatal(err)
		}
	}
	if err := wb.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	r, err := ReadStageRecord(path, StageRecordOptions{UTCOffset: 2 * time.Hour})
	if err != nil {
		t.Fatal(err)
	}
	want := []int64{utcUnix(2024, 4, 30, 22, 0, 0), utcUnix(2024, 5, 1, 4, 0, 0), utcUnix(2024, 5, 1, 12, 0, 0)}
	if fmt.Sprint(r.Stages.Time) != fmt.Sprint(want) || r.Stages.QualityOf(1) != "E" || r.Sheet != "Sheet1" {
		t.Errorf("times %v, quality %q", r.Stages.Time, r.Stages.QualityOf(1))
	}
	if err := wb.SetCellValue("Sheet1", "B3", "x"); err != nil {
		t.Fatal(err)
	}
	if err := wb.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	if _, err := ReadStageRecord(path, StageRecordOptions{}); err == nil || !strings.Contains(err.Error(), "stage.xlsx['Sheet1']!B3") {
		t.Errorf("bad cell in a workbook: %v", err)
	}
}

// TestParseISOTime checks the hand-written parser against the standard
// library's time.Date on written-out cases.
func TestParseISOTime(t *testing.T) {
	for _, tc := range []struct {
		in   string
		off  time.Duration
		want time.Time
		is   error
	}{
		{"2024-03-05", 0, time.Date(2024, 3, 5, 0, 0, 0, 0, time.UTC), nil},
		{"2024-03-05T14:30", 0, time.Date(2024, 3, 5, 14, 30, 0, 0, time.UTC), nil},
		{"2024-03-05 14:30:15", 0, time.Date(2024, 3, 5, 14, 30, 15, 0, time.UTC), nil},
		{"2024-03-05t14:30:15z", 0, time.Date(2024, 3, 5, 14, 30, 15, 0, time.UTC), nil},
		{"2024-03-05T14:30+10:00", 0, time.Date(2024, 3, 5, 4, 30, 0, 0, time.UTC), nil},
		{"2024-03-05T14:30:00-0530", 0, time.Date(2024, 3, 5, 20, 0, 0, 0, time.UTC), nil},
		{"2024-03-05T14:30-05", 0, time.Date(2024, 3, 5, 19, 30, 0, 0, time.UTC), nil},
		{"2024-03-05T14:30", -5 * time.Hour, time.Date(2024, 3, 5, 19, 30, 0, 0, time.UTC), nil},
		{"2024-03-05", 10 * time.Hour, time.Date(2024, 3, 4, 14, 0, 0, 0, time.UTC), nil},
		{"2024-02-29T23:59:59,000", 0, time.Date(2024, 2, 29, 23, 59, 59, 0, time.UTC), nil},
		{"1899-12-31T23:00Z", 0, time.Date(1899, 12, 31, 23, 0, 0, 0, time.UTC), nil},
		{"2023-02-29", 0, time.Time{}, ErrISOTime},
		{"2024-03-05T24:00", 0, time.Time{}, ErrISOTime},
		{"2024-03-05T14:60", 0, time.Time{}, ErrISOTime},
		{"2024-03-05T14:30:00.25", 0, time.Time{}, ErrSubSecond},
		{"2024-03-05T14", 0, time.Time{}, ErrISOTime},
		{"2024-03-05T14:30+1:00", 0, time.Time{}, ErrISOTime},
		{"2024-03-05T14:30 +10:00", 0, time.Time{}, ErrISOTime},
		{"05/03/2024", 0, time.Time{}, ErrISOTime},
		{"2024-3-5", 0, time.Time{}, ErrISOTime},
	} {
		got, err := ParseISOTime(tc.in, tc.off)
		if !errors.Is(err, tc.is) || tc.is == nil && !got.Equal(tc.want) {
			t.Errorf("%q (offset %v): %v, %v; want %v, %v", tc.in, tc.off, got, err, tc.want, tc.is)
		}
	}
}

// TestParseDecimal: the fast path gives what ParseNumber gives, bit for bit.
func TestParseDecimal(t *testing.T) {
	for _, s := range []string{"0", "-0", "1", "0.1", "0.3", "123.456", "-7.25", "+3.5", ".5", "5.", "999999999999999", "0.000000000000001",
		"1234567890.12345", "12345678901234567", "0.1234567890123456789", "1e3", "abc", "", ".", "-", "1,5", "NaN", "Inf", "0x1p3", "1.2.3"} {
		want, werr := ParseNumber(s)
		got, gerr := parseDecimal([]byte(s))
		if (werr == nil) != (gerr == nil) || !errors.Is(gerr, werr) || math.Float64bits(got) != math.Float64bits(want) && werr == nil {
			t.Errorf("%q: %v, %v; ParseNumber %v, %v", s, got, gerr, want, werr)
		}
	}
}

// readAllCSV reads CSV text the way ParseCSV does (text that is not a
// UTF-8 table refused, encoding/csv with the same settings, blank records
// skipped, fields trimmed), for comparison.
func readAllCSV(in string) ([][]string, []int, error) {
	data := []byte(strings.TrimPrefix(in, "\ufeff"))
	if err := sniffText(data, "x.csv"); err != nil {
		return nil, nil, err
	}
	data, err := dropSeparatorHint(data, "x.csv")
	if err != nil {
		return nil, nil, err
	}
	cr := csv.NewReader(bytes.NewReader(data))
	cr.Comment = '#'
	cr.FieldsPerRecord = -1
	cr.TrimLeadingSpace = true
	var recs [][]string
	var lines []int
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			return recs, lines, nil
		}
		if err != nil {
			return nil, nil, err
		}
		rec = trimAll(rec)
		if blank(rec) {
			continue
		}
		line, _ := cr.FieldPos(0)
		recs, lines = append(recs, rec), append(lines, line)
	}
}

// streamAll reads CSV text with csvStream.
func streamAll(in string) ([][]string, []int, error) {
	cs := newCSVStream(strings.NewReader(in), "x.csv")
	var recs [][]string
	var lines []int
	for {
		f, line, err := cs.next()
		if err == io.EOF {
			return recs, lines, nil
		}
		if err != nil {
			return nil, nil, err
		}
		rec := make([]string, len(f))
		for i, b := range f {
			rec[i] = string(b)
		}
		recs, lines = append(recs, rec), append(lines, line)
	}
}

// checkStreamMatches fails unless csvStream reads in as encoding/csv does
// (the reference): the same records on the same lines, or an error for
// both.
func checkStreamMatches(t *testing.T, in string) {
	t.Helper()
	want, wl, werr := readAllCSV(in)
	got, gl, gerr := streamAll(in)
	if (werr == nil) != (gerr == nil) {
		t.Fatalf("%q: stream error %v, encoding/csv error %v", in, gerr, werr)
	}
	if werr == nil && (fmt.Sprintf("%q", got) != fmt.Sprintf("%q", want) || fmt.Sprint(gl) != fmt.Sprint(wl)) {
		t.Fatalf("%q:\nstream %q at %v\ncsv    %q at %v", in, got, gl, want, wl)
	}
}

func TestCSVStreamMatchesEncodingCSV(t *testing.T) {
	for _, in := range []string{
		"a,b\n1,2\n",
		"a,b\r\n1,2\r\n\r\n3,4",
		"\ufeffa,b\n# c\n1,2\n",
		"a,b\n\"1\n2\",3\n4,5\n",
		"a,b\n \"x\",\" y \"\n",
		"a,b\n\"x\"\"y\",z\n",
		"a\n\"unterminated\n",
		"a\nb\"c\n",
		"a,b\n\"x\"y,z\n",
		"a,b\n  ,  \n1,\n",
		"a,b\n1,2\r",
		"#only a comment",
		"a,b\n\"#x\",1\n#\"\n",
		"a\n\"1\n#2\"\n",
		"sep=,\na,b\n1,2\n",
		"sep=,\r\na,b\r\n",
		"sep=;\na;b\n",
		"\ufeffsep=,\na,b\n",
		"a,b\nsep=,\n",
		"a,b\n1,2\xb0\n",
		"a,b\n\"1\n\xe9\",3\n",
		"# caf\xe9\na,b\n",
		"a,b\r1,2\r",
		"a\tb\n1\t2\n",
		"\xff\xfea\x00",
	} {
		checkStreamMatches(t, in)
	}
}

// The site keys above a stage record's header are read as every table's
// are: "# key: value" comment lines of CSV (a comment below the header is
// no key), key rows of a sheet.
func TestStageRecordSite(t *testing.T) {
	const in = "# site: Fernbrook at Old Weir\n# Site-ID: FB-1\n# a note\ntime,stage\n# site: not this\n2024-05-01T00:00,1\n"
	r, err := ParseStageRecord(strings.NewReader(in), "s.csv", StageRecordOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if want := (rating.Site{Name: "Fernbrook at Old Weir", ID: "FB-1"}); r.Site != want || r.Stages.Len() != 1 {
		t.Errorf("site %+v, want %+v (%d readings)", r.Site, want, r.Stages.Len())
	}
	path := filepath.Join(t.TempDir(), "stage.xlsx")
	wb := excelize.NewFile()
	for i, row := range [][]any{{"site", "Fernbrook at Old Weir"}, {"crew:", "AB"}, {}, {"time", "stage"}, {"2024-05-01T00:00Z", 1.0}} {
		cell, _ := excelize.CoordinatesToCellName(1, i+1)
		if err := wb.SetSheetRow("Sheet1", cell, &row); err != nil {
			t.Fatal(err)
		}
	}
	if err := wb.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	if r, err = ReadStageRecord(path, StageRecordOptions{}); err != nil {
		t.Fatal(err)
	}
	if want := (rating.Site{Name: "Fernbrook at Old Weir", Crew: "AB"}); r.Site != want {
		t.Errorf("workbook site %+v, want %+v", r.Site, want)
	}
}

// TestStageRecordClockAhead: local times without offsets that skip the
// hour a clock set forward for daylight saving skips (15-minute readings
// 01:45 then 03:00) are warned of, as the repeated hour of a clock set
// back is refused; an outage of another length, a jump with an irregular
// interval after it, and times written with offsets are not, nor is one
// lost hourly reading unless the hour lost starts at 01:00, 02:00 or 03:00
// on a Sunday as written (when clocks are set forward, common practice;
// 2025-10-05 and 2025-03-30 are Sundays). The dates are invented.
func TestStageRecordClockAhead(t *testing.T) {
	rows := func(times ...string) string {
		var b strings.Builder
		b.WriteString("time,stage\n")
		for _, tm := range times {
			b.WriteString(tm + ",0.6\n")
		}
		return b.String()
	}
	hourly, err := os.ReadFile("testdata/hourly-one-missing.csv") // a Wednesday in July, 14:00 lost
	if err != nil {
		t.Fatal(err)
	}
	hourlyOneMissing := string(hourly)
	spring := rows("2025-10-05T01:15", "2025-10-05T01:30", "2025-10-05T01:45", "2025-10-05T03:00", "2025-10-05T03:15", "2025-10-05T03:30")
	for _, tc := range []struct {
		name string
		csv  string
		off  time.Duration
		want string // "" for no warning
	}{
		{"spring hour at +10:00", spring, 10 * time.Hour,
			"1 place where the times, written without a UTC offset and read at the one offset +10:00, jump ahead one hour more than the record's interval (the first from 2025-10-05T01:45:00+10:00 to 2025-10-05T03:00:00+10:00, row 5)"},
		{"spring hour read as UTC", spring, 0, "read as UTC, jump ahead"},
		{"hourly record", rows("2025-10-07T00:00", "2025-10-07T01:00", "2025-10-07T03:00", "2025-10-07T04:00"), 0, ""},
		{"hourly record on a Sunday", rows("2025-10-05T00:00", "2025-10-05T01:00", "2025-10-05T03:00", "2025-10-05T04:00"), 0,
			"(the first from 2025-10-05T01:00:00Z to 2025-10-05T03:00:00Z, row 4)"},
		{"hourly record on a Sunday at +10:00", rows("2025-10-05T00:00", "2025-10-05T01:00", "2025-10-05T03:00", "2025-10-05T04:00"), 10 * time.Hour, "jump ahead"},
		{"hour from 01:00 on a Sunday", rows("2025-03-29T23:00", "2025-03-30T00:00", "2025-03-30T02:00", "2025-03-30T03:00"), 0, "jump ahead"},
		{"hour from 03:00 on a Sunday", rows("2025-03-30T01:00", "2025-03-30T02:00", "2025-03-30T04:00", "2025-03-30T05:00"), 0, "jump ahead"},
		{"hour from 04:00 on a Sunday", rows("2025-03-30T02:00", "2025-03-30T03:00", "2025-03-30T05:00", "2025-03-30T06:00"), 0, ""},
		{"hour from midnight on a Sunday", rows("2025-03-29T22:00", "2025-03-29T23:00", "2025-03-30T01:00", "2025-03-30T02:00"), 0, ""},
		{"Sunday afternoon", rows("2024-07-14T12:00", "2024-07-14T13:00", "2024-07-14T15:00", "2024-07-14T16:00"), 0, ""},
		{"Sunday afternoon at +10:00", rows("2024-07-14T12:00", "2024-07-14T13:00", "2024-07-14T15:00", "2024-07-14T16:00"), 10 * time.Hour, ""},
		{"one reading lost", hourlyOneMissing, 0, ""},
		{"two-hour outage", rows("2025-10-05T01:15", "2025-10-05T01:30", "2025-10-05T01:45", "2025-10-05T04:00", "2025-10-05T04:15"), 10 * time.Hour, ""},
		{"irregular after", rows("2025-10-05T01:15", "2025-10-05T01:30", "2025-10-05T01:45", "2025-10-05T03:00", "2025-10-05T03:05"), 10 * time.Hour, ""},
		{"times with offsets", rows("2025-10-05T01:15+10:00", "2025-10-05T01:30+10:00", "2025-10-05T01:45+10:00", "2025-10-05T03:00+11:00",
			"2025-10-05T03:15+11:00", "2025-10-05T03:30+11:00"), 0, ""},
	} {
		sr, err := ParseStageRecord(strings.NewReader(tc.csv), "s.csv", StageRecordOptions{UTCOffset: tc.off})
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		got := strings.Join(sr.Warnings, "\n")
		if tc.want == "" && strings.Contains(got, "jump ahead") || tc.want != "" && !strings.Contains(got, tc.want) {
			t.Errorf("%s: warnings %q, want %q", tc.name, got, tc.want)
		}
	}
}

// TestOffsetsDiffer: a stage record and gaugings of which only one writes
// its times with a UTC offset are warned of, naming the file read as UTC
// and the offset to give; two files that agree are not. The readings are
// invented.
func TestOffsetsDiffer(t *testing.T) {
	stage := func(tm string) *StageRecord {
		sr, err := ParseStageRecord(strings.NewReader("time,stage\n"+tm+",0.6\n"), "stage.csv", StageRecordOptions{})
		if err != nil {
			t.Fatal(err)
		}
		return sr
	}
	gaugings := func(tm string) Gaugings {
		gs, err := ParseGaugings(strings.NewReader("time,stage,discharge\n"+tm+",0.6,1.2\n"), "gaugings.csv")
		if err != nil {
			t.Fatal(err)
		}
		return gs
	}
	for _, tc := range []struct {
		name, stage, gauging, want string
	}{
		{"stage without", "2025-02-02T13:00", "2025-02-02T13:00+10:00",
			"gaugings.csv writes its times with a UTC offset (the first +10:00) and stage.csv without one, read as UTC: if those are local times, give --utc-offset (such as --utc-offset +10:00)"},
		{"gaugings without", "2025-02-02T13:00-05:00", "2025-02-02T13:00", "stage.csv writes its times with a UTC offset (the first -05:00) and gaugings.csv without one"},
		{"gaugings without, stage in UTC", "2025-02-02T13:00Z", "2025-02-02T13:00",
			"stage.csv writes its times with a UTC offset (the first in UTC) and gaugings.csv without one, read as UTC: if those are local times, give their offset from UTC, as --utc-offset ±HH:MM"},
		{"both with", "2025-02-02T13:00+10:00", "2025-02-02T03:00Z", ""},
		{"both without", "2025-02-02T13:00", "2025-02-02T13:00", ""},
	} {
		got := OffsetsDiffer(stage(tc.stage), gaugings(tc.gauging))
		if tc.want == "" && got != "" || !strings.Contains(got, tc.want) {
			t.Errorf("%s: %q, want %q", tc.name, got, tc.want)
		}
	}
}

// TestStageRecordMissingQuality: a row with a time, a blank stage and a
// quality is a missing reading that keeps its quality
// (Stages.MissingQuality, one per missing reading, a blank quality none);
// a record without a quality column has none. The record is invented.
func TestStageRecordMissingQuality(t *testing.T) {
	t.Parallel()
	const in = "time,stage,quality\n2025-03-04T00:00Z,0.8,A\n2025-03-04T01:00Z,,A\n2025-03-04T02:00Z,,\n2025-03-04T03:00Z,,ice\n2025-03-04T04:00Z,0.9,A\n"
	r, err := ParseStageRecord(strings.NewReader(in), "miss.csv", StageRecordOptions{})
	if err != nil {
		t.Fatal(err)
	}
	st := r.Stages
	var got []string
	for _, q := range st.MissingQuality {
		got = append(got, st.Qualities[q])
	}
	if want := []string{"A", "", "ice"}; len(st.Missing) != 3 || !slices.Equal(got, want) || st.Validate() != nil {
		t.Errorf("%d missing readings with qualities %q (%v), want %q", len(st.Missing), got, st.Validate(), want)
	}
	if st.QualityOf(0) != "A" || st.QualityOf(1) != "A" {
		t.Errorf("qualities of the readings %q, %q", st.QualityOf(0), st.QualityOf(1))
	}
	r, err = ParseStageRecord(strings.NewReader("time,stage\n2025-03-04T00:00Z,0.8\n2025-03-04T01:00Z,\n"), "plain.csv", StageRecordOptions{})
	if err != nil || len(r.Stages.Missing) != 1 || r.Stages.MissingQuality != nil {
		t.Errorf("no quality column: %v, missing %v, qualities %v", err, r.Stages.Missing, r.Stages.MissingQuality)
	}
}
