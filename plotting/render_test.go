package plotting_test

import (
	"encoding/csv"
	"flag"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
)

var outDir = flag.String("out", "", "write the test figures into this folder for viewing")

// keep writes a figure to -out when given.
func keep(t *testing.T, name string, data []byte) {
	t.Helper()
	if *outDir == "" {
		return
	}
	if err := os.WriteFile(filepath.Join(*outDir, name), data, 0o644); err != nil {
		t.Fatal(err)
	}
}

// csvTable reads a comma-separated file with '#' comment lines: its
// header and rows. Tests read their data with the standard library, never
// with the project's own readers (which import this package's peers).
func csvTable(t testing.TB, path string) (map[string]int, [][]string) {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.Comment = '#'
	r.FieldsPerRecord = -1
	recs, err := r.ReadAll()
	if err != nil || len(recs) < 2 {
		t.Fatalf("%s: %v", path, err)
	}
	cols := map[string]int{}
	for i, h := range recs[0] {
		cols[strings.TrimSpace(h)] = i
	}
	return cols, recs[1:]
}

// number parses a cell, failing the test on bad data.
func number(t testing.TB, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(strings.TrimSpace(s), 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

// demoSurvey is the invented demo survey shipped with the project, read
// as a ground line with n, banks (points marked bank) and the other marks.
type demoSurvey struct {
	Section subdivide.Section
	Labels  []string
}

func demoSection(t testing.TB) demoSurvey {
	t.Helper()
	cols, rows := csvTable(t, filepath.Join("..", "testdata", "tallow-xs1.csv"))
	sv := demoSurvey{Section: subdivide.Section{Name: "tallow-xs1"}}
	var banks []float64
	for i, r := range rows {
		x, z := number(t, r[cols["station"]]), number(t, r[cols["elevation"]])
		sv.Section.Points = append(sv.Section.Points, subdivide.Point{Station: x, Elevation: z})
		if i < len(rows)-1 {
			sv.Section.N = append(sv.Section.N, number(t, r[cols["n"]]))
		}
		mark := r[cols["mark"]]
		if mark == "bank" {
			banks, mark = append(banks, x), ""
		}
		sv.Labels = append(sv.Labels, mark)
	}
	if len(banks) == 2 {
		sv.Section.HasBanks, sv.Section.LeftBank, sv.Section.RightBank = true, banks[0], banks[1]
	}
	return sv
}

func demoTable(t testing.TB, sec subdivide.Section) rating.Table {
	t.Helper()
	p, err := subdivide.Compile(sec)
	if err != nil {
		t.Fatal(err)
	}
	tab, err := rating.Compute(p, rating.DefaultStages(p), rating.Options{Slope: 0.0012})
	if err != nil {
		t.Fatal(err)
	}
	return tab
}
