package method

import (
	"math"

	"gonum.org/v1/gonum/mathext"
)

// NormalCDF is the standard normal distribution function Φ(x) =
// erfc(-x/√2)/2, which keeps full relative accuracy in the lower tail far
// below 1e-16 (Abramowitz and Stegun 1964, 26.2.29); gonum's
// distuv.UnitNormal.CDF, bit for bit (see dist.go).
func NormalCDF(x float64) float64 { return 0.5 * math.Erfc(-x/math.Sqrt2) }

// NormalSF is the upper tail 1 - Φ(x) = Φ(-x). gonum's Survival computes
// (1 - erf(x/√2))/2, which cancels to 0 beyond x ≈ 8.3 (TestNormalSFTail);
// Φ(-x) keeps the tail.
func NormalSF(x float64) float64 { return NormalCDF(-x) }

// NormalQuantile is the standard normal quantile Φ⁻¹(p), gonum's
// mathext.NormalQuantile (algorithm AS 241 PPND16, Wichura 1988, Applied
// Statistics 37, 477-484, accurate to about 1 part in 10^16), as
// distuv.UnitNormal.Quantile gives it. It returns -Inf at 0, +Inf at 1 and
// NaN outside [0, 1] (gonum panics there).
func NormalQuantile(p float64) float64 {
	if !(p >= 0 && p <= 1) {
		return math.NaN()
	}
	return mathext.NormalQuantile(p) + 0 // + 0 as distuv's μ + σ·z: -0 becomes 0
}

// TwoSidedNormalP is 2·P(Z > |z|), accurate in the far tail.
func TwoSidedNormalP(z float64) float64 {
	return math.Min(1, 2*NormalSF(math.Abs(z)))
}

// LogNormalCDF is log Φ(z), accurate in both tails: for z far below -30 it
// uses the asymptotic series of Mills' ratio (Abramowitz and Stegun 1964,
// 26.2.12), where Φ(z) itself underflows. Hand-written: gonum's normal has
// no log CDF, and log(UnitNormal.CDF(z)) is -Inf below z ≈ -38.5
// (TestLogNormalCDFTail).
func LogNormalCDF(z float64) float64 {
	switch {
	case z > 0:
		return math.Log1p(-NormalSF(z))
	case z > -30:
		return math.Log(NormalCDF(z))
	}
	r := 1 / (z * z)
	s := 1 - r*(1-3*r*(1-5*r*(1-7*r*(1-9*r*(1-11*r)))))
	return -0.5*z*z - math.Log(-z) - 0.5*math.Log(2*math.Pi) + math.Log(s)
}

func normalFinite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
