package plotting

import (
	"bytes"
	"cmp"
	"errors"
	"fmt"
	"io"
	"math"
	"strings"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/rating/reach"
	"wetline/subdivide"
)

// The figures of a report are drawn in memory, each into a rating.Figure
// named Base-kind.png, so that a run writes its files only once every
// figure is drawn. Warnings of each figure are prefixed with its kind.

// RatingFigures are the inputs of the figures of a rating table.
type RatingFigures struct {
	// Site and Subtitle title the figures; Base starts their file names.
	Site, Base, Subtitle string
	// Table is the rating.
	Table rating.Table
	// Ground is the surveyed section; without points there is no section
	// figure and no bankfull line.
	Ground rating.Ground
	// ZeroFlow is the gauge height of zero flow for the log–log panel (NaN:
	// from the table).
	ZeroFlow float64
	// Geometry is how the section was wetted (pockets), for the section
	// figure.
	Geometry subdivide.Options
	// Size is the pixel size (zero value: the default).
	Size Size
	// Fit are the rows of Table as a rating fit wrote them, with what
	// each rests on and the bounds of its bands (survey.FitRowsFromTable;
	// nil for a table that is not a fit's). When given, the table is
	// drawn as the fit draws its own: dashed where extrapolated, the
	// conveyance-slope extension apart, the bands shaded.
	Fit []gauged.ControlRow
}

// figureSet collects drawn figures and their warnings.
type figureSet struct {
	base     string
	figs     []rating.Figure
	warnings []string
}

// add draws one figure named base-kind.png.
func (s *figureSet) add(kind, caption string, draw func(w io.Writer) (Result, error)) error {
	var buf bytes.Buffer
	res, err := draw(&buf)
	if err != nil {
		return fmt.Errorf("%s figure: %w", kind, err)
	}
	for _, w := range res.Warnings {
		s.warnings = append(s.warnings, kind+" figure: "+w)
	}
	s.figs = append(s.figs, rating.Figure{Name: s.base + "-" + kind + ".png", Caption: caption, PNG: buf.Bytes()})
	return nil
}

// oneFigure draws the one figure of a report, named base-kind.png, and
// returns it with its warnings, as the Draw functions do; nothing but the
// error when it cannot be drawn.
func oneFigure(base, kind, caption string, draw func(w io.Writer) (Result, error)) ([]rating.Figure, []string, error) {
	set := &figureSet{base: base}
	if err := set.add(kind, caption, draw); err != nil {
		return nil, nil, err
	}
	return set.figs, set.warnings, nil
}

// DrawRating draws the rating, cross-section (with a ground line) and
// properties figures of a rating table, its curve named by TableLabel and
// the figure titled by the table's Kind when it has one; rows flagged
// unsettled, critical_stage or above_end are marked (FlagMarks) and
// counted in a foot note (FlagNote). A step-backwater table carries that
// method's caution. A table without geometry columns has no properties
// figure (said in a warning).
func DrawRating(in RatingFigures) ([]rating.Figure, []string, error) {
	set := &figureSet{base: in.Base}
	t := in.Table
	rp := tableRatingPlot(in)
	// The section is drawn in elevations; the rating and the properties
	// in the table's stages, which may be gauge heights.
	datum := 0.0
	if t.GaugeHeights {
		datum = t.Datum
	}
	bankfull, hasBankfull := in.Ground.Section.Bankfull()
	if err := set.add("rating", "stage–discharge rating, linear and log–log", func(w io.Writer) (Result, error) {
		return Rating(w, rp)
	}); err != nil {
		return nil, nil, err
	}
	if len(in.Ground.Section.Points) > 0 {
		if err := set.add("section", "surveyed cross-section with subsections and water surfaces", func(w io.Writer) (Result, error) {
			return CrossSection(w, SectionPlot{Site: in.Site, Section: in.Ground.Section, Units: t.Units,
				Marks: in.Ground.Labels, Water: waterSurfaces(t, datum, bankfull, hasBankfull), Geometry: in.Geometry, Size: in.Size})
		}); err != nil {
			return nil, nil, err
		}
	}
	err := set.add("properties", "area, top width, hydraulic radius, conveyance, alpha and velocity against stage", func(w io.Writer) (Result, error) {
		return Properties(w, PropertiesPlot{Site: in.Site, Section: t.Name, Units: t.Units,
			Rows: PropertiesFromTable(t), Bankfull: rating.DecimalDifference(bankfull, datum), HasBankfull: hasBankfull, Size: in.Size})
	})
	switch {
	case errors.Is(err, ErrNoData):
		set.warnings = append(set.warnings, "no properties figure: the table has no area, top width or conveyance columns to draw")
	case err != nil:
		set.warnings = append(set.warnings, "no properties figure: "+err.Error())
	}
	return set.figs, set.warnings, nil
}

// tableRatingPlot lays out the rating figure of a rating table: titled
// and labelled by what the table is (its Kind, else a Manning rating by
// its slope), its flagged rows marked and counted in a foot note, the
// caution of its method, the gauge height of zero flow and bankfull
// (in the table's stages) as given.
func tableRatingPlot(in RatingFigures) RatingPlot {
	t := in.Table
	sub := in.Subtitle
	switch {
	case t.Kind != "":
		sub = fmt.Sprintf("%s, %s units; %s", t.Kind, strings.ToUpper(t.Units.String()), sub)
	case t.Slope > 0:
		sub = fmt.Sprintf("hydraulic rating by Manning's equation, friction slope %g, %s units; %s",
			t.Slope, strings.ToUpper(t.Units.String()), sub)
	}
	rp := RatingPlot{Site: in.Site, Section: t.Name, Subtitle: strings.TrimSuffix(sub, "; "), Units: t.Units,
		Hydraulic: CurveFromTable(t, TableLabel(t)), Size: in.Size, What: t.Kind, Flagged: FlagMarks(t)}
	if note := FlagNote(rp.Flagged, t.Units); note != "" {
		rp.Notes = append(rp.Notes, note)
	}
	if t.Kind == rating.KindBackwater {
		rp.Caution = DefaultBackwaterCaution
	}
	if len(in.Fit) > 0 {
		fitTableRowsPlot(&rp, in.Fit)
	}
	if !math.IsNaN(in.ZeroFlow) {
		// A table with a gauge height of zero flow is read
		// log-linearly in (h − e) between its rows: drawn so too.
		rp.ZeroFlow, rp.HasZeroFlow = in.ZeroFlow, true
		for _, c := range []*Curve{&rp.Hydraulic, &rp.Fitted, &rp.Extension} {
			c.Points = readAsRated(cleanCurve(*c), rp.ZeroFlow, true)
		}
	}
	datum := 0.0
	if t.GaugeHeights {
		datum = t.Datum
		rp.Subtitle += fmt.Sprintf("; stages are gauge heights, gauge zero at elevation %g %s", datum, t.Units.Length())
	}
	bankfull, hasBankfull := in.Ground.Section.Bankfull()
	rp.Bankfull, rp.HasBankfull = rating.DecimalDifference(bankfull, datum), hasBankfull
	return rp
}

// fitTableRowsPlot lays out a fit's table redrawn (rows, as
// survey.FitRowsFromTable reads them) as the fit's own figure draws it
// (fitRowsPlot), in place of the plain curve: the bands named by what
// they bound, which holds for either method's (the band of the relation;
// of one discharge, the relation and the scatter about it), and the
// gauge height of zero flow of the log–log panel, unless given, where
// the fitted rows start to flow.
func fitTableRowsPlot(rp *RatingPlot, rows []gauged.ControlRow) {
	fitRowsPlot(rp, rows, rp.Hydraulic.Label)
	rp.Hydraulic, rp.PadEnds = Curve{}, true
	rp.BandLabel, rp.TotalBandLabel = "95 % band of the relation", "95 % band of one discharge"
	if len(rp.Band)+len(rp.TotalBand) > 0 {
		rp.Notes = append(rp.Notes, "bands: the table's parametric_lower_95 to parametric_upper_95 (the fitted relation) and total_lower_95 to total_upper_95 (one discharge: the relation and the scatter about it)")
	}
	if e, ok := zeroFlowOf(cleanCurve(rp.Fitted)); ok {
		rp.ZeroFlow, rp.HasZeroFlow = e, true
	}
}

// TableLabel names a rating table's curve by what the table is: its Kind
// when its source says so (a fitted or step-backwater rating), else a
// hydraulic rating by Manning's equation when it has a friction slope,
// else neutrally a rating table.
func TableLabel(t rating.Table) string {
	switch {
	case t.Kind != "":
		return t.Kind
	case t.Slope > 0:
		return "hydraulic rating (Manning)"
	}
	return "rating table"
}

// waterSurfaces are the lines of a rating's section figure, in
// elevations: bankfull, and the highest rated stage (a gauge height plus
// datum) when it is above bankfull.
func waterSurfaces(t rating.Table, datum, bankfull float64, hasBankfull bool) []WaterSurface {
	water := []WaterSurface{}
	if hasBankfull {
		water = append(water, WaterSurface{Stage: bankfull, Label: "bankfull", Shade: true})
	}
	if _, top, ok := t.StageRange(); ok && (!hasBankfull || top+datum > bankfull) {
		top += datum
		water = append(water, WaterSurface{Stage: top, Label: "highest rated stage", Shade: !hasBankfull})
	}
	return water
}

// DrawFit draws the rating figure of a gaugings report: the gaugings by
// quality with error bars at their uncertainty (those left out of the fit
// hollow) against the hydraulic rating, the fitted controls (dashed where
// extrapolated), the hydraulic extension above the gaugings, the prior of
// a Bayesian fit, and both 95 % bands shaded along the whole table.
// Stages are gauge heights.
func DrawFit(rep *gauged.Report, site, base string, size Size) ([]rating.Figure, []string, error) {
	rp := FitPlot(rep, site)
	rp.Size = size
	caption := "gaugings against the hydraulic and fitted ratings, with both 95 % bands"
	if rep.Table == nil {
		caption = "gaugings against the hydraulic rating"
	}
	return oneFigure(base, "fit", caption, func(w io.Writer) (Result, error) {
		return Rating(w, rp)
	})
}

// FitPlot lays out a gaugings report as the rating plot DrawFit draws:
// the hydraulic rating, the fitted controls (their table's rows, dashed
// where extrapolated), the hydraulic extension (conveyance-slope rows),
// the prior rating of a Bayesian fit, both bands at every row that has
// them, and the gaugings with bars at their uncertainty, those left out
// of the fit marked Excluded. site titles it.
func FitPlot(rep *gauged.Report, site string) RatingPlot {
	rp := RatingPlot{Site: site, Section: cmp.Or(rep.Section, rep.Site), Units: rep.Units, PadEnds: true}
	var sub []string
	if rep.Curve != nil {
		c := Curve{Label: fmt.Sprintf("hydraulic rating (Manning, slope %g)", rep.Slope)}
		if rep.Hydraulic == nil {
			c.Label = "hydraulic rating (" + rep.HydraulicSource + ")"
		}
		for _, p := range rep.Curve {
			c.Points = append(c.Points, RatingPoint{Stage: p.Stage, Discharge: p.Hydraulic})
		}
		rp.Hydraulic = c
		if rep.Hydraulic != nil {
			sub = append(sub, fmt.Sprintf("gauge heights; gauge zero at elevation %g %s", rep.Datum, rep.Units.Length()))
		}
	}
	if t := rep.Table; t != nil {
		fitTablePlot(&rp, rep, t)
	}
	if f := rep.Fit; f != nil {
		rp.ZeroFlow, rp.HasZeroFlow = f.Controls[0].B, true
		method := "least-squares"
		if f.Method == gauged.Bayesian {
			method = "Bayesian"
		}
		sub = append(sub, fmt.Sprintf("%s fit of %s, standard error %.1f %%", method, rating.Counted(len(f.Controls), "control", "controls"), f.StandardErrorPercent))
	}
	for i, g := range rep.Gaugings {
		pg := Gauging{Stage: g.Stage, Discharge: g.Discharge, Quality: g.Quality, Uncertainty: g.UncertaintyPercent()}
		if rep.Fit != nil {
			pg.Excluded = rep.Fit.Residuals[i].Excluded
		} else {
			pg.Excluded = rep.Selection.Reason(g) != ""
		}
		rp.Gaugings = append(rp.Gaugings, pg)
	}
	rp.Notes = append(rp.Notes, fmt.Sprintf("error bars: each gauging's uncertainty at 95 %% (its uncertainty column, else its quality grade: excellent %g %%, good %g %%, fair %g %%, poor %g %%, unrated %g %%)",
		rating.Excellent.WeightPercent(), rating.Good.WeightPercent(), rating.Fair.WeightPercent(), rating.Poor.WeightPercent(), rating.Unrated.WeightPercent()))
	rp.Subtitle = strings.Join(sub, "; ")
	return rp
}

// fitTablePlot lays out the table of a fit: the fitted controls, the
// hydraulic extension, the prior and both bands.
func fitTablePlot(rp *RatingPlot, rep *gauged.Report, t *gauged.ControlTable) {
	f := rep.Fit
	bayes := f.Method == gauged.Bayesian
	fit := Curve{Label: "fitted controls (least squares)"}
	rp.BandLabel, rp.TotalBandLabel = "95 % band of the mean relation", "95 % prediction band of one discharge"
	if bayes {
		fit.Label = "fitted controls (posterior mode)"
		rp.BandLabel, rp.TotalBandLabel = "95 % parametric band (the relation)", "95 % total band (relation and remnant error)"
	}
	fitRowsPlot(rp, t.Rows, fit.Label)
	if rep.Prior != nil {
		pr := Curve{Label: "prior of the controls, from the survey (before the gaugings)"}
		for _, r := range t.Rows {
			pr.Points = append(pr.Points, RatingPoint{Stage: r.Stage, Discharge: rep.Prior.Discharge(r.Stage)})
		}
		rp.Prior = pr
	}
	if t.AboveNote != "" {
		rp.Notes = append(rp.Notes, t.AboveNote)
	}
	if t.BandsWithheld {
		rp.Notes = append(rp.Notes, "bands withheld: the chains disagree (R̂ above the limit)")
	}
}

// fitRowsPlot lays out the rows of a fit's table: the fitted curve
// (labelled fitLabel, dashed where extrapolated), the hydraulic extension
// (conveyance-slope rows, from the row below them) and both bands at
// every row that has them.
func fitRowsPlot(rp *RatingPlot, rows []gauged.ControlRow, fitLabel string) {
	fit := Curve{Label: fitLabel}
	ext := Curve{Label: "hydraulic extension (conveyance-slope)"}
	for i, r := range rows {
		pt := RatingPoint{Stage: r.Stage, Discharge: r.Discharge, Extrapolated: r.Extrapolated()}
		if r.Basis == gauged.ConveyanceSlopeAbove {
			if len(ext.Points) == 0 && i > 0 {
				prev := rows[i-1]
				ext.Points = append(ext.Points, RatingPoint{Stage: prev.Stage, Discharge: prev.Discharge})
			}
			ext.Points = append(ext.Points, pt)
		} else {
			fit.Points = append(fit.Points, pt)
		}
		if finite(r.ParametricLower, r.ParametricUpper) {
			rp.Band = append(rp.Band, BandPoint{Stage: r.Stage, Low: r.ParametricLower, High: r.ParametricUpper})
		}
		if finite(r.TotalLower, r.TotalUpper) {
			rp.TotalBand = append(rp.TotalBand, BandPoint{Stage: r.Stage, Low: r.TotalLower, High: r.TotalUpper})
		}
	}
	rp.Fitted, rp.Extension = fit, ext
}

// DrawReach draws the reach profile and the sections overlaid of a
// slope-area report. site titles them; base starts their file names. A
// report of one section (the slope-conveyance estimate) has no reach to
// draw a profile of: only its section is drawn.
func DrawReach(rep reach.Report, site, base string, size Size) ([]rating.Figure, []string, error) {
	set := &figureSet{base: base}
	rp := reachPlot(rep, site)
	rp.Size = size
	for _, f := range []struct {
		kind, caption string
		draw          func(io.Writer, ReachPlot) (Result, error)
	}{
		{"profile", "reach profile: thalweg, high-water marks, water surface and energy grade line", ReachProfile},
		{"sections", "the reach's sections overlaid at their thalwegs, with water surfaces", ReachSections},
	} {
		if f.kind == "profile" && len(rp.Sections) < 2 {
			continue
		}
		if err := set.add(f.kind, f.caption, func(w io.Writer) (Result, error) { return f.draw(w, rp) }); err != nil {
			return nil, nil, err
		}
	}
	return set.figs, set.warnings, nil
}

// reachPlot lays out a slope-area report as a reach plot.
func reachPlot(rep reach.Report, site string) ReachPlot {
	r := rep.Result
	name := rep.Name
	if site != "" {
		name = "" // the site names the reach; keep the title on one line
	}
	rp := ReachPlot{Site: site, Reach: name, Units: r.Units,
		Subtitle: fmt.Sprintf("%s; water surface from %s", r.Method, sideWords(r.Side))}
	for _, s := range r.Sections {
		rs := ReachSection{ID: s.ID, Distance: s.Distance, Ground: s.Ground, Bed: s.Bottom,
			WaterSurface: s.WaterSurface, VelocityHead: s.VelocityHead}
		if !math.IsNaN(s.Left) {
			rs.Marks = append(rs.Marks, HighWaterMark{Side: Left, Elevation: s.Left})
		}
		if !math.IsNaN(s.Right) {
			rs.Marks = append(rs.Marks, HighWaterMark{Side: Right, Elevation: s.Right})
		}
		rp.Sections = append(rp.Sections, rs)
	}
	note := fmt.Sprintf("peak discharge %s %s", rating.PlainFigures(r.Discharge, 4), r.Units.Discharge())
	if u := rep.Uncertainty; u != nil {
		note += fmt.Sprintf(", 90 %% band %s to %s %s (Monte Carlo, %d draws)", rating.PlainFigures(u.P05, 4), rating.PlainFigures(u.P95, 4), r.Units.Discharge(), u.Draws)
	}
	rp.Notes = []string{note}
	return rp
}

// sideWords says which marks set the water surface.
func sideWords(s reach.Side) string {
	switch s {
	case reach.LeftSide, reach.RightSide:
		return "the " + s.String() + " marks"
	}
	return "the mean of the left and right marks"
}

// verificationNote is the foot line of the backwater profiles on the
// verification profile: its discharge and its mean and largest departure
// from the marks (length unit, signed; a departure that rounds to zero
// without a sign).
func verificationNote(v reach.Verification, u rating.Units) string {
	return fmt.Sprintf("verification at %s %s: mean departure from the marks %s %s, largest %s %s",
		rating.PlainFigures(v.Discharge, 4), u.Discharge(), fmtSigned(v.MeanDeparture, 3), u.Length(), fmtSigned(v.MaxDeparture, 3), u.Length())
}

// DrawPlan draws the plan figure of a projected coordinate survey, named
// base-plan.png.
func DrawPlan(in PlanPlot, base string) ([]rating.Figure, []string, error) {
	return oneFigure(base, "plan", "plan of the survey "+in.Section+" and its section line", func(w io.Writer) (Result, error) { return Plan(w, in) })
}

// BackwaterFigures are the inputs of the figures of a step-backwater
// report.
type BackwaterFigures struct {
	// Site titles the figures; Base starts their file names.
	Site, Base string
	// Report is the step-backwater report.
	Report reach.BackwaterReport
	// Compare are other ratings at the rating section, drawn with the
	// step-backwater rating (the section's uniform-flow rating, say).
	Compare []Curve
	// Size is the pixel size (zero value: the default).
	Size Size
}

// backwaterSubtitle is the profile figure's subtitle: how many
// discharges were computed from which boundary, and where the rating is
// read.
func backwaterSubtitle(r reach.Backwater) string {
	return fmt.Sprintf("%s from the downstream boundary (%s); rating read at %s",
		rating.Counted(len(r.Profiles), "discharge", "discharges"), r.Boundary.Words(r.Units), r.Rating.Section)
}

// DrawBackwater draws the figures of a step-backwater report: the reach
// profile with every computed profile, the stages at critical depth, the
// high-water marks and a verified profile (Base-profiles.png), and the
// rating at the rating section with the band spanned by the profiles from
// the three starting stages, reads still depending on the boundary ringed
// and reads at critical depth crossed (as in the profile figure),
// beside any ratings to compare (Base-rating.png).
func DrawBackwater(in BackwaterFigures) ([]rating.Figure, []string, error) {
	set := &figureSet{base: in.Base}
	rep := in.Report
	r := rep.Result
	name := rep.Name
	if in.Site != "" {
		name = "" // the site names the reach; keep the title on one line
	}
	bp := BackwaterPlot{Site: in.Site, Reach: name, Units: r.Units, At: r.Rating.Section, Size: in.Size,
		Subtitle: backwaterSubtitle(r)}
	for _, s := range rep.Sections {
		rs := ReachSection{ID: s.ID, Distance: s.Distance, Bed: math.NaN()}
		if s.Geometry != nil {
			rs.Bed = s.Geometry.Bottom()
		}
		if !math.IsNaN(s.Left) {
			rs.Marks = append(rs.Marks, HighWaterMark{Side: Left, Elevation: s.Left})
		}
		if !math.IsNaN(s.Right) {
			rs.Marks = append(rs.Marks, HighWaterMark{Side: Right, Elevation: s.Right})
		}
		bp.Sections = append(bp.Sections, rs)
	}
	for _, p := range r.Profiles {
		bp.Profiles = append(bp.Profiles, profileLine(p, false))
	}
	if v := rep.Verification; v != nil {
		bp.Profiles = append(bp.Profiles, profileLine(v.Profile, true))
		bp.Notes = append(bp.Notes, verificationNote(*v, r.Units))
	}
	if err := set.add("profiles", "reach profile: thalweg, every computed water surface, critical stages and high-water marks", func(w io.Writer) (Result, error) {
		return BackwaterProfiles(w, bp)
	}); err != nil {
		return nil, nil, err
	}
	rc := backwaterComparison(in)
	caption := "step-backwater rating at " + r.Rating.Section + ", with the band spanned by the profiles from three starting stages"
	if len(in.Compare) > 0 {
		caption += ", beside the ratings compared"
	}
	if err := set.add("rating", caption, func(w io.Writer) (Result, error) {
		return CompareRatings(w, rc)
	}); err != nil {
		return nil, nil, err
	}
	return set.figs, set.warnings, nil
}

// profileLine lays out a computed profile for the profile figure.
func profileLine(p reach.SurfaceProfile, verified bool) ProfileLine {
	pl := ProfileLine{Discharge: p.Discharge, Verified: verified}
	for _, s := range p.Sections {
		pl.Points = append(pl.Points, ProfilePoint{Distance: s.Distance, WaterSurface: s.WaterSurface,
			EnergyGrade: s.EnergyGrade, Critical: s.Critical})
	}
	return pl
}

// backwaterComparison lays out the rating of a step-backwater report and
// the ratings to compare with it.
func backwaterComparison(in BackwaterFigures) RatingComparison {
	r := in.Report.Result
	rt := r.Rating
	rc := RatingComparison{Site: in.Site, Section: rt.Section, Units: r.Units, Size: in.Size,
		Subtitle: fmt.Sprintf("step-backwater rating from the downstream boundary (%s); %s units",
			r.Boundary.Words(r.Units), strings.ToUpper(r.Units.String())),
		BandLabel:   "spanned by the profiles from three starting stages",
		MarkedLabel: fmt.Sprintf("still depending on the boundary (spread over %g %s)", rt.Tolerance, r.Units.Length())}
	c := Curve{Label: "step-backwater rating at " + rt.Section}
	for i, rd := range rt.Rows {
		c.Points = append(c.Points, RatingPoint{Stage: rd.Stage, Discharge: rd.Discharge})
		if i < len(r.Profiles) && rt.Index < len(r.Profiles[i].Sections) {
			s := r.Profiles[i].Sections[rt.Index]
			lo := math.Min(rd.Stage, math.Min(s.SecondWaterSurface, s.HalfwayWaterSurface))
			hi := math.Max(rd.Stage, math.Max(s.SecondWaterSurface, s.HalfwayWaterSurface))
			rc.Band = append(rc.Band, StageBand{Discharge: rd.Discharge, Low: lo, High: hi})
		}
		if rd.Unsettled {
			rc.Marked = append(rc.Marked, RatingPoint{Stage: rd.Stage, Discharge: rd.Discharge})
		}
		if rd.Critical {
			rc.Critical = append(rc.Critical, RatingPoint{Stage: rd.Stage, Discharge: rd.Discharge})
		}
	}
	rc.Curves = append([]Curve{c}, in.Compare...)
	if len(in.Compare) == 0 {
		rc.What = "step-backwater rating"
	}
	return rc
}
