package output

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
	"time"
)

// ended is a process id that cannot be running (above any pid_max).
const ended = 999999999

// staleFolder makes a folder at path holding the named regular files.
func staleFolder(t *testing.T, path string, files ...string) string {
	t.Helper()
	if err := os.Mkdir(path, 0o755); err != nil {
		t.Fatal(err)
	}
	for _, n := range files {
		writeString(t, filepath.Join(path, n), "stage,discharge\n")
	}
	return path
}

// Only the temporary entries of ended runs for this very output, named as
// this package names them, not links, holding nothing but files, older
// than the age, are removed; an earlier output moved aside by a commit
// that did not complete (".tmpdir.old") stays, whether its destination is
// there or not, while one moved aside by a commit that did
// (".tmpdir.done") goes.
func TestCleanStale(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "ratings")
	staleFolder(t, out, "index.csv")
	p := func(name string) string { return filepath.Join(dir, name) }
	file := func(name string) string { writeString(t, p(name), "x"); return p(name) }

	elsewhere := staleFolder(t, filepath.Join(t.TempDir(), "theirs"), "keep.csv")
	gone := filepath.Join(dir, "gone") // an output whose folder is missing
	want := []string{
		staleFolder(t, p(fmt.Sprintf(".ratings.%d-1.tmpdir", ended)), "a.csv", "b.csv"),
		staleFolder(t, p(fmt.Sprintf(".ratings.%d-2.tmpdir.done", ended)), "index.csv"),
		file(fmt.Sprintf(".ratings.%d-3.tmp", ended)),
		file(fmt.Sprintf(".ratings.%d-10.lock", ended)),
		file(fmt.Sprintf(".ratings.%d-11.lock.old", ended)),
	}
	withFolder := staleFolder(t, p(fmt.Sprintf(".ratings.%d-5.tmpdir", ended)), "a.csv")
	if err := os.Mkdir(filepath.Join(withFolder, "sub"), 0o755); err != nil {
		t.Fatal(err)
	}
	withLink := staleFolder(t, p(fmt.Sprintf(".ratings.%d-6.tmpdir", ended)))
	if err := os.Symlink(elsewhere, filepath.Join(withLink, "link")); err != nil {
		t.Fatal(err)
	}
	link := p(fmt.Sprintf(".ratings.%d-7.tmpdir", ended))
	if err := os.Symlink(elsewhere, link); err != nil {
		t.Fatal(err)
	}
	kept := []string{
		withFolder, withLink, link, elsewhere,
		staleFolder(t, p(fmt.Sprintf(".ratings.%d-1.tmpdir", os.Getpid())), "a.csv"),   // its run goes on
		staleFolder(t, p(".ratings.x-1.tmpdir")),                                       // no process id
		staleFolder(t, p(fmt.Sprintf(".ratings.%d-1.tmpdirs", ended))),                 // not a kind made
		staleFolder(t, p(fmt.Sprintf("ratings.%d-1.tmpdir", ended))),                   // not hidden
		staleFolder(t, p(fmt.Sprintf(".other.%d-1.tmpdir", ended))),                    // another output's
		staleFolder(t, p(fmt.Sprintf(".ratings.1.%d-1.tmpdir", ended))),                // that of ratings.1
		staleFolder(t, p(fmt.Sprintf(".gone.%d-1.tmpdir.old", ended)), "index.csv"),    // the one copy of gone
		staleFolder(t, p(fmt.Sprintf(".ratings.%d-2.tmpdir.old", ended)), "index.csv"), // a commit that did not complete
		staleFolder(t, p(fmt.Sprintf(".ratings.%d-12.lock", ended))),                   // not a file
		file(fmt.Sprintf(".ratings.%d-8.tmp.txt", ended)),
		file(fmt.Sprintf(".ratings.%d-4.bak", ended)), // not the output itself: may be the one copy
	}
	old := time.Now().Add(-2 * time.Hour)
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range ents {
		if e.Type()&os.ModeSymlink == 0 {
			if err := os.Chtimes(p(e.Name()), old, old); err != nil {
				t.Fatal(err)
			}
		}
	}
	recent := file(fmt.Sprintf(".ratings.%d-9.tmp", ended)) // changed just now
	kept = append(kept, recent)

	got := CleanStale(out, time.Hour, time.Now())
	sort.Strings(got)
	sort.Strings(want)
	if fmt.Sprint(got) != fmt.Sprint(want) {
		t.Errorf("removed %v\nwant %v", got, want)
	}
	for _, w := range want {
		if _, err := os.Lstat(w); !os.IsNotExist(err) {
			t.Errorf("%s is still there", w)
		}
	}
	for _, k := range kept {
		if _, err := os.Lstat(k); err != nil {
			t.Errorf("%s removed", k)
		}
	}
	if _, err := os.Stat(filepath.Join(elsewhere, "keep.csv")); err != nil {
		t.Errorf("a file a link led to was removed: %v", err)
	}
	if got := CleanStale(gone, 0, time.Now()); len(got) > 0 {
		t.Errorf("with the output missing, removed %v", got)
	}
}

// A run that takes over the lock of a killed run on the same output
// folder removes the folder that run had staged, at once; nothing but the
// output is left beside it.
func TestFolderRemovesKilledRunsStaging(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "ratings")
	writeString(t, filepath.Join(dir, ".ratings.lock"), fmt.Sprintf("%d\n", ended))
	staleFolder(t, filepath.Join(dir, fmt.Sprintf(".ratings.%d-1.tmpdir", ended)), "a.csv", "b.csv")
	f := New()
	if err := writeFolder(t, f, out, "a.csv", marker); err != nil {
		t.Fatalf("stale lock not taken over: %v", err)
	}
	if err := f.Commit(); err != nil {
		t.Fatal(err)
	}
	if l := leftovers(t, dir, "ratings"); len(l) > 0 {
		t.Errorf("left beside it: %v", l)
	}
}

// A file's temporary file left by a killed run goes when a later run
// writes the same file, once it is a day old (no lock guards a file).
func TestWriteRemovesKilledRunsTemporaryFile(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "rating.csv")
	stale := filepath.Join(dir, fmt.Sprintf(".rating.csv.%d-1.tmp", ended))
	fresh := filepath.Join(dir, fmt.Sprintf(".rating.csv.%d-2.tmp", ended))
	writeString(t, stale, "stage\n")
	writeString(t, fresh, "stage\n")
	old := time.Now().Add(-ScratchAge - time.Hour)
	if err := os.Chtimes(stale, old, old); err != nil {
		t.Fatal(err)
	}
	f := New()
	if err := f.Write(out, text("stage,discharge\n")); err != nil {
		t.Fatal(err)
	}
	if err := f.Commit(); err != nil {
		t.Fatal(err)
	}
	if l := leftovers(t, dir, "rating.csv"); fmt.Sprint(l) != fmt.Sprint([]string{filepath.Base(fresh)}) {
		t.Errorf("left beside it: %v, want only the recent %s", l, filepath.Base(fresh))
	}
}

// A backup a killed run left beside an output file goes only while it is
// still the output itself (the hard link made before the commit changed
// anything): once the output was replaced, or where the backup is a copy
// or the output is missing, it may be the one copy of the earlier
// content, and stays.
func TestCleanStaleBackups(t *testing.T) {
	dir := t.TempDir()
	p := func(name string) string { return filepath.Join(dir, name) }
	out, gone := p("rating.csv"), p("gone.csv")
	writeString(t, out, "stage,discharge\n1,2\n")
	linked := p(fmt.Sprintf(".rating.csv.%d-1.bak", ended))
	if err := os.Link(out, linked); err != nil {
		t.Skip("no hard links here:", err)
	}
	copied := p(fmt.Sprintf(".rating.csv.%d-2.bak", ended))
	writeString(t, copied, "stage,discharge\n1,2\n")
	lone := p(fmt.Sprintf(".gone.csv.%d-1.bak", ended))
	writeString(t, lone, "stage,discharge\n1,2\n")
	old := time.Now().Add(-2 * ScratchAge)
	for _, f := range []string{out, linked, copied, lone} {
		if err := os.Chtimes(f, old, old); err != nil {
			t.Fatal(err)
		}
	}
	if got := CleanStale(out, ScratchAge, time.Now()); fmt.Sprint(got) != fmt.Sprint([]string{linked}) {
		t.Errorf("removed %v, want only the link %s", got, linked)
	}
	if got := CleanStale(gone, ScratchAge, time.Now()); len(got) > 0 {
		t.Errorf("with the output missing, removed %v", got)
	}
	for _, k := range []string{out, copied, lone} {
		if _, err := os.Lstat(k); err != nil {
			t.Errorf("%s removed", k)
		}
	}
}

// A lock written on another host (or in another process-id namespace)
// names a process id that says nothing here: it holds the folder, and
// the staged folder beside it stays, until the lock is a day old. Then it
// is taken over, and only what that run left over a day ago is removed.
// A lock written here by a process that has ended is taken over at once.
func TestFolderLockedElsewhere(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "ratings")
	lock := filepath.Join(dir, ".ratings.lock")
	writeString(t, lock, fmt.Sprintf("%d gauge-server.example pid:[1]\n", ended))
	staging := staleFolder(t, filepath.Join(dir, fmt.Sprintf(".ratings.%d-1.tmpdir", ended)), "a.csv")
	if _, err := New().Folder(out, marker, lines); !errors.Is(err, ErrBusy) || !strings.Contains(err.Error(), "gauge-server.example") {
		t.Errorf("a live lock of another host: %v, want ErrBusy naming the host", err)
	}
	if _, err := os.Stat(staging); err != nil {
		t.Errorf("the other host's staged folder was removed: %v", err)
	}

	// A day on, the lock and what that run left a day ago go; what it
	// left since stays.
	older := staleFolder(t, filepath.Join(dir, fmt.Sprintf(".ratings.%d-2.tmpdir", ended)), "a.csv")
	day := time.Now().Add(-ScratchAge - time.Hour)
	for _, p := range []string{lock, older} {
		if err := os.Chtimes(p, day, day); err != nil {
			t.Fatal(err)
		}
	}
	f := New()
	if err := writeFolder(t, f, out, "a.csv", marker); err != nil {
		t.Fatalf("a day-old lock of another host not taken over: %v", err)
	}
	if got := readString(t, lock); !strings.HasPrefix(got, fmt.Sprintf("%d %s", os.Getpid(), here())) {
		t.Errorf("the lock taken over says %q, want this process and where it runs", got)
	}
	if err := f.Commit(); err != nil {
		t.Fatal(err)
	}
	if l := leftovers(t, dir, "ratings"); fmt.Sprint(l) != fmt.Sprint([]string{filepath.Base(staging)}) {
		t.Errorf("left beside it: %v, want only the recent %s", l, filepath.Base(staging))
	}

	// Written here, by a process that has ended: taken over at once.
	writeString(t, lock, fmt.Sprintf("%d %s\n", ended, here()))
	g := New()
	if err := writeFolder(t, g, out, "a.csv", marker); err != nil {
		t.Fatalf("a lock of an ended process here not taken over: %v", err)
	}
	if err := g.Commit(); err != nil {
		t.Fatal(err)
	}
	if l := leftovers(t, dir, "ratings"); len(l) > 0 {
		t.Errorf("left beside it: %v", l)
	}
}
