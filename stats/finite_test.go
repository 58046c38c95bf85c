package stats

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"lotlens/stats/decimal"
)

// finiteRef is analyzeColumn's first pass without exclusions as first
// written (a value at a time), the reference for finiteReadings.
func finiteRef(vals []float64, dec []int8) (xs []float64, infs []int, maxD int8, allFixed, onGrid bool) {
	allFixed, onGrid = true, true
	for i, x := range vals {
		if x != x {
			continue
		}
		if math.IsInf(x, 0) {
			infs = append(infs, i)
			continue
		}
		xs = append(xs, x)
		d := dec[i]
		if d < 0 {
			allFixed = false
		} else if d > maxD {
			maxD = d
		}
		if onGrid {
			_, onGrid = decimal.Mantissa(x, int(d))
		}
	}
	return
}

// finiteReadings, called as analyzeColumn calls it (a slice of cells at a
// time, again after each infinite reading), gives the reference's readings and flags on random
// cells: missing, infinite, decimals from none (-1) to 8, values on and
// off their decimals.
func TestFiniteReadingsRef(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 11))
	for trial := range 400 {
		n := r.IntN(60)
		vals, dec := make([]float64, n), make([]int8, n)
		for i := range vals {
			d := int8(r.IntN(10) - 1)
			dec[i] = d
			switch r.IntN(12) {
			case 0:
				vals[i] = math.NaN()
			case 1:
				vals[i] = math.Inf(1 - 2*r.IntN(2))
			case 2:
				vals[i] = r.Float64() // rarely a plain decimal
			default:
				vals[i] = float64(r.IntN(20000)-10000) / math.Pow(10, float64(max(d, 0)))
			}
		}
		if trial%7 == 0 { // every value on its decimals: onGrid stays true
			for i := range vals {
				if vals[i]-vals[i] == 0 {
					dec[i] = max(dec[i], 0)
					vals[i] = float64(r.IntN(2000)) / math.Pow(10, float64(dec[i]))
				}
			}
		}
		wantX, wantInf, wantD, wantFixed, wantGrid := finiteRef(vals, dec)
		xs := make([]float64, 0, n)
		var infs []int
		maxD, allFixed, onGrid := int8(0), true, true
		slice := 1 + r.IntN(9) // as finiteSlice, smaller
		for i := 0; i < n; i++ {
			end := min(n, i+slice)
			i, xs, maxD, allFixed, onGrid = finiteReadings(vals[:end], dec, i, xs, maxD, allFixed, onGrid)
			if i == end {
				i--
				continue
			}
			infs = append(infs, i)
		}
		if !slices.Equal(xs, wantX) || !slices.Equal(infs, wantInf) || maxD != wantD || allFixed != wantFixed || onGrid != wantGrid {
			t.Fatalf("trial %d: got %v %v %d %v %v, want %v %v %d %v %v", trial, xs, infs, maxD, allFixed, onGrid, wantX, wantInf, wantD, wantFixed, wantGrid)
		}
	}
}
