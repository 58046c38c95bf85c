package method

import (
	"math"

	"gonum.org/v1/gonum/mathext"
)

// Method codes for the interval of a capability index (data, not words).
const (
	CapMethodChiSquare = "chi-square"   // Cp, Pp: chi-square distribution of the variance
	CapMethodBissell   = "bissell-1990" // CPL, CPU, Cpk, PPL, PPU, Ppk: Bissell (1990) normal approximation
	CapMethodBoyles    = "boyles-1991"  // Cpm: Boyles (1991) chi-square with his degrees of freedom
)

// CapabilityInput holds the summary figures the capability indices need.
// Limits and target are NaN when absent (a one-sided specification has one
// NaN limit; Cpm needs both limits and the target).
type CapabilityInput struct {
	Mean float64
	// SigmaWithin: the within-process sigma (for Cp, CPL, CPU, Cpk), with
	// DFWithin its effective degrees of freedom (the caller computes both,
	// e.g. average moving range / d2 or pooled SD / c4). NaN or 0 when
	// unavailable: the within indices are then not Valid.
	SigmaWithin, DFWithin float64
	// SigmaOverall: the overall sample SD (n-1 denominator), for Pp, PPL,
	// PPU, Ppk and Cpm, with n-1 degrees of freedom.
	SigmaOverall float64
	N            int
	LSL, USL     float64
	Target       float64
}

// CapIndex is one capability index with its interval at the Level of the
// CapabilityIndices that holds it. Valid false: cannot be computed (a limit
// or the target missing, sigma zero, too few readings); all figures are then 0.
type CapIndex struct {
	Value        float64
	Lower, Upper float64 // two-sided confidence interval
	LowerBound   float64 // one-sided lower confidence bound
	Method       string  // CapMethod* code
	DF           float64 // degrees of freedom used by the interval
	Valid        bool
}

// CapabilityIndices are the capability indices of a process from its mean,
// sigmas and specification.
type CapabilityIndices struct {
	Level                float64
	Cp, CPL, CPU, Cpk    CapIndex // within-process sigma
	Pp, PPL, PPU, Ppk    CapIndex // overall sigma
	Cpm                  CapIndex // overall sigma and target
	HasLSL, HasUSL, HasT bool
}

// Capability computes the capability indices and their confidence intervals
// at level (0 < level < 1).
//
//   - Cp = (USL-LSL)/(6σ), Pp the same with the overall sigma (Kane 1986,
//     J. Quality Technology 18:41-52). Interval by the chi-square
//     distribution of the variance with ν degrees of freedom:
//     Cp·√(χ²(α/2,ν)/ν) to Cp·√(χ²(1-α/2,ν)/ν); one-sided lower bound
//     Cp·√(χ²(α,ν)/ν).
//   - CPL = (μ-LSL)/(3σ), CPU = (USL-μ)/(3σ), Cpk = min (Kane 1986); with a
//     one-sided specification Cpk is the one that exists. Interval by the
//     normal approximation of Bissell (1990, Applied Statistics 39:331-340):
//     Ĉ ± z·√(1/(9n) + Ĉ²/(2ν)), with ν = n-1 for the overall sigma (as in
//     Bissell) and the effective degrees of freedom DFWithin for the
//     within-process sigma (Bissell's n-1 is the degrees of freedom of σ̂).
//   - Cpm = (USL-LSL)/(6√(σ² + (μ-T)²)) with the overall sigma (Chan, Cheng
//     and Spiring 1988), interval by Boyles (1991, J. Quality Technology
//     23:17-26): Cpm·√(χ²(α/2,ν)/ν) with ν = n(1+a²)²/(1+2a²), a = (μ-T)/σ.
//
// Errors: no limit, LSL above USL, level outside (0, 1), n < 2, non-finite
// mean. A sigma that is 0 or NaN only makes its indices not Valid.
func Capability(in CapabilityInput, level float64) (CapabilityIndices, error) {
	r := CapabilityIndices{Level: level}
	if err := capCheckLimits(in.LSL, in.USL); err != nil {
		return r, err
	}
	if !(level > 0 && level < 1) {
		return r, ErrCapLevel
	}
	if in.N < 2 {
		return r, ErrCapTooFew
	}
	if math.IsNaN(in.Mean) || math.IsInf(in.Mean, 0) || math.IsInf(in.Target, 0) {
		return r, ErrCapInput
	}
	r.HasLSL, r.HasUSL = !math.IsNaN(in.LSL), !math.IsNaN(in.USL)
	r.HasT = !math.IsNaN(in.Target)
	n := float64(in.N)
	if capSigmaOK(in.SigmaWithin) && in.DFWithin > 0 && !math.IsInf(in.DFWithin, 0) {
		r.Cp, r.CPL, r.CPU, r.Cpk = capFamily(in.Mean, in.SigmaWithin, in.DFWithin, n, in.LSL, in.USL, level)
	}
	if capSigmaOK(in.SigmaOverall) {
		r.Pp, r.PPL, r.PPU, r.Ppk = capFamily(in.Mean, in.SigmaOverall, n-1, n, in.LSL, in.USL, level)
		if r.HasLSL && r.HasUSL && r.HasT {
			r.Cpm = capCpm(in.Mean, in.SigmaOverall, n, in.LSL, in.USL, in.Target, level)
		}
	}
	return r, nil
}

func capSigmaOK(s float64) bool { return s > 0 && !math.IsInf(s, 0) }

// capFamily returns (Cp, CPL, CPU, Cpk) for one sigma with ν degrees of freedom.
func capFamily(mean, sigma, df, n, lsl, usl, level float64) (cp, cpl, cpu, cpk CapIndex) {
	hasL, hasU := !math.IsNaN(lsl), !math.IsNaN(usl)
	if hasL && hasU {
		cp = capChiSquare((usl-lsl)/(6*sigma), df, level)
	}
	if hasL {
		cpl = capBissell((mean-lsl)/(3*sigma), df, n, level)
	}
	if hasU {
		cpu = capBissell((usl-mean)/(3*sigma), df, n, level)
	}
	switch {
	case hasL && hasU:
		if cpl.Value <= cpu.Value {
			cpk = capBissell(cpl.Value, df, n, level)
		} else {
			cpk = capBissell(cpu.Value, df, n, level)
		}
	case hasL:
		cpk = cpl
	default:
		cpk = cpu
	}
	return
}

// capChiSquare is the chi-square interval of a ratio (limits)/(6σ).
func capChiSquare(v, df, level float64) CapIndex {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return CapIndex{}
	}
	a := 1 - level
	q := func(p float64) float64 { return math.Sqrt(2 * mathext.GammaIncRegInv(df/2, p) / df) }
	return CapIndex{Value: v, Lower: v * q(a/2), Upper: v * q(1-a/2), LowerBound: v * q(a),
		Method: CapMethodChiSquare, DF: df, Valid: true}
}

// capBissell is Bissell's (1990) normal-approximation interval.
func capBissell(v, df, n, level float64) CapIndex {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return CapIndex{}
	}
	se := math.Sqrt(1/(9*n) + v*v/(2*df))
	z2 := mathext.NormalQuantile(1 - (1-level)/2)
	z1 := mathext.NormalQuantile(level)
	return CapIndex{Value: v, Lower: v - z2*se, Upper: v + z2*se, LowerBound: v - z1*se,
		Method: CapMethodBissell, DF: df, Valid: true}
}

// capCpm is Cpm with Boyles's (1991) interval.
func capCpm(mean, sigma, n, lsl, usl, t, level float64) CapIndex {
	a := (mean - t) / sigma
	tau := sigma * math.Sqrt(1+a*a)
	v := (usl - lsl) / (6 * tau)
	df := n * (1 + a*a) * (1 + a*a) / (1 + 2*a*a)
	if math.IsNaN(v) || math.IsInf(v, 0) || math.IsNaN(df) || math.IsInf(df, 0) {
		return CapIndex{}
	}
	c := capChiSquare(v, df, level)
	c.Method = CapMethodBoyles
	return c
}

// CpkSampleSize returns the smallest number of readings n (n ≥ 2) for which
// the one-sided lower confidence bound of Cpk by Bissell's (1990)
// approximation, Ĉ - z(level)·√(1/(9n) + Ĉ²/(2(n-1))), exceeds required,
// if the estimate Ĉ stays what it is today. Ĉ must exceed required (else no
// n is enough: ErrCapInput). The answer is capped at 1e9 readings (ErrCapTooFew
// beyond). The within-process sigma's effective degrees of freedom are taken
// as n-1 here.
func CpkSampleSize(cpk, required, level float64) (int, error) {
	if !(level > 0 && level < 1) {
		return 0, ErrCapLevel
	}
	if math.IsNaN(cpk) || math.IsInf(cpk, 0) || math.IsNaN(required) || math.IsInf(required, 0) || !(cpk > required) {
		return 0, ErrCapInput
	}
	z := mathext.NormalQuantile(level)
	ok := func(n float64) bool {
		return cpk-z*math.Sqrt(1/(9*n)+cpk*cpk/(2*(n-1))) > required
	}
	const maxN = 1e9
	if !ok(maxN) {
		return 0, ErrCapTooFew
	}
	lo, hi := 1.0, maxN // ok(hi), !ok(lo) by convention (n=1 has no bound)
	for hi-lo > 1 {
		mid := math.Floor((lo + hi) / 2)
		if ok(mid) {
			hi = mid
		} else {
			lo = mid
		}
	}
	return int(hi), nil
}

// PercentileIndices are capability indices by the percentile method of
// ISO 22514-2 (the quantiles of the fitted or empirical distribution in
// place of μ ± 3σ). Has flags say which exist; all false means none.
type PercentileIndices struct {
	Pp, PPL, PPU, Ppk             float64
	HasPp, HasPPL, HasPPU, HasPpk bool
}

// PercentileCapability returns the indices of the percentile method of
// ISO 22514-2:2017 (process performance for a non-normal distribution):
// Pp = (USL-LSL)/(X99.865-X0.135), PPL = (X50-LSL)/(X50-X0.135),
// PPU = (USL-X50)/(X99.865-X50), Ppk = min(PPL, PPU), from the 0.135 %,
// 50 % and 99.865 % quantiles. NaN limits are absent. An index whose
// denominator is not positive is left out (Has false). Errors: no limit, LSL
// above USL, non-finite or unordered quantiles.
func PercentileCapability(q00135, q50, q99865, lsl, usl float64) (PercentileIndices, error) {
	var r PercentileIndices
	if err := capCheckLimits(lsl, usl); err != nil {
		return r, err
	}
	for _, q := range []float64{q00135, q50, q99865} {
		if math.IsNaN(q) || math.IsInf(q, 0) {
			return r, ErrCapInput
		}
	}
	if q00135 > q50 || q50 > q99865 {
		return r, ErrCapInput
	}
	hasL, hasU := !math.IsNaN(lsl), !math.IsNaN(usl)
	if hasL && hasU && q99865 > q00135 {
		r.Pp, r.HasPp = (usl-lsl)/(q99865-q00135), true
	}
	if hasL && q50 > q00135 {
		r.PPL, r.HasPPL = (q50-lsl)/(q50-q00135), true
	}
	if hasU && q99865 > q50 {
		r.PPU, r.HasPPU = (usl-q50)/(q99865-q50), true
	}
	switch {
	case r.HasPPL && r.HasPPU:
		r.Ppk, r.HasPpk = math.Min(r.PPL, r.PPU), true
	case r.HasPPL && !hasU:
		r.Ppk, r.HasPpk = r.PPL, true
	case r.HasPPU && !hasL:
		r.Ppk, r.HasPpk = r.PPU, true
	}
	return r, nil
}
