package stats

import (
	"math"
	"strconv"
	"strings"
	"testing"

	"lotlens/stats/internal/rref"
	"lotlens/stats/method"
)

// The leading suspect rule on invented torque readings (testdata/suspects,
// see its README): 60 readings at 0.01 with two planted outliers (rows 21
// and 42), where the adjusted box plot flags five ordinary readings because
// the medcouple comes out at -0.20 on tied, rounded data; and the same
// readings rounded to 0.02. The figures (medcouple, medcouple with the ties
// spread, counts, Shapiro-Wilk p of the readings inside the outer fences)
// are R 4.2.2's (testdata/rref/suspects.R); the expected choice follows the
// rule documented in leadRule (our rule; the thresholds are common practice
// or from memory, as said there).
func TestLeadRuleTorque(t *testing.T) {
	ref := rref.Load(t, "suspects.tsv", 3)
	counts := func(rep *Report) map[string]int {
		c := map[string]int{}
		for _, r := range rep.Suspects.Rules {
			c[r.Code] = r.Count
		}
		return c
	}
	near := func(what string, got, want, tol float64) {
		t.Helper()
		if math.Abs(got-want) > tol {
			t.Errorf("%s = %.17g, R 4.2.2 gives %.17g", what, got, want)
		}
	}

	// As typed (0.01).
	rep := analyzeFile(t, "../testdata/suspects/torque-tied-n60.txt", Options{})
	r := ref["t01"]
	c := counts(rep)
	if c["tukey-inner"] != int(r["tukeyInner"]) || c["adjusted-box"] != int(r["adjCount"]) {
		t.Fatalf("counts %v, R 4.2.2: Tukey inner %v, adjusted box %v", c, r["tukeyInner"], r["adjCount"])
	}
	l := rep.Suspects.Lead
	if l == nil || l.MC == nil {
		t.Fatal("no lead or no medcouple")
	}
	near("medcouple", *l.MC, r["mc"], 1e-12)
	// |MC| 0.20 < 2·sqrt(1.25/60) = 0.289: not clearly skewed; the 58
	// readings inside the outer fences look normal (R: p = 0.66 >= 0.05),
	// so the generalized ESD leads.
	if l.Rule != "gesd" || l.Reason != "rest-normal" {
		t.Errorf("lead %s (%s), want gesd (rest-normal): %s", l.Rule, l.Reason, l.Text)
	}
	if !strings.Contains(l.Text, "58 readings") || !strings.Contains(l.Text, "p = 0.660") {
		t.Errorf("lead text does not give the check (R: 58 readings, p = %.3f): %s", r["restSWp"], l.Text)
	}
	// The headline counts only the two planted outliers; the five
	// ordinary readings are listed after them, not from the leading rule.
	if l.Count != 2 {
		t.Errorf("headline count %d, want the 2 planted outliers", l.Count)
	}
	lead, also := 0, 0
	for i, s := range rep.Suspects.Readings {
		if s.Lead {
			lead++
			if s.Row != 21 && s.Row != 42 {
				t.Errorf("row %d (%s) counted by the leading rule", s.Row, s.Text)
			}
			if i >= 2 {
				t.Errorf("leading rule's reading at place %d, after others", i)
			}
		} else {
			also++
		}
		for _, f := range s.Flags {
			if f.Lead != (f.Rule == l.Rule) {
				t.Errorf("row %d: flag %s lead=%v", s.Row, f.Rule, f.Lead)
			}
			if strings.Contains(f.Text, "medcouple") || strings.Contains(f.Text, "critical") {
				t.Errorf("row %d: jargon in flag text %q", s.Row, f.Text)
			}
		}
	}
	if lead != 2 || also != int(r["adjCount"])-2 {
		t.Errorf("%d readings from the leading rule and %d others, want 2 and %v", lead, also, r["adjCount"]-2)
	}
	for _, ru := range rep.Suspects.Rules {
		if ru.Plain == "" {
			t.Errorf("rule %s has no plain description", ru.Code)
		}
	}

	// Without both outliers: nothing from the leading rule heads the list;
	// Tukey's fences still flag one reading (R 4.2.2), listed as also flagged.
	rep = analyzeFile(t, "../testdata/suspects/torque-tied-n60.txt", Options{Exclude: []int{21, 42}})
	if rep.Suspects.Lead.Count != 0 {
		t.Errorf("after leaving out both: lead %s counts %d", rep.Suspects.Lead.Rule, rep.Suspects.Lead.Count)
	}
	if got := counts(rep)["tukey-inner"]; got != int(ref["t01-out"]["tukeyInner"]) {
		t.Errorf("after leaving out both: Tukey inner %d, R 4.2.2 %v", got, ref["t01-out"]["tukeyInner"])
	}
	for _, s := range rep.Suspects.Readings {
		if s.Lead {
			t.Errorf("after leaving out both: row %d counted", s.Row)
		}
	}

	// Rounded to 0.02: the medcouple is -1 (R), clearly skewed on its face,
	// but with the ties spread over their 0.02 interval it is -0.36 (R):
	// it moves by more than one standard error, sqrt(1.25/60) = 0.144, so
	// it is not trusted and Tukey's fences lead.
	rep = analyzeFile(t, "../testdata/suspects/torque-step002-n60.txt", Options{})
	r = ref["t02"]
	l = rep.Suspects.Lead
	if l.Rule != "tukey-inner" || l.Reason != "medcouple-unstable" || l.MC == nil || l.MCSpread == nil {
		t.Fatalf("0.02 data: lead %+v, want tukey-inner (medcouple-unstable)", l)
	}
	near("medcouple (0.02)", *l.MC, r["mc"], 1e-12)
	near("medcouple with ties spread (0.02)", *l.MCSpread, r["mcSpread"], 1e-9)
	if c := counts(rep); l.Count != int(r["tukeyInner"]) || c["adjusted-box"] != int(r["adjCount"]) {
		t.Errorf("0.02 data: headline %d, adjusted box %d; R 4.2.2: %v and %v", l.Count, c["adjusted-box"], r["tukeyInner"], r["adjCount"])
	}
	if !strings.Contains(l.Text, "moves to -0.36") || !strings.Contains(l.Text, "rounding") {
		t.Errorf("0.02 data: lead text %q", l.Text)
	}

	// The method on the 0.01 data.
	x := readSetFile(t, "../testdata/suspects/torque-tied-n60.txt")
	mcs, ok := method.MedcoupleTiesSpread(x, 0.01)
	if !ok {
		t.Fatal("MedcoupleTiesSpread failed")
	}
	near("medcouple with ties spread (0.01)", mcs, ref["t01"]["mcSpread"], 1e-9)
}

// A clearly skewed set keeps the adjusted box plot as the leading rule:
// 03-torque-lognormal-n60 (lognormal by construction, testdata/sets/README.md;
// medcouple 0.468 by R 4.2.2's robustbase in testdata/rref/methods.tsv, no
// ties to spread).
func TestLeadRuleSkewed(t *testing.T) {
	rep := analyzeFile(t, "../testdata/sets/03-torque-lognormal-n60.txt", Options{})
	if l := rep.Suspects.Lead; l == nil || l.Rule != "adjusted-box" || l.Reason != "skewed" {
		t.Fatalf("lead %+v, want adjusted-box (skewed)", rep.Suspects.Lead)
	}
	// IQR 0: 09-coarse-ties-n50 (three distinct values): the ESD leads.
	rep = analyzeFile(t, "../testdata/sets/09-coarse-ties-n50.txt", Options{})
	if l := rep.Suspects.Lead; l == nil || l.Rule != "gesd" || l.Reason != "iqr-zero" {
		t.Fatalf("lead %+v, want gesd (iqr-zero)", rep.Suspects.Lead)
	}
}

// readSetFile reads one value a line, sorted.
func readSetFile(t *testing.T, path string) []float64 {
	t.Helper()
	var x []float64
	for _, f := range strings.Fields(mustRead(t, path)) {
		v, err := strconv.ParseFloat(f, 64)
		if err != nil {
			t.Fatal(err)
		}
		x = append(x, v)
	}
	sortStd(x)
	return x
}

// The verdict's shape reason is not driven by far-out readings: the torque
// readings with row 21 moved to 23.90 (20 SD below; row 42 at 24.74, 8 SD
// above) have G1 = -4.85 over all readings but -0.103 inside Tukey's outer
// fences (R 4.2.2, testdata/rref/suspects.R): not "left-skewed", and the
// verdict says that the far-out readings are the reason.
func TestVerdictShapeNotFromFarOut(t *testing.T) {
	ref := rref.Load(t, "suspects.tsv", 3)["t01-far"]
	lines := strings.Fields(mustRead(t, "../testdata/suspects/torque-tied-n60.txt"))
	lines[20] = "23.90"
	rep, err := Analyze(Request{Text: strings.Join(lines, "\n")})
	if err != nil {
		t.Fatal(err)
	}
	if g := rep.Shape.Skewness.Value; math.Abs(g-ref["G1all"]) > 1e-9 {
		t.Fatalf("G1 %v, R 4.2.2 %v", g, ref["G1all"])
	}
	var found bool
	for _, r := range rep.Verdict.Reasons {
		if strings.HasSuffix(r.Code, "-skewed") {
			t.Errorf("shape reason %s: %s", r.Code, r.Text)
		}
		if r.Code == "far-out-not-shape" {
			found = true
			if math.Abs(r.Vals["g1"]-ref["G1rest"]) > 1e-9 || r.Vals["below"] != ref["farBelow"] || r.Vals["above"] != ref["farAbove"] {
				t.Errorf("vals %v, R 4.2.2 G1 rest %v, below %v, above %v", r.Vals, ref["G1rest"], ref["farBelow"], ref["farAbove"])
			}
			if !strings.Contains(r.Text, "two readings far out on opposite sides") || !strings.Contains(r.Text, "roughly symmetric") {
				t.Errorf("text %q", r.Text)
			}
		}
	}
	if !found || rep.Verdict.Quote != "median-iqr" {
		t.Errorf("verdict %s %+v: want median-iqr with far-out-not-shape", rep.Verdict.Quote, rep.Verdict.Reasons)
	}
}

// The quartile-definition warning covers every quartile-based rule: for
// each definition hf1..hf9, a rule is listed in quantiles.differ exactly
// when its counts beyond the fences (below, above) differ from hf7's, the
// counts by R 4.2.2's quantile types (testdata/rref/suspects.R; the
// medcouple by its definition).
func TestQuartileSensitivityAllRules(t *testing.T) {
	ref := rref.Load(t, "suspects.tsv", 3)
	for _, set := range []string{"15-small-n8.txt", "26-coarse-tenths-n50.txt", "02-fill-normal-n250.txt"} {
		rep := analyzeFile(t, "../testdata/sets/"+set, Options{})
		listed := map[string]bool{}
		for _, d := range rep.Quantile.Differ {
			for _, m := range d.Methods {
				listed[d.Rule+"/"+m] = true
			}
		}
		base := ref[set+"@hf7"]
		want := 0
		for k := 1; k <= 9; k++ {
			if k == 7 {
				continue
			}
			m := "hf" + strconv.Itoa(k)
			r := ref[set+"@"+m]
			for _, rule := range []struct{ code, key string }{{"tukey-inner", "inner"}, {"tukey-outer", "outer"}, {"adjusted-box", "adj"}} {
				differs := r[rule.key+"Lo"] != base[rule.key+"Lo"] || r[rule.key+"Hi"] != base[rule.key+"Hi"]
				if differs {
					want++
				}
				if differs != listed[rule.code+"/"+m] {
					t.Errorf("%s: %s under %s: differs by R 4.2.2 %v, listed %v", set, rule.code, m, differs, listed[rule.code+"/"+m])
				}
			}
		}
		if (want > 0) != rep.Quantile.Sensitive || (want > 0 && !strings.Contains(rep.Quantile.Note, "adjusted box plot") && listed["adjusted-box/hf1"]) {
			t.Errorf("%s: sensitive %v, note %q", set, rep.Quantile.Sensitive, rep.Quantile.Note)
		}
	}
}
