package output

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"time"
)

// Causes of a refused output folder, for errors.Is.
var (
	// ErrForeignFolder: the output folder holds an entry that is not an
	// earlier output of the same kind, which replacing it would lose.
	ErrForeignFolder = errors.New("is not an earlier output of this command, and replacing the folder would lose it: give a new or empty folder")
	// ErrBusy: another run is writing the same output folder.
	ErrBusy = errors.New("another wetline run is writing this folder")
	// ErrNotFolder: the output folder's path names a file.
	ErrNotFolder = errors.New("is a file, not a folder")
	// ErrFolderName: a file name inside an output folder is not a plain name.
	ErrFolderName = errors.New("not a plain file name")
)

// Listed reads an output folder's index (the marker file's content) and
// returns the names of the files it lists.
type Listed func(index []byte) ([]string, error)

// Folder is an output folder written whole: its files go into a fresh
// hidden folder beside the destination, which replaces the destination
// when the set is committed. An interrupted or failed run leaves the
// destination as it was. Only a folder that is absent, empty, or an
// earlier output of the same kind is replaced: one holding the marker
// file (its index) and nothing but the regular files the index lists, so
// that replacing it loses nothing but an earlier output. One run at a
// time may write it.
type Folder struct {
	files           *Files
	dest, tmp, lock string
	marker          string
	listed          Listed
	names           map[string]bool
	swapped         bool
}

// Folder starts an output folder at path; marker names the index file
// every output of this kind holds, and listed reads the names of the files
// an index lists (nil: none but the marker). The folder must not hold any
// input; its parent folder must exist (or be one the run may create, see
// MayCreate). A path that is a symbolic link is refused, as replacing it
// would replace the link. Once the folder's lock is held (one left by a
// run that has ended is taken over; one written on another host, a day
// old), the temporary entries ended runs left beside the folder are
// removed (CleanStale).
func (f *Files) Folder(path, marker string, listed Listed) (*Folder, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.closed {
		return nil, ErrClosed
	}
	// "out/" names the folder out: its lock and staged folder go beside
	// it, in the folder above, never inside it.
	path = filepath.Clean(path)
	fail := func(err error) (*Folder, error) { return nil, fmt.Errorf("%s: %w", path, err) }
	for _, in := range f.inputs {
		if in != "" && in != "-" && Inside(in, path) {
			return fail(fmt.Errorf("%w (%s is inside it, and the folder is replaced whole)", ErrInput, in))
		}
	}
	parent, base := filepath.Dir(path), filepath.Base(path)
	if err := f.rulesLocked().checkFolder(parent); err != nil {
		return fail(err)
	}
	d := &Folder{files: f, dest: path, marker: marker, listed: listed,
		lock: filepath.Join(parent, "."+base+".lock"), names: map[string]bool{}}
	if err := d.check(); err != nil {
		return nil, err
	}
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return nil, err
	}
	age, err := takeLock(d.lock)
	if err != nil {
		return fail(err)
	}
	// The lock held, no other run writes this output: what killed runs
	// left beside it goes now (a day on, when the lock taken over was
	// written elsewhere).
	CleanStale(path, age, time.Now())
	f.seq++
	d.tmp = filepath.Join(parent, fmt.Sprintf(".%s.%d-%d.tmpdir", base, os.Getpid(), f.seq))
	if err := os.Mkdir(d.tmp, 0o755); err != nil {
		os.Remove(d.lock)
		return nil, fmt.Errorf("cannot write in %s: %w", parent, err)
	}
	f.folders = append(f.folders, d)
	return d, nil
}

// check accepts an absent folder, an empty one, or an earlier output:
// the marker and nothing but the regular files it lists. The error names
// the folder and its first other entry.
func (d *Folder) check() error {
	fail := func(err error) error { return fmt.Errorf("%s: %w", d.dest, err) }
	st, err := os.Lstat(d.dest)
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		return fail(err)
	}
	if st.Mode()&fs.ModeSymlink != 0 {
		if _, err := os.Stat(d.dest); err != nil {
			return fail(ErrDangling)
		}
		return fail(ErrLink)
	}
	if !st.IsDir() {
		return fail(ErrNotFolder)
	}
	ents, err := os.ReadDir(d.dest)
	if err != nil {
		return fail(err)
	}
	if len(ents) == 0 {
		return nil
	}
	known := map[string]bool{}
	index := "not listed in its " + d.marker
	if m, err := os.Lstat(filepath.Join(d.dest, d.marker)); err != nil || !m.Mode().IsRegular() {
		index = "and no " + d.marker + " lists it"
	} else {
		data, err := os.ReadFile(filepath.Join(d.dest, d.marker))
		if err != nil {
			return fail(err)
		}
		var names []string
		if d.listed != nil {
			names, err = d.listed(data)
		}
		if err != nil {
			// Not an index of this command's: it and everything beside
			// it are someone else's.
			index = "and its " + d.marker + " is not an index this command wrote"
		} else {
			known[d.marker] = true
			for _, n := range names {
				if n != "" && n == filepath.Base(n) {
					known[n] = true
				}
			}
		}
	}
	for _, e := range ents {
		switch {
		case e.IsDir():
			return fail(fmt.Errorf("%s/ (a folder) %w", e.Name(), ErrForeignFolder))
		case !e.Type().IsRegular():
			return fail(fmt.Errorf("%s (not a regular file) %w", e.Name(), ErrForeignFolder))
		case !known[e.Name()]:
			return fail(fmt.Errorf("%s (%s) %w", e.Name(), index, ErrForeignFolder))
		}
	}
	return nil
}

// takeLock creates the lock file holding this process's id and where it
// runs (see here); a lock left by a process that has ended is taken over.
// A lock written elsewhere (another host sharing the disk, another
// process-id namespace) names a process id that says nothing here: it is
// held until it is ScratchAge old. It returns the age from which the
// temporary entries beside the folder are another run's leftovers: 0,
// or ScratchAge once a lock written elsewhere was taken over, as that
// run's own entries cannot be told from a live run's.
func takeLock(lock string) (time.Duration, error) {
	me := here()
	var age time.Duration
	for range 2 {
		lf, err := os.OpenFile(lock, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
		if err == nil {
			_, err = fmt.Fprintln(lf, strings.TrimSpace(fmt.Sprintf("%d %s", os.Getpid(), me)))
			if cerr := lf.Close(); err == nil {
				err = cerr
			}
			return age, err
		}
		if !errors.Is(err, fs.ErrExist) {
			return 0, err
		}
		data, _ := os.ReadFile(lock)
		pid, where, perr := readLock(data)
		switch {
		case perr == nil && where != "" && where != me:
			st, err := os.Lstat(lock)
			if err != nil || time.Since(st.ModTime()) < ScratchAge {
				return 0, fmt.Errorf("%w (process %d on %s; its lock is %s, held until it is a day old)", ErrBusy, pid, where, lock)
			}
			age = ScratchAge
		case perr == nil && alive(pid):
			return 0, fmt.Errorf("%w (process %d; its lock is %s)", ErrBusy, pid, lock)
		}
		os.Remove(lock) // stale: its process has ended
	}
	return 0, fmt.Errorf("%w (lock %s)", ErrBusy, lock)
}

// readLock reads a lock file: the process id, and where the process
// runs ("" in a lock that does not say, taken as this host's).
func readLock(data []byte) (int, string, error) {
	pidText, where, _ := strings.Cut(strings.TrimSpace(string(data)), " ")
	pid, err := strconv.Atoi(pidText)
	return pid, strings.TrimSpace(where), err
}

// here names where this process runs, as a lock records it: the host
// name and, where it can be read, the process-id namespace, so that a
// process id in a lock is trusted only where it was written. A part that
// cannot be told is "?", which no lock written elsewhere matches.
func here() string {
	host, err := os.Hostname()
	if err != nil || host == "" || strings.ContainsAny(host, " \t\n") {
		host = "?"
	}
	if ns, err := os.Readlink("/proc/self/ns/pid"); err == nil && !strings.ContainsAny(ns, " \t\n") {
		return host + " " + ns
	}
	return host
}

// alive reports whether a process with this id runs.
func alive(pid int) bool {
	if pid <= 0 {
		return false
	}
	p, err := os.FindProcess(pid)
	if err != nil {
		return false
	}
	err = p.Signal(syscall.Signal(0))
	return err == nil || errors.Is(err, syscall.EPERM)
}

// Path returns where a file of the folder will be once committed.
func (d *Folder) Path(name string) string { return filepath.Join(d.dest, name) }

// Write writes one file of the folder. Names are plain file names, each
// written once.
func (d *Folder) Write(name string, write func(io.Writer) error) error {
	if name == "" || name != filepath.Base(name) || name == "." || name == ".." {
		return fmt.Errorf("%q: %w", name, ErrFolderName)
	}
	out, err := d.create(name)
	if err != nil {
		return err
	}
	return finish(out, write)
}

// create makes one file of the folder under the set's lock, so that a
// Discard (an interrupt) either comes first, and the file is refused with
// ErrClosed, or finds the file and removes it with the folder.
func (d *Folder) create(name string) (*os.File, error) {
	d.files.mu.Lock()
	defer d.files.mu.Unlock()
	if d.files.closed {
		return nil, ErrClosed
	}
	key := strings.ToLower(name)
	if d.names[key] {
		return nil, fmt.Errorf("%s: %w", d.Path(name), ErrTwice)
	}
	d.names[key] = true
	return os.OpenFile(filepath.Join(d.tmp, name), os.O_RDWR|os.O_CREATE|os.O_EXCL, 0o644)
}

// remove deletes the staged folder and the lock.
func (d *Folder) remove() {
	if !d.swapped {
		os.RemoveAll(d.tmp)
		os.Remove(d.lock)
	}
}
