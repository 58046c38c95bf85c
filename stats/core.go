package stats

import (
	"math"
	"sort"
	"strconv"

	"lotlens/stats/decimal"
	"lotlens/stats/ingest"
)

// analyzeColumn fills every section of rep from the value column: the
// first pass (exclusions, exact sums), the sort, then one builder per
// section, in order.
func analyzeColumn(rep *Report, cv *colView, opts Options) {
	w := wordsFor(rep)
	// Exclusions: the user's choice, listed, never deleted.
	var excl map[int32]bool
	if len(opts.Exclude) > 0 {
		excl = make(map[int32]bool, len(opts.Exclude))
		for _, r := range opts.Exclude {
			if r > 0 && r <= math.MaxInt32 {
				excl[int32(r)] = true
			} else {
				rep.Notes = append(rep.Notes, Note{Field: "settings.excluded", Text: w.excludeNotARow(r)})
			}
		}
	}
	cv.excludedByUser = excl

	vals, dec, rows := cv.vals, cv.dec, cv.rows
	xs := make([]float64, 0, len(vals))
	onGrid := true // every value a plain decimal held exactly
	maxD := int8(0)
	allFixed := true
	found := map[int32]bool{}
	for i := 0; i < len(vals); i++ {
		if excl == nil {
			// the finite readings up to the next infinite one, in a loop
			// without calls (WebAssembly runs it several times faster),
			// a slice of cells at a time: V8 first runs a wasm function
			// unoptimised and swaps in the optimised code between calls
			end := min(len(vals), i+finiteSlice)
			i, xs, maxD, allFixed, onGrid = finiteReadings(vals[:end], dec, i, xs, maxD, allFixed, onGrid)
			if i == end { // no infinite reading in the slice: the next
				i--
				continue
			}
		}
		x := vals[i]
		if x != x {
			continue
		}
		if math.IsInf(x, 0) {
			// the reader should not pass these; never let one into the figures
			rep.Counts.Rejected++
			why, action := w.notFinite()
			rep.Input.Problems = append(rep.Input.Problems, ingest.Problem{Row: int(rows[i]), Column: cv.name, Text: cv.text(i), Kind: "not-a-number", Reason: why, Action: action})
			continue
		}
		if excl != nil && excl[rows[i]] {
			found[rows[i]] = true
			rep.Settings.Excluded = append(rep.Settings.Excluded, Reading{Row: int(rows[i]), Column: cv.name, Text: cv.text(i), Value: x, Reason: opts.ExcludeReasons[int(rows[i])]})
			continue
		}
		xs = append(xs, x)
		d := dec[i]
		if d < 0 {
			allFixed = false
		} else if d > maxD {
			maxD = d
		}
		if onGrid {
			_, onGrid = decimal.Mantissa(x, int(d))
		}
	}
	if excl == nil { // every finite cell was kept
		cv.finite = -1
		if len(xs) == len(vals) {
			cv.finite = 1
		}
	}
	for r := range excl {
		if !found[r] {
			rep.Notes = append(rep.Notes, Note{Field: "settings.excluded", Text: w.excludeNoNumber(int(r), cv.name)})
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
		rep.Verdict.Reasons = []Reason{{Code: "no-data", Text: w.noDataReason()}}
		rep.Notes = append(rep.Notes, Note{Field: "counts.used", Text: w.noDataNote()})
		return
	}

	// The decimal grid: every value a plain decimal with at most maxD
	// decimals (checked value by value in the sums).
	var grid decimal.Grid
	if allFixed && onGrid {
		grid, _ = decimal.NewGrid(int(maxD))
	}
	s, ps := prepareSample(xs, grid, opts.Quantile)
	sorted := s.sorted
	xs = nil
	if !s.exact {
		rep.Notes = append(rep.Notes, Note{Field: "counts.decimals", Text: w.binaryPath(allFixed)})
	}

	// Counts: distinct values, the effective step.
	distinct, maxRun := runs(sorted)
	rep.Counts.Distinct = distinct
	step := 0.0
	if s.exact {
		step = effectiveStep(s, distinct)
		rep.Counts.Step = step
	}

	buildQuantiles(rep, w, s, cv)
	c := buildCentre(rep, w, s, opts, maxRun, cv)
	rep.Centre = c
	rep.Spread = buildSpread(rep, w, s, opts)

	// Shape, suspects, target.
	if n >= 3 && !s.constant {
		shape, notes := shapeSection(w, sorted, s.mo.mean, s.mo.sd, ps)
		rep.Shape = shape
		rep.Notes = append(rep.Notes, notes...)
	} else if s.constant {
		rep.Notes = append(rep.Notes, Note{Field: "shape", Text: w.shapeSectionConstant()})
	} else {
		rep.Notes = append(rep.Notes, Note{Field: "shape", Text: w.shapeSectionFew()})
	}

	suspects := &Suspects{Rules: []Rule{}, Readings: []Suspect{}}
	if n >= 3 {
		rules, flags, flagged, lead := outlierRules(w, s, 1-opts.Confidence, distinct)
		suspects.Rules, suspects.Lead = rules, lead
		var note *Note
		suspects.Readings, note = mapFlags(w, sorted, flags, flagged, cv)
		if note != nil {
			rep.Notes = append(rep.Notes, *note)
		}
	}
	rep.Suspects = suspects

	if opts.Target != nil {
		if n >= 2 && !s.constant {
			rep.Target = targetSection(w, sorted, s.mo.mean, s.mo.sd, *opts.Target, opts.Confidence, s.grid)
		} else {
			rep.Notes = append(rep.Notes, Note{Field: "target", Text: w.targetFewNote()})
		}
	}

	// Over time, before the spec section: its verdict becomes the spec's
	// caution, and the within-process sigma is estimated once for both.
	within := estimateWithin(cv, cv.subgroup, opts.WithinSigma)
	var stNotes []Note
	rep.Stability, stNotes = buildStability(w, cv, within, s, opts)
	rep.Notes = append(rep.Notes, stNotes...)

	// Against the spec.
	if opts.LSL != nil || opts.USL != nil {
		in := specInput{sorted: sorted, mean: s.mo.mean, sd: rep.Spread.SD, step: step, distinct: distinct,
			stability: rep.Stability.Caution(), stableKnown: rep.Stability != nil && rep.Stability.Judged}
		if n >= 2 && !s.constant {
			in.within = within
		}
		if sh := rep.Shape; sh != nil {
			if t := sh.Shapiro; t != nil {
				in.normalP, in.normalTest = &t.P, w.normalTest(t.Name, t.P)
			} else if t := sh.Large; t != nil {
				in.normalP, in.normalTest = &t.P, w.normalTest(t.Name, t.P)
			}
		}
		var notes []Note
		rep.Spec, notes = buildSpec(w, in, opts)
		rep.Notes = append(rep.Notes, notes...)
		rep.Settings.Coverage, rep.Settings.CpkGoal = opts.Coverage, opts.CpkGoal
	}
	rep.Groups = groupsSection(rep, w, cv, opts)

	// Charts.
	ch := &Charts{}
	ch.Histogram = histogram(sorted, rep.Spread.IQR, step)
	c.ModalClass = modalClass(ch.Histogram)
	ch.Box = boxElements(s)
	if n >= 3 && !s.constant {
		ch.ProbPlot = probPlot(sorted, s.mo.mean, s.mo.sd, opts.Confidence, maxChartPoints)
		probPlotRows(ch.ProbPlot.Points, cv)
		if b := ch.ProbPlot.BandLevel; b != 0 && b != opts.Confidence {
			rep.Notes = append(rep.Notes, Note{Field: "charts.probPlot.bandLevel", Text: w.probBandLevelClamped(opts.Confidence, b)})
		}
	} else {
		ch.ProbPlot = ProbPlot{Points: []ProbPt{}, Band: []BandPt{}}
	}
	ch.Series, ch.Thinned = series(cv, excl, n)
	rep.Charts = ch

	inner, outer := fenceCounts(s)
	verdict(rep, w, opts, n, s.constant, maxRun, distinct, step, inner, outer, restSkewOf(s))
	decimalMarkWarnings(rep, w, cv, n)
	guardFinite(rep)
}

// finiteSlice is the most cells finiteReadings takes in one call.
const finiteSlice = 1 << 14

// finiteReadings appends to xs the finite readings of vals from cell i on,
// up to the first infinite one (returned, or len(vals)), and updates with
// their decimals dec the most decimals, whether all were fixed and whether
// all are plain decimals held exactly, as analyzeColumn's loop does for
// each. xs has room for every cell.
func finiteReadings(vals []float64, dec []int8, i int, xs []float64, maxD int8, allFixed, onGrid bool) (int, []float64, int8, bool, bool) {
	dec = dec[:len(vals)]
	for ; i < len(vals); i++ {
		x := vals[i]
		if x-x != 0 { // not finite
			if x == x {
				break // infinite: the caller reports it
			}
			continue
		}
		xs = xs[:len(xs)+1]
		xs[len(xs)-1] = x
		d := dec[i]
		allFixed = allFixed && d >= 0
		maxD = max(maxD, d)
		if onGrid {
			_, onGrid = decimal.Mantissa(x, int(d))
		}
	}
	return i, xs, maxD, allFixed, onGrid
}

// maxChartPoints bounds the points of each chart series in a report. A
// chart's plot is about 560 units wide (stats/chart), so 600 blocks, each
// drawn by its lowest and highest point, keep every peak and dip at the
// chart's own resolution; more points only made the report and the page
// slower (2,000 before: the 10,000-reading report was 40 % larger).
const maxChartPoints = 1200

// modes fills the repeated values with their counts.
func modes(c *Centre, w words, sorted []float64, maxRun int, cv *colView) {
	if maxRun < 2 {
		c.ModeNote = w.modeNone()
		return
	}
	const maxListed = 10
	tied := 0
	var vals []float64
	for i := 0; i < len(sorted); {
		j := decimal.RunEnd(sorted, i)
		if j-i == maxRun {
			tied++
			if len(vals) < maxListed {
				vals = append(vals, sorted[j-1])
			}
		}
		i = j
	}
	texts := textsOf(w, vals, cv)
	for k, v := range vals {
		c.Modes = append(c.Modes, Mode{Value: v, Text: texts[k], Count: maxRun})
	}
	if tied > 1 {
		c.ModeNote = w.modeTies(tied, maxRun, min(tied, maxListed))
	}
}

// textsOf returns, for each value, the text of the first reading that holds
// it (one scan of the column).
func textsOf(w words, vals []float64, cv *colView) []string {
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
			out[k] = w.valueText(v)
		}
	}
	return out
}

// stepMinDistinct is the number of distinct values from which the gaps
// between them may show a step coarser than the decimals as typed. With k
// distinct values on a grid, chance alone makes all k-1 gaps from the
// smallest a multiple of g with a probability of about g^-(k-1); from 11
// distinct values that is at most 2^-10 (about 0.001) for the smallest
// coarser step g = 2. Three readings 4.09, 4.12, 4.15 (gaps of 0.03) say
// nothing about the gauge: their step is the typed 0.01.
const stepMinDistinct = 11

// effectiveStep is the step the values move in: the resolution as typed
// (10^-Scale), or, from stepMinDistinct distinct values on, the greatest
// common divisor of the gaps between the mantissas when it is coarser
// (e.g. 0.5 for data typed to 0.1 but recorded in half units).
func effectiveStep(s *sample, distinct int) float64 {
	if distinct < stepMinDistinct {
		return s.grid.Float(1)
	}
	return gapStep(s)
}

// gapStep is the greatest common divisor of the gaps between the values
// (at least the typed resolution), on the exact path; 0 otherwise. With few
// distinct values it may be coarser than the gauge's step by chance (see
// stepMinDistinct), but every gap is a multiple of it.
func gapStep(s *sample) float64 {
	if !s.exact || s.n == 0 {
		return 0
	}
	g := s.grid
	typed := g.Float(1)
	m0 := g.M(s.sorted[0])
	var d int64
	prev := m0
	for _, x := range s.sorted[1:] {
		m := g.M(x)
		if m == prev {
			continue
		}
		d = gcd(d, m-m0)
		prev = m
		if d == 1 {
			break
		}
	}
	if d <= 1 {
		return typed
	}
	v, _ := strconv.ParseFloat(strconv.FormatInt(d, 10)+"e-"+strconv.Itoa(g.Scale), 64)
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

// rowsHolding lists (up to limit) the rows of readings holding any of vals,
// with their text as typed.
func rowsHolding(w words, vals []float64, cv *colView, limit int) string {
	ix := newF64index(len(vals))
	for _, v := range vals {
		ix.put(v, 0)
	}
	var rows []int32
	var texts []string
	total := 0
	for i, x := range cv.vals {
		if ix.get(x) >= 0 && !cv.excludedByUser[cv.rows[i]] {
			total++
			if len(rows) < limit {
				rows = append(rows, cv.rows[i])
				texts = append(texts, cv.text(i))
			}
		}
	}
	return w.rowsWithText(rows, texts, total-len(rows))
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
func mapFlags(w words, sorted []float64, flags map[int][]Flag, flagged int, cv *colView) ([]Suspect, *Note) {
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
		note = &Note{Field: "suspects.readings", Text: w.suspectsMore(flagged, maxSuspects)}
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
	all := len(idx) // readings still to find: the scan stops when none is left
	for i, x := range cv.vals {
		if all == 0 {
			break
		}
		if k := ix.get(x); k >= 0 && left[k] > 0 && !cv.excludedByUser[cv.rows[i]] {
			left[k]--
			all--
			lead := false
			for _, f := range fl[k] {
				lead = lead || f.Lead
			}
			out = append(out, Suspect{Reading: Reading{Row: int(cv.rows[i]), Column: cv.name, Text: cv.text(i), Value: x}, Lead: lead, Flags: fl[k]})
		}
	}
	// the leading rule's readings first, each group by row
	sort.SliceStable(out, func(a, b int) bool {
		if out[a].Lead != out[b].Lead {
			return out[a].Lead
		}
		return out[a].Row < out[b].Row
	})
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
	// stop once every point has its row: on readings to a resolution (few
	// distinct values, each met early) that is long before the end
	left := len(pts)
	for i, x := range cv.vals {
		if id := ix.get(x); id >= 0 && len(got[id]) < need[id] && !cv.excludedByUser[cv.rows[i]] {
			got[id] = append(got[id], cv.rows[i])
			if left--; left == 0 {
				break
			}
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

// prepareSample sorts xs in place and prepares its sample, the same way for
// the whole column and for each group of the groups section: the moments
// from exact sums of powers of the decimals when every value lies on grid
// (ps, else nil), otherwise compensated binary sums; the quartiles under
// the quantile definition code; constant data get mean = the value and
// SD = 0 exactly.
func prepareSample(xs []float64, grid decimal.Grid, code string) (s *sample, ps *decimal.PowerSums) {
	sorted := xs
	if !grid.CountSort(sorted) {
		decimal.SortFloats(sorted)
	}
	var mo moments
	if n := len(sorted); n > 0 {
		lo, hi := sorted[0], sorted[n-1]
		if grid.Valid() && grid.Holds(sorted) {
			p := grid.PowerSums(sorted)
			if dm, ok := p.Moments(grid); ok {
				mo, ps = fromDecimal(dm), &p
			}
		}
		if ps == nil {
			mo = compensatedMoments(sorted, lo, hi)
		}
	}
	s = newSample(sorted, grid, mo, quantileDef(code), code)
	if s.constant {
		lo := sorted[0]
		s.mo.mean, s.mo.sd, s.mo.popSD, s.mo.varN1, s.mo.varN, s.mo.varInf = lo, 0, 0, 0, 0, false
	}
	return s, ps
}

// runs counts the distinct values of sorted data and the longest run of
// one value (1 for empty data).
func runs(sorted []float64) (distinct, maxRun int) {
	if len(sorted) == 0 {
		return 1, 1
	}
	distinct, maxRun = 0, 1
	for i := 0; i < len(sorted); {
		j := decimal.RunEnd(sorted, i)
		distinct++
		maxRun = max(maxRun, j-i)
		i = j
	}
	return distinct, maxRun
}
