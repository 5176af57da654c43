package survey

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
	"testing"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
)

func formatG(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

func TestParseRatingTables(t *testing.T) {
	// A fitted lookup table as the fit command writes it: the highest row
	// that is not extrapolated is the highest gauging.
	const fit = "stage,discharge,extrapolated,basis,lower_95,upper_95,hydraulic\n" +
		"0.2,0,true,fit below gaugings,,,\n" +
		"0.5,1.4,false,fit,1.3,1.5,\n" +
		"2.6,26.1,false,fit,25,27,\n" +
		"3.0,33.0,true,scaled hydraulic,,,31\n"
	rs, err := ParseRatingTables(strings.NewReader(fit), "fit.csv", RatingTableOptions{HasZeroFlow: true, ZeroFlow: 0.2})
	if err != nil {
		t.Fatal(err)
	}
	if len(rs.Periods) != 1 || !rs.Periods[0].From.IsZero() || len(rs.Warnings) != 0 {
		t.Fatalf("periods %+v warnings %q", rs.Periods, rs.Warnings)
	}
	rt := rs.Periods[0].Rating
	if !rt.HasHighGauging || rt.HighGauging != 2.6 || !rt.HasZeroFlow || rt.Name != "fit.csv" || len(rt.Points) != 4 {
		t.Errorf("rating %+v", rt)
	}
	// Periods from a valid_from column; elevations turned into gauge
	// heights; each period's dry first row gives its zero flow.
	const periods = "valid_from,stage,discharge\n" +
		"2023-01-01T00:00Z,100.5,0\n,101.0,2\n,102.0,9\n" +
		"2024-06-01T00:00+10:00,100.6,0\n,101.2,3\n"
	rs, err = ParseRatingTables(strings.NewReader(periods), "r.csv", RatingTableOptions{Datum: 100})
	if err != nil {
		t.Fatal(err)
	}
	if len(rs.Periods) != 2 || !rs.Periods[1].From.Equal(time.Date(2024, 5, 31, 14, 0, 0, 0, time.UTC)) ||
		rs.Periods[0].Rating.Points[1].Stage != 1 || len(rs.Periods[1].Rating.Points) != 2 || len(rs.Warnings) != 0 || len(rs.Notes) != 2 ||
		rs.Periods[0].Rating.ZeroFlow != 0.5 || rs.Periods[1].Rating.ZeroFlow != rating.DecimalDifference(100.6, 100) {
		t.Errorf("periods %+v warnings %q notes %q", rs.Periods, rs.Warnings, rs.Notes)
	}
	if _, err := (gauged.History{Periods: rs.Periods}).Compile(); err != nil {
		t.Errorf("periods read do not compile: %v", err)
	}
}

func TestParseRatingTablesErrors(t *testing.T) {
	for _, tc := range []struct {
		name, in string
		opt      RatingTableOptions
		want     []string
		is       error
	}{
		{"discharge falls", "stage,discharge\n0.5,1\n1.0,3\n1.5,2.5\n", RatingTableOptions{}, []string{"r.csv:4:2", `discharge "2.5"`}, gauged.ErrRatingNotRising},
		{"stage repeats", "stage,discharge\n0.5,1\n0.5,3\n", RatingTableOptions{}, []string{"r.csv:3:1"}, gauged.ErrRatingStages},
		{"one row", "stage,discharge\n0.5,1\n", RatingTableOptions{}, []string{"r.csv:2"}, gauged.ErrRatingTooFew},
		{"e above flow", "stage,discharge\n0.5,1\n1.0,3\n", RatingTableOptions{HasZeroFlow: true, ZeroFlow: 0.6}, []string{"r.csv:2:1"}, gauged.ErrZeroFlowAbove},
		{"blank discharge", "stage,discharge\n0.5,\n1.0,3\n", RatingTableOptions{}, []string{"r.csv:2:2", "blank"}, ErrNotNumber},
		{"negative", "stage,discharge\n0.5,-1\n1.0,3\n", RatingTableOptions{}, []string{"r.csv:2:2"}, gauged.ErrRatingNegative},
		{"periods out of order", "valid_from,stage,discharge\n2024-01-01,0,0\n,1,1\n2023-01-01,0,0\n,1,2\n", RatingTableOptions{}, []string{"r.csv:4:1"}, gauged.ErrPeriodOrder},
		{"first valid_from blank", "valid_from,stage,discharge\n,0,0\n,1,1\n", RatingTableOptions{}, []string{"r.csv:2:1"}, ErrValidFromBlank},
		{"no discharge column", "stage,flow\n0,0\n", RatingTableOptions{}, []string{"discharge"}, ErrMissingColumn},
		{"no rows", "stage,discharge\n", RatingTableOptions{}, []string{"no data rows"}, ErrEmpty},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParseRatingTables(strings.NewReader(tc.in), "r.csv", tc.opt)
			if err == nil {
				t.Fatal("no error")
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not say %q", err, w)
				}
			}
			if !errors.Is(err, tc.is) {
				t.Errorf("error %q is not %v", err, tc.is)
			}
		})
	}
}

// TestKindOf: a rating and a survey are told apart by their columns.
func TestKindOf(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		header string
		want   TableKind
	}{
		{"stage,discharge", KindRating},
		{"gauge_height (m),discharge (m3/s),extrapolated", KindRating},
		{"station,elevation,n,mark", KindSection},
		{"station,elevation,stage,discharge", KindBoth},
		{"time,stage", KindUnknown},
	} {
		tab, err := ParseCSV(strings.NewReader(c.header+"\n"), "t.csv")
		if err != nil {
			t.Fatal(err)
		}
		if got := KindOf(tab); got != c.want {
			t.Errorf("%q: %v, want %v", c.header, got, c.want)
		}
	}
}

// TestRatingNameAtOffset: a rating given a start names it at the offset
// its times are read in.
func TestRatingNameAtOffset(t *testing.T) {
	t.Parallel()
	from := time.Date(2025, 2, 17, 20, 0, 0, 0, time.UTC)
	rt, err := ParseRatingTables(strings.NewReader("stage,discharge\n0.3,0.5\n1,6\n"), "r8.csv", RatingTableOptions{From: from, UTCOffset: 10 * time.Hour})
	if err != nil {
		t.Fatal(err)
	}
	if got := rt.Periods[0].Rating.Name; got != "r8.csv from 2025-02-18T06:00:00+10:00" {
		t.Errorf("name %q", got)
	}
}

// Units written in a rating table's stage and discharge headers are
// reported, to be resolved by the caller; other columns' headers are not
// read; units of two systems, or an unknown unit, are refused at the
// column.
func TestRatingTableHeaderUnits(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name, header string
		found        bool
		units        rating.Units
		text         string
		at           string // position of the first column naming a unit
	}{
		{"none", "stage,discharge", false, rating.SI, "", ""},
		{"feet", "stage (ft),discharge (ft3/s)", true, rating.US, "ft", "r.csv:1:1"},
		{"cfs only", "gauge_height,discharge [cfs]", true, rating.US, "cfs", "r.csv:1:2"},
		{"metres", "Stage (m),Discharge (m3/s),area (ft2)", true, rating.SI, "m", "r.csv:1:1"},
		{"other columns unread", "stage,discharge,lower_95 (furlongs)", false, rating.SI, "", ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rs, err := ParseRatingTables(strings.NewReader(tc.header+"\n0.5,1\n1,3\n"), "r.csv", RatingTableOptions{})
			if err != nil {
				t.Fatal(err)
			}
			u := rs.Units
			if u.Found != tc.found || (u.Found && (u.Units != tc.units || u.Text != tc.text || u.At.Position() != tc.at)) {
				t.Errorf("units %+v, want found %v %v %q at %s", u, tc.found, tc.units, tc.text, tc.at)
			}
			// Resolved as the commands do: without --units the headers
			// decide; --units of the other system is refused.
			if got, err := u.Resolve(rating.SI, false); err != nil || got != tc.units {
				t.Errorf("resolved without --units: %v %v, want %v", got, err, tc.units)
			}
			other := rating.US
			if tc.units == rating.US {
				other = rating.SI
			}
			_, err = u.Resolve(other, true)
			if tc.found != (err != nil) || (err != nil && (!errors.Is(err, ErrUnitsDisagree) || !strings.Contains(err.Error(), tc.at) ||
				!strings.Contains(err.Error(), tc.text) || !strings.Contains(err.Error(), other.String()+" units"))) {
				t.Errorf("resolved with %v given: %v", other, err)
			}
		})
	}
	for _, tc := range []struct {
		name, header, at string
		is               error
	}{
		{"mixed", "stage (ft),discharge (m3/s)", "r.csv:1:2: discharge (m3/s)", ErrMixedUnits},
		{"unknown", "stage (furlongs),discharge", "r.csv:1:1: stage (furlongs)", ErrUnknownUnit},
	} {
		_, err := ParseRatingTables(strings.NewReader(tc.header+"\n0.5,1\n1,3\n"), "r.csv", RatingTableOptions{})
		if !errors.Is(err, tc.is) || !strings.Contains(err.Error(), tc.at) {
			t.Errorf("%s: %v, want %v at %s", tc.name, err, tc.is, tc.at)
		}
	}
}

// A valid_from written on every row of a period (long format) continues the
// period above while it repeats: two periods, of three and two rows, the
// second from 2024-06-01T00:00+10:00 = 2024-05-31T14:00Z (by hand). A time
// written twice in two forms of one instant continues it too; a period
// whose time comes back after another is still out of order.
func TestParseRatingTablesLongFormat(t *testing.T) {
	const long = "valid_from,stage,discharge\n" +
		"2023-01-01T00:00Z,0.5,0\n2023-01-01T00:00Z,1.0,2\n2023-01-01T10:00+10:00,2.0,9\n" +
		"2024-06-01T00:00+10:00,0.6,0\n2024-05-31T14:00Z,1.2,3\n"
	rs, err := ParseRatingTables(strings.NewReader(long), "r.csv", RatingTableOptions{HasZeroFlow: true, ZeroFlow: 0.6})
	if err != nil {
		t.Fatal(err)
	}
	if len(rs.Periods) != 2 || len(rs.Periods[0].Rating.Points) != 3 || len(rs.Periods[1].Rating.Points) != 2 ||
		!rs.Periods[0].From.Equal(time.Date(2023, 1, 1, 0, 0, 0, 0, time.UTC)) ||
		!rs.Periods[1].From.Equal(time.Date(2024, 5, 31, 14, 0, 0, 0, time.UTC)) {
		t.Errorf("periods %+v", rs.Periods)
	}
	const back = "valid_from,stage,discharge\n2023-01-01,0.5,0\n2023-01-01,1.0,2\n2024-01-01,0.5,0\n2024-01-01,1.0,2\n2023-01-01,0.5,0\n2023-01-01,1.0,2\n"
	if _, err := ParseRatingTables(strings.NewReader(back), "r.csv", RatingTableOptions{HasZeroFlow: true, ZeroFlow: 0.5}); !errors.Is(err, gauged.ErrPeriodOrder) ||
		!strings.Contains(err.Error(), "r.csv:6:1") {
		t.Errorf("a period come back: %v", err)
	}
}

// A table whose every row is marked extrapolated rests on no gauging: its
// highest gauging stays unknown, and the reader warns that all of it is
// extrapolated. One row that is not marked sets the highest gauging.
func TestRatingTableAllExtrapolated(t *testing.T) {
	for _, tc := range []struct {
		name, in string
		high     float64 // NaN: not known
		warned   bool
	}{
		{"every row", "stage,discharge,extrapolated\n0.5,1,yes\n1,3,yes\n2,9,yes\n", math.NaN(), true},
		{"one row gauged", "stage,discharge,extrapolated\n0.5,1,no\n1,3,yes\n2,9,yes\n", 0.5, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rs, err := ParseRatingTables(strings.NewReader(tc.in), "r.csv", RatingTableOptions{})
			if err != nil {
				t.Fatal(err)
			}
			rt := rs.Periods[0].Rating
			if known := !math.IsNaN(tc.high); rt.HasHighGauging != known || (known && rt.HighGauging != tc.high) {
				t.Errorf("highest gauging %v %g, want %g", rt.HasHighGauging, rt.HighGauging, tc.high)
			}
			warned := strings.Contains(strings.Join(rs.Warnings, "\n"), "every row is marked extrapolated")
			if warned != tc.warned {
				t.Errorf("warnings %q, want the all-extrapolated warning: %v", rs.Warnings, tc.warned)
			}
		})
	}
}

// DryFoot gives a table's own gauge height of zero flow: stage less depth
// of its first row with flow where it gives depths that agree with its
// rows, else the last of its leading rows without flow.
func TestDryFoot(t *testing.T) {
	pts := func(pairs ...float64) []gauged.RatingPoint {
		var out []gauged.RatingPoint
		for i := 0; i+1 < len(pairs); i += 2 {
			out = append(out, gauged.RatingPoint{Stage: pairs[i], Discharge: pairs[i+1]})
		}
		return out
	}
	nan := math.NaN()
	for _, tc := range []struct {
		name      string
		points    []gauged.RatingPoint
		depths    []float64
		e         float64
		ok        bool
		fromDepth bool
		doubt     footDoubt
	}{
		{"one dry row", pts(0.2, 0, 0.4, 1.5, 0.6, 4), nil, 0.2, true, false, footAgrees},
		{"dry rows below the foot", pts(-0.5, 0, 0, 0, 0.2, 0, 0.4, 1.5), nil, 0.2, true, false, footAgrees},
		{"flow from the first row", pts(0.2, 0.3, 0.4, 1.5), nil, 0, false, false, footAgrees},
		{"one row", pts(0.2, 0), nil, 0, false, false, footAgrees},
		{"no rows", nil, nil, 0, false, false, footAgrees},
		{"every row dry", pts(0.2, 0, 0.4, 0), nil, 0.4, true, false, footAgrees},
		{"blank depths", pts(0.2, 0, 0.4, 1.5), []float64{nan, nan}, 0.2, true, false, footAgrees},
		// Rows straddling the lowest point, 100.37, as rate writes them on
		// stages of the user's.
		{"depth between rows", pts(100.2, 0, 100.3, 0, 100.4, 0.0037, 100.5, 0.12), []float64{0, 0, 0.03, 0.13}, 100.37, true, true, footAgrees},
		{"depth at the dry row", pts(100.37, 0, 100.47, 0.05, 100.57, 0.3), []float64{0, 0.1, 0.2}, 100.37, true, true, footAgrees},
		{"depth of a later row", pts(100.3, 0, 100.4, 0.0037, 100.5, 0.12), []float64{0, nan, 0.13}, 100.37, true, true, footAgrees},
		// Written to 4 decimals: stage less depth 100.3712 is the dry
		// row's, 100.3713, within their rounding.
		{"depth rounded at the dry row", pts(100.3713, 0, 100.4, 0.004), []float64{0, 0.0288}, 100.3713, true, true, footAgrees},
		{"depths disagree", pts(100.3, 0, 100.4, 0.0037, 100.5, 0.12), []float64{0, 0.03, 0.05}, 100.37, true, true, footDepthsDisagree},
		{"depth below the dry row", pts(100.3, 0, 100.4, 0.0037, 100.5, 0.12), []float64{0.2, 0.3, 0.4}, 100.3, true, false, footDepthBelowDry},
		{"depth at flow", pts(100.3, 0, 100.4, 0.0037, 100.5, 0.12), []float64{0, 0, 0.1}, 100.3, true, false, footDepthAtFlow},
	} {
		t.Run(tc.name, func(t *testing.T) {
			f, ok := DryFoot(tc.points, tc.depths)
			if ok != tc.ok || (ok && (f.E != tc.e || f.FromDepth != tc.fromDepth || f.doubt != tc.doubt)) {
				t.Errorf("DryFoot = %+v, %v; want e %g from depth %v doubt %d, %v", f, ok, tc.e, tc.fromDepth, tc.doubt, tc.ok)
			}
			at := func(i int) string { return "r.csv:" + strconv.Itoa(i+2) }
			if w := f.Warning(at); (w != "") != (tc.doubt != footAgrees) {
				t.Errorf("warning %q for doubt %d", w, tc.doubt)
			}
		})
	}
	// On rate's own stages a row is on the lowest point: e is that dry
	// row's stage, and the depth column agrees.
	f, _ := DryFoot(pts(100.37, 0, 100.47, 0.05, 100.57, 0.3), []float64{0, 0.1, 0.2})
	const want = "r.csv:2: the gauge height of zero flow e = 100.37 is the stage of the table's last dry row at its foot, where its depth column puts the flow's start " +
		"(the stage less the depth of its first row with flow, 100.47 − 0.1; --zero-flow not given): the table is read log-linearly in (h − e) between rows"
	if note := f.Note(func(i int) string { return "r.csv:" + strconv.Itoa(i+2) }, "--zero-flow"); note != want {
		t.Errorf("note %q, want %q", note, want)
	}
}

// triangleQ is the discharge of a triangular channel of side slopes z
// (horizontal to vertical) at depth y by Manning's formula in SI units,
// Q = (1/n)·A·R^(2/3)·S^(1/2), A = z·y², R = z·y / (2·√(1 + z²)): a power
// law in depth of exponent 8/3, which a table read log-linearly in
// (h − e) with e on the vertex reproduces exactly between any two rows
// (Chow, V.T., 1959, Open-Channel Hydraulics, McGraw-Hill: the Manning
// formula in chap. 5 and a triangle's elements in table 2-1; section and
// table numbers from memory).
func triangleQ(z, n, s, y float64) float64 {
	if y <= 0 {
		return 0
	}
	a := z * y * y
	r := z * y / (2 * math.Sqrt(1+z*z))
	return a * math.Pow(r, 2.0/3) * math.Sqrt(s) / n
}

// A table on stages that straddle the channel's lowest point (as rate
// writes one on --from/--to/--step) is read with e on that point, from its
// depth column: every reader of a rating table (for discharge, for a
// backwater boundary, for a figure) reads the closed-form power law back
// at the stages between the rows, also between the last dry row and the
// first with flow, and zero flow below the point; without a depth column
// the last dry row stands for e, and the note says the flow starts
// between it and the first row with flow.
func TestDryFootFromDepthReadsPowerLaw(t *testing.T) {
	const z, n, slope, bottom = 5.0, 0.035, 0.0015, 100.37
	var withDepth, without strings.Builder
	withDepth.WriteString("stage,depth,discharge\n")
	without.WriteString("stage,discharge\n")
	for i := 0; i <= 10; i++ {
		h := rating.StepMultiple(float64(i), 0.1) + 100
		y := math.Max(0, rating.DecimalDifference(h, bottom))
		q := formatG(triangleQ(z, n, slope, y))
		fmt.Fprintf(&withDepth, "%s,%s,%s\n", formatG(h), strconv.FormatFloat(y, 'f', 4, 64), q)
		fmt.Fprintf(&without, "%s,%s\n", formatG(h), q)
	}
	rs, err := ParseRatingTables(strings.NewReader(withDepth.String()), "t.csv", RatingTableOptions{})
	if err != nil {
		t.Fatal(err)
	}
	rt := rs.Periods[0].Rating
	if !rt.HasZeroFlow || rt.ZeroFlow != bottom || len(rs.Warnings) != 0 || len(rs.Notes) != 1 ||
		!strings.Contains(rs.Notes[0], "t.csv:6: the gauge height of zero flow e = 100.37 is the stage less the depth of the table's first row with flow (100.4 − 0.03), above its last dry row at 100.3") {
		t.Fatalf("zero flow %v at %g, warnings %q, notes %q", rt.HasZeroFlow, rt.ZeroFlow, rs.Warnings, rs.Notes)
	}
	tr, err := rt.Compile()
	if err != nil {
		t.Fatal(err)
	}
	for _, h := range []float64{100.38, 100.4, 100.45, 100.77} {
		want := triangleQ(z, n, slope, h-bottom)
		if q, how := tr.Discharge(h); how != gauged.InTable || math.Abs(q-want) > 1e-9*want {
			t.Errorf("Q(%g) = %g (%v), want %g (Manning on the triangle)", h, q, how, want)
		}
	}
	for _, h := range []float64{100.35, 100.37} {
		if q, how := tr.Discharge(h); q != 0 || how != gauged.ZeroFlow {
			t.Errorf("Q(%g) = %g (%v), want zero flow below the lowest point", h, q, how)
		}
	}
	// The backwater boundary reads the same table the same way.
	ptab, err := ParseCSV(strings.NewReader(withDepth.String()), "t.csv")
	if err != nil {
		t.Fatal(err)
	}
	br, err := BoundaryRatingFromTable(ptab)
	if err != nil {
		t.Fatal(err)
	}
	b, err := br.Boundary()
	if err != nil {
		t.Fatal(err)
	}
	if h, err := b.StageOf(triangleQ(z, n, slope, 0.08)); err != nil || math.Abs(h-100.45) > 1e-9 {
		t.Errorf("boundary stage at Q(100.45) = %g, %v; want 100.45", h, err)
	}
	if h, err := b.StageOf(0); err != nil || h != bottom {
		t.Errorf("boundary stage at zero flow = %g, %v; want %g", h, err, bottom)
	}
	if note := br.ZeroFlowNote(); !strings.Contains(note, "t.csv:6: the gauge height of zero flow e = 100.37") || len(br.Warnings) != 0 {
		t.Errorf("boundary note %q, warnings %q", note, br.Warnings)
	}
	// A figure's reader of the table finds the same e.
	table, err := ParseRatingCSV(strings.NewReader(withDepth.String()), "t.csv", UnitChoice{})
	if err != nil {
		t.Fatal(err)
	}
	if f, ok := TableDryFoot(table); !ok || f.E != bottom || !f.FromDepth {
		t.Errorf("TableDryFoot = %+v, %v; want %g from the depth column", f, ok, bottom)
	}
	// Without depths: the last dry row, said to stand below the start of
	// the flow.
	rs, err = ParseRatingTables(strings.NewReader(without.String()), "t.csv", RatingTableOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if rt := rs.Periods[0].Rating; rt.ZeroFlow != 100.3 || len(rs.Notes) != 1 ||
		!strings.Contains(rs.Notes[0], "t.csv:5: the gauge height of zero flow e = 100.3 is the stage of the table's last dry row at its foot (--zero-flow not given)") ||
		!strings.Contains(rs.Notes[0], "the flow starts at or above that row and below the first row with flow, at 100.4, and the table gives no depth to say where") {
		t.Errorf("zero flow %g, notes %q", rt.ZeroFlow, rs.Notes)
	}
}

// A depth column that contradicts the rows' flow is warned of, at its
// row, and e is then the last dry row's stage (or, for depths that
// disagree among themselves, the first row with flow's).
func TestDryFootDepthWarnings(t *testing.T) {
	for _, tc := range []struct {
		name, csv string
		e         float64
		warning   string
	}{
		{"depths disagree", "stage,depth,discharge\n100.3,0,0\n100.4,0.03,0.0037\n100.5,0.13,0.12\n100.6,0.33,0.43\n", 100.37,
			"t.csv:5: stage less depth is 100.27 here but 100.37 at the first row with flow and a depth (t.csv:3), apart by more than the table's rounding (0.02)"},
		{"below the dry row", "stage,depth,discharge\n100.3,0.15,0\n100.4,0.25,0.0037\n100.5,0.35,0.12\n", 100.3,
			"t.csv:3: stage less depth, 100.4 − 0.25 = 100.15, lies below the table's last dry row at 100.3 (t.csv:2), which has no flow: " +
				"the depth is not counted from where the flow starts (rate counts it from the section's lowest point, which may be the floor of a pocket"},
		{"at flow", "stage,depth,discharge\n100.3,0,0\n100.4,0,0.0037\n100.5,0.1,0.12\n", 100.3,
			"t.csv:3: stage less depth, 100.4 − 0 = 100.4, is not below the stage of the table's first row with flow, 100.4"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rs, err := ParseRatingTables(strings.NewReader(tc.csv), "t.csv", RatingTableOptions{})
			if err != nil {
				t.Fatal(err)
			}
			if rt := rs.Periods[0].Rating; rt.ZeroFlow != tc.e || len(rs.Warnings) != 1 || !strings.Contains(rs.Warnings[0], tc.warning) {
				t.Errorf("e = %g, warnings %q; want %g and %q", rt.ZeroFlow, rs.Warnings, tc.e, tc.warning)
			}
		})
	}
	// A bad depth cell is an error at the cell.
	_, err := ParseRatingTables(strings.NewReader("stage,depth,discharge\n100.3,0,0\n100.4,x,0.0037\n"), "t.csv", RatingTableOptions{})
	if err == nil || !strings.Contains(err.Error(), "t.csv:3:2") {
		t.Errorf("bad depth: %v", err)
	}
}

// A row without flow above a given gauge height of zero flow contradicts
// it: refused by the readers for discharge, as a row with flow at or
// below it is; warned of by the figure's reader.
func TestDryRowAboveGivenZeroFlow(t *testing.T) {
	const table = "stage,discharge\n0.25,0\n0.35,0.40\n0.55,2.9\n"
	_, err := ParseRatingTables(strings.NewReader(table), "b.csv", RatingTableOptions{HasZeroFlow: true, ZeroFlow: 0.1})
	if !errors.Is(err, gauged.ErrDryAboveZeroFlow) || !strings.Contains(err.Error(), "b.csv:2:1") {
		t.Errorf("error %v, want %v at b.csv:2:1", err, gauged.ErrDryAboveZeroFlow)
	}
	for _, e := range []float64{0.25, 0.3} {
		if _, err := ParseRatingTables(strings.NewReader(table), "b.csv", RatingTableOptions{HasZeroFlow: true, ZeroFlow: e}); err != nil {
			t.Errorf("e = %g at or above the dry row: %v", e, err)
		}
	}
	ptab, err := ParseCSV(strings.NewReader(table), "b.csv")
	if err != nil {
		t.Fatal(err)
	}
	rt, err := RatingFromTableGiven(ptab, UnitChoice{}, ZeroFlowGiven{Given: true, Value: 0.1})
	if err != nil || len(rt.Warnings) != 1 || !strings.Contains(rt.Warnings[0], "b.csv:2: this row, at stage 0.25, has no flow, yet lies above the gauge height of zero flow 0.1 that --zero-flow gives") {
		t.Errorf("warnings %q, %v", rt.Warnings, err)
	}
}

// One rule reads every rating table: e from the zero flow given (said in
// an input note), else a
// hydraulic rating written from a section (dry rows at its foot) is read
// with its own gauge height of zero flow, the stage of its last dry row,
// said in an input note naming that row and the flag, with no warning; a
// table with neither is read linearly, with a warning naming the flag.
func TestRatingTablesZeroFlowAtDryFoot(t *testing.T) {
	const table = "stage,discharge\n99.5,0\n100.0,0\n100.5,1.2\n101.0,4.8\n"
	const wet = "stage,discharge\n100.5,1.2\n101.0,4.8\n"
	for _, tc := range []struct {
		name, table string
		opt         RatingTableOptions
		has         bool
		e           float64
		warning     string
		note        string
	}{
		{"at the dry foot", table, RatingTableOptions{Datum: 100}, true, 0, "",
			"hydraulic.csv:3: the gauge height of zero flow e = 0 is the stage of the table's last dry row at its foot (--zero-flow not given): the table is read log-linearly in (h − e) between rows; " +
				"the flow starts at or above that row and below the first row with flow, at 0.5, and the table gives no depth to say where"},
		{"at the dry foot, flag named", table, RatingTableOptions{Datum: 100, ZeroFlowFlag: "--hydraulic-zero-flow"}, true, 0, "", "(--hydraulic-zero-flow not given)"},
		{"given", table, RatingTableOptions{Datum: 100, HasZeroFlow: true, ZeroFlow: 0.2}, true, 0.2, "",
			"hydraulic.csv: the gauge height of zero flow e = 0.2 is given by --zero-flow: the table is read log-linearly in (h − e) between rows"},
		{"no dry row", wet, RatingTableOptions{Datum: 100}, false, 0,
			"hydraulic.csv: the table has no row without flow and --zero-flow is not given, so it is read linearly in stage between rows; give --zero-flow E", ""},
		{"no dry row, given", wet, RatingTableOptions{Datum: 100, HasZeroFlow: true, ZeroFlow: 0.2}, true, 0.2, "", "e = 0.2 is given by --zero-flow"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rs, err := ParseRatingTables(strings.NewReader(tc.table), "hydraulic.csv", tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			rt := rs.Periods[0].Rating
			if rt.HasZeroFlow != tc.has || (tc.has && rt.ZeroFlow != tc.e) {
				t.Errorf("zero flow %v at %g; want %v at %g", rt.HasZeroFlow, rt.ZeroFlow, tc.has, tc.e)
			}
			if tc.warning == "" && len(rs.Warnings) > 0 || tc.warning != "" && (len(rs.Warnings) != 1 || !strings.Contains(rs.Warnings[0], tc.warning)) {
				t.Errorf("warnings %q, want %q", rs.Warnings, tc.warning)
			}
			if tc.note == "" && len(rs.Notes) > 0 || tc.note != "" && (len(rs.Notes) != 1 || !strings.Contains(rs.Notes[0], tc.note)) {
				t.Errorf("notes %q, want %q", rs.Notes, tc.note)
			}
			if _, err := rt.Compile(); err != nil {
				t.Errorf("the rating read does not compile: %v", err)
			}
		})
	}
}

// TestZeroFlowColumnWarned: a rating table's column naming a gauge height
// of zero flow (a descriptor table with an offset on each row) is not
// read; both rating readers warn of it at its header, with its values and
// how zero flow is given, by the flag that gives it, not when the column
// holds the one zero flow given, and naming the value given when it holds
// another.
func TestZeroFlowColumnWarned(t *testing.T) {
	const unread = "this column is not read"
	for _, tc := range []struct {
		name, csv string
		opt       RatingTableOptions
		want      string // both readers' warnings hold it; "" for none
	}{
		// The offsets of the two segments of a published two-offset
		// rating (testdata/reference/rating-12323720-two-offsets.csv).
		{"two offsets", "stage (ft),discharge (ft3/s),offset (ft)\n3.66,0.78,3.58\n4.87,61.27,3.58\n6.59,243.71,3.30\n", RatingTableOptions{},
			"r.csv:1:3: offset (ft): this column is not read, yet names a gauge height of zero flow (it holds 3.58, 3.30): give the table's with --zero-flow"},
		{"two offsets with one --zero-flow", "stage,discharge,offset\n3.66,0.78,3.58\n4.87,61.27,3.58\n6.59,243.71,3.30\n",
			RatingTableOptions{HasZeroFlow: true, ZeroFlow: 3.58}, "(it holds 3.58, 3.30), where --zero-flow gives 3.58 (one value a rating file): check which is the table's; a rating whose periods"},
		{"e", "stage,discharge,e\n1,2,0.5\n2,5,\n", RatingTableOptions{}, "r.csv:1:3: e: " + unread},
		{"zero flow", "stage,discharge,Zero Flow\n1,2,0.5\n2,5,0.5\n", RatingTableOptions{}, "(it holds 0.5)"},
		{"gzf", "gauge_height,discharge,GZF\n1,2,0.5\n2,5,0.5\n", RatingTableOptions{}, "GZF: " + unread},
		{"offset1", "stage,discharge,offset1\n1,2,0.5\n2,5,0.5\n", RatingTableOptions{}, "offset1: " + unread},
		{"the one --zero-flow given", "stage,discharge,offset\n1,2,0.5\n2,5,0.5\n", RatingTableOptions{HasZeroFlow: true, ZeroFlow: 0.5}, ""},
		{"another --zero-flow given", "stage,discharge,offset\n1,2,0.32\n2,5,0.32\n", RatingTableOptions{HasZeroFlow: true, ZeroFlow: 0.3},
			"(it holds 0.32), where --zero-flow gives 0.3 (one value a rating file): check which is the table's"},
		{"a fit's hydraulic rating", "stage,discharge,offset\n1,2,0.32\n2,5,0.32\n", RatingTableOptions{ZeroFlowFlag: "--hydraulic-zero-flow"},
			"give the table's with --hydraulic-zero-flow (one value a rating file)"},
		{"its zero flow given", "stage,discharge,offset\n1,2,0.32\n2,5,0.32\n", RatingTableOptions{ZeroFlowFlag: "--hydraulic-zero-flow", HasZeroFlow: true, ZeroFlow: 0.25},
			"where --hydraulic-zero-flow gives 0.25"},
		{"blank", "stage,discharge,offset\n1,2,\n2,5,\n", RatingTableOptions{}, ""},
		{"another column", "stage,discharge,offsets_note\n1,2,x\n2,5,y\n", RatingTableOptions{}, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rt, err := ParseRatingTables(strings.NewReader(tc.csv), "r.csv", tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			tab, err := ParseCSV(strings.NewReader(tc.csv), "r.csv")
			if err != nil {
				t.Fatal(err)
			}
			one, err := RatingFromTableGiven(tab, UnitChoice{}, ZeroFlowGiven{Given: tc.opt.HasZeroFlow, Value: tc.opt.ZeroFlow, Flag: tc.opt.ZeroFlowFlag})
			if err != nil {
				t.Fatal(err)
			}
			for _, c := range []struct {
				reader   string
				warnings []string
			}{{"RatingTablesFromTable", rt.Warnings}, {"RatingFromTableGiven", one.Warnings}} {
				got := strings.Join(c.warnings, "\n")
				if tc.want == "" && strings.Contains(got, unread) || tc.want != "" && !strings.Contains(got, tc.want) {
					t.Errorf("%s: warnings %q, want %q", c.reader, got, tc.want)
				}
			}
		})
	}
}

// Where e came from is said with the rating (ZeroFlowSource), and a given
// e that differs from the depth column's by more than the table's rounding
// is warned of; a table whose first row already has flow (rate --from
// above the lowest point) takes e from its depth column too: stage less
// depth of its first row with flow and a depth. The rows are Manning's
// discharge on a triangle with its vertex at 100.37 (triangleQ: Chow 1959),
// a power law in (h − 100.37) that the log-linear reading with that e
// gives back exactly between rows.
func TestRatingTableZeroFlowSources(t *testing.T) {
	const z, n, slope, bottom = 5.0, 0.035, 0.0015, 100.37
	table := func(from int, blankFirst bool, fit bool) string {
		var b strings.Builder
		b.WriteString("stage,depth,discharge")
		if fit {
			b.WriteString(",basis")
		}
		b.WriteString("\n")
		for i := from; i <= 10; i++ {
			h := rating.StepMultiple(float64(i), 0.1) + 100
			y := math.Max(0, rating.DecimalDifference(h, bottom))
			d := strconv.FormatFloat(y, 'f', 4, 64)
			if blankFirst && i == from {
				d = ""
			}
			fmt.Fprintf(&b, "%s,%s,%s", formatG(h), d, formatG(triangleQ(z, n, slope, y)))
			if fit {
				b.WriteString(",fit")
			}
			b.WriteString("\n")
		}
		return b.String()
	}
	for _, tc := range []struct {
		name, csv string
		opt       RatingTableOptions
		e         float64
		source    string
		note      string
		warning   string
	}{
		{"depth column", table(0, false, false), RatingTableOptions{}, bottom, "the table's depth column", "e = 100.37 is the stage less the depth", ""},
		{"given, agreeing within the rounding", table(0, false, false), RatingTableOptions{HasZeroFlow: true, ZeroFlow: 100.38}, 100.38, "given by --zero-flow",
			"t.csv: the gauge height of zero flow e = 100.38 is given by --zero-flow", ""},
		{"given, against the depth column", table(0, false, false), RatingTableOptions{HasZeroFlow: true, ZeroFlow: 100.33}, 100.33, "given by --zero-flow",
			"e = 100.33 is given by --zero-flow",
			"t.csv:6: --zero-flow gives the gauge height of zero flow e = 100.33, but the table's depth column puts the flow's start at 100.37 (the stage less the depth of its first row with flow, 100.4 − 0.03), apart by more than the table's rounding (0.02)"},
		{"first row with flow", table(4, false, false), RatingTableOptions{}, bottom, "the table's depth column",
			"t.csv:2: the gauge height of zero flow e = 100.37 is the stage less the depth of the table's first row with flow (100.4 − 0.03), below its first row, at 100.4, which already has flow (--zero-flow not given)", ""},
		{"first row with flow, its depth blank", table(4, true, false), RatingTableOptions{}, bottom, "the table's depth column",
			"t.csv:3: the gauge height of zero flow e = 100.37 is the stage less the depth of the table's first row with flow and a depth (100.5 − 0.13)", ""},
		{"first row with flow, given against it", table(4, false, false), RatingTableOptions{HasZeroFlow: true, ZeroFlow: 100.3}, 100.3, "given by --zero-flow",
			"e = 100.3 is given by --zero-flow", "t.csv:2: --zero-flow gives the gauge height of zero flow e = 100.3, but the table's depth column puts the flow's start at 100.37"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rs, err := ParseRatingTables(strings.NewReader(tc.csv), "t.csv", tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			rt := rs.Periods[0].Rating
			if !rt.HasZeroFlow || rt.ZeroFlow != tc.e || rt.ZeroFlowSource != tc.source {
				t.Errorf("e %v %g from %q, want %g from %q", rt.HasZeroFlow, rt.ZeroFlow, rt.ZeroFlowSource, tc.e, tc.source)
			}
			if len(rs.Notes) != 1 || !strings.Contains(rs.Notes[0], tc.note) {
				t.Errorf("notes %q, want one with %q", rs.Notes, tc.note)
			}
			if tc.warning == "" && len(rs.Warnings) > 0 || tc.warning != "" && (len(rs.Warnings) != 1 || !strings.Contains(rs.Warnings[0], tc.warning)) {
				t.Errorf("warnings %q, want %q", rs.Warnings, tc.warning)
			}
			if tc.opt.HasZeroFlow {
				return
			}
			tr, err := rt.Compile()
			if err != nil {
				t.Fatal(err)
			}
			for _, h := range []float64{100.45, 100.55, 100.95} {
				want := triangleQ(z, n, slope, h-bottom)
				if q, _ := tr.Discharge(h); math.Abs(q-want) > 1e-5*want {
					t.Errorf("Q(%g) = %g, want %g (Manning on the triangle)", h, q, want)
				}
			}
		})
	}
}

// A fit's table begins at its fitted offset, a row without flow: the note
// says e is the fit's offset rather than that the flow starts somewhere
// above that row, and the source says so.
func TestRatingTableFitOffset(t *testing.T) {
	const fit = "stage,discharge,extrapolated,basis\n0.612938,0,true,fit below gaugings\n0.65,0.00416444,true,fit below gaugings\n0.74,0.0669896,false,fit\n"
	rs, err := ParseRatingTables(strings.NewReader(fit), "fit.csv", RatingTableOptions{})
	if err != nil {
		t.Fatal(err)
	}
	rt := rs.Periods[0].Rating
	if rt.ZeroFlow != 0.612938 || rt.ZeroFlowSource != "the fit's offset, the table's first row" || len(rs.Notes) != 1 ||
		!strings.Contains(rs.Notes[0], "fit.csv:2: the gauge height of zero flow e = 0.612938 is the stage of the table's last dry row at its foot") ||
		!strings.Contains(rs.Notes[0], "e is the fit's offset") || strings.Contains(rs.Notes[0], "the flow starts at or above that row") {
		t.Errorf("e %g from %q, notes %q", rt.ZeroFlow, rt.ZeroFlowSource, rs.Notes)
	}
}
