package output

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"testing"
)

const marker = "index.csv"

func writeFolder(t *testing.T, f *Files, path string, names ...string) error {
	t.Helper()
	d, err := f.Folder(path, marker)
	if err != nil {
		return err
	}
	for _, n := range names {
		if err := d.Write(n, text(n)); err != nil {
			return err
		}
	}
	return nil
}

// An output folder is swapped in whole: a new run's files replace an
// earlier output's entirely, with nothing of the old left mixed in.
func TestFolderSwappedInWhole(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "ratings")
	f := New()
	if err := writeFolder(t, f, out, "a.csv", "b.csv", marker); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(out); !os.IsNotExist(err) {
		t.Error("the folder appeared before Commit")
	}
	if err := f.Commit(); err != nil {
		t.Fatal(err)
	}
	f = New()
	if err := writeFolder(t, f, out, "c.csv", marker); err != nil {
		t.Fatal(err)
	}
	if err := f.Commit(); err != nil {
		t.Fatal(err)
	}
	if l := leftovers(t, out); fmt.Sprint(l) != "[c.csv index.csv]" {
		t.Errorf("folder holds %v, want the second run's files only", l)
	}
	if l := leftovers(t, dir, "ratings"); len(l) > 0 {
		t.Errorf("left beside it: %v", l)
	}
}

// A discarded run leaves the earlier output folder untouched and nothing
// beside it.
func TestFolderDiscardKeepsOld(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "ratings")
	if err := os.Mkdir(out, 0o755); err != nil {
		t.Fatal(err)
	}
	writeString(t, filepath.Join(out, marker), "old index\n")
	f := New()
	if err := writeFolder(t, f, out, "new.csv"); err != nil {
		t.Fatal(err)
	}
	f.Discard()
	if l := leftovers(t, out); fmt.Sprint(l) != "[index.csv]" {
		t.Errorf("folder holds %v", l)
	}
	if l := leftovers(t, dir, "ratings"); len(l) > 0 {
		t.Errorf("left beside it: %v", l)
	}
}

func TestFolderRefused(t *testing.T) {
	dir := t.TempDir()
	surveys := filepath.Join(dir, "surveys")
	if err := os.Mkdir(surveys, 0o755); err != nil {
		t.Fatal(err)
	}
	in := filepath.Join(surveys, "xs1.csv")
	writeString(t, in, "station,elevation\n")
	file := filepath.Join(dir, "out.csv")
	writeString(t, file, "x")
	for _, c := range []struct {
		path string
		want error
	}{
		{surveys, ErrInput},  // the folder holds an input
		{dir, ErrInput},      // so does its parent
		{file, ErrNotFolder}, // a file
		{filepath.Join(file, "x"), ErrNoFolder},
	} {
		f := New(in)
		if _, err := f.Folder(c.path, marker); !errors.Is(err, c.want) {
			t.Errorf("Folder(%s) = %v, want %v", c.path, err, c.want)
		}
		f.Discard()
	}
	f := New()
	if _, err := f.Folder(surveys, marker); !errors.Is(err, ErrForeignFolder) {
		t.Errorf("a folder of other files: %v, want ErrForeignFolder", err)
	}
	f.Discard()
	if got := readString(t, in); got != "station,elevation\n" {
		t.Errorf("input changed: %q", got)
	}
}

// A second run writing the same folder at the same time is refused; a
// lock left by an ended process is taken over.
func TestFolderBusy(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "ratings")
	first := New()
	if err := writeFolder(t, first, out, "a.csv"); err != nil {
		t.Fatal(err)
	}
	second := New()
	if _, err := second.Folder(out, marker); !errors.Is(err, ErrBusy) {
		t.Errorf("second run: %v, want ErrBusy", err)
	}
	second.Discard()
	first.Discard()
	// A stale lock: a process id that cannot be running.
	writeString(t, filepath.Join(dir, ".ratings.lock"), "-5\n")
	third := New()
	if err := writeFolder(t, third, out, "a.csv", marker); err != nil {
		t.Fatalf("stale lock not taken over: %v", err)
	}
	if err := third.Commit(); err != nil {
		t.Fatal(err)
	}
	if l := leftovers(t, dir, "ratings"); len(l) > 0 {
		t.Errorf("left beside it: %v", l)
	}
}

func TestFolderNames(t *testing.T) {
	f := New()
	defer f.Discard()
	d, err := f.Folder(filepath.Join(t.TempDir(), "out"), marker)
	if err != nil {
		t.Fatal(err)
	}
	for _, bad := range []string{"", "..", "../x", "a/b"} {
		if err := d.Write(bad, text("")); !errors.Is(err, ErrFolderName) {
			t.Errorf("name %q: %v", bad, err)
		}
	}
	if err := d.Write("A.csv", text("")); err != nil {
		t.Fatal(err)
	}
	if err := d.Write("a.csv", text("")); !errors.Is(err, ErrTwice) {
		t.Errorf("a.csv after A.csv: %v, want ErrTwice", err)
	}
}
