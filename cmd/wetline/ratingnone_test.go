package main

import (
	"encoding/json"
	"strconv"
	"strings"
	"testing"
)

// --zero-flow and --highest-gauging may leave out the periods without a
// rating (none@TIME): their values go to the ratings with a file in
// order, as a list with a dummy value for the empty period did.
func TestZeroFlowSkipsNoRatingPeriods(t *testing.T) {
	t.Parallel()
	base := []string{"record", recStages, "--rating", recRatingA, "--rating", "none@2024-05-01T12:00", "--rating", recRatingB + "@2024-05-02", "--format", "json"}
	type period struct {
		ZeroFlow *float64 `json:"zero_flow"`
		Highest  *float64 `json:"highest_gauging"`
	}
	word := func(v *float64) string {
		if v == nil {
			return "none"
		}
		return strconv.FormatFloat(*v, 'g', -1, 64)
	}
	// values runs the record and returns each period's zero flow and
	// highest gauging, as "e/H".
	values := func(t *testing.T, args ...string) ([]string, string, int) {
		out, errs, code := runCLI(t, append(append([]string(nil), base...), args...)...)
		if code != 0 {
			return nil, errs, code
		}
		var doc struct{ Ratings []period }
		if err := json.Unmarshal([]byte(out), &doc); err != nil {
			t.Fatal(err)
		}
		var got []string
		for _, p := range doc.Ratings {
			got = append(got, word(p.ZeroFlow)+"/"+word(p.Highest))
		}
		return got, errs, code
	}
	for _, tc := range []struct {
		name string
		args []string
		code int
		want string // e/H of the three periods, or a part of the error
	}{
		{"one per rating with a file", []string{"--zero-flow", "0.2,0.25"}, 0, "0.2/1.2 none/none 0.25/none"},
		{"one per --rating, as before", []string{"--zero-flow", "0.2,9,0.25"}, 0, "0.2/1.2 none/none 0.25/none"},
		{"one for all", []string{"--zero-flow", "0.2"}, 0, "0.2/1.2 none/none 0.2/none"},
		{"highest gauging too", []string{"--zero-flow", "0.2,0.25", "--highest-gauging", "1.3,1.5"}, 0, "0.2/1.3 none/none 0.25/1.5"},
		{"too many", []string{"--zero-flow", "0.2,0.25,0.3,0.35"}, 2, "--zero-flow gives 4 values for 3 --rating (2 with a file)"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			got, errs, code := values(t, tc.args...)
			if code != tc.code {
				t.Fatalf("exit %d, want %d: %s", code, tc.code, errs)
			}
			if code == 0 && strings.Join(got, " ") != tc.want || code != 0 && !strings.Contains(errs, tc.want) {
				t.Errorf("zero flows %q, stderr %q; want %q", got, errs, tc.want)
			}
		})
	}
}
