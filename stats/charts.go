package stats

import (
	"iter"
	"math"
	"sort"

	"lotlens/stats/method"
)

// Charts carries what the chart package draws. Long series are thinned
// (Thinned says so) so that the report stays small for any n.
type Charts struct {
	Histogram Histogram  `json:"histogram"`
	Box       Box        `json:"box"`
	ProbPlot  ProbPlot   `json:"probPlot"`
	Series    []SeriesPt `json:"series"`
	Thinned   bool       `json:"thinned,omitempty"`
}

// Histogram bins: Edges has len(Counts)+1 entries.
type Histogram struct {
	Rule   string    `json:"rule"` // "freedman-diaconis" or "sturges"
	Edges  []float64 `json:"edges"`
	Counts []int     `json:"counts"`
}

// Box is the box-plot elements under the chosen quantile definition.
type Box struct {
	// Quantile is the definition of the quartiles and fences
	// (settings.quantile).
	Quantile  string  `json:"quantile"`
	Q1        float64 `json:"q1"`
	Median    float64 `json:"median"`
	Q3        float64 `json:"q3"`
	LoWhisker float64 `json:"loWhisker"`
	HiWhisker float64 `json:"hiWhisker"`
	InnerLo   float64 `json:"innerLo"`
	InnerHi   float64 `json:"innerHi"`
	OuterLo   float64 `json:"outerLo"`
	OuterHi   float64 `json:"outerHi"`
}

// ProbPlot is a normal probability plot: theoretical quantile Z against the
// ordered value Y, with a simultaneous envelope around the fitted line.
type ProbPlot struct {
	Positions string   `json:"positions"` // plotting positions, e.g. "Blom (i-3/8)/(n+1/4)"
	Points    []ProbPt `json:"points"`
	Band      []BandPt `json:"band"`
	// BandMethod names the envelope: "tail-sensitive" (equal local levels,
	// Aldor-Noiman et al. 2013), simultaneous for all n points.
	BandMethod string `json:"bandMethod,omitempty"`
	// BandLevel is the chance that a normal sample has every point inside
	// the envelope: the confidence setting, clamped to the levels tabled
	// (0.5 to 0.99).
	BandLevel float64 `json:"bandLevel,omitempty"`
	// BandLocalLevel is η, the chance that one given point of a normal
	// sample falls outside its own stretch of the envelope.
	BandLocalLevel float64    `json:"bandLocalLevel,omitempty"`
	Line           [2]float64 `json:"line"` // intercept, slope (mean, SD)
}

// ProbPt is one point of the probability plot.
type ProbPt struct {
	Z   float64 `json:"z"`
	Y   float64 `json:"y"`
	Row int     `json:"row"`
}

// BandPt is the band at one theoretical quantile.
type BandPt struct {
	Z  float64 `json:"z"`
	Lo float64 `json:"lo"`
	Hi float64 `json:"hi"`
}

// SeriesPt is one value in data order.
type SeriesPt struct {
	I   int     `json:"i"` // position in data order (0-based)
	Row int     `json:"row"`
	Y   float64 `json:"y"`
}

// maxBins bounds the histogram (heavy tails can ask the Freedman-Diaconis
// rule for thousands of bins).
const maxBins = 200

// histogram bins the data. The bin width follows Freedman and Diaconis
// (1981): 2·IQR·n^(-1/3); when the IQR is 0 it falls back to Sturges (1926):
// ceil(log2 n) + 1 bins over the range. When the values move in a known step
// the width is rounded up to a whole number of steps and the edges sit half a
// step off the values, so that no value lies on an edge and no bin is empty
// only because of the recording grid.
func histogram(sorted []float64, iqr, step float64) Histogram {
	n := len(sorted)
	lo, hi := sorted[0], sorted[n-1]
	h := Histogram{Rule: "freedman-diaconis"}
	if lo == hi {
		w := step
		if !(w > 0) {
			w = math.Abs(lo) * 0.01
			if w == 0 {
				w = 1
			}
		}
		h.Rule = "single-value"
		h.Edges = []float64{lo - w/2, lo + w/2}
		h.Counts = []int{n}
		return h
	}
	if !finite(hi - lo) {
		// values near ±1.8e308: the range overflows; Sturges bins with
		// edges interpolated between the ends
		h.Rule = "sturges"
		k := int(math.Ceil(math.Log2(float64(n)))) + 1
		h.Edges = make([]float64, k+1)
		for i := range h.Edges {
			t := float64(i) / float64(k)
			h.Edges[i] = lo*(1-t) + hi*t
		}
		h.Edges[0], h.Edges[k] = lo, hi
		h.Counts = binCounts(sorted, h.Edges)
		return h
	}
	width := 2 * iqr / math.Cbrt(float64(n))
	if !(width > 0) || !(iqr > 0) {
		h.Rule = "sturges"
		k := math.Ceil(math.Log2(float64(n))) + 1
		width = (hi - lo) / k
	}
	start := lo
	if step > 0 {
		width = math.Max(step, math.Ceil(width/step*(1-1e-12))*step)
		start = lo - step/2
	}
	k := int(math.Ceil((hi - start) / width))
	if float64(k) > maxBins || k < 1 {
		k = maxBins
		width = (hi - start) / float64(k)
		if step > 0 {
			width = math.Max(step, math.Ceil(width/step)*step)
			k = int(math.Ceil((hi - start) / width))
		}
	}
	if start+float64(k)*width < hi {
		k++
	}
	h.Edges = make([]float64, k+1)
	for i := range h.Edges {
		h.Edges[i] = start + float64(i)*width
	}
	if h.Edges[k] < hi {
		h.Edges[k] = hi
	}
	h.Counts = binCounts(sorted, h.Edges)
	return h
}

// binCounts counts the sorted values in the bins of edges (the last bin
// holds its upper edge): a value moves past edge j when it is at least
// edges[j], so the values of bin j−1 end at the first value from there
// on that is at least edges[j], found by bisection (a search per edge,
// not a step per value).
func binCounts(sorted []float64, edges []float64) []int {
	k := len(edges) - 1
	counts := make([]int, k)
	pos := 0
	for j := 1; j < k; j++ {
		next := pos + sort.SearchFloat64s(sorted[pos:], edges[j])
		counts[j-1] = next - pos
		pos = next
	}
	counts[k-1] = len(sorted) - pos
	return counts
}

// modalClass is the histogram bin holding the most values (the first when
// several tie).
func modalClass(h Histogram) [2]float64 {
	best := 0
	for i, c := range h.Counts {
		if c > h.Counts[best] {
			best = i
		}
	}
	if len(h.Counts) == 0 {
		return [2]float64{}
	}
	return [2]float64{h.Edges[best], h.Edges[best+1]}
}

// boxElements are the box plot of Tukey (1977): box from Q1 to Q3, whiskers
// to the most extreme values within the inner fences (1.5 IQR beyond the
// quartiles), outer fences at 3 IQR. On decimal data the fences are exact
// and a reading on a fence is within it (the whisker reaches it).
func boxElements(s *sample) Box {
	inLo, inHi := s.fences(s.q1, s.q3, 3, 2)
	outLo, outHi := s.fences(s.q1, s.q3, 3, 1)
	b := Box{Quantile: s.defCode, Q1: s.q1.f, Median: s.qmed.f, Q3: s.q3.f,
		InnerLo: inLo.f, InnerHi: inHi.f, OuterLo: outLo.f, OuterHi: outHi.f}
	n := s.n
	i := min(s.countBelow(inLo), n-1) // first value >= inner fence
	b.LoWhisker = math.Min(s.sorted[i], b.Q1)
	j := max(n-1-s.countAbove(inHi), 0) // last value <= inner fence
	b.HiWhisker = math.Max(s.sorted[j], b.Q3)
	return b
}

// fenceCounts counts values beyond the inner and the outer fences.
func fenceCounts(s *sample) (inner, outer int) {
	inLo, inHi := s.fences(s.q1, s.q3, 3, 2)
	outLo, outHi := s.fences(s.q1, s.q3, 3, 1)
	return s.countBelow(inLo) + s.countAbove(inHi), s.countBelow(outLo) + s.countAbove(outHi)
}

// series is the data-order series of the used values. Above maxChartPoints
// values it is thinned: the series is cut into maxChartPoints/2 consecutive
// blocks and each block keeps its smallest and largest value in data order,
// so extremes and shifts stay visible (the min-max decimation of plotting
// practice). The series follows the request's order column when there is
// one (cv.seq; readings without an order key are left out of it, and listed
// by the reader's step), else the rows' order.
func series(cv *colView, excl map[int32]bool, n int) ([]SeriesPt, bool) {
	used := func(i int) bool {
		x := cv.vals[i]
		return x == x && !math.IsInf(x, 0) && !(excl != nil && excl[cv.rows[i]])
	}
	if cv.seq != nil {
		n = 0
		for _, i := range cv.seq {
			if used(int(i)) {
				n++
			}
		}
	}
	if n <= maxChartPoints {
		out := make([]SeriesPt, 0, n)
		k := 0
		for i := range cv.inOrder() {
			if used(i) {
				out = append(out, SeriesPt{I: k, Row: int(cv.rows[i]), Y: cv.vals[i]})
				k++
			}
		}
		return out, false
	}
	blocks := maxChartPoints / 2
	out := make([]SeriesPt, 0, maxChartPoints)
	pt := func(k, i int) SeriesPt { return SeriesPt{I: k, Row: int(cv.rows[i]), Y: cv.vals[i]} }
	// k counts the used readings; the k-th is in block k·blocks/n. The
	// block's first k and its end (the next block's first k) are worked out
	// once per block, not with a division per reading, and the block keeps
	// the cell and k of its smallest and largest reading (the first of
	// equals).
	k, end := 0, 0
	lo, hi, klo, khi := -1, -1, 0, 0
	flush := func() {
		switch {
		case lo < 0:
		case klo == khi:
			out = append(out, pt(klo, lo))
		case klo < khi:
			out = append(out, pt(klo, lo), pt(khi, hi))
		default:
			out = append(out, pt(khi, hi), pt(klo, lo))
		}
	}
	m := len(cv.vals)
	if cv.seq != nil {
		m = len(cv.seq)
	}
	if excl == nil {
		// the block's readings in a loop without calls (in WebAssembly a
		// loop in a long function with calls costs several times more)
		for j := 0; j < m; {
			flush()
			blk := int(int64(k) * int64(blocks) / int64(n))
			end = int((int64(blk+1)*int64(n) + int64(blocks) - 1) / int64(blocks))
			if cv.finite > 0 && cv.seq == nil {
				// every cell a reading: reading k is cell k
				lo, hi = blockMinMax(cv.vals[j:end])
				lo, hi = lo+j, hi+j
				klo, khi, j, k = lo, hi, end, end
			} else {
				j, k, lo, hi, klo, khi = seriesBlock(cv.vals, cv.seq, j, k, end)
			}
		}
		flush()
		return out, true
	}
	for j := 0; j < m; j++ {
		i := j
		if cv.seq != nil {
			i = int(cv.seq[j])
		}
		x := cv.vals[i]
		if x != x || math.IsInf(x, 0) || (excl != nil && excl[cv.rows[i]]) {
			continue
		}
		if k >= end {
			flush()
			blk := int(int64(k) * int64(blocks) / int64(n))
			end = int((int64(blk+1)*int64(n) + int64(blocks) - 1) / int64(blocks))
			lo, hi, klo, khi = i, i, k, k
		} else {
			if x < cv.vals[lo] {
				lo, klo = i, k
			}
			if x > cv.vals[hi] {
				hi, khi = i, k
			}
		}
		k++
	}
	flush()
	return out, true
}

// seriesBlock scans the cells from position j (of seq, or the cells
// themselves when seq is nil) until k, counting the finite readings, reaches
// end or the cells run out: it returns where it stopped and the cells and
// counts of the block's first lowest and first highest reading (lo < 0 for
// none).
func seriesBlock(vals []float64, seq []int32, j, k, end int) (next, nextK, lo, hi, klo, khi int) {
	// few branches per cell: each costs a jump through a table in
	// WebAssembly; x-x != 0 is true for NaN and the infinities, and the
	// first finite reading is below +Inf and above -Inf
	lo, hi = -1, -1
	ylo, yhi := math.Inf(1), math.Inf(-1)
	if seq == nil {
		for j < len(vals) && k < end {
			// at most end-k finite readings among the next end-k cells
			stop := min(len(vals), j+end-k)
			for p, x := range vals[j:stop] {
				if x-x != 0 {
					continue
				}
				if x < ylo {
					lo, klo, ylo = j+p, k, x
				}
				if x > yhi {
					hi, khi, yhi = j+p, k, x
				}
				k++
			}
			j = stop
		}
		return j, k, lo, hi, klo, khi
	}
	for ; j < len(seq) && k < end; j++ {
		i := int(seq[j])
		x := vals[i]
		if x-x != 0 {
			continue
		}
		if x < ylo {
			lo, klo, ylo = i, k, x
		}
		if x > yhi {
			hi, khi, yhi = i, k, x
		}
		k++
	}
	return j, k, lo, hi, klo, khi
}

// inOrder yields the cell indices in the order of the series over time.
func (cv *colView) inOrder() iter.Seq[int] {
	return func(yield func(int) bool) {
		if cv.seq == nil {
			for i := range cv.vals {
				if !yield(i) {
					return
				}
			}
			return
		}
		for _, i := range cv.seq {
			if !yield(int(i)) {
				return
			}
		}
	}
}

// probBandMaxPoints bounds the band points of the normal probability plot
// (both tails dense); its positions are named by probPlotPositions.
const probBandMaxPoints = 120

// probPlot gives the normal probability plot of the sorted data: the i-th
// smallest value against Blom's (1958) position (method.BlomPosition), the
// fitted line y = mean + sd·z, and the tail-sensitive simultaneous envelope
// at level conf around it (Aldor-Noiman et al. 2013: method.OrderStatBand
// at the local level η of method.ProbBandLocalLevel, calibrated for all n
// points with the mean and SD estimated from the sample, as the line is).
// Points are thinned to at most maxPoints and the envelope is drawn through
// at most probBandMaxPoints ranks (method.ThinIndices), both tails whole;
// its level is for all n points. The caller fills the rows.
func probPlot(sorted []float64, mean, sd, conf float64, maxPoints int) ProbPlot {
	n := len(sorted)
	pp := ProbPlot{Positions: probPlotPositions, Points: []ProbPt{}, Band: []BandPt{}, Line: [2]float64{mean, sd}}
	if n < 3 || !(sd > 0) || !finite(sd) || !finite(mean) {
		return pp
	}
	if !(conf > 0 && conf < 1) {
		conf = 0.95
	}
	for _, i := range method.ThinIndices(n, maxPoints) {
		pp.Points = append(pp.Points, ProbPt{Z: method.BlomPosition(i+1, n), Y: sorted[i]})
	}
	eta, used, ok := method.ProbBandLocalLevel(n, conf)
	if !ok {
		return pp
	}
	pp.BandMethod, pp.BandLevel, pp.BandLocalLevel = method.ProbBandTailSensitive, used, eta
	for _, i := range method.ThinIndices(n, probBandMaxPoints) {
		zl, zh := method.OrderStatBand(i+1, n, 1-eta)
		lo, hi := mean+sd*zl, mean+sd*zh
		if finite(lo) && finite(hi) {
			pp.Band = append(pp.Band, BandPt{Z: method.BlomPosition(i+1, n), Lo: lo, Hi: hi})
		}
	}
	return pp
}
