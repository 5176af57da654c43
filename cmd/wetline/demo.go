package main

import (
	"bytes"
	"context"
	"embed"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"wetline/rating"
	"wetline/survey/output"
	"wetline/survey/results"
)

// demoFiles holds the invented demo site: Tallow Creek at Mill Lane.
//
//go:embed demodata
var demoFiles embed.FS

// Demo site facts used by the demo command.
const (
	demoSurvey = "tallow-xs1.csv"
	demoSlope  = 0.0012 // water-surface slope of the invented reach, m/m
	// demoSite titles the demo's figures.
	demoSite = "Tallow Creek at Mill Lane (invented)"
)

const demoUsage = "demo -o DIR"

// demoStep is one thing the demo writes; the steps run in order and each
// prints what it wrote.
type demoStep func(ctx context.Context, e *env, dir string) error

// demoSteps are the parts of the demo, in order, each under a heading
// ("" continues the part above).
var demoSteps = []struct {
	heading string
	run     demoStep
}{
	{"Tallow Creek at Mill Lane footbridge, a gauged site (invented):", demoRating},
	{"", demoPlots},
	{"", demoWorkbook},
	{"", demoBatch},
	{"Gaugings at the Tallow Creek staff gauge (invented):", demoFit},
	{"A built section, the Mill Lane road culvert (invented):", demoSolve},
	{"Brindle Creek below Quarry Road, a post-flood slope-area reach (invented):", demoSlopeArea},
}

func runDemo(ctx context.Context, e *env, args []string) error {
	fs := newFlags("demo", demoUsage)
	out := fs.StringP("output", "o", "", "folder to write the demo into (created if missing)")
	if err := parseFlags(fs, e, args); err != nil {
		return err
	}
	if *out == "" || fs.NArg() != 0 {
		return usagef("demo: want -o DIR and no other arguments")
	}
	if err := os.MkdirAll(*out, 0o755); err != nil {
		return err
	}
	fmt.Fprintf(e.stdout, "wetline demo: invented sites and data, written to %s\n", *out)
	// Steps that rate the same section repeat its warnings: say each once.
	de := *e
	de.stdout = &onceWriter{w: e.stdout, seen: map[string]bool{}}
	for _, step := range demoSteps {
		if step.heading != "" {
			fmt.Fprintln(e.stdout, "\n"+step.heading)
		}
		if err := step.run(ctx, &de, *out); err != nil {
			return err
		}
	}
	fmt.Fprintln(e.stdout, "\ncaution: "+rating.Caution)
	return nil
}

// onceWriter passes lines through, except a warning line already passed.
type onceWriter struct {
	w    io.Writer
	seen map[string]bool
	buf  []byte
}

func (o *onceWriter) Write(p []byte) (int, error) {
	o.buf = append(o.buf, p...)
	for {
		i := bytes.IndexByte(o.buf, '\n')
		if i < 0 {
			return len(p), nil
		}
		line := string(o.buf[:i+1])
		o.buf = o.buf[i+1:]
		if strings.HasPrefix(line, "warning: ") {
			if o.seen[line] {
				continue
			}
			o.seen[line] = true
		}
		if _, err := io.WriteString(o.w, line); err != nil {
			return len(p), err
		}
	}
}

// copyDemoFile writes an embedded demo file into dir and returns its path.
func copyDemoFile(e *env, dir, name, what string) (string, error) {
	data, err := demoFiles.ReadFile("demodata/" + name)
	if err != nil {
		return "", err
	}
	path := filepath.Join(dir, name)
	if err := output.WriteFile(path, nil, func(w io.Writer) error {
		_, err := w.Write(data)
		return err
	}); err != nil {
		return "", err
	}
	fmt.Fprintf(e.stdout, "  %-28s %s\n", name, what)
	return path, nil
}

// demoRating writes the gauge section's survey and its rating table.
func demoRating(ctx context.Context, e *env, dir string) error {
	path, err := copyDemoFile(e, dir, demoSurvey, "surveyed cross-section at the gauge (station, elevation, n, marks)")
	if err != nil {
		return err
	}
	sf := sectionFlags{units: "si"}
	l, err := sf.load(path)
	if err != nil {
		return err
	}
	t, err := rating.Compute(l.geom, rating.DefaultStages(l.geom), rating.Options{Slope: demoSlope, Units: l.units})
	if err != nil {
		return err
	}
	warnings := append(append([]string(nil), l.warnings...), t.Warnings...)
	for _, f := range []struct {
		name, what string
		write      func(io.Writer) error
	}{
		{"tallow-xs1-rating.csv", fmt.Sprintf("rating table, %d stages at slope %g", len(t.Rows), demoSlope),
			func(w io.Writer) error { return results.WriteRatingCSV(w, t) }},
		{"tallow-xs1-rating.json", "the same table as JSON, with subsections and warnings",
			func(w io.Writer) error { return results.WriteRatingJSON(w, t, warnings) }},
	} {
		if err := output.WriteFile(filepath.Join(dir, f.name), []string{path}, f.write); err != nil {
			return err
		}
		fmt.Fprintf(e.stdout, "  %-28s %s\n", f.name, f.what)
	}
	printWarnings(e.stdout, warnings)
	return nil
}
