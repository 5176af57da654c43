package survey

import (
	"errors"
	"strings"
	"testing"
)

// A value in a column after the header's last named column is refused at
// its row and column, by the table reader and by the streamed stage record
// alike, in CSV and in a workbook; blank cells there (a spreadsheet's
// trailing commas) are read as before. Typical cause: an unquoted decimal
// comma shifting the rest of the row.
func TestValueBeyondHeader(t *testing.T) {
	t.Parallel()
	table, stages := csvTableErr, csvStagesErr
	for _, tc := range []struct {
		name, csv string
		read      func(string) error
		at        string // "" when read
	}{
		{"decimal comma", "station,elevation\n0,1\n1,0,5\n2,1\n", table, `t.csv:3:3: a value beyond the header's last column ("5"): name its column in the header, or quote a value that holds a comma (an unquoted decimal comma? 0,5 read as two values?)`},
		{"after blank names", "station,elevation,,\n0,1,,7\n", table, "t.csv:2:4: a value beyond"},
		{"quoted", "station,elevation\n0,1,\"x\"\n", table, "t.csv:2:3: a value beyond"},
		{"trailing commas", "station,elevation,,\n0,1,,\n1,0,,,,\n", table, ""},
		{"short rows", "station,elevation,n\n0,1\n1,0,\n", table, ""},
		{"stage record", "time,stage\n2024-01-01T00:00,1\n2024-01-01T01:00,1,5\n", stages, `t.csv:3:3: a value beyond the header's last column ("5")`},
		{"stage record quoted", "time,stage,\n\"2024-01-01T00:00\",1,,\"x\"\n", stages, "t.csv:2:4: a value beyond"},
		{"stage record trailing commas", "time,stage,,\n2024-01-01T00:00,1,,\n2024-01-01T01:00,1.1,,,\n", stages, ""},
	} {
		err := tc.read(tc.csv)
		if tc.at == "" {
			if err != nil {
				t.Errorf("%s: %v", tc.name, err)
			}
			continue
		}
		var pe *ParseError
		if !errors.Is(err, ErrBeyondHeader) || !errors.As(err, &pe) || !strings.Contains(err.Error(), tc.at) {
			t.Errorf("%s: %v, want ErrBeyondHeader at %s", tc.name, err, tc.at)
		}
	}
}

// The same in a workbook sheet, for a table and for a stage record.
func TestValueBeyondHeaderWorkbook(t *testing.T) {
	t.Parallel()
	path := writeBook(t, t.TempDir(), map[string][][]any{
		"xs":     {{"station", "elevation"}, {0, 1}, {1, 0, nil, "x"}},
		"stages": {{"time", "stage"}, {"2024-01-01T00:00:00Z", 1.0}, {"2024-01-01T01:00:00Z", 1.1, 7}},
		"fine":   {{"station", "elevation"}, {0, 1, ""}, {1, 0}},
	}, []string{"xs", "stages", "fine"})
	if _, err := ReadTable(path, "xs"); !errors.Is(err, ErrBeyondHeader) || !strings.Contains(err.Error(), "field.xlsx['xs']!D3: a value beyond") {
		t.Errorf("table: %v", err)
	} else if strings.Contains(err.Error(), "comma") || !strings.HasSuffix(err.Error(), "name its column in the header") {
		t.Errorf("table: %v: a sheet's cells hold no separators, so no advice on commas", err)
	}
	if _, err := ReadStageRecord(path, StageRecordOptions{Sheet: "stages"}); !errors.Is(err, ErrBeyondHeader) || !strings.Contains(err.Error(), "field.xlsx['stages']!C3: a value beyond") {
		t.Errorf("stage record: %v", err)
	}
	if _, err := ReadTable(path, "fine"); err != nil {
		t.Errorf("blank cell beyond the header: %v", err)
	}
}

// csvTableErr is the error of ParseCSV reading s as t.csv.
func csvTableErr(s string) error { _, err := ParseCSV(strings.NewReader(s), "t.csv"); return err }

// csvStagesErr is the error of ParseStageRecord reading s as t.csv.
func csvStagesErr(s string) error {
	_, err := ParseStageRecord(strings.NewReader(s), "t.csv", StageRecordOptions{})
	return err
}

// A CSV row with more fields than a header line ending in a named column
// is refused even when its extra fields are blank: an unquoted decimal
// comma (524,8) has shifted the row right, and its trailing comma is a
// field. A header line ending in blank fields (a spreadsheet's trailing
// empty columns) keeps its rows' blank extra fields read as before.
// A mark or note column holding a bare digit string after a whole number
// on most rows is the same split spilled into a column under the header.
// The data are invented.
func TestDecimalCommaSpill(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name, csv string
		err       error  // nil when read
		at        string // position and text the error holds
	}{
		{"trailing comma spilled", "station,elevation,mark,note\n0,731,4,left end,\n10,728.5,,\n20,729,7,right end,\n", ErrSpilledRow,
			"s.csv:2:5: more fields than the header line (5 fields, the header 4): an unquoted decimal comma?"},
		{"spreadsheet blank columns", "station,elevation,mark,note,,\n0,731.4,left end,,,\n20,729.7,right end,,,\n", nil, ""},
		{"rows as wide as the header", "station,elevation,mark,note\n0,731.4,left end,\n20,729.7,right end,\n", nil, ""},
		{"mark under the header", "station,elevation,mark,note,,\n0,731,4,left end,,\n10,728,2,,,\n20,729,7,right end,,\n", ErrSplitNumber,
			`s.csv:2:3: mark "4": a number split in two: elevation 731 then 4 on 3 of 3 rows: an unquoted decimal comma? 731,4 read as two values`},
		{"note under the header", "station,elevation,note\n0,731,4\n10,728,2\n20,729,7\n", ErrSplitNumber, "s.csv:2:3: note \"4\""},
		{"point numbers", "station,elevation,mark\n0,731,1\n10,728,2\n20,729,3\n", nil, ""},
		{"one row", "station,elevation,mark\n0,731,4\n10,728.5,\n20,729.2,\n", nil, ""},
		{"n takes the spill", "station,elevation,n,mark,,\n0,731,4,0.04,,\n20,729,7,0.04,,\n", ErrImplausible,
			`s.csv:2:3: n "4": roughness 4 is not a plausible value for Manning's n (0.005 to 1) (an unquoted decimal comma? 731,4 read as two values)`},
	} {
		_, err := ParseSection(strings.NewReader(tc.csv), "s.csv", SectionOptions{})
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
}

// A CSV row whose fields beyond a header line ending in a named column
// are all empty, with no number before them split at a comma, is refused
// saying so (remove them, or name their columns), not blamed on a
// decimal comma; one whose row holds a split number still is. The data
// are invented.
func TestTrailingEmptyFields(t *testing.T) {
	t.Parallel()
	table, stages := csvTableErr, csvStagesErr
	for _, tc := range []struct {
		name, csv string
		read      func(string) error
		at, not   string
	}{
		{"survey", "station,elevation,n,mark\n0,12.40,0.05,,,\n3,11.80,0.05,lb,,\n", table,
			"t.csv:2:5: more fields than the header line (6 fields, the header 4): the 2 fields after the header's last are empty: remove them, or name their columns in the header", "decimal comma"},
		{"one field", "station,elevation,n,mark\n0,12.40,0.05,lb,\n", table,
			"t.csv:2:5: more fields than the header line (5 fields, the header 4): the field after the header's last is empty: remove it, or name its column in the header", "decimal comma"},
		{"a split number", "station,elevation,n,mark\n0,731,4,0.04,\n", table,
			"t.csv:2:5: more fields than the header line (5 fields, the header 4): an unquoted decimal comma? 731,4 read as two values?", "are empty"},
		{"stage record", "time,stage\n2024-01-01T00:00,1.02,,\n", stages,
			"t.csv:2:3: more fields than the header line (4 fields, the header 2): the 2 fields after the header's last are empty", "decimal comma"},
	} {
		err := tc.read(tc.csv)
		if !errors.Is(err, ErrSpilledRow) || !strings.Contains(err.Error(), tc.at) || strings.Contains(err.Error(), tc.not) {
			t.Errorf("%s: %v, want ErrSpilledRow saying %q, not %q", tc.name, err, tc.at, tc.not)
		}
	}
}
