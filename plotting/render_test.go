package plotting_test

import (
	"flag"
	"os"
	"path/filepath"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
	"wetline/survey"
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

// demoSection reads the invented demo survey shipped with the project.
func demoSection(t testing.TB) survey.Survey {
	t.Helper()
	sv, err := survey.ReadSection(filepath.Join("..", "testdata", "tallow-xs1.csv"), "", survey.SectionOptions{})
	if err != nil {
		t.Fatal(err)
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
