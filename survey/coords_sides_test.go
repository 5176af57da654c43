package survey

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"
)

// A coordinate survey without pins takes its left end from the survey
// order, unless its bank marks that name a side all lie on the other
// side that way: a crew shooting from the right bank writes ltob at the
// left bank all the same, and the section is then oriented by the marks
// (the left bank on the left looking downstream), said in the note. Two
// marks naming one side contradict each other and are refused, naming
// both. A flow direction given, the pins or the line given still decide,
// and marks lying the other way are then refused (ErrSidesDisagree),
// naming what set the side and saying what to check first. The section is the invented skewSt one, laid at
// azimuth 120° with no offsets, so that the principal axis is that line;
// its banks are at stations 9 and 27 (points 3 and 6).
func TestCoordinateSurveyBankSides(t *testing.T) {
	for _, tc := range []struct {
		name        string
		left, right string    // marks at stations 9 and 27
		pins        [2]string // marks at stations 0 and 38
		reversed    bool      // surveyed from the right end (station 38 first)
		opt         CoordinateOptions
		err         error
		errText     []string
		wantLeft    string
		wantBanks   [2]float64 // stations of the banks
		wantFlipped bool       // Projection.Reversed
	}{
		{name: "ltob rtob shot from the right", left: "LTOB", right: "RTOB", reversed: true,
			wantLeft: LeftFromBanks, wantBanks: [2]float64{9, 27}, wantFlipped: true},
		{name: "lb and tob shot from the right", left: "LB", right: "tob", reversed: true,
			wantLeft: LeftFromBanks, wantBanks: [2]float64{9, 27}, wantFlipped: true},
		{name: "tob and right bank shot from the right", left: "top of bank", right: "right bank", reversed: true,
			wantLeft: LeftFromBanks, wantBanks: [2]float64{9, 27}, wantFlipped: true},
		{name: "ltob rtob shot from the left", left: "LTOB", right: "RTOB",
			wantLeft: LeftFromOrder, wantBanks: [2]float64{9, 27}},
		{name: "generic marks keep the survey order", left: "tob", right: "tob", reversed: true,
			wantLeft: LeftFromOrder, wantBanks: [2]float64{38 - 27, 38 - 9}},
		{name: "two left marks", left: "LTOB", right: "LB", reversed: true, err: ErrBankSides,
			errText: []string{`"LB" at row 4`, `"LTOB" at row 7`, "--flow-azimuth"}},
		{name: "two right marks", left: "rb", right: "RTOB", err: ErrBankSides,
			errText: []string{`"rb" at row 4`, `"RTOB" at row 7`, "--flow-azimuth"}},
		// Flowing at 30°, the right bank looking downstream lies towards
		// 120°, the direction of increasing station: the flow direction
		// agrees with the marks.
		{name: "flow direction agrees", left: "LTOB", right: "RTOB", reversed: true, opt: CoordinateOptions{FlowAzimuth: 30, FlowGiven: true},
			wantLeft: LeftFromFlow, wantBanks: [2]float64{9, 27}, wantFlipped: true},
		// When the pins, the flow direction or the line given set the
		// left bank, marks lying the other way are refused naming what
		// set it, the marks, and what to check first.
		{name: "flow direction against the marks", left: "LTOB", right: "RTOB", opt: CoordinateOptions{FlowAzimuth: 210, FlowGiven: true},
			err: ErrSidesDisagree, errText: []string{"xs.csv:1: ", "(--flow-azimuth 210)", `"LTOB" (row 4) on the right bank`, `"RTOB" (row 7) on the left bank`,
				"check the azimuth", "the marks agree with 30)"}},
		{name: "flow direction against the marks and pins", left: "LTOB", right: "RTOB", pins: [2]string{"LPIN", "RPIN"},
			opt: CoordinateOptions{FlowAzimuth: 210, FlowGiven: true}, err: ErrSidesDisagree,
			errText: []string{"(--flow-azimuth 210)", `the end pins, "LPIN" (row 2) and "RPIN" (row 9), agree with the marks: check the azimuth`, "agree with 30)"}},
		{name: "flow direction and pins against the marks", left: "LTOB", right: "RTOB", pins: [2]string{"RPIN", "LPIN"},
			opt: CoordinateOptions{FlowAzimuth: 210, FlowGiven: true}, err: ErrSidesDisagree,
			errText: []string{"(--flow-azimuth 210)", `agree with the azimuth: check the bank marks`}},
		{name: "pins swapped", left: "LTOB", right: "RTOB", pins: [2]string{"right pin", "left pin"}, err: ErrSidesDisagree,
			errText: []string{`xs.csv:9:5: mark "left pin": `, `the end pins, "left pin" (row 9) and "right pin" (row 2)`,
				`"RTOB" (row 7) on the left bank and "LTOB" (row 4) on the right bank`, "check the pins' labels"}},
		{name: "pins swapped, one mark naming a side", left: "tob", right: "RTOB", pins: [2]string{"right pin", "left pin"}, err: ErrSidesDisagree,
			errText: []string{`which put "RTOB" (row 7) on the left bank looking downstream`}},
		{name: "pins agree", left: "LTOB", right: "RTOB", pins: [2]string{"left pin", "right pin"},
			wantLeft: LeftFromPins, wantBanks: [2]float64{9, 27}},
		{name: "line given from the right end", left: "LTOB", right: "RTOB",
			opt: CoordinateOptions{Given: true, Line: [4]float64{640000 + 38*math.Sin(120*math.Pi/180), 5100000 + 38*math.Cos(120*math.Pi/180), 640000, 5100000}},
			err: ErrSidesDisagree, errText: []string{"(--line, its first point the left end)", "check the order of the line's two ends"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			st, off, z := slices.Clone(skewSt), make([]float64, len(skewSt)), slices.Clone(skewZ)
			marks := []string{tc.pins[0], "", tc.left, "", "", tc.right, "", tc.pins[1]}
			n := []string{"0.05", "", "", "", "", "", "", ""}
			if tc.reversed {
				slices.Reverse(st)
				slices.Reverse(off)
				slices.Reverse(z)
				slices.Reverse(marks)
			}
			text := skewedLine(640000, 5100000, 120, st, off, z, n, marks)
			sv, err := ParseSection(strings.NewReader(text), "xs.csv", SectionOptions{Coordinates: tc.opt})
			if tc.err != nil {
				if !errors.Is(err, tc.err) {
					t.Fatalf("error %v, want %v", err, tc.err)
				}
				for _, w := range tc.errText {
					if !strings.Contains(err.Error(), w) {
						t.Errorf("error %q does not say %q", err, w)
					}
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			pr, sec := sv.Projection, sv.Section
			if pr.Left != tc.wantLeft || pr.Reversed != tc.wantFlipped {
				t.Errorf("left %q reversed %v, want %q %v", pr.Left, pr.Reversed, tc.wantLeft, tc.wantFlipped)
			}
			if !closeRel(sec.LeftBank, tc.wantBanks[0], 1e-9, 1e-9) || !closeRel(sec.RightBank, tc.wantBanks[1], 1e-9, 1e-9) {
				t.Errorf("banks %g %g, want %v", sec.LeftBank, sec.RightBank, tc.wantBanks)
			}
			if !strings.Contains(sv.ProjectionNote.Text, "left bank from "+tc.wantLeft) {
				t.Errorf("note %q does not say the left bank came from %q", sv.ProjectionNote.Text, tc.wantLeft)
			}
		})
	}
}
