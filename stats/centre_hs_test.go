package stats

import (
	"math"
	"testing"

	"lotlens/stats/internal/rref"
)

// centre.medianCI is at exactly the chosen level (Hettmansperger and
// Sheather 1986, R 4.2.2 in testdata/rref/medianci.R), and
// centre.medianCIExact keeps the exact interval with its achieved level.
func TestCentreMedianCIInterpolated(t *testing.T) {
	ref := rref.Load(t, "medianci.tsv", 10)
	for _, c := range []struct {
		set  string
		conf float64
	}{{"01-bore-normal-n30.txt", 0.95}, {"03-torque-lognormal-n60.txt", 0.90}, {"17-n20-two-outliers.txt", 0.99}} {
		r := ref[c.set+"@"+trimConf(c.conf)]
		rep := analyzeFile(t, "../testdata/sets/"+c.set, Options{Confidence: c.conf})
		ci, ex := rep.Centre.MedianCI, rep.Centre.MedianCIExact
		if ci == nil || ex == nil {
			t.Fatalf("%s: intervals missing", c.set)
		}
		if ci.Level != c.conf || ci.Method != "interpolated-order-statistics" {
			t.Errorf("%s: level %v method %s", c.set, ci.Level, ci.Method)
		}
		if math.Abs(ci.Lo-r["lo"]) > 1e-12*math.Abs(r["lo"]) || math.Abs(ci.Hi-r["hi"]) > 1e-12*math.Abs(r["hi"]) {
			t.Errorf("%s: [%v, %v], R 4.2.2 [%v, %v]", c.set, ci.Lo, ci.Hi, r["lo"], r["hi"])
		}
		if ex.Lo != r["exactLo"] || ex.Hi != r["exactHi"] || math.Abs(ex.Level-r["level"]) > 1e-12 {
			t.Errorf("%s: exact %+v, R 4.2.2 [%v, %v] at %v", c.set, ex, r["exactLo"], r["exactHi"], r["level"])
		}
	}
}

func trimConf(c float64) string {
	switch c {
	case 0.9:
		return "0.9"
	case 0.95:
		return "0.95"
	}
	return "0.99"
}
