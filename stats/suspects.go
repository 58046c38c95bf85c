package stats

import (
	"math"

	"lotlens/stats/method"
)

// Suspects: readings flagged by standard rules. Nothing is removed.
type Suspects struct {
	// Lead is the rule that leads for these data, chosen by their shape,
	// ties and resolution (see leadRule); the headline counts only the
	// readings it flags. Absent below 3 readings.
	Lead     *Lead     `json:"lead,omitempty"`
	Rules    []Rule    `json:"rules"`
	Readings []Suspect `json:"readings"`
}

// Lead is the leading rule with the reason it leads.
type Lead struct {
	Rule   string `json:"rule"`   // a Rule.Code
	Reason string `json:"reason"` // "skewed", "few-distinct", "medcouple-unstable", "rest-normal", "rest-not-normal", "symmetric", "iqr-zero"
	Count  int    `json:"count"`  // readings the leading rule flags
	Text   string `json:"text"`   // why this rule leads, in words
	// MC is the medcouple of the data and MCSpread the medcouple with
	// tied readings spread over their rounding interval (present when it
	// was needed to decide).
	MC       *float64 `json:"mc,omitempty"`
	MCSpread *float64 `json:"mcSpread,omitempty"`
}

// Rule is one outlier rule as applied.
type Rule struct {
	Code  string   `json:"code"` // "tukey-inner", "tukey-outer", "adjusted-box", "modified-z", "gesd"
	Name  string   `json:"name"`
	Plain string   `json:"plain"`        // what the rule checks, in plain words ("also flagged by ...")
	Lo    *float64 `json:"lo,omitempty"` // lower limit, where the rule has one
	Hi    *float64 `json:"hi,omitempty"`
	Count int      `json:"count"`
	Note  string   `json:"note,omitempty"`
}

// Suspect is a flagged reading with every rule that flags it.
type Suspect struct {
	Reading
	Lead  bool   `json:"lead"` // flagged by the leading rule
	Flags []Flag `json:"flags"`
}

// Flag says which rule flags a reading and by how much.
type Flag struct {
	Rule  string  `json:"rule"`
	Score float64 `json:"score"` // rule's own measure: distance beyond the fence, |Mi|, R_i...
	Text  string  `json:"text"`
	Lead  bool    `json:"lead"` // the flag of the leading rule
}

// outlierRules applies the suspect-reading rules to the sample, whose
// quartiles follow the report's quantile definition and whose median is the
// centre's. Flags are keyed by index into the sorted data; nothing is
// removed. On decimal data every comparison of a reading with a fence or a
// limit is made on the decimals as typed (a reading on a fence is not
// beyond it).
//
//   - "tukey-inner" and "tukey-outer": Tukey's (1977, Exploratory Data
//     Analysis) fences 1.5 and 3 IQR beyond the nearest quartile (common
//     practice). Score: distance beyond the fence, in data units.
//   - "adjusted-box": the adjusted box plot of Hubert and Vandervieren
//     (2008), method.AdjustedBoxFences, with the medcouple (Brys, Hubert and
//     Struyf 2004). Score: distance beyond the fence.
//   - "modified-z": |Mi| > 3.5 with Mi = 0.6745(xi - median)/MAD, MAD the
//     raw median absolute deviation (Iglewicz and Hoaglin 1993). Not
//     defined when MAD = 0 (more than half the values equal the median):
//     the rule then flags nothing and says why. Score: |Mi|.
//   - "gesd": the generalized ESD procedure of Rosner (1983) at level alpha
//     for up to min(10, max(1, ⌊n/10⌋)) suspects, method.GESD; with one
//     suspect it is Grubbs' (1969) test. Score: Ri.
//
// The report lists at most maxSuspects readings, the most extreme, so the
// flags themselves are kept only for the indices within maxSuspects of
// either end of sorted (see flagSet); flagged counts every flagged index.
//
// Then leadRule chooses the rule that leads (Suspects.Lead) and the flags
// of that rule are marked Lead. distinct is the number of distinct values
// (for the medcouple guard).
func outlierRules(w words, s *sample, alpha float64, distinct int) (rules []Rule, flags map[int][]Flag, flagged int, lead *Lead) {
	sorted := s.sorted
	n := len(sorted)
	rules = []Rule{}
	if n == 0 {
		return rules, map[int][]Flag{}, 0, nil
	}
	innerLo, innerHi := s.fences(s.q1, s.q3, 3, 2)
	fs := newFlagSet(n, s.countBelow(innerLo)+s.countAbove(innerHi))
	if !(alpha > 0 && alpha < 1) {
		alpha = 0.05
	}
	q1, q3 := s.q1.f, s.q3.f
	iqr := s.sub(s.q3, s.q1).f
	zeroIQR := iqr == 0
	caption := w.quartileCaption(s.defCode)
	// Tukey's fences.
	for _, f := range []struct {
		code string
		k    int64
	}{{"tukey-inner", 1}, {"tukey-outer", 2}} {
		lo, hi := s.fences(s.q1, s.q3, 3*f.k, 2)
		outer := f.k == 2
		cnt := fenceFlags(sorted, s.countBelow(lo), s.countAbove(hi), lo.f, hi.f, f.code, fs, func(x float64) string {
			switch {
			case zeroIQR:
				return w.tukeyFlag(false, -1, outer)
			case x < q1:
				return w.tukeyFlag(true, (q1-x)/iqr, outer)
			}
			return w.tukeyFlag(false, (x-q3)/iqr, outer)
		})
		r := Rule{Code: f.code, Name: w.tukeyRule(outer), Plain: w.tukeyPlain(outer), Lo: fptr(lo.f), Hi: fptr(hi.f), Count: cnt,
			Note: w.tukeyNote(1.5*float64(f.k), caption, zeroIQR)}
		rules = append(rules, r)
	}

	// Adjusted box plot.
	mc, mcOK := s.medcouple()
	if mcOK {
		lof, hif := s.adjustedFences(s.q1, s.q3, mc)
		lo, hi := lof.f, hif.f
		nb, na := s.countBelow(lof), s.countAbove(hif)
		cnt := fenceFlags(sorted, nb, na, lo, hi, "adjusted-box", fs, func(x float64) string {
			if x < lo {
				return w.adjustedBoxFlag(true, lo-x)
			}
			return w.adjustedBoxFlag(false, x-hi)
		})
		rules = append(rules, Rule{Code: "adjusted-box", Name: w.adjustedBoxRule(), Plain: w.adjustedBoxPlain(), Lo: fptr(lo), Hi: fptr(hi), Count: cnt,
			Note: w.adjustedBoxNote(mc, caption, zeroIQR)})
	} else {
		rules = append(rules, Rule{Code: "adjusted-box", Name: w.adjustedBoxRule(), Plain: w.adjustedBoxPlain(), Note: w.adjustedBoxNotApplied()})
	}

	// Modified z-scores.
	madF := s.mad()
	mad := madF.f
	if mad > 0 && finite(mad) {
		median := s.median.f
		var half fig
		if madF.r != nil {
			half = exactFig(method.ModifiedZHalfWidthExact(madF.r))
		} else {
			half = fig{f: method.ModifiedZHalfWidth(mad)}
		}
		lo, hi := s.sub(s.median, half), s.add(s.median, half)
		nb, na := s.countBelow(lo), s.countAbove(hi)
		score := func(x float64) float64 { return math.Abs(method.ModifiedZConst * (x - median) / mad) }
		last, lastText := math.NaN(), ""
		text := func(x, m float64) string {
			if x != last {
				if x < median {
					m = -m
				}
				last, lastText = x, w.modifiedZFlag(m)
			}
			return lastText
		}
		for i := 0; i < nb; i++ {
			if fs.mark(i) {
				m := score(sorted[i])
				fs.add(i, Flag{Rule: "modified-z", Score: m, Text: text(sorted[i], m)})
			}
		}
		for i := n - 1; i >= n-na && i >= nb; i-- {
			if fs.mark(i) {
				m := score(sorted[i])
				fs.add(i, Flag{Rule: "modified-z", Score: m, Text: text(sorted[i], m)})
			}
		}
		rules = append(rules, Rule{Code: "modified-z", Name: w.modifiedZRule(), Plain: w.modifiedZPlain(), Lo: fptr(lo.f), Hi: fptr(hi.f), Count: nb + min(na, n-nb),
			Note: w.modifiedZNote(mad)})
	} else {
		rules = append(rules, Rule{Code: "modified-z", Name: w.modifiedZRule(), Plain: w.modifiedZPlain(), Note: w.modifiedZNotApplied()})
	}

	rules = append(rules, gesdRule(w, sorted, alpha, fs))

	outerLo, outerHi := s.fences(s.q1, s.q3, 3, 1)
	lead = leadRule(w, s, zeroIQR, mc, mcOK, distinct, s.countBelow(outerLo), s.countAbove(outerHi))
	for _, r := range rules {
		if r.Code == lead.Rule {
			lead.Count = r.Count
		}
	}
	for _, fl := range fs.m {
		for k := range fl {
			fl[k].Lead = fl[k].Rule == lead.Rule
		}
	}
	return rules, fs.m, fs.total, lead
}

// Thresholds of the choice of the leading rule (leadRule).
const (
	// mcMinDistinct: with fewer distinct values the medcouple's kernel
	// takes only a handful of values and the medcouple jumps between them
	// (our rule, shown on testdata/suspects: 17 distinct values already
	// give -0.2 on rounded symmetric data; below 10 nothing is left).
	mcMinDistinct = 10
	// mcSkewMin and mcAsymVar: the medcouple counts as clearly skewed when
	// |MC| >= max(0.1, 2·sqrt(1.25/n)): twice its standard error at the
	// normal, whose asymptotic variance is 1.25 (Brys, Hubert and Struyf
	// 2004; from memory), and never below 0.1 (our rule).
	mcSkewMin = 0.1
	mcAsymVar = 1.25
	// esdMinN: the generalized ESD leads only from 25 readings, where
	// Rosner's (1983) critical values are accurate (his paper).
	esdMinN = 25
	// restNormalAlpha: the readings inside Tukey's outer fences look
	// normal when Shapiro-Wilk gives p >= 0.05 (common practice).
	restNormalAlpha = 0.05
)

// mcSkewed tells whether a medcouple says clearly skewed for n readings.
func mcSkewed(mc float64, n int) bool {
	return math.Abs(mc) >= max(mcSkewMin, 2*math.Sqrt(mcAsymVar/float64(n)))
}

// leadRule chooses the rule whose flags the headline counts, in order:
//
//  1. IQR 0 (half the readings or more share one value): the fences sit
//     on the quartiles and flag every other reading, so the generalized
//     ESD leads ("iqr-zero").
//  2. The medcouple says clearly skewed (mcSkewed): the adjusted box plot
//     (Hubert and Vandervieren 2008) leads ("skewed"), unless the
//     medcouple cannot be trusted on these data, and then Tukey's inner
//     fences lead: fewer than mcMinDistinct distinct values
//     ("few-distinct"), or tied readings whose medcouple, once each run of
//     ties is spread over its rounding interval
//     (method.MedcoupleTiesSpread), no longer says skewed to the same side
//     or moves by more than one standard error, sqrt(1.25/n)
//     ("medcouple-unstable").
//  3. Otherwise the data are roughly symmetric. From esdMinN readings on,
//     when the readings inside Tukey's outer fences look normal
//     (Shapiro-Wilk, Royston 1995, p >= restNormalAlpha; above 5000 of
//     them the D'Agostino-Pearson K² test; the outer fences, 3 IQR beyond
//     the quartiles, cut a normal sample's tails only beyond about 4.7
//     SD, so the test is not biased by the cut), the generalized ESD (Rosner 1983), which assumes that, leads
//     ("rest-normal"); else Tukey's inner fences (Tukey 1977) lead
//     ("rest-not-normal", or "symmetric" below esdMinN readings or when
//     no normality test can be computed).
//
// The other rules' flags stay in the report as "also flagged by".
func leadRule(w words, s *sample, zeroIQR bool, mc float64, mcOK bool, distinct int, outerBelow, outerAbove int) *Lead {
	n := s.n
	if zeroIQR {
		return &Lead{Rule: "gesd", Reason: "iqr-zero", Text: w.leadIQRZero()}
	}
	if mcOK && mcSkewed(mc, n) {
		l := &Lead{Rule: "tukey-inner", MC: fptr(mc)}
		if distinct < mcMinDistinct {
			l.Reason, l.Text = "few-distinct", w.leadFewDistinct(mc, distinct, mcMinDistinct)
			return l
		}
		if gs := gapStep(s); distinct < n && gs > 0 {
			if mcs, ok := method.MedcoupleTiesSpread(s.sorted, gs); ok {
				l.MCSpread = fptr(mcs)
				if !mcSkewed(mcs, n) || (mcs > 0) != (mc > 0) || math.Abs(mcs-mc) > math.Sqrt(mcAsymVar/float64(n)) {
					l.Reason, l.Text = "medcouple-unstable", w.leadMCUnstable(mc, mcs, distinct, n, gs)
					return l
				}
			}
		}
		l.Rule, l.Reason, l.Text = "adjusted-box", "skewed", w.leadSkewed(mc)
		return l
	}
	var mcp *float64
	if mcOK {
		mcp = fptr(mc)
	}
	rest := n - outerAbove - outerBelow
	if n < esdMinN || rest < 3 {
		return &Lead{Rule: "tukey-inner", Reason: "symmetric", MC: mcp, Text: w.leadSymmetric(mc, mcOK, n, esdMinN)}
	}
	p, large, ok := s.partNormalP(outerBelow, n-outerAbove)
	if !ok {
		return &Lead{Rule: "tukey-inner", Reason: "symmetric", MC: mcp, Text: w.leadSymmetric(mc, mcOK, n, esdMinN)}
	}
	if p >= restNormalAlpha {
		return &Lead{Rule: "gesd", Reason: "rest-normal", MC: mcp, Text: w.leadRestNormal(mc, mcOK, p, large, rest)}
	}
	return &Lead{Rule: "tukey-inner", Reason: "rest-not-normal", MC: mcp, Text: w.leadRestNotNormal(mc, mcOK, p, large, rest)}
}

// flagSet collects flags by index with few allocations: each flagged
// index gets a slice of capacity 5 (one per rule) cut from a shared arena.
//
// Every rule flags the values beyond a cut-off at either end of the sorted
// data (fences, modified z-score, the ESD's extremes), so the flagged
// indices form a run at each end, and the maxSuspects most extreme of them
// (all the report lists, see mapFlags) lie within maxSuspects of an end.
// Only those indices keep their flags; the others are counted. Without this
// limit, data with many readings beyond the fences (an IQR of 0 flags about
// half of them) would cost some 250 bytes per flagged reading.
type flagSet struct {
	m     map[int][]Flag
	arena []Flag
	chunk int      // indices per arena allocation
	n     int      // number of values
	seen  []uint64 // flagged indices, one bit each
	total int      // flagged indices
}

// newFlagSet sizes the set for hint flagged readings (those beyond the
// inner fences, usually the largest set) among the indices it keeps.
func newFlagSet(n, hint int) *flagSet {
	hint = min(hint, 2*maxSuspects) + 16
	return &flagSet{m: make(map[int][]Flag, hint), chunk: min(1024, hint), n: n, seen: make([]uint64, (n+63)/64)}
}

// mark counts index i as flagged and tells whether its flags are kept:
// call add for i only when it returns true.
func (fs *flagSet) mark(i int) bool {
	if fs.seen[i/64]&(1<<(i%64)) == 0 {
		fs.seen[i/64] |= 1 << (i % 64)
		fs.total++
	}
	return min(i, fs.n-1-i) < maxSuspects
}

// add records flag f of index i (after mark).
func (fs *flagSet) add(i int, f Flag) {
	s, ok := fs.m[i]
	if !ok {
		if len(fs.arena) < 5 {
			fs.arena = make([]Flag, 5*fs.chunk)
		}
		s = fs.arena[:0:5]
		fs.arena = fs.arena[5:]
	}
	fs.m[i] = append(s, f)
}

// fenceFlags flags the nb lowest values (below lo) and the na highest
// (above hi) of the sorted data with their distance beyond the fence; it
// returns the count. Equal values share one text.
func fenceFlags(sorted []float64, nb, na int, lo, hi float64, code string, flags *flagSet, text func(float64) string) int {
	cnt := 0
	n := len(sorted)
	last, lastText := math.NaN(), ""
	cached := func(x float64) string {
		if x != last {
			last, lastText = x, text(x)
		}
		return lastText
	}
	for i := 0; i < nb; i++ {
		if flags.mark(i) {
			flags.add(i, Flag{Rule: code, Score: lo - sorted[i], Text: cached(sorted[i])})
		}
		cnt++
	}
	for j := n - 1; j >= n-na && j >= nb; j-- {
		if flags.mark(j) {
			flags.add(j, Flag{Rule: code, Score: sorted[j] - hi, Text: cached(sorted[j])})
		}
		cnt++
	}
	return cnt
}

// gesdRule runs Rosner's (1983) generalized ESD procedure (method.GESD)
// and flags its outliers, see outlierRules.
func gesdRule(w words, sorted []float64, alpha float64, flags *flagSet) Rule {
	n := len(sorted)
	r := method.GESDMaxSuspects(n)
	rule := Rule{Code: "gesd", Name: w.gesdRule(n >= 3 && r == 1), Plain: w.gesdPlain()}
	if n < 3 {
		rule.Note = w.gesdFew()
		return rule
	}
	steps, nout := method.GESD(sorted, alpha, r)
	for i := 0; i < nout; i++ {
		st := steps[i]
		if flags.mark(st.Index) {
			flags.add(st.Index, Flag{Rule: "gesd", Score: st.R, Text: w.gesdFlag(r == 1, i+1, st.R, st.Lambda, alpha)})
		}
	}
	rule.Count = nout
	rule.Note = w.gesdNote(alpha, r, n, len(steps))
	return rule
}

func fptr(x float64) *float64 {
	if !finite(x) {
		return nil
	}
	return &x
}
