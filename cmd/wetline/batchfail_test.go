package main

import (
	"bytes"
	"context"
	"crypto/sha256"
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// treeSums returns the SHA-256 of every file under root (by path relative
// to it), so that a run can be shown to leave it byte for byte as it was.
func treeSums(t *testing.T, root string) map[string][32]byte {
	t.Helper()
	sums := map[string][32]byte{}
	err := filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		b, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(root, p)
		sums[rel] = sha256.Sum256(b)
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return sums
}

// sameSums reports how want and got differ ("" when alike).
func sameSums(want, got map[string][32]byte) string {
	var diff []string
	for p, w := range want {
		if g, ok := got[p]; !ok {
			diff = append(diff, p+" removed")
		} else if g != w {
			diff = append(diff, p+" changed")
		}
	}
	for p := range got {
		if _, ok := want[p]; !ok {
			diff = append(diff, p+" added")
		}
	}
	return strings.Join(diff, ", ")
}

// failFixture is a place holding the good output of an earlier batch (a
// folder of three tables and its index, and a long table) and inputs
// with which a batch fails in each of its ways.
type failFixture struct {
	tmp, out, long string
	good           string // folder of three good surveys
	headerOnly     string // folder of two surveys with a header and no rows
	blankBook      string // the field template: survey sheets, none filled
	mixed          string // folder: a survey in feet, then one in metres
}

func newFailFixture(t *testing.T) failFixture {
	t.Helper()
	f := failFixture{good: batchInputs(t, "a1", "b2", "c3")}
	f.tmp = t.TempDir()
	f.out, f.long = filepath.Join(f.tmp, "ratings"), filepath.Join(f.tmp, "long.csv")
	for _, args := range [][]string{{"-o", f.out}, {"--long", "-o", f.long}} {
		if _, errs, code := runCLI(t, append([]string{"rate", f.good, "--slope", "0.001"}, args...)...); code != 0 {
			t.Fatalf("%v: exit %d: %s", args, code, errs)
		}
	}
	in := t.TempDir()
	f.headerOnly = filepath.Join(in, "header-only")
	f.mixed = filepath.Join(in, "mixed")
	for _, d := range []string{f.headerOnly, f.mixed} {
		if err := os.Mkdir(d, 0o755); err != nil {
			t.Fatal(err)
		}
	}
	for _, n := range []string{"a.csv", "b.csv"} {
		writeFileT(t, filepath.Join(f.headerOnly, n), "station,elevation,n\n")
	}
	ft := strings.Replace(surveyCSV(0), "station,elevation", "station (ft),elevation (ft)", 1)
	m := strings.Replace(surveyCSV(0), "station,elevation", "station (m),elevation (m)", 1)
	writeFileT(t, filepath.Join(f.mixed, "a-ft.csv"), ft)
	writeFileT(t, filepath.Join(f.mixed, "b-m.csv"), m)
	f.blankBook = filepath.Join(in, "blank.xlsx")
	if _, errs, code := runCLI(t, "template", "-o", f.blankBook); code != 0 {
		t.Fatalf("template: exit %d: %s", code, errs)
	}
	return f
}

func writeFileT(t *testing.T, path, text string) {
	t.Helper()
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
}

// TestBatchNothingRatedKeepsOutput: a batch whose every section is
// skipped (a header and no rows) rates nothing and exits 1, and, as
// every failed run, writes nothing: an earlier batch folder and an
// earlier long table are left byte for byte as they were, and standard
// output holds no table.
func TestBatchNothingRatedKeepsOutput(t *testing.T) {
	t.Parallel()
	f := newFailFixture(t)
	for _, tc := range []struct {
		name string
		args []string
	}{
		{"blank workbook into a folder", []string{f.blankBook, "--all-sheets", "-o", f.out}},
		{"header-only folder into a folder", []string{f.headerOnly, "-o", f.out}},
		{"header-only files into a long table", []string{filepath.Join(f.headerOnly, "a.csv"), filepath.Join(f.headerOnly, "b.csv"), "--long", "-o", f.long}},
		{"header-only folder into a long table", []string{f.headerOnly, "--long", "-o", f.long}},
		{"header-only folder onto standard output", []string{f.headerOnly, "--long"}},
		{"blank workbook into a new folder", []string{f.blankBook, "--all-sheets", "-o", filepath.Join(f.tmp, "new")}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			before := treeSums(t, f.tmp)
			stdout, errs, code := runCLI(t, append([]string{"rate", "--slope", "0.001"}, tc.args...)...)
			if code != 1 || !strings.Contains(errs, "nothing was rated") || !strings.Contains(errs, "nothing was written") {
				t.Errorf("exit %d, want 1 saying nothing was rated nor written:\n%s", code, errs)
			}
			if stdout != "" {
				t.Errorf("standard output holds %q", stdout)
			}
			if d := sameSums(before, treeSums(t, f.tmp)); d != "" {
				t.Errorf("earlier output not left as it was: %s", d)
			}
		})
	}
}

// TestBatchErrorCommitsNothing walks the ways a batch ends with an error
// (sections failed, every section skipped, sections in two unit systems,
// the run stopped while rating, a destination refused) into every kind
// of output: whatever the error, nothing is committed, and earlier output
// is left byte for byte as it was.
func TestBatchErrorCommitsNothing(t *testing.T) {
	t.Parallel()
	f := newFailFixture(t)
	bad := batchInputs(t, "a1", "bad", "c3")
	notBatch := filepath.Join(f.tmp, "other")
	if err := os.Mkdir(notBatch, 0o755); err != nil {
		t.Fatal(err)
	}
	writeFileT(t, filepath.Join(notBatch, "notes.txt"), "kept\n")
	stopped := errors.New("stopped while rating")
	outs := map[string][]string{
		"folder":     {"-o", f.out},
		"long table": {"--long", "-o", f.long},
		"stdout":     {"--long"},
		"new folder": {"-o", filepath.Join(f.tmp, "new")},
	}
	for _, tc := range []struct {
		name   string
		inputs []string
		stop   bool // cancel the run after the first section
	}{
		{"a section failed", []string{bad}, false},
		{"every section skipped", []string{f.headerOnly}, false},
		{"blank workbook", []string{f.blankBook, "--all-sheets"}, false},
		{"two unit systems", []string{f.mixed}, false},
		{"stopped", []string{f.good}, true},
	} {
		for on, out := range outs {
			t.Run(tc.name+" into "+on, func(t *testing.T) {
				before := treeSums(t, f.tmp)
				var stdout, stderr bytes.Buffer
				e := newEnv(&stdout, &stderr, commandTable())
				ctx, cancel := context.WithCancelCause(context.Background())
				defer cancel(nil)
				if tc.stop {
					e.reached = func(p string) {
						if p == "section 1" {
							cancel(stopped)
						}
					}
				}
				args := append(append([]string{"rate", "--slope", "0.001"}, tc.inputs...), out...)
				err := run(ctx, e, args)
				if err == nil {
					t.Fatalf("no error; stderr:\n%s", stderr.String())
				}
				if committed, _ := e.files.Committed(); committed {
					t.Errorf("output committed by a run ending with %v", err)
				}
				if stdout.Len() != 0 {
					t.Errorf("standard output holds %q", stdout.String())
				}
				if d := sameSums(before, treeSums(t, f.tmp)); d != "" {
					t.Errorf("earlier output not left as it was (%v): %s", err, d)
				}
			})
		}
	}
	// A folder that is not an earlier batch's is refused whatever the
	// sections give, and left as it was.
	before := treeSums(t, f.tmp)
	e := newEnv(&bytes.Buffer{}, &bytes.Buffer{}, commandTable())
	if err := run(context.Background(), e, []string{"rate", "--slope", "0.001", f.good, "-o", notBatch}); err == nil {
		t.Error("a folder that is not a batch's replaced")
	}
	if committed, _ := e.files.Committed(); committed {
		t.Error("refused folder: output committed")
	}
	if d := sameSums(before, treeSums(t, f.tmp)); d != "" {
		t.Errorf("refused folder: %s", d)
	}
}
