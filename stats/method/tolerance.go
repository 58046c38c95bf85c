package method

import (
	"math"
	"sync"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/mathext"
)

// NormalTolerance holds the factors of normal tolerance intervals: with
// confidence Confidence, at least the fraction Coverage of the population
// lies in mean ± K2·s (two-sided), or above mean - K1·s (or below
// mean + K1·s) (one-sided).
type NormalTolerance struct {
	N                    int
	DF                   float64 // degrees of freedom of s
	Coverage, Confidence float64
	K2                   float64 // two-sided, exact (Odeh and Owen 1980 integral)
	K2Howe               float64 // two-sided, Howe's (1969) approximation, for comparison
	K1                   float64 // one-sided, exact (noncentral t)
}

// NormalToleranceFactors returns the tolerance factors for a normal sample
// of n readings whose SD has df degrees of freedom (df = n-1 for the
// ordinary sample SD).
//
// K2 is the exact two-sided factor (Wald and Wolfowitz 1946; computed as in
// Odeh and Owen 1980, "Tables for Normal Tolerance Limits", Dekker): the k
// solving
//
//	γ = √(2n/π) ∫₀^∞ Pr{χ²_ν > ν r(x)²/k²} e^(-n x²/2) dx,
//	Φ(x+r) - Φ(x-r) = P,
//
// with the integral by composite Gauss-Legendre quadrature (gonum
// integrate/quad) and k by bisection. K2Howe is Howe's (1969, JASA
// 64:610-620) approximation k = √(ν(1+1/n) z²((1+P)/2) / χ²(1-γ, ν)).
// K1 is the exact one-sided factor t'(γ; ν, z_P √n)/√n, a quantile of the
// noncentral t distribution (Owen 1963), see TolNoncentralTCDF.
//
// Errors: n < 2, df not positive, coverage or confidence outside (0, 1).
func NormalToleranceFactors(n int, df, coverage, confidence float64) (NormalTolerance, error) {
	r := NormalTolerance{N: n, DF: df, Coverage: coverage, Confidence: confidence}
	if n < 2 {
		return r, ErrCapTooFew
	}
	if !(df > 0) || math.IsInf(df, 0) {
		return r, ErrCapInput
	}
	if !(coverage > 0 && coverage < 1) || !(confidence > 0 && confidence < 1) {
		return r, ErrCapLevel
	}
	nf := float64(n)
	zp2 := mathext.NormalQuantile((1 + coverage) / 2)
	chi := 2 * mathext.GammaIncRegInv(df/2, 1-confidence)
	r.K2Howe = math.Sqrt(df * (1 + 1/nf) * zp2 * zp2 / chi)
	r.K2 = tolTwoSidedExact(nf, df, coverage, confidence, r.K2Howe)
	k1, err := TolNoncentralTQuantile(confidence, df, mathext.NormalQuantile(coverage)*math.Sqrt(nf))
	if err != nil {
		return r, err
	}
	r.K1 = k1 / math.Sqrt(nf)
	return r, nil
}

// tolRule gives Gauss-Legendre nodes and weights on [0, 1] (gonum quad),
// computed on first use (not at start).
var tolRule = sync.OnceValue(func() (r struct{ x, w []float64 }) {
	r.x, r.w = make([]float64, 24), make([]float64, 24)
	quad.Legendre{}.FixedLocations(r.x, r.w, 0, 1)
	return r
})

// tolTwoSidedExact solves the Odeh-Owen integral for k (see
// NormalToleranceFactors). The substitution u = x√n makes the weight
// e^(-u²/2); u runs over [0, 12] in 48 panels of 24 Gauss-Legendre nodes
// (the integrand's tail beyond 12 is below e^-72).
func tolTwoSidedExact(n, df, p, conf, guess float64) float64 {
	const panels, width = 48, 0.25
	rule := tolRule()
	tolNodes, tolWeights := rule.x, rule.w
	m := panels * len(tolNodes)
	r2 := make([]float64, m) // ν r(x)², independent of k
	wt := make([]float64, m) // quadrature weight × √(2/π) e^(-u²/2)
	zp := mathext.NormalQuantile((1 + p) / 2)
	for j := 0; j < panels; j++ {
		for i, t := range tolNodes {
			u := (float64(j) + t) * width
			x := u / math.Sqrt(n)
			r := tolCoverR(x, p, zp)
			r2[j*len(tolNodes)+i] = df * r * r
			wt[j*len(tolNodes)+i] = tolWeights[i] * width * math.Sqrt(2/math.Pi) * math.Exp(-u*u/2)
		}
	}
	gamma := func(k float64) float64 {
		s := 0.0
		for i := range r2 {
			s += wt[i] * mathext.GammaIncRegComp(df/2, r2[i]/(k*k)/2)
		}
		return s
	}
	// the guess (Howe's factor) is close: bracket the root tightly around
	// it, widening as needed
	lo, hi := guess*0.99, guess*1.01
	flo, fhi := gamma(lo)-conf, gamma(hi)-conf
	for f := 1.02; fhi < 0 && hi < 1e12; f *= f {
		lo, flo = hi, fhi
		hi *= f
		fhi = gamma(hi) - conf
	}
	for f := 1.02; flo > 0 && lo > 1e-12; f *= f {
		hi, fhi = lo, flo
		lo /= f
		flo = gamma(lo) - conf
	}
	// gamma rises with k: the Illinois variant of regula falsi (Dowell
	// and Jarratt 1971), with a bisection step whenever a step fails to
	// halve the bracket, needs a fraction of bisection's integrals (each
	// costs 1,152 incomplete gamma functions, slow at large df)
	side := 0
	for it := 0; it < 200 && hi-lo > 1e-14*hi; it++ {
		width := hi - lo
		mid := (lo + hi) / 2
		if side != 2 && fhi != flo {
			mid = hi - fhi*(hi-lo)/(fhi-flo)
		}
		if !(mid > lo && mid < hi) {
			mid = (lo + hi) / 2
		}
		fm := gamma(mid) - conf
		switch {
		case fm == 0:
			return mid
		case fm < 0:
			lo, flo = mid, fm
			if side == -1 {
				fhi /= 2
			}
			side = -1
		default:
			hi, fhi = mid, fm
			if side == 1 {
				flo /= 2
			}
			side = 1
		}
		if hi-lo > width/2 {
			side = 2 // next step: bisection
		}
	}
	return (lo + hi) / 2
}

// tolCoverR solves Φ(x+r) - Φ(x-r) = p for r ≥ 0 by Newton's method from
// r = zp + x (exact at x = 0 to first order).
func tolCoverR(x, p, zp float64) float64 {
	r := zp + x
	for it := 0; it < 100; it++ {
		f := capNormCDF(x+r) - capNormCDF(x-r) - p
		d := tolPhi(x+r) + tolPhi(x-r)
		if d == 0 {
			break
		}
		step := f / d
		nr := r - step
		if nr <= 0 {
			nr = r / 2
		}
		if math.Abs(nr-r) <= 1e-15*r {
			r = nr
			break
		}
		r = nr
	}
	return r
}

func tolPhi(z float64) float64 { return math.Exp(-z*z/2) / math.Sqrt(2*math.Pi) }

// TolNoncentralTCDF returns Pr{T ≤ t} for the noncentral t distribution
// with df degrees of freedom and noncentrality delta, by algorithm AS 243
// (Lenth 1989, Applied Statistics 38:185-189) with the refinements of
// R's pnt (R 4.2.2): beyond |delta| > 37.62 (or df > 4e5) the normal
// approximation of Abramowitz and Stegun (1964) 26.7.10 is used, as R does.
// NaN in, NaN out; df must be positive.
func TolNoncentralTCDF(t, df, delta float64) float64 {
	if math.IsNaN(t) || math.IsNaN(df) || math.IsNaN(delta) || !(df > 0) {
		return math.NaN()
	}
	if math.IsInf(t, 1) {
		return 1
	}
	if math.IsInf(t, -1) {
		return 0
	}
	var negdel bool
	tt, del := t, delta
	if t < 0 {
		negdel, tt, del = true, -t, -delta
	}
	if df > 4e5 || del*del > 2*math.Ln2*1021 {
		s := 1 / (4 * df)
		v := capNormCDF((tt*(1-s) - del) / math.Sqrt(1+tt*tt*2*s))
		if negdel {
			return 1 - v
		}
		return v
	}
	x := t * t / (t*t + df)
	var tnc float64
	if x > 0 {
		lambda := del * del
		p := 0.5 * math.Exp(-0.5*lambda)
		q := math.Sqrt(2/math.Pi) * p * del
		s := 0.5 - p
		if s < 1e-7 {
			s = -0.5 * math.Expm1(-0.5*lambda)
		}
		a := 0.5
		b := 0.5 * df
		rxb := math.Pow(1-x, b)
		lgb, _ := math.Lgamma(b)
		lgb5, _ := math.Lgamma(0.5 + b)
		albeta := 0.5*math.Log(math.Pi) + lgb - lgb5
		xodd := mathext.RegIncBeta(a, b, x)
		godd := 2 * rxb * math.Exp(a*math.Log(x)-albeta)
		tnc = b * x
		xeven := 1 - rxb
		if tnc < 2.220446049250313e-16 {
			xeven = tnc
		}
		geven := tnc * rxb
		tnc = p*xodd + q*xeven
		for it := 1; it <= 1000; it++ {
			a++
			xodd -= godd
			xeven -= geven
			godd *= x * (a + b - 1) / a
			geven *= x * (a + b - 0.5) / (a + 0.5)
			p *= lambda / float64(2*it)
			q *= lambda / float64(2*it+1)
			tnc += p*xodd + q*xeven
			s -= p
			if s < -1e-10 || (s <= 0 && it > 1) {
				break
			}
			if math.Abs(2*s*(xodd-godd)) < 1e-12 {
				break
			}
		}
	}
	tnc += capNormCDF(-del)
	if tnc > 1 {
		tnc = 1
	}
	if negdel {
		return 1 - tnc
	}
	return tnc
}

// TolNoncentralTQuantile returns the p quantile of the noncentral t
// distribution (df, delta): the t with TolNoncentralTCDF(t) = p, by
// bracketing and bisection to relative 1e-13. Errors: p outside (0, 1), df
// not positive, non-finite delta.
func TolNoncentralTQuantile(p, df, delta float64) (float64, error) {
	if !(p > 0 && p < 1) {
		return math.NaN(), ErrCapLevel
	}
	if !(df > 0) || math.IsNaN(delta) || math.IsInf(delta, 0) || math.IsInf(df, 0) {
		return math.NaN(), ErrCapInput
	}
	f := func(t float64) float64 { return TolNoncentralTCDF(t, df, delta) - p }
	step := 1 + math.Abs(delta)
	lo, hi := delta-step, delta+step
	for i := 0; f(lo) > 0 && i < 2000; i++ {
		lo -= step
		step *= 2
	}
	step = 1 + math.Abs(delta)
	for i := 0; f(hi) < 0 && i < 2000; i++ {
		hi += step
		step *= 2
	}
	if f(lo) > 0 || f(hi) < 0 {
		return math.NaN(), ErrCapInput
	}
	for it := 0; it < 300 && hi-lo > 1e-13*math.Max(1, math.Abs(hi)); it++ {
		mid := (lo + hi) / 2
		if f(mid) < 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2, nil
}

// DistFreeConfidence returns the confidence that the interval between the
// r-th smallest and the s-th largest of n readings covers at least the
// fraction coverage of the population, for any continuous distribution
// (Wilks 1941, Ann. Math. Statist. 12:91-96): with m = r + s, the coverage
// is Beta(n-m+1, m) distributed, so the confidence is 1 - I_P(n-m+1, m).
// r = s = 1 is (min, max); r = 0 or s = 0 is a one-sided interval (no limit on
// that side). Errors: r or s negative, r + s = 0 or > n, coverage outside (0, 1).
func DistFreeConfidence(n, r, s int, coverage float64) (float64, error) {
	if r < 0 || s < 0 || r+s == 0 {
		return 0, ErrCapInput
	}
	if n < r+s {
		return 0, ErrCapTooFew
	}
	if !(coverage > 0 && coverage < 1) {
		return 0, ErrCapLevel
	}
	m := float64(r + s)
	return 1 - mathext.RegIncBeta(float64(n)-m+1, m, coverage), nil
}

// DistFreeSampleSize returns the smallest n for which the interval between
// the r-th smallest and the s-th largest reading (r = s = 1: min and max;
// r = 0 or s = 0: one-sided) covers at least the fraction coverage with at
// least the given confidence (Wilks 1941; see DistFreeConfidence). Capped at
// 1e9 readings (ErrCapTooFew beyond).
func DistFreeSampleSize(r, s int, coverage, confidence float64) (int, error) {
	if !(confidence > 0 && confidence < 1) {
		return 0, ErrCapLevel
	}
	m := r + s
	ok := func(n int) bool {
		c, err := DistFreeConfidence(n, r, s, coverage)
		return err == nil && c >= confidence
	}
	if _, err := DistFreeConfidence(m, r, s, coverage); err != nil {
		return 0, err
	}
	if ok(m) {
		return m, nil
	}
	lo, hi := m, m+1
	for !ok(hi) {
		if hi > 1e9 {
			return 0, ErrCapTooFew
		}
		lo, hi = hi, hi*2
	}
	for hi-lo > 1 {
		mid := lo + (hi-lo)/2
		if ok(mid) {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi, nil
}

// DistFreeRanks returns the widest claim n readings support: the largest
// m = r + s such that the interval between the r-th smallest and the s-th
// largest reading covers at least coverage with at least the given
// confidence (Wilks 1941), with r = ceil(m/2), s = m - r when twoSided, else
// r = 0, s = m (an upper limit; use the mirror for a lower one). achieved is
// the confidence of that choice. ok false: even (min, max) (or the maximum)
// is not enough.
func DistFreeRanks(n int, coverage, confidence float64, twoSided bool) (r, s int, achieved float64, ok bool) {
	if n < 1 || !(coverage > 0 && coverage < 1) || !(confidence > 0 && confidence < 1) {
		return 0, 0, 0, false
	}
	split := func(m int) (int, int) {
		if twoSided {
			return (m + 1) / 2, m / 2
		}
		return 0, m
	}
	m0 := 1
	if twoSided {
		m0 = 2
	}
	// confidence decreases as m grows: binary search the last m that holds.
	conf := func(m int) float64 {
		a, b := split(m)
		c, err := DistFreeConfidence(n, a, b, coverage)
		if err != nil {
			return 0
		}
		return c
	}
	if n < m0 || conf(m0) < confidence {
		return 0, 0, 0, false
	}
	lo, hi := m0, n+1 // conf(lo) ≥ confidence; hi: beyond n
	for hi-lo > 1 {
		mid := lo + (hi-lo)/2
		if conf(mid) >= confidence {
			lo = mid
		} else {
			hi = mid
		}
	}
	r, s = split(lo)
	return r, s, conf(lo), true
}
