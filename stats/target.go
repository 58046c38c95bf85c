package stats

import (
	"fmt"
	"math"
	"math/big"

	"lotlens/stats/decimal"
	"lotlens/stats/method"
)

// hlMaxN caps the Hodges-Lehmann estimate and interval: above it the
// O(n log n) selection over the n(n+1)/2 Walsh averages costs more than the
// rest of the analysis, and the median with its interval says the same for
// samples that large.
const hlMaxN = 100_000

// targetSection tests the centre of the data against target: sorted is
// ascending, mean and sd (divisor n-1) are exact; grid, when valid, holds
// every value (the decimals as typed).
//
//   - The one-sample t test (Student 1908), method.TTest, with the t
//     interval for the mean.
//   - The Wilcoxon (1945) signed-rank test of the differences x - target,
//     method.SignedRank, with the Hodges-Lehmann (1963) pseudo-median and
//     its distribution-free interval (method.SignedRankInterval,
//     method.WalshSums). On decimal data the differences, their ties and
//     zeros, and the Walsh sums are computed on the mantissas (the target
//     brought to the same scale), so 7.9 and 8.1 around a target of 8 are
//     tied. Above 100,000 values the estimate and interval are left out
//     (Method says so).
//
// Inside and Statement refer to the t interval for the mean.
func targetSection(sorted []float64, mean, sd float64, target, conf float64, grid decimal.Grid) *Target {
	n := len(sorted)
	if !(conf > 0 && conf < 1) {
		conf = 0.95
	}
	tg := &Target{Value: target}
	if n < 2 || !(sd > 0) || !finite(target) {
		tg.Statement = "The tests against the target need at least two values that are not all equal."
		return tg
	}
	if tt, ok := method.TTest(mean, sd, n, target, conf); ok {
		df, est := tt.DF, mean
		tg.T = &Test{Name: "One-sample t", Statistic: tt.T, DF: &df, P: tt.P, Estimate: &est,
			CI: &Interval{Lo: tt.Lo, Hi: tt.Hi, Level: conf, Method: "student-t"}, Method: "two-sided"}
		tg.Inside = target >= tt.Lo && target <= tt.Hi
		word := "inside"
		if !tg.Inside {
			word = "outside"
		}
		dec := decimalsFor((tt.Hi - tt.Lo) / 2)
		tg.Statement = fmt.Sprintf("The target %s lies %s the %s interval for the mean, %s to %s.",
			fmtFixed(target, dec), word, pctLabel(conf), fmtFixed(tt.Lo, dec), fmtFixed(tt.Hi, dec))
	} else {
		tg.Statement = "The t test could not be computed for these values."
	}
	tg.Wilcoxon = wilcoxonSignedRank(sorted, target, conf, grid)
	if w := tg.Wilcoxon; w != nil && w.CI != nil {
		ins := target >= w.CI.Lo && target <= w.CI.Hi
		word := "inside"
		if !ins {
			word = "outside"
		}
		dec := decimalsFor((w.CI.Hi - w.CI.Lo) / 2)
		tg.Statement += fmt.Sprintf(" It lies %s the %s interval for the pseudo-median (Wilcoxon), %s to %s.",
			word, pctLabel(w.CI.Level), fmtFixed(w.CI.Lo, dec), fmtFixed(w.CI.Hi, dec))
	}
	return tg
}

func pctLabel(c float64) string {
	return fmtTrim(100*c, 2) + "%"
}

// fmtTrim formats x with up to d decimals, trailing zeros dropped.
func fmtTrim(x float64, d int) string {
	s := fmt.Sprintf("%.*f", d, x)
	for len(s) > 1 && s[len(s)-1] == '0' && containsDot(s) {
		s = s[:len(s)-1]
	}
	if s[len(s)-1] == '.' {
		s = s[:len(s)-1]
	}
	return s
}

func containsDot(s string) bool {
	for i := range len(s) {
		if s[i] == '.' {
			return true
		}
	}
	return false
}

// decimalsFor is the number of decimals that shows a half-width h with one
// significant digit, two when its leading digit is 1.
func decimalsFor(h float64) int {
	if !(h > 0) || !finite(h) {
		return 2
	}
	e := int(math.Floor(math.Log10(h)))
	d := -e
	if h/math.Pow(10, float64(e)) < 2 {
		d++
	}
	return min(15, max(0, d))
}

func fmtFixed(x float64, dec int) string {
	if math.Abs(x) >= 1e15 {
		return fmt.Sprintf("%.6g", x)
	}
	return fmt.Sprintf("%.*f", dec, x)
}

// targetGrid brings the data and the target to one decimal scale: the
// scale of the data or of the target as typed (its shortest decimal),
// whichever is finer. ok is false when the target or a scaled value does
// not fit (the binary path is then used).
func targetGrid(sorted []float64, grid decimal.Grid, target float64) (g decimal.Grid, factor int64, mt int64, ok bool) {
	if !grid.Valid() || !grid.Holds(sorted) {
		return g, 0, 0, false
	}
	m, d, ok := decimal.FromFloat(target)
	if !ok {
		return g, 0, 0, false
	}
	S := max(grid.Scale, d)
	g, ok = decimal.NewGrid(S)
	if !ok {
		return g, 0, 0, false
	}
	factor = 1
	for range S - grid.Scale {
		factor *= 10
	}
	for range S - d {
		if m > decimal.MaxMantissa || m < -decimal.MaxMantissa {
			return g, 0, 0, false
		}
		m *= 10
	}
	lim := int64(decimal.MaxMantissa) / factor
	lo, hi := grid.M(sorted[0]), grid.M(sorted[len(sorted)-1])
	if lo <= -lim || hi >= lim || m <= -decimal.MaxMantissa || m >= decimal.MaxMantissa {
		return g, 0, 0, false
	}
	return g, factor, m, true
}

// wilcoxonSignedRank is the one-sample Wilcoxon signed-rank test of
// sorted against mu with the Hodges-Lehmann estimate and interval, see
// targetSection. On the exact path the sorted values are replaced by their
// mantissas (integers in float64) for the test and restored exactly after.
func wilcoxonSignedRank(sorted []float64, mu, conf float64, grid decimal.Grid) *Test {
	n := len(sorted)
	g, factor, mt, exact := targetGrid(sorted, grid, mu)
	if exact {
		for i, x := range sorted {
			sorted[i] = float64(grid.M(x) * factor)
		}
		defer func() {
			for i, x := range sorted {
				sorted[i] = g.Float(int64(x))
			}
		}()
		mu = float64(mt)
	}
	r, ok := method.SignedRank(sorted, mu)
	if !ok {
		return nil
	}
	test := &Test{Name: "Wilcoxon signed-rank", Statistic: r.V, P: r.P}
	if r.Exact {
		test.Method = "exact"
	} else {
		test.Method = "normal approximation with continuity correction"
		if r.Ties {
			test.Method += " and tie correction"
		}
	}
	if z := r.Above - r.Below; z > 0 {
		test.Method += fmt.Sprintf("; %d value(s) equal to the target dropped", z)
	}
	if r.NonZero > hlMaxN {
		test.Method += "; the pseudo-median and its interval are given up to 100,000 values"
		return test
	}
	if !exact && (math.Abs(sorted[0]) > 1e307 || math.Abs(sorted[n-1]) > 1e307) {
		return test
	}
	// Walsh sums z_i + z_j are twice the Walsh averages.
	w := method.NewWalshSums(sorted, r.Below, r.Above)
	half := func(sum ...float64) float64 { // mean of the sums, halved
		if exact {
			t := new(big.Int)
			for _, v := range sum {
				t.Add(t, big.NewInt(int64(v)))
			}
			den := new(big.Int).Mul(big.NewInt(int64(2*len(sum))), g.Denom())
			return decimal.Float64(new(big.Rat).SetFrac(t, den))
		}
		if len(sum) == 1 {
			return sum[0] / 2
		}
		return sum[0]/4 + sum[1]/4
	}
	var est float64
	if w.N%2 == 1 {
		v, _ := w.At(w.N / 2)
		est = half(v)
	} else {
		x, y := w.At(w.N/2 - 1)
		est = half(x, y)
	}
	test.Estimate = &est
	kLo, kHi, level, reached := method.SignedRankInterval(r, conf)
	m := "normal approximation"
	if r.Exact {
		m = "exact signed-rank distribution"
	} else if !reached {
		m += "; the requested level is not reachable with so few values"
	}
	lo, _ := w.At(kLo - 1)
	hi, _ := w.At(kHi - 1)
	if finite(lo) && finite(hi) && finite(est) {
		test.CI = &Interval{Lo: half(lo), Hi: half(hi), Level: level, Method: "walsh-averages (" + m + ")"}
	} else {
		test.Estimate = nil
	}
	return test
}
