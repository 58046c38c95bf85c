package method

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// tiedSample draws n readings of one of several tied shapes (invented,
// generated test data): few levels, many values on the median, all equal,
// two distinct values, heavy ties on one side, readings to a resolution.
func tiedSample(rng *rand.Rand, kind, n int) []float64 {
	x := make([]float64, n)
	levels := 2 + rng.IntN(6)
	for i := range x {
		switch kind % 9 {
		case 0: // a few levels, uniform
			x[i] = float64(rng.IntN(levels))
		case 1: // most values on one level (the median), the rest around it
			if rng.IntN(4) > 0 {
				x[i] = 3
			} else {
				x[i] = float64(rng.IntN(7))
			}
		case 2: // all equal
			x[i] = 1.25
		case 3: // two distinct values
			x[i] = float64(rng.IntN(2)) * 0.7
		case 4: // heavy ties above the median, spread below
			if rng.IntN(2) == 0 {
				x[i] = 10
			} else {
				x[i] = math.Round(rng.NormFloat64()*5*100) / 100
			}
		case 5: // heavy ties below the median, spread above
			if rng.IntN(2) == 0 {
				x[i] = -2
			} else {
				x[i] = math.Round(rng.ExpFloat64()*300) / 100
			}
		case 6: // uniform readings to 0.001 (the page's demo shape)
			x[i] = math.Round((4.8+0.4*rng.Float64())*1000) / 1000
		case 7: // normal readings to 0.01
			x[i] = math.Round((500+1.5*rng.NormFloat64())*100) / 100
		case 8: // skewed readings to 0.1
			x[i] = math.Round(math.Exp(rng.NormFloat64())*10) / 10
		}
	}
	slices.Sort(x)
	return x
}

// sameMiddle checks the tally's two middle kernel values against imSelect's
// over all the values (medcoupleImplicit), to the last bit.
func sameMiddle(t *testing.T, s []float64, what string) {
	t.Helper()
	n := len(s)
	m := s[(n-1)/2]
	if n%2 == 0 {
		m = s[n/2-1]/2 + s[n/2]/2
	}
	wa, wb, wok := medcoupleImplicit(s, m)
	tl := mcNewTally(s, m, n)
	if tl == nil {
		// Only data whose kernel denominator overflows (or infinite data)
		// are left to imSelect.
		if normalFinite((s[n-1] - m) - (s[0] - m)) {
			t.Fatalf("%s: no tally, imSelect gives %v %v (ok %v)", what, wa, wb, wok)
		}
		return
	}
	a, b, ok := tl.middle()
	if ok != wok || (ok && (math.Float64bits(a) != math.Float64bits(wa) || math.Float64bits(b) != math.Float64bits(wb))) {
		t.Fatalf("%s n %d: tally %v %v (ok %v), imSelect %v %v (ok %v); data %v", what, n, a, b, ok, wa, wb, wok, s[:min(n, 40)])
	}
}

// The tally gives the same two middle kernel values as imSelect over all
// the values, bit for bit, on tied data of many shapes and sizes (both
// parities of n, tiny to large), and the medcouple through the tally
// equals the naive O(n²) definition (naiveMedcouple, Brys, Hubert and
// Struyf 2004).
func TestMedcoupleTallyMatchesImplicit(t *testing.T) {
	defer func(f func(int) int) { mcTallyMaxDistinct = f }(mcTallyMaxDistinct)
	mcTallyMaxDistinct = func(n int) int { return n } // always the tally
	rng := rand.New(rand.NewPCG(21, 22))
	for kind := 0; kind < 9; kind++ {
		for n := 3; n <= 40; n++ {
			for rep := 0; rep < 8; rep++ {
				s := tiedSample(rng, kind, n)
				sameMiddle(t, s, "small")
				got, ok := Medcouple(s)
				want := naiveMedcouple(s)
				if math.Abs(want) < mcZero {
					want = 0
				}
				if !ok || math.Abs(got-want) > 1e-13 {
					t.Fatalf("kind %d n %d %v: medcouple %v (ok %v), naive %v", kind, n, s, got, ok, want)
				}
			}
		}
		sizes := []int{100, 101, 1000, 1001, 20_000, 20_001}
		if !testing.Short() {
			sizes = append(sizes, 300_000, 300_001)
		}
		for _, n := range sizes {
			sameMiddle(t, tiedSample(rng, kind, n), "large")
		}
	}
}

// Far from zero and near the ends of the floating-point range the tally
// still equals imSelect, or leaves the data to it (a difference from the
// median that overflows).
func TestMedcoupleTallyScales(t *testing.T) {
	rng := rand.New(rand.NewPCG(23, 24))
	for _, sc := range []struct{ off, scale float64 }{{1e6, 0.01}, {-3e9, 1}, {0, 1e-300}, {0, 1e300}, {1, 1e-9}, {0, 1e307}, {1e15, 1}} {
		for kind := 0; kind < 9; kind++ {
			for _, n := range []int{7, 31, 400, 5000} {
				s := tiedSample(rng, kind, n)
				for i := range s {
					s[i] = sc.off + s[i]*sc.scale
				}
				slices.Sort(s)
				sameMiddle(t, s, "scaled")
			}
		}
	}
}

// medcoupleMiddle takes the tally on many ties and imSelect on many
// distinct values (the switch, mcTallyMaxDistinct).
func TestMedcoupleTallySwitch(t *testing.T) {
	rng := rand.New(rand.NewPCG(25, 26))
	tied := tiedSample(rng, 6, 100_000)
	if mcNewTally(tied, tied[50_000], mcTallyMaxDistinct(len(tied))) == nil {
		t.Error("100,000 readings to 0.001: no tally")
	}
	cont := randomSample(rng, 0, 100_000)
	slices.Sort(cont)
	if mcNewTally(cont, cont[50_000], mcTallyMaxDistinct(len(cont))) != nil {
		t.Error("100,000 continuous readings: tally")
	}
}

// The limit counts the distinct values off the median exactly.
func TestMedcoupleTallyLimit(t *testing.T) {
	rng := rand.New(rand.NewPCG(29, 30))
	for kind := 0; kind < 9; kind++ {
		for _, n := range []int{3, 4, 9, 50, 51, 2000} {
			s := tiedSample(rng, kind, n)
			m := s[(n-1)/2]
			if n%2 == 0 {
				m = s[n/2-1]/2 + s[n/2]/2
			}
			d := 0
			for i, v := range s {
				if v != m && (i == 0 || v != s[i-1]) {
					d++
				}
			}
			if mcNewTally(s, m, d) == nil {
				t.Fatalf("kind %d n %d: %d distinct off the median, no tally with limit %d", kind, n, d, d)
			}
			if d > 0 && mcNewTally(s, m, d-1) != nil {
				t.Fatalf("kind %d n %d: %d distinct off the median, tally with limit %d", kind, n, d, d-1)
			}
		}
	}
}

func TestMcRunEnd(t *testing.T) {
	rng := rand.New(rand.NewPCG(27, 28))
	for rep := 0; rep < 200; rep++ {
		x := make([]float64, 1+rng.IntN(300))
		for i := range x {
			x[i] = float64(rng.IntN(1 + rep%20))
		}
		slices.Sort(x)
		for i := range x {
			want := i
			for want < len(x) && x[want] == x[i] {
				want++
			}
			if got := mcRunEnd(x, i); got != want {
				t.Fatalf("mcRunEnd(%v, %d) = %d, want %d", x, i, got, want)
			}
		}
	}
}

// Fuzz: readings on a few levels from the fuzzer's bytes (level = byte %
// levels, scaled); the tally equals imSelect bit for bit.
func FuzzMedcoupleTally(f *testing.F) {
	f.Add([]byte{1, 2, 3}, uint8(3), 1.0)
	f.Add([]byte{0, 0, 0, 0}, uint8(1), 0.5)
	f.Add([]byte{0, 1, 1, 1, 1, 2, 9, 9}, uint8(10), 0.001)
	f.Add([]byte{5, 5, 5, 1, 2, 200, 200, 7, 7, 7, 7}, uint8(255), -3.0)
	f.Fuzz(func(t *testing.T, b []byte, levels uint8, scale float64) {
		if len(b) < 3 || len(b) > 4000 || levels == 0 || !normalFinite(scale) || scale == 0 {
			return
		}
		x := make([]float64, len(b))
		for i, c := range b {
			x[i] = float64(int(c)%int(levels)) * scale
		}
		slices.Sort(x)
		sameMiddle(t, x, "fuzz")
	})
}

// Medcouple of 1,000,000 readings with few distinct values, against
// 1,000,000 continuous ones (imSelect) and the same tied readings by
// imSelect (the path before the tally).
func BenchmarkMedcoupleTied(b *testing.B) {
	rng := rand.New(rand.NewPCG(7, 8))
	const n = 1_000_000
	sets := []struct {
		name string
		x    []float64
	}{
		{"grid0.001", tiedSample(rng, 6, n)},
		{"normal0.01", tiedSample(rng, 7, n)},
		{"continuous", func() []float64 { x := randomSample(rng, 0, n); slices.Sort(x); return x }()},
	}
	for _, s := range sets {
		b.Run(s.name, func(b *testing.B) {
			for b.Loop() {
				Medcouple(s.x)
			}
		})
		b.Run(s.name+"/imSelect", func(b *testing.B) {
			x := s.x
			m := x[(n-1)/2]/2 + x[n/2]/2
			for b.Loop() {
				medcoupleImplicit(x, m)
			}
		})
	}
}

// The switch between the tally and imSelect (mcTallyShare): both on normal
// readings rounded to steps giving from a few hundred to nearly n distinct
// values (D in the name), 10,000 and 1,000,000 readings.
func BenchmarkMedcoupleTallyShare(b *testing.B) {
	for _, n := range []int{10_000, 1_000_000} {
		for _, res := range []float64{1e2, 1e3, 3e3, 1e4, 3e4, 1e5} {
			rng := rand.New(rand.NewPCG(1, 2))
			x := make([]float64, n)
			for i := range x {
				x[i] = math.Round(rng.NormFloat64()*res) / res
			}
			slices.Sort(x)
			m := x[(n-1)/2]/2 + x[n/2]/2
			d := 0
			for i := range x {
				if i == 0 || x[i] != x[i-1] {
					d++
				}
			}
			b.Run(fmt.Sprintf("n%d/D%d/tally", n, d), func(b *testing.B) {
				for b.Loop() {
					mcNewTally(x, m, n).middle()
				}
			})
			b.Run(fmt.Sprintf("n%d/D%d/imSelect", n, d), func(b *testing.B) {
				for b.Loop() {
					medcoupleImplicit(x, m)
				}
			})
		}
	}
}
