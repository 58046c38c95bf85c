package method

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

// sameBits: equal to the last bit (and the sign of a zero), or both NaN.
func sameBits(a, b float64) bool {
	return math.Float64bits(a) == math.Float64bits(b) || (math.IsNaN(a) && math.IsNaN(b))
}

// TestDistributionsLikeDistuv holds dist.go and normal.go to gonum's
// stat/distuv v0.17.0 (the reference library the engine used before; the
// test still imports it, the engine does not), bit for bit, over degrees
// of freedom, shapes, points and probabilities from the tails to the
// centre, including the values where distuv takes a special branch
// (x = 0, p = 0.5, p = 0 and 1, x < 0, k >= n).
func TestDistributionsLikeDistuv(t *testing.T) {
	dfs := []float64{0.5, 1, 1.5, 2, 3, 4.25, 5, 7, 10, 19, 29.6, 50, 99, 250, 1e3, 1e4, 1e6}
	xs := []float64{-1e3, -40, -8.5, -3, -1.96, -1, -0.3, -1e-9, 0, 1e-9, 0.3, 1, 1.96, 3, 8.5, 40, 1e3}
	ps := []float64{0, 1e-300, 1e-12, 1e-6, 0.001, 0.005, 0.025, 0.05, 0.1, 0.25, 0.4999, 0.5, 0.5001, 0.75, 0.9, 0.95, 0.975, 0.995, 0.999, 1 - 1e-6, 1 - 1e-12, 1}
	n, panics := 0, 0
	check := func(name string, got, want func() float64, args ...float64) {
		t.Helper()
		n++
		g, gp := try(got)
		w, wp := try(want)
		switch {
		case gp != wp:
			t.Errorf("%s%v: panicked %v, distuv panicked %v", name, args, gp, wp)
		case gp:
			panics++ // gonum's cephes refuses some extreme arguments
			t.Logf("%s%v: refused by both", name, args)
		case !sameBits(g, w):
			t.Errorf("%s%v = %v (%#x), distuv %v (%#x)", name, args, g, math.Float64bits(g), w, math.Float64bits(w))
		}
	}
	for _, nu := range dfs {
		st := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: nu}
		chi := distuv.ChiSquared{K: nu}
		for _, x := range xs {
			check("tSurvival", func() float64 { return tSurvival(nu, x) }, func() float64 { return st.Survival(x) }, nu, x)
			check("chiSquaredSurvival", func() float64 { return chiSquaredSurvival(nu, x) }, func() float64 { return chi.Survival(x) }, nu, x)
			for _, d2 := range dfs {
				if x >= 0 {
					f := distuv.F{D1: nu, D2: d2}
					check("fCDF", func() float64 { return fCDF(nu, d2, x) }, func() float64 { return f.CDF(x) }, nu, d2, x)
					check("fSurvival", func() float64 { return fSurvival(nu, d2, x) }, func() float64 { return f.Survival(x) }, nu, d2, x)
				}
			}
		}
		for _, p := range ps {
			check("tQuantile", func() float64 { return tQuantile(nu, p) }, func() float64 { return st.Quantile(p) }, nu, p)
			check("chiSquaredQuantile", func() float64 { return chiSquaredQuantile(nu, p) }, func() float64 { return chi.Quantile(p) }, nu, p)
			for _, d2 := range dfs {
				check("fQuantile", func() float64 { return fQuantile(nu, d2, p) }, func() float64 { return distuv.F{D1: nu, D2: d2}.Quantile(p) }, nu, d2, p)
				check("betaQuantile", func() float64 { return betaQuantile(nu, d2, p) }, func() float64 { return distuv.Beta{Alpha: nu, Beta: d2}.Quantile(p) }, nu, d2, p)
			}
		}
	}
	for _, x := range xs {
		check("NormalCDF", func() float64 { return NormalCDF(x) }, func() float64 { return distuv.UnitNormal.CDF(x) }, x)
	}
	for _, p := range ps {
		check("NormalQuantile", func() float64 { return NormalQuantile(p) }, func() float64 { return distuv.UnitNormal.Quantile(p) }, p)
	}
	for _, size := range []int{1, 2, 3, 10, 25, 100, 1001, 100000} {
		for _, k := range []int{-1, 0, 1, 2, size/2 - 1, size / 2, size - 1, size, size + 1} {
			check("BinomialHalfCDF", func() float64 { return BinomialHalfCDF(k, size) }, func() float64 { return distuv.Binomial{N: float64(size), P: 0.5}.CDF(float64(k)) }, float64(k), float64(size))
		}
	}
	if n < 15000 || panics > n/100 {
		t.Fatalf("%d comparisons, %d of them refused by both", n, panics)
	}
	t.Logf("%d comparisons, %d refused by both", n, panics)
}

// try calls f and reports whether it panicked.
func try(f func() float64) (v float64, panicked bool) {
	defer func() {
		if recover() != nil {
			panicked = true
		}
	}()
	return f(), false
}

// TestDistributionsOutsideRange: a probability outside [0, 1] (or NaN)
// gives NaN where distuv panics.
func TestDistributionsOutsideRange(t *testing.T) {
	for _, p := range []float64{-0.1, 1.1, math.NaN(), math.Inf(1)} {
		for name, v := range map[string]float64{
			"tQuantile":          tQuantile(5, p),
			"chiSquaredQuantile": chiSquaredQuantile(5, p),
			"fQuantile":          fQuantile(5, 7, p),
			"betaQuantile":       betaQuantile(2, 3, p),
			"NormalQuantile":     NormalQuantile(p),
		} {
			if !math.IsNaN(v) {
				t.Errorf("%s(%v) = %v, want NaN", name, p, v)
			}
		}
	}
}

// TestRankTestsFarTail: the normal approximations of the Mann-Whitney test
// and of Dunn's test give a two-sided p of erfc(|z|/√2) (the check value:
// the definition of the two-sided normal tail, 2·(1 - Φ(|z|)), computed by
// Go's math.Erfc), which stays above
// 0 far out; (1 - erf)/2, which they used before, cancels to 0 beyond
// |z| ≈ 8.3 (TestNormalSFTail). Two groups of 600 with no overlap (with a
// tie, so the normal approximation applies) give |z| ≈ 30.
func TestRankTestsFarTail(t *testing.T) {
	x, y := make([]float64, 600), make([]float64, 600)
	for i := range x {
		x[i], y[i] = float64(i), float64(1000+i)
	}
	x[1] = x[0]
	for _, g := range [][2][]float64{{x, y}, {y, x}} { // z < 0, then z > 0
		mw, err := MannWhitney(g[0], g[1], 0.95)
		if err != nil {
			t.Fatal(err)
		}
		if mw.Exact || !(math.Abs(mw.Z) > 25) {
			t.Fatalf("Mann-Whitney: exact %v, z %v; want the normal approximation far out", mw.Exact, mw.Z)
		}
		if want := math.Erfc(math.Abs(mw.Z) / math.Sqrt2); !(mw.P > 0) || math.Abs(mw.P-want) > 1e-12*want {
			t.Errorf("Mann-Whitney p = %v at z = %v, want erfc(|z|/√2) = %v", mw.P, mw.Z, want)
		}
		pairs, err := Dunn([][]float64{g[0], g[1]})
		if err != nil {
			t.Fatal(err)
		}
		if len(pairs) != 1 || !(pairs[0].P > 0) || pairs[0].P > 1e-100 {
			t.Errorf("Dunn's test: %+v, want one pair with 0 < p < 1e-100", pairs)
		}
	}
}
