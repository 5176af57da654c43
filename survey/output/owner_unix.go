//go:build unix

package output

import (
	"io/fs"
	"os"
	"syscall"
)

// ownedByMe reports whether the file belongs to the user running the
// program.
func ownedByMe(st fs.FileInfo) bool {
	s, ok := st.Sys().(*syscall.Stat_t)
	return ok && int(s.Uid) == os.Getuid()
}
