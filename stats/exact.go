package stats

import (
	"math"
	"math/big"
	"math/bits"
)

// Exact moments of fixed-point decimal data.
//
// Measurement values arrive as decimal text with a fixed number of decimals d.
// Such a value is m/10^d for an integer mantissa m. When |m| < 2^51 and
// d <= 22, m is recovered exactly from the correctly rounded float64 x as
// round(x*10^d): the product carries a relative error of at most 2^-52, so
// less than 1/2 in absolute terms. The recovery is verified by dividing back
// (m/10^d must round to x again). Sums of m and m² are then kept exactly in
// 128-bit integers, one accumulator per decimal count, and combined at the
// end in big integers, so that the mean, the variance and the SD are the
// correctly rounded values of the decimal data as typed (the method of the
// NIST StRD certified values, which are exact in decimal arithmetic).

// maxDec is the largest decimal count handled exactly (10^22 is the largest
// power of ten a float64 holds exactly).
const maxDec = 22

var pow10tab = func() [maxDec + 1]float64 {
	var t [maxDec + 1]float64
	p := 1.0
	for i := range t {
		t[i] = p
		p *= 10
	}
	return t
}()

// acc128 holds the count, the sum (signed 128-bit) and the sum of squares
// (unsigned 128-bit) of the mantissas with one decimal count.
type acc128 struct {
	n          int64
	sLo        uint64
	sHi        int64
	qLo, qHi   uint64
	overflowed bool
}

func (a *acc128) add(m int64) {
	a.n++
	var c uint64
	a.sLo, c = bits.Add64(a.sLo, uint64(m), 0)
	a.sHi += (m >> 63) + int64(c)
	u := uint64(m)
	if m < 0 {
		u = uint64(-m)
	}
	hi, lo := bits.Mul64(u, u)
	a.qLo, c = bits.Add64(a.qLo, lo, 0)
	a.qHi += hi + c
	if a.qHi >= 1<<62 {
		a.overflowed = true
	}
}

func (a *acc128) sum() *big.Int {
	hi := new(big.Int).SetInt64(a.sHi)
	hi.Lsh(hi, 64)
	return hi.Add(hi, new(big.Int).SetUint64(a.sLo))
}

func (a *acc128) sumSq() *big.Int {
	hi := new(big.Int).SetUint64(a.qHi)
	hi.Lsh(hi, 64)
	return hi.Add(hi, new(big.Int).SetUint64(a.qLo))
}

// exactAcc collects the mantissas of fixed-point values by decimal count.
type exactAcc struct {
	ok  bool
	acc [maxDec + 1]acc128
}

// mantissa returns m with x = m/10^d exactly as typed, or ok = false when x
// is not plain fixed-point text the exact path can hold.
func mantissa(x float64, d int8) (int64, bool) {
	if d < 0 || d > maxDec {
		return 0, false
	}
	p := pow10tab[d]
	f := x * p
	if !(math.Abs(f) < 1<<51) {
		return 0, false
	}
	m := int64(math.RoundToEven(f))
	if float64(m)/p != x {
		return 0, false
	}
	return m, true
}

// moments is the outcome of the first-pass arithmetic.
type moments struct {
	n      int
	mean   float64
	varN1  float64 // divisor n-1 (0 when n < 2)
	varN   float64 // divisor n
	sd     float64 // sqrt(varN1), correctly rounded on the exact path
	popSD  float64
	exact  bool // computed exactly from the decimal mantissas
	varInf bool // the variance does not fit a float64 (the SD may)
	decMax int  // largest decimal count (exact path)
}

// exactMoments combines the accumulators into correctly rounded moments.
func (e *exactAcc) moments() (moments, bool) {
	if !e.ok {
		return moments{}, false
	}
	D := -1
	var n int64
	for d := range e.acc {
		if e.acc[d].n > 0 {
			if e.acc[d].overflowed {
				return moments{}, false
			}
			D = d
			n += e.acc[d].n
		}
	}
	if D < 0 || n == 0 {
		return moments{}, false
	}
	S := new(big.Int)
	Q := new(big.Int)
	ten := big.NewInt(10)
	for d := 0; d <= D; d++ {
		a := &e.acc[d]
		if a.n == 0 {
			continue
		}
		k := new(big.Int).Exp(ten, big.NewInt(int64(D-d)), nil)
		s := a.sum()
		s.Mul(s, k)
		S.Add(S, s)
		q := a.sumSq()
		q.Mul(q, k)
		q.Mul(q, k)
		Q.Add(Q, q)
	}
	scale := new(big.Int).Exp(ten, big.NewInt(int64(D)), nil) // 10^D
	bn := big.NewInt(n)
	mo := moments{n: int(n), exact: true, decMax: D}
	// mean = S / (n 10^D)
	den := new(big.Int).Mul(bn, scale)
	mo.mean, _ = new(big.Rat).SetFrac(S, den).Float64()
	// n Q - S^2 = n^2 * (sum of squared deviations) * 10^(2D)
	num := new(big.Int).Mul(bn, Q)
	num.Sub(num, new(big.Int).Mul(S, S))
	scale2 := new(big.Int).Mul(scale, scale)
	if n >= 2 {
		d1 := new(big.Int).Mul(bn, big.NewInt(n-1))
		d1.Mul(d1, scale2)
		mo.varN1, _ = new(big.Rat).SetFrac(num, d1).Float64()
		mo.sd = sqrtRat(num, d1)
	}
	d2 := new(big.Int).Mul(bn, bn)
	d2.Mul(d2, scale2)
	mo.varN, _ = new(big.Rat).SetFrac(num, d2).Float64()
	mo.popSD = sqrtRat(num, d2)
	return mo, true
}

// sqrtRat returns sqrt(num/den) rounded to float64 from a 200-bit result.
func sqrtRat(num, den *big.Int) float64 {
	if num.Sign() <= 0 {
		return 0
	}
	const prec = 200
	a := new(big.Float).SetPrec(prec).SetInt(num)
	b := new(big.Float).SetPrec(prec).SetInt(den)
	a.Quo(a, b)
	a.Sqrt(a)
	f, _ := a.Float64()
	return f
}

// compensatedMoments is the fallback for data that are not fixed-point
// decimal text: values are scaled by a power of two (so that neither
// squares nor sums overflow or underflow), the mean is a Neumaier
// compensated sum (Neumaier 1974), and the sum of squared deviations uses
// the corrected two-pass algorithm (Chan, Golub and LeVeque 1983, eq. 1.7).
// sorted must be sorted ascending (used for the scale only).
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
	s := math.Ldexp(1, -e) // amax*s in [0.5, 1)
	var sum, c float64
	for _, x := range xs {
		y := x * s
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
		d := x*s - my
		ss += d * d
		sd += d
	}
	ss -= sd * sd / float64(n)
	if ss < 0 {
		ss = 0
	}
	mo.mean = my / s
	if n >= 2 {
		v := ss / float64(n-1)
		mo.sd = math.Sqrt(v) / s
		mo.varN1 = v / s / s
	}
	vN := ss / float64(n)
	mo.popSD = math.Sqrt(vN) / s
	mo.varN = vN / s / s
	if math.IsInf(mo.varN1, 0) || math.IsInf(mo.varN, 0) {
		mo.varInf = true
	}
	return mo
}
