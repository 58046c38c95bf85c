package method

import (
	"math/bits"

	"lotlens/stats/decimal"
	"math"
	"math/rand/v2"
	"slices"
)

// This file selects order statistics of large implicit matrices whose rows
// and columns are sorted, without building them: the medcouple's kernel
// matrix (about n²/4 entries) and the Walsh averages of the Wilcoxon
// signed-rank test (about n²/2 entries). The method is the one of Johnson
// and Mizoguchi (1978), "Selecting the Kth element in X+Y and X1+X2+...+Xm",
// SIAM J. Comput. 7, 147-153, and Monahan (1984), "Fast computation of the
// Hodges-Lehmann location estimator", ACM TOMS 10, 265-270: keep, for every
// row, the range of columns that may still hold the wanted entry; count the
// entries below a pivot with one monotone "staircase" walk over the rows in
// O(rows + columns); narrow the ranges; repeat. As in Monahan's algorithm
// the pivots are drawn at random from the remaining entries, here as a pair
// of sample quantiles bracketing the wanted rank (Floyd and Rivest 1975), so
// that each round keeps about 3/√s of the candidates for a sample of s.
// Once few candidates remain they are gathered and selected directly.
// Time O(n log n) expected; memory three int32 per row.

// imMatrix is an implicit matrix with entries increasing along each row
// and down each column. Row r holds columns [r, cols) when upper is set
// (a triangle, as the Walsh averages), else [0, cols).
type imMatrix struct {
	rows, cols int
	upper      bool
	// val is the entry at (r, c).
	val func(r, c int) float64
	// walk2 runs two staircases at once. For every row r, b1 is the first
	// column whose entry is > t1 (>= t1 when s1), so that b1 - first(r)
	// entries of the row are <= t1 (< t1); b2 likewise for t2, s2. When
	// visit is not nil it is called for consecutive chunks of rows from r0
	// with their b1 and b2 (the slices are reused). walk2 returns the two
	// totals. The comparisons must agree exactly with val.
	walk2 func(t1 float64, s1 bool, t2 float64, s2 bool, visit func(r0 int, b1, b2 []int32)) (n1, n2 int64)
}

func (m *imMatrix) first(r int) int {
	if m.upper {
		return r
	}
	return 0
}

func (m *imMatrix) total() int64 {
	if m.upper {
		return int64(m.cols)*int64(m.rows) - int64(m.rows)*int64(m.rows-1)/2
	}
	return int64(m.rows) * int64(m.cols)
}

// imBound is one side of the active set: the row boundary of the walk of
// (t, strict). As a lower bound it excludes the entries < t (strict) or
// <= t; as an upper bound it keeps the entries <= t (not strict) or < t.
type imBound struct {
	t      float64
	strict bool
}

// Sizes of the selection rounds.
const (
	imSample       = 1 << 16 // largest sample per round (smaller for small matrices, see imSelectHint)
	imMinCollect   = 1 << 16 // gather the candidates once this few remain
	imCollectShare = 8       // ... or once at most (rows+cols)/8 remain: about 1 byte per value
)

// imSelect returns the entries of rank k and k+1 (0-based, in ascending
// order of all entries; the second only when next is set and k+1 exists).
// Each round is one pass over the rows (two staircases), which also
// samples the next round's candidates; no per-row state is stored.
func imSelect(m *imMatrix, k int64, next bool) (vk, vk1 float64) {
	return imSelectHint(m, k, next, nil)
}

// imHint gives the first round's pivots and the expected share of the
// entries between them.
type imHint struct {
	lo, hi, share float64
}

// imSelectHint is imSelect with optional first-round pivots.
func imSelectHint(m *imMatrix, k int64, next bool, hint *imHint) (vk, vk1 float64) {
	rng := rand.New(rand.NewPCG(0x4c6f746c656e73, uint64(k)))
	lower := imBound{math.Inf(-1), true}
	upper := imBound{math.Inf(1), false}
	below := int64(0) // entries excluded by the lower bound (all smaller)
	W := m.total()    // active entries
	collectLimit := max(int64(imMinCollect), int64(m.rows+m.cols)/imCollectShare)
	// Sorting the sample should cost less than a pass over the rows.
	sampleN := min(imSample, max(4096, (m.rows+m.cols)/8))
	single := false // next round uses one pivot (progress through ties)
	var samp, buf []float64
	sampOK, bufOK := false, false

	// smallestAbove is the smallest entry > t (+Inf if none).
	smallestAbove := func(t float64) float64 {
		v := math.Inf(1)
		m.walk2(t, false, t, false, func(r0 int, b1, _ []int32) {
			for i, b := range b1 {
				if int(b) < m.cols {
					v = min(v, m.val(r0+i, int(b)))
				}
			}
		})
		return v
	}
	finish := func(buf []float64) (float64, float64) {
		if len(buf) == 0 {
			return math.NaN(), math.NaN()
		}
		kk := int(min(max(k-below, 0), int64(len(buf)-1)))
		a := floatSelect(buf, kk)
		b := a
		if next {
			if kk+1 < len(buf) {
				b = slices.Min(buf[kk+1:])
			} else {
				b = smallestAbove(a)
			}
		}
		return a, b
	}
	// gather returns all active entries.
	gather := func() []float64 {
		out := make([]float64, 0, W)
		m.walk2(lower.t, lower.strict, upper.t, upper.strict, func(r0 int, b1, b2 []int32) {
			for i := range b1 {
				for c := b1[i]; c < b2[i]; c++ {
					out = append(out, m.val(r0+i, int(c)))
				}
			}
		})
		return out
	}
	// sampleActive draws about s active entries uniformly.
	sampleActive := func(s int) []float64 {
		out := samp[:0]
		if cap(out) < s+s/16 {
			// sized once: the next walk's sample (about s, binomial
			// with SD √s) usually fits too
			out = make([]float64, 0, s+s/16)
		}
		if math.IsInf(lower.t, -1) && math.IsInf(upper.t, 1) {
			// Whole matrix: draw cells directly (the triangle's diagonal
			// is slightly under-drawn; pivots need not be exact quantiles).
			for range s {
				r, c := rng.IntN(m.rows), rng.IntN(m.cols)
				if m.upper && c < r {
					if r >= m.cols || c >= m.rows {
						continue
					}
					r, c = c, r
				}
				out = append(out, m.val(r, c))
			}
			return out
		}
		pos := make([]int64, s)
		for i := range pos {
			pos[i] = rng.Int64N(W)
		}
		slices.Sort(pos)
		acc := int64(0)
		pi := 0
		m.walk2(lower.t, lower.strict, upper.t, upper.strict, func(r0 int, b1, b2 []int32) {
			for i := range b1 {
				w := int64(b2[i] - b1[i])
				for pi < len(pos) && pos[pi] < acc+w {
					out = append(out, m.val(r0+i, int(b1[i])+int(pos[pi]-acc)))
					pi++
				}
				acc += w
			}
		})
		return out
	}
	for round := 0; ; round++ {
		if W <= 0 || round > 200 {
			// Cannot happen while walks and val agree; never return a
			// wrong value: the callers leave the figure out.
			return math.NaN(), math.NaN()
		}
		if bufOK {
			return finish(buf)
		}
		if W <= collectLimit {
			return finish(gather())
		}
		var lo, hi, wExp float64
		if round == 0 && hint != nil {
			// Pivots from the caller (a coarse pass over a subset).
			lo, hi = hint.lo, hint.hi
			wExp = hint.share * float64(W)
		} else {
			if !sampOK {
				samp = sampleActive(sampleN)
			}
			imSortSample(samp)
			s := len(samp)
			if s == 0 {
				// Only when walks and val disagree (NaN kernel values
				// from an infinite value among the data): cannot
				// compute, never panic.
				return math.NaN(), math.NaN()
			}
			kk := k - below
			centre := int(float64(kk) / float64(W) * float64(s))
			var i1, i2 int
			if single {
				i1 = min(max(centre, 0), s-1)
				i2 = i1
			} else {
				d := int(1.5*math.Sqrt(float64(s))) + 2
				i1, i2 = max(centre-d, 0), min(centre+d, s-1)
			}
			lo, hi = samp[i1], samp[i2]
			wExp = float64(i2-i1+1) / float64(s) * float64(W)
		}
		// One pass: count below lo and up to hi, and sample (or gather)
		// the band [lo, hi] for the next round in case it holds rank k.
		// A band of one value (lo == hi, common in tied data) is neither
		// sampled nor gathered: if it holds rank k the answer is lo, and
		// otherwise the next round's bounds exclude all of it.
		oneValue := lo == hi
		gatherBand := !oneValue && wExp <= float64(collectLimit)
		p := min(1, float64(sampleN)/math.Max(wExp, 1))
		lq := math.Log1p(-p)
		skip := func() int64 {
			if p >= 1 {
				return 0
			}
			return int64(math.Log(1-rng.Float64()) / lq)
		}
		nextPos := skip()
		acc := int64(0)
		samp = samp[:0]
		buf = buf[:0]
		overflow := false
		maxSamp := 4 * sampleN
		maxBuf := int(2 * collectLimit)
		if gatherBand {
			if want := min(maxBuf, int(wExp*1.25)+1024); cap(buf) < want {
				buf = make([]float64, 0, want)
			}
		}
		visit := func(r0 int, b1s, b2s []int32) {
			for i := range b1s {
				b1, b2 := int(b1s[i]), int(b2s[i])
				if overflow {
					return
				}
				if b2 <= b1 {
					continue
				}
				r := r0 + i
				if gatherBand {
					if len(buf)+b2-b1 > maxBuf {
						overflow = true
						return
					}
					for c := b1; c < b2; c++ {
						buf = append(buf, m.val(r, c))
					}
					continue
				}
				w := int64(b2 - b1)
				for nextPos < acc+w {
					samp = append(samp, m.val(r, b1+int(nextPos-acc)))
					if len(samp) >= maxSamp {
						overflow = true
						return
					}
					nextPos += 1 + skip()
				}
				acc += w
			}
		}
		if oneValue {
			visit = nil
		}
		cLT, cLE := m.walk2(lo, true, hi, false, visit)
		oldW := W
		sampOK, bufOK = false, false
		switch {
		case k < cLT: // rank k is below lo
			upper = imBound{lo, true}
			W = cLT - below
		case k >= cLE: // rank k is above hi
			W = below + W - cLE
			below = cLE
			lower = imBound{hi, false}
		default: // lo <= rank k <= hi
			lower, upper = imBound{lo, true}, imBound{hi, false}
			below, W = cLT, cLE-cLT
			if lo == hi {
				vk = lo
				if next {
					if k+1 < cLE {
						vk1 = lo
					} else {
						vk1 = smallestAbove(lo)
					}
				}
				return vk, vk1
			}
			if !overflow {
				if gatherBand {
					bufOK = int64(len(buf)) == W
				} else {
					sampOK = len(samp) >= sampleN/4
				}
			}
		}
		single = W > oldW/2
	}
}

// imSortSample sorts a pivot sample in place: by the radix sort of decimal.SortFloats
// (several times faster than a comparison sort at the sample sizes used),
// unless the sample holds a NaN (the kernel of values near the float64
// limit can give one), which only a comparison sort orders.
func imSortSample(samp []float64) {
	for _, v := range samp {
		if v != v {
			slices.Sort(samp)
			return
		}
	}
	decimal.SortFloats(samp)
}

// imChunk is the number of rows a walk hands to its visitor at once.
const imChunk = 4096

// mcStair runs the staircase of one threshold over the medcouple rows
// r0..r1-1 (all with x < m), starting from column c, writing each row's
// boundary into out[r-r0]; it returns the last boundary and the count. With
// u = x[q+c]-m >= 0 and v = m-x[r] > 0 the entry is (u-v)/(u+v), and it is
// > t (>= t when strict) when u(1-t) - v(1+t) is clearly positive: that
// difference is computed within 6.7e-16(u+v) of its exact value, and a
// margin of 2e-15(u+v) keeps the decision equal to comparing val's rounded
// quotient (relative error below 3.4e-16) with t. Inside the margin it
// divides exactly as val does, so walks and sampled values agree to the
// last bit.
func mcStair(x []float64, m float64, q, r0, r1, c int, t float64, strict bool, out []int32) (int, int64) {
	var cnt int64
	a, b := 1-t, 1+t
	for r := r0; r < r1; r++ {
		v := m - x[r] // > 0
		vb := v * b
		for c > 0 {
			u := x[q+c-1] - m // >= 0
			// (u - v) - t(u + v) = u(1-t) - v(1+t), computed within
			// 6.7e-16(u+v) of its value; a clear sign decides the
			// comparison of val's rounded quotient with t.
			diff := u*a - vb
			s := u + v
			mg := 2e-15 * s
			var gt bool
			switch {
			case s > 1e-290 && diff > mg:
				gt = true
			case s > 1e-290 && diff < -mg:
				gt = false
			case strict:
				gt = (u-v)/(u+v) >= t
			default:
				gt = (u-v)/(u+v) > t
			}
			if !gt {
				break
			}
			c--
		}
		out[r-r0] = int32(c)
		cnt += int64(c)
	}
	return c, cnt
}

// floatSelect returns the k-th smallest (0-based) of a (no NaN), reordering a so
// that a[:k] <= a[k] <= a[k+1:] (quickselect, Hoare 1961, with
// median-of-three pivots and a sort as the worst-case fallback).
func floatSelect(a []float64, k int) float64 {
	lo, hi := 0, len(a)-1
	budget := 2 * bits.Len64(uint64(len(a)))
	for hi > lo {
		if budget == 0 {
			slices.Sort(a[lo : hi+1])
			return a[k]
		}
		budget--
		mid := lo + (hi-lo)/2
		if a[mid] < a[lo] {
			a[mid], a[lo] = a[lo], a[mid]
		}
		if a[hi] < a[lo] {
			a[hi], a[lo] = a[lo], a[hi]
		}
		if a[hi] < a[mid] {
			a[hi], a[mid] = a[mid], a[hi]
		}
		p := a[mid]
		i, j := lo, hi
		for i <= j {
			for a[i] < p {
				i++
			}
			for a[j] > p {
				j--
			}
			if i <= j {
				a[i], a[j] = a[j], a[i]
				i++
				j--
			}
		}
		switch {
		case k <= j:
			hi = j
		case k >= i:
			lo = i
		default:
			return a[k]
		}
	}
	return a[k]
}

// Medcouple is the medcouple of Brys, Hubert and Struyf (2004), "A robust
// measure of skewness", J. Comput. Graph. Stat. 13, 996-1017: the median of
// the kernel h(xi, xj) = ((xj-m) - (m-xi)) / (xj - xi) over all pairs
// xi <= m <= xj, m the median, with the kernel's special case for pairs
// of values both equal to m (-1, 0 or +1 by their position, so that the
// kernel matrix stays sorted). The median of the kernel is found in
// O(n log n) expected time by imSelect, without forming the n²/4 pairs,
// or, when at most n/5 distinct values lie off the median (readings to a
// resolution), in O(D log D) by the same selection over the D distinct
// values with their counts (mcTally, the same value to the last bit);
// for an even number of pairs it is the mean of the two middle ones.
// sorted is ascending; ok is false for fewer than 3 values.
func Medcouple(sorted []float64) (mc float64, ok bool) {
	a, b, ok := medcoupleMiddle(sorted)
	if !ok {
		return 0, false
	}
	mc = a/2 + b/2
	// Kernel values carry rounding of a few units in 1e-16; a medcouple
	// this close to 0 is 0 within rounding (symmetric data).
	if math.Abs(mc) < mcZero {
		mc = 0
	}
	return mc, normalFinite(mc)
}

// mcZero is the magnitude below which the medcouple is reported as 0.
const mcZero = 1e-13

// medcoupleMiddle returns the two middle kernel values (equal when their
// number is odd).
func medcoupleMiddle(sorted []float64) (lo, hi float64, ok bool) {
	n := len(sorted)
	if n < 3 || n > math.MaxInt32 {
		return 0, 0, false
	}
	m := sorted[(n-1)/2]
	if n%2 == 0 {
		m = sorted[n/2-1]/2 + sorted[n/2]/2
	}
	// Few distinct values (readings to an instrument's resolution): select
	// over the distinct pairs with their counts (mcTally, same values).
	if t := mcNewTally(sorted, m, mcTallyMaxDistinct(n)); t != nil {
		return t.middle()
	}
	return medcoupleImplicit(sorted, m)
}

// medcoupleImplicit is medcoupleMiddle by imSelect over the kernel matrix of
// all the values about the median m.
func medcoupleImplicit(sorted []float64, m float64) (lo, hi float64, ok bool) {
	n := len(sorted)
	mx := mcMatrix(sorted, m)
	if mx == nil {
		return 0, 0, false
	}
	N := mx.total()
	kk := N / 2
	if N%2 == 0 {
		kk = N/2 - 1
	}
	// For large samples the first round's pivots come from the same
	// kernel over every step-th order statistic (the "skeleton"): each of
	// its entries stands for a step×step block of the full matrix, and
	// only the blocks along one staircase straddle a threshold, so its
	// ranks give the full matrix's to within a share 8/len(skeleton).
	var hint *imHint
	if n >= mcSkeletonMinN {
		step := n / mcSkeleton
		sk := make([]float64, 0, n/step+1)
		for i := step / 2; i < n; i += step {
			sk = append(sk, sorted[i])
		}
		if sm := mcMatrix(sk, m); sm != nil {
			ns := sm.total()
			f := float64(kk) / float64(N)
			d := 10 / float64(len(sk))
			r1 := int64(max(0, (f-d)*float64(ns)))
			r2 := int64(min(float64(ns-1), (f+d)*float64(ns)))
			a, _ := imSelect(sm, r1, false)
			b, _ := imSelect(sm, r2, false)
			hint = &imHint{lo: a, hi: b, share: 2 * d}
		}
	}
	if N%2 == 1 {
		v, _ := imSelectHint(mx, kk, false, hint)
		return v, v, normalFinite(v)
	}
	a, b := imSelectHint(mx, kk, true, hint)
	return a, b, normalFinite(a) && normalFinite(b)
}

// Skeleton of the medcouple for large samples (see medcoupleMiddle);
// variables so that the tests can use it on small samples.
var (
	mcSkeletonMinN = 2_000_000
	mcSkeleton     = 100_000
)

// mcMatrix is the medcouple's kernel matrix of the sorted values x about
// m (nil when one side is empty).
func mcMatrix(sorted []float64, m float64) *imMatrix {
	n := len(sorted)
	// rows: indices 0..p-1 (x <= m); columns: indices q..n-1 (x >= m).
	q, _ := slices.BinarySearch(sorted, m) // first x >= m
	p := q
	for p < n && sorted[p] == m {
		p++
	}
	k := p - q // values equal to m
	if k == 0 {
		p = q // x <= m are exactly 0..q-1
	}
	rows, cols := p, n-q
	if rows == 0 || cols == 0 {
		return nil
	}
	x := sorted
	mx := &imMatrix{rows: rows, cols: cols}
	mx.val = func(r, c int) float64 {
		w := x[r] - m
		u := x[q+c] - m
		if w == 0 && u == 0 {
			d := (r - q) + c - (k - 1)
			switch {
			case d < 0:
				return -1
			case d > 0:
				return 1
			}
			return 0
		}
		return (u + w) / (u - w)
	}
	// tieCount is the number of entries <= t (< t when strict) in the row
	// of the ar-th value tied with the median: -1, 0, +1 by position, then +1.
	tieCount := func(ar int, t float64, strict bool) int {
		if strict {
			switch {
			case t > 1:
				return cols
			case t > 0:
				return k - ar
			case t > -1:
				return k - 1 - ar
			}
			return 0
		}
		switch {
		case t >= 1:
			return cols
		case t >= 0:
			return k - ar
		case t >= -1:
			return k - 1 - ar
		}
		return 0
	}
	mx.walk2 = func(t1 float64, s1 bool, t2 float64, s2 bool, visit func(r0 int, b1, b2 []int32)) (n1, n2 int64) {
		ch1, ch2 := make([]int32, imChunk), make([]int32, imChunk)
		c1, c2 := cols, cols
		for r0 := 0; r0 < p; r0 += imChunk {
			r1 := min(r0+imChunk, p)
			// rows with x < m
			e := min(r1, q)
			if r0 < e {
				var a, b int64
				c1, a = mcStair(x, m, q, r0, e, c1, t1, s1, ch1)
				c2, b = mcStair(x, m, q, r0, e, c2, t2, s2, ch2)
				n1 += a
				n2 += b
			}
			// rows tied with the median
			for r := max(r0, q); r < r1; r++ {
				b1, b2 := tieCount(r-q, t1, s1), tieCount(r-q, t2, s2)
				ch1[r-r0], ch2[r-r0] = int32(b1), int32(b2)
				n1 += int64(b1)
				n2 += int64(b2)
			}
			if visit != nil {
				visit(r0, ch1[:r1-r0], ch2[:r1-r0])
			}
		}
		return n1, n2
	}
	return mx
}

// MedcoupleTiesSpread is the medcouple (Medcouple) of the data with every
// run of k equal values spread evenly over its rounding interval: the j-th
// of them (j = 0..k-1) becomes v + step·((j+½)/k - ½), the midpoints of k
// equal parts of [v - step/2, v + step/2]. Readings recorded to a step
// carry that much rounding; on tied, rounded data the medcouple's kernel
// takes only a few values and the medcouple can jump between them (for
// example -0.2 on rounded readings of a symmetric distribution), while the
// spread readings show what the unrounded data could have given. The
// spreading is our own stability check (not part of Brys, Hubert and Struyf
// 2004). sorted is ascending on a grid of step (every gap a multiple of
// step), so the spread values stay in order; ok is false for fewer than 3
// values or a step that is not positive.
func MedcoupleTiesSpread(sorted []float64, step float64) (mc float64, ok bool) {
	n := len(sorted)
	if n < 3 || !(step > 0) || !normalFinite(step) {
		return 0, false
	}
	x := make([]float64, n)
	for i := 0; i < n; {
		j := i + 1
		for j < n && sorted[j] == sorted[i] {
			j++
		}
		k := float64(j - i)
		for t := i; t < j; t++ {
			if j-i == 1 {
				x[t] = sorted[t]
			} else {
				x[t] = sorted[t] + step*((float64(t-i)+0.5)/k-0.5)
			}
		}
		i = j
	}
	return Medcouple(x)
}
