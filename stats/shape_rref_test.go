package stats

import (
	"lotlens/stats/internal/rref"
	"testing"

	"lotlens/stats/method"
)

// Reference values for the methods: testdata/rref/methods.tsv, written by
// testdata/rref/methods.R with R 4.2.2 (r-cran-nortest 1.0-4,
// r-cran-robustbase 0.95-0) from the invented sets in testdata/sets.

type mCheck struct {
	stat     string
	got      *float64
	rel, abs float64
}

func runChecks(t *testing.T, set string, ref map[string]float64, cs []mCheck) int {
	t.Helper()
	n := 0
	for _, c := range cs {
		want, ok := ref[c.stat]
		if !ok {
			if c.got != nil {
				t.Errorf("%s %s: we give %v where R 4.2.2 gives none", set, c.stat, *c.got)
			}
			continue
		}
		if c.got == nil {
			t.Errorf("%s %s: missing, R 4.2.2 gives %.17g", set, c.stat, want)
			continue
		}
		if !rref.Close(*c.got, want, c.rel, c.abs) {
			t.Errorf("%s %s = %.17g, R 4.2.2 gives %.17g", set, c.stat, *c.got, want)
		}
		n++
	}
	return n
}

func fp(x float64) *float64 { return &x }

// Shape statistics on the 24 invented sets against R 4.2.2: moments and
// D'Agostino tests by their published formulas in R, shapiro.test and
// nortest::ad.test.
func TestShapeR(t *testing.T) {
	ref := rref.Load(t, "methods.tsv", 24)
	checked := 0
	for set, r := range ref {
		x, mean, sd := rref.Set(t, set)
		sh, _ := shapeSection(words{}, x, mean, sd, powerSumsFor(x))
		var cs []mCheck
		// R's moments on the offset set carry about 9 significant digits
		// (binary sums of powers of values near 1e6); ours are exact
		// (TestExactShapeLRE checks 14 digits against Python fractions).
		loose := set == "12-offset-n200.txt"
		add := func(stat string, got *float64, rel, abs float64) {
			if loose && rel > 0 && stat != "swW" && stat != "swP" && stat != "adA" && stat != "adP" && stat != "SES" && stat != "SEK" {
				rel = 1e-7
			}
			cs = append(cs, mCheck{stat, got, rel, abs})
		}
		if sh.Skewness != nil {
			add("G1", &sh.Skewness.Value, 1e-9, 1e-12)
			add("SES", &sh.Skewness.SE, 1e-12, 0)
			if tt := sh.Skewness.Test; tt != nil {
				add("skewZ", &tt.Statistic, 1e-9, 1e-12)
				add("skewP", &tt.P, 1e-8, 1e-15)
			} else {
				add("skewZ", nil, 0, 0)
			}
		} else {
			add("G1", nil, 0, 0)
		}
		if sh.Kurtosis != nil {
			add("G2", &sh.Kurtosis.Value, 1e-9, 1e-12)
			add("SEK", &sh.Kurtosis.SE, 1e-12, 0)
			if tt := sh.Kurtosis.Test; tt != nil {
				add("kurtZ", &tt.Statistic, 1e-9, 1e-12)
				add("kurtP", &tt.P, 1e-8, 1e-15)
			} else {
				add("kurtZ", nil, 0, 0)
			}
		} else {
			add("G2", nil, 0, 0)
		}
		if sh.Omnibus != nil {
			add("K2", &sh.Omnibus.Statistic, 1e-9, 1e-12)
			add("K2P", &sh.Omnibus.P, 1e-8, 1e-15)
		} else {
			add("K2", nil, 0, 0)
		}
		if sh.Shapiro != nil {
			add("swW", &sh.Shapiro.Statistic, 1e-10, 0)
			add("swP", &sh.Shapiro.P, 1e-7, 1e-15)
		} else {
			add("swW", nil, 0, 0)
		}
		if sh.Anderson != nil {
			add("adA", &sh.Anderson.Statistic, 1e-9, 1e-12)
			add("adP", &sh.Anderson.P, 1e-8, 1e-15)
		} else {
			add("adA", nil, 0, 0)
		}
		if len(x) > method.ShapiroMaxN && (sh.Large == nil || sh.Large.Statistic != sh.Omnibus.Statistic) {
			t.Errorf("%s: above 5000 values the large-sample test should be the K² test", set)
		}
		checked += runChecks(t, set, r, cs)
	}
	if checked < 200 {
		t.Errorf("only %d shape values checked", checked)
	}
}
