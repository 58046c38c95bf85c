package stats

import (
	"math"
	"strconv"
)

// QuantileMethods lists the quantile definitions the engine knows: the nine
// sample quantiles of Hyndman and Fan (1996, The American Statistician 50,
// 361-365) and Tukey's hinges (Tukey 1977, Exploratory Data Analysis).
var QuantileMethods = []string{"hf1", "hf2", "hf3", "hf4", "hf5", "hf6", "hf7", "hf8", "hf9", "tukey"}

// quantileNames are the plain names shown beside each definition.
var quantileNames = map[string]string{
	"hf1":   "Hyndman-Fan type 1: inverse of the empirical distribution function",
	"hf2":   "Hyndman-Fan type 2: inverse of the empirical distribution function, averaged at discontinuities",
	"hf3":   "Hyndman-Fan type 3: nearest even order statistic",
	"hf4":   "Hyndman-Fan type 4: linear interpolation of the empirical distribution function, p = k/n",
	"hf5":   "Hyndman-Fan type 5: piecewise linear, p = (k - 1/2)/n",
	"hf6":   "Hyndman-Fan type 6: p = k/(n + 1)",
	"hf7":   "Hyndman-Fan type 7: p = (k - 1)/(n - 1)",
	"hf8":   "Hyndman-Fan type 8: median-unbiased, p = (k - 1/3)/(n + 1/3)",
	"hf9":   "Hyndman-Fan type 9: normal-unbiased, p = (k - 3/8)/(n + 1/4)",
	"tukey": "Tukey's hinges (quartiles only; other percentiles by type 7)",
}

// hfType returns the Hyndman-Fan type number of a method name (1..9), 0 for
// "tukey" and -1 for an unknown name.
func hfType(method string) int {
	if method == "tukey" {
		return 0
	}
	if len(method) == 3 && method[:2] == "hf" {
		if t, err := strconv.Atoi(method[2:]); err == nil && t >= 1 && t <= 9 {
			return t
		}
	}
	return -1
}

// quantileHF is sample quantile type t (1..9) of Hyndman and Fan (1996) at
// probability p of the ascending slice x (n >= 1). It follows the
// arithmetic of R's quantile() (R 4.2.2) step by step, including its fuzz
// for types 4 to 9, so that results agree to the last bit where possible.
func quantileHF(x []float64, p float64, t int) float64 {
	n := len(x)
	if n == 0 {
		return math.NaN()
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

// hinges are Tukey's lower hinge, median and upper hinge, computed as R's
// fivenum() does (R 4.2.2).
func hinges(x []float64) (lo, med, hi float64) {
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

// quantile is the chosen definition at p; "tukey" uses the hinges for the
// quartiles and type 7 elsewhere.
func quantile(x []float64, p float64, method string) float64 {
	t := hfType(method)
	if t == 0 {
		switch p {
		case 0.25:
			lo, _, _ := hinges(x)
			return lo
		case 0.5:
			_, m, _ := hinges(x)
			return m
		case 0.75:
			_, _, hi := hinges(x)
			return hi
		}
		t = 7
	}
	return quantileHF(x, p, t)
}

// quartiles under one definition.
func quartiles(x []float64, method string) QuartileSet {
	if hfType(method) == 0 {
		lo, m, hi := hinges(x)
		return QuartileSet{Method: method, Q1: lo, Median: m, Q3: hi}
	}
	t := hfType(method)
	return QuartileSet{Method: method, Q1: quantileHF(x, 0.25, t), Median: quantileHF(x, 0.5, t), Q3: quantileHF(x, 0.75, t)}
}
