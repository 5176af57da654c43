package main

import (
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
)

// A WETLINE_MAX_* variable that is not a whole number above zero stops
// every command before it reads or writes a file: exit status 2 and one
// line naming the variable and its value. Help and version still run.
// (Not parallel: it sets the environment.)
func TestLimitVariableRefused(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "out")
	t.Setenv("WETLINE_MAX_ROWS", "abc")
	const want = `wetline: WETLINE_MAX_ROWS "abc": not a whole number above zero` + "\n"
	var names []string
	for n := range commandTable() {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, n := range names {
		_, stderr, code := runCLI(t, n, "-o", out)
		if code != 2 || stderr != want {
			t.Errorf("%s: exit %d, stderr %q; want 2, %q", n, code, stderr, want)
		}
	}
	// The variable is told before the missing input is looked for.
	if _, stderr, code := runCLI(t, "rate", filepath.Join(dir, "none.csv"), "--slope", "0.001"); code != 2 || stderr != want {
		t.Errorf("rate of a missing file: exit %d, stderr %q; want 2, %q", code, stderr, want)
	}
	if _, err := os.Stat(out); err == nil {
		t.Errorf("%s written", out)
	}
	for _, args := range [][]string{{"version"}, {"help"}, {"help", "rate"}} {
		if stdout, stderr, code := runCLI(t, args...); code != 0 || stdout == "" {
			t.Errorf("%s: exit %d, stderr %q", strings.Join(args, " "), code, stderr)
		}
	}
}
