package method

import (
	"math"
)

// ConformNormalUpperBound returns the upper confidence bound, at level, of
// the fraction of a normal population beyond one specification limit, when
// the readings sit k estimated sigmas inside that limit: k = (x̄ − LSL)/σ̂
// for the lower limit, (USL − x̄)/σ̂ for the upper. n is the number of
// readings behind x̄ and df the degrees of freedom of σ̂ (n − 1 for the
// sample SD, the effective degrees of freedom for a within-process sigma).
//
// Method: √n·k follows the noncentral t distribution with df degrees of
// freedom and noncentrality δ = √n·z, where z = Φ⁻¹(1 − p) for the true
// fraction p beyond the limit (Owen 1963; the same duality as the one-sided
// normal tolerance limit, e.g. Hahn and Meeker 1991, section 4.5). The
// lower confidence bound of δ is the δ_L with Pr{T'(df, δ_L) ≤ √n·k} = level;
// the bound on the fraction is Φ(−δ_L/√n). Found by bisection on δ to
// 1e-12. Errors: n < 2, df not positive, k not finite, level outside (0, 1).
func ConformNormalUpperBound(k float64, n int, df, level float64) (float64, error) {
	if !(level > 0 && level < 1) {
		return math.NaN(), ErrCapLevel
	}
	if n < 2 || !(df > 0) || math.IsInf(df, 0) || math.IsNaN(k) || math.IsInf(k, 0) {
		return math.NaN(), ErrCapInput
	}
	sn := math.Sqrt(float64(n))
	t := sn * k
	// F(δ) = Pr{T' ≤ t} falls as δ rises; find F(δ) = level
	f := func(d float64) float64 { return TolNoncentralTCDF(t, df, d) - level }
	step := 1 + math.Abs(t)
	lo, hi := t-step, t+step
	for i := 0; f(lo) < 0 && i < 200; i++ {
		lo -= step
		step *= 2
	}
	step = 1 + math.Abs(t)
	for i := 0; f(hi) > 0 && i < 200; i++ {
		hi += step
		step *= 2
	}
	if f(lo) < 0 || f(hi) > 0 {
		return math.NaN(), ErrCapInput
	}
	for it := 0; it < 400 && hi-lo > 1e-12*math.Max(1, math.Abs(hi)); it++ {
		mid := (lo + hi) / 2
		if f(mid) > 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	return capNormCDF(-(lo + hi) / 2 / sn), nil
}
