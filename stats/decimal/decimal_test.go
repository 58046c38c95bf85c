package decimal

import (
	"math"
	"math/big"
	"math/rand/v2"
	"slices"
	"strconv"
	"testing"
)

// Mantissas are recovered exactly from the float64 of decimal text: the
// check values are the digits of the text itself (definition).
func TestMantissa(t *testing.T) {
	for _, c := range []struct {
		text string
		d    int
		m    int64
		ok   bool
	}{
		{"11.30", 2, 1130, true},
		{"0.1", 1, 1, true},
		{"-7.9", 1, -79, true},
		{"1000000.512", 3, 1000000512, true},
		{"0.1", 0, 0, false},                 // not a whole number
		{"12345678901234.5678", 4, 0, false}, // beyond 2^51
		{"1e-300", 22, 0, false},
	} {
		x, _ := strconv.ParseFloat(c.text, 64)
		m, ok := Mantissa(x, c.d)
		if ok != c.ok || (ok && m != c.m) {
			t.Errorf("Mantissa(%s, %d) = %d, %v; want %d, %v", c.text, c.d, m, ok, c.m, c.ok)
		}
	}
}

// FromFloat gives the shortest decimal that reads back as x.
func TestFromFloat(t *testing.T) {
	for _, c := range []struct {
		x    float64
		m    int64
		d    int
		okay bool
	}{
		{8, 8, 0, true}, {8.05, 805, 2, true}, {-0.001, -1, 3, true}, {1200, 1200, 0, true},
		{1e20, 0, 0, false}, {math.Inf(1), 0, 0, false}, {1e-30, 0, 0, false},
	} {
		m, d, ok := FromFloat(c.x)
		if ok != c.okay || (ok && (m != c.m || d != c.d)) {
			t.Errorf("FromFloat(%v) = %d, %d, %v; want %d, %d, %v", c.x, m, d, ok, c.m, c.d, c.okay)
		}
	}
}

// Counting against an exact threshold equals counting against the exact
// value of every reading (definition, on random grids and thresholds, the
// thresholds on the grid, between its points and beyond its ends).
func TestCountAgainstThreshold(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	for trial := 0; trial < 200; trial++ {
		d := rng.IntN(5)
		g, _ := NewGrid(d)
		n := 1 + rng.IntN(60)
		xs := make([]float64, n)
		for i := range xs {
			xs[i] = g.Float(int64(rng.IntN(2001) - 1000))
		}
		slices.Sort(xs)
		for k := 0; k < 20; k++ {
			th := big.NewRat(int64(rng.IntN(4001)-2000), int64(1+rng.IntN(7)))
			th.Quo(th, new(big.Rat).SetInt(g.Denom()))
			below, above := 0, 0
			for _, x := range xs {
				switch g.Value(x).Cmp(th) {
				case -1:
					below++
				case 1:
					above++
				}
			}
			if got := g.CountBelow(xs, th); got != below {
				t.Fatalf("CountBelow(%v) = %d, want %d", th, got, below)
			}
			if got := g.CountAbove(xs, th); got != above {
				t.Fatalf("CountAbove(%v) = %d, want %d", th, got, above)
			}
		}
	}
}

// The power sums and moments equal big-integer sums computed value by
// value (definition), for small and large deviations and long runs.
func TestPowerSums(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	for _, spread := range []int64{3, 1000, 40000, 3_000_000_000, 1 << 49} {
		g, _ := NewGrid(3)
		n := 500
		xs := make([]float64, n)
		for i := range xs {
			xs[i] = g.Float(rng.Int64N(2*spread+1) - spread + 1_000_000_500)
		}
		slices.Sort(xs)
		ps := g.PowerSums(xs)
		for k := 1; k <= 4; k++ {
			want := new(big.Int)
			for _, x := range xs {
				d := big.NewInt(g.M(x) - ps.C)
				p := new(big.Int).Exp(d, big.NewInt(int64(k)), nil)
				want.Add(want, p)
			}
			if ps.S[k].Cmp(want) != 0 {
				t.Errorf("spread %d: S%d = %v, want %v", spread, k, ps.S[k], want)
			}
		}
		mo, ok := ps.Moments(g)
		sum := new(big.Rat)
		for _, x := range xs {
			sum.Add(sum, g.Value(x))
		}
		mean := new(big.Rat).Quo(sum, big.NewRat(int64(n), 1))
		if !ok || mo.Mean != Float64(mean) {
			t.Errorf("spread %d: mean %v, exact %v", spread, mo.Mean, Float64(mean))
		}
	}
}

// An exact quantile interpolates on the decimals: 10.00 + (1/2)(10.52 -
// 10.00) = 10.26 (by hand).
func TestInterpolate(t *testing.T) {
	g, _ := NewGrid(2)
	if r := g.Interpolate(1000, 1052, 1, 2); Float64(r) != 10.26 {
		t.Errorf("%v", r)
	}
	if r := g.Interpolate(1000, 1052, 0, 4); Float64(r) != 10 {
		t.Errorf("%v", r)
	}
}

// AppendPlaces writes n·10⁻ᵈ with exactly d places. Expected texts: the
// definition (the mantissa's digits with a point d places from the right,
// zeros in front as needed); the random cases against strconv's own 'f'
// formatting of the same decimal, which is exact for these sizes.
func TestAppendPlaces(t *testing.T) {
	for _, c := range []struct {
		n    uint64
		d    int
		want string
	}{{0, 0, "0"}, {0, 2, "0.00"}, {105, 2, "1.05"}, {7, 3, "0.007"}, {100, 2, "1.00"},
		{123456, 6, "0.123456"}, {1, 19, "0.0000000000000000001"}, {18446744073709551615, 0, "18446744073709551615"}} {
		if got := string(AppendPlaces([]byte("x"), c.n, c.d)); got != "x"+c.want {
			t.Errorf("AppendPlaces(%d, %d) = %q, want %q", c.n, c.d, got[1:], c.want)
		}
	}
	r := rand.New(rand.NewPCG(5, 6))
	for i := 0; i < 20000; i++ {
		d := r.IntN(7)
		n := r.Uint64N(1 << 40)
		want := strconv.FormatFloat(float64(n)/Pow10(d), 'f', d, 64)
		if got := string(AppendPlaces(nil, n, d)); got != want {
			t.Fatalf("AppendPlaces(%d, %d) = %q, strconv %q", n, d, got, want)
		}
	}
}

// The written-out powers of ten are the exact ones: each equals the
// float64 that strconv reads from "1e<d>" (correctly rounded, and exact up
// to 1e22; definition), and none was left out of the literal.
// TestDenom: 10^Scale for every scale, against math/big's own power.
func TestDenom(t *testing.T) {
	for d := 0; d <= MaxScale; d++ {
		g, ok := NewGrid(d)
		if !ok {
			t.Fatalf("NewGrid(%d) refused", d)
		}
		want := new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(d)), nil)
		if got := g.Denom(); got.Cmp(want) != 0 {
			t.Errorf("Denom at scale %d = %v, want %v", d, got, want)
		}
	}
}

// TestShortestRat: the exact value of x's shortest decimal, against
// big.Rat.SetString of strconv's shortest form, from the smallest
// subnormal to the largest double, on a grid and off it.
func TestShortestRat(t *testing.T) {
	xs := []float64{0, math.Copysign(0, -1), 1, -1, 0.1, 5.3, 4.9, -12.75, 1e-300, 5e-324, math.MaxFloat64,
		-math.MaxFloat64, 123456789012345678, 1.0000000000000002, 0.30000000000000004, 1e22, 1e23, 2.5e-7, 6.02214076e23}
	rng := rand.New(rand.NewPCG(3, 4))
	for i := 0; i < 2000; i++ {
		xs = append(xs, math.Float64frombits(rng.Uint64()&^(0x7ff<<52)|uint64(rng.IntN(2046)+1)<<52))
	}
	for _, x := range xs {
		got, ok := ShortestRat(x)
		want, _ := new(big.Rat).SetString(strconv.FormatFloat(x, 'g', -1, 64))
		if !ok || got.Cmp(want) != 0 {
			t.Errorf("ShortestRat(%v) = %v, %v; want %v", x, got, ok, want)
		}
	}
	for _, x := range []float64{math.NaN(), math.Inf(1), math.Inf(-1)} {
		if _, ok := ShortestRat(x); ok {
			t.Errorf("ShortestRat(%v) accepted", x)
		}
	}
}

func TestPow10Table(t *testing.T) {
	for d := 0; d <= MaxScale; d++ {
		want, err := strconv.ParseFloat("1e"+strconv.Itoa(d), 64)
		if err != nil || Pow10(d) != want {
			t.Errorf("Pow10(%d) = %g, want %g (%v)", d, Pow10(d), want, err)
		}
	}
}
