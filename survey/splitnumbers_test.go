package survey

import (
	"errors"
	"slices"
	"strings"
	"testing"

	"wetline/rating"
)

// The CSV readers keep which cells were quoted, for the check of split
// numbers: ParseCSV in each record, the streamed reader for the record it
// returned last. A quote in a field that does not start with one is part
// of the text (encoding/csv with LazyQuotes off refuses it, so none is
// written here); a quoted field spanning lines counts at its first line.
// The data are invented.
func TestQuotedCells(t *testing.T) {
	t.Parallel()
	const csv = "a,b,c\n1,\"2\",3\n\"4\", 5 ,\"6,5\"\n7,8,9\n# note\n\"x\ny\",\"\",z\n"
	want := [][]bool{{false, true, false}, {true, false, true}, {false, false, false}, {true, true, false}}
	tab, err := ParseCSV(strings.NewReader(csv), "q.csv")
	if err != nil {
		t.Fatal(err)
	}
	if len(tab.Records) != len(want) {
		t.Fatalf("%d records, want %d", len(tab.Records), len(want))
	}
	for i, rec := range tab.Records {
		for c, w := range want[i] {
			if got := rec.quotedCell(c); got != w {
				t.Errorf("ParseCSV row %d column %d: quoted %v, want %v", rec.Row, c+1, got, w)
			}
		}
	}
	cs := newCSVStream(strings.NewReader(csv), "q.csv")
	for i := -1; ; i++ {
		fields, line, err := cs.next()
		if err != nil {
			break
		}
		if i < 0 {
			continue // the header
		}
		for c, w := range want[i] {
			if got := cs.fieldQuoted(c); got != w {
				t.Errorf("stream line %d field %d (%q): quoted %v, want %v", line, c+1, fields[c], got, w)
			}
		}
	}
}

// splitCase is a table read by one of the readers: read (nil when it is
// read), the error it gives (nil when read) with its text at, and the
// warning it gives (warn; "" for none among its warnings).
type splitCase struct {
	name, csv string
	err       error
	at        string
	warn      string
}

// checkSplit checks one splitCase against what a reader returned.
func checkSplit(t *testing.T, tc splitCase, warnings []string, err error) {
	t.Helper()
	if tc.err != nil {
		if !errors.Is(err, tc.err) || !strings.Contains(err.Error(), tc.at) {
			t.Errorf("%s: %v, want %v at %s", tc.name, err, tc.err, tc.at)
		}
		return
	}
	if err != nil {
		t.Errorf("%s: %v", tc.name, err)
		return
	}
	split := slices.IndexFunc(warnings, func(w string) bool { return strings.Contains(w, decimalCommaHint) })
	switch {
	case tc.warn == "" && split >= 0:
		t.Errorf("%s: warned %q, want no split warning", tc.name, warnings[split])
	case tc.warn != "" && (split < 0 || !strings.Contains(warnings[split], tc.warn)):
		t.Errorf("%s: warnings %q, want one holding %q", tc.name, warnings, tc.warn)
	}
}

// A survey's mark or note column holding a bare digit string after a
// whole elevation on most rows is refused (levels are read to the
// millimetre: 524 then 8 is 524,8 split by an unquoted decimal comma);
// after a whole station (stations at whole metres beside numeric point
// codes are common) it is warned of; quoted marks, and headers in US
// units, pass. The data are invented (sta-code is the layout of a
// survey with numeric point codes that was once refused).
func TestSectionSplitNumber(t *testing.T) {
	t.Parallel()
	for _, tc := range []splitCase{
		{name: "station then code", csv: "station,code,elevation\n0,1,102.5\n5,1,101.8\n10,2,100.9\n15,3,100.3\n20,3,100.2\n25,2,100.8\n30,1,101.9\n",
			warn: `s.csv:2:2: code "1": station 0 then 1 on 7 of 7 rows: an unquoted decimal comma? 0,1 read as two values: write numbers with a decimal point, or quote the code ("1") if it is a value of its own`},
		{name: "elevation then mark", csv: "station,elevation,mark,note\n0,524,8,LPIN\n5,523,1,\n10,521,9,\n15,523,4,RPIN\n", err: ErrSplitNumber,
			at: `s.csv:2:3: mark "8": a number split in two: elevation 524 then 8 on 4 of 4 rows: an unquoted decimal comma? 524,8 read as two values: write numbers with a decimal point, or quote the mark ("8") if it is a value of its own`},
		{name: "elevation then quoted mark", csv: "station,elevation,mark,note\n0,524,\"8\",LPIN\n5,523,\"1\",\n10,521,\"9\",\n15,523,\"4\",RPIN\n"},
		{name: "elevation in feet", csv: "station (ft),elevation (ft),mark,note\n0,524,8,LPIN\n5,523,1,\n10,521,9,\n15,523,4,RPIN\n"},
		{name: "point numbers", csv: "station,elevation,mark\n0,731,1\n10,728,2\n20,729,3\n"},
		{name: "spilled row", csv: "station,elevation,mark\n0,524,8,\n5,523.1,\n", err: ErrSpilledRow, at: "s.csv:2:4: more fields than the header line"},
	} {
		sv, err := ParseSection(strings.NewReader(tc.csv), "s.csv", SectionOptions{IgnoreBankMarks: true})
		checkSplit(t, tc, sv.Warnings, err)
	}
	// A sheet's cells hold no separators, so the advice there does not
	// name quoting.
	sheet := &Table{File: "xs.xlsx", Sheet: "xs", Header: []string{"station", "elevation", "mark"}, HeaderRow: 1,
		Records: []Record{{Row: 2, Cells: []string{"0", "524", "8"}}, {Row: 3, Cells: []string{"5", "523", "1"}}}}
	_, err := SectionFromTable(sheet, SectionOptions{})
	if !errors.Is(err, ErrSplitNumber) || strings.Contains(err.Error(), "or quote") ||
		!strings.Contains(err.Error(), `xs.xlsx['xs']!C2: mark "8": a number split in two: elevation 524 then 8 on 2 of 2 rows`) {
		t.Errorf("sheet: %v, want ErrSplitNumber at C2 without quoting advice", err)
	}
}

// An unquoted decimal comma in a gaugings table whose gauge height (or
// discharge, or uncertainty) has a text column after it splits the
// number in two without adding a field: 0,84 is read as stage 0 and note
// "84", 4,10 as discharge 4 and note "10". After a whole gauge height on
// most rows (read to the millimetre) it is refused; after a whole
// discharge or uncertainty, common in real data, warned of; headers in
// US units and quoted cells pass; a note of measurement numbers
// increasing down the rows passes. The data are invented
// (testdata/gaugings-commas.csv among them; the verticals, note and
// quality cases are layouts of gaugings that were once refused).
func TestGaugingsSplitNumber(t *testing.T) {
	t.Parallel()
	const head = "time,stage,discharge,"
	for _, tc := range []splitCase{
		{name: "note after discharge", csv: head + "note\n2024-05-01T09:00,0.84,4,10\n2024-05-01T12:00,1.12,7,60\n2024-05-02T11:00,0.60,1,95\n2024-05-05T11:00,0.70,2,85\n",
			warn: `g.csv:2:4: note "10": discharge 4 then 10 on 4 of 4 rows: an unquoted decimal comma? 4,10 read as two values: write numbers with a decimal point, or quote the note ("10") if it is a value of its own`},
		{name: "exclude after discharge", csv: head + "exclude\n2024-05-01T09:00,0.84,4,10\n2024-05-01T12:00,1.12,7,60\n", warn: `g.csv:2:4: exclude "10": discharge 4 then 10`},
		{name: "note after uncertainty", csv: head + "uncertainty,note\n2024-05-01T09:00,0.84,4.1,5,5\n2024-05-01T12:00,1.12,7.6,7,2\n", warn: `g.csv:2:5: note "5": uncertainty 5 then 5`},
		{name: "verticals after whole discharges", csv: head + "note\n2024-01-10T10:00,8.1,232,22\n2024-02-11T10:00,12.4,900,25\n2024-03-12T10:00,18.2,2423,24\n",
			warn: `g.csv:2:4: note "22": discharge 232 then 22 on 3 of 3 rows`},
		{name: "quoted notes", csv: head + "note\n2024-05-01T09:00,0.84,4,\"10\"\n2024-05-01T12:00,1.12,7,\"60\"\n2024-05-02T11:00,0.60,1,\"95\"\n"},
		{name: "feet and cfs", csv: "time,gauge_height (ft),discharge (cfs),note\n2025-03-04T10:00,2.10,45,3\n2025-04-15T10:30,2.45,88,1\n2025-05-27T11:00,3.02,172,2\n2025-07-08T10:00,1.88,31,1\n"},
		{name: "numeric quality in cfs", csv: "time,gauge_height (ft),discharge (cfs),quality\n2025-03-04T10:00,2.10,45,2\n2025-04-15T10:30,2.45,88,1\n",
			err: rating.ErrQuality, at: `g.csv:2:4: quality "2": quality must be`},
		{name: "note after gauge height", csv: "time,discharge,stage,note\n2024-05-01T09:00,4.1,0,84\n2024-05-01T12:00,7.6,1,12\n2024-05-02T11:00,1.9,0,60\n", err: ErrSplitNumber,
			at: `g.csv:2:4: note "84": a number split in two: stage 0 then 84 on 3 of 3 rows: an unquoted decimal comma? 0,84 read as two values`},
		{name: "quoted note after gauge height", csv: "time,discharge,stage,note\n2024-05-01T09:00,4.1,0,\"84\"\n2024-05-01T12:00,7.6,1,\"12\"\n2024-05-02T11:00,1.9,0,\"60\"\n"},
		{name: "gauge height in feet", csv: "time,discharge (cfs),stage (ft),note\n2024-05-01T09:00,4.1,0,84\n2024-05-01T12:00,7.6,1,12\n2024-05-02T11:00,1.9,0,60\n"},
		{name: "measurement numbers", csv: "time,discharge,stage,note\n2024-05-01T09:00,4.1,0,11\n2024-05-01T12:00,7.6,1,12\n2024-05-02T11:00,1.9,0,13\n"},
		{name: "one row of three", csv: head + "note\n2024-05-01T09:00,0.84,4,10\n2024-05-01T12:00,1.12,7.6,\n2024-05-02T11:00,0.60,1.95,\n"},
		{name: "whole discharges, worded notes", csv: head + "note\n2024-05-01T09:00,0.84,410,wading\n2024-05-01T12:00,1.12,760,boat\n"},
		{name: "spilled row", csv: head + "note\n2024-05-01T09:00,0,84,4.1,\n2024-05-01T12:00,1.12,7.6,\n", err: ErrSpilledRow, at: "g.csv:2:5: more fields than the header line"},
	} {
		gs, err := ParseGaugings(strings.NewReader(tc.csv), "g.csv")
		checkSplit(t, tc, gs.Warnings, err)
	}
	gs, err := ReadGaugings("testdata/gaugings-commas.csv", "")
	checkSplit(t, splitCase{name: "gaugings-commas.csv", warn: `gaugings-commas.csv:2:4: note "10": discharge 4 then 10 on 5 of 5 rows`}, gs.Warnings, err)
}

// The streamed stage record refuses what ParseCSV and the survey reader
// refuse: a CSV row with more fields than a header line ending in a named
// column (1,05, with its trailing comma). A quality column right after
// the stage holding a bare digit string after a whole stage on most rows
// (1,05 in a row as wide as the header) is warned of, not refused: a
// logger in centimetres records whole stages, and a quality code may be
// a digit. Digit strings increasing down the rows are warned of too: a
// record has no point numbers. Quoted qualities, a stage in feet and a
// column the record does not read (a logger's temperature) pass. The
// data are invented (testdata/stage-commas*.csv among them; the
// centimetre cases are layouts of logger records that were once
// refused).
func TestStageRecordSplitNumber(t *testing.T) {
	t.Parallel()
	const head = "time,stage,quality\n"
	for _, tc := range []splitCase{
		{name: "trailing comma spilled", csv: head + "2024-07-10T00:00,1,05,\n2024-07-10T01:00,1,06,\n", err: ErrSpilledRow,
			at: "s.csv:2:4: more fields than the header line (4 fields, the header 3): an unquoted decimal comma?"},
		{name: "quality under the header", csv: head + "2024-07-10T00:00,1,05\n2024-07-10T01:00,1,06\n2024-07-10T02:00,1,07\n",
			warn: `s.csv:2:3: quality "05": stage 1 then 05 on 3 of 3 rows: an unquoted decimal comma? 1,05 read as two values: write numbers with a decimal point, or quote the quality ("05") if it is a value of its own`},
		{name: "centimetres, quality codes", csv: head + "2025-06-01T00:00,152,1\n2025-06-01T00:15,153,1\n2025-06-01T00:30,153,2\n",
			warn: `s.csv:2:3: quality "1": stage 152 then 1 on 3 of 3 rows`},
		{name: "centimetres, quoted quality codes", csv: head + "2025-06-01T00:00,152,\"1\"\n2025-06-01T00:15,153,\"1\"\n2025-06-01T00:30,153,\"2\"\n"},
		{name: "feet", csv: "time,stage (ft),quality\n2025-06-01T00:00,5,1\n2025-06-01T00:15,5,1\n2025-06-01T00:30,5,2\n"},
		{name: "temperature not read", csv: "time,stage,temp_c\n2025-06-01T00:00,152,8\n2025-06-01T00:15,153,8\n2025-06-01T00:30,153,9\n"},
		{name: "beyond a short header", csv: "time,stage\n2024-07-10T00:00,1,05\n", err: ErrBeyondHeader, at: "(an unquoted decimal comma? 1,05 read as two values?)"},
		{name: "quality words", csv: head + "2024-07-10T00:00,1,good\n2024-07-10T01:00,1,fair\n"},
		{name: "one whole stage", csv: head + "2024-07-10T00:00,1,05\n2024-07-10T01:00,1.1,\n2024-07-10T02:00,1.2,07\n"},
		{name: "spreadsheet blank columns", csv: "time,stage,quality,,\n2024-07-10T00:00,1.05,,,\n2024-07-10T01:00,1.06,,,\n"},
	} {
		var warnings []string
		sr, err := ParseStageRecord(strings.NewReader(tc.csv), "s.csv", StageRecordOptions{})
		if sr != nil {
			warnings = sr.Warnings
		}
		checkSplit(t, tc, warnings, err)
	}
	if _, err := ReadStageRecord("testdata/stage-commas5.csv", StageRecordOptions{}); !errors.Is(err, ErrSpilledRow) {
		t.Errorf("stage-commas5.csv: %v, want %v", err, ErrSpilledRow)
	}
	sr, err := ReadStageRecord("testdata/stage-commas2.csv", StageRecordOptions{})
	var warnings []string
	if sr != nil {
		warnings = sr.Warnings
	}
	checkSplit(t, splitCase{name: "stage-commas2.csv", warn: `stage-commas2.csv:2:3: quality "05": stage 1 then 05`}, warnings, err)
}
