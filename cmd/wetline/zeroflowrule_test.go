package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"testing"
)

// Every command reading a rating table reads it by one rule: e from
// --zero-flow when given, else the stage of the table's dry first row
// (an input note says so), else linearly with a warning. shifts and
// compare read a table with a dry first row without --zero-flow as they
// read it with --zero-flow at that row's stage.
//
// Rows (0.2, 0), (0.7, 2), (1.2, 8): with e = 0.2 the power law through
// the two rows with flow is Q = 2·((h − 0.2)/0.5)² (b = ln 4/ln 2 = 2), so
// Q = 0.5 at 0.45 m and 0.72 at 0.5 m (closed form); read linearly in
// stage from the dry row, 1 and 1.2.
func TestZeroFlowFromDryFirstRow(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	foot := filepath.Join(dir, "foot.csv")
	gaugings := filepath.Join(dir, "g.csv")
	for name, text := range map[string]string{
		foot:     "stage,discharge\n0.2,0\n0.7,2\n1.2,8\n",
		gaugings: "time,stage,discharge\n2024-10-01T00:00,0.45,0.5\n",
	} {
		if err := os.WriteFile(name, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	note := foot + ":2: the gauge height of zero flow e = 0.2 is the stage of the table's last dry row at its foot (--zero-flow not given)"
	for _, zero := range [][]string{nil, {"--zero-flow", "0.2"}} {
		out, errs, code := runCLI(t, append([]string{"shifts", gaugings, "--rating", foot, "--format", "json"}, zero...)...)
		if code != 0 {
			t.Fatalf("shifts %v: exit %d: %s", zero, code, errs)
		}
		var sh struct {
			Gaugings []struct {
				Rated float64 `json:"rated"`
			} `json:"gaugings"`
			Ratings []struct {
				ZeroFlow *float64 `json:"zero_flow"`
			} `json:"ratings"`
			Warnings   []string `json:"warnings"`
			InputNotes []string `json:"input_notes"`
		}
		if err := json.Unmarshal([]byte(out), &sh); err != nil {
			t.Fatal(err)
		}
		if len(sh.Gaugings) != 1 || math.Abs(sh.Gaugings[0].Rated-0.5) > 1e-9 || len(sh.Ratings) != 1 || sh.Ratings[0].ZeroFlow == nil || *sh.Ratings[0].ZeroFlow != 0.2 {
			t.Errorf("shifts %v: %+v, want the gauging rated 0.5 on e = 0.2", zero, sh)
		}
		if noted := slicesContain(sh.InputNotes, note); noted != (zero == nil) || len(sh.Warnings) != 0 {
			t.Errorf("shifts %v: notes %q warnings %q, want the dry row's note only without the flag", zero, sh.InputNotes, sh.Warnings)
		}
	}
	out, errs, code := runCLI(t, "compare", foot, foot, "--step", "0.25", "--format", "json")
	if code != 0 {
		t.Fatalf("compare: exit %d: %s", code, errs)
	}
	var cmp struct {
		Rows []struct {
			Stage      float64 `json:"stage"`
			DischargeA float64 `json:"discharge_a"`
		} `json:"rows"`
		InputNotes []string `json:"input_notes"`
	}
	if err := json.Unmarshal([]byte(out), &cmp); err != nil {
		t.Fatal(err)
	}
	seen := false
	for _, r := range cmp.Rows {
		if r.Stage == 0.5 {
			seen = true
			if math.Abs(r.DischargeA-0.72) > 1e-9 {
				t.Errorf("compare at 0.5 m: %g, want 0.72 (log-linear in h − 0.2)", r.DischargeA)
			}
		}
	}
	if !seen || !slicesContain(cmp.InputNotes, note) {
		t.Errorf("compare: rows %+v notes %q", cmp.Rows, cmp.InputNotes)
	}
}
