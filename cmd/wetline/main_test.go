package main

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
)

var update = flag.Bool("update", false, "rewrite golden files in testdata/")

// runCLI runs the program with args and returns stdout, stderr and the exit
// status main would use.
func runCLI(t testing.TB, args ...string) (string, string, int) {
	t.Helper()
	var out, errb bytes.Buffer
	err := run(context.Background(), newEnv(&out, &errb, commandTable()), args)
	code := exitStatus(err, &errb)
	return out.String(), errb.String(), code
}

// checkRefused runs a command line that must be refused: exit status
// code, want in what it says on standard error, nothing on standard
// output, none of outputs written, and (status 1, bad input) one line.
func checkRefused(t *testing.T, args []string, code int, want string, outputs ...string) {
	t.Helper()
	stdout, stderr, got := runCLI(t, args...)
	if got != code {
		t.Fatalf("exit %d, want %d: %s", got, code, stderr)
	}
	if !strings.Contains(stderr, want) {
		t.Errorf("stderr %q lacks %q", stderr, want)
	}
	if stdout != "" {
		t.Errorf("stdout %q", stdout)
	}
	for _, p := range outputs {
		if _, err := os.Stat(p); !errors.Is(err, os.ErrNotExist) {
			t.Errorf("%s written: %v", p, err)
		}
	}
	if n := strings.Count(strings.TrimSpace(stderr), "\n"); code == 1 && n > 0 {
		t.Errorf("want one line, got:\n%s", stderr)
	}
}

// golden compares got with testdata/name, rewriting it with -update.
func golden(t *testing.T, name, got string) {
	t.Helper()
	path := filepath.Join("testdata", name)
	if *update {
		if err := os.MkdirAll("testdata", 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, []byte(got), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test -update to create it)", err)
	}
	if got != string(want) {
		t.Errorf("output differs from %s (run go test -update after checking):\n got: %s\nwant: %s", path, got, want)
	}
}

const demoSurveyPath = "../../testdata/tallow-xs1.csv"

func TestRateGolden(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		name string
		args []string
	}{
		{"rate-default.golden", []string{"rate", demoSurveyPath, "--slope", "0.001"}},
		{"rate-stages.golden", []string{"rate", demoSurveyPath, "--slope", "0.001", "--stages", "100.3,101,102.5,103,105.5"}},
		{"rate-connected.golden", []string{"rate", demoSurveyPath, "--slope", "0.001", "--connected", "--from", "102", "--to", "104", "--step", "0.5"}},
		{"rate-json.golden", []string{"rate", demoSurveyPath, "--slope", "0.001", "--format", "json", "--stages", "100.3,102.5,103.2"}},
		{"rate-n-override.golden", []string{"rate", demoSurveyPath, "--slope", "0.001", "--n", "0.05,0.03,0.09", "--banks", "40,70", "--stages", "102,103,104"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			out, errs, code := runCLI(t, c.args...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			golden(t, c.name, out)
		})
	}
}

// TestDemoSurveyInSync keeps the testdata copy equal to the embedded demo.
func TestDemoSurveyInSync(t *testing.T) {
	t.Parallel()
	a, _ := os.ReadFile(demoSurveyPath)
	b, _ := demoFiles.ReadFile("demodata/" + demoSurvey)
	if !bytes.Equal(a, b) {
		t.Error("testdata/tallow-xs1.csv differs from cmd/wetline/demodata/tallow-xs1.csv")
	}
}

func TestRateJSONUndefinedIsNull(t *testing.T) {
	t.Parallel()
	out, _, code := runCLI(t, "rate", demoSurveyPath, "--slope", "0.001", "--format", "json", "--stages", "100.3")
	if code != 0 {
		t.Fatal(code)
	}
	var v struct {
		Units map[string]string
		Rows  []map[string]any
	}
	if err := json.Unmarshal([]byte(out), &v); err != nil {
		t.Fatal(err)
	}
	if v.Rows[0]["froude"] != nil || v.Rows[0]["hydraulic_radius"] != nil || v.Units["discharge"] != "m3/s" {
		t.Errorf("dry row should have null froude: %v, units %v", v.Rows[0], v.Units)
	}
}

func TestRateWritesFileWithSummary(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	outPath := filepath.Join(dir, "r.json")
	_, errs, code := runCLI(t, "rate", demoSurveyPath, "--slope", "0.001", "-o", outPath)
	if code != 0 {
		t.Fatal(errs)
	}
	if !strings.Contains(errs, "wrote "+outPath) || !strings.Contains(errs, "caution:") || !strings.Contains(errs, "m3/s") {
		t.Errorf("summary: %s", errs)
	}
	data, _ := os.ReadFile(outPath)
	if !json.Valid(data) {
		t.Error("-o r.json did not choose JSON")
	}
}

// TestBadInputs checks each bad input gives one clear line naming file, row
// and column, the right exit status, and no output file.
func TestBadInputs(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	write := func(name, body string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	cases := []struct {
		name string
		args []string
		code int
		want string
	}{
		{"decimal comma", []string{"rate", write("a.csv", "station,elevation,n\n0,1,0.03\n1,\"0,5\",\n2,1,\n"), "--slope", "0.001"}, 1, "a.csv:3:2: elevation \"0,5\": decimal comma"},
		{"overhang", []string{"rate", write("b.csv", "station,elevation,n\n0,1,0.03\n2,0,\n1,1,\n"), "--slope", "0.001"}, 1, "b.csv:4:1"},
		{"n zero", []string{"rate", write("c.csv", "station,elevation,n\n0,1,0\n2,0,\n3,1,\n"), "--slope", "0.001"}, 1, "c.csv:2:3"},
		{"no n at all", []string{"rate", write("d.csv", "station,elevation\n0,1\n2,0\n3,1\n"), "--slope", "0.001"}, 1, "no n column"},
		{"missing file", []string{"rate", filepath.Join(dir, "nope.csv"), "--slope", "0.001"}, 1, "nope.csv"},
		{"no slope", []string{"rate", demoSurveyPath}, 2, "--slope"},
		{"bad units", []string{"rate", demoSurveyPath, "--slope", "0.001", "--units", "furlongs"}, 2, "furlongs"},
		{"bad flag", []string{"rate", demoSurveyPath, "--slope", "0.001", "--frobnicate"}, 2, "frobnicate"},
		{"bad n flag", []string{"rate", demoSurveyPath, "--slope", "0.001", "--n", "0.03,x,0.05"}, 2, "--n"},
		{"banks outside", []string{"rate", demoSurveyPath, "--slope", "0.001", "--banks", "-5,50"}, 2, "bank stations -5,50 for ../../testdata/tallow-xs1.csv (stations 0 to 120)"},
		{"no extend", []string{"rate", demoSurveyPath, "--slope", "0.001", "--no-extend", "--stages", "105"}, 1, "above"},
		{"three n without banks", []string{"rate", write("e.csv", "station,elevation,n\n0,1,0.03\n2,0,\n3,1,\n"), "--slope", "0.001", "--n", "0.03,0.03,0.03"}, 1, "needs bank stations"},
		{"unknown command", []string{"rattle"}, 2, "unknown command"},
		{"sheet on csv", []string{"rate", demoSurveyPath, "--slope", "0.001", "--sheet", "XS-2"}, 1, "sheet"},
		// Stages are written to 4 decimals (results.LengthDecimals): finer
		// ones would be written as repeats that plot and fit refuse.
		{"step finer than written", []string{"rate", demoSurveyPath, "--slope", "0.001", "--from", "101", "--to", "101.001", "--step", "0.00001"}, 2, "--step 1e-05 is finer than the table's stages are written (4 decimals)"},
		{"stages closer than written", []string{"rate", demoSurveyPath, "--slope", "0.001", "--stages", "101,101.00001"}, 2, "--stages: stages closer than the table's precision: 101 and 101.00001 would both be written 101"},
		{"range shorter than written", []string{"rate", demoSurveyPath, "--slope", "0.001", "--from", "101", "--to", "101.00004"}, 2, "the range is shorter than the table's precision"},
		{"step written alike from a half", []string{"rate", demoSurveyPath, "--slope", "0.001", "--from", "101.00005", "--to", "101.001", "--step", "0.0001"}, 2, "--step: stages closer"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			out := filepath.Join(dir, "out-"+strings.ReplaceAll(c.name, " ", "-")+".csv")
			args := append(append([]string(nil), c.args...), "-o", out)
			if c.args[0] != "rate" {
				args = c.args
			}
			_, errs, code := runCLI(t, args...)
			if code != c.code {
				t.Errorf("exit %d, want %d (%s)", code, c.code, errs)
			}
			if !strings.Contains(errs, c.want) {
				t.Errorf("stderr %q does not contain %q", errs, c.want)
			}
			if _, err := os.Stat(out); err == nil {
				t.Error("an output file was written")
			}
		})
	}
}

func TestRefusesToOverwriteInput(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	in := filepath.Join(dir, "xs.csv")
	data, _ := os.ReadFile(demoSurveyPath)
	os.WriteFile(in, data, 0o644)
	link := filepath.Join(dir, "link.csv")
	if err := os.Symlink(in, link); err != nil {
		t.Skip("no symlinks here")
	}
	_, errs, code := runCLI(t, "rate", in, "--slope", "0.001", "-o", link)
	if code != 1 || !strings.Contains(errs, "refusing to write over an input") {
		t.Errorf("exit %d: %s", code, errs)
	}
	after, _ := os.ReadFile(in)
	if !bytes.Equal(after, data) {
		t.Error("input changed")
	}
}

func TestHelpAndDemo(t *testing.T) {
	t.Parallel()
	out, _, code := runCLI(t, "rate", "--help")
	if code != 0 || !strings.Contains(out, "--slope") {
		t.Errorf("help: exit %d, %q", code, out)
	}
	dir, out := demoOutput(t)
	if !strings.Contains(out, "caution") {
		t.Errorf("demo output lacks the caution: %s", out)
	}
	for _, f := range []string{"tallow-xs1.csv", "tallow-xs1-rating.csv"} {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Error(err)
		}
	}
}

// ttyEnv is a test environment whose standard error acts as a terminal
// when tty is set, showing progress at once.
func ttyEnv(stdout, stderr io.Writer, tty bool) *env {
	e := newEnv(stdout, stderr, commandTable())
	e.stderrTTY, e.progressDelay, e.progressEvery = tty, 0, 0
	return e
}

// The demo is written once per test binary, into a folder removed when
// the tests end; tests read it and write their own outputs elsewhere.
var demoOnce struct {
	sync.Once
	dir, stdout string
	err         error
}

// demoOutput returns the folder the demo was written into and what it
// printed.
func demoOutput(t *testing.T) (dir, stdout string) {
	t.Helper()
	demoOnce.Do(func() {
		demoOnce.dir, demoOnce.err = os.MkdirTemp("", "wetline-demo-test-")
		if demoOnce.err != nil {
			return
		}
		var errs string
		var code int
		demoOnce.stdout, errs, code = runCLI(t, "demo", "-o", demoOnce.dir)
		if code != 0 {
			demoOnce.err = fmt.Errorf("demo: exit %d: %s", code, errs)
		}
	})
	if demoOnce.err != nil {
		t.Fatal(demoOnce.err)
	}
	return demoOnce.dir, demoOnce.stdout
}

// TestListFlagsBounded: every number of a list flag is held to the same
// plausibility bound as a single number (±10⁵ for stages and elevations,
// ±10⁸ for stations and discharges): one beyond it is a usage error
// naming the flag and the value, before any input is read.
func TestListFlagsBounded(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		name string
		args []string
		want string
	}{
		{"rate stages", []string{"rate", demoSurveyPath, "--slope", "0.001", "--stages", "101,1e9"}, "--stages 1e+09"},
		{"rate banks", []string{"rate", demoSurveyPath, "--slope", "0.001", "--banks", "10,3e8"}, "--banks 3e+08"},
		{"compare stages", []string{"compare", demoSurveyPath, "demodata/tallow-xs1-2025.csv", "--stages", "-2e5"}, "--stages -200000"},
		{"shifts zero flow", []string{"shifts", recGaugings, "--rating", recRatingA, "--zero-flow", "7e5"}, "--zero-flow 700000"},
		{"record highest gauging", []string{"record", recStages, "--rating", recRatingA, "--highest-gauging", "1,2e6"}, "--highest-gauging 2e+06"},
		{"fit breaks", []string{"fit", fitDemoGaugings, "--breaks", "1,5e5"}, "--breaks 500000"},
		{"backwater discharges", []string{"backwater", "demodata/tallow-reach.csv", "--discharges", "5,2e9", "--boundary", "critical"}, "--discharges 2e+09"},
	} {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			_, errs, code := runCLI(t, c.args...)
			if code != 2 || !strings.Contains(errs, c.want) || !strings.Contains(errs, "not a plausible value") {
				t.Errorf("exit %d, want 2 and %q: %s", code, c.want, errs)
			}
		})
	}
}

// The demo writes only into a new or empty folder, or one an earlier demo
// marked as its own: a folder holding a user's file of one of the demo's
// names is refused (exit 2) and left as it was.
func TestDemoFolder(t *testing.T) {
	t.Parallel()
	dir, _ := demoOutput(t)
	if fi, err := os.Stat(filepath.Join(dir, demoMark)); err != nil || !fi.Mode().IsRegular() {
		t.Fatalf("the demo folder is not marked: %v", err)
	}
	if err := demoFolder(dir); err != nil {
		t.Errorf("an earlier demo's folder: %v", err)
	}
	mine := filepath.Join(t.TempDir(), "mine")
	if err := os.Mkdir(mine, 0o755); err != nil {
		t.Fatal(err)
	}
	survey := filepath.Join(mine, demoSurvey)
	if err := os.WriteFile(survey, []byte("my own survey\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	_, errs, code := runCLI(t, "demo", "-o", mine)
	// Exit 1, as any output that cannot be used (README, Exit status).
	if code != 1 || !strings.Contains(errs, "holds files an earlier demo did not write") {
		t.Errorf("demo into a user's folder: exit %d, %q", code, errs)
	}
	ents, _ := os.ReadDir(mine)
	if data, _ := os.ReadFile(survey); string(data) != "my own survey\n" || len(ents) != 1 {
		t.Errorf("the user's folder changed: %d entries, survey %q", len(ents), data)
	}
	// An earlier demo's folder with a link in it is refused: the demo would
	// write through the link, over the file it points to.
	marked := filepath.Join(t.TempDir(), "marked")
	if err := os.Mkdir(marked, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(marked, demoMark), nil, 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink(survey, filepath.Join(marked, demoSurvey)); err != nil {
		t.Skip("no symbolic links here:", err)
	}
	if err := demoFolder(marked); !errors.Is(err, ErrDemoLink) || !strings.Contains(err.Error(), "holds a link") {
		t.Errorf("an earlier demo's folder with a link: %v", err)
	}
}
