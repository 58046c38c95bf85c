package stats

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
)

// Rosner's (1983) example of 54 values, as reproduced in the NIST/SEMATECH
// e-Handbook of Statistical Methods, 1.3.5.17.3 (generalized ESD test):
// published R_i and λ_i (3 decimals) and 3 outliers at α = 0.05. Our cap
// tests 5 suspects for n = 54; the handbook tests 10, with the same first 5
// steps.
func TestGESDRosnerExample(t *testing.T) {
	x := []float64{-0.25, 0.68, 0.94, 1.15, 1.20, 1.26, 1.26, 1.34, 1.38, 1.43, 1.49, 1.49, 1.55, 1.56, 1.58,
		1.65, 1.69, 1.70, 1.76, 1.77, 1.81, 1.91, 1.94, 1.96, 1.99, 2.06, 2.09, 2.10, 2.14, 2.15, 2.23, 2.24,
		2.26, 2.35, 2.37, 2.40, 2.47, 2.54, 2.62, 2.64, 2.90, 2.92, 2.92, 2.93, 3.21, 3.26, 3.30, 3.59, 3.68,
		4.30, 4.64, 5.34, 5.42, 6.01}
	if len(x) != 54 {
		t.Fatal("data")
	}
	fs := newFlagSet(len(x), 0)
	rule := gesdRule(words{}, x, 0.05, fs)
	flags := fs.m
	if rule.Count != 3 {
		t.Fatalf("GESD count %d, published 3", rule.Count)
	}
	// Published (NIST/SEMATECH e-Handbook 1.3.5.17.3): R1..R3 for the
	// flagged values 6.01, 5.42, 5.34.
	want := map[float64]float64{6.01: 3.118, 5.42: 2.942, 5.34: 3.179}
	for i, fs := range flags {
		w, ok := want[x[i]]
		if !ok {
			t.Errorf("flagged %v, not in the published list", x[i])
			continue
		}
		if math.Abs(fs[0].Score-w) > 0.002 {
			t.Errorf("R for %v = %.4f, published %.3f", x[i], fs[0].Score, w)
		}
	}
	if len(flags) != 3 {
		t.Errorf("%d flags", len(flags))
	}
}

// Rules on a small hand-made set: the values and fences follow from the
// definitions (common practice for Tukey's fences; Iglewicz and Hoaglin 1993).
func TestOutlierRulesDefinitions(t *testing.T) {
	x := []float64{1, 2, 3, 4, 5, 6, 7, 8, 9, 30}
	// type 7: q1 = 3.25, q3 = 7.75, IQR 4.5: inner hi 14.5, outer hi 21.25
	rules, flags, _, _ := outlierRules(words{}, binarySample(x), 0.05, len(x))
	got := map[string]Rule{}
	for _, r := range rules {
		got[r.Code] = r
	}
	if r := got["tukey-inner"]; r.Count != 1 || *r.Hi != 14.5 {
		t.Errorf("inner: %+v", r)
	}
	if r := got["tukey-outer"]; r.Count != 1 || *r.Hi != 21.25 {
		t.Errorf("outer: %+v", r)
	}
	// MAD: deviations from 5.5 are 0.5..4.5 and 24.5: median 2.5;
	// M = 0.6745·24.5/2.5 = 6.6101
	if r := got["modified-z"]; r.Count != 1 {
		t.Errorf("modified z: %+v", r)
	}
	fs := flags[9]
	var sawZ, sawInner bool
	for _, f := range fs {
		switch f.Rule {
		case "modified-z":
			sawZ = math.Abs(f.Score-0.6745*24.5/2.5) < 1e-12
		case "tukey-inner":
			sawInner = math.Abs(f.Score-(30-14.5)) < 1e-12 && f.Text == "4.94 IQR above Q3 (outside the inner fence)" // (30-7.75)/4.5
		}
	}
	if !sawZ || !sawInner {
		t.Errorf("flags of 30: %+v", fs)
	}
	if _, ok := flags[0]; ok {
		t.Errorf("1 flagged: %+v", flags[0])
	}
}

// MAD = 0: the modified z-score is not defined and flags nothing.
func TestModifiedZZeroMAD(t *testing.T) {
	x := []float64{5, 5, 5, 5, 5, 5, 7, 9}
	rules, flags, _, _ := outlierRules(words{}, binarySample(x), 0.05, len(x)) // type 7: Q1 5, Q3 5.5, median 5
	for _, r := range rules {
		if r.Code == "modified-z" && (r.Count != 0 || r.Lo != nil || r.Note == "") {
			t.Errorf("modified z with MAD 0: %+v", r)
		}
	}
	for _, fs := range flags {
		for _, f := range fs {
			if f.Rule == "modified-z" {
				t.Errorf("flag with MAD 0: %+v", f)
			}
		}
	}
}

// More flagged readings than the report lists: with an IQR of 0 the fences
// sit on the quartiles and every value off the middle is flagged (common
// practice: Tukey's fences, 1.5 and 3 IQR beyond the quartiles). The rules
// count all 3000, the note gives that number, and the 1000 listed are the
// most extreme: the 500 lowest and the 500 highest, each with its own row
// and text.
func TestSuspectsMoreThanListed(t *testing.T) {
	const side, middle = 1500, 4000
	var vals []string
	for i := 1; i <= side; i++ {
		vals = append(vals, strconv.FormatFloat(5-float64(i)/1000, 'f', 3, 64), strconv.FormatFloat(15+float64(i)/1000, 'f', 3, 64))
	}
	for range middle {
		vals = append(vals, "10.000")
	}
	rand.New(rand.NewPCG(3, 4)).Shuffle(len(vals), func(i, j int) { vals[i], vals[j] = vals[j], vals[i] })
	rep, err := Analyze(Request{Text: strings.Join(vals, "\n")})
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range rep.Suspects.Rules {
		if r.Code == "tukey-inner" && r.Count != 2*side {
			t.Errorf("inner fences flag %d, want %d", r.Count, 2*side)
		}
	}
	want := fmt.Sprintf("%d readings are flagged; the %d most extreme are listed", 2*side, maxSuspects)
	found := false
	for _, nt := range rep.Notes {
		found = found || strings.HasPrefix(nt.Text, want)
	}
	if !found {
		t.Errorf("no note %q in %+v", want, rep.Notes)
	}
	if len(rep.Suspects.Readings) != maxSuspects {
		t.Fatalf("%d readings listed, want %d", len(rep.Suspects.Readings), maxSuspects)
	}
	seen := map[int]bool{}
	for _, s := range rep.Suspects.Readings {
		if vals[s.Row-1] != s.Text || strconv.FormatFloat(s.Value, 'f', 3, 64) != s.Text || seen[s.Row] {
			t.Fatalf("reading %+v: row holds %q", s.Reading, vals[s.Row-1])
		}
		seen[s.Row] = true
		// the 500 most extreme on each side: below 4 or above 16
		if !(s.Value < 4 || s.Value > 16) || len(s.Flags) == 0 {
			t.Errorf("listed %+v, not among the most extreme", s)
		}
	}
}
