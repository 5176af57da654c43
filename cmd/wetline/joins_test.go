package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// The demo reach rated: the back-swamp behind tallow-xs1's levee joins the
// flow and steps the rating up by 12 %, warned; the hollow behind
// tallow-xs3's crest at 102.5 m joins it with a step of about +0.05 %,
// under rating.JoinStepWarned, and is not.
func TestDemoReachJoins(t *testing.T) {
	t.Parallel()
	dir, _ := demoOutput(t)
	out := filepath.Join(t.TempDir(), "reach-ratings")
	_, errs, code := runCLI(t, "rate", filepath.Join(dir, "tallow-reach"), "--slope", "0.0012", "-o", out)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var joins []string
	for _, l := range strings.Split(errs, "\n") {
		if strings.Contains(l, "joins the flow") {
			joins = append(joins, l)
		}
	}
	if len(joins) != 1 || !strings.HasPrefix(joins[0], "warning: tallow-xs1: at 103.6 m ") || !strings.Contains(joins[0], "the discharge steps up from 109.7 m3/s at the crest to 122.5 m3/s just above it (+12 %)") {
		t.Errorf("join warnings %q, want tallow-xs1's alone, at 103.6 m, +12 %%", joins)
	}
}

// Two surveys compared are rated without a slope: the join warning words
// the step of conveyance, in its unit, not a discharge at the slope 1
// used within.
func TestCompareSurveysJoinConveyance(t *testing.T) {
	t.Parallel()
	dir, _ := demoOutput(t)
	out := filepath.Join(t.TempDir(), "c.txt")
	_, errs, code := runCLI(t, "compare", filepath.Join(dir, "tallow-xs1.csv"), filepath.Join(dir, "tallow-xs1-2025.csv"), "-o", out)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	b, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	for _, text := range []string{errs, string(b)} {
		if !strings.Contains(text, "tallow-xs1: at 103.6 m the water standing behind the crest at station 78 m (stations 78 to 115 m) joins the flow as the crest is overtopped: the conveyance steps up from 3168 m3/s at the crest to 3535 m3/s just above it (+12 %)\n") {
			t.Errorf("no join warning worded as conveyance:\n%s", text)
		}
		if strings.Contains(text, "discharge steps") {
			t.Errorf("a join is worded as discharge:\n%s", text)
		}
	}
}
