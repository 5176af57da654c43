package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// A survey whose headers are in feet is rated in feet without --units;
// with --units si it is refused naming the file, the column and both
// units; an unknown unit is refused naming the column.
func TestUnitsFromHeaders(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	write := func(name, header string) string {
		p := filepath.Join(dir, name)
		body := header + "\n0,10\n10,0\n20,0\n30,10\n"
		if err := os.WriteFile(p, []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	feet := write("feet.csv", "station (ft),elevation (ft)")
	out, errs, code := runCLI(t, "rate", feet, "--slope", "0.001", "--n", "0.03", "--format", "json", "--stages", "5")
	if code != 0 || !strings.Contains(out, `"discharge": "ft3/s"`) {
		t.Errorf("feet survey without --units: exit %d, %s %s", code, out, errs)
	}
	_, errs, code = runCLI(t, "rate", feet, "--slope", "0.001", "--n", "0.03", "--units", "si")
	if code != 1 || !strings.Contains(errs, "feet.csv:1:1: station (ft)") || !strings.Contains(errs, "ft") || !strings.Contains(errs, "si units") {
		t.Errorf("feet survey with --units si: exit %d, %s", code, errs)
	}
	furlongs := write("furlongs.csv", "station (furlongs),elevation (ft)")
	_, errs, code = runCLI(t, "rate", furlongs, "--slope", "0.001", "--n", "0.03")
	if code != 1 || !strings.Contains(errs, "furlongs.csv:1:1: station (furlongs)") || !strings.Contains(errs, "unknown unit") {
		t.Errorf("unknown unit: exit %d, %s", code, errs)
	}
	mixed := write("mixed.csv", "station (m),elevation (ft)")
	_, errs, code = runCLI(t, "rate", mixed, "--slope", "0.001", "--n", "0.03")
	if code != 1 || !strings.Contains(errs, "mixed.csv:1:2: elevation (ft)") {
		t.Errorf("mixed units: exit %d, %s", code, errs)
	}
}
