package rating

import (
	"errors"
	"fmt"
	"math"

	"wetline/subdivide"
)

// DepthTolerance is the accuracy of every stage the inverse solvers
// return, as a fraction of the depth there. The bracketed bisection runs
// to the resolution of float64, far inside it; the constant is what tests
// hold the solvers to.
const DepthTolerance = 1e-6

// ScanSteps is the number of equal stage steps over which the solvers look
// for sign changes and turning points before refining each one. Turning
// points between samples are located by golden-section search, so two
// roots closer together than a step are still found.
const ScanSteps = 200

// MaxSearchDoublings bounds how often the search range of an open section
// is doubled in depth above its top (2^6 = 64 times the section's height)
// while looking for a stage that carries a discharge or holds an area.
const MaxSearchDoublings = 6

// JumpFraction decides whether a bracketed sign change is a jump: when,
// with the bracket narrowed to the resolution of float64, the function
// on both sides is still further from zero than this fraction of its
// values at the ends of the monotonic piece, it jumped past zero.
const JumpFraction = 1e-6

// CriticalBand is the half-width of the band of Froude numbers around 1
// reported as critical flow rather than sub- or supercritical (common
// practice: flow within a few tenths of a percent of critical is unstable
// and is called critical).
const CriticalBand = 0.005

// Errors of the inverse solvers, for errors.Is.
var (
	ErrNoRoot        = errors.New("no stage in the section's range")
	ErrTarget        = errors.New("target must be a positive, finite number")
	ErrNoFreeSurface = errors.New("no free surface (a conduit flowing full)")
)

// Root is one stage at which a solver's condition holds.
type Root struct {
	// Stage is the water-surface elevation; Depth is Stage minus the
	// lowest point.
	Stage, Depth float64
	// Rising tells the branch: true where the quantity solved for
	// (discharge, area, section factor) grows with stage, false on a
	// falling branch, such as a conduit between its peak discharge near
	// 0.94 D and full flow.
	Rising bool
	// Jump reports a stage where the quantity jumps past the target
	// instead of passing through it: ground lying level exactly at the
	// stage (a flat floodplain) is wetted all at once. Stage is then the
	// stage of the jump.
	Jump bool
}

// Branch names the root's branch: "rising" or "falling".
func (r Root) Branch() string {
	if r.Rising {
		return "rising"
	}
	return "falling"
}

// EnergyPoint is a specific energy at a stage.
type EnergyPoint struct {
	Stage, Depth float64
	// Energy is the specific energy y + αV²/2g (length unit).
	Energy float64
}

// stageFunc is a function of stage whose roots a solver finds.
type stageFunc func(h float64) (float64, error)

// solver evaluates hydraulics of one geometry.
type solver struct {
	g   subdivide.Geometry
	opt Options
}

func newSolver(g subdivide.Geometry, opt Options) solver {
	return solver{g: CompositeGeometry(g, opt.Composite), opt: opt}
}

// row returns the hydraulics at stage h; without a slope, slope 1 is used
// (α, β, geometry and conveyance do not depend on it).
func (s solver) row(h float64) (Row, error) {
	w, err := s.g.At(h, s.opt.Geometry)
	if err != nil {
		return Row{}, err
	}
	slope := s.opt.Slope
	if !(slope > 0) {
		slope = 1
	}
	return Hydraulics(w, s.g.Bottom(), slope, s.opt.Units)
}

// closed reports whether the geometry is a closed conduit (full at its top).
func (s solver) closed() (bool, error) {
	w, err := s.g.At(s.g.Top(), s.opt.Geometry)
	if err != nil {
		return false, err
	}
	return w.Full, nil
}

// ceiling returns stage h, or the section's top where the geometry
// refuses h: above the crown of a closed conduit, or above an end of a
// survey with Options.NoExtend (subdivide.ErrAboveEnds). A scan or probe
// that would go above the top stops there instead.
func (s solver) ceiling(h float64) (float64, error) {
	top := s.g.Top()
	if !(h > top) {
		return h, nil
	}
	if closed, err := s.closed(); err != nil || closed {
		return top, err
	}
	if _, err := s.g.At(h, s.opt.Geometry); errors.Is(err, subdivide.ErrAboveEnds) {
		return top, nil
	} else if err != nil {
		return h, err
	}
	return h, nil
}

// searchRange returns the stage range to search: from the bottom to the
// crown of a closed conduit, else to the top of the section, doubled in
// depth (at most MaxSearchDoublings times, and never where the geometry
// refuses the stage, as a survey does with Options.NoExtend) until
// reached(hi) holds.
func (s solver) searchRange(reached func(h float64) (bool, error)) (lo, hi float64, err error) {
	lo, hi = s.g.Bottom(), s.g.Top()
	closed, err := s.closed()
	if err != nil || closed {
		return lo, hi, err
	}
	if !(hi > lo) {
		hi = lo + 1
	}
	ok, err := reached(hi)
	for k := 0; err == nil && !ok && k < MaxSearchDoublings; k++ {
		next := lo + 2*(hi-lo)
		ok, err = reached(next)
		if errors.Is(err, subdivide.ErrAboveEnds) {
			return lo, hi, nil
		}
		hi = next
	}
	return lo, hi, err
}

// findRoots returns every stage in [lo, hi] where f is zero, ascending.
// f is sampled at ScanSteps+1 stages; each turning point between samples
// is located by golden-section search, splitting the range into pieces on
// which f is monotonic; each piece whose ends differ in sign is bisected.
func findRoots(f stageFunc, lo, hi float64) ([]Root, error) {
	type pt struct{ h, v float64 }
	pts := make([]pt, 0, ScanSteps+8)
	for i := 0; i <= ScanSteps; i++ {
		h := lo + (hi-lo)*float64(i)/ScanSteps
		if i == ScanSteps {
			h = hi
		}
		v, err := f(h)
		if err != nil {
			return nil, err
		}
		pts = append(pts, pt{h, v})
	}
	all := make([]pt, 0, len(pts)+4)
	for i, p := range pts {
		all = append(all, p)
		if i == 0 || i == len(pts)-1 {
			continue
		}
		d1, d2 := p.v-pts[i-1].v, pts[i+1].v-p.v
		if d1*d2 < 0 {
			h, v, err := GoldenSection(f, pts[i-1].h, pts[i+1].h, d1 > 0)
			if err != nil {
				return nil, err
			}
			if h < p.h {
				all = append(all[:len(all)-1], pt{h, v}, p)
			} else if h > p.h {
				// Inserted after p, before the next sample.
				all = append(all, pt{h, v})
			}
		}
	}
	var roots []Root
	add := func(h float64, rising, jump bool) {
		if n := len(roots); n > 0 && roots[n-1].Stage == h {
			return
		}
		roots = append(roots, Root{Stage: h, Depth: h - lo, Rising: rising, Jump: jump})
	}
	for i := 0; i+1 < len(all); i++ {
		a, b := all[i], all[i+1]
		if !(b.h > a.h) {
			continue
		}
		switch {
		case a.v == 0:
			add(a.h, b.v > a.v, false)
		case b.v == 0:
			// Taken as the left end of the next piece, or below at the end.
		case (a.v < 0) != (b.v < 0) && !math.IsNaN(a.v) && !math.IsNaN(b.v):
			h, left, right, err := bisect(f, a.h, b.h, a.v, b.v)
			if err != nil {
				return nil, err
			}
			scale := math.Abs(a.v) + math.Abs(b.v)
			jump := math.Min(math.Abs(left), math.Abs(right)) > JumpFraction*scale
			add(h, b.v > a.v, jump)
		}
	}
	if last := all[len(all)-1]; last.v == 0 {
		add(last.h, len(all) > 1 && last.v > all[len(all)-2].v, false)
	}
	return roots, nil
}

// bisect refines a root of f bracketed by [a, b] (fa = f(a), fb = f(b) of
// the other sign) to the resolution of float64. It returns the root and
// the values of f at the ends of the final bracket.
func bisect(f stageFunc, a, b, fa, fb float64) (h, left, right float64, err error) {
	for i := 0; i < 200; i++ {
		m := a + (b-a)/2
		if !(m > a && m < b) {
			break
		}
		fm, err := f(m)
		if err != nil {
			return m, fa, fb, err
		}
		if fm == 0 {
			return m, 0, 0, nil
		}
		if (fm < 0) == (fa < 0) {
			a, fa = m, fm
		} else {
			b, fb = m, fm
		}
	}
	// The end nearer zero is the root (a jump lies at its far side).
	if math.Abs(fb) < math.Abs(fa) {
		return b, fa, fb, nil
	}
	return a, fa, fb, nil
}

// GoldenSection finds the maximum (max true) or the minimum of f on
// [a, b] by golden-section search, to the resolution of float64: the
// stage h (length unit) and f there. f must be unimodal on [a, b]; its
// first error ends the search and is returned.
//
// References:
//
//	Press, W.H., and others (2007), Numerical Recipes, 3rd ed., section 10.2.
func GoldenSection(f func(h float64) (float64, error), a, b float64, max bool) (h, v float64, err error) {
	sign := 1.0
	if max {
		sign = -1
	}
	g := func(x float64) (float64, error) {
		y, err := f(x)
		return sign * y, err
	}
	const r = 0.6180339887498949 // (√5 − 1)/2
	c, d := b-r*(b-a), a+r*(b-a)
	fc, err := g(c)
	if err != nil {
		return 0, 0, err
	}
	fd, err := g(d)
	if err != nil {
		return 0, 0, err
	}
	for i := 0; i < 200 && c < d; i++ {
		if fc < fd {
			b, d, fd = d, c, fc
			c = b - r*(b-a)
			if fc, err = g(c); err != nil {
				return 0, 0, err
			}
		} else {
			a, c, fc = c, d, fd
			d = a + r*(b-a)
			if fd, err = g(d); err != nil {
				return 0, 0, err
			}
		}
		if !(b-a > 0) || b-a <= 4*math.Abs(a+b)*0x1p-52 {
			break
		}
	}
	if fc < fd {
		return c, sign * fc, nil
	}
	return d, sign * fd, nil
}

func checkTarget(v float64, what string) error {
	if !(v > 0) || math.IsInf(v, 0) {
		return fmt.Errorf("%s %v: %w", what, v, ErrTarget)
	}
	return nil
}

// NormalStages returns every stage at which geometry g carries discharge q
// in uniform flow at friction slope opt.Slope (Manning's equation with the
// subdivided conveyance of Hydraulics): the normal stage. Most sections
// have one; a closed conduit between full flow and its peak discharge has
// two (the lower on the rising branch, the upper on the falling branch),
// and a compound section merged into one subsection just above bankfull
// can have several. Roots are ascending, each to DepthTolerance.
//
// Stages above an open section's top are searched as Geometry.At extends
// it (built shapes exactly; surveys with vertical walls at the ends).
//
// Preconditions: opt.Slope positive and finite (else ErrSlope); q
// positive and finite (else ErrTarget). A discharge no stage carries is
// ErrNoRoot.
//
// References:
//
//	Chow, V.T., 1959, Open-Channel Hydraulics: McGraw-Hill, chapter 6
//	(uniform flow; section 6-4, the conveyance of a subdivided section).
func NormalStages(g subdivide.Geometry, q float64, opt Options) ([]Root, error) {
	if !(opt.Slope > 0) || math.IsInf(opt.Slope, 0) {
		return nil, fmt.Errorf("slope %v: %w", opt.Slope, ErrSlope)
	}
	if err := checkTarget(q, "discharge"); err != nil {
		return nil, err
	}
	s := newSolver(g, opt)
	f := func(h float64) (float64, error) {
		r, err := s.row(h)
		return r.Discharge - q, err
	}
	return s.solve(f, func(h float64) (bool, error) { v, err := f(h); return v >= 0, err },
		target{what: fmt.Sprintf("discharge %g %s", q, opt.Units.Discharge()), name: "discharge", verb: "carries", unit: opt.Units.Discharge(),
			amount: func(h float64) (float64, error) { r, err := s.row(h); return r.Discharge, err }})
}

// target is what a solver looks for, for its messages: its description
// (what), and, for a quantity that grows with stage, its name, the verb
// of the section having it, and how much the section has at a stage
// (amount, nil for none) in unit.
type target struct {
	what, name, verb string
	amount           func(h float64) (float64, error)
	unit             string
}

// solve searches the range and returns all roots of f, or ErrNoRoot.
func (s solver) solve(f stageFunc, reached func(float64) (bool, error), t target) ([]Root, error) {
	lo, hi, err := s.searchRange(reached)
	if err != nil {
		return nil, err
	}
	roots, err := findRoots(f, lo, hi)
	if err != nil {
		return nil, err
	}
	if len(roots) == 0 {
		return nil, s.noRoot(t, lo, hi)
	}
	return roots, nil
}

// noRoot is the ErrNoRoot of a search from lo to hi for t: it names the
// range honestly (the section's own top, and how far above it the search
// went between vertical walls at its ends) and, for a quantity, what the
// section gives at its top and at the highest stage searched.
func (s solver) noRoot(t target, lo, hi float64) error {
	u := s.opt.Units.Length()
	top := s.g.Top()
	closed, _ := s.closed()
	above := "between the walls"
	walls := false
	if w, err := s.g.At(hi, s.opt.Geometry); err == nil && hi > top {
		walls = w.ExtendedLeft > 0 || w.ExtendedRight > 0
	}
	if !walls {
		above = "with the shape continued"
	}
	var where string
	switch {
	case closed:
		where = fmt.Sprintf("searched from the invert, %g %s, to the crown, %g %s", lo, u, top, u)
	case hi > top && walls:
		where = fmt.Sprintf("searched from the lowest point, %g %s, to the section's top, %g %s, and on above it between vertical walls raised at its ends up to %g %s",
			lo, u, top, u, hi, u)
	case hi > top:
		where = fmt.Sprintf("searched from the lowest point, %g %s, to the section's top, %g %s, and on above it, the shape continued, up to %g %s",
			lo, u, top, u, hi, u)
	default:
		where = fmt.Sprintf("searched from the lowest point, %g %s, to the section's top, %g %s (no stage above its ends is computed)", lo, u, top, u)
	}
	if t.amount != nil {
		atTop, err1 := t.amount(top)
		atHi, err2 := t.amount(hi)
		switch {
		case err1 != nil || err2 != nil:
		case hi > top:
			where += fmt.Sprintf("; the %s is more than the section %s at its top (%.4g %s) and at %g %s %s (%.4g %s)",
				t.name, t.verb, atTop, t.unit, hi, u, above, atHi, t.unit)
		default:
			where += fmt.Sprintf("; the %s is more than the section %s at its top (%.4g %s)", t.name, t.verb, atTop, t.unit)
		}
	}
	return fmt.Errorf("%s: %w: %s", t.what, ErrNoRoot, where)
}

// StageForArea returns the stage (elevation, length unit) at which
// geometry g holds flow area a > 0 (area unit), to DepthTolerance of its
// depth. Area never falls as the stage rises, so there is one root; on
// ground lying level exactly at the stage the area jumps, and the root is
// the stage of the jump (Root.Jump). Errors: ErrTarget for a not positive
// and finite, ErrNoRoot for an area the section (extended up to
// MaxSearchDoublings times its depth, or to a conduit's crown) cannot
// hold.
//
// References:
//
//	Chow, V.T. (1959), Open-Channel Hydraulics, McGraw-Hill, section 2-3
//	(geometric elements of channel sections).
func StageForArea(g subdivide.Geometry, a float64, opt Options) (Root, error) {
	if err := checkTarget(a, "area"); err != nil {
		return Root{}, err
	}
	s := newSolver(g, opt)
	f := func(h float64) (float64, error) {
		w, err := s.g.At(h, opt.Geometry)
		return w.Area - a, err
	}
	roots, err := s.solve(f, func(h float64) (bool, error) { v, err := f(h); return v >= 0, err },
		target{what: fmt.Sprintf("area %g %s", a, opt.Units.Area()), name: "area", verb: "holds", unit: opt.Units.Area(),
			amount: func(h float64) (float64, error) { w, err := s.g.At(h, opt.Geometry); return w.Area, err }})
	if err != nil {
		return Root{}, err
	}
	return roots[0], nil
}

// sectionFactor returns ln(g·A³/(α·T·q²)), which is −2·ln F: zero at
// critical flow, −Inf when dry and +Inf at a full conduit's zero top width.
func (s solver) sectionFactor(h, q float64) (float64, Row, error) {
	r, err := s.row(h)
	if err != nil {
		return 0, r, err
	}
	switch {
	case !(r.Area > 0):
		return math.Inf(-1), r, nil
	case !(r.TopWidth > 0):
		return math.Inf(1), r, nil
	}
	alpha := r.Alpha
	if math.IsNaN(alpha) {
		alpha = 1
	}
	g := s.opt.Units.Gravity()
	return math.Log(g * r.Area * r.Area * r.Area / (alpha * r.TopWidth * q * q)), r, nil
}

// CriticalStages returns every stage at which discharge q is critical in
// geometry g, where the Froude number with the energy coefficient α of
// Hydraulics is 1:
//
//	α·Q²·T / (g·A³) = 1
//
// (Chow, 1959, section 4-2 and eq. 4-4). In a prismatic section there is
// one; in a compound section α jumps above bankfull and there can be two
// or three (Blalock & Sturm, 1981, J. Hydraulics Div. ASCE 107(HY6)). The
// range searched (criticalRange) reaches the stage at which all the
// ground is wet, above the lower end where the flow spreads over ground
// behind it, and goes on above between the walls at the ends until a
// bound holds every higher stage subcritical; a conduit is searched to
// its crown, and a survey with Options.NoExtend to its top. The range
// is scanned for sign changes and each is refined. Rising is
// true where the Froude number falls as stage rises (a minimum of specific
// energy).
//
// Preconditions: q positive and finite (else ErrTarget). A section in
// which q is nowhere critical is ErrNoRoot.
//
// References:
//
//	Chow, V.T., 1959, Open-Channel Hydraulics: McGraw-Hill, section 4-2.
//	Blalock, M.E., and Sturm, T.W., 1981, Minimum specific energy in
//	compound open channel: Journal of the Hydraulics Division, ASCE,
//	107(HY6) (cited from memory).
func CriticalStages(g subdivide.Geometry, q float64, opt Options) ([]Root, error) {
	if err := checkTarget(q, "discharge"); err != nil {
		return nil, err
	}
	s := newSolver(g, opt)
	f := func(h float64) (float64, error) {
		v, _, err := s.sectionFactor(h, q)
		return v, err
	}
	lo, wet, hi, err := s.criticalRange(groundPoints(g), q)
	if err != nil {
		return nil, err
	}
	roots, err := findRoots(f, lo, wet)
	if err != nil {
		return nil, err
	}
	if hi > wet {
		// Above the stage at which all the ground is under water the
		// section is smooth: scanned on its own, in as many steps.
		upper, err := findRoots(f, wet, hi)
		if err != nil {
			return nil, err
		}
		for _, r := range upper {
			r.Depth = r.Stage - lo
			if n := len(roots); n > 0 && roots[n-1].Stage == r.Stage {
				continue
			}
			roots = append(roots, r)
		}
	}
	if len(roots) == 0 {
		return nil, s.noRoot(target{what: fmt.Sprintf("critical flow of %g %s", q, opt.Units.Discharge())}, lo, hi)
	}
	return roots, nil
}

// criticalRange returns the stages between which CriticalStages looks
// for the critical stages of q: from the lowest point lo to hi, the
// range split at wet. A closed conduit is searched to its crown (wet and
// hi both the crown), and a section whose geometry refuses a stage above
// its top (Options.NoExtend) to its top. Otherwise wet is the stage at
// which all the ground is under water: the highest point of the ground
// line pts (at least the higher end), or the top where pts is nil. Below
// it a stretch of the section may carry no water at the lower end's
// stage and join the flow above it, so the Froude number can pass 1
// again there however it stands at the lower end. Above wet nothing new
// is wetted: the top width is constant between the vertical walls raised
// at the ends, or, with a built shape's sides continued, grows linearly
// with stage at rate s. There the search goes on, doubling the depth at
// most MaxSearchDoublings times, until at hi
//
//	g·A·a²/T > Q²,  with  T² ≥ A·s,
//
// where a is the least area of the subsections of positive width. That
// bound holds q subcritical at every stage above hi: with vᵢ = Kᵢ/Aᵢ,
// α·Q²·T/(g·A³) = 1 means Q² = g·A·K³/(T·ΣAᵢvᵢ³), and ΣAᵢvᵢ³ ≤ v²max·K and
// K ≥ a·vmax give Q² ≥ g·A·a²/T; no subsection's area falls as the stage
// rises, and A/T does not fall when T² ≥ A·s, so the bound never falls
// above hi (Chow, 1959, section 4-2, for the critical condition; the
// bound is this package's).
func (s solver) criticalRange(pts []subdivide.Point, q float64) (lo, wet, hi float64, err error) {
	lo, top := s.g.Bottom(), s.g.Top()
	closed, err := s.closed()
	if err != nil || closed {
		return lo, top, top, err
	}
	want := s.allWet(pts)
	if wet, err = s.ceiling(want); err != nil || wet < want {
		return lo, wet, wet, err
	}
	hi = wet
	for k := 0; k <= MaxSearchDoublings; k++ {
		next := lo + 2*(hi-lo)
		up, err := s.ceiling(next)
		if err != nil {
			return lo, wet, hi, err
		}
		clear, err := s.subcriticalAbove(hi, next, q)
		if err != nil || clear || up < next || k == MaxSearchDoublings {
			return lo, wet, hi, err
		}
		hi = next
	}
	return lo, wet, hi, nil
}

// allWet returns the stage at which all the ground of ground line pts
// is under water: its highest point, at least the top (the lower end),
// and the top where pts is nil (a built shape's top is its highest
// point). A section of no height is given one length unit.
func (s solver) allWet(pts []subdivide.Point) float64 {
	lo, wet := s.g.Bottom(), s.g.Top()
	for _, p := range pts {
		wet = math.Max(wet, p.Elevation)
	}
	if !(wet > lo) {
		wet = lo + 1
	}
	return wet
}

// subcriticalAbove reports whether the bound of criticalRange holds q
// subcritical at every stage above h, with the top width's rate of growth
// above h taken from the stages h and next above it.
func (s solver) subcriticalAbove(h, next, q float64) (bool, error) {
	r, err := s.row(h)
	if err != nil {
		return false, err
	}
	w, err := s.g.At(next, s.opt.Geometry)
	if errors.Is(err, subdivide.ErrAboveEnds) {
		// No stage above h is computed: nothing there to be critical.
		return true, nil
	}
	if err != nil {
		return false, err
	}
	if !(r.Area > 0) || !(r.TopWidth > 0) {
		return false, nil
	}
	least := math.Inf(1)
	for _, sub := range r.Subs {
		if sub.To > sub.From {
			least = math.Min(least, sub.Area)
		}
	}
	rate := math.Max(0, (w.TopWidth-r.TopWidth)/(next-h))
	if !(least > 0) || math.IsInf(least, 1) || r.TopWidth*r.TopWidth < r.Area*rate {
		return false, nil
	}
	return s.opt.Units.Gravity()*r.Area*least*least/r.TopWidth > q*q, nil
}

// CriticalDischarge returns the discharge that is critical at a stage,
// Qc = √(g·A³/(α·T)). It is ErrNoFreeSurface for a conduit flowing full
// and 0 for a dry stage.
func CriticalDischarge(g subdivide.Geometry, stage float64, opt Options) (float64, error) {
	s := newSolver(g, opt)
	r, err := s.row(stage)
	if err != nil {
		return 0, err
	}
	if !(r.Area > 0) {
		return 0, nil
	}
	if !(r.TopWidth > 0) {
		return 0, fmt.Errorf("stage %g: %w", stage, ErrNoFreeSurface)
	}
	alpha := r.Alpha
	if math.IsNaN(alpha) {
		alpha = 1
	}
	return math.Sqrt(opt.Units.Gravity() * r.Area * r.Area * r.Area / (alpha * r.TopWidth)), nil
}

// SpecificEnergy returns E = y + α·V²/(2g) for discharge q at a stage,
// with y the depth above the lowest point and V = q/A (Chow, 1959,
// section 3-2). It is +Inf at a dry stage.
func SpecificEnergy(g subdivide.Geometry, stage, q float64, opt Options) (float64, error) {
	return newSolver(g, opt).energy(stage, q)
}

func (s solver) energy(h, q float64) (float64, error) {
	r, err := s.row(h)
	if err != nil {
		return 0, err
	}
	if !(r.Area > 0) {
		return math.Inf(1), nil
	}
	alpha := r.Alpha
	if math.IsNaN(alpha) {
		alpha = 1
	}
	v := q / r.Area
	return r.Depth + alpha*v*v/(2*s.opt.Units.Gravity()), nil
}

// MinSpecificEnergy returns the stage and value of the least specific
// energy of discharge q in g. With α constant the minimum lies at the
// critical depth (Chow, 1959, section 3-2); where α varies with stage the
// energy itself is minimised: the range up to the highest critical stage
// (doubled in depth, or to the stage at which all the ground is wet when
// that is lower but at least a quarter of that depth above it) is
// scanned and each local
// minimum refined by golden-section search; the least is returned. The
// scan never goes above the top where the geometry refuses such a stage
// (a conduit's crown, a survey with Options.NoExtend): it stops there.
//
// References:
//
//	Chow, V.T., 1959, Open-Channel Hydraulics: McGraw-Hill, section 3-2
//	(specific energy and critical depth).
func MinSpecificEnergy(g subdivide.Geometry, q float64, opt Options) (EnergyPoint, error) {
	best, _, err := scanSpecificEnergy(g, q, opt)
	return best, err
}

// SpecificEnergyMinima returns every local minimum of the specific energy
// of discharge q in g, in stage order, found as MinSpecificEnergy finds
// them (a scan of the range up to the highest critical stage, doubled in
// depth, and at most to the top where the geometry refuses a stage above
// it, each local minimum refined by golden-section search). Where α is
// constant each lies at a critical stage; where α changes with stage (a
// compound section) a minimum can lie off every critical stage, since
// dE/dh = 1 − α·Q²·T/(g·A³) − (Q²/2gA²)·dα/dh. Errors are those of
// MinSpecificEnergy.
//
// References:
//
//	Chow, V.T., 1959, Open-Channel Hydraulics: McGraw-Hill, section 3-2
//	(specific energy and critical depth).
//	Blalock, M.E., and Sturm, T.W., 1981, Minimum specific energy in
//	compound open channel: Journal of the Hydraulics Division, ASCE,
//	107(HY6) (cited from memory).
func SpecificEnergyMinima(g subdivide.Geometry, q float64, opt Options) ([]EnergyPoint, error) {
	_, minima, err := scanSpecificEnergy(g, q, opt)
	return minima, err
}

// scanSpecificEnergy returns the least specific energy of q in g (see
// MinSpecificEnergy) and the local minima the scan refined, in stage
// order, one per minimum.
func scanSpecificEnergy(g subdivide.Geometry, q float64, opt Options) (EnergyPoint, []EnergyPoint, error) {
	crit, err := CriticalStages(g, q, opt)
	if err != nil {
		return EnergyPoint{}, nil, err
	}
	s := newSolver(g, opt)
	lo := s.g.Bottom()
	// Up to twice the depth of the highest critical stage, and never to
	// less than a quarter of that depth above it: a minimum at that stage
	// must lie inside the scan, which finds only interior minima, even
	// when it stands in the walls above the section's ends. Within that,
	// on up to the stage at which all the ground is wet (allWet), where a
	// stretch joining the flow can change α. Where the geometry refuses a
	// stage above its top (a conduit's crown, a survey with
	// Options.NoExtend) the scan stops at the top, and a minimum in its
	// last step is looked for there (below).
	hc := crit[len(crit)-1].Stage
	want := math.Min(lo+2*(hc-lo), math.Max(hc+(hc-lo)/4, s.allWet(groundPoints(g))))
	hi, err := s.ceiling(want)
	if err != nil {
		return EnergyPoint{}, nil, err
	}
	e := func(h float64) (float64, error) { return s.energy(h, q) }
	best := EnergyPoint{Energy: math.Inf(1)}
	var minima []EnergyPoint
	consider := func(h, v float64) {
		if v < best.Energy {
			best = EnergyPoint{Stage: h, Depth: h - lo, Energy: v}
		}
	}
	step := (hi - lo) / ScanSteps
	// add keeps a refined local minimum; a flat bottom can satisfy two
	// overlapping triples: one point is kept per minimum, the lower.
	add := func(hm, vm float64) {
		consider(hm, vm)
		pt := EnergyPoint{Stage: hm, Depth: hm - lo, Energy: vm}
		switch n := len(minima); {
		case n > 0 && hm-minima[n-1].Stage <= 2*step:
			if vm < minima[n-1].Energy {
				minima[n-1] = pt
			}
		case !math.IsInf(vm, 0):
			minima = append(minima, pt)
		}
	}
	prev := make([]float64, 0, 3)
	hs := make([]float64, 0, 3)
	for i := 0; i <= ScanSteps; i++ {
		h := lo + (hi-lo)*float64(i)/ScanSteps
		if i == ScanSteps {
			h = hi
		}
		v, err := e(h)
		if err != nil {
			return best, minima, err
		}
		consider(h, v)
		prev, hs = append(prev, v), append(hs, h)
		if len(prev) == 3 {
			if prev[1] <= prev[0] && prev[1] <= prev[2] {
				hm, vm, err := GoldenSection(e, hs[0], hs[2], false)
				if err != nil {
					return best, minima, err
				}
				add(hm, vm)
			}
			prev, hs = prev[1:], hs[1:]
		}
	}
	// A scan cut at the top misses a minimum in its last step, where the
	// energy still falls from the last sample but one to the top: refined
	// there, it is a local minimum when it lies below the top by more than
	// the depth tolerance (else the energy falls all the way to the top,
	// whose sample has been considered).
	if hi < want && len(prev) == 2 && prev[1] < prev[0] {
		hm, vm, err := GoldenSection(e, hs[0], hs[1], false)
		if err != nil {
			return best, minima, err
		}
		if hi-hm > DepthTolerance*(hi-lo) {
			add(hm, vm)
		}
	}
	for _, c := range crit {
		v, err := e(c.Stage)
		if err != nil {
			return best, minima, err
		}
		consider(c.Stage, v)
	}
	return best, minima, nil
}

// Flow regimes named by Regime.
const (
	RegimeSubcritical   = "subcritical"
	RegimeCritical      = "critical"
	RegimeSupercritical = "supercritical"
)

// Regime names the flow regime of a Froude number: RegimeCritical within
// CriticalBand of 1, else RegimeSubcritical or RegimeSupercritical; ""
// when the Froude number is undefined (a conduit flowing full). It is the
// one rule of the regime: solve's regime and the rows' FlagSupercritical
// both follow it, so that a stage at critical depth, whose Froude number
// is 1 only to rounding, is never called supercritical.
func Regime(froude float64) string {
	switch {
	case math.IsNaN(froude):
		return ""
	case math.Abs(froude-1) <= CriticalBand:
		return RegimeCritical
	case froude < 1:
		return RegimeSubcritical
	}
	return RegimeSupercritical
}

// PeakDischarge returns the stage and value of the largest discharge at
// slope opt.Slope in the range from the bottom to the top of g: for a
// circular conduit near 0.94 D, above its full-flow discharge. The range
// is scanned and the largest turning point refined by golden-section
// search.
func PeakDischarge(g subdivide.Geometry, opt Options) (stage, q float64, err error) {
	if !(opt.Slope > 0) || math.IsInf(opt.Slope, 0) {
		return 0, 0, fmt.Errorf("slope %v: %w", opt.Slope, ErrSlope)
	}
	s := newSolver(g, opt)
	f := func(h float64) (float64, error) {
		r, err := s.row(h)
		return r.Discharge, err
	}
	lo, hi := s.g.Bottom(), s.g.Top()
	step := (hi - lo) / ScanSteps
	bestH, bestQ := lo, math.Inf(-1)
	for i := 0; i <= ScanSteps; i++ {
		h := lo + float64(i)*step
		if i == ScanSteps {
			h = hi
		}
		v, err := f(h)
		if err != nil {
			return 0, 0, err
		}
		if v > bestQ {
			bestH, bestQ = h, v
		}
	}
	a, b := math.Max(lo, bestH-step), math.Min(hi, bestH+step)
	h, v, err := GoldenSection(f, a, b, true)
	if err != nil {
		return 0, 0, err
	}
	if v > bestQ {
		return h, v, nil
	}
	return bestH, bestQ, nil
}
