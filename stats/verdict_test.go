package stats

import (
	"strings"
	"testing"
)

func codes(rs []Reason) string {
	var s []string
	for _, r := range rs {
		s = append(s, r.Code)
	}
	return strings.Join(s, " ")
}

// TestVerdictRules checks the documented verdict rules on invented sets
// whose shape is known by construction (testdata/sets/README.md); the
// fence counts behind them follow from R 4.2.2's type-7 quartiles
// (testdata/rref/core.tsv).
func TestVerdictRules(t *testing.T) {
	cases := []struct {
		set, quote, reason string
	}{
		{"16-small-n12-outlier.txt", "median-iqr", "beyond-outer-fence"},
		{"17-n20-two-outliers.txt", "median-iqr", "beyond-outer-fence"},
		{"18-n1000-normal.txt", "mean-sd", "no-far-out"},
		{"20-n6000-normal.txt", "mean-sd", "no-far-out"},
		{"13-tiny-n3.txt", "mean-sd", "few-readings"},
		// skewness by construction (lognormal, right-skewed, left-skewed sets)
		{"03-torque-lognormal-n60.txt", "median-iqr", "right-skewed"},
		{"04-seal-rightskew-n120.txt", "median-iqr", "right-skewed"},
		{"05-leftskew-n80.txt", "median-iqr", "left-skewed"},
		{"08-heavytail-t3-n150.txt", "median-iqr", "many-beyond-inner-fence"},
	}
	for _, c := range cases {
		rep := analyzeFile(t, "../testdata/sets/"+c.set, Options{})
		got := codes(rep.Verdict.Reasons)
		if rep.Verdict.Quote != c.quote || !strings.Contains(got, c.reason) {
			t.Errorf("%s: quote %s (%s), want %s with %s", c.set, rep.Verdict.Quote, got, c.quote, c.reason)
		}
		for _, r := range rep.Verdict.Reasons {
			if r.Text == "" {
				t.Errorf("%s: reason %s without text", c.set, r.Code)
			}
		}
		if !strings.Contains(rep.Verdict.Caution, "regulations") {
			t.Errorf("%s: caution missing", c.set)
		}
	}
	// warnings: heavy ties (common practice: fewer than 10 distinct values);
	// set 09 has IQR 0 (R 4.2.2: both type-7 quartiles are 7), so the
	// fences are not used
	rep := analyzeFile(t, "../testdata/sets/09-coarse-ties-n50.txt", Options{})
	if w := codes(rep.Verdict.Warnings); !strings.Contains(w, "heavy-ties") {
		t.Errorf("09: warnings %q", w)
	}
	if rep.Verdict.Quote != "mean-sd" || !strings.Contains(codes(rep.Verdict.Reasons), "iqr-zero") {
		t.Errorf("09: %s %s", rep.Verdict.Quote, codes(rep.Verdict.Reasons))
	}
	// small sample warning below 20 values (common practice)
	rep = analyzeFile(t, "../testdata/sets/15-small-n8.txt", Options{})
	if w := codes(rep.Verdict.Warnings); !strings.Contains(w, "small-sample") {
		t.Errorf("15: warnings %q", w)
	}
}

// One, two and three readings: what the verdict can and cannot say (our
// rules, documented in verdict): one reading quotes the value alone (no
// SD), two and three say what they cannot show; no "Only 1 values".
func TestVerdictFewReadings(t *testing.T) {
	for _, c := range []struct {
		text, quote, code, want string
	}{
		{"5.02", "value", "single-value", "No spread"},
		{"5.02\n5.06", "mean-sd", "few-readings", "Two readings"},
		{"5.02\n5.06\n4.98", "mean-sd", "few-readings", "no test of the shape"},
	} {
		rep, err := Analyze(Request{Text: c.text})
		if err != nil {
			t.Fatal(err)
		}
		v := rep.Verdict
		if v.Quote != c.quote || len(v.Reasons) == 0 || v.Reasons[0].Code != c.code || !strings.Contains(v.Reasons[0].Text, c.want) {
			t.Errorf("%q: quote %s reasons %+v; want %s, %s containing %q", c.text, v.Quote, v.Reasons, c.quote, c.code, c.want)
		}
		for _, r := range append(append([]Reason{}, v.Reasons...), v.Warnings...) {
			if strings.Contains(r.Text, "1 values") || strings.Contains(r.Text, "0.0000") || strings.Contains(r.Text, "far-out") && rep.Counts.Used < 4 {
				t.Errorf("%q: %s: %q", c.text, r.Code, r.Text)
			}
		}
	}
}
