package method

import (
	"math"
	"sort"
)

// BlomPosition is z_i = Φ⁻¹((i - 3/8)/(n + 1/4)) for the i-th smallest of
// n values (1-based), Blom's (1958) plotting position (Statistical
// Estimates and Transformed Beta-Variables).
func BlomPosition(i, n int) float64 {
	return NormalQuantile((float64(i) - 0.375) / (float64(n) + 0.25))
}

// OrderStatBand is the pointwise band of the i-th smallest (1-based) of n
// values of a normal sample, in standard units: for a normal sample
// Φ((X_(i)-μ)/σ) ~ Beta(i, n-i+1) (David and Nagaraja 2003, Order
// Statistics, 2.1), so (X_(i)-μ)/σ lies with probability conf between
// Φ⁻¹(B⁻¹(α/2)) and Φ⁻¹(B⁻¹(1-α/2)), α = 1 - conf. Called with conf =
// 1 - η from ProbBandLocalLevel it gives the simultaneous envelope.
//
// The Beta quantiles are exact for every n: gonum's Beta.Quantile agrees
// with R's qbeta to 1e-8 in z for n up to 1e8 at the extreme ranks
// (TestOrderStatBandLargeN), so the normal approximation used before (far
// off in the tails at the small η of a simultaneous envelope) is gone.
// The upper end is taken by symmetry, 1 - B⁻¹(1-α/2; i, n-i+1) =
// B⁻¹(α/2; n-i+1, i), so that Φ⁻¹ never sees a probability near 1.
func OrderStatBand(i, n int, conf float64) (zlo, zhi float64) {
	k, fn := float64(i), float64(n)
	a := 1 - conf
	pl := betaQuantile(k, fn-k+1, a/2)
	ph := betaQuantile(fn-k+1, k, a/2)
	return NormalQuantile(pl), -NormalQuantile(ph)
}

//go:generate go run gen_probband.go

// ProbBandTailSensitive is the code of the simultaneous envelope of the
// normal probability plot (ProbBandLocalLevel).
const ProbBandTailSensitive = "tail-sensitive"

// ProbBandLevelMin and ProbBandLevelMax are the lowest and highest
// simultaneous levels tabled; other levels are clamped to them.
var (
	ProbBandLevelMin = probBandLevels[0]
	ProbBandLevelMax = probBandLevels[len(probBandLevels)-1]
)

// ProbBandTableMaxN is the largest n interpolated in the simulated table;
// beyond it η follows the fitted rate (ProbBandLocalLevel).
const ProbBandTableMaxN = probBandFitFrom

// ProbBandLocalLevel gives the local level η of the tail-sensitive
// simultaneous envelope of a normal probability plot of n points
// (Aldor-Noiman, Brown, Buja, Rolke and Stine 2013, "The power to see: a
// new graphical test of normality", The American Statistician 67(4)):
// every order statistic gets the same pointwise band, OrderStatBand(i, n,
// 1-η), and η is such that all n points of a normal sample lie inside
// with probability level. used is the level actually applied: level
// clamped to [ProbBandLevelMin, ProbBandLevelMax].
//
// η comes from the simulated table of testdata/rref/probband.R (R 4.2.2;
// each normal sample standardised by its own mean and SD, divisor n-1, as
// the plot draws its line at mean + SD·z, so the estimation of both is
// accounted for): every n from 3 to 30, then 40 log-spaced n up to
// ProbBandTableMaxN (10,000); between n, log η is interpolated linearly
// in log n; between levels, linearly in log(1 - level). Beyond the table η
// follows the asymptotic rate of equal local levels, η = c/(log n · log
// log n) (Gontscharuk, Landwehr and Finner 2015, Biometrical Journal
// 57(1)), with c fitted for each level to the simulated n from 10,000 to
// 100,000 (testdata/rref/probbandfit.R); between 10,000 and the first
// simulated n above it (15,849) log η runs linearly in log n from the
// table's value to the curve, so η is continuous. ok is false for n < 3
// or a level that is not a number.
func ProbBandLocalLevel(n int, level float64) (eta, used float64, ok bool) {
	if n < 3 || math.IsNaN(level) {
		return 0, 0, false
	}
	used = math.Min(math.Max(level, ProbBandLevelMin), ProbBandLevelMax)
	L := len(probBandLevels)
	j := sort.SearchFloat64s(probBandLevels[:], used) // first level >= used
	if j < L && probBandLevels[j] == used {
		return math.Exp(probBandLogEta(n, j)), used, true
	}
	l0, l1 := probBandLevels[j-1], probBandLevels[j]
	t := (math.Log(1-used) - math.Log(1-l0)) / (math.Log(1-l1) - math.Log(1-l0))
	e := (1-t)*probBandLogEta(n, j-1) + t*probBandLogEta(n, j)
	return math.Exp(e), used, true
}

// probBandLogEta is log η at n for the j-th tabled level: the table value,
// interpolated in log n, or beyond the table the fitted rate.
func probBandLogEta(n, j int) float64 {
	if n > probBandFitFrom {
		curve := func(x float64) float64 {
			return math.Log(probBandRateC[j]) - math.Log(math.Log(x)*math.Log(math.Log(x)))
		}
		if n >= probBandFitJoin {
			return curve(float64(n))
		}
		x0, x1 := math.Log(probBandFitFrom), math.Log(probBandFitJoin)
		t := (math.Log(float64(n)) - x0) / (x1 - x0)
		return (1-t)*probBandLogEta(probBandFitFrom, j) + t*curve(probBandFitJoin)
	}
	N := probBandN[:]
	k := sort.SearchInts(N, n) // first tabled n >= n
	if N[k] == n {
		return math.Log(probBandEta[k][j])
	}
	x0, x1 := math.Log(float64(N[k-1])), math.Log(float64(N[k]))
	t := (math.Log(float64(n)) - x0) / (x1 - x0)
	return (1-t)*math.Log(probBandEta[k-1][j]) + t*math.Log(probBandEta[k][j])
}

// ThinIndices picks at most m indices of 0..n-1 in increasing order: all
// of them when n <= m, else the first and last m/10 and m - 2·(m/10)
// spread evenly over the middle (both tails of a probability plot kept
// whole: common practice of plotting).
func ThinIndices(n, m int) []int {
	if m < 3 {
		m = 3
	}
	if n <= m {
		idx := make([]int, n)
		for i := range idx {
			idx[i] = i
		}
		return idx
	}
	t := max(1, m/10)
	mid := m - 2*t
	idx := make([]int, 0, m)
	for i := 0; i < t; i++ {
		idx = append(idx, i)
	}
	span := float64(n - 2*t - 1)
	for j := 0; j < mid; j++ {
		i := t + int(math.Round(float64(j)*span/float64(max(1, mid-1))))
		if i > idx[len(idx)-1] {
			idx = append(idx, i)
		}
	}
	for i := n - t; i < n; i++ {
		if i > idx[len(idx)-1] {
			idx = append(idx, i)
		}
	}
	return idx
}
