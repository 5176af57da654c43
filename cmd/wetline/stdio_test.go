package main

import (
	"bytes"
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// runProgram runs the test binary as the wetline program with stdin.
func runProgram(t *testing.T, stdin []byte, args ...string) (stdout, stderr string, code int) {
	t.Helper()
	cmd := exec.Command(os.Args[0], args...)
	cmd.Env = append(os.Environ(), helperEnv+"=1")
	cmd.Stdin = bytes.NewReader(stdin)
	var out, errb bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errb
	err := cmd.Run()
	code = 0
	if ee, ok := err.(*exec.ExitError); ok {
		code = ee.ExitCode()
	} else if err != nil {
		t.Fatal(err)
	}
	return out.String(), errb.String(), code
}

// A survey read from standard input (-) rates as the same file does, and
// -o - writes to standard output without making a file named -.
func TestStandardInputAndOutput(t *testing.T) {
	t.Parallel()
	data, err := os.ReadFile(demoSurveyPath)
	if err != nil {
		t.Fatal(err)
	}
	want, _, code := runCLI(t, "rate", demoSurveyPath, "--slope", "0.001")
	if code != 0 {
		t.Fatal(code)
	}
	got, errs, code := runProgram(t, data, "rate", "-", "--slope", "0.001", "-o", "-")
	if code != 0 || got != want {
		t.Errorf("rate - -o -: exit %d %s\ngot  %.200q\nwant %.200q", code, errs, got, want)
	}
	if _, err := os.Stat("-"); err == nil {
		t.Error("a file named - was made")
	}
	// Workbook bytes on standard input are read as a workbook.
	dir := t.TempDir()
	if _, errs, code := runCLI(t, "template", "-o", dir+"/f.xlsx", "--survey", demoSurveyPath); code != 0 {
		t.Fatal(errs)
	}
	book, _ := os.ReadFile(dir + "/f.xlsx")
	got, errs, code = runProgram(t, book, "rate", "-", "--sheet", "tallow-xs1", "--slope", "0.001")
	if code != 0 || !strings.HasPrefix(got, "stage,depth") {
		t.Errorf("workbook on standard input: exit %d %s", code, errs)
	}
}

// TestStdinNamedOnce: standard input named twice, in any command reading
// several inputs, is a command-line mistake (exit 2) naming both places,
// refused before anything is read; named once it is read.
func TestStdinNamedOnce(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		args   []string
		places string
	}{
		{[]string{"compare", "-", "-"}, "as argument 1 and as argument 2"},
		{[]string{"rate", "-", "-", "--slope", "0.001", "--long"}, "as argument 1 and as argument 2"},
		{[]string{"rate", "-", "--calibrate", "-", "--slope", "0.001"}, "as argument 1 and as --calibrate -"},
		{[]string{"fit", "-", "--section", "-", "--slope", "0.001"}, "as argument 1 and as --section -"},
		{[]string{"fit", "g.csv", "--section", "-", "--control-section", "-", "--slope", "0.001"}, "as --section - and as --control-section -"},
		{[]string{"shifts", "-", "--rating", "-"}, "as argument 1 and as --rating -"},
		{[]string{"record", "s.csv", "--rating", "-", "--rating", "-@2020-01-01"}, "as --rating - and as --rating -@2020-01-01"},
		{[]string{"record", "-", "--rating", "r.csv", "--gaugings", "-"}, "as argument 1 and as --gaugings -"},
		{[]string{"plot", "-", "--section", "-"}, "as argument 1 and as --section -"},
		{[]string{"backwater", "-", "--boundary", "rating:-"}, "as argument 1 and as --boundary rating:-"},
	} {
		_, errs, code := runCLI(t, tc.args...)
		if code != 2 || !strings.Contains(errs, "standard input (-) is named twice, "+tc.places) {
			t.Errorf("%v: exit %d:\n%s", tc.args, code, errs)
		}
	}
	data, err := os.ReadFile(demoSurveyPath)
	if err != nil {
		t.Fatal(err)
	}
	if _, errs, code := runProgram(t, data, "rate", "-", "--slope", "0.001"); code != 0 {
		t.Errorf("one - refused: exit %d:\n%s", code, errs)
	}
}

// A survey read from standard input redirected from a file is an input:
// -o naming that file (or a hard link to it) is refused, the file kept.
func TestStdinFileNotOverwritten(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	data, err := os.ReadFile(demoSurveyPath)
	if err != nil {
		t.Fatal(err)
	}
	xs := filepath.Join(dir, "xs.csv")
	mustWrite(t, xs, string(data))
	hard := filepath.Join(dir, "hard.csv")
	if err := os.Link(xs, hard); err != nil {
		t.Skip(err)
	}
	for _, out := range []string{xs, hard} {
		in, err := os.Open(xs)
		if err != nil {
			t.Fatal(err)
		}
		cmd := exec.Command(os.Args[0], "rate", "-", "--slope", "0.001", "-o", out)
		cmd.Env = append(os.Environ(), helperEnv+"=1")
		cmd.Stdin = in
		var errb bytes.Buffer
		cmd.Stderr = &errb
		err = cmd.Run()
		in.Close()
		var ee *exec.ExitError
		if !errors.As(err, &ee) || ee.ExitCode() != 1 || !strings.Contains(errb.String(), "standard input is read from") {
			t.Errorf("rate - -o %s < xs.csv: %v, want exit 1 refusing:\n%s", filepath.Base(out), err, errb.String())
		}
	}
	if b, _ := os.ReadFile(xs); !bytes.Equal(b, data) {
		t.Errorf("the survey read from standard input was overwritten: %.60q", b)
	}
}
