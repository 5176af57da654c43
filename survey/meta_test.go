package survey

import (
	"slices"
	"strings"
	"testing"
)

// commentedData tells the '#' lines below the header that hold values as
// encoding/csv reads the text: a line inside a quoted field is part of its
// record, and a comment's quoted comma parts no values.
func TestCommentedData(t *testing.T) {
	for _, tc := range []struct {
		name, text string
		want       []int
	}{
		{"numbered rows", "no.,stage,discharge\n#1,1,4\n#2,1.2,5.8\n3,1.4,7.8\n", []int{2, 3}},
		{"a comment", "no.,stage,discharge\n# checked by JK, with a comma\n3,1.4,7.8\n", nil},
		{"above the header", "#1,2,3\nstage,discharge\n1,2\n", nil},
		{"in a quoted note", "station,elevation,note\n0,3,\"riffle crest\n#2 pools, riffle, run\"\n1,0,\n", nil},
		{"in a quoted note, CRLF", "station,elevation,note\r\n0,3,\"riffle crest\r\n#2 pools, riffle, run\"\r\n1,0,\r\n#4,5,6\r\n", []int{5}},
		{"after a quoted note", "station,elevation,note\n0,3,\"two\nlines\"\n#3,1,x\n", []int{4}},
		{"quoted comma in a comment", "station,elevation,note\n0,3,\n# checked,\"pools, riffle\"\n1,0,\n", nil},
		{"last line without end", "stage,discharge\n1,2\n#2,3,4", []int{3}},
		{"blank lines", "stage,discharge\n\n1,2\n\n#2,3,4\n", []int{5}},
		{"a key row header", "site,Kowhai\nstage,discharge\n1,2\n#3,4,5\n", []int{4}},
	} {
		if got := commentedData([]byte(tc.text), headerLine(t, tc.text)); !slices.Equal(got, tc.want) {
			t.Errorf("%s: lines %v, want %v", tc.name, got, tc.want)
		}
	}
}

// headerLine is the line ParseCSV reads the header of text from.
func headerLine(t *testing.T, text string) int {
	t.Helper()
	tab, err := ParseCSV(strings.NewReader(text), "c.csv")
	if err != nil {
		t.Fatal(err)
	}
	return tab.HeaderRow
}

// ParseCSV warns of the hidden rows, and not of a quoted note's line.
func TestCommentedDataWarning(t *testing.T) {
	tab, err := ParseCSV(strings.NewReader("station,elevation,note\n0,3,\"riffle crest\n#2 pools, riffle, run\"\n1,0,\n"), "c.csv")
	if err != nil || len(tab.Warnings) != 0 || len(tab.Records) != 2 {
		t.Errorf("%v, warnings %q, %d records", err, tab.Warnings, len(tab.Records))
	}
}
