package method

import (
	"cmp"
	"math"
	"math/rand/v2"
	"slices"
)

// The medcouple on tied data. Readings recorded to an instrument's
// resolution take few distinct values (a million readings to 0.001 between
// 4.8 and 5.2 have about 400), so the n²/4 kernel values are repeats of the
// values on D_lo × D_hi distinct pairs: the pair of a distinct value l < m
// (c_l times) and u > m (c_u times) stands for c_l·c_u kernel values, all
// computed by the same expression as mcMatrix's (so the same bits). The
// pairs with one value equal to the median m (k of them) give exactly -1
// (l < m) or +1 (u > m), and the k×k block of pairs tied with the median
// holds, by mcMatrix's index rule d = i + j - (k-1) (i, j = 0..k-1),
// k(k-1)/2 values -1 (d < 0), k values 0 (d = 0) and k(k-1)/2 values +1.
// The wanted order statistics of this weighted multiset are then selected
// as imSelect does over the full matrix (Johnson and Mizoguchi 1978;
// Monahan 1984: random pivots, staircase counts, narrowing each row's
// range of columns), here with each cell counted by its weight: O(D log D)
// expected for D = D_lo + D_hi distinct values, after an O(D log(n/D))
// search for the runs of equal values, against O(n log n) for imSelect. Both this and imSelect return the
// exact order statistics of the same kernel values (they rely on the
// rounded kernel increasing along rows and columns, as the definition's
// kernel does), so the medcouple is the same to the last bit.

// mcTally is the medcouple's kernel over the distinct values of a sorted
// sample, with counts.
type mcTally struct {
	w  []float64 // distinct values below the median minus m, ascending (< 0)
	cw []int64   // their counts
	u  []float64 // distinct values above the median minus m, ascending (> 0)
	// cuBelow[j] is the number of values among the first j distinct values
	// above the median (a prefix sum of their counts, len(u)+1 entries).
	cuBelow []int64
	// Weights of the exact values -1, 0 and +1 from the pairs with a value
	// equal to the median.
	neg, zero, pos int64
	total          int64 // all kernel values: rows·cols of mcMatrix
}

// mcTallyShare: the tally is used when the distinct values other than the
// median number at most n/mcTallyShare. Measured on normal readings rounded
// to steps giving 576 to 9861 distinct values among 10,000 and 834 to
// 372,954 among 1,000,000: the tally took from 1/28 (10,000 readings, 576
// distinct) and 1/230 (1,000,000, 834 distinct) of imSelect's time to
// about the same at 6,600 of 10,000 and 1.6 times it at 373,000 of
// 1,000,000 (one third of imSelect's time at 148,000);
// BenchmarkMedcoupleTallyShare.
const mcTallyShare = 5

// mcTallyMaxDistinct is the most distinct values for which medcoupleMiddle
// uses the tally on n values (a variable so that the tests can force
// either path).
var mcTallyMaxDistinct = func(n int) int { return n / mcTallyShare }

// mcNewTally tallies the sorted values about their median m, or returns nil
// when more than maxD distinct values lie off the median, when a kernel's
// denominator can overflow or the data hold an infinity or NaN (left to
// imSelect, whose staircase cannot compute there and says so), or when one
// side is empty (no kernel: medcoupleImplicit says so).
func mcNewTally(sorted []float64, m float64, maxD int) *mcTally {
	n := len(sorted)
	q, _ := slices.BinarySearch(sorted, m) // first x >= m
	p := q
	if q < n && sorted[q] == m {
		p = mcRunEnd(sorted, q)
	}
	k := p - q
	rows, cols := p, n-q
	if rows == 0 || cols == 0 {
		return nil
	}
	if lo, hi := sorted[0]-m, sorted[n-1]-m; !normalFinite(hi - lo) {
		return nil
	}
	// Count the runs first (stopping past maxD: continuous data cost at
	// most maxD steps and no allocation), then tally them.
	dl := 0
	for i := 0; i < q && dl <= maxD; i = mcRunEnd(sorted[:q], i) {
		dl++
	}
	du := 0
	for i := p; i < n && dl+du <= maxD; i = mcRunEnd(sorted, i) {
		du++
	}
	if dl+du > maxD {
		return nil
	}
	t := &mcTally{
		w:       make([]float64, 0, dl),
		cw:      make([]int64, 0, dl),
		u:       make([]float64, 0, du),
		cuBelow: make([]int64, 1, du+1),
	}
	for i := 0; i < q; {
		j := mcRunEnd(sorted[:q], i)
		t.w = append(t.w, sorted[i]-m)
		t.cw = append(t.cw, int64(j-i))
		i = j
	}
	for i := p; i < n; {
		j := mcRunEnd(sorted, i)
		t.u = append(t.u, sorted[i]-m)
		t.cuBelow = append(t.cuBelow, t.cuBelow[len(t.cuBelow)-1]+int64(j-i))
		i = j
	}
	kk := int64(k)
	t.neg = int64(q)*kk + kk*(kk-1)/2
	t.zero = kk
	t.pos = kk*int64(n-p) + kk*(kk-1)/2
	t.total = int64(rows) * int64(cols)
	return t
}

// mcRunEnd returns the end of the run of values equal to x[i] (x sorted):
// a doubling search then a binary search, O(log of the run's length).
func mcRunEnd(x []float64, i int) int {
	v := x[i]
	lo, step := i, 1 // x[lo] == v
	for lo+step < len(x) && x[lo+step] == v {
		lo += step
		step *= 2
	}
	hi := min(lo+step, len(x)) // x[hi] != v or hi == len(x)
	for hi-lo > 1 {
		mid := int(uint(lo+hi) >> 1)
		if x[mid] == v {
			lo = mid
		} else {
			hi = mid
		}
	}
	return hi
}

// h is the kernel of the i-th distinct value below and the j-th above the
// median: mcMatrix's val, the same expression in the same order.
func (t *mcTally) h(i, j int) float64 {
	w, u := t.w[i], t.u[j]
	return (u + w) / (u - w)
}

// count returns the number of kernel values < th (strict) or <= th, and
// writes into bnd (when not nil) each row's first column not counted: one
// staircase over the distinct pairs, as mcStair's but comparing the
// kernel's rounded values themselves.
func (t *mcTally) count(th float64, strict bool, bnd []int32) int64 {
	var cnt int64
	c := len(t.u)
	for i := range t.w {
		for c > 0 {
			if v := t.h(i, c-1); v < th || (!strict && v == th) {
				break
			}
			c--
		}
		if bnd != nil {
			bnd[i] = int32(c)
		}
		cnt += t.cw[i] * t.cuBelow[c]
	}
	for c, v := range mcTallyConst {
		if v < th || (!strict && v == th) {
			cnt += t.constN(c)
		}
	}
	return cnt
}

// smallestAbove returns the smallest kernel value > th (+Inf if none).
func (t *mcTally) smallestAbove(th float64) float64 {
	v := math.Inf(1)
	for c, cv := range mcTallyConst {
		if t.constN(c) > 0 && cv > th {
			v = min(v, cv)
		}
	}
	c := len(t.u)
	for i := range t.w {
		for c > 0 && t.h(i, c-1) > th {
			c--
		}
		if c < len(t.u) {
			v = min(v, t.h(i, c))
		}
	}
	return v
}

// Sizes of the tally's selection rounds: the sample drawn per round (a
// quarter of the number of distinct values, within these bounds, so that
// drawing it costs about as much as the round's two staircases), and the
// number of distinct pairs left below which they are sorted directly (at
// least the number of distinct values: about the cost of one round).
const (
	mcTallySampleMin = 64
	mcTallySampleMax = 4096
	mcTallyGatherMin = 256
)

// mcTallyConst are the kernel values of the pairs with a value equal to the
// median, ascending; constN gives their numbers.
var mcTallyConst = [3]float64{-1, 0, 1}

func (t *mcTally) constN(c int) int64 {
	return [3]int64{t.neg, t.zero, t.pos}[c]
}

// selectRank returns the kernel value of rank k (0-based, ascending, each
// distinct pair counted by its weight). As imSelect: every row keeps the
// range of columns that may still hold rank k; each round draws a sample of
// the remaining kernel values by weight, takes two sample quantiles
// bracketing rank k as pivots (Floyd and Rivest 1975), or one when the
// last round kept more than half (progress through ties), counts below
// the lower and up to the upper pivot by two staircases, and narrows the
// ranges to the side or the band that holds rank k; once few pairs remain
// they are sorted with their weights. The kernel values -1, 0, +1 of the
// median's ties take part in the counts, the samples and the final sort
// while within the bounds.
func (t *mcTally) selectRank(k int64) float64 {
	rows, cols := len(t.w), len(t.u)
	rng := rand.New(rand.NewPCG(0x4c6f746c656e73, uint64(k)))
	first := make([]int32, rows) // active columns of row i: [first[i], end[i])
	end := make([]int32, rows)
	for i := range end {
		end[i] = int32(cols)
	}
	bLT, bLE := make([]int32, rows), make([]int32, rows)
	lower := imBound{math.Inf(-1), true} // as in imSelect
	upper := imBound{math.Inf(1), false}
	inBounds := func(v float64) bool {
		return (v > lower.t || (lower.strict && v == lower.t)) &&
			(v < upper.t || (!upper.strict && v == upper.t))
	}
	below := int64(0) // values excluded by the lower bound (all smaller)
	gatherLim := int64(max(mcTallyGatherMin, rows+cols))
	sN := min(mcTallySampleMax, max(mcTallySampleMin, (rows+cols)/4))
	samp := make([]float64, 0, sN)
	pos := make([]int64, sN)
	cum := make([]float64, sN)
	single := false
	oldW := int64(math.MaxInt64)
	for round := 0; round < 200; round++ {
		// Active pairs (unweighted) and active values (weighted).
		var cells, W int64
		for i := range first {
			if end[i] > first[i] {
				cells += int64(end[i] - first[i])
				W += t.cw[i] * (t.cuBelow[end[i]] - t.cuBelow[first[i]])
			}
		}
		for c, v := range mcTallyConst {
			if inBounds(v) {
				W += t.constN(c)
			}
		}
		if cells <= gatherLim || W <= 0 {
			break
		}
		single = single || W > oldW/2
		oldW = W
		// Sample by weight: sorted positions in [0, W), the constants
		// first, then the rows; within a row the column by its count.
		// (sorted uniforms from the sums of exponential spacings,
		// Devroye 1986, ch. 5, no sort needed)
		sum := 0.0
		for i := range cum {
			sum += rng.ExpFloat64()
			cum[i] = sum
		}
		sum += rng.ExpFloat64()
		for i, c := range cum {
			pos[i] = min(int64(c/sum*float64(W)), W-1)
		}
		samp = samp[:0]
		pi, acc := 0, int64(0)
		for c, v := range mcTallyConst {
			if !inBounds(v) {
				continue
			}
			acc += t.constN(c)
			for pi < len(pos) && pos[pi] < acc {
				samp = append(samp, v)
				pi++
			}
		}
		for i := range first {
			if end[i] <= first[i] {
				continue
			}
			base := t.cuBelow[first[i]]
			rw := t.cw[i] * (t.cuBelow[end[i]] - base)
			for pi < len(pos) && pos[pi] < acc+rw {
				// column j with cuBelow[j] <= base+o < cuBelow[j+1]
				o := base + (pos[pi]-acc)/t.cw[i]
				j, _ := slices.BinarySearch(t.cuBelow[first[i]:end[i]+1], o+1)
				samp = append(samp, t.h(i, int(first[i])+j-1))
				pi++
			}
			acc += rw
		}
		s := len(samp)
		centre := int(float64(k-below) / float64(W) * float64(s))
		var i1, i2 int
		if single {
			i1 = min(max(centre, 0), s-1)
			i2 = i1
			single = false
		} else {
			d := int(1.5*math.Sqrt(float64(s))) + 2
			i1, i2 = max(centre-d, 0), min(centre+d, s-1)
		}
		// the two sample quantiles (floatSelect leaves samp[i1:] the
		// values from rank i1 on)
		lo := floatSelect(samp, i1)
		hi := floatSelect(samp[i1:], i2-i1)
		cLT := t.count(lo, true, bLT)
		cLE := t.count(hi, false, bLE)
		switch {
		case k < cLT: // rank k is below lo
			upper = imBound{lo, true}
			for i := range end {
				end[i] = min(end[i], bLT[i])
			}
		case k >= cLE: // rank k is above hi
			lower, below = imBound{hi, false}, cLE
			for i := range first {
				first[i] = max(first[i], bLE[i])
			}
		default: // lo <= rank k <= hi
			if lo == hi {
				return lo
			}
			lower, upper, below = imBound{lo, true}, imBound{hi, false}, cLT
			for i := range first {
				first[i] = max(first[i], bLT[i])
				end[i] = min(end[i], bLE[i])
			}
		}
	}
	type wv struct {
		v float64
		n int64
	}
	var buf []wv
	for i := range first {
		for j := first[i]; j < end[i]; j++ {
			buf = append(buf, wv{t.h(i, int(j)), t.cw[i] * (t.cuBelow[j+1] - t.cuBelow[j])})
		}
	}
	for c, v := range mcTallyConst {
		if n := t.constN(c); n > 0 && inBounds(v) {
			buf = append(buf, wv{v, n})
		}
	}
	slices.SortFunc(buf, func(a, b wv) int { return cmp.Compare(a.v, b.v) })
	r := k - below
	for _, e := range buf {
		if r < e.n {
			return e.v
		}
		r -= e.n
	}
	return math.NaN() // cannot happen: the counts add up to total
}

// middle returns the two middle kernel values (equal when their number is
// odd), as medcoupleImplicit does.
func (t *mcTally) middle() (lo, hi float64, ok bool) {
	N := t.total
	kk := N / 2
	if N%2 == 0 {
		kk = N/2 - 1
	}
	v := t.selectRank(kk)
	if N%2 == 1 {
		return v, v, normalFinite(v)
	}
	v1 := v
	if kk+1 >= t.count(v, false, nil) {
		v1 = t.smallestAbove(v)
	}
	return v, v1, normalFinite(v) && normalFinite(v1)
}
