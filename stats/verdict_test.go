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
		{"13-tiny-n3.txt", "mean-sd", "small-sample"},
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
	// warnings: heavy ties (common practice: fewer than 10 distinct values)
	rep := analyzeFile(t, "../testdata/sets/09-coarse-ties-n50.txt", Options{})
	if w := codes(rep.Verdict.Warnings); !strings.Contains(w, "heavy-ties") {
		t.Errorf("09: warnings %q", w)
	}
	// small sample warning below 20 values (common practice)
	rep = analyzeFile(t, "../testdata/sets/15-small-n8.txt", Options{})
	if w := codes(rep.Verdict.Warnings); !strings.Contains(w, "small-sample") {
		t.Errorf("15: warnings %q", w)
	}
}
