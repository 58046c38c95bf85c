package method

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/mathext"
)

// Specification limits as mantissas. Where a decision must be exact on the
// decimals the user typed (is this reading below the LSL?), the caller
// converts every reading and both limits to int64 mantissas at one common
// scale (value = mantissa × 10^-scale, the same scale for all), so the
// comparison is an integer comparison. A nil limit means the specification
// has no limit on that side (a one-sided specification).
//
// A reading equal to a limit conforms: "below" is strictly less than the LSL,
// "above" is strictly greater than the USL (common practice: the limits
// belong to the specification).

// ErrSpecInsideOut is returned when the lower specification limit is above
// the upper one.
var ErrSpecInsideOut = errors.New("method: lower specification limit is above the upper one")

// ErrSpecNoLimit is returned when neither specification limit is given.
var ErrSpecNoLimit = errors.New("method: no specification limit given")

// ErrCapLevel is returned for a confidence level, coverage or probability
// outside the open interval (0, 1).
var ErrCapLevel = errors.New("method: level must lie strictly between 0 and 1")

// ErrCapTooFew is returned when there are too few readings for the method.
var ErrCapTooFew = errors.New("method: too few readings")

// ErrCapInput is returned for a NaN, infinite or negative input where a
// finite (or positive) one is needed.
var ErrCapInput = errors.New("method: input not finite or out of range")

// ConformInterval is the exact interval of Clopper and Pearson (1934) for a
// binomial proportion: K events in N trials.
type ConformInterval struct {
	K, N     int
	Fraction float64 // K / N
	Level    float64 // confidence level of Lower, Upper and UpperBound
	// Lower and Upper: two-sided interval at Level (each tail (1-Level)/2).
	Lower, Upper float64
	// UpperBound: one-sided upper bound at Level (the whole 1-Level in the
	// upper tail), the figure usually quoted for a fraction nonconforming.
	UpperBound float64
}

// ConformCI returns the exact binomial interval of Clopper and Pearson
// (1934, Biometrika 26:404-413) for k events in n trials at confidence level
// (0 < level < 1): the lower limit is the α/2 quantile of Beta(k, n-k+1)
// (0 when k = 0), the upper the 1-α/2 quantile of Beta(k+1, n-k) (1 when
// k = n); the one-sided upper bound uses α in place of α/2.
func ConformCI(k, n int, level float64) (ConformInterval, error) {
	if n < 1 || k < 0 || k > n {
		return ConformInterval{}, ErrCapTooFew
	}
	if !(level > 0 && level < 1) {
		return ConformInterval{}, ErrCapLevel
	}
	a := 1 - level
	r := ConformInterval{K: k, N: n, Fraction: float64(k) / float64(n), Level: level}
	kf, nf := float64(k), float64(n)
	if k == 0 {
		r.Lower = 0
	} else {
		r.Lower = mathext.InvRegIncBeta(kf, nf-kf+1, a/2)
	}
	if k == n {
		r.Upper, r.UpperBound = 1, 1
	} else {
		r.Upper = mathext.InvRegIncBeta(kf+1, nf-kf, 1-a/2)
		r.UpperBound = mathext.InvRegIncBeta(kf+1, nf-kf, 1-a)
	}
	return r, nil
}

// SpecPPM converts a fraction to parts per million.
func SpecPPM(fraction float64) float64 { return fraction * 1e6 }

// Conformance is the observed conformance of a batch to its specification:
// counts below the LSL, above the USL and outside either, each with its
// Clopper-Pearson (1934) interval. A side without a limit has K = 0 and the
// Has flag false.
type Conformance struct {
	N              int
	HasLSL, HasUSL bool
	Below          ConformInterval // readings < LSL
	Above          ConformInterval // readings > USL
	Outside        ConformInterval // Below + Above
}

// ConformanceCount counts the readings below the LSL and above the USL
// exactly, on int64 mantissas at one common scale (see the contract above:
// values, lsl and usl all share the scale; nil means no limit on that side),
// and returns the fractions with their exact binomial intervals (Clopper and
// Pearson 1934) at the confidence level. Errors: no readings, no limit, LSL
// above USL, level outside (0, 1).
func ConformanceCount(values []int64, lsl, usl *int64, level float64) (Conformance, error) {
	var c Conformance
	if len(values) == 0 {
		return c, ErrCapTooFew
	}
	if lsl == nil && usl == nil {
		return c, ErrSpecNoLimit
	}
	if lsl != nil && usl != nil && *lsl > *usl {
		return c, ErrSpecInsideOut
	}
	if !(level > 0 && level < 1) {
		return c, ErrCapLevel
	}
	var below, above int
	if lsl != nil {
		l := *lsl
		for _, v := range values {
			if v < l {
				below++
			}
		}
	}
	if usl != nil {
		u := *usl
		for _, v := range values {
			if v > u {
				above++
			}
		}
	}
	return capConformFrom(len(values), below, above, lsl != nil, usl != nil, level)
}

// ConformanceFromCounts is ConformanceCount for counts the caller has
// already made (for example on a sorted column by binary search).
func ConformanceFromCounts(n, below, above int, hasLSL, hasUSL bool, level float64) (Conformance, error) {
	if n < 1 || below < 0 || above < 0 || below+above > n {
		return Conformance{}, ErrCapTooFew
	}
	if !hasLSL && !hasUSL {
		return Conformance{}, ErrSpecNoLimit
	}
	if (!hasLSL && below > 0) || (!hasUSL && above > 0) {
		return Conformance{}, ErrCapInput
	}
	if !(level > 0 && level < 1) {
		return Conformance{}, ErrCapLevel
	}
	return capConformFrom(n, below, above, hasLSL, hasUSL, level)
}

func capConformFrom(n, below, above int, hasL, hasU bool, level float64) (Conformance, error) {
	c := Conformance{N: n, HasLSL: hasL, HasUSL: hasU}
	var err error
	if c.Below, err = ConformCI(below, n, level); err != nil {
		return Conformance{}, err
	}
	if c.Above, err = ConformCI(above, n, level); err != nil {
		return Conformance{}, err
	}
	if c.Outside, err = ConformCI(below+above, n, level); err != nil {
		return Conformance{}, err
	}
	return c, nil
}

// ExpectedFraction is the expected fraction outside the specification under
// a fitted distribution, per side and in total. A side without a limit has 0.
type ExpectedFraction struct {
	Below, Above, Total float64
}

// ExpectedOutsideNormal returns the expected fraction below the LSL and above
// the USL under a normal distribution with the given mean and sigma (the
// within-process or the overall sigma, as the caller chooses):
// Φ((LSL-μ)/σ) and Φ((μ-USL)/σ), computed by erfc so that tails down to
// 1e-300 keep their relative precision. A NaN limit means no limit on that
// side (one-sided specification). Errors: no limit, LSL above USL, a
// non-finite mean, sigma not positive and finite.
func ExpectedOutsideNormal(mean, sigma, lsl, usl float64) (ExpectedFraction, error) {
	var e ExpectedFraction
	if err := capCheckLimits(lsl, usl); err != nil {
		return e, err
	}
	if math.IsNaN(mean) || math.IsInf(mean, 0) || !(sigma > 0) || math.IsInf(sigma, 0) {
		return e, ErrCapInput
	}
	if !math.IsNaN(lsl) {
		e.Below = capNormCDF((lsl - mean) / sigma)
	}
	if !math.IsNaN(usl) {
		e.Above = capNormCDF((mean - usl) / sigma)
	}
	e.Total = e.Below + e.Above
	return e, nil
}

// capNormCDF is Φ(z) = erfc(-z/√2)/2.
func capNormCDF(z float64) float64 { return 0.5 * math.Erfc(-z/math.Sqrt2) }

// capCheckLimits checks limits given as floats with NaN for "no limit".
func capCheckLimits(lsl, usl float64) error {
	if math.IsNaN(lsl) && math.IsNaN(usl) {
		return ErrSpecNoLimit
	}
	if math.IsInf(lsl, 0) || math.IsInf(usl, 0) {
		return ErrCapInput
	}
	if !math.IsNaN(lsl) && !math.IsNaN(usl) && lsl > usl {
		return ErrSpecInsideOut
	}
	return nil
}
