package stats

import (
	"strconv"

	"lotlens/stats/method"
)

// Quantiles under the chosen definition, and the quartiles under all of them.
type Quantiles struct {
	Method      string        `json:"method"`
	Name        string        `json:"name"` // the definition in words
	Min         float64       `json:"min"`
	Q1          float64       `json:"q1"`
	Median      float64       `json:"median"`
	Q3          float64       `json:"q3"`
	Max         float64       `json:"max"`
	Percentiles []Percentile  `json:"percentiles"` // 0.135, 1, 5, 95, 99, 99.865
	All         []QuartileSet `json:"all"`         // hf1..hf9 and tukey
	// Sensitive is set when another definition would flag different readings
	// by a quartile-based rule (Tukey's inner or outer fences, the adjusted
	// box plot); Differ says which rules under which definitions, Note says
	// it in words with the rows.
	Sensitive bool         `json:"sensitive,omitempty"`
	Differ    []RuleDiffer `json:"differ,omitempty"`
	Note      string       `json:"note,omitempty"`
}

// RuleDiffer: a quartile-based rule flags another set of readings under
// these definitions than under the chosen one.
type RuleDiffer struct {
	Rule    string   `json:"rule"` // "tukey-inner", "tukey-outer", "adjusted-box"
	Methods []string `json:"methods"`
}

// Percentile is one named percentile.
type Percentile struct {
	P     float64 `json:"p"` // in percent, e.g. 99.865
	Value float64 `json:"value"`
}

// QuartileSet is Q1, median and Q3 under one definition.
type QuartileSet struct {
	Method string  `json:"method"`
	Q1     float64 `json:"q1"`
	Median float64 `json:"median"`
	Q3     float64 `json:"q3"`
}

// QuantileMethods lists the quantile definitions the engine knows: the nine
// sample quantiles of Hyndman and Fan (1996, The American Statistician 50,
// 361-365) and Tukey's hinges (Tukey 1977, Exploratory Data Analysis).
var QuantileMethods = []string{"hf1", "hf2", "hf3", "hf4", "hf5", "hf6", "hf7", "hf8", "hf9", "tukey"}

// hfType returns the Hyndman-Fan type number of a method name (1..9), 0 for
// "tukey" and -1 for an unknown name.
func hfType(code string) int {
	if code == "tukey" {
		return 0
	}
	if len(code) == 3 && code[:2] == "hf" {
		if t, err := strconv.Atoi(code[2:]); err == nil && t >= 1 && t <= 9 {
			return t
		}
	}
	return -1
}

// quantileDef is the method's definition for a code ("hf7" by default).
func quantileDef(code string) method.QuantileDef {
	switch t := hfType(code); {
	case t == 0:
		return method.TukeyHinges
	case t > 0:
		return method.QuantileDef(t)
	}
	return method.HF7
}

// percentilePoints are the percentiles every report gives (in percent):
// 0.135 and 99.865 are the ±3σ points of a normal distribution.
var percentilePoints = []float64{0.135, 1, 5, 95, 99, 99.865}

// percentileProbs are the same points as exact decimal probabilities, so
// that no rounding of p/100 changes which order statistics are used, and
// as float64 (the binary path).
var (
	percentileExact = []method.Prob{{Num: 135, Den: 100000}, {Num: 1, Den: 100}, {Num: 5, Den: 100}, {Num: 95, Den: 100}, {Num: 99, Den: 100}, {Num: 99865, Den: 100000}}
	percentileProbs = []float64{0.00135, 0.01, 0.05, 0.95, 0.99, 0.99865}
)

// buildQuantiles fills the quantile section: the chosen definition's
// quartiles and percentiles, the quartiles under every definition, and the
// sensitivity of Tukey's fences to the definition.
func buildQuantiles(rep *Report, w words, s *sample, cv *colView) {
	qs := &Quantiles{Method: s.defCode, Name: w.quantileName(s.defCode), Min: s.sorted[0], Max: s.sorted[s.n-1],
		Q1: s.q1.f, Median: s.qmed.f, Q3: s.q3.f}
	for i, p := range percentilePoints {
		qs.Percentiles = append(qs.Percentiles, Percentile{P: p, Value: s.quantile(percentileExact[i], s.def).f})
	}
	for _, code := range QuantileMethods {
		qs.All = append(qs.All, s.quartileSet(code))
	}
	fenceSensitivity(w, qs, s, cv)
	if qs.Median != s.median.f {
		rep.Notes = append(rep.Notes, Note{Field: "quantiles.median", Text: w.quantileMedian(s.defCode, s.n, qs.Median, s.median.f)})
	}
	rep.Quantile = qs
}

// quartileSet is Q1, median and Q3 under one definition.
func (s *sample) quartileSet(code string) QuartileSet {
	def := quantileDef(code)
	if def == s.def {
		return QuartileSet{Method: code, Q1: s.q1.f, Median: s.qmed.f, Q3: s.q3.f}
	}
	return QuartileSet{Method: code,
		Q1:     s.quantile(method.Prob{Num: 1, Den: 4}, def).f,
		Median: s.quantile(method.Prob{Num: 1, Den: 2}, def).f,
		Q3:     s.quantile(method.Prob{Num: 3, Den: 4}, def).f}
}

// fenceSensitivity marks the report when another quantile definition would
// put different readings beyond a quartile-based rule's fences: Tukey's
// inner and outer fences (1.5 and 3 IQR beyond the quartiles; Tukey 1977)
// and the adjusted box plot (Hubert and Vandervieren 2008, whose medcouple
// does not depend on the definition), and names the rules, the
// definitions and the rows. Tukey's counts are decided on the decimals as
// typed (exact fences) where the data are decimals.
func fenceSensitivity(w words, qs *Quantiles, s *sample, cv *colView) {
	n := s.n
	mc, mcOK := s.medcouple()
	type cut struct{ loIn, hiIn, loOut, hiOut, loAdj, hiAdj int } // counts beyond each fence
	cuts := func(q1, q3 fig) cut {
		li, hi := s.fences(q1, q3, 3, 2)
		lo, ho := s.fences(q1, q3, 3, 1)
		c := cut{s.countBelow(li), s.countAbove(hi), s.countBelow(lo), s.countAbove(ho), 0, 0}
		if mcOK {
			al, ah := s.adjustedFences(q1, q3, mc)
			c.loAdj, c.hiAdj = s.countBelow(al), s.countAbove(ah)
		}
		return c
	}
	ref := cuts(s.q1, s.q3)
	// the readings whose flag changes lie between the smallest and largest count at each end
	lo := [3][2]int{{ref.loIn, ref.loIn}, {ref.loOut, ref.loOut}, {ref.loAdj, ref.loAdj}}
	hi := [3][2]int{{ref.hiIn, ref.hiIn}, {ref.hiOut, ref.hiOut}, {ref.hiAdj, ref.hiAdj}}
	codes := [3]string{"tukey-inner", "tukey-outer", "adjusted-box"}
	refPair := [3][2]int{{ref.loIn, ref.hiIn}, {ref.loOut, ref.hiOut}, {ref.loAdj, ref.hiAdj}}
	var differ [3][]string
	for _, code := range QuantileMethods {
		def := quantileDef(code)
		if def == s.def {
			continue
		}
		c := cuts(s.quantile(method.Prob{Num: 1, Den: 4}, def), s.quantile(method.Prob{Num: 3, Den: 4}, def))
		got := [3][2]int{{c.loIn, c.hiIn}, {c.loOut, c.hiOut}, {c.loAdj, c.hiAdj}}
		for k := range codes {
			if got[k] != refPair[k] {
				differ[k] = append(differ[k], code)
			}
			lo[k][0], lo[k][1] = min(lo[k][0], got[k][0]), max(lo[k][1], got[k][0])
			hi[k][0], hi[k][1] = min(hi[k][0], got[k][1]), max(hi[k][1], got[k][1])
		}
	}
	var vals []float64
	var rules []string
	for k := range codes {
		if len(differ[k]) == 0 {
			continue
		}
		qs.Differ = append(qs.Differ, RuleDiffer{Rule: codes[k], Methods: differ[k]})
		rules = append(rules, w.differRule(codes[k], differ[k]))
		for i := lo[k][0]; i < lo[k][1] && len(vals) < 50; i++ {
			vals = append(vals, s.sorted[i])
		}
		for i := n - hi[k][1]; i < n-hi[k][0] && len(vals) < 50; i++ {
			vals = append(vals, s.sorted[i])
		}
	}
	if len(qs.Differ) == 0 {
		return
	}
	qs.Sensitive = true
	qs.Note = w.fenceSensitive(rules, qs.Method, rowsHolding(w, vals, cv, 20))
}
