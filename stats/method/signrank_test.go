package method

import (
	"math"
	"math/rand/v2"
	"slices"
	"sort"
	"testing"
)

// The Walsh-sum selection equals sorting all Walsh sums (twice the Walsh averages) (the
// definition of the Hodges-Lehmann estimate and of the interval's order
// statistics), with and without ties and values equal to the target.
func TestWalshSelectionMatchesSort(t *testing.T) {
	rng := rand.New(rand.NewPCG(31, 32))
	for _, n := range []int{1, 2, 3, 10, 57, 300, 800} {
		for kind := 0; kind < 5; kind++ {
			x := randomSample(rng, kind, n)
			slices.Sort(x)
			mu := x[len(x)/2] // some values equal the target
			a := sort.SearchFloat64s(x, mu)
			b := a
			for b < len(x) && x[b] == mu {
				b++
			}
			z := append(slices.Clone(x[:a]), x[b:]...)
			var all []float64
			for i := range z {
				for j := i; j < len(z); j++ {
					all = append(all, z[i]+z[j])
				}
			}
			slices.Sort(all)
			if len(all) == 0 {
				continue
			}
			w := NewWalshSums(x, a, b)
			if w.N != int64(len(all)) {
				t.Fatalf("total %d, want %d", w.N, len(all))
			}
			for _, k := range []int{0, len(all) / 3, len(all) / 2, len(all) - 1} {
				v, v1 := w.At(int64(k))
				if v != all[k] {
					t.Fatalf("n %d kind %d k %d: %v want %v", n, kind, k, v, all[k])
				}
				if k+1 < len(all) && v1 != all[k+1] {
					t.Fatalf("n %d kind %d k+1 %d: %v want %v", n, kind, k+1, v1, all[k+1])
				}
			}
		}
	}
}

// Exact null distribution of the signed-rank statistic: for n = 3 the sums
// of subsets of {1,2,3} are 0,1,2,3,3,4,5,6 (definition); and R 4.2.2
// psignrank(10, 10) = 0.0419921875, psignrank(3, 10) = 0.0048828125,
// qsignrank(0.025, 10) = 9.
func TestSignRankDistribution(t *testing.T) {
	c := SignRankCounts(3)
	if !slices.Equal(c, []float64{1, 1, 1, 2, 1, 1, 1}) {
		t.Errorf("counts %v", c)
	}
	c = SignRankCounts(10)
	if p := SignRankCDF(c, 10); math.Abs(p-0.0419921875) > 1e-15 || math.Abs(SignRankCDF(c, 3)-0.0048828125) > 1e-15 {
		t.Errorf("psignrank(10, 10) = %v", p)
	}
	if q := SignRankQuantile(c, 0.025); q != 9 {
		t.Errorf("qsignrank(0.025, 10) = %d", q)
	}
}
