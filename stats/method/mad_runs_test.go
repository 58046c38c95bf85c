package method

import (
	"math/big"
	"math/rand/v2"
	"slices"
	"sort"
	"testing"

	"lotlens/stats/decimal"
)

// madExactMerge is MedianAbsDevExact as first written (the two sides
// merged a deviation at a time), the reference for the merge by runs.
func madExactMerge(sorted []float64, g decimal.Grid, med2 int64) *big.Rat {
	n := len(sorted)
	lo := sort.Search(n, func(h int) bool { return 2*g.M(sorted[h]) >= med2 })
	i, j := lo-1, lo
	di, dj := int64(-1), int64(-1)
	if i >= 0 {
		di = med2 - 2*g.M(sorted[i])
	}
	if j < n {
		dj = 2*g.M(sorted[j]) - med2
	}
	next := func() int64 {
		if dj < 0 || (di >= 0 && di <= dj) {
			d := di
			i--
			if i >= 0 {
				di = med2 - 2*g.M(sorted[i])
			} else {
				di = -1
			}
			return d
		}
		d := dj
		j++
		if j < n {
			dj = 2*g.M(sorted[j]) - med2
		} else {
			dj = -1
		}
		return d
	}
	var a int64
	for k := 0; k <= (n-1)/2; k++ {
		a = next()
	}
	den := new(big.Int).Mul(big.NewInt(2), g.Denom())
	num := big.NewInt(a)
	if n%2 == 0 {
		num.Add(num, big.NewInt(next()))
		den.Mul(den, big.NewInt(2))
	}
	return new(big.Rat).SetFrac(num, den)
}

// MedianAbsDevExact equals the merge a deviation at a time on random data
// to 0.1 with runs of every length, odd and even n, the centre anywhere
// (the median, or off it).
func TestMedianAbsDevExactRuns(t *testing.T) {
	g, _ := decimal.NewGrid(1)
	r := rand.New(rand.NewPCG(4, 8))
	for trial := range 3000 {
		var x []float64
		for range 1 + r.IntN(10) {
			v := float64(r.IntN(40)-20) / 10
			for range 1 + r.IntN(1+r.IntN(200)) {
				x = append(x, v)
			}
		}
		slices.Sort(x)
		n := len(x)
		med2 := g.M(x[(n-1)/2]) + g.M(x[n/2])
		if trial%4 == 0 {
			med2 = int64(r.IntN(90) - 45)
		}
		if got, want := MedianAbsDevExact(x, g, med2), madExactMerge(x, g, med2); got.Cmp(want) != 0 {
			t.Fatalf("trial %d: n %d med2 %d: %v, want %v", trial, n, med2, got, want)
		}
	}
}
