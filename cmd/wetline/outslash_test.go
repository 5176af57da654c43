package main

import (
	"path/filepath"
	"testing"
)

// A batch -o folder named with a trailing slash is that folder: a second
// run replaces the first's output, and nothing is left beside it or
// inside it but the tables and their index.
func TestBatchFolderTrailingSlash(t *testing.T) {
	t.Parallel()
	in := batchInputs(t, "a", "b")
	dir := t.TempDir()
	out := filepath.Join(dir, "out") + "/"
	for run := range 2 {
		if _, errs, code := runCLI(t, "rate", filepath.Join(in, "a.csv"), filepath.Join(in, "b.csv"),
			"--slope", "0.0012", "-o", out); code != 0 {
			t.Fatalf("run %d: exit %d: %s", run+1, code, errs)
		}
		if got := listing(t, dir); got != "out/" {
			t.Errorf("run %d: beside the output: %q, want only out/", run+1, got)
		}
		if got := listing(t, filepath.Join(dir, "out")); got != "a.csv b.csv index.csv" {
			t.Errorf("run %d: the output holds %q", run+1, got)
		}
	}
}
