package stats

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

func init() { hookOutliers = outlierRules }

// Rule constants of the suspect-reading rules.
const (
	modZLimit = 3.5    // Iglewicz and Hoaglin (1993)
	modZConst = 0.6745 // Iglewicz and Hoaglin (1993): Φ⁻¹(0.75), rounded as published
	gesdMaxR  = 10     // our cap on the number of suspects the generalized ESD tests
)

// outlierRules applies the suspect-reading rules to the sorted data with
// quartiles q1, q3 and median (under the report's quantile definition).
// Flags are keyed by index into sorted; nothing is removed.
//
//   - "tukey-inner" and "tukey-outer": Tukey's (1977, Exploratory Data
//     Analysis) fences 1.5 and 3 IQR beyond the nearest quartile (common
//     practice). Score: distance beyond the fence, in data units.
//   - "adjusted-box": the adjusted box plot of Hubert and Vandervieren
//     (2008), "An adjusted boxplot for skewed distributions", Comput. Stat.
//     Data Anal. 52, 5186-5201: fences Q1 - 1.5·e^{-4MC}·IQR and
//     Q3 + 1.5·e^{3MC}·IQR for medcouple MC >= 0, and Q1 - 1.5·e^{-3MC}·IQR,
//     Q3 + 1.5·e^{4MC}·IQR for MC < 0. Score: distance beyond the fence.
//   - "modified-z": |Mi| > 3.5 with Mi = 0.6745(xi - median)/MAD, MAD the
//     raw median absolute deviation (Iglewicz and Hoaglin 1993, How to
//     Detect and Handle Outliers, ASQC). Not defined when MAD = 0 (more
//     than half the values equal the median): the rule then flags nothing
//     and says why. Score: |Mi|.
//   - "gesd": the generalized extreme Studentized deviate procedure of
//     Rosner (1983), "Percentage points for a generalized ESD many-outlier
//     procedure", Technometrics 25, 165-172, at level alpha, testing up to
//     r = min(10, max(1, ⌊n/10⌋)) suspects. With r = 1 it is Grubbs' (1969)
//     two-sided test for a single outlier. Score: Ri, the step's Studentized
//     deviate.
//
// The report lists at most maxSuspects readings, the most extreme, so the
// flags themselves are kept only for the indices within maxSuspects of
// either end of sorted (see flagSet); flagged counts every flagged index.
func outlierRules(sorted []float64, q1, q3, median float64, alpha float64) (rules []Rule, flags map[int][]Flag, flagged int) {
	n := len(sorted)
	rules = []Rule{}
	if n == 0 {
		return rules, map[int][]Flag{}, 0
	}
	fs := newFlagSet(sorted, q1, q3)
	if !(alpha > 0 && alpha < 1) {
		alpha = 0.05
	}
	iqr := q3 - q1
	zeroIQR := ""
	if iqr == 0 {
		zeroIQR = " The IQR is 0 (at least half the values are equal), so the fences sit on the quartiles and every other value is flagged: read these flags with care."
	}
	// Tukey's fences.
	for _, f := range []struct {
		code, name string
		k          float64
	}{
		{"tukey-inner", "Tukey's inner fences (1.5 IQR)", 1.5},
		{"tukey-outer", "Tukey's outer fences (3 IQR)", 3},
	} {
		lo, hi := q1-f.k*iqr, q3+f.k*iqr
		label := "outside the inner fence"
		if f.k == 3 {
			label = "far out, beyond the outer fence"
		}
		cnt := fenceFlags(sorted, lo, hi, f.code, fs, func(x float64) string {
			if iqr == 0 {
				return label
			}
			if x < q1 {
				return fmt.Sprintf("%s IQR below Q1 (%s)", fmtSig((q1-x)/iqr, 3), label)
			}
			return fmt.Sprintf("%s IQR above Q3 (%s)", fmtSig((x-q3)/iqr, 3), label)
		})
		r := Rule{Code: f.code, Name: f.name, Lo: fptr(lo), Hi: fptr(hi), Count: cnt,
			Note: fmt.Sprintf("Common practice (Tukey 1977): fences %g IQR beyond the nearest quartile.%s", f.k, zeroIQR)}
		rules = append(rules, r)
	}

	// Adjusted box plot.
	if mc, ok := medcouple(sorted); ok {
		var lo, hi float64
		if mc >= 0 {
			lo, hi = q1-1.5*math.Exp(-4*mc)*iqr, q3+1.5*math.Exp(3*mc)*iqr
		} else {
			lo, hi = q1-1.5*math.Exp(-3*mc)*iqr, q3+1.5*math.Exp(4*mc)*iqr
		}
		cnt := fenceFlags(sorted, lo, hi, "adjusted-box", fs, func(x float64) string {
			if x < lo {
				return fmt.Sprintf("%s below the adjusted lower fence (medcouple %s)", fmtSig(lo-x, 3), fmtSig(mc, 3))
			}
			return fmt.Sprintf("%s above the adjusted upper fence (medcouple %s)", fmtSig(x-hi, 3), fmtSig(mc, 3))
		})
		rules = append(rules, Rule{Code: "adjusted-box", Name: "Adjusted box plot for skewed data", Lo: fptr(lo), Hi: fptr(hi), Count: cnt,
			Note: fmt.Sprintf("Hubert and Vandervieren (2008): Tukey's 1.5 IQR fences stretched on the long side by the medcouple MC = %s (Brys, Hubert and Struyf 2004).%s", fmtSig(mc, 4), zeroIQR)})
	} else {
		rules = append(rules, Rule{Code: "adjusted-box", Name: "Adjusted box plot for skewed data",
			Note: "The medcouple could not be computed (it needs at least 3 values): rule not applied."})
	}

	// Modified z-scores.
	mad := rawMAD(sorted, median)
	if mad > 0 && finite(mad) {
		half := modZLimit * mad / modZConst
		lo, hi := median-half, median+half
		cnt := 0
		score := func(x float64) float64 { return math.Abs(modZConst * (x - median) / mad) }
		last, lastText := math.NaN(), ""
		text := func(x, m float64) string {
			if x != last {
				if x < median {
					m = -m
				}
				last, lastText = x, fmt.Sprintf("modified z-score %s (limit 3.5)", fmtSig(m, 3))
			}
			return lastText
		}
		for i := 0; i < n && score(sorted[i]) > modZLimit && sorted[i] < median; i++ {
			if fs.mark(i) {
				m := score(sorted[i])
				fs.add(i, Flag{Rule: "modified-z", Score: m, Text: text(sorted[i], m)})
			}
			cnt++
		}
		for i := n - 1; i >= 0 && score(sorted[i]) > modZLimit && sorted[i] > median; i-- {
			if fs.mark(i) {
				m := score(sorted[i])
				fs.add(i, Flag{Rule: "modified-z", Score: m, Text: text(sorted[i], m)})
			}
			cnt++
		}
		rules = append(rules, Rule{Code: "modified-z", Name: "Modified z-score above 3.5", Lo: fptr(lo), Hi: fptr(hi), Count: cnt,
			Note: fmt.Sprintf("Iglewicz and Hoaglin (1993): Mi = 0.6745(xi - median)/MAD with the raw MAD %s; |Mi| > 3.5 is flagged.", fmtSig(mad, 4))})
	} else {
		rules = append(rules, Rule{Code: "modified-z", Name: "Modified z-score above 3.5",
			Note: "The median absolute deviation is 0 (more than half the values equal the median), so the modified z-score is not defined: rule not applied."})
	}

	rules = append(rules, gesdRule(sorted, alpha, fs))
	return rules, fs.m, fs.total
}

// upperBound is the first index with s[i] > v.
func upperBound(s []float64, v float64) int {
	lo, hi := 0, len(s)
	for lo < hi {
		h := int(uint(lo+hi) >> 1)
		if s[h] <= v {
			lo = h + 1
		} else {
			hi = h
		}
	}
	return lo
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

// newFlagSet sizes the set for the readings beyond the inner fences
// (usually the largest set) among the indices it keeps.
func newFlagSet(sorted []float64, q1, q3 float64) *flagSet {
	n := len(sorted)
	iqr := q3 - q1
	hint := lowerBound(sorted, q1-1.5*iqr) + n - upperBound(sorted, q3+1.5*iqr)
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

// fenceFlags flags the values below lo or above hi (at the two ends of the
// sorted data) with their distance beyond the fence; it returns the count.
// Equal values share one text.
func fenceFlags(sorted []float64, lo, hi float64, code string, flags *flagSet, text func(float64) string) int {
	cnt := 0
	n := len(sorted)
	i := 0
	last, lastText := math.NaN(), ""
	cached := func(x float64) string {
		if x != last {
			last, lastText = x, text(x)
		}
		return lastText
	}
	for ; i < n && sorted[i] < lo; i++ {
		if flags.mark(i) {
			flags.add(i, Flag{Rule: code, Score: lo - sorted[i], Text: cached(sorted[i])})
		}
		cnt++
	}
	for j := n - 1; j >= i && sorted[j] > hi; j-- {
		if flags.mark(j) {
			flags.add(j, Flag{Rule: code, Score: sorted[j] - hi, Text: cached(sorted[j])})
		}
		cnt++
	}
	return cnt
}

// rawMAD is the unscaled median absolute deviation from med, in O(n) from
// the sorted data: the deviations below and above med are two sorted runs,
// merged up to the middle rank.
func rawMAD(sorted []float64, med float64) float64 {
	n := len(sorted)
	if n == 0 {
		return 0
	}
	// split: sorted[:s] < med <= sorted[s:]
	lo, hi := 0, n
	for lo < hi {
		h := int(uint(lo+hi) >> 1)
		if sorted[h] < med {
			lo = h + 1
		} else {
			hi = h
		}
	}
	s := lo
	i, j := s-1, s // next deviation from each run
	next := func() float64 {
		var d float64
		if j >= n || (i >= 0 && med-sorted[i] <= sorted[j]-med) {
			d = med - sorted[i]
			i--
		} else {
			d = sorted[j] - med
			j++
		}
		return d
	}
	var a float64
	for k := 0; k <= (n-1)/2; k++ {
		a = next()
	}
	if n%2 == 1 {
		return a
	}
	b := next()
	return a/2 + b/2
}

// gesdRule runs Rosner's (1983) generalized ESD procedure, see outlierRules.
// The extremes of the remaining values are always at the two ends of the
// sorted data, so each step is O(1) after one pass for the moments.
func gesdRule(sorted []float64, alpha float64, flags *flagSet) Rule {
	n := len(sorted)
	rule := Rule{Code: "gesd", Name: "Generalized ESD (Grubbs' test for one suspect)"}
	r := min(gesdMaxR, max(1, n/10))
	if n < 3 {
		rule.Note = "The generalized ESD needs at least 3 values: rule not applied."
		return rule
	}
	if r == 1 {
		rule.Name = "Grubbs' test (generalized ESD with one suspect)"
	}
	// Moments of the window [lo, hi] as sums of deviations from c.
	var c float64
	for _, x := range sorted {
		c += x
	}
	c /= float64(n)
	if !finite(c) {
		c = sorted[n/2]
	}
	moments := func(lo, hi int) (s1, s2 float64) {
		for _, x := range sorted[lo : hi+1] {
			d := x - c
			s1 += d
			s2 += d * d
		}
		return
	}
	lo, hi := 0, n-1
	s1, s2 := moments(lo, hi)
	type step struct {
		idx     int
		R, lam  float64
		applied bool
	}
	steps := make([]step, 0, r)
	nout := 0
	for i := 1; i <= r; i++ {
		nn := hi - lo + 1
		if nn < 3 {
			break
		}
		fn := float64(nn)
		mean := c + s1/fn
		v := (s2 - s1*s1/fn) / (fn - 1)
		if !(v > 0) || !finite(v) {
			break
		}
		sd := math.Sqrt(v)
		dl, dh := mean-sorted[lo], sorted[hi]-mean
		idx := hi
		dev := dh
		if dl > dh {
			idx, dev = lo, dl
		}
		R := dev / sd
		p := 1 - alpha/(2*fn)
		tq := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: fn - 2}.Quantile(p)
		lam := (fn - 1) * tq / math.Sqrt((fn-2+tq*tq)*fn)
		if !finite(R) || !finite(lam) {
			break
		}
		steps = append(steps, step{idx: idx, R: R, lam: lam})
		if R > lam {
			nout = i
		}
		d := sorted[idx] - c
		ns2 := s2 - d*d
		s1 -= d
		if idx == lo {
			lo++
		} else {
			hi--
		}
		if ns2 < 1e-8*s2 { // cancellation: recompute the sums exactly
			s1, s2 = moments(lo, hi)
		} else {
			s2 = ns2
		}
	}
	for i := 0; i < nout; i++ {
		st := steps[i]
		var txt string
		if r == 1 {
			txt = fmt.Sprintf("Grubbs' G = %s above the critical %s", fmtSig(st.R, 4), fmtSig(st.lam, 4))
		} else {
			txt = fmt.Sprintf("step %d of the generalized ESD: R = %s, critical %s", i+1, fmtSig(st.R, 4), fmtSig(st.lam, 4))
		}
		if flags.mark(st.idx) {
			flags.add(st.idx, Flag{Rule: "gesd", Score: st.R, Text: txt})
		}
	}
	rule.Count = nout
	note := fmt.Sprintf("Rosner (1983) at α = %s, testing up to %d suspect(s) (our limit: min(10, max(1, n/10))); with one suspect this is Grubbs' two-sided test. It assumes the other values are roughly normal.", fmtSig(alpha, 3), r)
	if n < 25 && r > 1 {
		note += " Rosner's critical values are approximate below 25 values."
	}
	if len(steps) < r {
		note += fmt.Sprintf(" Stopped after %d step(s): the remaining values are all equal.", len(steps))
	}
	rule.Note = note
	return rule
}

func fptr(x float64) *float64 {
	if !finite(x) {
		return nil
	}
	return &x
}

// fmtSig formats x with d significant digits, without exponent for
// everyday magnitudes.
func fmtSig(x float64, d int) string {
	if x == 0 || !finite(x) {
		return "0"
	}
	e := int(math.Floor(math.Log10(math.Abs(x))))
	if e < -4 || e >= 9 {
		return fmt.Sprintf("%.*g", d, x)
	}
	dec := max(0, d-1-e)
	return fmt.Sprintf("%.*f", dec, x)
}
