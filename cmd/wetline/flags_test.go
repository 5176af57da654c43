package main

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestOutputsNameOnePath: two outputs of one run naming the same path (as
// typed, after cleaning, or through a link), or a path inside an output
// written as a file, are a usage error naming both flags, found before any
// input is read or anything written; every command with more than one
// output is held to it.
func TestOutputsNameOnePath(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	in := filepath.Join(dir, "missing-input.csv") // never read: the flags are refused first
	p := func(name string) string { return filepath.Join(dir, name) }
	target := p("target.csv")
	if err := os.WriteFile(target, []byte("kept\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	link := p("link.csv")
	haveLink := os.Symlink(target, link) == nil
	cases := []struct {
		name string
		args []string
		want string
		link bool
	}{
		{"shifts proposed and plots", []string{"shifts", in, "--rating", in, "--proposed", p("x.csv"), "--plots", p("x.csv")}, "--proposed " + p("x.csv") + " and --plots " + p("x.csv") + " name the same path", false},
		{"shifts proposed and output cleaned", []string{"shifts", in, "--rating", in, "--proposed", p("x.csv"), "-o", dir + "/./x.csv"}, "--proposed " + p("x.csv") + " and -o " + dir + "/./x.csv name the same path", false},
		{"shifts output and plots", []string{"shifts", in, "--rating", in, "-o", p("s.txt"), "--plots", p("s.txt")}, "-o " + p("s.txt") + " and --plots " + p("s.txt"), false},
		{"shifts through a link", []string{"shifts", in, "--rating", in, "--proposed", link, "-o", target}, "--proposed " + link + " and -o " + target + " name the same path", true},
		{"shifts plots inside a file", []string{"shifts", in, "--rating", in, "-o", p("s.txt"), "--plots", p("s.txt/figs")}, "--plots " + p("s.txt/figs") + " lies inside -o " + p("s.txt") + ", which is written as a file", false},
		{"rate", []string{"rate", in, "--slope", "0.001", "-o", p("r.csv"), "--plots", p("r.csv")}, "rate: -o " + p("r.csv") + " and --plots " + p("r.csv"), false},
		{"slopearea", []string{"slopearea", in, "-o", p("a.txt"), "--plots", p("a.txt")}, "slopearea: --plots " + p("a.txt") + " and -o " + p("a.txt") + " name the same path", false},
		{"backwater", []string{"backwater", in, "--discharges", "1", "--boundary", "critical", "-o", p("b.txt"), "--plots", p("b.txt")}, "backwater: -o " + p("b.txt") + " and --plots " + p("b.txt") + " name the same path", false},
		{"fit", []string{"fit", in, "-o", p("f.txt"), "--plots", p("f.txt")}, "fit: -o " + p("f.txt") + " and --plots " + p("f.txt") + " name the same path", false},
		{"record", []string{"record", in, "--rating", in, "-o", p("c.txt"), "--plots", p("c.txt")}, "record: -o " + p("c.txt") + " and --plots " + p("c.txt") + " name the same path", false},
		{"compare", []string{"compare", in, in, "-o", p("d.txt"), "--plots", p("d.txt")}, "compare: -o " + p("d.txt") + " and --plots " + p("d.txt") + " name the same path", false},
		{"project", []string{"project", in, "-o", p("e.csv"), "--plots", p("e.csv")}, "project: -o " + p("e.csv") + " and --plots " + p("e.csv") + " name the same path", false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if c.link && !haveLink {
				t.Skip("no symbolic links here")
			}
			_, errs, code := runCLI(t, c.args...)
			if code != 2 || !strings.Contains(errs, c.want) {
				t.Errorf("exit %d, want 2 with %q:\n%s", code, c.want, errs)
			}
		})
	}
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, e := range ents {
		names = append(names, e.Name())
	}
	want := "target.csv"
	if haveLink {
		want = "link.csv target.csv"
	}
	if got := strings.Join(names, " "); got != want {
		t.Errorf("the folder holds %s, want %s", got, want)
	}
	if data, _ := os.ReadFile(target); string(data) != "kept\n" {
		t.Errorf("the linked file changed: %q", data)
	}
}

// TestOutputsApart: outputs at different paths pass the check, a report
// inside the figures' folder included; the run goes on to read its input.
func TestOutputsApart(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	in := filepath.Join(dir, "missing-input.csv")
	for _, args := range [][]string{
		{"shifts", in, "--rating", in, "--proposed", filepath.Join(dir, "p.csv"), "-o", filepath.Join(dir, "c.txt"), "--plots", filepath.Join(dir, "figs")},
		{"fit", in, "-o", filepath.Join(dir, "figs", "fit.txt"), "--plots", filepath.Join(dir, "figs")},
		{"rate", in, "--slope", "0.001", "-o", "-", "--plots", filepath.Join(dir, "figs")},
	} {
		_, errs, code := runCLI(t, args...)
		if code != 1 || !strings.Contains(errs, "missing-input.csv") {
			t.Errorf("%s: exit %d, want 1 for the missing input:\n%s", args[0], code, errs)
		}
	}
}

// TestHelpZeroDefaults: help states a zero default that is a value, as
// "(default 0)", and none for a zero standing for "not given" (a required
// slope, a datum whose presence changes the report) or for a default the
// usage says in words.
func TestHelpZeroDefaults(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		cmd, flag string
		shown     bool
	}{
		{"backwater", "contraction", true},
		{"record", "datum", true},
		{"shifts", "datum", true},
		{"rate", "slope", false},
		{"rate", "datum", false},
		{"rate", "offset-tolerance", false}, // "(default 0.5 m, 1.5 ft)" in words
		{"solve", "slope", false},
		{"slopearea", "slope", false},
		{"fit", "slope", false},
		{"fit", "datum", false},
		{"fit", "segments", false},
		{"fit", "controls", false}, // "(default 1, ...)" in words
		{"fit", "utc-offset", false},
		{"plot", "datum", false},
		{"compare", "step", false},
	} {
		out, errs, code := runCLI(t, c.cmd, "--help")
		if code != 0 {
			t.Fatalf("%s --help: exit %d: %s", c.cmd, code, errs)
		}
		line := ""
		for _, l := range strings.Split(out, "\n") {
			if strings.HasPrefix(strings.TrimSpace(l), "--"+c.flag+" ") {
				line = l
			}
		}
		if line == "" {
			t.Errorf("%s --help has no --%s", c.cmd, c.flag)
			continue
		}
		if got := strings.HasSuffix(line, " (default 0)"); got != c.shown {
			t.Errorf("%s --%s: default 0 shown %v, want %v:\n%s", c.cmd, c.flag, got, c.shown, line)
		}
		if strings.Count(line, "(default") > 1 {
			t.Errorf("%s --%s states its default twice:\n%s", c.cmd, c.flag, line)
		}
	}
}

// TestOutputIsAFigure: -o naming one of the figures --plots writes (a
// report with --format and a .png name) is refused, naming both flags,
// before anything is written. The figures' names come from the section
// read and the figures drawn, so this is found after computing: exit 1.
func TestOutputIsAFigure(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	figs := filepath.Join(dir, "figs")
	report := filepath.Join(figs, "tallow-xs1-rating.png")
	_, errs, code := runCLI(t, "rate", demoSurveyPath, "--slope", "0.001", "--format", "csv", "-o", report, "--plots", figs)
	want := "-o " + report + " is also a figure written into --plots " + figs
	if code != 1 || !strings.Contains(errs, want) || !strings.Contains(errs, "written twice in one run") {
		t.Errorf("exit %d, want 1 with %q:\n%s", code, want, errs)
	}
	if _, err := os.Stat(figs); !os.IsNotExist(err) {
		t.Errorf("the figures' folder was made: %v", err)
	}
	// Another name in that folder is no figure's: the run goes through.
	_, errs, code = runCLI(t, "rate", demoSurveyPath, "--slope", "0.001", "--format", "csv", "-o", filepath.Join(figs, "table.png"), "--plots", figs)
	if code != 0 {
		t.Errorf("a report beside the figures: exit %d: %s", code, errs)
	}
}

// TestHelpDurations: help writes a duration default without its zero
// trailing units (2h, not 2h0m0s); a duration's own non-zero units stay.
func TestHelpDurations(t *testing.T) {
	t.Parallel()
	for _, c := range [][2]string{{"2h0m0s", "2h"}, {"12h0m0s", "12h"}, {"1h30m0s", "1h30m"}, {"10m0s", "10m"},
		{"1h0m5s", "1h0m5s"}, {"45s", "45s"}, {"0s", "0s"}, {"1.5s", "1.5s"}} {
		if got := helpDuration(c[0]); got != c[1] {
			t.Errorf("helpDuration(%q) = %q, want %q", c[0], got, c[1])
		}
	}
	for cmd, want := range map[string]string{"record": "(default 2h)\n", "shifts": "(default 12h)\n"} {
		out, _, code := runCLI(t, cmd, "--help")
		if code != 0 || !strings.Contains(out, want) || strings.Contains(out, "0m0s") {
			t.Errorf("%s --help (exit %d) lacks %q:\n%s", cmd, code, want, out)
		}
	}
}

// Messages say what is wrong: a folder of no surveys, -o naming a folder,
// a slope that is not positive, a falling stage range, a reach survey that
// is a folder.
func TestPlainMessages(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	p := func(name string) string { return filepath.Join(dir, name) }
	for _, d := range []string{"empty", "out", "reach/xs2"} {
		if err := os.MkdirAll(p(d), 0o755); err != nil {
			t.Fatal(err)
		}
	}
	xs := p("reach/xs1.csv")
	if err := os.WriteFile(xs, []byte("station,elevation,n\n0,3,0.035\n4,0,0.035\n8,3\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	reach := p("reach/reach.csv")
	if err := os.WriteFile(reach, []byte("section,survey,distance,ws_left,ws_right\nXS-1,xs1.csv,0,2,2\nXS-2,xs2,100,1.9,1.9\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name string
		args []string
		code int
		want string
	}{
		{"folder without surveys", []string{"rate", p("empty"), "--slope", "0.001"}, 1, "no survey files (.csv, .xlsx) in the folder"},
		{"-o a folder", []string{"rate", xs, "--slope", "0.001", "-o", p("out")}, 2, "-o " + p("out") + " is a folder: name a file"},
		{"-o a folder, format given", []string{"rate", xs, "--slope", "0.001", "--format", "json", "-o", p("out")}, 2, "is a folder: name a file"},
		{"negative slope", []string{"rate", xs, "--slope", "-0.001"}, 2, "--slope -0.001: the friction slope must be positive"},
		{"falling range", []string{"rate", xs, "--slope", "0.001", "--from", "2", "--to", "1"}, 2, "from 2 to 1: the range must rise"},
		{"reach survey a folder", []string{"slopearea", reach}, 1, "xs2 is a folder: name the survey file in it"},
		{"a flag given twice", []string{"fit", xs, "--sheet", "a", "--sheet", "b"}, 2, "fit: --sheet is given twice: give it once"},
		{"a list flag given twice", []string{"rate", xs, "--slope", "0.001", "--stages", "1,2", "--stages", "3"}, 2, "--stages is given twice"},
		{"-o given twice", []string{"rate", xs, "--slope", "0.001", "-o", p("a.csv"), "--output", p("b.csv")}, 2, "-o (--output) is given twice"},
		{"compare a results workbook's summary", []string{"compare", p("r.xlsx"), p("r.xlsx"), "--sheet-a", "summary", "--sheet-b", "summary"}, 1, "r.xlsx['summary'] is a table that is neither a rating nor a survey"},
	} {
		if tc.args[0] == "compare" {
			if _, errs, code := runCLI(t, "rate", xs, "--slope", "0.001", "-o", p("r.xlsx")); code != 0 {
				t.Fatalf("rate: exit %d: %s", code, errs)
			}
		}
		_, errs, code := runCLI(t, tc.args...)
		if code != tc.code || !strings.Contains(errs, tc.want) || strings.Contains(errs, "step 1") {
			t.Errorf("%s: exit %d, %q; want exit %d and %q", tc.name, code, errs, tc.code, tc.want)
		}
	}
}

// An output flag given an empty path is a mistake on the command line
// (exit 2), not standard output nor the current folder.
func TestEmptyOutputPath(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"rate", demoSurveyPath, "--slope", "0.001", "-o", ""}, "rate: -o is given an empty path: name a file, or - for standard output"},
		{[]string{"rate", demoSurveyPath, "--slope", "0.001", "--plots", ""}, "rate: --plots is given an empty path: name a folder"},
		{[]string{"plot", "testdata/tallow-xs1-rating.csv", "-o", ""}, "plot: -o is given an empty path: name a folder"},
		{[]string{"shape", "rectangle:width=2", "-o", ""}, "shape: -o is given an empty path"},
		{[]string{"solve", "--shape", "rectangle:width=2", "--n", "0.015", "--discharge", "1", "--slope", "0.001", "-o", ""}, "solve: -o is given an empty path"},
	} {
		_, errs, code := runCLI(t, c.args...)
		if code != 2 || !strings.Contains(errs, c.want) {
			t.Errorf("%q: exit %d, want 2 and %q:\n%s", c.args, code, c.want, errs)
		}
	}
}

// TestOperandCount: a command given the wrong number of operands is a
// usage error saying what it wants and how many it got.
func TestOperandCount(t *testing.T) {
	t.Parallel()
	cases := []struct {
		args []string
		want string
	}{
		{[]string{"backwater", "a", "b"}, "backwater: want one REACH table, got 2 arguments"},
		{[]string{"slopearea"}, "slopearea: want one REACH table, got 0 arguments"},
		{[]string{"compare", "a"}, "compare: want two files A and B (two ratings, or two surveys of one section), got 1 arguments"},
		{[]string{"fit", "a", "b"}, "fit: want one GAUGINGS file, got 2 arguments"},
		{[]string{"shifts"}, "shifts: want one GAUGINGS file, got 0 arguments"},
		{[]string{"record", "a", "b", "c"}, "record: want one STAGES file (time and stage columns), got 3 arguments"},
		{[]string{"plot"}, "plot: want one TABLE file (a rating CSV written by 'wetline rate'), got 0 arguments"},
		{[]string{"project"}, "project: want one SURVEY file of eastings, northings and elevations, got 0 arguments"},
		{[]string{"shape"}, "shape: want one SPEC ("},
	}
	for _, tc := range cases {
		var out bytes.Buffer
		err := runArgs(t, newEnv(&out, &out, commandTable()), tc.args...)
		var ue usageError
		if !errors.As(err, &ue) || !strings.HasPrefix(err.Error(), tc.want) {
			t.Errorf("%q: err %v, want a usage error %q", tc.args, err, tc.want)
		}
	}
}

// TestOutputExtensionMessages: an -o whose extension a command does not
// write is refused naming the formats that command writes; a known
// format's extension is not called unknown, and --format is offered only
// by a command that has it, for an extension naming no format.
func TestOutputExtensionMessages(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	survey := filepath.Join(moduleRoot, "testdata", "tallow-xs1.csv")
	out := func(name string) string { return filepath.Join(dir, name) }
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"solve", survey, "--discharge", "10", "-o", out("s.xlsx")},
			"solve: -o " + out("s.xlsx") + ": solve writes text or json, not xlsx: name the file .txt or .json"},
		{[]string{"solve", survey, "--discharge", "10", "-o", out("s.dat")},
			"solve: -o " + out("s.dat") + `: cannot tell the format from the extension ".dat": name the file .txt or .json, or give --format`},
		{[]string{"shape", "rectangle:width=3", "-o", out("s.xlsx")},
			"shape: -o " + out("s.xlsx") + ": shape writes csv, not xlsx: name the file .csv"},
		{[]string{"shape", "rectangle:width=3", "-o", out("s.dat")},
			"shape: -o " + out("s.dat") + `: cannot tell the format from the extension ".dat": name the file .csv`},
		{[]string{"slopearea", out("reach.csv"), "-o", out("s.csv")},
			"slopearea: -o " + out("s.csv") + ": slopearea writes text, json or xlsx, not csv: name the file .txt, .json or .xlsx"},
		{[]string{"project", out("coords.csv"), "-o", out("p.txt")},
			"project: -o " + out("p.txt") + ": project writes csv or json, not text: name the file .csv or .json"},
	} {
		_, errs, code := runCLI(t, tc.args...)
		first, _, _ := strings.Cut(errs, "\n")
		if code != 2 || first != "wetline: "+tc.want {
			t.Errorf("%s: exit %d, %q; want 2, %q", strings.Join(tc.args, " "), code, first, "wetline: "+tc.want)
		}
	}
	if entries, _ := os.ReadDir(dir); len(entries) != 0 {
		t.Errorf("%d files written", len(entries))
	}
}
