package main

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"path/filepath"
	"strings"
	"time"

	"wetline/plotting"
	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/rating/record"
	"wetline/survey"
	"wetline/survey/results"
)

// The invented 2024–25 water year at the Tallow Creek gauge: a 15-minute
// stage record made here from a few storms on a seasonal base flow, the
// field visits' gaugings made from an invented true state of the control
// (weed on the riffle, a February flood that scoured it, a June fresh that
// washed the weed out), the two ratings and the shift diagrams a
// hydrographer accepted, and the resurvey of the gauge section after the
// flood. Times are local, ten hours east of UTC, written without an offset.
const (
	demoRecordOffset = 10 * time.Hour
	demoStages       = "tallow-stage-2025.csv"
	demoVisits       = "tallow-visits-2025.csv"
	demoRating7      = "tallow-rating-7.csv"
	demoRating8      = "tallow-rating-8.csv"
	demoShifts       = "tallow-shifts-2025.csv"
	demoSurvey2025   = "tallow-xs1-2025.csv"
	// demoRating8From is when rating 8 came into force: the flood's peak.
	demoRating8From = "2025-02-18T06:00"
	// demoStep is the logger's interval.
	demoStep = 15 * time.Minute
	// Gauge heights of zero flow of ratings 7 and 8, m.
	demoZeroFlow7, demoZeroFlow8 = 0.32, 0.26
)

// demoLocal reads a local demo time.
func demoLocal(s string) time.Time {
	t, err := survey.ParseISOTime(s, demoRecordOffset)
	if err != nil {
		panic("demo time " + s + ": " + err.Error())
	}
	return t
}

// demoStorm is one invented storm on the gauge-height record.
type demoStorm struct {
	start      string  // local time the rise begins
	rise       float64 // rise of the gauge height at the peak, m
	riseHours  float64 // time to peak, hours
	fallHours  float64 // recession time constant, hours
	washesWeed bool    // the storm clears the riffle's weed
}

// demoStorms are the year's storms; the one of 17 February is the flood
// that scoured the riffle.
var demoStorms = [...]demoStorm{
	{"2024-10-21T16:00", 0.35, 6, 30, false},
	{"2024-11-12T03:00", 0.55, 5, 36, false},
	{"2024-12-09T20:00", 0.25, 4, 24, false},
	{"2025-01-03T14:00", 0.80, 6, 40, false},
	{"2025-01-27T02:00", 0.30, 5, 30, false},
	{"2025-02-17T09:00", 2.45, 20, 60, false},
	{"2025-03-22T11:00", 0.40, 5, 30, false},
	{"2025-04-26T07:00", 0.60, 8, 40, false},
	{"2025-05-19T22:00", 0.35, 6, 30, false},
	{"2025-06-13T15:00", 1.20, 9, 48, true},
	{"2025-07-02T04:00", 0.50, 6, 36, false},
	{"2025-07-30T18:00", 0.70, 8, 40, false},
	{"2025-08-24T10:00", 0.45, 6, 30, false},
	{"2025-09-12T01:00", 0.30, 5, 30, false},
}

// demoOutage is when the logger recorded nothing (a flat battery).
var demoOutage = [2]string{"2025-05-08T13:00", "2025-05-10T09:30"}

// demoVisit is one gauging of the year: when, its quality, and the error
// of the measurement against the invented true discharge.
type demoVisit struct {
	at      string
	quality rating.Quality
	errPct  float64
	note    string
}

var demoVisitList = [...]demoVisit{
	{"2024-10-09T10:30", rating.Good, 1.5, "riffle clean"},
	{"2024-11-20T11:00", rating.Good, -2.0, "weed starting on the riffle"},
	{"2025-01-08T09:45", rating.Excellent, 0.8, "riffle weed-grown"},
	{"2025-02-12T10:15", rating.Good, -1.2, ""},
	{"2025-02-18T11:30", rating.Poor, 6.0, "flood; measured from the footbridge"},
	{"2025-03-04T10:00", rating.Good, 2.2, "riffle scoured; section resurveyed"},
	{"2025-04-15T10:30", rating.Good, -1.8, ""},
	{"2025-05-27T11:00", rating.Fair, 3.0, "weed returning"},
	{"2025-07-08T10:00", rating.Good, 1.0, "riffle clean after the June fresh"},
	{"2025-07-31T09:00", rating.Good, 1.2, "recession of the July storm"},
	{"2025-07-31T13:30", rating.Good, -0.9, "recession of the July storm"},
	{"2025-08-19T09:30", rating.Good, -2.5, ""},
	{"2025-09-23T10:45", rating.Excellent, -0.6, "weed-grown"},
}

// tallowYear makes the year's gauge heights at every 15 minutes, in
// metres to the millimetre, seeded so every run gives the same record.
func tallowYear() (times []int64, stages []float64) {
	start, end := demoLocal("2024-10-01T00:00"), demoLocal("2025-10-01T00:00")
	out0, out1 := demoLocal(demoOutage[0]).Unix(), demoLocal(demoOutage[1]).Unix()
	rng := rand.New(rand.NewPCG(15, 2025))
	n := int(end.Sub(start) / demoStep)
	times, stages = make([]int64, 0, n), make([]float64, 0, n)
	for t := start; t.Before(end); t = t.Add(demoStep) {
		noise := 0.0015 * rng.NormFloat64()
		if u := t.Unix(); u >= out0 && u < out1 {
			continue
		}
		times = append(times, t.Unix())
		stages = append(stages, math.Round(1000*(demoStage(t)+noise))/1000)
	}
	return times, stages
}

// demoStage is the invented true gauge height at t: a seasonal base flow
// (lowest in late summer, February), a small daily swing and the storms.
func demoStage(t time.Time) float64 {
	day := t.Sub(demoLocal("2024-10-01T00:00")).Hours() / 24
	h := 0.61 + 0.06*math.Cos(2*math.Pi*(day-320)/365.25) // wettest in mid-August
	h += 0.003 * math.Sin(2*math.Pi*float64(t.Add(demoRecordOffset).UTC().Hour())/24)
	for _, s := range demoStorms {
		dt := t.Sub(demoLocal(s.start)).Hours()
		switch {
		case dt <= 0:
		case dt < s.riseHours:
			x := math.Sin(math.Pi / 2 * dt / s.riseHours)
			h += s.rise * x * x
		default:
			h += s.rise * math.Exp(-(dt-s.riseHours)/s.fallHours)
		}
	}
	return h
}

// demoTrueShift is the invented true shift of the control at t and gauge
// height h: weed on the riffle, full up to 0.8 m and fading to nothing at
// the taper stage, growing through the summer until the February flood;
// after it (rating 8) regrowing, washed out by the June fresh, regrowing.
func demoTrueShift(t time.Time, h float64) float64 {
	ramp := func(from, to string, full float64) float64 {
		a, b := demoLocal(from), demoLocal(to)
		f := math.Max(0, math.Min(1, float64(t.Sub(a))/float64(b.Sub(a))))
		return full * f
	}
	taper := func(top float64) float64 { return math.Max(0, math.Min(1, (top-h)/(top-0.8))) }
	fresh := demoLocal(demoStorms[9].start).Add(time.Duration(demoStorms[9].riseHours * float64(time.Hour)))
	switch {
	case t.Before(demoLocal(demoRating8From)):
		return ramp("2024-11-01T00:00", "2025-01-20T00:00", -0.035) * taper(1.3)
	case t.Before(fresh):
		return ramp("2025-03-15T00:00", "2025-06-10T00:00", -0.020) * taper(1.2)
	}
	return ramp("2025-06-20T00:00", "2025-09-30T00:00", -0.030) * taper(1.2)
}

// demoRatings reads the two ratings as the record uses them.
func (d *demo) demoRatings() (gauged.History, error) {
	h := gauged.History{UTCOffset: demoRecordOffset}
	for _, r := range []struct {
		name string
		from time.Time
		e    float64
	}{{demoRating7, time.Time{}, demoZeroFlow7}, {demoRating8, demoLocal(demoRating8From), demoZeroFlow8}} {
		rt, err := survey.ReadRatingTables(d.path(r.name), survey.RatingTableOptions{From: r.from, UTCOffset: demoRecordOffset,
			HasZeroFlow: true, ZeroFlow: r.e})
		if err != nil {
			return h, err
		}
		h.Periods = append(h.Periods, rt.Periods...)
	}
	return h, nil
}

// writeDemoStages writes the year's stage record as CSV.
func writeDemoStages(w io.Writer, times []int64, stages []float64) error {
	bw := bufio.NewWriterSize(w, 1<<16)
	z := time.FixedZone("", int(demoRecordOffset/time.Second))
	fmt.Fprintln(bw, "# Tallow Creek at Mill Lane footbridge: 15-minute gauge heights of the 2024-25 water year (invented demo data).")
	fmt.Fprintln(bw, "# Local time, ten hours east of UTC, written without an offset; gauge height in metres. No readings during the logger outage of 8-10 May 2025.")
	fmt.Fprintln(bw, "time,stage (m)")
	b := make([]byte, 0, 32)
	for i, t := range times {
		b = time.Unix(t, 0).In(z).AppendFormat(b[:0], "2006-01-02T15:04")
		b = append(b, ',')
		b = appendMillimetres(b, stages[i])
		b = append(b, '\n')
		if _, err := bw.Write(b); err != nil {
			return err
		}
	}
	return bw.Flush()
}

// appendMillimetres appends a gauge height to three decimals.
func appendMillimetres(b []byte, h float64) []byte {
	return fmt.Appendf(b, "%.3f", h)
}

// writeDemoVisits writes the year's gaugings: the gauge height read at each
// (the record's), and the true discharge with the measurement's error.
func writeDemoVisits(w io.Writer, r *gauged.Rater, times []int64, stages []float64) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintln(bw, "# Tallow Creek at Mill Lane footbridge: gaugings of the 2024-25 water year (invented demo data).")
	fmt.Fprintln(bw, "# Local time, ten hours east of UTC; gauge height in metres; discharge in m3/s.")
	fmt.Fprintln(bw, "time,gauge_height,discharge,quality,note")
	for _, v := range demoVisitList {
		t := demoLocal(v.at)
		i := searchTime(times, t.Unix())
		if i < 0 {
			return fmt.Errorf("demo: no reading at the visit of %s", v.at)
		}
		h := stages[i]
		rated := r.At(t, h+demoTrueShift(t, h)).Discharge
		q := rated * (1 + v.errPct/100)
		fmt.Fprintf(bw, "%s,%.3f,%.3g,%s,%s\n", v.at, h, q, v.quality, v.note)
	}
	return bw.Flush()
}

// searchTime returns the index of the reading at Unix time t, -1 when none.
func searchTime(times []int64, t int64) int {
	lo, hi := 0, len(times)
	for lo < hi {
		m := (lo + hi) / 2
		if times[m] < t {
			lo = m + 1
		} else {
			hi = m
		}
	}
	if lo < len(times) && times[lo] == t {
		return lo
	}
	return -1
}

// record writes the year of stage record, its visits, the ratings and the
// accepted shifts, then the shift check, the discharge record, and the
// comparisons of the two ratings and of the two surveys.
func (d *demo) record() error {
	for _, f := range []struct{ name, what string }{
		{demoRating7, "rating 7, in force from the start of the water year (invented)"},
		{demoRating8, "rating 8, in force from the flood peak of 18 February 2025 (invented)"},
		{demoShifts, "the shift diagrams the hydrographer accepted from the visits (invented)"},
		{demoSurvey2025, "XS-1 resurveyed after the February flood: the riffle scoured"},
	} {
		if err := d.copy(f.name, f.what); err != nil {
			return err
		}
	}
	if err := d.e.files.Commit(); err != nil {
		return err
	}
	h, err := d.demoRatings()
	if err != nil {
		return err
	}
	base, err := h.Compile()
	if err != nil {
		return err
	}
	times, stages := tallowYear()
	if err := d.put(demoStages, fmt.Sprintf("a year of 15-minute gauge heights, %d readings, a logger outage in May", len(times)),
		func(w io.Writer) error { return writeDemoStages(w, times, stages) }); err != nil {
		return err
	}
	if err := d.put(demoVisits, fmt.Sprintf("the year's %d gaugings at %d field visits", len(demoVisitList), len(demoVisitList)-1),
		func(w io.Writer) error { return writeDemoVisits(w, base, times, stages) }); err != nil {
		return err
	}
	if err := d.e.files.Commit(); err != nil {
		return err
	}
	ds, err := survey.ReadShiftDiagrams(d.path(demoShifts), survey.ShiftTableOptions{UTCOffset: demoRecordOffset})
	if err != nil {
		return err
	}
	for i := range ds.Diagrams {
		ds.Diagrams[i].Source = d.rel(ds.Diagrams[i].Source)
	}
	h.Shifts = ds.Diagrams
	r, err := h.Compile()
	if err != nil {
		return err
	}
	if err := d.shiftCheck(r); err != nil {
		return err
	}
	if err := d.discharge(r); err != nil {
		return err
	}
	return d.comparisons()
}

// rel names a demo file's position (file:row) relative to the demo folder.
func (d *demo) rel(source string) string {
	return strings.TrimPrefix(source, d.dir+string(filepath.Separator))
}

// demoGaugings reads the year's gaugings, their sources relative to the
// demo folder.
func (d *demo) demoGaugings() ([]gauged.Gauging, error) {
	gs, err := survey.ReadGaugingsAt(d.path(demoVisits), "", demoRecordOffset)
	if err != nil {
		return nil, err
	}
	for i := range gs.Gaugings {
		gs.Gaugings[i].Source = d.rel(gs.Gaugings[i].Source)
	}
	return gs.Gaugings, nil
}

// demoInputs are the files the demo's record and shift check read.
func demoInputs(first string, shifts bool) []string {
	in := []string{first, demoRating7, demoRating8}
	if shifts {
		in = append(in, demoShifts)
	}
	return in
}

// shiftCheck writes the visits' gaugings against the ratings and the
// accepted diagrams, with the diagram each visit proposes.
func (d *demo) shiftCheck(r *gauged.Rater) error {
	gs, err := d.demoGaugings()
	if err != nil {
		return err
	}
	c, err := r.CheckGaugings(gs, gauged.CheckOptions{UTCOffset: demoRecordOffset})
	if err != nil {
		return err
	}
	c.Provenance = rating.Provenance{Program: program(), Inputs: demoInputs(demoVisits, true)}
	figs, w, err := plotting.DrawShifts(&c, demoSite, "tallow-visits-2025", plotting.Size{})
	if err != nil {
		return err
	}
	c.Figures, c.Warnings = figs, append(c.Warnings, w...)
	for _, f := range []struct {
		name, what string
		write      func(io.Writer, *gauged.ShiftCheck) error
	}{
		{"tallow-shifts-check.txt", "each gauging's departure and shift against the rating in force, a diagram proposed per visit", results.WriteShiftsText},
		{"tallow-shifts-proposed.csv", "the proposed diagrams in the shift-diagram format, to edit and give back", results.WriteProposedShifts},
	} {
		if err := d.put(f.name, f.what, func(w io.Writer) error { return f.write(w, &c) }); err != nil {
			return err
		}
	}
	if err := d.figures(figs); err != nil {
		return err
	}
	d.warn(c.Warnings)
	return nil
}

// discharge writes the year's discharge record with the accepted shifts.
func (d *demo) discharge(r *gauged.Rater) error {
	sr, err := survey.ReadStageRecord(d.path(demoStages), survey.StageRecordOptions{UTCOffset: demoRecordOffset})
	if err != nil {
		return err
	}
	gs, err := d.demoGaugings()
	if err != nil {
		return err
	}
	res, err := record.Compute(&sr.Stages, r, record.Options{UTCOffset: demoRecordOffset, Gaugings: gs})
	if err != nil {
		return err
	}
	res.Name = demoStages
	res.Provenance = rating.Provenance{Program: program(), Inputs: append(demoInputs(demoStages, true), demoVisits)}
	figs, w, err := plotting.DrawRecord(res, demoSite, "tallow-stage-2025", plotting.Size{})
	if err != nil {
		return err
	}
	res.Figures, res.Warnings = figs, append(res.Warnings, w...)
	const both = results.UnitTable | results.DailyTable
	for _, f := range []struct {
		name, what string
		tables     results.RecordTables
		write      func(io.Writer, *record.Result, results.RecordTables) error
	}{
		{"tallow-record-2025.txt", "the discharge record: ratings, periods and shifts used, daily values", results.DailyTable, results.WriteRecordText},
		{"tallow-record-2025-daily.csv", "daily mean, least and greatest discharge, coverage, flags", results.DailyTable, results.WriteRecordCSV},
		{"tallow-record-2025-unit.csv", "unit values: shift, effective gauge height, discharge, flags", results.UnitTable, results.WriteRecordCSV},
		{"tallow-record-2025.json", "the same record as JSON, unit and daily values", both, results.WriteRecordJSON},
		{"tallow-record-2025.xlsx", "record workbook: summary, daily and unit values, ratings, shifts, gaugings, hydrograph", both, results.WriteRecordWorkbook},
	} {
		if err := d.put(f.name, f.what, func(w io.Writer) error { return f.write(w, res, f.tables) }); err != nil {
			return err
		}
	}
	if err := d.figures(figs); err != nil {
		return err
	}
	var peak record.DailyValue
	for _, v := range res.Daily {
		if v.Max > peak.Max {
			peak = v
		}
	}
	d.list = append(d.list, fmt.Sprintf("  peak unit discharge %.3g m3/s at %s; provisional until reviewed", peak.Max, peak.MaxTime.Format("2006-01-02 15:04")))
	d.warn(res.Warnings)
	return nil
}

// comparisons compares the two ratings and the two surveys of XS-1.
func (d *demo) comparisons() error {
	h, err := d.demoRatings()
	if err != nil {
		return err
	}
	a, err := h.Periods[0].Rating.Compile()
	if err != nil {
		return err
	}
	b, err := h.Periods[1].Rating.Compile()
	if err != nil {
		return err
	}
	rc, err := gauged.CompareRatings(a, b, gauged.CompareOptions{Step: 0.1})
	if err != nil {
		return err
	}
	rc.Provenance = rating.Provenance{Program: program(), Inputs: []string{demoRating7, demoRating8}}
	figs, w, err := plotting.DrawRatingComparison(&rc, demoSite, "tallow-rating-7-vs-8", plotting.Size{})
	if err != nil {
		return err
	}
	rc.Warnings = append(rc.Warnings, w...)
	if err := d.put("tallow-rating-7-vs-8.txt", "rating 8 against rating 7, every 0.1 m of their common range"+percentAt(rc, 0.6, 2.0),
		func(w io.Writer) error { return results.WriteRatingComparisonText(w, &rc) }); err != nil {
		return err
	}
	if err := d.figures(figs); err != nil {
		return err
	}
	var ps [2]*survey.Prepared
	for i, name := range []string{demoSurvey, demoSurvey2025} {
		if ps[i], err = survey.Prepare(survey.SectionRequest{Path: d.path(name)}); err != nil {
			return err
		}
	}
	sc, err := rating.CompareSections(ps[0].Geometry, ps[1].Geometry, nil, rating.Options{})
	if err != nil {
		return err
	}
	sc.A, sc.B = demoSurvey, demoSurvey2025
	sc.GroundA, sc.GroundB = ps[0].Ground, ps[1].Ground
	sc.Provenance = rating.Provenance{Program: program(), Inputs: []string{demoSurvey, demoSurvey2025}}
	figs, w, err = plotting.DrawSectionComparison(&sc, demoSite, "tallow-xs1-2019-vs-2025", plotting.Size{})
	if err != nil {
		return err
	}
	sc.Warnings = append(sc.Warnings, w...)
	if err := d.put("tallow-xs1-2019-vs-2025.txt", "the two surveys of XS-1: area, wetted perimeter, top width, conveyance and their differences",
		func(w io.Writer) error { return results.WriteSectionComparisonText(w, &sc) }); err != nil {
		return err
	}
	if err := d.figures(figs); err != nil {
		return err
	}
	d.warn(rc.Warnings)
	d.warn(sc.Warnings)
	return nil
}

// percentAt words a rating comparison's percent difference at the rows
// nearest two stages.
func percentAt(c gauged.RatingComparison, stages ...float64) string {
	var parts []string
	for _, h := range stages {
		best := -1
		for i, r := range c.Rows {
			if best < 0 || math.Abs(r.Stage-h) < math.Abs(c.Rows[best].Stage-h) {
				best = i
			}
		}
		if best >= 0 {
			r := c.Rows[best]
			parts = append(parts, fmt.Sprintf("%+.0f %% at %.2f m", r.Percent, r.Stage))
		}
	}
	if len(parts) == 0 {
		return ""
	}
	return " (" + strings.Join(parts, ", ") + ")"
}
