package stats

import (
	"math"

	"lotlens/stats/decimal"
)

// moments are the mean and variance: exact on the decimals as typed
// (decimal.PowerSums) or, for other data, compensated binary arithmetic
// (compensatedMoments).
type moments struct {
	n      int
	mean   float64
	varN1  float64 // divisor n-1 (0 when n < 2)
	varN   float64 // divisor n
	sd     float64 // sqrt(varN1), correctly rounded on the exact path
	popSD  float64
	exact  bool // computed exactly from the decimal mantissas
	varInf bool // the variance does not fit a float64 (the SD may)
}

func fromDecimal(m decimal.Moments) moments {
	return moments{n: m.N, mean: m.Mean, varN1: m.VarN1, varN: m.VarN, sd: m.SD, popSD: m.PopSD, exact: true}
}

// scaler multiplies by 2^k: by a float64 factor when 2^k is a normal
// number, else (subnormal data, where 2^k exceeds the float64 range) by
// math.Ldexp.
type scaler struct {
	k int
	f float64
}

func newScaler(k int) scaler {
	if k > -1000 && k < 1000 {
		return scaler{k: k, f: math.Ldexp(1, k)}
	}
	return scaler{k: k}
}

func (s scaler) of(x float64) float64 {
	if s.f != 0 {
		return x * s.f
	}
	return math.Ldexp(x, s.k)
}

// compensatedMoments is the fallback for data that are not fixed-point
// decimal text: values are scaled by a power of two (so that neither
// squares nor sums overflow or underflow, subnormal values included), the
// mean is a Neumaier compensated sum (Neumaier 1974), and the sum of
// squared deviations uses the corrected two-pass algorithm (Chan, Golub and
// LeVeque 1983, eq. 1.7). lo and hi are the smallest and largest values.
func compensatedMoments(xs []float64, lo, hi float64) moments {
	n := len(xs)
	mo := moments{n: n}
	if n == 0 {
		return mo
	}
	amax := math.Max(math.Abs(lo), math.Abs(hi))
	if amax == 0 {
		return mo
	}
	_, e := math.Frexp(amax)
	k := -e // amax·2^k in [0.5, 1)
	sc := newScaler(k)
	var sum, c float64
	for _, x := range xs {
		y := sc.of(x)
		t := sum + y
		if math.Abs(sum) >= math.Abs(y) {
			c += (sum - t) + y
		} else {
			c += (y - t) + sum
		}
		sum = t
	}
	my := (sum + c) / float64(n)
	var ss, sd float64
	for _, x := range xs {
		d := sc.of(x) - my
		ss += d * d
		sd += d
	}
	ss -= sd * sd / float64(n)
	if ss < 0 {
		ss = 0
	}
	mo.mean = math.Ldexp(my, -k)
	if n >= 2 {
		v := ss / float64(n-1)
		mo.sd = math.Ldexp(math.Sqrt(v), -k)
		mo.varN1 = math.Ldexp(v, -2*k)
	}
	vN := ss / float64(n)
	mo.popSD = math.Ldexp(math.Sqrt(vN), -k)
	mo.varN = math.Ldexp(vN, -2*k)
	if math.IsInf(mo.varN1, 0) || math.IsInf(mo.varN, 0) {
		mo.varInf = true
	}
	return mo
}
