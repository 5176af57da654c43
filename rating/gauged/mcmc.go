package gauged

import (
	"math"
	"math/rand/v2"
	"runtime"
	"sort"
	"sync"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/gonum/stat/samplemv"
)

// Settings of the adaptive Metropolis sampler.
const (
	// RHatLimit is the potential scale reduction above which chains are
	// taken to disagree (common practice, after Gelman et al., 2013).
	RHatLimit = 1.05
	// amScale² / d scales a covariance into a random-walk proposal in d
	// dimensions (Haario, Saksman & Tamminen, 2001, after Gelman, Roberts
	// & Gilks, 1996): amScale = 2.38.
	amScale = 2.38
	// amEpsilon is the regularisation of a pilot covariance, as a
	// fraction of each parameter's squared scale (Haario et al.'s ε).
	amEpsilon = 1e-10
	// pilotRounds is the number of pilot runs, each followed by an
	// adaptation of the proposal.
	pilotRounds = 3
	// pilotMinAccept is the pilot acceptance rate below which the
	// proposal is shrunk by pilotShrink instead of adapted.
	pilotMinAccept, pilotShrink = 0.02, 0.1
	// chunkIterations is the fixed length of the chunks a chain is
	// sampled in.
	chunkIterations = 1000
	// startTries bounds the draws of an overdispersed start.
	startTries = 100
	// startSpread scales the Laplace standard deviations of the
	// overdispersed starts of the chains.
	startSpread = 2.0
	// stuckSpread is the standard deviation, in parameter scales, of the
	// proposal when the adapted one is not positive definite.
	stuckSpread = 1e-4
)

// logTarget adapts a log density to distmv.LogProber.
type logTarget func([]float64) float64

// LogProb returns the log density at x.
func (t logTarget) LogProb(x []float64) float64 { return t(x) }

// walkProposal is a symmetric multivariate normal random walk,
// x = y + L·z with L the Cholesky factor of its covariance. Being
// symmetric, its conditional log densities cancel in the acceptance ratio
// and are returned as 0.
type walkProposal struct {
	l   mat.TriDense
	rnd *rand.Rand
	z   []float64
}

// newWalk returns the proposal of covariance cov, or ok false when cov is
// not positive definite.
func newWalk(cov *mat.SymDense, rnd *rand.Rand) (*walkProposal, bool) {
	var ch mat.Cholesky
	if !ch.Factorize(cov) {
		return nil, false
	}
	w := &walkProposal{rnd: rnd, z: make([]float64, cov.SymmetricDim())}
	ch.LTo(&w.l)
	return w, true
}

// ConditionalLogProb is 0: the walk is symmetric.
func (w *walkProposal) ConditionalLogProb(x, y []float64) float64 { return 0 }

// ConditionalRand draws x = y + L·z.
func (w *walkProposal) ConditionalRand(x, y []float64) []float64 {
	if x == nil {
		x = make([]float64, len(y))
	}
	for i := range w.z {
		w.z[i] = w.rnd.NormFloat64()
	}
	n := len(y)
	for i := 0; i < n; i++ {
		s := y[i]
		for j := 0; j <= i; j++ {
			s += w.l.At(i, j) * w.z[j]
		}
		x[i] = s
	}
	return x
}

// chainSpec is the work of one chain.
type chainSpec struct {
	start []float64
	cov0  *mat.SymDense // starting proposal covariance
	src   rand.Source
	pilot int // pilot iterations in all
	draws int // kept iterations
}

// chainResult is one chain's kept draws (draws × d, row-major) and its
// acceptance rate over them.
type chainResult struct {
	draws      []float64
	acceptance float64
}

// sampleChunks runs n iterations of Metropolis–Hastings (gonum samplemv)
// from cur with proposal prop, in chunks of chunkIterations; it returns
// the draws (n × d, row-major), the number accepted and the last state.
func sampleChunks(target logTarget, prop *walkProposal, src rand.Source, cur []float64, n int) ([]float64, int, []float64) {
	d := len(cur)
	out := make([]float64, 0, n*d)
	accepted := 0
	cur = append([]float64(nil), cur...)
	for done := 0; done < n; {
		m := min(chunkIterations, n-done)
		batch := mat.NewDense(m, d, nil)
		samplemv.MetropolisHastingser{Initial: cur, Target: target, Proposal: prop, Src: src}.Sample(batch)
		raw := batch.RawMatrix()
		prev := cur
		for i := 0; i < m; i++ {
			row := raw.Data[i*raw.Stride : i*raw.Stride+d]
			if !equalRows(row, prev) {
				accepted++
			}
			prev = row
			out = append(out, row...)
		}
		cur = append([]float64(nil), prev...)
		done += m
	}
	return out, accepted, cur
}

// equalRows reports identical vectors (a rejected proposal repeats the state).
func equalRows(a, b []float64) bool {
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// runChain runs one chain: pilotRounds pilot runs, each followed by the
// adaptation of the proposal to amScale²/d times the pilot's covariance
// (or a shrink when the pilot hardly moved), then the kept draws with the
// proposal fixed.
func runChain(target logTarget, c chainSpec, scale []float64) chainResult {
	d := len(c.start)
	rnd := rand.New(c.src)
	cov := mat.NewSymDense(d, nil)
	cov.CopySym(c.cov0)
	cur := c.start
	per := c.pilot / pilotRounds
	for round := 0; round < pilotRounds && per > 0; round++ {
		prop, ok := newWalk(cov, rnd)
		if !ok {
			break
		}
		var draws []float64
		var acc int
		draws, acc, cur = sampleChunks(target, prop, c.src, cur, per)
		if float64(acc)/float64(per) < pilotMinAccept {
			cov.ScaleSym(pilotShrink, cov)
			continue
		}
		if next, ok := adapted(draws, d, scale); ok {
			cov = next
		}
	}
	prop, ok := newWalk(cov, rnd)
	if !ok {
		prop, _ = newWalk(diagonal(scale, stuckSpread), rnd)
	}
	draws, acc, _ := sampleChunks(target, prop, c.src, cur, c.draws)
	return chainResult{draws: draws, acceptance: float64(acc) / float64(c.draws)}
}

// adapted returns amScale²/d·(Σ + ε·diag(scale²)) for the covariance Σ of
// pilot draws (n × d, row-major); ok is false when it is not positive
// definite.
func adapted(draws []float64, d int, scale []float64) (*mat.SymDense, bool) {
	n := len(draws) / d
	if n < 2 {
		return nil, false
	}
	var cov mat.SymDense
	stat.CovarianceMatrix(&cov, mat.NewDense(n, d, draws), nil)
	f := amScale * amScale / float64(d)
	out := mat.NewSymDense(d, nil)
	for i := 0; i < d; i++ {
		for j := i; j < d; j++ {
			v := cov.At(i, j)
			if i == j {
				v += amEpsilon * scale[i] * scale[i]
			}
			out.SetSym(i, j, f*v)
		}
	}
	var ch mat.Cholesky
	return out, ch.Factorize(out)
}

// diagonal returns diag((f·scale)²).
func diagonal(scale []float64, f float64) *mat.SymDense {
	s := mat.NewSymDense(len(scale), nil)
	for i, v := range scale {
		s.SetSym(i, i, f*f*v*v)
	}
	return s
}

// runChains runs the chains on up to GOMAXPROCS goroutines. Each chain
// has its own source and writes only its own result, so the output does
// not depend on the number of cores or the order the chains run in.
func runChains(target logTarget, specs []chainSpec, scale []float64) []chainResult {
	out := make([]chainResult, len(specs))
	work := make(chan int)
	var wg sync.WaitGroup
	for w := 0; w < min(runtime.GOMAXPROCS(0), len(specs)); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range work {
				out[i] = runChain(target, specs[i], scale)
			}
		}()
	}
	for i := range specs {
		work <- i
	}
	close(work)
	wg.Wait()
	return out
}

// column returns parameter j of chain c's draws, from draw a to b.
func column(c chainResult, d, j, a, b int) []float64 {
	out := make([]float64, 0, b-a)
	for i := a; i < b; i++ {
		out = append(out, c.draws[i*d+j])
	}
	return out
}

// RHat returns the potential scale reduction factor of one parameter over
// chains (each a slice of draws of equal length n ≥ 4), computed on the
// two halves of every chain:
//
//	W = mean of the within-half variances,  B/n' = variance of the half means,
//	V = (n' − 1)/n'·W + B/n',              R̂ = √(V/W),
//
// with n' = n/2. It is NaN for fewer than four draws, 1 when every draw is
// the same (W = 0 and B = 0) and +Inf when the halves are constant but
// differ.
//
// References:
//
//	Gelman, A., Rubin, D. B. (1992). Inference from iterative simulation
//	using multiple sequences. Statistical Science 7(4), 457–472.
//	Gelman, A., Carlin, J. B., Stern, H. S., Dunson, D. B., Vehtari, A.,
//	Rubin, D. B. (2013). Bayesian Data Analysis, 3rd ed. CRC Press,
//	section 11.4 (split chains).
func RHat(chains [][]float64) float64 {
	var halves [][]float64
	for _, c := range chains {
		h := len(c) / 2
		if h < 2 {
			return math.NaN()
		}
		halves = append(halves, c[:h], c[len(c)-h:])
	}
	n := len(halves[0])
	for _, h := range halves {
		n = min(n, len(h))
	}
	means := make([]float64, len(halves))
	var w float64
	for i, h := range halves {
		h = h[:n]
		m, v := stat.MeanVariance(h, nil)
		means[i] = m
		w += v / float64(len(halves))
	}
	bn := stat.Variance(means, nil)
	if w == 0 {
		if bn == 0 {
			return 1
		}
		return math.Inf(1)
	}
	fn := float64(n)
	v := (fn-1)/fn*w + bn
	return math.Sqrt(v / w)
}

// EffectiveSize returns the effective sample size of one parameter over
// chains of equal length,
//
//	ESS = m·n / (1 + 2·Σ ρ_t),
//
// with ρ_t the autocorrelation at lag t averaged over the chains
// (autocovariances over the pooled variance) and the sum truncated by
// Geyer's initial positive sequence: pairs ρ_{2k} + ρ_{2k+1} are added
// while positive. It is at most m·n·log₁₀(m·n) (a cap against
// antithetic chains, as in Stan) and NaN for fewer than four draws.
//
// References:
//
//	Geyer, C. J. (1992). Practical Markov chain Monte Carlo. Statistical
//	Science 7(4), 473–483.
//	Gelman, A., et al. (2013). Bayesian Data Analysis, 3rd ed., section 11.5.
func EffectiveSize(chains [][]float64) float64 {
	m := len(chains)
	if m == 0 {
		return math.NaN()
	}
	n := len(chains[0])
	for _, c := range chains {
		n = min(n, len(c))
	}
	if n < 4 {
		return math.NaN()
	}
	centred := make([][]float64, m)
	var v0 float64
	for i, c := range chains {
		c = c[:n]
		mu := stat.Mean(c, nil)
		centred[i] = make([]float64, n)
		for t, x := range c {
			centred[i][t] = x - mu
			v0 += (x - mu) * (x - mu)
		}
	}
	v0 /= float64(m * n)
	total := float64(m * n)
	if !(v0 > 0) {
		return total
	}
	rho := func(t int) float64 {
		var s float64
		for _, c := range centred {
			for k := 0; k+t < n; k++ {
				s += c[k] * c[k+t]
			}
		}
		return s / float64(m*n) / v0
	}
	tau := -1.0
	for t := 0; t+1 < n; t += 2 {
		pair := rho(t) + rho(t+1)
		if !(pair > 0) {
			break
		}
		tau += 2 * pair
	}
	ess := total / math.Max(tau, 1/math.Log10(total))
	return ess
}

// ParamSummary is the posterior of one parameter.
type ParamSummary struct {
	// Name names the parameter: ln_a1, c1, b1, break2, remnant, and the
	// derived a1, b2 (offsets of replacing controls) ...
	Name string
	// Derived reports a quantity computed from the sampled parameters
	// (its prior is not stated: PriorMean and PriorSD are NaN).
	Derived bool
	// Mean, SD and the quantiles P2_5, P50, P97_5 of the posterior draws
	// (unit of the parameter).
	Mean, SD, P2_5, P50, P97_5 float64
	// PriorMean and PriorSD are the prior's mean and standard deviation
	// (NaN for a flat prior).
	PriorMean, PriorSD float64
	// RHat and ESS are the potential scale reduction and effective sample
	// size (NaN for derived quantities).
	RHat, ESS float64
}

// summarise returns the summary of a parameter's pooled draws.
func summarise(name string, pooled []float64) ParamSummary {
	s := ParamSummary{Name: name, PriorMean: math.NaN(), PriorSD: math.NaN(), RHat: math.NaN(), ESS: math.NaN()}
	v := append([]float64(nil), pooled...)
	sort.Float64s(v)
	s.Mean, s.SD = stat.MeanStdDev(v, nil)
	s.P2_5 = stat.Quantile(0.025, stat.Empirical, v, nil)
	s.P50 = stat.Quantile(0.5, stat.Empirical, v, nil)
	s.P97_5 = stat.Quantile(0.975, stat.Empirical, v, nil)
	return s
}
