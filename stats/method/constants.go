package method

import (
	"fmt"
	"math"
	"sync"

	"gonum.org/v1/gonum/integrate/quad"
)

// ChartConstants holds the control chart constants for subgroups of N
// readings from a normal distribution, with 3-sigma factors.
//
// SmallD2 and SmallD3 are the usual d2 and d3 (mean and standard deviation
// of the range of N standard normal readings); SmallD4 is the median of
// that range (used with the median moving range). C4 is the mean of the
// sample standard deviation of N standard normal readings and C5 =
// sqrt(1 - c4²) its standard deviation. The factors follow from them:
//
//	A = 3/√N        A2 = 3/(d2√N)      A3 = 3/(c4√N)      E2 = 3/d2
//	D1 = max(0, d2 − 3d3)   D2 = d2 + 3d3
//	D3 = max(0, 1 − 3d3/d2) D4 = 1 + 3d3/d2
//	B3 = max(0, 1 − 3c5/c4) B4 = 1 + 3c5/c4
//	B5 = max(0, c4 − 3c5)   B6 = c4 + 3c5
type ChartConstants struct {
	N                int
	SmallD2, SmallD3 float64
	SmallD4          float64
	C4, C5           float64
	A, A2, A3, E2    float64
	D1, D2, D3, D4   float64
	B3, B4, B5, B6   float64
}

// ctlMaxN bounds the subgroup size accepted by the constants: the range
// integrals below are laid out for sizes up to this (the upper tail of the
// range of 10⁵ normals is far inside the integration interval).
const ctlMaxN = 100000

// ctlConstCache is made on first use, not at start.
var (
	ctlConstCache map[int]ChartConstants
	ctlConstMu    sync.Mutex
)

// Constants returns the control chart constants for subgroups of n
// readings (2 <= n <= 100000).
//
// d2 and d3 are computed by numerical integration of the distribution of
// the range of n independent standard normal readings (Tippett 1925;
// the integrals as in Harter 1960): with Φ the normal distribution
// function and F(w) = n ∫ φ(x) [Φ(x+w) − Φ(x)]^(n−1) dx the distribution
// function of the range,
//
//	d2 = ∫ [1 − Φ(x)ⁿ − (1 − Φ(x))ⁿ] dx,   E[W²] = ∫₀^∞ 2w (1 − F(w)) dw,
//	d3 = sqrt(E[W²] − d2²),
//
// and d4 solves F(d4) = 1/2. Each integral is a composite 20-point
// Gauss-Legendre rule on panels of width 1/2 (gonum's quad.Legendre
// nodes). c4 is in closed form, c4 = sqrt(2/(n−1)) Γ(n/2)/Γ((n−1)/2),
// through log-gamma. The factors are those of ASTM E2587 and ISO 7870-2
// (see ChartConstants). Results are cached per n.
func Constants(n int) (ChartConstants, error) {
	if n < 2 || n > ctlMaxN {
		return ChartConstants{}, fmt.Errorf("subgroup size %d: constants need 2 to %d readings per subgroup", n, ctlMaxN)
	}
	ctlConstMu.Lock()
	c, ok := ctlConstCache[n]
	ctlConstMu.Unlock()
	if ok {
		return c, nil
	}
	if sd, ok := ctlSeedOf(n); ok {
		c = ctlConstantsOf(n, sd[0], sd[1], sd[2])
	} else {
		c = ctlComputeConstants(n)
	}
	ctlConstMu.Lock()
	if ctlConstCache == nil {
		ctlConstCache = map[int]ChartConstants{}
	}
	ctlConstCache[n] = c
	ctlConstMu.Unlock()
	return c, nil
}

// ctlSeed holds d2, d3 and d4 for the smallest subgroups, as
// ctlRangeMoments and ctlRangeMedian compute them: n = 2 is the moving
// range that every analysis of single readings uses, and 3 to 5 the usual
// subgroup sizes. Their integrals took about 50-115 ms natively and were
// the largest single cost of a first analysis in the browser (a fifth of
// it in Node's WebAssembly). TestConstantsSeed recomputes each one, bit for
// bit: the seed cannot go stale.
// It is a list, laid out by the compiler, so that nothing runs at start;
// ctlSeedOf looks a size up.
var ctlSeed = [...]struct {
	n int
	d [3]float64 // d2, d3, d4
}{
	{2, [3]float64{1.1283791670955123, 0.8525024664274177, 0.9538725524089399}},
	{3, [3]float64{1.6925687506432694, 0.8883680040451981, 1.587787750446347}},
	{4, [3]float64{2.0587507460079286, 0.8798082028249812, 1.9783204855397127}},
	{5, [3]float64{2.3259289472810387, 0.8640819410995016, 2.2568824930261933}},
}

// ctlSeedOf returns the seeded d2, d3 and d4 for subgroups of n, if any.
func ctlSeedOf(n int) ([3]float64, bool) {
	for _, s := range ctlSeed {
		if s.n == n {
			return s.d, true
		}
	}
	return [3]float64{}, false
}

func ctlComputeConstants(n int) ChartConstants {
	d2, d3 := ctlRangeMoments(n)
	return ctlConstantsOf(n, d2, d3, ctlRangeMedian(n))
}

// ctlConstantsOf completes the constants from the range's mean d2,
// standard deviation d3 and median d4 for subgroups of n.
func ctlConstantsOf(n int, d2, d3, d4 float64) ChartConstants {
	c4 := C4(n)
	c5 := math.Sqrt(math.Max(0, 1-c4*c4))
	rn := math.Sqrt(float64(n))
	return ChartConstants{
		N:       n,
		SmallD2: d2,
		SmallD3: d3,
		SmallD4: d4,
		C4:      c4,
		C5:      c5,
		A:       3 / rn,
		A2:      3 / (d2 * rn),
		A3:      3 / (c4 * rn),
		E2:      3 / d2,
		D1:      math.Max(0, d2-3*d3),
		D2:      d2 + 3*d3,
		D3:      math.Max(0, 1-3*d3/d2),
		D4:      1 + 3*d3/d2,
		B3:      math.Max(0, 1-3*c5/c4),
		B4:      1 + 3*c5/c4,
		B5:      math.Max(0, c4-3*c5),
		B6:      c4 + 3*c5,
	}
}

// C4 returns c4(n) = sqrt(2/(n−1)) Γ(n/2)/Γ((n−1)/2), the mean of the
// sample standard deviation of n standard normal readings (closed form,
// e.g. ASTM E2587; computed through log-gamma so it holds for any n >= 2).
// It returns NaN for n < 2.
func C4(n int) float64 {
	if n < 2 {
		return math.NaN()
	}
	a, _ := math.Lgamma(float64(n) / 2)
	b, _ := math.Lgamma(float64(n-1) / 2)
	return math.Sqrt(2/float64(n-1)) * math.Exp(a-b)
}

// ctlGL gives the 20-point Gauss-Legendre nodes and weights on [-1, 1],
// computed on first use (not at start).
var ctlGL = sync.OnceValue(func() (r struct{ x, w [20]float64 }) {
	quad.Legendre{}.FixedLocations(r.x[:], r.w[:], -1, 1)
	return r
})

// ctlPanels integrates f over [a, b] by the 20-point rule on panels of
// width at most 1 (the integrands vary on the scale of the normal density).
// Against the closed forms for n = 2 (d2 = 2/√π, d3 = √(2 − 4/π),
// d4 = √2·Φ⁻¹(3/4)) and n = 3 (d2 = 3/√π, E[W²] = 2 + 3√3/π) the error is
// below 1e-14 (constants_test.go).
func ctlPanels(f func(float64) float64, a, b float64) float64 {
	np := int(math.Ceil(b - a))
	if np < 1 {
		np = 1
	}
	h := (b - a) / float64(np)
	s := 0.0
	gl := ctlGL()
	for p := 0; p < np; p++ {
		lo := a + float64(p)*h
		mid, half := lo+h/2, h/2
		ps := 0.0
		for k := range gl.x {
			ps += gl.w[k] * f(mid+half*gl.x[k])
		}
		s += ps * half
	}
	return s
}

// ctlPhi is the standard normal distribution function, ctlQ its upper tail.
func ctlPhi(x float64) float64 { return 0.5 * math.Erfc(-x/math.Sqrt2) }
func ctlQ(x float64) float64   { return 0.5 * math.Erfc(x/math.Sqrt2) }

// ctlPhiDiff returns Φ(b) − Φ(a) for a <= b without cancellation in the
// upper tail.
func ctlPhiDiff(a, b float64) float64 {
	if a > 0 {
		return ctlQ(a) - ctlQ(b)
	}
	return ctlPhi(b) - ctlPhi(a)
}

// ctlXMax bounds the integrals over the readings: n·Q(ctlXMax) is
// negligible for n up to ctlMaxN.
const ctlXMax = 10.0

// ctlRangeCDF is F(w) = n ∫ φ(x) [Φ(x+w) − Φ(x)]^(n−1) dx.
func ctlRangeCDF(n int, w float64) float64 {
	if w <= 0 {
		return 0
	}
	m := float64(n - 1)
	f := func(x float64) float64 {
		d := ctlPhiDiff(x, x+w)
		if d <= 0 {
			return 0
		}
		return math.Exp(-x*x/2+m*math.Log(d)) / math.Sqrt(2*math.Pi)
	}
	v := float64(n) * ctlPanels(f, -ctlXMax, ctlXMax)
	return math.Min(1, v)
}

// ctlRangeMoments returns d2 and d3 for subgroups of n.
func ctlRangeMoments(n int) (d2, d3 float64) {
	fn := float64(n)
	// 1 − Φ(x)ⁿ − Φ(−x)ⁿ is even in x.
	g := func(x float64) float64 {
		p := ctlPhi(x)
		// 1 − Φ(x)ⁿ = −expm1(n log1p(−Q(x))) keeps the tail.
		return -math.Expm1(fn*math.Log1p(-ctlQ(x))) - math.Pow(1-p, fn)
	}
	d2 = 2 * ctlPanels(g, 0, ctlXMax)
	wmax := 2 * ctlXMax
	m2 := ctlPanels(func(w float64) float64 { return 2 * w * (1 - ctlRangeCDF(n, w)) }, 0, wmax)
	v := m2 - d2*d2
	if v < 0 {
		v = 0
	}
	return d2, math.Sqrt(v)
}

// ctlRangeMedian solves F(w) = 1/2 by regula falsi with the Illinois
// modification, from a bracket found by bisection.
func ctlRangeMedian(n int) float64 {
	lo, hi := 0.0, 2*ctlXMax
	flo, fhi := -0.5, 0.5
	for i := 0; i < 6; i++ { // bisection first: a bracket of width 20/64
		mid := (lo + hi) / 2
		fm := ctlRangeCDF(n, mid) - 0.5
		if fm < 0 {
			lo, flo = mid, fm
		} else {
			hi, fhi = mid, fm
		}
	}
	side := 0
	x := lo
	for i := 0; i < 100 && hi-lo > 1e-15*hi; i++ {
		x = (lo*fhi - hi*flo) / (fhi - flo)
		fx := ctlRangeCDF(n, x) - 0.5
		if fx == 0 {
			return x
		}
		if fx < 0 {
			lo, flo = x, fx
			if side == -1 {
				fhi /= 2
			}
			side = -1
		} else {
			hi, fhi = x, fx
			if side == 1 {
				flo /= 2
			}
			side = 1
		}
	}
	return x
}
