package subdivide

import (
	"cmp"
	"fmt"
	"math"
	"slices"
)

// StageFunc receives the wetted geometry of stage number i (an index into
// the stages given to Sweep). err is what At would return for that stage
// (a non-finite stage, or a stage above an end with Options.NoExtend); w is
// meaningful only when err is nil. Returning an error stops the sweep.
type StageFunc func(i int, w Wetted, err error) error

// Sweep computes the wetted geometry at many stages in one pass: for every
// stage it yields exactly what At returns (to rounding), but it visits the
// stages in ascending order and carries the ground that is already wet from
// one stage to the next instead of clipping the whole section again.
//
// fn is called once per stage: first for every non-finite stage, in input
// order, then for the others in ascending order of stage (equal stages in
// input order). The stages slice is not modified.
//
// Method. A segment from (x1,z1) to (x2,z2) is dry while the shifted stage
// h ≤ min(z1,z2), partly wet while min(z1,z2) < h ≤ max(z1,z2) and fully
// wet above. Segments enter the partly wet set as h passes their low end
// and move to running sums as h passes their high end; only the partly wet
// set is clipped at each stage. A fully wet segment of horizontal length
// dx contributes a constant perimeter and top width, and its area and
// first moment about the surface grow with h as
//
//	A(h+δ) = A(h) + T·δ
//	M(h+δ) = M(h) + A(h)·δ + T·δ²/2
//
// which holds for the sums over all fully wet segments alike (T their total
// width). The sums are carried forward with δ ≥ 0 between consecutive
// stages, so every term added is non-negative and no cancellation occurs;
// a segment's own contribution is computed exactly as in At at the first
// stage where it is fully wet. The number of separate pools is
// (partly wet segments + wet ends)/2, since every wetted reach is bounded
// by a partly wet segment or an end of the section on each side.
//
// With Options.Connected the wetted reach holding the main channel's lowest
// point only grows as the stage rises: its bounding dry points move outward
// monotonically, so they are tracked by two pointers and the reach between
// them is fully wet but for its two boundary segments.
//
// Cost: sorting the segment ends, O(N log N) for N points, plus O(S + P)
// per stage for S subsections and P partly wet segments (a handful on an
// ordinary section), plus O(M log M) to sort M stages. At clips all N
// segments at every stage, O(N·M).
func (p *Profile) Sweep(stages []float64, opt Options, fn StageFunc) error {
	order := make([]int, 0, len(stages))
	for i, s := range stages {
		if math.IsNaN(s) || math.IsInf(s, 0) {
			w, err := p.At(s, opt)
			if e := fn(i, w, err); e != nil {
				return e
			}
			continue
		}
		order = append(order, i)
	}
	slices.SortStableFunc(order, func(a, b int) int { return cmp.Compare(stages[a], stages[b]) })
	sw := newSweeper(p, opt)
	for _, i := range order {
		w, err := sw.at(stages[i])
		if e := fn(i, w, err); e != nil {
			return e
		}
	}
	return nil
}

// endKey is a segment index with the elevation of one of its ends.
type endKey struct {
	z float64
	i int32
}

// sweeper holds the state of one Sweep between stages.
type sweeper struct {
	p   *Profile
	opt Options
	// h is the shifted stage the running sums hold; started is false
	// before the first stage.
	h       float64
	started bool
	// Running sums over fully wet segments at stage h: per subsection
	// area, top width and perimeter, and over all of them area, top width
	// and first moment about the surface.
	subA, subT, subP    []float64
	area, width, moment float64
	byLow, byHigh       []endKey // segments by low and by high end
	nLow, nHigh         int      // how many of each have been passed
	partly              []int32  // partly wet segments, any order
	slot                []int32  // index of a segment in partly, or -1
	connected, chanWet  bool
	left, right         int // Connected: dry points bounding the reach
	subTemplate         []SubWetted
	nv                  int // number of points
}

func newSweeper(p *Profile, opt Options) *sweeper {
	n := len(p.xs)
	s := &sweeper{
		p: p, opt: opt,
		subA: make([]float64, len(p.subs)), subT: make([]float64, len(p.subs)), subP: make([]float64, len(p.subs)),
		connected: opt.Connected,
		nv:        n,
	}
	s.subTemplate = make([]SubWetted, len(p.subs))
	for i, sub := range p.subs {
		s.subTemplate[i].Subsection = sub
	}
	if !opt.Connected {
		s.byLow = make([]endKey, n-1)
		s.byHigh = make([]endKey, n-1)
		s.slot = make([]int32, n-1)
		for i := 0; i < n-1; i++ {
			z1, z2 := p.zs[i], p.zs[i+1]
			s.byLow[i] = endKey{math.Min(z1, z2), int32(i)}
			s.byHigh[i] = endKey{math.Max(z1, z2), int32(i)}
			s.slot[i] = -1
		}
		byZ := func(a, b endKey) int { return cmp.Compare(a.z, b.z) }
		slices.SortFunc(s.byLow, byZ)
		slices.SortFunc(s.byHigh, byZ)
	}
	return s
}

// advance carries the running sums from the last stage to shifted stage h.
func (s *sweeper) advance(h float64) {
	if !s.started {
		s.h, s.started = h, true
		return
	}
	d := h - s.h
	s.h = h
	if d <= 0 {
		return
	}
	s.moment += d*s.area + d*d*s.width/2
	s.area += d * s.width
	for k, t := range s.subT {
		if t != 0 {
			s.subA[k] += d * t
		}
	}
}

// addFull moves segment i into the running sums at shifted stage h.
func (s *sweeper) addFull(i int, h float64) {
	p := s.p
	a, perim, width, mom := segment(p.xs[i], p.zs[i], p.xs[i+1], p.zs[i+1], h)
	k := p.seg[i]
	s.subA[k] += a
	s.subT[k] += width
	s.subP[k] += perim
	s.area += a
	s.width += width
	s.moment += mom
}

// addPart adds the clipped contribution of segment i at shifted stage h
// to w and returns its moment.
func (s *sweeper) addPart(w *Wetted, i int, h float64) float64 {
	p := s.p
	a, perim, width, mom := segment(p.xs[i], p.zs[i], p.xs[i+1], p.zs[i+1], h)
	sw := &w.Subs[p.seg[i]]
	sw.Area += a
	sw.WettedPerimeter += perim
	sw.TopWidth += width
	return mom
}

// at returns the wetted geometry at a finite stage not below the last one.
func (s *sweeper) at(stage float64) (Wetted, error) {
	p := s.p
	w := Wetted{Stage: stage, Subs: make([]SubWetted, len(s.subTemplate))}
	copy(w.Subs, s.subTemplate)
	h := stage - p.z0
	s.advance(h)
	n := s.nv
	var moment float64
	wallLeft, wallRight := false, false
	if s.connected {
		k := p.chanLow
		if h-p.zs[k] <= 0 {
			return p.finish(w), nil
		}
		if !s.chanWet {
			s.chanWet = true
			s.left, s.right = k-1, k+1
		}
		for s.left >= 0 && p.zs[s.left] < h {
			s.addFull(s.left, h)
			s.left--
		}
		for s.right <= n-1 && p.zs[s.right] < h {
			s.addFull(s.right-1, h)
			s.right++
		}
		s.fillSums(&w)
		moment = s.moment
		if s.left >= 0 {
			moment += s.addPart(&w, s.left, h)
		}
		if s.right <= n-1 {
			moment += s.addPart(&w, s.right-1, h)
		}
		w.Pools = 1
		wallLeft, wallRight = s.left < 0, s.right > n-1
	} else {
		for s.nLow < len(s.byLow) && s.byLow[s.nLow].z < h {
			i := s.byLow[s.nLow].i
			s.slot[i] = int32(len(s.partly))
			s.partly = append(s.partly, i)
			s.nLow++
		}
		for s.nHigh < len(s.byHigh) && s.byHigh[s.nHigh].z < h {
			i := s.byHigh[s.nHigh].i
			// Remove i from the partly wet set: move the last one into its slot.
			j := s.slot[i]
			last := s.partly[len(s.partly)-1]
			s.partly[j] = last
			s.slot[last] = j
			s.partly = s.partly[:len(s.partly)-1]
			s.slot[i] = -1
			s.addFull(int(i), h)
			s.nHigh++
		}
		s.fillSums(&w)
		moment = s.moment
		for _, i := range s.partly {
			moment += s.addPart(&w, int(i), h)
		}
		ends := 0
		if p.zs[0] < h {
			ends++
		}
		if p.zs[n-1] < h {
			ends++
		}
		w.Pools = (len(s.partly) + ends) / 2
		wallLeft, wallRight = true, true
	}
	if err := p.walls(&w, h, stage, wallLeft, wallRight, s.opt.NoExtend); err != nil {
		return w, err
	}
	for _, sw := range w.Subs {
		w.Area += sw.Area
		w.WettedPerimeter += sw.WettedPerimeter
		w.TopWidth += sw.TopWidth
	}
	w = p.finish(w)
	if w.Area > 0 {
		w.CentroidDepth = moment / w.Area
	}
	return w, nil
}

// fillSums copies the running sums of fully wet ground into w.Subs.
func (s *sweeper) fillSums(w *Wetted) {
	for k := range w.Subs {
		w.Subs[k].Area = s.subA[k]
		w.Subs[k].TopWidth = s.subT[k]
		w.Subs[k].WettedPerimeter = s.subP[k]
	}
}

// walls adds the vertical walls above the ends that the counted water
// reaches (left and right say which ends it may reach), as At does, or
// returns At's error when noExtend is set.
func (p *Profile) walls(w *Wetted, h, stage float64, left, right, noExtend bool) error {
	n := len(p.zs)
	if d := h - p.zs[0]; d > 0 && left {
		if noExtend {
			return fmt.Errorf("stage %g is %g above the left end: %w", stage, d, ErrAboveEnds)
		}
		w.ExtendedLeft = d
		w.Subs[p.seg[0]].WettedPerimeter += d
	}
	if d := h - p.zs[n-1]; d > 0 && right {
		if noExtend {
			return fmt.Errorf("stage %g is %g above the right end: %w", stage, d, ErrAboveEnds)
		}
		w.ExtendedRight = d
		w.Subs[p.seg[n-2]].WettedPerimeter += d
	}
	return nil
}
