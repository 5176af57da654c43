package output

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"syscall"
	"time"
)

// Causes of a refused destination, for errors.Is.
var (
	// ErrInput: the destination is one of the run's input files.
	ErrInput = errors.New("refusing to write over an input file")
	// ErrStdin: the destination is the file standard input is read from
	// (a survey redirected with < FILE), an input like any other.
	ErrStdin = errors.New("is the file standard input is read from: refusing to write over an input file")
	// ErrNotRegular: the destination exists and is not a regular file (a
	// device, a pipe, a socket). A command that can write to standard
	// output says so where it is of use.
	ErrNotRegular = errors.New("not a regular file: refusing to write there")
	// ErrLink: the destination is a symbolic link. Renaming onto it would
	// replace the link, and writing through it would replace a file
	// elsewhere, so neither is done.
	ErrLink = errors.New("is a symbolic link: refusing to write through it (name what it points to, or remove the link)")
	// ErrDangling: the destination, or a folder on the way to it, is a
	// symbolic link to nothing.
	ErrDangling = errors.New("is a dangling symbolic link (it points to nothing): remove it or name another path")
	// ErrStream: the destination names one of the process's streams or
	// open files (/dev/stdout, /dev/fd/N, /proc/self/fd/N, or a link to
	// one). Renaming onto it would replace the file the stream is
	// redirected to, whole, instead of writing through the stream.
	ErrStream = errors.New("names a stream of the process (such as /dev/stdout): refusing to write there")
	// ErrFolder: the destination of a file is a folder.
	ErrFolder = errors.New("is a folder: give a file name")
	// ErrReadOnly: the destination is a read-only file.
	ErrReadOnly = errors.New("is read-only: refusing to replace it")
	// ErrExists: the destination of a file that must be new (WriteNew)
	// exists.
	ErrExists = errors.New("already exists and may hold data of yours: it is never replaced; remove it or choose another name")
	// ErrNoFolder: the folder a file is to be written in is not a folder.
	ErrNoFolder = errors.New("the folder to write in is a file")
	// ErrNoParent: the folder a file is to be written in does not exist
	// (and is not one the run may create, see MayCreate).
	ErrNoParent = errors.New("does not exist: create it first, or name a folder that exists")
	// ErrCommit: a destination could not be put in place at Commit; every
	// destination was restored as it was.
	ErrCommit = errors.New("could not be put in place, so no output was changed")
	// ErrClosed: the set was committed or discarded (an interrupt).
	ErrClosed = errors.New("interrupted: no more output is written")
	// ErrTwice: the run writes the same file twice.
	ErrTwice = errors.New("written twice in one run")
)

// Files is the set of files one run writes. Each file is written whole to
// a temporary file beside its destination; Commit puts them all in place
// and Discard removes them. No destination changes before Commit, and
// Commit changes all of them or none, so a run that fails anywhere, or is
// interrupted, leaves every existing file as it was and no partial file
// behind.
//
// Destinations are checked before anything is written: an input file (or
// the file standard input is read from), a folder, a read-only file, a
// symbolic link, or anything that is not a regular file (a device, a pipe)
// is refused. Links in the folders above a destination are followed. A
// file is written only into a folder that exists, or one the run may
// create (MayCreate).
//
// Make a Files with New. It is safe for concurrent use.
type Files struct {
	mu      sync.Mutex
	inputs  []string
	stdin   []fs.FileInfo // the files standard input is read from
	create  []string      // folders the run may create, with folders inside them
	staged  []*staged
	folders []*Folder
	made    []string // folders created for outputs, removed again if empty
	closed  bool
	// committed: a commit put output in place; dropped: a discard
	// removed output written but not yet committed (see Committed).
	committed, dropped bool
	seq                int
	// rename puts a file or folder in place at Commit: os.Rename, or a
	// test's that fails.
	rename func(oldpath, newpath string) error
}

// staged is a file written to its temporary name, waiting for Commit.
type staged struct {
	dest, tmp string
	fresh     bool // the destination must not exist (WriteNew)
}

// New returns an empty set that will never write over inputs.
func New(inputs ...string) *Files {
	return &Files{inputs: append([]string(nil), inputs...), rename: os.Rename}
}

// Protect adds input files that no output may replace.
func (f *Files) Protect(inputs ...string) {
	f.mu.Lock()
	defer f.mu.Unlock()
	f.inputs = append(f.inputs, inputs...)
}

// ProtectStdin adds the file standard input is read from (st, from
// os.Stdin.Stat) to the inputs no output may replace: a survey read from
// standard input redirected from a file. A pipe or a terminal (or a nil
// st) protects nothing, as no output can be one.
func (f *Files) ProtectStdin(st fs.FileInfo) {
	if st == nil || !st.Mode().IsRegular() {
		return
	}
	f.mu.Lock()
	defer f.mu.Unlock()
	f.stdin = append(f.stdin, st)
}

// MayCreate lets the run create folder dir, and folders inside it, for
// its outputs, when the folder dir is in exists. Any other missing folder
// is refused (ErrNoParent). Folders made for a run that fails are removed
// again when empty.
func (f *Files) MayCreate(dir string) {
	f.mu.Lock()
	defer f.mu.Unlock()
	f.create = append(f.create, dir)
}

// rules are what a destination is checked against.
type rules struct {
	inputs, create []string
	stdin          []fs.FileInfo
}

func (f *Files) rulesLocked() rules {
	return rules{inputs: f.inputs, create: f.create, stdin: f.stdin}
}

func (f *Files) rules() rules {
	f.mu.Lock()
	defer f.mu.Unlock()
	return f.rulesLocked()
}

// Check returns an error when path cannot be written: it names an input,
// a folder, a read-only file, a symbolic link, or anything but a regular
// file, or its folder is missing (and may not be created). Errors name
// the path and wrap one of the Err causes.
func (f *Files) Check(path string) error { return f.rules().destination(path, false) }

// CheckNew is Check for a file that must not exist yet (WriteNew).
func (f *Files) CheckNew(path string) error { return f.rules().destination(path, true) }

// destination checks path as the destination of a file; fresh requires
// that nothing is there yet.
func (r rules) destination(path string, fresh bool) error {
	path = filepath.Clean(path)
	fail := func(err error) error { return fmt.Errorf("%s: %w", path, err) }
	for _, in := range r.inputs {
		if in != "" && in != "-" && SamePath(path, in) {
			return fail(ErrInput)
		}
	}
	lst, err := os.Lstat(path)
	if err != nil {
		// Not there, or a file stands where a folder should be.
		if ferr := r.checkFolder(filepath.Dir(path)); ferr != nil {
			return fail(ferr)
		}
		if errors.Is(err, fs.ErrNotExist) {
			if throughStream(path) {
				return fail(ErrStream)
			}
			return nil
		}
		return fail(err)
	}
	if lst.Mode()&fs.ModeSymlink != 0 {
		target, err := os.Stat(path)
		switch {
		case special(path), err == nil && target.Mode().IsRegular() && throughStream(path):
			// /dev/stdout itself, or a link to a file the process's
			// output is redirected to.
			return fail(ErrStream)
		case err != nil && throughStream(path):
			// A link to /dev/stdout when the output is a pipe.
			return fail(ErrStream)
		case err != nil:
			return fail(ErrDangling)
		}
		return fail(ErrLink)
	}
	for _, st := range r.stdin {
		if os.SameFile(st, lst) {
			return fail(ErrStdin)
		}
	}
	switch {
	case lst.IsDir():
		return fail(ErrFolder)
	case !lst.Mode().IsRegular():
		return fail(ErrNotRegular)
	case throughStream(path):
		// A regular file reached through /dev/fd or the like: the file
		// the process's output is redirected to.
		return fail(ErrStream)
	case fresh:
		return fail(ErrExists)
	case lst.Mode().Perm()&0o200 == 0:
		return fail(ErrReadOnly)
	}
	return nil
}

// throughStream reports whether path, or a link on the way from it to the
// file it names, lies in a device or process folder (/dev, /proc), where
// /dev/stdout and /proc/self/fd/1 name whatever the process's output is:
// a terminal, a pipe, or a regular file it was redirected to.
func throughStream(path string) bool {
	p := path
	for hop := 0; hop < 40; hop++ {
		if special(p) {
			return true
		}
		if dir, err := filepath.EvalSymlinks(filepath.Dir(p)); err == nil && special(dir) {
			return true
		}
		st, err := os.Lstat(p)
		if err != nil || st.Mode()&fs.ModeSymlink == 0 {
			return false
		}
		target, err := os.Readlink(p)
		if err != nil {
			return false
		}
		if !filepath.IsAbs(target) {
			target = filepath.Join(filepath.Dir(p), target)
		}
		p = target
	}
	return false
}

// special reports whether path lies in a device or process folder (/dev,
// /proc).
func special(p string) bool {
	abs, err := filepath.Abs(p)
	if err != nil {
		return false
	}
	for _, root := range []string{"/dev", "/proc"} {
		if abs == root || strings.HasPrefix(abs, root+"/") {
			return true
		}
	}
	return false
}

// checkFolder accepts a folder that exists, or a missing one that the
// run may create: the first missing folder on the way to dir is (or lies
// in) a folder given to MayCreate. A file, or a dangling link, standing
// on the way is refused.
func (r rules) checkFolder(dir string) error {
	top := "" // the first missing folder on the way to dir
	for d := dir; ; d = filepath.Dir(d) {
		st, err := os.Stat(d)
		if err == nil {
			if !st.IsDir() {
				return fmt.Errorf("%w (%s)", ErrNoFolder, d)
			}
			if top == "" || r.creatable(top) {
				return nil
			}
			return fmt.Errorf("the folder %s %w", top, ErrNoParent)
		}
		if !errors.Is(err, fs.ErrNotExist) && !errors.Is(err, syscall.ENOTDIR) {
			return err
		}
		if lst, lerr := os.Lstat(d); lerr == nil && lst.Mode()&fs.ModeSymlink != 0 {
			return fmt.Errorf("the folder %s %w", d, ErrDangling)
		}
		top = d
		if next := filepath.Dir(d); next == d {
			return fmt.Errorf("the folder %s %w", top, ErrNoParent)
		}
	}
}

// creatable reports whether the run may create folder dir.
func (r rules) creatable(dir string) bool {
	for _, c := range r.create {
		if c != "" && Inside(dir, c) {
			return true
		}
	}
	return false
}

// Write writes a file through a temporary file beside path. The file
// reaches path only at Commit. write's error, or a refused destination,
// is returned (and nothing of this file is left); the caller should then
// Discard the whole set.
func (f *Files) Write(path string, write func(io.Writer) error) error {
	return f.write(path, false, write)
}

// WriteNew is Write for a file that must not replace anything: an
// existing path is refused (ErrExists), now and at Commit.
func (f *Files) WriteNew(path string, write func(io.Writer) error) error {
	return f.write(path, true, write)
}

func (f *Files) write(path string, fresh bool, write func(io.Writer) error) error {
	// A path is taken as it names a file: "out.csv/" or "a/./b" is the
	// file it cleans to, its temporary file beside that.
	path = filepath.Clean(path)
	f.mu.Lock()
	if f.closed {
		f.mu.Unlock()
		return ErrClosed
	}
	for _, s := range f.staged {
		if SamePath(s.dest, path) {
			f.mu.Unlock()
			return fmt.Errorf("%s: %w", path, ErrTwice)
		}
	}
	r := f.rulesLocked()
	f.mu.Unlock()
	if err := r.destination(path, fresh); err != nil {
		return err
	}
	if err := f.makeFolder(filepath.Dir(path)); err != nil {
		return err
	}
	// No lock keeps other runs from a file as from a folder: only what
	// ended runs left over a day ago is removed (a run elsewhere, on a
	// shared disk, has a process id that does not run here).
	CleanStale(path, ScratchAge, time.Now())
	tmp, entry, err := f.createTemp(path)
	if err != nil {
		return err
	}
	if err := finish(tmp, write); err != nil {
		f.drop(entry)
		return err
	}
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.closed { // discarded while writing: the file is gone already
		os.Remove(entry.tmp)
		return ErrClosed
	}
	entry.dest, entry.fresh = path, fresh
	return nil
}

// finish writes a temporary file whole and closes it.
func finish(tmp *os.File, write func(io.Writer) error) error {
	if err := write(tmp); err != nil {
		tmp.Close()
		return err
	}
	if err := tmp.Sync(); err != nil {
		tmp.Close()
		return err
	}
	return tmp.Close()
}

// makeFolder creates dir (and its parents) when missing, remembering what
// it made.
func (f *Files) makeFolder(dir string) error {
	var missing []string
	for d := dir; ; d = filepath.Dir(d) {
		if _, err := os.Stat(d); err == nil {
			break
		}
		missing = append(missing, d)
		if filepath.Dir(d) == d {
			break
		}
	}
	if len(missing) == 0 {
		return nil
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	f.mu.Lock()
	f.made = append(f.made, missing...) // deepest first
	f.mu.Unlock()
	return nil
}

// tempName names the temporary file of a destination: hidden, beside
// it, marked with the process id.
func tempName(dest string, pid, seq int) string {
	return filepath.Join(filepath.Dir(dest), fmt.Sprintf(".%s.%d-%d.tmp", filepath.Base(dest), pid, seq))
}

// createTemp creates a new temporary file for dest, and its entry in the
// set, under the lock, so that Discard never misses one.
func (f *Files) createTemp(dest string) (*os.File, *staged, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	for range 100 {
		if f.closed {
			return nil, nil, ErrClosed
		}
		f.seq++
		name := tempName(dest, os.Getpid(), f.seq)
		tmp, err := os.OpenFile(name, os.O_RDWR|os.O_CREATE|os.O_EXCL, 0o600)
		if err == nil {
			e := &staged{tmp: name} // dest is set once written whole
			f.staged = append(f.staged, e)
			return tmp, e, nil
		}
		if !errors.Is(err, fs.ErrExist) {
			return nil, nil, fmt.Errorf("cannot write in %s: %w", filepath.Dir(dest), err)
		}
	}
	return nil, nil, fmt.Errorf("%s: cannot create a temporary file beside it", dest)
}

// drop removes a temporary file that failed, and its entry.
func (f *Files) drop(e *staged) {
	f.mu.Lock()
	defer f.mu.Unlock()
	os.Remove(e.tmp)
	for i, s := range f.staged {
		if s == e {
			f.staged = append(f.staged[:i], f.staged[i+1:]...)
			return
		}
	}
}

// Commit puts every written file and folder in place, all or none,
// keeping an existing file's permissions. Destinations are checked once
// more first; a refused one stops the commit before anything changes.
// Then every existing file is backed up beside itself (a hard link, or a
// copy where links cannot be made), the new files and folders are renamed
// in one by one (a folder's old content moved aside first), and the
// backups removed. When a rename fails, every destination already
// replaced gets its backup back and every new one is removed, and the
// error (ErrCommit) names the destination that failed. Any failure
// discards the set. A commit that put anything in place is recorded
// (Committed). After a commit the set takes new files for a later
// commit.
func (f *Files) Commit() error {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.closed {
		return ErrClosed
	}
	var files []*staged
	for _, s := range f.staged {
		if s.dest != "" {
			files = append(files, s)
		}
	}
	r := f.rulesLocked()
	for _, s := range files {
		if err := r.destination(s.dest, s.fresh); err != nil {
			f.discardLocked()
			return err
		}
	}
	for _, d := range f.folders {
		if err := d.check(); err != nil {
			f.discardLocked()
			return err
		}
	}
	var steps []*step
	for _, s := range files {
		mode := os.FileMode(0o644)
		if st, err := os.Stat(s.dest); err == nil {
			mode = st.Mode().Perm()
		}
		if err := os.Chmod(s.tmp, mode); err != nil {
			f.discardLocked()
			return err
		}
		steps = append(steps, &step{dest: s.dest, tmp: s.tmp, file: s})
	}
	for _, d := range f.folders {
		steps = append(steps, &step{dest: d.dest, tmp: d.tmp, folder: d})
	}
	// Back up every existing file: nothing changes yet.
	for _, st := range steps {
		if err := f.backup(st); err != nil {
			for _, b := range steps {
				b.dropBackup()
			}
			f.discardLocked()
			return fmt.Errorf("%s: %w (cannot keep a copy of it: %w)", st.dest, ErrCommit, err)
		}
	}
	for i, st := range steps {
		if err := f.install(st); err != nil {
			kept := ""
			if st.folder != nil && st.backup != "" {
				// The earlier folder, moved aside, could not be put back.
				kept = fmt.Sprintf("; %s could not be restored (%v): its earlier content is kept as %s", st.dest, st.restoreErr, st.backup)
				st.backup = "" // keep it
			}
			for j := i - 1; j >= 0; j-- {
				if rerr := steps[j].undo(f.rename); rerr != nil {
					kept += fmt.Sprintf("; %s could not be restored (%v): its earlier content is kept as %s", steps[j].dest, rerr, steps[j].backup)
					steps[j].backup = "" // keep it
				}
			}
			for _, b := range steps {
				b.dropBackup()
			}
			f.discardLocked()
			if kept != "" {
				return fmt.Errorf("%s: could not be put in place (%w)%s", st.dest, err, kept)
			}
			return fmt.Errorf("%s: %w (%w)", st.dest, ErrCommit, err)
		}
	}
	for _, st := range steps {
		if st.folder != nil && st.backup != "" {
			// The commit is complete: the earlier folder it moved
			// aside is named so before it is removed, and a run
			// killed meanwhile leaves one a later run may remove
			// (".tmpdir.done"; a ".tmpdir.old" is always kept, see
			// CleanStale).
			done := strings.TrimSuffix(st.backup, ".old") + ".done"
			if os.Rename(st.backup, done) == nil {
				st.backup = done
			}
		}
		st.dropBackup()
		if st.folder != nil {
			st.folder.lock.release()
		}
	}
	f.staged, f.folders, f.made = nil, nil, nil
	if len(steps) > 0 {
		f.committed = true
	}
	return nil
}

// Committed reports whether a commit put output in place (committed),
// and whether a discard then removed output written but not committed
// (dropped). An interrupt's Discard waits for a commit under way, so
// that once it returns, these tell what the run left: nothing changed
// (neither), its output whole and in place (committed alone), or what
// was committed in place and the rest removed (both).
func (f *Files) Committed() (committed, dropped bool) {
	f.mu.Lock()
	defer f.mu.Unlock()
	return f.committed, f.dropped
}

// step is one destination of a commit: a file or a folder, the new one
// at tmp, and the backup of what stood at dest.
type step struct {
	dest, tmp string
	file      *staged
	folder    *Folder
	backup    string // the backup of the old file or folder; "" for none
	installed bool
	// restoreErr: why a folder's earlier content, moved aside, could
	// not be put back when the new one failed to go in its place.
	restoreErr error
}

// backup keeps what stands at a file's destination beside it, as a hard
// link (or a copy), leaving the destination as it is. A folder's old
// content is moved aside only when it is replaced (install).
func (f *Files) backup(st *step) error {
	if st.folder != nil {
		return nil
	}
	lst, err := os.Lstat(st.dest)
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		return err
	}
	f.seq++
	bak := filepath.Join(filepath.Dir(st.dest), fmt.Sprintf(".%s.%d-%d.bak", filepath.Base(st.dest), os.Getpid(), f.seq))
	if err := os.Link(st.dest, bak); err != nil {
		if err := copyFile(st.dest, bak, lst.Mode().Perm()); err != nil {
			os.Remove(bak)
			return err
		}
	}
	st.backup = bak
	return nil
}

// copyFile copies a regular file whole to a new file.
func copyFile(from, to string, mode os.FileMode) error {
	in, err := os.Open(from)
	if err != nil {
		return err
	}
	defer in.Close()
	out, err := os.OpenFile(to, os.O_RDWR|os.O_CREATE|os.O_EXCL, mode)
	if err != nil {
		return err
	}
	return finish(out, func(w io.Writer) error { _, err := io.Copy(w, in); return err })
}

// install puts one new file or folder in place.
func (f *Files) install(st *step) error {
	if st.file != nil {
		if st.file.fresh {
			// Never over a file that appeared since the check: a hard
			// link fails where anything stands.
			if err := os.Link(st.tmp, st.dest); err == nil {
				os.Remove(st.tmp)
				st.file.tmp, st.installed = "", true
				return nil
			} else if errors.Is(err, fs.ErrExist) {
				return fmt.Errorf("%w", ErrExists)
			}
		}
		if err := f.rename(st.tmp, st.dest); err != nil {
			return err
		}
		st.file.tmp, st.installed = "", true
		return nil
	}
	if _, err := os.Lstat(st.dest); err == nil {
		old := st.tmp + ".old"
		if err := f.rename(st.dest, old); err != nil {
			return err
		}
		st.backup = old
	}
	if err := f.rename(st.tmp, st.dest); err != nil {
		if st.backup != "" {
			if st.restoreErr = f.rename(st.backup, st.dest); st.restoreErr == nil {
				st.backup = ""
			}
		}
		return err
	}
	st.installed, st.folder.swapped = true, true
	return nil
}

// undo puts back what stood at an installed destination, with rename
// (Files.rename).
func (st *step) undo(rename func(oldpath, newpath string) error) error {
	if !st.installed {
		return nil
	}
	if st.folder != nil {
		// The new folder goes back to its temporary name, for Discard.
		if err := rename(st.dest, st.tmp); err != nil {
			return err
		}
		st.folder.swapped = false
	} else if st.backup == "" {
		return os.Remove(st.dest)
	}
	if st.backup == "" {
		return nil
	}
	if err := rename(st.backup, st.dest); err != nil {
		return err
	}
	st.backup = ""
	return nil
}

// dropBackup removes a step's backup, if any.
func (st *step) dropBackup() {
	if st.backup != "" {
		os.RemoveAll(st.backup)
		st.backup = ""
	}
}

// Discard removes every temporary file and staged folder, and the folders
// made for them when they are empty; nothing more can be written. It is
// what an interrupt calls, and safe to call more than once.
func (f *Files) Discard() {
	f.mu.Lock()
	defer f.mu.Unlock()
	f.discardLocked()
}

func (f *Files) discardLocked() {
	f.closed = true
	if len(f.staged) > 0 || len(f.folders) > 0 {
		f.dropped = true
	}
	for _, s := range f.staged {
		if s.tmp != "" {
			os.Remove(s.tmp)
		}
	}
	for _, d := range f.folders {
		d.remove()
	}
	for _, d := range f.made {
		os.Remove(d) // only succeeds when empty
	}
	f.staged, f.folders, f.made = nil, nil, nil
}

// SamePath reports whether two paths name the same file, after resolving
// links. A path that does not exist yet is compared by its absolute form.
func SamePath(a, b string) bool {
	if ia, err := os.Stat(a); err == nil {
		if ib, err := os.Stat(b); err == nil {
			return os.SameFile(ia, ib)
		}
	}
	return canonical(a) == canonical(b)
}

func canonical(p string) string {
	if r, err := filepath.EvalSymlinks(p); err == nil {
		p = r
	} else if dir, err := filepath.EvalSymlinks(filepath.Dir(p)); err == nil {
		p = filepath.Join(dir, filepath.Base(p))
	}
	if abs, err := filepath.Abs(p); err == nil {
		return abs
	}
	return filepath.Clean(p)
}

// Inside reports whether path lies inside folder dir (after resolving
// links), or is dir itself.
func Inside(path, dir string) bool {
	p, d := canonical(path), canonical(dir)
	return p == d || strings.HasPrefix(p, d+string(filepath.Separator))
}
