package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// Two ratings coming into force at one time, one of the times read from a
// rating file's valid_from column, are a conflict in the data (exit 1)
// named at the file and row the time came from, not a usage error; two
// times both given on the command line stay a usage error (exit 2).
func TestRatingValidFromConflict(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	dated := filepath.Join(dir, "dated.csv")
	if err := os.WriteFile(dated, []byte("# invented\nstage,discharge,valid_from\n0.40,0.60,2024-05-01T12:00Z\n0.90,5.20,2024-05-01T12:00Z\n1.20,9.10,2024-05-01T12:00Z\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name string
		args []string
		code int
		want string
	}{
		{"file time and @TIME", []string{"record", recStages, "--rating", recRatingA, "--rating", dated, "--rating", recRatingB + "@2024-05-01T12:00Z"}, 1,
			dated + ":3: the valid_from of --rating " + dated + ", 2024-05-01T12:00:00Z, is when --rating " + recRatingB + "@2024-05-01T12:00Z comes into force too: rating periods must begin in time order"},
		{"two @TIME", []string{"record", recStages, "--rating", recRatingA, "--rating", recRatingA + "@2024-05-01T12:00Z", "--rating", recRatingB + "@2024-05-01T12:00Z"}, 2,
			"both come into force at 2024-05-01T12:00:00Z"},
	} {
		_, errs, code := runCLI(t, append(tc.args, "-o", filepath.Join(dir, "r.csv"))...)
		if code != tc.code || !strings.Contains(errs, tc.want) {
			t.Errorf("%s: exit %d, want %d; stderr %q, want %q", tc.name, code, tc.code, errs, tc.want)
		}
		if _, err := os.Stat(filepath.Join(dir, "r.csv")); err == nil {
			t.Errorf("%s: output written", tc.name)
		}
	}
}
