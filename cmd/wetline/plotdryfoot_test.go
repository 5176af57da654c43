package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// plot takes a rating table's gauge height of zero flow from its dry
// first row when --zero-flow is not given, as every command reading a
// rating table does, and says so in an input note; the curve is then drawn
// with the log-linear reading in (h − e) (plotting's readAsRated, tested
// there). A given --zero-flow, or a table whose first row flows, gives no
// such note.
func TestPlotDryFootZeroFlow(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	dry := filepath.Join(dir, "dry.csv")
	wet := filepath.Join(dir, "wet.csv")
	if err := os.WriteFile(dry, []byte("stage,discharge\n0.4,0\n0.5,0\n1.0,2.5\n2.0,12\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(wet, []byte("stage,discharge\n0.6,0.3\n1.0,2.5\n2.0,12\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	const note = "the gauge height of zero flow e = 0.5 is the stage of the table's last dry row at its foot (--zero-flow not given)"
	for _, c := range []struct {
		name string
		args []string
		want bool
	}{
		{"dry foot", []string{"plot", dry, "-o", filepath.Join(dir, "a")}, true},
		{"given", []string{"plot", dry, "--zero-flow", "0.5", "-o", filepath.Join(dir, "b")}, false},
		{"first row flows", []string{"plot", wet, "-o", filepath.Join(dir, "c")}, false},
	} {
		t.Run(c.name, func(t *testing.T) {
			if err := os.MkdirAll(c.args[len(c.args)-1], 0o755); err != nil {
				t.Fatal(err)
			}
			out, errs, code := runCLI(t, c.args...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			if got := strings.Contains(out+errs, note); got != c.want {
				t.Errorf("note %q shown %v, want %v:\n%s%s", note, got, c.want, out, errs)
			}
		})
	}
}
