package stats

import (
	"fmt"
	"math"
	"sync"
)

func init() { hookShape = shapeSection }

// Validity limits of the shape tests.
const (
	skewTestMinN  = 8    // D'Agostino (1970) skewness test
	kurtTestMinN  = 20   // Anscombe and Glynn (1983) kurtosis test
	shapiroMinN   = 3    // Royston (1995) AS R94
	shapiroMaxN   = 5000 // Royston (1995) AS R94
	andersonMinN  = 8    // D'Agostino and Stephens (1986), as nortest::ad.test
	largeTestMinN = shapiroMaxN + 1
)

// shapeSection computes the shape statistics of the data: sorted is
// ascending, mean and sd (divisor n-1) are the exact values.
//
//   - Skewness G1 and excess kurtosis G2 are the adjusted (sample) estimators
//     G1 = g1·√(n(n-1))/(n-2), G2 = ((n+1)g2+6)(n-1)/((n-2)(n-3)), with the
//     usual standard errors SES = √(6n(n-1)/((n-2)(n+1)(n+3))) and
//     SEK = 2·SES·√((n²-1)/((n-3)(n+5))) (Joanes and Gill 1998, "Comparing
//     measures of sample skewness and kurtosis", The Statistician 47, 183-189).
//   - Their tests are D'Agostino's (1970) test of √b1, the Anscombe and Glynn
//     (1983) test of b2, and the K² omnibus, all as given by D'Agostino,
//     Belanger and D'Agostino (1990), "A suggestion for using powerful and
//     informative tests of normality", The American Statistician 44, 316-321.
//     The skewness test needs n >= 8, the kurtosis test and K² n >= 20.
//   - Shapiro-Wilk W and its p-value for 3 <= n <= 5000 (Royston 1995,
//     algorithm AS R94), see shapiroWilk.
//   - Anderson-Darling A² against the normal with estimated mean and SD, for
//     n >= 8, see andersonDarling.
//   - Shape.Large, above n = 5000 where Shapiro-Wilk is not defined, is the
//     D'Agostino-Pearson K² omnibus test (D'Agostino, Belanger and D'Agostino
//     1990), whose normal approximations improve as n grows.
//
// Figures that cannot be computed are left out, each with a Note.
func shapeSection(sorted []float64, mean, sd float64) (*Shape, []Note) {
	n := len(sorted)
	var notes []Note
	note := func(field, format string, a ...any) {
		notes = append(notes, Note{Field: field, Text: fmt.Sprintf(format, a...)})
	}
	sh := &Shape{}
	if n < 3 {
		note("shape", "Shape statistics need at least 3 values; there are %d.", n)
		return nil, notes
	}
	if !(sd > 0) || math.IsInf(sd, 0) || math.IsNaN(mean) || math.IsInf(mean, 0) {
		note("shape", "Shape statistics are not defined: all values are equal.")
		return nil, notes
	}
	fn := float64(n)
	// Standardised third and fourth moments. Working on z = (x-mean)/sd
	// keeps the powers finite for any finite data (|z| <= (n-1)/√n).
	var s3, s4 float64
	var c3, c4 float64 // Kahan compensation
	for _, x := range sorted {
		z := (x - mean) / sd
		z2 := z * z
		y := z2*z - c3
		t := s3 + y
		c3 = (t - s3) - y
		s3 = t
		y = z2*z2 - c4
		t = s4 + y
		c4 = (t - s4) - y
		s4 = t
	}
	m2 := (fn - 1) / fn // m2/sd²
	g1 := (s3 / fn) / math.Pow(m2, 1.5)
	b2 := (s4 / fn) / (m2 * m2)
	g2 := b2 - 3

	ses := math.Sqrt(6 * fn * (fn - 1) / ((fn - 2) * (fn + 1) * (fn + 3)))
	G1 := g1 * math.Sqrt(fn*(fn-1)) / (fn - 2)
	if finite(G1) && finite(ses) {
		sh.Skewness = &Moment{Value: G1, SE: ses}
	} else {
		note("shape.skewness", "The skewness could not be computed for these values.")
	}
	var zs, zk float64
	okS, okK := false, false
	if n >= skewTestMinN {
		if z, ok := dagostinoSkewZ(g1, n); ok && sh.Skewness != nil {
			zs, okS = z, true
			sh.Skewness.Test = &Test{Name: "D'Agostino skewness", Statistic: z, P: twoSidedNormalP(z),
				Method: "normal approximation to √b1 (D'Agostino 1970)"}
		}
	} else {
		note("shape.skewness.test", "The skewness test needs at least %d values; there are %d.", skewTestMinN, n)
	}
	if n >= 4 {
		sek := 2 * ses * math.Sqrt((fn*fn-1)/((fn-3)*(fn+5)))
		G2 := (fn - 1) / ((fn - 2) * (fn - 3)) * ((fn+1)*g2 + 6)
		if finite(G2) && finite(sek) {
			sh.Kurtosis = &Moment{Value: G2, SE: sek}
		} else {
			note("shape.kurtosis", "The kurtosis could not be computed for these values.")
		}
	} else {
		note("shape.kurtosis", "The kurtosis needs at least 4 values; there are %d.", n)
	}
	if n >= kurtTestMinN {
		if z, ok := anscombeGlynnZ(b2, n); ok && sh.Kurtosis != nil {
			zk, okK = z, true
			sh.Kurtosis.Test = &Test{Name: "Anscombe-Glynn kurtosis", Statistic: z, P: twoSidedNormalP(z),
				Method: "normal approximation to b2 (Anscombe and Glynn 1983)"}
		} else {
			note("shape.kurtosis.test", "The kurtosis test could not be computed for these values.")
		}
	} else if n >= 4 {
		note("shape.kurtosis.test", "The kurtosis test needs at least %d values; there are %d.", kurtTestMinN, n)
	}
	if okS && okK {
		k2 := zs*zs + zk*zk
		df := 2.0
		sh.Omnibus = &Test{Name: "D'Agostino-Pearson K²", Statistic: k2, DF: &df, P: math.Exp(-k2 / 2),
			Method: "chi-square with 2 degrees of freedom"}
		if n >= largeTestMinN {
			cp := *sh.Omnibus
			cp.DF = &df
			cp.Method = "chi-square with 2 degrees of freedom; used in place of Shapiro-Wilk above n = 5000"
			sh.Large = &cp
		}
	} else if n >= kurtTestMinN {
		note("shape.omnibus", "The K² omnibus test could not be computed for these values.")
	} else {
		note("shape.omnibus", "The K² omnibus test needs at least %d values; there are %d.", kurtTestMinN, n)
	}
	if n > shapiroMaxN && sh.Large == nil {
		note("shape.large", "No normality test for large samples could be computed for these values.")
	}

	if n >= shapiroMinN && n <= shapiroMaxN {
		if w, p, ok := shapiroWilk(sorted, mean); ok {
			sh.Shapiro = &Test{Name: "Shapiro-Wilk", Statistic: w, P: p, Method: "Royston (1995) AS R94"}
		} else {
			note("shape.shapiroWilk", "Shapiro-Wilk could not be computed for these values.")
		}
	} else {
		note("shape.shapiroWilk", "Shapiro-Wilk is defined for 3 to 5000 values; there are %d. The D'Agostino-Pearson K² test is shown instead.", n)
	}
	if n >= andersonMinN {
		a, astar, p := andersonDarling(sorted, mean, sd)
		if finite(a) && finite(p) {
			sh.Anderson = &Test{Name: "Anderson-Darling", Statistic: a, P: p,
				Method: fmt.Sprintf("A² = %.4g; p from the adjusted A²* = A²(1+0.75/n+2.25/n²) = %.4g (D'Agostino and Stephens 1986)", a, astar)}
		} else {
			note("shape.andersonDarling", "Anderson-Darling could not be computed for these values.")
		}
	} else {
		note("shape.andersonDarling", "Anderson-Darling needs at least %d values; there are %d.", andersonMinN, n)
	}
	return sh, notes
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

// twoSidedNormalP is 2·P(Z > |z|), accurate in the far tail.
func twoSidedNormalP(z float64) float64 {
	return math.Min(1, 2*normSF(math.Abs(z)))
}

// dagostinoSkewZ is D'Agostino's (1970) normal approximation for the
// skewness √b1 = g1 (D'Agostino, Belanger and D'Agostino 1990, eq. 1-8).
func dagostinoSkewZ(g1 float64, n int) (float64, bool) {
	fn := float64(n)
	y := g1 * math.Sqrt((fn+1)*(fn+3)/(6*(fn-2)))
	beta2 := 3 * (fn*fn + 27*fn - 70) * (fn + 1) * (fn + 3) / ((fn - 2) * (fn + 5) * (fn + 7) * (fn + 9))
	w2 := -1 + math.Sqrt(2*(beta2-1))
	delta := 1 / math.Sqrt(0.5*math.Log(w2))
	alpha := math.Sqrt(2 / (w2 - 1))
	r := y / alpha
	z := delta * math.Asinh(r) // ln(r + √(r²+1))
	return z, finite(z)
}

// anscombeGlynnZ is the Anscombe and Glynn (1983) normal approximation for
// the kurtosis b2 (D'Agostino, Belanger and D'Agostino 1990, eq. 9-14).
func anscombeGlynnZ(b2 float64, n int) (float64, bool) {
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
	return z, finite(z)
}

// logNormCDF is log Φ(z), accurate in both tails: for z far below -30 it
// uses the asymptotic series of Mills' ratio (Abramowitz and Stegun 1964,
// 26.2.12), where Φ(z) itself underflows.
func logNormCDF(z float64) float64 {
	switch {
	case z > 0:
		return math.Log1p(-normSF(z))
	case z > -30:
		return math.Log(normCDF(z))
	}
	r := 1 / (z * z)
	s := 1 - r*(1-3*r*(1-5*r*(1-7*r*(1-9*r*(1-11*r)))))
	return -0.5*z*z - math.Log(-z) - 0.5*math.Log(2*math.Pi) + math.Log(s)
}

// Table of log Φ for large samples: cubic Hermite interpolation on a grid
// of step 1/512 over [-lpTableMax, lpTableMax], with the derivative
// φ(z)/Φ(z) at the nodes. The interpolation error is below h^4/384 times
// the largest fourth derivative, about 1e-13 (checked against logNormCDF
// in the tests).
const (
	lpTableMax  = 38.0
	lpTableStep = 1.0 / 512
	lpTableMinN = 200_000 // use the table from this many values on
)

var lpTable struct {
	once sync.Once
	f, d []float64
}

func logPhiTable() ([]float64, []float64) {
	lpTable.once.Do(func() {
		m := int(2*lpTableMax/lpTableStep) + 2
		f := make([]float64, m)
		d := make([]float64, m)
		for i := range m {
			z := -lpTableMax + float64(i)*lpTableStep
			lf := logNormCDF(z)
			f[i] = lf
			// φ(z)/Φ(z) = exp(log φ(z) - log Φ(z))
			d[i] = math.Exp(-0.5*z*z - 0.5*math.Log(2*math.Pi) - lf)
		}
		lpTable.f, lpTable.d = f, d
	})
	return lpTable.f, lpTable.d
}

// fastLogPhi is log Φ(z) from the table (the direct formula outside it).
func fastLogPhi(f, d []float64, z float64) float64 {
	if !(z > -lpTableMax && z < lpTableMax) {
		return logNormCDF(z)
	}
	u := (z + lpTableMax) / lpTableStep
	k := int(u)
	t := u - float64(k)
	t2 := t * t
	t3 := t2 * t
	h00 := 2*t3 - 3*t2 + 1
	h10 := t3 - 2*t2 + t
	h01 := -2*t3 + 3*t2
	h11 := t3 - t2
	return h00*f[k] + h10*lpTableStep*d[k] + h01*f[k+1] + h11*lpTableStep*d[k+1]
}

// andersonDarling is the Anderson-Darling statistic A² (Anderson and
// Darling 1954) of the data against the normal distribution with the
// estimated mean and SD, the adjusted A²* = A²(1 + 0.75/n + 2.25/n²) and its
// p-value from D'Agostino and Stephens (1986), Goodness-of-Fit Techniques,
// Table 4.9 (the same piecewise formula as R's nortest::ad.test). One pass:
// Φ is computed once per distinct value; from 200,000 values on, log Φ
// comes from an interpolation table (fastLogPhi) accurate to about 1e-13.
func andersonDarling(sorted []float64, mean, sd float64) (a, astar, p float64) {
	n := len(sorted)
	fn := float64(n)
	var s float64
	prev := math.NaN()
	var lp, lq float64
	var tf, td []float64
	if n >= lpTableMinN {
		tf, td = logPhiTable()
	}
	for i, x := range sorted {
		if x != prev && tf != nil {
			z := (x - mean) / sd
			lp, lq = fastLogPhi(tf, td, z), fastLogPhi(tf, td, -z)
			prev = x
		} else if x != prev {
			z := (x - mean) / sd
			if z <= 0 {
				c := normCDF(z)
				if c > 1e-300 {
					lp = math.Log(c)
				} else {
					lp = logNormCDF(z)
				}
				lq = math.Log1p(-c)
			} else {
				c := normSF(z)
				if c > 1e-300 {
					lq = math.Log(c)
				} else {
					lq = logNormCDF(-z)
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

// shapiroWilk is the Shapiro-Wilk W test (Shapiro and Wilk 1965) with
// Royston's (1995) approximations for the coefficients and the p-value,
// algorithm AS R94 (Applied Statistics 44, 547-551), following the C
// translation in R's swilk.c. The coefficients take O(n) quantile
// evaluations. Data are centred on mean (which changes W only by rounding
// and keeps precision for data far from zero). ok is false outside
// 3 <= n <= 5000 and for zero range.
func shapiroWilk(x []float64, mean float64) (w, pw float64, ok bool) {
	n := len(x)
	if n < 3 || n > shapiroMaxN {
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
			a[i] = normQuantile((float64(i) - .375) / an25)
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
		return w, pw, finite(w) && finite(pw)
	}
	y := math.Log(w1)
	lxx := math.Log(an)
	var m, s float64
	if n <= 11 {
		gamma := swPoly(g, an)
		if y >= gamma {
			return w, 1e-99, finite(w) // as AS R94 / swilk.c: an "obvious" value
		}
		y = -math.Log(gamma - y)
		m = swPoly(c3, an)
		s = math.Exp(swPoly(c4, an))
	} else {
		m = swPoly(c5, lxx)
		s = math.Exp(swPoly(c6, lxx))
	}
	pw = normSF((y - m) / s)
	return w, pw, finite(w) && finite(pw)
}
