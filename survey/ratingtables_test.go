package survey

import (
	"errors"
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

// DryFoot gives a table's own gauge height of zero flow: the last of its
// leading rows without flow.
func TestDryFoot(t *testing.T) {
	pts := func(pairs ...float64) []gauged.RatingPoint {
		var out []gauged.RatingPoint
		for i := 0; i+1 < len(pairs); i += 2 {
			out = append(out, gauged.RatingPoint{Stage: pairs[i], Discharge: pairs[i+1]})
		}
		return out
	}
	for _, tc := range []struct {
		name   string
		points []gauged.RatingPoint
		e      float64
		ok     bool
	}{
		{"one dry row", pts(0.2, 0, 0.4, 1.5, 0.6, 4), 0.2, true},
		{"dry rows below the foot", pts(-0.5, 0, 0, 0, 0.2, 0, 0.4, 1.5), 0.2, true},
		{"flow from the first row", pts(0.2, 0.3, 0.4, 1.5), 0, false},
		{"one row", pts(0.2, 0), 0, false},
		{"no rows", nil, 0, false},
		{"every row dry", pts(0.2, 0, 0.4, 0), 0.4, true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			e, ok := DryFoot(tc.points)
			if ok != tc.ok || (ok && e != tc.e) {
				t.Errorf("DryFoot = %g, %v; want %g, %v", e, ok, tc.e, tc.ok)
			}
		})
	}
}

// One rule reads every rating table: e from the zero flow given, else a
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
			"hydraulic.csv:3: the gauge height of zero flow e = 0 is the stage of the table's last dry row at its foot (--zero-flow not given): the table is read log-linearly in (h − e) between rows"},
		{"at the dry foot, flag named", table, RatingTableOptions{Datum: 100, ZeroFlowFlag: "--hydraulic-zero-flow"}, true, 0, "", "(--hydraulic-zero-flow not given)"},
		{"given", table, RatingTableOptions{Datum: 100, HasZeroFlow: true, ZeroFlow: 0.2}, true, 0.2, "", ""},
		{"no dry row", wet, RatingTableOptions{Datum: 100}, false, 0,
			"hydraulic.csv: the table has no row without flow and --zero-flow is not given, so it is read linearly in stage between rows; give --zero-flow E", ""},
		{"no dry row, given", wet, RatingTableOptions{Datum: 100, HasZeroFlow: true, ZeroFlow: 0.2}, true, 0.2, "", ""},
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
