package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// An input that does not exist is named once, by its path, and, when a
// flag gave it, by the flag: exit 1, nothing written.
func TestMissingInputNamed(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	missing := filepath.Join(dir, "new.xlsx")
	out := filepath.Join(dir, "out.xlsx")
	gaugings := filepath.Join(dir, "gaugings.csv")
	stages := filepath.Join(dir, "stages.csv")
	for path, text := range map[string]string{
		gaugings: "time,stage,discharge\n2024-01-01,1.0,2.0\n2024-02-01,1.2,3.0\n2024-03-01,1.4,4.5\n",
		stages:   "time,stage\n2024-01-01T00:00Z,1.0\n2024-01-01T01:00Z,1.1\n",
	} {
		if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	for _, c := range []struct {
		name string
		args []string
		want string
	}{
		{"template --survey", []string{"template", "--survey", missing, "-o", out}, "wetline: template --survey: " + missing + ": no such file or directory\n"},
		{"fit --section", []string{"fit", gaugings, "--section", missing, "--slope", "0.001", "-o", out}, "wetline: fit --section: " + missing + ": no such file or directory\n"},
		{"record --rating FILE@TIME", []string{"record", stages, "--rating", missing + "@2020-01-01", "-o", out}, "wetline: record --rating: " + missing + ": no such file or directory\n"},
		{"rate, an argument", []string{"rate", missing, "--slope", "0.001", "-o", out}, "wetline: " + missing + ": no such file or directory\n"},
	} {
		_, stderr, code := runCLI(t, c.args...)
		if code != 1 || !strings.HasPrefix(stderr, c.want) {
			t.Errorf("%s: exit %d, %q, want exit 1 and %q", c.name, code, stderr, c.want)
		}
		if _, err := os.Stat(out); err == nil {
			t.Errorf("%s: wrote %s", c.name, out)
		}
	}
}
