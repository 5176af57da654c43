package survey

import (
	"errors"
	"fmt"
	"strconv"
	"strings"
	"testing"
)

// ratingReaders are every reader of a rating table, each given CSV text
// named r.csv: the table read back for plot, the rating periods read for
// compare, fit, shifts and record, and the boundary rating of backwater.
var ratingReaders = map[string]func(string) error{
	"RatingFromTable": func(s string) error {
		_, err := ParseRatingCSV(strings.NewReader(s), "r.csv", UnitChoice{})
		return err
	},
	"RatingTablesFromTable": func(s string) error {
		_, err := ParseRatingTables(strings.NewReader(s), "r.csv", RatingTableOptions{})
		return err
	},
	"BoundaryRatingFromTable": func(s string) error {
		t, err := ParseCSV(strings.NewReader(s), "r.csv")
		if err != nil {
			return err
		}
		_, err = BoundaryRatingFromTable(t)
		return err
	},
}

// Every rating-table reader refuses the same implausible stages (beyond
// ±MaxElevation) and discharges (above rating.MaxDischarge) at their
// cell, and reads the same values at the bounds.
func TestRatingReadersBounds(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name, csv string
		at        string // "" when the table is read
	}{
		{"discharge 1e308", "stage,discharge\n1,0\n2,1e308\n", "r.csv:3:2: discharge \"1e308\": discharge 1e+308 is not a plausible value"},
		{"discharge above the bound", "stage,discharge\n1,0\n2,100000001\n", "r.csv:3:2: discharge"},
		{"stage above the bound", "stage,discharge\n1,0\n100001,5\n", "r.csv:3:1: stage \"100001\": stage 100001 is not a plausible value"},
		{"stage below the bound", "stage,discharge\n-100001,0\n1,5\n", "r.csv:2:1: stage"},
		{"stage in a later column", "discharge,stage\n0,1\n5,2e5\n", "r.csv:3:2: stage"},
		{"at the bounds", "stage,discharge\n-100000,0\n100000,100000000\n", ""},
	} {
		for name, read := range ratingReaders {
			err := read(tc.csv)
			if tc.at == "" {
				if err != nil {
					t.Errorf("%s, %s: %v", tc.name, name, err)
				}
				continue
			}
			var pe *ParseError
			if !errors.Is(err, ErrImplausible) || !errors.As(err, &pe) || !strings.Contains(err.Error(), tc.at) {
				t.Errorf("%s, %s: %v, want ErrImplausible at %s", tc.name, name, err, tc.at)
			}
		}
	}
}

// Shift diagrams bound their stages, taper stages and shifts by
// ±MaxElevation, as stages are bounded elsewhere, at the cell.
func TestShiftDiagramBounds(t *testing.T) {
	t.Parallel()
	const head = "time,stage,shift,taper,abrupt\n"
	for _, tc := range []struct {
		name, csv string
		at        string // "" when the table is read
	}{
		{"stage", head + "2024-03-01,1e308,0.1,,\n", "s.csv:2:2: stage \"1e308\": stage 1e+308 is not a plausible value"},
		{"stage below", head + "2024-03-01,-100001,0.1,,\n", "s.csv:2:2: stage"},
		{"shift", head + "2024-03-01,1,1e300,,\n", "s.csv:2:3: shift \"1e300\": shift 1e+300 is not a plausible value"},
		{"shift below", head + "2024-03-01,1,-2e5,,\n", "s.csv:2:3: shift"},
		{"taper", head + "2024-03-01,1,0.1,1e200,\n", "s.csv:2:4: taper \"1e200\": taper 1e+200 is not a plausible value"},
		{"at the bounds", head + "2024-03-01,-99999,100000,100000,\n2024-04-01,,-100000,,\n", ""},
	} {
		_, err := ParseShiftDiagrams(strings.NewReader(tc.csv), "s.csv", ShiftTableOptions{})
		if tc.at == "" {
			if err != nil {
				t.Errorf("%s: %v", tc.name, err)
			}
			continue
		}
		var pe *ParseError
		if !errors.Is(err, ErrImplausible) || !errors.As(err, &pe) || !strings.Contains(err.Error(), tc.at) {
			t.Errorf("%s: %v, want ErrImplausible at %s", tc.name, err, tc.at)
		}
	}
}

// The property columns of a rating table, as plot reads them back, are
// bounded as its stage and discharge are (MaxArea and the others): a
// value beyond its bound is refused at its cell, one at the bound read.
func TestRatingPropertyBounds(t *testing.T) {
	t.Parallel()
	for _, f := range ratingFields() {
		for _, tc := range []struct {
			v  string
			ok bool
		}{
			{strconv.FormatFloat(f.limit, 'g', -1, 64), true},
			{strconv.FormatFloat(-f.limit, 'g', -1, 64), true},
			{strconv.FormatFloat(f.limit*1.5, 'g', -1, 64), false},
			{"1.7976931348623157e308", false},
			{"-1e308", false},
		} {
			csv := "stage,discharge," + f.name + "\n100.5,1,1\n101,5," + tc.v + "\n101.5,10,2\n"
			_, err := ParseRatingCSV(strings.NewReader(csv), "r.csv", UnitChoice{})
			at := "r.csv:3:3: " + f.name + " \"" + tc.v + "\": " + strings.ReplaceAll(f.name, "_", " ")
			switch {
			case tc.ok && err != nil:
				t.Errorf("%s %s: %v", f.name, tc.v, err)
			case !tc.ok && (!errors.Is(err, ErrImplausible) || !strings.Contains(fmt.Sprint(err), at)):
				t.Errorf("%s %s: %v, want ErrImplausible at %s", f.name, tc.v, err, at)
			}
		}
	}
}

// A fit's bands and hydraulic discharges read back are bounded as
// discharges are (rating.MaxDischarge), at their cell.
func TestFitRowsBounds(t *testing.T) {
	t.Parallel()
	for _, col := range []string{ColFitLower, ColFitUpper, ColFitTotalLower, ColFitTotalUpper, "hydraulic"} {
		csv := "stage,discharge,basis," + col + "\n1,1,fit,1\n2,5,fit,1e308\n"
		tb, err := ParseCSV(strings.NewReader(csv), "r.csv")
		if err != nil {
			t.Fatal(err)
		}
		rt, err := RatingFromTable(tb, UnitChoice{})
		if err != nil {
			t.Fatal(err)
		}
		_, err = FitRowsFromTable(tb, rt)
		if !errors.Is(err, ErrImplausible) || errors.Is(err, ErrFitBasis) || !strings.Contains(fmt.Sprint(err), "r.csv:3:4: ") {
			t.Errorf("%s 1e308: %v, want ErrImplausible at r.csv:3:4", col, err)
		}
	}
}
