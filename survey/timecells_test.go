package survey

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"wetline/rating/record"
)

// timeReader is a reader of a table whose first column holds times.
type timeReader struct {
	name string
	// header is the CSV header; the time is its first column.
	header string
	// row writes the line(s) of one time: the time's own line first.
	row  func(tm string) string
	read func(path string) error
}

// lines is the number of lines row writes.
func (r timeReader) lines() int { return strings.Count(r.row("t"), "\n") }

// timeReaders are the readers of times in files.
var timeReaders = []timeReader{
	{"stage record", "time,stage", func(tm string) string { return tm + ",0.5\n" },
		func(p string) error { _, err := ReadStageRecord(p, StageRecordOptions{}); return err }},
	{"stage record at +10:00", "time,stage", func(tm string) string { return tm + ",0.5\n" },
		func(p string) error {
			_, err := ReadStageRecord(p, StageRecordOptions{UTCOffset: 10 * time.Hour})
			return err
		}},
	{"gaugings", "time,stage,discharge", func(tm string) string { return tm + ",0.5,1\n" },
		func(p string) error { _, err := ReadGaugings(p, ""); return err }},
	{"gaugings at +10:00", "time,stage,discharge", func(tm string) string { return tm + ",0.5,1\n" },
		func(p string) error { _, err := ReadGaugingsAt(p, "", 10*time.Hour); return err }},
	{"shift diagrams", "time,stage,shift", func(tm string) string { return tm + ",0.5,0.1\n" },
		func(p string) error { _, err := ReadShiftDiagrams(p, ShiftTableOptions{}); return err }},
	{"rating periods", "valid_from,stage,discharge", func(tm string) string { return tm + ",0.5,0\n,1.0,3\n" },
		func(p string) error { _, err := ReadRatingTables(p, RatingTableOptions{}); return err }},
}

// writeTimes writes the file of reader r holding times, one row each.
func writeTimes(t *testing.T, dir string, r timeReader, times []string) string {
	t.Helper()
	var b strings.Builder
	b.WriteString(r.header + "\n")
	for _, tm := range times {
		b.WriteString(r.row(tm))
	}
	path := filepath.Join(dir, strings.ReplaceAll(r.name, " ", "-")+".csv")
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// checkCellError fails unless err is a single ParseError at row and
// column that is cause and says want.
func checkCellError(t *testing.T, err, cause error, row, col int, want string) {
	t.Helper()
	var pe *ParseError
	if !errors.Is(err, cause) || !errors.As(err, &pe) || pe.Row != row || pe.Column != col || !strings.Contains(err.Error(), want) {
		t.Errorf("%v; want %v at row %d column %d saying %q", err, cause, row, col, want)
	}
}

// Every time read from a file lies in the years MinYear to MaxYear, as
// written: a year outside is ErrYear at its cell. The bounds are the
// project's own choice; the years are compared as written, so
// 1800-01-01T00:00+14:00 (1799-12-31T10:00Z) is read.
func TestTimeYearBounds(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		tm   string
		want string // "" when read
	}{
		{"1800-01-01", ""},
		{"1800-01-01T00:00+14:00", ""},
		{"2200-12-31T23:59:59", ""},
		{"2200-12-31T23:59:59Z", ""},
		{"1799-12-31T23:59:59Z", "year 1799 is not a plausible year for a gauge record (1800 to 2200)"},
		{"2201-01-01", "year 2201"},
		{"0001-01-01T00:00", "year 1 "},
		{"9999-12-31T00:00-05:00", "year 9999"},
	} {
		for _, r := range timeReaders {
			t.Run(r.name+" "+tc.tm, func(t *testing.T) {
				t.Parallel()
				err := r.read(writeTimes(t, t.TempDir(), r, []string{tc.tm}))
				if tc.want == "" {
					if err != nil {
						t.Errorf("refused: %v", err)
					}
					return
				}
				checkCellError(t, err, ErrYear, 2, 1, tc.want)
			})
		}
	}
	for _, tc := range []struct {
		in   string
		want error
	}{
		{"0001-01-01", ErrYear}, {"1799-12-31T23:59:59Z", ErrYear}, {"2201-01-01T00:00+14:00", ErrYear},
		{"1800-01-01T00:00", nil}, {"2200-12-31 23:59:59Z", nil},
	} {
		if _, err := ParseISOTime(tc.in, 0); !errors.Is(err, tc.want) || (tc.want == nil) != (err == nil) {
			t.Errorf("ParseISOTime(%q): %v, want %v", tc.in, err, tc.want)
		}
		if _, err := ParseTime(tc.in, false, false); !errors.Is(err, tc.want) || (tc.want == nil) != (err == nil) {
			t.Errorf("ParseTime(%q): %v, want %v", tc.in, err, tc.want)
		}
	}
}

// dateSerial is the workbook date serial (1900 date system) of midnight
// UTC on a date after 1900-03-01: days from 1899-12-30, counted in Unix
// seconds (time.Time.Sub holds only 292 years).
func dateSerial(y int, m time.Month, d int) float64 {
	return float64((time.Date(y, m, d, 0, 0, 0, 0, time.UTC).Unix() - time.Date(1899, 12, 30, 0, 0, 0, 0, time.UTC).Unix()) / 86400)
}

// A workbook date serial stands for its date: one of a year beyond MaxYear
// is ErrYear at its cell, in the streamed stage record and in a table
// read whole (gaugings); 2200-12-31 is read.
func TestTimeYearBoundsSerial(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		serial float64
		bad    bool
	}{
		{dateSerial(2200, 12, 31), false},
		{dateSerial(2201, 1, 1), true},
	} {
		book := writeBook(t, t.TempDir(), map[string][][]any{
			"stage":     {{"time", "stage"}, {tc.serial, 0.5}},
			"gaugings":  {{"time", "stage", "discharge"}, {tc.serial, 0.5, 1}},
			"shifts":    {{"time", "stage", "shift"}, {tc.serial, 0.5, 0.1}},
			"ratings":   {{"valid_from", "stage", "discharge"}, {tc.serial, 0.5, 0}, {"", 1, 3}},
			"unrelated": {{"x"}},
		}, []string{"stage", "gaugings", "shifts", "ratings", "unrelated"})
		for name, read := range map[string]func() error{
			"stage record": func() error { _, err := ReadStageRecord(book, StageRecordOptions{Sheet: "stage"}); return err },
			"gaugings":     func() error { _, err := ReadGaugings(book, "gaugings"); return err },
			"shifts":       func() error { _, err := ReadShiftDiagrams(book, ShiftTableOptions{Sheet: "shifts"}); return err },
			"ratings":      func() error { _, err := ReadRatingTables(book, RatingTableOptions{Sheet: "ratings"}); return err },
		} {
			err := read()
			switch {
			case !tc.bad && err != nil:
				t.Errorf("%s, serial %g (2200-12-31): %v", name, tc.serial, err)
			case tc.bad:
				checkCellError(t, err, ErrYear, 2, 1, "year 2201")
			}
		}
	}
}

// The years MinYear to MaxYear, at any UTC offset, fit within
// record.MaxSpan: every record read can be computed, and its daily table
// holds at most the days of those years. 1800 to 2200 is 401 years with 97
// leap days (every fourth year but 1800, 1900, 2100 and 2200; Gregorian
// rule): 146 462 days.
func TestTimeBoundsFitRecordSpan(t *testing.T) {
	t.Parallel()
	first := time.Date(MinYear, 1, 1, 0, 0, 0, 0, time.FixedZone("", 14*3600)).Unix()
	last := time.Date(MaxYear, 12, 31, 23, 59, 59, 0, time.FixedZone("", -14*3600)).Unix()
	if last-first > record.MaxSpan {
		t.Errorf("times read span %d s, beyond record.MaxSpan %d s", last-first, record.MaxSpan)
	}
	const days = 401*365 + 97
	if got := (time.Date(MaxYear+1, 1, 1, 0, 0, 0, 0, time.UTC).Unix() - time.Date(MinYear, 1, 1, 0, 0, 0, 0, time.UTC).Unix()) / 86400; got != days {
		t.Errorf("%d days in %d to %d, want %d", got, MinYear, MaxYear, days)
	}
	r, err := ParseStageRecord(strings.NewReader("time,stage\n1800-01-01T00:00Z,1\n2200-12-31T23:59:59Z,1\n"), "s.csv", StageRecordOptions{})
	if err != nil || r.Stages.Validate() != nil {
		t.Errorf("a record of the whole range: %v", err)
	}
}

// One file holds times all with a UTC offset or all without: the first
// time whose form differs from the file's first is an error at its cell
// naming a row of each form.
func TestTimesMixedOffsets(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name    string
		times   []string
		at      int    // the time that differs, 0-based; -1 when read
		has, no int    // the rows named, counted from the first time (0)
		say     string // extra text
	}{
		{"all without", []string{"2024-05-01T10:00", "2024-05-02", "2024-05-03 09:30:00"}, -1, 0, 0, ""},
		{"all with", []string{"2024-05-01T10:00Z", "2024-05-02T00:00+10:00", "2024-05-03 09:30:00-05:00"}, -1, 0, 0, ""},
		{"with after without", []string{"2024-05-01T10:00", "2024-05-02T10:00Z"}, 1, 1, 0, ""},
		{"without after with", []string{"2024-05-01T10:00+10:00", "2024-05-02T10:00Z", "2024-05-03"}, 2, 0, 2, ""},
	} {
		for _, r := range timeReaders {
			t.Run(r.name+" "+tc.name, func(t *testing.T) {
				t.Parallel()
				err := r.read(writeTimes(t, t.TempDir(), r, tc.times))
				if tc.at < 0 {
					if err != nil {
						t.Errorf("refused: %v", err)
					}
					return
				}
				row := func(i int) int { return 2 + i*r.lines() }
				want := fmt.Sprintf("times with and without a UTC offset in one file: row %d has one, row %d has none", row(tc.has), row(tc.no))
				checkCellError(t, err, ErrMixedOffsets, row(tc.at), 1, want)
			})
		}
	}
	// In a workbook a date serial is a time without an offset.
	book := writeBook(t, t.TempDir(), map[string][][]any{
		"stage":    {{"time", "stage"}, {dateSerial(2024, 5, 1), 0.5}, {"2024-05-02T00:00Z", 0.6}},
		"gaugings": {{"time", "stage", "discharge"}, {dateSerial(2024, 5, 1), 0.5, 1}, {"2024-05-02T00:00Z", 0.6, 2}},
	}, []string{"stage", "gaugings"})
	_, err := ReadStageRecord(book, StageRecordOptions{Sheet: "stage"})
	checkCellError(t, err, ErrMixedOffsets, 3, 1, "field.xlsx['stage']!A3")
	_, err = ReadGaugingsAt(book, "gaugings", 10*time.Hour)
	checkCellError(t, err, ErrMixedOffsets, 3, 1, "field.xlsx['gaugings']!A3")
}

// A header naming stage and its alias gauge_height is refused at the
// second of the two, by every table that takes the alias.
func TestStageAliasBoth(t *testing.T) {
	t.Parallel()
	reader := map[string]func(string) error{}
	for _, r := range timeReaders {
		reader[r.name] = r.read
	}
	for _, tc := range []struct {
		name, reader, header string
		col                  int
		want                 string
	}{
		{"stage record", "stage record", "time,stage,gauge_height", 3, "both stage and gauge_height: keep one"},
		{"stage record, alias first", "stage record", "gauge_height (m),time,Stage (m)", 3, "both gauge_height (m) and Stage (m): keep one"},
		{"gaugings", "gaugings", "time,stage,discharge,gauge_height", 4, "both stage and gauge_height: keep one"},
		{"rating tables", "rating periods", "gauge height,discharge,stage", 3, "both gauge height and stage: keep one"},
		{"shift diagrams", "shift diagrams", "time,gauge-height,shift,stage", 4, "both gauge-height and stage: keep one"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			path := filepath.Join(t.TempDir(), "t.csv")
			if err := os.WriteFile(path, []byte(tc.header+"\n"+strings.Repeat("2024-05-01,", strings.Count(tc.header, ","))+"1\n"), 0o644); err != nil {
				t.Fatal(err)
			}
			err := reader[tc.reader](path)
			checkCellError(t, err, ErrAliasColumns, 1, tc.col, "t.csv:1:"+fmt.Sprint(tc.col)+": ")
			if err != nil && !strings.HasSuffix(err.Error(), tc.want) {
				t.Errorf("%v; want it to end %q", err, tc.want)
			}
		})
	}
	// The streamed workbook stage record too, as a cell reference.
	book := writeBook(t, t.TempDir(), map[string][][]any{"stage": {{"time", "stage", "gauge_height"}, {"2024-05-01", 1, 1}}}, []string{"stage"})
	_, err := ReadStageRecord(book, StageRecordOptions{})
	checkCellError(t, err, ErrAliasColumns, 1, 3, "field.xlsx['stage']!C1")
}

// A stage record that is not UTF-8 text, or no text table, is refused as
// every other reader refuses it (ParseCSV): the same cause at the same
// line and field. The positions are counted by hand: line 1 is the
// header, fields from 1.
func TestStageRecordEncoding(t *testing.T) {
	t.Parallel()
	var long strings.Builder // a header and 301 readings, about 5 700 bytes
	long.WriteString("time,stage\n2024-05-01T00:00,1\n")
	for i := range 300 {
		fmt.Fprintf(&long, "2024-05-02T%02d:%02d,1\n", i/60, i%60)
	}
	for _, tc := range []struct {
		name, text string
		is         error
		row, col   int
	}{
		{"degree sign in a stage", "time,stage\n2024-05-01T00:00,0.7\xb0\n", ErrNotUTF8, 2, 2},
		{"e acute in a quality", "time,stage,quality\n2024-05-01T00:00,0.7,estim\xe9\n", ErrNotUTF8, 2, 3},
		{"in the header", "time,stage (\xb0)\n2024-05-01T00:00,0.7\n", ErrNotUTF8, 1, 2},
		{"in a comment", "# logger at the weir, 12\xb0C\ntime,stage\n2024-05-01T00:00,0.7\n", ErrNotUTF8, 1, 2},
		{"after a quoted comma", "time,stage,quality\n2024-05-01T00:00,0.7,\"a, b\"\n2024-05-01T00:15,0.7,\"\xb0\"\n", ErrNotUTF8, 3, 3},
		{"in a quoted field of two lines", "time,stage,quality\n2024-05-01T00:00,0.7,\"a\nb\xe9\"\n", ErrNotUTF8, 3, 3},
		{"beyond the first 4096 bytes", long.String() + "2024-05-03T00:00,1\xe9\n", ErrNotUTF8, 303, 2},
		{"UTF-16", "\xff\xfet\x00i\x00m\x00e\x00", ErrUTF16, 0, 0},
		{"binary", "time,stage\n\x00\x01\x02", ErrBinary, 2, 1},
		{"a NUL in a quality", "# logger\ntime,stage,quality\n2024-05-01T00:00,0.7,a\x00b\n", ErrBinary, 3, 3},
		{"a NUL after a quoted comma", "time,stage,quality\n2024-05-01T00:00,0.7,\"a, b\x00\"\n", ErrBinary, 2, 3},
		{"a workbook", "PK\x03\x04rest", ErrWorkbookNamed, 0, 0},
		{"tabs", "# record\ntime\tstage\n2024-05-01T00:00\t0.7\n", ErrTabs, 2, 0},
		{"carriage returns alone", "time,stage\r2024-05-01T00:00,0.7\r", ErrCROnly, 0, 0},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			_, want := ParseCSV(strings.NewReader(tc.text), "s.csv")
			checkCellError(t, want, tc.is, tc.row, tc.col, "s.csv")
			_, err := ParseStageRecord(strings.NewReader(tc.text), "s.csv", StageRecordOptions{})
			checkCellError(t, err, tc.is, tc.row, tc.col, "s.csv")
			if err != nil && want != nil && err.Error() != want.Error() {
				t.Errorf("stage record: %q\nother readers: %q", err, want)
			}
		})
	}
}
