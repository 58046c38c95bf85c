package stats

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

func init() { hookTarget = targetSection }

// Limits of the Wilcoxon signed-rank computations.
const (
	wilcoxExactMaxN = 50 // exact distribution below this many non-zero differences (as R's wilcox.test)
	// hlMaxN caps the Hodges-Lehmann estimate and interval: above it the
	// O(n log n) selection over the n(n+1)/2 Walsh averages costs more
	// than the rest of the analysis, and the median with its interval
	// says the same for samples that large.
	hlMaxN = 100_000
)

// targetSection tests the centre of the data against target: sorted is
// ascending, mean and sd (divisor n-1) are exact.
//
//   - The one-sample t test (Student 1908): t = (mean - target)/(s/√n) on
//     n-1 degrees of freedom, two-sided p, and the t interval for the mean.
//   - The Wilcoxon (1945) signed-rank test of the differences x - target,
//     zeros dropped, as R's wilcox.test does it: the exact null
//     distribution for fewer than 50 non-zero differences without ties,
//     else the normal approximation with continuity correction and the tie
//     correction of the variance. Its estimate is the Hodges-Lehmann (1963)
//     pseudo-median, the median of the Walsh averages, with the
//     distribution-free interval from Walsh-average order statistics
//     (Tukey 1949; Hollander and Wolfe 1999, Nonparametric Statistical
//     Methods, 3.2): exact ranks from the signed-rank distribution, or
//     ranks n(n+1)/4 ∓ (z·σ + 1/2) from its normal approximation. The
//     Walsh averages are never formed: imSelect selects them in O(n log n)
//     (Monahan 1984). Above 100,000 values the estimate and interval are
//     left out (Method says so).
//
// Inside and Statement refer to the t interval for the mean.
func targetSection(sorted []float64, mean, sd float64, target, conf float64) *Target {
	n := len(sorted)
	if !(conf > 0 && conf < 1) {
		conf = 0.95
	}
	tg := &Target{Value: target}
	if n < 2 || !(sd > 0) || !finite(target) {
		tg.Statement = "The tests against the target need at least two values that are not all equal."
		return tg
	}
	fn := float64(n)
	se := sd / math.Sqrt(fn)
	df := fn - 1
	st := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: df}
	tstat := (mean - target) / se
	if finite(tstat) {
		p := math.Min(1, 2*st.Survival(math.Abs(tstat)))
		h := st.Quantile(1-(1-conf)/2) * se
		est := mean
		tg.T = &Test{Name: "One-sample t", Statistic: tstat, DF: &df, P: p, Estimate: &est,
			CI: &Interval{Lo: mean - h, Hi: mean + h, Level: conf, Method: "student-t"}, Method: "two-sided"}
		tg.Inside = target >= mean-h && target <= mean+h
		word := "inside"
		if !tg.Inside {
			word = "outside"
		}
		dec := decimalsFor(h)
		tg.Statement = fmt.Sprintf("The target %s lies %s the %s interval for the mean, %s to %s.",
			fmtFixed(target, dec), word, pctLabel(conf), fmtFixed(mean-h, dec), fmtFixed(mean+h, dec))
	} else {
		tg.Statement = "The t test could not be computed for these values."
	}
	tg.Wilcoxon = wilcoxonSignedRank(sorted, target, conf)
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

// wilcoxonSignedRank is the one-sample Wilcoxon signed-rank test of
// sorted against mu, see targetSection. Ranks of |x - mu| come from one
// O(n) merge of the two sorted runs below and above mu.
func wilcoxonSignedRank(sorted []float64, mu, conf float64) *Test {
	n := len(sorted)
	// sorted[:a] < mu, sorted[a:b] == mu, sorted[b:] > mu
	a := lowerBound(sorted, mu)
	b := a
	for b < n && sorted[b] == mu {
		b++
	}
	nz := a + (n - b)
	if nz == 0 {
		return nil
	}
	zeroes := b > a
	// Merge |d| ascending: run 1 is a-1 down to 0 (mu - x grows), run 2 is
	// b up to n-1. The absolute difference is computed as R does: |x - mu|.
	i, j := a-1, b
	absd := func(k int) float64 { return math.Abs(sorted[k] - mu) }
	var V, tieSum float64 // V: rank sum of the positive differences
	ties := false
	rank := 0
	for i >= 0 || j < n {
		// next value
		var v float64
		if j >= n || (i >= 0 && absd(i) <= absd(j)) {
			v = absd(i)
		} else {
			v = absd(j)
		}
		// the tie group: all remaining with |d| == v in both runs
		pos, cnt := 0, 0
		for i >= 0 && absd(i) == v {
			i--
			cnt++
		}
		for j < n && absd(j) == v {
			j++
			pos++
			cnt++
		}
		mid := float64(rank) + float64(cnt+1)/2
		V += mid * float64(pos)
		if cnt > 1 {
			ties = true
			t := float64(cnt)
			tieSum += t*t*t - t
		}
		rank += cnt
	}
	fn := float64(nz)
	M := fn * (fn + 1) / 2
	test := &Test{Name: "Wilcoxon signed-rank", Statistic: V}
	exact := nz < wilcoxExactMaxN && !ties && !zeroes
	alpha := 1 - conf
	var sigma float64
	var counts []float64
	if exact {
		counts = signRankCounts(nz)
		var p float64
		if V > M/2 {
			p = 1 - signRankCDF(counts, int(V)-1)
		} else {
			p = signRankCDF(counts, int(V))
		}
		test.P = math.Min(1, 2*p)
		test.Method = "exact"
	} else {
		z := V - M/2
		sigma = math.Sqrt(fn*(fn+1)*(2*fn+1)/24 - tieSum/48)
		if !(sigma > 0) {
			return nil
		}
		corr := 0.0
		if z > 0 {
			corr = 0.5
		} else if z < 0 {
			corr = -0.5
		}
		z = (z - corr) / sigma
		test.P = math.Min(1, 2*math.Min(normCDF(z), normSF(z)))
		test.Method = "normal approximation with continuity correction"
		if ties {
			test.Method += " and tie correction"
		}
	}
	if zeroes {
		test.Method += fmt.Sprintf("; %d value(s) equal to the target dropped", b-a)
	}
	if !finite(test.P) || !finite(V) {
		return nil
	}
	// Hodges-Lehmann estimate and interval over the non-zero differences
	// (shifted back by mu, as R does).
	if nz > hlMaxN {
		test.Method += "; the pseudo-median and its interval are given up to 100,000 values"
		return test
	}
	if math.Abs(sorted[0]) > 1e307 || math.Abs(sorted[n-1]) > 1e307 {
		return test
	}
	w := walshMatrix(sorted, a, b)
	N := w.total()
	var est float64
	if N%2 == 1 {
		est, _ = imSelect(w, N/2, false)
	} else {
		x, y := imSelect(w, N/2-1, true)
		est = x/2 + y/2
	}
	test.Estimate = &est
	var kLo int64 // 1-based rank of the lower limit
	level := conf
	var method string
	if exact {
		qu := signRankQuantile(counts, alpha/2)
		if qu == 0 {
			qu = 1
		}
		kLo = int64(qu)
		level = 1 - 2*signRankCDF(counts, qu-1)
		method = "exact signed-rank distribution"
	} else {
		zq := normQuantile(1 - alpha/2)
		k := math.Floor(M/2-0.5-zq*sigma) + 1
		kLo = int64(max(1, k))
		method = "normal approximation"
		if k < 1 {
			// Too few values for the requested level: the widest interval
			// [min, max] of the Walsh averages, with its own level.
			level = 1 - 2*normCDF((0.5-M/2)/sigma)
			method += "; the requested level is not reachable with so few values"
		}
	}
	kHi := int64(M) + 1 - kLo // 1-based rank of the upper limit
	if kLo > kHi {
		kLo, kHi = kHi, kLo
	}
	lo, _ := imSelect(w, kLo-1, false)
	hi, _ := imSelect(w, kHi-1, false)
	if finite(lo) && finite(hi) && finite(est) {
		test.CI = &Interval{Lo: lo, Hi: hi, Level: level, Method: "walsh-averages (" + method + ")"}
	} else {
		test.Estimate = nil
	}
	return test
}

func lowerBound(s []float64, v float64) int {
	lo, hi := 0, len(s)
	for lo < hi {
		h := int(uint(lo+hi) >> 1)
		if s[h] < v {
			lo = h + 1
		} else {
			hi = h
		}
	}
	return lo
}

// walshMatrix is the implicit matrix of Walsh averages (x_i + x_j)/2,
// i <= j, over sorted[:a] and sorted[b:] (the values not equal to mu).
func walshMatrix(sorted []float64, a, b int) *imMatrix {
	n := a + len(sorted) - b
	z := sorted
	if b > a { // skip the values equal to mu without copying when there are none
		z = make([]float64, 0, n)
		z = append(z, sorted[:a]...)
		z = append(z, sorted[b:]...)
	}
	w := &imMatrix{rows: n, cols: n, upper: true}
	w.val = func(r, c int) float64 { return (z[r] + z[c]) / 2 }
	w.walk2 = func(t1 float64, s1 bool, t2 float64, s2 bool, visit func(r0 int, b1, b2 []int32)) (n1, n2 int64) {
		ch1, ch2 := make([]int32, imChunk), make([]int32, imChunk)
		c1, c2 := n, n
		for r0 := 0; r0 < n; r0 += imChunk {
			r1 := min(r0+imChunk, n)
			var a, b int64
			c1, a = walshStair(z, r0, r1, c1, t1, s1, ch1)
			c2, b = walshStair(z, r0, r1, c2, t2, s2, ch2)
			n1 += a
			n2 += b
			if visit != nil {
				visit(r0, ch1[:r1-r0], ch2[:r1-r0])
			}
		}
		return n1, n2
	}
	return w
}

// walshStair runs the staircase of one threshold over the Walsh rows
// r0..r1-1 from column c (see mcStair).
func walshStair(z []float64, r0, r1, c int, t float64, strict bool, out []int32) (int, int64) {
	var cnt int64
	for r := r0; r < r1; r++ {
		c = max(c, r)
		zr := z[r]
		if strict {
			for c > r && (zr+z[c-1])/2 >= t {
				c--
			}
		} else {
			for c > r && (zr+z[c-1])/2 > t {
				c--
			}
		}
		out[r-r0] = int32(c)
		cnt += int64(c - r)
	}
	return c, cnt
}

// signRankCounts returns c[s], the number of subsets of {1..n} whose sum
// is s, for s = 0..n(n+1)/2 (the null distribution of the signed-rank
// statistic times 2^n). Exact in float64 for n < 50 (counts below 2^53).
func signRankCounts(n int) []float64 {
	M := n * (n + 1) / 2
	c := make([]float64, M+1)
	c[0] = 1
	top := 0
	for k := 1; k <= n; k++ {
		top += k
		for s := top; s >= k; s-- {
			c[s] += c[s-k]
		}
	}
	return c
}

// signRankCDF is P(V <= q) under the null hypothesis.
func signRankCDF(c []float64, q int) float64 {
	if q < 0 {
		return 0
	}
	if q >= len(c)-1 {
		return 1
	}
	var s, tot float64
	for i, v := range c {
		if i <= q {
			s += v
		}
		tot += v
	}
	return s / tot
}

// signRankQuantile is the smallest q with P(V <= q) >= p (as R's qsignrank).
func signRankQuantile(c []float64, p float64) int {
	var tot float64
	for _, v := range c {
		tot += v
	}
	var s float64
	for q, v := range c {
		s += v
		if s/tot >= p-10*2.220446049250313e-16 { // R's qsignrank fuzz
			return q
		}
	}
	return len(c) - 1
}
