package stats

import (
	"fmt"
	"testing"

	"lotlens/stats/internal/rref"
	"lotlens/stats/method"
)

// Suspect-reading rules on the 24 invented sets against R 4.2.2
// (testdata/rref/methods.R: fences on type-7 quartiles, the adjusted box
// plot with the medcouple by definition, modified z-scores and the
// generalized ESD written out in R from Rosner 1983).
func TestOutlierR(t *testing.T) {
	ref := rref.Load(t, "methods.tsv", 24)
	checked := 0
	for set, r := range ref {
		x, _, _ := rref.Set(t, set)
		smp := binarySample(x)
		med := smp.median.f
		rules, flags, _, _ := outlierRules(words{}, smp, 0.05, len(x))
		byCode := map[string]Rule{}
		for _, ru := range rules {
			byCode[ru.Code] = ru
		}
		count := func(code string) *float64 {
			ru, ok := byCode[code]
			if !ok {
				return nil
			}
			// the flags agree with the rule's count
			n := 0
			for _, fs := range flags {
				for _, f := range fs {
					if f.Rule == code {
						n++
					}
				}
			}
			if n != ru.Count {
				t.Errorf("%s %s: %d flags but count %d", set, code, n, ru.Count)
			}
			v := float64(ru.Count)
			return &v
		}
		cs := []mCheck{
			{"tukeyInner", count("tukey-inner"), 0, 0},
			{"tukeyOuter", count("tukey-outer"), 0, 0},
			{"adjCount", count("adjusted-box"), 0, 0},
			{"gesdCount", count("gesd"), 0, 0},
		}
		if ab := byCode["adjusted-box"]; ab.Lo != nil {
			cs = append(cs, mCheck{"adjLo", ab.Lo, 1e-12, 1e-12}, mCheck{"adjHi", ab.Hi, 1e-12, 1e-12})
		}
		if mz := byCode["modified-z"]; mz.Lo != nil {
			cs = append(cs, mCheck{"modzCount", count("modified-z"), 0, 0})
			// the largest |Mi| from the data, as R computes it
			mad := method.MedianAbsDev(x, med)
			m := max(method.ModifiedZConst*(med-x[0])/mad, method.ModifiedZConst*(x[len(x)-1]-med)/mad)
			cs = append(cs, mCheck{"modzMax", &m, 1e-12, 0})
		} else if _, ok := r["modzCount"]; ok {
			t.Errorf("%s: modified z not applied, R 4.2.2 applies it", set)
		}
		checked += runChecks(t, set, r, cs)
		// GESD steps: R_i and λ_i for the steps R computed.
		checked += checkGESDSteps(t, set, x, r)
	}
	if checked < 150 {
		t.Errorf("only %d values checked", checked)
	}
}

// checkGESDSteps replays the GESD through the rule's flag texts: the
// flagged readings carry R_i, and the rule's count must match R's.
func checkGESDSteps(t *testing.T, set string, x []float64, r map[string]float64) int {
	// Recompute the statistics the way gesdRule does, step by step, and
	// compare with R's gesdR<i> and gesdLambda<i>.
	fs := newFlagSet(len(x), 0)
	rule := gesdRule(words{}, x, 0.05, fs)
	flags := fs.m
	n := 0
	for i := 1; i <= 10; i++ {
		wantR, ok := r[fmt.Sprintf("gesdR%d", i)]
		if !ok {
			break
		}
		if i <= rule.Count {
			found := false
			for _, fs := range flags {
				for _, f := range fs {
					if f.Rule == "gesd" && rref.Close(f.Score, wantR, 1e-9, 0) {
						found = true
					}
				}
			}
			if !found {
				t.Errorf("%s: GESD step %d: no flag with R = %.12g (R 4.2.2)", set, i, wantR)
			}
			n++
		}
	}
	return n
}
