package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	"wetline/plotting"
	"wetline/rating"
	"wetline/survey"
	"wetline/survey/results"
)

// bwReach writes a reach table of the demo's Tallow Creek sections (rows
// "id,survey,distance" plus extra columns) into a new folder beside copies
// of the surveys, and returns its path.
func bwReach(t *testing.T, header string, rows ...string) string {
	t.Helper()
	dir := t.TempDir()
	for _, name := range demoGaugeReach {
		data, err := demoFiles.ReadFile("demodata/" + name)
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(dir, name), data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	path := filepath.Join(dir, "reach.csv")
	if err := os.WriteFile(path, []byte(header+"\n"+strings.Join(rows, "\n")+"\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// bwPlain is the three Tallow sections with distances only.
func bwPlain(t *testing.T) string {
	return bwReach(t, "section,survey,distance", "XS-2,tallow-xs2.csv,0", "XS-1,tallow-xs1.csv,140", "XS-3,tallow-xs3.csv,300")
}

// The text report of the demo reach is kept as a golden file.
func TestBackwaterTextGolden(t *testing.T) {
	t.Parallel()
	dir, _ := demoOutput(t)
	out, errs, code := runCLI(t, "backwater", filepath.Join(dir, demoBWReach), "--discharges", "5,20,45",
		"--boundary", "normal:0.0012", "--at", "XS-1", "--verify", "38")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	out = strings.ReplaceAll(out, dir+string(filepath.Separator), "DEMO/")
	golden(t, "backwater-tallow.golden", out)
}

// The CSV is a rating table like rate's, kept as a golden file, and plot
// draws it.
func TestBackwaterCSVGolden(t *testing.T) {
	t.Parallel()
	out, errs, code := runCLI(t, "backwater", bwPlain(t), "--from", "10", "--to", "40", "--step", "10", "--boundary", "critical",
		"--format", "csv")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	golden(t, "backwater-tallow.csv", out)
	if !strings.Contains(errs, "caution:") {
		t.Errorf("no caution on the console: %q", errs)
	}
	dir := t.TempDir()
	table := filepath.Join(dir, "xs2-backwater.csv")
	os.WriteFile(table, []byte(out), 0o644)
	if _, errs, code := runCLI(t, "plot", table, "-o", dir); code != 0 {
		t.Errorf("plot of the backwater table: exit %d: %s", code, errs)
	}
	tab, err := survey.ReadRatingCSV(table, "", survey.UnitChoice{})
	if err != nil || len(tab.Rows) != 4 || tab.Rows[3].Discharge != 40 {
		t.Errorf("table reads back as %d rows: %v", len(tab.Rows), err)
	}
}

// Each kind of boundary runs; a rating boundary reads the table rate
// writes for the last section, and gives there the table's stages.
func TestBackwaterBoundaries(t *testing.T) {
	t.Parallel()
	path := bwPlain(t)
	dir := filepath.Dir(path)
	ratingFile := filepath.Join(dir, "xs3-rating.csv")
	if _, errs, code := runCLI(t, "rate", filepath.Join(dir, "tallow-xs3.csv"), "--slope", "0.0012", "--stages", "100.5,101,101.5,102,102.5,103", "-o", ratingFile); code != 0 {
		t.Fatal(errs)
	}
	rt, err := survey.ReadRatingCSV(ratingFile, "", survey.UnitChoice{})
	if err != nil {
		t.Fatal(err)
	}
	q := rt.Rows[3].Discharge // at 102.0 m
	for _, tc := range []struct {
		boundary, kind string
	}{
		{"normal:0.0012", "normal"}, {"critical", "critical"}, {"stage:102.0", "stage"}, {"rating:" + ratingFile, "rating"},
	} {
		t.Run(tc.kind, func(t *testing.T) {
			out, errs, code := runCLI(t, "backwater", path, "--discharges", "10,"+strconv.FormatFloat(q, 'g', -1, 64),
				"--boundary", tc.boundary, "--format", "json")
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			var doc struct {
				Boundary struct{ Kind string }
				Profiles []struct {
					Sections []struct {
						WaterSurface float64 `json:"water_surface"`
					}
				}
			}
			if err := json.Unmarshal([]byte(out), &doc); err != nil {
				t.Fatal(err)
			}
			if doc.Boundary.Kind != tc.kind || len(doc.Profiles) != 2 {
				t.Fatalf("boundary %q, %d profiles", doc.Boundary.Kind, len(doc.Profiles))
			}
			last := doc.Profiles[1].Sections[2].WaterSurface
			switch tc.kind {
			case "stage", "rating":
				// At the table's discharge the rating's stage is its row's,
				// 102.0 m (rate wrote it to 4 decimals).
				if d := last - 102.0; d > 1e-3 || d < -1e-3 {
					t.Errorf("boundary stage %.4f, want 102.0", last)
				}
			}
		})
	}
}

// The JSON keys come in the documented order.
func TestBackwaterJSONKeys(t *testing.T) {
	t.Parallel()
	out, errs, code := runCLI(t, "backwater", bwPlain(t), "--discharges", "12", "--boundary", "critical", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	keys := func(data []byte) []string { return jsonKeys(t, data) }
	var doc struct {
		Profiles []struct{ Sections []json.RawMessage }
		Rating   json.RawMessage
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		what string
		data []byte
		want []string
	}{
		{"report", []byte(out), []string{"boundary", "profiles", "rating", "warnings", "caution"}},
		{"section", doc.Profiles[0].Sections[0], []string{"id", "distance", "water_surface", "energy_grade", "velocity_head", "froude", "critical", "spread"}},
		{"rating", doc.Rating, []string{"section", "rows"}},
	} {
		got := keys(c.data)
		if len(got) < len(c.want) || !slices.Equal(got[:len(c.want)], c.want) {
			t.Errorf("%s keys %q, want them to start %q", c.what, got, c.want)
		}
	}
}

// A verification asked of a run writing only the rating table (CSV, to
// standard output or a file) is not dropped: standard error gives its
// mean and largest departure, as the JSON report has them, and the caution
// with the step-backwater note, as the text report states it.
func TestBackwaterVerificationOnConsole(t *testing.T) {
	t.Parallel()
	dir, _ := demoOutput(t)
	reach := filepath.Join(dir, demoBWReach)
	args := []string{"backwater", reach, "--discharges", "5,20,45", "--boundary", "normal:0.0012", "--at", "XS-1", "--verify", "38"}
	js, errs, code := runCLI(t, append(args, "--format", "json")...)
	if code != 0 {
		t.Fatalf("json: exit %d: %s", code, errs)
	}
	var doc struct {
		Verification struct {
			MeanDeparture float64 `json:"mean_departure"`
			MaxDeparture  float64 `json:"max_departure"`
			Marks         []struct {
				ID string `json:"id"`
			} `json:"marks"`
		} `json:"verification"`
	}
	if err := json.Unmarshal([]byte(js), &doc); err != nil {
		t.Fatal(err)
	}
	v := doc.Verification
	want := fmt.Sprintf("verification: the profile of 38 m3/s against the high-water marks of %d sections: mean departure %+.3f m, largest %+.3f m at ",
		len(v.Marks), v.MeanDeparture, v.MaxDeparture)
	out := filepath.Join(t.TempDir(), "xs1-backwater.csv")
	for _, run := range []struct {
		name string
		args []string
	}{
		{"csv to standard output", append(slices.Clone(args), "--format", "csv")},
		{"-o csv", append(slices.Clone(args), "-o", out)},
	} {
		_, errs, code := runCLI(t, run.args...)
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", run.name, code, errs)
		}
		lines := strings.Split(strings.TrimSuffix(errs, "\n"), "\n")
		if got := verificationLines(lines); len(got) != 1 || !strings.HasPrefix(got[0], want) {
			t.Errorf("%s: verification lines %q on standard error, want one starting %q:\n%s", run.name, got, want, errs)
		}
		if len(lines) < 2 || lines[len(lines)-2] != "caution: "+results.BackwaterNote || lines[len(lines)-1] != "caution: "+rating.Caution {
			t.Errorf("%s: standard error does not end with the step-backwater note and the caution:\n%s", run.name, errs)
		}
	}
	// Without --verify there is no verification line.
	_, errs, _ = runCLI(t, append(args[:len(args)-2:len(args)-2], "--format", "csv")...)
	if len(verificationLines(strings.Split(errs, "\n"))) != 0 || !strings.Contains(errs, "caution: "+results.BackwaterNote) {
		t.Errorf("without --verify: %s", errs)
	}
}

// verificationLines are the console's lines summing up a verification
// (not its warnings, "warning: verification: ...").
func verificationLines(lines []string) []string {
	var out []string
	for _, l := range lines {
		if l = strings.TrimSpace(l); strings.HasPrefix(l, "verification: ") {
			out = append(out, l)
		}
	}
	return out
}

// The README's table of JSON keys gives the backwater report's keys, and
// those of its rating, exactly in the order the command writes them.
func TestReadmeBackwaterJSONKeys(t *testing.T) {
	t.Parallel()
	out, errs, code := runCLI(t, "backwater", bwPlain(t), "--discharges", "12", "--boundary", "critical", "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	keys := func(data []byte) []string { return jsonKeys(t, data) }
	var doc struct{ Rating json.RawMessage }
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	var row string
	for _, line := range strings.Split(readme(t), "\n") {
		if strings.HasPrefix(line, "| backwater |") {
			row = line
		}
	}
	cells := strings.Split(row, "|")
	if len(cells) < 4 {
		t.Fatalf("README has no backwater row in its table of outputs: %q", row)
	}
	// The JSON cell: `report keys`; in `rating`: `rating keys` (...).
	quoted := regexp.MustCompile("`([^`]*)`").FindAllStringSubmatch(cells[3], -1)
	list := func(i int) []string {
		if i >= len(quoted) {
			return nil
		}
		var ks []string
		for _, k := range strings.Split(quoted[i][1], ",") {
			ks = append(ks, strings.TrimSuffix(strings.TrimSpace(k), "[]"))
		}
		return ks
	}
	for _, c := range []struct {
		what   string
		data   []byte
		readme []string
	}{
		{"report", []byte(out), list(0)},
		{"rating", doc.Rating, list(2)},
	} {
		if got := keys(c.data); !slices.Equal(got, c.readme) {
			t.Errorf("%s keys written %q, README says %q", c.what, got, c.readme)
		}
	}
}

// Mistakes in the command line exit 2, bad data exit 1, each with one
// clear message, and a failed run writes nothing: neither the report nor
// a figure.
func TestBackwaterRefusals(t *testing.T) {
	t.Parallel()
	plain := bwPlain(t)
	const head = "section,survey,distance"
	for _, tc := range []struct {
		name  string
		reach string // "" for the plain reach
		args  []string
		code  int
		want  string
	}{
		{"no boundary", "", []string{"--discharges", "5"}, 2, "--boundary is required"},
		{"bad boundary", "", []string{"--discharges", "5", "--boundary", "tide:3"}, 2, "unknown boundary"},
		{"boundary without number", "", []string{"--discharges", "5", "--boundary", "normal:steep"}, 2, "not a finite number"},
		// The slope is named as given, in --boundary normal:S (there is no --slope here).
		{"implausible slope", "", []string{"--discharges", "5", "--boundary", "normal:0.9"}, 2, "backwater: --boundary normal:0.9 is not a plausible friction slope"},
		{"no discharges", "", []string{"--boundary", "critical"}, 2, "give the discharges"},
		{"list and ladder", "", []string{"--discharges", "5", "--from", "1", "--to", "9", "--step", "1", "--boundary", "critical"}, 2, "not both"},
		{"ladder without step", "", []string{"--from", "1", "--to", "9", "--boundary", "critical"}, 2, "go together"},
		{"negative discharge", "", []string{"--discharges", "5,-2", "--boundary", "critical"}, 2, "not a positive discharge"},
		{"twice", "", []string{"--discharges", "5,5", "--boundary", "critical"}, 2, "given twice"},
		{"too many", "", []string{"--from", "0.001", "--to", "100", "--step", "0.001", "--boundary", "critical"}, 2, "at most"},
		{"unknown section", "", []string{"--discharges", "5", "--boundary", "critical", "--at", "XS-9"}, 2, "XS-2, XS-1, XS-3"},
		{"expansion", "", []string{"--discharges", "5", "--boundary", "critical", "--expansion", "1.5"}, 2, "--expansion"},
		{"xlsx to stdout", "", []string{"--discharges", "5", "--boundary", "critical", "--format", "xlsx"}, 2, "needs -o"},
		{"verify without marks", "", []string{"--discharges", "5", "--boundary", "critical", "--verify", "20"}, 1, "no section of the reach has a high-water mark"},
		{"missing rating file", "", []string{"--discharges", "5", "--boundary", "rating:nowhere.csv"}, 1, "nowhere.csv"},
		// A stage is held to ±1e5 as every stage flag is (survey.MaxElevation).
		{"implausible stage", "", []string{"--discharges", "5", "--boundary", "stage:1e9"}, 2, "--boundary stage:1e9 is beyond ±100000: not a plausible stage"},
		{"stage below the bed", "", []string{"--discharges", "5", "--boundary", "stage:99"}, 1, "not above its lowest ground"},
		{"bridge", head + ",structure\nXS-2,tallow-xs2.csv,0,no\nXS-1,tallow-xs1.csv,140,Bridge\nXS-3,tallow-xs3.csv,300,none",
			[]string{"--discharges", "5", "--boundary", "critical"}, 1, "reach.csv:3:4: structure \"Bridge\": the section is at a structure"},
		{"unknown structure word", head + ",structure\nXS-2,tallow-xs2.csv,0,\nXS-1,tallow-xs1.csv,140,footbridge deck\nXS-3,tallow-xs3.csv,300,",
			[]string{"--discharges", "5", "--boundary", "critical"}, 1, "reach.csv:3:4: structure \"footbridge deck\": structure must be one of bridge, culvert, weir, dam, yes, true, 1"},
		{"bad flow length", head + ",channel_length\nXS-2,tallow-xs2.csv,0,-140\nXS-1,tallow-xs1.csv,140,\nXS-3,tallow-xs3.csv,300,",
			[]string{"--discharges", "5", "--boundary", "critical"}, 1, "reach.csv:2:4: channel_length \"-140\""},
		{"distance order", head + "\nXS-2,tallow-xs2.csv,0\nXS-1,tallow-xs1.csv,0\nXS-3,tallow-xs3.csv,300",
			[]string{"--discharges", "5", "--boundary", "critical"}, 1, "reach.csv:3:3: distance \"0\""},
		{"one section", head + "\nXS-2,tallow-xs2.csv,0", []string{"--discharges", "5", "--boundary", "critical"}, 1, "two or more sections"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			path := plain
			if tc.reach != "" {
				lines := strings.Split(tc.reach, "\n")
				path = bwReach(t, lines[0], lines[1:]...)
			}
			dir := t.TempDir()
			out, plots := filepath.Join(dir, "out.txt"), filepath.Join(dir, "figs")
			args := append([]string{"backwater", path, "-o", out, "--plots", plots}, tc.args...)
			if tc.name == "xlsx to stdout" {
				args = append([]string{"backwater", path}, tc.args...)
			}
			checkRefused(t, args, tc.code, tc.want, out, plots)
		})
	}
}

// A discharge beyond the boundary rating is refused, naming the file.
func TestBackwaterRatingRange(t *testing.T) {
	t.Parallel()
	path := bwPlain(t)
	table := filepath.Join(filepath.Dir(path), "short.csv")
	os.WriteFile(table, []byte("stage,discharge\n100.5,1\n101,6\n101.5,15\n"), 0o644)
	_, errs, code := runCLI(t, "backwater", path, "--discharges", "5,40", "--boundary", "rating:"+table)
	if code != 1 || !strings.Contains(errs, "short.csv") || !strings.Contains(errs, "outside the range of the boundary rating") {
		t.Errorf("exit %d: %s", code, errs)
	}
	os.WriteFile(table, []byte("stage,discharge\n100.5,1\n100.4,6\n"), 0o644)
	_, errs, code = runCLI(t, "backwater", path, "--discharges", "5", "--boundary", "rating:"+table)
	if code != 1 || !strings.Contains(errs, "short.csv:3:1") {
		t.Errorf("exit %d: %s", code, errs)
	}
}

// --plots writes the profile and rating figures as PNGs of the default
// size, and the workbook holds the report's sheets and figures.
func TestBackwaterPlotsAndWorkbook(t *testing.T) {
	t.Parallel()
	dir, _ := demoOutput(t)
	out := t.TempDir()
	plots := filepath.Join(out, "figs")
	book := filepath.Join(out, "bw.xlsx")
	_, errs, code := runCLI(t, "backwater", filepath.Join(dir, demoBWReach), "--from", "5", "--to", "50", "--step", "5",
		"--boundary", "normal:0.0012", "--at", "XS-1", "--verify", "38", "--plots", plots, "-o", book, "--site", "Tallow Creek")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, name := range []string{"tallow-reach-profiles.png", "tallow-reach-rating.png"} {
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
	if !strings.Contains(errs, "wrote "+book) || !strings.Contains(errs, "10 profiles") {
		t.Errorf("summary %q", errs)
	}
	f := openBook(t, book)
	want := []string{"summary", "rating", "convergence", "profiles", "subsections", "verification", "plots"}
	if got := f.GetSheetList(); !slices.Equal(got, want) {
		t.Errorf("sheets %q, want %q", got, want)
	}
}

// The demo writes the backwater rating at the gauge and its figures; its
// rating table reads back as a rating.
func TestDemoWritesBackwater(t *testing.T) {
	t.Parallel()
	dir, out := demoOutput(t)
	for _, want := range []string{"tallow-backwater.txt", "tallow-backwater-rating.png", "from uniform flow at slope", "9 February marks"} {
		if !strings.Contains(out, want) {
			t.Errorf("demo output lacks %q", want)
		}
	}
	tab, err := survey.ReadRatingCSV(filepath.Join(dir, "tallow-xs1-backwater-rating.csv"), "", survey.UnitChoice{})
	if err != nil || len(tab.Rows) != 30 {
		t.Fatalf("%d rows: %v", len(tab.Rows), err)
	}
	for i := 1; i < len(tab.Rows); i++ {
		if !(tab.Rows[i].Stage > tab.Rows[i-1].Stage) {
			t.Errorf("row %d: stage %g after %g", i, tab.Rows[i].Stage, tab.Rows[i-1].Stage)
		}
	}
}

// TestDemoReachInSync keeps the demo's reach table naming the surveys the
// demo copies.
func TestDemoReachInSync(t *testing.T) {
	t.Parallel()
	data, err := demoFiles.ReadFile("demodata/" + demoBWReach)
	if err != nil {
		t.Fatal(err)
	}
	for _, name := range demoGaugeReach {
		if !bytes.Contains(data, []byte("tallow-reach/"+name)) {
			t.Errorf("%s does not name tallow-reach/%s", demoBWReach, name)
		}
	}
}

// The backwater rating at the gauge stands where a hydraulic rating is
// used: fit reads the table backwater writes, compares the gaugings the
// table covers and warns of the rows it does not reach.
func TestBackwaterRatingFeedsFit(t *testing.T) {
	t.Parallel()
	reachPath := bwPlain(t)
	table := filepath.Join(filepath.Dir(reachPath), "bw-rating.csv")
	if _, errs, code := runCLI(t, "backwater", reachPath, "--from", "2", "--to", "60", "--step", "2", "--at", "XS-1",
		"--boundary", "normal:0.0012", "--format", "csv", "-o", table); code != 0 {
		t.Fatalf("backwater: exit %d: %s", code, errs)
	}
	for _, method := range []string{"lsq", "bayes"} {
		out, errs, code := runCLI(t, "fit", fitDemoGaugings, "--hydraulic-rating", table, "--datum", "100", "--method", method, "--format", "json")
		if code != 0 {
			t.Fatalf("fit --method %s: exit %d: %s", method, code, errs)
		}
		if !strings.Contains(out, `"hydraulic_source"`) || !strings.Contains(out, "bw-rating.csv") ||
			!strings.Contains(out, "lie outside the hydraulic rating table") || strings.Contains(out, "0.79149999") {
			t.Errorf("fit --method %s on the backwater table:\n%.600s", method, out)
		}
	}
}

// A boundary rating is held to the reach's unit system as every other
// input is: the demo sections name no unit, so they are in si units, and
// a rating whose headers say feet beside them is refused, naming the
// rating's column; one in metres or naming no unit is read. With --units
// us the sections take feet, and a rating in metres is refused.
func TestBackwaterBoundaryUnits(t *testing.T) {
	t.Parallel()
	path := bwPlain(t)
	rows := "100.5,1\n101,6\n101.5,15\n102,40\n103,100\n"
	for _, c := range []struct {
		name, header string
		extra        []string
		code         int
		want         []string
	}{
		{"feet beside si", "stage (ft),discharge (cfs)", nil, 1, []string{"ft.csv:1:1", survey.ErrUnitsUnnamed.Error()}},
		{"metres", "stage (m),discharge (m3/s)", nil, 0, nil},
		{"no unit", "stage,discharge", nil, 0, nil},
		{"metres with --units us", "stage (m),discharge (m3/s)", []string{"--units", "us"}, 1, []string{"metres-with---units-us.csv:1:1", survey.ErrUnitsDisagree.Error()}},
	} {
		t.Run(c.name, func(t *testing.T) {
			name := strings.ReplaceAll(c.name, " ", "-")
			if c.name == "feet beside si" {
				name = "ft"
			}
			table := filepath.Join(filepath.Dir(path), name+".csv")
			if err := os.WriteFile(table, []byte(c.header+"\n"+rows), 0o644); err != nil {
				t.Fatal(err)
			}
			args := append([]string{"backwater", path, "--discharges", "5,20", "--boundary", "rating:" + table, "--at", "XS-1"}, c.extra...)
			_, errs, code := runCLI(t, args...)
			if code != c.code {
				t.Fatalf("exit %d, want %d: %s", code, c.code, errs)
			}
			for _, w := range c.want {
				if !strings.Contains(errs, w) {
					t.Errorf("error lacks %q:\n%s", w, errs)
				}
			}
		})
	}
}

// A boundary rating that begins dry, as rate's table does, is read
// log-linearly in (h − e), e the stage of its dry row, as every rating
// table is (Kennedy 1984, USGS TWRI 3-A10): 25 m3/s between (101.5, 15) and
// (102, 40) above e = 100.05 starts at
// e + 1.45·(25/15)^(1/b), b = ln(40/15)/ln(1.95/1.45), 101.741916 m (by
// hand), not at 101.7 m, the straight line between the rows. Without the
// dry row the table is read linearly.
func TestBackwaterBoundaryLogLinear(t *testing.T) {
	t.Parallel()
	path := bwPlain(t)
	const tol = 1e-6 // m
	b := math.Log(40.0/15) / math.Log(1.95/1.45)
	for _, c := range []struct {
		name, rows string
		want       float64
	}{
		{"dry foot", "100.05,0\n100.5,1\n101,6\n101.5,15\n102,40\n103,100\n", 100.05 + 1.45*math.Pow(25.0/15, 1/b)},
		{"no dry row", "100.5,1\n101,6\n101.5,15\n102,40\n103,100\n", 101.7},
	} {
		t.Run(c.name, func(t *testing.T) {
			table := filepath.Join(filepath.Dir(path), strings.ReplaceAll(c.name, " ", "-")+".csv")
			if err := os.WriteFile(table, []byte("stage,discharge\n"+c.rows), 0o644); err != nil {
				t.Fatal(err)
			}
			out, errs, code := runCLI(t, "backwater", path, "--discharges", "25", "--boundary", "rating:"+table, "--format", "json")
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			var rep struct {
				Profiles []struct {
					Start float64 `json:"start"`
				} `json:"profiles"`
			}
			if err := json.Unmarshal([]byte(out), &rep); err != nil || len(rep.Profiles) != 1 {
				t.Fatalf("%v: %.300s", err, out)
			}
			if got := rep.Profiles[0].Start; math.Abs(got-c.want) > tol {
				t.Errorf("start %.6f, want %.6f", got, c.want)
			}
		})
	}
}
