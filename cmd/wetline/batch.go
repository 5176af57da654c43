package main

import (
	"bufio"
	"context"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"time"

	"wetline/rating"
	"wetline/survey"
	"wetline/survey/batch"
	"wetline/survey/results"
)

// runBatch rates several surveys: one table per section in the -o folder
// with an index (the folder replaced whole when the run succeeds), or one
// long table with --long. A section that fails does not stop the others:
// every section is rated, and when any failed nothing is written (no
// folder, no long table, an earlier output left as it was), every failed
// section is listed on standard error with its error, and the run ends
// with an error saying how many failed.
func runBatch(ctx context.Context, e *env, fs *flagSet, f *rateFlags) error {
	for _, name := range []string{"plots", "calibrate", "gaugings-sheet", "datum", "channel-only", "shape"} {
		if fs.Changed(name) {
			return usagef("rate: --%s is for one section, not a batch of surveys", name)
		}
	}
	if f.allSheets && fs.Changed("sheet") {
		return usagef("rate: give --all-sheets or --sheet, not both")
	}
	if fs.Changed("sheet") {
		for _, a := range fs.Args() {
			if !survey.IsWorkbook(a) {
				return usagef("rate: --sheet names a sheet of the workbooks, and %s is not one", a)
			}
		}
	}
	if err := batch.CheckFolders(fs.Args()); err != nil {
		return err
	}
	var format string
	var err error
	if f.long {
		format, err = outputFormat("rate", f.format, f.output, "csv")
	} else {
		if f.output == "" || f.output == "-" {
			return usagef("rate: with several surveys give -o DIR (a folder for one table per section) or --long")
		}
		if fileLike(f.output) {
			return usagef("rate: with several surveys -o names a folder, not a file (%s); give --long for one table", f.output)
		}
		format, err = outputFormat("rate", f.format, "", "csv", "json")
	}
	if err != nil {
		return err
	}
	jobs, inputs, warnings, err := batch.ListWarn(fs.Args(), f.sheet, format)
	if err != nil {
		return err
	}
	if err := results.WriteWarnings(e.stderr, warnings); err != nil {
		return err
	}
	req, err := f.request("")
	if err != nil {
		return err
	}
	e.files.Protect(inputs...)
	prog := &progress{e: e, total: len(jobs), start: time.Now()}
	opt := batch.Options{Request: req, Stages: f.stageSpec(fs), Progress: prog.update,
		Rating: rating.Options{Slope: f.slope, Units: req.Units, Geometry: f.geometry()}}
	sum, where, err := writeBatch(ctx, e, f, format, jobs, opt)
	prog.done()
	if err != nil {
		return err
	}
	if sum.Failed > 0 {
		// Nothing was committed: list every failure, as no index holds them.
		if err := results.WriteBatchFailures(e.stderr, sum.Entries); err != nil {
			return err
		}
		return fmt.Errorf("%w; nothing was written, so %s", sum.Err("above"), untouched(f))
	}
	index, note := "", "above"
	if !f.long {
		index = filepath.Join(f.output, batch.IndexFile)
		note = "in " + index
	}
	if err := results.WriteBatchSummary(e.stderr, sum.Entries, where, index); err != nil {
		return err
	}
	return sum.Err(note)
}

// untouched says which output a failed batch left as it was.
func untouched(f *rateFlags) string {
	if f.output == "" || f.output == "-" {
		return "standard output holds no table"
	}
	return f.output + " is as it was before the run"
}

// writeBatch rates the jobs into the -o folder, or into one long table,
// and commits the output only when no section failed; it says where the
// tables went. A long table for standard output is held in a temporary
// file until the batch is known to have no failed section.
func writeBatch(ctx context.Context, e *env, f *rateFlags, format string, jobs []batch.Job, opt batch.Options) (batch.Summary, string, error) {
	var sum batch.Summary
	var err error
	// A failed section fails the run, and run discards what a failed run
	// wrote: commit only a clean batch.
	commit := func() error {
		if sum.Failed > 0 {
			return nil
		}
		return e.files.Commit()
	}
	switch {
	case !f.long:
		sum, err = batch.Folder(ctx, e.files, f.output, format, jobs, opt)
		if err == nil {
			e.pass("staged")
			err = commit()
		}
		return sum, fmt.Sprintf("%s (index: %s)", f.output, filepath.Join(f.output, batch.IndexFile)), err
	case f.output == "" || f.output == "-":
		sum, err = longToStdout(ctx, e.stdout, jobs, opt)
		return sum, "one table on standard output", err
	}
	err = e.files.Write(f.output, func(w io.Writer) error {
		var werr error
		sum, werr = batch.Long(ctx, w, jobs, opt)
		return werr
	})
	if err == nil {
		e.pass("staged")
		err = commit()
	}
	return sum, "one table on " + f.output, err
}

// longToStdout writes the long table into a temporary file and copies it
// to stdout only when no section failed.
func longToStdout(ctx context.Context, stdout io.Writer, jobs []batch.Job, opt batch.Options) (batch.Summary, error) {
	tmp, err := os.CreateTemp("", "wetline-long-*.csv")
	if err != nil {
		return batch.Summary{}, err
	}
	defer func() {
		tmp.Close()
		os.Remove(tmp.Name())
	}()
	bw := bufio.NewWriter(tmp)
	sum, err := batch.Long(ctx, bw, jobs, opt)
	if err == nil {
		err = bw.Flush()
	}
	if err != nil || sum.Failed > 0 {
		return sum, err
	}
	if _, err := tmp.Seek(0, io.SeekStart); err != nil {
		return sum, err
	}
	_, err = io.Copy(stdout, tmp)
	return sum, err
}

// progress shows "rating: k of n sections" on standard error when it is
// a terminal and the batch has run for the environment's progress delay.
type progress struct {
	e        *env
	total    int
	start    time.Time
	last     time.Time
	shown    bool
	finished int
}

func (p *progress) update(k, total int) {
	p.finished = k
	p.e.pass(fmt.Sprintf("section %d", k))
	if !p.e.stderrTTY {
		return
	}
	now := time.Now()
	if now.Sub(p.start) < p.e.progressDelay || now.Sub(p.last) < p.e.progressEvery {
		return
	}
	p.last, p.shown = now, true
	fmt.Fprintf(p.e.stderr, "\rrating: %d of %d sections (%.0f s)", k, total, now.Sub(p.start).Seconds())
}

// done ends the progress line, if one was shown.
func (p *progress) done() {
	if p.shown {
		fmt.Fprintf(p.e.stderr, "\rrating: %d of %d sections (%.0f s)\n", p.finished, p.total, time.Since(p.start).Seconds())
	}
}

// fileLike reports a path whose extension is a file format's, which a
// folder's name would hardly have.
func fileLike(path string) bool {
	switch strings.ToLower(filepath.Ext(path)) {
	case ".csv", ".json", ".txt", ".xlsx", ".xls", ".tsv", ".png":
		return true
	}
	return false
}
