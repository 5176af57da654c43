package results

import (
	"fmt"
	"io"
	"slices"

	"wetline/rating"
	"wetline/rating/reach"
	"wetline/survey/workbook"
)

// Sheet names of a slope-area results workbook besides SheetSummary and
// SheetPlots.
const (
	SheetReachInputs = "inputs"
	SheetSections    = "sections"
	SheetSubreaches  = "subreaches"
	SheetChecks      = "checks"
	SheetUncertainty = "uncertainty"
)

// WriteSlopeAreaWorkbook writes the results workbook of a slope-area
// report to w, with its figures (none: no plots sheet). Sheets:
//
//   - summary: the peak discharge and its band, the method and its source,
//     the reach's length and fall, the units, the checks passed, the
//     program version, the warnings and the caution;
//   - inputs: the reach table as read (section, survey, distance, ws_left,
//     ws_right, quality, note: the columns of a reach table) with the
//     water surface taken from the marks;
//   - sections: each section's hydraulics at the peak discharge;
//   - subsections: every subsection of every section at the peak
//     discharge: its stations, region, Manning's n, area, wetted
//     perimeter, top width, conveyance, discharge and velocity;
//   - subreaches: each pair of adjacent sections alone, and its losses at
//     the peak discharge;
//   - checks: each quality check's value, limit, pass or warn (warnings in
//     the marked style) and source;
//   - uncertainty: the Monte Carlo percentiles, settings and
//     sensitivities, when run;
//   - plots: the pictures.
func WriteSlopeAreaWorkbook(w io.Writer, rep reach.Report) error {
	b := newBook("slope-area", rep.Provenance.Site, saReachName(rep))
	defer b.Close()
	if err := writeSheets(b, rep,
		writeSASummary, writeSAInputs, writeSASections, writeSASubsections, writeSASubreaches, writeSAChecks, writeSAUncertainty,
	); err != nil {
		return err
	}
	return finishBook(w, b, rep.Figures)
}

// saSubreachesSolved words how the subreaches of a slope-area estimate
// were solved: "the 2 subreaches solved together", or "its one subreach"
// for a reach of two sections.
func saSubreachesSolved(n int) string {
	if n == 1 {
		return "its one subreach"
	}
	return fmt.Sprintf("the %d subreaches solved together", n)
}

// saReachName names the reach table read ("reach" when built in code).
func saReachName(rep reach.Report) string {
	if rep.Name == "" {
		return "reach"
	}
	return rep.Name
}

func writeSASummary(b *workbook.Book, rep reach.Report) error {
	r := rep.Result
	u := r.Units
	L, Q := u.Length(), u.Discharge()
	var err error
	num := func(format string, v float64) any { return b.NumberOnce(format, v, &err) }
	items := []SummaryItem{
		{"reach table", saReachName(rep), ""},
		{"program", programName(rep.Provenance), ""},
		{"site", rep.Provenance.Site.String(), ""},
		{"units", fmt.Sprintf("%s: length %s, discharge %s", u, L, Q), ""},
		{"peak discharge", num(workbook.FormatSig3, r.Discharge), Q},
	}
	add := func(item string, v any, unit string) { items = append(items, SummaryItem{item, v, unit}) }
	if un := rep.Uncertainty; un != nil {
		add("5th percentile", num(workbook.FormatSig3, un.P05), Q)
		add("median", num(workbook.FormatSig3, un.P50), Q)
		add("95th percentile", num(workbook.FormatSig3, un.P95), Q)
		add("band", fmt.Sprintf("Monte Carlo over n and the marks, %s (%d without a solution), seed %d: see the uncertainty sheet", rating.Counted(un.Draws, "draw", "draws"), un.Failed, un.Seed), "")
	} else {
		add("band", "no Monte Carlo analysis was run", "")
	}
	switch r.Method {
	case reach.MethodSlopeArea:
		add("method", fmt.Sprintf("slope-area, %s (Dalrymple & Benson, 1967, USGS TWRI 3-A2)", saSubreachesSolved(len(r.Subreaches))), "")
		add("reach length", num(workbook.DecimalsFormat(lengthDecimals(saDistances(r)...)), r.Length), L)
		add("fall", num("0.000", r.Fall), L)
		add("least subreach discharge", num(workbook.FormatSig3, r.SubreachMin), Q)
		add("greatest subreach discharge", num(workbook.FormatSig3, r.SubreachMax), Q)
		add("subreach spread", num("0.0", 100*r.SubreachSpread), "% of the peak")
		if failed := saFailedSubreaches(r); failed != "" {
			add("no real discharge alone", failed, "")
		}
	default:
		add("method", "single-section slope-conveyance Q = K·√S with an assumed slope: a weaker method, no measured fall", "")
		add("slope assumed", num("0.######", r.Slope), L+"/"+L)
	}
	add("water surface from", saSurfaceWords(r), "")
	add("sections", len(r.Sections), "")
	pass := 0
	for _, c := range r.Checks {
		if c.Pass {
			pass++
		}
	}
	add("quality checks passed", fmt.Sprintf("%d of %d (see the checks sheet)", pass, len(r.Checks)), "")
	add("indirect estimate", rating.IndirectNote, "")
	if err != nil {
		return err
	}
	return WriteSummarySheet(b, SheetSummary, items, rep.Warnings)
}

func writeSAInputs(b *workbook.Book, rep reach.Report) error {
	L := rep.Result.Units.Length()
	s, err := reportTable(b, SheetReachInputs, []workbook.Column{
		{Name: "section", Width: 12},
		{Name: "survey", Width: 24},
		{Name: "distance", Unit: L, Format: workbook.DecimalsFormat(lengthDecimals(saDistances(rep.Result)...))},
		{Name: "ws_left", Unit: L, Format: "0.000"},
		{Name: "ws_right", Unit: L, Format: "0.000"},
		{Name: "quality", Width: 10},
		{Name: "note", Width: 30},
		{Name: "water_surface", Unit: L, Format: "0.000"},
		{Name: "marks_used", Format: "0"},
		{Name: "survey_note", Width: 60},
	})
	if err != nil {
		return err
	}
	for i, sec := range rep.Result.Sections {
		vals := []any{sec.ID, nil, sec.Distance, sec.Left, sec.Right, nil, nil, sec.WaterSurface, sec.MarksUsed, nil}
		if i < len(rep.Sections) {
			rr := rep.Sections[i]
			vals[1], vals[5], vals[6] = rr.Survey, rr.Quality.String(), rr.Note
			if rr.SurveyNote != "" {
				vals[9] = rr.SurveyNote
			}
		}
		if err := s.Row(vals...); err != nil {
			return err
		}
	}
	return s.Flush()
}

func writeSASections(b *workbook.Book, rep reach.Report) error {
	u := rep.Result.Units
	L := u.Length()
	s, err := reportTable(b, SheetSections, []workbook.Column{
		{Name: "section", Width: 12},
		{Name: "distance", Unit: L, Format: workbook.DecimalsFormat(lengthDecimals(saDistances(rep.Result)...))},
		{Name: "water_surface", Unit: L, Format: "0.000"},
		{Name: "thalweg", Unit: L, Format: "0.000"},
		{Name: "area", Unit: u.Area(), Format: workbook.FormatSig3},
		{Name: "wetted_perimeter", Unit: L, Format: "0.00"},
		{Name: "top_width", Unit: L, Format: "0.00"},
		{Name: "hydraulic_depth", Unit: L, Format: "0.000"},
		{Name: "conveyance", Unit: u.Conveyance(), Format: workbook.FormatSig3},
		{Name: "alpha", Format: "0.000"},
		{Name: "velocity", Unit: u.Velocity(), Format: "0.00"},
		{Name: "velocity_head", Unit: L, Format: "0.000"},
		{Name: "energy_grade", Unit: L, Format: "0.000"},
		{Name: "froude", Format: "0.00"},
	})
	if err != nil {
		return err
	}
	for _, sec := range rep.Result.Sections {
		if err := s.Row(sec.ID, sec.Distance, sec.WaterSurface, sec.Bottom, sec.Area, sec.WettedPerimeter, sec.TopWidth,
			sec.HydraulicDepth, sec.Conveyance, sec.Alpha, sec.Velocity, sec.VelocityHead, sec.EnergyGrade, sec.Froude); err != nil {
			return err
		}
	}
	return s.Flush()
}

func writeSASubsections(b *workbook.Book, rep reach.Report) error {
	u := rep.Result.Units
	s, err := reportTable(b, SheetSubsections, subsectionColumns(workbook.Column{Name: "section", Width: 12}, u))
	if err != nil {
		return err
	}
	for _, sec := range rep.Result.Sections {
		if err := writeSubsectionRows(s, sec.ID, sec.Subs); err != nil {
			return err
		}
	}
	return s.Flush()
}

func writeSASubreaches(b *workbook.Book, rep reach.Report) error {
	u := rep.Result.Units
	L := u.Length()
	s, err := reportTable(b, SheetSubreaches, []workbook.Column{
		{Name: "from", Width: 12},
		{Name: "to", Width: 12},
		{Name: "length", Unit: L, Format: workbook.DecimalsFormat(lengthDecimals(saDistances(rep.Result)...))},
		{Name: "fall", Unit: L, Format: "0.000"},
		{Name: "discharge", Unit: u.Discharge(), Format: workbook.FormatSig3},
		{Name: "flow", Width: 12},
		{Name: "eddy_k", Format: "0.0"},
		{Name: "friction_loss", Unit: L, Format: "0.000"},
		{Name: "velocity_head_change", Unit: L, Format: "0.000"},
		{Name: "eddy_loss", Unit: L, Format: "0.000"},
		{Name: "conveyance_ratio", Format: "0.00"},
	})
	if err != nil {
		return err
	}
	for _, sr := range rep.Result.Subreaches {
		if err := s.Row(sr.From, sr.To, sr.Length, sr.Fall, sr.Discharge, sr.Flow(), sr.EddyK,
			sr.FrictionLoss, sr.VelocityHeadChange, sr.EddyLoss, sr.ConveyanceRatio); err != nil {
			return err
		}
	}
	return s.Flush()
}

func writeSAChecks(b *workbook.Book, rep reach.Report) error {
	cols := []workbook.Column{
		{Name: "check", Width: 30},
		{Name: "value", Format: workbook.FormatSig3},
		{Name: "relation", Width: 10},
		{Name: "limit", Format: workbook.FormatSig3},
		{Name: "status", Width: 10},
		{Name: "source", Width: 60},
	}
	s, err := reportTable(b, SheetChecks, cols)
	if err != nil {
		return err
	}
	ws, err := b.WrapStyle()
	if err != nil {
		return err
	}
	for _, c := range rep.Result.Checks {
		vals := []any{c.Name, c.Value, c.Relation, c.Limit, c.Status(), workbook.Styled{Style: ws, Value: c.Source}}
		if !c.Pass {
			if err := markCells(b, cols, vals[:5]); err != nil { // the source keeps its wrapping
				return err
			}
		}
		if err := s.Row(vals...); err != nil {
			return err
		}
	}
	return s.Flush()
}

func writeSAUncertainty(b *workbook.Book, rep reach.Report) error {
	un := rep.Uncertainty
	if un == nil {
		return nil
	}
	r := rep.Result
	u := r.Units
	L, Q := u.Length(), u.Discharge()
	s, err := reportTable(b, SheetUncertainty, []workbook.Column{
		{Name: "quantity", Width: 40},
		{Name: "section", Width: 12},
		{Name: "value", Format: workbook.FormatSig3, Width: 14},
		{Name: "unit", Width: 14},
	})
	if err != nil {
		return err
	}
	rows := [][]any{
		{"discharge, 5th percentile", nil, un.P05, Q},
		{"discharge, median", nil, un.P50, Q},
		{"discharge, 95th percentile", nil, un.P95, Q},
		{"discharge, mean", nil, un.Mean, Q},
		{"discharge, standard deviation", nil, un.SD, Q},
		{"draws", nil, un.Draws, ""},
		{"draws without a solution", nil, un.Failed, ""},
		{"seed", nil, fmt.Sprint(un.Seed), ""},
		{"coefficient of variation of n (log-normal)", nil, un.NCV, ""},
		{markSDLabel(un.MarkSD), nil, un.MarkSD, L},
		{"dQ/dn, every n together", nil, un.DQDN, Q + " per unit n"},
		{"dQ/dn, every n together, per 0.001 of n", nil, un.DQDNPerMilli, Q + " per 0.001 n"},
	}
	if un.NErrors == reach.NSharedByRegion {
		rows = slices.Insert(rows, slices.IndexFunc(rows, func(r []any) bool { return r[0] == "coefficient of variation of n (log-normal)" })+1,
			[]any{"errors of n", nil, "one per region, shared by every section", ""})
	}
	for i, sec := range r.Sections {
		if i < len(un.WaterSurfaceSD) {
			rows = append(rows, []any{"standard deviation of the water surface", sec.ID, un.WaterSurfaceSD[i], L})
		}
	}
	for i, sec := range r.Sections {
		if i < len(un.DQDH) {
			rows = append(rows, []any{"dQ/dh, this water surface alone", sec.ID, un.DQDH[i], Q + " per " + L})
		}
	}
	for _, row := range rows {
		if err := s.Row(row...); err != nil {
			return err
		}
	}
	return s.Flush()
}

// markSDLabel names the uncertainty sheet's row of the mark standard
// deviation sd: zero means no mark was varied, rated or not.
func markSDLabel(sd float64) string {
	if sd > 0 {
		return "standard deviation of one mark (normal)"
	}
	return "standard deviation of one mark: none, every mark held (its quality set aside)"
}
