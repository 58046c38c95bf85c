package stats

import (
	"slices"
	"unsafe"
)

// radixMin is the size below which a comparison sort is faster.
const radixMin = 2048

// sortFloats sorts xs ascending (no NaN allowed). For large inputs it uses
// an LSD radix sort on the IEEE 754 bit patterns, mapped so that unsigned
// order equals numeric order (the usual sign-flip mapping; Knuth, TAOCP
// vol. 3, 5.2.5), 11 bits a pass, skipping passes in which all keys share
// the digit. It needs one scratch slice of len(xs) and returns the sorted
// slice, which is xs or the scratch.
func sortFloats(xs []float64) []float64 {
	n := len(xs)
	if n < radixMin {
		slices.Sort(xs)
		return xs
	}
	keys := unsafe.Slice((*uint64)(unsafe.Pointer(unsafe.SliceData(xs))), n)
	const bitsPer = 11
	const buckets = 1 << bitsPer
	const passes = (64 + bitsPer - 1) / bitsPer
	var hist [passes][buckets]uint32
	for i, k := range keys {
		// flip: negative numbers invert all bits, positive set the sign bit
		k ^= uint64(int64(k)>>63) | 1<<63
		keys[i] = k
		for p := 0; p < passes; p++ {
			hist[p][(k>>(p*bitsPer))&(buckets-1)]++
		}
	}
	tmp := make([]uint64, n)
	src, dst := keys, tmp
	for p := 0; p < passes; p++ {
		h := &hist[p]
		shift := uint(p * bitsPer)
		if h[(src[0]>>shift)&(buckets-1)] == uint32(n) {
			continue // every key has the same digit here
		}
		var sum uint32
		for i := range h {
			c := h[i]
			h[i] = sum
			sum += c
		}
		for _, k := range src {
			d := (k >> shift) & (buckets - 1)
			dst[h[d]] = k
			h[d]++
		}
		src, dst = dst, src
	}
	for i, k := range src {
		// unflip: keys with the top bit set were positive
		src[i] = k ^ (uint64(int64(^k)>>63) | 1<<63)
	}
	return unsafe.Slice((*float64)(unsafe.Pointer(unsafe.SliceData(src))), n)
}
