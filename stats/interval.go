package stats

import (
	"math"

	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/stat/distuv"
)

// meanCI is the Student t interval for the mean (Student 1908):
// mean ± t(1-α/2, n-1) · s/√n.
func meanCI(mean, sd float64, n int, conf float64) *Interval {
	if n < 2 || !(sd > 0) {
		return nil
	}
	t := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(n - 1)}.Quantile(1 - (1-conf)/2)
	h := t * (sd / math.Sqrt(float64(n)))
	return &Interval{Lo: mean - h, Hi: mean + h, Level: conf, Method: "student-t"}
}

// sdCI is the chi-square interval for the standard deviation of a normal
// population: s·sqrt((n-1)/χ²(1-α/2, n-1)) to s·sqrt((n-1)/χ²(α/2, n-1))
// (e.g. Montgomery, Introduction to Statistical Quality Control, 2009, 4.3).
// It assumes normal data; the report's shape tests say whether that holds.
func sdCI(sd float64, n int, conf float64) *Interval {
	if n < 2 || !(sd > 0) {
		return nil
	}
	a := 1 - conf
	k := float64(n - 1)
	chi := distuv.ChiSquared{K: k}
	hiQ := chi.Quantile(1 - a/2)
	loQ := chi.Quantile(a / 2)
	if !(loQ > 0) || !(hiQ > 0) {
		return nil
	}
	return &Interval{Lo: sd * math.Sqrt(k/hiQ), Hi: sd * math.Sqrt(k/loQ), Level: conf, Method: "chi-square"}
}

// binomHalfCDF is P(B <= k) for B ~ Binomial(n, 1/2), through the
// regularized incomplete beta function: I_{1/2}(n-k, k+1).
func binomHalfCDF(k, n int) float64 {
	if k < 0 {
		return 0
	}
	if k >= n {
		return 1
	}
	return mathext.RegIncBeta(float64(n-k), float64(k+1), 0.5)
}

// medianCI is the distribution-free interval for the median from order
// statistics (Thompson 1936; Conover, Practical Nonparametric Statistics,
// 1999, 3.2): [x(k), x(n-k+1)] with the largest k such that
// 2·P(B <= k-1) <= α for B ~ Binomial(n, 1/2). The achieved level
// 1 - 2·P(B <= k-1) is reported; it is at least the nominal level except
// when n is too small for any such k, in which case [min, max] is given with
// its lower level and ok is false.
func medianCI(sorted []float64, conf float64) (iv *Interval, ok bool) {
	n := len(sorted)
	if n < 2 {
		return nil, false
	}
	a := 1 - conf
	// start from the normal approximation, then step to the exact k
	z := normQuantile(1 - a/2)
	k := int(math.Floor(float64(n)/2-z*math.Sqrt(float64(n))/2)) + 1
	if k < 1 {
		k = 1
	}
	if k > n/2 {
		k = n / 2
	}
	for k > 1 && 2*binomHalfCDF(k-1, n) > a {
		k--
	}
	for k+1 <= n/2 && 2*binomHalfCDF(k, n) <= a {
		k++
	}
	level := 1 - 2*binomHalfCDF(k-1, n)
	ok = 2*binomHalfCDF(k-1, n) <= a
	return &Interval{Lo: sorted[k-1], Hi: sorted[n-k], Level: level, Method: "order-statistics"}, ok
}
