package method

import (
	"math"
	"sort"
)

// SignRankExactMaxN: the exact null distribution of the signed-rank
// statistic is used below this many non-zero differences without ties (as
// R's wilcox.test does).
const SignRankExactMaxN = 50

// SignedRankResult is the outcome of the one-sample Wilcoxon signed-rank
// test.
type SignedRankResult struct {
	V     float64 // rank sum of the positive differences
	P     float64 // two-sided
	Exact bool    // p from the exact null distribution
	Ties  bool    // tied |differences| (midranks used)
	Sigma float64 // SD of V under the null hypothesis (normal approximation; 0 when exact)
	// The ascending data split about mu: sorted[:Below] < mu,
	// sorted[Below:Above] == mu (dropped), sorted[Above:] > mu.
	Below, Above int
	NonZero      int
}

// SignedRank is the one-sample Wilcoxon (1945) signed-rank test of the
// ascending slice against mu, as R's wilcox.test (R 4.2.2) computes it:
// zero differences dropped, midranks for ties, the exact null distribution
// for fewer than 50 non-zero differences without ties or zeros, else the
// normal approximation with continuity correction and the tie correction of
// the variance. Ranks of |x - mu| come from one O(n) merge of the two sorted
// runs below and above mu. Ties and zeros are decided by the float64
// arithmetic of the input: pass integer-valued data (decimal mantissas) and
// an integer mu, all below 2^52 in magnitude, and every decision is exact.
// ok is false when no difference is non-zero.
func SignedRank(sorted []float64, mu float64) (r SignedRankResult, ok bool) {
	n := len(sorted)
	a := sort.SearchFloat64s(sorted, mu)
	b := a
	for b < n && sorted[b] == mu {
		b++
	}
	nz := a + (n - b)
	r.Below, r.Above, r.NonZero = a, b, nz
	if nz == 0 {
		return r, false
	}
	zeroes := b > a
	i, j := a-1, b
	absd := func(k int) float64 { return math.Abs(sorted[k] - mu) }
	var V, tieSum float64
	rank := 0
	for i >= 0 || j < n {
		var v float64
		if j >= n || (i >= 0 && absd(i) <= absd(j)) {
			v = absd(i)
		} else {
			v = absd(j)
		}
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
			r.Ties = true
			t := float64(cnt)
			tieSum += t*t*t - t
		}
		rank += cnt
	}
	fn := float64(nz)
	M := fn * (fn + 1) / 2
	r.V = V
	r.Exact = nz < SignRankExactMaxN && !r.Ties && !zeroes
	if r.Exact {
		counts := SignRankCounts(nz)
		var p float64
		if V > M/2 {
			p = 1 - SignRankCDF(counts, int(V)-1)
		} else {
			p = SignRankCDF(counts, int(V))
		}
		r.P = math.Min(1, 2*p)
	} else {
		z := V - M/2
		r.Sigma = math.Sqrt(fn*(fn+1)*(2*fn+1)/24 - tieSum/48)
		if !(r.Sigma > 0) {
			return r, false
		}
		corr := 0.0
		if z > 0 {
			corr = 0.5
		} else if z < 0 {
			corr = -0.5
		}
		z = (z - corr) / r.Sigma
		r.P = math.Min(1, 2*math.Min(NormalCDF(z), NormalSF(z)))
	}
	return r, normalFinite(r.P) && normalFinite(V)
}

// SignedRankInterval gives the 1-based ranks kLo <= kHi of the Walsh
// averages that bound the distribution-free interval for the pseudo-median
// (Tukey 1949; Hollander and Wolfe 1999, Nonparametric Statistical Methods,
// 3.2), as R's wilcox.test(conf.int = TRUE): from the exact signed-rank
// distribution when r.Exact, else ranks n(n+1)/4 ∓ (z·σ + 1/2) from its
// normal approximation. level is the level achieved; reached is false when
// too few values allow only the widest interval (minimum to maximum).
func SignedRankInterval(r SignedRankResult, conf float64) (kLo, kHi int64, level float64, reached bool) {
	nz := r.NonZero
	fn := float64(nz)
	M := fn * (fn + 1) / 2
	alpha := 1 - conf
	level, reached = conf, true
	if r.Exact {
		counts := SignRankCounts(nz)
		qu := SignRankQuantile(counts, alpha/2)
		if qu == 0 {
			qu = 1
		}
		kLo = int64(qu)
		level = 1 - 2*SignRankCDF(counts, qu-1)
	} else {
		zq := NormalQuantile(1 - alpha/2)
		k := math.Floor(M/2-0.5-zq*r.Sigma) + 1
		kLo = int64(max(1, k))
		if k < 1 {
			level = 1 - 2*NormalCDF((0.5-M/2)/r.Sigma)
			reached = false
		}
	}
	kHi = int64(M) + 1 - kLo
	if kLo > kHi {
		kLo, kHi = kHi, kLo
	}
	return kLo, kHi, level, reached
}

// SignRankCounts returns c[s], the number of subsets of {1..n} whose sum
// is s, for s = 0..n(n+1)/2 (the null distribution of the signed-rank
// statistic times 2^n). Exact in float64 for n < 50 (counts below 2^53).
func SignRankCounts(n int) []float64 {
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

// SignRankCDF is P(V <= q) under the null hypothesis, from SignRankCounts.
func SignRankCDF(c []float64, q int) float64 {
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

// SignRankQuantile is the smallest q with P(V <= q) >= p (as R's qsignrank).
func SignRankQuantile(c []float64, p float64) int {
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

// WalshSums are the sums z_i + z_j, i <= j, of the values of an ascending
// slice except a run in the middle (those equal to the target of a
// signed-rank test): twice the Walsh averages, whose median is the
// Hodges-Lehmann (1963) estimate. They are never formed: At selects them
// in O(n log n) expected time (Monahan 1984, see imSelect). On
// integer-valued input (decimal mantissas below 2^51) every sum is exact.
type WalshSums struct {
	m *imMatrix
	N int64 // number of sums
}

// NewWalshSums is the Walsh sums of sorted[:lo] and sorted[hi:].
func NewWalshSums(sorted []float64, lo, hi int) *WalshSums {
	n := lo + len(sorted) - hi
	z := sorted
	if hi > lo { // skip the middle run without copying when it is empty
		z = make([]float64, 0, n)
		z = append(z, sorted[:lo]...)
		z = append(z, sorted[hi:]...)
	}
	w := &imMatrix{rows: n, cols: n, upper: true}
	w.val = func(r, c int) float64 { return z[r] + z[c] }
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
	return &WalshSums{m: w, N: w.total()}
}

// At returns the sums of rank k and k+1 (0-based; the second equals the
// first when k+1 does not exist). NaN when the selection fails.
func (w *WalshSums) At(k int64) (vk, vk1 float64) {
	return imSelect(w.m, k, true)
}

// walshStair runs the staircase of one threshold over the Walsh rows
// r0..r1-1 from column c (see mcStair).
func walshStair(z []float64, r0, r1, c int, t float64, strict bool, out []int32) (int, int64) {
	var cnt int64
	for r := r0; r < r1; r++ {
		c = max(c, r)
		zr := z[r]
		if strict {
			for c > r && zr+z[c-1] >= t {
				c--
			}
		} else {
			for c > r && zr+z[c-1] > t {
				c--
			}
		}
		out[r-r0] = int32(c)
		cnt += int64(c - r)
	}
	return c, cnt
}

// OneSampleT is Student's (1908) one-sample t test of the mean against mu:
// t = (mean - mu)/(s/√n) on n-1 degrees of freedom, the two-sided p, and
// the t interval for the mean at level conf.
type OneSampleT struct {
	T, DF, P float64
	Lo, Hi   float64
}

// TTest computes OneSampleT from the mean and SD (divisor n-1) of n values;
// ok is false when n < 2, sd <= 0 or a figure is not finite.
func TTest(mean, sd float64, n int, mu, conf float64) (r OneSampleT, ok bool) {
	if n < 2 || !(sd > 0) || !normalFinite(mu) {
		return r, false
	}
	fn := float64(n)
	se := sd / math.Sqrt(fn)
	r.DF = fn - 1
	r.T = (mean - mu) / se
	if !normalFinite(r.T) {
		return r, false
	}
	r.P = math.Min(1, 2*tSurvival(r.DF, math.Abs(r.T)))
	h := tQuantile(r.DF, 1-(1-conf)/2) * se
	r.Lo, r.Hi = mean-h, mean+h
	return r, normalFinite(r.P) && normalFinite(r.Lo) && normalFinite(r.Hi)
}
