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
		{"decimal comma", "station,elevation\n0,1\n1,0,5\n2,1\n", table, `t.csv:3:3: a value beyond the header's last column ("5"): name its column in the header, or quote a value that holds a comma`},
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
