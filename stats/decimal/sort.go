package decimal

import "math"

// countSortMin is the size below which CountSort leaves the work to a
// comparison sort.
const countSortMin = 256

// CountSort sorts xs ascending by counting (a counting sort, Seward 1954)
// when every value is a plain decimal on g whose mantissas span a range of
// at most len(xs)/8 steps: the usual case of measurements typed to a fixed
// resolution (1,000,000 fill weights to 0.01 g span a few thousand steps).
// It writes each value back as m/10^Scale, which is exactly the value read
// (checked for every value, as in Mantissa), so the result equals any other
// sort's. It reports false, with xs unchanged, when the data do not qualify
// (-0, a value off the grid, a wide range, fewer than 256 values). Memory:
// one uint32 per step of the range.
func (g Grid) CountSort(xs []float64) bool {
	n := len(xs)
	if n < countSortMin || !g.Valid() {
		return false
	}
	p := g.pow
	lo, hi := int64(math.MaxInt64), int64(math.MinInt64)
	for _, x := range xs {
		f := x * p
		if !(math.Abs(f) < MaxMantissa) {
			return false
		}
		m := int64(math.RoundToEven(f))
		if float64(m)/p != x || (x == 0 && math.Signbit(x)) {
			return false
		}
		lo, hi = min(lo, m), max(hi, m)
	}
	span := hi - lo + 1
	if span > int64(n/8) {
		return false
	}
	count := make([]uint32, span)
	for _, x := range xs {
		count[int64(math.RoundToEven(x*p))-lo]++
	}
	i := 0
	for j, c := range count {
		if c == 0 {
			continue
		}
		v := float64(lo+int64(j)) / p
		run := xs[i : i+int(c)]
		for k := range run {
			run[k] = v
		}
		i += int(c)
	}
	return true
}
