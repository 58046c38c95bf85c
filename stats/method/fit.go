package method

import (
	"math"
	"sort"

	"gonum.org/v1/gonum/mathext"
)

// Family codes of the fitted distributions (data, not words).
const (
	FitNormal     = "normal"
	FitLognormal  = "lognormal"   // 2 parameters, threshold 0
	FitLognormal3 = "lognormal-3" // with a threshold
	FitWeibull    = "weibull"
	FitWeibull3   = "weibull-3"
	FitGamma      = "gamma"
	FitGamma3     = "gamma-3"
	FitBoxCox     = "box-cox" // normal after the Box-Cox (1964) transformation
)

// Reason codes of a candidate that could not be fitted (FitCandidate.Reason)
// and of the chooser (FitResult.Reason).
const (
	FitReasonNeedsPositive  = "needs-positive-data"   // the family needs all values > 0
	FitReasonConstant       = "constant-data"         // all values equal
	FitReasonTooFew         = "too-few-values"        // n below the family's minimum
	FitReasonNoThreshold    = "no-interior-threshold" // the threshold runs off to -∞ (the 2-parameter form is as good) or into the minimum
	FitReasonNoConvergence  = "no-convergence"
	FitReasonDegenerate     = "shape-degenerate"      // shape beyond the range where the family is computable and distinct from the normal
	FitReasonQuantileRange  = "quantile-out-of-range" // the percentiles are not finite
	FitReasonNormalAdequate = "normal-adequate"       // normal passes and is within 2 AIC of the best adequate candidate
	FitReasonLowestAIC      = "lowest-aic-adequate"   // the adequate candidate with the lowest AIC
	FitReasonNoAdequate     = "no-adequate-fit"       // no candidate passes: empirical percentiles
	FitReasonNonFinite      = "non-finite-data"       // a NaN or infinite value (nothing fitted)
)

// Codes of FitCandidate.AdequacyRule.
const (
	// Anderson-Darling p-value ≥ 0.05, by the approximation of D'Agostino
	// and Stephens (1986, Goodness-of-Fit Techniques, Table 4.9) for the
	// normal with estimated mean and SD (on the logs for the lognormal).
	FitRuleADPValue = "ad-pvalue-dagostino-stephens-1986"
	// Weibull: A²(1+0.2/√n) ≤ 0.757, the 5 % point for the extreme-value
	// distribution with both parameters estimated (Stephens 1977; D'Agostino
	// and Stephens 1986, Table 4.17; from memory).
	FitRuleADWeibull = "ad-critical-stephens-1977"
	// Other families (no published p-value): A²(1+0.75/n+2.25/n²) ≤ 0.752,
	// the normal case's 5 % point used as a working threshold (a rule of our
	// own; fitted thresholds and shapes lower A², so it is lenient).
	FitRuleADWorking = "ad-working-threshold"
)

// FitParams are a fitted distribution's parameters. Threshold: the lower
// bound of the support (3-parameter families; 0 for the 2-parameter ones).
//   - normal: Mu, Sigma.
//   - lognormal, lognormal-3: log(x - Threshold) ~ N(Mu, Sigma).
//   - weibull, weibull-3: F = 1 - exp(-((x-Threshold)/Scale)^Shape).
//   - gamma, gamma-3: (x - Threshold) ~ Gamma(Shape, Scale) (mean Shape·Scale).
//   - box-cox: ((x/Scale)^Lambda - 1)/Lambda ~ N(Mu, Sigma) (log(x/Scale)
//     when Lambda = 0), Scale the geometric mean of the data.
type FitParams struct {
	Threshold    float64
	Mu, Sigma    float64
	Shape, Scale float64
	Lambda       float64
}

// FitCandidate is one distribution fitted by maximum likelihood. When Valid
// is false only Family and Reason are set.
type FitCandidate struct {
	Family  string
	Valid   bool
	Reason  string // FitReason* when not Valid
	NParams int
	Params  FitParams
	LogLik  float64 // log-likelihood of the data (density of x)
	AIC     float64 // 2·NParams - 2·LogLik (Akaike 1974)
	// AD: Anderson-Darling (1954) statistic A² against the fitted CDF.
	AD float64
	// ADPValue is set when HasPValue (FitRuleADPValue families only).
	ADPValue     float64
	HasPValue    bool
	AdequacyRule string // FitRule* code
	Adequate     bool   // passes its rule at the 5 % level
	// Quantiles at 0.135 %, 50 %, 99.865 % (ISO 22514-2 percentile method).
	Q00135, Q50, Q99865 float64

	base  float64 // minimum of the data; the model works on d = x - base
	model fitModel
}

// FitResult is the outcome of FitDistributions.
type FitResult struct {
	N          int
	Candidates []FitCandidate // in the order normal, lognormal, lognormal-3, weibull, weibull-3, gamma, gamma-3, box-cox
	Chosen     int            // index into Candidates; -1: empirical percentiles
	Reason     string         // FitReason* code of the choice
	LowestAIC  int            // index of the valid candidate with the lowest AIC (-1: none)
	Empirical  FitEmpiricalPercentiles
}

// fitModel is a fitted distribution on offsets d = x - base.
type fitModel interface {
	logCDFs(d float64) (lf, ls float64) // log F and log(1-F)
	quantile(p float64) float64         // as an offset d
}

// CDF returns the fitted distribution function at x (0 for a candidate that
// is not Valid).
func (c FitCandidate) CDF(x float64) float64 {
	if !c.Valid || c.model == nil || math.IsNaN(x) {
		return 0
	}
	lf, _ := c.model.logCDFs(x - c.base)
	return math.Exp(lf)
}

// Quantile returns the fitted p quantile (0 < p < 1); ok false for a
// candidate that is not Valid, p out of range or a quantile that is not finite.
func (c FitCandidate) Quantile(p float64) (q float64, ok bool) {
	if !c.Valid || c.model == nil || !(p > 0 && p < 1) {
		return 0, false
	}
	q = c.base + c.model.quantile(p)
	return q, !math.IsNaN(q) && !math.IsInf(q, 0)
}

// ExpectedOutside returns the expected fraction below lsl and above usl
// (NaN: no limit on that side) under the fitted distribution.
func (c FitCandidate) ExpectedOutside(lsl, usl float64) (ExpectedFraction, error) {
	var e ExpectedFraction
	if err := capCheckLimits(lsl, usl); err != nil {
		return e, err
	}
	if !c.Valid || c.model == nil {
		return e, ErrCapInput
	}
	if !math.IsNaN(lsl) {
		lf, _ := c.model.logCDFs(lsl - c.base)
		e.Below = math.Exp(lf)
	}
	if !math.IsNaN(usl) {
		_, ls := c.model.logCDFs(usl - c.base)
		e.Above = math.Exp(ls)
	}
	e.Total = e.Below + e.Above
	return e, nil
}

// fitData is the data as distinct values d (offsets from the minimum,
// ascending) with counts w.
type fitData struct {
	d, w     []float64
	n        float64
	min, max float64
}

// fitThinTo bounds the points used to search thresholds and the Box-Cox
// lambda (see FitDistributions).
var fitThinTo = 2048

// FitDistributions fits the candidate distributions to x by maximum
// likelihood and chooses one for the percentile method of ISO 22514-2.
//
// Candidates: normal; lognormal (Galton), Weibull and gamma with two
// parameters (positive data only) and with a threshold (three parameters,
// n ≥ 10; the threshold by profile likelihood, Cohen and Whitten 1980 for the
// lognormal, Rockette, Antle and Klimko 1974 for the Weibull, a local maximum
// below the minimum as the global one is unbounded); a normal after the
// Box-Cox (1964) transformation with lambda by profile likelihood on
// [-5, 5] (positive data only; the truncation of the transformed normal is
// ignored, as is usual). Each candidate carries its log-likelihood, AIC and
// Anderson-Darling (1954) statistic against the fitted CDF (with the usual
// tie handling: tied values share their CDF), and a 5 % adequacy rule
// (FitRule* codes).
//
// Choice (a rule of our own): among adequate candidates, the lowest AIC
// (FitReasonLowestAIC); but the normal when it is adequate and within 2 AIC
// units of that one (FitReasonNormalAdequate; Burnham and Anderson 2002 read
// ΔAIC ≤ 2 as substantial support). When no candidate is adequate, Chosen is
// -1 and the empirical percentiles (always returned, see
// FitEmpiricalPercentilesOf, at confidence level) take their place
// (FitReasonNoAdequate).
//
// x need not be sorted (a sorted x is used as is, else a sorted copy).
// With more distinct values than 2048, the threshold of the 3-parameter
// families and the Box-Cox lambda are located on a summary: the 512
// smallest distinct values as they are and the others in 1536 groups of
// equal count (each at its mean); the other parameters, the likelihood and A² are then
// computed on all values. Never panics; a NaN or infinite value gives
// Reason FitReasonNonFinite and no candidate; constant data give every
// candidate FitReasonConstant.
func FitDistributions(x []float64, level float64) FitResult {
	res := FitResult{N: len(x), Chosen: -1, LowestAIC: -1}
	if len(x) == 0 {
		res.Reason = FitReasonTooFew
		return res
	}
	for _, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			res.Reason = FitReasonNonFinite
			return res
		}
	}
	if !(level > 0 && level < 1) {
		level = 0.95
	}
	xs := x
	if !sort.Float64sAreSorted(x) {
		xs = append([]float64(nil), x...)
		sort.Float64s(xs)
	}
	res.Empirical = FitEmpiricalPercentilesOf(xs, level)
	fd := fitCompress(xs)
	fams := []string{FitNormal, FitLognormal, FitLognormal3, FitWeibull, FitWeibull3, FitGamma, FitGamma3, FitBoxCox}
	res.Candidates = make([]FitCandidate, len(fams))
	for i, f := range fams {
		res.Candidates[i] = fitOne(f, fd)
	}
	res.Chosen, res.Reason, res.LowestAIC = fitChoose(res.Candidates, fd)
	return res
}

func fitCompress(xs []float64) *fitData {
	fd := &fitData{min: xs[0], max: xs[len(xs)-1], n: float64(len(xs))}
	for i := 0; i < len(xs); {
		j := i + 1
		for j < len(xs) && xs[j] == xs[i] {
			j++
		}
		fd.d = append(fd.d, xs[i]-fd.min)
		fd.w = append(fd.w, float64(j-i))
		i = j
	}
	return fd
}

// fitThin keeps the smallest m/4 distinct values (they decide a threshold)
// and groups the others into about 3m/4 points of equal count, each at the
// weighted mean of its group.
func fitThin(d, w []float64, n float64, m int) ([]float64, []float64) {
	if len(d) <= m {
		return d, w
	}
	keep := m / 4
	td, tw := make([]float64, 0, m+2), make([]float64, 0, m+2)
	td = append(td, d[:keep]...)
	tw = append(tw, w[:keep]...)
	rest := n
	for _, v := range w[:keep] {
		rest -= v
	}
	per := rest / float64(m-keep)
	var sw, swd float64
	for i := keep; i < len(d); i++ {
		sw += w[i]
		swd += w[i] * d[i]
		if sw >= per || i == len(d)-1 {
			td = append(td, swd/sw)
			tw = append(tw, sw)
			sw, swd = 0, 0
		}
	}
	return td, tw
}

func fitOne(fam string, fd *fitData) FitCandidate {
	c := FitCandidate{Family: fam, base: fd.min}
	fail := func(r string) FitCandidate { return FitCandidate{Family: fam, Reason: r} }
	if len(fd.d) < 2 {
		return fail(FitReasonConstant)
	}
	positive := fd.min > 0
	three := fam == FitLognormal3 || fam == FitWeibull3 || fam == FitGamma3
	if three && fd.n < 10 {
		return fail(FitReasonTooFew)
	}
	if (fam == FitLognormal || fam == FitWeibull || fam == FitGamma || fam == FitBoxCox) && !positive {
		return fail(FitReasonNeedsPositive)
	}
	spread := fd.max - fd.min
	var ok bool
	var reason string
	switch fam {
	case FitNormal:
		ok = fitNormal(fd, &c)
	case FitLognormal:
		ok, reason = fitLogn(fd.d, fd.w, fd.n, fd.min, &c)
	case FitWeibull:
		ok, reason = fitWeib(fd.d, fd.w, fd.n, fd.min, 0, &c)
	case FitGamma:
		ok, reason = fitGam(fd.d, fd.w, fd.n, fd.min, &c)
	case FitBoxCox:
		ok, reason = fitBoxCox(fd, &c)
	case FitLognormal3, FitWeibull3, FitGamma3:
		td, tw := fitThin(fd.d, fd.w, fd.n, fitThinTo)
		var k0 float64
		prof := func(tau float64) float64 {
			var t FitCandidate
			var good bool
			switch fam {
			case FitLognormal3:
				good, _ = fitLogn(td, tw, fd.n, tau, &t)
			case FitWeibull3:
				good, _ = fitWeib(td, tw, fd.n, tau, k0, &t)
				if good {
					k0 = t.Params.Shape
				}
			default:
				good, _ = fitGam(td, tw, fd.n, tau, &t)
			}
			if !good {
				return math.Inf(-1)
			}
			return t.LogLik
		}
		tau, found := fitThresholdSearch(prof, spread)
		if !found {
			return fail(FitReasonNoThreshold)
		}
		switch fam {
		case FitLognormal3:
			ok, reason = fitLogn(fd.d, fd.w, fd.n, tau, &c)
		case FitWeibull3:
			ok, reason = fitWeib(fd.d, fd.w, fd.n, tau, k0, &c)
		default:
			ok, reason = fitGam(fd.d, fd.w, fd.n, tau, &c)
		}
		c.Params.Threshold = fd.min - tau
		c.NParams = 3
	}
	if !ok {
		if reason == "" {
			reason = FitReasonNoConvergence
		}
		return fail(reason)
	}
	c.Family, c.Valid = fam, true
	if c.NParams == 0 {
		c.NParams = 2
	}
	if fam == FitBoxCox {
		c.NParams = 3
	}
	c.AIC = 2*float64(c.NParams) - 2*c.LogLik
	// The normal and lognormal A² use the sample SD (n-1), as the tables of
	// D'Agostino and Stephens (1986) do.
	adModel := c.model
	if fd.n > 1 {
		k := math.Sqrt(fd.n / (fd.n - 1))
		switch m := c.model.(type) {
		case fitNormalModel:
			m.sigma *= k
			adModel = m
		case fitLognModel:
			if fam == FitLognormal {
				m.sigma *= k
				adModel = m
			}
		}
	}
	c.AD = fitAD(adModel, fd)
	fitAdequacy(&c, fd.n)
	qs := [3]float64{0.00135, 0.5, 0.99865}
	var out [3]float64
	for i, p := range qs {
		q, good := c.Quantile(p)
		if !good {
			return fail(FitReasonQuantileRange)
		}
		out[i] = q
	}
	c.Q00135, c.Q50, c.Q99865 = out[0], out[1], out[2]
	if math.IsNaN(c.LogLik) || math.IsInf(c.LogLik, 0) || math.IsNaN(c.AD) || math.IsInf(c.AD, 0) {
		return fail(FitReasonNoConvergence)
	}
	return c
}

// fitThresholdSearch maximises a profile log-likelihood over the offset
// tau = min - threshold > 0 on a log grid from spread·e^-18 to spread·e^6
// (step 0.75), then by golden section (to 1e-5 in log tau) around the
// highest interior local maximum.
func fitThresholdSearch(prof func(float64) float64, spread float64) (float64, bool) {
	const lo, hi, m = -18.0, 6.0, 33
	s := make([]float64, m)
	v := make([]float64, m)
	for i := range s {
		s[i] = lo + (hi-lo)*float64(i)/float64(m-1)
		v[i] = prof(spread * math.Exp(s[i]))
	}
	best := -1
	for i := 1; i < m-1; i++ {
		if v[i] > math.Inf(-1) && v[i] >= v[i-1] && v[i] >= v[i+1] && (v[i] > v[i-1] || v[i] > v[i+1]) {
			if best < 0 || v[i] > v[best] {
				best = i
			}
		}
	}
	if best < 0 {
		return 0, false
	}
	a, b := s[best-1], s[best+1]
	g := (math.Sqrt(5) - 1) / 2
	c1, c2 := b-g*(b-a), a+g*(b-a)
	f1, f2 := prof(spread*math.Exp(c1)), prof(spread*math.Exp(c2))
	for it := 0; it < 40 && b-a > 1e-5; it++ {
		if f1 >= f2 {
			b, c2, f2 = c2, c1, f1
			c1 = b - g*(b-a)
			f1 = prof(spread * math.Exp(c1))
		} else {
			a, c1, f1 = c1, c2, f2
			c2 = a + g*(b-a)
			f2 = prof(spread * math.Exp(c2))
		}
	}
	t := spread * math.Exp((a+b)/2)
	if math.IsNaN(t) || math.IsInf(t, 0) || !(t > 0) {
		return 0, false
	}
	return t, true
}

// ----- normal

type fitNormalModel struct{ mr, sigma float64 }

func (m fitNormalModel) logCDFs(d float64) (float64, float64) {
	return fitLogPhis((d - m.mr) / m.sigma)
}
func (m fitNormalModel) quantile(p float64) float64 {
	return m.mr + m.sigma*mathext.NormalQuantile(p)
}

func fitNormal(fd *fitData, c *FitCandidate) bool {
	var s float64
	for i, d := range fd.d {
		s += fd.w[i] * d
	}
	mr := s / fd.n
	var ss float64
	for i, d := range fd.d {
		e := d - mr
		ss += fd.w[i] * e * e
	}
	v := ss / fd.n
	if !(v > 0) {
		return false
	}
	sig := math.Sqrt(v)
	c.Params = FitParams{Mu: fd.min + mr, Sigma: sig}
	c.LogLik = -fd.n / 2 * (math.Log(2*math.Pi*v) + 1)
	c.model = fitNormalModel{mr: mr, sigma: sig}
	return true
}

// fitLogPhis returns log Φ(z) and log Φ(-z), computing the smaller tail
// and the other from it by log1p.
func fitLogPhis(z float64) (float64, float64) {
	if z < 0 {
		l := fitLogPhi(z)
		return l, math.Log1p(-math.Exp(l))
	}
	l := fitLogPhi(-z)
	return math.Log1p(-math.Exp(l)), l
}

// fitLogPhi is log Φ(z), with the asymptotic series in the far lower tail.
func fitLogPhi(z float64) float64 {
	if z > -30 {
		return math.Log(capNormCDF(z))
	}
	// log Φ(z) = -z²/2 - log(-z) - log√(2π) + log(1 - 1/z² + 3/z⁴ - ...)
	z2 := z * z
	return -z2/2 - math.Log(-z) - 0.5*math.Log(2*math.Pi) + math.Log1p(-1/z2+3/(z2*z2))
}

// ----- lognormal: z = d + c with c > 0; log z = log c + log1p(d/c)

type fitLognModel struct{ c, mur, sigma float64 }

func (m fitLognModel) logCDFs(d float64) (float64, float64) {
	if d+m.c <= 0 {
		return math.Inf(-1), 0
	}
	return fitLogPhis((math.Log1p(d/m.c) - m.mur) / m.sigma)
}
func (m fitLognModel) quantile(p float64) float64 {
	return m.c*math.Exp(m.mur+m.sigma*mathext.NormalQuantile(p)) - m.c
}

// fitLogn fits log(d + c) ~ N: for the 2-parameter lognormal c is the
// minimum (threshold 0); for the 3-parameter one c = min - threshold.
func fitLogn(d, w []float64, n, c float64, out *FitCandidate) (bool, string) {
	if !(c > 0) {
		return false, FitReasonNoConvergence
	}
	var s, sl float64
	for i, v := range d {
		l := math.Log1p(v / c)
		s += w[i] * l
	}
	mur := s / n
	var ss float64
	for i, v := range d {
		e := math.Log1p(v/c) - mur
		ss += w[i] * e * e
		sl += w[i] * math.Log1p(v/c)
	}
	va := ss / n
	if !(va > 0) {
		return false, FitReasonConstant
	}
	lc := math.Log(c)
	sumLogZ := n*lc + sl
	out.Params = FitParams{Mu: lc + mur, Sigma: math.Sqrt(va)}
	out.LogLik = -n/2*(math.Log(2*math.Pi*va)+1) - sumLogZ
	out.model = fitLognModel{c: c, mur: mur, sigma: math.Sqrt(va)}
	return true, ""
}

// ----- Weibull on z = d + c

type fitWeibModel struct{ c, lr, k float64 } // lr = log(scale/c)

func (m fitWeibModel) logCDFs(d float64) (float64, float64) {
	if d+m.c <= 0 {
		return math.Inf(-1), 0
	}
	h := math.Exp(m.k * (math.Log1p(d/m.c) - m.lr)) // (z/scale)^k
	ls := -h
	lf := math.Log(-math.Expm1(-h))
	return lf, ls
}
func (m fitWeibModel) quantile(p float64) float64 {
	return m.c * math.Expm1(m.lr+math.Log(-math.Log1p(-p))/m.k)
}

// fitWeib fits a Weibull to z = d + c by maximum likelihood: the shape
// solves Σz^k log z/Σz^k - 1/k - mean(log z) = 0 (safeguarded Newton on a
// bracket), the scale is (mean z^k)^(1/k). k0 > 0 is a starting shape.
func fitWeib(d, w []float64, n, c, k0 float64, out *FitCandidate) (bool, string) {
	if !(c > 0) {
		return false, FitReasonNoConvergence
	}
	// ly = log(z/zmax) ≤ 0, with zmax = dmax + c.
	dmax := d[len(d)-1]
	zmax := dmax + c
	ly := make([]float64, len(d))
	var sly float64
	for i, v := range d {
		ly[i] = math.Log1p((v - dmax) / zmax)
		sly += w[i] * ly[i]
	}
	mly := sly / n
	var vv float64
	for i := range ly {
		e := ly[i] - mly
		vv += w[i] * e * e
	}
	if !(vv > 0) {
		return false, FitReasonConstant
	}
	g := func(k float64) (float64, float64) {
		var s0, s1, s2 float64
		for i, l := range ly {
			e := w[i] * math.Exp(k*l)
			s0 += e
			s1 += e * l
			s2 += e * l * l
		}
		m1 := s1 / s0
		return m1 - 1/k - mly, s2/s0 - m1*m1 + 1/(k*k)
	}
	k := k0
	if !(k > 0) || math.IsInf(k, 0) {
		k = 1.2825 / math.Sqrt(vv/n) // π/√6 / sd(log z)
	}
	lo, hi := 0.0, math.Inf(1)
	conv := false
	for it := 0; it < 200; it++ {
		f, df := g(k)
		if math.IsNaN(f) {
			return false, FitReasonNoConvergence
		}
		if f < 0 {
			lo = k
		} else {
			hi = k
		}
		nk := k - f/df
		if !(nk > lo && nk < hi) || math.IsNaN(nk) {
			if math.IsInf(hi, 1) {
				nk = 2 * k
			} else {
				nk = (lo + hi) / 2
			}
		}
		if math.Abs(nk-k) <= 1e-12*k {
			k = nk
			conv = true
			break
		}
		k = nk
		if k > 1e12 {
			return false, FitReasonDegenerate
		}
	}
	if !conv {
		return false, FitReasonNoConvergence
	}
	var s0 float64
	for i, l := range ly {
		s0 += w[i] * math.Exp(k*l)
	}
	llr := math.Log(s0/n) / k // log(scale/zmax)
	lzc := math.Log(zmax)
	// log-likelihood: n log k - n k log(scale) + (k-1) Σ log z - n, all
	// relative to log zmax: log z = lzc + ly, log scale = lzc + llr.
	out.Params = FitParams{Shape: k, Scale: zmax * math.Exp(llr)}
	out.LogLik = n*math.Log(k) - n*k*llr + (k-1)*sly - n*lzc - n
	// the model is relative to c: log(scale/c) = log(zmax/c) + llr.
	out.model = fitWeibModel{c: c, lr: math.Log1p(dmax/c) + llr, k: k}
	return true, ""
}

// ----- gamma on z = d + c

type fitGamModel struct{ c, br, a float64 } // br = scale/c

func (m fitGamModel) logCDFs(d float64) (float64, float64) {
	if d+m.c <= 0 {
		return math.Inf(-1), 0
	}
	x := (1 + d/m.c) / m.br
	// one incomplete gamma function: the smaller tail, the other by log1p
	if x < m.a {
		p := mathext.GammaIncReg(m.a, x)
		return math.Log(p), math.Log1p(-p)
	}
	q := mathext.GammaIncRegComp(m.a, x)
	return math.Log1p(-q), math.Log(q)
}
func (m fitGamModel) quantile(p float64) float64 {
	return m.c * (m.br*mathext.GammaIncRegInv(m.a, p) - 1)
}

// fitGam fits a gamma to z = d + c by maximum likelihood: the shape α
// solves log α - ψ(α) = log(mean z) - mean(log z) (Choi and Wette 1969),
// written as mean(u - log1p(u)), u = z/mean z - 1, for precision.
func fitGam(d, w []float64, n, c float64, out *FitCandidate) (bool, string) {
	if !(c > 0) {
		return false, FitReasonNoConvergence
	}
	var sd float64
	for i, v := range d {
		sd += w[i] * v
	}
	mz := c + sd/n // mean z
	var s, sl float64
	for i, v := range d {
		u := (v - sd/n) / mz
		s += w[i] * fitUMinusLog1p(u)
		sl += w[i] * math.Log1p(u)
	}
	s /= n
	if !(s > 0) {
		return false, FitReasonConstant
	}
	a, ok := fitGammaShape(s)
	if !ok {
		return false, FitReasonNoConvergence
	}
	if a > 1e7 {
		return false, FitReasonDegenerate
	}
	scale := mz / a
	sumLogZ := n*math.Log(mz) + sl
	out.Params = FitParams{Shape: a, Scale: scale}
	out.LogLik = n*(0.5*math.Log(a)-0.5*math.Log(2*math.Pi)-fitStirlErr(a)-a*s) - sumLogZ
	out.model = fitGamModel{c: c, br: scale / c, a: a}
	return true, ""
}

// fitUMinusLog1p is u - log(1+u), by its series for small u.
func fitUMinusLog1p(u float64) float64 {
	if math.Abs(u) < 1e-4 {
		return u * u * (0.5 - u*(1.0/3-u*0.25))
	}
	return u - math.Log1p(u)
}

// fitStirlErr is log Γ(a) - ((a-0.5) log a - a + log √(2π)).
func fitStirlErr(a float64) float64 {
	if a > 15 {
		a2 := a * a
		return (1.0/12 - (1.0/360-1.0/(1260*a2))/a2) / a
	}
	lg, _ := math.Lgamma(a)
	return lg - ((a-0.5)*math.Log(a) - a + 0.5*math.Log(2*math.Pi))
}

// fitGammaShape solves log a - ψ(a) = s by bisection on log a.
func fitGammaShape(s float64) (float64, bool) {
	h := func(a float64) float64 {
		if a > 1e4 {
			a2 := a * a
			return 1/(2*a) + 1/(12*a2) - 1/(120*a2*a2)
		}
		return math.Log(a) - mathext.Digamma(a)
	}
	lo, hi := math.Log(1e-10), math.Log(1e30)
	if h(math.Exp(hi)) > s {
		return math.Exp(hi), true
	}
	if h(math.Exp(lo)) < s {
		return 0, false
	}
	for it := 0; it < 200 && hi-lo > 1e-15; it++ {
		mid := (lo + hi) / 2
		if h(math.Exp(mid)) > s {
			lo = mid
		} else {
			hi = mid
		}
	}
	return math.Exp((lo + hi) / 2), true
}

// ----- Box-Cox

// fitBoxCoxModel: t = ((x/g)^λ-1)/λ ~ N(mu, sigma); log(x/g) = l1(d) - ml
// with l1(d) = log1p(d/min) and ml its mean, so x/g needs no huge logs.
type fitBoxCoxModel struct{ min, ml, lambda, mu, sigma float64 }

func fitBCT(ly, lambda float64) float64 {
	if math.Abs(lambda) < 1e-12 {
		return ly
	}
	return math.Expm1(lambda*ly) / lambda
}

func (m fitBoxCoxModel) logCDFs(d float64) (float64, float64) {
	if m.min+d <= 0 {
		return math.Inf(-1), 0
	}
	return fitLogPhis((fitBCT(math.Log1p(d/m.min)-m.ml, m.lambda) - m.mu) / m.sigma)
}
func (m fitBoxCoxModel) quantile(p float64) float64 {
	t := m.mu + m.sigma*mathext.NormalQuantile(p)
	var ly float64
	if math.Abs(m.lambda) < 1e-12 {
		ly = t
	} else {
		u := m.lambda * t
		if u <= -1 {
			return math.NaN()
		}
		ly = math.Log1p(u) / m.lambda
	}
	// x = g e^ly = min e^(ly + ml) ; d = x - min
	return m.min * math.Expm1(ly+m.ml)
}

func fitBoxCox(fd *fitData, c *FitCandidate) (bool, string) {
	mn := fd.min
	var sl float64
	for i, v := range fd.d {
		sl += fd.w[i] * math.Log1p(v/mn)
	}
	ml := sl / fd.n
	td, tw := fitThin(fd.d, fd.w, fd.n, fitThinTo)
	tly := make([]float64, len(td))
	for i, v := range td {
		tly[i] = math.Log1p(v/mn) - ml
	}
	ly := make([]float64, len(fd.d))
	for i, v := range fd.d {
		ly[i] = math.Log1p(v/mn) - ml
	}
	variance := func(l []float64, w []float64, lambda float64) (float64, float64) {
		var s float64
		for i, v := range l {
			s += w[i] * fitBCT(v, lambda)
		}
		m := s / fd.n
		var ss float64
		for i, v := range l {
			e := fitBCT(v, lambda) - m
			ss += w[i] * e * e
		}
		return m, ss / fd.n
	}
	// profile: -n/2 log σ²(λ) (the Jacobian sums to 0 with g the geometric mean)
	prof := func(lambda float64) float64 {
		_, v := variance(tly, tw, lambda)
		if !(v > 0) {
			return math.Inf(-1)
		}
		return -math.Log(v)
	}
	// grid, then golden section around the best grid point
	const lo, hi, m = -5.0, 5.0, 41
	best, bv := 0, math.Inf(-1)
	for i := 0; i < m; i++ {
		if v := prof(lo + (hi-lo)*float64(i)/float64(m-1)); v > bv {
			best, bv = i, v
		}
	}
	if math.IsInf(bv, -1) {
		return false, FitReasonConstant
	}
	step := (hi - lo) / float64(m-1)
	a := math.Max(lo, lo+float64(best-1)*step)
	b := math.Min(hi, lo+float64(best+1)*step)
	g := (math.Sqrt(5) - 1) / 2
	c1, c2 := b-g*(b-a), a+g*(b-a)
	f1, f2 := prof(c1), prof(c2)
	for it := 0; it < 60 && b-a > 1e-9; it++ {
		if f1 >= f2 {
			b, c2, f2 = c2, c1, f1
			c1 = b - g*(b-a)
			f1 = prof(c1)
		} else {
			a, c1, f1 = c1, c2, f2
			c2 = a + g*(b-a)
			f2 = prof(c2)
		}
	}
	lambda := (a + b) / 2
	mu, v := variance(ly, fd.w, lambda)
	if !(v > 0) || math.IsInf(v, 0) {
		return false, FitReasonNoConvergence
	}
	// log g = log min + ml
	lg := math.Log(mn) + ml
	c.Params = FitParams{Lambda: lambda, Mu: mu, Sigma: math.Sqrt(v), Scale: math.Exp(lg)}
	c.LogLik = -fd.n/2*(math.Log(2*math.Pi*v)+1) - fd.n*lg
	c.model = fitBoxCoxModel{min: mn, ml: ml, lambda: lambda, mu: mu, sigma: math.Sqrt(v)}
	return true, ""
}

// ----- Anderson-Darling and the adequacy rules

// fitAD is A² = -n - (1/n) Σ_i [(2i-1) log F(x_(i)) + (2(n-i)+1) log(1-F(x_(i)))]
// (Anderson and Darling 1954), summed by blocks of tied values.
func fitAD(m fitModel, fd *fitData) float64 {
	n := fd.n
	var s, cum float64
	for i, d := range fd.d {
		a := cum + 1
		b := cum + fd.w[i]
		lf, ls := m.logCDFs(d)
		lf = math.Max(lf, -745)
		ls = math.Max(ls, -745)
		s += (b*b-(a-1)*(a-1))*lf + ((n-a+1)*(n-a+1)-(n-b)*(n-b))*ls
		cum = b
	}
	return -n - s/n
}

// FitADNormalPValue is the p-value of the Anderson-Darling statistic a2 for
// a normal sample of n with estimated mean and SD, by the approximation of
// D'Agostino and Stephens (1986, Table 4.9) on A* = A²(1+0.75/n+2.25/n²).
func FitADNormalPValue(a2 float64, n int) float64 {
	nf := float64(n)
	a := a2 * (1 + 0.75/nf + 2.25/(nf*nf))
	var p float64
	switch {
	case a < 0.2:
		p = 1 - math.Exp(-13.436+101.14*a-223.73*a*a)
	case a < 0.34:
		p = 1 - math.Exp(-8.318+42.796*a-59.938*a*a)
	case a < 0.6:
		p = math.Exp(0.9177 - 4.279*a - 1.38*a*a)
	case a < 153.467:
		p = math.Exp(1.2937 - 5.709*a + 0.0186*a*a)
	default:
		p = 0
	}
	return math.Max(0, math.Min(1, p))
}

func fitAdequacy(c *FitCandidate, n float64) {
	switch c.Family {
	case FitNormal, FitLognormal:
		c.AdequacyRule = FitRuleADPValue
		c.ADPValue = FitADNormalPValue(c.AD, int(n))
		c.HasPValue = true
		c.Adequate = c.ADPValue >= 0.05
	case FitWeibull:
		c.AdequacyRule = FitRuleADWeibull
		c.Adequate = c.AD*(1+0.2/math.Sqrt(n)) <= 0.757
	default:
		c.AdequacyRule = FitRuleADWorking
		c.Adequate = c.AD*(1+0.75/n+2.25/(n*n)) <= 0.752
	}
}

func fitChoose(cs []FitCandidate, fd *fitData) (chosen int, reason string, lowest int) {
	chosen, lowest = -1, -1
	if len(fd.d) < 2 {
		return -1, FitReasonConstant, -1
	}
	best := -1
	for i, c := range cs {
		if !c.Valid {
			continue
		}
		if lowest < 0 || c.AIC < cs[lowest].AIC {
			lowest = i
		}
		if c.Adequate && (best < 0 || c.AIC < cs[best].AIC) {
			best = i
		}
	}
	if best < 0 {
		return -1, FitReasonNoAdequate, lowest
	}
	if cs[0].Valid && cs[0].Adequate && cs[0].AIC-cs[best].AIC <= 2 {
		return 0, FitReasonNormalAdequate, lowest
	}
	return best, FitReasonLowestAIC, lowest
}

// FitEmpirical is a sample quantile with its distribution-free
// confidence interval from order statistics.
type FitEmpirical struct {
	P     float64
	Value float64 // Hyndman and Fan (1996) type 7 (linear between order statistics)
	// Lower = x_(LowerRank), Upper = x_(UpperRank) (ranks from 1), with
	// Pr{x_(l) ≤ ξ_p ≤ x_(u)} = Achieved ≥ Level; a side that n cannot
	// support has its Has flag false (e.g. the 0.135 % point below n ≈ 2200
	// at 95 %).
	Lower, Upper         float64
	LowerRank, UpperRank int
	HasLower, HasUpper   bool
	Achieved             float64
}

// FitEmpiricalPercentiles are the 0.135 %, 50 % and 99.865 % sample quantiles
// (the percentile method of ISO 22514-2 on the empirical distribution).
type FitEmpiricalPercentiles struct {
	Level               float64
	Q00135, Q50, Q99865 FitEmpirical
}

// FitEmpiricalPercentilesOf returns the empirical 0.135 %, 50 % and 99.865 %
// quantiles of sorted (ascending) data with their order-statistic intervals
// at level (see FitQuantileOrderCI). Empty data give the zero value.
func FitEmpiricalPercentilesOf(sorted []float64, level float64) FitEmpiricalPercentiles {
	r := FitEmpiricalPercentiles{Level: level}
	if len(sorted) == 0 {
		return r
	}
	r.Q00135 = FitQuantileOrderCI(sorted, 0.00135, level)
	r.Q50 = FitQuantileOrderCI(sorted, 0.5, level)
	r.Q99865 = FitQuantileOrderCI(sorted, 0.99865, level)
	return r
}

// FitQuantileOrderCI returns the p quantile of sorted (ascending) data
// (Hyndman and Fan 1996, type 7) with the distribution-free interval from
// order statistics (Thompson 1936; e.g. Hahn and Meeker 1991, section
// 5.2): x_(l) and x_(u) with l the largest rank such that Pr{Bin(n,p) ≤ l-1}
// ≤ (1-level)/2 and u the smallest with Pr{Bin(n,p) ≤ u-1} ≥ 1-(1-level)/2.
func FitQuantileOrderCI(sorted []float64, p, level float64) FitEmpirical {
	q := FitEmpirical{P: p}
	n := len(sorted)
	if n == 0 || !(p > 0 && p < 1) || !(level > 0 && level < 1) {
		return q
	}
	h := float64(n-1) * p
	j := int(math.Floor(h))
	if j >= n-1 {
		q.Value = sorted[n-1]
	} else {
		q.Value = sorted[j] + (h-float64(j))*(sorted[j+1]-sorted[j])
	}
	a := (1 - level) / 2
	// B(k) = Pr{Bin(n,p) ≤ k}
	B := func(k int) float64 {
		if k < 0 {
			return 0
		}
		if k >= n {
			return 1
		}
		return mathext.RegIncBeta(float64(n-k), float64(k+1), 1-p)
	}
	// smallest k with B(k) ≥ t
	qb := func(t float64) int {
		lo, hi := -1, n // B(lo) < t ≤ B(hi)
		for hi-lo > 1 {
			mid := lo + (hi-lo)/2
			if B(mid) >= t {
				hi = mid
			} else {
				lo = mid
			}
		}
		return hi
	}
	// l - 1 = largest k with B(k) ≤ a
	k := qb(a)
	if B(k) > a {
		k--
	}
	l := k + 1
	u := qb(1-a) + 1
	if l >= 1 {
		q.HasLower, q.LowerRank, q.Lower = true, l, sorted[l-1]
	}
	if u <= n {
		q.HasUpper, q.UpperRank, q.Upper = true, u, sorted[u-1]
	}
	lo, hi := l, u
	if lo < 1 {
		lo = 0
	}
	if hi > n {
		hi = n + 1
	}
	q.Achieved = B(hi-1) - B(lo-1)
	return q
}
