package stats

import (
	"errors"
	"math"
	"sort"
	"strconv"
	"strings"

	"lotlens/stats/decimal"
	"lotlens/stats/ingest"
	"lotlens/stats/method"
)

// This file: the Groups section (do lines, shifts, cavities or suppliers
// differ): its report types and its builder. Each group's own figures come
// from the column's code (prepareSample, buildCentre, buildSpread,
// boxElements, skewness, verdict, withinOf, method.Capability); the tests
// from stats/method (anova.go, ranks.go, pairwise.go, spreadtest.go); the
// sentences from the "Groups" part of words.go.
//
// Groups come either from a group column beside the value column ("long":
// Request.Group) or from several value columns side by side, one per group
// ("wide": Request.Groups).

// CodeTooManyGroups is the error code of a request whose group column (or
// list of side-by-side columns) holds more than method.MaxGroups groups.
const CodeTooManyGroups = "too-many-groups"

// Groups compares the groups of the data.
type Groups struct {
	// Shape is "long" (a group column beside the value column) or "wide"
	// (one value column per group, side by side).
	Shape   string   `json:"shape"`
	Column  string   `json:"column,omitempty"`  // long: the group column
	Columns []string `json:"columns,omitempty"` // wide: the value columns compared
	// Statement is the section's verdict in plain words.
	Statement string `json:"statement"`
	// Lead is "means" or "medians": which family of tests leads, decided
	// per group by the single-column verdict's rules (Reasons say why);
	// "" when fewer than two groups can be tested.
	Lead    string   `json:"lead,omitempty"`
	Reasons []Reason `json:"reasons,omitempty"`
	// Exact is true when the rank tests and the fences worked on the
	// readings' decimal mantissas (every tie and comparison exact as
	// typed); false when some reading was not plain decimal text.
	Exact bool `json:"exact"`
	// Alpha is the level the tests and pairs are judged at (1 - confidence).
	Alpha    float64        `json:"alpha"`
	Levels   []GroupLevel   `json:"levels"`
	Centre   *GroupCentre   `json:"centre,omitempty"`
	Spread   *GroupSpread   `json:"spread,omitempty"`
	Pairwise *GroupPairwise `json:"pairwise,omitempty"`
	Effect   *GroupEffect   `json:"effect,omitempty"` // exactly two groups tested
}

// GroupLevel is one group: its own figures, chosen the way the
// single-column verdict chooses them.
type GroupLevel struct {
	Name string `json:"name"` // the label as typed (long) or the column name (wide)
	// Title is the name used in sentences ("Line B" for the label "B" of
	// column "Line").
	Title string `json:"title"`
	N     int    `json:"n"`
	// InTests is false for a group left out of the tests; LeftOut says why.
	InTests bool   `json:"inTests"`
	LeftOut string `json:"leftOut,omitempty"`
	// Quote is "mean-sd" or "median-iqr", by the verdict's rules applied
	// to this group alone; QuoteReasons are that verdict's reasons.
	Quote        string    `json:"quote"`
	QuoteReasons []Reason  `json:"quoteReasons,omitempty"`
	Mean         float64   `json:"mean"`
	MeanCI       *Interval `json:"meanCI,omitempty"`
	SD           float64   `json:"sd"`
	SDCI         *Interval `json:"sdCI,omitempty"`
	Median       float64   `json:"median"`
	MedianCI     *Interval `json:"medianCI,omitempty"`
	IQR          float64   `json:"iqr"`
	Min          float64   `json:"min"`
	Max          float64   `json:"max"`
	// Box holds the box-plot elements (type 7 quartiles, Tukey's fences).
	Box Box `json:"box"`
	// Suspects are the group's readings beyond its own Tukey fences, by
	// row (at most maxGroupSuspects); SuspectCount counts them all.
	Suspects     []Suspect `json:"suspects"`
	SuspectCount int       `json:"suspectCount"`
	// Letters: groups sharing a letter do not differ clearly (pairwise).
	Letters string     `json:"letters,omitempty"`
	Spec    *GroupSpec `json:"spec,omitempty"`
	// Points are the readings for the dot plot (a systematic sample in data
	// order when Thinned, plus every listed suspect).
	Points  []GroupPoint `json:"points"`
	Thinned bool         `json:"thinned,omitempty"`
}

// GroupPoint is one reading of a group for the dot plot.
type GroupPoint struct {
	Row int     `json:"row"`
	Y   float64 `json:"y"`
}

// GroupSpec is one group against the specification limits: the counts
// outside, decided as the spec section decides them, and the capability
// indices of method.Capability from the group's own figures.
type GroupSpec struct {
	Below     int       `json:"below"`               // readings below the LSL
	Above     int       `json:"above"`               // readings above the USL
	Outside   float64   `json:"outside"`             // fraction outside, observed
	OutsideCI *Interval `json:"outsideCI,omitempty"` // Clopper-Pearson
	// Cpk is from the group's within-process sigma, estimated as the
	// column's (see within.go): the moving range of the group's readings
	// in time order, or the pooled SD of its subgroups when a subgroup
	// column is given. Sigma names the estimator (a Within* code) and
	// SigmaWithin gives it; both are absent when no within sigma can be had
	// (too few readings in a row, no variation), with a Note.
	Cpk         *float64  `json:"cpk,omitempty"`
	CpkCI       *Interval `json:"cpkCI,omitempty"`
	Sigma       string    `json:"sigma,omitempty"`
	SigmaWithin *float64  `json:"sigmaWithin,omitempty"`
	// Ppk is from the group's overall SD (n − 1).
	Ppk   *float64  `json:"ppk,omitempty"`
	PpkCI *Interval `json:"ppkCI,omitempty"`
}

// GroupTest is one test of the section.
type GroupTest struct {
	// Code: "welch-anova", "anova", "kruskal-wallis", "welch-t",
	// "mann-whitney", "brown-forsythe", "bartlett", "f-ratio".
	Code      string   `json:"code"`
	Name      string   `json:"name"`
	Statistic float64  `json:"statistic"`
	DF        *float64 `json:"df,omitempty"`
	DF2       *float64 `json:"df2,omitempty"`
	P         float64  `json:"p"`
	Lead      bool     `json:"lead,omitempty"`
	Method    string   `json:"method,omitempty"`
}

// GroupCentre holds the tests of a difference in centre.
type GroupCentre struct {
	Lead   string      `json:"lead"` // code of the leading test
	Why    string      `json:"why"`
	Differ bool        `json:"differ"` // the leading test's p is below alpha
	Tests  []GroupTest `json:"tests"`
}

// GroupSpread holds the tests of a difference in spread and the ratio of
// the largest to the smallest SD.
type GroupSpread struct {
	Lead     string      `json:"lead"`
	Why      string      `json:"why"`
	Differ   bool        `json:"differ"`
	Tests    []GroupTest `json:"tests"`
	Ratio    float64     `json:"ratio"`
	Largest  string      `json:"largest"`
	Smallest string      `json:"smallest"`
	RatioCI  *Interval   `json:"ratioCI,omitempty"` // two groups: F-based interval
}

// GroupPairwise holds the comparisons of every pair of tested groups.
type GroupPairwise struct {
	Means   *PairSet `json:"means,omitempty"`
	Medians *PairSet `json:"medians,omitempty"`
	// LettersFrom names the set ("means" or "medians") the levels' letters
	// come from: the one that leads.
	LettersFrom string `json:"lettersFrom,omitempty"`
}

// PairSet is one family of pairwise comparisons.
type PairSet struct {
	// Method: "tukey-kramer", "games-howell" (means), "dunn-holm" (medians).
	Method string      `json:"method"`
	Why    string      `json:"why"`
	Lead   bool        `json:"lead,omitempty"`
	Pairs  []GroupPair `json:"pairs"`
}

// GroupPair compares group B with group A.
type GroupPair struct {
	A string `json:"a"`
	B string `json:"b"`
	// Diff is B minus A in the data's unit: the difference in means (with
	// its simultaneous interval) or the Hodges-Lehmann shift (with its
	// interval for this pair alone).
	Diff      *float64  `json:"diff,omitempty"`
	CI        *Interval `json:"ci,omitempty"`
	Statistic float64   `json:"statistic"`
	P         float64   `json:"p"` // adjusted for all pairs
	Differ    bool      `json:"differ"`
	// OfTolerance is |Diff| as a fraction of USL - LSL.
	OfTolerance *float64 `json:"ofTolerance,omitempty"`
}

// GroupEffect is the size of the difference between two groups (B minus A).
type GroupEffect struct {
	A          string    `json:"a"`
	B          string    `json:"b"`
	MeanDiff   float64   `json:"meanDiff"`
	MeanDiffCI *Interval `json:"meanDiffCI,omitempty"` // Welch
	Shift      *float64  `json:"shift,omitempty"`      // Hodges-Lehmann
	ShiftCI    *Interval `json:"shiftCI,omitempty"`
	HedgesG    *float64  `json:"hedgesG,omitempty"`
	HedgesGCI  *Interval `json:"hedgesGCI,omitempty"`
	// OfTolerance is the leading estimate (MeanDiff or Shift), in absolute
	// value, as a fraction of USL - LSL.
	OfTolerance *float64 `json:"ofTolerance,omitempty"`
}

// Limits of the section.
const (
	maxGroupSuspects = 50  // suspects listed per group
	maxGroupPoints   = 300 // dot-plot points per group before thinning
	maxPairShiftWork = 1e6 // readings × (tested groups - 1) up to which pairwise shifts are computed
	groupNameLen     = 3   // labels this short are prefixed with the column name in sentences
)

// grpSrc is one column the readings come from.
type grpSrc struct {
	name string
	vals []float64
	dec  []int8
	rows []int32
	text func(i int) string
}

// grpWork is one group while the section is built.
type grpWork struct {
	name, title string
	src         *grpSrc
	cells       []int32 // cell indices into src, in row order
	time        []int32 // the same cells in time order (cv.inOrder), for the within sigma
	s           *sample
	ps          *decimal.PowerSums
	mant        []int64 // the sorted readings' mantissas on the section's grid (exact path)
	lvl         GroupLevel
}

// groupsSection builds the Groups section from the group column (long) or
// the side-by-side columns (wide) of cv; nil when the request has neither.
func groupsSection(rep *Report, w words, cv *colView, opts Options) *Groups {
	if cv.group == nil && len(cv.wide) == 0 {
		return nil
	}
	g := &Groups{Alpha: math.Round((1-opts.Confidence)*1e12) / 1e12, Levels: []GroupLevel{}}
	excl := cv.excludedByUser
	used := func(c *grpSrc, i int) bool {
		x := c.vals[i]
		return x == x && !math.IsInf(x, 0) && (excl == nil || !excl[c.rows[i]])
	}
	var ws []*grpWork
	if cv.group != nil {
		g.Shape, g.Column = "long", cv.group.Name
		src := &grpSrc{name: cv.name, vals: cv.vals, dec: cv.dec, rows: cv.rows, text: cv.text}
		var gid []int32
		ws, gid = groupLong(src, cv.group, used)
		for i := range cv.inOrder() {
			if k := gid[i]; k > 0 {
				ws[k-1].time = append(ws[k-1].time, int32(i))
			}
		}
	} else {
		g.Shape = "wide"
		for _, c := range cv.wide {
			g.Columns = append(g.Columns, c.Name)
			src := &grpSrc{name: c.Name, vals: c.Values, dec: c.Dec, rows: c.Rows, text: c.Text}
			gw := &grpWork{name: c.Name, title: c.Name, src: src}
			for i := range c.Values {
				if used(src, i) {
					gw.cells = append(gw.cells, int32(i))
				}
			}
			for i := range cv.inOrder() {
				if i < len(c.Values) && used(src, i) {
					gw.time = append(gw.time, int32(i))
				}
			}
			ws = append(ws, gw)
		}
	}
	if len(ws) > method.MaxGroups {
		// pickColumns refuses these; a guard for other callers
		rep.Notes = append(rep.Notes, Note{Field: "groups", Text: w.grpTooMany(len(ws), method.MaxGroups)})
		return nil
	}

	// The section's decimal grid: the largest decimal count of all groups,
	// when every reading is a plain decimal (as the column's, core.go).
	total, maxD, onGrid := 0, 0, true
	for _, gw := range ws {
		total += len(gw.cells)
		for _, i := range gw.cells {
			d := int(gw.src.dec[i])
			if d < 0 {
				onGrid = false
				break
			}
			maxD = max(maxD, d)
			if onGrid {
				_, onGrid = decimal.Mantissa(gw.src.vals[i], d)
			}
		}
	}
	var grid decimal.Grid
	if onGrid {
		grid, _ = decimal.NewGrid(maxD)
	}
	// each group's sample, sorted and with its moments, as the column's
	fbuf := make([]float64, total) // one array for all groups
	exact := grid.Valid()
	for _, gw := range ws {
		xs := fbuf[:len(gw.cells):len(gw.cells)]
		fbuf = fbuf[len(gw.cells):]
		for k, i := range gw.cells {
			xs[k] = gw.src.vals[i]
		}
		gw.s, gw.ps = prepareSample(xs, grid, opts.Quantile)
		exact = exact && (gw.s.exact || gw.s.n == 0)
	}
	if exact {
		mbuf := make([]int64, total)
		for _, gw := range ws {
			gw.mant, mbuf = mbuf[:gw.s.n:gw.s.n], mbuf[gw.s.n:]
			for k, x := range gw.s.sorted {
				gw.mant[k] = grid.M(x)
			}
		}
	} else {
		rep.Notes = append(rep.Notes, Note{Field: "groups.exact", Text: w.grpNotExact()})
	}
	g.Exact = exact

	// each group on its own
	for _, gw := range ws {
		gw.lvl = groupLevel(rep, w, gw, cv, opts)
	}
	// screening: groups of 1 or 2 readings are listed, not tested
	sizes := make([]int, len(ws))
	for i, gw := range ws {
		sizes[i] = gw.s.n
	}
	keep, skipped := method.ScreenGroups(sizes)
	for _, s := range skipped {
		ws[s.Group].lvl.LeftOut = w.grpLeftOut(s.N, method.MinGroupReadings)
	}
	for _, i := range keep {
		ws[i].lvl.InTests = true
	}
	tested := make([]*grpWork, 0, len(keep))
	for _, i := range keep {
		tested = append(tested, ws[i])
	}
	groupTests(g, w, tested, grid, opts, rep)
	for _, gw := range ws {
		g.Levels = append(g.Levels, gw.lvl)
	}
	g.Statement = grpStatement(g, w, tested, rep, len(skipped))
	return g
}

// groupLong splits the value column by the group column's labels (text)
// or values (numbers), in order of first appearance. gid is each cell's
// group + 1 (0: not used).
func groupLong(src *grpSrc, gc *ingest.Column, used func(*grpSrc, int) bool) (ws []*grpWork, gid []int32) {
	byLabel := make([]int32, len(gc.LabelNames())) // label -> group + 1
	byValue := map[float64]int32{}
	// pass 1: each cell's group, and the groups' sizes
	gid = make([]int32, len(src.vals))
	var sizes []int
	for i := range src.vals {
		if !used(src, i) || partnerMissing(gc, i) {
			continue
		}
		var k int32
		if gc.Kind == "text" {
			if lb := gc.Label(i); lb < len(byLabel) {
				k = byLabel[lb]
			}
		} else {
			k = byValue[gc.Values[i]]
		}
		if k == 0 {
			if len(ws) >= method.MaxGroups+1 {
				continue // refused by pickColumns; never grow without bound
			}
			name := strings.TrimSpace(gc.Text(i))
			ws = append(ws, &grpWork{name: name, title: grpTitle(gc.Name, name), src: src})
			sizes = append(sizes, 0)
			k = int32(len(ws))
			if lb := gc.Label(i); gc.Kind == "text" && lb < len(byLabel) {
				byLabel[lb] = k
			} else {
				byValue[gc.Values[i]] = k
			}
		}
		gid[i] = k
		sizes[k-1]++
	}
	// pass 2: the cells of every group, carved out of one array
	total := 0
	for _, n := range sizes {
		total += n
	}
	buf := make([]int32, total)
	off := 0
	for k, gw := range ws {
		gw.cells = buf[off : off : off+sizes[k]]
		off += sizes[k]
	}
	for i, k := range gid {
		if k > 0 {
			gw := ws[k-1]
			gw.cells = append(gw.cells, int32(i))
		}
	}
	return ws, gid
}

// groupLevel computes one group's own figures with the column's builders:
// the centre and spread sections (buildCentre, buildSpread) of the group
// alone, Tukey's fences and the box (boxElements, exact on the decimals as
// typed), the skewness and the verdict's rules (verdict), and the spec
// figures. Notes of the column's builders about a group are not repeated.
func groupLevel(rep *Report, w words, gw *grpWork, cv *colView, opts Options) GroupLevel {
	s := gw.s
	n := s.n
	l := GroupLevel{Name: gw.name, Title: gw.title, N: n, Suspects: []Suspect{}, Points: []GroupPoint{}}
	if n == 0 {
		return l
	}
	l.Min, l.Max = s.sorted[0], s.sorted[n-1]
	own := &Report{} // the group's own report: the builders write their notes here
	c := buildCentre(own, w, s, opts, 1, nil)
	sp := buildSpread(own, w, s, opts)
	l.Mean, l.MeanCI, l.Median, l.MedianCI = c.Mean, c.MeanCI, c.Median, c.MedianCI
	l.SD, l.SDCI, l.IQR = sp.SD, sp.SDCI, sp.IQR
	l.Box = boxElements(s)
	inner, outer := fenceCounts(s)
	l.SuspectCount = inner
	grpSuspects(w, gw, &l)
	grpPoints(gw, &l)

	// the single-column verdict's rules on this group
	distinct, maxRun := runs(s.sorted)
	own.Spread, own.Quantile = sp, &Quantiles{Min: l.Min}
	if n >= 3 && !s.constant {
		sk, _, _ := skewness(w, s.sorted, s.mo.mean, s.mo.sd, gw.ps)
		own.Shape = &Shape{Skewness: sk}
	}
	verdict(own, w, Options{}, n, s.constant, maxRun, distinct, 0, inner, outer, restSkewOf(s))
	l.Quote, l.QuoteReasons = own.Verdict.Quote, own.Verdict.Reasons

	if opts.LSL != nil || opts.USL != nil {
		l.Spec = grpSpec(rep, w, gw, cv, opts)
	}
	return l
}

// grpSuspects lists the group's readings beyond its inner fences (Tukey
// 1977; exact on the decimals as typed, as the column's) by row, with the
// column's flag texts; the rows holding them are found by one scan of the
// group's cells.
func grpSuspects(w words, gw *grpWork, l *GroupLevel) {
	s := gw.s
	n := s.n
	inLo, inHi := s.fences(s.q1, s.q3, 3, 2)
	outLo, outHi := s.fences(s.q1, s.q3, 3, 1)
	loIn, hiIn := s.countBelow(inLo), n-s.countAbove(inHi)
	loOut, hiOut := s.countBelow(outLo), n-s.countAbove(outHi)
	if loIn == 0 && hiIn == n {
		return
	}
	sorted := s.sorted
	loCut, hiCut := math.Inf(-1), math.Inf(1) // values <= loCut or >= hiCut are flagged
	if loIn > 0 {
		loCut = sorted[loIn-1]
	}
	if hiIn < n {
		hiCut = sorted[hiIn]
	}
	loFar, hiFar := math.Inf(-1), math.Inf(1)
	if loOut > 0 {
		loFar = sorted[loOut-1]
	}
	if hiOut < n {
		hiFar = sorted[hiOut]
	}
	q1, q3 := s.q1.f, s.q3.f
	iqr := s.sub(s.q3, s.q1).f
	b := l.Box
	for _, i := range gw.cells {
		x := gw.src.vals[i]
		if x > loCut && x < hiCut {
			continue
		}
		if len(l.Suspects) >= maxGroupSuspects {
			break
		}
		outer := x <= loFar || x >= hiFar
		code := "tukey-inner"
		if outer {
			code = "tukey-outer"
		}
		var f Flag
		switch below := x <= loCut; {
		case iqr == 0:
			f = Flag{Rule: code, Text: w.tukeyFlag(below, -1, outer)}
		case below:
			f = Flag{Rule: code, Text: w.tukeyFlag(true, (q1-x)/iqr, outer)}
		default:
			f = Flag{Rule: code, Text: w.tukeyFlag(false, (x-q3)/iqr, outer)}
		}
		// score: distance beyond the fence crossed
		switch {
		case x <= loCut && outer:
			f.Score = b.OuterLo - x
		case x <= loCut:
			f.Score = b.InnerLo - x
		case outer:
			f.Score = x - b.OuterHi
		default:
			f.Score = x - b.InnerHi
		}
		l.Suspects = append(l.Suspects, Suspect{
			Reading: Reading{Row: int(gw.src.rows[i]), Column: gw.src.name, Text: gw.src.text(int(i)), Value: x},
			Flags:   []Flag{f},
		})
	}
}

// grpPoints fills the dot plot's readings: all of them up to
// maxGroupPoints, else every k-th in data order plus the suspects.
func grpPoints(gw *grpWork, l *GroupLevel) {
	n := len(gw.cells)
	step := 1
	if n > maxGroupPoints {
		step = (n + maxGroupPoints - 1) / maxGroupPoints
		l.Thinned = true
	}
	for k := 0; k < n; k += step {
		i := gw.cells[k]
		l.Points = append(l.Points, GroupPoint{Row: int(gw.src.rows[i]), Y: gw.src.vals[i]})
	}
	if l.Thinned {
		for _, s := range l.Suspects {
			l.Points = append(l.Points, GroupPoint{Row: s.Row, Y: s.Value})
		}
	}
}

// grpSpec is one group against the limits: the counts outside as the spec
// section counts them (specCounts), with the Clopper and Pearson (1934)
// interval (method.ConformanceFromCounts), and Cpk and Ppk with Bissell's
// (1990) intervals from method.Capability: Cpk from the group's
// within-process sigma (withinOf: the column's estimator on the group's
// readings in time order), Ppk from its overall SD.
func grpSpec(rep *Report, w words, gw *grpWork, cv *colView, opts Options) *GroupSpec {
	s := gw.s
	n := s.n
	lsl, usl := math.NaN(), math.NaN()
	if opts.LSL != nil {
		lsl = *opts.LSL
	}
	if opts.USL != nil {
		usl = *opts.USL
	}
	below, above := specCounts(s.sorted, lsl, usl)
	sp := &GroupSpec{Below: below, Above: above, Outside: float64(below+above) / float64(n)}
	if cf, err := method.ConformanceFromCounts(n, below, above, opts.LSL != nil, opts.USL != nil, opts.Confidence); err == nil {
		sp.OutsideCI = &Interval{Lo: cf.Outside.Lower, Hi: cf.Outside.Upper, Level: opts.Confidence, Method: "clopper-pearson"}
	}
	if n < 2 || s.constant {
		return sp
	}
	sigW, dfW := math.NaN(), math.NaN()
	series := make([]float64, len(gw.time))
	for k, i := range gw.time {
		series[k] = gw.src.vals[i]
	}
	ws := withinOf(series, gw.time, cv.subgroup, opts.WithinSigma)
	if ws.err == nil {
		sigW, dfW = ws.est.Sigma, ws.est.DF
	} else {
		rep.Notes = append(rep.Notes, Note{Field: "groups.levels.spec.cpk", Text: w.grpNoWithin(gw.title, ws.err)})
	}
	ci, err := method.Capability(method.CapabilityInput{Mean: s.mo.mean, SigmaWithin: sigW, DFWithin: dfW, SigmaOverall: s.mo.sd, N: n, LSL: lsl, USL: usl, Target: math.NaN()}, opts.Confidence)
	if err != nil {
		return sp
	}
	iv := func(x method.CapIndex) *Interval {
		return &Interval{Lo: x.Lower, Hi: x.Upper, Level: opts.Confidence, Method: x.Method}
	}
	if ci.Cpk.Valid {
		sp.Cpk, sp.CpkCI = fptr(ci.Cpk.Value), iv(ci.Cpk)
		sp.Sigma, sp.SigmaWithin = ws.method, fptr(sigW)
	}
	if ci.Ppk.Valid {
		sp.Ppk, sp.PpkCI = fptr(ci.Ppk.Value), iv(ci.Ppk)
	}
	return sp
}

// groupTests runs the tests on the groups with enough readings.
func groupTests(g *Groups, w words, ws []*grpWork, grid decimal.Grid, opts Options, rep *Report) {
	k := len(ws)
	if k < 2 {
		rep.Notes = append(rep.Notes, Note{Field: "groups.centre", Text: w.grpTooFew(k, method.MinGroupReadings)})
		return
	}
	conf, alpha := opts.Confidence, g.Alpha
	fs := make([][]float64, k)
	var ms [][]int64
	if g.Exact {
		ms = make([][]int64, k)
	}
	equalN := true
	for i, gw := range ws {
		fs[i] = gw.s.sorted
		if ms != nil {
			ms[i] = gw.mant
		}
		if gw.s.n != ws[0].s.n {
			equalN = false
		}
	}
	p10 := 1.0 // mantissa units to data units: divide by 10^scale
	if g.Exact {
		p10 = decimal.Pow10(grid.Scale)
	}
	note := func(field string, err error) {
		rep.Notes = append(rep.Notes, Note{Field: field, Text: grpMethodError(w, err, ws)})
	}

	// which family leads: the verdict's rules, group by group
	g.Lead = "means"
	for _, gw := range ws {
		if gw.lvl.Quote == "median-iqr" {
			g.Lead = "medians"
			for _, r := range gw.lvl.QuoteReasons {
				g.Reasons = append(g.Reasons, Reason{Code: r.Code, Text: w.grpReason(gw.title, r.Text), Vals: r.Vals})
			}
		}
	}
	if g.Lead == "means" {
		g.Reasons = []Reason{{Code: "all-mean-sd", Text: w.grpAllMean()}}
	}

	// centre
	c := &GroupCentre{Tests: []GroupTest{}}
	if k == 2 {
		if t, err := method.WelchT(fs[1], fs[0], conf); err == nil {
			c.Tests = append(c.Tests, GroupTest{Code: "welch-t", Name: w.grpTestName("welch-t"), Statistic: t.T, DF: fptr(t.DF), P: t.P, Method: w.grpTestMethod("welch-t")})
		} else {
			note("groups.centre", err)
		}
	} else if t, err := method.WelchANOVA(fs); err == nil {
		c.Tests = append(c.Tests, GroupTest{Code: "welch-anova", Name: w.grpTestName("welch-anova"), Statistic: t.F, DF: fptr(t.DF1), DF2: fptr(t.DF2), P: t.P, Method: w.grpTestMethod("welch-anova")})
	} else {
		note("groups.centre", err)
	}
	if a, err := method.OneWayANOVA(fs); err == nil {
		c.Tests = append(c.Tests, GroupTest{Code: "anova", Name: w.grpTestName("anova"), Statistic: a.F, DF: fptr(a.DF1), DF2: fptr(a.DF2), P: a.P, Method: w.grpTestMethod("anova")})
	} else {
		note("groups.centre", err)
	}
	var mw *method.MannWhitneyTest
	if k == 2 {
		var t method.MannWhitneyTest
		var err error
		if ms != nil {
			t, err = method.MannWhitney(ms[1], ms[0], conf)
			t.Shift, t.Lo, t.Hi = t.Shift/p10, t.Lo/p10, t.Hi/p10
		} else {
			t, err = method.MannWhitney(fs[1], fs[0], conf)
		}
		if err == nil {
			mw = &t
			c.Tests = append(c.Tests, GroupTest{Code: "mann-whitney", Name: w.grpTestName("mann-whitney"), Statistic: t.W, P: t.P, Method: w.grpMannWhitneyMethod(t.Exact)})
		} else {
			note("groups.centre", err)
		}
	} else {
		var t method.KruskalWallisTest
		var err error
		if ms != nil {
			t, err = method.KruskalWallis(ms)
		} else {
			t, err = method.KruskalWallis(fs)
		}
		if err == nil {
			c.Tests = append(c.Tests, GroupTest{Code: "kruskal-wallis", Name: w.grpTestName("kruskal-wallis"), Statistic: t.H, DF: fptr(t.DF), P: t.P,
				Method: w.grpKruskalMethod(t.TieFactor)})
		} else {
			note("groups.centre", err)
		}
	}
	leadCode := map[[2]bool]string{{true, true}: "welch-t", {true, false}: "welch-anova", {false, true}: "mann-whitney", {false, false}: "kruskal-wallis"}[[2]bool{g.Lead == "means", k == 2}]
	for i := range c.Tests {
		if c.Tests[i].Code == leadCode {
			c.Tests[i].Lead = true
			c.Lead = leadCode
			c.Differ = c.Tests[i].P < alpha
		}
	}
	c.Why = w.grpCentreWhy(g.Lead, k)
	if c.Lead != "" {
		g.Centre = c
	} else if len(c.Tests) > 0 {
		g.Centre = c
		c.Why += " " + w.grpLeadMissing()
	}

	// spread
	sp := &GroupSpread{Tests: []GroupTest{}}
	if t, err := method.BrownForsythe(fs); err == nil {
		sp.Tests = append(sp.Tests, GroupTest{Code: "brown-forsythe", Name: w.grpTestName("brown-forsythe"), Statistic: t.F, DF: fptr(t.DF1), DF2: fptr(t.DF2), P: t.P})
	} else {
		note("groups.spread", err)
	}
	if t, err := method.Bartlett(fs); err == nil {
		sp.Tests = append(sp.Tests, GroupTest{Code: "bartlett", Name: w.grpTestName("bartlett"), Statistic: t.K2, DF: fptr(t.DF), P: t.P, Method: w.grpTestMethod("bartlett")})
	} else {
		note("groups.spread", err)
	}
	if r, err := method.SDRatio(fs, conf); err == nil {
		sp.Ratio, sp.Largest, sp.Smallest = r.Ratio, ws[r.Largest].name, ws[r.Smallest].name
		if r.HasCI {
			sp.RatioCI = &Interval{Lo: r.Lo, Hi: r.Hi, Level: r.Level, Method: "f-distribution"}
			sp.Tests = append(sp.Tests, GroupTest{Code: "f-ratio", Name: w.grpTestName("f-ratio"), Statistic: r.F, DF: fptr(r.DF1), DF2: fptr(r.DF2), P: r.P, Method: w.grpTestMethod("f-ratio")})
		}
	} else {
		note("groups.spread", err)
	}
	spreadLead := "brown-forsythe"
	if g.Lead == "means" {
		spreadLead = "bartlett"
	}
	for i := range sp.Tests {
		if sp.Tests[i].Code == spreadLead {
			sp.Tests[i].Lead = true
			sp.Lead = spreadLead
			sp.Differ = sp.Tests[i].P < alpha
		}
	}
	if sp.Lead == "" && len(sp.Tests) > 0 { // Bartlett could not run: fall back
		sp.Tests[0].Lead = true
		sp.Lead = sp.Tests[0].Code
		sp.Differ = sp.Tests[0].P < alpha
	}
	sp.Why = w.grpSpreadWhy(sp.Lead)
	if len(sp.Tests) > 0 {
		g.Spread = sp
	}

	tol := 0.0
	if opts.LSL != nil && opts.USL != nil {
		tol = *opts.USL - *opts.LSL
	}
	ofTol := func(d float64) *float64 {
		if !(tol > 0) {
			return nil
		}
		v := math.Abs(d) / tol
		return &v
	}

	// effect sizes, two groups
	if k == 2 {
		e := &GroupEffect{A: ws[0].name, B: ws[1].name}
		if t, err := method.WelchT(fs[1], fs[0], conf); err == nil {
			e.MeanDiff = t.Diff
			e.MeanDiffCI = &Interval{Lo: t.Lo, Hi: t.Hi, Level: conf, Method: "welch"}
		} else {
			e.MeanDiff = ws[1].lvl.Mean - ws[0].lvl.Mean
		}
		if mw != nil {
			e.Shift = fptr(mw.Shift)
			e.ShiftCI = &Interval{Lo: mw.Lo, Hi: mw.Hi, Level: mw.AchievedLevel, Method: "hodges-lehmann"}
		}
		if h, err := method.Hedges(fs[1], fs[0], conf); err == nil {
			e.HedgesG = fptr(h.G)
			e.HedgesGCI = &Interval{Lo: h.Lo, Hi: h.Hi, Level: conf, Method: "normal approximation"}
		}
		if g.Lead == "medians" && e.Shift != nil {
			e.OfTolerance = ofTol(*e.Shift)
		} else {
			e.OfTolerance = ofTol(e.MeanDiff)
		}
		g.Effect = e
		return
	}

	// pairwise, three groups or more
	pw := &GroupPairwise{}
	spreadsDiffer := g.Spread != nil && g.Spread.Differ
	var mp []method.MeanPair
	var err error
	mset := &PairSet{Method: "tukey-kramer", Pairs: []GroupPair{}}
	if spreadsDiffer || !equalN {
		mset.Method = "games-howell"
		mp, err = method.GamesHowell(fs, conf)
	} else {
		mp, err = method.TukeyKramer(fs, conf)
	}
	mset.Why = w.grpMeansPairsWhy(mset.Method, spreadsDiffer, equalN)
	var meanIdx, rankIdx [][2]int
	if err == nil {
		for _, p := range mp {
			meanIdx = append(meanIdx, [2]int{p.I, p.J})
			d := p.Diff
			mset.Pairs = append(mset.Pairs, GroupPair{A: ws[p.I].name, B: ws[p.J].name, Diff: fptr(d),
				CI: &Interval{Lo: p.Lo, Hi: p.Hi, Level: conf, Method: mset.Method}, Statistic: p.Q, P: p.P, Differ: p.P < alpha, OfTolerance: ofTol(d)})
		}
		pw.Means = mset
	} else {
		note("groups.pairwise.means", err)
	}
	var rp []method.RankPair
	if ms != nil {
		rp, err = method.Dunn(ms)
	} else {
		rp, err = method.Dunn(fs)
	}
	if err == nil {
		dset := &PairSet{Method: "dunn-holm", Why: w.grpDunnWhy(), Pairs: []GroupPair{}}
		N := 0
		for _, gw := range ws {
			N += gw.s.n
		}
		shifts := float64(N)*float64(k-1) <= maxPairShiftWork
		for _, p := range rp {
			rankIdx = append(rankIdx, [2]int{p.I, p.J})
			gp := GroupPair{A: ws[p.I].name, B: ws[p.J].name, Statistic: p.Stat, P: p.PAdj, Differ: p.PAdj < alpha}
			if shifts {
				var t method.MannWhitneyTest
				var err error
				if ms != nil {
					t, err = method.MannWhitney(ms[p.J], ms[p.I], conf)
					t.Shift, t.Lo, t.Hi = t.Shift/p10, t.Lo/p10, t.Hi/p10
				} else {
					t, err = method.MannWhitney(fs[p.J], fs[p.I], conf)
				}
				if err == nil {
					gp.Diff = fptr(t.Shift)
					gp.CI = &Interval{Lo: t.Lo, Hi: t.Hi, Level: t.AchievedLevel, Method: "hodges-lehmann"}
					gp.OfTolerance = ofTol(t.Shift)
				}
			}
			dset.Pairs = append(dset.Pairs, gp)
		}
		if !shifts {
			rep.Notes = append(rep.Notes, Note{Field: "groups.pairwise.medians.pairs.diff", Text: w.grpNoShifts(N, k, int(maxPairShiftWork))})
		}
		pw.Medians = dset
	} else {
		note("groups.pairwise.medians", err)
	}
	lead, leadIdx := pw.Means, meanIdx
	pw.LettersFrom = "means"
	if g.Lead == "medians" && pw.Medians != nil || lead == nil {
		lead, leadIdx, pw.LettersFrom = pw.Medians, rankIdx, "medians"
	}
	if lead == nil {
		return
	}
	lead.Lead = true
	g.Pairwise = pw
	// letters: handed out from the highest centre down
	differ := map[[2]int]bool{}
	for i, p := range lead.Pairs {
		differ[leadIdx[i]] = p.Differ
	}
	order := make([]int, k)
	for i := range order {
		order[i] = i
	}
	centre := func(i int) float64 {
		if pw.LettersFrom == "medians" {
			return ws[i].lvl.Median
		}
		return ws[i].lvl.Mean
	}
	sort.SliceStable(order, func(a, b int) bool { return centre(order[a]) > centre(order[b]) })
	letters, err := method.CompactLetters(k, func(i, j int) bool { return differ[[2]int{i, j}] }, order)
	if err != nil {
		note("groups.levels.letters", err)
		return
	}
	for i, ls := range letters {
		var b strings.Builder
		for _, x := range ls {
			b.WriteString(grpGlyph(x))
		}
		ws[i].lvl.Letters = b.String()
	}
}

// grpGlyph is the letter for index x: a..z, then A..Z, then a2, b2, ...
func grpGlyph(x int) string {
	const abc = "abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ"
	if x < len(abc) {
		return abc[x : x+1]
	}
	return abc[x%26:x%26+1] + strconv.Itoa(x/26)
}

// grpTitle is the group's name in sentences: a short label gets its
// column's name in front ("Line B").
func grpTitle(column, label string) string {
	if column == "" || len([]rune(label)) > groupNameLen || strings.HasPrefix(strings.ToLower(label), strings.ToLower(column)) {
		return label
	}
	return column + " " + label
}

// grpStatement is the section's verdict in plain words: the numbers are
// chosen here, the sentences made by words (figures to the data's
// decimals plus one).
func grpStatement(g *Groups, w words, ws []*grpWork, rep *Report, skipped int) string {
	k := len(ws)
	dec, unit := -1, rep.Input.Unit
	if d := rep.Counts.Decimals; d >= 0 {
		dec = min(d+1, 12)
	}
	var b strings.Builder
	switch {
	case k < 2:
		b.WriteString(w.grpNoComparison(k, method.MinGroupReadings))
	case k == 2 && g.Effect != nil && g.Centre != nil:
		e := g.Effect
		d, ci, shift := e.MeanDiff, e.MeanDiffCI, false
		if g.Lead == "medians" && e.Shift != nil {
			d, ci, shift = *e.Shift, e.ShiftCI, true
		}
		b.WriteString(w.grpTwo(ws[0].title, ws[1].title, g.Centre.Differ, shift, d, ci, dec, unit, grpLeadP(g)))
	case g.Centre != nil:
		medians := g.Lead == "medians"
		c := func(i int) float64 {
			if medians {
				return ws[i].lvl.Median
			}
			return ws[i].lvl.Mean
		}
		hiI, loI := 0, 0
		for i := range ws {
			if c(i) > c(hiI) {
				hiI = i
			}
			if c(i) < c(loI) {
				loI = i
			}
		}
		nd, np := 0, -1
		if g.Pairwise != nil {
			set := g.Pairwise.Means
			if g.Pairwise.LettersFrom == "medians" {
				set = g.Pairwise.Medians
			}
			np = len(set.Pairs)
			for _, pr := range set.Pairs {
				if pr.Differ {
					nd++
				}
			}
		}
		b.WriteString(w.grpMany(k, g.Centre.Lead, medians, g.Centre.Differ, grpLeadP(g), ws[hiI].title, c(hiI), ws[loI].title, c(loI), dec, unit, nd, np))
	default:
		b.WriteString(w.grpCentreFailed())
	}
	if k >= 2 && g.Spread != nil {
		sp := g.Spread
		lead := sp.Tests[0]
		for _, t := range sp.Tests {
			if t.Lead {
				lead = t
			}
		}
		b.WriteString(w.grpSpreadPart(k, sp.Differ, lead.Code, lead.P, sp.Ratio))
	}
	if k >= 2 {
		b.WriteString(".")
	}
	if tol := grpTolerance(g); tol >= 0 {
		b.WriteString(w.grpOfTolerance(tol))
	}
	if skipped > 0 {
		b.WriteString(w.grpSkipped(skipped, method.MinGroupReadings))
	}
	return b.String()
}

// grpMethodError is the note of a method that could not run on the groups.
func grpMethodError(w words, err error, ws []*grpWork) string {
	var ge *method.GroupsError
	if errors.As(err, &ge) {
		who := ""
		if ge.Group >= 0 && ge.Group < len(ws) {
			who = ws[ge.Group].title
		}
		return w.grpMethodFailed(ge.Code, who)
	}
	return w.grpMethodFailed(method.GroupsCode(-1), "")
}

// grpLeadP is the p-value of the leading centre test.
func grpLeadP(g *Groups) float64 {
	for _, t := range g.Centre.Tests {
		if t.Lead {
			return t.P
		}
	}
	return g.Centre.Tests[0].P
}

// grpTolerance is the leading difference as a fraction of the tolerance
// (two groups), or the largest pairwise one; -1 when not known.
func grpTolerance(g *Groups) float64 {
	if g.Effect != nil && g.Effect.OfTolerance != nil {
		return *g.Effect.OfTolerance
	}
	if g.Pairwise == nil {
		return -1
	}
	set := g.Pairwise.Means
	if g.Pairwise.LettersFrom == "medians" && g.Pairwise.Medians != nil {
		set = g.Pairwise.Medians
	}
	best := -1.0
	for _, p := range set.Pairs {
		if p.OfTolerance != nil && *p.OfTolerance > best {
			best = *p.OfTolerance
		}
	}
	return best
}

// groupCount counts the groups a long request would form (labels or
// values of the group column beside a number in the value column).
func groupCount(val, gc *ingest.Column) int {
	seen := map[float64]bool{}
	labels := make([]bool, len(gc.LabelNames()))
	k := 0
	for i, x := range val.Values {
		if x != x || math.IsInf(x, 0) || partnerMissing(gc, i) {
			continue
		}
		if gc.Kind == "text" {
			if lb := gc.Label(i); lb < len(labels) && !labels[lb] {
				labels[lb] = true
				k++
			}
		} else if v := gc.Values[i]; !seen[v] {
			seen[v] = true
			k++
		}
		if k > method.MaxGroups {
			break
		}
	}
	return k
}
