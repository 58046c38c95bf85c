package method

import (
	"math"
)

// TwoSidedInterval is a two-sided confidence interval with the level it achieves.
type TwoSidedInterval struct {
	Lo, Hi, Level float64
}

// MeanInterval is the Student t interval for the mean (Student 1908):
// mean ± t(1-α/2, n-1)·s/√n. ok is false for n < 2, sd <= 0, or limits
// beyond the float64 range (values near 1e308).
func MeanInterval(mean, sd float64, n int, conf float64) (iv TwoSidedInterval, ok bool) {
	if n < 2 || !(sd > 0) || !normalFinite(sd) {
		return iv, false
	}
	t := tQuantile(float64(n-1), 1-(1-conf)/2)
	h := t * (sd / math.Sqrt(float64(n)))
	iv = TwoSidedInterval{Lo: mean - h, Hi: mean + h, Level: conf}
	return iv, normalFinite(iv.Lo) && normalFinite(iv.Hi)
}

// SDInterval is the chi-square interval for the standard deviation of a
// normal population: s·sqrt((n-1)/χ²(1-α/2, n-1)) to s·sqrt((n-1)/χ²(α/2,
// n-1)) (e.g. Montgomery, Introduction to Statistical Quality Control,
// 2009, 4.3). It assumes normal data.
func SDInterval(sd float64, n int, conf float64) (iv TwoSidedInterval, ok bool) {
	if n < 2 || !(sd > 0) || !normalFinite(sd) {
		return iv, false
	}
	a := 1 - conf
	k := float64(n - 1)
	hiQ := chiSquaredQuantile(k, 1-a/2)
	loQ := chiSquaredQuantile(k, a/2)
	if !(loQ > 0) || !(hiQ > 0) {
		return iv, false
	}
	iv = TwoSidedInterval{Lo: sd * math.Sqrt(k/hiQ), Hi: sd * math.Sqrt(k/loQ), Level: conf}
	return iv, normalFinite(iv.Lo) && normalFinite(iv.Hi)
}

// MedianInterval is the distribution-free interval for the median from
// order statistics (Thompson 1936; Conover, Practical Nonparametric
// Statistics, 1999, 3.2): [x(k), x(n-k+1)] (1-based) with the largest k
// such that 2·P(B <= k-1) <= α for B ~ Binomial(n, 1/2). level is the
// achieved 1 - 2·P(B <= k-1), at least conf except when n is too small for
// any such k: then k = 1 (minimum to maximum) and reached is false.
func MedianInterval(n int, conf float64) (k int, level float64, reached bool) {
	if n < 2 {
		return 0, 0, false
	}
	a := 1 - conf
	// start from the normal approximation, then step to the exact k
	z := NormalQuantile(1 - a/2)
	k = int(math.Floor(float64(n)/2-z*math.Sqrt(float64(n))/2)) + 1
	if k < 1 {
		k = 1
	}
	if k > n/2 {
		k = n / 2
	}
	for k > 1 && 2*BinomialHalfCDF(k-1, n) > a {
		k--
	}
	for k+1 <= n/2 && 2*BinomialHalfCDF(k, n) <= a {
		k++
	}
	level = 1 - 2*BinomialHalfCDF(k-1, n)
	reached = 2*BinomialHalfCDF(k-1, n) <= a
	return k, level, reached
}

// MedianIntervalInterpolated is the interpolated order-statistic interval
// for the median of Hettmansperger and Sheather (1986), "Confidence
// intervals based on interpolated order statistics", Statistics &
// Probability Letters 4, 75-79, at exactly the level conf. With k from
// MedianInterval (γk = 1 - 2·P(B <= k-1) >= conf > γk+1 for B ~
// Binomial(n, 1/2)), I = (γk - conf)/(γk - γk+1), λ = (n-k)·I/(k + (n-2k)·I)
// and the limits (1-λ)·x(k) + λ·x(k+1) and (1-λ)·x(n-k+1) + λ·x(n-k)
// (1-based). ok is false when no interpolation applies (n < 2, conf not
// reached even by the minimum and maximum, or no narrower pair of order
// statistics): then use MedianInterval's exact interval.
func MedianIntervalInterpolated(sorted []float64, conf float64) (lo, hi float64, ok bool) {
	n := len(sorted)
	k, gk, reached := MedianInterval(n, conf)
	if k < 1 || !reached || k+1 > n-k {
		return 0, 0, false
	}
	gk1 := 1 - 2*BinomialHalfCDF(k, n)
	if !(gk > gk1) {
		return 0, 0, false
	}
	I := (gk - conf) / (gk - gk1)
	fn, fk := float64(n), float64(k)
	lambda := (fn - fk) * I / (fk + (fn-2*fk)*I)
	lo = (1-lambda)*sorted[k-1] + lambda*sorted[k]
	hi = (1-lambda)*sorted[n-k] + lambda*sorted[n-k-1]
	return lo, hi, normalFinite(lo) && normalFinite(hi)
}
