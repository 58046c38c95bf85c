package method

import (
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// ProbBandExactMaxN: up to this many values the probability-plot band uses
// exact Beta quantiles, above it their normal approximation.
const ProbBandExactMaxN = 100_000

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
// Φ⁻¹(B⁻¹(α/2)) and Φ⁻¹(B⁻¹(1-α/2)). Above ProbBandExactMaxN the Beta
// quantiles use their normal approximation.
func OrderStatBand(i, n int, conf float64) (zlo, zhi float64) {
	k, fn := float64(i), float64(n)
	a := 1 - conf
	var pl, ph float64
	if n <= ProbBandExactMaxN {
		b := distuv.Beta{Alpha: k, Beta: fn - k + 1}
		pl, ph = b.Quantile(a/2), b.Quantile(1-a/2)
	} else {
		m := k / (fn + 1)
		s := math.Sqrt(m * (1 - m) / (fn + 2))
		zq := NormalQuantile(1 - a/2)
		pl, ph = math.Max(m-zq*s, 0.5/fn/fn), math.Min(m+zq*s, 1-0.5/fn/fn)
	}
	return NormalQuantile(pl), NormalQuantile(ph)
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
