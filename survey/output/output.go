package output

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sync/atomic"
)

// ErrWouldOverwriteInput is returned when an output path names an input.
var ErrWouldOverwriteInput = errors.New("refusing to write over an input file")

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

// CheckOutput returns an error when path names one of the inputs.
func CheckOutput(path string, inputs []string) error {
	for _, in := range inputs {
		if in != "" && SamePath(path, in) {
			return fmt.Errorf("%s: %w", path, ErrWouldOverwriteInput)
		}
	}
	return nil
}

// WriteFile writes a file through a temporary file in the same folder that
// is renamed into place only when write returns nil: an error leaves no
// partial file and an existing file at path unchanged. It refuses to write
// over any of inputs.
func WriteFile(path string, inputs []string, write func(io.Writer) error) (err error) {
	if err := CheckOutput(path, inputs); err != nil {
		return err
	}
	tmp, name, err := createTemp(path)
	if err != nil {
		return err
	}
	defer func() {
		UnregisterTemp(name)
		if err != nil {
			tmp.Close()
			os.Remove(name)
		}
	}()
	if err = write(tmp); err != nil {
		return err
	}
	if err = tmp.Sync(); err != nil {
		return err
	}
	if err = tmp.Close(); err != nil {
		return err
	}
	mode := os.FileMode(0o644)
	if st, serr := os.Stat(path); serr == nil {
		mode = st.Mode().Perm()
	}
	if err = os.Chmod(name, mode); err != nil {
		return err
	}
	return os.Rename(name, path)
}

// tempSeq numbers temporary files within this process.
var tempSeq atomic.Uint64

// createTemp creates a new temporary file beside path, registered for
// RemoveTemps in the same step, so an interrupt at any moment leaves
// nothing behind.
func createTemp(path string) (*os.File, string, error) {
	dir, base := filepath.Dir(path), filepath.Base(path)
	for range 100 {
		name := filepath.Join(dir, fmt.Sprintf(".%s.%d-%d.tmp", base, os.Getpid(), tempSeq.Add(1)))
		f, err := openTemp(name)
		if err == nil {
			return f, name, nil
		}
		if !errors.Is(err, fs.ErrExist) {
			return nil, "", err
		}
	}
	return nil, "", fmt.Errorf("%s: cannot create a temporary file beside it", path)
}
