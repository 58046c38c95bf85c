package method

import (
	"math"

	"gonum.org/v1/gonum/mathext"
)

// The sampling distributions the methods use (Student's t, chi-square, F,
// beta and the binomial with p = 1/2), each a few lines on gonum's mathext:
// the regularized incomplete beta and gamma functions and their inverses.
// They are written with the same expressions as gonum's stat/distuv v0.17.0
// for these standard forms, and TestDistributionsLikeDistuv holds them to
// distuv bit for bit. The engine does not import distuv itself: distuv
// imports gonum's stat package, which brings mat, lapack, blas and
// convex/lp into the WebAssembly and sets up mat's pools when the engine
// starts. Unlike distuv, a probability outside [0, 1] gives NaN, not a
// panic.

// tSurvival is P(T > x) for Student's t with nu degrees of freedom.
func tSurvival(nu, x float64) float64 {
	if x == 0 {
		return 0.5
	}
	t := nu / (x*x + nu)
	if x > 0 {
		return 0.5 * mathext.RegIncBeta(nu/2, 0.5, t)
	}
	return 1 - 0.5*mathext.RegIncBeta(nu/2, 0.5, t)
}

// tQuantile is the p-quantile of Student's t with nu degrees of freedom.
func tQuantile(nu, p float64) float64 {
	if !(p >= 0 && p <= 1) {
		return math.NaN()
	}
	if p == 0.5 {
		return 0
	}
	if p > 0.5 {
		t := mathext.InvRegIncBeta(nu/2, 0.5, 2*(1-p))
		return math.Sqrt(nu*(1-t)/t) + 0 // + 0 as distuv's y·σ + μ: -0 becomes 0
	}
	t := mathext.InvRegIncBeta(nu/2, 0.5, 2*p)
	return -math.Sqrt(nu*(1-t)/t) + 0
}

// chiSquaredSurvival is P(X > x) for chi-square with k degrees of freedom.
func chiSquaredSurvival(k, x float64) float64 {
	if x < 0 {
		return 1
	}
	return mathext.GammaIncRegComp(0.5*k, 0.5*x)
}

// chiSquaredQuantile is the p-quantile of chi-square with k degrees of
// freedom.
func chiSquaredQuantile(k, p float64) float64 {
	if !(p >= 0 && p <= 1) {
		return math.NaN()
	}
	return mathext.GammaIncRegInv(0.5*k, p) * 2
}

// fCDF is P(X <= x) for the F distribution with d1 and d2 degrees of
// freedom.
func fCDF(d1, d2, x float64) float64 {
	return mathext.RegIncBeta(d1/2, d2/2, d1*x/(d1*x+d2))
}

// fSurvival is 1 - fCDF, as distuv computes it.
func fSurvival(d1, d2, x float64) float64 { return 1 - fCDF(d1, d2, x) }

// fQuantile is the p-quantile of the F distribution with d1 and d2 degrees
// of freedom.
func fQuantile(d1, d2, p float64) float64 {
	if !(p >= 0 && p <= 1) {
		return math.NaN()
	}
	y := mathext.InvRegIncBeta(0.5*d1, 0.5*d2, p)
	return d2 * y / (d1 * (1 - y))
}

// betaQuantile is the p-quantile of the beta distribution with shapes a
// and b.
func betaQuantile(a, b, p float64) float64 {
	if !(p >= 0 && p <= 1) {
		return math.NaN()
	}
	return mathext.InvRegIncBeta(a, b, p)
}

// BinomialHalfCDF is P(B <= k) for B ~ Binomial(n, 1/2): the regularized
// incomplete beta I_{1/2}(n-k, k+1).
func BinomialHalfCDF(k, n int) float64 {
	x, fn := float64(k), float64(n)
	if x < 0 {
		return 0
	}
	if x >= fn {
		return 1
	}
	return mathext.RegIncBeta(fn-x, x+1, 1-0.5)
}
