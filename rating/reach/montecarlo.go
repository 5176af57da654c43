package reach

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"sort"
	"strings"
	"sync"

	"gonum.org/v1/gonum/stat"

	"wetline/rating"
	"wetline/subdivide"
)

// Defaults of the slope-area uncertainty analysis. They are stated
// assumptions of this project, to be reviewed for each site.
const (
	// DefaultDraws is the number of Monte Carlo draws.
	DefaultDraws = 5000
	// MaxDraws bounds the number of draws (each keeps one discharge).
	MaxDraws = 10_000_000
	// DefaultNCV is the coefficient of variation of each subsection's
	// Manning's n: 0.15 (project default; an assumption about how well n
	// is judged in the field, to be reviewed).
	DefaultNCV = 0.15
	// DefaultMarkSDSI and DefaultMarkSDUS are the standard deviation of one
	// high-water mark's elevation: 0.03 m or 0.10 ft, the band of a "good"
	// mark taken as one standard deviation (bands from Koenig and others,
	// 2016, USGS Techniques and Methods 3-A24; from memory).
	DefaultMarkSDSI = 0.03
	DefaultMarkSDUS = 0.10
	// MaxMarkSDSI and MaxMarkSDUS bound the standard deviation of one
	// mark: 1 m or 3 ft (project bound). A normal spread of 1 m puts a
	// mark's 5th to 95th percentiles 3.3 m apart, eight times the band of
	// a poor mark (±0.40 ft, Koenig and others, 2016, as above) and twenty
	// times the least fall of a subreach (MinFallSI): the marks no longer
	// set a water surface, so more is a slip rather than a judgement of
	// the marks. 3 ft is the same bound in feet (0.91 m), rounded.
	MaxMarkSDSI = 1.0
	MaxMarkSDUS = 3.0
	// ChunkDraws is the number of draws made from one random source. Chunk
	// c of a run with seed s draws from rand.NewPCG(s, c), so the draws do
	// not depend on how many goroutines share the work.
	ChunkDraws = 500
	// SensitivityNStep and SensitivityHStep are the central-difference steps of the sensitivities:
	// 0.001 in n, and 0.001 length unit in a water surface.
	SensitivityNStep = 0.001
	SensitivityHStep = 0.001
	// MilliN is the change of 0.001 in Manning's n in which the
	// sensitivity DQDNPerMilli is stated.
	MilliN = 0.001
)

// MonteCarloOptions configure the uncertainty analysis. The zero value is
// the default of every field.
type MonteCarloOptions struct {
	// Draws is the number of draws (default DefaultDraws).
	Draws int
	// Seed seeds the random sources; equal seeds give equal results.
	Seed uint64
	// NCV is the coefficient of variation of every subsection's n, drawn
	// log-normal with its median at the surveyed n; zero means DefaultNCV,
	// a negative value means no spread.
	NCV float64
	// MarkSD is the standard deviation of one mark's elevation (length
	// unit), drawn normal about the mark; zero means DefaultMarkSDSI or
	// DefaultMarkSDUS; a negative value means no spread of any mark, not
	// even of those whose section sets its own. Otherwise a section's own
	// Section.MarkSD replaces it for that section's marks. It may be at
	// most MaxMarkSDSI or MaxMarkSDUS.
	MarkSD float64
	// Workers is the number of goroutines (default GOMAXPROCS). Results do
	// not depend on it.
	Workers int
	// NErrors says how the errors of n are drawn: NIndependent (the zero
	// value, the default) or NSharedByRegion.
	NErrors NErrors
}

// NErrors says how a Monte Carlo draw spreads Manning's n over a reach.
type NErrors int

const (
	// NIndependent draws the error of every subsection of every section
	// on its own: errors of judgement that differ from place to place
	// partly cancel over a reach, so the band is the narrower. It is the
	// default, kept so that results computed before NSharedByRegion
	// existed are reproduced.
	NIndependent NErrors = iota
	// NSharedByRegion draws one error for each region (left overbank,
	// channel, right overbank) and applies it to every subsection of that
	// region in every section: the same person judges n over the whole
	// reach, so a bias in that judgement is shared and does not cancel,
	// and the band is the wider.
	NSharedByRegion
)

// NErrorWords returns the words of ParseNErrors, in the order of the
// NErrors constants.
func NErrorWords() []string { return []string{"independent", "by-region"} }

// ErrNErrors is returned by ParseNErrors for a word not in NErrorWords.
var ErrNErrors = fmt.Errorf("n errors must be %s", strings.Join(NErrorWords(), " or "))

// ParseNErrors reads one of NErrorWords (case-insensitive).
func ParseNErrors(word string) (NErrors, error) {
	for i, w := range NErrorWords() {
		if strings.EqualFold(strings.TrimSpace(word), w) {
			return NErrors(i), nil
		}
	}
	return NIndependent, fmt.Errorf("%w, not %q", ErrNErrors, word)
}

// String returns the word of e (one of NErrorWords).
func (e NErrors) String() string {
	if w := NErrorWords(); int(e) >= 0 && int(e) < len(w) {
		return w[e]
	}
	return fmt.Sprintf("NErrors(%d)", int(e))
}

// Uncertainty is the spread of a slope-area discharge under uncertain n
// and water surfaces, and its sensitivities.
type Uncertainty struct {
	// Draws is the number of draws made; Failed those without a solution
	// (a dry section, no fall, no real discharge, a subreach gaining
	// energy: SolveSlopeArea), left out of the
	// percentiles.
	Draws, Failed int
	// Seed, NCV and MarkSD are the settings used (MarkSD in length units;
	// zero when no mark was spread, whatever its section's own standard
	// deviation).
	Seed        uint64
	NCV, MarkSD float64
	// NErrors is how the errors of n were drawn.
	NErrors NErrors
	// P05, P50 and P95 are the 5th, 50th and 95th percentiles of the
	// discharge (linear interpolation between order statistics); Mean and
	// SD its mean and standard deviation.
	P05, P50, P95, Mean, SD float64
	// WaterSurfaceSD is the standard deviation of each section's water
	// surface as drawn (length unit), upstream first: the mark standard
	// deviation over √(marks used).
	WaterSurfaceSD []float64
	// DQDN is dQ/dn: the change in discharge per unit change of every n
	// together, in discharge unit per 1 of n (a change of 0.001 in n moves
	// the discharge by DQDNPerMilli), by central differences of
	// SensitivityNStep.
	DQDN float64
	// DQDNPerMilli is the same sensitivity in discharge unit per 0.001 of
	// n (DQDN × MilliN), the unit in which reports quote it.
	DQDNPerMilli float64
	// DQDH is dQ/dh for each section's water surface alone (discharge unit
	// per length unit), upstream first, by central differences of SensitivityHStep.
	DQDH []float64
	// Samples holds the discharges of the successful draws, sorted (for a
	// histogram).
	Samples []float64
}

// saModel is a reach prepared for repeated evaluation.
type saModel struct {
	secs  []Section
	ws    []float64 // water surfaces from the marks
	wsSD  []float64 // standard deviation of each water surface
	nsubs []int     // subsections of each section
	// regions holds each subsection's region, per section; nil when
	// every subsection's n is drawn on its own (NIndependent).
	regions [][]subdivide.Region
	opt     SlopeAreaOptions
}

// saScratch is one goroutine's working space.
type saScratch struct {
	ws   []float64
	nmul [][]float64
	sts  []saSectionState
}

func (m *saModel) newSAScratch() *saScratch {
	s := &saScratch{ws: make([]float64, len(m.secs)), nmul: make([][]float64, len(m.secs)),
		sts: make([]saSectionState, len(m.secs))}
	for i, n := range m.nsubs {
		s.nmul[i] = make([]float64, n)
		for j := range s.nmul[i] {
			s.nmul[i][j] = 1
		}
	}
	return s
}

// eval solves the reach with the scratch space's water surfaces and n factors.
func (m *saModel) eval(s *saScratch) (float64, error) {
	for i, sec := range m.secs {
		if err := saState(sec.Geometry, s.ws[i], s.nmul[i], m.opt.Geometry, m.opt.Units, &s.sts[i]); err != nil {
			return math.NaN(), err
		}
	}
	return saReachQ(m.secs, s.ws, s.sts, m.opt.Units)
}

// MonteCarlo estimates the uncertainty of the slope-area discharge of a
// reach: each draw takes every subsection's n from a log-normal
// distribution with median the surveyed n and coefficient of variation
// NCV,
//
//	ln n ~ N(ln n_surveyed, σ²),   σ = √ln(1 + CV²),
//
// and every section's water surface from a normal distribution about the
// value from its marks with standard deviation MarkSD/√m for the mean of
// m marks (marks independent), then solves the whole reach. By default
// (NIndependent) the n of every subsection of every section is drawn on
// its own; with NSharedByRegion one factor exp(σ·z) is drawn for each
// region (left overbank, channel, right overbank) and multiplies the n of
// every subsection in that region of every section, the errors of one
// person's judgement of n over a reach being shared. Water surfaces are
// drawn independently between sections either way. The result holds the
// 5th, 50th and 95th percentiles, mean and standard deviation of the
// discharge (discharge unit of opt.Units) over the draws that solve, and
// the sensitivities dQ/dn and dQ/dh by central differences. Draw d comes
// from the random source of its chunk (see ChunkDraws), so the result
// depends on mc.Seed alone, not on mc.Workers.
//
// Preconditions: at least two sections, and the reach must solve
// (SolveSlopeArea returns no error). Errors: ErrTooFewSections, the
// reach's own error, an error for more than MaxDraws draws, or ErrMarkSD
// for a mark standard deviation above MaxMarkSD.
//
// References:
//
//	Dalrymple, T., and Benson, M.A., 1967, Measurement of peak discharge by
//	the slope-area method: USGS TWRI, book 3, chap. A2 (the equation solved
//	in every draw); Monte Carlo propagation of the n and mark errors is
//	common practice.
func MonteCarlo(secs []Section, opt SlopeAreaOptions, mc MonteCarloOptions) (Uncertainty, error) {
	var res SlopeArea
	if len(secs) < 2 {
		return Uncertainty{}, ErrTooFewSections
	}
	ws, used, sts, err := saPrepare(secs, opt, &res)
	if err != nil {
		return Uncertainty{}, err
	}
	if _, err := saReachQ(secs, ws, sts, opt.Units); err != nil {
		return Uncertainty{}, err
	}
	u, err := mc.settings(opt.Units)
	if err != nil {
		return Uncertainty{}, err
	}
	m := &saModel{secs: secs, ws: ws, wsSD: make([]float64, len(secs)), nsubs: make([]int, len(secs)), opt: opt}
	for i, s := range secs {
		sd := u.MarkSD
		if s.MarkSD > 0 && mc.MarkSD >= 0 {
			sd = s.MarkSD
		}
		m.wsSD[i] = sd / math.Sqrt(float64(used[i]))
		m.nsubs[i] = len(sts[i].w.Subs)
	}
	if mc.NErrors == NSharedByRegion {
		m.regions = make([][]subdivide.Region, len(secs))
		for i := range secs {
			for _, sw := range sts[i].w.Subs {
				m.regions[i] = append(m.regions[i], sw.Region)
			}
		}
	}
	u.NErrors = mc.NErrors
	u.WaterSurfaceSD = append([]float64(nil), m.wsSD...)
	u.DQDN, u.DQDH = m.sensitivities(sts)
	u.DQDNPerMilli = u.DQDN * MilliN
	u.summarise(m.draws(u.Draws, math.Sqrt(math.Log1p(u.NCV*u.NCV)), mc.Seed, mc.Workers))
	return u, nil
}

// ErrMarkSD is returned for a standard deviation of a mark above
// MaxMarkSDSI or MaxMarkSDUS.
var ErrMarkSD = errors.New("standard deviation of a mark too large")

// MaxMarkSD returns the largest standard deviation of one mark that
// MonteCarlo takes in the length unit of u (MaxMarkSDSI or MaxMarkSDUS).
func MaxMarkSD(u rating.Units) float64 {
	if u == rating.US {
		return MaxMarkSDUS
	}
	return MaxMarkSDSI
}

// settings returns the uncertainty with the settings of mc in force
// (defaults for zero values, no spread for negative ones), and an error
// for more than MaxDraws draws or a mark standard deviation above
// MaxMarkSD (wrapping ErrMarkSD).
func (mc MonteCarloOptions) settings(units rating.Units) (Uncertainty, error) {
	u := Uncertainty{Draws: mc.Draws, Seed: mc.Seed, NCV: mc.NCV, MarkSD: mc.MarkSD}
	if u.Draws <= 0 {
		u.Draws = DefaultDraws
	}
	if u.Draws > MaxDraws {
		return Uncertainty{}, fmt.Errorf("%d draws is more than %d", u.Draws, MaxDraws)
	}
	if lim := MaxMarkSD(units); u.MarkSD > lim {
		return Uncertainty{}, fmt.Errorf("%w: %g %s is more than %g %s (the marks would no longer set a water surface)",
			ErrMarkSD, u.MarkSD, units.Length(), lim, units.Length())
	}
	switch {
	case u.NCV == 0:
		u.NCV = DefaultNCV
	case u.NCV < 0:
		u.NCV = 0
	}
	switch {
	case u.MarkSD == 0 && units == rating.US:
		u.MarkSD = DefaultMarkSDUS
	case u.MarkSD == 0:
		u.MarkSD = DefaultMarkSDSI
	case u.MarkSD < 0:
		u.MarkSD = 0
	}
	return u, nil
}

// draws returns the discharge of each of n draws (NaN where the reach
// does not solve), sigma being the standard deviation of ln n. Chunks of
// ChunkDraws draws are shared among workers goroutines (default
// GOMAXPROCS); chunk c draws from rand.NewPCG(seed, c).
func (m *saModel) draws(n int, sigma float64, seed uint64, workers int) []float64 {
	q := make([]float64, n)
	chunks := (n + ChunkDraws - 1) / ChunkDraws
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = min(workers, chunks)
	next := make(chan int, chunks)
	for c := range chunks {
		next <- c
	}
	close(next)
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			s := m.newSAScratch()
			for c := range next {
				rng := rand.New(rand.NewPCG(seed, uint64(c)))
				for d := c * ChunkDraws; d < min((c+1)*ChunkDraws, n); d++ {
					q[d] = m.drawOne(s, rng, sigma)
				}
			}
		}()
	}
	wg.Wait()
	return q
}

// drawOne draws every section's water surface and every subsection's n
// factor into s from rng and returns the reach's discharge (NaN when it
// does not solve).
func (m *saModel) drawOne(s *saScratch, rng *rand.Rand, sigma float64) float64 {
	if m.regions != nil {
		var f [3]float64 // by subdivide.Region
		for k := range f {
			f[k] = math.Exp(sigma * rng.NormFloat64())
		}
		for i := range m.secs {
			s.ws[i] = m.ws[i] + m.wsSD[i]*rng.NormFloat64()
			for j := range s.nmul[i] {
				s.nmul[i][j] = f[m.regions[i][j]]
			}
		}
	} else {
		for i := range m.secs {
			s.ws[i] = m.ws[i] + m.wsSD[i]*rng.NormFloat64()
			for j := range s.nmul[i] {
				s.nmul[i][j] = math.Exp(sigma * rng.NormFloat64())
			}
		}
	}
	v, err := m.eval(s)
	if err != nil {
		v = math.NaN()
	}
	return v
}

// summarise sets the failed count, the sorted samples and their
// percentiles, mean and standard deviation (NaN when no draw solved)
// from the draws' discharges q, which it reuses.
func (u *Uncertainty) summarise(q []float64) {
	ok := q[:0]
	for _, v := range q {
		if math.IsNaN(v) {
			u.Failed++
			continue
		}
		ok = append(ok, v)
	}
	sort.Float64s(ok)
	u.Samples = ok
	u.P05, u.P50, u.P95, u.Mean, u.SD = math.NaN(), math.NaN(), math.NaN(), math.NaN(), math.NaN()
	if len(ok) > 0 {
		u.P05 = stat.Quantile(0.05, stat.LinInterp, ok, nil)
		u.P50 = stat.Quantile(0.50, stat.LinInterp, ok, nil)
		u.P95 = stat.Quantile(0.95, stat.LinInterp, ok, nil)
		u.Mean, u.SD = stat.MeanStdDev(ok, nil)
	}
}

// sensitivities returns dQ/dn (every n changed by the same amount) and
// dQ/dh for each water surface, by central differences.
func (m *saModel) sensitivities(base []saSectionState) (dqdn float64, dqdh []float64) {
	s := m.newSAScratch()
	copy(s.ws, m.ws)
	qAt := func() float64 {
		v, err := m.eval(s)
		if err != nil {
			return math.NaN()
		}
		return v
	}
	setN := func(dn float64) {
		for i := range m.secs {
			for j, sw := range base[i].w.Subs {
				s.nmul[i][j] = 1
				if sw.N > 0 {
					s.nmul[i][j] = (sw.N + dn) / sw.N
				}
			}
		}
	}
	setN(SensitivityNStep)
	hi := qAt()
	setN(-SensitivityNStep)
	lo := qAt()
	dqdn = (hi - lo) / (2 * SensitivityNStep)
	setN(0)
	dqdh = make([]float64, len(m.secs))
	for i := range m.secs {
		s.ws[i] = m.ws[i] + SensitivityHStep
		hi := qAt()
		s.ws[i] = m.ws[i] - SensitivityHStep
		lo := qAt()
		s.ws[i] = m.ws[i]
		dqdh[i] = (hi - lo) / (2 * SensitivityHStep)
	}
	return dqdn, dqdh
}

// String summarises the band, e.g. "p05 410, p50 452, p95 497 (5000 draws)".
func (u Uncertainty) String() string {
	return fmt.Sprintf("p05 %s, p50 %s, p95 %s (%d draws, %d failed)",
		saSig(u.P05), saSig(u.P50), saSig(u.P95), u.Draws, u.Failed)
}
