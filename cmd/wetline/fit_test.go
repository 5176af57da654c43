package main

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"wetline/plotting"
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

// The JSON report holds the contract of issue 6: segments with from_stage,
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
		{"rate", fitDemoSurvey, "--slope", "0.0012", "--datum", "100"},
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
	if err == nil || !strings.Contains(err.Error(), "refusing to extrapolate") {
		t.Errorf("past the section: err = %v", err)
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
	if doc.Gaugings[0].Time != "2023-03-15T12:00:00" {
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
