package stats

import (
	"fmt"
	"math"

	"lotlens/stats/decimal"
	"lotlens/stats/method"
)

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
func shapeSection(sorted []float64, mean, sd float64, ps *decimal.PowerSums) (*Shape, []Note) {
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
	var sm method.ShapeMoments
	ok := false
	if ps != nil {
		sm, ok = method.ShapeExact(*ps)
	}
	if !ok {
		sm, ok = method.ShapeBinary(sorted, mean, sd)
	}
	if ok && finite(sm.G1) && finite(sm.SES) {
		sh.Skewness = &Moment{Value: sm.G1, SE: sm.SES}
	} else {
		note("shape.skewness", "The skewness could not be computed for these values.")
	}
	var zs, zk float64
	okS, okK := false, false
	if n >= method.SkewTestMinN {
		if z, ok := method.DAgostinoSkewZ(sm.Sqrtb1, n); ok && sh.Skewness != nil {
			zs, okS = z, true
			sh.Skewness.Test = &Test{Name: "D'Agostino skewness", Statistic: z, P: method.TwoSidedNormalP(z),
				Method: "normal approximation to √b1 (D'Agostino 1970)"}
		}
	} else {
		note("shape.skewness.test", "The skewness test needs at least %d values; there are %d.", method.SkewTestMinN, n)
	}
	if n >= 4 {
		if ok && sm.HasKurtosis && finite(sm.G2) && finite(sm.SEK) {
			sh.Kurtosis = &Moment{Value: sm.G2, SE: sm.SEK}
		} else {
			note("shape.kurtosis", "The kurtosis could not be computed for these values.")
		}
	} else {
		note("shape.kurtosis", "The kurtosis needs at least 4 values; there are %d.", n)
	}
	if n >= method.KurtTestMinN {
		if z, ok := method.AnscombeGlynnZ(sm.B2, n); ok && sh.Kurtosis != nil {
			zk, okK = z, true
			sh.Kurtosis.Test = &Test{Name: "Anscombe-Glynn kurtosis", Statistic: z, P: method.TwoSidedNormalP(z),
				Method: "normal approximation to b2 (Anscombe and Glynn 1983)"}
		} else {
			note("shape.kurtosis.test", "The kurtosis test could not be computed for these values.")
		}
	} else if n >= 4 {
		note("shape.kurtosis.test", "The kurtosis test needs at least %d values; there are %d.", method.KurtTestMinN, n)
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
	} else if n >= method.KurtTestMinN {
		note("shape.omnibus", "The K² omnibus test could not be computed for these values.")
	} else {
		note("shape.omnibus", "The K² omnibus test needs at least %d values; there are %d.", method.KurtTestMinN, n)
	}
	if n > method.ShapiroMaxN && sh.Large == nil {
		note("shape.large", "No normality test for large samples could be computed for these values.")
	}

	if n >= method.ShapiroMinN && n <= method.ShapiroMaxN {
		if w, p, ok := method.ShapiroWilk(sorted, mean); ok {
			sh.Shapiro = &Test{Name: "Shapiro-Wilk", Statistic: w, P: p, Method: "Royston (1995) AS R94"}
		} else {
			note("shape.shapiroWilk", "Shapiro-Wilk could not be computed for these values.")
		}
	} else {
		note("shape.shapiroWilk", "Shapiro-Wilk is defined for 3 to 5000 values; there are %d. The D'Agostino-Pearson K² test is shown instead.", n)
	}
	if n >= method.AndersonMinN {
		a, astar, p := method.AndersonDarling(sorted, mean, sd)
		if finite(a) && finite(p) {
			sh.Anderson = &Test{Name: "Anderson-Darling", Statistic: a, P: p,
				Method: fmt.Sprintf("A² = %.4g; p from the adjusted A²* = A²(1+0.75/n+2.25/n²) = %.4g (D'Agostino and Stephens 1986)", a, astar)}
		} else {
			note("shape.andersonDarling", "Anderson-Darling could not be computed for these values.")
		}
	} else {
		note("shape.andersonDarling", "Anderson-Darling needs at least %d values; there are %d.", method.AndersonMinN, n)
	}
	return sh, notes
}
