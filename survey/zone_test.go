package survey

import (
	"encoding/csv"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// zoneReader reads the first time of a table whose time column is
// followed by the time-zone column named in header (CSV text).
type zoneReader struct {
	name string
	// header is the CSV header after the time and zone columns' names;
	// rest the cells after a row's time and zone.
	header, rest string
	read         func(text string) (time.Time, error)
}

// zoneReaders are the readers of times in files, each of a table with a
// time-zone column.
var zoneReaders = []zoneReader{
	{"stage record", "stage", "0.5", func(s string) (time.Time, error) {
		r, err := ParseStageRecord(strings.NewReader(s), "z.csv", StageRecordOptions{UTCOffset: 3 * time.Hour})
		if err != nil {
			return time.Time{}, err
		}
		return time.Unix(r.Stages.Time[0], 0), nil
	}},
	{"gaugings", "stage,discharge", "0.5,1", func(s string) (time.Time, error) {
		t, err := ParseCSV(strings.NewReader(s), "z.csv")
		if err != nil {
			return time.Time{}, err
		}
		g, err := gaugingsFromTable(t, 3*3600)
		if err != nil {
			return time.Time{}, err
		}
		return g.Gaugings[0].Time, nil
	}},
	{"shift diagrams", "stage,shift", "0.5,0.1", func(s string) (time.Time, error) {
		d, err := ParseShiftDiagrams(strings.NewReader(s), "z.csv", ShiftTableOptions{UTCOffset: 3 * time.Hour})
		if err != nil {
			return time.Time{}, err
		}
		return d.Diagrams[0].Time, nil
	}},
	{"rating periods", "stage,discharge", "0.5,0", func(s string) (time.Time, error) {
		r, err := ParseRatingTables(strings.NewReader(s+",,1.0,3\n"), "z.csv", RatingTableOptions{UTCOffset: 3 * time.Hour})
		if err != nil {
			return time.Time{}, err
		}
		return r.Periods[0].From, nil
	}},
}

// TestTimeZoneColumn: every reader of times reads a time-zone column
// beside its time column. A zone cell gives a time without an offset its
// offset (whatever offset the command gives for such times, here +03:00);
// a time with its own offset keeps it and a zone cell beside it must
// agree; a blank zone cell beside a time without an offset, a zone that is
// neither an offset nor a listed abbreviation, and a disagreement are
// refused at the zone cell. Offsets of the abbreviations: EST UTC−5, EDT
// UTC−4, PDT UTC−7, AKDT UTC−8, HST UTC−10 (the North American standard
// and daylight times, from memory).
func TestTimeZoneColumn(t *testing.T) {
	utc := func(s string) time.Time {
		tm, err := time.Parse(time.RFC3339, s)
		if err != nil {
			t.Fatal(err)
		}
		return tm
	}
	for _, tc := range []struct {
		name, column, time, zone string
		want                     time.Time // the instant; zero when refused
		is                       error
		cell                     string // the position of the error
	}{
		{"EST", "tz", "2000-02-15T10:00:00", "EST", utc("2000-02-15T15:00:00Z"), nil, ""},
		{"EDT", "tz", "2000-06-06T08:35", "EDT", utc("2000-06-06T12:35:00Z"), nil, ""},
		{"lower case", "tz", "2000-06-06T08:35", "pdt", utc("2000-06-06T15:35:00Z"), nil, ""},
		{"AKDT", "tz", "2000-06-06T08:35", "AKDT", utc("2000-06-06T16:35:00Z"), nil, ""},
		{"HST", "tz", "2000-06-06T08:35", "HST", utc("2000-06-06T18:35:00Z"), nil, ""},
		{"an extended offset", "time zone", "2025-02-18T06:00", "+10:00", utc("2025-02-17T20:00:00Z"), nil, ""},
		{"a basic offset", "TimeZone", "2025-02-18T06:00", "-0500", utc("2025-02-18T11:00:00Z"), nil, ""},
		{"hours only", "UTC offset", "2025-02-18T06:00", "+05", utc("2025-02-18T01:00:00Z"), nil, ""},
		{"Z", "tz", "2025-02-18T06:00", "Z", utc("2025-02-18T06:00:00Z"), nil, ""},
		{"UTC", "tz", "2025-02-18T06:00", "UTC", utc("2025-02-18T06:00:00Z"), nil, ""},
		{"GMT", "tz", "2025-02-18T06:00", "gmt", utc("2025-02-18T06:00:00Z"), nil, ""},
		{"a date", "tz", "2025-02-18", "EST", utc("2025-02-18T05:00:00Z"), nil, ""},
		{"its own offset, the zone agreeing", "tz", "2025-02-18T06:00-05:00", "EST", utc("2025-02-18T11:00:00Z"), nil, ""},
		{"its own offset, the zone blank", "tz", "2025-02-18T06:00+10:00", "", utc("2025-02-17T20:00:00Z"), nil, ""},
		{"its own offset, the zone disagreeing", "tz", "2025-02-18T06:00Z", "EST", time.Time{}, ErrZoneDisagrees, "z.csv:2:2: tz \"EST\": "},
		{"no offset, the zone blank", "tz", "2025-02-18T06:00", "", time.Time{}, ErrZoneBlank, "z.csv:2:2: tz: "},
		{"an ambiguous abbreviation", "tz", "2025-02-18T06:00", "IST", time.Time{}, ErrZone, "z.csv:2:2: tz \"IST\": "},
		{"a zone name", "tz", "2025-02-18T06:00", "Australia/Brisbane", time.Time{}, ErrZone, "z.csv:2:2: tz \"Australia/Brisbane\": "},
		{"an offset too far", "tz", "2025-02-18T06:00", "+15:00", time.Time{}, ErrZone, "z.csv:2:2: tz \"+15:00\": "},
		{"a bad time", "tz", "2025-02-30T06:00", "EST", time.Time{}, ErrISOTime, "z.csv:2:1: "},
	} {
		for _, r := range zoneReaders {
			t.Run(tc.name+"/"+r.name, func(t *testing.T) {
				timeCol := "time"
				if r.name == "rating periods" {
					timeCol = "valid_from"
				}
				text := timeCol + "," + tc.column + "," + r.header + "\n" + tc.time + "," + tc.zone + "," + r.rest + "\n"
				got, err := r.read(text)
				switch {
				case tc.is == nil && err != nil:
					t.Fatal(err)
				case tc.is == nil && !got.Equal(tc.want):
					t.Errorf("%v, want %v", got.UTC(), tc.want)
				case tc.is != nil && !errors.Is(err, tc.is):
					t.Errorf("error %v, want %v", err, tc.is)
				case tc.is != nil && !strings.Contains(err.Error(), tc.cell):
					t.Errorf("error %q, want it at %q", err, tc.cell)
				}
			})
		}
	}
}

// TestTimeZoneColumnMixesZones: one file may mix zones (a gauge's
// standard and daylight times) and times with and without their own
// offsets once a zone column gives each an offset; two zone columns are
// refused.
func TestTimeZoneColumnMixesZones(t *testing.T) {
	g, err := ParseGaugings(strings.NewReader("time,tz,stage,discharge\n"+
		"2024-01-10T10:00,EST,1,2\n2024-07-10T10:00,EDT,1.1,2.2\n2024-08-10T10:00-04:00,,1.2,2.4\n"), "z.csv")
	if err != nil {
		t.Fatal(err)
	}
	want := []string{"2024-01-10T15:00:00Z", "2024-07-10T14:00:00Z", "2024-08-10T14:00:00Z"}
	for i, g := range g.Gaugings {
		if got := g.Time.UTC().Format(time.RFC3339); got != want[i] {
			t.Errorf("gauging %d at %s, want %s", i+1, got, want[i])
		}
	}
	if !g.Times.Offsets || g.Times.First != -5*time.Hour {
		t.Errorf("times %+v, want offsets, the first -05:00", g.Times)
	}
	_, err = ParseGaugings(strings.NewReader("time,tz,utc offset,stage,discharge\n2024-01-10T10:00,EST,-05:00,1,2\n"), "z.csv")
	if !errors.Is(err, ErrAliasColumns) {
		t.Errorf("two zone columns: %v, want %v", err, ErrAliasColumns)
	}
}

// TestTimeZoneColumnWorkbook: a workbook's date cell, which has no offset,
// takes its row's zone, in the streamed stage record and in the tables
// read whole.
func TestTimeZoneColumnWorkbook(t *testing.T) {
	dir := t.TempDir()
	local := time.Date(2024, 7, 10, 10, 0, 0, 0, time.UTC) // the wall clock the cell shows
	path := writeBook(t, dir, map[string][][]any{
		"stage":    {{"time", "tz", "stage"}, {local, "EDT", 0.5}, {local.Add(time.Hour), "EDT", 0.6}},
		"gaugings": {{"time", "tz", "stage", "discharge"}, {local, "EDT", 0.5, 1}},
	}, []string{"stage", "gaugings"})
	want := time.Date(2024, 7, 10, 14, 0, 0, 0, time.UTC)
	sr, err := ReadStageRecord(path, StageRecordOptions{Sheet: "stage"})
	if err != nil {
		t.Fatal(err)
	}
	if got := time.Unix(sr.Stages.Time[0], 0).UTC(); !got.Equal(want) {
		t.Errorf("stage record: %v, want %v", got, want)
	}
	gs, err := ReadGaugings(path, "gaugings")
	if err != nil {
		t.Fatal(err)
	}
	if got := gs.Gaugings[0].Time; !got.Equal(want) {
		t.Errorf("gaugings: %v, want %v", got.UTC(), want)
	}
}

// TestTimeZoneReference: the agency's gaugings at Patuxent River near
// Bowie (testdata/reference/gaugings-01594440.csv, USGS, public domain)
// write local times with a tz column of EST and EDT. Each is read at its
// own zone: the file's first winter and first summer gaugings, and every
// row, against the file's own cells read here with encoding/csv (EST is
// UTC−5, EDT UTC−4, from memory).
func TestTimeZoneReference(t *testing.T) {
	path := filepath.Join("..", "testdata", "reference", "gaugings-01594440.csv")
	gs, err := ReadGaugings(path, "")
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		i    int
		want string
	}{{0, "2000-02-15T15:00:00Z"}, {3, "2000-06-06T12:35:00Z"}} {
		if got := gs.Gaugings[c.i].Time.UTC().Format(time.RFC3339); got != c.want {
			t.Errorf("gauging %d at %s, want %s", c.i+1, got, c.want)
		}
	}
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	cr := csv.NewReader(f)
	cr.Comment = '#'
	rows, err := cr.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	hours := map[string]int{"EST": -5, "EDT": -4}
	for i, row := range rows[1:] {
		local, err := time.Parse("2006-01-02T15:04:05", row[0])
		if err != nil {
			t.Fatal(err)
		}
		h, ok := hours[row[1]]
		if !ok {
			t.Fatalf("row %d: zone %q", i+2, row[1])
		}
		want := local.Add(-time.Duration(h) * time.Hour)
		if got := gs.Gaugings[i].Time; !got.Equal(want) {
			t.Errorf("gauging %d (%s %s) at %v, want %v", i+1, row[0], row[1], got.UTC(), want)
		}
	}
}
