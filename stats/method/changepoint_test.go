package method

import (
	"math"
	"testing"
)

// Pettitt's test against the statistic written out in R 4.2.2
// (testdata/rref/control.R), and the approximate p-value against a
// permutation p-value (2000 permutations, seed 7) computed there: the
// approximation must agree within 0.05 where p < 0.5, where Pettitt (1979)
// says it is good.
func TestPettittAgainstR(t *testing.T) {
	ref := ctlRef(t)
	for set, d := range ctlDecimals {
		m := ref[set]
		x := ctlSeries(t, m, "x")
		cp, err := PettittChange(x)
		if err != nil {
			t.Fatal(err)
		}
		if float64(cp.Index) != m["pettitt.t"] || cp.Statistic != m["pettitt.k"] {
			t.Errorf("%s: index %d K %g, R %g %g", set, cp.Index, cp.Statistic, m["pettitt.t"], m["pettitt.k"])
		}
		ctlClose(t, set+" p", cp.P, m["pettitt.p"], 1e-12)
		ctlClose(t, set+" before", cp.MeanBefore, m["pettitt.before"], 1e-13)
		ctlClose(t, set+" after", cp.MeanAfter, m["pettitt.after"], 1e-13)
		if cp.P < 0.5 && math.Abs(cp.P-m["pettitt.pperm"]) > 0.05 {
			t.Errorf("%s: p %g, permutation %g", set, cp.P, m["pettitt.pperm"])
		}
		cm, _ := PettittChange(ctlMantissas(x, d))
		if cm.Index != cp.Index || cm.Statistic != cp.Statistic {
			t.Errorf("%s: int64 path %+v", set, cm)
		}
	}
}

func TestPettittEdges(t *testing.T) {
	if _, err := PettittChange([]float64{1}); err == nil {
		t.Error("n=1: no error")
	}
	c, err := PettittChange([]float64{3, 3, 3})
	if err != nil || c.Statistic != 0 || c.P != 1 || c.Index != 1 {
		t.Errorf("constant: %+v %v", c, err)
	}
	two, err := PettittChange([]int64{1, 5})
	if err != nil || two.Index != 1 || two.MeanBefore != 1 || two.MeanAfter != 5 {
		t.Errorf("two: %+v %v", two, err)
	}
}
