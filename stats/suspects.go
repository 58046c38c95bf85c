package stats

import (
	"math"

	"lotlens/stats/method"
)

// Suspects: readings flagged by standard rules. Nothing is removed.
type Suspects struct {
	Rules    []Rule    `json:"rules"`
	Readings []Suspect `json:"readings"`
}

// Rule is one outlier rule as applied.
type Rule struct {
	Code  string   `json:"code"` // "tukey-inner", "tukey-outer", "adjusted-box", "modified-z", "gesd"
	Name  string   `json:"name"`
	Lo    *float64 `json:"lo,omitempty"` // lower limit, where the rule has one
	Hi    *float64 `json:"hi,omitempty"`
	Count int      `json:"count"`
	Note  string   `json:"note,omitempty"`
}

// Suspect is a flagged reading with every rule that flags it.
type Suspect struct {
	Reading
	Flags []Flag `json:"flags"`
}

// Flag says which rule flags a reading and by how much.
type Flag struct {
	Rule  string  `json:"rule"`
	Score float64 `json:"score"` // rule's own measure: distance beyond the fence, |Mi|, R_i...
	Text  string  `json:"text"`
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
func outlierRules(w words, s *sample, alpha float64) (rules []Rule, flags map[int][]Flag, flagged int) {
	sorted := s.sorted
	n := len(sorted)
	rules = []Rule{}
	if n == 0 {
		return rules, map[int][]Flag{}, 0
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
		r := Rule{Code: f.code, Name: w.tukeyRule(outer), Lo: fptr(lo.f), Hi: fptr(hi.f), Count: cnt,
			Note: w.tukeyNote(1.5*float64(f.k), caption, zeroIQR)}
		rules = append(rules, r)
	}

	// Adjusted box plot.
	if mc, ok := method.Medcouple(sorted); ok {
		lo, hi := method.AdjustedBoxFences(q1, q3, mc)
		nb, na := lowerBound(sorted, lo), n-upperBound(sorted, hi)
		cnt := fenceFlags(sorted, nb, na, lo, hi, "adjusted-box", fs, func(x float64) string {
			if x < lo {
				return w.adjustedBoxFlag(true, lo-x, mc)
			}
			return w.adjustedBoxFlag(false, x-hi, mc)
		})
		rules = append(rules, Rule{Code: "adjusted-box", Name: w.adjustedBoxRule(), Lo: fptr(lo), Hi: fptr(hi), Count: cnt,
			Note: w.adjustedBoxNote(mc, caption, zeroIQR)})
	} else {
		rules = append(rules, Rule{Code: "adjusted-box", Name: w.adjustedBoxRule(), Note: w.adjustedBoxNotApplied()})
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
		rules = append(rules, Rule{Code: "modified-z", Name: w.modifiedZRule(), Lo: fptr(lo.f), Hi: fptr(hi.f), Count: nb + min(na, n-nb),
			Note: w.modifiedZNote(mad)})
	} else {
		rules = append(rules, Rule{Code: "modified-z", Name: w.modifiedZRule(), Note: w.modifiedZNotApplied()})
	}

	rules = append(rules, gesdRule(w, sorted, alpha, fs))
	return rules, fs.m, fs.total
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
	rule := Rule{Code: "gesd", Name: w.gesdRule(n >= 3 && r == 1)}
	if n < 3 {
		rule.Note = w.gesdFew()
		return rule
	}
	steps, nout := method.GESD(sorted, alpha, r)
	for i := 0; i < nout; i++ {
		st := steps[i]
		if flags.mark(st.Index) {
			flags.add(st.Index, Flag{Rule: "gesd", Score: st.R, Text: w.gesdFlag(r == 1, i+1, st.R, st.Lambda)})
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
