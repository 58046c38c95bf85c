package method

import (
	"lotlens/stats/internal/rref"
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// naiveMedcouple is the O(n²) definition of Brys, Hubert and Struyf (2004),
// test-only: all kernel values, the k×k block of pairs tied with the median
// contributing k(k-1)/2 values -1, k values 0 and k(k-1)/2 values +1.
func naiveMedcouple(x []float64) float64 {
	s := slices.Clone(x)
	slices.Sort(s)
	n := len(s)
	m := s[n/2]
	if n%2 == 0 {
		m = (s[n/2-1] + s[n/2]) / 2
	}
	var h []float64
	k := 0
	for _, xi := range s {
		if xi == m {
			k++
		}
	}
	for _, xi := range s {
		if xi > m {
			continue
		}
		for _, xj := range s {
			if xj < m || (xi == m && xj == m) {
				continue
			}
			h = append(h, ((xj-m)-(m-xi))/(xj-xi))
		}
	}
	for i := 0; i < k*(k-1)/2; i++ {
		h = append(h, -1, 1)
	}
	for i := 0; i < k; i++ {
		h = append(h, 0)
	}
	slices.Sort(h)
	N := len(h)
	if N%2 == 1 {
		return h[N/2]
	}
	return (h[N/2-1] + h[N/2]) / 2
}

func randomSample(rng *rand.Rand, kind, n int) []float64 {
	x := make([]float64, n)
	for i := range x {
		switch kind % 5 {
		case 0:
			x[i] = rng.NormFloat64()
		case 1:
			x[i] = math.Exp(rng.NormFloat64()) // right-skewed
		case 2:
			x[i] = -rng.ExpFloat64() // left-skewed
		case 3:
			x[i] = math.Round(rng.NormFloat64() * 3) // heavy ties, ties at the median
		case 4:
			x[i] = math.Round(rng.ExpFloat64()*20) / 10 // skewed with ties
		}
	}
	return x
}

// The fast medcouple equals the naive O(n²) definition (test-only code
// above, Brys, Hubert and Struyf 2004) on random data of many shapes,
// including heavy ties at the median and both parities of n.
func TestMedcoupleMatchesNaive(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	sizes := []int{3, 4, 5, 6, 7, 10, 11, 25, 50, 101, 200, 401, 1000}
	for kind := 0; kind < 5; kind++ {
		for _, n := range sizes {
			for rep := 0; rep < 3; rep++ {
				x := randomSample(rng, kind, n)
				want := naiveMedcouple(x)
				s := slices.Clone(x)
				slices.Sort(s)
				got, ok := Medcouple(s)
				if !ok || math.Abs(got-want) > 1e-13 {
					t.Fatalf("kind %d n %d: medcouple = %v (ok %v), naive %v", kind, n, got, ok, want)
				}
			}
		}
	}
}

// Large samples drive several selection rounds (the naive version is
// still quick at n = 1500: 560,000 pairs).
func TestMedcoupleSelectionRounds(t *testing.T) {
	if testing.Short() {
		t.Skip("slow naive reference")
	}
	rng := rand.New(rand.NewPCG(3, 4))
	for kind := 0; kind < 5; kind++ {
		x := randomSample(rng, kind, 1500+kind)
		want := naiveMedcouple(x)
		s := slices.Clone(x)
		slices.Sort(s)
		got, _ := Medcouple(s)
		if math.Abs(got-want) > 1e-13 {
			t.Fatalf("kind %d: medcouple = %v, naive %v", kind, got, want)
		}
	}
}

func TestMedcoupleEdge(t *testing.T) {
	// All equal: every pair is tied with the median; the block is
	// antisymmetric so the median kernel is 0 (definition).
	if mc, ok := Medcouple([]float64{2, 2, 2, 2, 2}); !ok || mc != 0 {
		t.Errorf("constant data: %v %v", mc, ok)
	}
	if _, ok := Medcouple([]float64{1, 2}); ok {
		t.Error("n = 2 should not give a medcouple")
	}
	// Symmetric data: the medcouple is 0 (definition).
	if mc, _ := Medcouple([]float64{-3, -2, -1, 0, 1, 2, 3}); math.Abs(mc) > 1e-15 {
		t.Errorf("symmetric data: %v", mc)
	}
}

func TestFloatSelect(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	for _, n := range []int{1, 2, 3, 10, 100, 1001} {
		for rep := 0; rep < 20; rep++ {
			a := make([]float64, n)
			for i := range a {
				a[i] = math.Round(rng.NormFloat64() * 5)
			}
			s := slices.Clone(a)
			slices.Sort(s)
			k := rng.IntN(n)
			if got := floatSelect(a, k); got != s[k] {
				t.Fatalf("floatSelect k=%d: %v want %v", k, got, s[k])
			}
		}
	}
}

func benchMedcouple(b *testing.B, n int) {
	rng := rand.New(rand.NewPCG(7, 8))
	x := make([]float64, n)
	for i := range x {
		x[i] = math.Round((50+rng.NormFloat64()+0.3*rng.ExpFloat64())*1e4) / 1e4
	}
	slices.Sort(x)
	b.ResetTimer()
	for b.Loop() {
		Medcouple(x)
	}
}

func BenchmarkMedcouple1M(b *testing.B)  { benchMedcouple(b, 1_000_000) }
func BenchmarkMedcouple10M(b *testing.B) { benchMedcouple(b, 10_000_000) }

// BenchmarkSortBaseline1M sorts 1M values: the baseline the medcouple is
// compared with in the same run.
func BenchmarkSortBaseline1M(b *testing.B) {
	rng := rand.New(rand.NewPCG(7, 8))
	x := make([]float64, 1_000_000)
	for i := range x {
		x[i] = rng.NormFloat64()
	}
	y := make([]float64, len(x))
	for b.Loop() {
		copy(y, x)
		slices.Sort(y)
	}
}

// The medcouple of the 24 invented sets against R 4.2.2: the definition
// written out in R (mcNaive, the mean of the two middle kernel values when
// their number is even) and robustbase 0.95-0's mc(x, doReflect = FALSE),
// which returns the lower middle value (mcLow); testdata/rref/methods.tsv,
// written by testdata/rref/methods.R.
func TestMedcoupleR(t *testing.T) {
	ref := rref.Load(t, "methods.tsv", 24)
	for set, r := range ref {
		x, _, _ := rref.Set(t, set)
		mc, ok := Medcouple(x)
		lo, _, _ := medcoupleMiddle(x)
		if !ok {
			t.Errorf("%s: no medcouple", set)
			continue
		}
		if !rref.Close(mc, r["mcNaive"], 1e-12, 1e-13) {
			t.Errorf("%s: medcouple %.17g, R 4.2.2 definition %.17g", set, mc, r["mcNaive"])
		}
		if !rref.Close(lo, r["mcLow"], 1e-12, 1e-13) {
			t.Errorf("%s: lower middle kernel %.17g, R 4.2.2 robustbase::mc %.17g", set, lo, r["mcLow"])
		}
	}
}

// The first-round pivots from the skeleton change the work, not the
// result: with the skeleton switched on for small samples, the medcouple
// still equals the naive definition.
func TestMedcoupleSkeleton(t *testing.T) {
	defer func(a, b int) { mcSkeletonMinN, mcSkeleton = a, b }(mcSkeletonMinN, mcSkeleton)
	mcSkeletonMinN, mcSkeleton = 500, 100
	rng := rand.New(rand.NewPCG(9, 10))
	for kind := 0; kind < 5; kind++ {
		for _, n := range []int{600, 1201} {
			x := randomSample(rng, kind, n)
			want := naiveMedcouple(x)
			s := slices.Clone(x)
			slices.Sort(s)
			got, _ := Medcouple(s)
			if math.Abs(got-want) > 1e-13 {
				t.Fatalf("kind %d n %d: medcouple = %v, naive %v", kind, n, got, want)
			}
		}
	}
}

// Far from zero and near the bottom of the floating-point range the
// staircase's rounding margin must still agree with the division.
func TestMedcoupleScales(t *testing.T) {
	rng := rand.New(rand.NewPCG(13, 14))
	for _, sc := range []struct{ off, scale float64 }{{1e6, 0.01}, {-3e9, 1}, {0, 1e-300}, {0, 1e300}, {1, 1e-9}} {
		for kind := 0; kind < 5; kind++ {
			for _, n := range []int{31, 400} {
				x := randomSample(rng, kind, n)
				for i := range x {
					x[i] = sc.off + x[i]*sc.scale
				}
				want := naiveMedcouple(x)
				s := slices.Clone(x)
				slices.Sort(s)
				got, ok := Medcouple(s)
				if math.Abs(want) < mcZero {
					want = 0
				}
				if !ok || math.Abs(got-want) > 1e-13 {
					t.Fatalf("offset %g scale %g kind %d n %d: %v (ok %v), naive %v", sc.off, sc.scale, kind, n, got, ok, want)
				}
			}
		}
	}
}
