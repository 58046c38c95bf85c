package method

import (
	"math"
	"strconv"
	"testing"
)

func TestConformanceAgainstR(t *testing.T) {
	ref := capRef(t)
	r := ref["conform"] // R 4.2.2: counts on the mantissas, qbeta and binom.test intervals
	x := capData(t)["norm50"]
	m := make([]int64, len(x))
	for i, v := range x {
		m[i] = int64(math.Round(v * 1000)) // the data have 3 decimals
	}
	lsl, usl := int64(r["lsl_m"]), int64(r["usl_m"])
	c, err := ConformanceCount(m, &lsl, &usl, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	if float64(c.Below.K) != r["below"] || float64(c.Above.K) != r["above"] || c.N != 50 {
		t.Fatalf("counts %d %d, want %v %v", c.Below.K, c.Above.K, r["below"], r["above"])
	}
	for name, ci := range map[string]ConformInterval{"below": c.Below, "above": c.Above, "outside": c.Outside} {
		capCheck(t, name+" lo", ci.Lower, r[name+"_lo"], 1e-12)
		capCheck(t, name+" hi", ci.Upper, r[name+"_hi"], 1e-12)
		capCheck(t, name+" ub", ci.UpperBound, r[name+"_ub"], 1e-12)
		capCheck(t, name+" lo (binom.test)", ci.Lower, r[name+"_binomtest_lo"], 1e-12)
		capCheck(t, name+" hi (binom.test)", ci.Upper, r[name+"_binomtest_hi"], 1e-12)
	}
	for _, k := range []int{0, 1, 7, 500} {
		ci, err := ConformCI(k, 500, 0.90)
		if err != nil {
			t.Fatal(err)
		}
		w := ref["cp_"+strconv.Itoa(k)+"_500_90"]
		capCheck(t, "lo", ci.Lower, w["lo"], 1e-12)
		capCheck(t, "hi", ci.Upper, w["hi"], 1e-12)
		capCheck(t, "ub", ci.UpperBound, w["ub"], 1e-12)
	}
	if got := SpecPPM(c.Outside.UpperBound); math.Abs(got-1e6*r["outside_ub"]) > 1e-6 {
		t.Errorf("ppm %v", got)
	}
}

func TestConformanceExactAndEdges(t *testing.T) {
	// A reading equal to a limit conforms (common practice); 10.005 typed
	// with 3 decimals is the mantissa 10005, decided without binary rounding.
	vals := []int64{10004, 10005, 10006, 9995, 9994}
	lsl, usl := int64(9995), int64(10005)
	c, err := ConformanceCount(vals, &lsl, &usl, 0.95)
	if err != nil || c.Below.K != 1 || c.Above.K != 1 || c.Outside.K != 2 {
		t.Fatalf("%v %+v", err, c)
	}
	// One-sided: only the LSL.
	c, err = ConformanceCount(vals, &lsl, nil, 0.95)
	if err != nil || c.HasUSL || c.Above.K != 0 || c.Below.K != 1 {
		t.Fatalf("one-sided: %v %+v", err, c)
	}
	// All beyond a limit: K = N, upper limits 1.
	hi := int64(0)
	c, err = ConformanceCount(vals, nil, &hi, 0.95)
	if err != nil || c.Above.K != 5 || c.Above.Upper != 1 || c.Above.UpperBound != 1 || !(c.Above.Lower > 0) {
		t.Fatalf("all above: %v %+v", err, c.Above)
	}
	// n = 2.
	if c, err = ConformanceCount(vals[:2], &lsl, &usl, 0.95); err != nil || c.Outside.K != 0 {
		t.Fatalf("n=2: %v %+v", err, c)
	}
	// Errors.
	if _, err := ConformanceCount(vals, &usl, &lsl, 0.95); err != ErrSpecInsideOut {
		t.Errorf("inside out: %v", err)
	}
	if _, err := ConformanceCount(vals, nil, nil, 0.95); err != ErrSpecNoLimit {
		t.Errorf("no limit: %v", err)
	}
	if _, err := ConformanceCount(nil, &lsl, nil, 0.95); err != ErrCapTooFew {
		t.Errorf("empty: %v", err)
	}
	if _, err := ConformanceCount(vals, &lsl, nil, 0); err != ErrCapLevel {
		t.Errorf("level 0: %v", err)
	}
	if _, err := ConformanceFromCounts(10, 3, 0, false, true, 0.95); err == nil {
		t.Error("count below without an LSL: no error")
	}
}

func TestExpectedOutsideNormalAgainstR(t *testing.T) {
	r := capRef(t)["expected"] // R 4.2.2 pnorm
	e, err := ExpectedOutsideNormal(r["mean"], r["sd"], 9.75, 10.3)
	if err != nil {
		t.Fatal(err)
	}
	capCheck(t, "below", e.Below, r["below"], 1e-14)
	capCheck(t, "above", e.Above, r["above"], 1e-14)
	capCheck(t, "total", e.Total, r["below"]+r["above"], 1e-14)
	e, _ = ExpectedOutsideNormal(12, 0.03, 9.75, math.NaN())
	if e.Below != r["far_below"] || e.Above != 0 {
		t.Errorf("far tail / one-sided: %+v", e)
	}
	// Φ(-30) = 4.906713927148187e-198 (R 4.2.2: pnorm(-30)): tails keep precision.
	e, _ = ExpectedOutsideNormal(0, 1, -30, math.NaN())
	capCheck(t, "Φ(-30)·1e198", e.Below*1e198, 4.906713927148187, 1e-12)
	if _, err := ExpectedOutsideNormal(0, 0, -1, 1); err != ErrCapInput {
		t.Errorf("sigma 0: %v", err)
	}
}
