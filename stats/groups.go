package stats

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"gonum.org/v1/gonum/stat/distuv"

	"lotlens/stats/ingest"
	"lotlens/stats/method"
)

// This file: the Groups section (do lines, shifts, cavities or suppliers
// differ): its report types and its builder. The numbers come from
// stats/method (anova.go, ranks.go, pairwise.go, spreadtest.go); the
// sentences are made by the small functions at the bottom of the file.
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

// GroupSpec is one group against the specification limits.
type GroupSpec struct {
	Below     int       `json:"below"`               // readings below the LSL
	Above     int       `json:"above"`               // readings above the USL
	Outside   float64   `json:"outside"`             // fraction outside, observed
	OutsideCI *Interval `json:"outsideCI,omitempty"` // Clopper-Pearson
	Cpk       *float64  `json:"cpk,omitempty"`
	CpkCI     *Interval `json:"cpkCI,omitempty"`
	// Sigma names the sigma behind Cpk: "overall-sd" (the group's sample
	// SD, so Cpk here equals Ppk).
	Sigma string `json:"sigma"`
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
	cells       []int32 // cell indices into src
	sorted      []float64
	mant        []int64 // sorted mantissas at the common scale (exact path)
	lvl         GroupLevel
}

// groupsSection builds the Groups section from the group column (long) or
// the side-by-side columns (wide) of cv; nil when the request has neither.
func groupsSection(rep *Report, cv *colView, opts Options) *Groups {
	if cv.group == nil && len(cv.wide) == 0 {
		return nil
	}
	g := &Groups{Alpha: math.Round((1-opts.Confidence)*1e12) / 1e12, Levels: []GroupLevel{}}
	excl := cv.excludedByUser
	var ws []*grpWork
	if cv.group != nil {
		g.Shape, g.Column = "long", cv.group.Name
		src := &grpSrc{name: cv.name, vals: cv.vals, dec: cv.dec, rows: cv.rows, text: cv.text}
		ws = groupLong(src, cv.group, excl)
	} else {
		g.Shape = "wide"
		for _, c := range cv.wide {
			g.Columns = append(g.Columns, c.Name)
			src := &grpSrc{name: c.Name, vals: c.Values, dec: c.Dec, rows: c.Rows, text: c.Text}
			w := &grpWork{name: c.Name, title: c.Name, src: src}
			for i, x := range c.Values {
				if x != x || math.IsInf(x, 0) || (excl != nil && excl[c.Rows[i]]) {
					continue
				}
				w.cells = append(w.cells, int32(i))
			}
			ws = append(ws, w)
		}
	}
	if len(ws) > method.MaxGroups {
		// pickColumns refuses these; a guard for other callers
		rep.Notes = append(rep.Notes, Note{Field: "groups", Text: fmt.Sprintf("%d groups: at most %d can be compared", len(ws), method.MaxGroups)})
		return nil
	}
	// values, the common decimal scale, sorting
	D, exact := 0, true
	total := 0
	for _, w := range ws {
		total += len(w.cells)
	}
	fbuf := make([]float64, total) // one array for all groups
	for _, w := range ws {
		w.sorted, fbuf = fbuf[:len(w.cells):len(w.cells)], fbuf[len(w.cells):]
		for k, i := range w.cells {
			w.sorted[k] = w.src.vals[i]
			if d := w.src.dec[i]; d < 0 || d > maxDec {
				exact = false
			} else if int(d) > D {
				D = int(d)
			}
		}
	}
	for _, w := range ws {
		if !exact || !countSortFixed(w.sorted, D) {
			sortFloats(w.sorted)
		}
	}
	if exact {
		mbuf := make([]int64, total)
		for _, w := range ws {
			w.mant, mbuf = mbuf[:len(w.sorted):len(w.sorted)], mbuf[len(w.sorted):]
			for k, x := range w.sorted {
				m, ok := mantissa(x, int8(D))
				if !ok {
					exact = false
					break
				}
				w.mant[k] = m
			}
			if !exact {
				break
			}
		}
	}
	if !exact {
		for _, w := range ws {
			w.mant = nil
		}
		rep.Notes = append(rep.Notes, Note{Field: "groups.exact", Text: grpWordsNotExact()})
	}
	g.Exact = exact

	// each group on its own
	for _, w := range ws {
		w.lvl = groupLevel(w, opts, exact, D)
	}
	// screening: groups of 1 or 2 readings are listed, not tested
	sizes := make([]int, len(ws))
	for i, w := range ws {
		sizes[i] = len(w.sorted)
	}
	keep, skipped := method.ScreenGroups(sizes)
	for _, s := range skipped {
		ws[s.Group].lvl.LeftOut = grpWordsLeftOut(s.N)
	}
	for _, i := range keep {
		ws[i].lvl.InTests = true
	}
	tested := make([]*grpWork, 0, len(keep))
	for _, i := range keep {
		tested = append(tested, ws[i])
	}
	groupTests(g, tested, opts, rep)
	for _, w := range ws {
		g.Levels = append(g.Levels, w.lvl)
	}
	g.Statement = grpStatement(g, tested, opts, rep, len(skipped))
	return g
}

// groupLong splits the value column by the group column's labels (text)
// or values (numbers), in order of first appearance.
func groupLong(src *grpSrc, gc *ingest.Column, excl map[int32]bool) []*grpWork {
	var ws []*grpWork
	byLabel := make([]int32, len(gc.LabelNames())) // label -> group + 1
	byValue := map[float64]int32{}
	// pass 1: each cell's group (0 = not used), and the groups' sizes
	gid := make([]int32, len(src.vals))
	var sizes []int
	for i, x := range src.vals {
		if x != x || math.IsInf(x, 0) || partnerMissing(gc, i) || (excl != nil && excl[src.rows[i]]) {
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
	for k, w := range ws {
		w.cells = buf[off : off : off+sizes[k]]
		off += sizes[k]
	}
	for i, k := range gid {
		if k > 0 {
			w := ws[k-1]
			w.cells = append(w.cells, int32(i))
		}
	}
	return ws
}

// groupLevel computes one group's own figures.
func groupLevel(w *grpWork, opts Options, exact bool, D int) GroupLevel {
	s := w.sorted
	n := len(s)
	l := GroupLevel{Name: w.name, Title: w.title, N: n, Suspects: []Suspect{}, Points: []GroupPoint{}}
	if n == 0 {
		l.Quote = ""
		return l
	}
	lo, hi := s[0], s[n-1]
	l.Min, l.Max = lo, hi
	var mo moments
	ok := false
	if exact {
		ea := exactAcc{ok: true}
		for _, m := range w.mant {
			ea.acc[D].add(m)
		}
		mo, ok = ea.moments()
	}
	if !ok {
		mo = compensatedMoments(s, lo, hi)
	}
	constant := lo == hi
	if constant {
		mo.mean, mo.sd = lo, 0
	}
	l.Mean, l.SD = mo.mean, mo.sd
	q1, med, q3 := quantileHF(s, 0.25, 7), quantileHF(s, 0.5, 7), quantileHF(s, 0.75, 7)
	l.Median, l.IQR = med, q3-q1
	if !constant {
		l.MeanCI = meanCI(mo.mean, mo.sd, n, opts.Confidence)
		l.SDCI = sdCI(mo.sd, n, opts.Confidence)
		if n >= 2 {
			l.MedianCI, _ = medianCI(s, opts.Confidence)
		}
	}
	// Tukey's fences on this group alone, exact on the mantissas
	b := boxElements(s, q1, med, q3)
	loIn, hiIn, loOut, hiOut := grpFenceCuts(w, q1, q3)
	inner := loIn + (n - hiIn)
	outer := loOut + (n - hiOut)
	if loIn < n {
		b.LoWhisker = math.Min(s[loIn], q1)
	}
	if hiIn > 0 {
		b.HiWhisker = math.Max(s[hiIn-1], q3)
	}
	l.Box = b
	l.SuspectCount = inner
	grpSuspects(w, &l, s, loIn, hiIn, loOut, hiOut)
	grpPoints(w, &l)

	// the single-column verdict's rules on this group
	maxRun, distinct, run := 1, 1, 1
	for i := 1; i < n; i++ {
		if s[i] != s[i-1] {
			distinct++
			run = 1
		} else if run++; run > maxRun {
			maxRun = run
		}
	}
	tmp := &Report{Spread: &Spread{SD: mo.sd, IQR: l.IQR}, Quantile: &Quantiles{Min: lo}, Shape: grpSkewness(s, mo.mean, mo.sd)}
	verdict(tmp, Options{}, n, constant, maxRun, distinct, 0, inner, outer)
	l.Quote, l.QuoteReasons = tmp.Verdict.Quote, tmp.Verdict.Reasons

	if opts.LSL != nil || opts.USL != nil {
		l.Spec = grpSpec(s, mo.mean, mo.sd, opts)
	}
	return l
}

// grpFenceCuts returns the positions in the group's sorted readings of
// Tukey's (1977) fences: readings [0, loIn) lie below the lower inner
// fence, [hiIn, n) above the upper one, and likewise for the outer
// fences. With mantissas the quartiles of type 7 are quarter-integers, so
// 8 x the fences are integers (8·(Q1 - 1.5 IQR) = 5A - 3B with A = 4 Q1,
// B = 4 Q3) and every comparison is exact on the decimals as typed.
func grpFenceCuts(w *grpWork, q1, q3 float64) (loIn, hiIn, loOut, hiOut int) {
	n := len(w.sorted)
	if w.mant != nil {
		m := w.mant
		q4 := func(p4 int) int64 { // 4 x the type 7 quantile at p = p4/4
			num := int64(n-1) * int64(p4) // h = num/4 (0-based)
			j := num / 4
			f := num % 4
			if j+1 >= int64(n) {
				return 4 * m[n-1]
			}
			return 4*m[j] + f*(m[j+1]-m[j])
		}
		A, B := q4(1), q4(3)
		lIn, hIn := 5*A-3*B, 5*B-3*A
		lOut, hOut := 8*A-6*B, 8*B-6*A
		below := func(t int64) int { return sort.Search(n, func(i int) bool { return 8*m[i] >= t }) }
		above := func(t int64) int { return sort.Search(n, func(i int) bool { return 8*m[i] > t }) }
		return below(lIn), above(hIn), below(lOut), above(hOut)
	}
	s := w.sorted
	iqr := q3 - q1
	below := func(t float64) int { return sort.SearchFloat64s(s, t) }
	above := func(t float64) int { return sort.Search(n, func(i int) bool { return s[i] > t }) }
	return below(q1 - 1.5*iqr), above(q3 + 1.5*iqr), below(q1 - 3*iqr), above(q3 + 3*iqr)
}

// grpSuspects lists the group's readings beyond its inner fences by row:
// the flagged values are those of sorted[:loIn] and sorted[hiIn:]; the
// rows holding them are found by one scan of the group's cells.
func grpSuspects(w *grpWork, l *GroupLevel, s []float64, loIn, hiIn, loOut, hiOut int) {
	if l.SuspectCount == 0 {
		return
	}
	n := len(s)
	var loCut, hiCut, loFar, hiFar float64
	hasLo, hasHi := loIn > 0, hiIn < n
	if hasLo {
		loCut = s[loIn-1] // values <= loCut are flagged
	}
	if hasHi {
		hiCut = s[hiIn]
	}
	loFar, hiFar = math.Inf(-1), math.Inf(1)
	if loOut > 0 {
		loFar = s[loOut-1]
	}
	if hiOut < n {
		hiFar = s[hiOut]
	}
	for _, i := range w.cells {
		x := w.src.vals[i]
		if !(hasLo && x <= loCut) && !(hasHi && x >= hiCut) {
			continue
		}
		code, txt := "tukey-inner", "beyond the group's inner fence (1.5 IQR)"
		if x <= loFar || x >= hiFar {
			code, txt = "tukey-outer", "beyond the group's outer fence (3 IQR)"
		}
		if len(l.Suspects) < maxGroupSuspects {
			l.Suspects = append(l.Suspects, Suspect{
				Reading: Reading{Row: int(w.src.rows[i]), Column: w.src.name, Text: w.src.text(int(i)), Value: x},
				Flags:   []Flag{{Rule: code, Text: txt}},
			})
		}
	}
	// scores: distance beyond the fence crossed
	for k := range l.Suspects {
		sp := &l.Suspects[k]
		b := l.Box
		switch {
		case sp.Value < b.InnerLo:
			fence := b.InnerLo
			if sp.Flags[0].Rule == "tukey-outer" {
				fence = b.OuterLo
			}
			sp.Flags[0].Score = fence - sp.Value
		default:
			fence := b.InnerHi
			if sp.Flags[0].Rule == "tukey-outer" {
				fence = b.OuterHi
			}
			sp.Flags[0].Score = sp.Value - fence
		}
	}
}

// grpPoints fills the dot plot's readings: all of them up to
// maxGroupPoints, else every k-th in data order plus the suspects.
func grpPoints(w *grpWork, l *GroupLevel) {
	n := len(w.cells)
	step := 1
	if n > maxGroupPoints {
		step = (n + maxGroupPoints - 1) / maxGroupPoints
		l.Thinned = true
	}
	for k := 0; k < n; k += step {
		i := w.cells[k]
		l.Points = append(l.Points, GroupPoint{Row: int(w.src.rows[i]), Y: w.src.vals[i]})
	}
	if l.Thinned {
		for _, s := range l.Suspects {
			l.Points = append(l.Points, GroupPoint{Row: s.Row, Y: s.Value})
		}
	}
}

// grpSkewness is the adjusted skewness G1 with D'Agostino's (1970) test,
// computed as in shapeSection, for the verdict's rules.
func grpSkewness(s []float64, mean, sd float64) *Shape {
	n := len(s)
	if n < 3 || !(sd > 0) {
		return nil
	}
	fn := float64(n)
	var s3 float64
	for _, x := range s {
		z := (x - mean) / sd
		s3 += z * z * z
	}
	m2 := (fn - 1) / fn
	g1 := (s3 / fn) / math.Pow(m2, 1.5)
	G1 := g1 * math.Sqrt(fn*(fn-1)) / (fn - 2)
	if !finite(G1) {
		return nil
	}
	sh := &Shape{Skewness: &Moment{Value: G1}}
	if n >= skewTestMinN {
		if z, ok := dagostinoSkewZ(g1, n); ok {
			sh.Skewness.Test = &Test{Name: "D'Agostino skewness", Statistic: z, P: twoSidedNormalP(z)}
		}
	}
	return sh
}

// grpSpec counts the readings outside the limits (exactly: limits and
// readings are both the doubles nearest their decimals, and that rounding
// keeps order), with the Clopper and Pearson (1934) interval of the
// fraction, and Cpk from the group's overall SD with the interval of
// Bissell (1990, "How reliable is your capability index?", Applied
// Statistics 39, 331-340): Ĉ ± z·√(1/(9n) + Ĉ²/(2(n-1))).
func grpSpec(s []float64, mean, sd float64, opts Options) *GroupSpec {
	n := len(s)
	sp := &GroupSpec{Sigma: "overall-sd"}
	if opts.LSL != nil {
		sp.Below = sort.SearchFloat64s(s, *opts.LSL)
	}
	if opts.USL != nil {
		u := *opts.USL
		sp.Above = n - sort.Search(n, func(i int) bool { return s[i] > u })
	}
	x := sp.Below + sp.Above
	sp.Outside = float64(x) / float64(n)
	a := 1 - opts.Confidence
	lo, hi := 0.0, 1.0
	if x > 0 {
		lo = distuv.Beta{Alpha: float64(x), Beta: float64(n - x + 1)}.Quantile(a / 2)
	}
	if x < n {
		hi = distuv.Beta{Alpha: float64(x + 1), Beta: float64(n - x)}.Quantile(1 - a/2)
	}
	sp.OutsideCI = &Interval{Lo: lo, Hi: hi, Level: opts.Confidence, Method: "clopper-pearson"}
	if n >= 2 && sd > 0 {
		c := math.Inf(1)
		if opts.LSL != nil {
			c = (mean - *opts.LSL) / (3 * sd)
		}
		if opts.USL != nil {
			c = math.Min(c, (*opts.USL-mean)/(3*sd))
		}
		if finite(c) {
			fn := float64(n)
			h := normQuantile(1-a/2) * math.Sqrt(1/(9*fn)+c*c/(2*(fn-1)))
			sp.Cpk = &c
			sp.CpkCI = &Interval{Lo: c - h, Hi: c + h, Level: opts.Confidence, Method: "bissell-1990"}
		}
	}
	return sp
}

// groupTests runs the tests on the groups with enough readings.
func groupTests(g *Groups, ws []*grpWork, opts Options, rep *Report) {
	k := len(ws)
	if k < 2 {
		rep.Notes = append(rep.Notes, Note{Field: "groups.centre", Text: grpWordsTooFew(k)})
		return
	}
	conf, alpha := opts.Confidence, g.Alpha
	fs := make([][]float64, k)
	var ms [][]int64
	if g.Exact {
		ms = make([][]int64, k)
	}
	equalN := true
	for i, w := range ws {
		fs[i] = w.sorted
		if ms != nil {
			ms[i] = w.mant
		}
		if len(w.sorted) != len(ws[0].sorted) {
			equalN = false
		}
	}
	p10 := 1.0 // mantissa units to data units: divide by 10^D
	if g.Exact {
		p10 = pow10tab[grpScale(ws)]
	}
	note := func(field string, err error) {
		rep.Notes = append(rep.Notes, Note{Field: field, Text: grpWordsMethodError(err, ws)})
	}

	// which family leads: the verdict's rules, group by group
	g.Lead = "means"
	for _, w := range ws {
		if w.lvl.Quote == "median-iqr" {
			g.Lead = "medians"
			for _, r := range w.lvl.QuoteReasons {
				g.Reasons = append(g.Reasons, Reason{Code: r.Code, Text: w.title + ": " + r.Text, Vals: r.Vals})
			}
		}
	}
	if g.Lead == "means" {
		g.Reasons = []Reason{{Code: "all-mean-sd", Text: grpWordsAllMean()}}
	}

	// centre
	c := &GroupCentre{Tests: []GroupTest{}}
	if k == 2 {
		if t, err := method.WelchT(fs[1], fs[0], conf); err == nil {
			c.Tests = append(c.Tests, GroupTest{Code: "welch-t", Name: "Welch's t test", Statistic: t.T, DF: fptr(t.DF), P: t.P, Method: "Welch-Satterthwaite degrees of freedom"})
		} else {
			note("groups.centre", err)
		}
	} else if t, err := method.WelchANOVA(fs); err == nil {
		c.Tests = append(c.Tests, GroupTest{Code: "welch-anova", Name: "Welch's ANOVA", Statistic: t.F, DF: fptr(t.DF1), DF2: fptr(t.DF2), P: t.P, Method: "F with Welch's fractional denominator degrees of freedom"})
	} else {
		note("groups.centre", err)
	}
	if a, err := method.OneWayANOVA(fs); err == nil {
		c.Tests = append(c.Tests, GroupTest{Code: "anova", Name: "One-way ANOVA", Statistic: a.F, DF: fptr(a.DF1), DF2: fptr(a.DF2), P: a.P, Method: "F test, equal variances assumed"})
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
			how := "normal approximation with tie and continuity corrections"
			if t.Exact {
				how = "exact distribution (no ties, both groups under 50)"
			}
			c.Tests = append(c.Tests, GroupTest{Code: "mann-whitney", Name: "Mann-Whitney (Wilcoxon rank-sum)", Statistic: t.W, P: t.P, Method: how})
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
			c.Tests = append(c.Tests, GroupTest{Code: "kruskal-wallis", Name: "Kruskal-Wallis", Statistic: t.H, DF: fptr(t.DF), P: t.P,
				Method: "chi-squared approximation, corrected for ties (factor " + strconv.FormatFloat(t.TieFactor, 'g', 4, 64) + ")"})
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
	c.Why = grpWordsCentreWhy(g.Lead, k)
	if c.Lead != "" {
		g.Centre = c
	} else if len(c.Tests) > 0 {
		g.Centre = c
		c.Why += " " + grpWordsLeadMissing()
	}

	// spread
	sp := &GroupSpread{Tests: []GroupTest{}}
	if t, err := method.BrownForsythe(fs); err == nil {
		sp.Tests = append(sp.Tests, GroupTest{Code: "brown-forsythe", Name: "Brown-Forsythe (Levene about the medians)", Statistic: t.F, DF: fptr(t.DF1), DF2: fptr(t.DF2), P: t.P})
	} else {
		note("groups.spread", err)
	}
	if t, err := method.Bartlett(fs); err == nil {
		sp.Tests = append(sp.Tests, GroupTest{Code: "bartlett", Name: "Bartlett", Statistic: t.K2, DF: fptr(t.DF), P: t.P, Method: "chi-squared; assumes normal data"})
	} else {
		note("groups.spread", err)
	}
	if r, err := method.SDRatio(fs, conf); err == nil {
		sp.Ratio, sp.Largest, sp.Smallest = r.Ratio, ws[r.Largest].name, ws[r.Smallest].name
		if r.HasCI {
			sp.RatioCI = &Interval{Lo: r.Lo, Hi: r.Hi, Level: r.Level, Method: "f-distribution"}
			sp.Tests = append(sp.Tests, GroupTest{Code: "f-ratio", Name: "F test of the variance ratio", Statistic: r.F, DF: fptr(r.DF1), DF2: fptr(r.DF2), P: r.P, Method: "assumes normal data"})
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
	sp.Why = grpWordsSpreadWhy(sp.Lead)
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
	mset.Why = grpWordsMeansPairsWhy(mset.Method, spreadsDiffer, equalN)
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
		dset := &PairSet{Method: "dunn-holm", Why: grpWordsDunnWhy(), Pairs: []GroupPair{}}
		N := 0
		for _, w := range ws {
			N += len(w.sorted)
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
			rep.Notes = append(rep.Notes, Note{Field: "groups.pairwise.medians.pairs.diff", Text: grpWordsNoShifts(N, k)})
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

// grpScale is the common decimal count of the groups' mantissas.
func grpScale(ws []*grpWork) int {
	D := 0
	for _, w := range ws {
		for _, i := range w.cells {
			if d := int(w.src.dec[i]); d > D {
				D = d
			}
		}
	}
	return D
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

// ---------- words ----------

func grpWordsNotExact() string {
	return "Some readings are not plain decimals as typed (exponent form or too many digits): the rank tests and fences of the groups use binary doubles, so ties and comparisons may differ in the last digit."
}

func grpWordsLeftOut(n int) string {
	return fmt.Sprintf("only %d %s: left out of the tests (at least %d are needed to estimate a group's own spread)", n, plural(n, "reading", "readings"), method.MinGroupReadings)
}

func grpWordsTooFew(k int) string {
	return fmt.Sprintf("%d %s with %d or more readings: at least two are needed to compare groups", k, plural(k, "group", "groups"), method.MinGroupReadings)
}

func grpWordsAllMean() string {
	return "every group is roughly symmetric without far-out readings (the verdict's rules, group by group), so the tests of means lead"
}

func grpWordsCentreWhy(lead string, k int) string {
	switch {
	case lead == "means" && k == 2:
		return "Welch's t test leads: both groups suit the mean, and Welch's test does not assume equal spreads. The rank test is shown beside it."
	case lead == "means":
		return "Welch's ANOVA leads: every group suits the mean, and Welch's test does not assume equal spreads (the classic one-way ANOVA, which does, is shown too). Kruskal-Wallis is shown beside them."
	case k == 2:
		return "The Mann-Whitney test leads: at least one group is skewed or holds far-out readings, so the comparison rests on ranks, and the Hodges-Lehmann shift gives the difference. Welch's t test is shown beside it."
	}
	return "Kruskal-Wallis leads: at least one group is skewed or holds far-out readings, so the comparison rests on ranks. The tests of means are shown beside it."
}

func grpWordsLeadMissing() string {
	return "The leading test could not be computed for these data (see the notes); the others are shown."
}

func grpWordsSpreadWhy(lead string) string {
	if lead == "bartlett" {
		return "Bartlett's test leads: every group looks normal, where it is the most sensitive test of equal spreads. Brown-Forsythe, which does not need normal data, is shown beside it."
	}
	return "The Brown-Forsythe test leads: it compares the spread about each group's median and stays honest for skewed data or far-out readings. Bartlett's test assumes normal data."
}

func grpWordsMeansPairsWhy(m string, spreadsDiffer, equalN bool) string {
	if m == "tukey-kramer" {
		return "Tukey-Kramer: the groups are of equal size and their spreads are alike, so a pooled SD serves every pair."
	}
	switch {
	case spreadsDiffer && !equalN:
		return "Games-Howell: the spreads differ and the group sizes are unequal, so each pair uses its own SDs."
	case spreadsDiffer:
		return "Games-Howell: the spreads differ, so each pair uses its own SDs."
	}
	return "Games-Howell: the group sizes are unequal, so each pair uses its own SDs rather than a pooled one."
}

func grpWordsDunnWhy() string {
	return "Dunn's test on the joint ranks of the Kruskal-Wallis test, with Holm's adjustment for the number of pairs; the Hodges-Lehmann shift of each pair gives the difference in the data's unit."
}

func grpWordsNoShifts(n, k int) string {
	return fmt.Sprintf("the Hodges-Lehmann shift of each pair is left out for %d readings in %d groups (it is computed up to %d readings × (groups − 1)); the differences in means are given", n, k, int(maxPairShiftWork))
}

func grpWordsMethodError(err error, ws []*grpWork) string {
	var ge *method.GroupsError
	if errors.As(err, &ge) {
		who := ""
		if ge.Group >= 0 && ge.Group < len(ws) {
			who = " (" + ws[ge.Group].title + ")"
		}
		switch ge.Code {
		case method.GroupsNoSpread:
			return "not computed: a group has no variation where this test needs some" + who
		case method.GroupsNotFinite:
			return "not computed: the result would not be a finite number for these values" + who
		case method.GroupsTooComplex:
			return "the letters are left out: the pattern of differences would need too many letters"
		}
	}
	return "not computed for these data: " + err.Error()
}

// grpNum writes a value at the data's decimals plus extra, with the
// data's decimal mark.
func grpNum(rep *Report, v float64, extra int) string {
	var s string
	if d := rep.Counts.Decimals; d >= 0 {
		s = strconv.FormatFloat(v, 'f', min(d+extra, 12), 64)
	} else {
		s = strconv.FormatFloat(v, 'g', 3, 64)
	}
	if s == "-0" || strings.HasPrefix(s, "-0.") && strings.Trim(s[3:], "0") == "" {
		s = s[1:]
	}
	if rep.Input.DecimalComma {
		s = strings.Replace(s, ".", ",", 1)
	}
	return s
}

func grpPct(level float64) string {
	return strconv.FormatFloat(100*level, 'g', 4, 64) + " %"
}

func grpUnit(rep *Report, s string) string {
	if rep.Input.Unit != "" {
		return s + " " + rep.Input.Unit
	}
	return s
}

func grpP(rep *Report, p float64) string {
	s := pText(p)
	if rep.Input.DecimalComma {
		s = strings.Replace(s, ".", ",", 1)
	}
	return s
}

// grpStatement is the section's verdict in plain words.
func grpStatement(g *Groups, ws []*grpWork, opts Options, rep *Report, skipped int) string {
	k := len(ws)
	var b strings.Builder
	if k < 2 {
		b.WriteString(fmt.Sprintf("No comparison: %s.", grpWordsTooFew(k)))
	} else if k == 2 && g.Effect != nil && g.Centre != nil {
		e := g.Effect
		A, B := ws[0].title, ws[1].title
		d, ci, test := e.MeanDiff, e.MeanDiffCI, "Welch's t test"
		what, in := "on average", ""
		if g.Lead == "medians" && e.Shift != nil {
			d, ci, test, what, in = *e.Shift, e.ShiftCI, "Mann-Whitney test", "in centre", "Hodges-Lehmann shift; "
		}
		p := grpLeadP(g)
		dir := "higher"
		lo, hi := 0.0, 0.0
		if ci != nil {
			lo, hi = ci.Lo, ci.Hi
		}
		if d < 0 {
			dir = "lower"
			lo, hi = -hi, -lo // the interval of the distance "lower"
		}
		iv := ""
		if ci != nil {
			iv = fmt.Sprintf("%s interval %s to %s, ", grpPct(ci.Level), grpNum(rep, lo, 1), grpUnit(rep, grpNum(rep, hi, 1)))
		}
		if g.Centre.Differ {
			b.WriteString(fmt.Sprintf("%s reads %s %s than %s %s (%s%s%s %s)", B, grpUnit(rep, grpNum(rep, math.Abs(d), 1)), dir, A, what, in, iv, test, grpP(rep, p)))
		} else {
			if ci != nil {
				iv = fmt.Sprintf("%s interval %s to %s, ", grpPct(ci.Level), grpNum(rep, ci.Lo, 1), grpUnit(rep, grpNum(rep, ci.Hi, 1)))
			}
			b.WriteString(fmt.Sprintf("%s and %s show no clear difference in centre: %s minus %s is %s %s (%s%s%s %s)", B, A, B, A, grpUnit(rep, grpNum(rep, d, 1)), what, in, iv, test, grpP(rep, p)))
		}
	} else if g.Centre != nil {
		name := map[string]string{"welch-anova": "Welch's ANOVA", "kruskal-wallis": "Kruskal-Wallis"}[g.Centre.Lead]
		p := grpLeadP(g)
		hiI, loI := 0, 0
		c := func(i int) float64 {
			if g.Lead == "medians" {
				return ws[i].lvl.Median
			}
			return ws[i].lvl.Mean
		}
		for i := range ws {
			if c(i) > c(hiI) {
				hiI = i
			}
			if c(i) < c(loI) {
				loI = i
			}
		}
		word := "mean"
		if g.Lead == "medians" {
			word = "median"
		}
		if g.Centre.Differ {
			b.WriteString(fmt.Sprintf("The %d groups differ in centre (%s %s): %s has the highest %s (%s), %s the lowest (%s)",
				k, name, grpP(rep, p), ws[hiI].title, word, grpUnit(rep, grpNum(rep, c(hiI), 1)), ws[loI].title, grpUnit(rep, grpNum(rep, c(loI), 1))))
			if g.Pairwise != nil {
				set := g.Pairwise.Means
				if g.Pairwise.LettersFrom == "medians" {
					set = g.Pairwise.Medians
				}
				nd := 0
				for _, pr := range set.Pairs {
					if pr.Differ {
						nd++
					}
				}
				b.WriteString(fmt.Sprintf("; %d of %d pairs differ clearly (groups sharing a letter do not)", nd, len(set.Pairs)))
			}
		} else {
			b.WriteString(fmt.Sprintf("The %d groups show no clear difference in centre (%s %s; %s from %s to %s)",
				k, name, grpP(rep, p), word+"s", grpNum(rep, c(loI), 1), grpUnit(rep, grpNum(rep, c(hiI), 1))))
		}
	} else {
		b.WriteString("The tests of a difference in centre could not be computed for these data (see the notes)")
	}
	if k >= 2 && g.Spread != nil {
		sp := g.Spread
		lead := sp.Tests[0]
		for _, t := range sp.Tests {
			if t.Lead {
				lead = t
			}
		}
		both := "their spreads"
		if k > 2 {
			both = "the spreads"
		}
		if sp.Differ {
			b.WriteString(fmt.Sprintf("; %s differ (%s %s; the largest SD is %s times the smallest)", both, strings.SplitN(lead.Name, " (", 2)[0], grpP(rep, lead.P), strconv.FormatFloat(sp.Ratio, 'f', 2, 64)))
		} else {
			b.WriteString(fmt.Sprintf("; %s are alike (%s %s)", both, strings.SplitN(lead.Name, " (", 2)[0], grpP(rep, lead.P)))
		}
	}
	if k >= 2 {
		b.WriteString(".")
	}
	if tol := grpTolerance(g); tol >= 0 {
		b.WriteString(fmt.Sprintf(" The difference is %s %% of the tolerance.", strconv.FormatFloat(100*tol, 'f', 0, 64)))
	}
	if skipped > 0 {
		b.WriteString(fmt.Sprintf(" %d %s fewer than %d readings %s listed but left out of the tests.", skipped, plural(skipped, "group with", "groups with"), method.MinGroupReadings, plural(skipped, "is", "are")))
	}
	return b.String()
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
