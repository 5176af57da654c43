package survey

import (
	"errors"
	"fmt"
	"math"

	"wetline/rating"
	"wetline/subdivide"
)

// ErrRequest is the cause of every error in what was asked of Prepare
// (rather than in the data read): an n override of the wrong length, bank
// stations for a built shape or outside the section, a file and a shape
// at once. Commands report it as a mistake on the command line. The
// messages of such errors say what was asked and why it cannot be done,
// without this sentinel's own words.
var ErrRequest = errors.New("the request cannot be met")

// requestError is an error in what was asked: errors.Is(err, ErrRequest)
// holds, and its message is its cause's alone.
type requestError struct{ err error }

func (e requestError) Error() string        { return e.err.Error() }
func (e requestError) Unwrap() error        { return e.err }
func (e requestError) Is(target error) bool { return target == ErrRequest }

// requestf makes an ErrRequest error; format may wrap with %w.
func requestf(format string, args ...any) error {
	return requestError{fmt.Errorf(format, args...)}
}

// SectionRequest says which section to prepare and how to adjust it. The
// zero value of every override keeps the survey as read.
type SectionRequest struct {
	// Path and Sheet name the survey (Sheet "" is the first visible sheet of a
	// workbook); Path is empty when Shape is given.
	Path, Sheet string
	// Shape is a built section's spec (see subdivide.ParseShape) instead
	// of a survey file.
	Shape string
	// N, when given, replaces the survey's n: one value for the whole
	// section, or three (left overbank, channel, right overbank), which
	// need bank stations.
	N []float64
	// Banks, when given, are the two bank stations (left, right) bounding
	// the main channel; they replace the survey's bank marks.
	Banks []float64
	// Composite is the composite-roughness method applied to the geometry.
	Composite rating.Composite
	// Units is the unit system asked for; with UnitsGiven false the
	// survey's headers decide (and Units is the default when they say
	// nothing), with UnitsGiven true they must agree.
	Units      rating.Units
	UnitsGiven bool
	// Coordinates say how a coordinate survey becomes stations (ignored
	// for a survey by station).
	Coordinates CoordinateOptions
	// Roughless says how the request's answer uses the conveyance of the
	// section: a shape or a survey given no n (no n column, no N) is
	// refused unless Roughless allows it (see RoughUse).
	Roughless RoughUse
	// Book, when set, is the workbook Path names, already open: the
	// sheet is read from it rather than from the file again (see
	// OpenBook).
	Book *OpenBook
}

// RoughUse says what a computation takes from a section's roughness.
type RoughUse int

const (
	// RoughNeeded: Manning's equation is used (a rating, a normal stage,
	// a uniform-flow discharge): n is needed.
	RoughNeeded RoughUse = iota
	// RoughAlphaOnly: only the velocity-distribution coefficient alpha
	// is used (critical flow without a slope). In a shape of one region,
	// or a survey without banks, alpha is 1 whatever n is, so no n is
	// needed; a compound shape or a survey with banks weighs its
	// overbanks by conveyance, so it needs n.
	RoughAlphaOnly
	// RoughUnused: nothing depends on n (a stage for a flow area).
	RoughUnused
)

// Prepared is a section ready for hydraulics.
type Prepared struct {
	// Geometry is the compiled section with the composite method applied.
	Geometry subdivide.Geometry
	// Ground is the section as read after the overrides, with each point's
	// label and note (no points for a closed conduit).
	Ground rating.Ground
	// Survey is the survey as read (zero for a built shape).
	Survey Survey
	// Shape is the built shape (zero value when a survey was read).
	Shape subdivide.Shape
	// Built reports a built shape rather than a survey.
	Built bool
	// NUnset reports a section given no Manning's n, built with unusedN
	// because the request's answer does not depend on n (see RoughUse).
	NUnset bool
	// Units is the unit system of the section (see SectionRequest.Units).
	Units rating.Units
	// Site is the survey's site metadata.
	Site rating.Site
	// Inputs are the files read, never to be written over.
	Inputs []string
	// Warnings are facts about the section a reviewer should see.
	Warnings []string
	// Notes are facts of the inputs that are not warnings, each with its
	// position (how a coordinate survey's stations were made), for the
	// report's inputs (rating.Provenance.Notes).
	Notes []string
}

// Source names the prepared section for messages: its file (and sheet)
// or its shape's spec.
func (p *Prepared) Source() string { return p.Ground.Source }

// Prepare reads the survey (or builds the shape) of req, applies the
// overrides and compiles the geometry. Errors in the data are
// *ParseError or name the survey file; errors in req wrap ErrRequest.
func Prepare(req SectionRequest) (*Prepared, error) {
	if req.Shape != "" || req.Path == "" {
		return prepareShape(req)
	}
	opt := SectionOptions{IgnoreBankMarks: req.Banks != nil, Coordinates: req.Coordinates, NGiven: req.N != nil}
	var sv Survey
	var err error
	if req.Book != nil {
		var t *Table
		if t, err = req.Book.ReadTable(req.Sheet); err == nil {
			sv, err = SectionFromTable(t, opt)
		}
	} else {
		sv, err = ReadSection(req.Path, req.Sheet, opt)
	}
	if err != nil {
		return nil, err
	}
	u, err := sv.Units.Resolve(req.Units, req.UnitsGiven)
	if err != nil {
		return nil, err
	}
	p := &Prepared{Survey: sv, Units: u, Site: sv.Site, Inputs: []string{req.Path}, Warnings: append([]string(nil), sv.Warnings...)}
	p.Notes = sv.InputNotes()
	p.Ground = rating.Ground{Labels: sv.Labels, Notes: sv.Notes, Source: Position(req.Path, req.Sheet)}
	sec := sv.Section
	if req.Banks != nil {
		for _, b := range req.Banks {
			if math.Abs(b) > MaxCoordinate {
				return nil, requestf("bank station %g is beyond ±%g", b, float64(MaxCoordinate))
			}
		}
		if len(req.Banks) != 2 {
			return nil, requestf("bank stations: want two, LEFT,RIGHT; got %d", len(req.Banks))
		}
		sec.HasBanks, sec.LeftBank, sec.RightBank = true, req.Banks[0], req.Banks[1]
	}
	if req.N != nil {
		n, err := regionN(req.N, sec.HasBanks, true)
		if errors.Is(err, ErrNoBanksForN) {
			return nil, fmt.Errorf("%s: %w", p.Ground.Source, err)
		}
		if err != nil {
			return nil, err
		}
		sec.NByRegion = n
		p.Warnings = append(p.Warnings, highN(req.N)...)
	}
	if sec.N == nil && req.N == nil {
		n, err := surveyRoughness(sec, req)
		if err != nil {
			return nil, fmt.Errorf("%s: %w", p.Ground.Source, err)
		}
		sec.NByRegion, p.NUnset = n, true
	}
	g, err := subdivide.Compile(sec)
	if req.Banks != nil && errors.Is(err, subdivide.ErrBanks) {
		return nil, requestf("bank stations %g,%g for %s (stations %g to %g): %w", req.Banks[0], req.Banks[1],
			p.Ground.Source, sec.Points[0].Station, sec.Points[len(sec.Points)-1].Station, subdivide.ErrBanks)
	}
	if err != nil {
		return nil, fmt.Errorf("%s: %w", p.Ground.Source, err)
	}
	p.Ground.Section = sec
	p.Geometry = rating.CompositeGeometry(g, req.Composite)
	return p, nil
}

// Causes of a survey that cannot take what was asked of it.
var (
	// ErrNoN: the survey has no n column and no n was given.
	ErrNoN = errors.New("the survey has no n column: give Manning's n")
	// ErrNoBanksForN: n by region was given for a survey without banks.
	ErrNoBanksForN = errors.New("n by region (LEFT,CHANNEL,RIGHT) needs bank stations: mark two points bank or give them")
)

// Position names a file and sheet as messages do: field.xlsx['XS-2'], or
// the path alone for a CSV file.
func Position(path, sheet string) string {
	if sheet == "" {
		return path
	}
	return (&ParseError{File: path, Sheet: sheet}).Position()
}

// regionN turns one n (the whole section) or three (left, channel,
// right) into n by region; three need banks unless the caller checks.
func regionN(v []float64, hasBanks, needBanks bool) (subdivide.PerRegion, error) {
	for _, n := range v {
		if !(n >= MinN && n <= MaxN) {
			return subdivide.PerRegion{}, requestf("Manning's n %v is not a plausible n (%g to %g)", n, MinN, MaxN)
		}
	}
	switch len(v) {
	case 1:
		return subdivide.Uniform(v[0]), nil
	case 3:
		if needBanks && !hasBanks {
			return subdivide.PerRegion{}, ErrNoBanksForN
		}
		return subdivide.PerRegion{Left: v[0], Channel: v[1], Right: v[2]}, nil
	}
	return subdivide.PerRegion{}, requestf("Manning's n: want one value or three (LEFT,CHANNEL,RIGHT), got %d", len(v))
}

// highN warns of given n values above HighN, as the survey reader does
// for its n column.
func highN(v []float64) []string {
	var out []string
	for _, n := range v {
		if n > HighN {
			out = append(out, fmt.Sprintf("Manning's n %g given is above %.2f: check it", n, HighN))
		}
	}
	return out
}

// prepareShape builds the section of req.Shape.
func prepareShape(req SectionRequest) (*Prepared, error) {
	switch {
	case req.Shape == "":
		return nil, requestf("give a survey file or a built shape")
	case req.Path != "":
		return nil, requestf("give a survey file or a built shape, not both")
	case req.Banks != nil:
		return nil, requestf("bank stations do not apply to a built shape (a compound shape's banks are its channel's top corners)")
	case req.Sheet != "":
		return nil, requestf("a sheet does not apply to a built shape")
	}
	sh, err := subdivide.ParseShape(req.Shape)
	if err != nil {
		return nil, requestf("%w", err)
	}
	n, err := shapeRoughness(sh, req)
	if err != nil {
		return nil, err
	}
	unset := req.N == nil
	g, err := sh.Build(n)
	if err != nil {
		return nil, requestf("%w", err)
	}
	p := &Prepared{Shape: sh, Built: true, NUnset: unset, Units: req.Units, Ground: rating.Ground{Source: sh.String()}, Warnings: highN(req.N)}
	if !sh.Closed() {
		if sec, err := sh.Section(n); err == nil {
			p.Ground.Section = sec
		}
	} else {
		p.Warnings = append(p.Warnings, fmt.Sprintf(
			"closed conduit: at its crown (stage %g %s) it flows full: the wetted perimeter is the whole circumference, the top width is zero and the Froude number is undefined; a stage above the crown is an error",
			g.Top(), req.Units.Length()))
	}
	p.Geometry = rating.CompositeGeometry(g, req.Composite)
	return p, nil
}

// unusedN is the n a built shape is built with when its answer does not
// depend on n (RoughUnused, or RoughAlphaOnly in a shape of one region):
// any positive value gives the same area, width, alpha and critical flow.
const unusedN = 1

// surveyRoughness is the n by region of a survey with no n column and
// no n given, by the rule of shapeRoughness: unusedN where the request's
// answer does not depend on n (RoughUnused; RoughAlphaOnly in a survey
// without banks, one region whose alpha is 1 whatever its n); else
// ErrNoN, saying why n is needed (bank marks split the section into
// channel and overbanks, which alpha weighs by their conveyance).
func surveyRoughness(sec subdivide.Section, req SectionRequest) (subdivide.PerRegion, error) {
	switch {
	case req.Roughless == RoughUnused, req.Roughless == RoughAlphaOnly && !sec.HasBanks:
		return subdivide.Uniform(unusedN), nil
	case req.Roughless == RoughAlphaOnly:
		return subdivide.PerRegion{}, fmt.Errorf("%w, even for critical flow: its banks split it into channel and overbanks, which alpha weighs by their conveyance", ErrNoN)
	}
	return subdivide.PerRegion{}, ErrNoN
}

// shapeRoughness is the n by region of a built shape: the one given (see
// ShapeN), else unusedN where the request's answer does not depend on n;
// else ErrRequest saying why n is needed.
func shapeRoughness(sh subdivide.Shape, req SectionRequest) (subdivide.PerRegion, error) {
	if req.N != nil {
		return ShapeN(sh, req.N)
	}
	switch {
	case req.Roughless == RoughUnused, req.Roughless == RoughAlphaOnly && sh.Kind != subdivide.Compound:
		return subdivide.PerRegion{Left: unusedN, Channel: unusedN, Right: unusedN}, nil
	case req.Roughless == RoughAlphaOnly:
		return subdivide.PerRegion{}, requestf("a compound shape needs Manning's n (--n) even for critical flow: alpha weighs its floodplains by their conveyance")
	}
	return subdivide.PerRegion{}, requestf("a built shape needs Manning's n (--n) for Manning's equation")
}

// ShapeN turns a given n into n by region for a built shape: one value
// (the floodplains of a compound shape taking its floodn key, when
// given), or LEFT,CHANNEL,RIGHT for a compound shape without floodn.
// Errors wrap ErrRequest: three values for another shape, or with floodn,
// which would give the floodplains' n twice.
func ShapeN(sh subdivide.Shape, v []float64) (subdivide.PerRegion, error) {
	if len(v) == 3 && sh.Kind != subdivide.Compound {
		return subdivide.PerRegion{}, requestf("n by region (LEFT,CHANNEL,RIGHT) needs a compound shape; a %s has one n", sh.Kind)
	}
	if len(v) == 3 && sh.FloodN > 0 {
		return subdivide.PerRegion{}, requestf("the shape's floodn=%g and n LEFT,CHANNEL,RIGHT %g,%g,%g both give the floodplains' n: give floodn with one n (the channel's), or the three n alone",
			sh.FloodN, v[0], v[1], v[2])
	}
	return regionN(v, true, false)
}
