package stats

import (
	"slices"
	"strings"
	"testing"

	"lotlens/stats/decimal"
)

// Above 100,000 values the Hodges-Lehmann estimate and interval are left
// out and the method says so; all values equal to the target give no
// Wilcoxon test.
func TestWilcoxonLimits(t *testing.T) {
	n := hlMaxN + 1
	x := make([]float64, n)
	for i := range x {
		x[i] = float64(i%1000) / 10
	}
	slices.Sort(x)
	w := wilcoxonSignedRank(words{}, x, 33.35, 0.95, decimal.Grid{})
	if w == nil || w.Estimate != nil || w.CI != nil || !strings.Contains(w.Method, "100,000") {
		t.Errorf("large n: %+v", w)
	}
	if w := wilcoxonSignedRank(words{}, []float64{2, 2, 2}, 2, 0.95, decimal.Grid{}); w != nil {
		t.Errorf("all zero differences: %+v", w)
	}
	tg := targetSection(words{}, []float64{4.9, 5.0, 5.1, 5.2}, 5.05, 0.12909944487358055, 5, 0.95, decimal.Grid{})
	// mean 5.05 ± t(0.975, 3)·s/√4 = 5.05 ± 0.2054 (R 4.2.2 qt(0.975, 3) = 3.182446)
	if !tg.Inside || !strings.HasPrefix(tg.Statement, "The target 5.0 lies inside the 95% interval for the mean, 4.8 to 5.3.") {
		t.Errorf("statement %q", tg.Statement)
	}
}
