package output

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

const marker = "index.csv"

// lines reads an index that lists one file name a line.
func lines(index []byte) ([]string, error) { return strings.Fields(string(index)), nil }

// writeFolder writes the named files into an output folder; the marker,
// when named, lists them all.
func writeFolder(t *testing.T, f *Files, path string, names ...string) error {
	t.Helper()
	d, err := f.Folder(path, marker, lines)
	if err != nil {
		return err
	}
	for _, n := range names {
		content := n
		if n == marker {
			content = strings.Join(names, "\n")
		}
		if err := d.Write(n, text(content)); err != nil {
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
		{filepath.Join(dir, "missing", "out"), ErrNoParent},
	} {
		f := New(in)
		if _, err := f.Folder(c.path, marker, lines); !errors.Is(err, c.want) {
			t.Errorf("Folder(%s) = %v, want %v", c.path, err, c.want)
		}
		f.Discard()
	}
	f := New()
	if _, err := f.Folder(surveys, marker, lines); !errors.Is(err, ErrForeignFolder) {
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
	if _, err := second.Folder(out, marker, lines); !errors.Is(err, ErrBusy) {
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
	d, err := f.Folder(filepath.Join(t.TempDir(), "out"), marker, lines)
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

// An existing folder is replaced only when every entry in it is an earlier
// output: its index and the regular files the index lists. A file of the
// user's, a sub-folder, a link or an unlisted file is refused, naming the
// first such entry, and the folder is left whole.
func TestFolderForeignEntries(t *testing.T) {
	for _, c := range []struct {
		name  string
		setup func(t *testing.T, out string)
		names string // named in the error
	}{
		{"a file the index does not list", func(t *testing.T, out string) {
			writeString(t, filepath.Join(out, "fieldbook.txt"), "page 1\n")
		}, "fieldbook.txt"},
		{"a sub-folder", func(t *testing.T, out string) {
			if err := os.Mkdir(filepath.Join(out, "photos"), 0o755); err != nil {
				t.Fatal(err)
			}
		}, "photos/"},
		{"a link the index lists", func(t *testing.T, out string) {
			os.Remove(filepath.Join(out, "a.csv"))
			if err := os.Symlink(filepath.Join(out, "b.csv"), filepath.Join(out, "a.csv")); err != nil {
				t.Skip(err)
			}
		}, "a.csv"},
		{"no index", func(t *testing.T, out string) {
			os.Remove(filepath.Join(out, marker))
		}, "a.csv"},
	} {
		dir := t.TempDir()
		out := filepath.Join(dir, "ratings")
		f := New()
		if err := writeFolder(t, f, out, "a.csv", "b.csv", marker); err != nil {
			t.Fatal(err)
		}
		if err := f.Commit(); err != nil {
			t.Fatal(err)
		}
		c.setup(t, out)
		before := leftovers(t, out)
		f = New()
		_, err := f.Folder(out, marker, lines)
		if !errors.Is(err, ErrForeignFolder) || !strings.Contains(err.Error(), c.names) || strings.Contains(err.Error(), "\n") {
			t.Errorf("%s: %v, want ErrForeignFolder naming %s on one line", c.name, err, c.names)
		}
		f.Discard()
		if got := leftovers(t, out); fmt.Sprint(got) != fmt.Sprint(before) {
			t.Errorf("%s: the folder now holds %v, want %v", c.name, got, before)
		}
		if l := leftovers(t, dir, "ratings"); len(l) > 0 {
			t.Errorf("%s: left beside it: %v", c.name, l)
		}
	}
}

// A file added to an earlier output between the check and the commit
// stops the commit: the folder is left with it.
func TestFolderForeignAtCommit(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "ratings")
	f := rewriteFolder(t, out)
	writeString(t, filepath.Join(out, "notes.txt"), "mine\n")
	if err := f.Commit(); !errors.Is(err, ErrForeignFolder) {
		t.Errorf("commit: %v, want ErrForeignFolder", err)
	}
	if got := readString(t, filepath.Join(out, "notes.txt")); got != "mine\n" {
		t.Errorf("notes.txt: %q", got)
	}
}

// A folder path that is a symbolic link (to a folder, or to nothing) is
// refused and left as it is.
func TestFolderLink(t *testing.T) {
	dir := t.TempDir()
	real := filepath.Join(dir, "real")
	if err := os.Mkdir(real, 0o755); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		target string
		want   error
	}{{real, ErrLink}, {filepath.Join(dir, "gone"), ErrDangling}} {
		ln := filepath.Join(dir, "link-"+filepath.Base(c.target))
		if err := os.Symlink(c.target, ln); err != nil {
			t.Skip(err)
		}
		f := New()
		if _, err := f.Folder(ln, marker, lines); !errors.Is(err, c.want) {
			t.Errorf("Folder(%s) = %v, want %v", ln, err, c.want)
		}
		f.Discard()
		if st, err := os.Lstat(ln); err != nil || st.Mode()&os.ModeSymlink == 0 {
			t.Errorf("%s is no longer the link", ln)
		}
	}
}

// A folder and a file committed together: when the file cannot be put in
// place, the folder swapped in before it is swapped back out.
func TestFolderRolledBack(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "ratings")
	f := rewriteFolder(t, out)
	f.rename = func(o, n string) error {
		if strings.HasSuffix(o, ".tmpdir") {
			return &os.LinkError{Op: "rename", Old: o, New: n, Err: syscall.EPERM}
		}
		return os.Rename(o, n)
	}
	if err := f.Commit(); !errors.Is(err, ErrCommit) {
		t.Errorf("commit: %v, want ErrCommit", err)
	}
	if l := leftovers(t, out); fmt.Sprint(l) != "[a.csv index.csv]" {
		t.Errorf("folder holds %v, want the first run's", l)
	}
	if l := leftovers(t, dir, "ratings"); len(l) > 0 {
		t.Errorf("left beside it: %v", l)
	}
}

// rewriteFolder commits an earlier output folder at out holding a.csv, and
// returns a new output with the folder written again holding b.csv, not
// yet committed.
func rewriteFolder(t *testing.T, out string) *Files {
	t.Helper()
	f := New()
	if err := writeFolder(t, f, out, "a.csv", marker); err != nil {
		t.Fatal(err)
	}
	if err := f.Commit(); err != nil {
		t.Fatal(err)
	}
	f = New()
	if err := writeFolder(t, f, out, "b.csv", marker); err != nil {
		t.Fatal(err)
	}
	return f
}

// An output folder named with a trailing slash (-o out/) is the folder
// out: its lock and staged folder go beside it, not inside it, and a
// second run replaces the first's output. A file named with one is the
// same as without.
func TestFolderTrailingSlash(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "ratings") + string(filepath.Separator)
	for run := range 2 {
		f := New()
		if err := writeFolder(t, f, out, "a.csv", marker); err != nil {
			t.Fatalf("run %d: %v", run+1, err)
		}
		if err := f.Commit(); err != nil {
			t.Fatalf("run %d: %v", run+1, err)
		}
		if got := fmt.Sprint(names(t, filepath.Join(dir, "ratings"))); got != "[a.csv index.csv]" {
			t.Errorf("run %d: the folder holds %s", run+1, got)
		}
		if l := leftovers(t, dir, "ratings"); len(l) > 0 {
			t.Errorf("run %d: left beside it: %v", run+1, l)
		}
	}
	f := New()
	if err := f.Write(filepath.Join(dir, "rating.csv")+"/", text("stage\n")); err != nil {
		t.Fatal(err)
	}
	if err := f.Commit(); err != nil {
		t.Fatal(err)
	}
	if got := readString(t, filepath.Join(dir, "rating.csv")); got != "stage\n" {
		t.Errorf("rating.csv holds %q", got)
	}
}

// names lists a folder.
func names(t *testing.T, dir string) []string {
	t.Helper()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, e := range ents {
		out = append(out, e.Name())
	}
	return out
}

// Runs that find the same stale lock at once take it over one at a time:
// of two racing for it, exactly one holds the folder and the other is
// told it is busy, every time.
func TestFolderStaleLockRace(t *testing.T) {
	for round := range 300 {
		dir := t.TempDir()
		out := filepath.Join(dir, "ratings")
		writeString(t, filepath.Join(dir, ".ratings.lock"), fmt.Sprintf("%d %s\n", ended, here()))
		var (
			start = make(chan struct{})
			errs  = make(chan error, 2)
			sets  = []*Files{New(), New()}
		)
		for _, f := range sets {
			go func() {
				<-start
				_, err := f.Folder(out, marker, lines)
				errs <- err
			}()
		}
		close(start)
		won := 0
		for range sets {
			switch err := <-errs; {
			case err == nil:
				won++
			case !errors.Is(err, ErrBusy):
				t.Fatalf("round %d: %v, want ErrBusy", round, err)
			}
		}
		for _, f := range sets {
			f.Discard()
		}
		if won != 1 {
			t.Fatalf("round %d: %d runs took over the stale lock, want 1", round, won)
		}
		if l := leftovers(t, dir); len(l) > 0 {
			t.Fatalf("round %d: left beside the folder: %v", round, l)
		}
	}
}

// A lock that cannot be read (empty, as one just created and not yet
// written, or not a lock wetline writes) is taken as held until it is
// LockGrace old, then as stale.
func TestFolderUnreadableLock(t *testing.T) {
	for _, content := range []string{"", "\n", "pid?\n"} {
		dir := t.TempDir()
		out := filepath.Join(dir, "ratings")
		lock := filepath.Join(dir, ".ratings.lock")
		writeString(t, lock, content)
		f := New()
		if _, err := f.Folder(out, marker, lines); !errors.Is(err, ErrBusy) {
			t.Errorf("a new lock holding %q: %v, want ErrBusy", content, err)
		}
		f.Discard()
		if got := readString(t, lock); got != content {
			t.Errorf("a new lock holding %q now holds %q", content, got)
		}
		old := time.Now().Add(-LockGrace - time.Second)
		if err := os.Chtimes(lock, old, old); err != nil {
			t.Fatal(err)
		}
		g := New()
		if err := writeFolder(t, g, out, "a.csv", marker); err != nil {
			t.Errorf("a lock holding %q, LockGrace old: %v, want it taken over", content, err)
		}
		if err := g.Commit(); err != nil {
			t.Fatal(err)
		}
		if l := leftovers(t, dir, "ratings"); len(l) > 0 {
			t.Errorf("left beside it: %v", l)
		}
	}
}

// The lock a run holds is never seen half-written: it appears whole,
// saying the process and where it runs, and only the lock is left
// beside the folder while the run writes.
func TestFolderLockWrittenWhole(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "ratings")
	f := New()
	defer f.Discard()
	if _, err := f.Folder(out, marker, lines); err != nil {
		t.Fatal(err)
	}
	if got, want := readString(t, filepath.Join(dir, ".ratings.lock")), fmt.Sprintf("%d %s\n", os.Getpid(), here()); got != want {
		t.Errorf("the lock holds %q, want %q", got, want)
	}
	var beside []string
	for _, n := range leftovers(t, dir) {
		if !strings.HasSuffix(n, ".tmpdir") {
			beside = append(beside, n)
		}
	}
	if fmt.Sprint(beside) != "[.ratings.lock]" {
		t.Errorf("beside the folder: %v, want the lock and the staged folder", beside)
	}
}

// A run's lock is kept fresh while it writes: its time is renewed as
// files are written, so that a long run on another host is not taken for
// an ended one.
func TestFolderLockRefreshed(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "ratings")
	lock := filepath.Join(dir, ".ratings.lock")
	f := New()
	defer f.Discard()
	d, err := f.Folder(out, marker, lines)
	if err != nil {
		t.Fatal(err)
	}
	old := time.Now().Add(-ScratchAge + time.Hour)
	if err := os.Chtimes(lock, old, old); err != nil {
		t.Fatal(err)
	}
	d.lock.touched = old
	if err := d.Write("a.csv", text("stage\n")); err != nil {
		t.Fatal(err)
	}
	st, err := os.Stat(lock)
	if err != nil {
		t.Fatal(err)
	}
	if time.Since(st.ModTime()) > time.Hour {
		t.Errorf("the lock's time is %v, not renewed by a write", st.ModTime())
	}
}

// When a commit fails and a folder already swapped in cannot be swapped
// back out, the earlier output the error names as kept beside it stays
// there, through later runs writing the same folder, until the user
// takes it.
func TestFolderFailedRollbackKeepsEarlierOutput(t *testing.T) {
	dir := t.TempDir()
	first, second := filepath.Join(dir, "ratings"), filepath.Join(dir, "tables")
	f := rewriteFolder(t, first)
	if err := writeFolder(t, f, second, "c.csv", marker); err != nil {
		t.Fatal(err)
	}
	f.rename = func(o, n string) error {
		// The second folder cannot be put in place, nor the first
		// swapped back out.
		if n == second || (o == first && strings.HasSuffix(n, ".tmpdir")) {
			return &os.LinkError{Op: "rename", Old: o, New: n, Err: syscall.EPERM}
		}
		return os.Rename(o, n)
	}
	err := f.Commit()
	if err == nil || errors.Is(err, ErrCommit) {
		t.Fatalf("commit: %v, want an error saying what was changed", err)
	}
	var kept string
	for _, n := range names(t, dir) {
		if strings.HasPrefix(n, ".ratings.") && strings.HasSuffix(n, ".tmpdir.old") {
			kept = filepath.Join(dir, n)
		}
	}
	if kept == "" || !strings.Contains(err.Error(), kept) {
		t.Fatalf("commit: %v; beside the folder: %v; want the earlier output kept and named", err, names(t, dir))
	}
	if got := readString(t, filepath.Join(kept, "a.csv")); got != "a.csv" {
		t.Errorf("the kept folder's a.csv holds %q", got)
	}
	// As a later run sees it, once this process has ended.
	later := filepath.Join(dir, fmt.Sprintf(".ratings.%d-1.tmpdir.old", ended))
	if err := os.Rename(kept, later); err != nil {
		t.Fatal(err)
	}
	g := New()
	if err := writeFolder(t, g, first, "d.csv", marker); err != nil {
		t.Fatal(err)
	}
	if err := g.Commit(); err != nil {
		t.Fatal(err)
	}
	if got := readString(t, filepath.Join(later, "a.csv")); got != "a.csv" {
		t.Errorf("after a later run the kept earlier output is gone or changed: %q", got)
	}
}

// When a folder cannot be put in place and its earlier output cannot be
// put back either, the earlier output is kept beside it, and named.
func TestFolderFailedInstallKeepsEarlierOutput(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "ratings")
	f := rewriteFolder(t, out)
	f.rename = func(o, n string) error {
		if n == out {
			return &os.LinkError{Op: "rename", Old: o, New: n, Err: syscall.EPERM}
		}
		return os.Rename(o, n)
	}
	err := f.Commit()
	if err == nil || errors.Is(err, ErrCommit) {
		t.Fatalf("commit: %v, want an error saying what was changed", err)
	}
	var kept string
	for _, n := range names(t, dir) {
		if strings.HasSuffix(n, ".tmpdir.old") {
			kept = filepath.Join(dir, n)
		}
	}
	if kept == "" || !strings.Contains(err.Error(), kept) {
		t.Fatalf("commit: %v; beside the folder: %v; want the earlier output kept and named", err, names(t, dir))
	}
	if got := readString(t, filepath.Join(kept, "a.csv")); got != "a.csv" {
		t.Errorf("the kept folder's a.csv holds %q", got)
	}
}
