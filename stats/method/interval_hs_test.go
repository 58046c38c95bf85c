package method

import (
	"math"
	"strconv"
	"strings"
	"testing"

	"lotlens/stats/internal/rref"
)

// The interpolated median interval (Hettmansperger and Sheather 1986)
// against the formula written out in R 4.2.2 (testdata/rref/medianci.R) on
// invented sets at 90, 95 and 99%, with the exact interval and its achieved
// level from MedianInterval.
func TestMedianIntervalInterpolatedR(t *testing.T) {
	ref := rref.Load(t, "medianci.tsv", 10)
	for key, r := range ref {
		set, lv, _ := strings.Cut(key, "@")
		conf, _ := strconv.ParseFloat(lv, 64)
		x, _, _ := rref.Set(t, set)
		n := len(x)
		k, level, reached := MedianInterval(n, conf)
		if !reached || k != int(r["k"]) || math.Abs(level-r["level"]) > 1e-12 {
			t.Errorf("%s: k %d level %.15g, R 4.2.2: k %v level %.15g", key, k, level, r["k"], r["level"])
			continue
		}
		lo, hi, ok := MedianIntervalInterpolated(x, conf)
		if !ok {
			t.Errorf("%s: no interpolated interval", key)
			continue
		}
		tol := 1e-12 * math.Max(1, math.Abs(r["hi"]))
		if math.Abs(lo-r["lo"]) > tol || math.Abs(hi-r["hi"]) > tol {
			t.Errorf("%s: [%.17g, %.17g], R 4.2.2 [%.17g, %.17g]", key, lo, hi, r["lo"], r["hi"])
		}
		// inside the exact interval
		if lo < x[k-1] || hi > x[n-k] {
			t.Errorf("%s: interpolated interval outside the exact one", key)
		}
	}
	// Not reachable: 5 values at 99% (the widest interval reaches 93.75%,
	// 1 - 2/32, Binomial(5, 1/2) from memory).
	if _, _, ok := MedianIntervalInterpolated([]float64{1, 2, 3, 4, 5}, 0.99); ok {
		t.Error("5 values at 99%: interpolation should not apply")
	}
}
