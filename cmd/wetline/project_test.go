package main

import (
	"bytes"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"wetline/survey"
)

const larchCoords = "demodata/larch-xs-coords.csv"

// project writes the projected survey a crew checks; the golden file is
// the reviewed output for the demo's total-station survey.
func TestProjectGolden(t *testing.T) {
	t.Parallel()
	out, errs, code := runCLI(t, "project", larchCoords)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	golden(t, "project-larch.csv", out)
	if !strings.Contains(errs, "larch-xs-coords.csv:15:1: easting (m)") || !strings.Contains(errs, "0.62 m off the section line") {
		t.Errorf("no warning of the point off the line: %s", errs)
	}
}

// Rating the coordinate survey directly and rating the projected survey
// (stations written to 0.1 mm) give the same table, to 1e-4 relative.
func TestProjectSameRating(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	projected := filepath.Join(dir, "larch-stations.csv")
	if _, errs, code := runCLI(t, "project", larchCoords, "-o", projected); code != 0 {
		t.Fatalf("project: exit %d: %s", code, errs)
	}
	rate := func(path string) string {
		out, errs, code := runCLI(t, "rate", path, "--slope", "0.003", "--step", "0.25")
		if code != 0 {
			t.Fatalf("rate %s: exit %d: %s", path, code, errs)
		}
		return out
	}
	direct, back := rate(larchCoords), rate(projected)
	dl, bl := strings.Split(direct, "\n"), strings.Split(back, "\n")
	if len(dl) != len(bl) || dl[0] != bl[0] {
		t.Fatalf("tables differ in shape:\n%s\n%s", direct, back)
	}
	for i := 1; i < len(dl); i++ {
		dc, bc := strings.Split(dl[i], ","), strings.Split(bl[i], ",")
		for j := range dc {
			a, errA := strconv.ParseFloat(dc[j], 64)
			b, errB := strconv.ParseFloat(bc[j], 64)
			if (errA == nil) != (errB == nil) || (errA == nil && math.Abs(a-b) > 1e-4*math.Max(math.Abs(a), 1e-3)) {
				t.Errorf("row %d column %d: %s from coordinates, %s from the projection", i, j, dc[j], bc[j])
			}
		}
	}
	if !strings.Contains(direct, "92.61,0,0,0,0") {
		t.Errorf("rating does not start at the thalweg 92.61:\n%s", direct)
	}
}

// The JSON keeps its documented keys in order, and a plan figure is drawn.
func TestProjectJSONAndPlan(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "p.json")
	_, errs, code := runCLI(t, "project", larchCoords, "-o", path, "--plots", dir, "--flow-azimuth", "55")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	want := "section units line left origin azimuth offset_tolerance max_offset reversed points site warnings caution input_notes"
	if got := strings.Join(jsonKeys(t, data), " "); got != want {
		t.Errorf("keys %s\nwant %s", got, want)
	}
	var rep struct {
		Left     string
		Reversed bool
		Points   []struct{ Station, Northing float64 }
	}
	if err := json.Unmarshal(data, &rep); err != nil {
		t.Fatal(err)
	}
	if rep.Left != "the flow direction given" || !rep.Reversed || len(rep.Points) != 15 || rep.Points[0].Northing != 5398207.655 {
		t.Errorf("left %q reversed %v points %d first %+v", rep.Left, rep.Reversed, len(rep.Points), rep.Points[0])
	}
	if bytes.Contains(data, []byte("e+06")) {
		t.Error("a northing written with an exponent")
	}
	png, err := os.ReadFile(filepath.Join(dir, "larch-xs-coords-plan.png"))
	if err != nil || !bytes.HasPrefix(png, []byte("\x89PNG")) {
		t.Errorf("plan figure: %v", err)
	}
}

// How a survey was projected is an input note, not a warning (README,
// File formats): "input: ..." on the console once, whether the CSV goes
// to standard output or to a file, and input_notes in JSON, never among
// the warnings.
func TestProjectNoteIsInput(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	const note = "stations were projected from eastings and northings"
	for _, tc := range []struct {
		name string
		args []string
	}{
		{"stdout", nil},
		{"file", []string{"-o", filepath.Join(dir, "p.csv")}},
	} {
		_, errs, code := runCLI(t, append([]string{"project", larchCoords}, tc.args...)...)
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", tc.name, code, errs)
		}
		var inputs int
		var warned bool
		for _, l := range strings.Split(errs, "\n") {
			if strings.HasPrefix(l, "input: "+larchCoords+":") && strings.Contains(l, note) {
				inputs++
			}
			warned = warned || strings.HasPrefix(l, "warning: ") && strings.Contains(l, note)
		}
		if inputs != 1 {
			t.Errorf("%s: %d input lines with the projection, want one:\n%s", tc.name, inputs, errs)
		}
		if warned {
			t.Errorf("%s: the projection is warned of:\n%s", tc.name, errs)
		}
	}
	out, errs, code := runCLI(t, "project", larchCoords, "--format", "json")
	if code != 0 {
		t.Fatalf("json: exit %d: %s", code, errs)
	}
	var rep struct {
		Warnings   []string `json:"warnings"`
		InputNotes []string `json:"input_notes"`
	}
	if err := json.Unmarshal([]byte(out), &rep); err != nil {
		t.Fatal(err)
	}
	if len(rep.InputNotes) != 1 || !strings.Contains(rep.InputNotes[0], note) {
		t.Errorf("input_notes %q", rep.InputNotes)
	}
	for _, w := range rep.Warnings {
		if strings.Contains(w, "stations were projected") {
			t.Errorf("the projection among the warnings: %q", w)
		}
	}
}

// Mistakes are refused with one line naming the file or the flag, and
// nothing is written.
func TestProjectRefusals(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	out := filepath.Join(dir, "out.csv")
	for _, c := range []struct {
		args []string
		code int
		want string
	}{
		{[]string{"project", demoSurveyPath, "-o", out}, 1, "tallow-xs1.csv: the survey gives stations, not eastings and northings"},
		{[]string{"project", larchCoords, "--line", "1,2,3", "-o", out}, 2, "--line: want four numbers E1,N1,E2,N2, got 3"},
		{[]string{"project", larchCoords, "--line", "1,2,1,2", "-o", out}, 2, "the two ends are the same point"},
		{[]string{"project", larchCoords, "--flow-azimuth", "145", "-o", out}, 1, "the flow direction runs along the section line"},
		{[]string{"project", larchCoords, "--flow-azimuth", "400", "-o", out}, 2, "--flow-azimuth 400: want degrees"},
		{[]string{"project", larchCoords, "--offset-tolerance", "-1", "-o", out}, 2, "--offset-tolerance -1: want a positive number"},
		{[]string{"project", larchCoords, "--units", "us", "-o", out}, 1, "easting (m)"},
		{[]string{"project", larchCoords, "-o", filepath.Join(dir, "out.txt")}, 2, ".txt"},
	} {
		_, errs, code := runCLI(t, c.args...)
		if code != c.code || !strings.Contains(errs, c.want) || strings.Count(strings.TrimSpace(errs), "\n") > 1 {
			t.Errorf("%v: exit %d, want %d with %q:\n%s", c.args[2:], code, c.code, c.want, errs)
		}
		if _, err := os.Stat(out); err == nil {
			t.Fatalf("%v: wrote %s", c.args[2:], out)
		}
	}
}

// Every command reading a survey reads a coordinate survey, with the
// coordinate flags.
func TestCoordinateSurveyEverywhere(t *testing.T) {
	t.Parallel()
	for _, args := range [][]string{
		{"solve", larchCoords, "--slope", "0.003", "--discharge", "20"},
		{"rate", larchCoords, "--slope", "0.003", "--stages", "94", "--flow-azimuth", "55", "--offset-tolerance", "1"},
		{"rate", larchCoords, "--slope", "0.003", "--stages", "94", "--line", "612431.204,5398207.655,612451.164,5398179.149"},
	} {
		out, errs, code := runCLI(t, args...)
		if code != 0 || out == "" {
			t.Errorf("%v: exit %d: %s", args, code, errs)
		}
		if strings.Contains(strings.Join(args, " "), "--offset-tolerance 1") && strings.Contains(errs, "more than the tolerance") {
			t.Errorf("%v: warned within the tolerance: %s", args, errs)
		}
	}
}

// The demo's coordinate survey is projected, rated from the coordinates,
// and its workbook summary names the site and the survey date.
func TestDemoCoordinateSurvey(t *testing.T) {
	t.Parallel()
	dir, stdout := demoOutput(t)
	for _, name := range []string{"larch-xs-coords.csv", "larch-xs-stations.csv", "larch-xs-coords-plan.png", "larch-xs-results.xlsx"} {
		if !strings.Contains(stdout, name) {
			t.Errorf("the demo does not list %s", name)
		}
	}
	sv, err := survey.ReadSection(filepath.Join(dir, "larch-xs-stations.csv"), "", survey.SectionOptions{})
	if err != nil || len(sv.Section.Points) != 15 || sv.Projection.Line != "" || sv.Site.Surveyed != "2026-10-03" {
		t.Errorf("projected survey reads back as %d points, projection %q, site %+v: %v", len(sv.Section.Points), sv.Projection.Line, sv.Site, err)
	}
	f, err := excelize.OpenFile(filepath.Join(dir, "larch-xs-results.xlsx"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := f.GetRows("summary")
	if err != nil {
		t.Fatal(err)
	}
	var text strings.Builder
	for _, r := range rows {
		text.WriteString(strings.Join(r, " ") + "\n")
	}
	for _, want := range []string{"Larch Brook at the footbridge (invented)", "surveyed 2026-10-03", "projected from eastings and northings"} {
		if !strings.Contains(text.String(), want) {
			t.Errorf("workbook summary lacks %q:\n%s", want, text.String())
		}
	}
}

// TestRateCSVToStdoutNotesProjection: rating a coordinate survey with the
// CSV table on standard output states the projection on the console as an
// input line (README, Outputs), as it does with -o.
func TestRateCSVToStdoutNotesProjection(t *testing.T) {
	t.Parallel()
	_, errs, code := runCLI(t, "rate", larchCoords, "--slope", "0.002")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !strings.Contains(errs, "input: "+larchCoords+":") || !strings.Contains(errs, "stations were projected from eastings and northings") {
		t.Errorf("no input line with the projection:\n%s", errs)
	}
}
