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
)

// Causes of a refused output folder, for errors.Is.
var (
	// ErrForeignFolder: the output folder holds files that are not an
	// earlier output of the same kind, which replacing it would lose.
	ErrForeignFolder = errors.New("holds files that are not an earlier output of this command: give a new or empty folder")
	// ErrBusy: another run is writing the same output folder.
	ErrBusy = errors.New("another wetline run is writing this folder")
	// ErrNotFolder: the output folder's path names a file.
	ErrNotFolder = errors.New("is a file, not a folder")
	// ErrFolderName: a file name inside an output folder is not a plain name.
	ErrFolderName = errors.New("not a plain file name")
)

// Folder is an output folder written whole: its files go into a fresh
// hidden folder beside the destination, which replaces the destination
// when the set is committed. An interrupted or failed run leaves the
// destination as it was. Only a folder that is absent, empty, or an
// earlier output of the same kind (holding the marker file) is replaced,
// and one run at a time may write it.
type Folder struct {
	files           *Files
	dest, tmp, lock string
	names           map[string]bool
	swapped         bool
}

// Folder starts an output folder at path; marker names the file every
// output of this kind holds (an index, say), which marks an existing
// folder as safe to replace. The folder must not hold any input.
func (f *Files) Folder(path, marker string) (*Folder, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.closed {
		return nil, ErrClosed
	}
	fail := func(err error) (*Folder, error) { return nil, fmt.Errorf("%s: %w", path, err) }
	for _, in := range f.inputs {
		if in != "" && in != "-" && Inside(in, path) {
			return fail(fmt.Errorf("%w (%s is inside it, and the folder is replaced whole)", ErrInput, in))
		}
	}
	parent, base := filepath.Dir(path), filepath.Base(path)
	if err := checkFolder(parent); err != nil {
		return fail(err)
	}
	if err := checkReplaceable(path, marker); err != nil {
		return fail(err)
	}
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return nil, err
	}
	d := &Folder{files: f, dest: path, lock: filepath.Join(parent, "."+base+".lock"), names: map[string]bool{}}
	if err := takeLock(d.lock); err != nil {
		return fail(err)
	}
	f.seq++
	d.tmp = filepath.Join(parent, fmt.Sprintf(".%s.%d-%d.tmpdir", base, os.Getpid(), f.seq))
	if err := os.Mkdir(d.tmp, 0o755); err != nil {
		os.Remove(d.lock)
		return nil, fmt.Errorf("cannot write in %s: %w", parent, err)
	}
	f.folders = append(f.folders, d)
	return d, nil
}

// checkReplaceable accepts an absent folder, an empty one, or one holding
// marker.
func checkReplaceable(path, marker string) error {
	st, err := os.Lstat(path)
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		return err
	}
	if !st.IsDir() {
		return ErrNotFolder
	}
	ents, err := os.ReadDir(path)
	if err != nil {
		return err
	}
	if len(ents) == 0 {
		return nil
	}
	if m, err := os.Stat(filepath.Join(path, marker)); err == nil && m.Mode().IsRegular() {
		return nil
	}
	return ErrForeignFolder
}

// takeLock creates the lock file holding this process's id; a lock left
// by a process that has ended is taken over.
func takeLock(lock string) error {
	for range 2 {
		lf, err := os.OpenFile(lock, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
		if err == nil {
			_, err = fmt.Fprintf(lf, "%d\n", os.Getpid())
			if cerr := lf.Close(); err == nil {
				err = cerr
			}
			return err
		}
		if !errors.Is(err, fs.ErrExist) {
			return err
		}
		data, _ := os.ReadFile(lock)
		pid, perr := strconv.Atoi(strings.TrimSpace(string(data)))
		if perr == nil && alive(pid) {
			return fmt.Errorf("%w (process %d; its lock is %s)", ErrBusy, pid, lock)
		}
		os.Remove(lock) // stale: its process has ended
	}
	return fmt.Errorf("%w (lock %s)", ErrBusy, lock)
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
	d.files.mu.Lock()
	closed := d.files.closed
	d.files.mu.Unlock()
	if closed {
		return ErrClosed
	}
	key := strings.ToLower(name)
	if d.names[key] {
		return fmt.Errorf("%s: %w", d.Path(name), ErrTwice)
	}
	d.names[key] = true
	out, err := os.OpenFile(filepath.Join(d.tmp, name), os.O_RDWR|os.O_CREATE|os.O_EXCL, 0o644)
	if err != nil {
		return err
	}
	return finish(out, write)
}

// swap puts the staged folder in place of the destination.
func (d *Folder) swap() error {
	defer os.Remove(d.lock)
	old := ""
	if _, err := os.Lstat(d.dest); err == nil {
		old = d.tmp + ".old"
		if err := os.Rename(d.dest, old); err != nil {
			return err
		}
	}
	if err := os.Rename(d.tmp, d.dest); err != nil {
		if old != "" {
			os.Rename(old, d.dest)
		}
		return err
	}
	d.swapped = true
	if old != "" {
		return os.RemoveAll(old)
	}
	return nil
}

// remove deletes the staged folder and the lock.
func (d *Folder) remove() {
	if !d.swapped {
		os.RemoveAll(d.tmp)
		os.Remove(d.lock)
	}
}
