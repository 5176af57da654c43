package survey

import (
	"errors"
	"math"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
)

func TestRatingFromTableErrors(t *testing.T) {
	for _, tc := range []struct {
		name, csv, want string
		is              error
	}{
		{"no discharge column", "stage,area\n1,2\n", `needs a column named "discharge"`, ErrMissingColumn},
		{"blank stage", "stage,discharge\n1,2\n,3\n", "t.csv:3:1: stage", ErrNotNumber},
		{"bad discharge", "stage,discharge\n1,x\n", `t.csv:2:2: discharge "x"`, ErrNotNumber},
		{"bad optional", "stage,discharge,alpha\n1,2,1;2\n", `t.csv:2:3: alpha`, ErrNotNumber},
		{"empty", "stage,discharge\n", "no data rows", ErrEmpty},
		{"stage decreasing", "stage,discharge\n1,0\n2,1\n1.5,2\n", "t.csv:4:1: stage", ErrRatingStageOrder},
		{"stage repeated", "stage,discharge\n1,0\n1,0\n2,1\n", "t.csv:3:1: stage", ErrRatingStageOrder},
		{"stage decreasing in a later column", "discharge,stage\n0,2\n1,1\n", "t.csv:3:2: stage", ErrRatingStageOrder},
		{"negative discharge", "stage,discharge\n1,0\n2,-5\n3,9\n", `t.csv:3:2: discharge "-5"`, gauged.ErrRatingNegative},
		{"two periods", "valid_from,stage,discharge\n2024-01-01,1,0\n,2,5\n2025-01-01,1,0\n,2,6\n", "t.csv: holds 2 rating periods (a valid_from column)", ErrRatingPeriods},
		{"three periods, times repeated", "valid_from,stage,discharge\n2023-01-01,1,0\n2024-01-01,1,0\n2024-01-01,2,5\n2025-01-01,1,0\n", "holds 3 rating periods", ErrRatingPeriods},
		{"negative discharge in a later column", "discharge,stage\n-0.001,1\n2,2\n", `t.csv:2:1: discharge "-0.001"`, gauged.ErrRatingNegative},
	} {
		_, err := ParseRatingCSV(strings.NewReader(tc.csv), "t.csv", UnitChoice{})
		if err == nil || !strings.Contains(err.Error(), tc.want) || !errors.Is(err, tc.is) {
			t.Errorf("%s: error %v, want %q (%v)", tc.name, err, tc.want, tc.is)
		}
	}
}

// One time in a valid_from column, written again or in another form of
// the same instant (of the same form, with or without an offset), is one
// rating and is read.
func TestRatingFromTableOnePeriod(t *testing.T) {
	for _, csv := range []string{
		"valid_from,stage,discharge\n2024-01-01,1,0\n,2,5\n",
		"valid_from,stage,discharge\n2024-01-01,1,0\n2024-01-01T00:00:00,2,5\n2024-01-01 00:00,3,9\n",
		"valid_from,stage,discharge\n2024-01-01T10:00+10:00,1,0\n2024-01-01T00:00:00Z,2,5\n",
	} {
		tab, err := ParseRatingCSV(strings.NewReader(csv), "t.csv", UnitChoice{})
		if err != nil || len(tab.Rows) < 2 {
			t.Errorf("%q: %d rows, %v", csv, len(tab.Rows), err)
		}
	}
}

// The times of a valid_from column are read as those of every other
// reader (see ParseISOTime): a time that is not one, a year outside
// MinYear to MaxYear, or a form with an offset in a file whose first time
// has none (or the other way round), is a ParseError at its cell, with
// the message RatingTablesFromTable gives for the same cell.
func TestRatingFromTableTimes(t *testing.T) {
	head := "valid_from,stage,discharge\n"
	for _, tc := range []struct {
		name, csv string
		is        error
		row       int
		want      string
	}{
		{"year 1", head + "0001-01-01,1,0\n,2,5\n", ErrYear, 2, "t.csv:2:1: valid_from \"0001-01-01\": year 1 is not a plausible year"},
		{"year 2201", head + "2201-01-01T00:00Z,1,0\n,2,5\n", ErrYear, 2, "year 2201"},
		{"with an offset after none", head + "2024-01-01,1,0\n2024-01-01T00:00Z,2,5\n", ErrMixedOffsets, 3, "t.csv:3:1: valid_from \"2024-01-01T00:00Z\": times with and without a UTC offset in one file: row 3 has one, row 2 has none"},
		{"none after an offset", head + "2024-01-01T00:00+00:00,1,0\n2024-01-01,2,5\n", ErrMixedOffsets, 3, "row 2 has one, row 3 has none"},
		{"not a time", head + "2024-13-01,1,0\n,2,5\n", ErrISOTime, 2, "t.csv:2:1: valid_from \"2024-13-01\": not an ISO 8601 date-time"},
		{"day first", head + "01/02/2024,1,0\n,2,5\n", ErrAmbiguousDate, 2, "ambiguous (day-first or month-first): write ISO 8601 (2024-02-01 day-first, 2024-01-02 month-first)"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParseRatingCSV(strings.NewReader(tc.csv), "t.csv", UnitChoice{})
			checkCellError(t, err, tc.is, tc.row, 1, tc.want)
			_, other := ParseRatingTables(strings.NewReader(tc.csv), "t.csv", RatingTableOptions{})
			if err != nil && other != nil && err.Error() != other.Error() {
				t.Errorf("RatingFromTable says %q, RatingTablesFromTable %q", err, other)
			}
		})
	}
}

func FuzzParseRatingCSV(f *testing.F) {
	for _, s := range []string{
		"stage,discharge\n1,2\n",
		"stage,depth,area,discharge,alpha\n10,0,0,0,\n10.5,0.5,2,1.2,1.0\n",
		"stage,discharge\n1,nan\n",
		"\ufeffstage;discharge\n1;2\n",
		"# c\nStage (m),Discharge (m3/s)\n1,2,3\n",
		"stage,discharge\n-2e5,0\n2,1e308\n",
		"site,Kowhai Stream\ndatum,gauge datum\nstage,discharge\n1,2\n#2,1.5,3\n",
		"stage,discharge,depth\n1,0,0\n2,3,1\n3,2,2\n",
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		tab, err := ParseRatingCSV(strings.NewReader(s), "f.csv", UnitChoice{})
		if err != nil {
			return
		}
		for i, r := range tab.Rows {
			if math.IsNaN(r.Stage) || math.IsInf(r.Stage, 0) || math.IsNaN(r.Discharge) {
				t.Fatalf("row with an undefined stage or discharge: %+v", r)
			}
			if r.Discharge < 0 {
				t.Fatalf("negative discharge accepted: %+v", r)
			}
			if math.Abs(r.Stage) > MaxElevation || r.Discharge > rating.MaxDischarge {
				t.Fatalf("implausible row accepted: %+v", r)
			}
			if i > 0 && !(r.Stage > tab.Rows[i-1].Stage) {
				t.Fatalf("stage %g after %g accepted", r.Stage, tab.Rows[i-1].Stage)
			}
		}
	})
}

// Units written in a rating table's headers decide its unit system, and
// contradict --units with an error naming the column.
func TestRatingTableUnits(t *testing.T) {
	const us = "stage (ft),discharge (cfs)\n1,2\n"
	tab, err := ParseRatingCSV(strings.NewReader(us), "t.csv", UnitChoice{})
	if err != nil || tab.Units != rating.US {
		t.Fatalf("headers in feet: units %v, %v", tab.Units, err)
	}
	_, err = ParseRatingCSV(strings.NewReader(us), "t.csv", UnitChoice{Units: rating.SI, Given: true})
	if !errors.Is(err, ErrUnitsDisagree) || !strings.Contains(err.Error(), "t.csv:1:1: stage (ft)") {
		t.Errorf("feet table with si asked for: %v", err)
	}
}

// TestRatingFromTableKind checks what a rating table read back says it
// is. Conveyance is defined by Q = K·S^½ (Chow 1959, section 6-2, from
// memory), so the rows of a uniform-flow table by Manning's equation give
// one friction slope S = (Q/K)²; a step-backwater table's rows each have
// their own. The uniform rows below are Q = K·√0.0012 written to six
// significant digits, as rate writes them; the varying ones are the first
// rows of a step-backwater table (invented); a table whose flags column
// carries backwater's own flags (unsettled, critical_stage) is one
// whatever its slopes, while rate's flags (pools, above_end) say nothing
// of the method. A fit's table is told by the columns only a fit writes
// (basis, the band bounds), not by extrapolated.
func TestRatingFromTableKind(t *testing.T) {
	for _, tc := range []struct {
		name, csv string
		slope     float64 // NaN: none
		kind      string
	}{
		{"uniform flow", "stage,conveyance,discharge\n100.3,0,0\n100.4,0.871846,0.0302016\n100.5,5.35796,0.185605\n101,92.2038,3.19403\n",
			0.0012, ""},
		{"friction slope varies", "stage,conveyance,discharge\n100.7915,42.4931,2\n100.9757,85.2777,4\n101.1163,129.367,6\n",
			math.NaN(), ""},
		{"one flowing row", "stage,conveyance,discharge\n100.3,0,0\n100.4,0.871846,0.0302016\n", math.NaN(), ""},
		{"no conveyance", "stage,discharge\n1,0\n2,1\n", math.NaN(), ""},
		{"fit table", "stage,discharge,extrapolated,basis\n0.4,0.036,true,fit below gaugings\n0.46,0.123,false,fit\n", math.NaN(), KindFitted},
		{"fit table, bands only", "stage,discharge,lower_95,upper_95\n0.4,0.036,0.03,0.04\n0.46,0.123,0.11,0.13\n", math.NaN(), KindFitted},
		{"fit table, total band only", "stage,discharge,total_lower_95,total_upper_95\n0.4,0.036,0.03,0.04\n0.46,0.123,0.11,0.13\n", math.NaN(), KindFitted},
		// The README's rating table may mark rows above the highest
		// gauging: a plain rating still, not a fit's.
		{"rating table marking extrapolated rows", "stage,discharge,extrapolated\n0.4,0.036,\n0.5,0.2,yes\n", math.NaN(), ""},
		{"step-backwater, unsettled", "stage,conveyance,discharge,flags\n100.7915,42.4931,2,unsettled\n100.9757,85.2777,4,\n101.1163,129.367,6,\n",
			math.NaN(), KindBackwater},
		{"step-backwater, critical and above an end", "stage,conveyance,discharge,flags\n100.7915,42.4931,2,critical_stage\n100.9757,85.2777,4,\n101.1163,129.367,6,above_end\n",
			math.NaN(), KindBackwater},
		{"rate's flags only", "stage,conveyance,discharge,flags\n100.3,0,0,\n100.4,0.871846,0.0302016,pools\n100.5,5.35796,0.185605,\n101,92.2038,3.19403,above_end\n",
			0.0012, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			tab, err := ParseRatingCSV(strings.NewReader(tc.csv), "t.csv", UnitChoice{})
			if err != nil {
				t.Fatal(err)
			}
			if !(tab.Slope == tc.slope || math.IsNaN(tab.Slope) && math.IsNaN(tc.slope)) || tab.Kind != tc.kind {
				t.Errorf("slope %g kind %q, want %g %q", tab.Slope, tab.Kind, tc.slope, tc.kind)
			}
		})
	}
}

// Every reader of a rating table takes gauge_height for stage, as the
// README's rating format says, and refuses a table giving both.
func TestRatingGaugeHeight(t *testing.T) {
	const body = "0.5,0\n1,2.5\n2,9\n"
	readers := map[string]func(tab *Table) error{
		"plot and compare (RatingFromTable)": func(tab *Table) error { _, err := RatingFromTable(tab, UnitChoice{}); return err },
		"backwater boundary":                 func(tab *Table) error { _, err := BoundaryRatingFromTable(tab); return err },
		"record and shifts":                  func(tab *Table) error { _, err := RatingTablesFromTable(tab, RatingTableOptions{}); return err },
	}
	for name, read := range readers {
		for _, head := range []string{"gauge_height,discharge\n", "Gauge Height (m),discharge (m3/s)\n"} {
			tab, err := ParseCSV(strings.NewReader(head+body), "r.csv")
			if err != nil {
				t.Fatal(err)
			}
			if err := read(tab); err != nil {
				t.Errorf("%s, header %q: %v", name, strings.TrimSpace(head), err)
			}
		}
		tab, err := ParseCSV(strings.NewReader("stage,gauge_height,discharge\n0.5,0.5,0\n1,1,2.5\n"), "r.csv")
		if err != nil {
			t.Fatal(err)
		}
		if err := read(tab); !errors.Is(err, ErrAliasColumns) {
			t.Errorf("%s, both stage and gauge_height: %v, want ErrAliasColumns", name, err)
		}
	}
}

// A survey naming one of its columns twice, under two of its names, is
// refused at the later one: easting and x (perhaps grid and local
// coordinates), northing and y, elevation and z, n and manning_n.
func TestSectionAliasColumns(t *testing.T) {
	for _, tc := range []struct {
		header string
		col    int
	}{
		{"easting,northing,x,elevation", 3},
		{"x,y,easting,northing,elevation", 3},
		{"easting,y,northing,elevation", 3},
		{"station,elevation,z", 3},
		{"station,elevation,n,manning_n", 4},
	} {
		cells := strings.Repeat("1,", strings.Count(tc.header, ","))
		tab, err := ParseCSV(strings.NewReader(tc.header+"\n"+cells+"1\n"+cells+"2\n"), "s.csv")
		if err != nil {
			t.Fatal(err)
		}
		_, err = SectionFromTable(tab, SectionOptions{})
		var pe *ParseError
		if !errors.Is(err, ErrAliasColumns) || !errors.As(err, &pe) || pe.Row != 1 || pe.Column != tc.col {
			t.Errorf("%s: %v, want ErrAliasColumns at row 1, column %d", tc.header, err, tc.col)
		}
	}
}

// A rating table whose discharge falls as stage rises is read, with a
// warning naming the first such row; one whose discharge never falls
// gets none.
func TestRatingFallingDischarge(t *testing.T) {
	for _, tc := range []struct {
		body, want string
	}{
		{"stage,discharge,depth\n1,0,0\n2,3,1\n3,2,2\n4,5,3\n", "r.csv:4: discharge falls as stage rises at 1 row, the first from 3 at 2 (row 3) to 2 at 3"},
		{"stage,discharge,depth\n1,0,0\n\n2,3,1\n\n3,2,2\n4,5,3\n", "r.csv:6: discharge falls as stage rises at 1 row, the first from 3 at 2 (row 4) to 2 at 3"},
		{"stage,discharge,depth\n1,0,0\n2,3,1\n3,3,2\n4,5,3\n", ""},
	} {
		tab, err := RatingFromTable(mustCSV(t, tc.body), UnitChoice{})
		if err != nil {
			t.Fatal(err)
		}
		got := strings.Join(tab.Warnings, "\n")
		if (tc.want == "") != (got == "") || !strings.Contains(got, tc.want) {
			t.Errorf("%q: warnings %q, want %q", tc.body, got, tc.want)
		}
	}
}

// The warnings of a rating table name its sheet and the row: the falling
// discharge at its row. A table with no depth column is not warned of:
// nothing read from it rests on a bottom.
func TestRatingWarningsInSheet(t *testing.T) {
	tab := mustCSV(t, "stage,discharge\n1,0\n2,3\n3,2\n")
	tab.File, tab.Sheet = "field.xlsx", "XS-2"
	r, err := RatingFromTable(tab, UnitChoice{})
	if err != nil {
		t.Fatal(err)
	}
	got := strings.Join(r.Warnings, "\n")
	for _, want := range []string{"field.xlsx['XS-2'] row 4: discharge falls as stage rises at 1 row, the first from 3 at 2 (row 3)"} {
		if !strings.Contains(got, want) {
			t.Errorf("warnings %q, want %q", got, want)
		}
	}
	if strings.Contains(got, "depth") || len(r.Warnings) != 1 {
		t.Errorf("warnings %q, want only the falling discharge", got)
	}
}

func mustCSV(t *testing.T, body string) *Table {
	t.Helper()
	tab, err := ParseCSV(strings.NewReader(body), "r.csv")
	if err != nil {
		t.Fatal(err)
	}
	return tab
}

// A rating table is named for its section: by its sheet, but by the
// workbook for a results workbook's "rating" sheet, without the suffixes
// rate's outputs add.
func TestRatingSection(t *testing.T) {
	for _, tc := range []struct{ file, sheet, want string }{
		{"out/kus.xlsx", "rating", "kus"},
		{"tallow-xs1-results.xlsx", "Rating", "tallow-xs1"},
		{"lo/fit-res.xlsx", "fitted rating", "fit-res"},
		{"tallow-xs1-rating.csv", "", "tallow-xs1"},
		{"field.xlsx", "XS-2", "XS-2"},
	} {
		if got := ratingSection(&Table{File: tc.file, Sheet: tc.sheet}); got != tc.want {
			t.Errorf("%s['%s']: %q, want %q", tc.file, tc.sheet, got, tc.want)
		}
	}
}

// TestRatingFromTableFlags: each row's flags are the words of its flags
// column, blank for none.
func TestRatingFromTableFlags(t *testing.T) {
	tab, err := ParseRatingCSV(strings.NewReader("stage,discharge,flags\n1,0,\n2,5,above_end unsettled\n3,9, critical_stage \n"), "t.csv", UnitChoice{})
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, r := range tab.Rows {
		got = append(got, strings.Join(r.Flags, "+"))
	}
	if want := []string{"", "above_end+unsettled", "critical_stage"}; strings.Join(got, "|") != strings.Join(want, "|") {
		t.Errorf("flags %q, want %q", got, want)
	}
}
