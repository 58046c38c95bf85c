package stats

import (
	"math"
	"math/rand/v2"
	"slices"
	"sync"
	"testing"

	"lotlens/stats/decimal"
)

// Benchmarks of the methods on sorted measurement-like data (4 decimals,
// slightly skewed): each is compared in the same run with
// BenchmarkMethodsBaseline, one pass summing the data (the cheapest
// possible O(n) step), and with the sort in BenchmarkSortBaseline1M.

var methodsData = map[int][]float64{}
var methodsMu sync.Mutex

func methodsBenchData(n int) []float64 {
	methodsMu.Lock()
	defer methodsMu.Unlock()
	if x, ok := methodsData[n]; ok {
		return x
	}
	rng := rand.New(rand.NewPCG(11, uint64(n)))
	x := make([]float64, n)
	for i := range x {
		x[i] = math.Round((50+rng.NormFloat64()+0.3*rng.ExpFloat64())*1e4) / 1e4
	}
	slices.Sort(x)
	methodsData[n] = x
	return x
}

func meanSDOf(x []float64) (float64, float64) {
	var s float64
	for _, v := range x {
		s += v
	}
	m := s / float64(len(x))
	var ss float64
	for _, v := range x {
		ss += (v - m) * (v - m)
	}
	return m, math.Sqrt(ss / float64(len(x)-1))
}

var sinkF float64

// grid4: the bench data are typed with 4 decimals (the exact path).
var grid4, _ = decimal.NewGrid(4)

func benchBaseline(b *testing.B, n int) {
	x := methodsBenchData(n)
	b.ResetTimer()
	for b.Loop() {
		var s float64
		for _, v := range x {
			s += v
		}
		sinkF = s
	}
}

func benchShape(b *testing.B, n int) {
	x := methodsBenchData(n)
	m, sd := meanSDOf(x)
	b.ResetTimer()
	for b.Loop() {
		sums := grid4.PowerSums(x) // the exact sums are the shape's first pass
		shapeSection(words{}, x, m, sd, &sums)
	}
}

func benchOutliers(b *testing.B, n int) {
	x := methodsBenchData(n)
	smp := decimalSample(x, 4)
	b.ResetTimer()
	for b.Loop() {
		outlierRules(words{}, smp, 0.05, smp.n)
	}
}

func benchTarget(b *testing.B, n int) {
	x := methodsBenchData(n)
	m, sd := meanSDOf(x)
	b.ResetTimer()
	for b.Loop() {
		targetSection(words{}, x, m, sd, 50.2, 0.95, grid4)
	}
}

func benchProbPlot(b *testing.B, n int) {
	x := methodsBenchData(n)
	m, sd := meanSDOf(x)
	b.ResetTimer()
	for b.Loop() {
		probPlot(x, m, sd, 0.95, 2000)
	}
}

func BenchmarkMethodsBaseline1M(b *testing.B)  { benchBaseline(b, 1_000_000) }
func BenchmarkMethodsBaseline10M(b *testing.B) { benchBaseline(b, 10_000_000) }
func BenchmarkShape1M(b *testing.B)            { benchShape(b, 1_000_000) }
func BenchmarkShape10M(b *testing.B)           { benchShape(b, 10_000_000) }
func BenchmarkOutlierRules1M(b *testing.B)     { benchOutliers(b, 1_000_000) }
func BenchmarkOutlierRules10M(b *testing.B)    { benchOutliers(b, 10_000_000) }
func BenchmarkTarget1M(b *testing.B)           { benchTarget(b, 1_000_000) }
func BenchmarkTarget10M(b *testing.B)          { benchTarget(b, 10_000_000) }
func BenchmarkTarget100k(b *testing.B)         { benchTarget(b, 100_000) }
func BenchmarkProbPlot1M(b *testing.B)         { benchProbPlot(b, 1_000_000) }
func BenchmarkProbPlot10M(b *testing.B)        { benchProbPlot(b, 10_000_000) }
