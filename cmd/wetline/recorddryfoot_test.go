package main

import (
	"encoding/csv"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// A rating rate writes on stages of the user's that straddle the
// section's lowest point is read by record with e on that point, from
// the table's depth column: the discharge between the rows is the
// section's own (Manning on a triangular section, a power law of
// exponent 8/3 in depth, which the log-linear reading in (h − e)
// reproduces to the table's six figures), and a gauge height below the
// lowest point but above the last dry row is zero flow, flagged.
func TestRecordReadsRatingFromDepth(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	// A V of side slopes 5 (horizontal to vertical), its vertex at 100.37.
	const z, n, slope, bottom = 5.0, 0.035, 0.0015, 100.37
	put := func(name, text string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	xs := put("vee.csv", "station,elevation,n\n0,102.37,0.035\n10,100.37,0.035\n20,102.37,\n")
	stages := put("stages.csv", "time,stage\n2024-01-01T00:00,100.45\n2024-01-01T00:15,100.35\n2024-01-01T00:30,100.38\n")
	table := filepath.Join(dir, "vee-rating.csv")
	if _, errs, code := runCLI(t, "rate", xs, "--slope", "0.0015", "--from", "100", "--to", "101", "--step", "0.1", "-o", table); code != 0 {
		t.Fatalf("rate: exit %d: %s", code, errs)
	}
	out, errs, code := runCLI(t, "record", stages, "--rating", table, "--unit", "--format", "csv")
	if code != 0 {
		t.Fatalf("record: exit %d: %s", code, errs)
	}
	if !strings.Contains(errs, "vee-rating.csv:6: the gauge height of zero flow e = 100.37 is the stage less the depth of the table's first row with flow (100.4 − 0.03)") {
		t.Errorf("no note of e from the depth column:\n%s", errs)
	}
	rows, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := map[string]int{}
	for i, h := range rows[0] {
		col[h] = i
	}
	// Manning's formula on the triangle (Chow 1959, chap. 5 and table 2-1;
	// from memory): Q = (1/n)·z·y²·(z·y/(2√(1+z²)))^(2/3)·√S.
	manning := func(y float64) float64 {
		if y <= 0 {
			return 0
		}
		return z * y * y * math.Pow(z*y/(2*math.Sqrt(1+z*z)), 2.0/3) * math.Sqrt(slope) / n
	}
	for i, want := range []struct {
		stage float64
		flag  string
	}{{100.45, ""}, {100.35, "below_zero_flow"}, {100.38, ""}} {
		r := rows[i+1]
		q, err := strconv.ParseFloat(r[col["discharge"]], 64)
		if err != nil {
			t.Fatalf("row %d: %v", i+1, err)
		}
		if hand := manning(want.stage - bottom); math.Abs(q-hand) > 2e-5*hand || r[col["flags"]] != want.flag {
			t.Errorf("at %g: discharge %g flags %q, want %g (Manning on the section) flags %q", want.stage, q, r[col["flags"]], hand, want.flag)
		}
	}
}

// A row without flow above the --zero-flow given contradicts it: compare
// (as record, shifts and fit --hydraulic-zero-flow) refuses it, naming the
// flag and the row, as it refuses a row with flow at or below e.
func TestZeroFlowBelowDryRowRefused(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	a := filepath.Join(dir, "a.csv")
	b := filepath.Join(dir, "b.csv")
	if err := os.WriteFile(a, []byte("stage,discharge\n0.30,0\n0.40,0.45\n0.60,3.2\n1.00,12.5\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(b, []byte("stage,discharge\n0.25,0\n0.35,0.40\n0.55,2.9\n1.20,20.1\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	_, errs, code := runCLI(t, "compare", a, b, "--zero-flow", "0.3,0.1", "--step", "0.1")
	if code != 1 || !strings.Contains(errs, "compare: --zero-flow 0.1: ") || !strings.Contains(errs, "b.csv:2:1: stage \"0.25\": a row without flow lies above the gauge height of zero flow") {
		t.Errorf("exit %d: %s", code, errs)
	}
	if _, errs, code := runCLI(t, "compare", a, b, "--zero-flow", "0.3,0.25", "--step", "0.1"); code != 0 {
		t.Errorf("e at the dry rows: exit %d: %s", code, errs)
	}
}
