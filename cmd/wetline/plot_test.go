package main

import (
	"bytes"
	"context"
	"errors"
	"image/png"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"wetline/plotting"
)

// decodeAll checks that dir holds exactly the named PNGs at the given size.
func decodeAll(t *testing.T, dir string, names []string, w, h int) {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(entries) != len(names) {
		var got []string
		for _, e := range entries {
			got = append(got, e.Name())
		}
		t.Fatalf("%s holds %q, want %q", dir, got, names)
	}
	for _, n := range names {
		data, err := os.ReadFile(filepath.Join(dir, n))
		if err != nil {
			t.Fatal(err)
		}
		img, err := png.Decode(bytes.NewReader(data))
		if err != nil {
			t.Fatalf("%s: %v", n, err)
		}
		if b := img.Bounds(); b.Dx() != w || b.Dy() != h {
			t.Errorf("%s: %d×%d, want %d×%d", n, b.Dx(), b.Dy(), w, h)
		}
	}
}

var figureNames = []string{"tallow-xs1-properties.png", "tallow-xs1-rating.png", "tallow-xs1-section.png"}

func TestRatePlots(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	plots := filepath.Join(dir, "figs")
	var stdout, stderr bytes.Buffer
	err := run(context.Background(), newEnv(&stdout, &stderr, commandTable()),
		[]string{"rate", filepath.Join("..", "..", "testdata", "tallow-xs1.csv"), "--slope", "0.0012", "-o", filepath.Join(dir, "r.csv"), "--plots", plots})
	if err != nil {
		t.Fatal(err, stderr.String())
	}
	decodeAll(t, plots, figureNames, plotting.DefaultWidth, plotting.DefaultHeight)
	if !strings.Contains(stderr.String(), "tallow-xs1-rating.png") {
		t.Errorf("figures not listed:\n%s", stderr.String())
	}
}

func TestPlotRedraw(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	var stdout, stderr bytes.Buffer
	e := newEnv(&stdout, &stderr, commandTable())
	survey := filepath.Join("..", "..", "testdata", "tallow-xs1.csv")
	table := filepath.Join(dir, "tallow-xs1-rating.csv")
	if err := run(context.Background(), e, []string{"rate", survey, "--slope", "0.0012", "-o", table}); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "out")
	if err := run(context.Background(), e, []string{"plot", table, "--section", survey, "-o", out,
		"--width", "800", "--height", "500", "--dpi", "96", "--site", "Tallow Creek"}); err != nil {
		t.Fatal(err, stderr.String())
	}
	decodeAll(t, out, figureNames, 800, 500)
	// Without a section: no section figure.
	out2 := filepath.Join(dir, "out2")
	if err := run(context.Background(), e, []string{"plot", table, "-o", out2}); err != nil {
		t.Fatal(err)
	}
	decodeAll(t, out2, []string{"tallow-xs1-properties.png", "tallow-xs1-rating.png"}, plotting.DefaultWidth, plotting.DefaultHeight)
	// A gauge height of zero flow above the thalweg leaves flowing rows
	// out of the log–log panel, with a warning.
	stderr.Reset()
	if err := run(context.Background(), e, []string{"plot", table, "-o", filepath.Join(dir, "out3"), "--zero-flow", "100.55"}); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(stderr.String(), "warning: rating figure: log–log panel: 2 rating points") {
		t.Errorf("no warning about rows left out:\n%s", stderr.String())
	}
}

func TestPlotErrors(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	bad := filepath.Join(dir, "bad.csv")
	if err := os.WriteFile(bad, []byte("stage,discharge\n1,2\n2,lots\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	down := filepath.Join(dir, "down.csv")
	if err := os.WriteFile(down, []byte("stage,discharge\n1,0\n2,5\n1.5,3\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	same := filepath.Join(dir, "same.csv")
	if err := os.WriteFile(same, []byte("discharge,stage\n0,1\n5,2\n5,2\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	periods := filepath.Join(dir, "periods.csv")
	if err := os.WriteFile(periods, []byte("valid_from,stage,discharge\n2024-01-01,1,0\n,2,5\n,3,9\n2025-01-01,1,0\n,2,6\n,3,10\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	neg := filepath.Join(dir, "neg.csv")
	if err := os.WriteFile(neg, []byte("stage,discharge\n1,0\n2,-5\n3,9\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	huge := filepath.Join(dir, "huge.csv")
	if err := os.WriteFile(huge, []byte("stage,discharge\n1,0\n2,5\n3,1e308\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name   string
		args   []string
		usage  bool
		errHas string
	}{
		{"no table", []string{"plot"}, true, "want one TABLE"},
		{"tiny figure", []string{"plot", bad, "--width", "10"}, true, "figure size"},
		{"bad cell", []string{"plot", bad}, false, `bad.csv:3:2: discharge "lots"`},
		{"missing file", []string{"plot", filepath.Join(dir, "none.csv")}, false, "none.csv"},
		{"stage decreasing", []string{"plot", down}, false, `down.csv:4:1: stage "1.5"`},
		{"stage repeated", []string{"plot", same}, false, `same.csv:4:2: stage "2"`},
		{"several periods", []string{"plot", periods}, false, `periods.csv: holds 2 rating periods (a valid_from column): one rating per file is read`},
		{"negative discharge", []string{"plot", neg}, false, `neg.csv:3:2: discharge "-5": discharge must not be negative`},
		{"implausible discharge", []string{"plot", huge}, false, `huge.csv:4:2: discharge "1e308": discharge 1e+308 is not a plausible value (beyond ±1e+08)`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			out := filepath.Join(dir, "out-"+strings.ReplaceAll(tc.name, " ", "-"))
			args := append(append([]string(nil), tc.args...), "-o", out)
			var stdout, stderr bytes.Buffer
			err := run(context.Background(), newEnv(&stdout, &stderr, commandTable()), args)
			var ue usageError
			if err == nil || errors.As(err, &ue) != tc.usage || !strings.Contains(err.Error(), tc.errHas) {
				t.Fatalf("error %v (usage %v), want %q (usage %v)", err, errors.As(err, &ue), tc.errHas, tc.usage)
			}
			if _, serr := os.Stat(out); serr == nil {
				t.Errorf("output folder %s was created on error", out)
			}
		})
	}
}

// plot --section: when neither --units nor the table's headers name the
// units, the section's headers decide, as in other commands; a table
// whose headers contradict them is refused naming its column. The table
// is the QA rectangle 20 ft wide at n 0.03 and slope 0.001: at 2 ft,
// Q = 1.486/0.03 * 40 * (40/24)^(2/3) * sqrt(0.001) = 88.08 ft3/s
// (Manning's equation, Chow 1959, eq. 5-7, k = 1.486 in US units).
func TestPlotSectionUnits(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	section := filepath.Join(dir, "ft.csv")
	write := func(name, text string) string {
		path := filepath.Join(dir, name)
		if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		return path
	}
	write("ft.csv", "# site: Owl Run near Hobb's Ford\nstation (ft),elevation (ft),n\n0,10,0.03\n0,0,0.03\n20,0,0.03\n20,10,\n")
	plain := write("plain.csv", "stage,depth,discharge\n0,0,0\n2,2,88.08\n")
	metres := write("metres.csv", "stage (m),depth (m),discharge (m3/s)\n0,0,0\n2,2,88.08\n")
	for _, tc := range []struct {
		name  string
		args  []string
		code  int
		words string // on standard error
	}{
		{"the section's headers decide", []string{plain, "--section", section}, 0, "plain-section.png"},
		{"the table's headers disagree", []string{metres, "--section", section}, 1,
			"metres.csv:1:1: stage (m): the header's unit is not the unit system asked for: the header says m (si units) but us units were asked for (us units set by the headers of " + section + ")"},
		{"--units disagrees", []string{plain, "--section", section, "--units", "si"}, 1, "ft.csv:2:1: station (ft)"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			out := t.TempDir()
			_, errs, code := runCLI(t, append(append([]string{"plot"}, tc.args...), "-o", out)...)
			if code != tc.code || !strings.Contains(errs, tc.words) {
				t.Errorf("exit %d, want %d; stderr %q lacks %q", code, tc.code, errs, tc.words)
			}
		})
	}
}

// plot --section warns when the table's bottom (stage − depth, plus
// --datum) is more than 0.5 m from the section's lowest point: a table of
// gauge heights on a gauge whose zero is at 10 m, drawn over the test
// trapezoid whose bottom is at 10 m, agrees only with --datum 10.
func TestPlotSectionBottomMismatch(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	table := filepath.Join(dir, "gauge.csv")
	if err := os.WriteFile(table, []byte("stage,depth,discharge\n0,0,0\n1,1,5\n2,2,20\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, tt := range []struct {
		name string
		args []string
		want string // "" for no warning
	}{
		{"datum given", []string{"--datum", "10"}, ""},
		{"datum forgotten", nil, "the table's bottom, elevation 0.000 m (stage − depth), lies 10.000 m below the lowest point of testdata/record/xs-a.csv (10.000 m)"},
		{"datum wrong", []string{"--datum", "9"}, "elevation 9.000 m (stage − depth + datum), lies 1.000 m below"},
		{"within 0.5 m", []string{"--datum", "10.4"}, ""},
	} {
		t.Run(tt.name, func(t *testing.T) {
			args := append([]string{"plot", table, "--section", recSectionA, "-o", filepath.Join(dir, strings.ReplaceAll(tt.name, " ", "-"))}, tt.args...)
			_, errs, code := runCLI(t, args...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			got := strings.Contains(errs, "the table's bottom")
			if got != (tt.want != "") || !strings.Contains(errs, tt.want) {
				t.Errorf("stderr %q, want %q", errs, tt.want)
			}
		})
	}
}

// plot reads a workbook table from the sheet --sheet names (when the
// survey is not a workbook) or --table-sheet names, refuses an unknown
// sheet and a sheet named for a CSV table; the demo's results workbook
// holds the rating on its "rating" sheet and the survey on "survey".
func TestPlotSheets(t *testing.T) {
	t.Parallel()
	demo, _ := demoOutput(t)
	book := filepath.Join(demo, "tallow-xs1-results.xlsx")
	csv := filepath.Join(demo, "tallow-xs1-rating.csv")
	survey := filepath.Join(demo, "tallow-xs1.csv")
	for _, tt := range []struct {
		name   string
		args   []string
		code   int
		errHas string // "" for success
	}{
		{"first sheet a results summary: its rating sheet", []string{book}, 0, ""},
		{"--sheet names the table's", []string{book, "--sheet", "rating"}, 0, ""},
		{"--sheet with a survey CSV", []string{book, "--section", survey, "--sheet", "rating"}, 0, ""},
		{"--table-sheet", []string{book, "--table-sheet", "rating"}, 0, ""},
		{"both workbooks", []string{book, "--section", book, "--sheet", "survey", "--table-sheet", "rating"}, 0, ""},
		{"unknown sheet", []string{book, "--sheet", "ratings"}, 1, `['ratings']: no such sheet (sheets: summary, rating,`},
		{"unknown table sheet", []string{book, "--section", book, "--sheet", "survey", "--table-sheet", "nosuch"}, 1, `['nosuch']: no such sheet`},
		{"sheet of a CSV table", []string{csv, "--sheet", "rating"}, 2, "--sheet rating: " + csv + " is not a workbook"},
		{"table sheet of a CSV table", []string{csv, "--section", survey, "--table-sheet", "rating"}, 2, "--table-sheet rating: " + csv + " is not a workbook"},
		{"both flags for the table", []string{book, "--sheet", "rating", "--table-sheet", "rating"}, 2, "both name the table's sheet"},
	} {
		t.Run(tt.name, func(t *testing.T) {
			out := filepath.Join(t.TempDir(), "figures")
			_, errs, code := runCLI(t, append(append([]string{"plot"}, tt.args...), "-o", out)...)
			if code != tt.code || !strings.Contains(errs, tt.errHas) {
				t.Fatalf("exit %d, want %d; stderr %q, want %q", code, tt.code, errs, tt.errHas)
			}
			figs, _ := filepath.Glob(filepath.Join(out, "*-rating.png"))
			if (len(figs) == 1) != (tt.code == 0) {
				t.Errorf("rating figures %v", figs)
			}
		})
	}
}
