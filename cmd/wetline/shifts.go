package main

import (
	"context"
	"fmt"
	"io"
	"path/filepath"
	"strings"
	"time"

	"wetline/plotting"
	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/survey"
	"wetline/survey/results"
)

const shiftsUsage = "shifts GAUGINGS --rating FILE[@TIME] [--rating FILE@TIME ...] [--shifts FILE] [--proposed FILE.csv] [--visit-gap DURATION] " +
	"[--utc-offset ±HH:MM] [--zero-flow E,...] [--highest-gauging H,...] [--extrapolate] [--datum D] [--units si|us] " +
	"[--format text|json|csv|xlsx] [-o FILE] [--plots DIR] [--site NAME]"

// shiftsFlags are the flags of the shifts command.
type shiftsFlags struct {
	historyFlags
	gaugingsSheet string
	proposed      string
	visitGap      time.Duration
	format        string
	output        string
	plots, site   string
}

func (f *shiftsFlags) register(fs *flagSet) {
	f.historyFlags.register(fs)
	fs.StringVar(&f.gaugingsSheet, "gaugings-sheet", "", "workbook sheet of the gaugings (default: a sheet named gaugings, else the first)")
	fs.StringVar(&f.proposed, "proposed", "", "also write each visit's proposed shift diagram to this CSV file, headers naming the unit (stage (ft), shift (ft)), to edit and give back with --shifts")
	fs.DurationVar(&f.visitGap, "visit-gap", gauged.DefaultVisitGap, "longest time between gaugings of one field visit, as 12h (a visit is split where a rating period begins); 0 makes every gauging its own visit")
	fs.StringVar(&f.format, "format", "", "output format: text, json, csv or xlsx (needs -o); default: from the -o extension, else text")
	fs.StringVarP(&f.output, "output", "o", "", "output file (default: standard output)")
	fs.StringVar(&f.plots, "plots", "", "also write the figures of shift against time and against stage (PNG) into this folder")
	fs.output(outputFile, "output", "proposed")
	fs.output(outputFolder, "plots")
	fs.StringVar(&f.site, "site", "", siteUsage)
}

func runShifts(ctx context.Context, e *env, args []string) error {
	fs := newFlags("shifts", shiftsUsage)
	f := shiftsFlags{historyFlags: historyFlags{cmd: "shifts"}}
	f.register(fs)
	if err := fs.parseOperands(e, args, 1, "one GAUGINGS file"); err != nil {
		return err
	}
	format, err := outputFormat("shifts", f.format, f.output, "text", "json", "csv", "xlsx")
	if err != nil {
		return err
	}
	if f.visitGap < 0 {
		return usagef("shifts: --visit-gap %v: want a duration of zero or more", f.visitGap)
	}
	if ext := strings.ToLower(filepath.Ext(f.proposed)); f.proposed != "" && ext != ".csv" {
		return usagef("shifts: --proposed %s: the proposed diagrams are written as CSV: name the file .csv", f.proposed)
	}
	c, err := f.check(fs, fs.Arg(0))
	if err != nil {
		return err
	}
	if f.plots != "" || format == "xlsx" {
		base := strings.TrimSuffix(filepath.Base(fs.Arg(0)), filepath.Ext(fs.Arg(0)))
		figs, w, err := plotting.DrawShifts(c, c.Provenance.Site.Name, base, plotting.Size{})
		if err != nil {
			return err
		}
		c.Figures, c.Warnings = figs, append(c.Warnings, w...)
	}
	if f.proposed != "" {
		e.files.Protect(c.Provenance.Inputs...)
		if err := e.files.Check(f.proposed); err != nil {
			return err
		}
		if err := e.files.Write(f.proposed, func(w io.Writer) error { return results.WriteProposedShifts(w, c) }); err != nil {
			return err
		}
	}
	write := map[string]func(io.Writer, *gauged.ShiftCheck) error{
		"text": results.WriteShiftsText, "json": results.WriteShiftsJSON, "csv": results.WriteShiftsCSV, "xlsx": results.WriteShiftsWorkbook,
	}[format]
	err = e.deliver(delivery{output: f.output, inputs: c.Provenance.Inputs,
		write:  func(w io.Writer) error { return write(w, c) },
		inline: format == "text" || format == "json", warnings: c.Warnings, notes: c.Provenance.Notes, plots: f.plots, figs: c.Figures,
		summary: func(w io.Writer) error { return results.WriteShiftsSummary(w, c, f.output) }})
	if err == nil && f.proposed != "" {
		_, err = fmt.Fprintf(e.stderr, "wrote %s: the proposed shift diagrams, to edit and give back with --shifts\n", f.proposed)
	}
	return err
}

// check reads the history and the gaugings and measures the gaugings.
func (f *shiftsFlags) check(fs *flagSet, path string) (*gauged.ShiftCheck, error) {
	h, inputs, warnings, err := f.history(fs)
	if err != nil {
		return nil, err
	}
	r, err := f.compile(h)
	if err != nil {
		return nil, err
	}
	gs, err := survey.ReadGaugingsAt(path, f.gaugingsSheet, time.Duration(f.offset))
	if err != nil {
		return nil, err
	}
	if err := f.tableUnits(gs.Units, path); err != nil {
		return nil, err
	}
	gs.Warnings = append(gs.Warnings, gs.SpanWarnings(f.unitSystem)...)
	gap := f.visitGap
	if gap == 0 {
		// The library reads a zero gap as its default; the flag's 0 means
		// no two instants share a visit.
		gap = time.Nanosecond
	}
	c, err := r.CheckGaugings(gs.Gaugings, gauged.CheckOptions{VisitGap: gap, Units: f.unitSystem, UTCOffset: time.Duration(f.offset)})
	if err != nil {
		return nil, usageError{err: err}
	}
	c.Provenance = rating.Provenance{Program: program(), Inputs: append([]string{path}, inputs...), Site: siteWith(gs.Site, f.site), Notes: f.notes}
	c.Warnings = append(append(warnings, gs.Warnings...), c.Warnings...)
	return &c, nil
}
