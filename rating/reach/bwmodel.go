package reach

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"wetline/rating"
	"wetline/subdivide"
)

// The step-backwater solver asks for a section's hydraulics at thousands
// of trial stages. Solving with Geometry.At each time clips every segment
// of the ground again; this file holds the exact shortcut.
//
// The ground of a surveyed section is piecewise linear, so between two
// consecutive distinct vertex elevations e_j < e_(j+1) nothing changes but
// the depth: every partly wet segment's wetted width and length grow in
// proportion to the stage, and fully wet ones keep theirs. In such a band
// each subsection's top width T and wetted perimeter P are linear in the
// stage h and its area is their integral:
//
//	T(h) = T_j + T'·(h − e_j)
//	P(h) = P_j + P'·(h − e_j)
//	A(h) = A_j + T_j·(h − e_j) + T'·(h − e_j)²/2
//
// with T_j, P_j and A_j the limits just above e_j. This holds with the
// vertical walls added above an end (constant width, perimeter growing
// with depth), in connected-flow mode (pools join only at vertex
// elevations), and above a built open shape's nominal top, whose sides go
// on straight. The coefficients come from the section's own geometry at
// three stages in each band (subdivide.Profile.Sweep, or Geometry.At), so
// the form reproduces At to rounding at every stage: it is exact, not an
// interpolation. Stages exactly at a vertex elevation belong to the band
// below, as At treats ground lying exactly at the stage as dry.
//
// Geometries whose vertices are not known (anything but a surveyed
// *subdivide.Profile, a built *subdivide.Prism, or either with scaled n)
// are evaluated with At at every trial stage.

// bwState is a section's hydraulic state at one stage.
type bwState struct {
	stage float64
	// area and width are the flow area and top width of the section.
	area, width float64
	// k is the conveyance ΣKi; kr its share by subdivide.Region.
	k  float64
	kr [3]float64
	// c is Σ(Ki³/Ai²)/K³ = α/A², so the velocity head of discharge Q is
	// c·Q²/(2g).
	c float64
	// walls reports vertical walls added above an end; pools the number
	// of separate pools counted.
	walls bool
	pools int
}

// wet reports whether the state carries flow.
func (s *bwState) wet() bool { return s.area > 0 && s.k > 0 }

// alpha is the energy coefficient Σ(Ki³/Ai²)/(K³/A²).
func (s *bwState) alpha() float64 { return s.c * s.area * s.area }

// froude returns √(α·Q²·T/(g·A³)) = √(c·Q²·T/(g·A)).
func (s *bwState) froude(q float64, u rating.Units) float64 {
	if !s.wet() || !(s.width > 0) {
		return math.NaN()
	}
	return math.Sqrt(s.c * q * q * s.width / (u.Gravity() * s.area))
}

// critical2 returns the square of the discharge that is critical at the
// state, g·A³/(α·T) = g·A/(c·T): 0 when dry, +Inf without a free surface.
func (s *bwState) critical2(u rating.Units) float64 {
	switch {
	case !s.wet():
		return 0
	case !(s.width > 0):
		return math.Inf(1)
	}
	return u.Gravity() * s.area / (s.c * s.width)
}

// bwAccum sums subsections into a state.
type bwAccum struct {
	st   *bwState
	k3a2 float64
	u    rating.Units
}

func (a *bwAccum) reset(st *bwState, h float64, u rating.Units) {
	*st = bwState{stage: h}
	a.st, a.k3a2, a.u = st, 0, u
}

// add takes one subsection of area ar, wetted perimeter p, top width t
// and roughness n in region r.
func (a *bwAccum) add(ar, p, t, n float64, r subdivide.Region) error {
	a.st.area += ar
	a.st.width += t
	if !(ar > 0) {
		return nil
	}
	if !(n > 0) {
		return rating.ErrNoN
	}
	// Manning's conveyance (k/n)·A·R^(2/3), as rating.Conveyance, with
	// R^(2/3) taken as ∛(R²), which is faster than math.Pow.
	var k float64
	if p > 0 {
		r := ar / p
		k = a.u.ManningK() / n * ar * math.Cbrt(r*r)
	}
	a.st.k += k
	a.st.kr[r] += k
	a.k3a2 += k * k * k / (ar * ar)
	return nil
}

func (a *bwAccum) finish() {
	if k := a.st.k; k > 0 {
		a.st.c = a.k3a2 / (k * k * k)
	}
}

// bwBand is one stage band (lo, hi] of a section: see the file comment.
type bwBand struct {
	lo, hi float64
	// polys are the subsections' coefficients (nil when direct);
	// hasWalls reports a subsection of no width among them.
	polys    []bwPoly
	hasWalls bool
	// walls and pools are as sampled inside the band.
	walls bool
	pools int
	// direct bands are evaluated with Geometry.At: the band was too thin
	// to sample, or the geometry refused a stage in it.
	direct bool
}

// bwPoly holds one subsection's limits just above the band's lower end
// and their rates (see the file comment).
type bwPoly struct {
	a0, t0, t1, p0, p1 float64
	n                  float64
	region             subdivide.Region
	wall               int // subdivide.Subsection.Wall
}

// bwModel is a section prepared for repeated evaluation.
type bwModel struct {
	g      subdivide.Geometry
	gopt   subdivide.Options
	u      rating.Units
	bottom float64
	// bands cover (bottom, +Inf), ascending; a stage at or below the
	// bottom is dry.
	bands []bwBand
	// span is the height above the highest vertex over which the top band
	// is sampled.
	span float64
	// crit and conv are the critical discharge and conveyance against
	// stage, built on first use.
	crit, conv *bwCurve
}

// BandMatchTolerance is the relative difference between a subsection's
// area at a band's lower end as fitted from inside the band and as
// computed there, within which the computed one (exact, often zero) is
// used; a larger difference is a jump (pools joining) and the fit is kept.
const BandMatchTolerance = 1e-9

// newBWModel prepares geometry g.
func newBWModel(g subdivide.Geometry, gopt subdivide.Options, u rating.Units) (*bwModel, error) {
	m := &bwModel{g: g, gopt: gopt, u: u, bottom: g.Bottom()}
	m.span = math.Max(g.Top()-m.bottom, 1)
	elev, ok := vertexElevations(g)
	if !ok {
		m.bands = []bwBand{{lo: m.bottom, hi: math.Inf(1), direct: true}}
		return m, nil
	}
	slices.Sort(elev)
	elev = slices.Compact(elev)
	if elev[0] != m.bottom {
		return nil, fmt.Errorf("lowest vertex %g is not the bottom %g", elev[0], m.bottom)
	}
	m.bands = make([]bwBand, len(elev))
	stages := make([]float64, 0, 3*len(elev))
	for j, lo := range elev {
		hi := math.Inf(1)
		w := m.span
		if j+1 < len(elev) {
			hi = elev[j+1]
			w = hi - lo
		}
		m.bands[j] = bwBand{lo: lo, hi: hi}
		stages = append(stages, lo, lo+w/3, lo+2*w/3)
	}
	ws, errs := sampleGeometry(g, stages, gopt)
	for j := range m.bands {
		m.fitBand(&m.bands[j], ws[3*j:3*j+3], errs[3*j:3*j+3], stages[3*j:3*j+3])
	}
	return m, nil
}

// fitBand sets a band's coefficients from the geometry at its lower end
// and at two stages inside it.
func (m *bwModel) fitBand(b *bwBand, w []subdivide.Wetted, errs []error, h []float64) {
	if errs[0] != nil || errs[1] != nil || errs[2] != nil || !(h[0] < h[1] && h[1] < h[2] && h[2] < b.hi) ||
		len(w[1].Subs) != len(w[2].Subs) || len(w[0].Subs) != len(w[1].Subs) {
		b.direct = true
		return
	}
	b.walls = w[1].ExtendedLeft > 0 || w[1].ExtendedRight > 0
	b.pools = w[1].Pools
	b.polys = make([]bwPoly, len(w[1].Subs))
	d1, d2 := h[1]-h[0], h[2]-h[0]
	for i := range b.polys {
		s0, s1, s2 := w[0].Subs[i], w[1].Subs[i], w[2].Subs[i]
		t1 := (s2.TopWidth - s1.TopWidth) / (d2 - d1)
		p1 := (s2.WettedPerimeter - s1.WettedPerimeter) / (d2 - d1)
		t0 := math.Max(s1.TopWidth-t1*d1, 0)
		p0 := math.Max(s1.WettedPerimeter-p1*d1, 0)
		a0 := s1.Area - (t0+0.5*t1*d1)*d1
		if math.Abs(a0-s0.Area) <= BandMatchTolerance*s1.Area {
			a0 = s0.Area
		}
		b.polys[i] = bwPoly{a0: math.Max(a0, 0), t0: t0, t1: t1, p0: p0, p1: p1, n: s1.N, region: s1.Region, wall: s1.Wall}
		b.hasWalls = b.hasWalls || s1.Wall != 0
	}
}

// vertexElevations returns the elevations at which the geometry of g can
// change other than with depth, when g is a kind whose ground is known.
func vertexElevations(g subdivide.Geometry) ([]float64, bool) {
	var pts []subdivide.Point
	switch v := g.(type) {
	case *subdivide.Profile:
		pts = v.Points()
	case *subdivide.Prism:
		pts = v.Points()
	case rating.ScaledN:
		return vertexElevations(v.Geometry)
	case *rating.ScaledN:
		return vertexElevations(v.Geometry)
	default:
		return nil, false
	}
	out := make([]float64, len(pts))
	for i, p := range pts {
		out[i] = p.Elevation
	}
	return out, len(out) > 0
}

// sampleGeometry returns the wetted geometry of g at each stage: in one
// sweep for a surveyed profile (with its n scaled if g scales it), else
// stage by stage.
func sampleGeometry(g subdivide.Geometry, stages []float64, opt subdivide.Options) ([]subdivide.Wetted, []error) {
	ws := make([]subdivide.Wetted, len(stages))
	errs := make([]error, len(stages))
	var scale func(*subdivide.Wetted)
	inner := g
	switch v := g.(type) {
	case rating.ScaledN:
		inner, scale = v.Geometry, scaler(v)
	case *rating.ScaledN:
		inner, scale = v.Geometry, scaler(*v)
	}
	if p, ok := inner.(*subdivide.Profile); ok {
		_ = p.Sweep(stages, opt, func(i int, w subdivide.Wetted, err error) error {
			if scale != nil {
				scale(&w)
			}
			ws[i], errs[i] = w, err
			return nil
		})
		return ws, errs
	}
	for i, h := range stages {
		ws[i], errs[i] = g.At(h, opt)
	}
	return ws, errs
}

func scaler(s rating.ScaledN) func(*subdivide.Wetted) {
	return func(w *subdivide.Wetted) {
		for i := range w.Subs {
			if s.Scales(w.Subs[i].Region) {
				w.Subs[i].N *= s.Factor
			}
		}
	}
}

// band returns the index of the band holding stage h, or -1 when h is at
// or below the bottom (dry) or not a number.
func (m *bwModel) band(h float64) int {
	if !(h > m.bottom) {
		return -1
	}
	j, _ := slices.BinarySearchFunc(m.bands, h, func(b bwBand, h float64) int {
		if b.hi < h {
			return -1
		}
		return 1
	})
	return j
}

// state sets st to the hydraulic state at stage h.
func (m *bwModel) state(h float64, st *bwState) error {
	return m.stateIn(m.band(h), h, st)
}

// stateIn sets st to the state at stage h computed with band j (-1: dry).
// With j the band of h it is exact; with the band below or above it gives
// the band's limit at its end, which is how the ends of a band are taken.
func (m *bwModel) stateIn(j int, h float64, st *bwState) error {
	var acc bwAccum
	acc.reset(st, h, m.u)
	if j < 0 {
		return nil
	}
	b := &m.bands[j]
	if b.direct {
		w, err := m.g.At(h, m.gopt)
		if err != nil {
			return err
		}
		for _, s := range rating.FoldWalls(w.Subs) {
			if err := acc.add(s.Area, s.WettedPerimeter, s.TopWidth, s.N, s.Region); err != nil {
				return fmt.Errorf("stations %g to %g: %w", s.From, s.To, err)
			}
		}
		acc.finish()
		st.walls, st.pools = w.ExtendedLeft > 0 || w.ExtendedRight > 0, w.Pools
		return nil
	}
	d := h - b.lo
	if b.hasWalls {
		return m.stateWalls(b, d, &acc, st)
	}
	for i := range b.polys {
		p := &b.polys[i]
		a := math.Max(p.a0+(p.t0+0.5*p.t1*d)*d, 0)
		t := math.Max(p.t0+p.t1*d, 0)
		per := math.Max(p.p0+p.p1*d, 0)
		if err := acc.add(a, per, t, p.n, p.region); err != nil {
			sub := m.g.Subsections()
			if i < len(sub) {
				return fmt.Errorf("stations %g to %g: %w", sub[i].From, sub[i].To, err)
			}
			return err
		}
	}
	acc.finish()
	st.walls, st.pools = b.walls, b.pools
	return nil
}

// stateWalls is stateIn's fitted band with walls among its subsections:
// the subsections at height d above the band's foot, the walls folded
// into the subsections they face (rating.FoldWalls), summed into st.
func (m *bwModel) stateWalls(b *bwBand, d float64, acc *bwAccum, st *bwState) error {
	subs := make([]subdivide.SubWetted, len(b.polys))
	for i := range b.polys {
		p := &b.polys[i]
		subs[i] = subdivide.SubWetted{Subsection: subdivide.Subsection{N: p.n, Region: p.region, Wall: p.wall},
			Area: math.Max(p.a0+(p.t0+0.5*p.t1*d)*d, 0), TopWidth: math.Max(p.t0+p.t1*d, 0), WettedPerimeter: math.Max(p.p0+p.p1*d, 0)}
	}
	sub := m.g.Subsections()
	for i, s := range rating.FoldWalls(subs) {
		if err := acc.add(s.Area, s.WettedPerimeter, s.TopWidth, s.N, s.Region); err != nil {
			if i < len(sub) {
				return fmt.Errorf("stations %g to %g: %w", sub[i].From, sub[i].To, err)
			}
			return err
		}
	}
	acc.finish()
	st.walls, st.pools = b.walls, b.pools
	return nil
}

// errNoCrossing is returned when a growing curve does not reach a level
// within MaxCurveDoublings.
var errNoCrossing = errors.New("the quantity does not reach the level at any stage searched")

// isClosed reports whether g is a closed conduit: full at its top.
func isClosed(g subdivide.Geometry, opt subdivide.Options) (bool, error) {
	if _, ok := g.(*subdivide.Conduit); ok {
		return true, nil
	}
	w, err := g.At(g.Top(), opt)
	if err != nil {
		return false, err
	}
	return w.Full, nil
}
