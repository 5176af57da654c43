package output

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync/atomic"
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
	files     *Files
	dest, tmp string
	lock      *folderLock
	marker    string
	listed    Listed
	names     map[string]bool
	swapped   bool
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
	d := &Folder{files: f, dest: path, marker: marker, listed: listed, names: map[string]bool{}}
	if err := d.check(); err != nil {
		return nil, err
	}
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return nil, err
	}
	lock, err := takeLock(path)
	if err != nil {
		return fail(err)
	}
	d.lock = lock
	// The lock held, no other run writes this output: what killed runs
	// left beside it goes now (a day on, when the lock taken over was
	// written elsewhere).
	CleanStale(path, lock.age, time.Now())
	f.seq++
	d.tmp = filepath.Join(parent, fmt.Sprintf(".%s.%d-%d.tmpdir", base, os.Getpid(), f.seq))
	if err := os.Mkdir(d.tmp, 0o755); err != nil {
		lock.release()
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

// LockGrace is how long a lock that cannot be read (empty, or not one
// this package writes) is taken as held: a lock is written whole before
// it is put in place, but where hard links cannot be made it is created
// first and written after, and a moment empty. Older than this, such a
// lock is taken as a stale one.
const LockGrace = time.Minute

// lockRefresh is how often the time of a held lock is renewed as the
// folder's files are written, so that a long run is not taken for an
// ended one where its lock is judged by its age (a lock written on
// another host).
const lockRefresh = time.Minute

// lockSeq numbers the entries a lock is written and taken over through,
// unique within the process.
var lockSeq atomic.Int64

// folderLock is the lock a run holds on an output folder.
type folderLock struct {
	path    string
	info    fs.FileInfo // the lock file this run made
	touched time.Time   // when its time was last renewed
	age     time.Duration
}

// takeLock creates the lock file of the output folder dest, holding this
// process's id and where it runs (see here); a lock left by a process
// that has ended is taken over. A lock written elsewhere (another host
// sharing the disk, another process-id namespace) names a process id
// that says nothing here: it is held until it is ScratchAge old. A lock
// that cannot be read is held until it is LockGrace old. The lock's age
// from which the temporary entries beside the folder are another run's
// leftovers is 0, or ScratchAge once a lock written elsewhere (or one
// that cannot be read) was taken over, as that run's own entries cannot
// be told from a live run's.
//
// The lock is written whole under a name of its own (".NAME.PID-N.lock")
// and linked in place, which never replaces a file. A stale lock is
// taken over by renaming it aside to a name of this run's own
// (".NAME.PID-N.lock.old"): of runs taking over the same lock at once,
// only one rename succeeds. The one renamed aside is checked to be the
// very lock judged stale; when it is not (another run took the stale
// lock over and made its own in between), it is linked back in place.
func takeLock(dest string) (*folderLock, error) {
	parent, base := filepath.Dir(dest), filepath.Base(dest)
	lock := filepath.Join(parent, "."+base+".lock")
	own := func(kind string) string {
		return filepath.Join(parent, fmt.Sprintf(".%s.%d-%d.%s", base, os.Getpid(), lockSeq.Add(1), kind))
	}
	me := here()
	content := []byte(strings.TrimSpace(fmt.Sprintf("%d %s", os.Getpid(), me)) + "\n")
	fresh := own("lock")
	if err := writeLock(fresh, content); err != nil {
		return nil, err
	}
	defer os.Remove(fresh)
	var age time.Duration
	for range 10 {
		err := os.Link(fresh, lock)
		if err != nil && !errors.Is(err, fs.ErrExist) {
			// No hard links here: the lock is created in place, and
			// is empty for a moment (LockGrace).
			err = writeLock(lock, content)
		}
		if err == nil {
			st, err := os.Lstat(lock)
			if err != nil {
				return nil, err
			}
			return &folderLock{path: lock, info: st, touched: time.Now(), age: age}, nil
		}
		if !errors.Is(err, fs.ErrExist) {
			return nil, err
		}
		data, rerr := os.ReadFile(lock)
		st, serr := os.Lstat(lock)
		if errors.Is(rerr, fs.ErrNotExist) || errors.Is(serr, fs.ErrNotExist) {
			continue // released meanwhile
		}
		if rerr != nil {
			return nil, rerr
		}
		if serr != nil {
			return nil, serr
		}
		after, err := staleLock(lock, data, st, me, time.Now())
		if err != nil {
			return nil, err
		}
		aside := own("lock.old")
		if err := os.Rename(lock, aside); err != nil {
			if errors.Is(err, fs.ErrNotExist) {
				continue // another run moved it first
			}
			return nil, err
		}
		moved, rerr := os.ReadFile(aside)
		mst, serr := os.Lstat(aside)
		if rerr == nil && serr == nil && os.SameFile(st, mst) && bytes.Equal(moved, data) {
			// The stale lock itself: it goes, and the next turn puts
			// this run's in its place.
			os.Remove(aside)
			age = max(age, after)
			continue
		}
		// Another run's lock, made since the stale one was read: back
		// in place (a link, which never replaces a lock made since).
		if err := os.Link(aside, lock); err != nil && !errors.Is(err, fs.ErrExist) {
			os.Rename(aside, lock)
		}
		os.Remove(aside)
	}
	return nil, fmt.Errorf("%w (lock %s)", ErrBusy, lock)
}

// staleLock judges a lock another run holds, read as data with its
// file's st: an error (ErrBusy) while it is held, or else the age from
// which the entries beside the folder are leftovers (see takeLock).
func staleLock(lock string, data []byte, st fs.FileInfo, me string, now time.Time) (time.Duration, error) {
	pid, where, err := readLock(data)
	switch {
	case err != nil:
		if now.Sub(st.ModTime()) < LockGrace {
			return 0, fmt.Errorf("%w (its lock %s does not say which process holds it, and is taken as held until it is a minute old)", ErrBusy, lock)
		}
		return ScratchAge, nil
	case where != "" && where != me:
		if now.Sub(st.ModTime()) < ScratchAge {
			return 0, fmt.Errorf("%w (process %d on %s; its lock is %s, held until it is a day old)", ErrBusy, pid, where, lock)
		}
		return ScratchAge, nil
	case alive(pid):
		return 0, fmt.Errorf("%w (process %d; its lock is %s)", ErrBusy, pid, lock)
	}
	return 0, nil // its process has ended
}

// writeLock creates a new lock file holding content.
func writeLock(path string, content []byte) error {
	lf, err := os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
	if err != nil {
		return err
	}
	_, err = lf.Write(content)
	if cerr := lf.Close(); err == nil {
		err = cerr
	}
	if err != nil {
		os.Remove(path)
	}
	return err
}

// mine reports whether the lock file is still the one this run made.
func (l *folderLock) mine() bool {
	st, err := os.Lstat(l.path)
	return err == nil && os.SameFile(st, l.info)
}

// touch renews the time of the lock, at most once every lockRefresh.
func (l *folderLock) touch(now time.Time) {
	if now.Sub(l.touched) < lockRefresh || !l.mine() {
		return
	}
	if os.Chtimes(l.path, now, now) == nil {
		l.touched = now
	}
}

// release removes the lock, while it is this run's.
func (l *folderLock) release() {
	if l.mine() {
		os.Remove(l.path)
	}
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
	d.lock.touch(time.Now())
	return os.OpenFile(filepath.Join(d.tmp, name), os.O_RDWR|os.O_CREATE|os.O_EXCL, 0o644)
}

// remove deletes the staged folder, unless it was swapped in and could
// not be swapped back out, and the lock.
func (d *Folder) remove() {
	if !d.swapped {
		os.RemoveAll(d.tmp)
	}
	d.lock.release()
}
