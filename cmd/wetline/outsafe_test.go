package main

import (
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"syscall"
	"testing"
)

// reachSurveys are three surveys rated as a batch.
var reachSurveys = []string{"demodata/tallow-xs1.csv", "demodata/tallow-xs2.csv", "demodata/tallow-xs3.csv"}

func batchArgs(out string, surveys ...string) []string {
	return append(append([]string{"rate"}, surveys...), "--slope", "0.001", "-o", out)
}

// listing names a folder's entries, sub-folders with a slash.
func listing(t *testing.T, dir string) string {
	t.Helper()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, e := range ents {
		n := e.Name()
		if e.IsDir() {
			n += "/"
		}
		names = append(names, n)
	}
	return strings.Join(names, " ")
}

func mustWrite(t *testing.T, path, content string) {
	t.Helper()
	if err := os.WriteFile(path, []byte(content), 0o644); err != nil {
		t.Fatal(err)
	}
}

// A batch -o folder is replaced only when everything in it is an earlier
// output: the user's files in a folder that happens to hold an index.csv,
// or a file added to an earlier output, are never deleted; the run is
// refused with exit 1 and one line naming the first foreign entry, and
// nothing is written. An earlier output is replaced whole, tables it
// listed and the new run does not write going with it.
func TestBatchFolderKeepsForeignFiles(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	mydata := filepath.Join(dir, "mydata")
	if err := os.MkdirAll(filepath.Join(mydata, "photos"), 0o755); err != nil {
		t.Fatal(err)
	}
	mustWrite(t, filepath.Join(mydata, "index.csv"), "site,photo\nmill lane,1\n")
	mustWrite(t, filepath.Join(mydata, "fieldbook.txt"), "page 1\n")
	mustWrite(t, filepath.Join(mydata, "photos", "p1.jpg"), "jpeg")
	before := listing(t, mydata)
	_, errs, code := runCLI(t, batchArgs(mydata, reachSurveys...)...)
	if code != 1 || !strings.Contains(errs, "fieldbook.txt") || strings.Count(strings.TrimSpace(errs), "\n") != 0 {
		t.Errorf("a folder of the user's with an index.csv: exit %d, want 1 and one line naming fieldbook.txt:\n%s", code, errs)
	}
	if got := listing(t, mydata); got != before {
		t.Errorf("mydata holds %q, want %q", got, before)
	}

	out := filepath.Join(dir, "rout")
	if _, errs, code := runCLI(t, batchArgs(out, reachSurveys...)...); code != 0 {
		t.Fatalf("first run: exit %d\n%s", code, errs)
	}
	mustWrite(t, filepath.Join(out, "notes.txt"), "checked by RB\n")
	_, errs, code = runCLI(t, batchArgs(out, reachSurveys...)...)
	if code != 1 || !strings.Contains(errs, "notes.txt") {
		t.Errorf("an earlier output with notes.txt added: exit %d, want 1 naming notes.txt:\n%s", code, errs)
	}
	if b, err := os.ReadFile(filepath.Join(out, "notes.txt")); err != nil || string(b) != "checked by RB\n" {
		t.Errorf("notes.txt: %q %v", b, err)
	}
	os.Remove(filepath.Join(out, "notes.txt"))
	// The earlier output, as it was written, is replaced whole.
	if _, errs, code := runCLI(t, batchArgs(out, reachSurveys[:2]...)...); code != 0 {
		t.Fatalf("rerun: exit %d\n%s", code, errs)
	}
	if got, want := listing(t, out), "index.csv tallow-xs1.csv tallow-xs2.csv"; got != want {
		t.Errorf("after the rerun the folder holds %q, want %q", got, want)
	}
}

// No output is written through a symbolic link, by -o or into --plots:
// the link and the file it points to are left as they were, exit 1 and
// one line saying it is a link. A link among the folders above is fine.
func TestOutputLinksRefused(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	target := filepath.Join(dir, "target.txt")
	other := filepath.Join(dir, "other.txt")
	mustWrite(t, target, "target\n")
	mustWrite(t, other, "other\n")
	ln := filepath.Join(dir, "linkexist.csv")
	if err := os.Symlink("target.txt", ln); err != nil {
		t.Skip(err)
	}
	f2 := filepath.Join(dir, "f2")
	if err := os.Mkdir(f2, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink("../other.txt", filepath.Join(f2, "tallow-xs1-rating.png")); err != nil {
		t.Fatal(err)
	}
	report := filepath.Join(dir, "report.csv")
	for _, args := range [][]string{
		{"rate", demoSurveyPath, "--slope", "0.001", "-o", ln},
		{"rate", demoSurveyPath, "--slope", "0.001", "-o", report, "--plots", f2},
		{"shape", "rectangle:width=2", "-o", ln},
		{"plot", "testdata/tallow-xs1-rating.csv", "-o", f2},
	} {
		_, errs, code := runCLI(t, args...)
		if code != 1 || !strings.Contains(errs, "is a symbolic link") {
			t.Errorf("%v: exit %d, want 1 saying it is a symbolic link:\n%s", args, code, errs)
		}
	}
	for p, want := range map[string]string{target: "target\n", other: "other\n"} {
		if b, _ := os.ReadFile(p); string(b) != want {
			t.Errorf("%s holds %q, want %q", p, b, want)
		}
	}
	if st, err := os.Lstat(ln); err != nil || st.Mode()&os.ModeSymlink == 0 {
		t.Errorf("the link was replaced: %v", err)
	}
	if got := listing(t, f2); got != "tallow-xs1-rating.png" {
		t.Errorf("f2 holds %q", got)
	}
	if _, err := os.Stat(report); !os.IsNotExist(err) {
		t.Errorf("the report was written although a figure was refused: %v", err)
	}
	// A folder reached through a link takes the figures.
	real := filepath.Join(dir, "real")
	if err := os.Mkdir(real, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink("real", filepath.Join(dir, "figlink")); err != nil {
		t.Fatal(err)
	}
	if _, errs, code := runCLI(t, "rate", demoSurveyPath, "--slope", "0.001", "--plots", filepath.Join(dir, "figlink")); code != 0 {
		t.Errorf("--plots through a linked folder: exit %d\n%s", code, errs)
	}
	if _, err := os.Stat(filepath.Join(real, "tallow-xs1-rating.png")); err != nil {
		t.Error(err)
	}
}

// A template and a built shape never replace an existing file (a
// filled-in field workbook, a field survey): exit 1, the file kept; a new
// name is written.
func TestNewFileNeverReplaces(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name, file string
		args       []string
	}{
		{"template", "tallow-field.xlsx", []string{"template"}},
		{"shape", "survey-keep.csv", []string{"shape", "rectangle:width=3"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			dir := t.TempDir()
			kept := filepath.Join(dir, tc.file)
			mustWrite(t, kept, "field data\n")
			_, errs, code := runCLI(t, append(tc.args, "-o", kept)...)
			if code != 1 || !strings.Contains(errs, "remove it or choose another name") {
				t.Errorf("%s over a file: exit %d, want 1:\n%s", tc.name, code, errs)
			}
			if b, _ := os.ReadFile(kept); string(b) != "field data\n" {
				t.Errorf("the file was replaced: %.40q", b)
			}
			if _, errs, code := runCLI(t, append(tc.args, "-o", filepath.Join(dir, "new"+filepath.Ext(tc.file)))...); code != 0 {
				t.Errorf("a new file: exit %d\n%s", code, errs)
			}
		})
	}
}

// Clear messages for paths that cannot take an output: a dangling link
// as a folder, a link to a folder as a batch folder, and a missing folder
// above -o FILE (refused, naming it).
func TestOutputPathMessages(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	dang := filepath.Join(dir, "dang")
	if err := os.Symlink("nowhere", dang); err != nil {
		t.Skip(err)
	}
	real := filepath.Join(dir, "real")
	if err := os.Mkdir(real, 0o755); err != nil {
		t.Fatal(err)
	}
	folderLink := filepath.Join(dir, "routlink")
	if err := os.Symlink("real", folderLink); err != nil {
		t.Fatal(err)
	}
	missing := filepath.Join(dir, "nothere")
	for _, c := range []struct {
		args []string
		code int
		want string
	}{
		{[]string{"rate", demoSurveyPath, "--slope", "0.001", "--plots", dang}, 1, "dang is a dangling symbolic link"},
		{[]string{"plot", "testdata/tallow-xs1-rating.csv", "-o", dang}, 1, "dang is a dangling symbolic link"},
		{[]string{"demo", "-o", dang}, 1, "dang is a dangling symbolic link"},
		{[]string{"rate", "demodata/tallow-xs1.csv", "demodata/tallow-xs2.csv", "--slope", "0.001", "-o", folderLink}, 1, "routlink: is a symbolic link"},
		{[]string{"rate", demoSurveyPath, "--slope", "0.001", "-o", filepath.Join(missing, "deeper", "out.csv")}, 1, "the folder " + missing + " does not exist"},
	} {
		_, errs, code := runCLI(t, c.args...)
		if code != c.code || !strings.Contains(errs, c.want) {
			t.Errorf("%q: exit %d, want %d and %q:\n%s", c.args, code, c.code, c.want, errs)
		}
	}
	if _, err := os.Stat(missing); !os.IsNotExist(err) {
		t.Errorf("a missing folder was made: %v", err)
	}
	if got := listing(t, real); got != "" {
		t.Errorf("the linked folder got %q", got)
	}
}

// A report path that is no regular file (a pipe, a device) or names a
// stream is refused suggesting standard output (-o -) only where a
// command can write there: not for a template, which needs a file, nor
// for a figure's path under --plots.
func TestStdoutSuggestedOnlyWhereItWorks(t *testing.T) {
	t.Parallel()
	if runtime.GOOS == "windows" {
		t.Skip("no named pipes")
	}
	dir := t.TempDir()
	pipe, csvPipe := filepath.Join(dir, "pipe.xlsx"), filepath.Join(dir, "pipe.csv")
	figs := filepath.Join(dir, "figs")
	if err := os.Mkdir(figs, 0o755); err != nil {
		t.Fatal(err)
	}
	for _, p := range []string{pipe, csvPipe, filepath.Join(figs, "tallow-xs1-section.png")} {
		if err := syscall.Mkfifo(p, 0o644); err != nil {
			t.Skip("no named pipes:", err)
		}
	}
	const hint = "-o -"
	for _, tc := range []struct {
		args []string
		hint bool
	}{
		{[]string{"rate", demoSurveyPath, "--slope", "0.001", "-o", pipe}, true},
		{[]string{"rate", demoSurveyPath, "--slope", "0.001", "-o", os.DevNull, "--format", "csv"}, true},
		{[]string{"shape", "rectangle:width=2", "-o", csvPipe}, true},
		{[]string{"template", "-o", pipe}, false},
		{[]string{"rate", demoSurveyPath, "--slope", "0.001", "--plots", figs}, false},
	} {
		_, errs, code := runCLI(t, tc.args...)
		if code != 1 || !strings.Contains(errs, "refusing to write there") {
			t.Errorf("%v: exit %d, want 1 refusing the path:\n%s", tc.args, code, errs)
			continue
		}
		if got := strings.Contains(errs, hint); got != tc.hint {
			t.Errorf("%v: suggests %q: %v, want %v:\n%s", tc.args, hint, got, tc.hint, errs)
		}
	}
}
