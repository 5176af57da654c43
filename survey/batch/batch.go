// Package batch rates many surveyed sections at once: every survey file
// of a folder, every survey sheet of a workbook, or a list of files. The
// sections are rated on a pool of workers and their results come back in
// input order; a section that fails is listed with its error and does not
// stop the others, so that every failure is found in one run. The
// command commits a batch's output only when it is clean: no section
// failed, and at least one was rated (Summary.Clean).
//
// A survey with a header and no rows (a blank sheet of the field
// workbook) is skipped with a note, not failed.
//
// A batch writes either a folder (one table per section and an index,
// replaced whole when the run succeeds: see output.Folder) or one long
// table with a section column.
package batch

import (
	"bytes"
	"context"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"time"

	"wetline/rating"
	"wetline/subdivide"
	"wetline/survey"
	"wetline/survey/output"
	"wetline/survey/rate"
	"wetline/survey/results"
)

// IndexFile is the name of the index table written into a batch folder;
// it also marks a folder as an earlier batch output, which may be
// replaced when it holds nothing but the index and the tables the index
// lists (IndexedFiles).
const IndexFile = "index.csv"

// ErrIndex: an index table has no output column.
var ErrIndex = errors.New("not a batch index: it has no output column")

// IndexedFiles returns the table files an index table (IndexFile, as
// results.WriteIndexCSV writes it) lists in its output column.
func IndexedFiles(index []byte) ([]string, error) {
	rows, err := csv.NewReader(bytes.NewReader(index)).ReadAll()
	if err != nil {
		return nil, err
	}
	if len(rows) == 0 {
		return nil, ErrIndex
	}
	col := -1
	for i, name := range rows[0] {
		if strings.TrimPrefix(name, "\ufeff") == "output" {
			col = i
		}
	}
	if col < 0 {
		return nil, ErrIndex
	}
	var names []string
	for _, r := range rows[1:] {
		if col < len(r) && r[col] != "" {
			names = append(names, r[col])
		}
	}
	return names, nil
}

// Job is one survey of a batch: a CSV file or a workbook sheet.
type Job struct {
	// Path and Sheet say where the survey is (Sheet "" for a CSV file).
	Path, Sheet string
	// Name is the section's name, unique in the batch; Output the name of
	// its table file in a batch folder.
	Name, Output string
	// Err is a problem found while listing the inputs (the job fails).
	Err error
}

// Source names the job's survey: the file, and the sheet in brackets.
func (j Job) Source() string {
	if j.Sheet != "" {
		return fmt.Sprintf("%s['%s']", j.Path, j.Sheet)
	}
	return j.Path
}

// ErrNoSurveys is returned for a folder without survey files.
var ErrNoSurveys = errors.New("no survey files (.csv, .xlsx) in the folder")

// List expands arguments into jobs in input order: a folder gives its CSV
// files and workbooks in name order (hidden files skipped); a workbook
// gives every sheet holding a survey (station and elevation columns), or
// only the named sheet. It also returns every input file. Section names
// are made unique and give the table file names, with extension ext.
func List(args []string, sheet, ext string) ([]Job, []string, error) {
	jobs, files, _, err := ListWarn(args, sheet, ext)
	return jobs, files, err
}

// ListWarn is List, and also returns warnings: hidden sheets of a
// workbook are passed over, each named in a warning, and a named sheet
// that is hidden is read with a warning. A workbook taking values from
// other workbooks is warned of here, once, and not with each of its
// sheets rated.
//
// A CSV file of a folder whose header plainly makes it another kind of
// table (a reach table, gaugings, a rating table, shift diagrams, a stage
// record: see survey.SniffCSV) is
// skipped, and one warning lists them; a file named on its own is rated
// whatever it holds. A coordinate survey and a survey by station
// projected from it (its eastings and northings the same) are both rated,
// with a warning that the section is rated twice.
func ListWarn(args []string, sheet, ext string) ([]Job, []string, []string, error) {
	var files, skipped []string
	sniffs := map[string]survey.Sniff{}
	for _, a := range args {
		st, err := os.Stat(a)
		if err != nil || !st.IsDir() {
			files = append(files, a) // a missing file fails as its section
			if !survey.IsWorkbook(a) {
				if sn, err := survey.SniffCSV(a); err == nil {
					sniffs[a] = sn
				}
			}
			continue
		}
		found, err := surveyFiles(a)
		if err != nil {
			return nil, nil, nil, err
		}
		kept := 0
		for _, f := range found {
			if !survey.IsWorkbook(f) {
				sn, err := survey.SniffCSV(f)
				if err == nil && sn.Other != "" {
					skipped = append(skipped, fmt.Sprintf("%s (%s)", filepath.Base(f), sn.Other))
					continue
				}
				if err == nil {
					sniffs[f] = sn
				}
			}
			files = append(files, f)
			kept++
		}
		if kept == 0 {
			return nil, nil, nil, fmt.Errorf("%s: %w (%s)", a, ErrNoSurveys, strings.Join(skipped, ", "))
		}
	}
	var jobs []Job
	var warnings []string
	if len(skipped) > 0 {
		warnings = append(warnings, fmt.Sprintf("skipped %s that %s: %s", rating.Counted(len(skipped), "file", "files"), rating.Agree(len(skipped), "is not a survey", "are not surveys"), strings.Join(skipped, ", ")))
	}
	warnings = append(warnings, twinWarnings(files, sniffs)...)
	var owner []int // the index in files of each job's file
	for i, path := range files {
		js, ws := fileJobs(path, sheet)
		jobs = append(jobs, js...)
		warnings = append(warnings, ws...)
		for range js {
			owner = append(owner, i)
		}
	}
	uniqueNames(jobs, ext)
	warnings = append(warnings, sameFileWarnings(files, jobs, owner)...)
	return jobs, files, warnings, nil
}

// sameFileWarnings warns of each pair of files that are one file (one
// path named twice, two spellings of it, a link: os.SameFile), whose
// sections are rated twice under two names; owner gives the index in
// files of each job's file. Two files of the same content are two
// surveys, and not warned of here. Each file is looked at once: only
// files of one size and time are compared (a batch may hold thousands).
func sameFileWarnings(files []string, jobs []Job, owner []int) []string {
	type key struct {
		size int64
		mod  time.Time
	}
	infos := make([]fs.FileInfo, len(files))
	groups := map[key][]int{}
	for i, f := range files {
		st, err := os.Stat(f)
		if err != nil {
			continue // a missing file fails as its section
		}
		infos[i] = st
		k := key{st.Size(), st.ModTime()}
		groups[k] = append(groups[k], i)
	}
	sections := func(f int) string {
		var names []string
		for k, j := range jobs {
			if owner[k] == f {
				names = append(names, j.Name)
			}
		}
		return rating.JoinAnd(names)
	}
	var out []string
	for b := range files {
		if infos[b] == nil {
			continue
		}
		for _, a := range groups[key{infos[b].Size(), infos[b].ModTime()}] {
			if a >= b || !os.SameFile(infos[a], infos[b]) {
				continue
			}
			which := fmt.Sprintf("%s and %s are the same survey file", files[a], files[b])
			if files[a] == files[b] {
				which = fmt.Sprintf("%s is named twice, the same survey file", files[a])
			}
			out = append(out, fmt.Sprintf("%s: it is rated twice, as %s and as %s; leave one of them out", which, sections(a), sections(b)))
		}
	}
	return out
}

// twinWarnings warns of each coordinate survey among files whose points
// a survey by station among them also gives (projected from it: the
// first points of the coordinate survey are among the other's): the
// section would be rated twice.
func twinWarnings(files []string, sniffs map[string]survey.Sniff) []string {
	var out []string
	for _, c := range files {
		sc, ok := sniffs[c]
		if !ok || sc.Projected || len(sc.Points) == 0 {
			continue
		}
		for _, p := range files {
			sp, ok := sniffs[p]
			if !ok || !sp.Projected || !sharesPoints(sc.Points, sp.Points) {
				continue
			}
			out = append(out, fmt.Sprintf("%s and %s hold one section (%s gives stations projected from the eastings and northings of %s): it is rated twice; leave one of them out",
				c, p, filepath.Base(p), filepath.Base(c)))
		}
	}
	return out
}

// sharesPoints reports whether the first points of a (up to three) are
// all among b's.
func sharesPoints(a, b [][2]float64) bool {
	in := map[[2]float64]bool{}
	for _, p := range b {
		in[p] = true
	}
	for _, p := range a[:min(3, len(a))] {
		if !in[p] {
			return false
		}
	}
	return true
}

// CheckFolders returns the error of the first folder among args that
// holds no survey file (wrapping ErrNoSurveys), nil when each folder holds
// one; files are not looked at. A command checks its folders so before
// asking how a batch is to be written.
func CheckFolders(args []string) error {
	for _, a := range args {
		if st, err := os.Stat(a); err == nil && st.IsDir() {
			if _, err := surveyFiles(a); err != nil {
				return err
			}
		}
	}
	return nil
}

// surveyFiles lists the survey files of a folder in name order.
func surveyFiles(dir string) ([]string, error) {
	ents, err := os.ReadDir(dir)
	if err != nil {
		return nil, err
	}
	var out []string
	for _, en := range ents {
		name := en.Name()
		ext := strings.ToLower(filepath.Ext(name))
		if en.IsDir() || strings.HasPrefix(name, ".") || (ext != ".csv" && !survey.IsWorkbook(name)) {
			continue
		}
		out = append(out, filepath.Join(dir, name))
	}
	if len(out) == 0 {
		return nil, fmt.Errorf("%s: %w", dir, ErrNoSurveys)
	}
	return out, nil
}

// fileJobs returns the jobs of one input file: a CSV file, the named
// sheet, or every visible survey sheet of a workbook, each sheet that
// cannot be read being a failing job of its own; and the warnings of a
// workbook as a whole (its links to other workbooks, given here once and
// not with each sheet rated: see survey.OpenBook), those naming hidden
// survey sheets passed over (a named sheet that is hidden is read, and
// the section's own warnings say so), and one listing every other sheet
// not rated with its reason (not a survey table, and what it is; or
// refused, and its error).
func fileJobs(path, sheet string) ([]Job, []string) {
	base := strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
	if !survey.IsWorkbook(path) {
		return []Job{{Path: path, Name: base}}, nil
	}
	sheets, warnings, err := survey.SurveySheetsWarn(path)
	if err != nil {
		return []Job{{Path: path, Name: base, Err: err}}, nil
	}
	if sheet != "" {
		// A named hidden sheet is read, and its reader warns of it.
		return []Job{{Path: path, Sheet: sheet, Name: sheet}}, warnings
	}
	var jobs []Job
	var hidden, others []string
	for _, s := range sheets {
		switch {
		case s.Hidden && (s.Survey || s.Err != nil):
			hidden = append(hidden, "'"+s.Sheet+"'")
		case s.Survey || s.Err != nil:
			jobs = append(jobs, Job{Path: path, Sheet: s.Sheet, Name: s.Sheet, Err: s.Err})
			if s.Err != nil {
				others = append(others, fmt.Sprintf("'%s' (refused: %s)", s.Sheet, refusal(s.Err)))
			}
		case s.Hidden:
			others = append(others, fmt.Sprintf("'%s' (hidden, not a survey table: %s)", s.Sheet, s.Other))
		default:
			others = append(others, fmt.Sprintf("'%s' (not a survey table: %s)", s.Sheet, s.Other))
		}
	}
	if len(hidden) > 0 {
		warnings = append(warnings, fmt.Sprintf("%s: %s %s not read: name one with --sheet to read it", path, rating.Agree(len(hidden), "hidden sheet", "hidden sheets"), strings.Join(hidden, ", ")))
	}
	if len(others) > 0 {
		warnings = append(warnings, fmt.Sprintf("%s: %s not rated: %s", path, rating.Counted(len(others), "sheet", "sheets"), strings.Join(others, "; ")))
	}
	if len(jobs) == 0 {
		return []Job{{Path: path, Name: base, Err: fmt.Errorf("%s: %w", path, ErrNoSurveySheet)}}, warnings
	}
	return jobs, warnings
}

// refusal is the error of a sheet that cannot be read, without the file
// and sheet its ParseError names (the warning naming the sheet says them).
func refusal(err error) string {
	var pe *survey.ParseError
	if errors.As(err, &pe) && pe.Err != nil {
		if pe.Row > 0 {
			return fmt.Sprintf("row %d: %v", pe.Row, pe.Err)
		}
		return pe.Err.Error()
	}
	return err.Error()
}

// ErrNoSurveySheet is the cause of a workbook none of whose sheets holds
// a survey.
var ErrNoSurveySheet = errors.New("no sheet has a station and an elevation column")

// uniqueNames gives every job a distinct section name and output file
// name (case-insensitively, the index file's name kept free).
func uniqueNames(jobs []Job, ext string) {
	used := map[string]bool{strings.ToLower(IndexFile): true}
	for i := range jobs {
		stem := SafeFileName(jobs[i].Name)
		out := stem + "." + ext
		for k := 2; used[strings.ToLower(out)]; k++ {
			out = fmt.Sprintf("%s-%d.%s", stem, k, ext)
		}
		used[strings.ToLower(out)] = true
		jobs[i].Output = out
		if s := strings.TrimSuffix(out, "."+ext); s != stem {
			jobs[i].Name = fmt.Sprintf("%s (%s)", jobs[i].Name, s)
		}
	}
}

// SafeFileName keeps letters, digits, '.', '-' and '_' of a section name
// (others become '_'), without leading or trailing dots.
func SafeFileName(name string) string {
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

// Options configure a batch. Request and Rating are applied to every
// section (Request's Path and Sheet come from each job).
type Options struct {
	// Request holds the overrides of every section (n, banks, units,
	// composite roughness).
	Request survey.SectionRequest
	// Stages asks for the stages of every table. A default step worked
	// out for a section is never finer than its table writes stages
	// (results.TableStages; the section's warnings say when it was
	// raised).
	Stages rating.StageSpec
	// Rating holds the slope and wetting options (its Units is replaced by
	// each section's, resolved as Prepare resolves it).
	Rating rating.Options
	// Workers is the number of sections rated at once (default GOMAXPROCS).
	Workers int
	// Progress, when set, is called after each section with the count
	// done, from the goroutine that called Run.
	Progress func(done, total int)
	// ReadOnly only reads and checks the surveys (for measuring).
	ReadOnly bool
}

// Result is what rating one job gives.
type Result struct {
	// Entry is the job's line of the index.
	Entry results.IndexEntry
	// Table is the rating table (no rows when the job failed or was
	// skipped).
	Table rating.Table
	// units is what the section's headers say of its unit system and the
	// system it was rated in (nil when it was not read).
	units *sectionUnits
}

// sectionUnits is the unit system a section was read in, and what its
// headers said of it.
type sectionUnits struct {
	Units rating.Units
	Note  survey.UnitNote
}

// describe says where a section's unit system came from, for messages.
func (s sectionUnits) describe(source string) string {
	if !s.Note.Found {
		return fmt.Sprintf("%s: its headers name no unit, so %s units", source, s.Units)
	}
	return fmt.Sprintf("%s: column %q says %s (%s units)", s.Note.At.Position(), s.Note.At.Name, s.Note.Text, s.Units)
}

// ErrMixedSystems is the cause of a section of a batch whose unit system
// is not that of the first section rated: one batch writes one system.
var ErrMixedSystems = errors.New("the sections of one batch must be in one unit system: rate the others in a run of their own")

// SkippedNote says why a section was skipped: its table has a header and
// no rows, as the blank cross-section sheets of a field workbook have.
const SkippedNote = "a header and no survey rows"

// Rate reads and rates one job (rate.Section). A survey with a header
// and no rows is skipped (Entry.Skipped), not failed: a field workbook
// holds blank cross-section sheets until the crew fills them. A section
// whose stages its table would write alike (results.ErrStagesAlike: a
// range shorter than results.LengthResolution, or a given step or list
// that fine) fails; with default stages it fails as one with no depth to
// rate (results.ErrNoDepth), as one holding no water below its ends does.
func Rate(j Job, opt Options) Result {
	return rateJob(j, opt, nil)
}

// rateJob is Rate, reading a workbook's sheet from book when it is not
// nil (the workbook j.Path names, already open).
func rateJob(j Job, opt Options, book *survey.OpenBook) Result {
	nan := math.NaN()
	en := results.IndexEntry{Section: j.Name, Source: j.Source(),
		StageMin: nan, StageMax: nan, BankfullStage: nan, BankfullDischarge: nan}
	fail := func(err error) Result {
		var ce *rate.ComputeError
		if errors.As(err, &ce) {
			err = ce.Err // the index names the source beside it
		}
		en.Err = strings.ReplaceAll(strings.TrimSpace(err.Error()), "\n", "; ")
		return Result{Entry: en}
	}
	if j.Err != nil {
		return fail(j.Err)
	}
	// A survey with a header and no rows fails to be prepared: it is
	// skipped.
	failRead := func(err error) Result {
		if headerOnly(j, book, err) {
			en.Skipped = SkippedNote
			return Result{Entry: en}
		}
		return fail(err)
	}
	req := opt.Request
	req.Path, req.Sheet, req.Book = j.Path, j.Sheet, book
	if opt.ReadOnly {
		p, err := survey.Prepare(req)
		if err != nil {
			return failRead(err)
		}
		return Result{Entry: en, units: &sectionUnits{Units: p.Units, Note: p.Survey.Units}}
	}
	res, err := rate.Section(rate.Options{Request: req, Stages: opt.Stages, Rating: rating.RateOptions{Options: opt.Rating}})
	if err != nil {
		return failRead(err)
	}
	p, t := res.Prepared, res.Report.Table
	t.Name = j.Name
	en.Rows, en.Warnings = len(t.Rows), res.Report.Warnings
	en.StageMin, en.StageMax, _ = t.StageRange()
	en.BankfullStage, en.BankfullDischarge = res.BankfullStage, res.BankfullDischarge
	return Result{Entry: en, Table: t, units: &sectionUnits{Units: p.Units, Note: p.Survey.Units}}
}

// unitGuard holds a batch to the unit system of its first section rated
// (in input order), refusing a later section in another system.
type unitGuard struct {
	first *sectionUnits
	from  string
}

// check returns r, or r failed with ErrMixedSystems when its unit system
// differs from the first rated section's.
func (g *unitGuard) check(r Result) Result {
	if r.units == nil || r.Entry.Err != "" || r.Entry.Skipped != "" {
		return r
	}
	if g.first == nil {
		g.first, g.from = r.units, r.Entry.Source
		return r
	}
	if r.units.Units == g.first.Units {
		return r
	}
	nan := math.NaN()
	en := results.IndexEntry{Section: r.Entry.Section, Source: r.Entry.Source,
		StageMin: nan, StageMax: nan, BankfullStage: nan, BankfullDischarge: nan}
	en.Err = fmt.Sprintf("%s, but the first section rated in this batch is in %s units (%s): %v",
		r.units.describe(r.Entry.Source), g.first.Units, g.first.describe(g.from), ErrMixedSystems)
	return Result{Entry: en}
}

// headerOnly reports whether a survey that failed with err has a header
// and no data rows. Only a survey found with too few points is read again
// to tell (from book when it is not nil).
func headerOnly(j Job, book *survey.OpenBook, err error) bool {
	if !errors.Is(err, subdivide.ErrTooFewPoints) {
		return false
	}
	var t *survey.Table
	var rerr error
	if book != nil {
		t, rerr = book.ReadTable(j.Sheet)
	} else {
		t, rerr = survey.ReadTable(j.Path, j.Sheet)
	}
	return rerr == nil && len(t.Header) > 0 && len(t.Records) == 0
}

// Run rates the jobs on a pool of workers and calls emit for every job in
// input order, from the calling goroutine. Every section is rated in the
// unit system a single run would use (the one asked for, which its
// headers must match, else its headers'); one whose system differs from
// that of the first section rated fails with ErrMixedSystems. At most a
// few results per worker wait to be emitted, so memory stays bounded
// however long the batch. An error from emit, or the context ending, stops the batch.
func Run(ctx context.Context, jobs []Job, opt Options, emit func(i int, r Result) error) error {
	workers := opt.Workers
	if workers < 1 {
		workers = runtime.GOMAXPROCS(0)
	}
	var units unitGuard
	books := newOpenBooks(jobs)
	defer books.closeAll()
	return orderedPool(ctx, len(jobs), workers, func(i int) Result {
		book, err := books.get(jobs[i])
		if err != nil {
			j := jobs[i]
			j.Err = err
			return Rate(j, opt)
		}
		defer books.done(jobs[i])
		return rateJob(jobs[i], opt, book)
	},
		func(i int, r Result) error {
			if err := emit(i, units.check(r)); err != nil {
				return err
			}
			if opt.Progress != nil {
				opt.Progress(i+1, len(jobs))
			}
			return nil
		})
}

// openBooks holds the workbooks of a batch open while their sheets are
// rated: each is opened when its first sheet is rated and closed when its
// last is done, so a workbook of N sheets is read once, not N times, and
// a folder of workbooks holds few open at once (jobs run in input order).
type openBooks struct {
	mu   sync.Mutex
	refs map[string]*bookRef
}

// bookRef is one workbook of a batch: the jobs not yet done, and the
// workbook once opened (or why it could not be).
type bookRef struct {
	once sync.Once
	left int
	book *survey.OpenBook
	err  error
}

// newOpenBooks counts the jobs reading each workbook sheet by sheet.
func newOpenBooks(jobs []Job) *openBooks {
	b := &openBooks{refs: map[string]*bookRef{}}
	for _, j := range jobs {
		if bookJob(j) {
			r := b.refs[j.Path]
			if r == nil {
				r = &bookRef{}
				b.refs[j.Path] = r
			}
			r.left++
		}
	}
	return b
}

// bookJob reports a job reading a sheet of a workbook.
func bookJob(j Job) bool { return j.Err == nil && j.Sheet != "" && survey.IsWorkbook(j.Path) }

// get returns the open workbook of a job (nil for a job reading no
// workbook sheet), opening it on first use.
func (b *openBooks) get(j Job) (*survey.OpenBook, error) {
	if !bookJob(j) {
		return nil, nil
	}
	b.mu.Lock()
	r := b.refs[j.Path]
	b.mu.Unlock()
	r.once.Do(func() { r.book, r.err = survey.OpenWorkbookFile(j.Path) })
	return r.book, r.err
}

// done notes a job of a workbook done, closing the workbook after its
// last.
func (b *openBooks) done(j Job) {
	if !bookJob(j) {
		return
	}
	b.mu.Lock()
	r := b.refs[j.Path]
	r.left--
	last := r.left == 0
	b.mu.Unlock()
	if last && r.book != nil {
		r.book.Close()
	}
}

// closeAll closes every workbook still open (a batch stopped early).
func (b *openBooks) closeAll() {
	b.mu.Lock()
	defer b.mu.Unlock()
	for _, r := range b.refs {
		if r.book != nil {
			r.book.Close()
		}
	}
}

// Summary is what a batch wrote.
type Summary struct {
	// Entries are the index lines, in input order.
	Entries []results.IndexEntry
	// Failed counts the sections that failed, Skipped those without
	// survey rows.
	Failed, Skipped int
}

// add counts an entry and appends it.
func (s *Summary) add(en results.IndexEntry) {
	switch {
	case en.Err != "":
		s.Failed++
	case en.Skipped != "":
		s.Skipped++
	}
	s.Entries = append(s.Entries, en)
}

// ErrFailed is the cause of a batch in which some sections failed.
var ErrFailed = errors.New("sections failed")

// ErrNothingRated is the cause of a batch whose every section was
// skipped.
var ErrNothingRated = errors.New("no section has survey rows: nothing was rated")

// Clean reports whether a batch's output may be put in place: every
// section was rated or skipped, and at least one rated (Err is nil). A
// batch that is not clean ends with an error, and writes nothing: the
// caller discards its output, leaving an earlier one as it was.
func (s Summary) Clean() bool { return s.Err("") == nil }

// Err returns nil when every section was rated or skipped and at least
// one rated; else an error saying how many failed (wrapping ErrFailed),
// or that all were skipped (ErrNothingRated).
func (s Summary) Err(where string) error {
	switch {
	case s.Failed > 0:
		return fmt.Errorf("%d of %d %w (each is listed with its error %s)", s.Failed, len(s.Entries), ErrFailed, where)
	case s.Skipped > 0 && s.Skipped == len(s.Entries):
		return fmt.Errorf("%d skipped, %w", s.Skipped, ErrNothingRated)
	}
	return nil
}

// Folder rates the jobs into a batch folder at dir, staged in files (the
// folder replaces an earlier one only when files is committed): one table
// per section in format "csv" or "json", and the index. Only the index
// and the tables of sections that were rated are staged; the index lists
// every section, failed and skipped ones too. The caller commits files
// only when the batch is clean (Summary.Clean: no section failed, one
// rated) and nothing returned an error, and discards them otherwise, so
// a failed batch leaves an earlier folder as it was.
func Folder(ctx context.Context, files *output.Files, dir, format string, jobs []Job, opt Options) (Summary, error) {
	var sum Summary
	d, err := files.Folder(dir, IndexFile, IndexedFiles)
	if err != nil {
		return sum, err
	}
	err = Run(ctx, jobs, opt, func(i int, r Result) error {
		if r.Entry.Err == "" && r.Entry.Skipped == "" {
			rep := rating.RatingReport{Table: r.Table, Warnings: r.Entry.Warnings}
			if err := d.Write(jobs[i].Output, func(w io.Writer) error {
				if format == "json" {
					return results.WriteRatingJSON(w, rep)
				}
				return results.WriteRatingCSV(w, rep)
			}); err != nil {
				return err
			}
			r.Entry.Output = jobs[i].Output
		}
		sum.add(r.Entry)
		return nil
	})
	if err != nil {
		return sum, err
	}
	return sum, d.Write(IndexFile, func(w io.Writer) error { return results.WriteIndexCSV(w, sum.Entries) })
}

// Long rates the jobs into one long CSV table written to w (see
// results.LongRatingWriter). Sections that fail or are skipped are left
// out. The caller puts the table in place only when the batch is clean
// (Summary.Clean) and nothing returned an error: a batch that rated
// nothing writes no header-only table.
func Long(ctx context.Context, w io.Writer, jobs []Job, opt Options) (Summary, error) {
	var sum Summary
	long := results.NewLongRatingWriter(w)
	err := Run(ctx, jobs, opt, func(i int, r Result) error {
		sum.add(r.Entry)
		if r.Entry.Err != "" || r.Entry.Skipped != "" {
			return nil
		}
		return long.Write(r.Entry.Section, r.Table)
	})
	if err != nil {
		return sum, err
	}
	return sum, long.Flush()
}

// orderedPool runs do(i) for i in [0, n) on the given number of workers
// and calls emit(i, result) for every i in increasing order, from the
// calling goroutine. An error from emit, or the context ending, stops the
// pool; a context ended returns its cause (context.Cause), so that the
// caller can tell why the run was stopped.
func orderedPool[T any](ctx context.Context, n, workers int, do func(i int) T, emit func(i int, r T) error) error {
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
		if ctx.Err() != nil {
			// Ended: no more results are emitted, even those ready.
			err = context.Cause(ctx)
			break
		}
		select {
		case r := <-slots[i]:
			<-ahead
			err = emit(i, r)
		case <-ctx.Done():
			err = context.Cause(ctx)
		}
	}
	cancel()
	wg.Wait()
	return err
}
