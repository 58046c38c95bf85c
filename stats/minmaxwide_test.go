package stats

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// minMaxWide gives what the two passes it replaced give: blockMinMax on
// the block, and the points j >= max(a, 1) of the block whose moving
// range is above cut, on random readings with ties, blocks at the start
// and anywhere, one-point blocks, and a cut of +Inf (the check off).
func TestMinMaxWideRef(t *testing.T) {
	r := rand.New(rand.NewPCG(2, 6))
	for trial := range 3000 {
		n := 1 + r.IntN(50)
		x := make([]float64, n)
		for i := range x {
			x[i] = float64(r.IntN(12))
		}
		a := r.IntN(n)
		e := a + 1 + r.IntN(n-a)
		cut := float64(r.IntN(10))
		if trial%5 == 0 {
			cut = math.Inf(1)
		}
		wlo, whi := blockMinMax(x[a:e])
		var want []int32
		for j := max(a, 1); j < e; j++ {
			if math.Abs(x[j]-x[j-1]) > cut {
				want = append(want, int32(j))
			}
		}
		lo, hi, wide := minMaxWide(x, a, e, cut, nil)
		if lo != wlo+a || hi != whi+a || !slices.Equal(wide, want) {
			t.Fatalf("trial %d: %v [%d, %d) cut %v: %d %d %v, want %d %d %v", trial, x, a, e, cut, lo, hi, wide, wlo+a, whi+a, want)
		}
	}
}
