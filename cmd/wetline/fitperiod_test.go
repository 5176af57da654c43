package main

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"wetline/survey/results"
)

// An empty --period, one holding none of the gaugings (for a fit or a
// comparison alone) or too few for the fit, is an error naming --period.
// The demo's gaugings run from 2019-05-19 to 2024-03-02; three of them
// (2023-10-02, 2023-11-21, 2024-03-02) fall after 2023-10-01, too few for
// the three parameters of one power law fitted by least squares.
func TestFitPeriodFlag(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name, period string
		code         int
		want         string
		extra        []string // default --method lsq
	}{
		{"compare only, after every gauging", "2030-01-01..", 1, "fit: --period 2030-01-01..: none of the 24 gaugings of demodata/tallow-gaugings.csv falls in it",
			[]string{"--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100", "--compare-only"}},
		{"three gaugings", "2023-10-01..", 1, "fit: --period 2023-10-01..: demodata/tallow-gaugings.csv: too few gaugings for the fit: 3 gaugings used", nil},
		{"empty", "", 2, "fit: --period is empty", nil},
		{"blank", "  ", 2, "fit: --period is empty", nil},
		{"neither end", "..", 2, `fit: --period ".." has neither end`, nil},
		{"year 1", "0001-01-01..2024-01-01", 2, `fit: --period from "0001-01-01": year 1 is not a plausible year`, nil},
		{"after every gauging", "2030-01-01..", 1, "fit: --period 2030-01-01..: none of the 24 gaugings of demodata/tallow-gaugings.csv falls in it", nil},
		{"between two gaugings", "2021-01-14..2021-03-02", 1, "(they run from 2019-05-19T08:45:00Z to 2024-03-02T10:30:00Z)", nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			extra := tc.extra
			if extra == nil {
				extra = []string{"--method", "lsq"}
			}
			_, errs, code := runCLI(t, append([]string{"fit", fitDemoGaugings, "--period", tc.period}, extra...)...)
			if code != tc.code || !strings.Contains(errs, tc.want) {
				t.Errorf("exit %d (want %d), stderr %q, want %q", code, tc.code, errs, tc.want)
			}
		})
	}
}

// --utc-offset places the times of --period and --exclude written without
// an offset, as those of the gaugings: a date is then the local day. At
// +10:00, the local day 2025-07-31 runs from 2025-07-30T14:00Z up to, not
// including, 2025-07-31T14:00Z (a date alone as TO ends the period at the
// next day's start), and 09:00 local is 23:00Z the day before.
func TestFitSelectionOffset(t *testing.T) {
	t.Parallel()
	utc := func(s string) time.Time {
		v, err := time.Parse(time.RFC3339Nano, s)
		if err != nil {
			t.Fatal(err)
		}
		return v
	}
	for _, tc := range []struct {
		name     string
		offset   time.Duration
		from, to string
		exclude  string
	}{
		{"UTC", 0, "2025-07-31T00:00:00Z", "2025-08-01T00:00:00Z", "2025-07-31T09:00:00Z"},
		{"ten hours east", 10 * time.Hour, "2025-07-30T14:00:00Z", "2025-07-31T14:00:00Z", "2025-07-30T23:00:00Z"},
		{"five and a half west", -(5*time.Hour + 30*time.Minute), "2025-07-31T05:30:00Z", "2025-08-01T05:30:00Z", "2025-07-31T14:30:00Z"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			f := &fitFlags{period: "2025-07-31..2025-07-31", exclude: "2025-07-31T09:00", offset: utcOffset(tc.offset)}
			sel, err := f.selection(true)
			if err != nil {
				t.Fatal(err)
			}
			if !sel.From.Equal(utc(tc.from)) || !sel.To.Equal(utc(tc.to)) {
				t.Errorf("period %v to %v, want %s to %s", sel.From, sel.To, tc.from, tc.to)
			}
			if len(sel.Exclude) != 1 || !sel.Exclude[0].Equal(utc(tc.exclude)) {
				t.Errorf("exclude %v, want %s", sel.Exclude, tc.exclude)
			}
		})
	}
}

// fit --utc-offset: a malformed offset is a usage error naming the flag.
func TestFitOffsetFlag(t *testing.T) {
	t.Parallel()
	_, errs, code := runCLI(t, "fit", fitDemoGaugings, "--method", "lsq", "--utc-offset", "ten")
	if code != 2 || !strings.Contains(errs, "utc-offset") {
		t.Errorf("exit %d, stderr %q; want 2 naming --utc-offset", code, errs)
	}
}

// TestFitReportsAtOffset: with --utc-offset every report of fit gives the
// gaugings' times at that offset (RFC 3339 with it in text, CSV and JSON;
// the wall clock there in a workbook's date cells, the summary naming the
// zone), whatever offset each was written with; without it every time is
// in UTC, as shifts and record give theirs. (A file gives every time with an offset
// or none.) By hand: 23:00Z is 09:00+10:00 the next day; 00:00Z is
// 10:00+10:00; 12:00−05:00 is 17:00Z, 03:00+10:00 the next day.
func TestFitReportsAtOffset(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	var b strings.Builder
	b.WriteString("time,gauge_height,discharge,quality\n")
	times := []string{"2025-07-30T23:00Z", "2025-08-01T00:00Z", "2025-08-02T12:00-05:00", "2025-08-02T23:00Z", "2025-08-03T23:00Z", "2025-08-04T23:00Z"}
	for i, h := range []float64{0.5, 0.7, 0.9, 1.2, 1.6, 2.0} {
		fmt.Fprintf(&b, "%s,%g,%.6g,good\n", times[i], h, 8*math.Pow(h-0.3, 2)) // an invented power law
	}
	gaugings := filepath.Join(dir, "gaugings.csv")
	if err := os.WriteFile(gaugings, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	local := []string{"2025-07-31T09:00:00+10:00", "2025-08-01T10:00:00+10:00", "2025-08-03T03:00:00+10:00"}
	inUTC := []string{"2025-07-30T23:00:00Z", "2025-08-01T00:00:00Z", "2025-08-02T17:00:00Z"}
	fit := func(extra ...string) string {
		t.Helper()
		out, errs, code := runCLI(t, append([]string{"fit", gaugings}, extra...)...)
		if code != 0 {
			t.Fatalf("fit %v: exit %d: %s", extra, code, errs)
		}
		return out
	}
	compare := []string{"--hydraulic-rating", fitDemoRatingTable, "--datum", "100", "--compare-only", "--format", "csv"}
	for _, tc := range []struct {
		name string
		out  string
		want []string
	}{
		{"text", fit("--method", "lsq", "--utc-offset", "+10:00"), append([]string{"6 measurements, si units; times in UTC+10:00"}, local...)},
		{"csv", fit(append(compare, "--utc-offset", "+10:00")...), local},
		{"json", fit("--method", "lsq", "--utc-offset", "+10:00", "--format", "json"), local},
		{"text in UTC", fit("--method", "lsq"), inUTC},
		{"csv in UTC", fit(compare...), inUTC},
	} {
		for _, w := range tc.want {
			if !strings.Contains(strings.ReplaceAll(tc.out, " ", ""), strings.ReplaceAll(w, " ", "")) {
				t.Errorf("%s: no %s in\n%s", tc.name, w, tc.out)
			}
		}
		if strings.HasSuffix(tc.name, "in UTC") && strings.Contains(tc.out, "+10:00") {
			t.Errorf("%s: a time at +10:00 without --utc-offset", tc.name)
		}
	}

	doc := fitJSON(t, gaugings, "--method", "lsq", "--utc-offset", "+10:00", "--exclude", "2025-08-04T09:00")
	if got := toStrings(doc["selection"].(map[string]any)["exclude_times"]); len(got) != 1 || got[0] != "2025-08-04T09:00:00+10:00" {
		t.Errorf("json: excluded times %q, want 2025-08-04T09:00:00+10:00", got)
	}

	book := filepath.Join(dir, "fit.xlsx")
	if _, errs, code := runCLI(t, "fit", gaugings, "--method", "lsq", "--utc-offset", "+10:00", "-o", book); code != 0 {
		t.Fatalf("workbook: exit %d: %s", code, errs)
	}
	f, err := excelize.OpenFile(book)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	for i, want := range []time.Time{
		time.Date(2025, 7, 31, 9, 0, 0, 0, time.UTC), time.Date(2025, 8, 1, 10, 0, 0, 0, time.UTC), time.Date(2025, 8, 3, 3, 0, 0, 0, time.UTC),
	} {
		cell, _ := excelize.CoordinatesToCellName(1, i+2)
		raw, err := f.GetCellValue(results.SheetGaugings, cell, excelize.Options{RawCellValue: true})
		if err != nil {
			t.Fatal(err)
		}
		serial, err := strconv.ParseFloat(raw, 64)
		if err != nil {
			t.Fatalf("%s: %q is no date serial", cell, raw)
		}
		got, err := excelize.ExcelDateToTime(serial, false)
		if err != nil || !got.Round(time.Second).Equal(want) {
			t.Errorf("%s shows %v (%v), want the wall clock %v", cell, got, err, want)
		}
	}
	rows, err := f.GetRows(results.SheetSummary)
	if err != nil {
		t.Fatal(err)
	}
	zone := ""
	for _, r := range rows {
		if len(r) > 1 && r[0] == "times in" {
			zone = r[1]
		}
	}
	if zone != "UTC+10:00" {
		t.Errorf("summary: times in %q, want UTC+10:00", zone)
	}
}

// The times of --exclude, --period and --rating FILE@TIME are read in the
// forms of every time in a file (survey.ParseISOTime), with the same
// message, whatever --utc-offset says. The instants follow the offset rule
// of RFC 3339, 4.2 (local time minus its offset is UTC), worked by hand.
func TestFlagTimesOneForm(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		in   string
		want string // the instant in UTC; "" when refused
		says string // the cause when refused
	}{
		{"2025-07-31T09:00:00-0500", "2025-07-31T14:00:00Z", ""},
		{"2025-07-31T09:00-05", "2025-07-31T14:00:00Z", ""},
		{"2025-07-31 09:00+10:00", "2025-07-30T23:00:00Z", ""},
		{"2025-07-31t09:00z", "2025-07-31T09:00:00Z", ""},
		{"2025-07-31T09:00:00.000Z", "2025-07-31T09:00:00Z", ""},
		{"2025-07-31T09:00:00.5Z", "", "fractions of a second are not kept"},
		{"45869", "", "not an ISO 8601 date-time"},
		{"31/07/2025", "", "a date written with the day and month as numbers is ambiguous (day-first or month-first): write ISO 8601 (2025-07-31)"},
	} {
		for _, off := range []time.Duration{0, 10 * time.Hour} {
			t.Run(fmt.Sprintf("%s at %v", tc.in, off), func(t *testing.T) {
				t.Parallel()
				f := &fitFlags{exclude: tc.in, period: tc.in + "..", offset: utcOffset(off)}
				sel, errSel := f.selection(true)
				h := &historyFlags{cmd: "record", offset: utcOffset(off)}
				spec, errSpec := h.parseRatingSpec("no-such-rating.csv@" + tc.in)
				if tc.want == "" {
					for _, err := range []error{errSel, errSpec} {
						var ue usageError
						if !errors.As(err, &ue) || !strings.Contains(err.Error(), ": "+tc.says) {
							t.Errorf("%v; want a usage error saying %q", err, tc.says)
						}
					}
					if t.Failed() {
						return
					}
					if a, b := errSel.Error(), errSpec.Error(); a[strings.Index(a, tc.says):] != b[strings.Index(b, tc.says):] {
						t.Errorf("--exclude says %q, --rating @ %q", a, b)
					}
					return
				}
				want, err := time.Parse(time.RFC3339, tc.want)
				if err != nil {
					t.Fatal(err)
				}
				if errSel != nil || len(sel.Exclude) != 1 || !sel.Exclude[0].Equal(want) || !sel.From.Equal(want) {
					t.Errorf("--exclude, --period: %v, %v; want %v", sel, errSel, want)
				}
				if errSpec != nil || !spec.from.Equal(want) {
					t.Errorf("--rating @: %v, %v; want %v", spec.from, errSpec, want)
				}
			})
		}
	}
}

// --period FROM..TO runs from FROM up to, not including, TO, as rating
// periods do: a gauging exactly at the boundary T is fitted in T.. and not
// in ..T. The file holds invented gaugings with a tz column (MST, MDT); at
// --utc-offset -07:00 a rating period begins at 2023-06-21T10:00, the time
// of the gauging after a flood (11:00 MDT). The 25 fitted before it (the
// one marked exclude left out) give, by weighted least squares in ln Q
// worked outside the program (weights 1/σ², σ = U/1.96; for each offset B
// the closed-form weighted regression of ln Q on ln(h − B), B by a 0.1 mm
// grid refined by ternary search on the weighted sum of squares),
// A = 7.5584, B = 0.3866 m, C = 1.7590; the 4 from it, A = 9.8636,
// B = 0.3534 m, C = 1.3799.
func TestFitPeriodHalfOpen(t *testing.T) {
	t.Parallel()
	const in = "testdata/period-boundary-gaugings.csv"
	const boundary = "2023-06-21T10:00:00-07:00"
	for _, tc := range []struct {
		period    string
		n         int
		a, b, c   float64
		boundaryX bool   // the boundary gauging left out
		says      string // the selection line's period
	}{
		{"..2023-06-21T10:00", 25, 7.5584, 0.3866, 1.7590, true, "rating period up to, not including, " + boundary},
		{"2023-06-21T10:00..", 4, 9.8636, 0.3534, 1.3799, false, "rating period from " + boundary + " on"},
		{"2020-01-01..2023-06-21T10:00", 25, 7.5584, 0.3866, 1.7590, true,
			"rating period from 2020-01-01T00:00:00-07:00 up to, not including, " + boundary},
	} {
		t.Run(tc.period, func(t *testing.T) {
			t.Parallel()
			args := []string{in, "--method", "lsq", "--utc-offset", "-07:00", "--period", tc.period}
			doc := fitJSON(t, args...)
			seg := doc["segments"].([]any)[0].(map[string]any)
			got := []float64{seg["coefficient"].(float64), seg["zero_flow_stage"].(float64), seg["exponent"].(float64)}
			for i, want := range []float64{tc.a, tc.b, tc.c} {
				if math.Abs(got[i]-want) > 1e-4*math.Abs(want) {
					t.Errorf("A, B, C = %.5g, want %.5g, %.5g, %.5g", got, tc.a, tc.b, tc.c)
					break
				}
			}
			if n := doc["gaugings_fitted"].(float64); int(n) != tc.n {
				t.Errorf("%v gaugings fitted, want %d", n, tc.n)
			}
			for _, g := range doc["gaugings"].([]any) {
				m := g.(map[string]any)
				if m["time"] == boundary && m["excluded"] != tc.boundaryX {
					t.Errorf("the gauging at the boundary: excluded %v (%v), want %v", m["excluded"], m["excluded_reason"], tc.boundaryX)
				}
			}
			out, _, err := fitRun(t, append([]string{"fit"}, args...)...)
			if err != nil {
				t.Fatal(err)
			}
			if !strings.Contains(out, fmt.Sprintf("Selection: %d of 30 gaugings fitted; %s (", tc.n, tc.says)) {
				t.Errorf("selection line, want %q:\n%s", tc.says, out[:min(len(out), 600)])
			}
		})
	}
}

// A time of --exclude without an offset is read at --utc-offset, not at a
// tz column of the file: the gauging written 2023-05-27T10:00 with tz MDT
// (−06:00) is 09:00 at −07:00, so 2023-05-27T10:00 is no gauging's time,
// and written with its offset it is that gauging's. --help says so.
func TestFitExcludeOffset(t *testing.T) {
	t.Parallel()
	const in = "testdata/period-boundary-gaugings.csv"
	args := []string{"fit", in, "--method", "lsq", "--utc-offset", "-07:00", "--period", "..2023-06-21T10:00"}
	checkRefused(t, append(args, "--exclude", "2023-05-27T10:00"), 1,
		"fit: --exclude 2023-05-27T10:00:00-07:00: "+in+": no gauging is at that time (the nearest is at 2023-05-27T09:00:00-07:00)")
	doc := fitJSON(t, append(args[1:], "--exclude", "2023-05-27T10:00-06:00")...)
	for _, g := range doc["gaugings"].([]any) {
		m := g.(map[string]any)
		if want := m["time"] == "2023-05-27T09:00:00-07:00"; (m["excluded_reason"] == "excluded by time") != want {
			t.Errorf("gauging at %v: %v", m["time"], m["excluded_reason"])
		}
	}
	if s := doc["selection"].(map[string]any); s["fitted"] != 24.0 || toStrings(s["exclude_times"])[0] != "2023-05-27T09:00:00-07:00" {
		t.Errorf("selection %v", s)
	}
	help, _, _ := runCLI(t, "fit", "--help")
	for _, want := range []string{"a time without an offset is read at --utc-offset, not at a tz column", "from FROM up to, not including, TO"} {
		if !strings.Contains(strings.Join(strings.Fields(help), " "), want) {
			t.Errorf("--help does not say %q", want)
		}
	}
}
