package output

import (
	"errors"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
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

// TestWriteFileErrorMidWrite: a writer failing after part of its output
// leaves neither a partial file nor a temporary file, and an existing
// output keeps its content.
func TestWriteFileErrorMidWrite(t *testing.T) {
	boom := errors.New("disk on fire")
	halfThenFail := func(w io.Writer) error {
		if _, err := io.WriteString(w, "stage,discharge\n1,2\n"); err != nil {
			return err
		}
		return boom
	}
	tests := []struct {
		name     string
		existing string // "" for no file before
	}{
		{"new file", ""},
		{"existing file", "old content\n"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			dir := t.TempDir()
			out := filepath.Join(dir, "rating.csv")
			if tt.existing != "" {
				writeString(t, out, tt.existing)
			}
			err := WriteFile(out, nil, halfThenFail)
			if !errors.Is(err, boom) {
				t.Fatalf("err = %v, want the writer's error", err)
			}
			if tt.existing == "" {
				if _, err := os.Stat(out); !os.IsNotExist(err) {
					t.Errorf("a partial output exists: %v", err)
				}
			} else if got := readString(t, out); got != tt.existing {
				t.Errorf("existing output changed to %q", got)
			}
			if l := leftovers(t, dir, "rating.csv"); len(l) > 0 {
				t.Errorf("files left behind: %v", l)
			}
		})
	}
}

// TestWriteFileReplaces: a successful write replaces the file whole and
// keeps its permissions.
func TestWriteFileReplaces(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "rating.csv")
	writeString(t, out, "old\n")
	if err := os.Chmod(out, 0o600); err != nil {
		t.Fatal(err)
	}
	if err := WriteFile(out, nil, func(w io.Writer) error {
		_, err := io.WriteString(w, "new\n")
		return err
	}); err != nil {
		t.Fatal(err)
	}
	if got := readString(t, out); got != "new\n" {
		t.Errorf("content %q, want %q", got, "new\n")
	}
	if st, err := os.Stat(out); err != nil || st.Mode().Perm() != 0o600 {
		t.Errorf("mode %v (%v), want 0600", st.Mode(), err)
	}
	if l := leftovers(t, dir, "rating.csv"); len(l) > 0 {
		t.Errorf("files left behind: %v", l)
	}
}

// TestWriteFileRefusesInputThroughLink: an output that is an input
// reached through a symbolic link (to the file or to its folder), or the
// other way round, is refused and the input is untouched.
func TestWriteFileRefusesInputThroughLink(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "xs1.csv")
	writeString(t, in, "station,elevation\n0,1\n1,0\n")
	fileLink := filepath.Join(dir, "latest.csv")
	dirLink := filepath.Join(dir, "surveys")
	if err := os.Symlink(in, fileLink); err != nil {
		t.Skip("symbolic links not available:", err)
	}
	if err := os.Symlink(dir, dirLink); err != nil {
		t.Fatal(err)
	}
	tests := []struct{ out, input string }{
		{fileLink, in},
		{in, fileLink},
		{filepath.Join(dirLink, "xs1.csv"), in},
		{filepath.Join(dir, ".", "sub", "..", "xs1.csv"), fileLink},
	}
	for _, tt := range tests {
		err := WriteFile(tt.out, []string{"other.csv", tt.input}, func(w io.Writer) error {
			_, err := io.WriteString(w, "overwritten")
			return err
		})
		if !errors.Is(err, ErrWouldOverwriteInput) {
			t.Errorf("WriteFile(%s) with input %s: err = %v, want ErrWouldOverwriteInput", tt.out, tt.input, err)
		}
		if err != nil && !strings.Contains(err.Error(), tt.out) {
			t.Errorf("error %q does not name the output", err)
		}
	}
	if got := readString(t, in); !strings.HasPrefix(got, "station") {
		t.Errorf("input changed to %q", got)
	}
	if l := leftovers(t, dir, "xs1.csv", "latest.csv", "surveys"); len(l) > 0 {
		t.Errorf("files left behind: %v", l)
	}
}

// TestWriteFileInterrupted follows the interrupt path: the command's
// signal handler calls RemoveTemps while a write is under way. No
// temporary file remains, no output appears, an existing one is kept.
func TestWriteFileInterrupted(t *testing.T) {
	// The real program exits after RemoveTemps; the tests go on writing.
	reopen := func() {
		temps.Lock()
		temps.closed = false
		temps.Unlock()
	}
	defer reopen()
	for _, existing := range []string{"", "old content\n"} {
		reopen()
		dir := t.TempDir()
		out := filepath.Join(dir, "rating.csv")
		if existing != "" {
			writeString(t, out, existing)
		}
		err := WriteFile(out, nil, func(w io.Writer) error {
			io.WriteString(w, "stage,discharge\n")
			if l := leftovers(t, dir, "rating.csv"); len(l) != 1 {
				t.Errorf("want one temporary file while writing, found %v", l)
			}
			RemoveTemps() // what the interrupt handler does
			_, err := io.WriteString(w, "1,2\n")
			return err
		})
		if err == nil {
			t.Errorf("interrupted write reported success")
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
		// After the clean-up no new temporary file can be made.
		if err := WriteFile(filepath.Join(dir, "later.csv"), nil, func(io.Writer) error { return nil }); !errors.Is(err, errInterrupted) {
			t.Errorf("write after the clean-up: %v, want errInterrupted", err)
		}
	}
}
