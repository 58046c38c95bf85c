package stats

import (
	"math"
	"math/big"

	"lotlens/stats/decimal"
	"lotlens/stats/method"
)

// Target: tests of the centre against the target value.
type Target struct {
	Value     float64 `json:"value"`
	T         *Test   `json:"t,omitempty"`
	Wilcoxon  *Test   `json:"wilcoxon,omitempty"`
	Inside    bool    `json:"inside"` // target inside the CI of the quoted centre
	Statement string  `json:"statement"`
}

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
func targetSection(w words, sorted []float64, mean, sd float64, target, conf float64, grid decimal.Grid) *Target {
	n := len(sorted)
	if !(conf > 0 && conf < 1) {
		conf = 0.95
	}
	tg := &Target{Value: target}
	if n < 2 || !(sd > 0) || !finite(target) {
		tg.Statement = w.targetFew()
		return tg
	}
	if tt, ok := method.TTest(mean, sd, n, target, conf); ok {
		df, est := tt.DF, mean
		tg.T = &Test{Name: testT, Statistic: tt.T, DF: &df, P: tt.P, Estimate: &est,
			CI: &Interval{Lo: tt.Lo, Hi: tt.Hi, Level: conf, Method: "student-t"}, Method: w.tMethod()}
		tg.Inside = target >= tt.Lo && target <= tt.Hi
		tg.Statement = w.targetMean(target, tg.Inside, conf, tt.Lo, tt.Hi)
	} else {
		tg.Statement = w.tTestFailed()
	}
	tg.Wilcoxon = wilcoxonSignedRank(w, sorted, target, conf, grid)
	if wx := tg.Wilcoxon; wx != nil && wx.CI != nil {
		ins := target >= wx.CI.Lo && target <= wx.CI.Hi
		tg.Statement += w.targetPseudoMedian(ins, wx.CI.Level, wx.CI.Lo, wx.CI.Hi)
	}
	return tg
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
func wilcoxonSignedRank(w words, sorted []float64, mu, conf float64, grid decimal.Grid) *Test {
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
	capped := r.NonZero > hlMaxN
	test := &Test{Name: testWilcoxon, Statistic: r.V, P: r.P, Method: w.wilcoxonMethod(r.Exact, r.Ties, r.Above-r.Below, capped, hlMaxN)}
	if capped {
		return test
	}
	if !exact && (math.Abs(sorted[0]) > 1e307 || math.Abs(sorted[n-1]) > 1e307) {
		return test
	}
	// Walsh sums z_i + z_j are twice the Walsh averages.
	ws := method.NewWalshSums(sorted, r.Below, r.Above)
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
	if ws.N%2 == 1 {
		v, _ := ws.At(ws.N / 2)
		est = half(v)
	} else {
		x, y := ws.At(ws.N/2 - 1)
		est = half(x, y)
	}
	test.Estimate = &est
	kLo, kHi, level, reached := method.SignedRankInterval(r, conf)
	lo, _ := ws.At(kLo - 1)
	hi, _ := ws.At(kHi - 1)
	if finite(lo) && finite(hi) && finite(est) {
		test.CI = &Interval{Lo: half(lo), Hi: half(hi), Level: level, Method: w.walshMethod(r.Exact, reached)}
	} else {
		test.Estimate = nil
	}
	return test
}
