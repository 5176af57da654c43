package reach

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"wetline/rating"
	"wetline/subdivide"
)

// bwRun is a reach prepared for computing profiles.
type bwRun struct {
	secs   []Section
	models []*bwModel
	// flow[j] are the flow lengths from section j to j+1 (weighted[j]
	// when given) and plain[j] the distance difference.
	flow       [][3]float64
	weighted   []bool
	plain      []float64
	b          Boundary
	second     *Boundary
	u          rating.Units
	kExp, kCon float64
	// warm[k][j] is the stage of profile k at section j for the previous
	// discharge (NaN before the first); k is the first profile, the
	// second, or the half-way one.
	warm [3][]float64
	// crit[j] holds the critical crossings of section j for the current
	// discharge once critDone[j].
	crit     [][]bwCrossing
	critDone []bool
	// rows[k] holds profile k while it is computed; eq is the energy
	// equation of the subreach being solved.
	rows [3][]bwRow
	eq   subreach
	// Facts gathered for the summary warnings.
	walls    []float64 // highest stage with walls added, per section (NaN: none)
	pools    []int     // most pools counted, per section
	warnings []string
}

// newBWRun validates the reach and prepares its sections.
func newBWRun(secs []Section, b Boundary, opt BackwaterOptions) (*bwRun, error) {
	if len(secs) < 2 {
		return nil, ErrBackwaterSections
	}
	if err := b.validate(); err != nil {
		return nil, err
	}
	if opt.Second != nil {
		if err := opt.Second.validate(); err != nil {
			return nil, fmt.Errorf("second boundary: %w", err)
		}
	}
	r := &bwRun{secs: secs, b: b, second: opt.Second, u: opt.Units,
		models: make([]*bwModel, len(secs)), flow: make([][3]float64, len(secs)-1),
		weighted: make([]bool, len(secs)-1), plain: make([]float64, len(secs)-1),
		crit: make([][]bwCrossing, len(secs)), critDone: make([]bool, len(secs)),
		walls: make([]float64, len(secs)), pools: make([]int, len(secs))}
	var err error
	if r.kExp, r.kCon, err = opt.eddy(); err != nil {
		return nil, err
	}
	for k := range r.warm {
		r.rows[k] = make([]bwRow, len(secs))
		r.warm[k] = make([]float64, len(secs))
		for j := range r.warm[k] {
			r.warm[k][j] = math.NaN()
		}
	}
	for i, s := range secs {
		if err := r.prepareSection(i, s, opt); err != nil {
			return nil, err
		}
		r.walls[i] = math.NaN()
	}
	r.warnings = append(r.warnings, b.Warnings...)
	if opt.Second != nil {
		r.warnings = append(r.warnings, opt.Second.Warnings...)
	}
	r.warnings = append(r.warnings, r.bankWarnings()...)
	r.warnings = append(r.warnings, orderWarnings(secs, opt.Units)...)
	return r, nil
}

// bankWarnings returns a warning naming the sections without overbank
// subsections (no bank marks) at an end of a subreach whose overbank flow
// lengths differ from its channel length: all such a section's
// conveyance is the channel's, so its half of the weighted length
// (WeightedLength) is the channel flow length and the overbank lengths
// cannot be applied at it.
func (r *bwRun) bankWarnings() []string {
	var ids, parts []string
	L := r.u.Length()
	used := make([]bool, len(r.flow))
	for j, s := range r.secs {
		if hasOverbank(s.Geometry) {
			continue
		}
		named := false
		for _, i := range []int{j - 1, j} {
			if i < 0 || i >= len(r.flow) || !r.weighted[i] {
				continue
			}
			l := r.flow[i]
			ch := l[subdivide.Channel]
			if l[subdivide.LeftOverbank] == ch && l[subdivide.RightOverbank] == ch {
				continue
			}
			if !named {
				ids, named = append(ids, s.ID), true
			}
			if !used[i] {
				used[i] = true
				parts = append(parts, fmt.Sprintf("%s to %s (left %s, channel %s, right %s %s)", r.secs[i].ID, r.secs[i+1].ID,
					lengthText(l[subdivide.LeftOverbank]), lengthText(ch), lengthText(l[subdivide.RightOverbank]), L))
			}
		}
	}
	if len(ids) == 0 {
		return nil
	}
	n := len(ids)
	return []string{fmt.Sprintf("%s %s %s no bank marks, so all %s conveyance is the channel's: the overbank flow lengths of %s %s "+
		"cannot be applied at %s, and the channel flow length is used for %s of the weighted length; "+
		"mark %s banks for the overbank lengths to count",
		rating.Agree(n, "section", "sections"), rating.JoinAnd(ids), rating.Agree(n, "has", "have"), rating.Agree(n, "its", "their"),
		rating.Agree(len(parts), "the subreach", "the subreaches"), rating.JoinAnd(parts), rating.Agree(n, "it", "them"),
		rating.Agree(n, "its half", "their halves"), rating.Agree(n, "its", "their"))}
}

// hasOverbank reports whether g has a subsection in an overbank region.
func hasOverbank(g subdivide.Geometry) bool {
	for _, sub := range g.Subsections() {
		if sub.Region != subdivide.Channel {
			return true
		}
	}
	return false
}

// orderWarnings returns warnings when the reach, listed upstream first,
// may be listed downstream first: the high-water marks (the mean of a
// section's given marks) at the last section with marks above those at
// the first by more than the marks' band (markBand, the larger of the
// two sections'), which a steady profile does not do; or the thalweg
// (lowest ground) of the last section above that of the first by more
// than BedRiseSI or BedRiseUS. Neither is refused. A bed may rise over a
// short reach (a riffle or weir below a pool, the very control a gauge
// above it relies on), so a rising bed alone is worded as a question;
// with the marks rising too, the reach is most likely listed the wrong
// way round, and the warning says so.
func orderWarnings(secs []Section, u rating.Units) []string {
	first, last := secs[0], secs[len(secs)-1]
	zu, zd := first.Geometry.Bottom(), last.Geometry.Bottom()
	bedTol := BedRiseSI
	if u == rating.US {
		bedTol = BedRiseUS
	}
	bedRises := zd-zu > bedTol
	up, down := -1, -1
	for i, s := range secs {
		if finite(markMean(s)) {
			if up < 0 {
				up = i
			}
			down = i
		}
	}
	marksRise := false
	var hu, hd float64
	if up >= 0 && down > up {
		hu, hd = markMean(secs[up]), markMean(secs[down])
		marksRise = hd-hu > math.Max(markBand(secs[up], u), markBand(secs[down], u))
	}
	const check = "check that the sections are listed upstream first, with distances increasing downstream"
	var out []string
	switch {
	case bedRises && marksRise:
		out = append(out, rating.Sayf("the bed and the high-water marks both rise downstream over the reach (thalweg of %s at %.3f, of %s at %.3f %s; marks of %s at %.3f, of %s at %.3f %s): "+
			"the reach is most likely listed downstream first; "+check,
			first.ID, zu, last.ID, zd, u.Length(), secs[up].ID, hu, secs[down].ID, hd, u.Length()))
	case marksRise:
		out = append(out, rating.Sayf("the high-water marks rise %.3g %s downstream over the reach (%s at %.3f, %s at %.3f %s), which a steady water surface does not: "+
			"check the marks, and "+check,
			hd-hu, u.Length(), secs[up].ID, hu, secs[down].ID, hd, u.Length()))
	case bedRises:
		out = append(out, rating.Sayf("the bed rises %.3g %s downstream over the reach (thalweg of %s at %.3f, of %s at %.3f %s): "+
			"a riffle or weir below a pool does this; if the reach has none, "+check,
			zd-zu, u.Length(), first.ID, zu, last.ID, zd, u.Length()))
	}
	return out
}

// BedRiseSI and BedRiseUS are the rise of the thalweg from the first
// section to the last (m, ft) that orderWarnings takes for a rise: less is
// within what a surveyed thalweg can tell (a few centimetres, common
// practice).
const (
	BedRiseSI = 0.05
	BedRiseUS = 0.15
)

// markBand is the elevation band within which a section's marks may
// differ from the water surface (length unit of u): its MarkSD when
// given, else its quality's band (rating.Quality.MarkSD), else the band
// of a good mark, DefaultMarkSDSI or DefaultMarkSDUS (0.03 m or 0.1 ft,
// common practice).
func markBand(s Section, u rating.Units) float64 {
	if s.MarkSD > 0 {
		return s.MarkSD
	}
	if sd, ok := s.Quality.MarkSD(u); ok {
		return sd
	}
	if u == rating.US {
		return DefaultMarkSDUS
	}
	return DefaultMarkSDSI
}

// markMean is the mean of a section's given high-water marks (NaN when
// it has none).
func markMean(s Section) float64 {
	switch l, r := finite(s.Left), finite(s.Right); {
	case l && r:
		return (s.Left + s.Right) / 2
	case l:
		return s.Left
	case r:
		return s.Right
	}
	return math.NaN()
}

// prepareSection checks section i and builds its model and flow lengths.
func (r *bwRun) prepareSection(i int, s Section, opt BackwaterOptions) error {
	fail := func(field string, err error) error { return &SectionError{Index: i, ID: s.ID, Field: field, Err: err} }
	if s.Geometry == nil {
		return fail("geometry", errors.New("no geometry"))
	}
	if !finite(s.Distance) {
		return fail("distance", errors.New("distance is not a finite number"))
	}
	if i > 0 && !(s.Distance > r.secs[i-1].Distance) {
		return fail("distance", fmt.Errorf("%w: %g after %g", ErrDistances, s.Distance, r.secs[i-1].Distance))
	}
	closed, err := isClosed(s.Geometry, opt.Geometry)
	if err != nil {
		return fail("geometry", err)
	}
	if closed {
		return fail("geometry", ErrClosedConduit)
	}
	if r.models[i], err = newBWModel(s.Geometry, opt.Geometry, opt.Units); err != nil {
		return fail("geometry", err)
	}
	if i+1 == len(r.secs) {
		return nil
	}
	dist := r.secs[i+1].Distance - s.Distance
	r.plain[i] = dist
	for _, l := range s.FlowLengths.Array() {
		if !finite(l) || l < 0 {
			return fail("flow_lengths", fmt.Errorf("%w: %v", ErrFlowLength, s.FlowLengths))
		}
		if l > 0 {
			r.weighted[i] = true
		}
	}
	if r.weighted[i] {
		for k, l := range s.FlowLengths.Array() {
			if l == 0 {
				l = dist
			}
			r.flow[i][k] = l
		}
		L := opt.Units.Length()
		if ch := s.FlowLengths.Channel; ch > 0 && math.Abs(ch-dist) > ChannelLengthMismatch*dist {
			r.warnings = append(r.warnings, fmt.Sprintf(
				"section %s: the channel flow length %s %s to the next section differs from the distance between them, %s %s; the flow lengths are used",
				s.ID, lengthText(ch), L, lengthText(dist), L))
		}
		for _, ob := range []struct {
			name string
			l    float64
		}{{"left", s.FlowLengths.Left}, {"right", s.FlowLengths.Right}} {
			if ob.l > 0 && (ob.l > OverbankLengthRatio*dist || ob.l*OverbankLengthRatio < dist) {
				r.warnings = append(r.warnings, fmt.Sprintf(
					"section %s: the %s overbank flow length %s %s to the next section is %.4g times the distance between them, %s %s "+
						"(more than %g times or less than 1/%g is unusual); the flow lengths are used",
					s.ID, ob.name, lengthText(ob.l), L, ob.l/dist, lengthText(dist), L, OverbankLengthRatio, OverbankLengthRatio))
			}
		}
	}
	return nil
}

// lengthText writes a length rounded to 0.1 mm (or 0.0001 ft), with no
// trailing zeros: 160, 0.001, 172.5.
func lengthText(v float64) string {
	return strconv.FormatFloat(math.Round(v*1e4)/1e4, 'f', -1, 64)
}

func (r *bwRun) secondWords() string {
	if r.second != nil {
		return r.second.String()
	}
	if r.b.Kind == CriticalDepth {
		return fmt.Sprintf("%.1f times critical depth", RaisedStartFactor)
	}
	return fmt.Sprintf("critical depth (or %.1f times the first start's depth where that start is itself critical)", RaisedStartFactor)
}

// criticals returns the critical crossings of section j at discharge q.
func (r *bwRun) criticals(j int, q float64) ([]bwCrossing, error) {
	if r.critDone[j] {
		return r.crit[j], nil
	}
	c, err := r.models[j].criticalCurve()
	if err != nil {
		return nil, err
	}
	if r.crit[j], err = c.crossings(q*q, r.crit[j]); err != nil {
		return nil, fmt.Errorf("critical stage: %w", err)
	}
	if len(r.crit[j]) == 0 || !r.crit[j][0].rising {
		return nil, fmt.Errorf("critical stage: %w", rating.ErrNoRoot)
	}
	r.critDone[j] = true
	return r.crit[j], nil
}

// bwRow is one section of a profile being computed.
type bwRow struct {
	st             bwState
	critical, jump bool
	residual       float64
	length, hf, he float64
	expanding      bool
	hv, energy     float64
}

// profile computes the three profiles of discharge q: from the boundary,
// from the second start and from half-way between them.
func (r *bwRun) profile(q float64) (SurfaceProfile, error) {
	clear(r.critDone)
	p := SurfaceProfile{Discharge: q}
	n := len(r.secs)
	s1, c1, err := r.start(r.b, q, &p.Warnings)
	if err != nil {
		return p, err
	}
	var s2 float64
	var c2 bool
	switch {
	case r.second != nil:
		var ignored []string
		if s2, c2, err = r.start(*r.second, q, &ignored); err != nil {
			return p, fmt.Errorf("second boundary: %w", err)
		}
	case c1:
		s2 = r.models[n-1].bottom + RaisedStartFactor*(s1-r.models[n-1].bottom)
	default:
		if s2, err = r.criticalStart(q); err != nil {
			return p, err
		}
		c2 = true
	}
	p.Start, p.StartCritical, p.SecondStart, p.SecondCritical = s1, c1, s2, c2
	rows1, err := r.march(0, s1, c1, q)
	if err != nil {
		return p, err
	}
	rows2, err := r.march(1, s2, c2, q)
	if err != nil {
		return p, fmt.Errorf("second profile: %w", err)
	}
	var between bool
	if p.HalfwayStart, between = r.halfway(s1, s2, q); !between {
		p.Warnings = append(p.Warnings, fmt.Sprintf(
			"every stage tried between the start %.3f %s and the second start %.3f %s at %s is supercritical: "+
				"the third profile starts at the first start and checks nothing", s1, r.u.Length(), s2, r.u.Length(), r.secs[n-1].ID))
	}
	rows3, err := r.march(2, p.HalfwayStart, false, q)
	if err != nil {
		return p, fmt.Errorf("half-way profile: %w", err)
	}
	p.Sections = make([]ProfileSection, n)
	var crit []string
	for j := range rows1 {
		p.Sections[j] = r.section(j, q, &rows1[j], rows2[j].st.stage, rows3[j].st.stage)
		if rows1[j].critical && j < n-1 {
			crit = append(crit, r.secs[j].ID)
		}
	}
	if len(crit) > 0 {
		p.Warnings = append(p.Warnings, fmt.Sprintf(
			"no subcritical stage balances the energy equation at %s: the profile passes through critical depth there", strings.Join(crit, ", ")))
	}
	return p, nil
}

// HalfwayTries is how many times the distance of the third start from
// the first is halved, from half-way between the two starts, while the
// stage there is supercritical.
const HalfwayTries = 6

// halfway returns the third start of discharge q between the starts s1
// and s2: half-way between them where that stage is subcritical, else the
// first subcritical stage of s1 + (s2 − s1)/2^k, k = 2 … HalfwayTries (a
// compound section can have several critical stages, so that half-way may
// lie in a supercritical band while stages nearer s1 do not). Where none
// of them is subcritical it returns s1 and false, so that the third
// profile is always a subcritical one.
func (r *bwRun) halfway(s1, s2, q float64) (float64, bool) {
	m := r.models[len(r.secs)-1]
	var st bwState
	d := (s2 - s1) / 2
	for range HalfwayTries {
		h := s1 + d
		if err := m.state(h, &st); err == nil && st.wet() && !(st.froude(q, r.u) > 1) {
			return h, true
		}
		d /= 2
	}
	return s1, false
}

// section fills the reported values of section j; second and halfway are
// the stages of the other two profiles there.
func (r *bwRun) section(j int, q float64, row *bwRow, second, halfway float64) ProfileSection {
	s := r.secs[j]
	st := &row.st
	out := ProfileSection{ID: s.ID, Distance: s.Distance, Bottom: r.models[j].bottom,
		WaterSurface: st.stage, VelocityHead: row.hv, EnergyGrade: st.stage + row.hv,
		Froude: st.froude(q, r.u), Area: st.area, TopWidth: st.width, Conveyance: st.k, Alpha: st.alpha(),
		Critical: row.critical, SecondWaterSurface: second, HalfwayWaterSurface: halfway,
		Spread: math.Max(math.Abs(st.stage-second), math.Abs(st.stage-halfway)),
		Length: row.length, FrictionLoss: row.hf, EddyLoss: row.he, Expanding: row.expanding,
		Residual: row.residual, Jump: row.jump}
	if st.walls && !(r.walls[j] >= st.stage) {
		r.walls[j] = st.stage
	}
	r.pools[j] = max(r.pools[j], st.pools)
	return out
}

// start returns the stage of boundary b at discharge q at the last
// section and whether it is critical depth; a stage in supercritical flow
// is replaced by critical depth, with a warning.
func (r *bwRun) start(b Boundary, q float64, warns *[]string) (float64, bool, error) {
	n := len(r.secs)
	m := r.models[n-1]
	var h float64
	var err error
	switch b.Kind {
	case CriticalDepth:
		h, err = r.criticalStart(q)
		return h, true, err
	case NormalDepth:
		h, err = r.normalStage(q, b.Slope)
	case KnownStage:
		h = b.Stage
	case StageRating:
		h, err = b.ratingStage(q)
	}
	if err != nil {
		return h, false, err
	}
	if !(h > m.bottom) {
		return h, false, fmt.Errorf("%w: stage %g at section %s is not above its lowest ground %g", ErrBoundary, h, r.secs[n-1].ID, m.bottom)
	}
	var st bwState
	if err := m.state(h, &st); err != nil {
		return h, false, &SectionError{Index: n - 1, ID: r.secs[n-1].ID, Field: "geometry", Err: err}
	}
	if st.froude(q, r.u) > 1 {
		c, w, err := r.supercriticalStart(h, b, q)
		if err != nil {
			return h, false, err
		}
		*warns = append(*warns, w)
		return c, true, nil
	}
	return h, false, nil
}

// supercriticalStart returns the start of a profile whose boundary stage
// h at the last section is supercritical, with the note saying so. Below
// every critical stage of q the profile starts at critical depth (the
// critical stage of least specific energy, criticalStart). A compound
// section can have several critical stages, and h can lie in a
// supercritical band between two of them, above critical depth: the
// profile then starts at the critical stage at the foot of the nearest
// subcritical band above h, the least raise of the boundary stage that
// makes it subcritical.
func (r *bwRun) supercriticalStart(h float64, b Boundary, q float64) (float64, string, error) {
	n := len(r.secs)
	u, id := r.u.Length(), r.secs[n-1].ID
	cr, err := r.criticals(n-1, q)
	if err != nil {
		return h, "", &SectionError{Index: n - 1, ID: id, Field: "geometry", Err: err}
	}
	below := -1 // the highest critical stage below h
	for i, c := range cr {
		if c.h < h {
			below = i
		}
	}
	if below >= 0 {
		for _, c := range cr[below+1:] {
			if c.rising {
				return c.h, fmt.Sprintf("the boundary stage %.3f %s (%s) is supercritical at %s, in a band between its critical stages %.3f and %.3f %s "+
					"(the section is compound and flow passes through critical more than once): the profile starts at %.3f %s, "+
					"the critical stage at the foot of the subcritical flow above it", h, u, b.Kind, id, cr[below].h, c.h, u, c.h, u), nil
			}
		}
	}
	c, err := r.criticalStart(q)
	if err != nil {
		return h, "", err
	}
	return c, fmt.Sprintf("the boundary stage %.3f %s (%s) is below critical depth at %s: the profile starts at critical depth, %.3f %s",
		h, u, b.Kind, id, c, u), nil
}

// normalStage returns the highest normal stage of q at slope s in the last
// section.
func (r *bwRun) normalStage(q, s float64) (float64, error) {
	n := len(r.secs)
	c, err := r.models[n-1].conveyanceCurve()
	if err != nil {
		return 0, err
	}
	cr, err := c.crossings(q/math.Sqrt(s), nil)
	if err == nil && len(cr) == 0 {
		err = rating.ErrNoRoot
	}
	if err != nil {
		return 0, fmt.Errorf("%w: normal depth of %g at slope %g in section %s: %w", ErrBoundary, q, s, r.secs[n-1].ID, err)
	}
	return cr[len(cr)-1].h, nil
}

// criticalStart returns the critical stage of q at the last section with
// the least specific energy (the control, where there are several).
func (r *bwRun) criticalStart(q float64) (float64, error) {
	n := len(r.secs)
	cr, err := r.criticals(n-1, q)
	if err != nil {
		return 0, &SectionError{Index: n - 1, ID: r.secs[n-1].ID, Field: "geometry", Err: err}
	}
	m := r.models[n-1]
	best, bestE := math.NaN(), math.Inf(1)
	var st bwState
	for _, c := range cr {
		if !c.rising {
			continue
		}
		if err := m.state(c.h, &st); err != nil {
			return 0, err
		}
		if e := c.h - m.bottom + st.c*q*q/(2*r.u.Gravity()); e < bestE {
			best, bestE = c.h, e
		}
	}
	return best, nil
}

// march computes profile k from start stage h at the last section,
// returning each section's row, upstream first.
func (r *bwRun) march(k int, h float64, critical bool, q float64) ([]bwRow, error) {
	n := len(r.secs)
	rows := r.rows[k]
	last := &rows[n-1]
	m := r.models[n-1]
	band := m.band(h)
	if critical {
		band = bandAbove(m, h) // as finishRow reports a critical stage
	}
	if err := m.stateIn(band, h, &last.st); err != nil {
		return nil, &SectionError{Index: n - 1, ID: r.secs[n-1].ID, Field: "geometry", Err: err}
	}
	last.critical = critical
	r.setHead(last, q)
	for j := n - 2; j >= 0; j-- {
		if err := r.solveUp(k, j, q, &rows[j], &rows[j+1]); err != nil {
			return nil, &SectionError{Index: j, ID: r.secs[j].ID, Field: "geometry", Err: err}
		}
	}
	for j := range rows {
		r.warm[k][j] = rows[j].st.stage
	}
	return rows, nil
}

func (r *bwRun) setHead(row *bwRow, q float64) {
	row.hv = row.st.c * q * q / (2 * r.u.Gravity())
	row.energy = row.st.stage + row.hv
}

// subreach holds the energy equation of one subreach at one discharge.
type subreach struct {
	r   *bwRun
	j   int
	q   float64
	q2g float64 // Q²/(2g)
	dn  *bwRow
	st  bwState // the upstream state last evaluated
}

// residual evaluates the energy equation at upstream stage h: the
// upstream energy minus the downstream energy and the losses. It is −Inf
// where the section is dry.
func (e *subreach) residual(h float64, band int) (float64, error) {
	m := e.r.models[e.j]
	if band < 0 {
		band = m.band(h)
	}
	if err := m.stateIn(band, h, &e.st); err != nil {
		return 0, err
	}
	if !e.st.wet() {
		return math.Inf(-1), nil
	}
	f, _, _, _, _ := e.balance(&e.st)
	return f, nil
}

// balance returns the residual and the length, friction loss, eddy loss
// and flow direction of the subreach with upstream state st.
func (e *subreach) balance(st *bwState) (f, l, hf, he float64, expanding bool) {
	d := &e.dn.st
	hvu, hvd := st.c*e.q2g, d.c*e.q2g
	l = e.r.plain[e.j]
	if e.r.weighted[e.j] {
		l = weightedLength(e.r.flow[e.j], st.kr, d.kr)
	}
	hf = l * e.q * e.q / (st.k * d.k)
	expanding = hvu > hvd
	k := e.r.kCon
	if expanding {
		k = e.r.kExp
	}
	he = k * math.Abs(hvu-hvd)
	return st.stage + hvu - (d.stage + hvd + hf + he), l, hf, he, expanding
}

// solveUp finds the stage of section j in profile k given the row of the
// section downstream.
func (r *bwRun) solveUp(k, j int, q float64, row, dn *bwRow) error {
	cr, err := r.criticals(j, q)
	if err != nil {
		return err
	}
	e := &r.eq
	*e = subreach{r: r, j: j, q: q, q2g: q * q / (2 * r.u.Gravity()), dn: dn}
	m := r.models[j]
	// Subcritical bands, highest first: each from a rising crossing to the
	// next crossing (or without end).
	for i := len(cr) - 1; i >= 0; i-- {
		if !cr[i].rising {
			continue
		}
		lo, hi := cr[i].h, math.Inf(1)
		if i+1 < len(cr) {
			hi = cr[i+1].h
		}
		h, ok, err := r.rootInBand(k, j, e, lo, hi)
		if err != nil {
			return err
		}
		if ok {
			band := -1
			if h == lo {
				band = bandAbove(m, lo)
			}
			return r.finishRow(m, e, h, band, false, row)
		}
	}
	// No subcritical root: the flow passes through critical depth. Of the
	// critical stages at which the upstream energy covers the energy and
	// losses downstream (residual ≥ 0; the highest always does, or its
	// band would hold a root), the one with the least excess.
	best, bestF := math.NaN(), math.Inf(1)
	for _, c := range cr {
		if !c.rising {
			continue
		}
		f, err := e.residual(c.h, bandAbove(m, c.h))
		if err != nil {
			return err
		}
		if f >= 0 && f < bestF {
			best, bestF = c.h, f
		}
	}
	if math.IsNaN(best) {
		return fmt.Errorf("%w: no critical stage", ErrNoBackwaterFit)
	}
	return r.finishRow(m, e, best, bandAbove(m, best), true, row)
}

// bandAbove returns the band just above stage h (the subcritical side of
// a critical stage lying at a jump).
func bandAbove(m *bwModel, h float64) int {
	j := m.band(h)
	if j >= 0 && j+1 < len(m.bands) && m.bands[j].hi == h {
		return j + 1
	}
	return j
}

// finishRow sets row to section j's state at stage h, computed with band
// (-1: the band of h). A critical stage lying where the geometry jumps
// (ground level at the stage) is reported with the state just above, on
// its subcritical side.
func (r *bwRun) finishRow(m *bwModel, e *subreach, h float64, band int, critical bool, row *bwRow) error {
	if band < 0 {
		band = m.band(h)
	}
	if err := m.stateIn(band, h, &row.st); err != nil {
		return err
	}
	row.critical = critical
	row.residual, row.length, row.hf, row.he, row.expanding = e.balance(&row.st)
	r.setHead(row, e.q)
	if !critical {
		spec := row.st.stage - m.bottom + row.hv
		row.jump = math.Abs(row.residual) > BalanceTolerance*spec
	}
	return nil
}

// rootInBand finds the root of the energy equation of subreach e in the
// subcritical band (lo, hi), reporting whether there is one.
func (r *bwRun) rootInBand(k, j int, e *subreach, lo, hi float64) (float64, bool, error) {
	m := r.models[j]
	flo, err := e.residual(lo, bandAbove(m, lo))
	if err != nil || flo > 0 {
		return 0, false, err
	}
	if flo == 0 {
		return lo, true, nil
	}
	tol := func(h float64) float64 { return bwStageTol(h - m.bottom) }
	f := func(h float64) (float64, error) { return e.residual(h, -1) }
	if !math.IsInf(hi, 1) {
		fhi, err := f(hi)
		if err != nil || fhi < 0 {
			return 0, false, err
		}
		h, err := brentRoot(f, lo, hi, flo, fhi, tol(hi))
		return h, err == nil, err
	}
	// Unbounded band: bracket upwards from a warm guess. A trial stage the
	// geometry refuses (above an end, not extended) is replaced by the top
	// of the section: the root lies below it, or is reported not reached
	// there rather than at the trial stage.
	top := m.g.Top()
	atTop := func(err error) (float64, error) {
		if !errors.Is(err, subdivide.ErrAboveEnds) || !(top > lo) {
			return 0, err
		}
		ft, errt := f(top)
		if errt != nil {
			return 0, err
		}
		if ft < 0 {
			return 0, fmt.Errorf("%w: the balancing stage is %w", ErrNoBackwaterFit, errAboveTop(top))
		}
		return ft, nil
	}
	guess, step := r.guess(k, j, e.dn.st.stage, lo)
	fg, err := f(guess)
	if err != nil {
		if fg, err = atTop(err); err != nil {
			return 0, false, err
		}
		guess = top
	}
	for i := 0; fg < 0; i++ {
		if i == MaxCurveDoublings {
			return 0, false, fmt.Errorf("%w: no stage up to %g", ErrNoBackwaterFit, guess)
		}
		lo, flo = guess, fg
		guess += step
		step *= 2
		if fg, err = f(guess); err != nil {
			if fg, err = atTop(err); err != nil {
				return 0, false, err
			}
			guess = top
		}
	}
	h, err := brentRoot(f, lo, guess, flo, fg, tol(guess))
	return h, err == nil, err
}

// WarmStep is the least first step, as a fraction of the depth at the
// downstream section, by which a trial stage is raised while the energy
// equation is bracketed.
const WarmStep = 0.01

// guess returns a first trial stage above lo for section j of profile k,
// whose downstream section stands at hd, and the step by which to raise
// it: the previous discharge's stage moved as much as the stage
// downstream moved, or the downstream depth carried up.
func (r *bwRun) guess(k, j int, hd, lo float64) (guess, step float64) {
	m, md := r.models[j], r.models[j+1]
	depth := math.Max(hd-md.bottom, 0)
	step = WarmStep * math.Max(depth, minDepthScale)
	prev, prevD := r.warm[k][j], r.warm[k][j+1]
	if finite(prev) && finite(prevD) {
		guess = prev + (hd - prevD)
		step = math.Max(step, math.Abs(hd-prevD))
	} else {
		guess = math.Max(m.bottom+depth, hd)
	}
	if !(guess > lo) {
		guess = lo + step
	}
	return guess, step
}

// rating reads the stage of every profile at section at; a read whose
// spread exceeds tol is unsettled, but at the last section, where the
// boundary sets the stage and the starts differ by construction.
func (r *bwRun) rating(ps []SurfaceProfile, at int, tol float64) BackwaterRating {
	rt := BackwaterRating{Section: r.secs[at].ID, Index: at, Tolerance: tol, AtBoundary: at == len(r.secs)-1,
		Rows: make([]RatingRead, len(ps)), Geometry: r.secs[at].Geometry,
		GeometryOptions: r.models[at].gopt, Units: r.u}
	for i, p := range ps {
		s := p.Sections[at]
		rt.Rows[i] = RatingRead{Discharge: p.Discharge, Stage: s.WaterSurface, Spread: s.Spread,
			Critical: s.Critical, Unsettled: s.Spread > tol && !rt.AtBoundary}
	}
	return rt
}

// summary returns the warnings about the whole computation.
func (r *bwRun) summary(ps []SurfaceProfile, rt BackwaterRating) []string {
	var out []string
	u := r.u
	for j, s := range r.secs {
		if h := r.walls[j]; finite(h) {
			// The heights of the walls at the highest stage, as a rating
			// table words them.
			w, err := s.Geometry.At(h, r.models[j].gopt)
			ws := rating.ExtensionWarnings(w.ExtendedLeft, w.ExtendedRight, h, u)
			if err != nil || len(ws) == 0 {
				ws = []string{fmt.Sprintf("stages up to %.3f %s are above an end of the section: a vertical wall was added there", h, u.Length())}
			}
			for _, w := range ws {
				out = append(out, "section "+s.ID+": "+w)
			}
		}
		if r.pools[j] > 1 && r.models[j].gopt.AllPools {
			out = append(out, fmt.Sprintf("section %s: the water stands in up to %d separate pools; all are counted", s.ID, r.pools[j]))
		}
	}
	crit, starts, third, jumps, worst := 0, 0, 0, 0, 0.0
	for _, p := range ps {
		for _, s := range p.Sections {
			if s.Jump {
				jumps++
				worst = math.Max(worst, math.Abs(s.Residual))
			}
		}
		for _, s := range p.Sections[:len(p.Sections)-1] {
			if s.Critical {
				crit++
				break
			}
		}
		if p.StartCritical && r.b.Kind != CriticalDepth {
			starts++
		}
		if p.HalfwayStart == p.Start && p.SecondStart != p.Start {
			third++
		}
	}
	if crit > 0 {
		out = append(out, fmt.Sprintf("%s the profile passes through critical depth (see the sections marked critical): "+
			"the computed stages there are critical depth, not a subcritical profile", atOf(crit, len(ps))))
	}
	if jumps > 0 {
		out = append(out, fmt.Sprintf("at %s (marked jump) the hydraulics jump at the computed stage "+
			"(a pocket joins the flow or level ground is wetted all at once): the energy equation balances there only to %.2g %s",
			rating.Counted(jumps, "section stage", "section stages"), worst, u.Length()))
	}
	if starts > 0 {
		out = append(out, fmt.Sprintf("%s the boundary stage is supercritical (below critical depth, or between two critical stages of a compound section): "+
			"those profiles start at a critical stage (see the profiles' notes)", atOf(starts, len(ps))))
	}
	if third > 0 {
		out = append(out, fmt.Sprintf("%s no stage tried between the two starts is subcritical: "+
			"the third profile starts at the first start there and does not check it (see the profiles' notes)", atOf(third, len(ps))))
	}
	if w := unsettledWarning(rt, u); w != "" {
		out = append(out, w)
	}
	return out
}

// unsettledWarning words the warning for rating reads whose profiles
// still differ, or returns "". The discharges are given as the runs of
// unsettled ones among all, in ascending order (dischargeRuns), so that
// the settled discharges between them are not counted in.
func unsettledWarning(rt BackwaterRating, u rating.Units) string {
	n, worst := 0, 0.0
	for _, row := range rt.Rows {
		if row.Unsettled {
			n++
			worst = math.Max(worst, row.Spread)
		}
	}
	if n == 0 {
		return ""
	}
	return fmt.Sprintf("%s (%s) the profiles from the boundary and the check starts still differ at %s "+
		"by more than %g %s (at most %.3f %s): the reach is too short for the boundary to be forgotten there; "+
		"those rating stages depend on the boundary", atOf(n, len(rt.Rows)),
		dischargeRuns(rt.Rows, u), rt.Section, rt.Tolerance, u.Length(), worst, u.Length())
}

// atOf words k of n discharges: "at 3 of 40 discharges", or "at the one
// discharge" when n is 1.
func atOf(k, n int) string {
	if n == 1 {
		return "at the one discharge"
	}
	return fmt.Sprintf("at %d of %d discharges", k, n)
}

// maxRuns is the most runs of discharges a warning lists before it counts
// the rest.
const maxRuns = 4

// dischargeRuns words the unsettled reads' discharges as runs: the reads
// in ascending order of discharge, each run a stretch of unsettled ones
// between settled ones, written "q" when it holds one discharge and
// "q1 to q2" otherwise, the runs joined by commas and "and", with the
// unit: "1 and 78 to 200 m3/s". Past maxRuns the rest are counted ("1, 3,
// 5 m3/s and 3 more runs").
func dischargeRuns(rows []RatingRead, u rating.Units) string {
	rs := slices.Clone(rows)
	slices.SortStableFunc(rs, func(a, b RatingRead) int { return cmp.Compare(a.Discharge, b.Discharge) })
	var runs []string
	for i := 0; i < len(rs); i++ {
		if !rs[i].Unsettled {
			continue
		}
		j := i
		for j+1 < len(rs) && rs[j+1].Unsettled {
			j++
		}
		lo, hi := rating.PlainFigures(rs[i].Discharge, 4), rating.PlainFigures(rs[j].Discharge, 4)
		if lo == hi {
			runs = append(runs, lo)
		} else {
			runs = append(runs, lo+" to "+hi)
		}
		i = j
	}
	if len(runs) > maxRuns {
		return fmt.Sprintf("%s %s and %d more runs", strings.Join(runs[:maxRuns-1], ", "), u.Discharge(), len(runs)-(maxRuns-1))
	}
	return rating.JoinAnd(runs) + " " + u.Discharge()
}
