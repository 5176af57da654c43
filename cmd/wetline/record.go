package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"time"

	"wetline/plotting"
	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/rating/record"
	"wetline/survey"
	"wetline/survey/results"
)

// The record and shifts commands build a rating history from flags: the
// ratings with the time each comes into force, the shift diagrams, and
// how to read them.

// noRating is the --rating word for a period without a rating.
const noRating = "none"

// historyFlags are the flags that build a rating history.
type historyFlags struct {
	cmd         string
	ratings     []string
	ratingSheet string
	zeroFlow    numbers
	highest     numbers
	extrapolate bool
	datum       float64
	shifts      string
	shiftsSheet string
	offset      utcOffset
	units       string
	// unitSystem is the unit system of the ratings and gaugings read,
	// and decided what set it (see unitsDecided).
	unitSystem rating.Units
	decided    unitsDecided
	// notes are the input notes of the ratings read (see
	// unitsDecided.takeTable), for the report's provenance.
	notes []string
}

func (hf *historyFlags) register(fs *flagSet) {
	fs.StringArrayVar(&hf.ratings, "rating", nil, "rating table FILE (stage and discharge columns), or FILE@TIME for a rating in force from TIME (ISO 8601), "+
		"or none@TIME for a period without a rating; repeat for each rating period")
	fs.StringVar(&hf.ratingSheet, "rating-sheet", "", "workbook sheet of every rating given as a workbook (default: the first visible sheet)")
	fs.Var(&hf.zeroFlow, "zero-flow", "gauge height of zero flow e of the ratings: one value for all, or one per --rating in order, where the periods without a rating (none@TIME) may be left out (log-linear in h − e between rows; e may not lie below a row without flow, nor at or above a row with flow; a gauge height, also with --datum; default: where a table's flow starts, from its depth column, also when its first row has flow, else its last dry row, else linear, with a warning)")
	fs.Var(&hf.highest, "highest-gauging", "gauge height of the highest gauging of the ratings: one value for all, or one per --rating, where the periods without a rating (none@TIME) may be left out (default: from an extrapolated column)")
	fs.BoolVar(&hf.extrapolate, "extrapolate", false, "let the ratings extrapolate beyond their rows (default: no discharge outside a table)")
	fs.Float64Var(&hf.datum, "datum", 0, "subtract DATUM from the ratings' stages: read a table of elevations (as 'wetline rate' writes) at gauge heights")
	fs.StringVar(&hf.shifts, "shifts", "", "shift diagrams FILE (time, stage, shift columns; optional taper and abrupt)")
	fs.StringVar(&hf.shiftsSheet, "shifts-sheet", "", "workbook sheet of the shift diagrams (default: the first visible sheet)")
	fs.input("rating", "shifts")
	fs.Var(&hf.offset, "utc-offset", "offset ±HH:MM of times written without one, in every file read; days and times are reported in it (default UTC)")
	fs.StringVar(&hf.units, "units", "si", "unit system that labels the values: si (m, m3/s) or us (ft, ft3/s); nothing is converted "+
		"(default: the units written in the rating tables' or the gaugings' headers, else si)")
}

// ratingSpec is one --rating: a file (or no rating) and when it comes into
// force.
type ratingSpec struct {
	text, path string
	none       bool
	from       time.Time
	hasFrom    bool
}

// parseRatingSpec reads FILE, FILE@TIME or none@TIME. A path that exists
// as given is a file even when it holds an @.
func (hf *historyFlags) parseRatingSpec(s string) (ratingSpec, error) {
	spec := ratingSpec{text: s, path: s}
	if i := strings.LastIndex(s, "@"); i >= 0 {
		if _, err := os.Stat(s); err != nil {
			t, err := survey.ParseISOTime(s[i+1:], time.Duration(hf.offset))
			if err != nil {
				return spec, usagef("%s: --rating %s: the time after @: %v", hf.cmd, s, err)
			}
			spec.path, spec.from, spec.hasFrom = s[:i], t, true
		}
	}
	if strings.EqualFold(spec.path, noRating) {
		if !spec.hasFrom {
			return spec, usagef("%s: --rating %s: a period without a rating needs its time: none@TIME", hf.cmd, s)
		}
		spec.none = true
	}
	if spec.path == "" {
		return spec, usagef("%s: --rating %s: no file before the @", hf.cmd, s)
	}
	return spec, nil
}

// zeroFlowAbove names --zero-flow in an error of a rating table read with
// the gauge height of zero flow that flag gave, when that height lies at
// or above a row with flow, or below a row without flow; other errors are
// returned as they are. With --datum, the error says that --zero-flow is
// a gauge height, as the table's stages less the datum are.
func zeroFlowAbove(cmd string, opt survey.RatingTableOptions, err error) error {
	if !opt.HasZeroFlow || !errors.Is(err, gauged.ErrZeroFlowAbove) && !errors.Is(err, gauged.ErrDryAboveZeroFlow) {
		return err
	}
	e := strconv.FormatFloat(opt.ZeroFlow, 'g', -1, 64)
	if opt.Datum != 0 {
		d := strconv.FormatFloat(opt.Datum, 'g', -1, 64)
		return fmt.Errorf("%s: --zero-flow %s: %w (with --datum %s the table's stages less %s are gauge heights, and --zero-flow is a gauge height too: elevation %s is gauge height %s)",
			cmd, e, err, d, d, e, strconv.FormatFloat(rating.DecimalDifference(opt.ZeroFlow, opt.Datum), 'g', -1, 64))
	}
	return fmt.Errorf("%s: --zero-flow %s: %w", cmd, e, err)
}

// perRating returns value k of a list flag given once for all ratings or
// once per rating.
func perRating(v numbers, k int) (float64, bool) {
	switch len(v) {
	case 0:
		return 0, false
	case 1:
		return v[0], true
	}
	return v[k], true
}

// datedPeriod is a rating period read, with the --rating it came from.
type datedPeriod struct {
	gauged.Period
	spec string
	// at is where a rating file's valid_from column gave the time
	// ("file:row"), "" for a time given on the command line or none.
	at string
}

// history reads the ratings and shift diagrams the flags name. Mistakes in
// the flags are usage errors; bad files are data errors naming their
// cells. It returns the history, the files read and the readers'
// warnings.
func (hf *historyFlags) history(fs *flagSet) (gauged.History, []string, []string, error) {
	var h gauged.History
	d, err := decideUnits(hf.units, fs.Changed("units"))
	if err != nil {
		return h, nil, nil, err
	}
	if err := fs.within(survey.MaxElevation, "zero-flow", "highest-gauging", "datum"); err != nil {
		return h, nil, nil, err
	}
	if len(hf.ratings) == 0 {
		return h, nil, nil, usagef("%s: give the rating with --rating FILE (and --rating FILE@TIME for each later rating period)", hf.cmd)
	}
	specs, skipNone, err := hf.ratingSpecs()
	if err != nil {
		return h, nil, nil, err
	}
	var inputs, warnings []string
	var periods []datedPeriod
	file := 0 // index of the --rating among those with a file
	for k, spec := range specs {
		at := func(name string) int {
			if skipNone[name] {
				return file
			}
			return k
		}
		ps, path, warns, err := hf.ratingPeriods(spec, at("zero-flow"), at("highest-gauging"), &d)
		if err != nil {
			return h, nil, nil, err
		}
		if !spec.none {
			file++
		}
		if path != "" {
			inputs = append(inputs, path)
		}
		periods, warnings = append(periods, ps...), append(warnings, warns...)
	}
	if h.Periods, err = hf.inOrder(periods); err != nil {
		return h, nil, nil, err
	}
	if hf.shifts != "" {
		ds, err := survey.ReadShiftDiagrams(hf.shifts, survey.ShiftTableOptions{Sheet: hf.shiftsSheet, UTCOffset: time.Duration(hf.offset)})
		if err != nil {
			return h, nil, nil, err
		}
		note, err := d.takeTable(ds.Units, hf.shifts)
		if err != nil {
			return h, nil, nil, err
		}
		if note != "" {
			hf.notes = append(hf.notes, note)
		}
		h.Shifts = ds.Diagrams
		inputs, warnings = append(inputs, hf.shifts), append(warnings, ds.Warnings...)
	} else if err := fs.needs("--shifts FILE", false, "shifts-sheet"); err != nil {
		return h, nil, nil, err
	}
	hf.decided, hf.unitSystem = d, d.Units
	h.UTCOffset = time.Duration(hf.offset)
	return h, inputs, warnings, nil
}

// ratingSpecs parses every --rating and checks the lists of --zero-flow
// and --highest-gauging against them: one value for all, one per
// --rating, or one per --rating with a file (skipNone names the flags
// read that way, skipping the periods without a rating, none@TIME).
// Mistakes are usage errors.
func (hf *historyFlags) ratingSpecs() ([]ratingSpec, map[string]bool, error) {
	specs := make([]ratingSpec, len(hf.ratings))
	files := 0
	for k, s := range hf.ratings {
		var err error
		if specs[k], err = hf.parseRatingSpec(s); err != nil {
			return nil, nil, err
		}
		if !specs[k].none {
			files++
		}
	}
	skipNone := map[string]bool{}
	for _, l := range []struct {
		name string
		v    numbers
	}{{"zero-flow", hf.zeroFlow}, {"highest-gauging", hf.highest}} {
		n := len(l.v)
		switch {
		case n <= 1 || n == len(hf.ratings):
		case n == files:
			skipNone[l.name] = true
		case files < len(hf.ratings):
			return nil, nil, usagef("%s: --%s gives %d values for %d --rating (%d with a file): give one for all, one per --rating, or one per --rating with a file",
				hf.cmd, l.name, n, len(hf.ratings), files)
		default:
			return nil, nil, usagef("%s: --%s gives %d values for %d --rating: give one for all, or one per --rating", hf.cmd, l.name, n, len(hf.ratings))
		}
	}
	return specs, skipNone, nil
}

// ratingPeriods reads a --rating: the periods it holds (one without a
// rating for none@TIME), the file read ("" for none) and the reader's
// warnings. Its gauge height of zero flow is value z of --zero-flow and
// its highest gauging value g of --highest-gauging (see perRating). The
// units of its headers are resolved into d.
func (hf *historyFlags) ratingPeriods(spec ratingSpec, z, g int, d *unitsDecided) ([]datedPeriod, string, []string, error) {
	s := spec.text
	if spec.none {
		return []datedPeriod{{Period: gauged.Period{From: spec.from}, spec: s}}, "", nil, nil
	}
	opt := survey.RatingTableOptions{Sheet: hf.ratingSheet, Extrapolate: hf.extrapolate, Datum: hf.datum, From: spec.from,
		UTCOffset: time.Duration(hf.offset)}
	opt.ZeroFlow, opt.HasZeroFlow = perRating(hf.zeroFlow, z)
	opt.HighGauging, opt.HasHighGauging = perRating(hf.highest, g)
	rt, err := survey.ReadRatingTables(spec.path, opt)
	if err != nil {
		return nil, "", nil, zeroFlowAbove(hf.cmd, opt, err)
	}
	note, err := d.takeTable(rt.Units, spec.path)
	if err != nil {
		return nil, "", nil, err
	}
	if note != "" {
		hf.notes = append(hf.notes, note)
	}
	hf.notes = append(hf.notes, rt.Notes...)
	if spec.hasFrom && (len(rt.Periods) != 1 || !rt.Periods[0].From.Equal(spec.from)) {
		return nil, "", nil, usagef("%s: --rating %s: %s has a %s column, so its ratings carry their own times: give it without @TIME",
			hf.cmd, s, spec.path, survey.ColRatingValidFrom)
	}
	out := make([]datedPeriod, len(rt.Periods))
	for i, p := range rt.Periods {
		out[i] = datedPeriod{p, s, rt.FromAt[i]}
	}
	return out, spec.path, rt.Warnings, nil
}

// inOrder puts the rating periods in time order; two coming into force at
// one time are a usage error naming both --rating, or, when a rating
// file's valid_from column gave either time, a conflict in the data
// (gauged.ErrPeriodOrder, exit status 1) naming the file and row it came
// from.
func (hf *historyFlags) inOrder(periods []datedPeriod) ([]gauged.Period, error) {
	sort.SliceStable(periods, func(i, j int) bool { return periods[i].From.Before(periods[j].From) })
	out := make([]gauged.Period, 0, len(periods))
	for i, p := range periods {
		if i > 0 && p.From.Equal(periods[i-1].From) {
			when := "from the beginning"
			if !p.From.IsZero() {
				when = "at " + p.From.Format(time.RFC3339)
			}
			if q := periods[i-1]; q.at != "" || p.at != "" {
				file, other := p, q // file: the period whose time a valid_from cell gave
				if p.at == "" {
					file, other = q, p
				}
				also := "--rating " + other.spec
				if other.at != "" {
					also = "the rating of " + other.at
				}
				return nil, fmt.Errorf("%s: the %s of --rating %s, %s, is when %s comes into force too: %w",
					file.at, survey.ColRatingValidFrom, file.spec, p.From.Format(time.RFC3339), also, gauged.ErrPeriodOrder)
			}
			return nil, usagef("%s: --rating %s and --rating %s both come into force %s: give each later rating its time, FILE@TIME",
				hf.cmd, periods[i-1].spec, p.spec, when)
		}
		out = append(out, p.Period)
	}
	return out, nil
}

// tableUnits resolves the units of a table's headers (the gaugings, the
// stage record) against those of the ratings and shift diagrams (or
// --units); a table naming units sets them when nothing had.
func (hf *historyFlags) tableUnits(note survey.UnitNote, path string) error {
	if err := hf.decided.take(note, path); err != nil {
		return err
	}
	hf.unitSystem = hf.decided.Units
	return nil
}

// compile checks a history and prepares it for lookups.
func (hf *historyFlags) compile(h gauged.History) (*gauged.Rater, error) {
	r, err := h.Compile()
	if err != nil {
		return nil, fmt.Errorf("%s: %w", hf.cmd, err)
	}
	return r, nil
}

// utcOffset is a flag holding an offset from UTC: ±HH:MM, ±HHMM, ±HH, Z
// or 0, within record.MaxUTCOffset.
type utcOffset time.Duration

func (o *utcOffset) String() string {
	d := time.Duration(*o)
	if d == 0 {
		return "0"
	}
	return record.FormatOffset(d)
}

func (o *utcOffset) Set(s string) error {
	s = strings.TrimSpace(s)
	switch strings.ToUpper(s) {
	case "", "Z", "0", "UTC":
		*o = 0
		return nil
	}
	bad := fmt.Errorf("%q is not an offset from UTC: write +10:00, -05:30, +0930 or Z", s)
	sign := time.Duration(1)
	switch s[0] {
	case '+':
	case '-':
		sign = -1
	default:
		return bad
	}
	body := strings.ReplaceAll(s[1:], ":", "")
	if len(body) != 2 && len(body) != 4 {
		return bad
	}
	hh, err1 := strconv.Atoi(body[:2])
	mm := 0
	var err2 error
	if len(body) == 4 {
		mm, err2 = strconv.Atoi(body[2:])
	}
	d := sign * (time.Duration(hh)*time.Hour + time.Duration(mm)*time.Minute)
	if err1 != nil || err2 != nil || mm > 59 || d > record.MaxUTCOffset || d < -record.MaxUTCOffset {
		return bad
	}
	*o = utcOffset(d)
	return nil
}

func (o *utcOffset) Type() string { return "offset" }

const recordUsage = "record STAGES --rating FILE[@TIME] [--rating FILE@TIME ...] [--shifts FILE] [--gaugings FILE] [--daily] [--unit] " +
	"[--max-gap DURATION] [--stage-tolerance D] [--utc-offset ±HH:MM] [--zero-flow E,...] [--highest-gauging H,...] [--extrapolate] [--datum D] [--units si|us] " +
	"[--format text|json|csv|xlsx] [-o FILE] [--plots DIR] [--site NAME]"

// recordFlags are the flags of the record command.
type recordFlags struct {
	historyFlags
	sheet         string
	gaugings      string
	gaugingsSheet string
	daily, unit   bool
	maxGap        time.Duration
	stageTol      float64
	format        string
	output        string
	plots, site   string
}

func (f *recordFlags) register(fs *flagSet) {
	f.historyFlags.register(fs)
	fs.StringVar(&f.sheet, "sheet", "", "workbook sheet of the stage record (default: the first visible sheet)")
	fs.StringVar(&f.gaugings, "gaugings", "", "gaugings FILE: those within the record's span set against the record (discharge and gauge height) and drawn on the hydrograph; those outside it are counted in one warning")
	fs.StringVar(&f.gaugingsSheet, "gaugings-sheet", "", "workbook sheet of the gaugings (default: a sheet named gaugings, else the first)")
	fs.BoolVar(&f.daily, "daily", false, "write the daily values (the default in text and CSV): days at --utc-offset, midnight to midnight, both included; the time-weighted mean over the covered part, the least and greatest with their times, coverage; with --unit too, both tables, in text, JSON or a workbook (a CSV file holds one: give one of them)")
	fs.BoolVar(&f.unit, "unit", false, "write the unit values, one row per reading (JSON and workbooks write both tables unless --daily or --unit alone picks one)")
	fs.DurationVar(&f.maxGap, "max-gap", record.DefaultMaxGap, "longest time between readings that is bridged, as 90m or 2h; longer gaps are left uncovered")
	fs.Float64Var(&f.stageTol, "stage-tolerance", 0, "largest difference between a gauging's gauge height and the recorded stage at its time that is not flagged, in the length unit "+
		"(default 0.02 m, or 0.06 ft in US units)")
	fs.StringVar(&f.format, "format", "", "output format: text, json, csv (one table) or xlsx (needs -o); default: from the -o extension, else text")
	fs.StringVarP(&f.output, "output", "o", "", "output file (default: standard output)")
	fs.StringVar(&f.plots, "plots", "", "also write the hydrograph figure (PNG) into this folder")
	fs.output(outputFile, "output")
	fs.input("gaugings")
	fs.output(outputFolder, "plots")
	fs.StringVar(&f.site, "site", "", siteUsage)
}

// tables turns --daily and --unit into the tables to write.
func (f *recordFlags) tables() results.RecordTables {
	var t results.RecordTables
	if f.daily {
		t |= results.DailyTable
	}
	if f.unit {
		t |= results.UnitTable
	}
	return t
}

func runRecord(ctx context.Context, e *env, args []string) error {
	fs := newFlags("record", recordUsage)
	f := recordFlags{historyFlags: historyFlags{cmd: "record"}}
	f.register(fs)
	if err := fs.parseOperands(e, args, 1, "one STAGES file (time and stage columns)"); err != nil {
		return err
	}
	format, err := outputFormat("record", f.format, f.output, "text", "json", "csv", "xlsx")
	if err != nil {
		return err
	}
	tables := f.tables()
	if format == "csv" && tables == results.UnitTable|results.DailyTable {
		return usagef("record: %v: give --unit or --daily, or write JSON or a workbook for both", results.ErrOneTable)
	}
	if !(f.maxGap > 0) || f.maxGap%time.Second != 0 {
		return usagef("record: --max-gap %v: want a positive whole number of seconds, as 90m or 2h", f.maxGap)
	}
	if err := fs.needs("--gaugings FILE", f.gaugings != "", "gaugings-sheet", "stage-tolerance"); err != nil {
		return err
	}
	if fs.Changed("stage-tolerance") && !(f.stageTol > 0 && f.stageTol <= survey.MaxElevation) {
		return usagef("record: --stage-tolerance %g: want a positive length, as 0.02", f.stageTol)
	}
	res, err := f.compute(fs, fs.Arg(0), format, tables)
	if err != nil {
		return err
	}
	if f.plots != "" || format == "xlsx" {
		base := strings.TrimSuffix(filepath.Base(fs.Arg(0)), filepath.Ext(fs.Arg(0)))
		figs, w, err := plotting.DrawRecord(res, res.Provenance.Site.Name, base, plotting.Size{})
		if err != nil {
			return err
		}
		res.Figures, res.Warnings = figs, append(res.Warnings, w...)
	}
	write := map[string]func(io.Writer, *record.Result, results.RecordTables) error{
		"text": results.WriteRecordText, "json": results.WriteRecordJSON, "csv": results.WriteRecordCSV, "xlsx": results.WriteRecordWorkbook,
	}[format]
	return e.deliver(delivery{output: f.output, inputs: res.Provenance.Inputs,
		write:  func(w io.Writer) error { return write(w, res, tables) },
		inline: format == "text" || format == "json", warnings: append(append([]string(nil), res.Warnings...), "provisional: "+record.ProvisionalNote),
		notes: res.Provenance.Notes, plots: f.plots, figs: res.Figures,
		summary: func(w io.Writer) error { return results.WriteRecordSummary(w, res, f.output) }})
}

// compute reads the history, the stage record and the gaugings, and
// computes the record. A workbook too small for the unit values is
// refused before the record is computed.
func (f *recordFlags) compute(fs *flagSet, path, format string, tables results.RecordTables) (*record.Result, error) {
	h, inputs, warnings, err := f.history(fs)
	if err != nil {
		return nil, err
	}
	r, err := f.compile(h)
	if err != nil {
		return nil, err
	}
	sr, err := survey.ReadStageRecord(path, survey.StageRecordOptions{Sheet: f.sheet, UTCOffset: time.Duration(f.offset)})
	if err != nil {
		return nil, err
	}
	if err := f.tableUnits(sr.Units, path); err != nil {
		return nil, err
	}
	st := &sr.Stages
	if format == "xlsx" {
		days := int((st.Time[st.Len()-1]-st.Time[0])/86400) + 2
		if err := results.CheckRecordWorkbook(st.Len()+len(st.Missing), days, tables); err != nil {
			return nil, fmt.Errorf("record: %s: %w", path, err)
		}
	}
	opt := record.Options{MaxGap: f.maxGap, UTCOffset: time.Duration(f.offset), StageTolerance: f.stageTol}
	inputs = append([]string{path}, inputs...)
	warnings = append(warnings, sr.Warnings...)
	site := sr.Site // the stage record's, its blanks from the gaugings'
	if f.gaugings != "" {
		gs, err := survey.ReadGaugingsAt(f.gaugings, f.gaugingsSheet, time.Duration(f.offset))
		if err != nil {
			return nil, err
		}
		if err := f.tableUnits(gs.Units, f.gaugings); err != nil {
			return nil, err
		}
		gs.Warnings = append(gs.Warnings, gs.SpanWarnings(f.unitSystem)...)
		site = site.Merge(gs.Site)
		opt.Gaugings = gs.Gaugings
		inputs = append(inputs, f.gaugings)
		warnings = append(warnings, gs.Warnings...)
		if w := survey.OffsetsDiffer(sr, gs); w != "" && !fs.Changed("utc-offset") {
			warnings = append(warnings, w)
		}
	}
	opt.UnitSystem = f.unitSystem
	res, err := record.Compute(st, r, opt)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	res.Name = filepath.Base(path)
	res.Provenance = rating.Provenance{Program: program(), Inputs: inputs, Site: siteWith(site, f.site), Notes: f.notes}
	res.Warnings = append(warnings, res.Warnings...)
	return res, nil
}
