package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"wetline/plotting"
)

const (
	recSectionA = "testdata/record/xs-a.csv"
	recSectionB = "testdata/record/xs-b.csv"
)

func TestCompareGolden(t *testing.T) {
	t.Parallel()
	checkRecordGoldens(t, []recordGolden{
		{"compare-ratings.txt", []string{"compare", recRatingA, recRatingB, "--zero-flow", "0.2"}},
		{"compare-ratings.csv", []string{"compare", recRatingA, recRatingB, "--zero-flow", "0.2", "--step", "0.25", "--format", "csv"}},
		{"compare-sections.txt", []string{"compare", recSectionA, recSectionB, "--step", "0.5"}},
		{"compare-sections.csv", []string{"compare", recSectionA, recSectionB, "--stages", "11,12", "--format", "csv"}},
	})
}

// TestCompareSectionsClosedForm: two trapezoids, A with a 4 m bottom at
// 10 m, B the same banks scoured to a 3 m bottom at 9.5 m, side slopes
// 1:1, n = 0.03. At stage 12 m (Chow, 1959, Open-Channel Hydraulics,
// Table 2-1: A = (b + zy)y, P = b + 2y√(1+z²), T = b + 2zy):
//
//	A: y = 2,   area (4 + 2)·2 = 12 m²,      P = 4 + 4√2,  T = 8 m
//	B: y = 2.5, area (3 + 2.5)·2.5 = 13.75, P = 3 + 5√2,  T = 8 m
//
// and Manning's conveyance K = A·R^(2/3)/n with R = A/P.
func TestCompareSectionsClosedForm(t *testing.T) {
	t.Parallel()
	out, errs, code := runCLI(t, "compare", recSectionA, recSectionB, "--stages", "12", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var doc struct {
		Kind string
		Rows []struct {
			Stage                    float64
			A, B, Difference         map[string]float64
			ConveyancePercentDiffers float64 `json:"conveyance_percent_difference"`
		}
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	const tol = 1e-9 // closed forms against the clipped polygon: round-off only
	k := func(a, p float64) float64 { return a * math.Pow(a/p, 2.0/3) / 0.03 }
	want := map[string][2]float64{
		"area":             {12, 13.75},
		"wetted_perimeter": {4 + 4*math.Sqrt2, 3 + 5*math.Sqrt2},
		"top_width":        {8, 8},
		"conveyance":       {k(12, 4+4*math.Sqrt2), k(13.75, 3+5*math.Sqrt2)},
	}
	if doc.Kind != "sections" || len(doc.Rows) != 1 {
		t.Fatalf("kind %q, %d rows", doc.Kind, len(doc.Rows))
	}
	r := doc.Rows[0]
	for key, w := range want {
		if math.Abs(r.A[key]-w[0]) > tol*w[0] || math.Abs(r.B[key]-w[1]) > tol*w[1] || math.Abs(r.Difference[key]-(w[1]-w[0])) > tol*w[1] {
			t.Errorf("%s: A %v B %v diff %v, want %v", key, r.A[key], r.B[key], r.Difference[key], w)
		}
	}
	if p := 100 * (want["conveyance"][1] - want["conveyance"][0]) / want["conveyance"][0]; math.Abs(r.ConveyancePercentDiffers-p) > tol*p {
		t.Errorf("conveyance percent %v, want %v", r.ConveyancePercentDiffers, p)
	}
}

// TestCompareSectionsDatums: surveys whose datum keys differ are compared
// with the text saying so and a warning naming both; the same datum keeps
// "both in one datum". The stages also come out in increasing order, each
// once, whatever the order given.
func TestCompareSectionsDatums(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	body, err := os.ReadFile(recSectionA)
	if err != nil {
		t.Fatal(err)
	}
	put := func(name, datum string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, append([]byte("# datum: "+datum+"\n"), body...), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	a, b, c := put("a.csv", "local datum A"), put("b.csv", "AHD"), put("c.csv", "local datum A")
	for _, tt := range []struct {
		name, other string
		head, warn  string
	}{
		{"datums differ", b, "(si units; datums differ: A local datum A, B AHD)", `a.csv: "local datum A"; `},
		{"one datum", c, "(si units; both in one datum)", ""},
	} {
		out, errs, code := runCLI(t, "compare", a, tt.other, "--stages", "12,11,11", "--format", "text")
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", tt.name, code, errs)
		}
		if first, _, _ := strings.Cut(out, "\n"); !strings.HasSuffix(first, tt.head) {
			t.Errorf("%s: first line %q, want it to end %q", tt.name, first, tt.head)
		}
		if got := strings.Contains(out, "warning: the surveys name different datums ("); got != (tt.warn != "") || !strings.Contains(out, tt.warn) {
			t.Errorf("%s: warning %q wanted %v in\n%s", tt.name, tt.warn, tt.warn != "", out)
		}
		i11, i12 := strings.Index(out, "\n     11.000 "), strings.Index(out, "\n     12.000 ")
		if i11 < 0 || i12 < i11 || strings.Count(out, "\n     11.000 ") != 1 {
			t.Errorf("%s: rows not 11 then 12, once each:\n%s", tt.name, out)
		}
	}
}

// TestCompareRatingsHand: rating-a and rating-b at a shared row stage,
// 0.9 m: 5.20 and 6.00 m³/s, so B − A = 0.80 and 100·0.80/5.20 = 15.38 %.
// Hand computation from the tables.
func TestCompareRatingsHand(t *testing.T) {
	t.Parallel()
	out, errs, code := runCLI(t, "compare", recRatingA, recRatingB, "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var doc struct {
		Kind     string
		From, To float64
		Rows     []struct {
			Stage   float64
			A       float64 `json:"discharge_a"`
			B       float64 `json:"discharge_b"`
			Percent float64 `json:"percent_difference"`
		}
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if doc.Kind != "ratings" || doc.From != 0.4 || doc.To != 1.6 {
		t.Errorf("kind %q, range %g to %g", doc.Kind, doc.From, doc.To)
	}
	const tol = 1e-9 // one division
	found := false
	for _, r := range doc.Rows {
		if r.Stage == 0.9 {
			found = true
			if r.A != 5.2 || r.B != 6 || math.Abs(r.Percent-100*0.8/5.2) > tol {
				t.Errorf("0.9 m: %+v", r)
			}
		}
	}
	if !found {
		t.Error("no row at 0.9 m")
	}
}

func TestCompareFigures(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		a, b, fig string
	}{
		{recRatingA, recRatingB, "rating-a-vs-rating-b-compare.png"},
		{recSectionA, recSectionB, "xs-a-vs-xs-b-overlay.png"},
	} {
		dir, plots := t.TempDir(), t.TempDir()
		if _, errs, code := runCLI(t, "compare", c.a, c.b, "--plots", plots, "-o", filepath.Join(dir, "c.json")); code != 0 {
			t.Fatalf("exit %d: %s", code, errs)
		}
		decodeAll(t, plots, []string{c.fig}, plotting.DefaultWidth, plotting.DefaultHeight)
	}
}

func TestCompareRefusals(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		name string
		args []string
		code int
		want string
	}{
		{"one file", []string{"compare", recRatingA}, 2, "want two files"},
		{"mixed kinds", []string{"compare", recRatingA, recSectionA}, 2, "is a rating table and"},
		{"neither kind", []string{"compare", recStages, recRatingA}, 1, "neither a rating nor a survey"},
		{"rating flag on surveys", []string{"compare", recSectionA, recSectionB, "--zero-flow", "9"}, 2, "--zero-flow has no use when comparing surveys"},
		{"survey flag on ratings", []string{"compare", recRatingA, recRatingB, "--stages", "1"}, 2, "--stages has no use when comparing ratings"},
		{"three zero flows", []string{"compare", recRatingA, recRatingB, "--zero-flow", "0.1,0.2,0.3"}, 2, "one for both, or A,B"},
		{"periods in a file", []string{"compare", "testdata/record/periods.csv", recRatingB}, 1, "holds 2 rating periods"},
		{"no common range", []string{"compare", recRatingA, recRatingB, "--datum", "0,5"}, 1, "share no range"},
		{"stages and step", []string{"compare", recSectionA, recSectionB, "--stages", "11", "--step", "0.5"}, 2, "not both"},
	} {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			_, errs, code := runCLI(t, c.args...)
			if code != c.code || !strings.Contains(errs, c.want) {
				t.Errorf("exit %d, want %d; stderr %q should hold %q", code, c.code, errs, c.want)
			}
		})
	}
}

// TestTooFineStep: a --step laying out more than rating.MaxStages stages
// (a million) is a usage error naming --step with its unit, in every
// command that takes one. 1e-9 m over any of these ranges (about 3 m of
// rating table, 4.5 m of section) gives billions; 0.0001 m over rate's
// 200 m gives two million.
func TestTooFineStep(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name string
		args []string
	}{
		// rate refuses a step finer than its table is written (0.0001)
		// before counting stages, so its range is made wide instead.
		{"rate", []string{"rate", fitDemoSurvey, "--slope", "0.001", "--from", "100", "--to", "300", "--step", "0.0001"}},
		{"compare ratings", []string{"compare", recRatingA, recRatingB, "--step", "1e-9"}},
		{"compare surveys", []string{"compare", fitDemoSurvey, fitDemoSurvey, "--step", "1e-9"}},
		{"fit", []string{"fit", fitDemoGaugings, "--method", "lsq", "--step", "1e-9"}},
		{"fit with a section", []string{"fit", fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100", "--method", "lsq", "--step", "1e-9"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			_, errs, code := runCLI(t, tc.args...)
			step, _ := strconv.ParseFloat(tc.args[len(tc.args)-1], 64)
			want := tc.args[0] + ": --step " + strconv.FormatFloat(step, 'g', -1, 64) + " m: "
			if code != 2 || !strings.Contains(errs, want) || !strings.Contains(errs, "is more than 1000000") {
				t.Errorf("exit %d, stderr %q; want 2 and %q", code, errs, want)
			}
		})
	}
}

// TestCompareSummaryUnits: the console summary after a written comparison
// gives the largest difference as the report's headline does, in
// discharge first, with the stage and its unit, SI or US.
func TestCompareSummaryUnits(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		units, unit string
	}{{"si", " m3/s at 1.2 m "}, {"us", " ft3/s at 1.2 ft "}} {
		t.Run(tc.units, func(t *testing.T) {
			t.Parallel()
			path := filepath.Join(t.TempDir(), "c.txt")
			_, errs, code := runCLI(t, "compare", recRatingA, recRatingB, "--units", tc.units, "-o", path)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			i := strings.Index(errs, "largest difference")
			if i < 0 {
				t.Fatalf("no summary: %s", errs)
			}
			line := errs[i:]
			line = line[:strings.IndexByte(line, '\n')]
			if !strings.Contains(line, tc.unit) || !strings.Contains(line, "in percent, ") {
				t.Errorf("summary %q: want the discharge difference%s and the largest percentage", line, tc.unit)
			}
		})
	}
}

// TestCompareSectionsDates: each survey's date reaches every format. A
// surveyed 2020-01-14 and B 2023-06-21 (one site, one datum): the text
// names both dates, the JSON gives each survey's site block after the
// site's (whose date, neither survey's alone, is blank), and the
// workbook's summary has a row for each date.
func TestCompareSectionsDates(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	put := func(name, src, date string) string {
		body, err := os.ReadFile(src)
		if err != nil {
			t.Fatal(err)
		}
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, append([]byte("# site: Test Creek\n# surveyed: "+date+"\n# datum: local\n"), body...), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	a, b := put("a.csv", recSectionA, "2020-01-14"), put("b.csv", recSectionB, "2023-06-21")
	out, errs, code := runCLI(t, "compare", a, b, "--stages", "12")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !strings.Contains(out, "\nSite: Test Creek, datum local\nSurveyed: A 2020-01-14, B 2023-06-21\n") {
		t.Errorf("text does not name both survey dates:\n%s", out)
	}
	out, errs, code = runCLI(t, "compare", a, b, "--stages", "12", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var doc map[string]json.RawMessage
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	type site struct{ Name, Surveyed, Datum string }
	var s, sa, sb site
	for _, kv := range []struct {
		key string
		v   *site
	}{{"site", &s}, {"site_a", &sa}, {"site_b", &sb}} {
		if err := json.Unmarshal(doc[kv.key], kv.v); err != nil {
			t.Fatalf("%s: %v", kv.key, err)
		}
	}
	if s != (site{"Test Creek", "", "local"}) || sa != (site{"Test Creek", "2020-01-14", "local"}) || sb != (site{"Test Creek", "2023-06-21", "local"}) {
		t.Errorf("site %+v, site_a %+v, site_b %+v", s, sa, sb)
	}
	keys := jsonKeys(t, []byte(out))
	if i, j, k := slices.Index(keys, "site"), slices.Index(keys, "site_a"), slices.Index(keys, "site_b"); !(i >= 4 && j == i+1 && k == j+1) || !slices.Equal(keys[:4], []string{"kind", "a", "b", "units"}) {
		t.Errorf("keys %q: want kind, a, b, units first and site_a, site_b after site", keys)
	}
	book := filepath.Join(dir, "c.xlsx")
	if _, errs, code := runCLI(t, "compare", a, b, "--stages", "12", "-o", book); code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	got := summaryItems(t, book)
	if got["survey A surveyed"] != "2020-01-14" || got["survey B surveyed"] != "2023-06-21" {
		t.Errorf("summary items %q", got)
	}
}
