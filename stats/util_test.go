package stats

import (
	"os"
	"reflect"
	"sort"

	"lotlens/stats/decimal"
	"lotlens/stats/method"
)

var osReadFile = os.ReadFile

func reflectValue(v any) reflect.Value { return reflect.ValueOf(v) }

func sortStd(x []float64) { sort.Float64s(x) }

// binarySample is the sample of ascending data on the binary path
// (quartiles by type 7), as the builders see data that are not decimals.
func binarySample(sorted []float64) *sample {
	mo := compensatedMoments(sorted, sorted[0], sorted[len(sorted)-1])
	return newSample(sorted, decimal.Grid{}, mo, method.HF7, "hf7")
}

// decimalSample is the sample of ascending data typed with d decimals.
func decimalSample(sorted []float64, d int) *sample {
	g, _ := decimal.NewGrid(d)
	mo := compensatedMoments(sorted, sorted[0], sorted[len(sorted)-1])
	return newSample(sorted, g, mo, method.HF7, "hf7")
}

// gridFor is the finest decimal grid (up to 9 decimals) holding every value
// of x, or the invalid grid.
func gridFor(x []float64) decimal.Grid {
	for d := 0; d <= 9; d++ {
		g, _ := decimal.NewGrid(d)
		ok := true
		for _, v := range x {
			if _, in := g.Mantissa(v); !in {
				ok = false
				break
			}
		}
		if ok {
			return g
		}
	}
	return decimal.Grid{}
}

// powerSumsFor is the exact sums of powers of ascending x on its grid
// (gridFor), nil when x has none.
func powerSumsFor(x []float64) *decimal.PowerSums {
	g := gridFor(x)
	if !g.Valid() || !g.Holds(x) {
		return nil
	}
	ps := g.PowerSums(x)
	return &ps
}
