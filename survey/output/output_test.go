package output

import (
	"errors"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"
)

// leftovers lists the files in dir other than those named in keep.
func leftovers(t *testing.T, dir string, keep ...string) []string {
	t.Helper()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, e := range ents {
		found := false
		for _, k := range keep {
			found = found || e.Name() == k
		}
		if !found {
			out = append(out, e.Name())
		}
	}
	return out
}

func writeString(t *testing.T, path, s string) {
	t.Helper()
	if err := os.WriteFile(path, []byte(s), 0o644); err != nil {
		t.Fatal(err)
	}
}

func readString(t *testing.T, path string) string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

func text(s string) func(io.Writer) error {
	return func(w io.Writer) error {
		_, err := io.WriteString(w, s)
		return err
	}
}

// A writer failing after part of its output leaves neither a partial
// file nor a temporary file, and an existing output keeps its content.
func TestWriteErrorMidWrite(t *testing.T) {
	boom := errors.New("disk on fire")
	halfThenFail := func(w io.Writer) error {
		if _, err := io.WriteString(w, "stage,discharge\n1,2\n"); err != nil {
			return err
		}
		return boom
	}
	for _, existing := range []string{"", "old content\n"} {
		dir := t.TempDir()
		out := filepath.Join(dir, "rating.csv")
		if existing != "" {
			writeString(t, out, existing)
		}
		f := New()
		if err := f.Write(out, halfThenFail); !errors.Is(err, boom) {
			t.Fatalf("err = %v, want the writer's error", err)
		}
		f.Discard()
		if existing == "" {
			if _, err := os.Stat(out); !os.IsNotExist(err) {
				t.Errorf("a partial output exists: %v", err)
			}
		} else if got := readString(t, out); got != existing {
			t.Errorf("existing output changed to %q", got)
		}
		if l := leftovers(t, dir, "rating.csv"); len(l) > 0 {
			t.Errorf("files left behind: %v", l)
		}
	}
}

// Nothing reaches a destination before Commit; a failure of a later file
// of the run leaves the earlier ones' destinations as they were.
func TestAllOrNothing(t *testing.T) {
	dir := t.TempDir()
	a, b := filepath.Join(dir, "a.csv"), filepath.Join(dir, "b.png")
	writeString(t, a, "old a\n")
	f := New()
	if err := f.Write(a, text("new a\n")); err != nil {
		t.Fatal(err)
	}
	if got := readString(t, a); got != "old a\n" {
		t.Errorf("a replaced before Commit: %q", got)
	}
	notADir := filepath.Join(dir, "notadir")
	writeString(t, notADir, "x")
	if err := f.Write(filepath.Join(notADir, "fig.png"), text("png")); !errors.Is(err, ErrNoFolder) {
		t.Errorf("figure under a file: %v, want ErrNoFolder", err)
	}
	f.Discard()
	if got := readString(t, a); got != "old a\n" {
		t.Errorf("a changed by a failed run: %q", got)
	}
	if _, err := os.Stat(b); !os.IsNotExist(err) {
		t.Error("b exists")
	}
	if l := leftovers(t, dir, "a.csv", "notadir"); len(l) > 0 {
		t.Errorf("files left behind: %v", l)
	}
}

// A commit replaces files whole, keeps their permissions and makes
// missing folders the run may create.
func TestCommitReplaces(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "rating.csv")
	writeString(t, out, "old\n")
	if err := os.Chmod(out, 0o600); err != nil {
		t.Fatal(err)
	}
	fig := filepath.Join(dir, "figs", "new", "rating.png")
	f := New()
	f.MayCreate(filepath.Join(dir, "figs"))
	if err := f.Write(out, text("new\n")); err != nil {
		t.Fatal(err)
	}
	if err := f.Write(fig, text("png")); err != nil {
		t.Fatal(err)
	}
	if err := f.Commit(); err != nil {
		t.Fatal(err)
	}
	if got := readString(t, out); got != "new\n" {
		t.Errorf("content %q, want %q", got, "new\n")
	}
	if st, err := os.Stat(out); err != nil || st.Mode().Perm() != 0o600 {
		t.Errorf("mode %v (%v), want 0600", st.Mode(), err)
	}
	if got := readString(t, fig); got != "png" {
		t.Errorf("figure %q", got)
	}
	if l := leftovers(t, dir, "rating.csv", "figs"); len(l) > 0 {
		t.Errorf("files left behind: %v", l)
	}
	if err := f.Write(out, text("again\n")); err != nil {
		t.Errorf("write after commit: %v", err)
	}
	f.Discard()
	if got := readString(t, out); got != "new\n" {
		t.Errorf("a discarded write after a commit changed the file: %q", got)
	}
}

// A folder made for an output of a failed run is removed again.
func TestDiscardRemovesMadeFolders(t *testing.T) {
	dir := t.TempDir()
	f := New()
	f.MayCreate(filepath.Join(dir, "figs"))
	if err := f.Write(filepath.Join(dir, "figs", "a.png"), text("png")); err != nil {
		t.Fatal(err)
	}
	f.Discard()
	if l := leftovers(t, dir); len(l) > 0 {
		t.Errorf("left behind: %v", l)
	}
}

// Destinations that are not regular files, inputs, folders and read-only
// files are refused before anything is written, and left as they were.
func TestRefusedDestinations(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "xs1.csv")
	writeString(t, in, "station,elevation\n0,1\n1,0\n")
	fifo := filepath.Join(dir, "pipe")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Skip("no named pipes here:", err)
	}
	ro := filepath.Join(dir, "kept.csv")
	writeString(t, ro, "keep me\n")
	if err := os.Chmod(ro, 0o444); err != nil {
		t.Fatal(err)
	}
	link := func(name, target string) string {
		p := filepath.Join(dir, name)
		if err := os.Symlink(target, p); err != nil {
			t.Skip("symbolic links not available:", err)
		}
		return p
	}
	fifoLink := link("pipe-link", fifo)
	devLink := link("null-link", os.DevNull)
	inLink := link("latest.csv", in)
	dirLink := link("surveys", dir)
	dangling := link("nowhere", filepath.Join(dir, "missing", "x"))
	other := filepath.Join(dir, "other.txt")
	writeString(t, other, "someone's notes\n")
	fileLink := link("figure.png", other)
	folderLink := link("figs", filepath.Join(dir, "gone"))
	for _, c := range []struct {
		out  string
		want error
	}{
		{os.DevNull, ErrNotRegular},
		{fifo, ErrNotRegular},
		{fifoLink, ErrLink},
		{devLink, ErrLink},
		{dangling, ErrDangling},
		{fileLink, ErrLink},
		{filepath.Join(folderLink, "rating.png"), ErrDangling},
		{filepath.Join(dir, "missing", "deeper", "out.csv"), ErrNoParent},
		{dir, ErrFolder},
		{ro, ErrReadOnly},
		{in, ErrInput},
		{inLink, ErrInput},
		{filepath.Join(dirLink, "xs1.csv"), ErrInput},
		{filepath.Join(dir, ".", "sub", "..", "xs1.csv"), ErrInput},
		{filepath.Join(in, "rating.csv"), ErrNoFolder},
	} {
		f := New(in)
		if err := f.Check(c.out); !errors.Is(err, c.want) {
			t.Errorf("Check(%s) = %v, want %v", c.out, err, c.want)
		}
		err := f.Write(c.out, text("overwritten"))
		if !errors.Is(err, c.want) {
			t.Errorf("Write(%s) = %v, want %v", c.out, err, c.want)
		}
		if err != nil && !strings.Contains(err.Error(), filepath.Base(c.out)) {
			t.Errorf("error %q does not name the output", err)
		}
		f.Discard()
	}
	if st, err := os.Lstat(fifo); err != nil || st.Mode()&os.ModeNamedPipe == 0 {
		t.Errorf("the pipe was replaced: %v %v", st.Mode(), err)
	}
	if st, err := os.Stat(os.DevNull); err != nil || st.Mode()&os.ModeCharDevice == 0 {
		t.Errorf("%s was replaced", os.DevNull)
	}
	if got := readString(t, ro); got != "keep me\n" {
		t.Errorf("read-only file changed to %q", got)
	}
	if got := readString(t, in); !strings.HasPrefix(got, "station") {
		t.Errorf("input changed to %q", got)
	}
	if got := readString(t, other); got != "someone's notes\n" {
		t.Errorf("the file a link points to changed to %q", got)
	}
	if l := leftovers(t, dir, "xs1.csv", "pipe", "kept.csv", "pipe-link", "null-link", "latest.csv", "surveys", "nowhere",
		"other.txt", "figure.png", "figs"); len(l) > 0 {
		t.Errorf("files left behind: %v", l)
	}
}

// A link to a regular file is refused: neither the link nor the file it
// points to changes. Links in the folders above a destination are
// followed.
func TestLinkRefused(t *testing.T) {
	dir := t.TempDir()
	target := filepath.Join(dir, "real.csv")
	writeString(t, target, "old\n")
	ln := filepath.Join(dir, "current.csv")
	if err := os.Symlink(target, ln); err != nil {
		t.Skip("symbolic links not available:", err)
	}
	f := New()
	if err := f.Write(ln, text("new\n")); !errors.Is(err, ErrLink) {
		t.Fatalf("write through a link: %v, want ErrLink", err)
	}
	f.Discard()
	if st, err := os.Lstat(ln); err != nil || st.Mode()&os.ModeSymlink == 0 {
		t.Errorf("the link was replaced: %v", err)
	}
	if got := readString(t, target); got != "old\n" {
		t.Errorf("target %q", got)
	}
	sub := filepath.Join(dir, "sub")
	if err := os.Mkdir(sub, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink(sub, filepath.Join(dir, "figs")); err != nil {
		t.Fatal(err)
	}
	f = New()
	if err := f.Write(filepath.Join(dir, "figs", "a.png"), text("png")); err != nil {
		t.Fatal(err)
	}
	if err := f.Commit(); err != nil {
		t.Fatal(err)
	}
	if got := readString(t, filepath.Join(sub, "a.png")); got != "png" {
		t.Errorf("through a linked folder: %q", got)
	}
}

// failRename is a rename that fails for destinations named fail.
func failRename(fail string) func(o, n string) error {
	return func(o, n string) error {
		if filepath.Base(n) == fail {
			return &os.LinkError{Op: "rename", Old: o, New: n, Err: syscall.EPERM}
		}
		return os.Rename(o, n)
	}
}

// A commit is all or nothing: when one destination cannot be replaced
// (here a rename that fails, as onto an immutable file), the files put in
// place before it get their old content back, new ones are removed, and
// no backup or temporary file is left; the error names the destination
// and says nothing was changed.
func TestCommitRollsBack(t *testing.T) {
	dir := t.TempDir()
	report := filepath.Join(dir, "out.csv")
	figs := filepath.Join(dir, "figs")
	if err := os.Mkdir(figs, 0o755); err != nil {
		t.Fatal(err)
	}
	rating, props, section := filepath.Join(figs, "xs-rating.png"), filepath.Join(figs, "xs-properties.png"), filepath.Join(figs, "xs-section.png")
	writeString(t, report, "old report\n")
	writeString(t, rating, "old rating\n")
	writeString(t, props, "old properties\n")
	if err := os.Chmod(report, 0o640); err != nil {
		t.Fatal(err)
	}
	f := New()
	f.rename = failRename("xs-properties.png")
	for _, p := range []string{report, rating, section, props} {
		if err := f.Write(p, text("new\n")); err != nil {
			t.Fatal(err)
		}
	}
	err := f.Commit()
	if !errors.Is(err, ErrCommit) || !strings.Contains(err.Error(), "xs-properties.png") || !errors.Is(err, syscall.EPERM) {
		t.Fatalf("commit: %v, want ErrCommit naming xs-properties.png", err)
	}
	for p, want := range map[string]string{report: "old report\n", rating: "old rating\n", props: "old properties\n"} {
		if got := readString(t, p); got != want {
			t.Errorf("%s holds %q after a failed commit, want %q", p, got, want)
		}
	}
	if st, err := os.Stat(report); err != nil || st.Mode().Perm() != 0o640 {
		t.Errorf("report mode %v (%v), want 0640", st.Mode(), err)
	}
	if _, err := os.Stat(section); !os.IsNotExist(err) {
		t.Errorf("a new figure is left: %v", err)
	}
	if l := leftovers(t, dir, "out.csv", "figs"); len(l) > 0 {
		t.Errorf("files left behind: %v", l)
	}
	if l := leftovers(t, figs, "xs-rating.png", "xs-properties.png"); len(l) > 0 {
		t.Errorf("files left behind in figs: %v", l)
	}
	// The same files commit once nothing stands in the way.
	f = New()
	for _, p := range []string{report, rating} {
		if err := f.Write(p, text("new\n")); err != nil {
			t.Fatal(err)
		}
	}
	if err := f.Commit(); err != nil {
		t.Fatal(err)
	}
	if got := readString(t, rating); got != "new\n" {
		t.Errorf("rating %q", got)
	}
	if l := leftovers(t, figs, "xs-rating.png", "xs-properties.png"); len(l) > 0 {
		t.Errorf("backups left behind: %v", l)
	}
}

// The file standard input is read from is an input: no output replaces
// it, under any name that reaches it.
func TestStdinProtected(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "xs.csv")
	writeString(t, in, "station,elevation\n")
	hard := filepath.Join(dir, "hard.csv")
	if err := os.Link(in, hard); err != nil {
		t.Skip(err)
	}
	st, err := os.Stat(in)
	if err != nil {
		t.Fatal(err)
	}
	f := New()
	f.ProtectStdin(st)
	for _, p := range []string{in, hard, filepath.Join(dir, ".", "xs.csv")} {
		if err := f.Write(p, text("rating")); !errors.Is(err, ErrStdin) {
			t.Errorf("Write(%s) = %v, want ErrStdin", p, err)
		}
	}
	if err := f.Write(filepath.Join(dir, "other.csv"), text("rating")); err != nil {
		t.Errorf("another file: %v", err)
	}
	f.Discard()
	if got := readString(t, in); got != "station,elevation\n" {
		t.Errorf("input changed to %q", got)
	}
}

// WriteNew never replaces a file: an existing one is refused before
// writing, and one that appears before the commit stops it.
func TestWriteNew(t *testing.T) {
	dir := t.TempDir()
	book := filepath.Join(dir, "field.xlsx")
	writeString(t, book, "filled in\n")
	f := New()
	if err := f.CheckNew(book); !errors.Is(err, ErrExists) {
		t.Errorf("CheckNew: %v, want ErrExists", err)
	}
	if err := f.WriteNew(book, text("blank")); !errors.Is(err, ErrExists) {
		t.Errorf("WriteNew: %v, want ErrExists", err)
	}
	f.Discard()
	fresh := filepath.Join(dir, "new.xlsx")
	f = New()
	if err := f.WriteNew(fresh, text("blank")); err != nil {
		t.Fatal(err)
	}
	writeString(t, fresh, "typed meanwhile\n")
	if err := f.Commit(); !errors.Is(err, ErrExists) {
		t.Errorf("commit over a file made meanwhile: %v, want ErrExists", err)
	}
	if got := readString(t, fresh); got != "typed meanwhile\n" {
		t.Errorf("replaced: %q", got)
	}
	os.Remove(fresh)
	f = New()
	if err := f.WriteNew(fresh, text("blank")); err != nil {
		t.Fatal(err)
	}
	if err := f.Commit(); err != nil {
		t.Fatal(err)
	}
	if got := readString(t, fresh); got != "blank" {
		t.Errorf("new file %q", got)
	}
	if l := leftovers(t, dir, "field.xlsx", "new.xlsx"); len(l) > 0 {
		t.Errorf("left behind: %v", l)
	}
}

// Discard while a file is being written (what an interrupt does) leaves
// no temporary file, no output, an existing output as it was, and
// refuses later writes.
func TestDiscardWhileWriting(t *testing.T) {
	for _, existing := range []string{"", "old content\n"} {
		dir := t.TempDir()
		out := filepath.Join(dir, "rating.csv")
		if existing != "" {
			writeString(t, out, existing)
		}
		f := New()
		err := f.Write(out, func(w io.Writer) error {
			io.WriteString(w, "stage,discharge\n")
			if l := leftovers(t, dir, "rating.csv"); len(l) != 1 {
				t.Errorf("want one temporary file while writing, found %v", l)
			}
			f.Discard()
			_, err := io.WriteString(w, "1,2\n")
			return err
		})
		if !errors.Is(err, ErrClosed) {
			t.Errorf("interrupted write: %v, want ErrClosed", err)
		}
		if existing == "" {
			if _, err := os.Stat(out); !os.IsNotExist(err) {
				t.Errorf("an output exists after the interrupt: %v", err)
			}
		} else if got := readString(t, out); got != existing {
			t.Errorf("existing output changed to %q", got)
		}
		if l := leftovers(t, dir, "rating.csv"); len(l) > 0 {
			t.Errorf("files left behind: %v", l)
		}
		if err := f.Write(filepath.Join(dir, "later.csv"), text("")); !errors.Is(err, ErrClosed) {
			t.Errorf("write after Discard: %v, want ErrClosed", err)
		}
	}
}

func TestWrittenTwice(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "a.png")
	f := New()
	defer f.Discard()
	if err := f.Write(out, text("1")); err != nil {
		t.Fatal(err)
	}
	if err := f.Write(out, text("2")); !errors.Is(err, ErrTwice) {
		t.Errorf("second write of one file: %v, want ErrTwice", err)
	}
}

// A path naming one of the process's streams or open files (/dev/stdout,
// /dev/fd/N, /proc/self/fd/N, or a link to one) is refused even when the
// stream is redirected to a regular file: renaming onto it would replace
// that file whole (a log appended to with >>) instead of writing through
// the stream. The file is left as it was.
func TestStreamDestinations(t *testing.T) {
	dir := t.TempDir()
	logPath := filepath.Join(dir, "log.txt")
	if err := os.WriteFile(logPath, []byte("precious\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	lf, err := os.OpenFile(logPath, os.O_WRONLY|os.O_APPEND, 0)
	if err != nil {
		t.Fatal(err)
	}
	defer lf.Close()
	fd := strconv.Itoa(int(lf.Fd()))
	var outs []string
	for _, p := range []string{"/proc/self/fd/" + fd, "/dev/fd/" + fd} {
		if st, err := os.Stat(p); err == nil && st.Mode().IsRegular() {
			outs = append(outs, p)
		}
	}
	if len(outs) == 0 {
		t.Skip("no /proc/self/fd or /dev/fd on this system")
	}
	link := filepath.Join(dir, "out.csv")
	if err := os.Symlink(outs[0], link); err != nil {
		t.Skip("symbolic links not available:", err)
	}
	outs = append(outs, link, "/dev/new-output.csv")
	for _, out := range outs {
		f := New()
		if err := f.Check(out); !errors.Is(err, ErrStream) {
			t.Errorf("Check(%s) = %v, want ErrStream", out, err)
		}
		if err := f.Write(out, text("overwritten")); !errors.Is(err, ErrStream) {
			t.Errorf("Write(%s) = %v, want ErrStream", out, err)
		}
		f.Commit()
	}
	if b, _ := os.ReadFile(logPath); string(b) != "precious\n" {
		t.Errorf("the redirected file holds %q, want it unchanged", b)
	}
	if _, err := os.Lstat(link); err != nil {
		t.Errorf("the link was removed: %v", err)
	}
}

// A Discard that comes while a commit is under way (an interrupt) waits
// for it, and Committed then tells the truth: the new output is in place,
// nothing was dropped. Output written after a commit and discarded is
// told as dropped; a set discarded before any commit as neither.
func TestCommittedTellsWhatWasLeft(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "rating.csv")
	writeString(t, out, "old content\n")
	f := New()
	if err := f.Write(out, text("stage,discharge\n")); err != nil {
		t.Fatal(err)
	}
	discarded := make(chan struct{})
	f.rename = func(o, n string) error {
		go func() { f.Discard(); close(discarded) }()
		time.Sleep(50 * time.Millisecond) // the Discard waits meanwhile
		return os.Rename(o, n)
	}
	if err := f.Commit(); err != nil {
		t.Fatal(err)
	}
	<-discarded
	if c, d := f.Committed(); !c || d {
		t.Errorf("discarded during the commit: committed %v, dropped %v; want true, false", c, d)
	}
	if got := readString(t, out); got != "stage,discharge\n" {
		t.Errorf("the output holds %q, want the new content", got)
	}

	g := New()
	if err := g.Write(out, text("a\n")); err != nil {
		t.Fatal(err)
	}
	if err := g.Commit(); err != nil {
		t.Fatal(err)
	}
	if err := g.Write(filepath.Join(dir, "later.csv"), text("b\n")); err != nil {
		t.Fatal(err)
	}
	g.Discard()
	if c, d := g.Committed(); !c || !d {
		t.Errorf("discarded after a commit and a write: committed %v, dropped %v; want true, true", c, d)
	}

	h := New()
	if err := h.Write(out, text("c\n")); err != nil {
		t.Fatal(err)
	}
	h.Discard()
	if c, _ := h.Committed(); c {
		t.Error("discarded before any commit: committed")
	}
	if got := readString(t, out); got != "a\n" {
		t.Errorf("the output holds %q, want it as it was", got)
	}
	if l := leftovers(t, dir, "rating.csv"); len(l) > 0 {
		t.Errorf("files left behind: %v", l)
	}
}
