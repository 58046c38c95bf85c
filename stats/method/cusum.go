package method

import (
	"fmt"
	"math"
)

// CUSUMChart is a two-sided tabular CUSUM in the units of the data.
// Upper[i] and Lower[i] are the upper and lower sums after point i, both
// >= 0; Decision = H·σ. UpperCount[i] and LowerCount[i] count the points
// since the sum was last zero (the usual estimate of when a shift
// began is the point after the last zero). Beyond lists the points where
// either sum exceeds Decision.
type CUSUMChart struct {
	K, H, Centre, Sigma    float64
	Slack, Decision        float64 // K·σ and H·σ
	Upper, Lower           []float64
	UpperCount, LowerCount []int32
	Beyond                 []int
}

// CUSUM computes the tabular (decision-interval) CUSUM of Page (1954) as
// set out in the NIST/SEMATECH e-Handbook 6.3.2.3 and Montgomery (2009,
// §9.1): C⁺ᵢ = max(0, xᵢ − (centre + Kσ) + C⁺ᵢ₋₁), C⁻ᵢ = max(0, (centre
// − Kσ) − xᵢ + C⁻ᵢ₋₁), starting from 0, with a signal when a sum exceeds
// Hσ. Usual settings: K = 0.5 (to detect a shift of 1σ), H = 4 or 5.
// sigma is the standard deviation of one plotted point.
func CUSUM(x []float64, centre, sigma, k, h float64) (CUSUMChart, error) {
	n := len(x)
	c := CUSUMChart{K: k, H: h, Centre: centre, Sigma: sigma, Slack: k * sigma, Decision: h * sigma,
		Upper: make([]float64, n), Lower: make([]float64, n),
		UpperCount: make([]int32, n), LowerCount: make([]int32, n)}
	_, err := EWMACUSUMScan(x, centre, sigma, 0, 0, k, h, nil, func(i int, up, lo float64, nu, nl int32, beyond bool) {
		c.Upper[i], c.Lower[i], c.UpperCount[i], c.LowerCount[i] = up, lo, nu, nl
		if beyond {
			c.Beyond = append(c.Beyond, i)
		}
	})
	if err != nil {
		return CUSUMChart{}, err
	}
	return c, nil
}

func ctlCheckKH(k, h float64) error {
	if !(k >= 0) || math.IsInf(k, 0) {
		return fmt.Errorf("CUSUM reference value k = %g: it must be a number >= 0", k)
	}
	if !(h > 0) || math.IsInf(h, 0) {
		return fmt.Errorf("CUSUM decision interval h = %g: it must be a positive number", h)
	}
	return nil
}

// CUSUMRunLength holds the average run lengths of a tabular CUSUM.
type CUSUMRunLength struct {
	Upper, Lower float64 // one-sided: the upper sum alone, the lower sum alone
	TwoSided     float64 // 1/TwoSided = 1/Upper + 1/Lower
}

// CUSUMARL returns the average run lengths of a tabular CUSUM with
// reference value k and decision interval h (in standard deviations of one
// point), started at zero, when the mean has shifted by shift standard
// deviations. Each one-sided run length is the Markov chain approximation
// of Brook and Evans (1972) with ctlARLStates states; the two-sided one
// combines them as 1/ARL = 1/ARL⁺ + 1/ARL⁻ (van Dobben de Bruyn 1968;
// Montgomery 2009 §9.1), which is close when the two sums are rarely
// non-zero together.
func CUSUMARL(k, h, shift float64) (CUSUMRunLength, error) {
	if err := ctlCheckKH(k, h); err != nil {
		return CUSUMRunLength{}, err
	}
	if math.IsNaN(shift) || math.IsInf(shift, 0) {
		return CUSUMRunLength{}, fmt.Errorf("shift %g: it must be finite", shift)
	}
	up, err := ctlCUSUMOneSided(k, h, shift)
	if err != nil {
		return CUSUMRunLength{}, err
	}
	lo, err := ctlCUSUMOneSided(k, h, -shift)
	if err != nil {
		return CUSUMRunLength{}, err
	}
	return CUSUMRunLength{Upper: up, Lower: lo, TwoSided: 1 / (1/up + 1/lo)}, nil
}

// ctlCUSUMOneSided: states j = 0..m−1 hold the sum in [(j−½)w, (j+½)w)
// (state 0: [0, w/2)), w = h/(m − ½); the sum leaving [0, h) ends the run.
func ctlCUSUMOneSided(k, h, shift float64) (float64, error) {
	m := ctlARLStates
	w := h / (float64(m) - 0.5)
	a := make([]float64, m*m)
	for i := 0; i < m; i++ {
		ci := float64(i) * w
		for j := 0; j < m; j++ {
			// next sum = ci + X − k with X ~ N(shift, 1)
			var p float64
			if j == 0 {
				p = ctlPhi(w/2 - ci + k - shift)
			} else {
				cj := float64(j) * w
				p = ctlPhiDiff(cj-w/2-ci+k-shift, cj+w/2-ci+k-shift)
			}
			v := -p
			if i == j {
				v += 1
			}
			a[i*m+j] = v
		}
	}
	return ctlSolveARL(a, m, 0)
}

// EWMACUSUMScanAt computes the averages of EWMA (λ = lambda, L = l) and
// the sums of CUSUM (k, h) without keeping them, in one pass with the two
// recursions side by side (each waits on its own previous value, so
// together they take little more time than one). It visits only some
// points, in order: those listed in at (ascending), every point beyond
// the limits (visitE) or beyond H·σ (visitC), and the point after each
// (where a run beyond ends); at a point both visit, visitE first. visitE
// gets the average z; visitC the upper and lower sums and the number of
// points each has been above 0 in a row. A long series costs one tight
// pass and a call per point visited. A scan whose settings are refused
// returns its error and makes no visit; the other still runs.
func EWMACUSUMScanAt(x []float64, centre, sigma, lambda, l, k, h float64, at []int,
	visitE func(i int, z float64, beyond bool), visitC func(i int, up, lo float64, nu, nl int32, beyond bool)) (errE, errC error) {
	return ctlScanEC(x, centre, sigma, lambda, l, k, h, at, false, visitE, visitC)
}

// EWMACUSUMScan is EWMACUSUMScanAt visiting every point, in order (EWMA
// and CUSUM keep them all; a short series draws them all).
func EWMACUSUMScan(x []float64, centre, sigma, lambda, l, k, h float64,
	visitE func(i int, z float64, beyond bool), visitC func(i int, up, lo float64, nu, nl int32, beyond bool)) (errE, errC error) {
	return ctlScanEC(x, centre, sigma, lambda, l, k, h, nil, true, visitE, visitC)
}

// ctlScanEC is EWMACUSUMScanAt, visiting every point when all; a nil
// visit function leaves its scan out.
func ctlScanEC(x []float64, centre, sigma, lambda, l, k, h float64, at []int, all bool,
	visitE func(i int, z float64, beyond bool), visitC func(i int, up, lo float64, nu, nl int32, beyond bool)) (errE, errC error) {
	if !(sigma >= 0) || math.IsInf(sigma, 0) || math.IsNaN(centre) || math.IsInf(centre, 0) {
		err := fmt.Errorf("centre %g and sigma %g: they must be finite, sigma >= 0", centre, sigma)
		return err, err
	}
	if visitE != nil {
		errE = ctlCheckLambdaL(lambda, l)
	}
	if visitC != nil {
		errC = ctlCheckKH(k, h)
	}
	doE, doC := errE == nil && visitE != nil, errC == nil && visitC != nil
	slack := k * sigma
	st := ctlEC{z: centre, a: 1, lambda: lambda, q: (1 - lambda) * (1 - lambda), kk: lambda / (2 - lambda),
		lsig: l * sigma, hi: centre + slack, low: centre - slack, decision: h * sigma, centre: centre}
	next, ai := ctlNextAt(at, 0, all)
	for i := 0; i < len(x); i++ {
		// the points that need no visit pass in a loop without calls
		if i = st.run(x, i, next); i == len(x) {
			break
		}
		here := i == next
		if doE && (st.beyondE || st.wasE || here) {
			visitE(i, st.z, st.beyondE)
		}
		if doC && (st.beyondC || st.wasC || here) {
			visitC(i, st.up, st.lo, st.nu, st.nl, st.beyondC)
		}
		if here {
			next, ai = ctlNextAt(at, ai+1, all)
			if all {
				next = i + 1
			}
		}
		st.wasE, st.wasC = st.beyondE, st.beyondC
	}
	return errE, errC
}

// ctlEC is the state of EWMACUSUMScanAt after a point: the EWMA z with
// its limit's half-width hw ((1−λ)^(2(i+1)) in a), the CUSUM sums and
// counts, whether each is beyond, and whether it was at the point before.
type ctlEC struct {
	z, a, hw, up, lo             float64
	nu, nl                       int32
	beyondE, beyondC, wasE, wasC bool
	lambda, q, kk, lsig          float64
	hi, low, decision, centre    float64
}

// ctlPos is max(0, s) for every s that is not NaN (-0 gives +0), without a
// branch to mispredict and without the call that WebAssembly makes for the
// built-in max of floats: a negative s (sign bit set) has every bit cleared.
func ctlPos(s float64) float64 {
	b := math.Float64bits(s)
	return math.Float64frombits(b &^ uint64(int64(b)>>63))
}

// run advances the state from point from and stops at the first point to
// visit (at next, beyond, or just after a point beyond), returning it
// (len(x) when none is left).
func (s *ctlEC) run(x []float64, from, next int) int {
	z, a, hw, up, lo, nu, nl := s.z, s.a, s.hw, s.up, s.lo, s.nu, s.nl
	wasE, wasC := s.wasE, s.wasC
	lambda, q, kk, lsig, hi, low, decision, centre := s.lambda, s.q, s.kk, s.lsig, s.hi, s.low, s.decision, s.centre
	i := from
	beyondE, beyondC := false, false
	stop := false
	// while (1−λ)^(2(i+1)) is not below the rounding of 1, and at the
	// point after one beyond: the full step (|z − centre| > hw is
	// z − centre > hw || z − centre < −hw, NaN giving false)
	for ; i < len(x) && (1-a != 1 || wasE || wasC); i++ {
		v := x[i]
		z = lambda*v + (1-lambda)*z
		if 1-a != 1 {
			a *= q
			hw = lsig * math.Sqrt(kk*(1-a))
		}
		beyondE = math.Abs(z-centre) > hw
		up = ctlPos(v - hi + up)
		lo = ctlPos(low - v + lo)
		nu = (nu + 1) * int32(ctlU(up > 0))
		nl = (nl + 1) * int32(ctlU(lo > 0))
		beyondC = up > decision || lo > decision
		if beyondE || wasE || beyondC || wasC || i == next {
			stop = true
			break
		}
		wasE, wasC = beyondE, beyondC
	}
	// then hw stays and nothing was beyond at the point before: the same
	// step with fewer tests (most of a long series)
	if !stop {
		for ; i < len(x); i++ {
			v := x[i]
			z = lambda*v + (1-lambda)*z
			beyondE = math.Abs(z-centre) > hw
			up = ctlPos(v - hi + up)
			lo = ctlPos(low - v + lo)
			nu = (nu + 1) * int32(ctlU(up > 0))
			nl = (nl + 1) * int32(ctlU(lo > 0))
			beyondC = up > decision || lo > decision
			if beyondE || beyondC || i == next {
				break
			}
		}
	}
	s.z, s.a, s.hw, s.up, s.lo, s.nu, s.nl = z, a, hw, up, lo, nu, nl
	s.beyondE, s.beyondC, s.wasE, s.wasC = beyondE, beyondC, wasE, wasC
	return i
}
