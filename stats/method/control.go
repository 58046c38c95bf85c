package method

import (
	"errors"
	"fmt"
	"math"
	"slices"
)

// SigmaEstimate is a within-process standard deviation with the effective
// degrees of freedom to use when a confidence interval or a capability
// interval is built on it (the estimate treated as σ·sqrt(χ²_ν/ν)).
type SigmaEstimate struct {
	Sigma float64
	DF    float64 // effective degrees of freedom ν
	Count int     // moving ranges or subgroups that entered the estimate
}

// ctlPatnaikDF is Patnaik's (1950) chi approximation: an estimator with
// squared coefficient of variation cv2 behaves like σ·sqrt(χ²_ν/ν) with
// ν = 1/(2·cv2) (first order).
func ctlPatnaikDF(cv2 float64) float64 {
	if !(cv2 > 0) {
		return 0
	}
	return 1 / (2 * cv2)
}

// MovingRanges returns the moving ranges of span w of x: element j is the
// range (largest minus smallest) of x[j], ..., x[j+w−1], so there are
// len(x)−w+1 of them. It uses monotone queues, O(n) for any span.
func MovingRanges(x []float64, w int) ([]float64, error) {
	if w < 2 {
		return nil, fmt.Errorf("moving-range span %d: it must be at least 2", w)
	}
	if len(x) < w {
		return nil, fmt.Errorf("%d readings: a moving range of span %d needs at least %d", len(x), w, w)
	}
	out := make([]float64, len(x)-w+1)
	if w == 2 {
		for j := range out {
			out[j] = math.Abs(x[j+1] - x[j])
		}
		return out, nil
	}
	var hi, lo ctlDeque
	hi.init(w + 1) // w indices in the window plus the one pushed before the oldest leaves
	lo.init(w + 1)
	for i, v := range x {
		for hi.n > 0 && x[hi.back()] <= v {
			hi.popBack()
		}
		hi.pushBack(i)
		for lo.n > 0 && x[lo.back()] >= v {
			lo.popBack()
		}
		lo.pushBack(i)
		if hi.front() <= i-w {
			hi.popFront()
		}
		if lo.front() <= i-w {
			lo.popFront()
		}
		if i >= w-1 {
			out[i-w+1] = x[hi.front()] - x[lo.front()]
		}
	}
	return out, nil
}

// ctlDeque is a ring buffer of indices holding at most its capacity.
type ctlDeque struct {
	buf     []int
	head, n int
}

func (d *ctlDeque) init(c int)     { d.buf = make([]int, c) }
func (d *ctlDeque) front() int     { return d.buf[d.head] }
func (d *ctlDeque) back() int      { return d.buf[(d.head+d.n-1)%len(d.buf)] }
func (d *ctlDeque) popBack()       { d.n-- }
func (d *ctlDeque) popFront()      { d.head = (d.head + 1) % len(d.buf); d.n-- }
func (d *ctlDeque) pushBack(i int) { d.buf[(d.head+d.n)%len(d.buf)] = i; d.n++ }

// ctlMRCov1 is the covariance of two adjacent moving ranges of span 2 of
// independent N(0, 1) readings: |D₁| and |D₂| with D ~ N(0, 2) and
// correlation −1/2, E|D₁||D₂| = 2·(2/π)(√(1−ρ²) + ρ·asin ρ) = 2√3/π + 1/3.
var ctlMRCov1 = 2*math.Sqrt(3)/math.Pi + 1.0/3 - 4/math.Pi

// SigmaMovingRange estimates σ from individual readings as the average
// moving range of span w divided by d2(w) (Shewhart individuals chart;
// ASTM E2587, NIST/SEMATECH e-Handbook 6.3.2.2). A moving range enters
// only when its whole window is in keep (nil keeps every reading): a
// reading left out of the baseline takes out the ranges that touch it.
//
// Degrees of freedom: Patnaik's (1950) ν = 1/(2·CV²) with the exact
// variance of the average of m moving ranges of span 2 (adjacent ranges
// correlated, ranges further apart independent), which gives ν ≈ 0.605·m
// for long series, close to the 0.62·(k−1) quoted for the average moving
// range in the literature (from memory). For span w > 2 the windows that
// share at most one reading are treated as independent: ν = m'·d2²/(2d3²)
// with m' = ⌊m/(w−1)⌋, on the safe side.
func SigmaMovingRange(x []float64, w int, keep []bool) (SigmaEstimate, error) {
	sum, m := 0.0, len(x)-1
	if w == 2 && keep == nil && m >= 1 {
		// the usual case, summed without an array of ranges (long series)
		prev := x[0]
		for _, v := range x[1:] {
			sum += math.Abs(v - prev)
			prev = v
		}
	} else {
		mr, mm, err := ctlKeptRanges(x, w, keep)
		if err != nil {
			return SigmaEstimate{}, err
		}
		sum, m = 0, mm
		for _, v := range mr {
			sum += v
		}
	}
	c, _ := Constants(w)
	mbar := sum / float64(m)
	est := SigmaEstimate{Sigma: mbar / c.SmallD2, Count: m}
	if w == 2 {
		// Var(Σ MR) = m·v0 + 2·(pairs of adjacent kept ranges)·c1, σ = 1.
		adj := ctlAdjacentKept(len(x), w, keep)
		v0 := 2 * (1 - 2/math.Pi)
		vs := float64(m)*v0 + 2*float64(adj)*ctlMRCov1
		cv2 := vs / (float64(m) * float64(m) * c.SmallD2 * c.SmallD2)
		est.DF = ctlPatnaikDF(cv2)
	} else {
		mm := m / (w - 1)
		if mm < 1 {
			mm = 1
		}
		est.DF = float64(mm) * c.SmallD2 * c.SmallD2 / (2 * c.SmallD3 * c.SmallD3)
	}
	return est, nil
}

// ctlKeptRanges returns the moving ranges of span w whose windows lie in
// keep, and their count.
func ctlKeptRanges(x []float64, w int, keep []bool) ([]float64, int, error) {
	if keep != nil && len(keep) != len(x) {
		return nil, 0, fmt.Errorf("baseline marks %d readings, the series has %d", len(keep), len(x))
	}
	all, err := MovingRanges(x, w)
	if err != nil {
		return nil, 0, err
	}
	if keep == nil {
		return all, len(all), nil
	}
	out := all[:0]
	run := 0 // kept readings in a row ending at i
	for i := range x {
		if keep[i] {
			run++
		} else {
			run = 0
		}
		if i >= w-1 && run >= w {
			out = append(out, all[i-w+1])
		}
	}
	if len(out) == 0 {
		return nil, 0, fmt.Errorf("the baseline holds no %d readings in a row: no moving range to estimate the spread from", w)
	}
	return out, len(out), nil
}

// ctlAdjacentKept counts pairs of kept moving ranges (span w) at
// consecutive positions.
func ctlAdjacentKept(n, w int, keep []bool) int {
	if keep == nil {
		m := n - w + 1
		if m < 2 {
			return 0
		}
		return m - 1
	}
	adj, run := 0, 0
	for i := 0; i < n; i++ {
		if keep[i] {
			run++
		} else {
			run = 0
		}
		if run >= w+1 {
			adj++
		}
	}
	return adj
}

// SigmaMedianMovingRange estimates σ as the median moving range of span w
// divided by d4(w), the median of the range of w standard normal readings
// (the median moving range chart: Nelson 1982, ASTM E2587). keep as in
// SigmaMovingRange.
//
// Degrees of freedom: Patnaik's ν = 1/(2·CV²) with the large-sample
// variance of a sample median, 1/(4·m'·f(d4)²) where f is the density of
// the range at its median; m' is the number of ranges for span 2 (the weak
// correlation of adjacent ranges is ignored) and ⌊m/(w−1)⌋ for span w > 2.
func SigmaMedianMovingRange(x []float64, w int, keep []bool) (SigmaEstimate, error) {
	mr, m, err := ctlKeptRanges(x, w, keep)
	if err != nil {
		return SigmaEstimate{}, err
	}
	c, _ := Constants(w)
	s := slices.Clone(mr)
	slices.Sort(s)
	med := s[m/2]
	if m%2 == 0 {
		med = (s[m/2-1] + s[m/2]) / 2
	}
	mm := m
	if w > 2 {
		mm = m / (w - 1)
		if mm < 1 {
			mm = 1
		}
	}
	f := ctlRangeDensity(w, c.SmallD4)
	cv2 := 1 / (4 * float64(mm) * f * f * c.SmallD4 * c.SmallD4)
	return SigmaEstimate{Sigma: med / c.SmallD4, DF: ctlPatnaikDF(cv2), Count: m}, nil
}

// ctlRangeDensity is the density of the range of n standard normal
// readings, n(n−1) ∫ φ(x) φ(x+w) [Φ(x+w) − Φ(x)]^(n−2) dx.
func ctlRangeDensity(n int, w float64) float64 {
	m := float64(n - 2)
	f := func(x float64) float64 {
		d := ctlPhiDiff(x, x+w)
		if d <= 0 {
			return 0
		}
		return math.Exp(-x*x/2-(x+w)*(x+w)/2+m*math.Log(d)) / (2 * math.Pi)
	}
	return float64(n) * float64(n-1) * ctlPanels(f, -ctlXMax, ctlXMax)
}

// ctlGroupStats returns the size, mean, range and SD (n−1 divisor, two
// passes) of one subgroup.
func ctlGroupStats(g []float64) (n int, mean, r, s float64) {
	n = len(g)
	if n == 0 {
		return 0, 0, 0, 0
	}
	lo, hi, sum := g[0], g[0], 0.0
	for _, v := range g {
		sum += v
		lo = math.Min(lo, v)
		hi = math.Max(hi, v)
	}
	mean = sum / float64(n)
	if n > 1 {
		ss := 0.0
		for _, v := range g {
			ss += (v - mean) * (v - mean)
		}
		s = math.Sqrt(ss / float64(n-1))
	}
	return n, mean, hi - lo, s
}

var ctlErrNoSpread = errors.New("no subgroup of two or more readings: the within-subgroup spread cannot be estimated (for single readings use the moving range)")

// ctlSubgroupSelect returns the subgroups to use: all, or those whose
// index is in baseline.
func ctlSubgroupSelect(groups [][]float64, baseline []int) ([][]float64, error) {
	if baseline == nil {
		return groups, nil
	}
	out := make([][]float64, 0, len(baseline))
	for _, i := range baseline {
		if i < 0 || i >= len(groups) {
			return nil, fmt.Errorf("baseline subgroup %d: there are %d subgroups (0-based)", i, len(groups))
		}
		out = append(out, groups[i])
	}
	return out, nil
}

// SigmaRangeBar estimates σ from subgroups by the ranges: with equal
// sizes R̄/d2(n); with unequal sizes the weighted form of ASTM E2587 (also
// Burr 1969), σ = Σ fᵢ·Rᵢ/d2(nᵢ) / Σ fᵢ with fᵢ = d2(nᵢ)²/d3(nᵢ)², the
// inverse relative variance of each subgroup's estimate. Subgroups of one
// reading carry no range and are skipped.
//
// Degrees of freedom: Patnaik (1950) applied to the weighted estimate, whose
// squared coefficient of variation is 1/Σfᵢ: ν = Σfᵢ/2.
func SigmaRangeBar(groups [][]float64) (SigmaEstimate, error) {
	num, den, k := 0.0, 0.0, 0
	for _, g := range groups {
		n, _, r, _ := ctlGroupStats(g)
		if n < 2 {
			continue
		}
		c, err := Constants(n)
		if err != nil {
			return SigmaEstimate{}, err
		}
		f := c.SmallD2 * c.SmallD2 / (c.SmallD3 * c.SmallD3)
		num += f * r / c.SmallD2
		den += f
		k++
	}
	if k == 0 {
		return SigmaEstimate{}, ctlErrNoSpread
	}
	return SigmaEstimate{Sigma: num / den, DF: den / 2, Count: k}, nil
}

// SigmaSBar estimates σ from subgroups by their standard deviations: with
// equal sizes S̄/c4(n); with unequal sizes the weighted form of ASTM E2587
// (also Burr 1969), σ = Σ hᵢ·sᵢ/c4(nᵢ) / Σ hᵢ with hᵢ = c4²/(1 − c4²).
// Subgroups of one reading are skipped. Degrees of freedom ν = Σhᵢ/2
// (Patnaik 1950, as in SigmaRangeBar).
func SigmaSBar(groups [][]float64) (SigmaEstimate, error) {
	num, den, k := 0.0, 0.0, 0
	for _, g := range groups {
		n, _, _, s := ctlGroupStats(g)
		if n < 2 {
			continue
		}
		c4 := C4(n)
		h := c4 * c4 / (1 - c4*c4)
		num += h * s / c4
		den += h
		k++
	}
	if k == 0 {
		return SigmaEstimate{}, ctlErrNoSpread
	}
	return SigmaEstimate{Sigma: num / den, DF: den / 2, Count: k}, nil
}

// SigmaPooled estimates σ as the pooled standard deviation
// sqrt(Σ(nᵢ−1)sᵢ² / Σ(nᵢ−1)) divided by c4(ν+1), ν = Σ(nᵢ−1), which makes
// it unbiased (ASTM E2587; Montgomery, Introduction to Statistical Quality
// Control, 2009, §6.4). ν is exact: the pooled variance is σ²χ²_ν/ν.
func SigmaPooled(groups [][]float64) (SigmaEstimate, error) {
	ss, df, k := 0.0, 0, 0
	for _, g := range groups {
		n, _, _, s := ctlGroupStats(g)
		if n < 2 {
			continue
		}
		ss += float64(n-1) * s * s
		df += n - 1
		k++
	}
	if k == 0 {
		return SigmaEstimate{}, ctlErrNoSpread
	}
	sp := math.Sqrt(ss / float64(df))
	return SigmaEstimate{Sigma: sp / C4(df+1), DF: float64(df), Count: k}, nil
}

// IndividualsOptions are the settings of an individuals and moving range
// chart. Zero values take the defaults.
type IndividualsOptions struct {
	Width    float64 // limits at Centre ± Width·σ; 0 means 3
	Span     int     // moving-range span; 0 means 2
	Median   bool    // σ from the median moving range instead of the average
	Baseline []int   // 0-based indices of the readings that set the limits; nil means all
}

// IndividualsChart holds the limits of an individuals chart and its
// moving range chart. MovingRange[j] is the range of readings j to
// j+Span−1 (plotted at reading j+Span−1). The moving range chart's centre
// and limits are d2·σ and (d2 ± Width·d3)·σ, the lower one not below 0;
// with the average moving range this is the usual D4·MR̄ and D3·MR̄.
type IndividualsChart struct {
	Centre, Lower, Upper float64
	Sigma                SigmaEstimate
	Span                 int
	MovingRange          []float64
	MRCentre             float64
	MRLower, MRUpper     float64
	BaselineCount        int // readings in the baseline
}

// Individuals computes an individuals (X) and moving range chart
// (Shewhart 1931; ASTM E2587 §8, NIST/SEMATECH e-Handbook 6.3.2.2). The
// centre is the mean of the baseline readings, σ the average (or median)
// moving range of the baseline divided by d2 (or d4); the limits apply to
// every reading. A baseline of constant readings gives σ = 0 and limits on
// the centre (any later different reading lies beyond them).
func Individuals(x []float64, o IndividualsOptions) (IndividualsChart, error) {
	width, span := ctlWidth(o.Width), o.Span
	if span == 0 {
		span = 2
	}
	if width <= 0 {
		return IndividualsChart{}, fmt.Errorf("limit width %g: it must be positive", o.Width)
	}
	keep, nb, err := ctlKeep(len(x), o.Baseline)
	if err != nil {
		return IndividualsChart{}, err
	}
	if nb < 2 {
		return IndividualsChart{}, fmt.Errorf("%d readings in the baseline: the limits need at least 2", nb)
	}
	sum := 0.0
	for i, v := range x {
		if keep == nil || keep[i] {
			sum += v
		}
	}
	centre := sum / float64(nb)
	var est SigmaEstimate
	if o.Median {
		est, err = SigmaMedianMovingRange(x, span, keep)
	} else {
		est, err = SigmaMovingRange(x, span, keep)
	}
	if err != nil {
		return IndividualsChart{}, err
	}
	mr, _ := MovingRanges(x, span)
	c, _ := Constants(span)
	s := est.Sigma
	return IndividualsChart{
		Centre: centre, Lower: centre - width*s, Upper: centre + width*s,
		Sigma: est, Span: span, MovingRange: mr,
		MRCentre: c.SmallD2 * s, MRLower: math.Max(0, c.SmallD2-width*c.SmallD3) * s,
		MRUpper: (c.SmallD2 + width*c.SmallD3) * s, BaselineCount: nb,
	}, nil
}

func ctlWidth(w float64) float64 {
	if w == 0 {
		return 3
	}
	if math.IsNaN(w) || math.IsInf(w, 0) {
		return -1
	}
	return w
}

// ctlKeep turns baseline indices into a mask (nil for all) and counts them.
func ctlKeep(n int, baseline []int) ([]bool, int, error) {
	if baseline == nil {
		return nil, n, nil
	}
	keep := make([]bool, n)
	nb := 0
	for _, i := range baseline {
		if i < 0 || i >= n {
			return nil, 0, fmt.Errorf("baseline index %d: there are %d points (0-based)", i, n)
		}
		if !keep[i] {
			keep[i] = true
			nb++
		}
	}
	return keep, nb, nil
}

// Spread chooses the chart of the within-subgroup spread.
type Spread int

const (
	SpreadAuto  Spread = iota // by subgroup size (see SubgroupOptions.SDFromSize)
	SpreadRange               // mean and range chart
	SpreadSD                  // mean and standard deviation chart
)

// SubgroupOptions are the settings of a subgroup chart. Zero values take
// the defaults.
type SubgroupOptions struct {
	Width float64 // limits at ± Width standard errors; 0 means 3
	// Spread: SpreadAuto picks the standard deviation chart when the
	// largest baseline subgroup has SDFromSize readings or more, else the
	// range chart. Common practice: the range loses efficiency against the
	// standard deviation as subgroups grow, and the usual advice is the
	// standard deviation for subgroups larger than about 10 (Montgomery
	// 2009 §6.3; ASTM E2587).
	Spread     Spread
	SDFromSize int   // 0 means 10
	Pooled     bool  // with the SD chart, σ from the pooled SD instead of S-bar
	Baseline   []int // 0-based indices of the subgroups that set the limits; nil means all
}

// SubgroupChart holds a mean chart and its range or SD chart with limits
// per subgroup (they differ when the sizes differ). For subgroup i:
//
//	MeanLower/Upper[i] = Centre ∓ Width·σ/√nᵢ
//	range chart: SpreadCentre = d2(nᵢ)σ, limits (d2 ∓ Width·d3)σ (D1σ, D2σ)
//	SD chart:    SpreadCentre = c4(nᵢ)σ, limits (c4 ∓ Width·c5)σ (B5σ, B6σ)
//
// lower limits not below 0. A subgroup of one reading has Spreads[i] = 0
// and spread centre and limits 0: it has no point on the spread chart.
type SubgroupChart struct {
	Spread                                 Spread // SpreadRange or SpreadSD, as used
	Centre                                 float64
	Sigma                                  SigmaEstimate
	Sizes                                  []int
	Means, Spreads                         []float64
	MeanLower, MeanUpper                   []float64
	SpreadCentre, SpreadLower, SpreadUpper []float64
	BaselineCount                          int // subgroups in the baseline
}

// Subgroups computes a mean chart with a range or standard deviation
// chart (Shewhart 1931; ASTM E2587 §7 and its forms for unequal subgroup
// sizes; NIST/SEMATECH e-Handbook 6.3.2.1). The centre is the grand mean
// of the baseline readings (each subgroup weighted by its size); σ is
// SigmaRangeBar, SigmaSBar or SigmaPooled of the baseline subgroups.
func Subgroups(groups [][]float64, o SubgroupOptions) (SubgroupChart, error) {
	width := ctlWidth(o.Width)
	if width <= 0 {
		return SubgroupChart{}, fmt.Errorf("limit width %g: it must be positive", o.Width)
	}
	if len(groups) == 0 {
		return SubgroupChart{}, errors.New("no subgroups")
	}
	for i, g := range groups {
		if len(g) == 0 {
			return SubgroupChart{}, fmt.Errorf("subgroup %d is empty", i)
		}
	}
	base, err := ctlSubgroupSelect(groups, o.Baseline)
	if err != nil {
		return SubgroupChart{}, err
	}
	if len(base) == 0 {
		return SubgroupChart{}, errors.New("the baseline holds no subgroup")
	}
	sum, cnt, maxn := 0.0, 0, 0
	for _, g := range base {
		for _, v := range g {
			sum += v
		}
		cnt += len(g)
		maxn = max(maxn, len(g))
	}
	spread := o.Spread
	if spread == SpreadAuto {
		from := o.SDFromSize
		if from == 0 {
			from = 10
		}
		spread = SpreadRange
		if maxn >= from {
			spread = SpreadSD
		}
	}
	var est SigmaEstimate
	switch {
	case spread == SpreadRange:
		est, err = SigmaRangeBar(base)
	case o.Pooled:
		est, err = SigmaPooled(base)
	default:
		est, err = SigmaSBar(base)
	}
	if err != nil {
		return SubgroupChart{}, err
	}
	k := len(groups)
	ch := SubgroupChart{
		Spread: spread, Centre: sum / float64(cnt), Sigma: est,
		Sizes: make([]int, k), Means: make([]float64, k), Spreads: make([]float64, k),
		MeanLower: make([]float64, k), MeanUpper: make([]float64, k),
		SpreadCentre: make([]float64, k), SpreadLower: make([]float64, k), SpreadUpper: make([]float64, k),
		BaselineCount: len(base),
	}
	s := est.Sigma
	for i, g := range groups {
		n, mean, r, sd := ctlGroupStats(g)
		ch.Sizes[i], ch.Means[i] = n, mean
		hw := width * s / math.Sqrt(float64(n))
		ch.MeanLower[i], ch.MeanUpper[i] = ch.Centre-hw, ch.Centre+hw
		if n < 2 {
			continue
		}
		c, err := Constants(n)
		if err != nil {
			return SubgroupChart{}, err
		}
		if spread == SpreadRange {
			ch.Spreads[i] = r
			ch.SpreadCentre[i] = c.SmallD2 * s
			ch.SpreadLower[i] = math.Max(0, c.SmallD2-width*c.SmallD3) * s
			ch.SpreadUpper[i] = (c.SmallD2 + width*c.SmallD3) * s
		} else {
			ch.Spreads[i] = sd
			ch.SpreadCentre[i] = c.C4 * s
			ch.SpreadLower[i] = math.Max(0, c.C4-width*c.C5) * s
			ch.SpreadUpper[i] = (c.C4 + width*c.C5) * s
		}
	}
	return ch, nil
}
