package main

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// eNotation matches a figure written with an exponent (1.12e-15, 7e+02).
var eNotation = regexp.MustCompile(`\b[0-9]+(\.[0-9]+)?[eE][-+]?[0-9]+\b`)

// No message of a fit writes a figure with an exponent: the text report,
// its warnings, the summary after a file is written and the errors, for
// least-squares and Bayesian fits, among them fits whose figures are
// tiny (a replacing control of exponent 10.3 has a coefficient near
// 4·10⁻⁹, its prior from the section too; an offset fitted at its
// breakpoint has a standard error near 10⁻¹¹). Demo gaugings (demodata)
// and invented sparse ones: a riffle at 0.46 to 0.71 m and three
// gaugings at 2.31 to 2.96 m that barely rise.
func TestFitMessagesPlainFigures(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	sparse := filepath.Join(dir, "flat-top.csv")
	if err := os.WriteFile(sparse, []byte("time,gauge_height,discharge,quality\n"+
		"2020-01-01T10:00,0.46,0.121,good\n2020-02-01T10:00,0.52,0.27,good\n2020-03-01T10:00,0.58,0.496,fair\n"+
		"2020-04-01T10:00,0.71,1.11,good\n2020-05-01T10:00,2.31,37,fair\n2020-06-01T10:00,2.74,38.5,fair\n"+
		"2020-07-01T10:00,2.96,38.1,poor\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	section := []string{"--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100"}
	quick := []string{"--chains", "2", "--draws", "1000"}
	cat := func(lists ...[]string) []string {
		var out []string
		for _, l := range lists {
			out = append(out, l...)
		}
		return out
	}
	for i, args := range [][]string{
		cat([]string{fitDemoGaugings, "--method", "lsq"}, section),
		cat([]string{fitDemoGaugings}, section, quick),
		cat([]string{fitDemoGaugings, "--breaks", "1,2", "--kinds", "section,channel,channel"}, section, quick),
		cat([]string{fitDemoGaugings, "--method", "lsq", "--breaks", "1,2", "--kinds", "section,channel,channel"}, section),
		{sparse, "--method", "lsq", "--breaks", "0.75", "--kinds", "section,channel"},
		cat([]string{sparse, "--breaks", "1", "--kinds", "section,channel"}, quick),
		{fitDemoGaugings, "--method", "lsq", "--breaks", "2.6"},
		cat([]string{fitDemoGaugings, "--breaks", "0.5,2.8"}, quick),
	} {
		for _, out := range []string{"", filepath.Join(dir, "fit.json")} {
			a := append([]string{"fit"}, args...)
			if out != "" {
				a = append(a, "-o", out)
			}
			stdout, stderr, _ := runCLI(t, a...)
			text := stdout + stderr
			if out != "" {
				text = stderr + stdout // the summary and warnings, not the JSON
			}
			if text == "" {
				t.Errorf("run %d %v: nothing said", i, a)
			}
			for _, line := range strings.Split(text, "\n") {
				if m := eNotation.FindString(line); m != "" {
					t.Errorf("run %d %v: %q in %q", i, a, m, line)
				}
			}
		}
	}
}
