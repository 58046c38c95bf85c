package stats

import (
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
	// walk sets out[r] to the first column of row r whose entry is > t
	// (>= t when strict), for every row, and returns the number of entries
	// <= t (< t when strict). out[r] never decreases when t grows.
	walk func(t float64, strict bool, out []int32) int64
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

// imSelect returns the entries of rank k and k+1 (0-based, in ascending
// order of all entries; the second only when next is set and k+1 exists).
func imSelect(m *imMatrix, k int64, next bool) (vk, vk1 float64) {
	rows := m.rows
	L := make([]int32, rows)
	U := make([]int32, rows)
	T := make([]int32, rows)
	for r := range rows {
		L[r] = int32(m.first(r))
		U[r] = int32(m.cols)
	}
	rng := rand.New(rand.NewPCG(0x4c6f746c656e73, uint64(k)))
	below := int64(0) // entries left of L: all smaller than the active ones
	W := m.total()
	collectLimit := int64(max(1<<12, rows/4))
	single := false // use one pivot (guarantees progress through ties)

	// entryAbove is the smallest entry right of U (all larger than any active entry).
	entryAbove := func() float64 {
		v := math.Inf(1)
		for r := range rows {
			if int(U[r]) < m.cols {
				v = min(v, m.val(r, int(U[r])))
			}
		}
		return v
	}
	var samp []float64
	var pos []int64
	for {
		if W <= collectLimit || W < 64 {
			buf := make([]float64, 0, W)
			for r := range rows {
				for c := L[r]; c < U[r]; c++ {
					buf = append(buf, m.val(r, int(c)))
				}
			}
			if len(buf) == 0 { // only after rounding inconsistencies
				return entryAbove(), entryAbove()
			}
			kk := int(min(max(k-below, 0), int64(len(buf)-1)))
			vk = floatSelect(buf, kk)
			if next {
				if kk+1 < len(buf) {
					vk1 = slices.Min(buf[kk+1:])
				} else {
					vk1 = entryAbove()
				}
			}
			return vk, vk1
		}
		// Sample s active entries uniformly (with replacement).
		s := 1 << 14
		if W > 1<<30 {
			s = 1 << 16
		}
		pos = pos[:0]
		for range s {
			pos = append(pos, rng.Int64N(W))
		}
		slices.Sort(pos)
		samp = samp[:0]
		acc := int64(0)
		pi := 0
		for r := 0; r < rows && pi < len(pos); r++ {
			w := int64(U[r] - L[r])
			for pi < len(pos) && pos[pi] < acc+w {
				samp = append(samp, m.val(r, int(L[r])+int(pos[pi]-acc)))
				pi++
			}
			acc += w
		}
		slices.Sort(samp)
		s = len(samp)
		kk := k - below
		centre := int(float64(kk) / float64(W) * float64(s))
		var lo, hi float64
		if single {
			c := min(max(centre, 0), s-1)
			lo, hi = samp[c], samp[c]
		} else {
			d := int(1.5*math.Sqrt(float64(s))) + 2
			lo = samp[max(centre-d, 0)]
			hi = samp[min(centre+d, s-1)]
		}
		oldW := W
		cLT := m.walk(lo, true, T)
		if k < cLT {
			// The wanted entry is below lo: keep [L, T).
			for r := range rows {
				T[r] = min(T[r], U[r])
			}
			U, T = T, U
		} else {
			cLE := m.walk(hi, false, L) // old L is no longer needed
			if k >= cLE {
				// The wanted entry is above hi: keep [boundary(<=hi), U).
				below = cLE
			} else {
				// lo <= wanted <= hi: keep [T, L).
				U, L, T = L, T, U
				below = cLT
				if lo == hi {
					vk = lo
					if next {
						if k+1 < cLE {
							vk1 = lo
						} else {
							vk1 = entryAbove()
						}
					}
					return vk, vk1
				}
			}
		}
		// Active width; the clamp only matters after rounding ties.
		W = 0
		for r := range rows {
			if L[r] > U[r] {
				L[r] = U[r]
			}
			W += int64(U[r] - L[r])
		}
		single = W > oldW/2
		if W <= 0 {
			return lo, hi
		}
	}
}

// floatSelect returns the k-th smallest (0-based) of a, reordering a so
// that a[:k] <= a[k] <= a[k+1:] (quickselect, Hoare 1961, with
// median-of-three pivots and a sort as the worst-case fallback).
func floatSelect(a []float64, k int) float64 {
	lo, hi := 0, len(a)-1
	budget := 2 * (64 - countLeadingZeros(uint64(len(a))))
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

func countLeadingZeros(x uint64) int {
	n := 0
	for x != 0 {
		x >>= 1
		n++
	}
	return 64 - n
}

// medcouple is the medcouple of Brys, Hubert and Struyf (2004), "A robust
// measure of skewness", J. Comput. Graph. Stat. 13, 996-1017: the median of
// the kernel h(xi, xj) = ((xj-m) - (m-xi)) / (xj - xi) over all pairs
// xi <= m <= xj, m the median, with the kernel's special case for pairs
// of values both equal to m (-1, 0 or +1 by their position, so that the
// kernel matrix stays sorted). The median of the kernel is found in
// O(n log n) expected time by imSelect, without forming the n²/4 pairs;
// for an even number of pairs it is the mean of the two middle ones.
// sorted is ascending; ok is false for fewer than 3 values.
func medcouple(sorted []float64) (mc float64, ok bool) {
	a, b, ok := medcoupleMiddle(sorted)
	if !ok {
		return 0, false
	}
	mc = a/2 + b/2
	return mc, finite(mc)
}

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
		return 0, 0, false
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
	mx.walk = func(t float64, strict bool, out []int32) int64 {
		var cnt int64
		c := cols
		// Rows with x < m. The kernel is computed exactly as in val, so
		// that walks and sampled pivots agree to the last bit.
		for r := 0; r < q; r++ {
			w := x[r] - m
			if strict {
				for c > 0 {
					u := x[q+c-1] - m
					if (u+w)/(u-w) < t {
						break
					}
					c--
				}
			} else {
				for c > 0 {
					u := x[q+c-1] - m
					if (u+w)/(u-w) <= t {
						break
					}
					c--
				}
			}
			out[r] = int32(c)
			cnt += int64(c)
		}
		// Rows tied with the median: -1, 0, +1 by position, then +1.
		for r := q; r < p; r++ {
			ar := r - q
			var cc int
			if strict {
				switch {
				case t > 1:
					cc = cols
				case t > 0:
					cc = k - ar
				case t > -1:
					cc = k - 1 - ar
				}
			} else {
				switch {
				case t >= 1:
					cc = cols
				case t >= 0:
					cc = k - ar
				case t >= -1:
					cc = k - 1 - ar
				}
			}
			out[r] = int32(cc)
			cnt += int64(cc)
		}
		return cnt
	}
	N := mx.total()
	if N%2 == 1 {
		v, _ := imSelect(mx, N/2, false)
		return v, v, finite(v)
	}
	a, b := imSelect(mx, N/2-1, true)
	return a, b, finite(a) && finite(b)
}
