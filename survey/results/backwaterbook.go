package results

import (
	"fmt"
	"io"
	"math"

	"wetline/rating/reach"
	"wetline/survey/workbook"
)

// Sheet names of a step-backwater results workbook besides SheetSummary,
// SheetRating, SheetSubsections and SheetPlots.
const (
	SheetConvergence  = "convergence"
	SheetProfiles     = "profiles"
	SheetVerification = "verification"
)

// WriteBackwaterWorkbook writes the results workbook of a step-backwater
// report to w. Sheets:
//
//   - summary: the reach, program, units, method and its sources, the
//     boundary, the second and half-way starts, the eddy-loss
//     coefficients, the rating section and the spread tolerance, the
//     discharges, how many reads are unsettled or critical, the warnings
//     and the caution;
//   - rating: the rating section's full hydraulics at every computed
//     stage, the sheet of a rate workbook (WriteRatingSheet);
//   - convergence: each discharge's stage at the rating section from the
//     three starts, their spread, critical and unsettled (marked);
//   - profiles: every profile, one row per discharge and section;
//   - subsections: the rating section's subsections at each stage
//     (WriteSubsectionSheet);
//   - verification: the departures from the marks, when asked (outside
//     their quality band marked);
//   - plots: the pictures, when given.
func WriteBackwaterWorkbook(w io.Writer, rep reach.BackwaterReport) error {
	b := newBook("step-backwater", rep.Provenance.Site, bwReachName(rep))
	defer b.Close()
	if err := writeSheets(b, rep,
		writeBWSummary, writeBWRating, writeBWConvergence, writeBWProfiles, writeBWSubsections, writeBWVerification,
	); err != nil {
		return err
	}
	return finishBook(w, b, rep.Figures)
}

// bwReachName names the reach table read ("reach" when built in code).
func bwReachName(rep reach.BackwaterReport) string {
	if rep.Name == "" {
		return "reach"
	}
	return rep.Name
}

func writeBWSummary(b *workbook.Book, rep reach.BackwaterReport) error {
	r := rep.Result
	u := r.Units
	var err error
	num := func(format string, v float64) any { return b.NumberOnce(format, v, &err) }
	boundary := BackwaterBoundaryWords(rep)
	items := []SummaryItem{
		{"reach table", bwReachName(rep), ""},
		{"program", programName(rep.Provenance), ""},
		{"site", rep.Provenance.Site.String(), ""},
		{"units", fmt.Sprintf("%s: length %s, discharge %s", u, u.Length(), u.Discharge()), ""},
		{"method", "standard step method between adjacent sections (Davidian, 1984, USGS TWRI 3-A15; Chow, 1959, ch. 10)", ""},
		{"friction loss", "Q²·L/(Ku·Kd), the geometric mean of the two conveyances; L weighted by conveyance where flow lengths are given", ""},
		{"eddy-loss coefficient, expanding", num("0.00", r.Expansion), ""},
		{"eddy-loss coefficient, contracting", num("0.00", r.Contraction), ""},
		{"sections", len(rep.Sections), ""},
		{"downstream boundary", boundary, ""},
		{"second start of every profile", r.SecondBoundary, ""},
		{"third start of every profile", "half-way between the two (nearer the first where half-way is supercritical)", ""},
		{"rating section", r.Rating.Section, ""},
		{"spread tolerance", num("0.000", r.Rating.Tolerance), u.Length()},
		{"discharges", len(r.Profiles), ""},
	}
	for _, sec := range rep.Sections {
		if sec.SurveyNote != "" {
			items = append(items, SummaryItem{"survey of " + sec.ID, sec.SurveyNote, ""})
		}
	}
	unsettled, critical := 0, 0
	for _, rd := range r.Rating.Rows {
		if rd.Unsettled {
			unsettled++
		}
		if rd.Critical {
			critical++
		}
	}
	items = append(items,
		SummaryItem{"reads still depending on the boundary (unsettled)", unsettled, ""},
		SummaryItem{"reads at critical depth", critical, ""})
	if v := rep.Verification; v != nil {
		items = append(items,
			SummaryItem{"verification discharge", num(workbook.FormatSig3, v.Discharge), u.Discharge()},
			SummaryItem{"mean departure from the marks", num("+0.000;-0.000;0.000", v.MeanDeparture), u.Length()},
			SummaryItem{"largest departure from the marks", num("+0.000;-0.000;0.000", v.MaxDeparture), u.Length()})
	}
	items = append(items, SummaryItem{"note", BackwaterNote, ""})
	items = append(items, inputNoteItems(rep.Provenance)...)
	if err != nil {
		return err
	}
	return WriteSummarySheet(b, SheetSummary, items, rep.Warnings)
}

func writeBWRating(b *workbook.Book, rep reach.BackwaterReport) error {
	return WriteRatingSheet(b, SheetRating, rep.Table)
}

func writeBWSubsections(b *workbook.Book, rep reach.BackwaterReport) error {
	return WriteSubsectionSheet(b, SheetSubsections, rep.Table)
}

func writeBWConvergence(b *workbook.Book, rep reach.BackwaterReport) error {
	r := rep.Result
	L, Q := r.Units.Length(), r.Units.Discharge()
	cols := []workbook.Column{
		{Name: "discharge", Unit: Q, Format: workbook.FormatSig3},
		{Name: "stage", Unit: L, Format: "0.000"},
		{Name: "second_stage", Unit: L, Format: "0.000"},
		{Name: "halfway_stage", Unit: L, Format: "0.000"},
		{Name: "spread", Unit: L, Format: "0.000"},
		{Name: "critical", Width: 10},
		{Name: "unsettled", Width: 10},
	}
	s, err := reportTable(b, SheetConvergence, cols)
	if err != nil {
		return err
	}
	at := r.Rating.Index
	for i, rd := range r.Rating.Rows {
		second, halfway := math.NaN(), math.NaN()
		if i < len(r.Profiles) && at < len(r.Profiles[i].Sections) {
			s := r.Profiles[i].Sections[at]
			second, halfway = s.SecondWaterSurface, s.HalfwayWaterSurface
		}
		vals := []any{rd.Discharge, rd.Stage, second, halfway, rd.Spread, yes(rd.Critical), yes(rd.Unsettled)}
		if rd.Unsettled {
			if err := markCells(b, cols, vals); err != nil {
				return err
			}
		}
		if err := s.Row(vals...); err != nil {
			return err
		}
	}
	return s.Flush()
}

func writeBWProfiles(b *workbook.Book, rep reach.BackwaterReport) error {
	u := rep.Result.Units
	L := u.Length()
	s, err := reportTable(b, SheetProfiles, []workbook.Column{
		{Name: "discharge", Unit: u.Discharge(), Format: workbook.FormatSig3},
		{Name: "section", Width: 12},
		{Name: "distance", Unit: L, Format: "0.0"},
		{Name: "thalweg", Unit: L, Format: "0.000"},
		{Name: "water_surface", Unit: L, Format: "0.000"},
		{Name: "energy_grade", Unit: L, Format: "0.000"},
		{Name: "velocity_head", Unit: L, Format: "0.000"},
		{Name: "froude", Format: "0.00"},
		{Name: "critical", Width: 10},
		{Name: "spread", Unit: L, Format: "0.000"},
		{Name: "second_water_surface", Unit: L, Format: "0.000"},
		{Name: "area", Unit: u.Area(), Format: workbook.FormatSig3},
		{Name: "top_width", Unit: L, Format: "0.00"},
		{Name: "conveyance", Unit: u.Conveyance(), Format: workbook.FormatSig3},
		{Name: "alpha", Format: "0.000"},
		{Name: "length", Unit: L, Format: "0.0"},
		{Name: "friction_loss", Unit: L, Format: "0.000"},
		{Name: "eddy_loss", Unit: L, Format: "0.000"},
		{Name: "flow", Width: 12},
	})
	if err != nil {
		return err
	}
	for _, p := range rep.Result.Profiles {
		for j, x := range p.Sections {
			var length, hf, he, flow any = x.Length, x.FrictionLoss, x.EddyLoss, "contracting"
			switch {
			case j == len(p.Sections)-1:
				length, hf, he, flow = nil, nil, nil, nil
			case x.Expanding:
				flow = "expanding"
			}
			if err := s.Row(p.Discharge, x.ID, x.Distance, x.Bottom, x.WaterSurface, x.EnergyGrade, x.VelocityHead, x.Froude,
				yes(x.Critical), x.Spread, x.SecondWaterSurface, x.Area, x.TopWidth, x.Conveyance, x.Alpha,
				length, hf, he, flow); err != nil {
				return err
			}
		}
	}
	return s.Flush()
}

func writeBWVerification(b *workbook.Book, rep reach.BackwaterReport) error {
	v := rep.Verification
	if v == nil {
		return nil
	}
	L := rep.Result.Units.Length()
	const signed = "+0.000;-0.000;0.000"
	cols := []workbook.Column{
		{Name: "section", Width: 12},
		{Name: "distance", Unit: L, Format: "0.0"},
		{Name: "ws_left", Unit: L, Format: "0.000"},
		{Name: "ws_right", Unit: L, Format: "0.000"},
		{Name: "mark", Unit: L, Format: "0.000"},
		{Name: "water_surface", Unit: L, Format: "0.000"},
		{Name: "departure", Unit: L, Format: signed},
		{Name: "left_departure", Unit: L, Format: signed},
		{Name: "right_departure", Unit: L, Format: signed},
		{Name: "band", Unit: L, Format: "0.000"},
		{Name: "outside", Width: 10},
	}
	s, err := reportTable(b, SheetVerification, cols)
	if err != nil {
		return err
	}
	for _, m := range v.Marks {
		vals := []any{m.ID, m.Distance, m.Left, m.Right, m.Mark, m.WaterSurface, m.Departure, m.LeftDeparture,
			m.RightDeparture, m.Band, yes(m.Outside)}
		if m.Outside {
			if err := markCells(b, cols, vals); err != nil {
				return err
			}
		}
		if err := s.Row(vals...); err != nil {
			return err
		}
	}
	return s.Flush()
}
