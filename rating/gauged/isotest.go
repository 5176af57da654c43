package gauged

import (
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// RelationTestLevel is the significance level at which a test of a
// relation is reported as failed (ISO 1100-2, 5 %, from memory).
const RelationTestLevel = 0.05

// RelationTest is one statistical test of a stage–discharge relation
// against the gaugings it was fitted to.
type RelationTest struct {
	// Name is "sign", "runs" or "mean departure".
	Name string
	// N is the number of departures the test used (zeros left out by the
	// sign and runs tests).
	N int
	// Statistic is the test's statistic: the number of positive departures
	// (sign), the number of changes of sign (runs), Student's t (mean
	// departure); NaN when the test could not be made.
	Statistic float64
	// P is the p-value (NaN when the test could not be made).
	P float64
	// Failed reports P < RelationTestLevel.
	Failed bool
}

// RelationTests are the three tests of a relation of ISO 1100-2 on the
// departures of the gaugings, ordered by stage.
type RelationTests struct {
	Sign, Runs, Mean RelationTest
}

// RelationChecks runs SignTest, RunsTest and MeanDepartureTest on
// departures ordered by stage (ln Q − ln Q_rating, say), each departure
// of equal weight as ISO 1100-2 gives the tests for gaugings, whatever
// weights the curve was fitted with.
func RelationChecks(dep []float64) RelationTests {
	return RelationTests{Sign: SignTest(dep), Runs: RunsTest(dep), Mean: MeanDepartureTest(dep)}
}

// nonzero returns the departures that are not zero (nor NaN).
func nonzero(dep []float64) []float64 {
	var out []float64
	for _, d := range dep {
		if d != 0 && !math.IsNaN(d) {
			out = append(out, d)
		}
	}
	return out
}

// finishTest sets Failed from P.
func finishTest(t RelationTest) RelationTest {
	t.Failed = t.P < RelationTestLevel
	return t
}

// SignTest tests the balance of positive and negative departures: with
// n non-zero departures of which k are positive, under a relation that
// fits, k is binomial with n trials and probability ½; the two-sided
// p-value is
//
//	p = min(1, 2·min(P(X ≤ k), P(X ≥ k))),   X ~ Binomial(n, ½),
//
// exact (ISO 1100-2 states the test with the normal approximation, from
// memory). Needs one departure; otherwise Statistic and P are NaN.
//
// References:
//
//	ISO 1100-2:2010. Hydrometry — Measurement of liquid flow in open
//	channels — Part 2: Determination of the stage-discharge relationship
//	(tests of a relation: sign test; from memory).
func SignTest(dep []float64) RelationTest {
	nz := nonzero(dep)
	t := RelationTest{Name: "sign", N: len(nz), Statistic: math.NaN(), P: math.NaN()}
	if len(nz) == 0 {
		return t
	}
	k := 0
	for _, d := range nz {
		if d > 0 {
			k++
		}
	}
	b := distuv.Binomial{N: float64(len(nz)), P: 0.5}
	lower := b.CDF(float64(k))
	upper := 1.0
	if k > 0 {
		upper = 1 - b.CDF(float64(k-1))
	}
	t.Statistic = float64(k)
	t.P = math.Min(1, 2*math.Min(lower, upper))
	return finishTest(t)
}

// RunsTest tests for long runs of departures of one sign, the mark of a
// relation that misses the shape of the gaugings: with n non-zero
// departures in order of stage and signs independent with probability ½,
// the number of changes of sign X is binomial with n − 1 trials and
// probability ½; too few changes is the failure, so the one-sided p-value
// of m observed changes is
//
//	p = P(X ≤ m),   X ~ Binomial(n − 1, ½).
//
// Needs two departures; otherwise Statistic and P are NaN.
//
// References:
//
//	ISO 1100-2:2010 (tests of a relation: test for long runs of
//	departures of one sign; from memory).
func RunsTest(dep []float64) RelationTest {
	nz := nonzero(dep)
	t := RelationTest{Name: "runs", N: len(nz), Statistic: math.NaN(), P: math.NaN()}
	if len(nz) < 2 {
		return t
	}
	m := 0
	for i := 1; i < len(nz); i++ {
		if (nz[i] > 0) != (nz[i-1] > 0) {
			m++
		}
	}
	t.Statistic = float64(m)
	t.P = distuv.Binomial{N: float64(len(nz) - 1), P: 0.5}.CDF(float64(m))
	return finishTest(t)
}

// MeanDepartureTest tests for bias: Student's t of the mean departure,
//
//	t = d̄ / (s/√n),   two-sided p = 2·P(T > |t|),   T ~ t(n − 1),
//
// with d̄ and s the mean and sample standard deviation of the n
// departures, each of equal weight: ISO 1100-2 states the test on the
// gaugings' departures from the curve, unweighted. It is made so on a
// curve fitted by weighted least squares too; there the weighted mean of
// the departures is zero by the normal equation of each control's ln A
// (Σwᵢrᵢ = 0), so a weighted form of the test could never fail, while
// the unweighted mean shows a curve pulled away from the bulk of the
// gaugings by a few heavily weighted ones. Departures that are NaN are
// left out. Needs two departures that are not all equal; otherwise
// Statistic and P are NaN.
//
// References:
//
//	ISO 1100-2:2010. Hydrometry — Measurement of liquid flow in open
//	channels — Part 2: Determination of the stage-discharge relationship
//	(tests of a relation: test for bias of the mean departure of the
//	gaugings; from memory).
func MeanDepartureTest(dep []float64) RelationTest {
	var v []float64
	for _, d := range dep {
		if !math.IsNaN(d) {
			v = append(v, d)
		}
	}
	t := RelationTest{Name: "mean departure", N: len(v), Statistic: math.NaN(), P: math.NaN()}
	n := float64(len(v))
	if len(v) < 2 {
		return t
	}
	var mean, ss float64
	for _, d := range v {
		mean += d / n
	}
	for _, d := range v {
		ss += (d - mean) * (d - mean)
	}
	sd := math.Sqrt(ss / (n - 1))
	if !(sd > 0) {
		return t
	}
	t.Statistic = mean / (sd / math.Sqrt(n))
	t.P = 2 * distuv.StudentsT{Mu: 0, Sigma: 1, Nu: n - 1}.Survival(math.Abs(t.Statistic))
	return finishTest(t)
}
