package stats

import (
	"math"

	"lotlens/stats/decimal"
	"lotlens/stats/method"
)

// Moment is a shape statistic with its standard error and test.
type Moment struct {
	Value float64 `json:"value"`
	SE    float64 `json:"se"`
	Test  *Test   `json:"test,omitempty"`
}

// Shape of the distribution.
type Shape struct {
	Skewness *Moment `json:"skewness,omitempty"` // G1, adjusted
	Kurtosis *Moment `json:"kurtosis,omitempty"` // G2, adjusted excess
	Omnibus  *Test   `json:"omnibus,omitempty"`  // D'Agostino-Pearson K2
	Shapiro  *Test   `json:"shapiroWilk,omitempty"`
	Anderson *Test   `json:"andersonDarling,omitempty"`
	// Large is the normality test used above n = 5000 (named in Test.Name).
	Large *Test `json:"large,omitempty"`
}

// largeTestMinN: above Shapiro-Wilk's range the K² omnibus test leads.
const largeTestMinN = method.ShapiroMaxN + 1

// shapeSection builds the shape section from the ascending data: mean and
// sd (divisor n-1) are the best available; ps, when not nil, are the exact
// sums of powers of the decimals as typed, and the moments then come from
// them (method.ShapeExact), else from binary arithmetic (method.ShapeBinary).
//
//   - Skewness G1 and excess kurtosis G2 with their standard errors (Joanes
//     and Gill 1998), see method.ShapeMoments.
//   - D'Agostino's (1970) test of √b1 (n >= 8), the Anscombe and Glynn
//     (1983) test of b2 (n >= 20) and the K² omnibus (D'Agostino, Belanger
//     and D'Agostino 1990).
//   - Shapiro-Wilk W for 3 <= n <= 5000 (Royston 1995, AS R94); above,
//     Shape.Large is the K² omnibus test.
//   - Anderson-Darling A² against the normal with estimated mean and SD
//     (n >= 8; D'Agostino and Stephens 1986).
//
// Figures that cannot be computed are left out, each with a Note.
func shapeSection(w words, sorted []float64, mean, sd float64, ps *decimal.PowerSums) (*Shape, []Note) {
	n := len(sorted)
	var notes []Note
	note := func(field, text string) {
		notes = append(notes, Note{Field: field, Text: text})
	}
	failed := func(field string) { note(field, w.notComputed(field)) }
	needs := func(field string, min int) { note(field, w.needsN(field, min, n)) }
	sh := &Shape{}
	if n < 3 {
		note("shape", w.shapeFew(n))
		return nil, notes
	}
	if !(sd > 0) || math.IsInf(sd, 0) || math.IsNaN(mean) || math.IsInf(mean, 0) {
		note("shape", w.shapeConstant())
		return nil, notes
	}
	sk, sm, ok := skewness(w, sorted, mean, sd, ps)
	sh.Skewness = sk
	if sk == nil {
		failed("shape.skewness")
	}
	var zs, zk float64
	okS, okK := false, false
	if sk != nil && sk.Test != nil {
		zs, okS = sk.Test.Statistic, true
	}
	if n < method.SkewTestMinN {
		needs("shape.skewness.test", method.SkewTestMinN)
	}
	if n >= 4 {
		if ok && sm.HasKurtosis && finite(sm.G2) && finite(sm.SEK) {
			sh.Kurtosis = &Moment{Value: sm.G2, SE: sm.SEK}
		} else {
			failed("shape.kurtosis")
		}
	} else {
		needs("shape.kurtosis", 4)
	}
	if n >= method.KurtTestMinN {
		if z, ok := method.AnscombeGlynnZ(sm.B2, n); ok && sh.Kurtosis != nil {
			zk, okK = z, true
			sh.Kurtosis.Test = &Test{Name: testKurt, Statistic: z, P: method.TwoSidedNormalP(z), Method: w.kurtMethod()}
		} else {
			failed("shape.kurtosis.test")
		}
	} else if n >= 4 {
		needs("shape.kurtosis.test", method.KurtTestMinN)
	}
	if okS && okK {
		k2 := zs*zs + zk*zk
		df := 2.0
		sh.Omnibus = &Test{Name: testOmnibus, Statistic: k2, DF: &df, P: math.Exp(-k2 / 2), Method: w.omnibusMethod(false)}
		if n >= largeTestMinN {
			cp := *sh.Omnibus
			cp.DF = &df
			cp.Method = w.omnibusMethod(true)
			sh.Large = &cp
		}
	} else if n >= method.KurtTestMinN {
		failed("shape.omnibus")
	} else {
		needs("shape.omnibus", method.KurtTestMinN)
	}
	if n > method.ShapiroMaxN && sh.Large == nil {
		note("shape.large", w.noLargeTest())
	}

	if n >= method.ShapiroMinN && n <= method.ShapiroMaxN {
		if sw, p, ok := method.ShapiroWilk(sorted, mean); ok {
			sh.Shapiro = &Test{Name: testShapiro, Statistic: sw, P: p, Method: w.shapiroMethod()}
		} else {
			failed("shape.shapiroWilk")
		}
	} else {
		note("shape.shapiroWilk", w.shapiroRange(n))
	}
	if n >= method.AndersonMinN {
		a, astar, p := method.AndersonDarling(sorted, mean, sd)
		if finite(a) && finite(p) {
			sh.Anderson = &Test{Name: testAnderson, Statistic: a, P: p, Method: w.andersonMethod(a, astar)}
		} else {
			failed("shape.andersonDarling")
		}
	} else {
		needs("shape.andersonDarling", method.AndersonMinN)
	}
	return sh, notes
}

// skewness is the adjusted skewness G1 with its standard error and, from
// method.SkewTestMinN readings, D'Agostino's (1970) test: the figures the
// verdict's rules read. sm are the moments behind it, exact from ps when
// given (method.ShapeExact), else binary (method.ShapeBinary); ok is false
// when they cannot be computed, and sk is nil when G1 is not finite. The
// shape section and each group of the groups section use it.
func skewness(w words, sorted []float64, mean, sd float64, ps *decimal.PowerSums) (sk *Moment, sm method.ShapeMoments, ok bool) {
	n := len(sorted)
	if n < 3 || !(sd > 0) || math.IsInf(sd, 0) || !finite(mean) {
		return nil, sm, false
	}
	if ps != nil {
		sm, ok = method.ShapeExact(*ps)
	}
	if !ok {
		sm, ok = method.ShapeBinary(sorted, mean, sd)
	}
	if !ok || !finite(sm.G1) || !finite(sm.SES) {
		return nil, sm, ok
	}
	sk = &Moment{Value: sm.G1, SE: sm.SES}
	if n >= method.SkewTestMinN {
		if z, zok := method.DAgostinoSkewZ(sm.Sqrtb1, n); zok {
			sk.Test = &Test{Name: testSkew, Statistic: z, P: method.TwoSidedNormalP(z), Method: w.skewMethod()}
		}
	}
	return sk, sm, ok
}
