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
)

// Causes of a refused destination, for errors.Is.
var (
	// ErrInput: the destination is one of the run's input files.
	ErrInput = errors.New("refusing to write over an input file")
	// ErrNotRegular: the destination exists and is not a regular file (a
	// device, a pipe, a socket, or a link to one).
	ErrNotRegular = errors.New("not a regular file: refusing to write there (write to standard output with -o - instead)")
	// ErrStream: the destination names one of the process's streams or
	// open files (/dev/stdout, /dev/fd/N, /proc/self/fd/N, or a link to
	// one). Renaming onto it would replace the file the stream is
	// redirected to, whole, instead of writing through the stream.
	ErrStream = errors.New("names a stream of the process (such as /dev/stdout): refusing to write there (write to standard output with -o - instead)")
	// ErrFolder: the destination of a file is a folder.
	ErrFolder = errors.New("is a folder: give a file name")
	// ErrReadOnly: the destination is a read-only file.
	ErrReadOnly = errors.New("is read-only: refusing to replace it")
	// ErrNoFolder: the folder a file is to be written in is not a folder.
	ErrNoFolder = errors.New("the folder to write in is a file")
	// ErrClosed: the set was committed or discarded (an interrupt).
	ErrClosed = errors.New("interrupted: no more output is written")
	// ErrTwice: the run writes the same file twice.
	ErrTwice = errors.New("written twice in one run")
)

// Files is the set of files one run writes. Each file is written whole to
// a temporary file beside its destination; Commit renames them all into
// place and Discard removes them. No destination changes before Commit, so
// a run that fails anywhere, or is interrupted, leaves every existing file
// as it was and no partial file behind.
//
// Destinations are checked before anything is written: an input file, a
// folder, a read-only file or anything that is not a regular file (a
// device, a pipe, a link to one) is refused. A link to a regular file is
// followed: the file it names is replaced and the link kept.
//
// Make a Files with New. It is safe for concurrent use.
type Files struct {
	mu      sync.Mutex
	inputs  []string
	staged  []*staged
	folders []*Folder
	made    []string // folders created for outputs, removed again if empty
	closed  bool
	seq     int
}

// staged is a file written to its temporary name, waiting for Commit.
type staged struct {
	dest, tmp string
}

// New returns an empty set that will never write over inputs.
func New(inputs ...string) *Files {
	return &Files{inputs: append([]string(nil), inputs...)}
}

// Protect adds input files that no output may replace.
func (f *Files) Protect(inputs ...string) {
	f.mu.Lock()
	defer f.mu.Unlock()
	f.inputs = append(f.inputs, inputs...)
}

// Check returns an error when path cannot be written: it names an input,
// a folder, a read-only file, or anything but a regular file. A path
// that does not exist yet is fine when its folder exists or can be made.
// Errors name the path and wrap one of the Err causes.
func (f *Files) Check(path string) error {
	f.mu.Lock()
	inputs := f.inputs
	f.mu.Unlock()
	_, err := destination(path, inputs)
	return err
}

// destination resolves path (following a link to a regular file) and
// checks it; it returns the path to rename onto.
func destination(path string, inputs []string) (string, error) {
	fail := func(err error) (string, error) { return "", fmt.Errorf("%s: %w", path, err) }
	for _, in := range inputs {
		if in != "" && in != "-" && SamePath(path, in) {
			return fail(ErrInput)
		}
	}
	lst, err := os.Lstat(path)
	if err != nil {
		// Not there, or a file stands where a folder should be.
		if ferr := checkFolder(filepath.Dir(path)); ferr != nil {
			return fail(ferr)
		}
		if errors.Is(err, fs.ErrNotExist) {
			if throughStream(path) {
				return fail(ErrStream)
			}
			return path, nil
		}
		return fail(err)
	}
	dest := path
	st := lst
	if lst.Mode()&fs.ModeSymlink != 0 {
		target, err := filepath.EvalSymlinks(path)
		if err != nil {
			if throughStream(path) {
				// /dev/stdout when the output is a pipe or a terminal.
				return fail(ErrStream)
			}
			return fail(fmt.Errorf("a link to nothing: %w", ErrNotRegular))
		}
		if st, err = os.Stat(target); err != nil {
			return fail(err)
		}
		dest = target
	}
	switch {
	case st.IsDir():
		return fail(ErrFolder)
	case !st.Mode().IsRegular():
		return fail(ErrNotRegular)
	case st.Mode().Perm()&0o200 == 0:
		return fail(ErrReadOnly)
	case throughStream(path):
		// A regular file reached through /dev/stdout or the like: the
		// file the process's output is redirected to.
		return fail(ErrStream)
	}
	return dest, nil
}

// throughStream reports whether path, or a link on the way from it to the
// file it names, lies in a device or process folder (/dev, /proc), where
// /dev/stdout and /proc/self/fd/1 name whatever the process's output is:
// a terminal, a pipe, or a regular file it was redirected to.
func throughStream(path string) bool {
	special := func(p string) bool {
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

// checkFolder accepts a folder that exists, or a path none of whose
// existing ancestors is a file.
func checkFolder(dir string) error {
	for d := dir; ; d = filepath.Dir(d) {
		st, err := os.Stat(d)
		if err == nil {
			if !st.IsDir() {
				return fmt.Errorf("%w (%s)", ErrNoFolder, d)
			}
			return nil
		}
		if !errors.Is(err, fs.ErrNotExist) && !errors.Is(err, syscall.ENOTDIR) {
			return err
		}
		if next := filepath.Dir(d); next == d {
			return nil
		}
	}
}

// Write writes a file through a temporary file beside path. The file
// reaches path only at Commit. write's error, or a refused destination,
// is returned (and nothing of this file is left); the caller should then
// Discard the whole set.
func (f *Files) Write(path string, write func(io.Writer) error) error {
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
	inputs := f.inputs
	f.mu.Unlock()
	dest, err := destination(path, inputs)
	if err != nil {
		return err
	}
	if err := f.makeFolder(filepath.Dir(dest)); err != nil {
		return err
	}
	tmp, entry, err := f.createTemp(dest)
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
	entry.dest = dest
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

// Commit renames every written file into place, in the order written,
// keeping an existing file's permissions, then swaps in every folder.
// Destinations are checked once more first; a refused one stops the
// commit before anything is renamed, and discards the set. After a
// commit the set takes new files for a later commit.
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
	for _, s := range files {
		if _, err := destination(s.dest, f.inputs); err != nil {
			f.discardLocked()
			return err
		}
	}
	for _, s := range files {
		mode := os.FileMode(0o644)
		if st, err := os.Stat(s.dest); err == nil {
			mode = st.Mode().Perm()
		}
		if err := os.Chmod(s.tmp, mode); err != nil {
			f.discardLocked()
			return err
		}
		if err := os.Rename(s.tmp, s.dest); err != nil {
			f.discardLocked()
			return err
		}
		s.tmp = ""
	}
	for _, d := range f.folders {
		if err := d.swap(); err != nil {
			f.discardLocked()
			return err
		}
	}
	f.staged, f.folders, f.made = nil, nil, nil
	return nil
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
