package main

import (
	"context"
	"io"
	"math"

	"wetline/plotting"
	"wetline/survey"
	"wetline/survey/results"
)

const projectUsage = "project SURVEY [--sheet NAME] [--line E1,N1,E2,N2] [--flow-azimuth DEG] [--offset-tolerance D] [--units si|us] [--format csv|json] [-o FILE] [--plots DIR] [--site NAME]"

// runProject turns a coordinate survey (easting, northing, elevation)
// into the station–elevation survey every command reads, for a crew to
// check the stations and each point's distance off the section line.
func runProject(ctx context.Context, e *env, args []string) error {
	fs := newFlags("project", projectUsage)
	var cf coordFlags
	cf.register(fs, true)
	sheet := fs.String("sheet", "", "workbook sheet holding the survey (default: the first visible sheet)")
	units := fs.String("units", "si", unitsUsage)
	format := fs.String("format", "", "output format: csv (a survey every command reads) or json (default: from the -o extension, else csv)")
	out := fs.StringP("output", "o", "", "output file (.csv or .json; default: standard output)")
	plots := fs.String("plots", "", "folder for the plan figure (PNG)")
	fs.output(outputFile, "output")
	fs.output(outputFolder, "plots")
	site := fs.String("site", "", siteUsage)
	if err := fs.parseOperands(e, args, 1, "one SURVEY file of eastings, northings and elevations"); err != nil {
		return err
	}
	f, err := outputFormat("project", *format, *out, "csv", "json")
	if err != nil {
		return err
	}
	u, err := unitChoice(*units, fs.Changed("units"))
	if err != nil {
		return err
	}
	opt, err := cf.options(fs, u)
	if err != nil {
		return err
	}
	rep, err := survey.Project(fs.Arg(0), *sheet, opt, u)
	if err != nil {
		return err
	}
	rep.Provenance.Program = program()
	rep.Provenance.Site = siteWith(rep.Provenance.Site, *site)
	if *plots != "" {
		if err := drawPlan(&rep, opt); err != nil {
			return err
		}
	}
	write := results.WriteProjectionCSV
	if f == "json" {
		write = results.WriteProjectionJSON
	}
	return e.deliver(delivery{output: *out, inputs: []string{fs.Arg(0)},
		write:  func(w io.Writer) error { return write(w, rep) },
		inline: f == "json", warnings: rep.Warnings, notes: rep.Provenance.Notes, plots: *plots, figs: rep.Figures,
		summary: func(w io.Writer) error { return results.WriteProjectionSummary(w, rep, *out) }})
}

// drawPlan draws the plan figure of a projected survey into its report,
// named after its section; opt gives the flow direction, when known.
func drawPlan(rep *survey.ProjectionReport, opt survey.CoordinateOptions) error {
	sv, pr := rep.Survey, rep.Survey.Projection
	pts := sv.Section.Points
	figs, w, err := plotting.DrawPlan(plotting.PlanPlot{Site: rep.Provenance.Site.Name, Section: sv.Section.Name, Units: rep.Units,
		Easting: pr.Easting, Northing: pr.Northing, Labels: sv.Labels,
		OriginE: pr.OriginE, OriginN: pr.OriginN, Azimuth: pr.Azimuth, Length: math.Max(pts[len(pts)-1].Station, 0),
		FlowAzimuth: opt.FlowAzimuth, FlowGiven: opt.FlowGiven,
		Notes: []string{"Section line: " + pr.Line + "; left bank from " + pr.Left + "."}}, figureBase(sv.Section.Name))
	if err != nil {
		return err
	}
	rep.Figures, rep.Warnings = figs, append(rep.Warnings, w...)
	return nil
}
