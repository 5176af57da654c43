package main

import (
	"context"
	"embed"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"wetline/plotting"
	"wetline/rating"
	"wetline/rating/reach"
	"wetline/survey"
	"wetline/survey/batch"
	"wetline/survey/results"
)

// demoFiles holds the invented demo sites: Tallow Creek at Mill Lane and
// Brindle Creek below Quarry Road.
//
//go:embed demodata
var demoFiles embed.FS

// Demo site facts used by the demo command.
const (
	demoSurvey = "tallow-xs1.csv"
	demoSlope  = 0.0012 // water-surface slope of the invented reach, m/m
	// demoSite titles the demo's figures.
	demoSite     = "Tallow Creek at Mill Lane (invented)"
	demoGaugings = "tallow-gaugings.csv"
	demoDatum    = 100.0 // elevation of the staff gauge's zero, m
	// The invented Mill Lane road culvert beside the gauge.
	demoCulvert      = "circle:diameter=1.2"
	demoCulvertN     = 0.013
	demoCulvertSlope = 0.003 // m/m
	demoCulvertFlow  = 1.5   // m³/s
	// Brindle Creek below Quarry Road, an invented post-flood survey.
	demoReach       = "reach-brindle.csv"
	demoReachReport = "reach-brindle-slopearea"
	demoReachSite   = "Brindle Creek below Quarry Road (invented)"
	demoReachDraws  = 5000
)

// demoGaugeReach lists the surveyed sections around the gauge, upstream first.
var demoGaugeReach = [...]string{"tallow-xs2.csv", demoSurvey, "tallow-xs3.csv"}

// demoReachSurveys are the slope-area reach's sections.
var demoReachSurveys = [...]string{"reach-brindle-xs1.csv", "reach-brindle-xs2.csv", "reach-brindle-xs3.csv"}

const demoUsage = "demo -o DIR"

// demo writes the demo into a folder, step by step: each step's files are
// committed before the next step reads them.
type demo struct {
	e    *env
	dir  string
	list []string // lines naming what the current step wrote
}

// demoSteps are the parts of the demo, in order, each under a heading
// ("" continues the part above).
func demoSteps() []struct {
	heading string
	run     func(*demo) error
} {
	return []struct {
		heading string
		run     func(*demo) error
	}{
		{"Tallow Creek at Mill Lane footbridge, a gauged site (invented):", (*demo).rating},
		{"", (*demo).workbook},
		{"", (*demo).batch},
		{"Gaugings at the Tallow Creek staff gauge (invented):", (*demo).fit},
		{"A built section, the Mill Lane road culvert (invented):", (*demo).culvert},
		{"Brindle Creek below Quarry Road, a post-flood slope-area reach (invented):", (*demo).slopeArea},
		{"Tallow Creek through the gauge, a step-backwater rating from the surveyed reach (invented):", (*demo).backwater},
		{"Larch Brook at the footbridge, a total-station survey in eastings and northings (invented):", (*demo).coordinates},
		{"A year of record at the Tallow Creek gauge: visits, shifts, the discharge record (invented):", (*demo).record},
	}
}

func runDemo(ctx context.Context, e *env, args []string) error {
	fs := newFlags("demo", demoUsage)
	out := fs.StringP("output", "o", "", "folder to write the demo into (created if missing)")
	if err := fs.parse(e, args); err != nil {
		return err
	}
	if *out == "" || *out == "-" || fs.NArg() != 0 {
		return usagef("demo: want -o DIR and no other arguments")
	}
	if err := demoFolder(*out); err != nil {
		return err
	}
	e.files.MayCreate(*out) // with the demo's sub-folders
	var b strings.Builder
	fmt.Fprintf(&b, "wetline demo: invented sites and data, written to %s\n", *out)
	d := &demo{e: e, dir: *out}
	if err := e.files.Write(d.path(demoMark), func(w io.Writer) error {
		_, err := io.WriteString(w, "This folder was written by wetline demo, which may write into it again.\n")
		return err
	}); err != nil {
		return err
	}
	seen := map[string]bool{}
	for _, step := range demoSteps() {
		if step.heading != "" {
			b.WriteString("\n" + step.heading + "\n")
		}
		if err := step.run(d); err != nil {
			return err
		}
		if err := e.files.Commit(); err != nil {
			return err
		}
		for _, l := range d.list {
			// Steps that rate the same section repeat its warnings: say each once.
			if strings.HasPrefix(l, "warning: ") {
				if seen[l] {
					continue
				}
				seen[l] = true
			}
			b.WriteString(l + "\n")
		}
		d.list = nil
	}
	b.WriteString("\ncaution: " + rating.Caution + "\n")
	_, err := io.WriteString(e.stdout, b.String())
	return err
}

// demoMark names the file that marks a folder as the demo's own, so that
// demo writes into it again; any other folder must be new or empty.
const demoMark = ".wetline-demo"

// Causes of a refused demo folder (exit 1, as any output that cannot be
// used).
var (
	// ErrDemoFolder: the folder holds files an earlier demo did not write.
	ErrDemoFolder = errors.New("give a new or empty folder")
	// ErrDemoLink: an earlier demo's folder holds a symbolic link.
	ErrDemoLink = errors.New("remove it or give a new folder")
)

// demoFolder refuses a demo folder that holds files the demo did not
// write: an existing folder must be empty or marked by an earlier demo
// (demoMark), since the demo writes its files under fixed names and would
// replace a user's file of one of them.
func demoFolder(dir string) error {
	ents, err := os.ReadDir(dir)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return nil
	case err != nil:
		return fmt.Errorf("demo: -o %s: %w", dir, err)
	case len(ents) == 0:
		return nil
	}
	if fi, err := os.Lstat(filepath.Join(dir, demoMark)); err == nil && fi.Mode().IsRegular() {
		return demoLinks(dir)
	}
	return fmt.Errorf("demo: -o %s holds files an earlier demo did not write (such as %s): %w", dir, ents[0].Name(), ErrDemoFolder)
}

// demoLinks refuses an earlier demo's folder holding a link: the demo
// would write its file through it, over whatever it points to.
func demoLinks(dir string) error {
	return filepath.WalkDir(dir, func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return fmt.Errorf("demo: -o %s: %w", dir, err)
		}
		if d.Type()&fs.ModeSymlink != 0 {
			return fmt.Errorf("demo: -o %s holds a link, %s, which the demo would write through: %w", dir, path, ErrDemoLink)
		}
		return nil
	})
}

// path returns the path of a demo file.
func (d *demo) path(name string) string { return filepath.Join(d.dir, name) }

// put writes one demo file and lists it.
func (d *demo) put(name, what string, write func(io.Writer) error) error {
	if err := d.e.files.Write(d.path(name), write); err != nil {
		return err
	}
	d.list = append(d.list, fmt.Sprintf("  %-28s %s", name, what))
	return nil
}

// copy writes an embedded demo file into the demo folder (or a sub-folder).
func (d *demo) copy(name, what string) error {
	data, err := demoFiles.ReadFile("demodata/" + filepath.Base(name))
	if err != nil {
		return err
	}
	if err := d.e.files.Write(d.path(name), func(w io.Writer) error { _, err := w.Write(data); return err }); err != nil {
		return err
	}
	if what != "" {
		d.list = append(d.list, fmt.Sprintf("  %-28s %s", name, what))
	}
	return nil
}

// figures writes figures and lists them.
func (d *demo) figures(figs []rating.Figure) error {
	for _, f := range d.e.figures.place(d.dir, figs) {
		png := f.PNG
		if err := d.put(f.Name, f.Caption, func(w io.Writer) error { _, err := w.Write(png); return err }); err != nil {
			return err
		}
	}
	return nil
}

// warn lists warnings.
func (d *demo) warn(warnings []string) {
	for _, w := range warnings {
		d.list = append(d.list, "warning: "+w)
	}
}

// rateSurvey rates a demo survey at the demo slope, with the lookup table
// when asked.
func (d *demo) rateSurvey(path, sheet string, lookup bool) (rating.RatingReport, error) {
	p, err := survey.Prepare(survey.SectionRequest{Path: path, Sheet: sheet})
	if err != nil {
		return rating.RatingReport{}, err
	}
	rep, err := rating.Rate(p.Geometry, rating.DefaultStages(p.Geometry),
		rating.RateOptions{Options: rating.Options{Slope: demoSlope}, Lookup: lookup})
	if err != nil {
		return rep, err
	}
	rep.Provenance = rating.Provenance{Program: program(), Inputs: p.Inputs, Site: p.Site}
	rep.Ground = p.Ground
	rep.Warnings = slices.Concat(p.Warnings, rep.Warnings)
	return rep, nil
}

// rating writes the gauge section's survey, its rating table and figures.
func (d *demo) rating() error {
	if err := d.copy(demoSurvey, "surveyed cross-section at the gauge (station, elevation, n, marks)"); err != nil {
		return err
	}
	if err := d.e.files.Commit(); err != nil {
		return err
	}
	rep, err := d.rateSurvey(d.path(demoSurvey), "", false)
	if err != nil {
		return err
	}
	if err := d.put("tallow-xs1-rating.csv", fmt.Sprintf("rating table, %d stages at slope %g", len(rep.Table.Rows), demoSlope),
		func(w io.Writer) error { return results.WriteRatingCSV(w, rep) }); err != nil {
		return err
	}
	if err := d.put("tallow-xs1-rating.json", "the same table as JSON, with subsections and warnings",
		func(w io.Writer) error { return results.WriteRatingJSON(w, rep) }); err != nil {
		return err
	}
	d.warn(rep.Warnings)
	figs, warnings, err := plotting.DrawRating(plotting.RatingFigures{Site: demoSite, Base: "tallow-xs1",
		Subtitle: "section XS-1 at the gauge", Table: rep.Table, Ground: rep.Ground, ZeroFlow: math.NaN()})
	if err != nil {
		return err
	}
	if err := d.figures(figs); err != nil {
		return err
	}
	d.warn(warnings)
	return nil
}

// workbook writes the gauge section's survey into a field workbook,
// rates the section read back from that workbook, and writes the results
// workbook.
func (d *demo) workbook() error {
	sv, err := survey.ReadSection(d.path(demoSurvey), "", survey.SectionOptions{})
	if err != nil {
		return err
	}
	const fieldName, resultsName = "tallow-field.xlsx", "tallow-xs1-results.xlsx"
	if err := d.put(fieldName, "field workbook: the survey on sheet "+sv.Section.Name+", blank sheets, reach, gaugings",
		func(w io.Writer) error {
			return survey.WriteTemplate(w, survey.TemplateOptions{Surveys: []survey.Survey{sv}})
		}); err != nil {
		return err
	}
	if err := d.e.files.Commit(); err != nil {
		return err
	}
	rep, err := d.rateSurvey(d.path(fieldName), sv.Section.Name, true)
	if err != nil {
		return err
	}
	if err := drawRating(&rep, "", ""); err != nil {
		return err
	}
	return d.put(resultsName, "results workbook (rated from the field workbook): summary, rating, lookup by hundredths, subsections, figures",
		func(w io.Writer) error { return results.WriteRatingWorkbook(w, rep) })
}

// batch copies the reach's three sections into a folder and rates them
// all at once, as `wetline rate DIR -o OUT` does.
func (d *demo) batch() error {
	const in, out = "tallow-reach", "tallow-reach-ratings"
	for _, name := range demoGaugeReach {
		if err := d.copy(filepath.Join(in, name), ""); err != nil {
			return err
		}
	}
	if err := d.e.files.Commit(); err != nil {
		return err
	}
	d.list = append(d.list, fmt.Sprintf("  %-28s %d surveyed sections of Tallow Creek around the gauge", in+"/", len(demoGaugeReach)))
	jobs, _, err := batch.List([]string{d.path(in)}, "", "csv")
	if err != nil {
		return err
	}
	sum, err := batch.Folder(context.Background(), d.e.files, d.path(out), "csv", jobs,
		batch.Options{Stages: rating.DefaultStageSpec(), Rating: rating.Options{Slope: demoSlope}})
	if err != nil {
		return err
	}
	if err := sum.Err(""); err != nil {
		return err
	}
	d.list = append(d.list, fmt.Sprintf("  %-28s %s", out+"/", "their rating tables at once (batch mode) and index.csv with bankfull discharges"))
	return nil
}

// culvert writes the normal and critical depths of the demo culvert.
func (d *demo) culvert() error {
	p, err := survey.Prepare(survey.SectionRequest{Shape: demoCulvert, N: []float64{demoCulvertN}})
	if err != nil {
		return err
	}
	rep, err := rating.Answer(p.Geometry, rating.Query{Discharge: demoCulvertFlow, Area: math.NaN(), Stage: math.NaN()},
		rating.Options{Slope: demoCulvertSlope})
	if err != nil {
		return err
	}
	rep.Section = p.Source()
	rep.Provenance = rating.Provenance{Program: program()}
	rep.Warnings = slices.Concat(p.Warnings, rep.Warnings)
	return d.put("mill-lane-culvert-solve.txt", "normal and critical depth in the 1.2 m road culvert",
		func(w io.Writer) error { return results.WriteSolveText(w, rep) })
}

// slopeArea writes the reach table, its three surveys and the slope-area
// report as text, JSON, figures and a workbook.
func (d *demo) slopeArea() error {
	if err := d.copy(demoReach, "reach table: sections, distances, high-water marks"); err != nil {
		return err
	}
	for i, name := range demoReachSurveys {
		if err := d.copy(name, fmt.Sprintf("surveyed section XS-%d of the reach", i+1)); err != nil {
			return err
		}
	}
	if err := d.e.files.Commit(); err != nil {
		return err
	}
	rep, err := estimate(d.path(demoReach), "", reach.EstimateOptions{Draws: demoReachDraws,
		MonteCarlo: reach.MonteCarloOptions{Seed: 1, NCV: reach.DefaultNCV}}, survey.SectionOptions{}, false)
	if err != nil {
		return err
	}
	for _, o := range []struct {
		ext, what string
		write     func(io.Writer, reach.Report) error
	}{
		{".txt", "slope-area report for review", results.WriteSlopeAreaText},
		{".json", "the same report as JSON", results.WriteSlopeAreaJSON},
	} {
		if err := d.put(demoReachReport+o.ext, o.what, func(w io.Writer) error { return o.write(w, rep) }); err != nil {
			return err
		}
	}
	figs, w, err := plotting.DrawReach(rep, demoReachSite, "reach-brindle", plotting.Size{})
	if err != nil {
		return err
	}
	rep.Figures, rep.Warnings = figs, append(rep.Warnings, w...)
	if err := d.figures(figs); err != nil {
		return err
	}
	if err := d.put(demoReachReport+".xlsx", "results workbook: summary, inputs, sections, subreaches, checks, uncertainty, figures",
		func(w io.Writer) error { return results.WriteSlopeAreaWorkbook(w, rep) }); err != nil {
		return err
	}
	r := rep.Result
	line := fmt.Sprintf("  peak discharge %s %s", rating.PlainFigures(r.Discharge, 4), r.Units.Discharge())
	if u := rep.Uncertainty; u != nil {
		line += fmt.Sprintf(", 90 %% band %s to %s %s", rating.PlainFigures(u.P05, 4), rating.PlainFigures(u.P95, 4), r.Units.Discharge())
	}
	d.list = append(d.list, line)
	d.warn(rep.Warnings)
	return nil
}
