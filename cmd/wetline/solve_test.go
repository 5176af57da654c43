package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

func TestSolveGolden(t *testing.T) {
	t.Parallel()
	tests := []struct {
		name string
		args []string
	}{
		{"solve-pipe.txt", []string{"solve", "--shape", "circle:diameter=0.6", "--n", "0.013", "--slope", "0.005", "--discharge", "0.45"}},
		{"solve-trapezoid.txt", []string{"solve", "--shape", "trapezoid:bottom=3,side=2", "--n", "0.025", "--slope", "0.0008", "--discharge", "12"}},
		{"solve-compound.txt", []string{"solve", "--shape", "compound:bottom=4,side=0,depth=2,floodplain=40,outer=0,floodn=0.06", "--n", "0.03", "--discharge", "20"}},
		{"solve-area-us.txt", []string{"solve", "--shape", "trapezoid:bottom=20,side=2", "--n", "0.025", "--units", "us", "--area", "100"}},
		{"solve-stage.txt", []string{"solve", "--shape", "rectangle:width=2", "--n", "0.015", "--stage", "0.5", "--slope", "0.001"}},
	}
	for _, tt := range tests {
		out, errs, code := runCLI(t, tt.args...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", tt.args, code, errs)
		}
		golden(t, tt.name, out)
	}
}

// TestSolveJSONContract checks the keys promised to scripts.
func TestSolveJSONContract(t *testing.T) {
	t.Parallel()
	out, errs, code := runCLI(t, "solve", "--shape", "trapezoid:bottom=3,side=2", "--n", "0.025", "--slope", "0.0008", "--discharge", "12", "--format", "json")
	if code != 0 {
		t.Fatal(errs)
	}
	var v map[string]any
	if err := json.Unmarshal([]byte(out), &v); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"normal_stage", "normal_depth", "critical_stages", "froude", "regime", "specific_energy_minima", "caution"} {
		if _, ok := v[k]; !ok {
			t.Errorf("JSON lacks %q", k)
		}
	}
	if v["regime"] != "subcritical" {
		t.Errorf("regime %v", v["regime"])
	}
	if cs, ok := v["critical_stages"].([]any); !ok || len(cs) != 1 {
		t.Errorf("critical_stages %v", v["critical_stages"])
	}
}

func TestShapeUsageErrors(t *testing.T) {
	t.Parallel()
	tests := []struct {
		args []string
		want string // in stderr
		code int
	}{
		{[]string{"solve", "--shape", "hexagon:side=1", "--n", "0.02", "--discharge", "1"}, `kind: unknown kind "hexagon"`, 2},
		{[]string{"rate", "--shape", "trapezoid:bottom=3", "--n", "0.02", "--slope", "0.001"}, "side: missing", 2},
		{[]string{"rate", "--shape", "circle:diameter=0", "--n", "0.02", "--slope", "0.001"}, "diameter: must be positive", 2},
		{[]string{"rate", "--shape", "rectangle:width=2,depth=1", "--n", "0.02", "--slope", "0.001"}, `"depth": unknown key`, 2},
		{[]string{"rate", "--shape", "circle:diameter=0.6", "--n", "0.013", "--slope", "0.001", "--stages", "0.3,0.7"}, "above the crown", 2},
		{[]string{"rate", "--shape", "circle:diameter=0.6", "--slope", "0.001"}, "needs Manning's n", 2},
		{[]string{"solve", "--shape", "circle:diameter=0.6", "--n", "0.013"}, "give one of --discharge", 2},
		{[]string{"solve", "--shape", "circle:diameter=0.6", "--n", "0.013", "--discharge", "1", "--composite", "average"}, "composite roughness", 2},
		{[]string{"shape", "circle:diameter=1"}, "closed conduit", 2},
	}
	for _, tt := range tests {
		_, errs, code := runCLI(t, tt.args...)
		if code != tt.code || !strings.Contains(errs, tt.want) {
			t.Errorf("%v: exit %d, stderr %q; want %d and %q", tt.args, code, errs, tt.code, tt.want)
		}
		if code == 2 && strings.Contains(tt.want, ":") && !strings.Contains(errs, "accepted:") {
			t.Errorf("%v: the message does not list the accepted forms: %s", tt.args, errs)
		}
	}
}

// sameCSVNumbers reports whether two CSV texts have the same cells, numbers
// compared to within one unit in the sixth significant digit (the
// writer's precision: the sweep and the per-stage clip may round the last
// written digit differently).
func sameCSVNumbers(a, b string) bool {
	la, lb := strings.Split(a, "\n"), strings.Split(b, "\n")
	if len(la) != len(lb) {
		return false
	}
	for i := range la {
		fa, fb := strings.Split(la[i], ","), strings.Split(lb[i], ",")
		if len(fa) != len(fb) {
			return false
		}
		for j := range fa {
			if fa[j] == fb[j] {
				continue
			}
			x, ex := strconv.ParseFloat(fa[j], 64)
			y, ey := strconv.ParseFloat(fb[j], 64)
			if ex != nil || ey != nil || math.Abs(x-y) > 1e-5*math.Max(math.Abs(x), math.Abs(y)) {
				return false
			}
		}
	}
	return true
}

// TestShapeSurveyRoundTrip: a shape written as a survey CSV rates as the
// shape itself at the default stages.
func TestShapeSurveyRoundTrip(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	for i, spec := range []string{"trapezoid:bottom=3,left=1.5,right=2,invert=101.25", "compound:bottom=2,side=1,depth=1.5,floodplain=20,outer=3", "rectangle:width=2.5", "triangle:side=0.75"} {
		path := filepath.Join(dir, "built-"+strconv.Itoa(i)+".csv") // shape never replaces a file
		n := "0.03"
		if strings.HasPrefix(spec, "compound") {
			n = "0.06,0.035,0.05"
		}
		if _, errs, code := runCLI(t, "shape", spec, "--n", n, "-o", path); code != 0 {
			t.Fatal(errs)
		}
		fromFile, errs, code := runCLI(t, "rate", path, "--slope", "0.001")
		if code != 0 {
			t.Fatal(errs)
		}
		fromShape, errs, code := runCLI(t, "rate", "--shape", spec, "--n", n, "--slope", "0.001")
		if code != 0 {
			t.Fatal(errs)
		}
		if !sameCSVNumbers(fromFile, fromShape) {
			t.Errorf("%s: rating from the written survey differs:\n%s\nfrom the shape:\n%s", spec, fromFile, fromShape)
		}
	}
}

// TestShapeSurveyUnits: a shape written in feet says so in its headers,
// so it rates in feet (US Manning constant 1.486) without --units, exactly
// as the shape given with --units us, and --units si is refused naming the
// column.
func TestShapeSurveyUnits(t *testing.T) {
	t.Parallel()
	path := filepath.Join(t.TempDir(), "built-ft.csv")
	const spec, n = "trapezoid:bottom=10,side=2", "0.03"
	if _, errs, code := runCLI(t, "shape", spec, "--n", n, "--units", "us", "-o", path); code != 0 {
		t.Fatal(errs)
	}
	fromFile, errs, code := runCLI(t, "rate", path, "--slope", "0.001")
	if code != 0 {
		t.Fatal(errs)
	}
	fromShape, errs, code := runCLI(t, "rate", "--shape", spec, "--n", n, "--slope", "0.001", "--units", "us")
	if code != 0 {
		t.Fatal(errs)
	}
	if !sameCSVNumbers(fromFile, fromShape) {
		t.Errorf("rating of the feet survey differs from the shape in feet:\n%s\n%s", fromFile, fromShape)
	}
	if _, errs, code := runCLI(t, "rate", path, "--slope", "0.001", "--units", "si"); code != 1 || !strings.Contains(errs, "built-ft.csv") || !strings.Contains(errs, "station (ft)") {
		t.Errorf("--units si on a feet survey: exit %d: %s", code, errs)
	}
}

// TestSolveWithoutN: n enters only through conveyance, so a built shape
// needs none for a stage at a flow area, nor for critical flow in a shape
// of one region (alpha is 1 whatever n is); Manning's equation (--slope)
// and a compound shape's alpha still need it. Closed forms for the
// trapezoid bottom 3 m, sides 2:1 (Chow 1959, table 2-1 and eq. 4-4):
// A = (3 + 2y)·y = 10 m² at y = (−3 + √89)/4 = 1.6085 m; at y = 1 m,
// A = 5 m², T = 7 m and Qc = √(9.80665·5³/7) = 13.233 m³/s.
func TestSolveWithoutN(t *testing.T) {
	t.Parallel()
	trap := "trapezoid:bottom=3,side=2"
	noN := filepath.Join(t.TempDir(), "non.csv")
	if err := os.WriteFile(noN, []byte("station,elevation\n0,2\n4,0\n7,0\n11,2\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name string
		args []string
		code int
		want string
	}{
		{"area", []string{"--shape", trap, "--area", "10"}, 0, "held at stage 1.6085 m"},
		{"critical at a stage", []string{"--shape", trap, "--stage", "1"}, 0, "critical discharge is 13.23 m3/s"},
		{"critical stage of a discharge", []string{"--shape", trap, "--discharge", "13.233"}, 0, "critical stage 1.0000 m"},
		{"uniform flow", []string{"--shape", trap, "--stage", "1", "--slope", "0.001"}, 2, "needs Manning's n (--n) for Manning's equation"},
		{"normal stage", []string{"--shape", trap, "--discharge", "10", "--slope", "0.001"}, 2, "needs Manning's n"},
		{"compound critical", []string{"--shape", "compound:bottom=4,side=0,depth=2,floodplain=40,outer=0,floodn=0.06", "--stage", "2.5"}, 2, "alpha weighs its floodplains"},
		{"compound area", []string{"--shape", "compound:bottom=4,side=0,depth=2,floodplain=40,outer=0,floodn=0.06", "--area", "8"}, 0, "held at stage 2.0000 m"},
		// The same trapezoid surveyed, with no n column: a survey without
		// banks is one region, as the shape (such a survey was once
		// refused for --area and --stage).
		{"survey area", []string{noN, "--area", "10"}, 0, "held at stage 1.6085 m"},
		{"survey critical at a stage", []string{noN, "--stage", "1"}, 0, "critical discharge is 13.23 m3/s"},
		{"survey critical stage", []string{noN, "--discharge", "13.233"}, 0, "roughness none given (Manning's n plays no part"},
		{"survey uniform flow", []string{noN, "--stage", "1", "--slope", "0.001"}, 1, "the survey has no n column: give Manning's n"},
		{"survey with banks, critical", []string{noN, "--banks", "4,7", "--stage", "1"}, 1, "even for critical flow: its banks split it"},
		{"survey with banks, area", []string{noN, "--banks", "4,7", "--area", "10"}, 0, "held at stage 1.6085 m"},
	} {
		out, errs, code := runCLI(t, append([]string{"solve"}, tc.args...)...)
		if code != tc.code || !strings.Contains(out+errs, tc.want) {
			t.Errorf("%s: exit %d, output %q %q; want exit %d and %q", tc.name, code, out, errs, tc.code, tc.want)
		}
	}
}

// With --no-extend a discharge whose normal and critical stages both lie
// inside the section is solved, not refused for a stage the search of
// specific energy would have looked at above the walls. The section is a
// rectangle 10 m wide between vertical walls 10 m high, n 0.03, carrying
// 846 m³/s at slope 0.05: critical depth y_c = (q²/g)^(1/3) with
// q = 84.6 m²/s is 9.0034 m and E_min = 1.5·y_c = 13.5051 m (Chow 1959,
// section 3-2); the normal depth 5.8574 m solves Manning's equation
// (1/n)·A·R^(2/3)·√S = Q with A = 10·y, R = 10·y/(10 + 2·y) (Chow 1959,
// section 6-4), by bisection in a short independent script.
func TestSolveNoExtendInsideTheWalls(t *testing.T) {
	t.Parallel()
	out, errs, code := runCLI(t, "solve", filepath.Join("testdata", "solve-walls-10m.csv"), "--discharge", "846", "--slope", "0.05", "--no-extend")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, want := range []string{"normal stage 5.8574 m", "critical stage 9.0034 m", "least specific energy 13.5051 m at stage 9.0034 m"} {
		if !strings.Contains(out, want) {
			t.Errorf("output %q lacks %q", out, want)
		}
	}
}
