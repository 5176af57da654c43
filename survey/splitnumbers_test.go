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
