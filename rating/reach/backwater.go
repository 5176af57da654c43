package reach

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"wetline/rating"
	"wetline/subdivide"
)

// Defaults and tolerances of the step-backwater computation.
const (
	// SpreadToleranceSI and SpreadToleranceUS are the default largest
	// difference between the stage of a discharge's profile and those of
	// its check profiles at the rating section, 0.01 m or 0.03 ft, beyond
	// which the rating read
	// there carries a warning (project default: the resolution to which a
	// stage is read).
	SpreadToleranceSI = 0.01
	SpreadToleranceUS = 0.03
	// RaisedStartFactor sets the second start of a profile whose first
	// start is critical depth: that depth times 1.3 (after the
	// "critical and 1.3 × normal depth" pair of starts of Davidian, 1984,
	// USGS TWRI 3-A15; from memory).
	RaisedStartFactor = 1.3
	// BalanceTolerance is the energy-equation residual, as a fraction of
	// the specific energy of the upstream section, above which a
	// subcritical stage is reported as a jump; the solver itself finds the
	// stage to BackwaterStageTolerance, far inside it.
	BalanceTolerance = 1e-9
	// ChannelLengthMismatch is the relative difference between a given
	// channel flow length and the difference of the sections' distances
	// above which a warning is given (project default).
	ChannelLengthMismatch = 0.01
	// OverbankLengthRatio bounds the ratio of an overbank flow length to
	// the difference of the sections' distances, either way, beyond which
	// a warning is given: an overbank path may be shorter than the channel
	// across a bend or longer around it, but twice or half the distance
	// more often means a slip in the table (project default).
	OverbankLengthRatio = 2.0
)

// Row flags of a backwater rating table (rating.Row.Flags), beside those
// of package rating.
const (
	// FlagCriticalStage: no subcritical stage balances the energy
	// equation at the section; the stage is critical depth.
	FlagCriticalStage = "critical_stage"
	// FlagUnsettled: the discharge's profile and its check profiles
	// differ at the section by more than the spread tolerance: the
	// boundary is not yet forgotten there.
	FlagUnsettled = "unsettled"
)

// Errors of the step-backwater computation, for errors.Is.
var (
	ErrBackwaterSections = errors.New("a step-backwater reach needs two or more sections")
	ErrClosedConduit     = errors.New("a closed conduit (a culvert or pipe) is not an open channel: " +
		"flow through structures is refused, not approximated")
	ErrDischarge      = errors.New("discharge must be a positive, finite number")
	ErrNoDischarges   = errors.New("no discharges to compute")
	ErrEddyK          = errors.New("eddy-loss coefficient must be a number from 0 to 1")
	ErrFlowLength     = errors.New("flow lengths must be finite and zero (not given: the distance) or more")
	ErrRatingSection  = errors.New("no section of the reach has this id")
	ErrNoMarks        = errors.New("no section of the reach has a high-water mark")
	ErrNoBackwaterFit = errors.New("no stage balances the energy equation")
)

// BackwaterOptions configure a step-backwater computation. The zero value
// is the default of every field.
type BackwaterOptions struct {
	// Units is the unit system of every input and result (default SI).
	Units rating.Units
	// Geometry controls pockets and end extension of every section.
	Geometry subdivide.Options
	// Expansion is the eddy-loss coefficient where the velocity head falls
	// downstream (the flow expands): zero means ExpandingEddyK (0.5), a
	// negative value none; at most 1.
	Expansion float64
	// Contraction is the coefficient where the velocity head rises
	// downstream: zero or negative means ContractingEddyK (0), none; at
	// most 1.
	Contraction float64
	// At is the id of the section whose stages make the rating; "" means
	// the upstream section.
	At string
	// SpreadTolerance is the largest spread of a rating read without a
	// warning (length unit); zero means SpreadToleranceSI or
	// SpreadToleranceUS.
	SpreadTolerance float64
	// Second is the boundary of the second profile of every discharge;
	// nil means critical depth, or RaisedStartFactor times the first
	// start's depth where that start is itself critical.
	Second *Boundary
}

func (o BackwaterOptions) eddy() (exp, con float64, err error) {
	exp, con = o.Expansion, o.Contraction
	switch {
	case exp == 0:
		exp = ExpandingEddyK
	case exp < 0:
		exp = 0
	}
	if con < 0 {
		con = 0
	}
	if !(exp <= 1) || !(con <= 1) {
		return exp, con, fmt.Errorf("%w: expansion %v, contraction %v", ErrEddyK, o.Expansion, o.Contraction)
	}
	return exp, con, nil
}

func (o BackwaterOptions) spreadTolerance() float64 {
	return givenOr(o.SpreadTolerance, o.Units, SpreadToleranceSI, SpreadToleranceUS)
}

// Backwater is the result of a step-backwater computation: a water-surface
// profile through the reach for every discharge, and the rating they give
// at one section. Lengths, stages and discharges are in Units.
type Backwater struct {
	// Units is the unit system of every value.
	Units rating.Units
	// Boundary is the downstream boundary as given; SecondBoundary says
	// how the second profile of every discharge started.
	Boundary       Boundary
	SecondBoundary string
	// Expansion and Contraction are the eddy-loss coefficients used.
	Expansion, Contraction float64
	// Profiles holds one profile per discharge, in the order given.
	Profiles []SurfaceProfile
	// Rating is the stage of every discharge at the rating section.
	Rating BackwaterRating
	// Warnings are facts a reviewer should see.
	Warnings []string
}

// SurfaceProfile is the water-surface profile of one discharge.
type SurfaceProfile struct {
	// Discharge is the steady discharge through the reach.
	Discharge float64
	// Start and SecondStart are the stages at the last section from which
	// the profile and its second (the convergence check) were computed;
	// StartCritical and SecondCritical report starts at critical depth.
	Start, SecondStart            float64
	StartCritical, SecondCritical bool
	// Sections holds each section's hydraulics, upstream first.
	Sections []ProfileSection
	// Warnings are facts about this profile.
	Warnings []string
	// HalfwayStart is the stage half-way between Start and SecondStart
	// from which the third profile was computed; where that stage is
	// supercritical, the first subcritical stage nearer Start found by
	// halving its distance from Start (HalfwayTries), or Start itself,
	// warned, where there is none.
	HalfwayStart float64
}

// ProfileSection is one section of a water-surface profile.
type ProfileSection struct {
	ID string
	// Distance is the position along the channel, Bottom the lowest
	// ground (length unit).
	Distance, Bottom float64
	// WaterSurface is the stage; VelocityHead α·V²/(2g); EnergyGrade
	// their sum (length unit). Froude is √(α·Q²·T/(g·A³)).
	WaterSurface, EnergyGrade, VelocityHead, Froude float64
	// Area (length unit squared), TopWidth (length unit), Conveyance
	// (discharge unit) and Alpha (the energy coefficient) at the stage.
	Area, TopWidth, Conveyance, Alpha float64
	// Critical reports that no subcritical stage balances the energy
	// equation here (or that the profile starts at critical depth): the
	// stage is critical depth.
	Critical bool
	// Residual is the energy equation's upstream energy minus downstream
	// energy and losses at the stage (length unit): zero to rounding,
	// except at a critical stage and where Jump is set; zero at the last
	// section. Jump reports a stage at which the section's hydraulics jump
	// (a pocket joins the flow, level ground is wetted all at once) and
	// the equation changes sign without passing through zero: the stage is
	// that of the jump, and the residual is more than BalanceTolerance of
	// the specific energy.
	Residual float64
	Jump     bool
	// SecondWaterSurface and HalfwayWaterSurface are the stages of the
	// second and half-way profiles, and Spread the larger of
	// |WaterSurface − SecondWaterSurface| and |WaterSurface −
	// HalfwayWaterSurface| (length unit).
	SecondWaterSurface, HalfwayWaterSurface, Spread float64
	// Length is the subreach length to the next section downstream,
	// weighted by conveyance where flow lengths are given; FrictionLoss
	// Q²·Length/(K·Kdown) and EddyLoss k·|Δ velocity head| the losses over
	// it (length unit; zero at the last section). Expanding reports a
	// velocity head falling downstream, where the expansion coefficient
	// applied.
	Length, FrictionLoss, EddyLoss float64
	Expanding                      bool
}

// BackwaterRating is the stage–discharge relation computed at one
// section: the rating a gauge there would have if the reach is as
// surveyed.
type BackwaterRating struct {
	// Section is the id of the rating section; Index its position in the
	// reach (0 upstream).
	Section string
	Index   int
	// Tolerance is the spread above which a read is unsettled (length unit).
	Tolerance float64
	// AtBoundary reports a rating section that is the last, where the
	// boundary sets the stage: the reads are the boundary's, and none is
	// Unsettled, since the check starts differ from the boundary there by
	// construction (their Spread is that difference).
	AtBoundary bool
	// Rows holds one read per discharge, in the order given.
	Rows []RatingRead
	// Geometry, GeometryOptions and Units are the section's, for Table.
	Geometry        subdivide.Geometry
	GeometryOptions subdivide.Options
	Units           rating.Units
}

// RatingRead is the stage of one discharge at the rating section.
type RatingRead struct {
	// Discharge and Stage (the first profile's water surface); Spread the
	// difference from the second profile there (length unit).
	Discharge, Stage, Spread float64
	// Critical: the stage is critical depth. Unsettled: Spread exceeds
	// the tolerance at a section upstream of the boundary.
	Critical, Unsettled bool
}

// ComputeBackwater computes water-surface profiles through a reach by the
// standard step method, one for each discharge, from the downstream
// boundary at the last section, and reads the rating at the section
// opt.At. Sections are given upstream first with distances increasing
// downstream. The flow is steady, gradually varied and subcritical.
//
// Between a section d and the next section u upstream the energy equation
//
//	hu + αu·Vu²/2g = hd + αd·Vd²/2g + L·Q²/(Ku·Kd) + k·|αu·Vu²/2g − αd·Vd²/2g|
//
// is solved for the stage hu: friction loss from the geometric mean of the
// two conveyances (the form of the slope-area method), eddy loss with
// k = opt.Expansion where the velocity head falls downstream and
// opt.Contraction where it rises, and α from the subsections. L is the
// distance between the sections or, where Section.FlowLengths are given,
// the flow lengths weighted by the mean of the two sections' conveyance
// fractions (WeightedLength); a section without overbank subsections (no
// bank marks) puts all its conveyance in the channel, and is warned of
// where the subreach's overbank lengths differ from its channel length.
// A boundary StageRating is read linearly between its points unless
// Boundary.StageOf reads it otherwise. The stage is the
// subcritical root: the root above a critical stage of the section, found
// by Brent's method in the highest band of stages in which the flow is
// subcritical and the equation has one (a compound section can have
// several critical stages, and so several bands). Where no such root
// exists the flow passes through critical depth: the stage is the critical
// stage at which the upstream energy exceeds the downstream energy and
// losses the least (never one that falls short of them), and the section
// is marked Critical.
//
// Every discharge is computed three times: from the boundary's stage, from
// a second start (opt.Second; by default critical depth, or 1.3 times the
// first start's depth where that is critical) and from half-way between
// the two. Profiles from different starts converge upstream; the larger
// difference of the two check profiles from the first at each section is
// its Spread, and a rating read where it exceeds the tolerance is
// Unsettled and warned: the reach is too short there for the boundary to
// be forgotten. At the last section, where the profiles start, the rating
// is the boundary itself: its reads are never Unsettled (the starts differ
// there by construction), and a warning says the rating is the
// boundary's (BackwaterRating.AtBoundary). The half-way start guards against a chance agreement: over
// a short reach a profile started from critical depth, with its large
// velocity head and friction loss, can overshoot the first and cross it,
// so that at some discharge the two meet at the rating section although
// neither has forgotten its start; the half-way profile then differs.
// Several trial starting stages are the usual check of convergence
// (common practice).
// A boundary stage in supercritical flow (below critical depth) is
// replaced by critical depth and warned.
//
// Preconditions: two or more sections, each with an open-channel geometry
// (a closed conduit is refused: ErrClosedConduit), distances increasing;
// discharges positive. Errors are *SectionError for a section at fault, or
// wrap ErrBackwaterSections, ErrDischarge, ErrNoDischarges, ErrBoundary,
// ErrBoundaryRange, ErrEddyK or ErrRatingSection.
//
// References:
//
//	Davidian, J., 1984, Computation of water-surface profiles in open
//	channels: U.S. Geological Survey Techniques of Water-Resources
//	Investigations, book 3, chapter A15.
//	Chow, V.T., 1959, Open-Channel Hydraulics: McGraw-Hill, chapter 10
//	(the standard step method).
//	Dalrymple, T., and Benson, M.A., 1967, Measurement of peak discharge
//	by the slope-area method: U.S. Geological Survey Techniques of
//	Water-Resources Investigations, book 3, chapter A2 (eddy-loss
//	coefficients).
func ComputeBackwater(secs []Section, qs []float64, b Boundary, opt BackwaterOptions) (Backwater, error) {
	res := Backwater{Units: opt.Units, Boundary: b}
	if len(qs) == 0 {
		return res, ErrNoDischarges
	}
	for _, q := range qs {
		if !(q > 0) || math.IsInf(q, 0) {
			return res, fmt.Errorf("%w: %v", ErrDischarge, q)
		}
	}
	r, err := newBWRun(secs, b, opt)
	if err != nil {
		return res, err
	}
	res.Expansion, res.Contraction = r.kExp, r.kCon
	res.SecondBoundary = r.secondWords()
	at, err := ratingIndex(secs, opt.At)
	if err != nil {
		return res, err
	}
	res.Profiles = make([]SurfaceProfile, len(qs))
	order := make([]int, len(qs))
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, func(a, b int) int { return compareFloat(qs[a], qs[b]) })
	for _, i := range order {
		p, err := r.profile(qs[i])
		if err != nil {
			return res, fmt.Errorf("discharge %g %s: %w", qs[i], opt.Units.Discharge(), err)
		}
		res.Profiles[i] = p
	}
	res.Rating = r.rating(res.Profiles, at, opt.spreadTolerance())
	res.Warnings = append(r.warnings, r.summary(res.Profiles, res.Rating)...)
	if w := boundaryRatingWarning(secs, at, b, opt.Units); w != "" {
		res.Warnings = append(res.Warnings, w)
	}
	return res, nil
}

// boundaryRatingWarning returns a warning when the rating section at is
// the last, where the boundary sets the stage, and "" otherwise: the
// rating there is the boundary itself, not computed through the reach. A
// known stage is that stage at every discharge (a flat rating, but for
// critical depth where the stage is below it), a stage-discharge boundary
// is returned as given, normal depth is the section's uniform-flow rating
// at the slope given and critical depth its critical stages. The spreads
// there are the check starts' differences from the boundary, by
// construction, and flag no read unsettled; the warning says so.
func boundaryRatingWarning(secs []Section, at int, b Boundary, u rating.Units) string {
	if at != len(secs)-1 {
		return ""
	}
	id := secs[at].ID
	const spreads = "; its spreads are the differences of the check starts from the boundary, not a test of the reach, " +
		"and flag no stage unsettled"
	switch b.Kind {
	case KnownStage:
		return fmt.Sprintf("the rating is at section %s, the last, where the boundary fixes the stage: it is %s for every discharge "+
			"(critical depth where that is higher), not a rating; rate a section upstream%s", id, b.Words(u), spreads)
	case StageRating:
		return fmt.Sprintf("the rating is at section %s, the last, where the boundary sets the stage: it is the boundary's "+
			"stage-discharge rating given back, not computed; rate a section upstream%s", id, spreads)
	case NormalDepth:
		return fmt.Sprintf("the rating is at section %s, the last, where the boundary sets the stage: it is %s "+
			"(the section's uniform-flow rating at that slope, critical depth where that is higher), not computed through the reach; "+
			"rate a section upstream%s", id, b.Words(u), spreads)
	case CriticalDepth:
		return fmt.Sprintf("the rating is at section %s, the last, where the boundary sets the stage: it is the section's critical depth "+
			"at every discharge, not computed through the reach; rate a section upstream%s", id, spreads)
	}
	return ""
}

func compareFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}

// ratingIndex returns the index of the section with id (0 for "").
func ratingIndex(secs []Section, id string) (int, error) {
	if id == "" {
		return 0, nil
	}
	for i, s := range secs {
		if s.ID == id {
			return i, nil
		}
	}
	return 0, fmt.Errorf("%w: %q", ErrRatingSection, id)
}

// WeightedLength returns the length of a subreach whose left-overbank,
// channel and right-overbank flow paths have lengths l, each weighted by
// the mean of its part's conveyance fractions at the two ends:
//
//	L = ½·( Σi li·Kui / Ku  +  Σi li·Kdi / Kd )
//
// with Kui and Kdi the conveyance of part i at the upstream and
// downstream section and Ku, Kd their sums. At one section each part
// carries the share Ki/K of the discharge, so this is the length weighted
// by the mean discharge of each path, Σi li·(Qui + Qdi)/(2Q). A section
// without conveyance is left out of the average; NaN when neither has
// any. A section without overbank parts (no bank marks) has all its
// conveyance in the channel: its half of L is the channel length.
//
// References:
//
//	Davidian, J., 1984, Computation of water-surface profiles in open
//	channels: USGS TWRI, book 3, chap. A15 (the length of a subreach
//	weighted by the discharge of each flow path; from memory).
//	Chow, V.T., 1959, Open-Channel Hydraulics: McGraw-Hill, chapter 10
//	(the standard step method).
func WeightedLength(l, ku, kd subdivide.PerRegion) float64 {
	return weightedLength(l.Array(), ku.Array(), kd.Array())
}

// weightedLength is WeightedLength on values indexed by subdivide.Region.
func weightedLength(l, ku, kd [3]float64) float64 {
	var sum, n float64
	for _, k := range [][3]float64{ku, kd} {
		kt := k[0] + k[1] + k[2]
		if !(kt > 0) {
			continue
		}
		sum += (l[0]*k[0] + l[1]*k[1] + l[2]*k[2]) / kt
		n++
	}
	if n == 0 {
		return math.NaN()
	}
	return sum / n
}
