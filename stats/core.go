package stats

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"lotlens/stats/ingest"
)

// percentilePoints are the percentiles every report gives (in percent):
// 0.135 and 99.865 are the ±3σ points of a normal distribution.
var percentilePoints = []float64{0.135, 1, 5, 95, 99, 99.865}

// percentileProbs are the same points as probabilities, written out so that
// no rounding of p/100 changes which order statistics are used.
var percentileProbs = []float64{0.00135, 0.01, 0.05, 0.95, 0.99, 0.99865}

// analyzeColumn fills every section of rep from the value column.
func analyzeColumn(rep *Report, cv *colView, opts Options) {
	// Exclusions: the user's choice, listed, never deleted.
	var excl map[int32]bool
	if len(opts.Exclude) > 0 {
		excl = make(map[int32]bool, len(opts.Exclude))
		for _, r := range opts.Exclude {
			if r > 0 && r <= math.MaxInt32 {
				excl[int32(r)] = true
			} else {
				rep.Notes = append(rep.Notes, Note{Field: "settings.excluded", Text: fmt.Sprintf("row %d in the exclusion list is not a row of the data; ignored", r)})
			}
		}
	}
	cv.excludedByUser = excl

	vals, dec, rows := cv.vals, cv.dec, cv.rows
	xs := make([]float64, 0, len(vals))
	ea := exactAcc{ok: true}
	maxD := int8(0)
	allFixed := true
	found := map[int32]bool{}
	for i, x := range vals {
		if x != x {
			continue
		}
		if math.IsInf(x, 0) {
			// the reader should not pass these; never let one into the figures
			rep.Counts.Rejected++
			rep.Input.Problems = append(rep.Input.Problems, ingest.Problem{Row: int(rows[i]), Column: cv.name, Text: cv.text(i), Kind: "not-a-number", Reason: "not a finite number", Action: "left out"})
			continue
		}
		if excl != nil && excl[rows[i]] {
			found[rows[i]] = true
			rep.Settings.Excluded = append(rep.Settings.Excluded, Reading{Row: int(rows[i]), Column: cv.name, Text: cv.text(i), Value: x})
			continue
		}
		xs = append(xs, x)
		d := dec[i]
		if d < 0 {
			allFixed = false
		} else if d > maxD {
			maxD = d
		}
		if ea.ok {
			m, ok := mantissa(x, d)
			if ok {
				ea.acc[d].add(m)
			} else {
				ea.ok = false
			}
		}
	}
	for r := range excl {
		if !found[r] {
			rep.Notes = append(rep.Notes, Note{Field: "settings.excluded", Text: fmt.Sprintf("row %d is listed for exclusion but holds no number in column %q; nothing to exclude there", r, cv.name)})
		}
	}
	sort.Slice(rep.Notes, func(i, j int) bool { return rep.Notes[i].Text < rep.Notes[j].Text })
	n := len(xs)
	rep.Input.Problems = append(rep.Input.Problems, cv.extraProblems...)
	rep.Counts.Used = n
	rep.Counts.Missing = cv.missing
	rep.Counts.Rejected += cv.bad
	rep.Counts.Excluded = len(rep.Settings.Excluded)
	if allFixed && n > 0 {
		rep.Counts.Decimals = int(maxD)
		rep.Counts.Resolution = math.Pow(10, -float64(maxD))
	} else {
		rep.Counts.Decimals = -1
	}
	if n == 0 {
		rep.Verdict.Quote = ""
		rep.Verdict.Reasons = []Reason{{Code: "no-data", Text: "No values are left to analyse: every number is excluded. Remove exclusions to see figures."}}
		rep.Notes = append(rep.Notes, Note{Field: "counts.used", Text: "no values left after the exclusions"})
		return
	}

	sorted := xs
	if !allFixed || !countSortFixed(sorted, int(maxD)) {
		sortFloats(sorted)
	}
	xs = nil
	lo, hi := sorted[0], sorted[n-1]

	mo, ok := ea.moments()
	if !ok {
		mo = compensatedMoments(sorted, lo, hi)
	}
	constant := lo == hi
	if constant {
		mo.mean, mo.sd, mo.popSD, mo.varN1, mo.varN, mo.varInf = lo, 0, 0, 0, 0, false
	}

	// Counts: distinct values, the effective step.
	distinct, maxRun := 1, 1
	run := 1
	for i := 1; i < n; i++ {
		if sorted[i] != sorted[i-1] {
			distinct++
			run = 1
		} else {
			run++
			if run > maxRun {
				maxRun = run
			}
		}
	}
	rep.Counts.Distinct = distinct
	step := 0.0
	if allFixed {
		step = effectiveStep(sorted, int(maxD))
		rep.Counts.Step = step
	}

	// Quantiles.
	method := opts.Quantile
	qs := &Quantiles{Method: method, Name: quantileNames[method], Min: lo, Max: hi}
	qset := quartiles(sorted, method)
	qs.Q1, qs.Median, qs.Q3 = qset.Q1, qset.Median, qset.Q3
	for i, p := range percentilePoints {
		qs.Percentiles = append(qs.Percentiles, Percentile{P: p, Value: quantile(sorted, percentileProbs[i], method)})
	}
	for _, m := range QuantileMethods {
		qs.All = append(qs.All, quartiles(sorted, m))
	}
	fenceSensitivity(rep, qs, sorted, cv)
	rep.Quantile = qs

	median := quantileHF(sorted, 0.5, 7)

	// Centre.
	c := &Centre{Mean: mo.mean, Median: median, Trimmed10: trimmedMean(sorted, 0.1)}
	if !constant {
		c.MeanCI = meanCI(mo.mean, mo.sd, n, opts.Confidence)
		if iv, ok := medianCI(sorted, opts.Confidence); iv != nil {
			c.MedianCI = iv
			if !ok {
				rep.Notes = append(rep.Notes, Note{Field: "centre.medianCI", Text: fmt.Sprintf("with %d values no order-statistic interval reaches %s; the widest one (minimum to maximum) reaches %s", n, pct(opts.Confidence), pct(iv.Level))})
			}
		}
	} else {
		rep.Notes = append(rep.Notes, Note{Field: "centre.meanCI", Text: "all values are equal: no interval for the mean or the median can be computed"})
	}
	if n < 2 {
		rep.Notes = append(rep.Notes, Note{Field: "centre.meanCI", Text: "one value: no interval, SD or shape can be computed"})
	}
	modes(c, sorted, maxRun, cv)
	rep.Centre = c

	// Spread.
	rng := hi - lo
	if mo.exact {
		// exact on the decimal mantissas: 0.3 - 0.1 is 0.2, not 0.19999999999999998
		p := pow10tab[mo.decMax]
		if ml, okl := mantissa(lo, int8(mo.decMax)); okl {
			if mh, okh := mantissa(hi, int8(mo.decMax)); okh {
				rng = float64(mh-ml) / p
			}
		}
	}
	s := &Spread{Range: rng, SD: mo.sd, IQR: qs.Q3 - qs.Q1, MAD: 1.4826 * madRaw(sorted, median)}
	if mo.varInf {
		rep.Notes = append(rep.Notes, Note{Field: "spread.variance", Text: "the variance exceeds the largest double-precision number (1.8e308) and is omitted; the SD is given"})
	} else {
		v := mo.varN1
		s.Variance = &v
	}
	if n >= 2 {
		s.SEM = mo.sd / math.Sqrt(float64(n))
		if !constant {
			s.SDCI = sdCI(mo.sd, n, opts.Confidence)
		}
	} else {
		s.SD = 0
		rep.Notes = append(rep.Notes, Note{Field: "spread.sd", Text: "one value: the SD needs at least two (shown as 0)"})
	}
	if opts.PopulationSD {
		p := mo.popSD
		s.PopSD = &p
	}
	if mo.mean != 0 && (lo > 0 || hi < 0) && n >= 2 {
		cvv := mo.sd / math.Abs(mo.mean)
		s.CV = &cvv
	} else if n >= 2 {
		rep.Notes = append(rep.Notes, Note{Field: "spread.cv", Text: "the coefficient of variation is omitted: it needs values all of one sign (a ratio scale), and a mean other than 0"})
	}
	rep.Spread = s

	// Methods: shape, probability plot, suspects, target.
	var shape *Shape
	if n >= 3 && !constant {
		if hookShape != nil {
			var notes []Note
			shape, notes = hookShape(sorted, mo.mean, mo.sd)
			rep.Notes = append(rep.Notes, notes...)
		}
	} else if constant {
		rep.Notes = append(rep.Notes, Note{Field: "shape", Text: "all values are equal: shape statistics and normality tests cannot be computed"})
	} else {
		rep.Notes = append(rep.Notes, Note{Field: "shape", Text: "shape statistics and normality tests need at least 3 values"})
	}
	rep.Shape = shape

	suspects := &Suspects{Rules: []Rule{}, Readings: []Suspect{}}
	if hookOutliers != nil && n >= 3 {
		rules, flags, flagged := hookOutliers(sorted, qs.Q1, qs.Q3, median, 1-opts.Confidence)
		suspects.Rules = rules
		var note *Note
		suspects.Readings, note = mapFlags(sorted, flags, flagged, cv)
		if note != nil {
			rep.Notes = append(rep.Notes, *note)
		}
	}
	if hookOutliers != nil || n < 3 {
		rep.Suspects = suspects
	}

	if opts.Target != nil {
		if n >= 2 && !constant && hookTarget != nil {
			rep.Target = hookTarget(sorted, mo.mean, mo.sd, *opts.Target, opts.Confidence)
		} else if n < 2 || constant {
			rep.Notes = append(rep.Notes, Note{Field: "target", Text: "tests against the target need at least two values that are not all equal"})
		}
	}

	// Charts.
	ch := &Charts{}
	ch.Histogram = histogram(sorted, qs.Q3-qs.Q1, step)
	c.ModalClass = modalClass(ch.Histogram)
	ch.Box = boxElements(sorted, qs.Q1, qs.Median, qs.Q3)
	if hookProbPlot != nil && n >= 3 && !constant {
		ch.ProbPlot = hookProbPlot(sorted, mo.mean, mo.sd, opts.Confidence, maxChartPoints)
		probPlotRows(ch.ProbPlot.Points, cv)
	} else {
		ch.ProbPlot = ProbPlot{Points: []ProbPt{}, Band: []BandPt{}}
	}
	ch.Series, ch.Thinned = series(cv, excl, n)
	rep.Charts = ch
	var stNotes []Note
	rep.Stability, stNotes = buildStability(cv, estimateWithin(cv, cv.subgroup, opts.WithinSigma), cv.subgroup, opts)
	rep.Notes = append(rep.Notes, stNotes...)

	inner, outer := fenceCounts(sorted, ch.Box)
	verdict(rep, opts, n, constant, maxRun, distinct, step, inner, outer)
	guardFinite(rep)
}

// maxChartPoints bounds the points of each chart series in a report.
const maxChartPoints = 2000

func pct(p float64) string {
	return strconv.FormatFloat(100*p, 'g', 4, 64) + "%"
}

// trimmedMean is the mean of the values left after removing floor(n·trim)
// from each end, as R's mean(x, trim) (R 4.2.2) does; the sum is Neumaier
// compensated (Neumaier 1974). Tukey and McLaughlin (1963).
func trimmedMean(sorted []float64, trim float64) float64 {
	n := len(sorted)
	lo := int(math.Floor(float64(n)*trim)) + 1
	hi := n + 1 - lo
	if lo > hi {
		return quantileHF(sorted, 0.5, 7)
	}
	part := sorted[lo-1 : hi]
	return compensatedMoments(part, part[0], part[len(part)-1]).mean
}

// madRaw is the median of |x - m| without the 1.4826 scale (Hampel 1974).
// The absolute deviations of an ascending slice are two ascending runs
// (left of m reversed, right of m); their merge is walked up to its middle,
// so no extra memory is needed.
func madRaw(sorted []float64, m float64) float64 {
	n := len(sorted)
	if n == 0 {
		return 0
	}
	// split: left = indices < r with x < m (reversed), right = indices >= r
	r := sort.SearchFloat64s(sorted, m)
	i, j := r-1, r
	next := func() float64 {
		if i >= 0 && (j >= n || m-sorted[i] <= sorted[j]-m) {
			v := m - sorted[i]
			i--
			return v
		}
		v := sorted[j] - m
		j++
		return v
	}
	k := (n - 1) / 2 // 0-based lower middle
	var a float64
	for t := 0; t <= k; t++ {
		a = next()
	}
	if n%2 == 1 {
		return a
	}
	b := next()
	return (a + b) / 2
}

// modes fills the repeated values with their counts.
func modes(c *Centre, sorted []float64, maxRun int, cv *colView) {
	if maxRun < 2 {
		c.ModeNote = "no repeated value"
		return
	}
	const maxListed = 10
	tied := 0
	var vals []float64
	run := 1
	for i := 1; i <= len(sorted); i++ {
		if i < len(sorted) && sorted[i] == sorted[i-1] {
			run++
			continue
		}
		if run == maxRun {
			tied++
			if len(vals) < maxListed {
				vals = append(vals, sorted[i-1])
			}
		}
		run = 1
	}
	texts := textsOf(vals, cv)
	for k, v := range vals {
		c.Modes = append(c.Modes, Mode{Value: v, Text: texts[k], Count: maxRun})
	}
	switch {
	case tied > maxListed:
		c.ModeNote = fmt.Sprintf("%d values tie, each occurring %d times; the %d smallest are listed", tied, maxRun, maxListed)
	case tied > 1:
		c.ModeNote = fmt.Sprintf("%d values tie, each occurring %d times", tied, maxRun)
	}
}

// textsOf returns, for each value, the text of the first reading that holds
// it (one scan of the column).
func textsOf(vals []float64, cv *colView) []string {
	out := make([]string, len(vals))
	if len(vals) == 0 {
		return out
	}
	ix := newF64index(len(vals))
	for k, v := range vals {
		ix.put(v, int32(k))
	}
	left := len(vals)
	for i, x := range cv.vals {
		if k := ix.get(x); k >= 0 && out[k] == "" && !cv.excludedByUser[cv.rows[i]] {
			out[k] = cv.text(i)
			left--
			if left == 0 {
				break
			}
		}
	}
	for k, v := range vals {
		if out[k] == "" {
			out[k] = strconv.FormatFloat(v, 'g', -1, 64)
		}
	}
	return out
}

// effectiveStep is the greatest common step of the values as typed: the
// gcd of the differences of the scaled mantissas (e.g. 0.5 for data read to
// 0.1 but recorded in half units). 0 when unknown.
func effectiveStep(sorted []float64, D int) float64 {
	if D > maxDec || len(sorted) < 2 {
		return 0
	}
	p := pow10tab[D]
	m0f := sorted[0] * p
	if !(math.Abs(m0f) < 1<<51) || !(math.Abs(sorted[len(sorted)-1]*p) < 1<<51) {
		return 0
	}
	m0 := int64(math.RoundToEven(m0f))
	var g int64
	prev := m0
	for i := 1; i < len(sorted); i++ {
		m := int64(math.RoundToEven(sorted[i] * p))
		if m == prev {
			continue
		}
		g = gcd(g, m-m0)
		prev = m
		if g == 1 {
			break
		}
	}
	if g == 0 {
		return math.Pow(10, -float64(D))
	}
	v, _ := strconv.ParseFloat(strconv.FormatInt(g, 10)+"e-"+strconv.Itoa(D), 64)
	return v
}

func gcd(a, b int64) int64 {
	if a < 0 {
		a = -a
	}
	if b < 0 {
		b = -b
	}
	for b != 0 {
		a, b = b, a%b
	}
	return a
}

// fenceSensitivity marks the report when another quantile definition would
// put different readings beyond Tukey's fences (1.5 and 3 IQR beyond the
// quartiles; Tukey 1977), and names their rows.
func fenceSensitivity(rep *Report, qs *Quantiles, sorted []float64, cv *colView) {
	n := len(sorted)
	type cut struct{ loIn, hiIn, loOut, hiOut int } // counts beyond each fence
	cuts := func(q QuartileSet) cut {
		iqr := q.Q3 - q.Q1
		below := func(f float64) int { return sort.SearchFloat64s(sorted, f) } // values < f
		above := func(f float64) int {                                         // values > f
			return n - sort.Search(n, func(i int) bool { return sorted[i] > f })
		}
		return cut{below(q.Q1 - 1.5*iqr), above(q.Q3 + 1.5*iqr), below(q.Q1 - 3*iqr), above(q.Q3 + 3*iqr)}
	}
	ref := cuts(QuartileSet{Q1: qs.Q1, Q3: qs.Q3})
	// the readings whose flag changes lie in sorted[minLo:maxLo] and sorted[n-maxHi:n-minHi]
	minLo, maxLo, minHi, maxHi := ref.loIn, ref.loIn, ref.hiIn, ref.hiIn
	minLoO, maxLoO, minHiO, maxHiO := ref.loOut, ref.loOut, ref.hiOut, ref.hiOut
	var differ []string
	for _, q := range qs.All {
		c := cuts(q)
		if c != ref {
			differ = append(differ, q.Method)
		}
		minLo, maxLo = min(minLo, c.loIn), max(maxLo, c.loIn)
		minHi, maxHi = min(minHi, c.hiIn), max(maxHi, c.hiIn)
		minLoO, maxLoO = min(minLoO, c.loOut), max(maxLoO, c.loOut)
		minHiO, maxHiO = min(minHiO, c.hiOut), max(maxHiO, c.hiOut)
	}
	if len(differ) == 0 {
		return
	}
	qs.Sensitive = true
	var vals []float64
	addRange := func(a, b int) {
		for i := a; i < b && len(vals) < 50; i++ {
			vals = append(vals, sorted[i])
		}
	}
	addRange(minLo, maxLo)
	addRange(n-maxHi, n-minHi)
	addRange(minLoO, maxLoO)
	addRange(n-maxHiO, n-minHiO)
	rowsOf := rowsHolding(vals, cv, 20)
	qs.Note = fmt.Sprintf("Which readings lie beyond Tukey's fences depends on the quantile definition here: %s flag(s) a different set than %s. Readings affected: %s.",
		strings.Join(differ, ", "), qs.Method, rowsOf)
}

// rowsHolding lists (up to limit) the rows of readings holding any of vals.
func rowsHolding(vals []float64, cv *colView, limit int) string {
	ix := newF64index(len(vals))
	for _, v := range vals {
		ix.put(v, 0)
	}
	var rows []string
	total := 0
	for i, x := range cv.vals {
		if ix.get(x) >= 0 && !cv.excludedByUser[cv.rows[i]] {
			total++
			if len(rows) < limit {
				rows = append(rows, "row "+strconv.Itoa(int(cv.rows[i]))+" ("+cv.text(i)+")")
			}
		}
	}
	s := strings.Join(rows, ", ")
	if total > limit {
		s += fmt.Sprintf(" and %d more", total-limit)
	}
	return s
}

// maxSuspects bounds the readings listed in a report; the rules still
// count every flagged reading.
const maxSuspects = 1000

// mapFlags turns flags keyed by index into sorted into readings with row,
// column and text. Equal values carry the same flags, so every reading
// holding a flagged value is listed. Beyond maxSuspects readings the most
// extreme (farthest from the middle of the ordered data) are kept and a Note
// says how many were flagged: flagged, the count of all flagged indices
// (flags itself need only hold the maxSuspects most extreme).
func mapFlags(sorted []float64, flags map[int][]Flag, flagged int, cv *colView) ([]Suspect, *Note) {
	out := []Suspect{}
	if len(flags) == 0 {
		return out, nil
	}
	n := len(sorted)
	idx := make([]int, 0, len(flags))
	for i := range flags {
		if i >= 0 && i < n {
			idx = append(idx, i)
		}
	}
	depth := func(i int) int { return min(i, n-1-i) }
	sort.Slice(idx, func(a, b int) bool {
		if depth(idx[a]) != depth(idx[b]) {
			return depth(idx[a]) < depth(idx[b])
		}
		return idx[a] < idx[b]
	})
	var note *Note
	if flagged > maxSuspects {
		note = &Note{Field: "suspects.readings", Text: fmt.Sprintf("%d readings are flagged; the %d most extreme are listed (the rules give the full counts)", flagged, maxSuspects)}
	}
	if len(idx) > maxSuspects {
		idx = idx[:maxSuspects]
	}
	ix := newF64index(len(idx))
	var fl [][]Flag
	left := make([]int, 0, len(idx))
	for _, i := range idx {
		v := sorted[i]
		if k := ix.get(v); k >= 0 {
			left[k]++
			continue
		}
		ix.put(v, int32(len(fl)))
		fl = append(fl, flags[i])
		left = append(left, 1)
	}
	for i, x := range cv.vals {
		if k := ix.get(x); k >= 0 && left[k] > 0 && !cv.excludedByUser[cv.rows[i]] {
			left[k]--
			out = append(out, Suspect{Reading: Reading{Row: int(cv.rows[i]), Column: cv.name, Text: cv.text(i), Value: x}, Flags: fl[k]})
		}
	}
	sort.SliceStable(out, func(a, b int) bool { return out[a].Row < out[b].Row })
	return out, note
}

// probPlotRows fills the row of each probability-plot point: readings that
// hold the same value are handed out in data order, one per point.
func probPlotRows(pts []ProbPt, cv *colView) {
	if len(pts) == 0 {
		return
	}
	ix := newF64index(len(pts))
	var need []int
	for _, p := range pts {
		id := ix.get(p.Y)
		if id < 0 {
			id = int32(len(need))
			ix.put(p.Y, id)
			need = append(need, 0)
		}
		need[id]++
	}
	got := make([][]int32, len(need))
	for i, x := range cv.vals {
		if id := ix.get(x); id >= 0 && len(got[id]) < need[id] && !cv.excludedByUser[cv.rows[i]] {
			got[id] = append(got[id], cv.rows[i])
		}
	}
	for i := range pts {
		id := ix.get(pts[i].Y)
		if rows := got[id]; len(rows) > 0 {
			pts[i].Row = int(rows[0])
			got[id] = rows[1:]
		}
	}
}
