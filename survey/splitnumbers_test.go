package survey

import (
	"errors"
	"strings"
	"testing"
)

// An unquoted decimal comma in a gaugings table whose discharge (or stage,
// or uncertainty) has a text column after it splits the number in two
// without adding a field: 4,10 is read as discharge 4 and note "10". A
// text column holding a bare digit string after a whole number on most
// rows is refused as a survey's mark or note column is; a note of
// measurement numbers increasing down the rows passes. The data are
// invented (testdata/gaugings-commas.csv is the reviewer's input).
func TestGaugingsSplitNumber(t *testing.T) {
	t.Parallel()
	const head = "time,stage,discharge,"
	for _, tc := range []struct {
		name, csv string
		at        string // position and text of the ErrSplitNumber; "" when read
	}{
		{"note after discharge", head + "note\n2024-05-01T09:00,0.84,4,10\n2024-05-01T12:00,1.12,7,60\n2024-05-02T11:00,0.60,1,95\n2024-05-05T11:00,0.70,2,85\n",
			`g.csv:2:4: note "10": a number split in two: discharge 4 then 10, as on 4 of 4 rows: an unquoted decimal comma? 4,10 read as two values`},
		{"exclude after discharge", head + "exclude\n2024-05-01T09:00,0.84,4,10\n2024-05-01T12:00,1.12,7,60\n", `g.csv:2:4: exclude "10"`},
		{"quality after discharge", head + "quality\n2024-05-01T09:00,0.84,4,10\n2024-05-01T12:00,1.12,7,60\n", `g.csv:2:4: quality "10"`},
		{"note after uncertainty", head + "uncertainty,note\n2024-05-01T09:00,0.84,4.1,5,5\n2024-05-01T12:00,1.12,7.6,7,2\n", `g.csv:2:5: note "5": a number split in two: uncertainty 5 then 5`},
		{"measurement numbers", head + "note\n2024-05-01T09:00,0.84,410,11\n2024-05-01T12:00,1.12,760,12\n2024-05-02T11:00,0.60,195,13\n", ""},
		{"one row of three", head + "note\n2024-05-01T09:00,0.84,4,10\n2024-05-01T12:00,1.12,7.6,\n2024-05-02T11:00,0.60,1.95,\n", ""},
		{"whole discharges, worded notes", head + "note\n2024-05-01T09:00,0.84,410,wading\n2024-05-01T12:00,1.12,760,boat\n", ""},
	} {
		_, err := ParseGaugings(strings.NewReader(tc.csv), "g.csv")
		if tc.at == "" {
			if err != nil {
				t.Errorf("%s: %v", tc.name, err)
			}
			continue
		}
		if !errors.Is(err, ErrSplitNumber) || !strings.Contains(err.Error(), tc.at) {
			t.Errorf("%s: %v, want ErrSplitNumber at %s", tc.name, err, tc.at)
		}
	}
	_, err := ReadGaugings("testdata/gaugings-commas.csv", "")
	if !errors.Is(err, ErrSplitNumber) || !strings.Contains(err.Error(), "gaugings-commas.csv:2:4: note \"10\"") {
		t.Errorf("gaugings-commas.csv: %v, want ErrSplitNumber at row 2, column 4", err)
	}
}

// The streamed stage record refuses what ParseCSV and the survey reader
// refuse: a CSV row with more fields than a header line ending in a named
// column (1,05, with its trailing comma), and a column after the stage
// holding a bare digit string after a whole stage on most rows (1,05 in a
// row as wide as the header). Digit strings increasing down the rows are
// refused too: a record has no point numbers, and a split stage rising
// slowly gives them. The data are invented (testdata/stage-commas*.csv
// are the reviewer's inputs).
func TestStageRecordSplitNumber(t *testing.T) {
	t.Parallel()
	const head = "time,stage,quality\n"
	for _, tc := range []struct {
		name, csv string
		err       error  // nil when read
		at        string // position and text the error holds
	}{
		{"trailing comma spilled", head + "2024-07-10T00:00,1,05,\n2024-07-10T01:00,1,06,\n", ErrSpilledRow,
			"s.csv:2:4: more fields than the header line (4 fields, the header 3): an unquoted decimal comma?"},
		{"quality under the header", head + "2024-07-10T00:00,1,05\n2024-07-10T01:00,1,06\n2024-07-10T02:00,1,07\n", ErrSplitNumber,
			`s.csv:2:3: quality "05": a number split in two: stage 1 then 05, as on 3 of 3 rows: an unquoted decimal comma? 1,05 read as two values`},
		{"ignored column under the header", "time,stage,logger\n2024-07-10T00:00,1,45\n2024-07-10T01:00,1,38\n", ErrSplitNumber, `s.csv:2:3: logger "45"`},
		{"beyond a short header", "time,stage\n2024-07-10T00:00,1,05\n", ErrBeyondHeader, "(an unquoted decimal comma? 1,05 read as two values?)"},
		{"quality words", head + "2024-07-10T00:00,1,good\n2024-07-10T01:00,1,fair\n", nil, ""},
		{"one whole stage", head + "2024-07-10T00:00,1,05\n2024-07-10T01:00,1.1,\n2024-07-10T02:00,1.2,07\n", nil, ""},
		{"spreadsheet blank columns", "time,stage,quality,,\n2024-07-10T00:00,1.05,,,\n2024-07-10T01:00,1.06,,,\n", nil, ""},
	} {
		_, err := ParseStageRecord(strings.NewReader(tc.csv), "s.csv", StageRecordOptions{})
		if tc.err == nil {
			if err != nil {
				t.Errorf("%s: %v", tc.name, err)
			}
			continue
		}
		if !errors.Is(err, tc.err) || !strings.Contains(err.Error(), tc.at) {
			t.Errorf("%s: %v, want %v at %s", tc.name, err, tc.err, tc.at)
		}
	}
	for file, want := range map[string]error{"testdata/stage-commas5.csv": ErrSpilledRow, "testdata/stage-commas2.csv": ErrSplitNumber} {
		if _, err := ReadStageRecord(file, StageRecordOptions{}); !errors.Is(err, want) {
			t.Errorf("%s: %v, want %v", file, err, want)
		}
	}
}
