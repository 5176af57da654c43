package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// The warning of gauge heights spanning more than a river rises at a
// gauge follows the unit system resolved for the run (the headers', else
// --units): gaugings of a large river over
// 64 ft, in a file naming no unit, are not warned of with --units us, and
// are in si units (limit 50 m, common practice). The data are invented.
func TestGaugedSpanFollowsUnits(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	write := func(name, body string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	gaugings := write("big.csv", "time,stage,discharge,quality\n"+
		"2024-01-10T10:00,8,232,good\n2024-02-11T10:00,12,900,good\n2024-03-12T10:00,18,2423,good\n"+
		"2024-04-13T10:00,25,4827,good\n2024-05-14T10:00,33,8270,good\n2024-06-15T10:00,41,12364,good\n"+
		"2024-07-16T10:00,50,17669,good\n2024-08-17T10:00,58,22956,good\n2024-09-18T10:00,66,28747,good\n"+
		"2024-01-19T10:00,72,33403,good\n")
	rating := write("rating.csv", "stage,discharge\n5,100\n20,3000\n40,11000\n80,40000\n")
	stages := write("stages.csv", "time,stage\n2024-05-14T09:00,33.1\n2024-05-14T10:00,33\n2024-05-14T11:00,32.9\n")
	for _, tc := range []struct {
		name string
		args []string
		warn string // "" for no span warning
	}{
		{"fit --units us", []string{"fit", gaugings, "--units", "us", "--method", "lsq"}, ""},
		{"fit in si", []string{"fit", gaugings, "--method", "lsq"}, "span 64 m"},
		{"shifts --units us", []string{"shifts", gaugings, "--rating", rating, "--units", "us"}, ""},
		{"shifts in si", []string{"shifts", gaugings, "--rating", rating}, "span 64 m"},
		{"record --units us", []string{"record", stages, "--rating", rating, "--gaugings", gaugings, "--units", "us"}, ""},
		{"record in si", []string{"record", stages, "--rating", rating, "--gaugings", gaugings}, "span 64 m"},
	} {
		out, errs, code := runCLI(t, tc.args...)
		errs += out // text reports carry their warnings
		if code != 0 {
			t.Errorf("%s: exit %d: %s", tc.name, code, errs)
			continue
		}
		if got := strings.Contains(errs, "more than any river rises"); got != (tc.warn != "") || !strings.Contains(errs, tc.warn) {
			t.Errorf("%s: %s, want a span warning %q", tc.name, errs, tc.warn)
		}
	}
}
