package survey

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"wetline/rating"
)

func TestParseGaugings(t *testing.T) {
	const in = "# comment\ntime,gauge_height (m),discharge,quality,note\n" +
		"2024-03-05T14:30,1.25,3.4,good,wading\n" +
		"2024-04-01,1.80,7.9,E,\n" +
		"2024-05-02 08:15:00,2.1,12.5,,\n"
	gs, err := ParseGaugings(strings.NewReader(in), "g.csv")
	if err != nil {
		t.Fatal(err)
	}
	if len(gs.Gaugings) != 3 {
		t.Fatalf("got %d gaugings, want 3", len(gs.Gaugings))
	}
	g := gs.Gaugings[0]
	want := time.Date(2024, 3, 5, 14, 30, 0, 0, time.UTC)
	if !g.Time.Equal(want) || g.Stage != 1.25 || g.Discharge != 3.4 || g.Quality != rating.Good || g.Note != "wading" || g.Source != "g.csv:3" {
		t.Errorf("first gauging = %+v", g)
	}
	if gs.Gaugings[1].Quality != rating.Excellent || gs.Gaugings[2].Quality != rating.Unrated {
		t.Errorf("qualities = %v, %v", gs.Gaugings[1].Quality, gs.Gaugings[2].Quality)
	}
}

// Bad gaugings: each error names the row and column, and every bad row of
// the file is reported together.
func TestParseGaugingsErrors(t *testing.T) {
	for _, tc := range []struct {
		name, in string
		want     []string
		is       error
	}{
		{"negative discharge", "time,stage,discharge\n2024-01-01,1,-3\n", []string{"g.csv:2:3", "must not be negative"}, ErrNegativeDischarge},
		{"denormal discharge", "time,stage,discharge\n2024-01-01,1,3\n2024-02-01,1.1,4.9e-324\n", []string{"g.csv:3:3", "below 1e-06"}, ErrImplausible},
		{"discharge below the bound", "time,stage,discharge\n2024-01-01,1,9.9e-7\n", []string{"g.csv:2:3", "above 0 but below 1e-06"}, ErrImplausible},
		{"bad date", "time,stage,discharge\n2024-13-45,1,3\n", []string{"g.csv:2:1", `time "2024-13-45"`}, ErrISOTime},
		{"serial in csv", "time,stage,discharge\n45000,1,3\n", []string{"g.csv:2:1"}, ErrSerialInCSV},
		{"duplicate time", "time,stage,discharge\n2024-01-01T10:00,1,3\n2024-01-01T10:00,1.1,3.5\n", []string{"g.csv:3:1", "row 2"}, ErrDuplicateTime},
		{"duplicate instant", "time,stage,discharge\n2024-01-01T10:00+01:00,1,3\n2024-01-01T09:00:00Z,1.1,3.5\n", []string{"g.csv:3:1", "row 2"}, ErrDuplicateTime},
		{"blank stage", "time,stage,discharge\n2024-01-01,,3\n", []string{"g.csv:2:2", "stage is blank"}, ErrNotNumber},
		{"quality word", "time,stage,discharge,quality\n2024-01-01,1,3,superb\n", []string{"g.csv:2:4"}, rating.ErrQuality},
		{"no discharge column", "time,stage,flow\n2024-01-01,1,3\n", []string{"discharge"}, ErrMissingColumn},
		{"no rows", "time,stage,discharge\n", []string{"no data rows"}, ErrEmpty},
		{"two rows bad", "time,stage,discharge\nx,1,3\n2024-01-02,1,-1\n", []string{"g.csv:2:1", "g.csv:3:3"}, ErrISOTime},
		{"uncertainty not a number", "time,stage,discharge,uncertainty\n2024-01-01,1,3,five\n", []string{"g.csv:2:4", `"five"`}, ErrNotNumber},
		{"uncertainty zero", "time,stage,discharge,uncertainty\n2024-01-01,1,3,0\n", []string{"g.csv:2:4", "above 0"}, ErrUncertainty},
		{"uncertainty negative", "time,stage,discharge,exclude,uncertainty (%)\n2024-01-01,1,3,,-4\n", []string{"g.csv:2:5"}, ErrUncertainty},
		{"uncertainty 100", "time,stage,discharge,uncertainty\n2024-01-01,1,3,7\n2024-01-02,2,9,100\n", []string{"g.csv:3:4"}, ErrUncertainty},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParseGaugings(strings.NewReader(tc.in), "g.csv")
			if err == nil {
				t.Fatal("no error")
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not contain %q", err, w)
				}
			}
			if !errors.Is(err, tc.is) {
				t.Errorf("error %q is not %v", err, tc.is)
			}
		})
	}
}

// The smallest gauged discharges are read: zero (a dry channel) and
// MinGaugedDischarge itself.
func TestParseGaugingsSmallestDischarge(t *testing.T) {
	gs, err := ParseGaugings(strings.NewReader("time,stage,discharge\n2024-01-01,0.2,0\n2024-02-01,0.3,1e-6\n2024-03-01,0.4,0.0001\n"), "g.csv")
	if err != nil {
		t.Fatal(err)
	}
	if len(gs.Gaugings) != 3 || gs.Gaugings[1].Discharge != 1e-6 {
		t.Errorf("gaugings %+v", gs.Gaugings)
	}
}

// The optional uncertainty (percent at 95 %) and exclude columns: a blank
// uncertainty leaves the quality's band in force, any text excludes.
func TestParseGaugingsUncertaintyExclude(t *testing.T) {
	const in = "time,stage,discharge,quality,uncertainty (%),exclude\n" +
		"2024-03-05T14:30,1.25,3.4,good,6.5,\n" +
		"2024-04-01,1.80,7.9,fair,,  weed on the control \n" +
		"2024-05-02,2.1,12.5,,,\n"
	gs, err := ParseGaugings(strings.NewReader(in), "g.csv")
	if err != nil {
		t.Fatal(err)
	}
	g := gs.Gaugings
	if len(g) != 3 || g[0].Uncertainty != 6.5 || g[0].Exclude != "" || g[1].Uncertainty != 0 || g[1].Exclude != "weed on the control" || g[2].Exclude != "" {
		t.Fatalf("gaugings %+v", g)
	}
	// 6.5 % at 95 % is σ = 0.065/1.96 in ln Q; a fair gauging without a
	// number takes the fair band, 8 % (Gauging.LogSigma).
	if s := g[0].LogSigma(); math.Abs(s-0.065/1.959963984540054) > 1e-12 {
		t.Errorf("σ = %g", s)
	}
	if u := g[1].UncertaintyPercent(); u != rating.FairBandPercent {
		t.Errorf("fair uncertainty %g", u)
	}
}

// A workbook date serial is read in the workbook's date system: serial
// 45000 is 2023-03-15 in the 1900 system (excelize.ExcelDateToTime; the
// 1904 system counts 1462 days less, ECMA-376 Part 1, 18.17.4.1, from memory).
func TestGaugingsWorkbookSerial(t *testing.T) {
	tab := &Table{File: "f.xlsx", Sheet: "gaugings", Header: []string{"time", "stage", "discharge"}, HeaderRow: 1,
		Records: []Record{{Row: 2, Cells: []string{"45000.5", "1.2", "3"}}}}
	gs, err := GaugingsFromTable(tab)
	if err != nil {
		t.Fatal(err)
	}
	if want := time.Date(2023, 3, 15, 12, 0, 0, 0, time.UTC); !gs.Gaugings[0].Time.Equal(want) {
		t.Errorf("time = %v, want %v", gs.Gaugings[0].Time, want)
	}
	tab.Date1904 = true
	gs, err = GaugingsFromTable(tab)
	if err != nil {
		t.Fatal(err)
	}
	if want := time.Date(2027, 3, 16, 12, 0, 0, 0, time.UTC); !gs.Gaugings[0].Time.Equal(want) {
		t.Errorf("1904 time = %v, want %v", gs.Gaugings[0].Time, want)
	}
}

// ReadGaugings finds the sheet named gaugings in a workbook.
func TestReadGaugingsWorkbook(t *testing.T) {
	f := excelize.NewFile()
	defer f.Close()
	if _, err := f.NewSheet("Gaugings"); err != nil {
		t.Fatal(err)
	}
	rows := [][]any{{"time", "stage", "discharge", "quality"}, {45000.25, 1.5, 4.25, "fair"}, {45030, 1.7, 5.5, "good"}}
	for i, r := range rows {
		cell, _ := excelize.CoordinatesToCellName(1, i+1)
		if err := f.SetSheetRow("Gaugings", cell, &r); err != nil {
			t.Fatal(err)
		}
	}
	path := t.TempDir() + "/field.xlsx"
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	gs, err := ReadGaugings(path, "")
	if err != nil {
		t.Fatal(err)
	}
	if gs.Sheet != "Gaugings" || len(gs.Gaugings) != 2 || gs.Gaugings[0].Discharge != 4.25 || gs.Gaugings[0].Quality != rating.Fair {
		t.Errorf("got %+v", gs)
	}
	if !strings.Contains(gs.Gaugings[1].Source, "row 3") {
		t.Errorf("source %q does not name row 3", gs.Gaugings[1].Source)
	}
}

func FuzzParseGaugings(f *testing.F) {
	f.Add("time,stage,discharge\n2024-01-01,1,3\n")
	f.Add("date,time,stage,discharge\n2024-03-04,09:15,9.9,0.14\n2024-04-11,13:40,10.1,0.7\n")
	f.Add("time,gauge_height,discharge,quality,note\n2024-01-01T10:00:00Z,1.5,3,poor,x\n2024-01-01T10:00:00+01:00,1,,g,\n")
	f.Add("time,stage,discharge,uncertainty,exclude\n2024-01-01,1,3,7.5,\n2024-01-02,1.2,4,,moss\n2024-01-03,1.4,5,1e2, \n2024-01-04,1.5,6,NaN,x\n")
	f.Add("site,Kowhai Stream\nsite id,KW-3\nno.,time,stage,discharge\n#1,2024-01-01T09:00,1,4\n#2,2024-01-02T09:00,1.2,5.8\n# checked, \"JK, PM\"\n")
	f.Add("time,stage,discharge,note\n2024-01-01,1,3,\"gauged from the bridge\n#2 pools, riffle\"\n")
	f.Fuzz(func(t *testing.T, in string) {
		gs, err := ParseGaugings(strings.NewReader(in), "f.csv")
		if err != nil {
			return
		}
		for _, g := range gs.Gaugings {
			if g.Discharge < 0 || g.Stage != g.Stage || g.Source == "" || g.Uncertainty < 0 || g.Uncertainty >= MaxUncertaintyPercent || g.Exclude != strings.TrimSpace(g.Exclude) {
				t.Fatalf("accepted bad gauging %+v", g)
			}
		}
	})
}

// TestGaugingPlausibilityWarnings: one measurement entered twice is
// warned of; ordinary gaugings are not (gauge heights spanning more than
// a river rises: TestGaugingSpanWarnings). The limit is common practice
// (see twinWithin).
func TestGaugingPlausibilityWarnings(t *testing.T) {
	const head = "time,gauge_height%s,discharge,exclude\n"
	for _, tc := range []struct {
		name, unit, rows string
		want             []string // substrings of the one warning expected
	}{
		{"ordinary", "", "2024-03-05T10:00,0.62,1.2,\n2024-06-01T10:00,3.35,60.1,\n", nil},
		{"entered twice", "", "2024-03-05T10:00,1.251,4.50,\n2024-03-05T10:45,1.253,4.50,\n",
			[]string{"g.csv:2 and g.csv:3, 45 minutes apart, have the same gauge height and discharge"}},
		{"entered twice out of order", "", "2024-03-05T10:45,1.253,4.50,\n2024-01-01T10:00,0.9,2.0,\n2024-03-05T10:00,1.251,4.50,\n",
			[]string{"g.csv:4 and g.csv:2, 45 minutes apart"}},
		{"repeat with another discharge", "", "2024-03-05T10:00,1.251,4.50,\n2024-03-05T10:45,1.253,4.62,\n", nil},
		{"next day", "", "2024-03-05T10:00,1.251,4.50,\n2024-03-06T10:00,1.251,4.50,\n", nil},
		{"one excluded", "", "2024-03-05T10:00,1.251,4.50,\n2024-03-05T10:45,1.253,4.50,copied row\n", nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			gs, err := ParseGaugings(strings.NewReader(fmt.Sprintf(head, tc.unit)+tc.rows), "g.csv")
			if err != nil {
				t.Fatal(err)
			}
			if want := min(1, len(tc.want)); len(gs.Warnings) != want { // each case is warned once or not at all
				t.Fatalf("warnings %q, want %d", gs.Warnings, want)
			}
			for _, w := range tc.want {
				if !strings.Contains(strings.Join(gs.Warnings, "\n"), w) {
					t.Errorf("warnings %q: want %q", gs.Warnings, w)
				}
			}
		})
	}
}
