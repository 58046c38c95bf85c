package decimal

import (
	"math/rand/v2"
	"slices"
	"testing"
)

// CountSort gives what slices.Sort gives (bit for bit) on readings to
// 0.01 with many ties, negatives among them, whenever it takes the data.
func TestCountSortLikeSort(t *testing.T) {
	g, _ := NewGrid(2)
	r := rand.New(rand.NewPCG(1, 2))
	took := 0
	for trial := range 40 {
		n := countSortMin + r.IntN(3000)
		xs := make([]float64, n)
		for i := range xs {
			xs[i] = g.Float(int64(r.IntN(1+trial*8)) - int64(trial*2))
		}
		want := slices.Clone(xs)
		slices.Sort(want)
		if g.CountSort(xs) {
			took++
			if !slices.Equal(xs, want) {
				t.Fatalf("trial %d: n %d: not the sorted values", trial, n)
			}
		}
	}
	if took < 20 {
		t.Errorf("CountSort took %d of 40 data sets", took)
	}
}
