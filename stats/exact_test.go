package stats

import (
	"fmt"
	"lotlens/stats/internal/rref"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// Tests of "exact as typed": every check value is the exact decimal
// computation written out beside it, or the output of a committed script
// (testdata/rref/figures.py with Python fractions, testdata/rref/signrank.R
// with R 4.2.2 on whole-number data).

func ruleByCode(rep *Report, code string) Rule {
	for _, r := range rep.Suspects.Rules {
		if r.Code == code {
			return r
		}
	}
	return Rule{}
}

// A reading on Tukey's fence is on it, not beyond it. By hand: nine values,
// type-7 quartiles at positions 1 + 8/4 = 3 and 1 + 8·3/4 = 7, so Q1 = 10.00
// and Q3 = 10.52; IQR = 0.52, 1.5·0.52 = 0.78, upper inner fence
// 10.52 + 0.78 = 11.30 exactly, which the reading 11.30 does not exceed.
// (In binary the fence is 11.299999999999999 and 11.30 is flagged.)
func TestFenceOnTheReading(t *testing.T) {
	rep, err := Analyze(Request{Text: lines("9.80", "9.90", "10.00", "10.10", "10.20", "10.30", "10.52", "10.60", "11.30")})
	if err != nil {
		t.Fatal(err)
	}
	checkClean(t, rep)
	if rep.Quantile.Q1 != 10 || rep.Quantile.Q3 != 10.52 || rep.Spread.IQR != 0.52 {
		t.Fatalf("quartiles %v %v IQR %v, by hand 10.00, 10.52, 0.52", rep.Quantile.Q1, rep.Quantile.Q3, rep.Spread.IQR)
	}
	inner := ruleByCode(rep, "tukey-inner")
	if inner.Count != 0 || inner.Hi == nil || *inner.Hi != 11.3 {
		t.Errorf("inner fence rule %+v (Hi %v): by hand the fence is 11.30 and nothing lies beyond it", inner, deref(inner.Hi))
	}
	for _, s := range rep.Suspects.Readings {
		for _, f := range s.Flags {
			if strings.HasPrefix(f.Rule, "tukey") {
				t.Errorf("reading %s flagged by %s", s.Text, f.Rule)
			}
		}
	}
	b := rep.Charts.Box
	if b.InnerHi != 11.3 || b.HiWhisker != 11.3 {
		t.Errorf("box: inner fence %v, whisker %v; by hand both 11.3", b.InnerHi, b.HiWhisker)
	}
	// lower fence 10.00 - 0.78 = 9.22; outer fences 10.00 - 1.56 = 8.44, 10.52 + 1.56 = 12.08
	if b.InnerLo != 9.22 || b.OuterLo != 8.44 || b.OuterHi != 12.08 {
		t.Errorf("box fences %+v, by hand 9.22, 8.44, 12.08", b)
	}
	for _, r := range rep.Verdict.Reasons {
		if r.Code == "beyond-outer-fence" || r.Code == "many-beyond-inner-fence" {
			t.Errorf("verdict reason %s", r.Code)
		}
	}
}

func deref(p *float64) any {
	if p == nil {
		return nil
	}
	return *p
}

// IQR, MAD and fences are reported as the exact decimals. By hand: 12.31,
// 12.31, 12.33, 12.34, 12.50; type-7 quartiles are the 2nd and 4th values,
// Q1 = 12.31 and Q3 = 12.34, IQR 0.03 (binary: 0.030000000000001137);
// median 12.33, |x - median| = 0.02, 0.02, 0, 0.01, 0.17 with median 0.02,
// MAD = 1.4826·0.02 = 0.029652; fences 12.31 - 0.045 = 12.265,
// 12.34 + 0.045 = 12.385, 12.31 - 0.09 = 12.22, 12.34 + 0.09 = 12.43.
func TestFiguresShownExactly(t *testing.T) {
	rep, err := Analyze(Request{Text: lines("12.31", "12.31", "12.33", "12.34", "12.50")})
	if err != nil {
		t.Fatal(err)
	}
	s, b := rep.Spread, rep.Charts.Box
	if s.IQR != 0.03 || s.MAD != 0.029652 {
		t.Errorf("IQR %v MAD %v, by hand 0.03 and 0.029652", s.IQR, s.MAD)
	}
	if b.InnerLo != 12.265 || b.InnerHi != 12.385 || b.OuterLo != 12.22 || b.OuterHi != 12.43 {
		t.Errorf("fences %+v, by hand 12.265, 12.385, 12.22, 12.43", b)
	}
	if r := ruleByCode(rep, "tukey-inner"); r.Count != 1 || *r.Lo != 12.265 || *r.Hi != 12.385 {
		t.Errorf("inner rule %+v", r)
	}
	// range 12.50 - 12.31 = 0.19 (binary: 0.1899999999999995)
	if s.Range != 0.19 {
		t.Errorf("range %v, by hand 0.19", s.Range)
	}
}

// figuresRef reads testdata/rref/figures.tsv (Python fractions, exact).
func figuresRef(t *testing.T) map[string]map[string]float64 {
	t.Helper()
	return rref.Load(t, "figures.tsv", 20)
}

// Every quantile definition, the hinges, the median, the MAD, the IQR, the
// fences and the count beyond the inner fences equal the exact figures of
// the decimals as typed, bit for bit (testdata/rref/figures.py).
func TestExactFigures(t *testing.T) {
	ref := figuresRef(t)
	for set, r := range ref {
		for ty := 1; ty <= 9; ty++ {
			code := fmt.Sprintf("hf%d", ty)
			rep := analyzeFile(t, filepath.Join("../testdata/sets", set), Options{Quantile: code})
			q := rep.Quantile
			chk := func(name string, got float64) {
				t.Helper()
				if want, ok := r[name]; !ok {
					t.Fatalf("%s: no reference %s", set, name)
				} else if got != want {
					t.Errorf("%s %s %s = %.17g, exact %.17g", set, code, name, got, want)
				}
			}
			chk(fmt.Sprintf("q%d_0.25", ty), q.Q1)
			chk(fmt.Sprintf("q%d_0.5", ty), q.Median)
			chk(fmt.Sprintf("q%d_0.75", ty), q.Q3)
			for i, p := range q.Percentiles {
				chk(fmt.Sprintf("q%d_%s", ty, strconv.FormatFloat(percentileProbs[i], 'g', -1, 64)), p.Value)
			}
			chk("median", rep.Centre.Median)
			chk("mad", rep.Spread.MAD)
			chk("hinge_lo", q.All[9].Q1)
			chk("hinge_med", q.All[9].Median)
			chk("hinge_hi", q.All[9].Q3)
			if ty == 7 {
				chk("iqr7", rep.Spread.IQR)
				b := rep.Charts.Box
				chk("innerLo", b.InnerLo)
				chk("innerHi", b.InnerHi)
				chk("outerLo", b.OuterLo)
				chk("outerHi", b.OuterHi)
				chk("beyondInner", float64(ruleByCode(rep, "tukey-inner").Count))
			}
		}
	}
}

// Skewness and kurtosis carry at least 14 correct digits against exact
// rational arithmetic (testdata/rref/figures.py), on the offset set
// 25-offset-milli-n500 (values near 1,000,000.5 typed to 0.001) and on
// every other set.
func TestExactShapeLRE(t *testing.T) {
	ref := figuresRef(t)
	if _, ok := ref["25-offset-milli-n500.txt"]; !ok {
		t.Fatal("no offset set in figures.tsv")
	}
	for set, r := range ref {
		if _, ok := r["G1"]; !ok {
			continue
		}
		rep := analyzeFile(t, filepath.Join("../testdata/sets", set), Options{})
		if rep.Shape == nil || rep.Shape.Skewness == nil || rep.Shape.Kurtosis == nil {
			t.Errorf("%s: no shape", set)
			continue
		}
		for _, c := range []struct {
			name string
			got  float64
		}{{"G1", rep.Shape.Skewness.Value}, {"G2", rep.Shape.Kurtosis.Value}} {
			if l := lre(c.got, r[c.name]); l < 14 {
				t.Errorf("%s %s = %.17g, exact %.17g: LRE %.1f < 14", set, c.name, c.got, r[c.name], l)
			}
		}
	}
}

// The signed-rank test decides ties and zeros on the decimals as typed: on
// the 0.1-resolution set 26-coarse-tenths-n50 around the target 8 (7.9 and
// 8.1 tied), V and p equal R 4.2.2's wilcox.test on the same data scaled
// to whole numbers (testdata/rref/signrank.R), and the Hodges-Lehmann
// estimate is the exact median of the Walsh averages. R on the doubles
// gives another V (595, not 601): the defect this guards against.
func TestSignedRankOnDecimals(t *testing.T) {
	r := readSmallTSV(t, filepath.Join("..", "testdata", "rref", "signrank.tsv"))["26-coarse-tenths-n50.txt"]
	target := r["target"]
	rep := analyzeFile(t, "../testdata/sets/26-coarse-tenths-n50.txt", Options{Target: &target})
	w := rep.Target.Wilcoxon
	if w == nil {
		t.Fatal("no signed-rank test")
	}
	if w.Statistic != r["V"] || relErr(w.P, r["p"]) > 1e-12 {
		t.Errorf("V = %v p = %.17g, R 4.2.2 on whole numbers: V = %v p = %.17g", w.Statistic, w.P, r["V"], r["p"])
	}
	if w.Statistic == r["binaryV"] {
		t.Errorf("V = %v equals R's value on the binary doubles", w.Statistic)
	}
	if w.Estimate == nil || *w.Estimate != r["hl"] {
		t.Errorf("estimate %v, exact median of the Walsh averages %v", deref(w.Estimate), r["hl"])
	}
	// R finds the approximate interval by uniroot (tol 1e-4) on a step
	// function; ours are Walsh averages at the ranks of the same normal
	// approximation: equal within R's tolerance on this 0.05-step grid.
	if w.CI == nil || math.Abs(w.CI.Lo-r["lo"]) > 1e-4 || math.Abs(w.CI.Hi-r["hi"]) > 1e-4 {
		t.Errorf("interval %+v, R 4.2.2 %v to %v", w.CI, r["lo"], r["hi"])
	}
	if !strings.Contains(w.Method, "tie correction") {
		t.Errorf("method %q: the ties should be seen", w.Method)
	}
}

// One median for the centre. By hand: 1..8 has the middle values 4 and 5,
// the usual median 4.5; Hyndman-Fan types 1 and 3 take the 4th value (4),
// type 4 interpolates at n·p = 4 (4 as well). The centre keeps 4.5 under
// every definition, the quantile section follows the definition, and a
// Note says why the two differ.
func TestMedianAgreement(t *testing.T) {
	data := lines("1", "2", "3", "4", "5", "6", "7", "8")
	for _, code := range QuantileMethods {
		rep, err := Analyze(Request{Text: data, Options: Options{Quantile: code}})
		if err != nil {
			t.Fatal(err)
		}
		want := 4.5
		if code == "hf1" || code == "hf3" || code == "hf4" {
			want = 4
		}
		if rep.Centre.Median != 4.5 || rep.Quantile.Median != want {
			t.Errorf("%s: centre median %v, quantile median %v; by hand 4.5 and %v", code, rep.Centre.Median, rep.Quantile.Median, want)
		}
		noted := false
		for _, n := range rep.Notes {
			noted = noted || n.Field == "quantiles.median"
		}
		if noted != (want != 4.5) {
			t.Errorf("%s: note on the two medians %v, want %v", code, noted, want != 4.5)
		}
		name, _, _ := strings.Cut(quantileNames(code), ":")
		if r := ruleByCode(rep, "tukey-inner"); !strings.Contains(r.Note, "quartiles by "+name) || strings.Contains(r.Note, code) {
			t.Errorf("%s: the fence rule does not name the quartile definition: %q", code, r.Note)
		}
	}
}

// Three readings say nothing about a coarse step: 4.09, 4.12, 4.15 typed
// to 0.01 move in steps of the typed 0.01 (stepMinDistinct, 11 distinct
// values), so no warning about steps of 0.03 appears, even with a
// tolerance of 0.2 (20 steps of 0.01; common practice asks for 10).
func TestResolutionFewReadings(t *testing.T) {
	lsl, usl := 4.0, 4.2
	rep, err := Analyze(Request{Text: lines("4.09", "4.12", "4.15"), Options: Options{LSL: &lsl, USL: &usl}})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Counts.Step != 0.01 || rep.Counts.Resolution != 0.01 {
		t.Errorf("step %v resolution %v, want the typed 0.01", rep.Counts.Step, rep.Counts.Resolution)
	}
	for _, w := range rep.Verdict.Warnings {
		if strings.HasPrefix(w.Code, "coarse") || strings.Contains(w.Text, "0.03") {
			t.Errorf("warning %s: %s", w.Code, w.Text)
		}
	}
	// With enough readings the gaps do say more: 12 distinct values on a
	// 0.03 grid typed to 0.01 move in steps of 0.03 (by hand).
	var v []string
	for i := 0; i < 12; i++ {
		v = append(v, strconv.FormatFloat(4.00+0.03*float64(i), 'f', 2, 64))
	}
	rep, _ = Analyze(Request{Text: lines(v...)})
	if rep.Counts.Step != 0.03 {
		t.Errorf("12 values on a 0.03 grid: step %v", rep.Counts.Step)
	}
}

// Values near 1e308 keep the centre: the median, the mean and what else
// fits stay; only the interval that overflows is omitted, with a Note.
// Subnormal values are neither "all equal" nor beyond double precision.
// By hand: the median of 1.1e308, 1.2e308, 1.3e308, 1.7e308 is
// (1.2e308 + 1.3e308)/2 = 1.25e308.
func TestExtremeMagnitudes(t *testing.T) {
	rep, err := Analyze(Request{Text: lines("1.1e308", "1.2e308", "1.3e308", "1.7e308")})
	if err != nil {
		t.Fatal(err)
	}
	checkClean(t, rep)
	if rep.Centre == nil {
		t.Fatalf("centre removed: notes %+v", rep.Notes)
	}
	if rep.Centre.Median != 1.25e308 {
		t.Errorf("median %v, by hand 1.25e308", rep.Centre.Median)
	}
	for _, n := range rep.Notes {
		if n.Field == "centre" {
			t.Errorf("note %+v", n)
		}
	}
	for _, text := range []string{lines("5e-324", "1e-320", "2e-320"), lines("4e-320", "5e-320", "6e-320")} {
		rep, err := Analyze(Request{Text: text})
		if err != nil {
			t.Fatal(err)
		}
		checkClean(t, rep)
		for _, r := range append(rep.Verdict.Reasons, rep.Verdict.Warnings...) {
			if r.Code == "constant" {
				t.Errorf("%q: called all equal: %s", text, r.Text)
			}
		}
		for _, n := range rep.Notes {
			if strings.Contains(n.Text, "double-precision") || strings.Contains(n.Text, "all values are equal") || strings.Contains(n.Text, "all equal") {
				t.Errorf("%q: note %+v", text, n)
			}
		}
		if rep.Spread == nil || !(rep.Spread.SD > 0) || rep.Shape == nil {
			t.Errorf("%q: spread %+v shape %+v", text, rep.Spread, rep.Shape)
		}
	}
}

// readSmallTSV reads a reference table of the testdata/rref form
// (set<TAB>statistic<TAB>value after a header line) of any size.
func readSmallTSV(t *testing.T, path string) map[string]map[string]float64 {
	t.Helper()
	b, err := osReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	out := map[string]map[string]float64{}
	for _, ln := range strings.Split(strings.TrimSpace(string(b)), "\n")[1:] {
		p := strings.Split(ln, "\t")
		if len(p) != 3 {
			t.Fatalf("%s: bad line %q", path, ln)
		}
		v, err := strconv.ParseFloat(p[2], 64)
		if err != nil {
			t.Fatal(err)
		}
		if out[p[0]] == nil {
			out[p[0]] = map[string]float64{}
		}
		out[p[0]][p[1]] = v
	}
	return out
}

// Exponent-form input keeps the binary path and the report says so; plain
// decimals do not carry that note.
func TestBinaryFallbackNoted(t *testing.T) {
	has := func(rep *Report) bool {
		for _, n := range rep.Notes {
			if n.Field == "counts.decimals" && strings.Contains(n.Text, "binary floating point") {
				return true
			}
		}
		return false
	}
	rep, _ := Analyze(Request{Text: lines("1.2e1", "13", "14.5", "12.25")})
	if !has(rep) {
		t.Errorf("exponent form: no note in %+v", rep.Notes)
	}
	rep, _ = Analyze(Request{Text: lines("12", "13", "14.5", "12.25")})
	if has(rep) {
		t.Errorf("plain decimals: note %+v", rep.Notes)
	}
}
