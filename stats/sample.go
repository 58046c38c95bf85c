package stats

import (
	"math"
	"math/big"
	"sort"

	"lotlens/stats/decimal"
	"lotlens/stats/method"
)

// sample is the sorted data of one analysis with what every section
// builder shares: the decimal grid (when the values are plain decimals),
// the moments, and the quartiles under the chosen definition.
type sample struct {
	sorted   []float64
	n        int
	grid     decimal.Grid // valid when exact
	exact    bool         // every value lies on grid: decisions on the decimals as typed
	mo       moments
	constant bool

	def     method.QuantileDef // the user's quantile definition
	defCode string             // its code, "hf7"
	q1, q3  fig                // quartiles under def
	qmed    fig                // median under def
	median  fig                // the centre's median: (n+1)/2-th order statistic

	mcDone bool // mc and mcOK hold the medcouple (see medcouple)
	mc     float64
	mcOK   bool
}

// medcouple is the medcouple of the data (method.Medcouple), computed once
// for the suspect rules and the quartile-definition check.
func (s *sample) medcouple() (float64, bool) {
	if !s.mcDone {
		s.mc, s.mcOK = method.Medcouple(s.sorted)
		s.mcDone = true
	}
	return s.mc, s.mcOK
}

// fig is a figure: its float64 and, on the exact path, its exact value
// (r is then the decimal the float rounds; nil on the binary path).
type fig struct {
	f float64
	r *big.Rat
}

func exactFig(r *big.Rat) fig { return fig{f: decimal.Float64(r), r: r} }

// newSample prepares the shared figures. grid is valid when every value is
// a plain decimal with at most grid.Scale decimals; the ends are checked
// here for the size of their mantissas.
func newSample(sorted []float64, grid decimal.Grid, mo moments, def method.QuantileDef, defCode string) *sample {
	s := &sample{sorted: sorted, n: len(sorted), mo: mo, def: def, defCode: defCode}
	if grid.Valid() && grid.Holds(sorted) {
		s.grid, s.exact = grid, true
	}
	if s.n == 0 {
		return s
	}
	s.constant = sorted[0] == sorted[s.n-1]
	s.q1 = s.quantile(method.Prob{Num: 1, Den: 4}, def)
	s.qmed = s.quantile(method.Prob{Num: 1, Den: 2}, def)
	s.q3 = s.quantile(method.Prob{Num: 3, Den: 4}, def)
	s.median = s.at(method.MedianPos(s.n))
	return s
}

// at is the figure at a quantile position.
func (s *sample) at(pos method.QuantilePos) fig {
	if s.exact {
		g := s.grid
		return exactFig(g.Interpolate(g.M(s.sorted[pos.Lo]), g.M(s.sorted[pos.Hi]), pos.GNum, pos.GDen))
	}
	return fig{f: pos.Float(s.sorted)}
}

// quantile is the sample quantile of definition def at p: exact on the
// decimals, else R's binary arithmetic (method.Quantile).
func (s *sample) quantile(p method.Prob, def method.QuantileDef) fig {
	if s.exact {
		return s.at(method.QuantileAt(s.n, p, def))
	}
	return fig{f: method.Quantile(s.sorted, p.Float(), def)}
}

// sub is a - b.
func (s *sample) sub(a, b fig) fig {
	if a.r != nil && b.r != nil {
		return exactFig(new(big.Rat).Sub(a.r, b.r))
	}
	return fig{f: a.f - b.f}
}

// fences are Tukey's fences k IQR beyond q1 and q3 (k = 3/2 or 3).
func (s *sample) fences(q1, q3 fig, kNum, kDen int64) (lo, hi fig) {
	if q1.r != nil && q3.r != nil {
		l, h := method.TukeyFencesExact(q1.r, q3.r, big.NewRat(kNum, kDen))
		return exactFig(l), exactFig(h)
	}
	l, h := method.TukeyFences(q1.f, q3.f, float64(kNum)/float64(kDen))
	return fig{f: l}, fig{f: h}
}

// countBelow is the number of values < f, decided on the decimals as typed
// on the exact path.
func (s *sample) countBelow(f fig) int {
	if s.exact && f.r != nil {
		return s.grid.CountBelow(s.sorted, f.r)
	}
	return lowerBound(s.sorted, f.f)
}

// countAbove is the number of values > f.
func (s *sample) countAbove(f fig) int {
	if s.exact && f.r != nil {
		return s.grid.CountAbove(s.sorted, f.r)
	}
	return s.n - upperBound(s.sorted, f.f)
}

// mad is the raw median absolute deviation about the centre's median.
func (s *sample) mad() fig {
	if s.exact {
		m2 := new(big.Rat).Mul(s.grid.Units(s.median.r), big.NewRat(2, 1))
		if m2.IsInt() && m2.Num().IsInt64() {
			return exactFig(method.MedianAbsDevExact(s.sorted, s.grid, m2.Num().Int64()))
		}
	}
	return fig{f: method.MedianAbsDev(s.sorted, s.median.f)}
}

// scaled is c·f (c an exact decimal constant num/den).
func scaled(f fig, num, den int64) fig {
	if f.r != nil {
		return exactFig(new(big.Rat).Mul(f.r, big.NewRat(num, den)))
	}
	return fig{f: f.f * float64(num) / float64(den)}
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

// add is a + b.
func (s *sample) add(a, b fig) fig {
	if a.r != nil && b.r != nil {
		return exactFig(new(big.Rat).Add(a.r, b.r))
	}
	return fig{f: a.f + b.f}
}

// lowerBound is the first index with s[i] >= v (sort.SearchFloat64s);
// upperBound the first with s[i] > v.
func lowerBound(s []float64, v float64) int { return sort.SearchFloat64s(s, v) }

func upperBound(s []float64, v float64) int {
	return sort.Search(len(s), func(i int) bool { return s[i] > v })
}

// partShape is the shape moments (method.ShapeMoments) of sorted[lo:hi]:
// exact from the decimals as typed on the exact path, else binary.
func (s *sample) partShape(lo, hi int) (method.ShapeMoments, bool) {
	part := s.sorted[lo:hi]
	if len(part) < 3 || part[0] == part[len(part)-1] {
		return method.ShapeMoments{}, false
	}
	if s.exact {
		if sm, ok := method.ShapeExact(s.grid.PowerSums(part)); ok {
			return sm, true
		}
	}
	mo := compensatedMoments(part, part[0], part[len(part)-1])
	return method.ShapeBinary(part, mo.mean, mo.sd)
}

// partNormalP is the p-value of a normality test of sorted[lo:hi]:
// Shapiro-Wilk (Royston 1995) up to method.ShapiroMaxN values, else the
// D'Agostino-Pearson K² omnibus test; large tells which. ok is false when
// neither can be computed.
func (s *sample) partNormalP(lo, hi int) (p float64, large, ok bool) {
	part := s.sorted[lo:hi]
	if len(part) <= method.ShapiroMaxN {
		mean := 0.0
		for _, x := range part {
			mean += x
		}
		mean /= float64(len(part))
		_, p, ok = method.ShapiroWilk(part, mean)
		return p, false, ok
	}
	sm, ok := s.partShape(lo, hi)
	if !ok {
		return 0, true, false
	}
	zs, ok1 := method.DAgostinoSkewZ(sm.Sqrtb1, len(part))
	zk, ok2 := method.AnscombeGlynnZ(sm.B2, len(part))
	if !ok1 || !ok2 {
		return 0, true, false
	}
	return math.Exp(-(zs*zs + zk*zk) / 2), true, true
}

// adjustedFences are the adjusted box plot's fences (Hubert and
// Vandervieren 2008, method.AdjustedBoxFences) on quartiles q1 and q3 with
// medcouple mc. With mc = 0 they are Tukey's inner fences exactly, and are
// computed as those (on the decimals as typed), so that a reading on a
// fence is within it, not beyond by binary rounding.
func (s *sample) adjustedFences(q1, q3 fig, mc float64) (lo, hi fig) {
	if mc == 0 {
		return s.fences(q1, q3, 3, 2)
	}
	l, h := method.AdjustedBoxFences(q1.f, q3.f, mc)
	return fig{f: l}, fig{f: h}
}
