package main

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"wetline/plotting"
	"wetline/rating/gauged"
)

// fitRun runs the program and returns stdout, stderr and run's error.
func fitRun(t *testing.T, args ...string) (string, string, error) {
	t.Helper()
	var out, errb bytes.Buffer
	err := run(context.Background(), newEnv(&out, &errb, commandTable()), args)
	return out.String(), errb.String(), err
}

const (
	fitDemoGaugings = "demodata/tallow-gaugings.csv"
	fitDemoSurvey   = "demodata/tallow-xs1.csv"
	// fitDemoRatingTable is the demo section's hydraulic rating as rate
	// writes it (rate demodata/tallow-xs1.csv --slope 0.0012 --format csv).
	fitDemoRatingTable = "testdata/tallow-xs1-rating.csv"
)

func TestFitGolden(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name string
		args []string
	}{
		{"fit-demo.txt", []string{"fit", fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100"}},
		{"fit-demo-lsq.txt", []string{"fit", fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100", "--method", "lsq"}},
		{"fit-demo-2seg.txt", []string{"fit", fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100", "--segments", "2", "--channel-only", "--method", "lsq"}},
		{"fit-demo-control.csv", []string{"fit", fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100", "--zero-flow", "control", "--format", "csv"}},
		{"fit-demo-compare.csv", []string{"fit", fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100", "--compare-only", "--format", "csv"}},
		{"fit-demo-table.txt", []string{"fit", fitDemoGaugings, "--hydraulic-rating", fitDemoRatingTable, "--datum", "100", "--method", "lsq", "--step", "0.2"}},
		{"fit-demo-select.txt", []string{"fit", fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100", "--method", "lsq",
			"--exclude", "2019-07-15T12:45,2020-09-28T09:30", "--period", "2019-06-01..2023-12-31", "--step", "0.5"}},
		{"fit-nosection.txt", []string{"fit", fitDemoGaugings, "--zero-flow", "0.3", "--step", "0.25"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			out, _, err := fitRun(t, tc.args...)
			if err != nil {
				t.Fatal(err)
			}
			golden(t, tc.name, out)
		})
	}
}

// The JSON report holds its documented contract: segments with from_stage,
// to_stage, coefficient, zero_flow_stage and exponent; the standard error
// in percent; gaugings with stage, discharge, fitted, departure_percent and
// shift; table rows with stage, discharge and extrapolated; the datum and
// the caution.
func TestFitJSONContract(t *testing.T) {
	t.Parallel()
	out, _, err := fitRun(t, "fit", fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100", "--format", "json")
	if err != nil {
		t.Fatal(err)
	}
	var doc map[string]any
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	need := func(obj map[string]any, keys ...string) {
		for _, k := range keys {
			if _, ok := obj[k]; !ok {
				t.Errorf("missing key %q in %v", k, obj)
			}
		}
	}
	need(doc, "segments", "standard_error_percent", "gaugings", "table", "datum", "caution", "warnings", "extrapolation")
	seg := doc["segments"].([]any)[0].(map[string]any)
	need(seg, "from_stage", "to_stage", "coefficient", "zero_flow_stage", "exponent")
	g := doc["gaugings"].([]any)[0].(map[string]any)
	need(g, "stage", "discharge", "fitted", "departure_percent", "shift")
	rows := doc["table"].([]any)
	need(rows[0].(map[string]any), "stage", "discharge", "extrapolated")
	if rows[0].(map[string]any)["extrapolated"] != true || rows[len(rows)-1].(map[string]any)["extrapolated"] != true {
		t.Errorf("the first row (below the gaugings) and the last (above) must be extrapolated")
	}
	if doc["datum"] != 100.0 {
		t.Errorf("datum = %v", doc["datum"])
	}
	// What the report grew: each control its own offset and joint, both
	// bands and the multiple of the largest gauging on every row (the
	// last one too), the posterior, the method, the tests and the
	// convention.
	need(doc, "method", "uncertainty_convention", "posterior", "relation_tests", "johnson", "selection", "more_controls")
	segs := doc["segments"].([]any)
	for _, s := range segs {
		need(s.(map[string]any), "zero_flow_stage", "control", "kind", "prior")
	}
	if doc["method"] != "bayes" || len(segs) != 2 || segs[1].(map[string]any)["control"] != "add" || doc["floodplain_added"] != true {
		t.Errorf("method %v, segments %v", doc["method"], segs)
	}
	last := rows[len(rows)-1].(map[string]any)
	need(last, "parametric_lower_95", "parametric_upper_95", "total_lower_95", "total_upper_95", "basis", "gauged_multiple")
	for _, k := range []string{"parametric_lower_95", "total_lower_95", "total_upper_95", "gauged_multiple"} {
		if _, ok := last[k].(float64); !ok {
			t.Errorf("last row %s = %v, want a number", k, last[k])
		}
	}
	post := doc["posterior"].(map[string]any)
	need(post, "parameters", "rhat_max", "ess_min", "acceptance")
	need(post["parameters"].([]any)[0].(map[string]any), "name", "mean", "sd", "p2_5", "p50", "p97_5", "prior_mean", "prior_sd")
	need(doc["relation_tests"].(map[string]any), "sign", "runs", "mean_departure")
}

// fitJSON runs fit with --format json and decodes the report.
func fitJSON(t *testing.T, args ...string) map[string]any {
	t.Helper()
	out, _, err := fitRun(t, append(append([]string{"fit"}, args...), "--format", "json")...)
	if err != nil {
		t.Fatal(err)
	}
	var doc map[string]any
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	return doc
}

// tableInterp bounds the relative difference, at the demo gaugings,
// between the section's hydraulic rating and the same rating read from
// its table in 0.1 m rows, interpolated log-linearly above its dry foot
// (measured at most 4 % by this test, at the lowest gauging, 0.16 m above
// the foot, where the section is not a power law of the depth; higher up
// well under 1 %).
const tableInterp = 0.05

// A hydraulic rating table (the demo section's, as rate writes it) stands
// in for the section: the gaugings are compared with it (to the table's
// interpolation), least squares extends on it by conveyance-slope, and a
// Bayesian fit takes its prior from it.
func TestFitHydraulicTable(t *testing.T) {
	t.Parallel()
	sec := fitJSON(t, fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100", "--method", "lsq")
	tab := fitJSON(t, fitDemoGaugings, "--hydraulic-rating", fitDemoRatingTable, "--datum", "100", "--method", "lsq")
	if src, _ := tab["hydraulic_source"].(string); !strings.HasPrefix(src, "table ") {
		t.Errorf("hydraulic source %q", src)
	}
	gs, gt := sec["gaugings"].([]any), tab["gaugings"].([]any)
	for i := range gs {
		a, b := gs[i].(map[string]any)["hydraulic"].(float64), gt[i].(map[string]any)["hydraulic"].(float64)
		if math.Abs(a-b) > tableInterp*a {
			t.Errorf("gauging %d: section %g, table %g", i+1, a, b)
		}
	}
	rows := tab["table"].([]any)
	if b := rows[len(rows)-1].(map[string]any)["basis"]; b != "conveyance-slope" {
		t.Errorf("top row basis %v", b)
	}
	bayes := fitJSON(t, fitDemoGaugings, "--hydraulic-rating", fitDemoRatingTable, "--datum", "100", "--draws", "1000")
	if p, _ := bayes["segments"].([]any)[0].(map[string]any)["prior"].(string); !strings.Contains(p, "hydraulic rating table") {
		t.Errorf("prior %q", p)
	}
}

// A surveyed riffle crest (invented test data, its lowest point at gauge
// height 0.30 m) makes the first control a section control whose prior is
// critical flow over it, its offset's prior the crest's lowest point.
func TestFitControlSection(t *testing.T) {
	t.Parallel()
	doc := fitJSON(t, fitDemoGaugings, "--control-section", "testdata/tallow-riffle.csv", "--datum", "100", "--draws", "1000")
	seg := doc["segments"].([]any)[0].(map[string]any)
	if seg["kind"] != "section" || !strings.Contains(seg["prior"].(string), "critical flow over the crest") {
		t.Errorf("segment %v", seg)
	}
	for _, p := range doc["posterior"].(map[string]any)["parameters"].([]any) {
		if q := p.(map[string]any); q["name"] == "b1" && math.Abs(q["prior_mean"].(float64)-0.3) > 1e-9 {
			t.Errorf("offset prior %v, want the crest at 0.3", q["prior_mean"])
		}
	}
}

// The gaugings' own uncertainty and exclude columns, and --exclude and
// --period: every gauging stays in the report, those left out marked with
// their reason and their departures (a listed time that matches no
// gauging is an error: TestFitExcludeMatchesNoGauging).
func TestFitExcludeAndUncertainty(t *testing.T) {
	t.Parallel()
	in := filepath.Join(t.TempDir(), "g.csv")
	csv := "time,stage,discharge,quality,uncertainty,exclude\n"
	for i, h := range []float64{0.5, 0.7, 0.9, 1.2, 1.6, 2.0, 2.4} {
		q := 8 * math.Pow(h-0.3, 2) * (1 + 0.01*float64(i%3-1)) // invented
		excl, unc := "", ""
		if i == 3 {
			excl, q = "weed on the control", 1.5*q
		}
		if i == 5 {
			unc = "3"
		}
		csv += fmt.Sprintf("2024-0%d-01,%g,%g,good,%s,%s\n", i+1, h, q, unc, excl)
	}
	if err := os.WriteFile(in, []byte(csv), 0o644); err != nil {
		t.Fatal(err)
	}
	doc := fitJSON(t, in, "--method", "lsq", "--exclude", "2024-07-01", "--period", "..2024-07-01")
	gs := doc["gaugings"].([]any)
	want := map[int]string{3: "weed on the control", 6: "excluded by time"}
	for i, g := range gs {
		m := g.(map[string]any)
		if m["excluded_reason"] != want[i] || m["excluded"] != (want[i] != "") || m["departure_percent"] == nil {
			t.Errorf("gauging %d: %v", i+1, m)
		}
	}
	if u := gs[5].(map[string]any)["uncertainty_percent"]; u != 3.0 {
		t.Errorf("uncertainty %v, want 3 from the column", u)
	}
	// The excluded gauging is 1.5·0.99 times the invented law, the fit
	// within about 2 % of the law (its other gaugings are within 1 %).
	if d := gs[3].(map[string]any)["departure_percent"].(float64); math.Abs(d-48.5) > 3 {
		t.Errorf("excluded gauging departs %g %%, want about 48.5", d)
	}
	if s := doc["selection"].(map[string]any); s["fitted"] != 5.0 || s["excluded"] != 2.0 {
		t.Errorf("selection %v", s)
	}
}

// toStrings turns a decoded JSON list into strings.
func toStrings(v any) []string {
	var out []string
	for _, s := range v.([]any) {
		out = append(out, s.(string))
	}
	return out
}

// Chains too short to agree (10 draws each): the bands are withheld, with
// a warning, unless --show-unconverged asks for them.
func TestFitUnconverged(t *testing.T) {
	t.Parallel()
	for _, show := range []bool{false, true} {
		args := []string{fitDemoGaugings, "--draws", "10"}
		if show {
			args = append(args, "--show-unconverged")
		}
		doc := fitJSON(t, args...)
		row := doc["table"].([]any)[5].(map[string]any)
		_, has := row["total_lower_95"].(float64)
		if doc["bands_withheld"] != !show || has != show || doc["posterior"].(map[string]any)["converged"] != false {
			t.Errorf("show %v: withheld %v, band %v, converged %v", show, doc["bands_withheld"], row["total_lower_95"], doc["posterior"].(map[string]any)["converged"])
		}
		if w := strings.Join(toStrings(doc["warnings"]), "\n"); show == strings.Contains(w, "bands withheld") {
			t.Errorf("show %v: warnings %q", show, w)
		}
	}
}

// Bad gaugings: one clear error naming file, row and column; no output
// file is written.
func TestFitBadGaugingsWritesNothing(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	for _, tc := range []struct {
		name, csv string
		args      []string
		want      []string
	}{
		{"negative", "time,stage,discharge\n2024-01-01,1,3\n2024-01-02,1.2,-4\n", nil, []string{"bad.csv:3:3", "negative"}},
		{"date", "time,stage,discharge\n2024-01-01,1,3\n01/02/2024,1.2,4\n", nil, []string{"bad.csv:3:1", "ISO 8601"}},
		{"duplicate", "time,stage,discharge\n2024-01-01,1,3\n2024-01-01,1.2,4\n", nil, []string{"bad.csv:3:1", "duplicate time", "row 2"}},
		{"below e", "time,stage,discharge\n2024-01-01,1,3\n2024-01-02,1.2,4\n2024-01-03,1.5,6\n2024-01-04,0.2,0.1\n2024-01-05,2,9\n",
			[]string{"--zero-flow", "0.5"}, []string{"bad.csv:5", "below the gauge height of zero flow"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			in := filepath.Join(dir, "bad.csv")
			if err := os.WriteFile(in, []byte(tc.csv), 0o644); err != nil {
				t.Fatal(err)
			}
			out := filepath.Join(dir, "out.json")
			_, _, err := fitRun(t, append([]string{"fit", in, "-o", out}, tc.args...)...)
			if err == nil {
				t.Fatal("no error")
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not contain %q", err, w)
				}
			}
			if _, serr := os.Stat(out); !errors.Is(serr, os.ErrNotExist) {
				t.Errorf("output written despite the error")
			}
		})
	}
}

func TestFitUsageErrors(t *testing.T) {
	t.Parallel()
	for _, args := range [][]string{
		{"fit"},
		{"fit", fitDemoGaugings, "--slope", "0.001"},
		{"fit", fitDemoGaugings, "--section", fitDemoSurvey},
		{"fit", fitDemoGaugings, "--compare-only"},
		{"fit", fitDemoGaugings, "--zero-flow", "control"},
		{"fit", fitDemoGaugings, "--zero-flow", "low"},
		{"fit", fitDemoGaugings, "--segments", "5"},
		{"fit", fitDemoGaugings, "--controls", "0"},
		{"fit", fitDemoGaugings, "--segments", "3", "--breaks", "1"},
		{"fit", fitDemoGaugings, "--segments", "2", "--controls", "3"},
		{"fit", fitDemoGaugings, "--controls", "2", "--kinds", "channel"},
		{"fit", fitDemoGaugings, "--controls", "2", "--kinds", "channel,weir"},
		{"fit", fitDemoGaugings, "--controls", "2", "--joints", "add,add"},
		{"fit", fitDemoGaugings, "--controls", "3", "--joints", "add"},
		{"fit", fitDemoGaugings, "--controls", "2", "--joints", "join"},
		{"fit", fitDemoGaugings, "--method", "mcmc"},
		{"fit", fitDemoGaugings, "--method", "lsq", "--draws", "100"},
		{"fit", fitDemoGaugings, "--method", "lsq", "--show-unconverged"},
		{"fit", fitDemoGaugings, "--draws", "0"},
		// Memory bound: at most gauged.MaxChains chains and
		// gauged.MaxKeptDraws draws in all (999999999999 draws would run
		// out of memory).
		{"fit", fitDemoGaugings, "--draws", "999999999999"},
		{"fit", fitDemoGaugings, "--chains", "100000"},
		{"fit", fitDemoGaugings, "--chains", "8", "--draws", "300000"},
		{"fit", fitDemoGaugings, "--n-cv", "0.1"},
		{"fit", fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--n-cv", "-0.1"},
		{"fit", fitDemoGaugings, "--crest-cv", "0.1"},
		{"fit", fitDemoGaugings, "--datum", "100"},
		{"fit", fitDemoGaugings, "--hydraulic-rating-sheet", "x"},
		{"fit", fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--hydraulic-rating", "r.csv"},
		{"fit", fitDemoGaugings, "--exclude", "yesterday"},
		{"fit", fitDemoGaugings, "--period", "2020-01-01"},
		{"fit", fitDemoGaugings, "--period", "2021-01-01..2020-01-01"},
		{"fit", fitDemoGaugings, "--period", "..2020-13-01"},
		{"fit", fitDemoGaugings, "--format", "xml"},
		{"fit", fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--compare-only", "--segments", "2"},
		{"rate", fitDemoSurvey, "--slope", "0.0012", "--channel-only"},
	} {
		_, _, err := fitRun(t, args...)
		var ue usageError
		if !errors.As(err, &ue) {
			t.Errorf("%q: err = %v, want a usage error", args, err)
		}
	}
}

// Refusing to extrapolate past the section's lower end (104.8 m, gauge
// height 4.8 m); without a section the fitted controls are carried above
// the gaugings only when asked (--to), each row saying how far.
func TestFitRefusesPastSection(t *testing.T) {
	t.Parallel()
	_, _, err := fitRun(t, "fit", fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100", "--to", "5")
	if err == nil || !strings.Contains(err.Error(), "refusing to extrapolate") || !strings.Contains(err.Error(), filepath.Base(fitDemoSurvey)) {
		t.Errorf("past the section: err = %v, want it to name the section file", err)
	}
	// The section's own end, 104.8 − 100 as the gauge height (4.799…97
	// in floating point), is within the table.
	out, _, err := fitRun(t, "fit", fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100", "--to", "4.8", "--method", "lsq")
	if err != nil || !strings.Contains(out, "      4.800 ") {
		t.Errorf("--to at the section's end: err = %v, output %.300q", err, out)
	}
	for _, method := range []string{"bayes", "lsq"} {
		out, _, err := fitRun(t, "fit", fitDemoGaugings, "--to", "3.5", "--method", method, "--format", "json")
		if err != nil {
			t.Fatalf("%s: %v", method, err)
		}
		var doc struct {
			Table []struct {
				Stage, Discharge float64
				Basis            string
				Multiple         *float64 `json:"gauged_multiple"`
				TotalLower       *float64 `json:"total_lower_95"`
			}
		}
		if err := json.Unmarshal([]byte(out), &doc); err != nil {
			t.Fatal(err)
		}
		last := doc.Table[len(doc.Table)-1]
		// The largest demo gauging is 66.1 m³/s at 2.96 m (demodata).
		if last.Stage != 3.5 || last.Basis != "fit above gaugings" || last.Multiple == nil || math.Abs(*last.Multiple-last.Discharge/66.1) > 1e-9 || last.TotalLower == nil {
			t.Errorf("%s: last row %+v", method, last)
		}
	}
}

// rate --calibrate scales n by the best factor and says so in the report.
func TestRateCalibrate(t *testing.T) {
	t.Parallel()
	out, _, err := fitRun(t, "rate", fitDemoSurvey, "--slope", "0.0012", "--calibrate", fitDemoGaugings, "--datum", "100", "--format", "json")
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Warnings []string
		Rows     []struct {
			Subsections []struct{ N float64 }
		}
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(strings.Join(doc.Warnings, "\n"), "n calibrated on 24 gaugings") {
		t.Errorf("warnings %q do not state the calibration", doc.Warnings)
	}
	// The survey's first n is 0.045; the demo gaugings were invented with
	// discharges 1.12 times the survey's rating, so the factor is near 1/1.12.
	n := doc.Rows[len(doc.Rows)-1].Subsections[0].N
	if f := n / 0.045; f < 0.86 || f > 0.92 {
		t.Errorf("calibrated factor %g, want near %g", f, 1/1.12)
	}
}

func TestDemoWritesFit(t *testing.T) {
	t.Parallel()
	dir, out := demoOutput(t)
	for _, name := range []string{"tallow-gaugings.csv", "tallow-fit.txt", "tallow-fit.json", "tallow-fit-table.csv", "tallow-fit-lsq.txt", "tallow-fit.png", "tallow-lsq-fit.png", "tallow-fit.xlsx"} {
		if !strings.Contains(out, name) {
			t.Errorf("demo output does not list %s", name)
		}
		if _, err := os.Stat(filepath.Join(dir, name)); err != nil {
			t.Error(err)
		}
	}
}

// Gaugings from a workbook's gaugings sheet, with times as the
// spreadsheet's own date cells (serial 45000.5 is 2023-03-15 12:00 in the
// 1900 date system, excelize.ExcelDateToTime).
func TestFitWorkbookGaugings(t *testing.T) {
	t.Parallel()
	f := excelize.NewFile()
	defer f.Close()
	if _, err := f.NewSheet("gaugings"); err != nil {
		t.Fatal(err)
	}
	rows := [][]any{{"time", "gauge_height", "discharge", "quality"}}
	for i, h := range []float64{0.5, 0.7, 0.9, 1.2, 1.6, 2.0} {
		rows = append(rows, []any{45000.5 + 30*float64(i), h, 8 * math.Pow(h-0.3, 2), "good"})
	}
	style, err := f.NewStyle(&excelize.Style{NumFmt: 22}) // m/d/yy h:mm
	if err != nil {
		t.Fatal(err)
	}
	for i, r := range rows {
		cell, _ := excelize.CoordinatesToCellName(1, i+1)
		if err := f.SetSheetRow("gaugings", cell, &r); err != nil {
			t.Fatal(err)
		}
		if i > 0 {
			if err := f.SetCellStyle("gaugings", cell, cell, style); err != nil {
				t.Fatal(err)
			}
		}
	}
	path := filepath.Join(t.TempDir(), "field.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	out, _, err := fitRun(t, "fit", path, "--format", "json", "--method", "lsq")
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Gaugings []struct{ Time string }
		Segments []struct {
			ZeroFlowStage float64 `json:"zero_flow_stage"`
			Exponent      float64
		}
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if doc.Gaugings[0].Time != "2023-03-15T12:00:00Z" {
		t.Errorf("first time %q", doc.Gaugings[0].Time)
	}
	// Noise-free Q = 8·(h − 0.3)² (closed form).
	if s := doc.Segments[0]; math.Abs(s.ZeroFlowStage-0.3) > 1e-6 || math.Abs(s.Exponent-2) > 1e-6 {
		t.Errorf("segment %+v, want e 0.3 and b 2", s)
	}
}

// TestFitPlots checks that fit --plots writes the rating figure with the
// gaugings as a PNG of the default size.
func TestFitPlots(t *testing.T) {
	t.Parallel()
	dir, _ := demoOutput(t)
	plots := filepath.Join(t.TempDir(), "figs")
	_, errs, code := runCLI(t, "fit", filepath.Join(dir, demoGaugings), "--section", filepath.Join(dir, demoSurvey),
		"--slope", "0.0012", "--datum", "100", "--plots", plots, "-o", filepath.Join(t.TempDir(), "fit.json"))
	if code != 0 {
		t.Fatal(errs)
	}
	f, err := os.Open(filepath.Join(plots, "tallow-gaugings-fit.png"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	cfg, err := png.DecodeConfig(f)
	if err != nil || cfg.Width != plotting.DefaultWidth || cfg.Height != plotting.DefaultHeight {
		t.Errorf("%v %dx%d", err, cfg.Width, cfg.Height)
	}
}

// --controls, --kinds and --joints say what each control is and how it
// joins the one below; --joints takes one word per control above the
// first, or one per control with the first "replace".
func TestFitControlFlags(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		args         []string
		kinds, joins []string
	}{
		{[]string{"--controls", "2", "--kinds", "section,channel", "--joints", "replace"}, []string{"section", "channel"}, []string{"replace", "replace"}},
		{[]string{"--segments", "2", "--joints", "replace,add", "--breaks", "2.2"}, []string{"channel", "channel"}, []string{"replace", "add"}},
		{[]string{"--breaks", "1.2"}, []string{"channel", "channel"}, []string{"replace", "replace"}},
	} {
		doc := fitJSON(t, append([]string{fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100", "--method", "lsq"}, tc.args...)...)
		segs := doc["segments"].([]any)
		if len(segs) != len(tc.kinds) {
			t.Fatalf("%q: %d segments", tc.args, len(segs))
		}
		for j, s := range segs {
			m := s.(map[string]any)
			if m["kind"] != tc.kinds[j] || m["control"] != tc.joins[j] {
				t.Errorf("%q: control %d is %v, %v", tc.args, j+1, m["kind"], m["control"])
			}
		}
		if doc["floodplain_added"] != false {
			t.Errorf("%q: a floodplain was added", tc.args)
		}
	}
}

// fit --section without --datum, every gauging below the section's lowest
// point (the demo gaugings are gauge heights 0.46 to 2.96 m; the demo
// section's ground lies near 100 m and above): refused with exit 1, the
// ranges and a hint to give --datum. With the gaugings written as
// elevations (gauge height + 100 m, by hand) the fit runs, and the datum
// line says no datum was given instead of "+ 0 m (--datum)".
func TestFitSectionWithoutDatum(t *testing.T) {
	t.Parallel()
	out, errs, code := runCLI(t, "fit", fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--compare-only")
	if code != 1 || out != "" || !strings.Contains(errs, "no gauging lies within the section's stage range") || !strings.Contains(errs, "give --datum") {
		t.Errorf("exit %d, stdout %q, stderr %q", code, out, errs)
	}
	elev := filepath.Join(t.TempDir(), "elev.csv")
	if err := os.WriteFile(elev, []byte("time,stage,discharge,quality\n2019-05-19T08:45,100.77,1.53,good\n2019-07-15T12:45,101.96,23.6,poor\n2019-09-11T09:30,102.74,50.7,fair\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	out, errs, code = runCLI(t, "fit", elev, "--section", fitDemoSurvey, "--slope", "0.0012", "--compare-only")
	if code != 0 || !strings.Contains(out, "Gauge datum: none given, so gauge heights are read as the survey's elevations") || strings.Contains(out, "(--datum)") {
		t.Errorf("elevations: exit %d\n%.600s\n%s", code, out, errs)
	}
}

// TestDemoFitStatesDatum: the demo's text fits state the gauge datum they
// use (demoDatum) as the same fit on the command line with --datum does.
func TestDemoFitStatesDatum(t *testing.T) {
	t.Parallel()
	dir, _ := demoOutput(t)
	datumLine := func(text string) string {
		for _, l := range strings.Split(text, "\n") {
			if strings.HasPrefix(l, "Gauge datum:") {
				return l
			}
		}
		return ""
	}
	out, errs, code := runCLI(t, "fit", filepath.Join(dir, demoGaugings), "--section", filepath.Join(dir, demoSurvey),
		"--slope", fmt.Sprint(demoSlope), "--datum", fmt.Sprint(demoDatum), "--method", "lsq")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	want := datumLine(out)
	if !strings.Contains(want, "+ 100 m") {
		t.Fatalf("the command's datum line %q", want)
	}
	for _, name := range []string{"tallow-fit.txt", "tallow-fit-lsq.txt"} {
		b, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		if got := datumLine(string(b)); got != want {
			t.Errorf("%s: %q, want %q", name, got, want)
		}
	}
}

// A breakpoint above every gauging leaves a control with none, and one
// at 2.6 m leaves it two: on weak priors (no section) both methods refuse
// them with exit status 1, as for other gaugings that cannot carry the
// fit, naming the control, its stages, how many gaugings it holds and at
// which stages (the Bayesian fit its priors too). The demo gaugings reach
// 2.96 m, two of them above 2.6 m (2.74 and 2.96 m; demodata).
func TestFitBreakAboveGaugingsRefused(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct{ breaks, want string }{
		{"3.5", "control 2 (from 3.5 m up) holds 0 of the 24 gaugings used"},
		{"2.6", "control 2 (from 2.6 m up) holds 2 of the 24 gaugings used, from 2.74 to 2.96 m"},
	} {
		for _, method := range []string{"bayes", "lsq"} {
			out, errs, code := runCLI(t, "fit", fitDemoGaugings, "--method", method, "--breaks", tc.breaks)
			if code != 1 || out != "" || !strings.Contains(errs, "a control holds too few gaugings: "+tc.want) ||
				!strings.Contains(errs, "breakpoint given at "+tc.breaks+" m") || strings.Count(errs, "\n") != 1 {
				t.Errorf("%s --breaks %s: exit %d, stdout %q, stderr %q, want it to name %q", method, tc.breaks, code, out, errs, tc.want)
			}
			if method == "bayes" && !strings.Contains(errs, "weak priors") {
				t.Errorf("bayes --breaks %s: stderr %q does not name the control's priors", tc.breaks, errs)
			}
		}
	}
}

// A breakpoint the gaugings cannot honour inside their range: the demo's
// three gaugings above 2.5 m (2.52 to 2.96 m) rise from what the first
// control gives at 2.5 m faster than a power law can, and least squares
// drives the replacing control's exponent past MaxFitExponent as its
// offset runs off below. Least squares refuses with exit status 1 and
// names the control, its breakpoint, its gaugings and the exponent it
// reached; a Bayesian fit with the section's prior on that exponent fits
// it (demodata).
func TestFitBreakRunawayNamesControl(t *testing.T) {
	t.Parallel()
	out, errs, code := runCLI(t, "fit", fitDemoGaugings, "--breaks", "2.5", "--method", "lsq")
	if code != 1 || out != "" || !strings.Contains(errs, "no power law of a control fits its gaugings: control 2 (from 2.5 m, 3 gaugings from 2.52 to 2.96 m): its least-squares exponent is ") ||
		!strings.Contains(errs, ", above 10, ") || strings.Count(errs, "\n") != 1 {
		t.Errorf("lsq: exit %d, stdout %q, stderr %q", code, out, errs)
	}
	out, errs, code = runCLI(t, "fit", fitDemoGaugings, "--breaks", "2.5", "--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100")
	if code != 0 || !strings.Contains(out, "control 2 (channel, replaces the one below), 2.500 to 2.960 m") {
		t.Errorf("bayes: exit %d, stderr %q", code, errs)
	}
}

// A time of --exclude that is no gauging's (a slip of the keyboard) is an
// error, exit status 1 as for a --period holding none, one line per such
// time naming it (at --utc-offset) and the nearest gauging; a time that
// matches, whatever offset it is written with, is left out as before.
// Demo gaugings at 2019-05-19T08:45 and 2019-07-15T12:45 (demodata).
func TestFitExcludeMatchesNoGauging(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name  string
		args  []string
		lines []string // one a time matching no gauging, in the order given
	}{
		{"two of three mistyped", []string{"--exclude", "2019-05-19T08:45,2019-07-15T12:54,2019-05-19T09:45"}, []string{
			"--exclude 2019-07-15T12:54:00Z: " + fitDemoGaugings + ": no gauging is at that time (the nearest is at 2019-07-15T12:45:00Z)",
			"--exclude 2019-05-19T09:45:00Z: " + fitDemoGaugings + ": no gauging is at that time (the nearest is at 2019-05-19T08:45:00Z)"}},
		// At +10:00 the file's times, written without an offset, are
		// read at +10:00 too.
		{"at +10:00", []string{"--utc-offset", "+10:00", "--exclude", "2019-05-19T09:45"}, []string{
			"--exclude 2019-05-19T09:45:00+10:00: " + fitDemoGaugings + ": no gauging is at that time (the nearest is at 2019-05-19T08:45:00+10:00)"}},
	} {
		args := append([]string{"fit", fitDemoGaugings, "--method", "lsq"}, tc.args...)
		out, errs, code := runCLI(t, args...)
		lines := strings.Split(strings.TrimSpace(errs), "\n")
		if code != 1 || out != "" || len(lines) != len(tc.lines) {
			t.Errorf("%s: exit %d, stdout %q, stderr %q", tc.name, code, out, errs)
			continue
		}
		for i, want := range tc.lines {
			if !strings.Contains(lines[i], want) {
				t.Errorf("%s: line %d %q, want %q", tc.name, i+1, lines[i], want)
			}
		}
		if _, _, err := fitRun(t, args...); !errors.Is(err, gauged.ErrExcludeUnmatched) {
			t.Errorf("%s: %v, want gauged.ErrExcludeUnmatched", tc.name, err)
		}
	}
	doc := fitJSON(t, fitDemoGaugings, "--method", "lsq", "--exclude", "2019-05-19T18:45+10:00") // 08:45 UTC
	if s := doc["selection"].(map[string]any); s["excluded"] != 1.0 {
		t.Errorf("a matching time written at +10:00: selection %v", s)
	}
}

// A fit on a section states its calibration of n in JSON with the keys of
// its contract, in the order of the first release (channel_only, the
// factor, the gaugings' scatter about the calibrated rating), the factor's
// own standard error added after them. With every
// n scaled, as here, the factor's standard error is the scatter over √n
// in ln units (the standard error of a weighted mean), so below it.
func TestFitCalibrationJSON(t *testing.T) {
	t.Parallel()
	out, errs, code := runCLI(t, "fit", fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100", "--method", "lsq", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var doc map[string]json.RawMessage
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	keys := jsonKeys(t, doc["calibration"])
	if want := []string{"channel_only", "factor", "standard_error_percent", "factor_standard_error_percent"}; !slices.Equal(keys, want) {
		t.Errorf("calibration keys %q, want %q", keys, want)
	}
	var c struct {
		Factor   float64 `json:"factor"`
		FactorSE float64 `json:"factor_standard_error_percent"`
		SE       float64 `json:"standard_error_percent"`
	}
	if err := json.Unmarshal(doc["calibration"], &c); err != nil {
		t.Fatal(err)
	}
	if !(c.Factor > 0 && c.FactorSE > 0 && c.FactorSE < c.SE) {
		t.Errorf("calibration %+v", c)
	}
}
