package stats

import (
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

func init() { hookProbPlot = probPlot }

// Plotting positions and band of the normal probability plot.
const (
	probPlotPositions = "Blom (i-3/8)/(n+1/4)"
	probBandMaxPoints = 120     // band points (both tails dense)
	probBandExactMaxN = 100_000 // Beta quantiles exact up to here, normal approximation above
)

// probPlot gives the normal probability plot of the sorted data: the i-th
// smallest value against z_i = Φ⁻¹((i-3/8)/(n+1/4)), Blom's (1958)
// plotting positions (Statistical Estimates and Transformed Beta-Variables),
// the fitted line y = mean + sd·z, and a pointwise confidence band around
// it at level conf: for a normal sample the i-th order statistic has
// Φ((X_(i)-μ)/σ) ~ Beta(i, n-i+1) (David and Nagaraja 2003, Order
// Statistics, 2.1), so X_(i) lies with probability conf between
// mean + sd·Φ⁻¹(B⁻¹(α/2)) and mean + sd·Φ⁻¹(B⁻¹(1-α/2)) (the band ignores
// the estimation of mean and SD, as is usual for such bands). For
// n > 100,000 the Beta quantiles use their normal approximation. Points
// are thinned to at most maxPoints, keeping every point of both tails
// (the first and last tenth of the budget) and spreading the rest evenly.
// The caller fills the rows.
func probPlot(sorted []float64, mean, sd, conf float64, maxPoints int) ProbPlot {
	n := len(sorted)
	pp := ProbPlot{Positions: probPlotPositions, Points: []ProbPt{}, Band: []BandPt{}, Line: [2]float64{mean, sd}}
	if n < 3 || !(sd > 0) || !finite(sd) || !finite(mean) {
		return pp
	}
	if !(conf > 0 && conf < 1) {
		conf = 0.95
	}
	fn := float64(n)
	blom := func(i int) float64 { return normQuantile((float64(i+1) - 0.375) / (fn + 0.25)) }
	for _, i := range thinIndices(n, maxPoints) {
		pp.Points = append(pp.Points, ProbPt{Z: blom(i), Y: sorted[i]})
	}
	a := 1 - conf
	for _, i := range thinIndices(n, probBandMaxPoints) {
		k := float64(i + 1)
		var pl, ph float64
		if n <= probBandExactMaxN {
			b := distuv.Beta{Alpha: k, Beta: fn - k + 1}
			pl, ph = b.Quantile(a/2), b.Quantile(1-a/2)
		} else {
			m := k / (fn + 1)
			s := math.Sqrt(m * (1 - m) / (fn + 2))
			zq := normQuantile(1 - a/2)
			pl, ph = math.Max(m-zq*s, 0.5/fn/fn), math.Min(m+zq*s, 1-0.5/fn/fn)
		}
		zl, zh := normQuantile(pl), normQuantile(ph)
		lo, hi := mean+sd*zl, mean+sd*zh
		if finite(lo) && finite(hi) {
			pp.Band = append(pp.Band, BandPt{Z: blom(i), Lo: lo, Hi: hi})
		}
	}
	return pp
}

// thinIndices picks at most m indices of 0..n-1 in increasing order: all
// of them when n <= m, else the first and last m/10 and m - 2·(m/10)
// spread evenly over the middle.
func thinIndices(n, m int) []int {
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
