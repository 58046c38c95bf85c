package method

import (
	"fmt"
	"math"
)

// This file: the group methods' shared screening and errors, and the
// tests of a difference in means: one-way ANOVA, Welch's ANOVA, Welch's
// t test with the interval for the difference, Hedges' g.
//
// Every group method takes the readings of each group as one slice, at
// most MaxGroups groups, each with at least MinGroupReadings finite
// readings; ScreenGroups says which groups to leave out (and why) before
// the call. A method that cannot compute returns a *GroupsError (a code
// and the group concerned), never NaN or Inf and never a panic.

// Limits of the group methods.
const (
	MinGroupReadings = 3  // fewer readings: the group is left out of the tests
	MaxGroups        = 50 // more groups: the methods refuse
)

// GroupsCode says why a group method could not compute, or why a group
// was left out.
type GroupsCode int

// The codes.
const (
	GroupsOK         GroupsCode = iota
	GroupsTooFew                // fewer than two groups (or, for a two-group method, not exactly two)
	GroupsTooMany               // more than MaxGroups groups
	GroupsSmall                 // a group has fewer than MinGroupReadings readings
	GroupsNoSpread              // no variation where the method needs some (constant group, all readings tied)
	GroupsNotFinite             // a reading is NaN or infinite, or a result would not be finite
	GroupsBadLevel              // the confidence level is not strictly between 0 and 1
	GroupsTooComplex            // the letter display would need too many letters
)

// GroupsError is the error of the group methods: a code, the index of the
// group concerned (-1 when none) and that group's number of readings.
type GroupsError struct {
	Code  GroupsCode
	Group int
	N     int
}

func (e *GroupsError) Error() string {
	if e.Group >= 0 {
		return fmt.Sprintf("method: groups: code %d at group %d (n = %d)", int(e.Code), e.Group, e.N)
	}
	return fmt.Sprintf("method: groups: code %d", int(e.Code))
}

func grpErr(code GroupsCode, g, n int) error { return &GroupsError{Code: code, Group: g, N: n} }

// GroupSkip is a group left out of the tests, with the reason.
type GroupSkip struct {
	Group int
	N     int
	Code  GroupsCode
}

// ScreenGroups returns the indices of the groups with at least
// MinGroupReadings readings (in order) and the others with the code
// GroupsSmall. Common practice: a group of one or two readings carries no
// usable estimate of its own spread.
func ScreenGroups(sizes []int) (keep []int, skipped []GroupSkip) {
	for i, n := range sizes {
		if n < MinGroupReadings {
			skipped = append(skipped, GroupSkip{Group: i, N: n, Code: GroupsSmall})
		} else {
			keep = append(keep, i)
		}
	}
	return keep, skipped
}

// grpCheck validates the groups: 2..MaxGroups groups (exactly two when
// two is set), each with MinGroupReadings finite readings.
func grpCheck[T RankNumber](groups [][]T, two bool) error {
	k := len(groups)
	if k < 2 || (two && k != 2) {
		return grpErr(GroupsTooFew, -1, 0)
	}
	if k > MaxGroups {
		return grpErr(GroupsTooMany, -1, 0)
	}
	for i, g := range groups {
		if len(g) < MinGroupReadings {
			return grpErr(GroupsSmall, i, len(g))
		}
		for _, v := range g {
			if f := float64(v); math.IsNaN(f) || math.IsInf(f, 0) {
				return grpErr(GroupsNotFinite, i, len(g))
			}
		}
	}
	return nil
}

func grpLevelOK(level float64) bool { return level > 0 && level < 1 }

// grpMoments is the mean and the sample variance (n-1) of one group, by
// two passes (the second corrected by the residual sum, Chan, Golub and
// LeVeque 1983).
type grpMoments struct {
	n        float64
	mean     float64
	variance float64
}

func grpMomentsOf(x []float64) grpMoments {
	n := float64(len(x))
	s := 0.0
	for _, v := range x {
		s += v
	}
	m := s / n
	var ss, r float64
	for _, v := range x {
		d := v - m
		ss += d * d
		r += d
	}
	m += r / n
	v := (ss - r*r/n) / (n - 1)
	if v < 0 {
		v = 0
	}
	return grpMoments{n: n, mean: m, variance: v}
}

func grpAllMoments(groups [][]float64) []grpMoments {
	ms := make([]grpMoments, len(groups))
	for i, g := range groups {
		ms[i] = grpMomentsOf(g)
	}
	return ms
}

func grpFinite(xs ...float64) bool {
	for _, x := range xs {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}

// GroupFTest is an F test: the statistic, its degrees of freedom and the
// upper-tail p-value.
type GroupFTest struct {
	F, DF1, DF2, P float64
}

// ANOVA is the one-way analysis of variance: the F test with the sums of
// squares and mean squares between and within the groups.
type ANOVA struct {
	GroupFTest
	SSBetween, SSWithin float64
	MSBetween, MSWithin float64
}

func grpFSurvival(f, d1, d2 float64) float64 {
	if f <= 0 {
		return 1
	}
	return fSurvival(d1, d2, f)
}

// OneWayANOVA is Fisher's one-way analysis of variance (Fisher 1925,
// "Statistical Methods for Research Workers", ch. VII) for a difference
// among the group means, assuming equal variances.
func OneWayANOVA(groups [][]float64) (ANOVA, error) {
	if err := grpCheck(groups, false); err != nil {
		return ANOVA{}, err
	}
	return grpANOVA(grpAllMoments(groups))
}

func grpANOVA(ms []grpMoments) (ANOVA, error) {
	k := float64(len(ms))
	var N, sum float64
	for _, m := range ms {
		N += m.n
		sum += m.n * m.mean
	}
	grand := sum / N
	var ssb, ssw float64
	for _, m := range ms {
		d := m.mean - grand
		ssb += m.n * d * d
		ssw += (m.n - 1) * m.variance
	}
	if !(ssw > 0) {
		return ANOVA{}, grpErr(GroupsNoSpread, -1, 0)
	}
	d1, d2 := k-1, N-k
	a := ANOVA{SSBetween: ssb, SSWithin: ssw, MSBetween: ssb / d1, MSWithin: ssw / d2}
	a.DF1, a.DF2 = d1, d2
	a.F = a.MSBetween / a.MSWithin
	a.P = grpFSurvival(a.F, d1, d2)
	if !grpFinite(a.F, a.P, ssb, ssw) {
		return ANOVA{}, grpErr(GroupsNotFinite, -1, 0)
	}
	return a, nil
}

// WelchANOVA is Welch's (1951) test for a difference among means without
// assuming equal variances ("On the comparison of several mean values: an
// alternative approach", Biometrika 38, 330-336); DF2 is fractional.
func WelchANOVA(groups [][]float64) (GroupFTest, error) {
	if err := grpCheck(groups, false); err != nil {
		return GroupFTest{}, err
	}
	ms := grpAllMoments(groups)
	k := float64(len(ms))
	var W, wm float64
	w := make([]float64, len(ms))
	for i, m := range ms {
		if !(m.variance > 0) {
			return GroupFTest{}, grpErr(GroupsNoSpread, i, int(m.n))
		}
		w[i] = m.n / m.variance
		W += w[i]
		wm += w[i] * m.mean
	}
	mw := wm / W
	var a, tmp float64
	for i, m := range ms {
		d := m.mean - mw
		a += w[i] * d * d
		u := 1 - w[i]/W
		tmp += u * u / (m.n - 1)
	}
	a /= k - 1
	tmp /= k*k - 1
	b := 1 + 2*(k-2)*tmp
	t := GroupFTest{F: a / b, DF1: k - 1, DF2: 1 / (3 * tmp)}
	t.P = grpFSurvival(t.F, t.DF1, t.DF2)
	if !grpFinite(t.F, t.DF2, t.P) {
		return GroupFTest{}, grpErr(GroupsNotFinite, -1, 0)
	}
	return t, nil
}

// WelchTTest is Welch's two-sample t test: Diff = mean(x) - mean(y), its
// standard error, the interval [Lo, Hi] at Level, t, its fractional
// degrees of freedom and the two-sided p-value.
type WelchTTest struct {
	Diff, SE, Lo, Hi, Level float64
	T, DF, P                float64
}

// WelchT is Welch's (1947) t test for two means with unequal variances
// ("The generalization of 'Student's' problem when several different
// population variances are involved", Biometrika 34, 28-35), degrees of
// freedom by Satterthwaite (1946).
func WelchT(x, y []float64, level float64) (WelchTTest, error) {
	if err := grpCheck([][]float64{x, y}, true); err != nil {
		return WelchTTest{}, err
	}
	if !grpLevelOK(level) {
		return WelchTTest{}, grpErr(GroupsBadLevel, -1, 0)
	}
	a, b := grpMomentsOf(x), grpMomentsOf(y)
	va, vb := a.variance/a.n, b.variance/b.n
	se := math.Sqrt(va + vb)
	if !(se > 0) {
		return WelchTTest{}, grpErr(GroupsNoSpread, -1, 0)
	}
	df := (va + vb) * (va + vb) / (va*va/(a.n-1) + vb*vb/(b.n-1))
	r := WelchTTest{Diff: a.mean - b.mean, SE: se, DF: df, Level: level}
	r.T = r.Diff / se
	r.P = math.Min(1, 2*tSurvival(df, math.Abs(r.T)))
	q := tQuantile(df, 1-(1-level)/2)
	r.Lo, r.Hi = r.Diff-q*se, r.Diff+q*se
	if !grpFinite(r.Diff, r.T, r.DF, r.P, r.Lo, r.Hi) {
		return WelchTTest{}, grpErr(GroupsNotFinite, -1, 0)
	}
	return r, nil
}

// HedgesG is the standardized difference of two means: D is Cohen's d,
// (mean(x) - mean(y)) over the pooled SD; G is Hedges' g, d times the
// exact small-sample correction J; SE and [Lo, Hi] at Level are its large
// sample standard error and normal interval.
type HedgesG struct {
	D, G, J, SE, Lo, Hi, Level float64
}

// Hedges is Hedges' g with the exact bias correction
// J = Γ(m/2) / (√(m/2) Γ((m-1)/2)), m = n1 + n2 - 2 (Hedges 1981,
// "Distribution theory for Glass's estimator of effect size and related
// estimators", J. Educ. Statist. 6, 107-128), and the standard error
// √((n1+n2)/(n1 n2) + g²/(2(n1+n2))) of Hedges and Olkin (1985,
// "Statistical Methods for Meta-Analysis", ch. 5).
func Hedges(x, y []float64, level float64) (HedgesG, error) {
	if err := grpCheck([][]float64{x, y}, true); err != nil {
		return HedgesG{}, err
	}
	if !grpLevelOK(level) {
		return HedgesG{}, grpErr(GroupsBadLevel, -1, 0)
	}
	a, b := grpMomentsOf(x), grpMomentsOf(y)
	m := a.n + b.n - 2
	sp := math.Sqrt(((a.n-1)*a.variance + (b.n-1)*b.variance) / m)
	if !(sp > 0) {
		return HedgesG{}, grpErr(GroupsNoSpread, -1, 0)
	}
	l1, _ := math.Lgamma(m / 2)
	l2, _ := math.Lgamma((m - 1) / 2)
	j := math.Exp(l1 - l2 - 0.5*math.Log(m/2))
	h := HedgesG{D: (a.mean - b.mean) / sp, J: j, Level: level}
	h.G = j * h.D
	h.SE = math.Sqrt((a.n+b.n)/(a.n*b.n) + h.G*h.G/(2*(a.n+b.n)))
	z := NormalQuantile(1 - (1-level)/2)
	h.Lo, h.Hi = h.G-z*h.SE, h.G+z*h.SE
	if !grpFinite(h.D, h.G, h.SE, h.Lo, h.Hi) {
		return HedgesG{}, grpErr(GroupsNotFinite, -1, 0)
	}
	return h, nil
}
