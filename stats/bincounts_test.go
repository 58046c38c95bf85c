package stats

import (
	"math/rand/v2"
	"slices"
	"testing"
)

// binCountsWalk is binCounts as first written (a step per value), the
// reference for the bisection.
func binCountsWalk(sorted []float64, edges []float64) []int {
	k := len(edges) - 1
	counts := make([]int, k)
	b := 0
	for _, x := range sorted {
		for b < k-1 && x >= edges[b+1] {
			b++
		}
		counts[b]++
	}
	return counts
}

// binCounts gives the walk's counts on random sorted values with ties,
// edges on values, empty bins, values beyond the last edge, a single
// bin, and edges out of order (as rounding can make the interpolated
// edges near ±1.8e308).
func TestBinCountsWalk(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 5))
	for trial := range 2000 {
		n := 1 + r.IntN(80)
		x := make([]float64, n)
		for i := range x {
			x[i] = float64(r.IntN(40)) / 4
		}
		slices.Sort(x)
		k := 1 + r.IntN(12)
		edges := make([]float64, k+1)
		for i := range edges {
			edges[i] = float64(r.IntN(44)-2) / 4
		}
		if trial%3 != 0 {
			slices.Sort(edges)
		}
		if got, want := binCounts(x, edges), binCountsWalk(x, edges); !slices.Equal(got, want) {
			t.Fatalf("trial %d: values %v edges %v: %v, want %v", trial, x, edges, got, want)
		}
	}
}
