package gauged

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// The adaptive sampler on a correlated bivariate normal (closed-form
// target): the pooled draws' means, standard deviations and correlation
// agree with the target's within Monte Carlo tolerance (four standard
// errors from the effective sample size), R̂ is near 1, and the adapted
// random walk accepts near the 0.35 of a well-scaled walk in two
// dimensions (Gelman, Roberts & Gilks, 1996: 0.44 in one dimension, 0.23
// in many; from memory).
func TestSamplerNormalTarget(t *testing.T) {
	mu := []float64{1, -2}
	sd := []float64{0.5, 3}
	const rho = 0.9
	target := logTarget(func(x []float64) float64 {
		u, v := (x[0]-mu[0])/sd[0], (x[1]-mu[1])/sd[1]
		return -0.5 * (u*u - 2*rho*u*v + v*v) / (1 - rho*rho)
	})
	scale := []float64{1, 1}
	cov0 := diagonal(scale, 0.3)
	var specs []chainSpec
	for c := 0; c < 4; c++ {
		specs = append(specs, chainSpec{start: []float64{mu[0] + float64(c) - 1.5, mu[1]}, cov0: cov0,
			src: rand.NewPCG(5, uint64(c)), pilot: 3000, draws: 10000})
	}
	res := runChains(target, specs, scale)
	for j := 0; j < 2; j++ {
		var cols [][]float64
		var pooled []float64
		for _, r := range res {
			col := column(r, 2, j, 0, 10000)
			cols = append(cols, col)
			pooled = append(pooled, col...)
		}
		ess := EffectiveSize(cols)
		m, s := stat.MeanStdDev(pooled, nil)
		if math.Abs(m-mu[j]) > 4*sd[j]/math.Sqrt(ess) || math.Abs(s-sd[j]) > 4*sd[j]/math.Sqrt(2*ess) {
			t.Errorf("parameter %d: mean %.4f sd %.4f, target %g and %g (ESS %.0f)", j, m, s, mu[j], sd[j], ess)
		}
		if r := RHat(cols); r > 1.01 {
			t.Errorf("parameter %d: R̂ %.4f", j, r)
		}
	}
	var all []float64
	for _, r := range res {
		all = append(all, r.draws...)
		t.Logf("acceptance %.3f", r.acceptance)
		if r.acceptance < 0.25 || r.acceptance > 0.45 {
			t.Errorf("acceptance %.3f", r.acceptance)
		}
	}
	var c mat.SymDense
	stat.CorrelationMatrix(&c, mat.NewDense(len(all)/2, 2, all), nil)
	if math.Abs(c.At(0, 1)-rho) > 0.01 {
		t.Errorf("correlation %.4f, target %g", c.At(0, 1), rho)
	}
}

// The effective sample size of an AR(1) sequence x_t = φ·x_{t−1} + e_t
// is n·(1 − φ)/(1 + φ) (closed form of its integrated autocorrelation
// time; Geyer, 1992), here within 15 % (its own sampling error).
func TestEffectiveSizeAR1(t *testing.T) {
	const phi, n = 0.8, 50000
	rng := rand.New(rand.NewPCG(3, 3))
	var chains [][]float64
	for c := 0; c < 2; c++ {
		x := make([]float64, n)
		for i := 1; i < n; i++ {
			x[i] = phi*x[i-1] + rng.NormFloat64()
		}
		chains = append(chains, x)
	}
	want := 2 * n * (1 - phi) / (1 + phi)
	if got := EffectiveSize(chains); math.Abs(got/want-1) > 0.15 {
		t.Errorf("ESS %.0f, want about %.0f", got, want)
	}
}
