package output

import (
	"io/fs"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"time"
)

// stalePart matches what follows "." + an output's name + "." in the
// names of the temporary entries a run makes beside that output: the
// process id, a dash, a sequence number, and the kind (see tempName,
// Files.Folder, Files.backup, install, Commit and takeLock).
var stalePart = regexp.MustCompile(`^([0-9]+)-[0-9]+\.(tmp|bak|tmpdir|tmpdir\.old|tmpdir\.done|lock|lock\.old)$`)

// CleanStale removes the temporary entries that killed runs left beside
// the output dest: only names of the forms this package makes ("." + the
// output's name + ".PID-N" + ".tmp", ".bak", ".tmpdir", ".tmpdir.done",
// ".lock" or ".lock.old"), not links, owned by this user, of a process
// that no longer runs, and unchanged for at least age before now. A
// backup (".bak") is removed only while it is still the file at dest (the
// hard link a commit makes first), since otherwise it may be the one copy
// of the earlier content. A folder (".tmpdir", a staged output folder, or
// ".tmpdir.done", an earlier output moved aside by a commit that put the
// new one in place whole) is removed only when it holds nothing but
// regular files, as such a folder does. A lock's content written before
// it is put in place (".lock") and a stale lock moved aside (".lock.old")
// are removed when they are regular files. An earlier output moved aside
// by a commit that did not complete (".tmpdir.old": the run was killed
// during it, or a failed commit could not put it back and said where it
// is kept) may be the one copy of that output, whether dest is there or
// not, and is never removed. It returns the paths removed; anything it
// cannot read is left alone.
func CleanStale(dest string, age time.Duration, now time.Time) []string {
	parent, base := filepath.Dir(dest), filepath.Base(dest)
	ents, err := os.ReadDir(parent)
	if err != nil {
		return nil
	}
	var removed []string
	for _, e := range ents {
		rest, ok := strings.CutPrefix(e.Name(), "."+base+".")
		if !ok {
			continue
		}
		m := stalePart.FindStringSubmatch(rest)
		if m == nil {
			continue
		}
		pid, err := strconv.Atoi(m[1])
		if err != nil || pid == os.Getpid() || alive(pid) {
			continue
		}
		path := filepath.Join(parent, e.Name())
		st, err := os.Lstat(path)
		if err != nil || now.Sub(st.ModTime()) < age || !ownedByMe(st) {
			continue
		}
		switch kind := m[2]; kind {
		case "tmpdir.old":
			continue
		case "tmp", "lock", "lock.old":
			if !st.Mode().IsRegular() || os.Remove(path) != nil {
				continue
			}
		case "bak":
			// A backup is a hard link to the output made before the
			// commit changed anything (Files.backup): while it is still
			// the output itself, it holds nothing the output does not.
			// Once the output was replaced, or when it is a copy or the
			// output is missing, it may be the one copy of the earlier
			// content, and stays.
			if !st.Mode().IsRegular() || !sameAsDest(st, dest) || os.Remove(path) != nil {
				continue
			}
		default:
			if !st.IsDir() || !onlyFiles(path) {
				continue
			}
			if err := os.RemoveAll(path); err != nil {
				continue
			}
		}
		removed = append(removed, path)
	}
	return removed
}

// sameAsDest reports whether st is the file at dest itself (a hard link
// to it).
func sameAsDest(st fs.FileInfo, dest string) bool {
	d, err := os.Lstat(dest)
	return err == nil && d.Mode().IsRegular() && os.SameFile(st, d)
}

// onlyFiles reports whether folder dir holds nothing but regular files
// owned by this user.
func onlyFiles(dir string) bool {
	ents, err := os.ReadDir(dir)
	if err != nil {
		return false
	}
	for _, e := range ents {
		if !e.Type().IsRegular() {
			return false
		}
		info, err := e.Info()
		if err != nil || info.Mode()&fs.ModeType != 0 || !ownedByMe(info) {
			return false
		}
	}
	return true
}
