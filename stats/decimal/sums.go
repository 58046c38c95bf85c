package decimal

import (
	"math"
	"math/big"
	"math/bits"
)

// Exact sums of decimal data.
//
// The sums of the first four powers of the mantissas about a centre are
// kept exactly (192-bit accumulators, big integers at the end), so that the
// mean, the variance, the SD and the shape moments are the correctly
// rounded values of the decimal data as typed (the method of the NIST StRD
// certified values, which are exact in decimal arithmetic).

// Moments are the mean and the variance of the values, each the correctly
// rounded value of the exact figure (the SDs rounded from 256-bit square
// roots).
type Moments struct {
	N     int
	Mean  float64
	VarN1 float64 // divisor n-1 (0 when n < 2)
	VarN  float64 // divisor n
	SD    float64 // sqrt(VarN1)
	PopSD float64 // sqrt(VarN)
}

// Moments combines the sums (taken on grid g) into the mean and variance:
// mean = C + S1/n and n²·var_n = n·S2 - S1² in mantissa units, exactly.
func (ps PowerSums) Moments(g Grid) (mo Moments, ok bool) {
	if ps.N == 0 || ps.S[1] == nil {
		return mo, false
	}
	n := ps.N
	bn := big.NewInt(n)
	scale := g.Denom()
	mo.N = int(n)
	// mean = (C·n + S1) / (n·10^D)
	num := new(big.Int).Mul(big.NewInt(ps.C), bn)
	num.Add(num, ps.S[1])
	mo.Mean = Float64(new(big.Rat).SetFrac(num, new(big.Int).Mul(bn, scale)))
	// A = n·S2 - S1² = n²·var_n·10^(2D)
	A := new(big.Int).Mul(bn, ps.S[2])
	A.Sub(A, new(big.Int).Mul(ps.S[1], ps.S[1]))
	scale2 := new(big.Int).Mul(scale, scale)
	if n >= 2 {
		d1 := new(big.Int).Mul(bn, big.NewInt(n-1))
		d1.Mul(d1, scale2)
		v := new(big.Rat).SetFrac(A, d1)
		mo.VarN1 = Float64(v)
		mo.SD = SqrtRat(v)
	}
	d2 := new(big.Int).Mul(bn, bn)
	d2.Mul(d2, scale2)
	v := new(big.Rat).SetFrac(A, d2)
	mo.VarN = Float64(v)
	mo.PopSD = SqrtRat(v)
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
	// Sorted values come in runs of equal values (measurements repeat):
	// each run's powers are computed once and multiplied by its length.
	for i := 0; i < n; {
		x := sorted[i]
		j := RunEnd(sorted, i)
		cnt := uint64(j - i)
		d := g.M(x) - c
		u := uint64(d)
		if d < 0 {
			u = uint64(-d)
		}
		if u < 1<<15 { // u⁴ < 2^60: one 128-bit product per power
			u2 := u * u
			h, l := bits.Mul64(u, cnt)
			a1.addS128(h, l, d < 0)
			h, l = bits.Mul64(u2, cnt)
			a2.addS128(h, l, false)
			h, l = bits.Mul64(u2*u, cnt)
			a3.addS128(h, l, d < 0)
			h, l = bits.Mul64(u2*u2, cnt)
			a4.addS128(h, l, false)
			i = j
			continue
		}
		for ; i < j; i++ {
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
// g), in mantissa units. Equal neighbours (sorted data) are summed as runs.
func (g Grid) Sum(xs []float64) *big.Int {
	var acc acc192
	// runs of equal values (sorted data) cost one product each
	for i := 0; i < len(xs); {
		x := xs[i]
		j := i + 1
		for j < len(xs) && xs[j] == x {
			j++
		}
		m := g.M(x)
		u := uint64(m)
		if m < 0 {
			u = uint64(-m)
		}
		h, l := bits.Mul64(u, uint64(j-i))
		acc.addS128(h, l, m < 0)
		i = j
	}
	return acc.big()
}
