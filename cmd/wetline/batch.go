package main

import (
	"context"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"time"

	"github.com/spf13/pflag"

	"wetline/rating"
	"wetline/survey"
	"wetline/survey/output"
	"wetline/survey/results"
)

// batchFlags are the flags of rate that concern several surveys.
type batchFlags struct {
	allSheets bool
	long      bool
}

func (b *batchFlags) register(fs *pflag.FlagSet) {
	fs.BoolVar(&b.allSheets, "all-sheets", false, "rate every sheet of a workbook that holds a survey (a station and an elevation column)")
	fs.BoolVar(&b.long, "long", false, "with several surveys (files, folders, --all-sheets) -o names a folder for one table per section and an index; --long writes one long CSV table with a section column instead (to -o FILE or standard output)")
}

// isBatch reports whether rate was given several surveys: more than one
// path, a folder, or --all-sheets.
func (f *rateFlags) isBatch(args []string) bool {
	if len(args) > 1 || f.batch.allSheets {
		return true
	}
	if len(args) == 1 {
		if st, err := os.Stat(args[0]); err == nil && st.IsDir() {
			return true
		}
	}
	return false
}

// indexFile is the name of the index table written beside the tables.
const indexFile = "index.csv"

// progressDelay is how long a batch runs before it shows a progress line
// (only when standard error is a terminal); progressEvery is the shortest
// time between two updates.
var (
	progressDelay = time.Second
	progressEvery = 200 * time.Millisecond
)

// batchJob is one survey of a batch: a CSV file or a workbook sheet.
type batchJob struct {
	path, sheet string
	name        string // section name, unique in the batch
	out         string // output file name in the folder
	err         error  // found while listing the inputs
}

func (j batchJob) source() string {
	if j.sheet != "" {
		return fmt.Sprintf("%s['%s']", j.path, j.sheet)
	}
	return j.path
}

// batchResult is what rating one job gives.
type batchResult struct {
	entry results.IndexEntry
	table rating.Table // kept only for the long table
}

// batch holds what every job of one batch run shares.
type batch struct {
	f         *rateFlags
	format    string
	outDir    string   // folder of tables, "" for the long table
	protected []string // inputs an output could land on
	keepTable bool
	compute   bool // false: only read (for measuring)
}

// runBatch rates several surveys on a pool of GOMAXPROCS workers and
// writes their tables in input order: one file per section in the -o
// folder with an index table, or one long table with --long. A section
// that fails is listed with its error and does not stop the others; the
// run then ends with an error saying how many failed.
func runBatch(ctx context.Context, e *env, f *rateFlags, args []string) error {
	if !(f.slope > 0) || math.IsInf(f.slope, 0) {
		return usagef("rate: --slope S (a positive friction slope) is required")
	}
	if len(f.stages) > 0 && (!math.IsNaN(f.from) || !math.IsNaN(f.to) || !math.IsNaN(f.step)) {
		return usagef("rate: give --stages or --from/--to/--step, not both")
	}
	b := &batch{f: f, compute: true}
	var err error
	if f.batch.long {
		if b.format, err = outputFormat(f.format, f.output, "csv"); err != nil {
			return err
		}
		b.keepTable = true
	} else {
		if f.output == "" {
			return usagef("rate: with several surveys give -o DIR (a folder for one table per section) or --long")
		}
		if b.format, err = outputFormat(f.format, "", "csv", "json"); err != nil {
			return err
		}
		b.outDir = f.output
	}
	jobs, inputs, err := listSurveys(args, f.sheet, b.format)
	if err != nil {
		return err
	}
	if b.outDir != "" {
		if err := os.MkdirAll(b.outDir, 0o755); err != nil {
			return err
		}
		b.protected = inputsIn(b.outDir, inputs)
	} else if f.output != "" {
		if err := output.CheckOutput(f.output, inputs); err != nil {
			return err
		}
	}
	start := time.Now()
	prog := &progress{e: e, total: len(jobs), start: start}
	var entries []results.IndexEntry
	failed := 0
	emit := func(long *results.LongRatingWriter) func(int, batchResult) error {
		return func(i int, r batchResult) error {
			entries = append(entries, r.entry)
			if r.entry.Err != "" {
				failed++
			} else if long != nil {
				if err := long.Write(r.entry.Section, r.table); err != nil {
					return err
				}
			}
			prog.update(i + 1)
			return nil
		}
	}
	run := func(long *results.LongRatingWriter) error {
		return orderedPool(ctx, len(jobs), runtime.GOMAXPROCS(0),
			func(i int) batchResult { return b.rate(jobs[i]) }, emit(long))
	}
	switch {
	case b.outDir != "":
		if err := run(nil); err != nil {
			return err
		}
		prog.done()
		index := filepath.Join(b.outDir, indexFile)
		if err := output.WriteFile(index, b.protected, func(w io.Writer) error {
			return results.WriteIndexCSV(w, entries)
		}); err != nil {
			return err
		}
		fmt.Fprintf(e.stderr, "rated %d of %d sections into %s (index: %s)\n", len(jobs)-failed, len(jobs), b.outDir, index)
	default:
		write := func(w io.Writer) error {
			long := results.NewLongRatingWriter(w)
			if err := run(long); err != nil {
				return err
			}
			return long.Flush()
		}
		if f.output == "" {
			err = write(e.stdout)
		} else {
			err = output.WriteFile(f.output, inputs, write)
		}
		if err != nil {
			return err
		}
		prog.done()
		where := "standard output"
		if f.output != "" {
			where = f.output
		}
		fmt.Fprintf(e.stderr, "rated %d of %d sections into one table on %s\n", len(jobs)-failed, len(jobs), where)
	}
	shown := 0
	for _, en := range entries {
		if en.Err != "" && shown < survey.MaxReported {
			fmt.Fprintf(e.stderr, "failed: %s: %s\n", en.Section, en.Err)
			shown++
		}
	}
	fmt.Fprintln(e.stderr, "caution: "+rating.Caution)
	if failed > 0 {
		return fmt.Errorf("%d of %d sections failed (each is listed with its error%s)", failed, len(jobs), indexNote(b.outDir))
	}
	return nil
}

func indexNote(dir string) string {
	if dir == "" {
		return " above"
	}
	return " in " + filepath.Join(dir, indexFile)
}

// rate reads, rates and (with a folder) writes one survey.
func (b *batch) rate(j batchJob) batchResult {
	nan := math.NaN()
	en := results.IndexEntry{Section: j.name, Source: j.source(),
		StageMin: nan, StageMax: nan, BankfullStage: nan, BankfullDischarge: nan}
	fail := func(err error) batchResult {
		en.Err = strings.ReplaceAll(strings.TrimSpace(err.Error()), "\n", "; ")
		return batchResult{entry: en}
	}
	if j.err != nil {
		return fail(j.err)
	}
	sf := b.f.sectionFlags
	sf.sheet = j.sheet
	l, err := sf.load(j.path)
	if err != nil {
		return fail(err)
	}
	if !b.compute {
		return batchResult{entry: en}
	}
	stages, err := b.f.stageList(l)
	if err != nil {
		return fail(err)
	}
	opt := rating.Options{Slope: b.f.slope, Units: l.units, Geometry: l.geomOpt}
	t, err := rating.Compute(l.geom, stages, opt)
	if err != nil {
		return fail(err)
	}
	t.Name = j.name
	warnings := append(append([]string(nil), l.warnings...), t.Warnings...)
	en.Rows, en.Warnings = len(t.Rows), warnings
	for i, r := range t.Rows {
		if i == 0 || r.Stage < en.StageMin {
			en.StageMin = r.Stage
		}
		if i == 0 || r.Stage > en.StageMax {
			en.StageMax = r.Stage
		}
	}
	if hb, ok := l.section.Bankfull(); ok {
		en.BankfullStage = hb
		if bt, err := rating.Compute(l.geom, []float64{hb}, opt); err == nil && len(bt.Rows) == 1 {
			en.BankfullDischarge = bt.Rows[0].Discharge
		}
	}
	if b.outDir != "" {
		path := filepath.Join(b.outDir, j.out)
		if err := output.WriteFile(path, b.protected, func(w io.Writer) error {
			if b.format == "json" {
				return results.WriteRatingJSON(w, t, warnings)
			}
			return results.WriteRatingCSV(w, t)
		}); err != nil {
			return fail(err)
		}
		en.Output = j.out
	}
	r := batchResult{entry: en}
	if b.keepTable {
		r.table = t
	}
	return r
}

// listSurveys expands the arguments into jobs in input order: a folder
// gives its CSV files and workbooks in name order; a workbook gives every
// sheet holding a survey (or the named sheet). It also returns every input
// file. Section names are made unique and give the output file names.
func listSurveys(args []string, sheet, format string) ([]batchJob, []string, error) {
	var files []string
	for _, a := range args {
		st, err := os.Stat(a)
		if err != nil || !st.IsDir() {
			files = append(files, a) // a missing file fails as its section
			continue
		}
		ents, err := os.ReadDir(a)
		if err != nil {
			return nil, nil, err
		}
		n := len(files)
		for _, en := range ents {
			name := en.Name()
			ext := strings.ToLower(filepath.Ext(name))
			if en.IsDir() || strings.HasPrefix(name, ".") || (ext != ".csv" && !survey.IsWorkbook(name)) {
				continue
			}
			files = append(files, filepath.Join(a, name))
		}
		if len(files) == n {
			return nil, nil, fmt.Errorf("%s: no survey files (.csv, .xlsx) in the folder", a)
		}
	}
	var jobs []batchJob
	for _, path := range files {
		base := strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
		switch {
		case !survey.IsWorkbook(path):
			jobs = append(jobs, batchJob{path: path, name: base})
		case sheet != "":
			jobs = append(jobs, batchJob{path: path, sheet: sheet, name: sheet})
		default:
			sheets, err := survey.SectionSheets(path)
			if err == nil && len(sheets) == 0 {
				err = fmt.Errorf("%s: no sheet has a station and an elevation column", path)
			}
			if err != nil {
				jobs = append(jobs, batchJob{path: path, name: base, err: err})
			}
			for _, s := range sheets {
				jobs = append(jobs, batchJob{path: path, sheet: s, name: s})
			}
		}
	}
	uniqueNames(jobs, format)
	return jobs, files, nil
}

// uniqueNames gives every job a distinct section name and output file
// name (case-insensitively, the index file's name kept free).
func uniqueNames(jobs []batchJob, format string) {
	used := map[string]bool{strings.ToLower(indexFile): true}
	for i := range jobs {
		stem := safeFileName(jobs[i].name)
		out := stem + "." + format
		for k := 2; used[strings.ToLower(out)]; k++ {
			out = fmt.Sprintf("%s-%d.%s", stem, k, format)
		}
		used[strings.ToLower(out)] = true
		jobs[i].out = out
		if s := strings.TrimSuffix(out, "."+format); s != stem {
			jobs[i].name = fmt.Sprintf("%s (%s)", jobs[i].name, s)
		}
	}
}

// safeFileName keeps letters, digits, '.', '-' and '_' of a section name.
func safeFileName(name string) string {
	var b strings.Builder
	for _, r := range name {
		switch {
		case r >= 'a' && r <= 'z', r >= 'A' && r <= 'Z', r >= '0' && r <= '9', r == '-', r == '_', r == '.':
			b.WriteRune(r)
		default:
			b.WriteByte('_')
		}
	}
	s := strings.Trim(b.String(), ".")
	if s == "" {
		s = "section"
	}
	return s
}

// inputsIn returns the inputs that resolve into dir: the only ones an
// output written there could replace.
func inputsIn(dir string, inputs []string) []string {
	d, err := filepath.EvalSymlinks(dir)
	if err != nil {
		return inputs
	}
	d, _ = filepath.Abs(d)
	var out []string
	for _, in := range inputs {
		p, err := filepath.EvalSymlinks(in)
		if err != nil {
			out = append(out, in)
			continue
		}
		if p, _ = filepath.Abs(p); filepath.Dir(p) == d {
			out = append(out, in)
		}
	}
	return out
}

// orderedPool runs do(i) for i in [0, n) on the given number of workers
// and calls emit(i, result) for every i in increasing order, from the
// calling goroutine. At most a few results per worker wait to be emitted,
// so memory stays bounded however long the batch. An error from emit, or
// the context ending, stops the pool.
func orderedPool[T any](ctx context.Context, n, workers int, do func(i int) T, emit func(i int, r T) error) error {
	if workers < 1 {
		workers = 1
	}
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	slots := make([]chan T, n)
	for i := range slots {
		slots[i] = make(chan T, 1)
	}
	ahead := make(chan struct{}, 4*workers)
	jobs := make(chan int)
	go func() {
		defer close(jobs)
		for i := 0; i < n; i++ {
			select {
			case ahead <- struct{}{}:
			case <-ctx.Done():
				return
			}
			select {
			case jobs <- i:
			case <-ctx.Done():
				return
			}
		}
	}()
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range jobs {
				slots[i] <- do(i)
			}
		}()
	}
	var err error
	for i := 0; i < n && err == nil; i++ {
		select {
		case r := <-slots[i]:
			<-ahead
			err = emit(i, r)
		case <-ctx.Done():
			err = ctx.Err()
		}
	}
	cancel()
	wg.Wait()
	return err
}

// progress shows "rated k of n sections" on standard error when it is a
// terminal and the batch has run for progressDelay.
type progress struct {
	e        *env
	total    int
	start    time.Time
	last     time.Time
	shown    bool
	finished int
}

func (p *progress) update(k int) {
	p.finished = k
	if !p.e.stderrTTY {
		return
	}
	now := time.Now()
	if now.Sub(p.start) < progressDelay || now.Sub(p.last) < progressEvery {
		return
	}
	p.last, p.shown = now, true
	fmt.Fprintf(p.e.stderr, "\rrating: %d of %d sections (%.0f s)", k, p.total, now.Sub(p.start).Seconds())
}

// done ends the progress line, if one was shown.
func (p *progress) done() {
	if p.shown {
		fmt.Fprintf(p.e.stderr, "\rrating: %d of %d sections (%.0f s)\n", p.finished, p.total, time.Since(p.start).Seconds())
	}
}
