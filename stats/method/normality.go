package method

import (
	"math"
	"sync"
)

// Validity limits of the normality tests.
const (
	SkewTestMinN = 8    // D'Agostino (1970) skewness test
	KurtTestMinN = 20   // Anscombe and Glynn (1983) kurtosis test
	ShapiroMinN  = 3    // Royston (1995) AS R94
	ShapiroMaxN  = 5000 // Royston (1995) AS R94
	AndersonMinN = 8    // D'Agostino and Stephens (1986), as nortest::ad.test
)

// DAgostinoSkewZ is D'Agostino's (1970) normal approximation for the
// skewness √b1 = g1 (D'Agostino, Belanger and D'Agostino 1990, eq. 1-8).
func DAgostinoSkewZ(g1 float64, n int) (float64, bool) {
	fn := float64(n)
	y := g1 * math.Sqrt((fn+1)*(fn+3)/(6*(fn-2)))
	beta2 := 3 * (fn*fn + 27*fn - 70) * (fn + 1) * (fn + 3) / ((fn - 2) * (fn + 5) * (fn + 7) * (fn + 9))
	w2 := -1 + math.Sqrt(2*(beta2-1))
	delta := 1 / math.Sqrt(0.5*math.Log(w2))
	alpha := math.Sqrt(2 / (w2 - 1))
	r := y / alpha
	z := delta * math.Asinh(r) // ln(r + √(r²+1))
	return z, normalFinite(z)
}

// AnscombeGlynnZ is the Anscombe and Glynn (1983) normal approximation for
// the kurtosis b2 (D'Agostino, Belanger and D'Agostino 1990, eq. 9-14).
func AnscombeGlynnZ(b2 float64, n int) (float64, bool) {
	fn := float64(n)
	eb2 := 3 * (fn - 1) / (fn + 1)
	vb2 := 24 * fn * (fn - 2) * (fn - 3) / ((fn + 1) * (fn + 1) * (fn + 3) * (fn + 5))
	x := (b2 - eb2) / math.Sqrt(vb2)
	sb1 := 6 * (fn*fn - 5*fn + 2) / ((fn + 7) * (fn + 9)) * math.Sqrt(6*(fn+3)*(fn+5)/(fn*(fn-2)*(fn-3)))
	a := 6 + 8/sb1*(2/sb1+math.Sqrt(1+4/(sb1*sb1)))
	den := 1 + x*math.Sqrt(2/(a-4))
	if den == 0 {
		return 0, false
	}
	t := math.Cbrt((1 - 2/a) / den) // signed cube root
	z := ((1 - 2/(9*a)) - t) / math.Sqrt(2/(9*a))
	return z, normalFinite(z)
}

// Table of log Φ for large samples: cubic Hermite interpolation on a grid
// of step 1/512 over [-adTableMax, adTableMax], with the derivative
// φ(z)/Φ(z) at the nodes. The interpolation error is below h^4/384 times
// the largest fourth derivative, about 1e-13 (checked against logNormCDF
// in the tests).
const (
	adTableMax  = 38.0
	adTableStep = 1.0 / 512
	adTableMinN = 200_000 // use the table from this many values on
)

var adLogPhiTab struct {
	once sync.Once
	f, d []float64
}

func adLogPhiTable() ([]float64, []float64) {
	adLogPhiTab.once.Do(func() {
		m := int(2*adTableMax/adTableStep) + 2
		f := make([]float64, m)
		d := make([]float64, m)
		for i := range m {
			z := -adTableMax + float64(i)*adTableStep
			lf := LogNormalCDF(z)
			f[i] = lf
			// φ(z)/Φ(z) = exp(log φ(z) - log Φ(z))
			d[i] = math.Exp(-0.5*z*z - 0.5*math.Log(2*math.Pi) - lf)
		}
		adLogPhiTab.f, adLogPhiTab.d = f, d
	})
	return adLogPhiTab.f, adLogPhiTab.d
}

// adFastLogPhi is log Φ(z) from the table (the direct formula outside it).
func adFastLogPhi(f, d []float64, z float64) float64 {
	if !(z > -adTableMax && z < adTableMax) {
		return LogNormalCDF(z)
	}
	u := (z + adTableMax) / adTableStep
	k := int(u)
	t := u - float64(k)
	t2 := t * t
	t3 := t2 * t
	h00 := 2*t3 - 3*t2 + 1
	h10 := t3 - 2*t2 + t
	h01 := -2*t3 + 3*t2
	h11 := t3 - t2
	return h00*f[k] + h10*adTableStep*d[k] + h01*f[k+1] + h11*adTableStep*d[k+1]
}

// AndersonDarling is the Anderson-Darling statistic A² (Anderson and
// Darling 1954) of the data against the normal distribution with the
// estimated mean and SD, the adjusted A²* = A²(1 + 0.75/n + 2.25/n²) and its
// p-value from D'Agostino and Stephens (1986), Goodness-of-Fit Techniques,
// Table 4.9 (the same piecewise formula as R's nortest::ad.test). One pass:
// Φ is computed once per distinct value; from 200,000 values on, log Φ
// comes from an interpolation table (adFastLogPhi) accurate to about 1e-13.
func AndersonDarling(sorted []float64, mean, sd float64) (a, astar, p float64) {
	n := len(sorted)
	fn := float64(n)
	var s float64
	prev := math.NaN()
	var lp, lq float64
	var tf, td []float64
	if n >= adTableMinN {
		tf, td = adLogPhiTable()
	}
	for i, x := range sorted {
		if x != prev && tf != nil {
			z := (x - mean) / sd
			lp, lq = adFastLogPhi(tf, td, z), adFastLogPhi(tf, td, -z)
			prev = x
		} else if x != prev {
			z := (x - mean) / sd
			if z <= 0 {
				c := NormalCDF(z)
				if c > 1e-300 {
					lp = math.Log(c)
				} else {
					lp = LogNormalCDF(z)
				}
				lq = math.Log1p(-c)
			} else {
				c := NormalSF(z)
				if c > 1e-300 {
					lq = math.Log(c)
				} else {
					lq = LogNormalCDF(-z)
				}
				lp = math.Log1p(-c)
			}
			prev = x
		}
		// term i (1-based k=i+1): (2k-1) log Φ(z_k) + (2(n-k)+1) log(1-Φ(z_k))
		k := float64(i + 1)
		s += (2*k-1)*lp + (2*(fn-k)+1)*lq
	}
	a = -fn - s/fn
	astar = a * (1 + 0.75/fn + 2.25/(fn*fn))
	switch {
	case astar < 0.2:
		p = 1 - math.Exp(-13.436+101.14*astar-223.73*astar*astar)
	case astar < 0.34:
		p = 1 - math.Exp(-8.318+42.796*astar-59.938*astar*astar)
	case astar < 0.6:
		p = math.Exp(0.9177 - 4.279*astar - 1.38*astar*astar)
	case astar < 10:
		p = math.Exp(1.2937 - 5.709*astar + 0.0186*astar*astar)
	default:
		p = 3.7e-24
	}
	return a, astar, p
}

// swPoly evaluates cc[0] + cc[1]x + ... as in AS R94.
func swPoly(cc []float64, x float64) float64 {
	r := cc[0]
	if len(cc) > 1 {
		p := x * cc[len(cc)-1]
		for j := len(cc) - 2; j > 0; j-- {
			p = (p + cc[j]) * x
		}
		r += p
	}
	return r
}

// ShapiroWilk is the Shapiro-Wilk W test (Shapiro and Wilk 1965) with
// Royston's (1995) approximations for the coefficients and the p-value,
// algorithm AS R94 (Applied Statistics 44, 547-551), following the C
// translation in R's swilk.c. The coefficients take O(n) quantile
// evaluations. Data are centred on mean (which changes W only by rounding
// and keeps precision for data far from zero). ok is false outside
// 3 <= n <= 5000 and for zero range.
func ShapiroWilk(x []float64, mean float64) (w, pw float64, ok bool) {
	n := len(x)
	if n < 3 || n > ShapiroMaxN {
		return 0, 0, false
	}
	g := []float64{-2.273, .459}
	c1 := []float64{0., .221157, -.147981, -2.07119, 4.434685, -2.706056}
	c2 := []float64{0., .042981, -.293762, -1.752461, 5.682633, -3.582633}
	c3 := []float64{.544, -.39978, .025054, -6.714e-4}
	c4 := []float64{1.3822, -.77857, .062767, -.0020322}
	c5 := []float64{-1.5861, -.31082, -.083751, .0038915}
	c6 := []float64{-.4803, -.082676, .0030302}

	nn2 := n / 2
	a := make([]float64, nn2+1) // 1-based as in AS R94
	an := float64(n)
	if n == 3 {
		a[1] = math.Sqrt(0.5)
	} else {
		an25 := an + .25
		summ2 := 0.0
		for i := 1; i <= nn2; i++ {
			a[i] = NormalQuantile((float64(i) - .375) / an25)
			summ2 += a[i] * a[i]
		}
		summ2 *= 2
		ssumm2 := math.Sqrt(summ2)
		rsn := 1 / math.Sqrt(an)
		a1 := swPoly(c1, rsn) - a[1]/ssumm2
		var i1 int
		var fac float64
		if n > 5 {
			i1 = 3
			a2 := -a[2]/ssumm2 + swPoly(c2, rsn)
			fac = math.Sqrt((summ2 - 2*(a[1]*a[1]) - 2*(a[2]*a[2])) / (1 - 2*(a1*a1) - 2*(a2*a2)))
			a[2] = a2
		} else {
			i1 = 2
			fac = math.Sqrt((summ2 - 2*(a[1]*a[1])) / (1 - 2*(a1*a1)))
		}
		a[1] = a1
		for i := i1; i <= nn2; i++ {
			a[i] /= -fac
		}
	}
	rng := x[n-1] - x[0]
	if !(rng > 0) || math.IsInf(rng, 0) {
		return 0, 0, false
	}
	// W as the squared correlation between the data and the coefficients.
	// The coefficient of order statistic i (0-based) is -a[i+1] for the
	// lower half, +a[n-i] for the upper half and 0 for the middle one.
	coef := func(i int) float64 {
		j := n - 1 - i
		switch {
		case i < j:
			return -a[i+1]
		case i > j:
			return a[j+1]
		}
		return 0
	}
	var sa, sx float64
	for i := 0; i < n; i++ {
		sa += coef(i)
		sx += (x[i] - mean) / rng
	}
	sa /= an
	sx /= an
	var ssa, ssx, sax float64
	for i := 0; i < n; i++ {
		asa := coef(i) - sa
		xsx := (x[i]-mean)/rng - sx
		ssa += asa * asa
		ssx += xsx * xsx
		sax += asa * xsx
	}
	// w1 = 1-W computed so as to avoid rounding error for W near 1.
	ssassx := math.Sqrt(ssa * ssx)
	w1 := (ssassx - sax) * (ssassx + sax) / (ssa * ssx)
	if w1 < 0 { // rounding, W = 1 to machine precision
		w1 = 0
	}
	w = 1 - w1
	if n == 3 { // exact p-value
		const pi6 = 1.90985931710274  // 6/π
		const stqr = 1.04719755119660 // asin(√(3/4)) = π/3
		pw = pi6 * (math.Asin(math.Sqrt(w)) - stqr)
		if pw < 0 {
			pw = 0
		}
		if pw > 1 {
			pw = 1
		}
		return w, pw, normalFinite(w) && normalFinite(pw)
	}
	y := math.Log(w1)
	lxx := math.Log(an)
	var m, s float64
	if n <= 11 {
		gamma := swPoly(g, an)
		if y >= gamma {
			return w, 1e-99, normalFinite(w) // as AS R94 / swilk.c: an "obvious" value
		}
		y = -math.Log(gamma - y)
		m = swPoly(c3, an)
		s = math.Exp(swPoly(c4, an))
	} else {
		m = swPoly(c5, lxx)
		s = math.Exp(swPoly(c6, lxx))
	}
	pw = NormalSF((y - m) / s)
	return w, pw, normalFinite(w) && normalFinite(pw)
}
