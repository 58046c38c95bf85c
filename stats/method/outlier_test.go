package method

import (
	"math"
	"math/big"
	"slices"
	"testing"

	"lotlens/stats/decimal"
)

// MedianAbsDev from sorted data by merging equals the definition (median
// of |x - med|, both medians the middle value or the mean of the two).
func TestMedianAbsDev(t *testing.T) {
	for _, x := range [][]float64{{1}, {1, 2}, {1, 2, 3}, {1, 1, 2, 2, 4, 6, 9}, {-5, -1, 0, 0, 0, 2, 3, 10}} {
		med := Quantile(x, 0.5, HF7)
		d := make([]float64, len(x))
		for i, v := range x {
			d[i] = math.Abs(v - med)
		}
		slices.Sort(d)
		want := Quantile(d, 0.5, HF7)
		if got := MedianAbsDev(x, med); got != want {
			t.Errorf("MedianAbsDev(%v) = %v, want %v", x, got, want)
		}
	}
}

// The exact MAD is the definition on the decimals as typed: for 0.1, 0.2,
// 0.3, 0.4, 0.6 (median 0.3) the deviations are 0.2, 0.1, 0, 0.1, 0.3 and
// their median is exactly 1/10 (written out by hand), which 1.4826 turns
// into exactly 0.14826 (the binary MAD gives 0.09999999999999998).
func TestMedianAbsDevExact(t *testing.T) {
	g, _ := decimal.NewGrid(1)
	x := []float64{0.1, 0.2, 0.3, 0.4, 0.6}
	mad := MedianAbsDevExact(x, g, 6) // median 0.3: twice its mantissa is 6
	if mad.Cmp(big.NewRat(1, 10)) != 0 {
		t.Fatalf("exact MAD %v, want 1/10", mad)
	}
	scaled := new(big.Rat).Mul(mad, big.NewRat(14826, 10000))
	if f := decimal.Float64(scaled); f != 0.14826 {
		t.Errorf("1.4826·MAD = %v, want 0.14826", f)
	}
	// even n: 1.0 1.5 2.5 4.0 (median 2.0): deviations 1.0 0.5 0.5 2.0,
	// median (0.5+1.0)/2 = 3/4
	x = []float64{1.0, 1.5, 2.5, 4.0}
	if mad := MedianAbsDevExact(x, g, 40); mad.Cmp(big.NewRat(3, 4)) != 0 {
		t.Errorf("even n: %v, want 3/4", mad)
	}
}
