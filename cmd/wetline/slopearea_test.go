package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"wetline/plotting"
	"wetline/rating"
	"wetline/rating/reach"
)

func TestSlopeAreaTextGolden(t *testing.T) {
	t.Parallel()
	out, errs, code := runCLI(t, "slopearea", "demodata/reach-brindle.csv")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, want := range []string{"Peak discharge", "Quality checks", "Uncertainty", "dQ/dn", "Caution: " + rating.Caution} {
		if !strings.Contains(out, want) {
			t.Errorf("report lacks %q", want)
		}
	}
	golden(t, "slopearea-brindle.golden", out)
}

// The JSON form holds at least the fields of the published contract.
func TestSlopeAreaJSONContract(t *testing.T) {
	t.Parallel()
	out, errs, code := runCLI(t, "slopearea", "demodata/reach-brindle.csv", "--format", "json", "--draws", "500")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var doc map[string]any
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	need := func(obj any, where string, keys ...string) {
		m, ok := obj.(map[string]any)
		if !ok {
			t.Fatalf("%s is not an object: %v", where, obj)
		}
		for _, k := range keys {
			if _, ok := m[k]; !ok {
				t.Errorf("%s lacks %q", where, k)
			}
		}
	}
	need(doc, "report", "discharge", "units", "sections", "subreaches", "checks", "uncertainty", "warnings", "caution")
	first := func(key string) any {
		a, ok := doc[key].([]any)
		if !ok || len(a) == 0 {
			t.Fatalf("%s is not a non-empty array", key)
		}
		return a[0]
	}
	need(first("sections"), "section", "id", "water_surface", "area", "conveyance", "alpha", "velocity_head", "froude")
	need(first("subreaches"), "subreach", "from", "to", "length", "fall", "discharge", "expanding")
	need(first("checks"), "check", "name", "value", "limit", "pass")
	need(doc["uncertainty"], "uncertainty", "p05", "p50", "p95", "dq_dn", "dq_dn_per_0_001_n")
	sec0 := first("sections").(map[string]any)
	subs, _ := sec0["subsections"].([]any)
	if len(subs) == 0 {
		t.Fatal("sections[0] has no subsections")
	}
	need(subs[0], "subsection", "from_station", "to_station", "n", "area", "conveyance")
	un := doc["uncertainty"].(map[string]any)
	if a, b := un["dq_dn"].(float64), un["dq_dn_per_0_001_n"].(float64); math.Abs(a*0.001-b) > 1e-9*math.Abs(a) {
		t.Errorf("dq_dn %g and dq_dn_per_0_001_n %g disagree", a, b)
	}
	if q, _ := doc["discharge"].(float64); !(q > 0) {
		t.Errorf("discharge %v", doc["discharge"])
	}
	if len(doc["sections"].([]any)) != 3 || len(doc["subreaches"].([]any)) != 2 {
		t.Error("want 3 sections and 2 subreaches")
	}
}

// Bad reach data ends with one clear error, exit status 1 (2 for flags),
// and writes nothing.
func TestSlopeAreaBadReach(t *testing.T) {
	t.Parallel()
	survey := "station,elevation,n\n0,12,0.04\n10,10,0.04\n20,12,\n"
	high := "station,elevation,n\n0,15,0.04\n10,13,0.04\n20,15,\n"
	const head = "section,survey,distance,ws_left,ws_right\n"
	for _, tc := range []struct {
		name, reach string
		flags       []string
		code        int
		want        string
	}{
		{"one section", head + "A,a.csv,0,11,\n", nil, 1, "two or more sections"},
		{"zero fall", head + "A,a.csv,0,11,\nB,a.csv,100,11,\n", nil, 1, "must fall"},
		{"negative fall", head + "A,a.csv,0,11,\nB,a.csv,100,11.2,\n", nil, 1, "must fall"},
		{"distances not increasing", head + "A,a.csv,100,11,\nB,a.csv,100,10.9,\n", nil, 1, "reach.csv:3:3: distance \"100\""},
		{"section above the water", head + "A,a.csv,0,11,\nB,high.csv,100,10.9,\n", nil, 1, "reach.csv:3:4"},
		{"unknown survey file", head + "A,a.csv,0,11,\nB,gone.csv,100,10.9,\n", nil, 1, "reach.csv:3:2: survey \"gone.csv\""},
		{"bad side", head + "A,a.csv,0,11,\nB,a.csv,100,10.9,\n", []string{"--side", "middle"}, 2, `slopearea: --side: the side of the marks must be mean, left or right, not "middle"`},
		{"slope with a reach", head + "A,a.csv,0,11,\nB,a.csv,100,10.9,\n", []string{"--slope", "0.001"}, 2, "--slope"},
		{"negative draws", head + "A,a.csv,0,11,\nB,a.csv,100,10.9,\n", []string{"--draws", "-1"}, 2, "--draws"},
		{"one draw", head + "A,a.csv,0,11,\nB,a.csv,100,10.9,\n", []string{"--draws", "1"}, 2, "--draws 1: want 0 (no band) or 100 to"},
		{"too few draws", head + "A,a.csv,0,11,\nB,a.csv,100,10.9,\n", []string{"--draws", "99"}, 2, "--draws 99"},
		{"n-cv above 1", head + "A,a.csv,0,11,\nB,a.csv,100,10.9,\n", []string{"--n-cv", "1.5"}, 2, "--n-cv 1.5: want 0 to 1"},
		{"no marks on a row", head + "A,a.csv,0,,\nB,a.csv,100,10.9,\n", nil, 1, "reach.csv:2:4: ws_left: give a high-water mark in ws_left or ws_right"},
		{"listed downstream first", head + "C,a.csv,200,10.8,\nB,a.csv,100,10.9,\nA,a.csv,0,11,\n", nil, 1,
			"reach.csv:3:3: distance \"100\": distances must increase downstream, row by row (100 after 200): the table lists its sections downstream first"},
		{"middle mark raised by a blunder", head + "A,a.csv,0,11,\nB,a.csv,100,11.6,\nC,a.csv,200,10.8,\n", nil, 1,
			"reach.csv: subreach A to B: at the reach's computed "},
		{"survey outside the folder", head + "A,a.csv,0,11,\nB,../a.csv,100,10.9,\n", nil, 1, "give --surveys-anywhere to allow it"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			for name, text := range map[string]string{"reach.csv": tc.reach, "a.csv": survey, "high.csv": high} {
				if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
					t.Fatal(err)
				}
			}
			out := filepath.Join(dir, "out.json")
			args := append([]string{"slopearea", filepath.Join(dir, "reach.csv"), "-o", out}, tc.flags...)
			checkRefused(t, args, tc.code, tc.want, out)
		})
	}
}

// One section with a slope gives the slope-conveyance estimate Q = K·√S,
// labelled as weaker.
func TestSlopeAreaOneSectionSlope(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	os.WriteFile(filepath.Join(dir, "reach.csv"), []byte("section,survey,distance,ws_left,ws_right\nA,a.csv,0,11,\n"), 0o644)
	os.WriteFile(filepath.Join(dir, "a.csv"), []byte("station,elevation,n\n0,12,0.04\n10,10,0.04\n20,12,\n"), 0o644)
	out, errs, code := runCLI(t, "slopearea", filepath.Join(dir, "reach.csv"), "--slope", "0.001")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !strings.Contains(out, "weaker method") || !strings.Contains(out, "slope-conveyance") {
		t.Errorf("report does not label the weaker method:\n%s", out)
	}
	// The Monte Carlo flags (on by default) do not apply to one section:
	// said, not silent.
	if !strings.Contains(out, "no uncertainty band: the Monte Carlo analysis") {
		t.Errorf("report does not say the uncertainty flags do not apply:\n%s", out)
	}
	// No profile of a reach of one section, only the section.
	plots := filepath.Join(dir, "figs")
	if _, errs, code := runCLI(t, "slopearea", filepath.Join(dir, "reach.csv"), "--slope", "0.001", "--plots", plots,
		"-o", filepath.Join(dir, "r.txt")); code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if names, _ := filepath.Glob(filepath.Join(plots, "*.png")); len(names) != 1 || filepath.Base(names[0]) != "reach-sections.png" {
		t.Errorf("figures %q: want reach-sections.png only", names)
	}
	// Triangle of depth 1 m and side slopes 5:1: A = 5 m², P = 2√26 m,
	// Q = A·R^(2/3)·√S/n (Chow 1959, eq. 6-9) = 2.458 m³/s (by hand).
	if !strings.Contains(out, "Peak discharge  2.458 m3/s") {
		t.Errorf("want Q = 2.458 m3/s:\n%s", out)
	}
}

func TestSlopeAreaOutputFile(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	out := filepath.Join(dir, "report.json")
	_, errs, code := runCLI(t, "slopearea", "demodata/reach-brindle.csv", "-o", out, "--draws", "200")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	data, err := os.ReadFile(out)
	if err != nil || !bytes.HasPrefix(data, []byte("{")) {
		t.Fatalf("json by extension: %v %q", err, data[:min(len(data), 20)])
	}
	if !strings.Contains(errs, "wrote "+out) || !strings.Contains(errs, "caution: ") {
		t.Errorf("summary %q", errs)
	}
	// Never over an input.
	before, _ := os.ReadFile("demodata/reach-brindle-xs2.csv")
	_, errs, code = runCLI(t, "slopearea", "demodata/reach-brindle.csv", "--format", "text", "-o", "demodata/reach-brindle-xs2.csv")
	after, _ := os.ReadFile("demodata/reach-brindle-xs2.csv")
	if code != 1 || !strings.Contains(errs, "refusing") || !bytes.Equal(before, after) {
		t.Errorf("overwrite of an input: exit %d %s", code, errs)
	}
}

func TestDemoWritesSlopeArea(t *testing.T) {
	t.Parallel()
	dir, out := demoOutput(t)
	if !strings.Contains(out, "reach-brindle-slopearea.txt") {
		t.Errorf("demo output lacks the report:\n%s", out)
	}
	report, err := os.ReadFile(filepath.Join(dir, "reach-brindle-slopearea.txt"))
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"Quality checks", "90 % band", rating.Caution} {
		if !strings.Contains(string(report), want) {
			t.Errorf("demo report lacks %q", want)
		}
	}
	// The written reach reads back to the same discharge.
	out2, _, code := runCLI(t, "slopearea", filepath.Join(dir, "reach-brindle.csv"), "--format", "json", "--draws", "0")
	var doc struct{ Discharge float64 }
	if code != 0 || json.Unmarshal([]byte(out2), &doc) != nil || !(doc.Discharge > 0) {
		t.Errorf("demo reach does not read back: %d %q", code, out2)
	}
	_ = reach.DefaultDraws
}

// TestSlopeAreaPlots checks that --plots writes both reach figures as PNGs
// of the default size, and that a bad reach writes no figure.
func TestSlopeAreaPlots(t *testing.T) {
	t.Parallel()
	dir, _ := demoOutput(t)
	plots := filepath.Join(t.TempDir(), "figs")
	_, errs, code := runCLI(t, "slopearea", filepath.Join(dir, demoReach), "--plots", plots, "--draws", "200", "-o", filepath.Join(t.TempDir(), "r.txt"))
	if code != 0 {
		t.Fatal(errs)
	}
	for _, name := range []string{"reach-brindle-profile.png", "reach-brindle-sections.png"} {
		f, err := os.Open(filepath.Join(plots, name))
		if err != nil {
			t.Fatal(err)
		}
		cfg, err := png.DecodeConfig(f)
		f.Close()
		if err != nil || cfg.Width != plotting.DefaultWidth || cfg.Height != plotting.DefaultHeight {
			t.Errorf("%s: %v %dx%d", name, err, cfg.Width, cfg.Height)
		}
	}
	bad := filepath.Join(dir, "bad.csv")
	os.WriteFile(bad, []byte("section,survey,distance,ws_left,ws_right\nA,reach-brindle-xs1.csv,0,51,51\n"), 0o644)
	none := filepath.Join(dir, "none")
	if _, _, code := runCLI(t, "slopearea", bad, "--plots", none); code == 0 {
		t.Error("a one-section reach without --slope was accepted")
	}
	if _, err := os.Stat(none); err == nil {
		t.Error("figures folder made for a failed run")
	}
}

// Flow lengths in the reach table are not used by the slope-area method,
// which takes the distance between sections (Dalrymple and Benson 1967,
// TWRI 3-A2): the report warns, naming the columns and that backwater
// reads them, instead of ignoring them silently.
func TestSlopeAreaWarnsFlowLengths(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	os.WriteFile(filepath.Join(dir, "reach.csv"), []byte("section,survey,distance,ws_left,ws_right,left_length,channel_length,right_length\n"+
		"A,a.csv,0,11.2,,90,100,110\nB,b.csv,100,11,,,,\n"), 0o644)
	os.WriteFile(filepath.Join(dir, "a.csv"), []byte("station,elevation,n\n0,12.2,0.04\n10,10.2,0.04\n20,12.2,\n"), 0o644)
	os.WriteFile(filepath.Join(dir, "b.csv"), []byte("station,elevation,n\n0,12,0.04\n10,10,0.04\n20,12,\n"), 0o644)
	out, errs, code := runCLI(t, "slopearea", filepath.Join(dir, "reach.csv"))
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if want := "the flow lengths in left_length, channel_length, right_length (section A) are read by backwater only, not here: " +
		"the slope-area method takes the distance between sections"; !strings.Contains(out, want) {
		t.Errorf("report lacks %q:\n%s", want, out)
	}
}

// A reach table without unit headers, its surveys in ft and no --units:
// the surveys' headers decide (US units), as a single survey's do for
// rate, instead of "the header says ft (us units) but si units were
// asked for" when nothing was asked for.
func TestSlopeAreaUnitsFromSurveys(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	os.WriteFile(filepath.Join(dir, "reach.csv"), []byte("section,survey,distance,ws_left,ws_right\nA,a.csv,0,11.2,\nB,b.csv,300,11,\n"), 0o644)
	os.WriteFile(filepath.Join(dir, "a.csv"), []byte("station (ft),elevation (ft),n\n0,12.2,0.04\n10,10.2,0.04\n20,12.2,\n"), 0o644)
	os.WriteFile(filepath.Join(dir, "b.csv"), []byte("station (ft),elevation (ft),n\n0,12,0.04\n10,10,0.04\n20,12,\n"), 0o644)
	out, errs, code := runCLI(t, "slopearea", filepath.Join(dir, "reach.csv"), "--draws", "0")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !strings.Contains(out, "US units (lengths ft, discharge ft3/s)") {
		t.Errorf("report not in US units:\n%s", out)
	}
	if _, errs, code := runCLI(t, "slopearea", filepath.Join(dir, "reach.csv"), "--units", "si"); code != 1 || !strings.Contains(errs, "si units were asked for") {
		t.Errorf("--units si with surveys in ft: exit %d: %s", code, errs)
	}
}

// --mark-sd given while every section of the demo reach has a quality is
// not used: the report says so (and the console warns); the default and
// --mark-sd 0 (no spread, which overrides the qualities) give no such
// warning.
func TestSlopeAreaMarkSDUnused(t *testing.T) {
	t.Parallel()
	const unused = "the standard deviation of a mark given (0.05 m) is not used"
	for _, tc := range []struct {
		flags  []string
		warned bool
	}{
		{nil, false},
		{[]string{"--mark-sd", "0.05"}, true},
		{[]string{"--mark-sd", "0"}, false},
	} {
		t.Run(strings.Join(tc.flags, " "), func(t *testing.T) {
			t.Parallel()
			out, errs, code := runCLI(t, append([]string{"slopearea", "demodata/reach-brindle.csv", "--draws", "200"}, tc.flags...)...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			if got := strings.Contains(out, "  - "+unused); got != tc.warned {
				t.Errorf("report warns %v, want %v:\n%s", got, tc.warned, out)
			}
		})
	}
}

// --mark-sd is bounded by the unit system of the reach (1 m, 3 ft): more is
// a usage error naming the flag; --mark-sd 0 says that no mark is varied,
// rated or not.
func TestSlopeAreaMarkSDBound(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	for name, unit := range map[string]string{"si": "", "us": " (ft)"} {
		os.WriteFile(filepath.Join(dir, name+".csv"), []byte("section,survey,distance,ws_left,ws_right\n"+
			"A,a"+name+".csv,0,11.2,\nB,b"+name+".csv,300,11,\n"), 0o644)
		os.WriteFile(filepath.Join(dir, "a"+name+".csv"), []byte("station"+unit+",elevation"+unit+",n\n0,12.2,0.04\n10,10.2,0.04\n20,12.2,\n"), 0o644)
		os.WriteFile(filepath.Join(dir, "b"+name+".csv"), []byte("station"+unit+",elevation"+unit+",n\n0,12,0.04\n10,10,0.04\n20,12,\n"), 0o644)
	}
	for _, tc := range []struct {
		reach, markSD string
		code          int
		want          string
	}{
		{"si.csv", "1", 0, "standard deviation 1 m per mark"},
		{"si.csv", "5", 2, "--mark-sd: standard deviation of a mark too large: 5 m is more than 1 m"},
		{"si.csv", "1e9", 2, "--mark-sd: standard deviation of a mark too large"},
		{"us.csv", "3", 0, "standard deviation 3 ft per mark"},
		{"us.csv", "3.5", 2, "3.5 ft is more than 3 ft"},
		{"si.csv", "0", 0, "marks          not varied: every mark held at its elevation, its quality rating set aside"},
	} {
		t.Run(tc.reach+" "+tc.markSD, func(t *testing.T) {
			t.Parallel()
			out, errs, code := runCLI(t, "slopearea", filepath.Join(dir, tc.reach), "--draws", "200", "--mark-sd", tc.markSD)
			if code != tc.code || !strings.Contains(out+errs, tc.want) {
				t.Errorf("exit %d, want %d with %q:\n%s%s", code, tc.code, tc.want, out, errs)
			}
		})
	}
}

// How a coordinate survey's stations were made is a fact of the inputs,
// not a warning: slopearea and backwater give it once per section in the
// report's inputs (text, JSON, workbook), and neither the report's
// warnings nor the console repeat it.
func TestSurveyProjectionIsInputNotWarning(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	coords := func(z float64) string {
		var b strings.Builder
		b.WriteString("easting,northing,elevation,n,mark\n")
		for i, dz := range []float64{3, 1.5, 0, 0, 0, 1.5, 3} {
			mark := ""
			switch i {
			case 0:
				mark = "left pin"
			case 6:
				mark = "right pin"
			}
			n := "0.035"
			if i == 6 {
				n = ""
			}
			fmt.Fprintf(&b, "%.3f,%.3f,%.3f,%s,%s\n", 7000+3*float64(i), 9000-0.01*float64(i%2), z+dz, n, mark)
		}
		return b.String()
	}
	files := map[string]string{
		"a.csv": coords(100), "b.csv": coords(99.6), "c.csv": coords(99.2),
		"reach.csv": "section,survey,distance,ws_left,ws_right\nA,a.csv,0,101.5,\nB,b.csv,200,101.1,\nC,c.csv,400,100.7,\n",
	}
	for name, text := range files {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	const projected = "stations were projected from eastings and northings"
	table := filepath.Join(dir, "reach.csv")
	for _, tc := range []struct {
		name string
		args []string
	}{
		{"slopearea text", []string{"slopearea", table, "--draws", "0"}},
		{"slopearea json", []string{"slopearea", table, "--draws", "0", "--format", "json"}},
		{"backwater text", []string{"backwater", table, "--discharges", "10,20", "--boundary", "normal:0.002"}},
		{"backwater json", []string{"backwater", table, "--discharges", "10,20", "--boundary", "normal:0.002", "--format", "json"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			out, errs, code := runCLI(t, tc.args...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			if n := strings.Count(out, projected); n != 3 {
				t.Errorf("the report states the projection %d times, want once per section (3):\n%s", n, out)
			}
			if strings.Contains(errs, projected) {
				t.Errorf("console repeats the projection: %s", errs)
			}
			if strings.HasSuffix(tc.name, "json") {
				var doc struct {
					Warnings []string `json:"warnings"`
				}
				if err := json.Unmarshal([]byte(out), &doc); err != nil {
					t.Fatal(err)
				}
				for _, w := range doc.Warnings {
					if strings.Contains(w, projected) {
						t.Errorf("warning %q", w)
					}
				}
				return
			}
			if _, warnings, ok := strings.Cut(out, "\nWarnings\n"); ok && strings.Contains(warnings, projected) {
				t.Errorf("the projection is among the warnings:\n%s", out)
			}
			for _, id := range []string{"A", "B", "C"} {
				if !strings.Contains(out, "survey of "+id+": "+projected) && !strings.Contains(out, "  survey "+id+"      "+projected) {
					t.Errorf("no line on the survey of %s:\n%s", id, out)
				}
			}
		})
	}
	// The console after a file is written keeps quiet about it too.
	_, errs, code := runCLI(t, "slopearea", table, "--draws", "0", "-o", filepath.Join(t.TempDir(), "r.xlsx"))
	if code != 0 || strings.Contains(errs, projected) {
		t.Errorf("exit %d, console %q", code, errs)
	}
}

// The same for one coordinate survey rated, fitted or compared: the
// survey reader gives how the stations were made as a note of its own
// (not a warning a caller must pick out by its words), and the reports
// give it with their inputs.
func TestSingleSurveyProjectionIsInputNote(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	var b strings.Builder
	b.WriteString("easting,northing,elevation,n,mark\n")
	for i, dz := range []float64{3, 1.5, 0, 0, 0, 1.5, 3} {
		mark := map[int]string{0: "left pin", 6: "right pin"}[i]
		fmt.Fprintf(&b, "%.3f,%.3f,%.3f,0.035,%s\n", 7000+3*float64(i), 9000-0.01*float64(i%2), 100+dz, mark)
	}
	gaugings := "time,stage,discharge\n2024-01-01,100.6,0.9\n2024-02-01,101.0,3.1\n2024-03-01,101.5,7.4\n2024-04-01,102.0,13.5\n2024-05-01,102.4,19.8\n2024-06-01,100.8,1.8\n"
	for name, text := range map[string]string{"c.csv": b.String(), "d.csv": b.String(), "g.csv": gaugings} {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	c, d := filepath.Join(dir, "c.csv"), filepath.Join(dir, "d.csv")
	const projected = "stations were projected from eastings and northings"
	for _, tc := range []struct {
		name  string
		args  []string
		notes int // how many times the report gives the note
	}{
		{"rate text", []string{"rate", c, "--slope", "0.001", "--format", "text"}, 1},
		{"rate json", []string{"rate", c, "--slope", "0.001", "--format", "json"}, 1},
		{"rate to a file", []string{"rate", c, "--slope", "0.001", "-o", filepath.Join(t.TempDir(), "r.csv")}, 0},
		{"compare text", []string{"compare", c, d, "--format", "text"}, 2},
		{"compare json", []string{"compare", c, d, "--format", "json"}, 2},
		{"fit text", []string{"fit", filepath.Join(dir, "g.csv"), "--section", c, "--slope", "0.001", "--datum", "0", "--format", "text"}, 1},
		{"fit json", []string{"fit", filepath.Join(dir, "g.csv"), "--section", c, "--slope", "0.001", "--datum", "0", "--format", "json"}, 1},
	} {
		t.Run(tc.name, func(t *testing.T) {
			out, errs, code := runCLI(t, tc.args...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			if n := strings.Count(out, projected); n != tc.notes {
				t.Errorf("the report gives the note %d times, want %d:\n%s", n, tc.notes, out)
			}
			for _, line := range strings.Split(out+errs, "\n") {
				if strings.Contains(line, projected) && strings.Contains(line, "warning") {
					t.Errorf("the note among the warnings: %s", line)
				}
			}
			if tc.notes == 0 && !strings.Contains(errs, "input: "+c+":1: "+projected) {
				t.Errorf("the console does not give the note as an input's:\n%s", errs)
			}
			if strings.HasSuffix(tc.name, "json") {
				var doc struct {
					Warnings []string `json:"warnings"`
					Notes    []string `json:"input_notes"`
				}
				if err := json.Unmarshal([]byte(out), &doc); err != nil {
					t.Fatal(err)
				}
				if len(doc.Notes) != tc.notes {
					t.Errorf("input_notes %q, want %d", doc.Notes, tc.notes)
				}
				for _, w := range doc.Warnings {
					if strings.Contains(w, projected) {
						t.Errorf("warning %q", w)
					}
				}
			} else if tc.notes > 0 && !strings.Contains(out, "Input: "+c+":1: "+projected) {
				t.Errorf("no input line:\n%s", out)
			}
		})
	}
}

// --n-errors by-region reaches the Monte Carlo draws: the report says the
// errors were shared and the band is wider than the default's; a word
// other than independent or by-region is a usage error.
func TestSlopeAreaNErrors(t *testing.T) {
	t.Parallel()
	band := func(args ...string) (string, float64) {
		out, errs, code := runCLI(t, append([]string{"slopearea", "demodata/reach-brindle.csv", "--format", "json", "--draws", "1000"}, args...)...)
		if code != 0 {
			t.Fatalf("exit %d: %s", code, errs)
		}
		var doc struct {
			Uncertainty struct {
				P05, P95 float64
				NErrors  string `json:"n_errors"`
			} `json:"uncertainty"`
		}
		if err := json.Unmarshal([]byte(out), &doc); err != nil {
			t.Fatal(err)
		}
		return doc.Uncertainty.NErrors, doc.Uncertainty.P95 - doc.Uncertainty.P05
	}
	wi, indep := band()
	ws, shared := band("--n-errors", "by-region")
	if wi != "" || ws != "by-region" || !(shared > indep) {
		t.Errorf("n_errors %q, %q; bands %g (independent) and %g (by region)", wi, ws, indep, shared)
	}
	if _, errs, code := runCLI(t, "slopearea", "demodata/reach-brindle.csv", "--n-errors", "shared"); code != 2 || !strings.Contains(errs, "--n-errors") {
		t.Errorf("--n-errors shared: exit %d, %s", code, errs)
	}
}

// With --no-extend a water surface above an end of a section is an error
// placed on the value compared: the one mark used (the side asked for, or
// the only mark), or, for the mean of two, both marks as written and
// their mean, not the left cell alone beside a stage that is not in it.
func TestSlopeAreaNoExtendNamesMarks(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name, left, right string
		args              []string
		want              string
	}{
		{"mean", "12.5", "12.3", nil, `reach.csv:2:4: ws_left "12.5" and ws_right "12.3", the water surface their mean 12.4: stage 12.4 `},
		{"left", "12.5", "12.3", []string{"--side", "left"}, `reach.csv:2:4: ws_left "12.5": stage 12.5 `},
		{"right", "12.5", "12.3", []string{"--side", "right"}, `reach.csv:2:5: ws_right "12.3": stage 12.3 `},
		{"right only", "", "12.3", nil, `reach.csv:2:5: ws_right "12.3": stage 12.3 `},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			dir := t.TempDir()
			os.WriteFile(filepath.Join(dir, "reach.csv"), []byte("section,survey,distance,ws_left,ws_right\n"+
				"A,a.csv,0,"+tc.left+","+tc.right+"\nB,b.csv,100,11.6,11.6\n"), 0o644)
			os.WriteFile(filepath.Join(dir, "a.csv"), []byte("station,elevation,n\n0,12.2,0.04\n10,10.2,0.04\n20,12.2,\n"), 0o644)
			os.WriteFile(filepath.Join(dir, "b.csv"), []byte("station,elevation,n\n0,12,0.04\n10,10,0.04\n20,12,\n"), 0o644)
			_, errs, code := runCLI(t, append([]string{"slopearea", filepath.Join(dir, "reach.csv"), "--no-extend", "--draws", "0"}, tc.args...)...)
			if code == 0 {
				t.Fatalf("exit 0, want an error")
			}
			if got := strings.ReplaceAll(errs, filepath.Join(dir, "reach.csv"), "reach.csv"); !strings.Contains(got, tc.want) {
				t.Errorf("error %q, want %q", got, tc.want)
			}
		})
	}
}
