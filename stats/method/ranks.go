package method

import (
	"math"
	"math/rand/v2"
	"slices"
	"sort"
)

// This file: rank tests of a difference in centre (Kruskal-Wallis, the
// Mann-Whitney / Wilcoxon rank-sum test with the Hodges-Lehmann shift and
// its interval) and their shared machinery: ranks by a merge of the
// sorted groups, the exact null distribution of the rank-sum statistic,
// and the selection of order statistics of the pairwise differences.

// RankNumber is the element type of the rank methods: float64 readings,
// or the readings' int64 mantissas at one common decimal scale (reading =
// mantissa × 10^-scale; the caller converts, e.g. 12.30 and 12.3 both to
// 1230 at scale 2). With mantissas every tie, every comparison and every
// pairwise difference of the Hodges-Lehmann shift is exact on the
// decimals as typed; mantissas must stay below 2^62 in magnitude so that
// differences do not overflow. Results in data units (shifts, limits) are
// then in mantissa units: the caller multiplies by 10^-scale. float64
// readings parsed from decimals of up to 15 significant digits also rank
// exactly (parsing is monotone and keeps distinct decimals distinct); only
// their differences are rounded.
type RankNumber interface{ ~int64 | ~float64 }

// grpSortedView returns g itself when it is in ascending order, else a
// sorted copy.
func grpSortedView[T RankNumber](g []T) []T {
	if slices.IsSorted(g) {
		return g
	}
	c := slices.Clone(g)
	slices.Sort(c)
	return c
}

func grpSortedViews[T RankNumber](groups [][]T) [][]T {
	s := make([][]T, len(groups))
	for i, g := range groups {
		s[i] = grpSortedView(g)
	}
	return s
}

// grpRanks holds the mid-rank sums of the groups in the ranking of all
// readings together and the tie term Σ(t³ - t) over the blocks of tied
// readings.
type grpRanks struct {
	sums []float64
	n    float64
	tie  float64
}

// grpRankSums ranks the sorted groups together by a k-way merge (a binary
// heap of the groups' next readings), O(N log k).
func grpRankSums[T RankNumber](sorted [][]T) grpRanks {
	k := len(sorted)
	pos := make([]int, k)
	heap := make([]int, 0, k)
	less := func(a, b int) bool { return sorted[a][pos[a]] < sorted[b][pos[b]] }
	down := func(i int) {
		for {
			l := 2*i + 1
			if l >= len(heap) {
				return
			}
			m := l
			if r := l + 1; r < len(heap) && less(heap[r], heap[l]) {
				m = r
			}
			if !less(heap[m], heap[i]) {
				return
			}
			heap[i], heap[m] = heap[m], heap[i]
			i = m
		}
	}
	up := func(i int) {
		for i > 0 {
			p := (i - 1) / 2
			if !less(heap[i], heap[p]) {
				return
			}
			heap[i], heap[p] = heap[p], heap[i]
			i = p
		}
	}
	pop := func() int {
		g := heap[0]
		last := len(heap) - 1
		heap[0] = heap[last]
		heap = heap[:last]
		if last > 0 {
			down(0)
		}
		return g
	}
	r := grpRanks{sums: make([]float64, k)}
	for g := range sorted {
		if len(sorted[g]) > 0 {
			heap = append(heap, g)
			up(len(heap) - 1)
		}
	}
	block := make([]int, 0, k) // groups in the current tie block
	cnts := make([]int, k)
	rank := 0
	for len(heap) > 0 {
		v := sorted[heap[0]][pos[heap[0]]]
		block = block[:0]
		for len(heap) > 0 && sorted[heap[0]][pos[heap[0]]] == v {
			block = append(block, pop())
		}
		t := 0
		for _, g := range block {
			s, p := sorted[g], pos[g]
			c := p
			for p < len(s) && s[p] == v {
				p++
			}
			cnts[g] = p - c
			t += p - c
			pos[g] = p
		}
		mid := float64(rank) + float64(t+1)/2
		for _, g := range block {
			r.sums[g] += mid * float64(cnts[g])
			if pos[g] < len(sorted[g]) {
				heap = append(heap, g)
				up(len(heap) - 1)
			}
		}
		if t > 1 {
			ft := float64(t)
			r.tie += ft*ft*ft - ft
		}
		rank += t
	}
	r.n = float64(rank)
	return r
}

// KruskalWallisTest is the Kruskal-Wallis statistic H (tie corrected),
// its degrees of freedom, the upper-tail chi-squared p-value, the tie
// correction factor C = 1 - Σ(t³-t)/(N³-N) that H was divided by, and the
// mean rank of each group.
type KruskalWallisTest struct {
	H, DF, P  float64
	TieFactor float64
	MeanRanks []float64
}

// KruskalWallis is the Kruskal-Wallis (1952) rank test for a difference
// among groups ("Use of ranks in one-criterion variance analysis", JASA
// 47, 583-621), with the correction for ties and the chi-squared
// approximation. Groups already in ascending order are used as they are.
func KruskalWallis[T RankNumber](groups [][]T) (KruskalWallisTest, error) {
	if err := grpCheck(groups, false); err != nil {
		return KruskalWallisTest{}, err
	}
	rk := grpRankSums(grpSortedViews(groups))
	return grpKW(groups, rk)
}

func grpKW[T RankNumber](groups [][]T, rk grpRanks) (KruskalWallisTest, error) {
	n := rk.n
	c := 1 - rk.tie/(n*n*n-n)
	if !(c > 0) {
		return KruskalWallisTest{}, grpErr(GroupsNoSpread, -1, 0)
	}
	var s float64
	mr := make([]float64, len(groups))
	for i, g := range groups {
		ni := float64(len(g))
		s += rk.sums[i] * rk.sums[i] / ni
		mr[i] = rk.sums[i] / ni
	}
	h := (12*s/(n*(n+1)) - 3*(n+1)) / c
	if h < 0 {
		h = 0
	}
	t := KruskalWallisTest{H: h, DF: float64(len(groups) - 1), TieFactor: c, MeanRanks: mr}
	t.P = chiSquaredSurvival(t.DF, h)
	if !grpFinite(t.H, t.P) {
		return KruskalWallisTest{}, grpErr(GroupsNotFinite, -1, 0)
	}
	return t, nil
}

// grpExactMax: the exact null distribution of the rank-sum statistic is
// used when both groups have fewer readings than this and there are no
// ties (the default of R's wilcox.test).
const grpExactMax = 50

// grpWilcoxCounts returns c[w], the number of the C(m+n, m) arrangements
// with rank-sum statistic W = w (0 <= w <= mn), by the recursion of the
// Gaussian binomial coefficients, T(a, b) = T(a-1, b) + q^a T(a, b-1)
// (Mann and Whitney 1947, eq. 3, in generating-function form; Andrews
// 1976, "The Theory of Partitions", ch. 3). All terms are positive, so
// the counts are accurate to rounding in float64. O(m²n²/4) for m <= n.
func grpWilcoxCounts(m, n int) []float64 {
	if m > n {
		m, n = n, m
	}
	// cur[b] is T(a, b), a polynomial of degree a*b
	prev := make([][]float64, n+1)
	cur := make([][]float64, n+1)
	for b := 0; b <= n; b++ {
		prev[b] = []float64{1} // T(0, b) = 1
	}
	for a := 1; a <= m; a++ {
		cur[0] = []float64{1}
		for b := 1; b <= n; b++ {
			p := make([]float64, a*b+1)
			copy(p, prev[b])
			for i, v := range cur[b-1] {
				p[i+a] += v
			}
			cur[b] = p
		}
		prev, cur = cur, prev
	}
	return prev[n]
}

// grpWilcoxDist is the exact distribution: cumulative probabilities
// cdf[w] = P(W <= w).
type grpWilcoxDist struct {
	cdf []float64
}

func grpNewWilcoxDist(m, n int) grpWilcoxDist {
	c := grpWilcoxCounts(m, n)
	tot := 0.0
	for _, v := range c {
		tot += v
	}
	cdf := make([]float64, len(c))
	s := 0.0
	for i, v := range c {
		s += v
		cdf[i] = s / tot
	}
	return grpWilcoxDist{cdf: cdf}
}

// p is P(W <= q).
func (d grpWilcoxDist) p(q int) float64 {
	if q < 0 {
		return 0
	}
	if q >= len(d.cdf) {
		return 1
	}
	return d.cdf[q]
}

// quantile is the smallest q with P(W <= q) >= x (for x <= 1/2, with R's
// allowance of 10 machine epsilons).
func (d grpWilcoxDist) quantile(x float64) int {
	x -= 10 * 2.220446049250313e-16
	for q, c := range d.cdf {
		if c >= x {
			return q
		}
	}
	return len(d.cdf) - 1
}

// twoSided is the exact two-sided p-value of W, as R's wilcox.test.
func (d grpWilcoxDist) twoSided(w float64, mn float64) float64 {
	var p float64
	if w > mn/2 {
		p = 1 - d.p(int(w)-1)
	} else {
		p = d.p(int(w))
	}
	return math.Min(1, 2*p)
}

// grpPairRank merges two sorted samples: W = the number of pairs with
// x > y, ties counting one half (= rank sum of x - m(m+1)/2), and the tie
// term Σ(t³ - t) of the two together.
func grpPairRank[T RankNumber](x, y []T) (w, tie float64) {
	i, j := 0, 0
	m, n := len(x), len(y)
	for i < m || j < n {
		var v T
		if j >= n || (i < m && x[i] <= y[j]) {
			v = x[i]
		} else {
			v = y[j]
		}
		a := i
		for i < m && x[i] == v {
			i++
		}
		b := j
		for j < n && y[j] == v {
			j++
		}
		cx, cy := i-a, j-b
		// each x here beats the b readings of y already passed, ties half
		w += float64(cx) * (float64(b) + float64(cy)/2)
		if t := float64(cx + cy); t > 1 {
			tie += t*t*t - t
		}
	}
	return w, tie
}

// grpSelfTie is Σ(t³ - t) over the blocks of tied readings of one sorted
// sample.
func grpSelfTie[T RankNumber](s []T) float64 {
	tie := 0.0
	for i := 0; i < len(s); {
		j := i + 1
		for j < len(s) && s[j] == s[i] {
			j++
		}
		if t := float64(j - i); t > 1 {
			tie += t*t*t - t
		}
		i = j
	}
	return tie
}

// grpRankSumP is the two-sided p-value of the rank-sum statistic w of
// samples of m and n with tie term tie: exact when exact, else the normal
// approximation with the tie and continuity corrections (returning z).
func grpRankSumP(w, tie float64, m, n int, exact bool, dist func() grpWilcoxDist) (p, z float64, err error) {
	fm, fn := float64(m), float64(n)
	mn := fm * fn
	if exact {
		return dist().twoSided(w, mn), 0, nil
	}
	N := fm + fn
	sigma := math.Sqrt(mn / 12 * ((N + 1) - tie/(N*(N-1))))
	if !(sigma > 0) {
		return 0, 0, grpErr(GroupsNoSpread, -1, 0)
	}
	d := w - mn/2
	corr := 0.0
	if d > 0 {
		corr = 0.5
	} else if d < 0 {
		corr = -0.5
	}
	z = (d - corr) / sigma
	p = TwoSidedNormalP(z)
	return p, z, nil
}

// MannWhitneyTest is the Wilcoxon rank-sum / Mann-Whitney test of x
// against y with the Hodges-Lehmann shift.
//
// W is the rank sum of x minus m(m+1)/2 (the number of pairs with x > y,
// ties counting one half). P is two-sided: from the exact null
// distribution when Exact, else from the normal approximation with the
// tie and continuity corrections, Z being the standardized statistic (0
// when Exact). Shift is the Hodges-Lehmann estimate, the median of the
// m·n differences x_i - y_j, and [Lo, Hi] its interval at Level;
// AchievedLevel is the interval's own coverage (the exact order
// statistics reach only some levels; with the normal approximation it
// equals Level unless the samples are too small for it).
type MannWhitneyTest struct {
	W, P, Z              float64
	Exact                bool
	Shift, Lo, Hi        float64
	Level, AchievedLevel float64
}

// MannWhitney is the Wilcoxon (1945) rank-sum test, in the form of Mann
// and Whitney (1947, "On a test of whether one of two random variables is
// stochastically larger than the other", Ann. Math. Statist. 18, 50-60),
// with the Hodges and Lehmann (1963, "Estimates of location based on rank
// tests", Ann. Math. Statist. 34, 598-611) shift of x over y and its
// distribution-free interval (Lehmann 1975, "Nonparametrics", ch. 2;
// Bauer 1972, JASA 67, 687-690), as R's wilcox.test(x, y, conf.int =
// TRUE): exact when both samples have fewer than 50 readings and no
// readings are tied, else the normal approximation with tie and
// continuity corrections, whose interval limits are the order statistics
// of the differences where R's root search of the standardized statistic
// changes sign. The k-th difference is selected without forming the m·n
// differences (see grpDiffSelect), in O((m+n) log(m+n)) expected time.
// Samples already in ascending order are used as they are.
func MannWhitney[T RankNumber](x, y []T, level float64) (MannWhitneyTest, error) {
	if err := grpCheck([][]T{x, y}, true); err != nil {
		return MannWhitneyTest{}, err
	}
	if !grpLevelOK(level) {
		return MannWhitneyTest{}, grpErr(GroupsBadLevel, -1, 0)
	}
	xs, ys := grpSortedView(x), grpSortedView(y)
	m, n := len(xs), len(ys)
	w, tie := grpPairRank(xs, ys)
	exact := m < grpExactMax && n < grpExactMax && tie == 0
	var dist grpWilcoxDist
	getDist := func() grpWilcoxDist {
		if dist.cdf == nil {
			dist = grpNewWilcoxDist(m, n)
		}
		return dist
	}
	p, z, err := grpRankSumP(w, tie, m, n, exact, getDist)
	if err != nil {
		return MannWhitneyTest{}, err
	}
	r := MannWhitneyTest{W: w, P: p, Z: z, Exact: exact, Level: level, AchievedLevel: level}
	// Hodges-Lehmann shift: the median of the differences
	mn := int64(m) * int64(n)
	sel := grpNewDiffSel(xs, ys)
	if mn%2 == 1 {
		r.Shift = float64(sel.kth(mn / 2))
	} else {
		a := sel.kth(mn/2 - 1)
		b := sel.next(a, mn/2-1)
		r.Shift = float64(a)/2 + float64(b)/2
	}
	alpha := 1 - level
	var kLo, kHi int64 // 1-based ranks of the limits
	if exact {
		d := getDist()
		qu := int64(d.quantile(alpha / 2))
		if qu == 0 {
			qu = 1
		}
		kLo, kHi = qu, mn-qu+1
		r.AchievedLevel = 1 - 2*d.p(int(qu)-1)
	} else {
		N := float64(m + n)
		tieIn := grpSelfTie(xs) + grpSelfTie(ys)
		sigma := math.Sqrt(float64(mn) / 12 * ((N + 1) - tieIn/(N*(N-1))))
		zq := NormalQuantile(1 - alpha/2)
		k := math.Floor(float64(mn)/2-0.5-zq*sigma) + 1
		if k < 1 {
			k = 1
			r.AchievedLevel = 2*NormalCDF((float64(mn)/2-0.5)/sigma) - 1
		}
		kLo = int64(k)
		kHi = mn + 1 - kLo
	}
	if kLo > kHi {
		kLo, kHi = kHi, kLo
	}
	r.Lo = float64(sel.kth(kLo - 1))
	r.Hi = float64(sel.kth(kHi - 1))
	if !grpFinite(r.W, r.P, r.Z, r.Shift, r.Lo, r.Hi, r.AchievedLevel) {
		return MannWhitneyTest{}, grpErr(GroupsNotFinite, -1, 0)
	}
	return r, nil
}

// grpDiffSel selects order statistics of the m·n differences x_i - y_j of
// two sorted samples without forming them: the implicit matrix with rows
// x_i and columns y_j is sorted along both (decreasing in j), so the
// entries below a threshold t are counted by one monotone "staircase"
// walk in O(m + n). The selection keeps, per row, the band of entries
// between a lower and an upper threshold that still holds the wanted
// rank, as in Johnson and Mizoguchi (1978, "Selecting the Kth element in
// X + Y and X1 + X2 + ... + Xm", SIAM J. Comput. 7, 147-153); the two
// thresholds of each round are order statistics of a random sample of
// the band bracketing the wanted rank (Floyd and Rivest 1975; Monahan
// 1984, ACM TOMS 10, 265-270), so each round keeps a few per cent of the
// band, and a band small enough is gathered and sorted. Differences are
// compared as computed, so ties and order agree exactly with the values
// returned (exact for int64 mantissas; for float64 the rounding of a
// difference is monotone in each operand, which keeps the rows sorted).
type grpDiffSel[T RankNumber] struct {
	x, y     []T
	lo, hi   []int32 // entries of row i below the band, and below or in it
	tl, th   []int32
	pref     []int64
	rng      *rand.Rand
	sample   []T
	gathered []T
}

func grpNewDiffSel[T RankNumber](x, y []T) *grpDiffSel[T] {
	m := len(x)
	return &grpDiffSel[T]{
		x: x, y: y,
		lo: make([]int32, m), hi: make([]int32, m),
		tl: make([]int32, m), th: make([]int32, m),
		pref: make([]int64, m+1),
		rng:  rand.New(rand.NewPCG(0x6c6f746c, 0x656e7321)),
	}
}

// stair fills cnt[i] = #{j : x_i - y_j < t} (strict) or <= t, and
// returns the total.
func (s *grpDiffSel[T]) stair(t T, strict bool, cnt []int32) int64 {
	y := s.y
	n := len(y)
	p := 0 // first j with x_i - y_j below t; non-decreasing in i
	var tot int64
	for i, xi := range s.x {
		if strict {
			for p < n && xi-y[p] >= t {
				p++
			}
		} else {
			for p < n && xi-y[p] > t {
				p++
			}
		}
		cnt[i] = int32(n - p)
		tot += int64(n - p)
	}
	return tot
}

// kth returns the difference of 0-based rank k in ascending order.
func (s *grpDiffSel[T]) kth(k int64) T {
	x, y := s.x, s.y
	m, n := len(x), len(y)
	for i := range s.lo {
		s.lo[i], s.hi[i] = 0, int32(n)
	}
	below, top := int64(0), int64(m)*int64(n)
	gatherAt := int64(max(m+n, 4096))
	for {
		c := top - below
		if c <= gatherAt {
			g := s.gathered[:0]
			for i, xi := range x {
				for j := n - int(s.hi[i]); j < n-int(s.lo[i]); j++ {
					g = append(g, xi-y[j])
				}
			}
			slices.Sort(g)
			s.gathered = g
			return g[k-below]
		}
		// random sample of the band
		var acc int64
		for i := 0; i < m; i++ {
			s.pref[i] = acc
			acc += int64(s.hi[i] - s.lo[i])
		}
		s.pref[m] = acc
		ns := int(min(c, 1<<13))
		smp := s.sample[:0]
		for t := 0; t < ns; t++ {
			u := s.rng.Int64N(c)
			i := sort.Search(m, func(r int) bool { return s.pref[r+1] > u }) // row holding u
			j := n - int(s.hi[i]) + int(u-s.pref[i])
			smp = append(smp, x[i]-y[j])
		}
		slices.Sort(smp)
		s.sample = smp
		f := float64(k-below) / float64(c) * float64(ns)
		d := 2 * math.Sqrt(float64(ns))
		ia := int(max(0, math.Floor(f-d)))
		ib := int(min(float64(ns-1), math.Ceil(f+d)))
		a, b := smp[ia], smp[ib]
		tla := s.stair(a, true, s.tl)
		thb := s.stair(b, false, s.th)
		switch {
		case k < tla: // below a
			s.hi, s.tl = s.tl, s.hi
			top = tla
		case k >= thb: // above b
			s.lo, s.th = s.th, s.lo
			below = thb
		default:
			if a == b {
				return a
			}
			if thb-tla >= c { // no progress (ties at both ends): one pivot
				pv := smp[int(min(float64(ns-1), max(0, f)))]
				lt := s.stair(pv, true, s.tl)
				le := s.stair(pv, false, s.th)
				switch {
				case k < lt:
					s.hi, s.tl = s.tl, s.hi
					top = lt
				case k >= le:
					s.lo, s.th = s.th, s.lo
					below = le
				default:
					return pv
				}
				continue
			}
			s.lo, s.tl = s.tl, s.lo
			s.hi, s.th = s.th, s.hi
			below, top = tla, thb
		}
	}
}

// next returns the difference of rank k+1 given v, the one of rank k.
func (s *grpDiffSel[T]) next(v T, k int64) T {
	le := s.stair(v, false, s.th)
	if le > k+1 {
		return v
	}
	// the smallest entry above v: in row i, the entry just before the
	// ones <= v (differences decrease in j)
	n := len(s.y)
	first := true
	var best T
	for i, xi := range s.x {
		j := n - int(s.th[i]) - 1
		if j < 0 {
			continue
		}
		d := xi - s.y[j]
		if first || d < best {
			best, first = d, false
		}
	}
	return best
}
