package main

import (
	"os"
	"testing"
)

// TestCompareStdin: compare tells a rating from a survey by its columns
// before reading it, so standard input is read once and kept: A or B
// given as - compares as the file itself does, for ratings and surveys.
func TestCompareStdin(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name, a, b string
		stdinIsA   bool
		extra      []string
	}{
		{"ratings, A", recRatingA, recRatingB, true, []string{"--zero-flow", "0.2", "--format", "csv"}},
		{"ratings, B", recRatingA, recRatingB, false, []string{"--zero-flow", "0.2", "--format", "csv"}},
		{"surveys, A", recSectionA, recSectionB, true, []string{"--stages", "11,12", "--format", "csv"}},
		{"surveys, B", recSectionA, recSectionB, false, []string{"--stages", "11,12", "--format", "csv"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			want, errs, code := runCLI(t, append([]string{"compare", tc.a, tc.b}, tc.extra...)...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			in, a, b := tc.b, tc.a, "-"
			if tc.stdinIsA {
				in, a, b = tc.a, "-", tc.b
			}
			data, err := os.ReadFile(in)
			if err != nil {
				t.Fatal(err)
			}
			got, errs, code := runProgram(t, data, append([]string{"compare", a, b}, tc.extra...)...)
			if code != 0 || got != want {
				t.Errorf("compare %s %s: exit %d %s\ngot  %.300q\nwant %.300q", a, b, code, errs, got, want)
			}
		})
	}
}
