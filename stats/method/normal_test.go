package method

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

// Check values: R 4.2.2, qnorm(p) and pnorm(z) printed with %.17g.
func TestNormQuantileR(t *testing.T) {
	cases := []struct{ p, z float64 }{
		{1e-300, -37.047096299361201},
		{1e-20, -9.2623400897984052},
		{1e-10, -6.3613409024040557},
		{0.00135, -2.999976992703393},
		{0.01, -2.3263478740408408},
		{0.025, -1.9599639845400538},
		{0.05, -1.6448536269514726},
		{0.1, -1.2815515655446008},
		{0.3, -0.52440051270804067},
		{0.5, 0},
		{0.7, 0.52440051270804067},
		{0.9, 1.2815515655446008},
		{0.975, 1.9599639845400536},
		{0.99, 2.3263478740408408},
		{0.999999, 4.7534243088170891},
	}
	for _, c := range cases {
		got := NormalQuantile(c.p)
		if math.Abs(got-c.z) > 1e-14*math.Max(1, math.Abs(c.z)) {
			t.Errorf("NormalQuantile(%g) = %.17g, R 4.2.2 qnorm gives %.17g", c.p, got, c.z)
		}
	}
	for _, p := range []float64{-0.1, 1.1, math.NaN()} {
		if !math.IsNaN(NormalQuantile(p)) {
			t.Errorf("NormalQuantile(%g) should be NaN", p)
		}
	}
	if !math.IsInf(NormalQuantile(0), -1) || !math.IsInf(NormalQuantile(1), 1) {
		t.Error("normQuantile at 0 and 1 should be -Inf and +Inf")
	}
}

func TestNormCDFR(t *testing.T) {
	cases := []struct{ z, p float64 }{
		{-20, 2.7536241186062337e-89},
		{-8, 6.2209605742717849e-16},
		{-3, 0.0013498980316300946},
		{-1.96, 0.024997895148220428},
		{-1, 0.15865525393145705},
		{0, 0.5},
		{0.5, 0.69146246127401301},
		{1, 0.84134474606854293},
		{1.96, 0.97500210485177963},
		{3, 0.9986501019683699},
		{8, 0.99999999999999933},
	}
	for _, c := range cases {
		// Relative accuracy of erfc degrades gently in the far tail.
		tol := 1e-14 * (1 + c.z*c.z) * c.p
		got := NormalCDF(c.z)
		if math.Abs(got-c.p) > tol {
			t.Errorf("NormalCDF(%g) = %.17g, R 4.2.2 pnorm gives %.17g", c.z, got, c.p)
		}
		if sf := NormalSF(-c.z); math.Abs(sf-c.p) > tol {
			t.Errorf("NormalSF(%g) = %.17g, R 4.2.2 pnorm gives %.17g", -c.z, sf, c.p)
		}
	}
}

// Round trip: Φ(Φ⁻¹(p)) = p across the range (a property of the pair).
func TestNormRoundTrip(t *testing.T) {
	for e := -300.0; e < 0; e += 0.37 {
		p := math.Pow(10, e)
		z := NormalQuantile(p)
		if back := NormalCDF(z); math.Abs(back-p) > 1e-14*(1+z*z)*p {
			t.Fatalf("NormalCDF(NormalQuantile(%g)) = %g", p, back)
		}
	}
}

// gonum's Survival cancels in the upper tail; NormalSF does not. Check
// value: R 4.2.2 pnorm(10, lower.tail = FALSE) = 7.6198530241605269e-24.
func TestNormalSFTail(t *testing.T) {
	const want = 7.6198530241605269e-24
	if got := NormalSF(10); math.Abs(got-want) > 1e-13*want {
		t.Errorf("NormalSF(10) = %g, R 4.2.2 gives %g", got, want)
	}
	if got := distuv.UnitNormal.Survival(10); got == want {
		t.Log("gonum's Survival is now accurate in the tail: NormalSF could use it")
	}
}

// gonum has no log CDF of the normal, and log(CDF) underflows: the reason
// LogNormalCDF is hand-written. Check value: R 4.2.2
// pnorm(-40, log.p = TRUE) = -804.6084420137538.
func TestLogNormalCDFTail(t *testing.T) {
	const want = -804.6084420137538
	if got := LogNormalCDF(-40); math.Abs(got-want) > 1e-13*math.Abs(want) {
		t.Errorf("LogNormalCDF(-40) = %.17g, R 4.2.2 gives %.17g", got, want)
	}
	if l := math.Log(distuv.UnitNormal.CDF(-40)); !math.IsInf(l, -1) {
		t.Logf("log(UnitNormal.CDF(-40)) = %g is finite now", l)
	}
}
