package method

import (
	"errors"
	"math"
	"sync"
)

// The studentized range distribution: the range of k independent standard
// normal values divided by an independent estimate of their SD on df
// degrees of freedom. Its distribution function is the double integral of
// Copenhaver and Holland (1988), "Computation of the distribution of the
// maximum studentized range statistic with application to multiple
// significance testing of simple effects", J. Statist. Comput. Simul. 30,
// 1-15: the inner integral (Hartley's form of the distribution of the
// range of k normals) by Gauss-Legendre quadrature of degree 12 on two or
// three intervals, the outer one (over the chi distribution of the SD
// estimate) by Gauss-Legendre of degree 16 on intervals of length 1, 1/2,
// 1/4 or 1/8 by df. This is the algorithm, constants and cut-offs that
// R's ptukey uses, so the results agree with R's to about 1e-10.

// errGrpTukeyArgs is returned for a studentized range argument out of range.
var errGrpTukeyArgs = errors.New("method: studentized range needs k >= 2 groups, df >= 2 and a probability in [0, 1]")

// grpLegendre returns the non-negative nodes (descending) and weights of
// the n-point Gauss-Legendre rule on [-1, 1], n even, by Newton's method
// on the Legendre polynomial (the classical construction, as in Golub and
// Welsch 1969's reference values). Computed on first use (grpLeg12,
// grpLeg16), not at start.
func grpLegendre(n int) (x, w []float64) {
	h := n / 2
	x = make([]float64, h)
	w = make([]float64, h)
	for i := 0; i < h; i++ {
		z := math.Cos(math.Pi * (float64(i) + 0.75) / (float64(n) + 0.5))
		var dp float64
		for it := 0; it < 100; it++ {
			p0, p1 := 1.0, z
			for j := 2; j <= n; j++ {
				p0, p1 = p1, ((2*float64(j)-1)*z*p1-(float64(j)-1)*p0)/float64(j)
			}
			dp = float64(n) * (z*p1 - p0) / (z*z - 1)
			dz := p1 / dp
			z -= dz
			if math.Abs(dz) < 1e-16 {
				break
			}
		}
		// recompute the derivative at the converged node
		p0, p1 := 1.0, z
		for j := 2; j <= n; j++ {
			p0, p1 = p1, ((2*float64(j)-1)*z*p1-(float64(j)-1)*p0)/float64(j)
		}
		dp = float64(n) * (z*p1 - p0) / (z*z - 1)
		x[i] = z
		w[i] = 2 / ((1 - z*z) * dp * dp)
	}
	return x, w
}

// grpRule is a Gauss-Legendre rule from grpLegendre.
type grpRule struct{ x, w []float64 }

var (
	grpLeg12 = sync.OnceValue(func() grpRule { x, w := grpLegendre(12); return grpRule{x, w} })
	grpLeg16 = sync.OnceValue(func() grpRule { x, w := grpLegendre(16); return grpRule{x, w} })
)

func grpPhi(x float64) float64 { return 0.5 * math.Erfc(-x/math.Sqrt2) }

// grpWProb is the probability that the range of cc standard normal values
// is below w (Hartley's form; Copenhaver and Holland 1988, with rr = 1
// range).
func grpWProb(w, cc float64) float64 {
	const (
		c1 = -30.0
		c2 = -50.0
		c3 = 60.0
		bb = 8.0
	)
	qsqz := w * 0.5
	if qsqz >= bb {
		return 1
	}
	// (2 Phi(w/2) - 1)^cc, the first term of Hartley's form
	prW := 2*grpPhi(qsqz) - 1
	if prW >= math.Exp(c2/cc) {
		prW = math.Pow(prW, cc)
	} else {
		prW = 0
	}
	wincr := 3.0
	if w > 3 {
		wincr = 2
	}
	blb := qsqz
	binc := (bb - qsqz) / wincr
	bub := blb + binc
	einsum := 0.0
	cc1 := cc - 1
	leg := grpLeg12()
	grpLeg12x, grpLeg12w := leg.x, leg.w
	for wi := 1.0; wi <= wincr; wi++ {
		elsum := 0.0
		a := 0.5 * (bub + blb)
		b := 0.5 * (bub - blb)
		// nodes from -1 to 1, as the published order
		for jj := 0; jj < 12; jj++ {
			var xx, wt float64
			if jj < 6 {
				xx, wt = -grpLeg12x[jj], grpLeg12w[jj]
			} else {
				xx, wt = grpLeg12x[11-jj], grpLeg12w[11-jj]
			}
			ac := a + b*xx
			qexpo := ac * ac
			if qexpo > c3 {
				break
			}
			rinsum := grpPhi(ac) - grpPhi(ac-w)
			if rinsum >= math.Exp(c1/cc1) {
				elsum += wt * math.Exp(-0.5*qexpo) * math.Pow(rinsum, cc1)
			}
		}
		elsum *= 2 * b * cc / math.Sqrt(2*math.Pi)
		einsum += elsum
		blb = bub
		bub += binc
	}
	prW += einsum
	if prW <= math.Exp(c1) {
		return 0
	}
	if prW >= 1 {
		return 1
	}
	return prW
}

// PTukey is the distribution function P(Q <= q) of the studentized range
// Q of k means on df degrees of freedom (df may be fractional, as in
// Games-Howell; df above 25000 is taken as infinite). Copenhaver and
// Holland (1988), as R's ptukey (nranges = 1).
func PTukey(q float64, k int, df float64) (float64, error) {
	if k < 2 || !(df >= 2) || math.IsNaN(q) {
		return 0, errGrpTukeyArgs
	}
	if q <= 0 {
		return 0, nil
	}
	if math.IsInf(q, 1) {
		return 1, nil
	}
	cc := float64(k)
	if df > 25000 {
		return grpWProb(q, cc), nil
	}
	const (
		eps1 = -30.0
		eps2 = 1e-14
	)
	f2 := df * 0.5
	lg, _ := math.Lgamma(f2)
	f2lf := f2*math.Log(df) - df*math.Ln2 - lg
	f21 := f2 - 1
	ff4 := df * 0.25
	var ulen float64
	switch {
	case df <= 100:
		ulen = 1
	case df <= 800:
		ulen = 0.5
	case df <= 5000:
		ulen = 0.25
	default:
		ulen = 0.125
	}
	f2lf += math.Log(ulen)
	ans := 0.0
	otsum := 0.0
	leg := grpLeg16()
	grpLeg16x, grpLeg16w := leg.x, leg.w
	for i := 1; i <= 50; i++ {
		otsum = 0
		twa1 := float64(2*i-1) * ulen
		for jj := 0; jj < 16; jj++ {
			var u, wt float64
			if jj < 8 {
				u, wt = twa1-grpLeg16x[jj]*ulen, grpLeg16w[jj]
			} else {
				u, wt = twa1+grpLeg16x[jj-8]*ulen, grpLeg16w[jj-8]
			}
			t1 := f2lf + f21*math.Log(u) - u*ff4
			if t1 >= eps1 {
				qsqz := q * math.Sqrt(u*0.5)
				otsum += grpWProb(qsqz, cc) * wt * math.Exp(t1)
			}
		}
		if float64(i)*ulen >= 1 && otsum <= eps2 {
			break
		}
		ans += otsum
	}
	if ans > 1 {
		ans = 1
	}
	return ans, nil
}

// QTukey is the quantile function of the studentized range: the q with
// PTukey(q, k, df) = p. Starting value from the approximation of
// Copenhaver and Holland (1988) (as R's qtukey), then secant steps on
// PTukey; unlike R's (which stops at a step below 1e-4) the iteration runs
// to a relative step below 1e-9 so that intervals built on it are as accurate as
// PTukey.
func QTukey(p float64, k int, df float64) (float64, error) {
	if k < 2 || !(df >= 2) || !(p >= 0 && p <= 1) {
		return 0, errGrpTukeyArgs
	}
	if p == 0 {
		return 0, nil
	}
	if p == 1 {
		return math.Inf(1), nil
	}
	return grpQTukeyFrom(p, k, df, grpQTukeyStart(p, float64(k), df)), nil
}

// grpQTukeyFrom solves PTukey(q, k, df) = p by secant steps from x0
// (arguments already checked), stopping once the step is below 1e-9
// relative or PTukey is within 1e-13 of p; a bisection finishes the rare
// case where the secant stalls.
func grpQTukeyFrom(p float64, k int, df float64, x0 float64) float64 {
	pt := func(x float64) float64 {
		v, _ := PTukey(x, k, df)
		return v
	}
	v0 := pt(x0) - p
	if math.Abs(v0) < 1e-13 {
		return x0
	}
	// second iterate: a step of 2 % towards p (the start is within a few
	// per cent; R steps by 1)
	x1 := x0 * 1.02
	if v0 > 0 {
		x1 = x0 * 0.98
	}
	v1 := pt(x1) - p
	for iter := 0; iter < 50; iter++ {
		if math.Abs(v1) < 1e-13 {
			return x1
		}
		if v1 == v0 {
			break
		}
		ans := x1 - v1*(x1-x0)/(v1-v0)
		if !(ans > 0) || math.IsInf(ans, 0) {
			break
		}
		x0, v0 = x1, v1
		x1 = ans
		v1 = pt(x1) - p
		if math.Abs(x1-x0) < 1e-9*math.Max(1, x1) {
			return x1
		}
	}
	// Secant stalled: bisect on a bracket (PTukey is monotone).
	lo, hi := 0.0, math.Max(x1, 1)
	for pt(hi) < p {
		hi *= 2
		if hi > 1e6 {
			return hi
		}
	}
	for i := 0; i < 200 && hi-lo > 1e-12*hi; i++ {
		mid := 0.5 * (lo + hi)
		if pt(mid) < p {
			lo = mid
		} else {
			hi = mid
		}
	}
	return 0.5 * (lo + hi)
}

// grpQTukeyStart is the starting value of Copenhaver and Holland (1988)
// for the quantile, built on the normal quantile approximation of Odeh
// and Evans (1974, "Algorithm AS 70: the percentage points of the normal
// distribution", Appl. Statist. 23, 96-97), whose constants are these.
func grpQTukeyStart(p, c, v float64) float64 {
	const (
		p0   = -0.322232431088
		q0   = 0.993484626060e-01
		p1   = -1.0
		q1   = 0.588581570495
		p2   = -0.342242088547
		q2   = 0.531103462366
		p3   = -0.0204231210245
		q3   = 0.103537752850
		p4   = -0.453642210148e-04
		q4   = 0.38560700634e-02
		c1   = 0.8832
		c2   = 0.2368
		c3   = 1.214
		c4   = 1.208
		c5   = 1.4142
		vmax = 120.0
	)
	ps := 0.5 - 0.5*p
	yi := math.Sqrt(math.Log(1 / (ps * ps)))
	t := yi + ((((yi*p4+p3)*yi+p2)*yi+p1)*yi+p0)/((((yi*q4+q3)*yi+q2)*yi+q1)*yi+q0)
	if v < vmax {
		t += (t*t*t + t) / v / 4
	}
	q := c1 - c2*t
	if v < vmax {
		q += -c3/v + c4*t/v
	}
	return t * (q*math.Log(c-1) + c5)
}
