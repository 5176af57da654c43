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

// plot of a fit's table names its e, the fit's offset at its first row,
// in an input note as it does a rate table's; a given --zero-flow that a
// table contradicts is warned of in true words: the fit's dry first row
// above e is not a point "with flow", and a row with flow at or below e
// gets the explicit warning that the two disagree, as a dry row above e
// does.
func TestPlotZeroFlowNotesAndWarnings(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	fit := filepath.Join(dir, "fit.csv")
	rate := filepath.Join(dir, "rate.csv")
	if err := os.WriteFile(fit, []byte("stage,discharge,extrapolated,basis\n0.612938,0,true,fit below gaugings\n0.65,0.00416444,true,fit below gaugings\n0.74,0.0669896,false,fit\n1.0,0.5,false,fit\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(rate, []byte("stage,depth,discharge\n0.6,0,0\n0.7,0.09,0.028375\n0.8,0.19,0.167\n1.0,0.39,0.9\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name      string
		args      []string
		want, not []string
	}{
		{"fit table", []string{"plot", fit}, []string{"gauge height of zero flow e = 0.612938", "e is the fit's offset"}, nil},
		{"fit table, e below its dry row", []string{"plot", fit, "--zero-flow", "0.5"},
			[]string{"fit.csv:2: this row, at stage 0.612938, has no flow, yet lies above the gauge height of zero flow 0.5", "1 rating point without flow above the gauge height of zero flow"},
			[]string{"rating point with flow at or below"}},
		{"e above a row with flow", []string{"plot", rate, "--zero-flow", "0.75"},
			[]string{"rate.csv:3: this row, at stage 0.7, carries 0.028375, yet lies at or below the gauge height of zero flow 0.75 that --zero-flow gives: the two disagree"}, nil},
	} {
		t.Run(c.name, func(t *testing.T) {
			out := filepath.Join(t.TempDir(), "p")
			if err := os.MkdirAll(out, 0o755); err != nil {
				t.Fatal(err)
			}
			stdout, errs, code := runCLI(t, append(c.args, "-o", out)...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			for _, w := range c.want {
				if !strings.Contains(stdout+errs, w) {
					t.Errorf("want %q in:\n%s", w, errs)
				}
			}
			for _, w := range c.not {
				if strings.Contains(stdout+errs, w) {
					t.Errorf("do not want %q in:\n%s", w, errs)
				}
			}
		})
	}
}
