package stats

import (
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"
)

// The Walsh-average selection equals sorting all Walsh averages (the
// definition of the Hodges-Lehmann estimate and of the interval's order
// statistics), with and without ties and values equal to the target.
func TestWalshSelectionMatchesSort(t *testing.T) {
	rng := rand.New(rand.NewPCG(31, 32))
	for _, n := range []int{1, 2, 3, 10, 57, 300, 800} {
		for kind := 0; kind < 5; kind++ {
			x := randomSample(rng, kind, n)
			slices.Sort(x)
			mu := x[len(x)/2] // some values equal the target
			a := lowerBound(x, mu)
			b := a
			for b < len(x) && x[b] == mu {
				b++
			}
			z := append(slices.Clone(x[:a]), x[b:]...)
			var all []float64
			for i := range z {
				for j := i; j < len(z); j++ {
					all = append(all, (z[i]+z[j])/2)
				}
			}
			slices.Sort(all)
			if len(all) == 0 {
				continue
			}
			w := walshMatrix(x, a, b)
			if w.total() != int64(len(all)) {
				t.Fatalf("total %d, want %d", w.total(), len(all))
			}
			for _, k := range []int{0, len(all) / 3, len(all) / 2, len(all) - 1} {
				v, v1 := imSelect(w, int64(k), true)
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
	c := signRankCounts(3)
	if !slices.Equal(c, []float64{1, 1, 1, 2, 1, 1, 1}) {
		t.Errorf("counts %v", c)
	}
	c = signRankCounts(10)
	if p := signRankCDF(c, 10); math.Abs(p-0.0419921875) > 1e-15 || math.Abs(signRankCDF(c, 3)-0.0048828125) > 1e-15 {
		t.Errorf("psignrank(10, 10) = %v", p)
	}
	if q := signRankQuantile(c, 0.025); q != 9 {
		t.Errorf("qsignrank(0.025, 10) = %d", q)
	}
}

// Above 100,000 values the Hodges-Lehmann estimate and interval are left
// out and the method says so; all values equal to the target give no
// Wilcoxon test.
func TestWilcoxonLimits(t *testing.T) {
	n := hlMaxN + 1
	x := make([]float64, n)
	for i := range x {
		x[i] = float64(i%1000) / 10
	}
	slices.Sort(x)
	w := wilcoxonSignedRank(x, 33.35, 0.95)
	if w == nil || w.Estimate != nil || w.CI != nil || !strings.Contains(w.Method, "100,000") {
		t.Errorf("large n: %+v", w)
	}
	if w := wilcoxonSignedRank([]float64{2, 2, 2}, 2, 0.95); w != nil {
		t.Errorf("all zero differences: %+v", w)
	}
	tg := targetSection([]float64{4.9, 5.0, 5.1, 5.2}, 5.05, 0.12909944487358055, 5, 0.95)
	// mean 5.05 ± t(0.975, 3)·s/√4 = 5.05 ± 0.2054 (R 4.2.2 qt(0.975, 3) = 3.182446)
	if !tg.Inside || !strings.HasPrefix(tg.Statement, "The target 5.0 lies inside the 95% interval for the mean, 4.8 to 5.3.") {
		t.Errorf("statement %q", tg.Statement)
	}
}
