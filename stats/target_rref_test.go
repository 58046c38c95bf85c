package stats

import (
	"math"
	"testing"

	"lotlens/stats/decimal"
	"lotlens/stats/internal/rref"
)

// Tests against a target on the 24 invented sets against R 4.2.2:
// t.test and wilcox.test(conf.int = TRUE) with the target chosen in
// testdata/rref/methods.R, and the Hodges-Lehmann pseudo-median by its
// definition (median of the Walsh averages).
func TestTargetR(t *testing.T) {
	ref := rref.Load(t, "methods.tsv", 24)
	checked := 0
	for set, r := range ref {
		x, mean, sd := rref.Set(t, set)
		mu := r["target"]
		tg := targetSection(words{}, x, mean, sd, mu, 0.95, decimal.Grid{}) // binary, as R computes
		if tg.T == nil {
			t.Fatalf("%s: no t test", set)
		}
		cs := []mCheck{
			{"tT", &tg.T.Statistic, 1e-9, 1e-12},
			{"tDF", tg.T.DF, 0, 0},
			{"tP", &tg.T.P, 1e-8, 1e-15},
			{"tLo", &tg.T.CI.Lo, 1e-12, 0},
			{"tHi", &tg.T.CI.Hi, 1e-12, 0},
		}
		w := tg.Wilcoxon
		if w == nil {
			t.Fatalf("%s: no Wilcoxon test", set)
		}
		exact := w.Method == "exact"
		if exact != (r["wExact"] == 1) {
			t.Errorf("%s: Wilcoxon method %q, R 4.2.2 exact = %v", set, w.Method, r["wExact"])
		}
		cs = append(cs, mCheck{"wV", &w.Statistic, 1e-12, 0}, mCheck{"wP", &w.P, 1e-8, 1e-15})
		if _, ok := r["hl"]; ok {
			cs = append(cs, mCheck{"hl", w.Estimate, 1e-12, 1e-15})
		}
		if exact {
			// Exact intervals are Walsh averages of R's exact ranks.
			cs = append(cs, mCheck{"wEst", w.Estimate, 1e-12, 1e-15},
				mCheck{"wLo", &w.CI.Lo, 1e-12, 1e-15}, mCheck{"wHi", &w.CI.Hi, 1e-12, 1e-15})
		} else if w.CI != nil {
			// R finds the approximate interval and estimate by uniroot with
			// tol = 1e-4 on a step function; ours are the Walsh averages at
			// the ranks the same approximation gives (for the estimate, the
			// mean of the two middle ones, where R stops anywhere on the
			// flat stretch between them). They agree to R's tolerance plus
			// two steps of the data's resolution (four Walsh-average steps).
			tol := 1.5e-4 + 2*resolutionOf(x)
			cs = append(cs, mCheck{"wEst", w.Estimate, 0, tol},
				mCheck{"wLo", &w.CI.Lo, 0, tol}, mCheck{"wHi", &w.CI.Hi, 0, tol})
		}
		checked += runChecks(t, set, r, cs)
		if tg.Statement == "" {
			t.Errorf("%s: no statement", set)
		}
		if in := mu >= tg.T.CI.Lo && mu <= tg.T.CI.Hi; in != tg.Inside {
			t.Errorf("%s: Inside = %v", set, tg.Inside)
		}
	}
	if checked < 200 {
		t.Errorf("only %d values checked", checked)
	}
}

// resolutionOf is the smallest gap between distinct sorted values.
func resolutionOf(x []float64) float64 {
	r := math.Inf(1)
	for i := 1; i < len(x); i++ {
		if d := x[i] - x[i-1]; d > 0 && d < r {
			r = d
		}
	}
	return r
}
