package main

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// Reference: testdata/reference/rating-01594440.csv and
// gaugings-01594440.csv (USGS 01594440, Patuxent River near Bowie, MD;
// reference README: the rating is logarithmic between breakpoints with
// an offset of 2.0 ft). With --hydraulic-zero-flow 2, fit reads the
// table as shifts reads it with --zero-flow 2: log-linearly in (h − 2)
// between rows. The gauging at 10.91 ft (2140 ft3/s) lies between the
// rows 9 ft (1175) and 13 ft (4350), where, in closed form,
// Q = 1175·((10.91 − 2)/(9 − 2))^b with b = ln(4350/1175)/ln(11/7),
// 2363.0 ft3/s; read linearly in stage it was 2691. Every gauging's
// discharge and departure on the table agree with shifts's. Without the
// flag, a table with no row without flow is read linearly, and fit says
// so.
func TestFitHydraulicTableZeroFlow(t *testing.T) {
	t.Parallel()
	const (
		gaugings = "../../testdata/reference/gaugings-01594440.csv"
		table    = "../../testdata/reference/rating-01594440.csv"
	)
	type row struct {
		Stage     float64  `json:"stage"`
		Discharge float64  `json:"discharge"`
		Hydraulic *float64 `json:"hydraulic"`
		HydDep    *float64 `json:"hydraulic_departure_percent"`
		Rated     *float64 `json:"rated"`
		Dep       *float64 `json:"departure_percent"`
	}
	type doc struct {
		Gaugings []row    `json:"gaugings"`
		Warnings []string `json:"warnings"`
	}
	read := func(args ...string) doc {
		t.Helper()
		out, errs, err := fitRun(t, args...)
		if err != nil {
			t.Fatalf("%v: %v %s", args, err, errs)
		}
		var d doc
		if err := json.Unmarshal([]byte(out), &d); err != nil {
			t.Fatal(err)
		}
		return d
	}
	fit := read("fit", gaugings, "--units", "us", "--hydraulic-rating", table, "--hydraulic-zero-flow", "2", "--compare-only", "--format", "json")
	if text, errs, err := fitRun(t, "fit", gaugings, "--units", "us", "--hydraulic-rating", table, "--hydraulic-zero-flow", "2", "--compare-only"); err != nil ||
		!strings.Contains(text, "(read at gauge heights, log-linearly in (h − e) between rows, e = 2 ft)") {
		t.Errorf("text does not say how the table is read: %v %s", err, errs)
	}
	sh := read("shifts", gaugings, "--units", "us", "--rating", table, "--zero-flow", "2", "--format", "json")
	b := math.Log(4350.0/1175) / math.Log(11.0/7)
	want := 1175 * math.Pow((10.91-2)/(9-2), b)
	if len(fit.Gaugings) != 142 || len(sh.Gaugings) != 142 {
		t.Fatalf("%d and %d gaugings, want 142 (reference README)", len(fit.Gaugings), len(sh.Gaugings))
	}
	seen := false
	for i, g := range fit.Gaugings {
		s := sh.Gaugings[i]
		if g.Hydraulic == nil || s.Rated == nil {
			t.Fatalf("gauging at %g: no discharge on the table", g.Stage)
		}
		if math.Abs(*g.Hydraulic-*s.Rated) > 1e-9**s.Rated || math.Abs(*g.HydDep-*s.Dep) > 1e-9 {
			t.Errorf("gauging at %g: fit reads %g (%.3f %%), shifts %g (%.3f %%)", g.Stage, *g.Hydraulic, *g.HydDep, *s.Rated, *s.Dep)
		}
		if g.Stage == 10.91 {
			seen = true
			if math.Abs(*g.Hydraulic-want) > 1e-6*want {
				t.Errorf("at 10.91 ft: %g ft3/s, want %.1f (log-linear in h − 2)", *g.Hydraulic, want)
			}
		}
	}
	if !seen {
		t.Error("no gauging at 10.91 ft")
	}
	for _, w := range fit.Warnings {
		if strings.Contains(w, "read linearly") {
			t.Errorf("with the flag: warning %q", w)
		}
	}
	plain := read("fit", gaugings, "--units", "us", "--hydraulic-rating", table, "--compare-only", "--format", "json")
	if !slicesContain(plain.Warnings, "read linearly in stage between rows; give --hydraulic-zero-flow E") {
		t.Errorf("without the flag: warnings %q", plain.Warnings)
	}
	// The extension above the gaugings reads the table the same way: its
	// rows are the table's discharge times one factor, and at 24 ft
	// (between the rows 20.85 ft, 16497.75, and 27.9 ft, 31100) the
	// table's discharge is, in closed form, read log-linearly in h − 2.
	out, errs, err := fitRun(t, "fit", gaugings, "--units", "us", "--hydraulic-rating", table, "--hydraulic-zero-flow", "2",
		"--method", "lsq", "--to", "27", "--step", "1", "--format", "json")
	if err != nil {
		t.Fatalf("%v %s", err, errs)
	}
	var ext struct {
		Table []struct {
			Stage, Discharge, Hydraulic float64
			Basis                       string
		} `json:"table"`
	}
	if err := json.Unmarshal([]byte(out), &ext); err != nil {
		t.Fatal(err)
	}
	b24 := math.Log(31100/16497.75) / math.Log(25.9/18.85)
	factor := math.NaN()
	for _, r := range ext.Table {
		if r.Basis != "conveyance-slope" {
			continue
		}
		if math.IsNaN(factor) {
			factor = r.Discharge / r.Hydraulic
		}
		if math.Abs(r.Discharge/r.Hydraulic/factor-1) > 1e-9 {
			t.Errorf("extension at %g ft: %g is %g times the table's %g, not %g", r.Stage, r.Discharge, r.Discharge/r.Hydraulic, r.Hydraulic, factor)
		}
		if want := 16497.75 * math.Pow((24-2)/(20.85-2), b24); r.Stage == 24 && math.Abs(r.Hydraulic/want-1) > 1e-9 {
			t.Errorf("table at 24 ft: %g, want %g", r.Hydraulic, want)
		}
	}
	if math.IsNaN(factor) {
		t.Error("no extension rows")
	}
	_, errs, code := runCLI(t, "fit", gaugings, "--units", "us", "--hydraulic-rating", table, "--hydraulic-zero-flow", "3", "--compare-only")
	if code != 1 || !strings.Contains(errs, "fit: --hydraulic-zero-flow 3: ") || !strings.Contains(errs, "above a row with flow") {
		t.Errorf("e above the first row: exit %d, %q", code, errs)
	}
	if _, errs, code := runCLI(t, "fit", gaugings, "--hydraulic-zero-flow", "2"); code != 2 || !strings.Contains(errs, "--hydraulic-zero-flow needs --hydraulic-rating TABLE") {
		t.Errorf("without a table: exit %d, %q", code, errs)
	}
}

// slicesContain reports whether one of ss contains sub.
func slicesContain(ss []string, sub string) bool {
	for _, s := range ss {
		if strings.Contains(s, sub) {
			return true
		}
	}
	return false
}
