package method

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// The exact positions of QuantileAt give the same quantiles as R's binary
// arithmetic (Quantile, which follows R 4.2.2's quantile() and fivenum()
// step by step) on random data, for every definition and probability
// tested, to within binary rounding.
func TestQuantileAtMatchesR(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	probs := []Prob{{1, 4}, {1, 2}, {3, 4}, {135, 100000}, {1, 100}, {5, 100}, {95, 100}, {99, 100}, {99865, 100000}, {0, 1}, {1, 1}}
	for trial := 0; trial < 300; trial++ {
		n := 1 + rng.IntN(40)
		if trial%10 == 0 {
			n = 1000 + rng.IntN(3000)
		}
		x := make([]float64, n)
		for i := range x {
			x[i] = math.Round(rng.NormFloat64()*1000) / 100
		}
		slices.Sort(x)
		for def := HF1; def <= TukeyHinges; def++ {
			for _, p := range probs {
				got := QuantileAt(n, p, def).Float(x)
				want := Quantile(x, p.Float(), def)
				if math.Abs(got-want) > 1e-12*(1+math.Abs(want)) {
					t.Fatalf("n %d def %d p %d/%d: %v, R's arithmetic %v", n, def, p.Num, p.Den, got, want)
				}
			}
		}
	}
}

// The median position is the usual one (definition).
func TestMedianPos(t *testing.T) {
	x := []float64{1, 2, 3, 4, 5, 6, 7, 8}
	if m := MedianPos(8).Float(x); m != 4.5 {
		t.Errorf("median of 1..8 = %v", m)
	}
	if m := MedianPos(7).Float(x[:7]); m != 4 {
		t.Errorf("median of 1..7 = %v", m)
	}
}
