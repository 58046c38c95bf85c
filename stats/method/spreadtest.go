package method

import (
	"math"
)

// This file: tests of a difference in spread among groups.

// BrownForsythe is Levene's (1960) test centred on the group medians, as
// proposed by Brown and Forsythe (1974, "Robust tests for the equality of
// variances", JASA 69, 364-367): the one-way ANOVA F test of the absolute
// deviations |x - median| of each group. Groups already in ascending
// order are used as they are; others are copied and sorted.
func BrownForsythe(groups [][]float64) (GroupFTest, error) {
	if err := grpCheck(groups, false); err != nil {
		return GroupFTest{}, err
	}
	ms := make([]grpMoments, len(groups))
	for i, g := range groups {
		s := grpSortedView(g)
		med := grpMedianSorted(s)
		// mean and variance of |x - med|, two passes
		n := float64(len(s))
		sum := 0.0
		for _, v := range s {
			sum += math.Abs(v - med)
		}
		m := sum / n
		var ss, r float64
		for _, v := range s {
			d := math.Abs(v-med) - m
			ss += d * d
			r += d
		}
		vr := (ss - r*r/n) / (n - 1)
		if vr < 0 {
			vr = 0
		}
		ms[i] = grpMoments{n: n, mean: m + r/n, variance: vr}
	}
	a, err := grpANOVA(ms)
	if err != nil {
		return GroupFTest{}, err
	}
	return a.GroupFTest, nil
}

func grpMedianSorted(s []float64) float64 {
	n := len(s)
	if n%2 == 1 {
		return s[n/2]
	}
	return s[n/2-1]/2 + s[n/2]/2
}

// BartlettTest is Bartlett's statistic (chi-squared on DF degrees of
// freedom) and its upper-tail p-value.
type BartlettTest struct {
	K2, DF, P float64
}

// Bartlett is Bartlett's (1937) test of equal variances for normal data
// ("Properties of sufficiency and statistical tests", Proc. R. Soc. A 160,
// 268-282).
func Bartlett(groups [][]float64) (BartlettTest, error) {
	if err := grpCheck(groups, false); err != nil {
		return BartlettTest{}, err
	}
	ms := grpAllMoments(groups)
	k := float64(len(ms))
	var N, sv, sl, sinv float64
	for i, m := range ms {
		if !(m.variance > 0) {
			return BartlettTest{}, grpErr(GroupsNoSpread, i, int(m.n))
		}
		N += m.n
		sv += (m.n - 1) * m.variance
		sl += (m.n - 1) * math.Log(m.variance)
		sinv += 1 / (m.n - 1)
	}
	sp := sv / (N - k)
	stat := ((N-k)*math.Log(sp) - sl) / (1 + (sinv-1/(N-k))/(3*(k-1)))
	if stat < 0 { // rounding when all variances are equal
		stat = 0
	}
	b := BartlettTest{K2: stat, DF: k - 1}
	b.P = chiSquaredSurvival(b.DF, stat)
	if !grpFinite(b.K2, b.P) {
		return BartlettTest{}, grpErr(GroupsNotFinite, -1, 0)
	}
	return b, nil
}

// SDRatioResult is the ratio of the largest to the smallest group SD
// (Largest and Smallest are their group indices). For two groups it also
// holds the F test of equal variances (F = the variance ratio, two-sided
// P) and the interval [Lo, Hi] for the ratio of the SDs at Level; with
// more groups HasCI is false and those fields are zero.
type SDRatioResult struct {
	Ratio             float64
	Largest, Smallest int
	HasCI             bool
	Lo, Hi, Level     float64
	F, DF1, DF2, P    float64
}

// SDRatio is the ratio of the largest to the smallest SD; for two groups
// with the F-based interval of the variance ratio (Fisher 1924; Snedecor
// and Cochran 1989, "Statistical Methods", 8th ed., sec. 6.12), square
// rooted for the SDs.
func SDRatio(groups [][]float64, level float64) (SDRatioResult, error) {
	if err := grpCheck(groups, false); err != nil {
		return SDRatioResult{}, err
	}
	if !grpLevelOK(level) {
		return SDRatioResult{}, grpErr(GroupsBadLevel, -1, 0)
	}
	ms := grpAllMoments(groups)
	lg, sm := 0, 0
	for i, m := range ms {
		if m.variance > ms[lg].variance {
			lg = i
		}
		if m.variance < ms[sm].variance {
			sm = i
		}
	}
	if lg == sm { // all variances equal: the first two
		lg, sm = 0, 1
	}
	if !(ms[sm].variance > 0) {
		return SDRatioResult{}, grpErr(GroupsNoSpread, sm, int(ms[sm].n))
	}
	vr := ms[lg].variance / ms[sm].variance
	r := SDRatioResult{Ratio: math.Sqrt(vr), Largest: lg, Smallest: sm}
	if len(groups) == 2 {
		d1, d2 := ms[lg].n-1, ms[sm].n-1
		a := (1 - level) / 2
		r.HasCI, r.Level = true, level
		r.Lo = math.Sqrt(vr / fQuantile(d1, d2, 1-a))
		r.Hi = math.Sqrt(vr / fQuantile(d1, d2, a))
		r.F, r.DF1, r.DF2 = vr, d1, d2
		r.P = math.Min(1, 2*math.Min(fCDF(d1, d2, vr), fSurvival(d1, d2, vr)))
	}
	if !grpFinite(r.Ratio, r.Lo, r.Hi, r.F, r.P) {
		return SDRatioResult{}, grpErr(GroupsNotFinite, -1, 0)
	}
	return r, nil
}
