package method

import (
	"math"
	"testing"
)

// Individuals chart figures against R 4.2.2 (testdata/rref/control.R):
// mean, MR-bar/d2, median MR/d4 for spans 2 and 3, with all readings and
// with the first half as baseline.
func TestIndividualsAgainstR(t *testing.T) {
	ref := ctlRef(t)
	for _, set := range []string{"ind", "ar", "ties", "small"} {
		m := ref[set]
		x := ctlSeries(t, m, "x")
		ch, err := Individuals(x, IndividualsOptions{})
		if err != nil {
			t.Fatal(err)
		}
		ctlClose(t, set+" centre", ch.Centre, m["all.centre"], 1e-14)
		ctlClose(t, set+" sigma", ch.Sigma.Sigma, m["all.sigma"], 1e-12)
		c2, _ := Constants(2)
		ctlClose(t, set+" MR centre", ch.MRCentre, m["all.mrbar"], 1e-12)
		ctlClose(t, set+" MR upper", ch.MRUpper, c2.D4*m["all.mrbar"], 1e-12)
		ctlClose(t, set+" upper", ch.Upper, m["all.centre"]+3*m["all.sigma"], 1e-13)
		if len(ch.MovingRange) != len(x)-1 || ch.MRLower != 0 {
			t.Errorf("%s: %d moving ranges, MR lower %g", set, len(ch.MovingRange), ch.MRLower)
		}
		half := make([]int, len(x)/2)
		for i := range half {
			half[i] = i
		}
		hb, err := Individuals(x, IndividualsOptions{Baseline: half})
		if err != nil {
			t.Fatal(err)
		}
		ctlClose(t, set+" half centre", hb.Centre, m["half.centre"], 1e-14)
		ctlClose(t, set+" half sigma", hb.Sigma.Sigma, m["half.sigma"], 1e-12)
		if hb.BaselineCount != len(half) || len(hb.MovingRange) != len(x)-1 {
			t.Errorf("%s: baseline %d", set, hb.BaselineCount)
		}
		med, err := Individuals(x, IndividualsOptions{Median: true, Baseline: half})
		if err != nil {
			t.Fatal(err)
		}
		ctlClose(t, set+" half sigma med", med.Sigma.Sigma, m["half.sigmamed"], 1e-12)
		s3, _ := SigmaMovingRange(x, 3, nil)
		ctlClose(t, set+" sigma span 3", s3.Sigma, m["all.sigma3"], 1e-12)
		sm3, _ := SigmaMedianMovingRange(x, 3, nil)
		ctlClose(t, set+" sigma med span 3", sm3.Sigma, m["all.sigmamed3"], 1e-12)
	}
}

// The effective degrees of freedom of MR-bar/d2: about 0.62·(k−1) for long
// series (from memory; our exact-variance form gives 0.605·(k−1)), and
// exactly 1/(2·CV²) for one moving range, CV² = (2 − 4/π)/(4/π) = π/2 − 1.
func TestSigmaMovingRangeDF(t *testing.T) {
	x := make([]float64, 10001)
	for i := range x {
		x[i] = float64(i % 7)
	}
	e, _ := SigmaMovingRange(x, 2, nil)
	if r := e.DF / 10000; r < 0.59 || r > 0.63 {
		t.Errorf("df/(k−1) = %g", r)
	}
	e2, err := SigmaMovingRange([]float64{1, 2}, 2, nil)
	if err != nil {
		t.Fatal(err)
	}
	ctlClose(t, "df for one range", e2.DF, 1/(2*(math.Pi/2-1)), 1e-12)
}

// Subgroup estimators against R 4.2.2: the weighted R-bar and S-bar of
// ASTM E2587 with their Patnaik degrees of freedom and the pooled SD over
// c4, for equal and unequal sizes.
func TestSubgroupSigmaAgainstR(t *testing.T) {
	ref := ctlRef(t)
	for _, set := range []string{"sub-eq", "sub-uneq", "sub-big"} {
		m := ref[set]
		g := ctlGroups(t, m)
		r, err := SigmaRangeBar(g)
		if err != nil {
			t.Fatal(err)
		}
		ctlClose(t, set+" sigma R", r.Sigma, m["sigma.r"], 1e-9)
		ctlClose(t, set+" df R", r.DF, m["df.r"], 1e-8)
		s, _ := SigmaSBar(g)
		ctlClose(t, set+" sigma S", s.Sigma, m["sigma.s"], 1e-12)
		ctlClose(t, set+" df S", s.DF, m["df.s"], 1e-10)
		p, _ := SigmaPooled(g)
		ctlClose(t, set+" sigma pooled", p.Sigma, m["sigma.pooled"], 1e-12)
		ch, err := Subgroups(g, SubgroupOptions{})
		if err != nil {
			t.Fatal(err)
		}
		ctlClose(t, set+" centre", ch.Centre, m["centre"], 1e-14)
		want := SpreadRange
		if set == "sub-big" { // subgroups of 12: the SD chart (common practice: above about 10)
			want = SpreadSD
		}
		if ch.Spread != want {
			t.Errorf("%s: spread chart %d, want %d", set, ch.Spread, want)
		}
	}
	// Equal sizes: the textbook forms R-bar/d2 and the A2, D4 limits (ASTM
	// E2587 factors, computed here).
	m := ref["sub-eq"]
	g := ctlGroups(t, m)
	ch, _ := Subgroups(g, SubgroupOptions{})
	c5, _ := Constants(5)
	ctlClose(t, "R-bar/d2", ch.Sigma.Sigma, m["rbar"]/c5.SmallD2, 1e-9)
	ctlClose(t, "UCL mean", ch.MeanUpper[3], m["centre"]+c5.A2*m["rbar"], 1e-9)
	ctlClose(t, "UCL range", ch.SpreadUpper[3], c5.D4*m["rbar"], 1e-9)
	ctlClose(t, "CL range", ch.SpreadCentre[0], m["rbar"], 1e-9)
	sd, _ := Subgroups(g, SubgroupOptions{Spread: SpreadSD})
	ctlClose(t, "S-bar/c4", sd.Sigma.Sigma, m["sbar"]/c5.C4, 1e-12)
	ctlClose(t, "UCL mean S", sd.MeanUpper[0], m["centre"]+c5.A3*m["sbar"], 1e-9)
	ctlClose(t, "UCL S", sd.SpreadUpper[0], c5.B4*m["sbar"], 1e-9)
}

// Unequal sizes: limits per subgroup, narrower for larger subgroups; a
// baseline of subgroups; subgroups of one reading.
func TestSubgroupsUnequalAndBaseline(t *testing.T) {
	ref := ctlRef(t)
	g := ctlGroups(t, ref["sub-uneq"])
	ch, err := Subgroups(g, SubgroupOptions{})
	if err != nil {
		t.Fatal(err)
	}
	for i := range g {
		hw := ch.MeanUpper[i] - ch.Centre
		ctlClose(t, "half width", hw*math.Sqrt(float64(len(g[i]))), 3*ch.Sigma.Sigma, 1e-12)
	}
	base, err := Subgroups(g, SubgroupOptions{Baseline: []int{0, 1, 2, 3, 4, 5, 6, 7, 8, 9}})
	if err != nil {
		t.Fatal(err)
	}
	r10, _ := SigmaRangeBar(g[:10])
	if base.Sigma != r10 || base.BaselineCount != 10 || len(base.Means) != len(g) {
		t.Errorf("baseline sigma %v, want %v", base.Sigma, r10)
	}
	// Mixed with single readings: those have no spread point.
	mixed := [][]float64{{1, 2, 3}, {4}, {2, 2.5}, {3}}
	mc, err := Subgroups(mixed, SubgroupOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if mc.SpreadUpper[1] != 0 || mc.Spreads[1] != 0 || mc.MeanUpper[1] <= mc.MeanUpper[0] {
		t.Errorf("single-reading subgroup: %+v", mc)
	}
	// All subgroups of size 1: no within-subgroup spread.
	if _, err := Subgroups([][]float64{{1}, {2}, {3}}, SubgroupOptions{}); err == nil {
		t.Error("all of size 1: no error")
	}
	// One subgroup.
	one, err := Subgroups([][]float64{{1, 2, 4}}, SubgroupOptions{})
	if err != nil || one.Sigma.Count != 1 {
		t.Errorf("one subgroup: %v %+v", err, one.Sigma)
	}
	for _, bad := range []SubgroupOptions{{Baseline: []int{99}}, {Baseline: []int{}}, {Width: math.NaN()}} {
		if _, err := Subgroups(g, bad); err == nil {
			t.Errorf("%+v: no error", bad)
		}
	}
	if _, err := Subgroups([][]float64{{1, 2}, {}}, SubgroupOptions{}); err == nil {
		t.Error("empty subgroup: no error")
	}
}

func TestIndividualsEdges(t *testing.T) {
	// n = 1 and a single-point baseline.
	if _, err := Individuals([]float64{5}, IndividualsOptions{}); err == nil {
		t.Error("one reading: no error")
	}
	if _, err := Individuals([]float64{5, 6, 7}, IndividualsOptions{Baseline: []int{1}}); err == nil {
		t.Error("baseline of one: no error")
	}
	// Baseline of 2 points: one moving range.
	ch, err := Individuals([]float64{5, 6, 9, 4}, IndividualsOptions{Baseline: []int{0, 1}})
	if err != nil {
		t.Fatal(err)
	}
	c2, _ := Constants(2)
	ctlClose(t, "sigma from one range", ch.Sigma.Sigma, 1/c2.SmallD2, 1e-15)
	ctlClose(t, "centre", ch.Centre, 5.5, 0)
	// Two baseline points not adjacent: no moving range inside the baseline.
	if _, err := Individuals([]float64{5, 6, 9, 4}, IndividualsOptions{Baseline: []int{0, 2}}); err == nil {
		t.Error("no adjacent baseline pair: no error")
	}
	// Constant data: sigma 0, limits on the centre, no NaN.
	cc, err := Individuals([]float64{2, 2, 2, 2}, IndividualsOptions{})
	if err != nil || cc.Sigma.Sigma != 0 || cc.Upper != 2 || cc.Lower != 2 || cc.Sigma.DF <= 0 {
		t.Errorf("constant: %v %+v", err, cc)
	}
	if _, err := Individuals([]float64{1, 2}, IndividualsOptions{Baseline: []int{-1}}); err == nil {
		t.Error("bad index: no error")
	}
	if _, err := Individuals([]float64{1, 2, 3}, IndividualsOptions{Span: 5}); err == nil {
		t.Error("span longer than the data: no error")
	}
}

// MovingRanges of span w against the definition (max − min of each window).
func TestMovingRangesSpan(t *testing.T) {
	x := []float64{3, 1, 4, 1, 5, 9, 2, 6, 5, 3, 5, 8, 9, 7, 9}
	for w := 2; w <= 6; w++ {
		mr, err := MovingRanges(x, w)
		if err != nil {
			t.Fatal(err)
		}
		for j := range mr {
			lo, hi := x[j], x[j]
			for _, v := range x[j : j+w] {
				lo, hi = math.Min(lo, v), math.Max(hi, v)
			}
			if mr[j] != hi-lo {
				t.Errorf("w=%d j=%d: %g, want %g", w, j, mr[j], hi-lo)
			}
		}
	}
}
