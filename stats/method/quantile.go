// Package method holds the statistical methods of Lotlens as plain
// functions, in the spirit of gonum's stat package: slices and numbers in,
// numbers (or small structs of numbers defined here) out. No report types,
// no sentences. Each function's doc comment names its published source.
// Where the data are decimals typed by the user, the functions that decide
// something on them (quantile positions, fences, the MAD, ties in rank
// tests) take exact values from package decimal or integer-valued input.
package method

import (
	"math"
	"math/big"
)

// QuantileDef is a sample quantile definition: types 1 to 9 of Hyndman and
// Fan (1996, "Sample quantiles in statistical packages", The American
// Statistician 50, 361-365), or Tukey's hinges (Tukey 1977, Exploratory
// Data Analysis) for the quartiles.
type QuantileDef int

// The definitions.
const (
	HF1 QuantileDef = iota + 1
	HF2
	HF3
	HF4
	HF5
	HF6
	HF7
	HF8
	HF9
	TukeyHinges
)

// Prob is a probability as an exact decimal fraction Num/Den (0.25 = 1/4,
// 0.00135 = 135/100000), so that no binary rounding of p moves a quantile
// to another order statistic.
type Prob struct{ Num, Den int64 }

// Float is p as a float64.
func (p Prob) Float() float64 { return float64(p.Num) / float64(p.Den) }

// QuantilePos says where a sample quantile of n ascending values x lies:
// x[Lo] + (GNum/GDen)·(x[Hi] - x[Lo]), 0-based indices, 0 <= GNum <= GDen.
// Every definition of Hyndman and Fan (1996) and Tukey's hinges has this
// form with a rational weight.
type QuantilePos struct {
	Lo, Hi     int
	GNum, GDen int64
}

// Float is the quantile of the ascending slice at pos in binary floating
// point.
func (pos QuantilePos) Float(sorted []float64) float64 {
	lo, hi := sorted[pos.Lo], sorted[pos.Hi]
	switch {
	case pos.GNum == 0 || lo == hi:
		return lo
	case pos.GNum == pos.GDen:
		return hi
	}
	h := float64(pos.GNum) / float64(pos.GDen)
	return (1-h)*lo + h*hi
}

// QuantileAt is the position of the sample quantile of definition def at
// probability p for n >= 1 values, computed exactly in rational arithmetic
// following the definitions of Hyndman and Fan (1996) as R's quantile()
// (R 4.2.2) writes them: for types 1-3 j = ⌊np + m⌋ (m = 0, 0, -1/2) with
// the weight 0, 1/2 or 1; for types 4-9 j = ⌊a + p(n + 1 - a - b)⌋ and the
// weight its fractional part, with (a, b) = (0, 1), (1/2, 1/2), (0, 0),
// (1, 1), (1/3, 1/3), (3/8, 3/8). Indices beyond the data are clamped to
// the first or last value. TukeyHinges gives the hinges at p = 1/4 and 3/4
// (R's fivenum()), the median at 1/2, and type 7 elsewhere.
func QuantileAt(n int, p Prob, def QuantileDef) QuantilePos {
	if n < 1 || p.Den <= 0 {
		return QuantilePos{GDen: 1}
	}
	if p.Num < 0 {
		p.Num = 0
	}
	if p.Num > p.Den {
		p.Num = p.Den
	}
	if def == TukeyHinges {
		r := new(big.Rat).SetFrac64(p.Num, p.Den)
		var d float64
		n4 := math.Floor(float64(n+3)/2) / 2
		switch {
		case r.Cmp(big.NewRat(1, 4)) == 0:
			d = n4
		case r.Cmp(big.NewRat(1, 2)) == 0:
			d = float64(n+1) / 2
		case r.Cmp(big.NewRat(3, 4)) == 0:
			d = float64(n+1) - n4
		default:
			return QuantileAt(n, p, HF7)
		}
		lo, hi := int(math.Floor(d))-1, int(math.Ceil(d))-1
		if lo == hi {
			return QuantilePos{Lo: lo, Hi: hi, GDen: 1}
		}
		return QuantilePos{Lo: lo, Hi: hi, GNum: 1, GDen: 2}
	}
	P := new(big.Rat).SetFrac64(p.Num, p.Den)
	N := new(big.Rat).SetInt64(int64(n))
	nppm := new(big.Rat)
	var gNum, gDen int64
	var j int64
	if def <= HF3 {
		nppm.Mul(N, P)
		if def == HF3 {
			nppm.Sub(nppm, big.NewRat(1, 2))
		}
		j = qntFloor(nppm)
		frac := new(big.Rat).Sub(nppm, new(big.Rat).SetInt64(j)).Sign() != 0
		gDen = 1
		switch def {
		case HF1:
			if frac {
				gNum = 1
			}
		case HF2:
			if frac {
				gNum = 1
			} else {
				gNum, gDen = 1, 2
			}
		default:
			if frac || j%2 != 0 {
				gNum = 1
			}
		}
	} else {
		var a, b *big.Rat
		switch def {
		case HF4:
			a, b = big.NewRat(0, 1), big.NewRat(1, 1)
		case HF5:
			a, b = big.NewRat(1, 2), big.NewRat(1, 2)
		case HF6:
			a, b = big.NewRat(0, 1), big.NewRat(0, 1)
		case HF8:
			a, b = big.NewRat(1, 3), big.NewRat(1, 3)
		case HF9:
			a, b = big.NewRat(3, 8), big.NewRat(3, 8)
		default:
			a, b = big.NewRat(1, 1), big.NewRat(1, 1)
		}
		// nppm = a + p (n + 1 - a - b)
		t := new(big.Rat).Add(N, big.NewRat(1, 1))
		t.Sub(t, a)
		t.Sub(t, b)
		nppm.Mul(P, t)
		nppm.Add(nppm, a)
		j = qntFloor(nppm)
		h := new(big.Rat).Sub(nppm, new(big.Rat).SetInt64(j))
		gNum, gDen = h.Num().Int64(), h.Denom().Int64()
	}
	// R: x padded with x[1] twice in front and x[n] twice behind; the
	// value is between the (1-based) order statistics j and j+1.
	clamp := func(k int64) int {
		if k < 1 {
			k = 1
		}
		if k > int64(n) {
			k = int64(n)
		}
		return int(k) - 1
	}
	lo, hi := clamp(j), clamp(j+1)
	if gNum == 0 || lo == hi {
		return QuantilePos{Lo: lo, Hi: lo, GDen: 1}
	}
	if gNum == gDen {
		return QuantilePos{Lo: hi, Hi: hi, GDen: 1}
	}
	return QuantilePos{Lo: lo, Hi: hi, GNum: gNum, GDen: gDen}
}

// qntFloor is ⌊r⌋.
func qntFloor(r *big.Rat) int64 {
	q, _ := new(big.Int).DivMod(r.Num(), r.Denom(), new(big.Int))
	return q.Int64()
}

// Quantile is sample quantile type def (HF1..HF9) of Hyndman and Fan
// (1996) at probability p of the ascending slice x (n >= 1) in binary
// floating point. It follows the arithmetic of R's quantile() (R 4.2.2)
// step by step, including its fuzz for types 4 to 9, so that results agree
// to the last bit where possible: the path for data that are not plain
// decimals. TukeyHinges gives Hinges at 1/4, 1/2, 3/4 and type 7 elsewhere.
func Quantile(x []float64, p float64, def QuantileDef) float64 {
	n := len(x)
	if n == 0 {
		return math.NaN()
	}
	t := int(def)
	if def == TukeyHinges {
		lo, m, hi := Hinges(x)
		switch p {
		case 0.25:
			return lo
		case 0.5:
			return m
		case 0.75:
			return hi
		}
		t = 7
	}
	p = math.Max(0, math.Min(1, p))
	// at(k) is x[k] with 1-based k clamped to [1, n] (R pads x at both ends)
	at := func(k float64) float64 {
		i := int(k) - 1
		if i < 0 {
			i = 0
		}
		if i > n-1 {
			i = n - 1
		}
		return x[i]
	}
	if t == 7 {
		index := 1 + float64(n-1)*p
		lo := math.Floor(index)
		hi := math.Ceil(index)
		q := at(lo)
		if index > lo && at(hi) != q {
			h := index - lo
			q = (1-h)*q + h*at(hi)
		}
		return q
	}
	var j, h float64
	if t <= 3 {
		nppm := float64(n) * p
		if t == 3 {
			nppm = float64(n)*p - 0.5
		}
		j = math.Floor(nppm)
		switch t {
		case 1:
			if nppm > j {
				h = 1
			}
		case 2:
			if nppm > j {
				h = 1
			} else {
				h = 0.5
			}
		case 3:
			if nppm != j || math.Mod(j, 2) == 1 || math.Mod(j, 2) == -1 {
				h = 1
			}
		}
	} else {
		var a, b float64
		switch t {
		case 4:
			a, b = 0, 1
		case 5:
			a, b = 0.5, 0.5
		case 6:
			a, b = 0, 0
		case 8:
			a, b = 1.0/3, 1.0/3
		case 9:
			a, b = 3.0/8, 3.0/8
		default:
			a, b = 1, 1
		}
		const fuzz = 4 * 2.220446049250313e-16
		nppm := a + p*(float64(n)+1-a-b)
		j = math.Floor(nppm + fuzz)
		h = nppm - j
		if math.Abs(h) < fuzz {
			h = 0
		}
	}
	// R: x <- c(x[1], x[1], x, x[n], x[n]); qs <- x[j+2]; x[j+3] when h == 1
	lo := at(j)
	hi := at(j + 1)
	if h == 1 {
		return hi
	}
	if h > 0 && h < 1 && lo != hi {
		return (1-h)*lo + h*hi
	}
	return lo
}

// Hinges are Tukey's (1977) lower hinge, median and upper hinge, computed
// as R's fivenum() does (R 4.2.2).
func Hinges(x []float64) (lo, med, hi float64) {
	n := len(x)
	if n == 0 {
		return math.NaN(), math.NaN(), math.NaN()
	}
	n4 := math.Floor(float64(n+3)/2) / 2
	d := [3]float64{n4, float64(n+1) / 2, float64(n+1) - n4}
	var out [3]float64
	for i, v := range d {
		out[i] = 0.5 * (x[int(math.Floor(v))-1] + x[int(math.Ceil(v))-1])
	}
	return out[0], out[1], out[2]
}

// MedianPos is the position of the usual sample median of the ascending slice: the middle
// value, or the mean of the two middle values for even n (the (n+1)/2-th
// order statistic; Hyndman-Fan types 2, 5, 6, 7, 8 and 9 and Tukey's
// hinges all agree with it, types 1, 3 and 4 take the lower middle value).
func MedianPos(n int) QuantilePos {
	if n%2 == 1 || n == 0 {
		return QuantilePos{Lo: n / 2, Hi: n / 2, GDen: 1}
	}
	return QuantilePos{Lo: n/2 - 1, Hi: n / 2, GNum: 1, GDen: 2}
}
