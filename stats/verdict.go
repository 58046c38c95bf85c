package stats

import "lotlens/stats/method"

// Verdict thresholds (common practice; documented in the help page).
const (
	// skewStrong: |G1| at or above this is skewed whatever the test says
	// (Bulmer 1979, Principles of Statistics: |skewness| > 1 is "highly skewed").
	skewStrong = 1.0
	// skewModerate: |G1| at or above this is skewed when D'Agostino's test
	// on G1 also rejects symmetry at skewAlpha (Bulmer 1979: 0.5 to 1 is
	// "moderately skewed").
	skewModerate = 0.5
	skewAlpha    = 0.05
	// smallN: below this the shape cannot be judged and intervals are rough
	// (common practice).
	smallN = 20
	// tinyN: below this no shape test runs; the verdict rests on the fences.
	tinyN = 8
	// manyOutlierShare: more than this share of readings beyond the inner
	// fences (with at least manyOutlierMin of them) is far more than a normal
	// distribution gives (about 0.7%): common practice.
	manyOutlierShare = 0.02
	manyOutlierMin   = 3
	// minStepsTolerance: at least ten resolution steps across the
	// tolerance (common practice, the "10 to 1" rule of gauge selection).
	minStepsTolerance = 10
	// minStepsSD: the SD should span at least two resolution steps, or the
	// recorded values cannot show the spread (common practice).
	minStepsSD = 2
)

// verdict decides which pair of figures to quote, by these rules, in order:
//
//  1. one value: the value itself (quote "value": no SD, interval or
//     shape can come from one reading); all values equal: mean and SD
//     (the SD is 0).
//  2. skewed (8 values or more): |G1| >= 1, or |G1| >= 0.5 with
//     D'Agostino's skewness test (D'Agostino 1970) significant at 5% ->
//     median and IQR. When readings lie beyond the outer fences, G1 and
//     its test are those of the readings inside them (restSkew): a few
//     far-out readings move G1 without saying anything about the shape;
//     when they alone make G1 look skewed, the reason "far-out-not-shape"
//     says so (rule 3 then applies).
//  3. any reading beyond Tukey's outer fence (3 IQR beyond the quartiles,
//     Tukey 1977) -> median and IQR.
//  4. more than 2% of readings (and at least 3) beyond the inner fences
//     (1.5 IQR) -> median and IQR.
//  5. otherwise mean and SD; with two or three readings the reason
//     "few-readings" says what they can and cannot show (two: a range, no
//     shape, no suspect rule; three: a rough SD, no shape test, an odd
//     reading cannot be told from spread); below 8 values the shape
//     cannot be tested and the report says that the choice rests on the
//     fences alone.
//
// When the IQR is 0 (half the readings or more share one value) rules 3
// and 4 are not applied: such fences would flag every other reading, and an
// IQR of 0 describes nothing; the reason "iqr-zero" says so.
//
// Warnings: fewer than 20 values; a resolution too coarse for the
// tolerance (fewer than 10 steps across it) or for the spread (SD below 2
// steps); heavy ties (fewer than 10 distinct values among 20 or more, or
// one value holding more than a quarter of the readings); constant data.
func verdict(rep *Report, w words, opts Options, n int, constant bool, maxRun, distinct int, step float64, inner, outer int, rest restSkew) {
	v := &rep.Verdict
	v.Reasons = nil
	s := rep.Spread
	switch {
	case n == 1:
		// nothing but the value: no SD is quoted
		v.Quote = "value"
		v.Reasons = append(v.Reasons, Reason{Code: "single-value", Text: w.reasonSingle()})
	case constant:
		v.Quote = "mean-sd"
		v.Reasons = append(v.Reasons, Reason{Code: "constant", Text: w.reasonConstant(n, rep.Quantile.Min), Vals: map[string]float64{"n": float64(n)}})
	default:
		var why []Reason
		iqrZero := rep.Spread != nil && rep.Spread.IQR == 0
		if sh := rep.Shape; sh != nil && sh.Skewness != nil && n >= tinyN {
			g1 := sh.Skewness.Value
			var p float64 = -1
			if sh.Skewness.Test != nil {
				p = sh.Skewness.Test.P
			}
			skewedAll := abs(g1) >= skewStrong || (abs(g1) >= skewModerate && p >= 0 && p < skewAlpha)
			switch {
			case rest.far > 0 && rest.ok:
				// far-out readings present: the shape is judged on the rest
				if rest.skewed() {
					vals := map[string]float64{"g1": rest.g1, "g1All": g1, "far": float64(rest.far)}
					if rest.p >= 0 {
						vals["p"] = rest.p
					}
					why = append(why, Reason{Code: sideOf(rest.g1) + "-skewed", Text: w.reasonSkewRest(sideOf(rest.g1), rest.g1, rest.p, rest.far), Vals: vals})
				} else if skewedAll {
					why = append(why, Reason{Code: "far-out-not-shape", Text: w.reasonFarOutNotShape(rest.below, rest.above, g1, rest.g1),
						Vals: map[string]float64{"g1": rest.g1, "g1All": g1, "below": float64(rest.below), "above": float64(rest.above)}})
				}
			case skewedAll:
				vals := map[string]float64{"g1": g1}
				if p >= 0 {
					vals["p"] = p
				}
				why = append(why, Reason{Code: sideOf(g1) + "-skewed", Text: w.reasonSkew(sideOf(g1), g1, p), Vals: vals})
			}
		}
		if iqrZero {
			// half the readings or more share one value: fences at 0 IQR
			// would flag every other reading, and an IQR of 0 says nothing
			inner, outer = 0, 0
		}
		if outer > 0 {
			why = append(why, Reason{Code: "beyond-outer-fence", Text: w.reasonBeyondOuter(outer), Vals: map[string]float64{"count": float64(outer)}})
		}
		innerOnly := inner - outer
		if inner > manyOutlierMin-1 && float64(inner) > manyOutlierShare*float64(n) && innerOnly > 0 {
			why = append(why, Reason{Code: "many-beyond-inner-fence", Text: w.reasonManyInner(inner, n), Vals: map[string]float64{"count": float64(inner), "share": float64(inner) / float64(n)}})
		}
		if len(why) > 0 {
			v.Quote = "median-iqr"
			v.Reasons = why
			break
		}
		v.Quote = "mean-sd"
		if iqrZero {
			v.Reasons = append(v.Reasons, Reason{Code: "iqr-zero", Text: w.reasonIQRZero()})
		}
		if sh := rep.Shape; sh != nil && sh.Skewness != nil && n >= tinyN {
			vals := map[string]float64{"g1": sh.Skewness.Value}
			p := -1.0
			if sh.Skewness.Test != nil {
				p = sh.Skewness.Test.P
				vals["p"] = p
			}
			v.Reasons = append(v.Reasons, Reason{Code: "symmetric", Text: w.reasonSkew("", sh.Skewness.Value, p), Vals: vals})
		} else if n <= 3 {
			v.Reasons = append(v.Reasons, Reason{Code: "few-readings", Text: w.reasonFewReadings(n), Vals: map[string]float64{"n": float64(n)}})
		} else if n < tinyN {
			v.Reasons = append(v.Reasons, Reason{Code: "small-sample", Text: w.reasonSmallSample(n), Vals: map[string]float64{"n": float64(n)}})
		} else {
			v.Reasons = append(v.Reasons, Reason{Code: "shape-unknown", Text: w.reasonShapeUnknown()})
		}
		if !iqrZero && n > 3 {
			v.Reasons = append(v.Reasons, Reason{Code: "no-far-out", Text: w.reasonNoFarOut()})
		}
	}

	// Warnings.
	if n < smallN {
		v.Warnings = append(v.Warnings, Reason{Code: "small-sample", Text: w.warnSmallSample(n, smallN), Vals: map[string]float64{"n": float64(n)}})
	}
	if constant && n > 1 {
		v.Warnings = append(v.Warnings, Reason{Code: "constant", Text: w.warnConstant(), Vals: map[string]float64{"n": float64(n)}})
	}
	res := step
	if !(res > 0) {
		res = rep.Counts.Resolution
	}
	if res > 0 && opts.LSL != nil && opts.USL != nil {
		steps := (*opts.USL - *opts.LSL) / res
		if steps < minStepsTolerance {
			v.Warnings = append(v.Warnings, Reason{Code: "coarse-for-tolerance", Text: w.warnCoarseForTolerance(res, steps, minStepsTolerance), Vals: map[string]float64{"step": res, "steps": steps}})
		}
	}
	if res > 0 && !constant && s != nil && n >= 2 && s.SD/res < minStepsSD {
		v.Warnings = append(v.Warnings, Reason{Code: "coarse-for-spread", Text: w.warnCoarseForSpread(s.SD, s.SD/res, res), Vals: map[string]float64{"step": res, "sd": s.SD, "steps": s.SD / res}})
	}
	if n >= smallN && !constant && (distinct < 10 || maxRun*4 > n) {
		v.Warnings = append(v.Warnings, Reason{Code: "heavy-ties", Text: w.warnHeavyTies(distinct, n, maxRun), Vals: map[string]float64{"distinct": float64(distinct), "maxCount": float64(maxRun)}})
	}
}

// restSkew is the skewness of the readings inside Tukey's outer fences
// (3 IQR beyond the quartiles): the verdict's shape reason rests on it
// when some readings lie beyond them, so that two far-out readings do
// not make the data "skewed".
type restSkew struct {
	ok           bool
	far          int     // readings beyond the outer fences
	below, above int     // of which below and above
	g1, p        float64 // G1 of the rest (Joanes and Gill 1998) and D'Agostino's p (-1 when n < 8)
}

func (r restSkew) skewed() bool {
	return abs(r.g1) >= skewStrong || (abs(r.g1) >= skewModerate && r.p >= 0 && r.p < skewAlpha)
}

// restSkewOf computes restSkew for the sample.
func restSkewOf(s *sample) restSkew {
	var r restSkew
	if s.n < tinyN || s.constant {
		return r
	}
	lo, hi := s.fences(s.q1, s.q3, 3, 1)
	r.below, r.above = s.countBelow(lo), s.countAbove(hi)
	r.far = r.below + r.above
	if r.far == 0 || s.n-r.far < tinyN {
		return r
	}
	sm, ok := s.partShape(r.below, s.n-r.above)
	if !ok || !finite(sm.G1) {
		return r
	}
	r.ok, r.g1, r.p = true, sm.G1, -1
	if z, ok := method.DAgostinoSkewZ(sm.Sqrtb1, s.n-r.far); ok && s.n-r.far >= method.SkewTestMinN {
		r.p = method.TwoSidedNormalP(z)
	}
	return r
}

func sideOf(g1 float64) string {
	if g1 < 0 {
		return "left"
	}
	return "right"
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}

// decimalMarkWarnings puts the reader's decimal-mark trouble into the
// verdict: values left out because the column mixes marks (code
// "mixed-decimal-marks": the mean and median come from the rest), and a
// column of "1,234"-like values read by the default mark
// ("ambiguous-decimal-mark": the other reading is 1000 times larger or
// smaller).
func decimalMarkWarnings(rep *Report, w words, cv *colView, n int) {
	v := &rep.Verdict
	if cv.mixedDropped > 0 {
		v.Warnings = append(v.Warnings, Reason{Code: "mixed-decimal-marks", Text: w.warnMixedMarks(cv.name, cv.decimalComma, cv.mixedDropped, n),
			Vals: map[string]float64{"dropped": float64(cv.mixedDropped), "used": float64(n)}})
	}
	if cv.ambiguous {
		v.Warnings = append(v.Warnings, Reason{Code: "ambiguous-decimal-mark", Text: w.warnAmbiguousMark(cv.name, cv.decimalComma),
			Vals: map[string]float64{"factor": 1000}})
	}
}
