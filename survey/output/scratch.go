package output

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"time"
)

// ScratchPrefix starts the name of a run's scratch folder, followed by
// the process id, a dash and a random part; ScratchMark is the file inside
// that marks the folder as wetline's own.
const (
	ScratchPrefix = "wetline-scratch-"
	ScratchMark   = ".wetline-scratch"
)

// ScratchAge is how long a scratch folder of a run that ended is kept
// before a later run removes it (CleanScratch): a killed run cannot remove
// its own.
const ScratchAge = 24 * time.Hour

// NewScratch makes a private scratch folder for one run in dir (""
// for the system's temporary folder), marked with ScratchMark, and
// returns its path. The run removes it when it ends.
func NewScratch(dir string) (string, error) {
	d, err := os.MkdirTemp(dir, fmt.Sprintf("%s%d-", ScratchPrefix, os.Getpid()))
	if err != nil {
		return "", fmt.Errorf("cannot make a temporary folder: %w", err)
	}
	if err := os.WriteFile(filepath.Join(d, ScratchMark), nil, 0o600); err != nil {
		os.RemoveAll(d)
		return "", fmt.Errorf("cannot make a temporary folder: %w", err)
	}
	return d, nil
}

// CleanScratch removes the scratch folders in dir ("" for the system's
// temporary folder) that earlier runs left behind when they were killed:
// only a folder (not a link) named ScratchPrefix + PID + "-…", holding
// ScratchMark, owned by this user, unchanged for longer than age before
// now, and whose process no longer runs. It returns the folders removed;
// anything it cannot read is left alone.
func CleanScratch(dir string, age time.Duration, now time.Time) []string {
	if dir == "" {
		dir = os.TempDir()
	}
	ents, err := os.ReadDir(dir)
	if err != nil {
		return nil
	}
	var removed []string
	for _, e := range ents {
		rest, ok := strings.CutPrefix(e.Name(), ScratchPrefix)
		if !ok || !e.IsDir() {
			continue
		}
		pidText, _, ok := strings.Cut(rest, "-")
		pid, err := strconv.Atoi(pidText)
		if !ok || err != nil || alive(pid) {
			continue
		}
		path := filepath.Join(dir, e.Name())
		st, err := os.Lstat(path)
		if err != nil || !st.IsDir() || now.Sub(st.ModTime()) < age || !ownedByMe(st) {
			continue
		}
		if m, err := os.Lstat(filepath.Join(path, ScratchMark)); err != nil || !m.Mode().IsRegular() {
			continue
		}
		if err := os.RemoveAll(path); err == nil || errors.Is(err, fs.ErrNotExist) {
			removed = append(removed, path)
		}
	}
	return removed
}
