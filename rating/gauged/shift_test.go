package gauged

import (
	"errors"
	"math"
	"strings"
	"testing"
	"time"
)

// shiftTol is the tolerance on hand-computed shifts (round-off).
const shiftTol = 1e-12

func march(d int) time.Time { return time.Date(2024, 3, d, 0, 0, 0, 0, time.UTC) }

// TestShiftTaper: stage-only diagrams tapering to zero, by hand.
//
// Points (0.5, −0.10), (1.0, −0.06), taper at 1.5:
//
//	h = 0.3:  below the first point, constant: −0.10
//	h = 0.75: half-way 0.5 → 1.0: −0.10 + 0.5·0.04 = −0.08
//	h = 1.25: half-way 1.0 → 1.5: −0.06 + 0.5·0.06 = −0.03
//	h = 2.0:  above the taper: 0
//
// One point (0.4, 0.12), taper at 1.0: h = 0.7 is half-way, 0.06; a taper
// below the point, (0.4, 0.12) with taper 0.2: h = 0.3 gives 0.06, h = 0.1
// gives 0.
func TestShiftTaper(t *testing.T) {
	two := ShiftDiagram{Points: []ShiftPoint{{0.5, -0.10}, {1.0, -0.06}}, HasTaper: true, Taper: 1.5}
	one := ShiftDiagram{Points: []ShiftPoint{{0.4, 0.12}}, HasTaper: true, Taper: 1.0}
	low := ShiftDiagram{Points: []ShiftPoint{{0.4, 0.12}}, HasTaper: true, Taper: 0.2}
	constant := ShiftDiagram{Points: []ShiftPoint{{math.NaN(), 0.07}}}
	for _, tc := range []struct {
		d    ShiftDiagram
		h, s float64
	}{
		{two, 0.3, -0.10}, {two, 0.75, -0.08}, {two, 1.25, -0.03}, {two, 1.5, 0}, {two, 2.0, 0},
		{one, 0.3, 0.12}, {one, 0.7, 0.06}, {one, 1.2, 0},
		{low, 0.1, 0}, {low, 0.3, 0.06}, {low, 0.9, 0.12},
		{constant, -5, 0.07}, {constant, 12, 0.07},
	} {
		if err := tc.d.Validate(); err != nil {
			t.Fatal(err)
		}
		if s := tc.d.At(tc.h); math.Abs(s-tc.s) > shiftTol {
			t.Errorf("%+v at %g: %v, want %v", tc.d.Points, tc.h, s, tc.s)
		}
	}
}

// TestShiftRefused: a diagram whose slope ds/dh is −1 or steeper is
// refused; the error names the point (or the taper).
//
//	(0.5, 0.30) → (0.7, 0.05): slope −0.25/0.2 = −1.25
//	(0.5, 0.25) → (0.75, 0): slope −0.25/0.25 = −1 exactly (refused too)
//	(1.0, 0.5), taper at 1.25: slope −0.5/0.25 = −2
//	(0.5, 0.25) → (0.75, 0.0001): slope −0.9996, accepted
func TestShiftRefused(t *testing.T) {
	for _, tc := range []struct {
		name  string
		d     ShiftDiagram
		point int
		taper bool
	}{
		{"steeper", ShiftDiagram{Points: []ShiftPoint{{0.2, 0.3}, {0.5, 0.30}, {0.7, 0.05}}}, 2, false},
		{"exactly -1", ShiftDiagram{Points: []ShiftPoint{{0.5, 0.25}, {0.75, 0}}}, 1, false},
		{"taper", ShiftDiagram{Points: []ShiftPoint{{1.0, 0.5}}, HasTaper: true, Taper: 1.25}, -1, true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			err := tc.d.Validate()
			var se *ShiftError
			if !errors.Is(err, ErrShiftSlope) || !errors.As(err, &se) || se.Point != tc.point || se.Taper != tc.taper {
				t.Errorf("error %v, want ErrShiftSlope at point %d (taper %v)", err, tc.point, tc.taper)
			}
			if _, err := (History{Periods: []Period{{Rating: &RatingTable{Points: []RatingPoint{{0, 0}, {2, 5}}}}}, Shifts: []ShiftDiagram{tc.d}}).Compile(); !errors.Is(err, ErrShiftSlope) {
				t.Errorf("History.Compile: %v, want ErrShiftSlope", err)
			}
		})
	}
	ok := ShiftDiagram{Points: []ShiftPoint{{0.5, 0.25}, {0.75, 0.0001}}}
	if err := ok.Validate(); err != nil {
		t.Errorf("slope −0.9996: %v", err)
	}
}

func TestShiftValidate(t *testing.T) {
	for _, tc := range []struct {
		name string
		d    ShiftDiagram
		is   error
	}{
		{"empty", ShiftDiagram{}, ErrShiftEmpty},
		{"same stage", ShiftDiagram{Points: []ShiftPoint{{1, 0.1}, {1, 0.2}}}, ErrShiftStages},
		{"unsorted", ShiftDiagram{Points: []ShiftPoint{{1, 0.1}, {0.5, 0.2}}}, ErrShiftStages},
		{"taper inside", ShiftDiagram{Points: []ShiftPoint{{1, 0.1}, {2, 0.2}}, HasTaper: true, Taper: 1.5}, ErrTaperInside},
		{"no stage with a taper", ShiftDiagram{Points: []ShiftPoint{{math.NaN(), 0.1}}, HasTaper: true, Taper: 1.5}, ErrShiftNoStage},
		{"infinite shift", ShiftDiagram{Points: []ShiftPoint{{1, math.Inf(1)}}}, ErrShiftNotFinite},
	} {
		if err := tc.d.Validate(); !errors.Is(err, tc.is) {
			t.Errorf("%s: %v, want %v", tc.name, err, tc.is)
		}
	}
}

// Rows gather into diagrams by time, sorted by stage; errors name the row
// and field; a diagram read back from its rows is the same.
func TestDiagramsFromRows(t *testing.T) {
	nan := math.NaN()
	rows := []ShiftRow{
		{Time: march(1), Stage: 1.0, Shift: -0.06, HasTaper: true, Taper: 1.5},
		{Time: march(1), Stage: 0.5, Shift: -0.10},
		{Time: march(9), Stage: nan, Shift: 0.02, Abrupt: true},
	}
	ds, err := DiagramsFromRows(rows)
	if err != nil {
		t.Fatal(err)
	}
	if len(ds) != 2 || len(ds[0].Points) != 2 || ds[0].Points[0].Stage != 0.5 || !ds[0].HasTaper || ds[0].Taper != 1.5 || !ds[1].Abrupt {
		t.Fatalf("diagrams %+v", ds)
	}
	back, err := DiagramsFromRows(append(ds[0].Rows(), ds[1].Rows()...))
	if err != nil || len(back) != 2 || back[0].At(1.25) != ds[0].At(1.25) || back[1].At(3) != 0.02 {
		t.Errorf("read back %+v, %v", back, err)
	}
	for _, tc := range []struct {
		name  string
		rows  []ShiftRow
		row   int
		field string
		is    error
		says  string // in the message, naming the other row by what it holds ("" not checked)
	}{
		{"steep", []ShiftRow{{Time: march(1), Stage: 0.5, Shift: 0.3}, {Time: march(1), Stage: 0.7, Shift: 0.05}}, 1, "shift", ErrShiftSlope, ""},
		{"steep unsorted", []ShiftRow{{Time: march(1), Stage: 0.7, Shift: 0.05}, {Time: march(1), Stage: 0.5, Shift: 0.3}}, 0, "shift", ErrShiftSlope, ""},
		{"taper steep", []ShiftRow{{Time: march(1), Stage: 1, Shift: 0.5}, {Time: march(1), Stage: 0.5, Shift: 0.5, HasTaper: true, Taper: 1.25}}, 1, "taper", ErrShiftSlope, ""},
		{"taper conflict", []ShiftRow{{Time: march(1), Stage: 1, Shift: 0.1, HasTaper: true, Taper: 2}, {Time: march(1), Stage: 0.5, Shift: 0.1, HasTaper: true, Taper: 3}}, 1, "taper", ErrShiftConflict,
			"taper 3, the row at stage 1 says 2"},
		{"time order", []ShiftRow{{Time: march(5), Stage: 1, Shift: 0.1}, {Time: march(2), Stage: 1, Shift: 0.1}}, 1, "time", ErrShiftTime,
			"is not after the diagram before it (" + march(5).Format(time.RFC3339) + ")"},
		{"time again", []ShiftRow{{Time: march(2), Stage: 1, Shift: 0.1}, {Time: march(5), Stage: 1, Shift: 0.1}, {Time: march(2), Stage: 2, Shift: 0.1}}, 2, "time", ErrShiftTime,
			"is not after the diagram before it (" + march(5).Format(time.RFC3339) + ")"},
		{"same stage", []ShiftRow{{Time: march(1), Stage: 1, Shift: 0.1}, {Time: march(1), Stage: 1, Shift: 0.2}}, 1, "stage", ErrShiftStages, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := DiagramsFromRows(tc.rows)
			var re *ShiftRowError
			if !errors.Is(err, tc.is) || !errors.As(err, &re) || re.Row != tc.row || re.Field != tc.field {
				t.Errorf("error %v, want %v at row %d field %s", err, tc.is, tc.row, tc.field)
			}
			if tc.says != "" && (err == nil || !strings.Contains(err.Error(), tc.says)) {
				t.Errorf("error %v does not say %q", err, tc.says)
			}
		})
	}
}
