package method

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

func meanSDOf(x []float64) (float64, float64) {
	n := float64(len(x))
	var s float64
	for _, v := range x {
		s += v
	}
	m := s / n
	var ss float64
	for _, v := range x {
		ss += (v - m) * (v - m)
	}
	return m, math.Sqrt(ss / (n - 1))
}

// Shapiro and Wilk (1965), Biometrika 52, 591-611, worked example: weights
// of 11 men, W = 0.79 (published, 2 decimals); full digits R 4.2.2
// shapiro.test: W = 0.78881469, p = 0.006703814.
func TestShapiroWilkPublishedExample(t *testing.T) {
	x := []float64{148, 154, 158, 160, 161, 162, 166, 170, 182, 195, 236}
	m, _ := meanSDOf(x)
	w, p, ok := ShapiroWilk(x, m)
	if !ok {
		t.Fatal("not computed")
	}
	if math.Abs(w-0.79) > 0.005 {
		t.Errorf("W = %v, published 0.79", w)
	}
	if math.Abs(w-0.78881469) > 5e-9 || math.Abs(p-0.006703814) > 5e-9 {
		t.Errorf("W = %.10f p = %.10f, R 4.2.2 gives 0.78881469, 0.006703814", w, p)
	}
}

// n = 3: the p-value is exact (Royston 1995); W = 1 for equally spaced
// values, p = 1 (definition), and W = 0.75 is the minimum, p = 0.
func TestShapiroWilkN3(t *testing.T) {
	w, p, ok := ShapiroWilk([]float64{1, 2, 3}, 2)
	if !ok || math.Abs(w-1) > 1e-12 || math.Abs(p-1) > 1e-9 {
		t.Errorf("equally spaced: W %v p %v", w, p)
	}
	w, p, ok = ShapiroWilk([]float64{0, 0, 1}, 1.0/3)
	if !ok || math.Abs(w-0.75) > 1e-12 || p > 1e-6 {
		t.Errorf("two equal: W %v p %v", w, p)
	}
}

// The interpolated log Φ agrees with the direct formula across the table
// and beyond it (the direct formula is checked against R in normal_test.go).
func TestFastLogPhi(t *testing.T) {
	f, d := adLogPhiTable()
	worst := 0.0
	for z := -45.0; z <= 45; z += 0.000731 {
		got, want := adFastLogPhi(f, d, z), LogNormalCDF(z)
		err := math.Abs(got - want)
		if err > 1e-12*math.Max(1, math.Abs(want)) {
			t.Fatalf("z %v: %v want %v", z, got, want)
		}
		worst = max(worst, err)
	}
	t.Logf("largest difference %.3g", worst)
}

// Anderson-Darling through the table equals the direct computation on a
// large continuous sample (relative 1e-9).
func TestAndersonDarlingTable(t *testing.T) {
	rng := rand.New(rand.NewPCG(41, 42))
	n := adTableMinN + 1000
	x := make([]float64, n)
	for i := range x {
		x[i] = rng.NormFloat64() + 0.05*rng.ExpFloat64()
	}
	slices.Sort(x)
	m, sd := meanSDOf(x)
	a, _, p := AndersonDarling(x, m, sd)
	// direct: the same sum without the table
	var s float64
	fn := float64(n)
	for i, v := range x {
		z := (v - m) / sd
		k := float64(i + 1)
		s += (2*k-1)*LogNormalCDF(z) + (2*(fn-k)+1)*LogNormalCDF(-z)
	}
	want := -fn - s/fn
	if math.Abs(a-want) > 1e-9*math.Abs(want) || !normalFinite(p) {
		t.Errorf("A² = %.15g, direct %.15g", a, want)
	}
}
