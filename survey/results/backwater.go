package results

import (
	"fmt"
	"io"
	"math"
	"strings"

	"wetline/rating"
	"wetline/rating/reach"
)

// BackwaterNote is stated beside the caution by every step-backwater
// report: what a computed rating rests on.
const BackwaterNote = "A step-backwater rating rests on the surveyed sections, the judged n values and the downstream boundary: " +
	"verify the reach against high-water marks or gaugings before the rating is used."

type jsonBoundary struct {
	Kind        string       `json:"kind"`
	Description string       `json:"description"`
	Slope       *Float       `json:"slope,omitempty"`
	Stage       *Float       `json:"stage,omitempty"`
	Source      string       `json:"source,omitempty"`
	Points      []jsonStageQ `json:"points,omitempty"`
	Second      string       `json:"second_start"`
}

type jsonStageQ struct {
	Stage     Float `json:"stage"`
	Discharge Float `json:"discharge"`
}

type jsonProfileSection struct {
	ID                 string `json:"id"`
	Distance           Float  `json:"distance"`
	WaterSurface       Float  `json:"water_surface"`
	EnergyGrade        Float  `json:"energy_grade"`
	VelocityHead       Float  `json:"velocity_head"`
	Froude             Float  `json:"froude"`
	Critical           bool   `json:"critical"`
	Spread             Float  `json:"spread"`
	SecondWaterSurface Float  `json:"second_water_surface"`
	Bottom             Float  `json:"bottom"`
	Area               Float  `json:"area"`
	TopWidth           Float  `json:"top_width"`
	Conveyance         Float  `json:"conveyance"`
	Alpha              Float  `json:"alpha"`
	Length             Float  `json:"length"`
	FrictionLoss       Float  `json:"friction_loss"`
	EddyLoss           Float  `json:"eddy_loss"`
	Expanding          bool   `json:"expanding"`
	Jump               bool   `json:"jump"`
	// HalfwayWaterSurface is the stage of the profile started half-way
	// between the first and second starts (added after the contract keys).
	HalfwayWaterSurface Float `json:"halfway_water_surface"`
}

// jsonSurveyNote says how the survey of a section given in coordinates
// was made into stations (reach.Section.SurveyNote).
type jsonSurveyNote struct {
	Section string `json:"section"`
	Note    string `json:"note"`
}

type jsonProfile struct {
	Discharge      Float                `json:"discharge"`
	Sections       []jsonProfileSection `json:"sections"`
	Start          Float                `json:"start"`
	StartCritical  bool                 `json:"start_critical"`
	SecondStart    Float                `json:"second_start"`
	SecondCritical bool                 `json:"second_critical"`
	Warnings       []string             `json:"warnings"`
	HalfwayStart   Float                `json:"halfway_start"`
}

type jsonRead struct {
	Discharge Float `json:"discharge"`
	Stage     Float `json:"stage"`
	Spread    Float `json:"spread"`
	Critical  bool  `json:"critical"`
	Unsettled bool  `json:"unsettled"`
}

type jsonBWRating struct {
	Section    string     `json:"section"`
	Rows       []jsonRead `json:"rows"`
	Tolerance  Float      `json:"spread_tolerance"`
	Hydraulics []jsonRow  `json:"hydraulics"`
}

type jsonMarkDeparture struct {
	ID             string `json:"id"`
	Distance       Float  `json:"distance"`
	WSLeft         Float  `json:"ws_left"`
	WSRight        Float  `json:"ws_right"`
	Mark           Float  `json:"mark"`
	WaterSurface   Float  `json:"water_surface"`
	Departure      Float  `json:"departure"`
	LeftDeparture  Float  `json:"left_departure"`
	RightDeparture Float  `json:"right_departure"`
	Band           Float  `json:"band"`
	Outside        bool   `json:"outside"`
}

type jsonVerification struct {
	Discharge     Float               `json:"discharge"`
	Marks         []jsonMarkDeparture `json:"marks"`
	MeanDeparture Float               `json:"mean_departure"`
	MaxDeparture  Float               `json:"max_departure"`
	Profile       jsonProfile         `json:"profile"`
}

// WriteBackwaterJSON writes a step-backwater report as one JSON object.
// The leading keys are a contract with scripts:
//
//	{"boundary": {...},
//	 "profiles": [{"discharge", "sections": [{"id", "distance",
//	   "water_surface", "energy_grade", "velocity_head", "froude",
//	   "critical", "spread", ...}], ...}],
//	 "rating": {"section", "rows": [{"discharge", "stage", "spread", ...}], ...},
//	 "warnings", "caution", ...}
//
// Keys after these are added, never between them: "units", "reach",
// "program", "expansion", "contraction" (the eddy-loss coefficients),
// "verification" (null unless asked for), "site", "note" (BackwaterNote,
// stated beside the caution as in the text report) and, where a section's
// survey was given in coordinates, "survey_notes" ([{"section", "note"}]:
// how its stations were made), and last "input_notes" when the inputs
// have notes (a boundary rating table naming no unit). The rating's
// "hydraulics" holds
// the section's full hydraulics at every computed stage in the row
// objects of WriteRatingJSON. Spread is the larger difference of the
// profiles from the second and half-way starts from the first (length
// unit). Undefined values are null.
func WriteBackwaterJSON(w io.Writer, rep reach.BackwaterReport) error {
	r := rep.Result
	out := struct {
		Boundary     jsonBoundary      `json:"boundary"`
		Profiles     []jsonProfile     `json:"profiles"`
		Rating       jsonBWRating      `json:"rating"`
		Warnings     []string          `json:"warnings"`
		Caution      string            `json:"caution"`
		Units        JSONUnits         `json:"units"`
		Reach        string            `json:"reach"`
		Program      string            `json:"program"`
		Expansion    Float             `json:"expansion"`
		Contraction  Float             `json:"contraction"`
		Verification *jsonVerification `json:"verification"`
		Site         *jsonSite         `json:"site"`
		Note         string            `json:"note"`
		SurveyNotes  []jsonSurveyNote  `json:"survey_notes,omitempty"`
		InputNotes   []string          `json:"input_notes,omitempty"`
	}{
		Boundary: bwJSONBoundary(rep), Profiles: make([]jsonProfile, len(r.Profiles)),
		Rating: jsonBWRating{Section: r.Rating.Section, Rows: make([]jsonRead, len(r.Rating.Rows)),
			Tolerance: Float(r.Rating.Tolerance), Hydraulics: jsonRows(rep.Table)},
		Warnings: nonNil(rep.Warnings), Caution: rating.Caution, Units: UnitNames(r.Units),
		Reach: rep.Name, Program: programName(rep.Provenance),
		Expansion: Float(r.Expansion), Contraction: Float(r.Contraction), Site: siteJSON(rep.Provenance.Site),
		Note: BackwaterNote, InputNotes: rep.Provenance.Notes,
	}
	for i, p := range r.Profiles {
		out.Profiles[i] = bwJSONProfile(p)
	}
	for i, rd := range r.Rating.Rows {
		out.Rating.Rows[i] = jsonRead{Discharge: Float(rd.Discharge), Stage: Float(rd.Stage), Spread: Float(rd.Spread),
			Critical: rd.Critical, Unsettled: rd.Unsettled}
	}
	if v := rep.Verification; v != nil {
		jv := &jsonVerification{Discharge: Float(v.Discharge), Marks: []jsonMarkDeparture{},
			MeanDeparture: Float(v.MeanDeparture), MaxDeparture: Float(v.MaxDeparture), Profile: bwJSONProfile(v.Profile)}
		for _, m := range v.Marks {
			jv.Marks = append(jv.Marks, jsonMarkDeparture{ID: m.ID, Distance: Float(m.Distance), WSLeft: Float(m.Left),
				WSRight: Float(m.Right), Mark: Float(m.Mark), WaterSurface: Float(m.WaterSurface), Departure: Float(m.Departure),
				LeftDeparture: Float(m.LeftDeparture), RightDeparture: Float(m.RightDeparture), Band: Float(m.Band), Outside: m.Outside})
		}
		out.Verification = jv
	}
	for _, sec := range rep.Sections {
		if sec.SurveyNote != "" {
			out.SurveyNotes = append(out.SurveyNotes, jsonSurveyNote{Section: sec.ID, Note: sec.SurveyNote})
		}
	}
	return writeJSON(w, out)
}

func bwJSONBoundary(rep reach.BackwaterReport) jsonBoundary {
	b := rep.Result.Boundary
	jb := jsonBoundary{Kind: b.Kind.String(), Description: BackwaterBoundaryWords(rep), Second: rep.Result.SecondBoundary}
	switch b.Kind {
	case reach.NormalDepth:
		v := Float(b.Slope)
		jb.Slope = &v
	case reach.KnownStage:
		v := Float(b.Stage)
		jb.Stage = &v
	case reach.StageRating:
		jb.Source = rep.BoundarySource
		for _, p := range b.Rating {
			jb.Points = append(jb.Points, jsonStageQ{Stage: Float(p.Stage), Discharge: Float(p.Discharge)})
		}
	}
	return jb
}

func bwJSONProfile(p reach.SurfaceProfile) jsonProfile {
	jp := jsonProfile{Discharge: Float(p.Discharge), Sections: make([]jsonProfileSection, len(p.Sections)),
		Start: Float(p.Start), StartCritical: p.StartCritical, SecondStart: Float(p.SecondStart),
		SecondCritical: p.SecondCritical, Warnings: nonNil(p.Warnings), HalfwayStart: Float(p.HalfwayStart)}
	for j, s := range p.Sections {
		jp.Sections[j] = jsonProfileSection{ID: s.ID, Distance: Float(s.Distance), WaterSurface: Float(s.WaterSurface),
			EnergyGrade: Float(s.EnergyGrade), VelocityHead: Float(s.VelocityHead), Froude: Float(s.Froude),
			Critical: s.Critical, Spread: Float(s.Spread), SecondWaterSurface: Float(s.SecondWaterSurface),
			Bottom: Float(s.Bottom), Area: Float(s.Area), TopWidth: Float(s.TopWidth), Conveyance: Float(s.Conveyance),
			Alpha: Float(s.Alpha), Length: Float(s.Length), FrictionLoss: Float(s.FrictionLoss), EddyLoss: Float(s.EddyLoss),
			Expanding: s.Expanding, Jump: s.Jump, HalfwayWaterSurface: Float(s.HalfwayWaterSurface)}
	}
	return jp
}

// WriteBackwaterCSV writes the rating of a step-backwater report at its
// rating section as a rating table in the layout of WriteRatingCSV (the
// columns of RatingColumns, one discharge per subsection,
// ExtraRatingColumns and flags), so that it reads back wherever a rating
// table of rate does. Each row is the section's hydraulics at a computed
// stage, with the friction slope there (Q/K)²; flags mark critical_stage
// and unsettled rows (reach.FlagCriticalStage, reach.FlagUnsettled).
func WriteBackwaterCSV(w io.Writer, rep reach.BackwaterReport) error {
	return WriteRatingCSV(w, BackwaterRatingReport(rep))
}

// BackwaterRatingReport returns the rating of a step-backwater report as
// a rating report (its table, provenance and warnings), for the writers
// of rating tables.
func BackwaterRatingReport(rep reach.BackwaterReport) rating.RatingReport {
	return rating.RatingReport{Provenance: rep.Provenance, Table: rep.Table, Warnings: rep.Warnings}
}

// WriteBackwaterText writes a step-backwater report for a reviewer: the
// method and boundary, the rating at the rating section with the spread of
// each read, every profile section by section, the section's full
// hydraulics at each rating stage, the verification against the marks
// when asked, the warnings and the caution.
func WriteBackwaterText(w io.Writer, rep reach.BackwaterReport) error {
	r := rep.Result
	u := r.Units
	L, Q := u.Length(), u.Discharge()
	var t textReport
	line, table := t.line, t.table
	title := "Step-backwater profiles and rating"
	if rep.Name != "" {
		title += ": " + rep.Name
	}
	line("%s", title)
	line("%s, %s units (lengths %s, discharge %s)", programName(rep.Provenance), strings.ToUpper(u.String()), L, Q)
	t.b.WriteString(siteLine(rep.Provenance))
	line("")
	bwTextMethod(line, rep)

	line("")
	line("Rating at %s (%s; spread: the larger difference of the profiles from the second and half-way starts)", r.Rating.Section, rating.Counted(len(r.Rating.Rows), "discharge", "discharges"))
	var rows [][]string
	for _, rd := range r.Rating.Rows {
		rows = append(rows, []string{sig(rd.Discharge, 4), fixed(rd.Stage, 3), fixed(rd.Spread, 3), bwFlags(rd.Critical, rd.Unsettled, false)})
	}
	table(fmt.Sprintf("discharge %s\tstage %s\tspread %s\tflags", Q, L, L), rows)

	line("")
	line("Profiles (sections upstream first; losses over the subreach to the next section downstream)")
	for _, p := range r.Profiles {
		line("")
		bwTextProfile(line, table, p, u)
	}

	line("")
	line("Hydraulics at %s at each rating stage (each row at its own friction slope (Q/K)²)", r.Rating.Section)
	writeMainColumnsText(&t.b, rep.Table)

	if v := rep.Verification; v != nil {
		line("")
		bwTextVerification(line, table, v, u)
	}
	if len(rep.Warnings) > 0 {
		line("")
		line("Warnings")
		for _, s := range rep.Warnings {
			line("  - %s", s)
		}
	}
	line("")
	line("%s", BackwaterNote)
	line("Caution: %s", rating.Caution)
	_, err := io.WriteString(w, t.String())
	return err
}

// BackwaterBoundaryWords describes the downstream boundary of a report
// with its units (reach.Boundary.Words), and where a boundary rating was
// read.
func BackwaterBoundaryWords(rep reach.BackwaterReport) string {
	s := rep.Result.Boundary.Words(rep.Result.Units)
	if rep.BoundarySource != "" {
		s += ", read from " + rep.BoundarySource
	}
	return s
}

// bwTextMethod writes the method, boundary and settings lines.
func bwTextMethod(line func(string, ...any), rep reach.BackwaterReport) {
	r := rep.Result
	u := r.Units
	n := len(r.Profiles)
	last := "the last section"
	if len(rep.Sections) > 0 {
		last = rep.Sections[len(rep.Sections)-1].ID
	}
	line("  method        standard step method, energy equation between adjacent sections (Davidian 1984, USGS TWRI 3-A15; Chow 1959, ch. 10)")
	line("  friction      Q²·L/(Ku·Kd), the geometric mean of the two conveyances; L weighted by conveyance where flow lengths are given")
	line("  eddy loss     %g × the fall of velocity head (expanding), %g × its rise (contracting)", r.Expansion, r.Contraction)
	line("  boundary      %s, at %s", BackwaterBoundaryWords(rep), last)
	line("  second start  %s", r.SecondBoundary)
	line("  third start   half-way between the two (nearer the first where half-way is supercritical)")
	line("  sections      %d, rating read at %s; spread tolerance %g %s", len(rep.Sections), r.Rating.Section, r.Rating.Tolerance, u.Length())
	for _, s := range rep.Sections {
		if s.SurveyNote != "" {
			line("  %-13s %s", "survey "+s.ID, s.SurveyNote)
		}
	}
	if n > 0 {
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, p := range r.Profiles {
			lo, hi = math.Min(lo, p.Discharge), math.Max(hi, p.Discharge)
		}
		line("  discharges    %d, from %s to %s %s", n, sig(lo, 4), sig(hi, 4), u.Discharge())
	}
}

// bwTextProfile writes one profile as a table.
func bwTextProfile(line func(string, ...any), table func(string, [][]string), p reach.SurfaceProfile, u rating.Units) {
	L := u.Length()
	start := fixed(p.Start, 3) + " " + L
	if p.StartCritical {
		start += " (critical depth)"
	}
	second := fixed(p.SecondStart, 3) + " " + L
	if p.SecondCritical {
		second += " (critical depth)"
	}
	line("  Q = %s %s: start %s, second start %s, half-way start %s %s", sig(p.Discharge, 4), u.Discharge(), start, second, fixed(p.HalfwayStart, 3), L)
	var rows [][]string
	for j, s := range p.Sections {
		length, hf, he := fixed(s.Length, 1), fixed(s.FrictionLoss, 3), fixed(s.EddyLoss, 3)
		if j == len(p.Sections)-1 {
			length, hf, he = "-", "-", "-"
		}
		rows = append(rows, []string{s.ID, fixed(s.Distance, 1), fixed(s.Bottom, 3), fixed(s.WaterSurface, 3), fixed(s.EnergyGrade, 3),
			fixed(s.VelocityHead, 3), fixed(s.Froude, 2), fixed(s.Spread, 3), length, hf, he, bwFlags(s.Critical, false, s.Jump)})
	}
	table("section\tdistance\tthalweg\twater surface\tenergy grade\tvel. head\tfroude\tspread\tlength\tfriction loss\teddy loss\tflags", rows)
	for _, w := range p.Warnings {
		line("    note: %s", w)
	}
}

// bwTextVerification writes the departures of a verified profile from the
// marks.
func bwTextVerification(line func(string, ...any), table func(string, [][]string), v *reach.Verification, u rating.Units) {
	L := u.Length()
	line("Verification: the profile of %s %s against the high-water marks (departure = computed − mark)", sig(v.Discharge, 4), u.Discharge())
	var rows [][]string
	for _, m := range v.Marks {
		band, out := "-", ""
		if !math.IsNaN(m.Band) {
			band = "±" + fixed(m.Band, 3)
		}
		if m.Outside {
			out = "outside"
		}
		rows = append(rows, []string{m.ID, fixed(m.Distance, 1), fixed(m.Left, 3), fixed(m.Right, 3), fixed(m.WaterSurface, 3),
			saSigned3(m.Departure), saSigned3(m.LeftDeparture), saSigned3(m.RightDeparture), band, out})
	}
	table(fmt.Sprintf("section\tdistance\tws_left\tws_right\tcomputed %s\tdeparture\tfrom left\tfrom right\tquality band\t", L), rows)
	line("  mean departure %s %s, largest %s %s", saSigned3(v.MeanDeparture), L, saSigned3(v.MaxDeparture), L)
}

// bwFlags words a read's or a section's flags.
func bwFlags(critical, unsettled, jump bool) string {
	var f []string
	if critical {
		f = append(f, "critical")
	}
	if unsettled {
		f = append(f, "unsettled")
	}
	if jump {
		f = append(f, "jump")
	}
	if len(f) == 0 {
		return "-"
	}
	return strings.Join(f, " ")
}

// saSigned3 formats a departure with its sign and three decimals, "-"
// when undefined.
func saSigned3(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "-"
	}
	return fmt.Sprintf("%+.3f", v)
}

// jsonRows returns the rows of a rating table as in WriteRatingJSON.
func jsonRows(t rating.Table) []jsonRow {
	rows := make([]jsonRow, len(t.Rows))
	for i, r := range t.Rows {
		rows[i] = ratingJSONRow(r)
	}
	return rows
}

// jsonSubs returns subsection rows as in WriteRatingJSON.
func jsonSubs(subs []rating.SubRow) []jsonSub {
	out := make([]jsonSub, len(subs))
	for j, s := range subs {
		out[j] = jsonSub{
			FromStation: Float(s.From), ToStation: Float(s.To), Region: s.Region.String(), N: Float(s.N),
			Area: Float(s.Area), WettedPerimeter: Float(s.WettedPerimeter), TopWidth: Float(s.TopWidth),
			Conveyance: Float(s.Conveyance), Discharge: Float(s.Discharge), MeanVelocity: Float(s.Velocity),
		}
	}
	return out
}
