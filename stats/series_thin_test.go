package stats

import (
	"math"
	"math/rand/v2"
	"reflect"
	"testing"
)

// seriesThinnedRef is the min-max thinning as first written (a division and
// a point per reading), kept as the reference for series.
func seriesThinnedRef(cv *colView, excl map[int32]bool, n int) []SeriesPt {
	used := func(i int) bool {
		x := cv.vals[i]
		return x == x && !math.IsInf(x, 0) && !(excl != nil && excl[cv.rows[i]])
	}
	blocks := maxChartPoints / 2
	out := make([]SeriesPt, 0, maxChartPoints)
	k := 0
	var bmin, bmax SeriesPt
	cur := -1
	flush := func() {
		if cur < 0 {
			return
		}
		if bmin.I == bmax.I {
			out = append(out, bmin)
		} else if bmin.I < bmax.I {
			out = append(out, bmin, bmax)
		} else {
			out = append(out, bmax, bmin)
		}
	}
	for i := range cv.inOrder() {
		if !used(i) {
			continue
		}
		blk := int(int64(k) * int64(blocks) / int64(n))
		p := SeriesPt{I: k, Row: int(cv.rows[i]), Y: cv.vals[i]}
		if blk != cur {
			flush()
			cur = blk
			bmin, bmax = p, p
		} else {
			if p.Y < bmin.Y {
				bmin = p
			}
			if p.Y > bmax.Y {
				bmax = p
			}
		}
		k++
	}
	flush()
	return out
}

// The thinned series equals the reference on random data: lengths around
// the block boundaries and far above, ties (readings to a resolution),
// cells that are not numbers, readings left out, an order column, and
// every cell a number (colView.finite).
func TestSeriesThinnedSame(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	for trial := 0; trial < 300; trial++ {
		m := maxChartPoints + 1 + r.IntN(5000)
		if trial%10 == 0 {
			m = maxChartPoints + 1 + trial/10
		}
		cv := &colView{vals: make([]float64, m), rows: make([]int32, m)}
		step := []float64{0, 0.1, 0.001}[trial%3]
		for i := range cv.vals {
			x := r.NormFloat64()
			if step > 0 {
				x = math.Round(x/step) * step
			}
			if trial%6 != 3 && r.IntN(200) == 0 {
				x = math.NaN()
			}
			cv.vals[i], cv.rows[i] = x, int32(i+2)
		}
		var excl map[int32]bool
		if trial%4 == 1 {
			excl = map[int32]bool{}
			for i := 0; i < m/50; i++ {
				excl[int32(2+r.IntN(m))] = true
			}
		}
		if trial%5 == 2 {
			cv.seq = make([]int32, m)
			for i, p := range r.Perm(m) {
				cv.seq[i] = int32(p)
			}
			cv.seq = cv.seq[:m-r.IntN(m/10)] // cells without an order key
		}
		n := 0
		for i := range cv.inOrder() {
			if x := cv.vals[i]; x == x && !(excl != nil && excl[cv.rows[i]]) {
				n++
			}
		}
		if trial%6 == 3 {
			cv.finite = 1 // every cell a number, as analyzeColumn notes
		}
		got, thinned := series(cv, excl, n)
		if n <= maxChartPoints {
			continue
		}
		if want := seriesThinnedRef(cv, excl, n); !thinned || !reflect.DeepEqual(got, want) {
			t.Fatalf("trial %d (m %d, n %d): thinned %v, %d points, reference %d", trial, m, n, thinned, len(got), len(want))
		}
	}
}
