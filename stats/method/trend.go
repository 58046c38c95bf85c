package method

import (
	"errors"
	"fmt"
	"math"
	"slices"
)

// The drift checks take the readings in order. Where a decision rests on
// ties (signs of differences in Mann-Kendall and Sen, sides of the median
// in the runs test, ranks in Pettitt's test), they accept int64 mantissas
// at a common scale as well as float64: the caller converts each decimal
// as typed to its mantissa at the largest number of decimals in the
// column (12.30 and 12.3 both to 1230 at scale 2), so equal readings tie
// exactly. Two distinct decimals within float64's 15 significant digits
// also compare correctly as parsed float64, so the float64 path decides
// the same for such data. Figures in the units of the data (Sen's slope,
// means) come back in mantissa units when int64 is used: multiply by
// 10^−scale.

// Autocorrelation is the lag-1 autocorrelation of a series with two
// tests of zero autocorrelation.
type Autocorrelation struct {
	N  int
	R1 float64 // Σ(xₜ−x̄)(xₜ₊₁−x̄) / Σ(xₜ−x̄)²
	Z  float64 // R1·√N, standard normal under no autocorrelation (Bartlett 1946)
	PZ float64 // two-sided p-value of Z
	Q  float64 // Ljung-Box statistic at lag 1, N(N+2)·R1²/(N−1)
	P  float64 // its p-value from χ² with 1 degree of freedom (Ljung and Box 1978)
}

// Lag1Autocorrelation returns the lag-1 sample autocorrelation (Box and
// Jenkins 1970; as R's acf) with the large-sample test of Bartlett (1946)
// (standard error 1/√N) and the Ljung-Box (1978) test at lag 1. A strong
// positive autocorrelation makes limits from moving ranges too narrow.
// It needs at least 3 readings that are not all equal.
func Lag1Autocorrelation(x []float64) (Autocorrelation, error) {
	n := len(x)
	if n < 3 {
		return Autocorrelation{}, fmt.Errorf("%d readings: the autocorrelation needs at least 3", n)
	}
	mean := 0.0
	for _, v := range x {
		mean += v
	}
	mean /= float64(n)
	// the same sums in the same order as d_i² over every i and
	// d_i·d_(i+1) over i < n−1, with each d_i worked out once
	den, num := 0.0, 0.0
	d := x[0] - mean
	for _, v := range x[1:] {
		dn := v - mean
		den += d * d
		num += d * dn
		d = dn
	}
	den += d * d
	if !(den > 0) {
		return Autocorrelation{}, errors.New("all readings are equal: the autocorrelation is undefined")
	}
	r := num / den
	fn := float64(n)
	z := r * math.Sqrt(fn)
	q := fn * (fn + 2) * r * r / (fn - 1)
	return Autocorrelation{N: n, R1: r, Z: z, PZ: math.Erfc(math.Abs(z) / math.Sqrt2), Q: q,
		P: chiSquaredSurvival(1, q)}, nil
}

// RunsTest is the Wald-Wolfowitz runs test about the median.
type RunsTest struct {
	N            int // readings
	Above, Below int // readings above and below the median
	OnMedian     int // readings equal to the median, left out
	Runs         int // runs of readings on one side
	Expected, SD float64
	Z            float64 // (Runs − Expected)/SD, no continuity correction
	P            float64 // two-sided p-value: exact when Exact, else from Z
	Exact        bool
	Longest      int // the longest run, in readings
	LongestFirst int // its first and last reading (0-based indices into x)
	LongestLast  int
	LongestSide  int     // +1 above the median, −1 below
	Median       float64 // fewer runs than Expected: clustering or drift; more: over-adjustment
}

// ctlRunsExactMax bounds the readings for which the exact distribution is
// summed (O(N) terms, each from log-gamma).
const ctlRunsExactMax = 5000

// RunsAboutMedian is the runs test of Wald and Wolfowitz (1940) about the
// median: readings equal to the median are left out (common practice),
// the others are marked above or below, and the number of runs R is
// compared with its distribution given the counts n₁ above and n₂ below:
// mean 2n₁n₂/N + 1, variance 2n₁n₂(2n₁n₂ − N)/(N²(N−1)), N = n₁ + n₂.
// The p-value is exact (Swed and Eisenhart 1943, summed from the
// closed-form probabilities) for N <= 5000, and from the normal
// approximation without continuity correction above; two-sided, twice the
// smaller tail, at most 1. Also the longest run and where it lies. The
// median is decided without arithmetic: with an even count every reading
// lies at or below the lower middle value or at or above the upper one.
func RunsAboutMedian[T int64 | float64](x []T) (RunsTest, error) {
	r, err := RankSeries(x)
	if err != nil {
		return RunsTest{}, err
	}
	return RunsRanked(r)
}

// RunsRanked is RunsAboutMedian on ranks made by RankSeries (shared with
// the other rank tests of the same series).
func RunsRanked[T int64 | float64](r SeriesRanks[T]) (RunsTest, error) {
	n := r.N
	if n < 2 {
		return RunsTest{}, fmt.Errorf("%d readings: the runs test needs at least 2", n)
	}
	// the dense ranks of the lower and upper middle values
	lo, hi := r.rankAt((n-1)/2), r.rankAt(n/2)
	res := RunsTest{N: n, Median: (float64(r.Values[lo]) + float64(r.Values[hi])) / 2}
	prev, runStart := 0, 0
	curLen := 0
	for i, k := range r.Dense {
		var sd int
		switch {
		case k < lo || (k == lo && lo < hi):
			sd = -1
		case k > hi || (k == hi && lo < hi):
			sd = 1
		}
		switch sd {
		case 0:
			res.OnMedian++
			continue
		case 1:
			res.Above++
		default:
			res.Below++
		}
		if sd != prev {
			res.Runs++
			prev, runStart, curLen = sd, i, 0
		}
		curLen++
		if curLen > res.Longest {
			res.Longest, res.LongestFirst, res.LongestLast, res.LongestSide = curLen, runStart, i, sd
		}
	}
	if res.Above == 0 || res.Below == 0 {
		return res, errors.New("no readings on one side of the median: the runs test cannot be computed")
	}
	n1, n2 := float64(res.Above), float64(res.Below)
	nn := n1 + n2
	res.Expected = 2*n1*n2/nn + 1
	vr := 2 * n1 * n2 * (2*n1*n2 - nn) / (nn * nn * (nn - 1))
	res.SD = math.Sqrt(vr)
	if res.SD > 0 {
		res.Z = (float64(res.Runs) - res.Expected) / res.SD
	}
	if res.Above+res.Below <= ctlRunsExactMax {
		res.Exact = true
		le, ge := ctlRunsTails(res.Above, res.Below, res.Runs)
		res.P = math.Min(1, 2*math.Min(le, ge))
	} else {
		res.P = math.Erfc(math.Abs(res.Z) / math.Sqrt2)
	}
	return res, nil
}

// ctlRunsTails returns P(R <= r) and P(R >= r) for the number of runs of
// n1 and n2 items in random order: P(R = 2k) = 2·C(n1−1,k−1)·C(n2−1,k−1)/C(N,n1),
// P(R = 2k+1) = [C(n1−1,k)·C(n2−1,k−1) + C(n1−1,k−1)·C(n2−1,k)]/C(N,n1).
func ctlRunsTails(n1, n2, r int) (le, ge float64) {
	lc := func(a, b int) float64 {
		if b < 0 || b > a {
			return math.Inf(-1)
		}
		x, _ := math.Lgamma(float64(a + 1))
		y, _ := math.Lgamma(float64(b + 1))
		z, _ := math.Lgamma(float64(a - b + 1))
		return x - y - z
	}
	tot := lc(n1+n2, n1)
	for rr := 2; rr <= n1+n2; rr++ {
		var p float64
		if rr%2 == 0 {
			k := rr / 2
			p = 2 * math.Exp(lc(n1-1, k-1)+lc(n2-1, k-1)-tot)
		} else {
			k := rr / 2
			p = math.Exp(lc(n1-1, k)+lc(n2-1, k-1)-tot) + math.Exp(lc(n1-1, k-1)+lc(n2-1, k)-tot)
		}
		if rr <= r {
			le += p
		}
		if rr >= r {
			ge += p
		}
	}
	return math.Min(1, le), math.Min(1, ge)
}

func ctlFinite[T int64 | float64](x []T) error {
	for i, v := range x {
		f := float64(v)
		if math.IsNaN(f) || math.IsInf(f, 0) {
			return fmt.Errorf("reading %d is %g: readings must be finite", i, f)
		}
	}
	return nil
}

// MannKendall is the Mann-Kendall trend test.
type MannKendall struct {
	N         int
	S         int64   // Σ_{i<j} sign(xⱼ − xᵢ)
	VarS      float64 // with the tie correction
	Z         float64 // (S − sign(S))/√VarS, continuity corrected
	P         float64 // two-sided, normal approximation
	Tau       float64 // Kendall's tau-b of the readings against their order
	TieGroups int     // groups of equal readings (of two or more)
}

// MannKendallTest is the trend test of Mann (1945) with the variance of
// Kendall (1975) corrected for ties,
//
//	Var(S) = [n(n−1)(2n+5) − Σ t(t−1)(2t+5)] / 18
//
// over the groups of t equal readings, and the normal approximation with
// continuity correction (Z = 0 when S = 0). S is computed in O(n log n):
// S = P − Q where Q counts the pairs out of order (MannKendallRanked),
// P = n(n−1)/2 − Q − Σ t(t−1)/2 over the tie groups. Needs at least 3 readings; when all are equal
// VarS = 0 and P = 1.
func MannKendallTest[T int64 | float64](x []T) (MannKendall, error) {
	r, err := RankSeries(x)
	if err != nil {
		return MannKendall{}, err
	}
	return MannKendallRanked(r)
}

// MannKendallRanked is MannKendallTest on ranks made by RankSeries: the
// pairs out of order are counted with a binary indexed tree over the dense
// ranks (Fenwick 1994), O(n log d) for d distinct values, and the tie
// groups are the ranks' counts.
func MannKendallRanked[T int64 | float64](r SeriesRanks[T]) (MannKendall, error) {
	n := r.N
	if n < 3 {
		return MannKendall{}, fmt.Errorf("%d readings: the trend test needs at least 3", n)
	}
	d := len(r.Values)
	tree := make([]int32, d+1) // counts of earlier readings by dense rank, 1-based
	var q int64
	for i, k := range r.Dense {
		// earlier readings at or below rank k
		le := int64(0)
		for j := int(k) + 1; j > 0; j -= j & -j {
			le += int64(tree[j])
		}
		q += int64(i) - le
		for j := int(k) + 1; j <= d; j += j & -j {
			tree[j]++
		}
	}
	var ties int64
	tieTerm := 0.0
	groups := 0
	for k := range d {
		if t := r.Below[k+1] - r.Below[k]; t > 1 {
			groups++
			ties += t * (t - 1) / 2
			ft := float64(t)
			tieTerm += ft * (ft - 1) * (2*ft + 5)
		}
	}
	nn := int64(n) * int64(n-1) / 2
	p := nn - q - ties
	res := MannKendall{N: n, S: p - q, TieGroups: groups}
	fn := float64(n)
	res.VarS = (fn*(fn-1)*(2*fn+5) - tieTerm) / 18
	res.P = 1
	if res.VarS > 0 {
		sv := float64(res.S)
		switch {
		case res.S > 0:
			res.Z = (sv - 1) / math.Sqrt(res.VarS)
		case res.S < 0:
			res.Z = (sv + 1) / math.Sqrt(res.VarS)
		}
		res.P = math.Erfc(math.Abs(res.Z) / math.Sqrt2)
	}
	if nn-ties > 0 {
		res.Tau = float64(res.S) / math.Sqrt(float64(nn)*float64(nn-ties))
	}
	return res, nil
}

// SeriesRanks are the ranks of a series in order, made once by RankSeries
// and shared by the rank tests of the series (RunsRanked,
// MannKendallRanked, PettittRanked).
type SeriesRanks[T int64 | float64] struct {
	N      int
	Dense  []int32 // the dense rank of each reading, in order (0: the smallest value)
	Values []T     // the distinct values, ascending
	Below  []int64 // Below[k]: readings below Values[k]; Below[len(Values)] = N
}

// rankAt is the dense rank of the reading at 0-based position p of the
// sorted series.
func (r SeriesRanks[T]) rankAt(p int) int32 {
	k, _ := slices.BinarySearch(r.Below, int64(p)+1) // first k with Below[k] > p
	return int32(k - 1)
}

// rankCountMax bounds the range of integers RankSeries ranks by counting
// (one int32 per step, as decimal.Grid.CountSort): 4 steps a reading.
const rankCountMax = 4

// RankSeries ranks the readings x (finite) once for the rank tests:
// integers (mantissas of decimals as typed) whose range spans at most
// 4·n + 1024 steps by counting (Seward 1954), O(n + range); others by a
// sort of a copy and a binary search among the distinct values,
// O(n log n). Equal readings share a rank: ties are exact on integers.
func RankSeries[T int64 | float64](x []T) (SeriesRanks[T], error) {
	n := len(x)
	if err := ctlFinite(x); err != nil {
		return SeriesRanks[T]{}, err
	}
	r := SeriesRanks[T]{N: n, Dense: make([]int32, n)}
	if n == 0 {
		r.Below = []int64{0}
		return r, nil
	}
	if m, ok := any(x).([]int64); ok {
		lo, hi := m[0], m[0]
		for _, v := range m {
			lo, hi = min(lo, v), max(hi, v)
		}
		if span := uint64(hi - lo); hi-lo >= 0 && span < uint64(rankCountMax*n+1024) {
			count := make([]int32, span+1)
			for _, v := range m {
				count[v-lo]++
			}
			// count becomes the dense rank of each step that occurs
			vals := make([]int64, 0)
			below := make([]int64, 0)
			seen := int64(0)
			for j, c := range count {
				if c == 0 {
					continue
				}
				count[j] = int32(len(vals))
				vals = append(vals, lo+int64(j))
				below = append(below, seen)
				seen += int64(c)
			}
			for i, v := range m {
				r.Dense[i] = count[v-lo]
			}
			r.Values, r.Below = any(vals).([]T), append(below, int64(n))
			return r, nil
		}
	}
	s := slices.Clone(x)
	slices.Sort(s)
	for i := 0; i < n; {
		j := i + 1
		for j < n && s[j] == s[i] {
			j++
		}
		r.Values = append(r.Values, s[i])
		r.Below = append(r.Below, int64(i))
		i = j
	}
	r.Below = append(r.Below, int64(n))
	for i, v := range x {
		k, _ := slices.BinarySearch(r.Values, v)
		r.Dense[i] = int32(k)
	}
	return r, nil
}

// SenSlope is Sen's estimate of the slope per reading with its interval.
type SenSlope struct {
	N            int
	Slope        float64 // median of (xⱼ − xᵢ)/(j − i) over i < j
	Lower, Upper float64 // confidence interval
	Confidence   float64
	Intercept    float64 // median of xᵢ − Slope·i (i from 0), the line's value at the first reading
}

// ctlSenMax bounds the readings for Sen's slope: all n(n−1)/2 slopes are
// formed (n = 2000: 2 million, 16 MB).
const ctlSenMax = 2000

// SenSlopeEstimate returns Sen's (1968) estimate of the slope per reading,
// the median of the pairwise slopes (xⱼ − xᵢ)/(j − i), with the
// distribution-free confidence interval of Gilbert (1987, §16.5.2): with
// C = z_{(1+conf)/2}·√Var(S) (Var(S) of MannKendallTest, ties corrected)
// and N' = n(n−1)/2 slopes, the limits are the M₁-th and (M₂+1)-th
// smallest slopes, M₁ = (N' − C)/2, M₂ = (N' + C)/2, by linear
// interpolation between neighbouring order statistics when M is not whole
// (clamped to the first and last slope). Intercept is the median of
// xᵢ − Slope·i (Conover 1980). It forms every slope, so n is limited to
// 2000 readings; larger series give an error.
func SenSlopeEstimate[T int64 | float64](x []T, confidence float64) (SenSlope, error) {
	n := len(x)
	if n < 3 {
		return SenSlope{}, fmt.Errorf("%d readings: Sen's slope needs at least 3", n)
	}
	if n > ctlSenMax {
		return SenSlope{}, fmt.Errorf("%d readings: Sen's slope is computed for at most %d", n, ctlSenMax)
	}
	if !(confidence > 0 && confidence < 1) {
		return SenSlope{}, fmt.Errorf("confidence %g: it must be between 0 and 1", confidence)
	}
	mk, err := MannKendallTest(x)
	if err != nil {
		return SenSlope{}, err
	}
	sl := make([]float64, 0, n*(n-1)/2)
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			sl = append(sl, float64(x[j]-x[i])/float64(j-i))
		}
	}
	// three order statistics of n(n−1)/2 slopes: by selection, O(n²)
	// instead of a sort
	np := float64(len(sl))
	c := NormalQuantile((1+confidence)/2) * math.Sqrt(mk.VarS)
	st := ctlSelectStats(sl, (np+1)/2, (np-c)/2, (np+c)/2+1)
	res := SenSlope{N: n, Confidence: confidence, Slope: st[0], Lower: st[1], Upper: st[2]}
	r := make([]float64, n)
	for i, v := range x {
		r[i] = float64(v) - res.Slope*float64(i)
	}
	slices.Sort(r)
	res.Intercept = ctlOrderStat(r, float64(n+1)/2)
	return res, nil
}

// ctlSelectStats is ctlOrderStat for the ranks ks on unsorted s
// (reordered; the same values), by selection (Hoare 1961), not a sort:
// each order statistic needed (0-based ranks i and i+1 of each k) is
// selected within the part of s that the ones already placed leave to it
// (ctlSelectRanks), so that s is partitioned about once in all, not once a
// rank.
func ctlSelectStats(s []float64, ks ...float64) []float64 {
	n := len(s)
	out := make([]float64, len(ks))
	if n == 0 {
		for j := range out {
			out[j] = math.NaN()
		}
		return out
	}
	pos := func(k float64) (i int, f float64) {
		switch {
		case k <= 1:
			return 0, 0
		case k >= float64(n):
			return n - 1, 0
		}
		f = math.Floor(k)
		return int(f) - 1, f
	}
	var ranks []int
	for _, k := range ks {
		i, f := pos(k)
		ranks = append(ranks, i)
		if f != 0 {
			ranks = append(ranks, i+1)
		}
	}
	slices.Sort(ranks)
	ctlSelectRanks(s, slices.Compact(ranks))
	for j, k := range ks {
		i, f := pos(k)
		if f == 0 {
			out[j] = s[i]
		} else {
			out[j] = s[i] + (k-f)*(s[i+1]-s[i])
		}
	}
	return out
}

// ctlSelectRanks reorders s so that s[r] holds the value of 0-based rank r
// (as in sorted s) for every r of ranks (ascending, distinct, in range): it
// selects the middle rank (floatSelect leaves the smaller values before it
// and the larger after), then the ranks below it in the part before and
// those above in the part after. A rank at either end of its part is that
// part's least or greatest value: found by one scan.
func ctlSelectRanks(s []float64, ranks []int) {
	if len(ranks) == 0 {
		return
	}
	m := len(ranks) / 2
	r := ranks[m]
	switch r {
	case 0:
		j := 0
		for i, v := range s {
			if v < s[j] {
				j = i
			}
		}
		s[0], s[j] = s[j], s[0]
	case len(s) - 1:
		j := 0
		for i, v := range s {
			if v > s[j] {
				j = i
			}
		}
		s[r], s[j] = s[j], s[r]
	default:
		floatSelect(s, r)
	}
	ctlSelectRanks(s[:r], ranks[:m])
	above := ranks[m+1:]
	for i := range above {
		above[i] -= r + 1
	}
	ctlSelectRanks(s[r+1:], above)
}

// ctlOrderStat returns the order statistic of 1-based rank k of sorted s,
// interpolating linearly for a fractional rank and clamping to [1, len].
func ctlOrderStat(s []float64, k float64) float64 {
	if k <= 1 {
		return s[0]
	}
	if k >= float64(len(s)) {
		return s[len(s)-1]
	}
	f := math.Floor(k)
	i := int(f) - 1
	return s[i] + (k-f)*(s[i+1]-s[i])
}
