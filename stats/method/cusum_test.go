package method

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

// Tabular CUSUM sums against the recursion written out in R 4.2.2
// (testdata/rref/control.R), k = 0.5σ, h = 5σ.
func TestCUSUMAgainstR(t *testing.T) {
	ref := ctlRef(t)
	for _, set := range []string{"ind", "ar", "ties", "small"} {
		m := ref[set]
		x := ctlSeries(t, m, "x")
		ind, _ := Individuals(x, IndividualsOptions{})
		c, err := CUSUM(x, ind.Centre, ind.Sigma.Sigma, 0.5, 5)
		if err != nil {
			t.Fatal(err)
		}
		up, lo := ctlSeries(t, m, "cusum+"), ctlSeries(t, m, "cusum-")
		for i := range x {
			if math.Abs(c.Upper[i]-up[i]) > 1e-12*math.Max(1, up[i]) || math.Abs(c.Lower[i]-lo[i]) > 1e-12*math.Max(1, lo[i]) {
				t.Errorf("%s %d: %g %g, R %g %g", set, i, c.Upper[i], c.Lower[i], up[i], lo[i])
			}
			if (c.Upper[i] == 0) != (c.UpperCount[i] == 0) {
				t.Errorf("%s %d: count %d for sum %g", set, i, c.UpperCount[i], c.Upper[i])
			}
		}
	}
	// The shifted series "ind" (+0.08 after reading 40, σ about 0.055)
	// must signal on the upper side after the shift.
	x := ctlSeries(t, ref["ind"], "x")
	ind, _ := Individuals(x[:40], IndividualsOptions{})
	c, _ := CUSUM(x, ind.Centre, ind.Sigma.Sigma, 0.5, 5)
	if len(c.Beyond) == 0 || c.Beyond[0] < 40 {
		t.Errorf("beyond %v", c.Beyond)
	}
}

// Run lengths: Montgomery (2009) Table 9.3 for k = 0.5, two-sided (from
// memory: h = 4: 168, 26.6, 8.38, 3.34 at shifts 0, 0.5, 1, 2; h = 5:
// 465, 38.0, 10.4, 4.01), and the same Markov chain solved in R 4.2.2.
func TestCUSUMARL(t *testing.T) {
	table := []struct{ h, shift, arl float64 }{
		{4, 0, 168}, {4, 0.5, 26.6}, {4, 1, 8.38}, {4, 2, 3.34},
		{5, 0, 465}, {5, 0.5, 38.0}, {5, 1, 10.4}, {5, 2, 4.01},
	}
	ref := ctlRef(t)
	for _, r := range table {
		got, err := CUSUMARL(0.5, r.h, r.shift)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(got.TwoSided-r.arl) > 0.005*r.arl {
			t.Errorf("h=%g shift %g: ARL %.3f, table %g", r.h, r.shift, got.TwoSided, r.arl)
		}
		if r.shift == 0 && got.Upper != got.Lower {
			t.Errorf("in control: sides differ %g %g", got.Upper, got.Lower)
		}
		if want, ok := ref[fmt.Sprintf("cusum-h%g", r.h)][fmt.Sprintf("arl:%g", r.shift)]; ok {
			ctlClose(t, "CUSUM ARL vs R", got.TwoSided, want, 1e-9)
		}
	}
	for _, bad := range [][2]float64{{-1, 4}, {0.5, 0}, {math.NaN(), 4}} {
		if _, err := CUSUMARL(bad[0], bad[1], 0); err == nil {
			t.Errorf("%v: no error", bad)
		}
	}
}

// ctlPos is the built-in max(0, s) for every s but NaN, bit for bit (so -0
// gives +0, as max does): checked on the edge cases and on random bits.
func TestCtlPos(t *testing.T) {
	same := func(s float64) {
		if got, want := ctlPos(s), max(0, s); math.Float64bits(got) != math.Float64bits(want) {
			t.Errorf("ctlPos(%v) = %v (%#x), max(0, s) = %v", s, got, math.Float64bits(got), want)
		}
	}
	for _, s := range []float64{0, math.Copysign(0, -1), 1, -1, 5e-324, -5e-324, math.MaxFloat64, -math.MaxFloat64, math.Inf(1), math.Inf(-1)} {
		same(s)
	}
	r := rand.New(rand.NewPCG(1, 2))
	for i := 0; i < 100000; i++ {
		if s := math.Float64frombits(r.Uint64()); !math.IsNaN(s) {
			same(s)
		}
	}
}
