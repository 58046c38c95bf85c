package decimal

import (
	"math"
	"math/big"
	"math/bits"
)

// Exact sums of decimal data.
//
// Sums of m and m² are kept exactly in 128-bit integers, one accumulator
// per decimal count, while the reader's values stream past (before any
// sorting), and combined at the end in big integers, so that the mean, the
// variance and the SD are the correctly rounded values of the decimal data
// as typed (the method of the NIST StRD certified values, which are exact in
// decimal arithmetic). PowerSums adds the third and fourth powers about a
// centre, for the shape statistics.

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

// Sums collects plain decimal values (value and decimal count as the reader
// gives them). The zero value is ready to use.
type Sums struct {
	bad bool
	acc [MaxScale + 1]acc128
}

// Add adds x typed with d decimals (d < 0: not a plain decimal, which makes
// the sums unusable).
func (s *Sums) Add(x float64, d int8) {
	if s.bad {
		return
	}
	m, ok := Mantissa(x, int(d))
	if !ok {
		s.bad = true
		return
	}
	s.acc[d].add(m)
}

// OK tells whether every value added was a plain decimal held exactly.
func (s *Sums) OK() bool { return !s.bad }

// Moments are the mean and the variance of the values, each the correctly
// rounded value of the exact figure (SD: rounded from a 200-bit square root).
type Moments struct {
	N     int
	Mean  float64
	VarN1 float64 // divisor n-1 (0 when n < 2)
	VarN  float64 // divisor n
	SD    float64 // sqrt(VarN1)
	PopSD float64 // sqrt(VarN)
	Scale int     // the largest decimal count seen
}

// Moments combines the accumulators; ok is false when a value was not a
// plain decimal, nothing was added, or a sum overflowed its 128 bits.
func (s *Sums) Moments() (mo Moments, ok bool) {
	if s.bad {
		return mo, false
	}
	D := -1
	var n int64
	for d := range s.acc {
		if s.acc[d].n > 0 {
			if s.acc[d].overflowed {
				return mo, false
			}
			D = d
			n += s.acc[d].n
		}
	}
	if D < 0 || n == 0 {
		return mo, false
	}
	S := new(big.Int)
	Q := new(big.Int)
	ten := big.NewInt(10)
	for d := 0; d <= D; d++ {
		a := &s.acc[d]
		if a.n == 0 {
			continue
		}
		k := new(big.Int).Exp(ten, big.NewInt(int64(D-d)), nil)
		sm := a.sum()
		sm.Mul(sm, k)
		S.Add(S, sm)
		q := a.sumSq()
		q.Mul(q, k)
		q.Mul(q, k)
		Q.Add(Q, q)
	}
	scale := new(big.Int).Exp(ten, big.NewInt(int64(D)), nil) // 10^D
	bn := big.NewInt(n)
	mo = Moments{N: int(n), Scale: D}
	// mean = S / (n 10^D)
	den := new(big.Int).Mul(bn, scale)
	mo.Mean, _ = new(big.Rat).SetFrac(S, den).Float64()
	// n Q - S^2 = n^2 * (sum of squared deviations) * 10^(2D)
	num := new(big.Int).Mul(bn, Q)
	num.Sub(num, new(big.Int).Mul(S, S))
	scale2 := new(big.Int).Mul(scale, scale)
	if n >= 2 {
		d1 := new(big.Int).Mul(bn, big.NewInt(n-1))
		d1.Mul(d1, scale2)
		mo.VarN1, _ = new(big.Rat).SetFrac(num, d1).Float64()
		mo.SD = SqrtRat(new(big.Rat).SetFrac(num, d1))
	}
	d2 := new(big.Int).Mul(bn, bn)
	d2.Mul(d2, scale2)
	mo.VarN, _ = new(big.Rat).SetFrac(num, d2).Float64()
	mo.PopSD = SqrtRat(new(big.Rat).SetFrac(num, d2))
	return mo, true
}

// SqrtRat is sqrt(r) rounded to float64 from a 256-bit result (0 for r <= 0).
func SqrtRat(r *big.Rat) float64 {
	if r.Sign() <= 0 {
		return 0
	}
	const prec = 256
	a := new(big.Float).SetPrec(prec).SetInt(r.Num())
	b := new(big.Float).SetPrec(prec).SetInt(r.Denom())
	a.Quo(a, b)
	a.Sqrt(a)
	f, _ := a.Float64()
	return f
}

// PowerSums are the exact sums of (m - C)^k, k = 1..4, over the mantissas
// m of n values on a grid, about the centre C (a mantissa near the middle,
// so that the powers stay small).
type PowerSums struct {
	N int64
	C int64
	S [5]*big.Int // S[k] = Σ (m - C)^k; S[0] unused
}

// acc192 is a two's-complement 192-bit accumulator.
type acc192 struct{ w0, w1, w2 uint64 }

func (a *acc192) addS128(hi, lo uint64, neg bool) {
	if neg { // two's complement of the 128-bit magnitude, sign-extended
		lo = ^lo + 1
		hi = ^hi
		if lo == 0 {
			hi++
		}
	}
	var c uint64
	a.w0, c = bits.Add64(a.w0, lo, 0)
	a.w1, c = bits.Add64(a.w1, hi, c)
	ext := uint64(0)
	if neg {
		ext = math.MaxUint64
	}
	a.w2, _ = bits.Add64(a.w2, ext, c)
}

func (a *acc192) big() *big.Int {
	neg := a.w2>>63 == 1
	w0, w1, w2 := a.w0, a.w1, a.w2
	if neg { // magnitude
		w0 = ^w0 + 1
		w1 = ^w1
		w2 = ^w2
		if w0 == 0 {
			w1++
			if w1 == 0 {
				w2++
			}
		}
	}
	r := new(big.Int).SetUint64(w2)
	r.Lsh(r, 64)
	r.Or(r, new(big.Int).SetUint64(w1))
	r.Lsh(r, 64)
	r.Or(r, new(big.Int).SetUint64(w0))
	if neg {
		r.Neg(r)
	}
	return r
}

// PowerSums computes the sums over the ascending slice, which must lie on g.
// The deviations d = m - C of magnitude below 2^31 go through 64- and
// 128-bit products into 192-bit accumulators (no allocation); larger ones
// (a spread of more than two billion steps) through big integers.
func (g Grid) PowerSums(sorted []float64) PowerSums {
	n := len(sorted)
	ps := PowerSums{N: int64(n)}
	for k := range ps.S {
		ps.S[k] = new(big.Int)
	}
	if n == 0 {
		return ps
	}
	c := g.M(sorted[n/2])
	ps.C = c
	var a1, a2, a3, a4 acc192
	var bd, bp, bt *big.Int
	for _, x := range sorted {
		d := g.M(x) - c
		u := uint64(d)
		if d < 0 {
			u = uint64(-d)
		}
		if u < 1<<31 {
			u2 := u * u
			a1.addS128(0, u, d < 0)
			a2.addS128(0, u2, false)
			h, l := bits.Mul64(u2, u)
			a3.addS128(h, l, d < 0)
			h, l = bits.Mul64(u2, u2)
			a4.addS128(h, l, false)
			continue
		}
		if bd == nil {
			bd, bp, bt = new(big.Int), new(big.Int), new(big.Int)
		}
		bd.SetInt64(d)
		bp.Set(bd)
		for k := 1; k <= 4; k++ {
			if k > 1 {
				bp.Mul(bp, bd)
			}
			ps.S[k].Add(ps.S[k], bt.Set(bp))
		}
	}
	ps.S[1].Add(ps.S[1], a1.big())
	ps.S[2].Add(ps.S[2], a2.big())
	ps.S[3].Add(ps.S[3], a3.big())
	ps.S[4].Add(ps.S[4], a4.big())
	return ps
}

// CentralSums are n·M2, n²·M3 and n³·M4 for the central sums of powers
// Mk = Σ (x - mean)^k in mantissa units: integers, exactly.
func (ps PowerSums) CentralSums() (a, b, c *big.Int) {
	n := big.NewInt(ps.N)
	s1, s2, s3, s4 := ps.S[1], ps.S[2], ps.S[3], ps.S[4]
	t := new(big.Int)
	// A = n S2 - S1²
	a = new(big.Int).Mul(n, s2)
	a.Sub(a, t.Mul(s1, s1))
	// B = n² S3 - 3 n S1 S2 + 2 S1³
	n2 := new(big.Int).Mul(n, n)
	b = new(big.Int).Mul(n2, s3)
	t.Mul(n, s1)
	t.Mul(t, s2)
	t.Mul(t, big.NewInt(3))
	b.Sub(b, t)
	t.Mul(s1, s1)
	t.Mul(t, s1)
	t.Mul(t, big.NewInt(2))
	b.Add(b, t)
	// C = n³ S4 - 4 n² S1 S3 + 6 n S1² S2 - 3 S1⁴
	n3 := new(big.Int).Mul(n2, n)
	c = new(big.Int).Mul(n3, s4)
	t.Mul(n2, s1)
	t.Mul(t, s3)
	t.Mul(t, big.NewInt(4))
	c.Sub(c, t)
	s1sq := new(big.Int).Mul(s1, s1)
	t.Mul(n, s1sq)
	t.Mul(t, s2)
	t.Mul(t, big.NewInt(6))
	c.Add(c, t)
	t.Mul(s1sq, s1sq)
	t.Mul(t, big.NewInt(3))
	c.Sub(c, t)
	return a, b, c
}

// Sum is the exact sum of the mantissas of the values (which must lie on
// g), in mantissa units.
func (g Grid) Sum(xs []float64) *big.Int {
	var lo uint64
	var hi int64
	for _, x := range xs {
		m := g.M(x)
		var c uint64
		lo, c = bits.Add64(lo, uint64(m), 0)
		hi += (m >> 63) + int64(c)
	}
	r := new(big.Int).SetInt64(hi)
	r.Lsh(r, 64)
	return r.Add(r, new(big.Int).SetUint64(lo))
}
