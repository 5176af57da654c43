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
// wet above. Each segment is put in the bucket of the first stage that
// wets it and of the first that wets it fully; as the sweep reaches a
// stage, the segments of its buckets enter the partly wet set or move from
// it to running sums. Only the partly wet set is clipped at each stage. A
// fully wet segment of horizontal length dx contributes a constant
// perimeter and top width, and its area and first moment about the
// surface grow with h as
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
// By default (without Options.AllPools) the wetted reach holding the main channel's lowest
// point only grows as the stage rises: its bounding dry points move outward
// monotonically, so they are tracked by two pointers and the reach between
// them is fully wet but for its two boundary segments.
//
// Cost, for N points, M stages, S subsections and P partly wet segments
// (a handful on an ordinary section): O(M log M) to sort the stages,
// O(N) to fill the buckets when the ground changes gradually from point
// to point (O(N log M) at worst), and O(S + P) per stage. At clips all N
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
	hs := make([]float64, len(order)) // shifted stages, ascending
	for k, i := range order {
		hs[k] = stages[i] - p.z0
	}
	sw := newSweeper(p, opt, hs)
	var all *sweeper // every pool, for the water left standing in pockets
	if !opt.AllPools && p.pockets {
		all = newSweeper(p, Options{AllPools: true}, hs)
	}
	for k, i := range order {
		w, err := sw.at(k, stages[i])
		if all != nil {
			aw, aerr := all.at(k, stages[i])
			if err == nil && aerr == nil && aw.Pools > w.Pools {
				w.Ponded, w.PondedPools = math.Max(0, aw.Area-w.Area), aw.Pools-w.Pools
			}
		}
		if e := fn(i, w, err); e != nil {
			return e
		}
	}
	return nil
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
	subA, subT, subP []float64
	// subBuf is the unused rest of the current block of subsection slices.
	subBuf              []SubWetted
	area, width, moment float64
	// Buckets by stage number k (compressed rows): segments that become
	// partly wet at stage k are enter[enterAt[k]:enterAt[k+1]], those that
	// become fully wet full[fullAt[k]:fullAt[k+1]], in increasing order.
	enter, enterAt, full, fullAt []int32
	partly                       []int32 // partly wet segments, any order
	slot                         []int32 // index of a segment in partly, or -1
	connected, chanWet           bool
	left, right                  int // connected: dry points bounding the reach
	subTemplate                  []SubWetted
	nv                           int // number of points
}

// newSweeper prepares a sweep over the shifted stages hs (ascending).
//
// With Options.AllPools every segment is put in the bucket of the
// first stage that wets it and of the first that wets it fully. A point
// at shifted elevation z is first wet at stage number k(z), the first k
// with hs[k] > z; a segment is partly wet from min(k(z1), k(z2)) and
// fully wet from max(k(z1), k(z2)). k(z) is found by a galloping search
// from the neighbouring point's k, so on ground that changes gradually it
// costs O(1) per point, and O(log M) at worst, for M stages; filling the
// buckets is a counting sort, O(N + M).
func newSweeper(p *Profile, opt Options, hs []float64) *sweeper {
	n := len(p.xs)
	s := &sweeper{
		p: p, opt: opt,
		subA: make([]float64, len(p.subs)), subT: make([]float64, len(p.subs)), subP: make([]float64, len(p.subs)),
		connected: !opt.AllPools,
		nv:        n,
	}
	s.subTemplate = make([]SubWetted, len(p.subs))
	for i, sub := range p.subs {
		s.subTemplate[i].Subsection = sub
	}
	if !opt.AllPools {
		return s
	}
	m := len(hs)
	kv := make([]int32, n) // stage number at which each point is first wet
	k := 0
	for j, z := range p.zs {
		k = firstAbove(hs, z, k)
		kv[j] = int32(k)
	}
	s.enterAt = make([]int32, m+2)
	s.fullAt = make([]int32, m+2)
	for i := 0; i < n-1; i++ {
		lo, hi := min(kv[i], kv[i+1]), max(kv[i], kv[i+1])
		if lo < hi {
			s.enterAt[lo+2]++
		}
		if int(hi) < m {
			s.fullAt[hi+2]++
		}
	}
	for k := 2; k < m+2; k++ {
		s.enterAt[k] += s.enterAt[k-1]
		s.fullAt[k] += s.fullAt[k-1]
	}
	s.enter = make([]int32, s.enterAt[m+1])
	s.full = make([]int32, s.fullAt[m+1])
	for i := 0; i < n-1; i++ {
		lo, hi := min(kv[i], kv[i+1]), max(kv[i], kv[i+1])
		if lo < hi {
			s.enter[s.enterAt[lo+1]] = int32(i)
			s.enterAt[lo+1]++
		}
		if int(hi) < m {
			s.full[s.fullAt[hi+1]] = int32(i)
			s.fullAt[hi+1]++
		}
	}
	s.slot = make([]int32, n-1)
	for i := range s.slot {
		s.slot[i] = -1
	}
	return s
}

// firstAbove returns the first index k with hs[k] > z (len(hs) if none),
// searching outward from the guess k0.
func firstAbove(hs []float64, z float64, k0 int) int {
	m := len(hs)
	k0 = min(k0, m)
	// Bracket the answer in (lo, hi]: hs[lo] <= z (or lo = -1), hs[hi] > z
	// (or hi = m), galloping away from k0.
	lo, hi := -1, m
	if k0 == m || hs[k0] > z {
		hi = k0
		step := 1
		for lo = k0 - 1; lo >= 0 && hs[lo] > z; lo -= step {
			hi = lo
			step *= 2
		}
		lo = max(lo, -1)
	} else {
		lo = k0
		step := 1
		for hi = lo + 1; hi < m && hs[hi] <= z; hi += step {
			lo = hi
			step *= 2
		}
		hi = min(hi, m)
	}
	for hi-lo > 1 {
		mid := int(uint(lo+hi) >> 1)
		if hs[mid] > z {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi
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

// subsBlock is how many stages' subsection slices are allocated at once.
const subsBlock = 256

// newSubs returns a fresh slice for one stage's subsections, cut from a
// block shared with the next stages (each stage keeps its own part, so a
// caller may hold on to it) to spare the allocator one call per stage.
func (s *sweeper) newSubs() []SubWetted {
	ns := len(s.subTemplate)
	if len(s.subBuf) < ns {
		s.subBuf = make([]SubWetted, ns*subsBlock)
	}
	out := s.subBuf[:ns:ns]
	s.subBuf = s.subBuf[ns:]
	return out
}

// at returns the wetted geometry at stage number k, a finite stage not
// below the last one.
func (s *sweeper) at(k int, stage float64) (Wetted, error) {
	p := s.p
	w := Wetted{Stage: stage, Subs: s.newSubs()}
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
		for _, i := range s.enter[s.enterAt[k]:s.enterAt[k+1]] {
			s.slot[i] = int32(len(s.partly))
			s.partly = append(s.partly, i)
		}
		for _, i := range s.full[s.fullAt[k]:s.fullAt[k+1]] {
			if j := s.slot[i]; j >= 0 {
				// Remove i from the partly wet set: move the last one into its slot.
				last := s.partly[len(s.partly)-1]
				s.partly[j] = last
				s.slot[last] = j
				s.partly = s.partly[:len(s.partly)-1]
				s.slot[i] = -1
			}
			s.addFull(int(i), h)
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
	return p.total(w, moment), nil
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
			return fmt.Errorf("stage %.6g is %.4g above the left end (elevation %.6g): %w", stage, d, p.zs[0]+p.z0, ErrAboveEnds)
		}
		w.ExtendedLeft = d
		w.Subs[p.seg[0]].WettedPerimeter += d
	}
	if d := h - p.zs[n-1]; d > 0 && right {
		if noExtend {
			return fmt.Errorf("stage %.6g is %.4g above the right end (elevation %.6g): %w", stage, d, p.zs[n-1]+p.z0, ErrAboveEnds)
		}
		w.ExtendedRight = d
		w.Subs[p.seg[n-2]].WettedPerimeter += d
	}
	return nil
}
