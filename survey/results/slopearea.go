package results

import (
	"fmt"
	"io"
	"math"
	"strings"

	"wetline/rating"
	"wetline/rating/reach"
)

type jsonSASection struct {
	ID              string    `json:"id"`
	Survey          string    `json:"survey,omitempty"`
	Distance        Float     `json:"distance"`
	WSLeft          Float     `json:"ws_left"`
	WSRight         Float     `json:"ws_right"`
	Quality         string    `json:"quality,omitempty"`
	WaterSurface    Float     `json:"water_surface"`
	MarksUsed       int       `json:"marks_used"`
	Bottom          Float     `json:"bottom"`
	Area            Float     `json:"area"`
	WettedPerimeter Float     `json:"wetted_perimeter"`
	TopWidth        Float     `json:"top_width"`
	HydraulicDepth  Float     `json:"hydraulic_depth"`
	Conveyance      Float     `json:"conveyance"`
	Alpha           Float     `json:"alpha"`
	Velocity        Float     `json:"velocity"`
	VelocityHead    Float     `json:"velocity_head"`
	EnergyGrade     Float     `json:"energy_grade"`
	Froude          Float     `json:"froude"`
	Subsections     []jsonSub `json:"subsections"`
	// SurveyNote says how the survey's stations were made (added after
	// the contract keys; absent for a survey in stations).
	SurveyNote string `json:"survey_note,omitempty"`
}

type jsonSubreach struct {
	From               string `json:"from"`
	To                 string `json:"to"`
	Length             Float  `json:"length"`
	Fall               Float  `json:"fall"`
	Discharge          Float  `json:"discharge"`
	Expanding          bool   `json:"expanding"`
	EddyK              Float  `json:"eddy_k"`
	FrictionLoss       Float  `json:"friction_loss"`
	VelocityHeadChange Float  `json:"velocity_head_change"`
	EddyLoss           Float  `json:"eddy_loss"`
	ConveyanceRatio    Float  `json:"conveyance_ratio"`
	Flow               string `json:"flow"`
}

type jsonCheck struct {
	Name     string `json:"name"`
	Value    Float  `json:"value"`
	Limit    Float  `json:"limit"`
	Relation string `json:"relation"`
	Pass     bool   `json:"pass"`
	Status   string `json:"status"`
	Source   string `json:"source"`
}

type jsonUncertainty struct {
	P05    Float  `json:"p05"`
	P50    Float  `json:"p50"`
	P95    Float  `json:"p95"`
	Mean   Float  `json:"mean"`
	SD     Float  `json:"sd"`
	Draws  int    `json:"draws"`
	Failed int    `json:"failed"`
	Seed   uint64 `json:"seed"`
	NCV    Float  `json:"n_cv"`
	MarkSD Float  `json:"mark_sd"`
	// NErrors is "by-region" when one n error per region was shared by
	// every section; absent for independent errors (the default).
	NErrors string  `json:"n_errors,omitempty"`
	WSSD    []Float `json:"water_surface_sd"`
	DQDN    Float   `json:"dq_dn"`
	DQDNm   Float   `json:"dq_dn_per_0_001_n"`
	DQDH    []Float `json:"dq_dh"`
}

// WriteSlopeAreaJSON writes a slope-area report as one JSON object:
// {"method","discharge","units","side","fall","length","slope",
// "subreach_min","subreach_max","subreach_spread","sections":[...],
// "subreaches":[...],"checks":[...],"uncertainty":{...} or null,
// "warnings":[...],"caution","site","note"}, note the caution's word on
// indirect estimates (rating.IndirectNote). Each section holds "subsections", its
// subsections at the peak discharge (from_station, to_station, region, n,
// area, wetted_perimeter, top_width, conveyance, discharge, mean_velocity,
// as in WriteRatingJSON). Each subreach ends with "flow", "expanding",
// "contracting" or "uniform" (reach.Subreach.Flow); a section whose
// stations were projected from coordinates ends with "survey_note", how.
// In "uncertainty", "dq_dn" is the change of
// discharge per unit change of every n together (discharge unit per 1 of
// n) and "dq_dn_per_0_001_n" the same per 0.001 of n, as the text report
// quotes it; "dq_dh" is per length unit of each water surface. Undefined
// values are null.
func WriteSlopeAreaJSON(w io.Writer, rep reach.Report) error {
	r := rep.Result
	out := struct {
		Method         string           `json:"method"`
		Discharge      Float            `json:"discharge"`
		Units          JSONUnits        `json:"units"`
		Side           string           `json:"side"`
		Fall           Float            `json:"fall"`
		Length         Float            `json:"length"`
		Slope          Float            `json:"slope,omitempty"`
		SubreachMin    Float            `json:"subreach_min"`
		SubreachMax    Float            `json:"subreach_max"`
		SubreachSpread Float            `json:"subreach_spread"`
		Sections       []jsonSASection  `json:"sections"`
		Subreaches     []jsonSubreach   `json:"subreaches"`
		Checks         []jsonCheck      `json:"checks"`
		Uncertainty    *jsonUncertainty `json:"uncertainty"`
		Warnings       []string         `json:"warnings"`
		Caution        string           `json:"caution"`
		Site           *jsonSite        `json:"site"`
		Note           string           `json:"note"`
	}{
		Method: r.Method, Discharge: Float(r.Discharge), Units: UnitNames(r.Units), Side: r.Side.String(),
		Fall: Float(r.Fall), Length: Float(r.Length), Slope: Float(r.Slope),
		SubreachMin: Float(r.SubreachMin), SubreachMax: Float(r.SubreachMax), SubreachSpread: Float(r.SubreachSpread),
		Sections: []jsonSASection{}, Subreaches: []jsonSubreach{}, Checks: []jsonCheck{},
		Warnings: rep.Warnings, Caution: rating.Caution, Site: siteJSON(rep.Provenance.Site),
		Note: rating.IndirectNote,
	}
	if out.Warnings == nil {
		out.Warnings = []string{}
	}
	for i, s := range r.Sections {
		js := saJSONSection(s)
		if i < len(rep.Sections) {
			js.Survey, js.Quality = rep.Sections[i].Survey, rep.Sections[i].Quality.String()
			js.SurveyNote = rep.Sections[i].SurveyNote
		}
		out.Sections = append(out.Sections, js)
	}
	for _, s := range r.Subreaches {
		out.Subreaches = append(out.Subreaches, jsonSubreach{From: s.From, To: s.To, Length: Float(s.Length),
			Fall: Float(s.Fall), Discharge: Float(s.Discharge), Expanding: s.Expanding, EddyK: Float(s.EddyK),
			FrictionLoss: Float(s.FrictionLoss), VelocityHeadChange: Float(s.VelocityHeadChange),
			EddyLoss: Float(s.EddyLoss), ConveyanceRatio: Float(s.ConveyanceRatio), Flow: s.Flow()})
	}
	for _, c := range r.Checks {
		out.Checks = append(out.Checks, jsonCheck{Name: c.Name, Value: Float(c.Value), Limit: Float(c.Limit),
			Relation: c.Relation, Pass: c.Pass, Status: c.Status(), Source: c.Source})
	}
	if u := rep.Uncertainty; u != nil {
		out.Uncertainty = saJSONUncertainty(u)
	}
	return writeJSON(w, out)
}

// saJSONSection is one section of the slope-area JSON, without its survey
// and quality (from the reach table).
func saJSONSection(s reach.SectionResult) jsonSASection {
	return jsonSASection{ID: s.ID, Distance: Float(s.Distance), WSLeft: Float(s.Left), WSRight: Float(s.Right),
		WaterSurface: Float(s.WaterSurface), MarksUsed: s.MarksUsed, Bottom: Float(s.Bottom),
		Area: Float(s.Area), WettedPerimeter: Float(s.WettedPerimeter), TopWidth: Float(s.TopWidth),
		HydraulicDepth: Float(s.HydraulicDepth), Conveyance: Float(s.Conveyance), Alpha: Float(s.Alpha),
		Velocity: Float(s.Velocity), VelocityHead: Float(s.VelocityHead), EnergyGrade: Float(s.EnergyGrade),
		Froude: Float(s.Froude), Subsections: jsonSubs(s.Subs)}
}

// saJSONUncertainty is the Monte Carlo block of the slope-area JSON.
func saJSONUncertainty(u *reach.Uncertainty) *jsonUncertainty {
	ju := &jsonUncertainty{P05: Float(u.P05), P50: Float(u.P50), P95: Float(u.P95), Mean: Float(u.Mean),
		SD: Float(u.SD), Draws: u.Draws, Failed: u.Failed, Seed: u.Seed, NCV: Float(u.NCV),
		MarkSD: Float(u.MarkSD), DQDN: Float(u.DQDN), DQDNm: Float(u.DQDNPerMilli), DQDH: []Float{}, WSSD: []Float{}}
	if u.NErrors == reach.NSharedByRegion {
		ju.NErrors = u.NErrors.String()
	}
	for _, v := range u.DQDH {
		ju.DQDH = append(ju.DQDH, Float(v))
	}
	for _, v := range u.WaterSurfaceSD {
		ju.WSSD = append(ju.WSSD, Float(v))
	}
	return ju
}

// WriteSlopeAreaText writes a slope-area report for a reviewer: the
// estimate and its band first, then the inputs, each section, the n,
// area and conveyance of every subsection of every section, each subreach,
// the checks with their sources, the uncertainty settings and
// sensitivities, the warnings and the caution. Lengths and discharges are
// in the report's units (rep.Result.Units), named in the heading and in
// the column headers. The only error is w's.
func WriteSlopeAreaText(w io.Writer, rep reach.Report) error {
	var t textReport
	saTextHeading(&t, rep)
	saTextInputs(&t, rep)
	saTextSections(&t, rep.Result)
	saTextSubsections(&t, rep.Result)
	saTextSubreaches(&t, rep.Result)
	saTextChecks(&t, rep.Result)
	if un := rep.Uncertainty; un != nil {
		saTextUncertainty(&t, rep.Result, un)
	}
	saTextFoot(&t, rep.Warnings)
	_, err := io.WriteString(w, t.String())
	return err
}

// saTextHeading writes the title, the program and units, the site, and
// the peak discharge with its band and how it was found.
func saTextHeading(t *textReport, rep reach.Report) {
	r := rep.Result
	u := r.Units
	L, Q := u.Length(), u.Discharge()
	title := "Slope-area flood peak"
	if r.Method == reach.MethodSlopeConveyance {
		title = "Single-section slope-conveyance flood peak (weaker method)"
	}
	if rep.Name != "" {
		title += ": " + rep.Name
	}
	t.line("%s", title)
	if rep.Provenance.Program != "" {
		t.line("%s, %s units (lengths %s, discharge %s)", rep.Provenance.Program, strings.ToUpper(u.String()), L, Q)
	} else {
		t.line("%s units (lengths %s, discharge %s)", strings.ToUpper(u.String()), L, Q)
	}
	t.b.WriteString(siteLine(rep.Provenance))
	t.line("")
	t.line("Peak discharge  %s %s", rating.PlainFigures(r.Discharge, 4), Q)
	switch un := rep.Uncertainty; {
	case un == nil:
	case un.Failed >= un.Draws:
		t.line("  90 %% band     none: no draw of %d had a solution", un.Draws)
	default:
		t.line("  90 %% band     %s to %s %s (5th to 95th percentile, median %s, %s)",
			rating.PlainFigures(un.P05, 4), rating.PlainFigures(un.P95, 4), Q, rating.PlainFigures(un.P50, 4), rating.Counted(un.Draws-un.Failed, "draw", "draws"))
	}
	switch r.Method {
	case reach.MethodSlopeArea:
		t.line("  method        slope-area, %s (Dalrymple & Benson 1967, USGS TWRI 3-A2)", saSubreachesSolved(len(r.Subreaches)))
		t.line("  subreaches    %s", saSubreachWords(r))
		t.line("  reach         length %s %s, fall %s %s, water surface from %s", fixed(r.Length, lengthDecimals(saDistances(r)...)), L, fixed(r.Fall, 3), L, saSurfaceWords(r))
	default:
		t.line("  method        Q = K·√S at one section with an assumed slope S = %g: no measured fall, no velocity-head change", r.Slope)
	}
}

// saSubreachWords says what the subreaches give each alone: the range of
// their discharges and its spread when every one solves, else which
// solved (with its discharge) and which have no real discharge alone.
func saSubreachWords(r reach.SlopeArea) string {
	Q := r.Units.Discharge()
	var solved, failed []string
	for _, sr := range r.Subreaches {
		if math.IsNaN(sr.Discharge) {
			failed = append(failed, sr.From+" to "+sr.To)
		} else {
			solved = append(solved, fmt.Sprintf("%s to %s %s %s", sr.From, sr.To, rating.PlainFigures(sr.Discharge, 4), Q))
		}
	}
	switch {
	case len(failed) == 0:
		return fmt.Sprintf("%s to %s %s alone (spread %s %% of the peak)", rating.PlainFigures(r.SubreachMin, 4), rating.PlainFigures(r.SubreachMax, 4), Q, fixed(100*r.SubreachSpread, 1))
	case len(solved) == 0:
		return fmt.Sprintf("none has a real discharge alone (%s): only the whole reach gives one", strings.Join(failed, ", "))
	}
	verb := "solve"
	if len(solved) == 1 {
		verb = "solves"
	}
	return fmt.Sprintf("%d of %d %s alone: %s; no real discharge alone: %s", len(solved), len(r.Subreaches), verb,
		strings.Join(solved, ", "), strings.Join(failed, ", "))
}

// saFailedSubreaches lists the subreaches with no real discharge alone
// ("XS-1 to XS-2, ...").
func saFailedSubreaches(r reach.SlopeArea) string {
	var failed []string
	for _, sr := range r.Subreaches {
		if math.IsNaN(sr.Discharge) {
			failed = append(failed, sr.From+" to "+sr.To)
		}
	}
	return strings.Join(failed, ", ")
}

// saTextInputs writes the reach table as read: each section's distance,
// marks, water surface, quality, survey and note.
func saTextInputs(t *textReport, rep reach.Report) {
	r := rep.Result
	t.line("")
	t.line("Inputs (reach table)")
	rows := [][]string{}
	dec := lengthDecimals(saDistances(r)...)
	for i, s := range r.Sections {
		row := []string{s.ID, fixed(s.Distance, dec), fixed(s.Left, 3), fixed(s.Right, 3), fixed(s.WaterSurface, 3), "", "", ""}
		if i < len(rep.Sections) {
			rr := rep.Sections[i]
			row[5], row[6], row[7] = saDash(rr.Quality.String()), rr.Survey, rr.Note
		}
		rows = append(rows, row)
	}
	t.table(fmt.Sprintf("section\tdistance %s\tws_left\tws_right\twater surface\tquality\tsurvey\tnote", r.Units.Length()), rows)
	surveyNotes(t, rep.Sections)
}

// surveyNotes writes, below a reach's inputs, how the survey of each
// section given in coordinates was made into stations (one line a
// section); nothing when every survey gives stations.
func surveyNotes(t *textReport, secs []reach.Section) {
	for _, s := range secs {
		if s.SurveyNote != "" {
			t.line("  survey of %s: %s", s.ID, s.SurveyNote)
		}
	}
}

// saTextSections writes every section's hydraulics at the peak discharge.
func saTextSections(t *textReport, r reach.SlopeArea) {
	u := r.Units
	t.line("")
	t.line("Sections at the peak discharge")
	var rows [][]string
	for _, s := range r.Sections {
		rows = append(rows, []string{s.ID, fixed(s.Bottom, 3), fixed(s.WaterSurface-s.Bottom, 2), fixed(s.Area, 2), fixed(s.TopWidth, 2),
			fixed(s.Conveyance, 0), fixed(s.Alpha, 3), fixed(s.Velocity, 2), fixed(s.VelocityHead, 3), fixed(s.EnergyGrade, 3), fixed(s.Froude, 2)})
	}
	t.table(fmt.Sprintf("section\tthalweg\tmax depth\tarea %s\ttop width\tconveyance %s\talpha\tvelocity %s\tvel. head\tenergy grade\tfroude",
		u.Area(), u.Conveyance(), u.Velocity()), rows)
}

// saTextSubsections writes the n, area, conveyance, discharge and
// velocity of every subsection of every section at the peak discharge.
func saTextSubsections(t *textReport, r reach.SlopeArea) {
	u := r.Units
	t.line("")
	t.line("Subsections at the peak discharge (Manning's n as surveyed)")
	var rows [][]string
	for _, s := range r.Sections {
		for k, sub := range s.Subs {
			rows = append(rows, []string{s.ID, fmt.Sprint(k + 1), sub.Region.String(), fixed(sub.From, 1) + " to " + fixed(sub.To, 1),
				fixed(sub.N, 3), fixed(sub.Area, 2), fixed(sub.Conveyance, 0), rating.PlainFigures(sub.Discharge, 4), fixed(sub.Velocity, 2)})
		}
	}
	t.table(fmt.Sprintf("section\tsubsection\tregion\tstations %s\tn\tarea %s\tconveyance %s\tdischarge %s\tvelocity %s",
		u.Length(), u.Area(), u.Conveyance(), u.Discharge(), u.Velocity()), rows)
}

// saTextSubreaches writes each subreach's length, fall, discharge alone
// and losses at the peak discharge; nothing for a single section.
func saTextSubreaches(t *textReport, r reach.SlopeArea) {
	if len(r.Subreaches) == 0 {
		return
	}
	t.line("")
	t.line("Subreaches (losses at the peak discharge)")
	var rows [][]string
	dec := lengthDecimals(saDistances(r)...)
	for _, s := range r.Subreaches {
		rows = append(rows, []string{s.From + " to " + s.To, fixed(s.Length, dec), fixed(s.Fall, 3), rating.PlainFigures(s.Discharge, 4), s.Flow(),
			fixed(s.EddyK, 1), fixed(s.FrictionLoss, 3), fixed(s.VelocityHeadChange, 3), fixed(s.EddyLoss, 3), fixed(s.ConveyanceRatio, 2)})
	}
	t.table(fmt.Sprintf("subreach\tlength\tfall\tQ alone %s\tflow\tk\tfriction loss\tvel. head change\teddy loss\tK down/up", r.Units.Discharge()), rows)
}

// saTextChecks writes the quality checks with how many pass, each with
// its value against its limit and its source.
func saTextChecks(t *textReport, r reach.SlopeArea) {
	t.line("")
	pass := 0
	for _, c := range r.Checks {
		if c.Pass {
			pass++
		}
	}
	t.line("Quality checks (%d of %d %s)", pass, len(r.Checks), rating.Agree(pass, "passes", "pass"))
	var rows [][]string
	for _, c := range r.Checks {
		rows = append(rows, []string{c.Status(), c.Name, rating.PlainFigures(c.Value, 4) + " " + c.Relation + " " + rating.PlainFigures(c.Limit, 4), c.Source})
	}
	t.table("status\tcheck\tvalue vs limit\tsource", rows)
}

// saTextUncertainty writes the Monte Carlo settings, the discharge's
// percentiles and the sensitivities dQ/dn and dQ/dh.
func saTextUncertainty(t *textReport, r reach.SlopeArea, un *reach.Uncertainty) {
	L, Q := r.Units.Length(), r.Units.Discharge()
	t.line("")
	t.line("Uncertainty (Monte Carlo, seed %d)", un.Seed)
	if un.NErrors == reach.NSharedByRegion {
		t.line("  Manning's n    log-normal, median the surveyed n, coefficient of variation %g; one error per region "+
			"(left overbank, channel, right overbank) shared by every section", un.NCV)
	} else {
		t.line("  Manning's n    log-normal per subsection, median the surveyed n, coefficient of variation %g", un.NCV)
	}
	if un.MarkSD > 0 {
		t.line("  marks          normal about each mark, standard deviation %g %s per mark unless its quality says otherwise", un.MarkSD, L)
	} else {
		t.line("  marks          not varied: every mark held at its elevation, its quality rating set aside")
	}
	sds := make([]string, 0, len(un.WaterSurfaceSD))
	for i, v := range un.WaterSurfaceSD {
		if i < len(r.Sections) {
			sds = append(sds, r.Sections[i].ID+" "+fixed(v, 3))
		}
	}
	t.line("  water surfaces standard deviation %s %s (mean of the marks used)", strings.Join(sds, ", "), L)
	t.line("  discharge      p05 %s  p50 %s  p95 %s  mean %s  sd %s %s", rating.PlainFigures(un.P05, 4), rating.PlainFigures(un.P50, 4), rating.PlainFigures(un.P95, 4), rating.PlainFigures(un.Mean, 4), rating.PlainFigures(un.SD, 4), Q)
	t.line("  draws          %d, %d without a solution", un.Draws, un.Failed)
	t.line("  dQ/dn          %s %s per 0.001 of every n", rating.PlainFigures(un.DQDNPerMilli, 4), Q)
	parts := make([]string, len(un.DQDH))
	for i, v := range un.DQDH {
		id := ""
		if i < len(r.Sections) {
			id = r.Sections[i].ID
		}
		parts[i] = fmt.Sprintf("%s %s", id, saSigned(v*0.01))
	}
	t.line("  dQ/dh          %s %s per 0.01 %s rise of one water surface", strings.Join(parts, ", "), Q, L)
}

// saTextFoot writes the warnings, the note on indirect estimates and the
// caution.
func saTextFoot(t *textReport, warnings []string) {
	if len(warnings) > 0 {
		t.line("")
		t.line("Warnings")
		for _, s := range warnings {
			t.line("  - %s", s)
		}
	}
	t.line("")
	t.line("%s", rating.IndirectNote)
	t.line("Caution: %s", rating.Caution)
}

func saSideWords(s reach.Side) string {
	switch s {
	case reach.LeftSide:
		return "the left"
	case reach.RightSide:
		return "the right"
	}
	return "the mean of the left and right"
}

// saSurfaceWords says which marks set the water surfaces, as they were
// used: the side asked for (r.Side) where every section has it, else that
// side and, by name, the sections where the other mark stood in (a
// section missing a mark uses the one it has; reach.SlopeAreaOptions.Side).
func saSurfaceWords(r reach.SlopeArea) string {
	var left, right, mean []string // section ids by the marks used
	for _, s := range r.Sections {
		hasL, hasR := !math.IsNaN(s.Left) && !math.IsInf(s.Left, 0), !math.IsNaN(s.Right) && !math.IsInf(s.Right, 0)
		switch {
		case hasL && hasR && r.Side == reach.MeanSide:
			mean = append(mean, s.ID)
		case hasL && (r.Side == reach.LeftSide || !hasR):
			left = append(left, s.ID)
		case hasR:
			right = append(right, s.ID)
		}
	}
	chosen, others := mean, []struct {
		ids        []string
		word, lack string
	}{{left, "left", "right"}, {right, "right", "left"}}
	switch r.Side {
	case reach.LeftSide:
		chosen, others = left, others[1:]
	case reach.RightSide:
		chosen, others = right, others[:1]
	}
	out := saSideWords(r.Side) + " marks"
	var stand []string
	for _, o := range others {
		if len(o.ids) == 0 {
			continue
		}
		if len(o.ids) == len(r.Sections) {
			return fmt.Sprintf("the %s marks (no section has a %s mark)", o.word, o.lack)
		}
		stand = append(stand, fmt.Sprintf("the %s mark alone at %s (no %s mark)", o.word, strings.Join(o.ids, ", "), o.lack))
	}
	if len(stand) > 0 {
		if len(chosen) == 0 {
			return strings.Join(stand, "; ")
		}
		out += "; " + strings.Join(stand, "; ")
	}
	return out
}

// saDistances returns the distances of the reach's sections, from which
// its lengths come.
func saDistances(r reach.SlopeArea) []float64 {
	out := make([]float64, len(r.Sections))
	for i, s := range r.Sections {
		out[i] = s.Distance
	}
	return out
}

func saDash(s string) string {
	if s == "" {
		return "-"
	}
	return s
}

func saSigned(v float64) string {
	if math.IsNaN(v) {
		return "-"
	}
	return fmt.Sprintf("%+.4g", v)
}
