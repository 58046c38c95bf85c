package stats

import (
	"math"
	"math/bits"
)

// f64index maps a small set of float64 values (by bit pattern) to small
// integers. It replaces a Go map on the hot scans over every reading
// (mapping a few flagged or plotted values back to their rows), where a
// lookup must cost a couple of nanoseconds: open addressing, linear probing,
// a Fibonacci hash of the bits (Knuth, TAOCP vol. 3, 6.4).
type f64index struct {
	keys  []uint64
	vals  []int32 // -1 = empty slot
	shift uint
}

func newF64index(n int) *f64index {
	size := 16
	for size < 2*n {
		size <<= 1
	}
	ix := &f64index{keys: make([]uint64, size), vals: make([]int32, size), shift: uint(64 - bits.TrailingZeros(uint(size)))}
	for i := range ix.vals {
		ix.vals[i] = -1
	}
	return ix
}

func (ix *f64index) slot(k uint64) int {
	return int((k * 0x9E3779B97F4A7C15) >> ix.shift)
}

// put stores v for x (the first value stored for x wins).
func (ix *f64index) put(x float64, v int32) {
	k := math.Float64bits(x + 0) // +0 folds -0 into 0
	mask := len(ix.keys) - 1
	for i := ix.slot(k); ; i = (i + 1) & mask {
		if ix.vals[i] < 0 {
			ix.keys[i], ix.vals[i] = k, v
			return
		}
		if ix.keys[i] == k {
			return
		}
	}
}

// get returns the value stored for x, or -1.
func (ix *f64index) get(x float64) int32 {
	k := math.Float64bits(x + 0)
	mask := len(ix.keys) - 1
	for i := ix.slot(k); ; i = (i + 1) & mask {
		v := ix.vals[i]
		if v < 0 || ix.keys[i] == k {
			if v >= 0 {
				return v
			}
			return -1
		}
	}
}
