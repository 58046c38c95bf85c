package decimal

import (
	"math/bits"
	"slices"
	"unsafe"
)

// radixMinN is the size below which a comparison sort is used.
const radixMinN = 256

// SortFloats sorts xs ascending in place (no NaN allowed) and returns it.
// Large inputs use an in-place most-significant-digit radix sort (the
// "American flag sort" of McIlroy, Bostic and McIlroy 1993, Computing
// Systems 6) on the IEEE 754 bit patterns, mapped so that unsigned order is
// numeric order (flip all bits of negatives, the sign bit of the rest).
// Each pass takes its digit just below the highest bit in which the keys of
// that bucket differ, so data that share their leading bits (every value near
// 500.0) cost no wasted passes. No scratch memory: the engine's peak stays at
// one float64 per value.
func SortFloats(xs []float64) []float64 {
	n := len(xs)
	if n < radixMinN {
		slices.Sort(xs)
		return xs
	}
	keys := unsafe.Slice((*uint64)(unsafe.Pointer(unsafe.SliceData(xs))), n)
	for i, k := range keys {
		keys[i] = k ^ (uint64(int64(k)>>63) | 1<<63)
	}
	radixFlagSort(keys)
	for i, k := range keys {
		keys[i] = k ^ (uint64(int64(^k)>>63) | 1<<63)
	}
	return xs
}

// radixFlagSort sorts keys in place by their highest differing bits.
func radixFlagSort(keys []uint64) {
	if len(keys) < 64 {
		radixInsertionSort(keys)
		return
	}
	k0 := keys[0]
	var diff uint64
	for _, k := range keys {
		diff |= k ^ k0
	}
	if diff == 0 {
		return // all equal
	}
	top := 64 - bits.LeadingZeros64(diff) // bits 0..top-1 vary
	digit := 11
	if len(keys) < 4096 {
		digit = 8
	}
	shift := top - digit
	if shift < 0 {
		shift = 0
		digit = top
	}
	nb := 1 << digit
	mask := uint64(nb - 1)
	var countArr, nextArr [1 << 11]int
	count, next := countArr[:nb], nextArr[:nb]
	for _, k := range keys {
		count[(k>>shift)&mask]++
	}
	sum := 0
	for b := range count {
		next[b] = sum
		sum += count[b]
	}
	// ends[b] = start of b + count[b]; permute in place, cycle by cycle
	var endArr [1 << 11]int
	end := endArr[:nb]
	for b := range count {
		end[b] = next[b] + count[b]
	}
	for b := 0; b < nb; b++ {
		for next[b] < end[b] {
			k := keys[next[b]]
			d := int((k >> shift) & mask)
			for d != b {
				// put k in its bucket, take the key that was there
				j := next[d]
				next[d]++
				k, keys[j] = keys[j], k
				d = int((k >> shift) & mask)
			}
			keys[next[b]] = k
			next[b]++
		}
	}
	if shift == 0 {
		return
	}
	start := 0
	for b := 0; b < nb; b++ {
		c := count[b]
		if c > 1 {
			radixFlagSort(keys[start : start+c])
		}
		start += c
	}
}

func radixInsertionSort(a []uint64) {
	for i := 1; i < len(a); i++ {
		k := a[i]
		j := i
		for j > 0 && a[j-1] > k {
			a[j] = a[j-1]
			j--
		}
		a[j] = k
	}
}
