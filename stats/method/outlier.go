package method

import (
	"math"
	"math/big"
	"sort"

	"lotlens/stats/decimal"
)

// Constants of the suspect-reading rules.
const (
	ModifiedZLimit = 3.5    // Iglewicz and Hoaglin (1993)
	ModifiedZConst = 0.6745 // Iglewicz and Hoaglin (1993): Φ⁻¹(0.75), rounded as published
	MADScale       = 1.4826 // Hampel (1974): 1/Φ⁻¹(0.75), rounded as usually published
)

// TukeyFences are Tukey's (1977, Exploratory Data Analysis) fences k IQR
// beyond the quartiles: q1 - k(q3-q1) and q3 + k(q3-q1) (k = 1.5 inner,
// 3 outer: common practice).
func TukeyFences(q1, q3, k float64) (lo, hi float64) {
	iqr := q3 - q1
	return q1 - k*iqr, q3 + k*iqr
}

// TukeyFencesExact are TukeyFences in exact rational arithmetic, for
// quartiles that are exact decimals: a reading on a fence is on it, not
// beyond (11.30 with quartiles 10.00 and 10.52).
func TukeyFencesExact(q1, q3, k *big.Rat) (lo, hi *big.Rat) {
	iqr := new(big.Rat).Sub(q3, q1)
	d := new(big.Rat).Mul(k, iqr)
	return new(big.Rat).Sub(q1, d), new(big.Rat).Add(q3, d)
}

// AdjustedBoxFences are the fences of the adjusted box plot of Hubert and
// Vandervieren (2008), "An adjusted boxplot for skewed distributions",
// Comput. Stat. Data Anal. 52, 5186-5201: Q1 - 1.5·e^{-4MC}·IQR and
// Q3 + 1.5·e^{3MC}·IQR for medcouple MC >= 0, Q1 - 1.5·e^{-3MC}·IQR and
// Q3 + 1.5·e^{4MC}·IQR for MC < 0.
func AdjustedBoxFences(q1, q3, mc float64) (lo, hi float64) {
	iqr := q3 - q1
	if mc >= 0 {
		return q1 - 1.5*math.Exp(-4*mc)*iqr, q3 + 1.5*math.Exp(3*mc)*iqr
	}
	return q1 - 1.5*math.Exp(-3*mc)*iqr, q3 + 1.5*math.Exp(4*mc)*iqr
}

// ModifiedZHalfWidthExact is the distance from the median beyond which
// the modified z-score |0.6745(x - median)/MAD| exceeds 3.5 (Iglewicz and
// Hoaglin 1993, How to Detect and Handle Outliers, ASQC), exactly:
// 3.5·MAD/0.6745 = 35000·MAD/6745, MAD the raw median absolute deviation.
func ModifiedZHalfWidthExact(mad *big.Rat) *big.Rat {
	return new(big.Rat).Mul(mad, big.NewRat(35000, 6745))
}

// ModifiedZHalfWidth is ModifiedZHalfWidthExact in binary floating point.
func ModifiedZHalfWidth(mad float64) float64 { return ModifiedZLimit * mad / ModifiedZConst }

// MedianAbsDev is the raw median absolute deviation from med (Hampel 1974)
// of the ascending slice, in O(n): the deviations below and above med are
// two sorted runs, merged up to the middle rank.
func MedianAbsDev(sorted []float64, med float64) float64 {
	n := len(sorted)
	if n == 0 {
		return 0
	}
	s := sort.SearchFloat64s(sorted, med)
	i, j := s-1, s // next deviation from each run
	next := func() float64 {
		var d float64
		if j >= n || (i >= 0 && med-sorted[i] <= sorted[j]-med) {
			d = med - sorted[i]
			i--
		} else {
			d = sorted[j] - med
			j++
		}
		return d
	}
	var a float64
	for k := 0; k <= (n-1)/2; k++ {
		a = next()
	}
	if n%2 == 1 {
		return a
	}
	b := next()
	return a/2 + b/2
}

// MedianAbsDevExact is MedianAbsDev on the decimals as typed: the ascending
// slice lies on g and med2 is twice the median in mantissa units (an
// integer: the median is a value or the mean of two). The deviations
// |2m - med2| are integers, merged as in MedianAbsDev; the result is exact.
func MedianAbsDevExact(sorted []float64, g decimal.Grid, med2 int64) *big.Rat {
	n := len(sorted)
	if n == 0 {
		return new(big.Rat)
	}
	// first index with 2m >= med2
	lo := sort.Search(n, func(h int) bool { return 2*g.M(sorted[h]) >= med2 })
	// the deviations in ascending order, from the two sides of the median
	// (below: lo-1 down, above: lo up), a run of equal readings at a time
	// (a long run costs a few comparisons, decimal.RunStart and RunEnd): a
	// is the deviation at position (n-1)/2 of that order, b at the next
	i, j := lo-1, lo
	k := (n - 1) / 2
	var a, b int64
	for taken := 0; taken <= k+1 && (i >= 0 || j < n); {
		var d int64
		var cnt int
		if j >= n || (i >= 0 && med2-2*g.M(sorted[i]) <= 2*g.M(sorted[j])-med2) {
			d = med2 - 2*g.M(sorted[i])
			s := decimal.RunStart(sorted, i)
			cnt, i = i-s+1, s-1
		} else {
			d = 2*g.M(sorted[j]) - med2
			e := decimal.RunEnd(sorted, j)
			cnt, j = e-j, e
		}
		if taken <= k && k < taken+cnt {
			a = d
		}
		if taken <= k+1 && k+1 < taken+cnt {
			b = d
		}
		taken += cnt
	}
	den := new(big.Int).Mul(big.NewInt(2), g.Denom())
	num := big.NewInt(a)
	if n%2 == 0 {
		num.Add(num, big.NewInt(b))
		den.Mul(den, big.NewInt(2))
	}
	return new(big.Rat).SetFrac(num, den)
}

// GESDStep is one step of the generalized ESD procedure: the index (into
// the ascending slice) of the most extreme remaining value, its Studentized
// deviate R and the critical value Lambda.
type GESDStep struct {
	Index     int
	R, Lambda float64
}

// GESDMaxSuspects is r = min(10, max(1, ⌊n/10⌋)), our cap on the number of
// suspects the generalized ESD tests.
func GESDMaxSuspects(n int) int { return min(10, max(1, n/10)) }

// GESD runs the generalized extreme Studentized deviate procedure of
// Rosner (1983), "Percentage points for a generalized ESD many-outlier
// procedure", Technometrics 25, 165-172, at level alpha for up to r
// suspects on the ascending slice (with r = 1 it is Grubbs' 1969 two-sided
// test). It returns the steps computed (fewer than r when the remaining
// values are all equal) and the number of outliers: the largest i with
// R_i > λ_i. The extremes of the remaining values are always at the two
// ends, so each step is O(1) after one pass for the moments.
func GESD(sorted []float64, alpha float64, r int) (steps []GESDStep, outliers int) {
	n := len(sorted)
	if n < 3 {
		return nil, 0
	}
	var c float64
	for _, x := range sorted {
		c += x
	}
	c /= float64(n)
	if !normalFinite(c) {
		c = sorted[n/2]
	}
	moments := func(lo, hi int) (s1, s2 float64) {
		for _, x := range sorted[lo : hi+1] {
			d := x - c
			s1 += d
			s2 += d * d
		}
		return
	}
	lo, hi := 0, n-1
	s1, s2 := moments(lo, hi)
	steps = make([]GESDStep, 0, r)
	for i := 1; i <= r; i++ {
		nn := hi - lo + 1
		if nn < 3 {
			break
		}
		fn := float64(nn)
		mean := c + s1/fn
		v := (s2 - s1*s1/fn) / (fn - 1)
		if !(v > 0) || !normalFinite(v) {
			break
		}
		sd := math.Sqrt(v)
		dl, dh := mean-sorted[lo], sorted[hi]-mean
		idx := hi
		dev := dh
		if dl > dh {
			idx, dev = lo, dl
		}
		R := dev / sd
		p := 1 - alpha/(2*fn)
		tq := tQuantile(fn-2, p)
		lam := (fn - 1) * tq / math.Sqrt((fn-2+tq*tq)*fn)
		if !normalFinite(R) || !normalFinite(lam) {
			break
		}
		steps = append(steps, GESDStep{Index: idx, R: R, Lambda: lam})
		if R > lam {
			outliers = i
		}
		d := sorted[idx] - c
		ns2 := s2 - d*d
		s1 -= d
		if idx == lo {
			lo++
		} else {
			hi--
		}
		if ns2 < 1e-8*s2 { // cancellation: recompute the sums exactly
			s1, s2 = moments(lo, hi)
		} else {
			s2 = ns2
		}
	}
	return steps, outliers
}
