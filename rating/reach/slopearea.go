package reach

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"wetline/rating"
	"wetline/subdivide"
)

// Eddy-loss coefficients of the slope-area method (Dalrymple & Benson,
// 1967): none where the flow contracts, half the drop in velocity head
// where it expands.
const (
	ContractingEddyK = 0.0
	ExpandingEddyK   = 0.5
)

// Quality criteria for a slope-area reach. Each is stated beside the check
// that uses it; values recalled from the published guidance are marked as
// such.
const (
	// MinReachDepths is the least reach length, in mean depths of flow:
	// L ≥ 75·d (common practice, attributed to Dalrymple & Benson, 1967;
	// confirmed only secondhand). Each subreach of a longer reach is held
	// to its equal share (saSubreachLengthChecks).
	MinReachDepths = 75.0
	// MinFallSI and MinFallUS are the least fall between each pair of
	// adjacent sections, 0.15 m or 0.5 ft, unless the velocity head is
	// larger (Dalrymple & Benson, 1967, as quoted by Jarrett, 1985, USGS
	// WRI 85-4004, p. 7).
	MinFallSI = 0.15
	MinFallUS = 0.5
	// MinSections is the number of sections recommended for a slope-area
	// reach; a reach of two is warned (Dalrymple & Benson, 1967, as read
	// in secondary sources).
	MinSections = 3
	// MaxConveyanceRatio bounds the ratio of the larger to the smaller
	// conveyance of adjacent sections, 1/0.7 ≈ 1.429: Kd/Ku between 0.7
	// and 1/0.7, this project's symmetric reading of the end-section
	// conveyance-ratio guidance of Dalrymple & Benson (1967; from
	// memory), applied to each subreach.
	MaxConveyanceRatio = 1 / 0.7
	// MaxFroude is the Froude number at or above which a section is
	// flagged: the energy equation between sections assumes gradually
	// varied subcritical flow (Chow, 1959, section 10-1), and a high
	// computed Froude number in a natural channel often means n was
	// taken too low (Jarrett, 1984, Hydraulics of high-gradient streams,
	// J. Hydraulic Engineering 110(11); from memory).
	MaxFroude = 1.0
	// MarkSpreadSI and MarkSpreadUS are the default tolerance between the
	// left and right high-water marks of a section, 0.15 m or 0.5 ft
	// (project default, common practice).
	MarkSpreadSI = 0.15
	MarkSpreadUS = 0.5
	// SubreachSpreadWarn is the relative spread of the subreach
	// discharges, (max − min)/Q, above which a warning is given
	// (common practice).
	SubreachSpreadWarn = 0.20
)

// Side selects which high-water marks set a section's water surface.
// The zero value takes the mean of the marks present.
type Side int

// Sides.
const (
	MeanSide  Side = iota // mean of the left and right marks present
	LeftSide              // the left mark (the right one when the left is missing)
	RightSide             // the right mark (the left one when the right is missing)
)

func (s Side) String() string {
	switch s {
	case LeftSide:
		return "left"
	case RightSide:
		return "right"
	}
	return "mean"
}

// ErrSide is the cause of a side that is not mean, left or right.
var ErrSide = errors.New("the side of the marks must be mean, left or right")

// ParseSide reads "mean", "left" or "right" (any case; "" is mean);
// another word is an error wrapping ErrSide.
func ParseSide(s string) (Side, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "", "mean", "both":
		return MeanSide, nil
	case "left":
		return LeftSide, nil
	case "right":
		return RightSide, nil
	}
	return MeanSide, fmt.Errorf("%w, not %q", ErrSide, s)
}

// Section is one surveyed section of a slope-area reach.
type Section struct {
	// ID names the section in reports.
	ID string
	// Geometry is the section's ground, n and banks.
	Geometry subdivide.Geometry
	// Distance is the position along the channel (length unit), increasing
	// downstream.
	Distance float64
	// Left and Right are the high-water-mark elevations on each bank
	// (length unit); NaN where there is no mark.
	Left, Right float64
	// MarkSD is the standard deviation of one mark's elevation (length
	// unit) used by MonteCarlo; zero means MonteCarloOptions.MarkSD.
	MarkSD float64
	// Survey, Quality and Note describe the section's inputs for reports:
	// where its survey came from, the marks' quality rating, a note.
	Survey  string
	Quality rating.Quality
	Note    string
	// SurveyNote says how the survey's stations were made when that is
	// worth a reviewer's reading (projected from eastings and northings,
	// onto which line, how far the farthest point lies off it): a fact of
	// the inputs, which reports give with the section's inputs, not among
	// the warnings. Empty for a survey given in stations.
	SurveyNote string
	// FlowLengths are the lengths of the flow paths to the next section
	// downstream (length unit) in each region, for the step-backwater
	// method, which weights them by conveyance (WeightedLength). All zero
	// means the distance to the next section for every path; a zero entry
	// beside others means that distance for its path. Unused at the last
	// section and by the slope-area method.
	FlowLengths subdivide.PerRegion
}

// SlopeAreaOptions configure a slope-area computation. The zero value is
// the default of every field.
type SlopeAreaOptions struct {
	// Units is the unit system of every input and result (default SI).
	Units rating.Units
	// Geometry controls pockets and end extension, as for a rating.
	Geometry subdivide.Options
	// Side picks the marks that set each water surface (default the mean).
	Side Side
	// MarkSpread is the tolerance between a section's two marks (length
	// unit); zero means MarkSpreadSI or MarkSpreadUS.
	MarkSpread float64
	// MinFall is the least acceptable fall between each pair of adjacent
	// sections (length unit), unless the velocity head is larger; zero
	// means MinFallSI or MinFallUS.
	MinFall float64
}

func (o SlopeAreaOptions) markSpread() float64 {
	return givenOr(o.MarkSpread, o.Units, MarkSpreadSI, MarkSpreadUS)
}

func (o SlopeAreaOptions) minFall() float64 {
	return givenOr(o.MinFall, o.Units, MinFallSI, MinFallUS)
}

// givenOr returns v, a tolerance given in the options, when it is
// positive, and otherwise the default for the unit system u: us for
// rating.US, si for any other.
func givenOr(v float64, u rating.Units, si, us float64) float64 {
	switch {
	case v > 0:
		return v
	case u == rating.US:
		return us
	}
	return si
}

// Methods reported in SlopeArea.Method.
const (
	MethodSlopeArea       = "slope-area"
	MethodSlopeConveyance = "slope-conveyance"
)

// SlopeArea is the result of a slope-area (or single-section
// slope-conveyance) computation: everything a report, a workbook or a plot
// needs. Lengths, areas and discharges are in Units.
type SlopeArea struct {
	// Method is MethodSlopeArea or MethodSlopeConveyance.
	Method string
	// Units is the unit system of every value.
	Units rating.Units
	// Side is how each water surface was taken from its marks.
	Side Side
	// Discharge is the peak discharge from the whole reach solved at once.
	Discharge float64
	// Fall is the water-surface drop from the first to the last section;
	// Length the distance between them. For the slope-conveyance method
	// Fall is zero and Slope is the slope given.
	Fall, Length, Slope float64
	// Sections holds each section's hydraulics at Discharge, upstream first.
	Sections []SectionResult
	// Subreaches holds each pair of adjacent sections, upstream first.
	Subreaches []Subreach
	// SubreachMin and SubreachMax are the least and greatest subreach
	// discharges; SubreachSpread is (max − min)/Discharge (NaN when a
	// subreach has no solution).
	SubreachMin, SubreachMax, SubreachSpread float64
	// MarkSpread and MinFall are the tolerances the checks used.
	MarkSpread, MinFall float64
	// Checks are the quality checks, in report order.
	Checks []Check
	// Warnings are facts a reviewer should see.
	Warnings []string
}

// SectionResult is one section's hydraulics at the reach discharge.
type SectionResult struct {
	ID string
	// Distance is the position along the channel.
	Distance float64
	// Left and Right are the marks (NaN where missing); WaterSurface is the
	// elevation used; MarksUsed how many marks it rests on (1 or 2).
	Left, Right, WaterSurface float64
	MarksUsed                 int
	// Bottom is the lowest ground elevation (the thalweg).
	Bottom float64
	// Area, WettedPerimeter, TopWidth and HydraulicDepth (A/T) describe
	// the wetted section.
	Area, WettedPerimeter, TopWidth, HydraulicDepth float64
	// ChannelDepth is the main channel's mean depth, its area over its
	// top width between the bank stations; NaN for a section without
	// banks (all channel). The reach-length checks use it where it is
	// known (see saCheckDepth).
	ChannelDepth float64
	// Conveyance is ΣKi over subsections; Alpha the energy coefficient
	// Σ(Ki³/Ai²)/(K³/A²).
	Conveyance, Alpha float64
	// Velocity is Q/A; VelocityHead α·V²/(2g); EnergyGrade WaterSurface +
	// VelocityHead; Froude √(α·Q²·T/(g·A³)).
	Velocity, VelocityHead, EnergyGrade, Froude float64
	// Subs is each subsection at the peak discharge, the first thing a
	// reviewer checks: its stations (From, To), Manning's n, region, area,
	// wetted perimeter, top width, conveyance Ki, discharge Q·Ki/K and
	// velocity (NaN where dry).
	Subs []rating.SubRow
	// Ground is the section's ground line with bank points inserted (nil
	// when the geometry is not a surveyed *subdivide.Profile).
	Ground []subdivide.Point
}

// Subreach is the energy balance between two adjacent sections.
type Subreach struct {
	// From and To are the section IDs, upstream first; FromIndex and
	// ToIndex their indices in SlopeArea.Sections.
	From, To           string
	FromIndex, ToIndex int
	// Length is the distance between the sections; Fall the drop in water
	// surface from upstream to downstream.
	Length, Fall float64
	// Discharge is this subreach solved alone (NaN when it has no real
	// solution).
	Discharge float64
	// Expanding reports a velocity head falling downstream (by more than
	// VelocityHeadTolerance of it); EddyK is the
	// eddy-loss coefficient applied (ExpandingEddyK or ContractingEddyK).
	// The method Flow says which in a word, or uniform.
	Expanding bool
	EddyK     float64
	// At the reach discharge: FrictionLoss Q²L/(KuKd), VelocityHeadChange
	// hvu − hvd (0 within VelocityHeadTolerance), and EddyLoss k·(hvu − hvd).
	FrictionLoss, VelocityHeadChange, EddyLoss float64
	// ConveyanceRatio is Kd/Ku.
	ConveyanceRatio float64
}

// Words of Subreach.Flow.
const (
	FlowExpanding   = "expanding"
	FlowContracting = "contracting"
	FlowUniform     = "uniform"
)

// Flow says how the velocity head changes through the subreach:
// FlowExpanding where it falls downstream, FlowContracting where it rises,
// and FlowUniform where the two velocity heads are equal within
// VelocityHeadTolerance of the larger (VelocityHeadChange is then 0): a
// prismatic reach at one depth, which neither expands nor contracts. A
// uniform subreach takes the contracting coefficient, which makes no
// difference there (the eddy loss k·0 is 0 for any k).
func (s Subreach) Flow() string {
	switch {
	case s.Expanding:
		return FlowExpanding
	case s.VelocityHeadChange == 0:
		return FlowUniform
	}
	return FlowContracting
}

// Check is one quality check of a slope-area reach.
type Check struct {
	// Name says what is checked and where, e.g. "froude XS-2".
	Name string
	// Value is the measured quantity; Limit the criterion; Relation how
	// they compare for a pass ("≥" or "≤" or "<").
	Value, Limit float64
	Relation     string
	// Pass is true when the criterion holds; otherwise the check warns
	// (Status "warn", and a warning on the result in the same word).
	Pass bool
	// Source cites the criterion.
	Source string
}

// Status returns "pass" or "warn".
func (c Check) Status() string {
	if c.Pass {
		return "pass"
	}
	return "warn"
}

// Errors of the slope-area computation, for errors.Is.
var (
	ErrTooFewSections  = errors.New("a slope-area reach needs two or more sections (with one, give a slope for the weaker slope-conveyance estimate)")
	ErrDistances       = errors.New("distances must increase downstream")
	ErrNoMark          = errors.New("no high-water mark: give ws_left or ws_right")
	ErrFall            = errors.New("the water surface must fall from the first section to the last")
	ErrDrySection      = errors.New("the ground is entirely above the water surface")
	ErrNoReachSolution = errors.New("no real discharge: the velocity-head recovery exceeds the friction loss")
	// ErrEnergyGain is the cause of a reach refused because, at its
	// computed discharge, the marks of a subreach leave no positive
	// friction loss (see SolveSlopeArea).
	ErrEnergyGain = errors.New("no real flow gains energy downstream: the marks of this subreach fit no discharge; check them, or leave the section out")
)

// SectionError reports a problem with one section of a reach.
type SectionError struct {
	// Index is the 0-based index of the section; ID its name.
	Index int
	ID    string
	// Field names the input at fault: "distance", "geometry",
	// "flow_lengths", or for a water surface "ws_left" or "ws_right" when
	// it is that one mark and "water_surface" when it is the mean of both
	// marks or there is no mark (saMarkField).
	Field string
	Err   error
}

func (e *SectionError) Error() string {
	return fmt.Sprintf("section %s: %v", e.ID, e.Err)
}

func (e *SectionError) Unwrap() error { return e.Err }

// saWaterSurface returns a section's water surface from its marks, the
// number of marks used, and a warning naming the mark used when the chosen
// side, or one of the two for the mean, was missing.
func saWaterSurface(s Section, side Side) (ws float64, used int, warn string) {
	l, r := s.Left, s.Right
	hasL, hasR := finite(l), finite(r)
	switch {
	case hasL && hasR:
		switch side {
		case LeftSide:
			return l, 1, ""
		case RightSide:
			return r, 1, ""
		}
		return rating.DecimalMean(l, r), 2, "" // 407.415, not 407.41499999999996
	case hasL:
		switch side {
		case RightSide:
			warn = fmt.Sprintf("section %s has no right mark: the left mark is used", s.ID)
		case MeanSide:
			warn = fmt.Sprintf("section %s has no right mark: its water surface is the left mark alone, not a mean of two", s.ID)
		}
		return l, 1, warn
	case hasR:
		switch side {
		case LeftSide:
			warn = fmt.Sprintf("section %s has no left mark: the right mark is used", s.ID)
		case MeanSide:
			warn = fmt.Sprintf("section %s has no left mark: its water surface is the right mark alone, not a mean of two", s.ID)
		}
		return r, 1, warn
	}
	return math.NaN(), 0, ""
}

// saMarkField names the input a section's water surface was taken from,
// for a SectionError: "ws_left" or "ws_right" when it rests on one mark
// (used is 1: the side chosen, or the only mark), "water_surface" when it
// is the mean of both.
func saMarkField(s Section, side Side, used int) string {
	if used != 1 {
		return "water_surface"
	}
	switch hasL, hasR := finite(s.Left), finite(s.Right); {
	case hasL && (!hasR || side == LeftSide):
		return "ws_left"
	case hasR:
		return "ws_right"
	}
	return "water_surface"
}

// saSectionState is the hydraulic state of a section at a water surface.
type saSectionState struct {
	w        subdivide.Wetted
	k, alpha float64
	c        float64 // α/A², so that hv = c·Q²/(2g)
	subK     []float64
	scratch  []subdivide.SubWetted // the subsections with n scaled, for a draw
}

// saState wets a section at ws, with each subsection's n multiplied by
// nmul[i] (nil for none).
func saState(g subdivide.Geometry, ws float64, nmul []float64, gopt subdivide.Options, u rating.Units, st *saSectionState) error {
	w, err := g.At(ws, gopt)
	if err != nil {
		return err
	}
	subs := w.Subs
	if nmul != nil {
		st.scratch = append(st.scratch[:0], w.Subs...)
		for i := range st.scratch {
			st.scratch[i].N *= nmul[i]
		}
		subs = st.scratch
	}
	subs = rating.FoldWalls(subs) // walls convey with what they face
	if nmul == nil {
		w.Subs = subs
	}
	st.w = w
	if cap(st.subK) < len(w.Subs) {
		st.subK = make([]float64, len(w.Subs))
	}
	st.subK = st.subK[:len(w.Subs)]
	var kt, k3a2 float64
	for i, sw := range subs {
		st.subK[i] = 0
		if sw.Area <= 0 {
			continue
		}
		n := sw.N
		if !(n > 0) {
			return fmt.Errorf("stations %g to %g: %w", sw.From, sw.To, rating.ErrNoN)
		}
		k := rating.Conveyance(sw.Area, sw.WettedPerimeter, n, u)
		st.subK[i] = k
		kt += k
		k3a2 += k * k * k / (sw.Area * sw.Area)
	}
	st.k = kt
	if !(w.Area > 0) || !(kt > 0) {
		return ErrDrySection
	}
	st.alpha = k3a2 / (kt * kt * kt / (w.Area * w.Area))
	st.c = st.alpha / (w.Area * w.Area)
	return nil
}

// VelocityHeadTolerance is the relative difference, of the larger of two
// velocity heads, below which they count as equal: sections of the same
// shape at the same depth differ by round-off only, and their subreach
// neither expands nor contracts (Subreach.Flow is FlowUniform). It is far
// above round-off (about 1e-16 of a value, a few times that after the
// depth is taken from elevations of a hundred metres) and far below any
// difference a survey can show (1e-9 of a velocity head of 1 m is a
// micrometre).
const VelocityHeadTolerance = 1e-9

// headChange returns up − dn, or 0 where the two differ by no more than
// VelocityHeadTolerance of the larger.
func headChange(up, dn float64) float64 {
	d := up - dn
	if math.Abs(d) <= VelocityHeadTolerance*math.Max(math.Abs(up), math.Abs(dn)) {
		return 0
	}
	return d
}

// saSubreachTerm returns the denominator term of one subreach,
// L/(Ku·Kd) − (1−k)·(cu − cd)/(2g), and whether it expands (cu > cd by
// more than VelocityHeadTolerance).
func saSubreachTerm(l float64, up, dn *saSectionState, u rating.Units) (term float64, expanding bool) {
	dc := headChange(up.c, dn.c)
	expanding = dc > 0
	k := ContractingEddyK
	if expanding {
		k = ExpandingEddyK
	}
	return l/(up.k*dn.k) - (1-k)*dc/(2*u.Gravity()), expanding
}

// saReachQ solves the whole reach for the water surfaces ws and states
// sts. At the discharge found, every subreach must keep a positive
// friction loss (saFrictionLoss); otherwise the discharge is returned with
// ErrEnergyGain (bare: SolveSlopeArea names the subreach).
func saReachQ(secs []Section, ws []float64, sts []saSectionState, u rating.Units) (float64, error) {
	var den float64
	for j := 0; j+1 < len(secs); j++ {
		t, _ := saSubreachTerm(secs[j+1].Distance-secs[j].Distance, &sts[j], &sts[j+1], u)
		den += t
	}
	fall := ws[0] - ws[len(ws)-1]
	if !(fall > 0) {
		return math.NaN(), ErrFall
	}
	if !(den > 0) {
		return math.NaN(), ErrNoReachSolution
	}
	q := math.Sqrt(fall / den)
	if saGainingSubreach(ws, sts, q, u) >= 0 {
		return q, ErrEnergyGain
	}
	return q, nil
}

// saFrictionLoss returns the friction loss that the water surfaces of
// subreach j (sections j and j+1) leave at discharge q: the drop of the
// energy grade less the eddy loss,
//
//	hf = (hu + hvu) − (hd + hvd) − k·(hvu − hvd) = F + (1−k)·(hvu − hvd),
//
// with k and the velocity-head change as in saSubreachTerm. Over the
// whole reach these add up to Q²·Σ L/(Ku·Kd), which is positive; a
// subreach alone may come out at zero or below.
func saFrictionLoss(j int, ws []float64, sts []saSectionState, q float64, u rating.Units) float64 {
	up, dn := &sts[j], &sts[j+1]
	dc := headChange(up.c, dn.c)
	k := ContractingEddyK
	if dc > 0 {
		k = ExpandingEddyK
	}
	return ws[j] - ws[j+1] + (1-k)*dc*q*q/(2*u.Gravity())
}

// saGainingSubreach returns the first subreach whose friction loss at q
// (saFrictionLoss) is not above the round-off of its water surfaces
// (roundOffSlack), or −1 when every subreach loses energy to friction.
func saGainingSubreach(ws []float64, sts []saSectionState, q float64, u rating.Units) int {
	for j := 0; j+1 < len(ws); j++ {
		if !(saFrictionLoss(j, ws, sts, q, u) > roundOffSlack(ws[j], ws[j+1])) {
			return j
		}
	}
	return -1
}

// saEnergyGainError names subreach j of a reach refused with
// ErrEnergyGain: the energy grades of its two sections at the computed
// discharge q, their rise (or a fall smaller than the eddy loss), and the
// friction loss the marks leave.
func saEnergyGainError(secs []Section, ws []float64, sts []saSectionState, q float64, u rating.Units, j int) error {
	g2 := 2 * u.Gravity()
	eu := ws[j] + sts[j].c*q*q/g2
	ed := ws[j+1] + sts[j+1].c*q*q/g2
	hf := saFrictionLoss(j, ws, sts, q, u)
	L := u.Length()
	how := fmt.Sprintf("the energy grade rises %.3f %s downstream, from %.3f %s at %s to %.3f %s at %s",
		ed-eu, L, eu, L, secs[j].ID, ed, L, secs[j+1].ID)
	if ed < eu {
		how = fmt.Sprintf("the energy grade falls only %.3f %s, from %.3f %s at %s to %.3f %s at %s, no more than the eddy loss",
			eu-ed, L, eu, L, secs[j].ID, ed, L, secs[j+1].ID)
	}
	return fmt.Errorf("subreach %s to %s: at the reach's computed %s %s %s, a friction loss of %.3f %s: %w",
		secs[j].ID, secs[j+1].ID, saSig(q), u.Discharge(), how, hf, L, ErrEnergyGain)
}

// SolveSlopeArea computes the peak discharge of a reach of two or more
// sections by the slope-area method, the hydraulics of each section and
// subreach at that discharge, and the quality checks. Sections are given
// upstream first; each water surface comes from the section's marks
// (SlopeAreaOptions.Side).
//
// The slope-area method estimates a flood peak from the high-water marks
// and surveyed cross-sections of a reach of two or more sections
// (Dalrymple & Benson, 1967). Between an upstream section u and the next
// section d downstream, the energy equation is
//
//	hu + hvu = hd + hvd + hf + k·(hvu − hvd)
//
// with h the water-surface elevation, hv = α·Q²/(2g·A²) the velocity head,
// hf = Q²·L/(Ku·Kd) the friction loss over the subreach length L from the
// geometric mean of the two conveyances, and k the eddy-loss coefficient:
// k = 0 where the velocity head rises downstream (a contracting subreach)
// and k = 0.5 where it falls (an expanding subreach). Since hv ∝ Q² and
// α, A and K depend on the water surface only, each subreach solves in
// closed form:
//
//	Q² = F / ( L/(Ku·Kd) − (1−k)·(αu/Au² − αd/Ad²)/(2g) )
//
// where F = hu − hd is the fall. The whole reach of sections 1…M is solved
// with all subreaches together by adding the M−1 energy equations: the
// intermediate water surfaces cancel and
//
//	Q² = (h1 − hM) / Σj ( Lj/(Kj·Kj+1) − (1−kj)·(αj/Aj² − αj+1/Aj+1²)/(2g) )
//
// the multi-section form of Dalrymple & Benson (1967; from memory). The
// choice of k in each subreach depends only on the geometry (αu/Au² against
// αd/Ad²), so no iteration is needed.
//
// Each subreach must lose energy at the computed discharge. The whole-reach
// form balances only the sum of the subreach equations, so marks that are
// impossible in one subreach (a mark raised by a blunder, so that the
// energy grade rises downstream through it) still give a positive Q²: the
// other subreaches pay for it, and the discharge is an artefact of the
// blunder, not an estimate of the flow. The method rests on the energy
// equation above with losses that are never negative: the friction loss
// hf = Q²·L/(Ku·Kd) is positive and the eddy loss is zero or more, so in
// a real flow the energy grade falls through every subreach by more than
// its eddy loss (Dalrymple & Benson, 1967; Chow, 1959, section 10-1).
// A reach whose water surface rises from end to end is refused (ErrFall);
// for the same reason a reach is refused where, at its computed
// discharge, the water surfaces of a subreach leave a friction loss
// F + (1−k)·(hvu − hvd) of zero or less (within the round-off of the
// elevations, RoundOffRelative), wrapping ErrEnergyGain and naming the
// subreach, its energy grades and the friction loss left. This project
// refuses rather than warns (its reading of the method): a figure that no
// real flow could give is not a flood peak to be read with a warning
// beside it, and a refusal writes nothing that could be quoted. A subreach
// whose water surface rises but whose energy grade still falls by more
// than its eddy loss (recovery of velocity head in an expansion) is a real
// flow and is solved, with the checks' warnings.
//
// References:
//
//	Dalrymple, T., and Benson, M.A., 1967, Measurement of peak discharge by
//	the slope-area method: U.S. Geological Survey Techniques of
//	Water-Resources Investigations, book 3, chapter A2.
//	Chow, V.T., 1959, Open-Channel Hydraulics, sections 2-7 and 10-1.
//
// Errors are *SectionError for a section at fault (distance not
// increasing, no mark, dry section) or wrap ErrTooFewSections, ErrFall,
// ErrNoReachSolution or ErrEnergyGain.
func SolveSlopeArea(secs []Section, opt SlopeAreaOptions) (SlopeArea, error) {
	u := opt.Units
	res := SlopeArea{Method: MethodSlopeArea, Units: u, Side: opt.Side,
		MarkSpread: opt.markSpread(), MinFall: opt.minFall()}
	if len(secs) < 2 {
		return res, ErrTooFewSections
	}
	ws, used, sts, err := saPrepare(secs, opt, &res)
	if err != nil {
		return res, err
	}
	// Differences of inputs are the decimals a hand calculation gives
	// (a fall of 1.43, not 1.42999999999995), for every report.
	res.Fall = rating.DecimalDifference(ws[0], ws[len(ws)-1])
	res.Length = rating.DecimalDifference(secs[len(secs)-1].Distance, secs[0].Distance)
	if !(res.Fall > 0) {
		return res, fmt.Errorf("%w: %s at %.3f %s, %s at %.3f %s", ErrFall,
			secs[0].ID, ws[0], u.Length(), secs[len(secs)-1].ID, ws[len(ws)-1], u.Length())
	}
	q, err := saReachQ(secs, ws, sts, u)
	if errors.Is(err, ErrEnergyGain) {
		return res, saEnergyGainError(secs, ws, sts, q, u, saGainingSubreach(ws, sts, q, u))
	}
	if err != nil {
		return res, err
	}
	res.Discharge = q
	saFillSections(&res, secs, ws, used, sts, q)
	res.SubreachMin, res.SubreachMax = math.Inf(1), math.Inf(-1)
	for j := 0; j+1 < len(secs); j++ {
		up, dn := &res.Sections[j], &res.Sections[j+1]
		l := rating.DecimalDifference(secs[j+1].Distance, secs[j].Distance)
		term, expanding := saSubreachTerm(l, &sts[j], &sts[j+1], u)
		sr := Subreach{From: secs[j].ID, To: secs[j+1].ID, FromIndex: j, ToIndex: j + 1,
			Length: l, Fall: rating.DecimalDifference(ws[j], ws[j+1]), Expanding: expanding, Discharge: math.NaN(),
			ConveyanceRatio: sts[j+1].k / sts[j].k}
		if x := sr.Fall / term; x > 0 && !math.IsInf(x, 0) {
			sr.Discharge = math.Sqrt(x)
		}
		if expanding {
			sr.EddyK = ExpandingEddyK
		}
		sr.FrictionLoss = q * q * l / (sts[j].k * sts[j+1].k)
		sr.VelocityHeadChange = headChange(up.VelocityHead, dn.VelocityHead)
		if expanding {
			sr.EddyLoss = sr.EddyK * sr.VelocityHeadChange
		}
		res.Subreaches = append(res.Subreaches, sr)
		if math.IsNaN(sr.Discharge) {
			res.SubreachMin, res.SubreachMax = math.NaN(), math.NaN()
			res.Warnings = append(res.Warnings, fmt.Sprintf(
				"subreach %s to %s alone has no real discharge (fall %.3f %s): the reach's discharge rests on the other subreaches; review its marks",
				sr.From, sr.To, sr.Fall, u.Length()))
		} else {
			res.SubreachMin = math.Min(res.SubreachMin, sr.Discharge)
			res.SubreachMax = math.Max(res.SubreachMax, sr.Discharge)
		}
	}
	res.SubreachSpread = (res.SubreachMax - res.SubreachMin) / q
	if res.SubreachSpread > SubreachSpreadWarn {
		res.Warnings = append(res.Warnings, fmt.Sprintf(
			"the subreach discharges spread by %.0f %% of the reach discharge (%s to %s %s): review the marks and n values",
			100*res.SubreachSpread, saSig(res.SubreachMin), saSig(res.SubreachMax), u.Discharge()))
	}
	res.Checks = saChecks(&res)
	return res, nil
}

// saSig writes a discharge or a check's value for a warning or an error:
// four significant figures in plain decimal (rating.PlainFigures).
func saSig(v float64) string { return rating.PlainFigures(v, 4) }

// saPrepare validates the sections, takes their water surfaces and wets
// them. Warnings about marks and end extension go on res.
func saPrepare(secs []Section, opt SlopeAreaOptions, res *SlopeArea) (ws []float64, used []int, sts []saSectionState, err error) {
	u := opt.Units
	ws = make([]float64, len(secs))
	used = make([]int, len(secs))
	sts = make([]saSectionState, len(secs))
	for i, s := range secs {
		if s.Geometry == nil {
			return nil, nil, nil, &SectionError{i, s.ID, "geometry", errors.New("no geometry")}
		}
		if math.IsNaN(s.Distance) || math.IsInf(s.Distance, 0) {
			return nil, nil, nil, &SectionError{i, s.ID, "distance", errors.New("distance is not a finite number")}
		}
		if i > 0 && !(s.Distance > secs[i-1].Distance) {
			return nil, nil, nil, &SectionError{i, s.ID, "distance",
				fmt.Errorf("%w: %g after %g", ErrDistances, s.Distance, secs[i-1].Distance)}
		}
		h, n, warn := saWaterSurface(s, opt.Side)
		if n == 0 {
			return nil, nil, nil, &SectionError{i, s.ID, "water_surface", ErrNoMark}
		}
		if warn != "" {
			res.Warnings = append(res.Warnings, warn)
		}
		ws[i], used[i] = h, n
		if err := saState(s.Geometry, h, nil, opt.Geometry, u, &sts[i]); err != nil {
			if errors.Is(err, ErrDrySection) {
				err = fmt.Errorf("%w: water surface %.3f %s, lowest ground %.3f %s",
					ErrDrySection, h, u.Length(), s.Geometry.Bottom(), u.Length())
			}
			return nil, nil, nil, &SectionError{i, s.ID, saMarkField(s, opt.Side, n), err}
		}
		for _, w := range rating.ExtensionWarnings(sts[i].w.ExtendedLeft, sts[i].w.ExtendedRight, h, u) {
			res.Warnings = append(res.Warnings, "section "+s.ID+": "+w)
		}
		for _, w := range rating.PoolWarnings(sts[i].w.Pools, min(sts[i].w.PondedPools, 1), sts[i].w.Ponded, opt.Geometry, u) {
			res.Warnings = append(res.Warnings, "section "+s.ID+": "+w)
		}
	}
	return ws, used, sts, nil
}

// saFillSections sets each section's hydraulics at discharge q.
func saFillSections(res *SlopeArea, secs []Section, ws []float64, used []int, sts []saSectionState, q float64) {
	u := res.Units
	res.Sections = make([]SectionResult, len(secs))
	for i, s := range secs {
		st := &sts[i]
		w := st.w
		r := SectionResult{ID: s.ID, Distance: s.Distance, Left: s.Left, Right: s.Right,
			WaterSurface: ws[i], MarksUsed: used[i], Bottom: s.Geometry.Bottom(),
			Area: w.Area, WettedPerimeter: w.WettedPerimeter, TopWidth: w.TopWidth,
			HydraulicDepth: w.HydraulicDepth, Conveyance: st.k, Alpha: st.alpha,
			Velocity: q / w.Area, Subs: make([]rating.SubRow, len(w.Subs))}
		r.ChannelDepth = saChannelDepth(s.Geometry, w)
		r.VelocityHead = st.c * q * q / (2 * u.Gravity())
		r.EnergyGrade = r.WaterSurface + r.VelocityHead
		r.Froude = rating.FroudeNumber(q, w.Area, w.TopWidth, st.alpha, u)
		if p, ok := s.Geometry.(*subdivide.Profile); ok {
			r.Ground = p.Points()
		}
		for j, sw := range w.Subs {
			sr := rating.SubRow{SubWetted: sw, Conveyance: st.subK[j], Velocity: math.NaN()}
			sr.Discharge = q * st.subK[j] / st.k
			if sw.Area > 0 {
				sr.Velocity = sr.Discharge / sw.Area
			}
			r.Subs[j] = sr
		}
		res.Sections[i] = r
	}
}

// Sources of the checks, as printed beside them.
const (
	srcPairFall = "Dalrymple & Benson 1967 (TWRI 3-A2), as quoted by Jarrett 1985 (USGS WRI 85-4004, p. 7): " +
		"fall between each pair of sections at least the larger of 0.5 ft (0.15 m) and the velocity head"
	srcSections = "Dalrymple & Benson 1967 (TWRI 3-A2): three or more sections recommended (as read in secondary sources)"
	// srcLength takes the depth used (saDepthWords).
	srcLength = "length at least 75 mean %s (common practice, attributed to Dalrymple & Benson 1967; confirmed only secondhand)"
	// srcSubreachLength takes the share of MinReachDepths per subreach
	// and the depth used (saDepthWords).
	srcSubreachLength = "each subreach at least its equal share of the reach length, %.4g mean %s " +
		"(this project's reading of: length at least 75 mean depths, common practice, attributed to Dalrymple & Benson 1967; confirmed only secondhand)"
	// srcKRatio takes MaxConveyanceRatio as printed, twice.
	srcKRatio = "Kd/Ku between 0.7 and 1/0.7 = %s, checked as the larger conveyance over the smaller ≤ %s: " +
		"the end-section guidance of Dalrymple & Benson 1967 (TWRI 3-A2; from memory), read symmetrically and applied to each subreach"
	srcFroude    = "subcritical, gradually varied flow assumed (Chow 1959, 10-1); high Froude suggests n too low (Jarrett 1984, from memory)"
	srcExpanding = "a drop above 0, the velocity head falling downstream, means the subreach expands; below 0 it contracts; no change (uniform) passes. " +
		"Dalrymple & Benson 1967 (TWRI 3-A2): contracting reaches preferred, expansion losses uncertain (from memory)"
	srcMarks = "left and right marks within the mark-spread tolerance (project default, common practice)"
)

// saChecks evaluates the quality criteria of a solved reach and adds a
// warning for each that does not pass, in the word of Check.Status.
func saChecks(res *SlopeArea) []Check {
	cs := saCheckList(res)
	for _, c := range cs {
		if !c.Pass {
			res.Warnings = append(res.Warnings, fmt.Sprintf("quality check %q: %s, value %s, wanted %s %s (%s)",
				c.Name, c.Status(), saSig(c.Value), c.Relation, saSig(c.Limit), c.Source))
		}
	}
	return cs
}

func saCheckList(res *SlopeArea) []Check {
	var cs []Check
	meanD := 0.0
	for _, s := range res.Sections {
		meanD += saCheckDepth(s)
	}
	meanD /= float64(len(res.Sections))
	if res.Method == MethodSlopeArea {
		n := len(res.Sections)
		cs = append(cs, Check{Name: "sections in the reach", Value: float64(n), Limit: MinSections, Relation: "≥",
			Pass: n >= MinSections, Source: srcSections})
		cs = append(cs, saFallChecks(res)...)
		first, last := res.Sections[0].Distance, res.Sections[n-1].Distance
		cs = append(cs, Check{Name: "reach length vs mean depth", Value: res.Length, Limit: MinReachDepths * meanD, Relation: "≥",
			Pass: res.Length >= MinReachDepths*meanD-roundOffSlack(first, last), Source: fmt.Sprintf(srcLength, saDepthWords(res.Sections, "averaged over the sections"))})
		cs = append(cs, saSubreachLengthChecks(res)...)
		for _, sr := range res.Subreaches {
			ratio := sr.ConveyanceRatio
			if ratio < 1 {
				ratio = 1 / ratio
			}
			cs = append(cs, Check{Name: "conveyance ratio " + sr.From + " to " + sr.To, Value: ratio,
				Limit: MaxConveyanceRatio, Relation: "≤", Pass: ratio <= MaxConveyanceRatio,
				Source: fmt.Sprintf(srcKRatio, saSig(MaxConveyanceRatio), saSig(MaxConveyanceRatio))})
		}
		for _, sr := range res.Subreaches {
			// The value is the drop in velocity head downstream, hvu − hvd:
			// above 0 the flow expands, 0 is uniform (within
			// VelocityHeadTolerance), below 0 it contracts.
			cs = append(cs, Check{Name: "expansion " + sr.From + " to " + sr.To + " (velocity-head drop)", Value: sr.VelocityHeadChange,
				Limit: 0, Relation: "≤", Pass: !sr.Expanding, Source: srcExpanding})
		}
	}
	for _, s := range res.Sections {
		cs = append(cs, Check{Name: "froude " + s.ID, Value: s.Froude, Limit: MaxFroude, Relation: "<",
			Pass: s.Froude < MaxFroude, Source: srcFroude})
	}
	for _, s := range res.Sections {
		if math.IsNaN(s.Left) || math.IsNaN(s.Right) {
			continue
		}
		d := math.Abs(rating.DecimalDifference(s.Left, s.Right))
		cs = append(cs, Check{Name: "mark spread " + s.ID, Value: d, Limit: res.MarkSpread, Relation: "≤",
			Pass: d <= res.MarkSpread+roundOffSlack(s.Left, s.Right), Source: srcMarks})
	}
	return cs
}

// saSubreachLengthChecks checks the length of every subreach of a reach
// of three or more sections against its equal share of the reach-length
// criterion at its own depth: L ≥ MinReachDepths/(M − 1) · (du + dd)/2
// for M sections, du and dd the mean depths of its two sections
// (saCheckDepth).
// The criterion is for the whole reach (srcLength); sharing it equally
// among the subreaches is this project's reading, which catches a
// subreach so short that its fall and losses are round-off and its
// discharge alone means nothing. A reach of two sections has one
// subreach, checked as the reach.
func saSubreachLengthChecks(res *SlopeArea) []Check {
	if len(res.Subreaches) < 2 {
		return nil
	}
	share := MinReachDepths / float64(len(res.Subreaches))
	cs := make([]Check, 0, len(res.Subreaches))
	for _, sr := range res.Subreaches {
		up, dn := res.Sections[sr.FromIndex], res.Sections[sr.ToIndex]
		limit := share * (saCheckDepth(up) + saCheckDepth(dn)) / 2
		cs = append(cs, Check{Name: "subreach length " + sr.From + " to " + sr.To, Value: sr.Length, Limit: limit, Relation: "≥",
			Pass:   sr.Length >= limit-roundOffSlack(up.Distance, dn.Distance),
			Source: fmt.Sprintf(srcSubreachLength, share, saDepthWords([]SectionResult{up, dn}, "averaged over its two sections"))})
	}
	return cs
}

// saChannelDepth returns the main channel's mean depth in a wetted
// section, the area over the top width of its Channel subsections, or NaN
// when the geometry has no banks (its subsections are all channel) or its
// channel holds no water.
func saChannelDepth(g subdivide.Geometry, w subdivide.Wetted) float64 {
	if _, _, banks := subdivide.ChannelLimits(g.Subsections()); !banks {
		return math.NaN()
	}
	var a, t float64
	for _, sw := range w.Subs {
		if sw.Region == subdivide.Channel {
			a += sw.Area
			t += sw.TopWidth
		}
	}
	if !(a > 0 && t > 0) {
		return math.NaN()
	}
	return a / t
}

// saCheckDepth is the depth of flow the reach-length criterion measures a
// section by. The criterion asks for a fall that is large against the
// depth of the flow, and in a section with overbanks the flow is the
// main channel's: the whole section's A/T, diluted by wide, shallow
// overbanks, would pass a reach far shorter than 75 depths of the water
// that carries the discharge. So it is the main channel's mean depth
// where the section has banks (ChannelDepth), and the whole section's
// A/T where it has none (this project's reading of the criterion).
func saCheckDepth(s SectionResult) float64 {
	if finite(s.ChannelDepth) {
		return s.ChannelDepth
	}
	return s.HydraulicDepth
}

// saDepthWords says which depth saCheckDepth took at the sections, for
// the source of a length check: "depths of the main channel (…) " when it
// is the channel's at each (or of the whole section at each), the
// sections by name otherwise, then every, which says how the depths are
// combined ("averaged over the sections").
func saDepthWords(secs []SectionResult, every string) string {
	var channel, whole []string
	for _, s := range secs {
		if finite(s.ChannelDepth) {
			channel = append(channel, s.ID)
		} else {
			whole = append(whole, s.ID)
		}
	}
	const (
		chWords    = "of the main channel (its area over its top width between the banks)"
		wholeWords = "of the whole section (its area over its top width)"
	)
	switch {
	case len(whole) == 0:
		return "depths " + chWords + " " + every
	case len(channel) == 0:
		return "depths " + wholeWords + " " + every
	}
	return "depths " + chWords + " at " + strings.Join(channel, ", ") + " and " + wholeWords + " at " + strings.Join(whole, ", ") + ", " + every
}

// saFallChecks checks the fall of every subreach against the larger of
// the least fall and the velocity head. The velocity head of a pair is
// taken as the larger of its two sections' (this project's reading of the
// rule, which names one velocity head).
func saFallChecks(res *SlopeArea) []Check {
	cs := make([]Check, 0, len(res.Subreaches))
	for _, sr := range res.Subreaches {
		hv := math.Max(res.Sections[sr.FromIndex].VelocityHead, res.Sections[sr.ToIndex].VelocityHead)
		limit := math.Max(res.MinFall, hv)
		slack := roundOffSlack(res.Sections[sr.FromIndex].WaterSurface, res.Sections[sr.ToIndex].WaterSurface)
		cs = append(cs, Check{Name: "fall " + sr.From + " to " + sr.To, Value: sr.Fall, Limit: limit, Relation: "≥",
			Pass: sr.Fall >= limit-slack, Source: srcPairFall})
	}
	return cs
}

// MarkSpreadEpsilon is the relative slack given to a mark's band when a
// computed departure from the mark is compared with it, so that a
// departure equal to the band in the written decimals lies inside.
const MarkSpreadEpsilon = 1e-9

// RoundOffRelative is the round-off allowed when a difference of two
// inputs of the same kind (a fall or a mark spread from elevations, a
// length from distances) is compared with its limit, relative to the
// larger magnitude of the two: the difference is computed in binary from
// decimals, so 50.94 − 50.79 comes out as 0.14999999999999147 and would
// fail a limit of 0.15 it meets in the written figures. Double precision
// carries about 1.1e-16 of a value, and the subtraction keeps the error of
// its operands, so a few times 1e-16 of the larger magnitude is round-off;
// 1e-9 of it stays far above that and far below any survey's resolution
// (1e-9 of a 10 000 m elevation is 0.01 mm).
const RoundOffRelative = 1e-9

// roundOffSlack returns the round-off allowed in a difference of a and b:
// RoundOffRelative of the larger of |a| and |b|.
func roundOffSlack(a, b float64) float64 {
	return RoundOffRelative * math.Max(math.Abs(a), math.Abs(b))
}

// SlopeConveyance is the single-section fallback: Q = K·√S with the given
// friction slope s (dimensionless) and the section's conveyance at its
// water surface. It is a weaker method than the slope-area method: the
// slope is assumed, not measured between sections, and no velocity-head
// change is accounted for. The result carries the warning saying so.
//
// Reference: Chow (1959), Open-Channel Hydraulics, section 6-4 (uniform
// flow); Dalrymple & Benson (1967) for the slope-area method it replaces.
func SlopeConveyance(sec Section, s float64, opt SlopeAreaOptions) (SlopeArea, error) {
	u := opt.Units
	res := SlopeArea{Method: MethodSlopeConveyance, Units: u, Side: opt.Side, Slope: s,
		MarkSpread: opt.markSpread(), MinFall: opt.minFall(),
		SubreachMin: math.NaN(), SubreachMax: math.NaN(), SubreachSpread: math.NaN()}
	if !(s > 0) || math.IsInf(s, 0) {
		return res, fmt.Errorf("slope %v: %w", s, rating.ErrSlope)
	}
	res.Warnings = append(res.Warnings, "single-section slope-conveyance estimate Q = K·√S with an assumed slope: "+
		"a weaker method than the slope-area method (no measured fall, no velocity-head change)")
	ws, used, sts, err := saPrepare([]Section{sec}, opt, &res)
	if err != nil {
		return res, err
	}
	q := sts[0].k * math.Sqrt(s)
	res.Discharge = q
	saFillSections(&res, []Section{sec}, ws, used, sts, q)
	res.Checks = saChecks(&res)
	return res, nil
}

// finite reports whether v is a number other than ±Inf.
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
