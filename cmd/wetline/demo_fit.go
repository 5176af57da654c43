package main

import (
	"fmt"
	"io"
	"math"
	"path/filepath"
	"slices"
	"strings"

	"wetline/plotting"
	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/survey"
	"wetline/survey/results"
)

// demoFitMultiple is the multiple of the largest demo gauging at which
// the demo states both fits' total bands (twice the largest gauged
// discharge, the common limit of extrapolation).
const demoFitMultiple = gauged.ExtrapolationWarnMultiple

// fit writes the demo site's gaugings and two reports on them: the
// Bayesian fit with priors from the surveyed section (a channel control
// and a floodplain adding at the bank stage, as fit does by default) and
// the least-squares fit with the conveyance-slope extension, each with
// both 95 % bands on every row of its table, and says what the two bands
// are at twice the largest gauged discharge.
func (d *demo) fit() error {
	if err := d.copy(demoGaugings, "discharge measurements at the staff gauge (invented)"); err != nil {
		return err
	}
	if err := d.e.files.Commit(); err != nil {
		return err
	}
	p, err := survey.Prepare(survey.SectionRequest{Path: d.path(demoSurvey)})
	if err != nil {
		return err
	}
	gs, err := survey.ReadGaugings(d.path(demoGaugings), "")
	if err != nil {
		return err
	}
	hyd := &rating.HydraulicCurve{Geometry: p.Geometry, Datum: demoDatum, Options: rating.Options{Slope: demoSlope}}
	report := func(m gauged.Method) (*gauged.Report, error) {
		rep, err := gauged.Analyze(gs.Gaugings, gauged.Options{Site: strings.TrimSuffix(demoGaugings, filepath.Ext(demoGaugings)), Section: p.Survey.Section.Name, Hydraulic: hyd, DatumGiven: true, Lookup: m == gauged.Bayesian,
			Method: m, Floodplain: true, Controls: gauged.ControlOptions{Controls: []gauged.ControlSpec{{Kind: gauged.ChannelControl}}},
			Bayes: gauged.BayesOptions{Seed: fitDefaultSeed}})
		if err != nil {
			return nil, err
		}
		rep.Warnings = slices.Concat(p.Warnings, rep.Warnings)
		rep.Provenance = rating.Provenance{Program: program(), Inputs: []string{demoGaugings, demoSurvey}}
		return rep, nil
	}
	bayes, err := report(gauged.Bayesian)
	if err != nil {
		return err
	}
	lsq, err := report(gauged.LeastSquares)
	if err != nil {
		return err
	}
	if err := d.fitFiles(bayes, lsq); err != nil {
		return err
	}
	d.list = append(d.list, demoBands(bayes, lsq)...)
	d.warn(bayes.Warnings)
	return nil
}

// fitFiles writes the reports and figures of both fits.
func (d *demo) fitFiles(bayes, lsq *gauged.Report) error {
	for _, f := range []struct {
		name, what string
		rep        *gauged.Report
		write      func(io.Writer, *gauged.Report) error
	}{
		{"tallow-fit.txt", fmt.Sprintf("Bayesian fit of %d controls with priors from the section (standard error %.1f %%), both bands on every row",
			len(bayes.Fit.Controls), bayes.Fit.StandardErrorPercent), bayes, results.WriteFitText},
		{"tallow-fit.json", "the same report as JSON", bayes, results.WriteFitJSON},
		{"tallow-fit-table.csv", "its table: both 95 % bands on every row, and the multiple of the largest gauging above it", bayes, results.WriteFitCSV},
		{"tallow-fit-lsq.txt", fmt.Sprintf("least-squares fit, extended by conveyance-slope (standard error %.1f %%)", lsq.Fit.StandardErrorPercent), lsq, results.WriteFitText},
	} {
		rep, write := f.rep, f.write
		if err := d.put(f.name, f.what, func(w io.Writer) error { return write(w, rep) }); err != nil {
			return err
		}
	}
	for _, f := range []struct {
		rep  *gauged.Report
		base string
	}{{bayes, "tallow"}, {lsq, "tallow-lsq"}} {
		figs, w, err := plotting.DrawFit(f.rep, demoSite, f.base, plotting.Size{})
		if err != nil {
			return err
		}
		f.rep.Figures, f.rep.Warnings = figs, append(f.rep.Warnings, w...)
		if err := d.figures(figs); err != nil {
			return err
		}
	}
	return d.put("tallow-fit.xlsx", "results workbook: fit, gaugings with residuals, fitted rating, bands, posterior, lookup by hundredths (extrapolated shaded), n by stage, figure",
		func(w io.Writer) error { return results.WriteFitWorkbook(w, bayes) })
}

// demoBands says, for each fit, its total band at the table's first row
// past demoFitMultiple times the largest gauged discharge.
func demoBands(reps ...*gauged.Report) []string {
	var out []string
	for _, rep := range reps {
		for _, r := range rep.Table.Rows {
			if !(r.Multiple >= demoFitMultiple) || math.IsNaN(r.TotalLower) {
				continue
			}
			out = append(out, fmt.Sprintf("  %s at %.2f m (%.1f times the largest gauging): %.3g m3/s, total 95 %% band %.3g to %.3g (%s)",
				rep.Fit.Method, r.Stage, r.Multiple, r.Discharge, r.TotalLower, r.TotalUpper, r.Basis))
			break
		}
	}
	return out
}
