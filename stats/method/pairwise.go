package method

import (
	"math"
	"math/bits"
	"slices"
	"sort"
)

// This file: pairwise comparisons of groups (Tukey-Kramer, Games-Howell,
// Mann-Whitney and Dunn's test with Holm's adjustment), Holm's adjustment
// itself and the compact letter display.

// Pairs are listed in the order (0,1), (0,2), ..., (0,k-1), (1,2), ...,
// (k-2,k-1): I < J.

// MeanPair is one pairwise comparison of means: Diff = mean[J] - mean[I],
// its standard error SE (the one of the studentized range: Q = |Diff|/SE),
// the degrees of freedom DF, the statistic Q, the p-value P (already
// adjusted for all k(k-1)/2 comparisons by the studentized range) and the
// simultaneous interval [Lo, Hi] for Diff at the level asked for.
type MeanPair struct {
	I, J               int
	Diff, SE, DF, Q, P float64
	Lo, Hi             float64
}

// TukeyKramer is Tukey's honestly significant difference with the
// Kramer (1956) adjustment for unequal sizes ("Extension of multiple range
// tests to group means with unequal numbers of replications", Biometrics
// 12, 307-310; Tukey 1953): pooled within-group variance, SE =
// √(MSW/2 (1/n_I + 1/n_J)), on N - k degrees of freedom, p-values and
// intervals from the studentized range for k means (PTukey, QTukey).
func TukeyKramer(groups [][]float64, level float64) ([]MeanPair, error) {
	if err := grpCheck(groups, false); err != nil {
		return nil, err
	}
	if !grpLevelOK(level) {
		return nil, grpErr(GroupsBadLevel, -1, 0)
	}
	ms := grpAllMoments(groups)
	a, err := grpANOVA(ms)
	if err != nil {
		return nil, err
	}
	k := len(ms)
	df := a.DF2
	q, err := QTukey(level, k, df)
	if err != nil {
		return nil, grpErr(GroupsSmall, -1, 0)
	}
	out := make([]MeanPair, 0, k*(k-1)/2)
	for i := 0; i < k; i++ {
		for j := i + 1; j < k; j++ {
			se := math.Sqrt(a.MSWithin / 2 * (1/ms[i].n + 1/ms[j].n))
			p, err := grpPairMean(i, j, ms, se, df, q, k)
			if err != nil {
				return nil, err
			}
			out = append(out, p)
		}
	}
	return out, nil
}

func grpPairMean(i, j int, ms []grpMoments, se, df, q float64, k int) (MeanPair, error) {
	d := ms[j].mean - ms[i].mean
	r := MeanPair{I: i, J: j, Diff: d, SE: se, DF: df, Q: math.Abs(d) / se}
	c, err := PTukey(r.Q, k, df)
	if err != nil {
		return MeanPair{}, grpErr(GroupsSmall, -1, 0)
	}
	r.P = math.Min(1, math.Max(0, 1-c))
	r.Lo, r.Hi = d-q*se, d+q*se
	if !grpFinite(r.Diff, r.SE, r.Q, r.P, r.Lo, r.Hi) {
		return MeanPair{}, grpErr(GroupsNotFinite, -1, 0)
	}
	return r, nil
}

// GamesHowell is the Games and Howell (1976) comparison of means without
// assuming equal variances ("Pairwise multiple comparison procedures with
// unequal n's and/or variances: a Monte Carlo study", J. Educ. Statist. 1,
// 113-125): SE = √((s_I²/n_I + s_J²/n_J)/2), Welch-Satterthwaite degrees
// of freedom for each pair, p-values and intervals from the studentized
// range for k means. Pairs whose DF falls below 2 are refused (the
// studentized range needs df >= 2).
func GamesHowell(groups [][]float64, level float64) ([]MeanPair, error) {
	if err := grpCheck(groups, false); err != nil {
		return nil, err
	}
	if !grpLevelOK(level) {
		return nil, grpErr(GroupsBadLevel, -1, 0)
	}
	ms := grpAllMoments(groups)
	k := len(ms)
	for i, m := range ms {
		if !(m.variance > 0) {
			return nil, grpErr(GroupsNoSpread, i, int(m.n))
		}
	}
	out := make([]MeanPair, 0, k*(k-1)/2)
	for i := 0; i < k; i++ {
		for j := i + 1; j < k; j++ {
			vi, vj := ms[i].variance/ms[i].n, ms[j].variance/ms[j].n
			df := (vi + vj) * (vi + vj) / (vi*vi/(ms[i].n-1) + vj*vj/(ms[j].n-1))
			df = math.Max(df, 2) // never below 2 for n >= 3 (each term >= n-1 >= 2); rounding guard
			q, err := QTukey(level, k, df)
			if err != nil {
				return nil, grpErr(GroupsNotFinite, -1, 0)
			}
			p, err := grpPairMean(i, j, ms, math.Sqrt((vi+vj)/2), df, q, k)
			if err != nil {
				return nil, err
			}
			out = append(out, p)
		}
	}
	return out, nil
}

// RankPair is one pairwise rank comparison: Stat is the Mann-Whitney W of
// group I against group J (PairwiseMannWhitney) or Dunn's z for mean rank
// of J minus mean rank of I (Dunn); P is the unadjusted two-sided p-value,
// PAdj the one adjusted by Holm's method over all k(k-1)/2 pairs; Exact
// tells whether P came from the exact distribution (Mann-Whitney only).
type RankPair struct {
	I, J          int
	Stat, P, PAdj float64
	Exact         bool
}

// PairwiseMannWhitney is the Mann-Whitney / Wilcoxon rank-sum test for
// each pair of groups (Wilcoxon 1945; Mann and Whitney 1947; exact or
// normal approximation as in MannWhitney) with Holm's (1979) adjustment,
// as R's pairwise.wilcox.test. Groups already in ascending order are used
// as they are.
func PairwiseMannWhitney[T RankNumber](groups [][]T) ([]RankPair, error) {
	if err := grpCheck(groups, false); err != nil {
		return nil, err
	}
	s := grpSortedViews(groups)
	k := len(s)
	dists := map[[2]int]grpWilcoxDist{}
	out := make([]RankPair, 0, k*(k-1)/2)
	for i := 0; i < k; i++ {
		for j := i + 1; j < k; j++ {
			m, n := len(s[i]), len(s[j])
			w, tie := grpPairRank(s[i], s[j])
			exact := m < grpExactMax && n < grpExactMax && tie == 0
			key := [2]int{min(m, n), max(m, n)}
			p, _, err := grpRankSumP(w, tie, m, n, exact, func() grpWilcoxDist {
				d, ok := dists[key]
				if !ok {
					d = grpNewWilcoxDist(m, n)
					dists[key] = d
				}
				return d
			})
			if err != nil {
				// all readings of the pair tied: no evidence of a difference
				p = 1
			}
			out = append(out, RankPair{I: i, J: j, Stat: w, P: p, Exact: exact})
		}
	}
	return holmAdjust(out)
}

// Dunn is Dunn's (1964) test of all pairs after a Kruskal-Wallis test
// ("Multiple comparisons using rank sums", Technometrics 6, 241-252): the
// groups' mean ranks in the joint ranking, z = (R̄_J - R̄_I) /
// √((N(N+1)/12 - Σ(t³-t)/(12(N-1))) (1/n_I + 1/n_J)) with the correction
// for ties, two-sided normal p-values, adjusted by Holm's (1979) method.
// Groups already in ascending order are used as they are.
func Dunn[T RankNumber](groups [][]T) ([]RankPair, error) {
	if err := grpCheck(groups, false); err != nil {
		return nil, err
	}
	rk := grpRankSums(grpSortedViews(groups))
	return grpDunn(groups, rk)
}

func grpDunn[T RankNumber](groups [][]T, rk grpRanks) ([]RankPair, error) {
	k := len(groups)
	N := rk.n
	v := N*(N+1)/12 - rk.tie/(12*(N-1))
	if !(v > 0) {
		return nil, grpErr(GroupsNoSpread, -1, 0)
	}
	out := make([]RankPair, 0, k*(k-1)/2)
	for i := 0; i < k; i++ {
		for j := i + 1; j < k; j++ {
			ni, nj := float64(len(groups[i])), float64(len(groups[j]))
			z := (rk.sums[j]/nj - rk.sums[i]/ni) / math.Sqrt(v*(1/ni+1/nj))
			p := TwoSidedNormalP(z)
			if !grpFinite(z, p) {
				return nil, grpErr(GroupsNotFinite, -1, 0)
			}
			out = append(out, RankPair{I: i, J: j, Stat: z, P: p})
		}
	}
	return holmAdjust(out)
}

// Holm is Holm's (1979) step-down adjustment of p-values for multiple
// tests ("A simple sequentially rejective multiple test procedure",
// Scand. J. Statist. 6, 65-70), as R's p.adjust(p, "holm"): the i-th
// smallest of m p-values is multiplied by m - i + 1, made non-decreasing
// in that order and capped at 1. The result is in the order of p.
func Holm(p []float64) ([]float64, error) {
	m := len(p)
	for _, v := range p {
		if !(v >= 0 && v <= 1) {
			return nil, grpErr(GroupsNotFinite, -1, 0)
		}
	}
	idx := make([]int, m)
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool { return p[idx[a]] < p[idx[b]] })
	out := make([]float64, m)
	run := 0.0
	for r, i := range idx {
		v := math.Min(1, float64(m-r)*p[i])
		run = math.Max(run, v)
		out[i] = run
	}
	return out, nil
}

// grpMaxLetters caps the letter display (each letter is a maximal set of
// groups no two of which differ; adversarial patterns have exponentially
// many).
const grpMaxLetters = 4096

// CompactLetters is the compact letter display of which groups differ,
// by the insert-and-absorb algorithm with the sweep of Piepho (2004, "An
// algorithm for a letter-based representation of all-pairwise
// comparisons", J. Comput. Graph. Statist. 13, 456-466): two groups share
// a letter exactly when differ(i, j) is false. order gives the groups in
// the order letters are handed out (e.g. by descending centre; nil for
// 0..k-1): letter 0 goes first to order[0]'s letters, and so on. The
// result holds, for each group, its letters as ascending indices (0 for
// the first letter; the glyphs are the caller's). differ is called with
// i < j only.
func CompactLetters(k int, differ func(i, j int) bool, order []int) ([][]int, error) {
	if k < 1 || k > MaxGroups {
		return nil, grpErr(GroupsTooMany, -1, 0)
	}
	if order == nil {
		order = make([]int, k)
		for i := range order {
			order[i] = i
		}
	}
	if len(order) != k {
		return nil, grpErr(GroupsTooFew, -1, 0)
	}
	seen := uint64(0)
	for _, g := range order {
		if g < 0 || g >= k || seen&(1<<g) != 0 {
			return nil, grpErr(GroupsTooFew, g, 0)
		}
		seen |= 1 << g
	}
	dif := make([]uint64, k) // dif[i]: groups differing from i
	for i := 0; i < k; i++ {
		for j := i + 1; j < k; j++ {
			if differ(i, j) {
				dif[i] |= 1 << j
				dif[j] |= 1 << i
			}
		}
	}
	cols := []uint64{seen} // one letter for all
	for i := 0; i < k; i++ {
		for j := i + 1; j < k; j++ {
			if dif[i]&(1<<j) == 0 {
				continue
			}
			// insert: split every letter holding both
			both := uint64(1)<<i | uint64(1)<<j
			var next []uint64
			for _, c := range cols {
				if c&both == both {
					next = append(next, c&^(1<<i), c&^(1<<j))
				} else {
					next = append(next, c)
				}
			}
			// absorb: drop letters contained in another
			cols = grpAbsorb(next)
			if len(cols) > grpMaxLetters {
				return nil, grpErr(GroupsTooComplex, -1, 0)
			}
		}
	}
	// sweep: drop a group from a letter when every group it meets there
	// also meets it in another letter, and it keeps a letter
	for ci := range cols {
		for g := 0; g < k; g++ {
			if cols[ci]&(1<<g) == 0 {
				continue
			}
			ok := true
			nLetters := 0
			for cj, c := range cols {
				if c&(1<<g) != 0 && cj != ci {
					nLetters++
				}
			}
			if nLetters == 0 {
				continue
			}
			rest := cols[ci] &^ (1 << g)
			for rest != 0 && ok {
				h := bits.TrailingZeros64(rest)
				rest &^= 1 << h
				found := false
				for cj, c := range cols {
					if cj != ci && c&(1<<g) != 0 && c&(1<<h) != 0 {
						found = true
						break
					}
				}
				ok = found
			}
			if ok {
				cols[ci] &^= 1 << g
			}
		}
	}
	cols = slices.DeleteFunc(cols, func(c uint64) bool { return c == 0 })
	// letters in the order of the groups they first reach
	pos := make([]int, k)
	for r, g := range order {
		pos[g] = r
	}
	key := func(c uint64) []int {
		var ks []int
		for c != 0 {
			g := bits.TrailingZeros64(c)
			c &^= 1 << g
			ks = append(ks, pos[g])
		}
		slices.Sort(ks)
		return ks
	}
	slices.SortStableFunc(cols, func(a, b uint64) int { return slices.Compare(key(a), key(b)) })
	out := make([][]int, k)
	for li, c := range cols {
		for c != 0 {
			g := bits.TrailingZeros64(c)
			c &^= 1 << g
			out[g] = append(out[g], li)
		}
	}
	return out, nil
}

func grpAbsorb(cols []uint64) []uint64 {
	slices.Sort(cols)
	cols = slices.Compact(cols)
	out := cols[:0:0]
	for i, c := range cols {
		sub := false
		for j, d := range cols {
			if i != j && c&d == c {
				sub = true
				break
			}
		}
		if !sub {
			out = append(out, c)
		}
	}
	return out
}

// holmAdjust fills each pair's PAdj: its p-value adjusted over all the
// pairs by Holm's (1979) method.
func holmAdjust(out []RankPair) ([]RankPair, error) {
	ps := make([]float64, len(out))
	for i, p := range out {
		ps[i] = p.P
	}
	adj, err := Holm(ps)
	if err != nil {
		return nil, err
	}
	for i := range out {
		out[i].PAdj = adj[i]
	}
	return out, nil
}
