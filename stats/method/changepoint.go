package method

import (
	"fmt"
	"math"
)

// ChangePoint is the most likely single change in the level of a series.
type ChangePoint struct {
	N          int
	Index      int     // 0-based index of the first reading after the change
	Statistic  float64 // Pettitt's K = max |U_t|
	P          float64 // approximate two-sided p-value, at most 1
	MeanBefore float64 // mean of readings 0 .. Index−1
	MeanAfter  float64 // mean of readings Index .. N−1
}

// PettittChange is the rank-based change-point test of Pettitt (1979,
// Applied Statistics 28:126): U_t = Σ_{i<=t} Σ_{j>t} sign(xᵢ − xⱼ), the
// change after the t maximising |U_t| (the first such t), K = max |U_t|,
// with Pettitt's approximation p ≈ 2·exp(−6K²/(n³ + n²)) (good for
// p < 0.5; capped at 1). U_t is computed through
// U_t = U_{t−1} + Σⱼ sign(x_t − xⱼ), the sums of signs from the ranks
// (ties count 0; RankSeries, then O(n)). Needs at least 2 readings; with all
// readings equal K = 0 and P = 1 (Index 1).
func PettittChange[T int64 | float64](x []T) (ChangePoint, error) {
	r, err := RankSeries(x)
	if err != nil {
		return ChangePoint{}, err
	}
	return PettittRanked(r, x)
}

// PettittRanked is PettittChange on ranks made by RankSeries (shared with
// the other rank tests of x): Σⱼ sign(x_t − xⱼ) = (readings below x_t) −
// (readings above x_t), from the rank's counts, in O(n).
func PettittRanked[T int64 | float64](r SeriesRanks[T], x []T) (ChangePoint, error) {
	n := r.N
	if n < 2 || len(x) != n {
		return ChangePoint{}, fmt.Errorf("%d readings: a change point needs at least 2", n)
	}
	v := func(t int) int64 {
		k := r.Dense[t]
		return r.Below[k] - (int64(n) - r.Below[k+1])
	}
	var u, best int64
	bt := 1
	for t := 1; t < n; t++ { // U_t for the first t readings
		u += v(t - 1)
		a := u
		if a < 0 {
			a = -a
		}
		if a > best {
			best, bt = a, t
		}
	}
	k := float64(best)
	fn := float64(n)
	p := math.Min(1, 2*math.Exp(-6*k*k/(fn*fn*fn+fn*fn)))
	var sb, sa float64
	for i, val := range x {
		if i < bt {
			sb += float64(val)
		} else {
			sa += float64(val)
		}
	}
	return ChangePoint{N: n, Index: bt, Statistic: k, P: p,
		MeanBefore: sb / float64(bt), MeanAfter: sa / float64(n-bt)}, nil
}
