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
// every section is rated, and when any failed, or none was rated (every
// one skipped), nothing is written (no folder, no long table, an earlier
// output left as it was), every failed section is listed on standard
// error with its error, and the run ends with an error saying how many
// failed or that nothing was rated.
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
		format, err = outputFormat("rate --long", f.format, f.output, "csv")
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
	st, err := writeBatch(ctx, e, f, format, jobs, opt)
	defer st.done()
	prog.done()
	if err != nil {
		return err
	}
	sum := st.sum
	if !sum.Clean() {
		// Nothing is put in place: list every failure, as no index holds
		// them.
		e.files.Discard()
		if err := results.WriteBatchFailures(e.stderr, sum.Entries); err != nil {
			return err
		}
		return fmt.Errorf("%w; nothing was written, so %s", sum.Err("above"), untouched(f))
	}
	e.pass("staged")
	if err := st.put(); err != nil {
		return err
	}
	index := ""
	if !f.long {
		index = filepath.Join(f.output, batch.IndexFile)
	}
	return results.WriteBatchSummary(e.stderr, sum.Entries, st.where, index)
}

// untouched says which output a failed batch left as it was.
func untouched(f *rateFlags) string {
	if f.output == "" || f.output == "-" {
		return "standard output holds no table"
	}
	return f.output + " is as it was before the run"
}

// stagedBatch is a batch rated with its output staged, not yet in place.
type stagedBatch struct {
	sum batch.Summary
	// where says where the tables go.
	where string
	// put puts the output in place; the caller calls it only for a clean
	// batch (batch.Summary.Clean), once, and for no other.
	put func() error
	// done removes what is still held aside; it is always called.
	done func()
}

// writeBatch rates the jobs into the -o folder, or into one long table,
// and stages the output without putting any of it in place: that is the
// caller's, once the batch is known to be clean. A long table for
// standard output is held in a temporary file until then.
func writeBatch(ctx context.Context, e *env, f *rateFlags, format string, jobs []batch.Job, opt batch.Options) (stagedBatch, error) {
	st := stagedBatch{put: e.files.Commit, done: func() {}}
	var err error
	switch {
	case !f.long:
		st.where = fmt.Sprintf("%s (index: %s)", f.output, filepath.Join(f.output, batch.IndexFile))
		st.sum, err = batch.Folder(ctx, e.files, f.output, format, jobs, opt)
	case f.output == "" || f.output == "-":
		st.where = "one table on standard output"
		st.sum, st.put, st.done, err = longToStdout(ctx, e.stdout, jobs, opt)
	default:
		st.where = "one table on " + f.output
		err = stdoutHint(e.files.Write(f.output, func(w io.Writer) error {
			var werr error
			st.sum, werr = batch.Long(ctx, w, jobs, opt)
			return werr
		}))
	}
	return st, err
}

// longToStdout writes the long table into a temporary file; put copies
// it to stdout, and done removes the file.
func longToStdout(ctx context.Context, stdout io.Writer, jobs []batch.Job, opt batch.Options) (batch.Summary, func() error, func(), error) {
	tmp, err := os.CreateTemp("", "wetline-long-*.csv")
	if err != nil {
		return batch.Summary{}, nil, func() {}, err
	}
	done := func() {
		tmp.Close()
		os.Remove(tmp.Name())
	}
	bw := bufio.NewWriter(tmp)
	sum, err := batch.Long(ctx, bw, jobs, opt)
	if err == nil {
		err = bw.Flush()
	}
	put := func() error {
		if _, err := tmp.Seek(0, io.SeekStart); err != nil {
			return err
		}
		_, err := io.Copy(stdout, tmp)
		return err
	}
	return sum, put, done, err
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
