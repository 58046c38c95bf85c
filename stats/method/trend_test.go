package method

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// ctlMantissas converts series rounded to d decimals (as the R script
// rounds them) to int64 mantissas.
func ctlMantissas(x []float64, d int) []int64 {
	out := make([]int64, len(x))
	p := math.Pow(10, float64(d))
	for i, v := range x {
		out[i] = int64(math.Round(v * p))
	}
	return out
}

var ctlDecimals = map[string]int{"ind": 3, "ar": 2, "ties": 1, "small": 2}

// Drift checks against R 4.2.2 (testdata/rref/control.R): acf() and
// Box.test() for the autocorrelation; the runs test, Mann-Kendall with
// the tie correction, Sen's slope with Gilbert's interval written out as
// formulas; Kendall's tau-b from cor(). The int64 path (mantissas) must
// decide exactly as the float64 path on these data.
func TestDriftAgainstR(t *testing.T) {
	ref := ctlRef(t)
	for set, d := range ctlDecimals {
		m := ref[set]
		x := ctlSeries(t, m, "x")
		xm := ctlMantissas(x, d)
		ac, err := Lag1Autocorrelation(x)
		if err != nil {
			t.Fatal(err)
		}
		ctlClose(t, set+" r1", ac.R1, m["r1"], 1e-12)
		ctlClose(t, set+" Q", ac.Q, m["lbq"], 1e-11)
		ctlClose(t, set+" LB p", ac.P, m["lbp"], 1e-9)
		ctlClose(t, set+" Z", ac.Z, m["r1"]*math.Sqrt(float64(len(x))), 1e-12)

		rt, err := RunsAboutMedian(x)
		if err != nil {
			t.Fatal(err)
		}
		rm, _ := RunsAboutMedian(xm)
		if rt != (RunsTest{}) && (rm.Runs != rt.Runs || rm.Longest != rt.Longest || rm.P != rt.P) {
			t.Errorf("%s: int64 path %+v, float64 %+v", set, rm, rt)
		}
		if float64(rt.Runs) != m["runs"] || float64(rt.Above) != m["runs.above"] || float64(rt.Below) != m["runs.below"] || float64(rt.Longest) != m["runs.longest"] || !rt.Exact {
			t.Errorf("%s runs: %+v", set, rt)
		}
		ctlClose(t, set+" runs z", rt.Z, m["runs.z"], 1e-12)
		ctlClose(t, set+" runs p", rt.P, m["runs.pexact"], 1e-9)
		if rt.LongestLast-rt.LongestFirst+1 < rt.Longest {
			t.Errorf("%s: longest run %d at %d..%d", set, rt.Longest, rt.LongestFirst, rt.LongestLast)
		}

		mk, err := MannKendallTest(x)
		if err != nil {
			t.Fatal(err)
		}
		mkm, _ := MannKendallTest(xm)
		if mk != mkm {
			t.Errorf("%s: int64 MK %+v, float64 %+v", set, mkm, mk)
		}
		if float64(mk.S) != m["mk.s"] {
			t.Errorf("%s S = %d, R %g", set, mk.S, m["mk.s"])
		}
		ctlClose(t, set+" var S", mk.VarS, m["mk.var"], 1e-14)
		ctlClose(t, set+" MK z", mk.Z, m["mk.z"], 1e-13)
		ctlClose(t, set+" MK p", mk.P, m["mk.p"], 1e-10)
		ctlClose(t, set+" tau", mk.Tau, m["mk.tau"], 1e-12)

		sen, err := SenSlopeEstimate(x, 0.95)
		if err != nil {
			t.Fatal(err)
		}
		ctlClose(t, set+" sen", sen.Slope, m["sen.slope"], 1e-12)
		ctlClose(t, set+" sen lo", sen.Lower, m["sen.lo"], 1e-10)
		ctlClose(t, set+" sen hi", sen.Upper, m["sen.hi"], 1e-10)
		ctlClose(t, set+" sen intercept", sen.Intercept, m["sen.intercept"], 1e-12)
		senm, _ := SenSlopeEstimate(xm, 0.95)
		ctlClose(t, set+" sen (mantissas)", senm.Slope/math.Pow(10, float64(d)), m["sen.slope"], 1e-12)
	}
}

// Mann-Kendall in O(n log n) against the O(n²) definition on series with
// many ties (definition: Mann 1945; check by direct counting).
func TestMannKendallAgainstPairs(t *testing.T) {
	for _, n := range []int{3, 17, 100, 1001} {
		x := make([]int64, n)
		for i := range x {
			x[i] = int64((i*7919)%13) + int64(i/50)
		}
		var s int64
		for i := 0; i < n; i++ {
			for j := i + 1; j < n; j++ {
				switch {
				case x[j] > x[i]:
					s++
				case x[j] < x[i]:
					s--
				}
			}
		}
		mk, err := MannKendallTest(x)
		if err != nil || mk.S != s {
			t.Errorf("n=%d: S %d, want %d (%v)", n, mk.S, s, err)
		}
	}
}

func TestDriftEdges(t *testing.T) {
	c := []float64{4, 4, 4, 4, 4}
	if _, err := Lag1Autocorrelation(c); err == nil {
		t.Error("constant autocorrelation: no error")
	}
	if _, err := Lag1Autocorrelation([]float64{1, 2}); err == nil {
		t.Error("n=2 autocorrelation: no error")
	}
	if _, err := RunsAboutMedian(c); err == nil {
		t.Error("constant runs: no error")
	}
	if _, err := RunsAboutMedian([]float64{1}); err == nil {
		t.Error("n=1 runs: no error")
	}
	mk, err := MannKendallTest(c)
	if err != nil || mk.S != 0 || mk.VarS != 0 || mk.P != 1 || mk.Z != 0 || mk.Tau != 0 {
		t.Errorf("constant MK: %+v %v", mk, err)
	}
	if _, err := MannKendallTest([]float64{1, 2}); err == nil {
		t.Error("n=2 MK: no error")
	}
	if _, err := MannKendallTest([]float64{1, math.NaN(), 2}); err == nil {
		t.Error("NaN MK: no error")
	}
	s, err := SenSlopeEstimate(c, 0.95)
	if err != nil || s.Slope != 0 || s.Lower != 0 || s.Upper != 0 {
		t.Errorf("constant Sen: %+v %v", s, err)
	}
	if _, err := SenSlopeEstimate(make([]float64, ctlSenMax+1), 0.95); err == nil {
		t.Error("Sen above the limit: no error")
	}
	if _, err := SenSlopeEstimate([]float64{1, 2, 3}, 1); err == nil {
		t.Error("confidence 1: no error")
	}
	// Median decided without arithmetic: the values next to the middle
	// ones are on their sides even when the midpoint would round onto one.
	a, b := 1.0, math.Nextafter(1, 2)
	rt, err := RunsAboutMedian([]float64{a, b, a, b})
	if err != nil || rt.OnMedian != 0 || rt.Runs != 4 {
		t.Errorf("adjacent doubles: %+v %v", rt, err)
	}
}

// TestRankSeriesPaths: ranks by counting (a narrow range of integers) and
// by sorting (a wide range, the same order) give the same tests, and the
// tests on ranks equal the brute-force definitions (S and U_t summed over
// every pair, the median by sorting: from memory of the definitions).
func TestRankSeriesPaths(t *testing.T) {
	narrow := []int64{5, 3, 5, 8, 1, 3, 3, 9, 5, 2, 7, 7, 4, 6, 5, 8, 9, 9, 1, 5}
	wide := make([]int64, len(narrow))
	for i, v := range narrow {
		wide[i] = v * 1_000_000_007 // same order and ties, range too wide to count
	}
	rn, _ := RankSeries(narrow)
	rw, _ := RankSeries(wide)
	if !slices.Equal(rn.Dense, rw.Dense) || !slices.Equal(rn.Below, rw.Below) {
		t.Fatalf("ranks differ: %v %v / %v %v", rn.Dense, rn.Below, rw.Dense, rw.Below)
	}
	var s int64
	n := len(narrow)
	for i := range n {
		for j := i + 1; j < n; j++ {
			s += int64(cmpSign(narrow[j] - narrow[i]))
		}
	}
	for _, r := range []SeriesRanks[int64]{rn, rw} {
		mk, err := MannKendallRanked(r)
		if err != nil || mk.S != s {
			t.Errorf("S %d, want %d (%v)", mk.S, s, err)
		}
	}
	// Pettitt: K = max over t of |Σ_{i<t<=j} sign(xᵢ − xⱼ)|
	var best int64
	bt := 0
	for tt := 1; tt < n; tt++ {
		var u int64
		for i := 0; i < tt; i++ {
			for j := tt; j < n; j++ {
				u += int64(cmpSign(narrow[i] - narrow[j]))
			}
		}
		if u < 0 {
			u = -u
		}
		if u > best {
			best, bt = u, tt
		}
	}
	cp, err := PettittRanked(rw, wide)
	if err != nil || cp.Statistic != float64(best) || cp.Index != bt {
		t.Errorf("Pettitt K %g at %d, want %d at %d (%v)", cp.Statistic, cp.Index, best, bt, err)
	}
	// runs about the median: the median of narrow is 5
	rt, err := RunsRanked(rn)
	if err != nil || rt.Median != 5 || rt.OnMedian != 5 {
		t.Errorf("runs: median %g, %d on it (%v)", rt.Median, rt.OnMedian, err)
	}
}

func cmpSign(d int64) int {
	switch {
	case d > 0:
		return 1
	case d < 0:
		return -1
	}
	return 0
}

// TestSelectStat: the order statistics by selection equal those read from
// a sorted copy (ties, few distinct values, fractional and clamped ranks).
func TestSelectStat(t *testing.T) {
	for seed := uint64(1); seed <= 30; seed++ {
		x := ctlRandomSeries(seed, 1+int(seed*seed*7)%3000)
		sorted := slices.Clone(x)
		slices.Sort(sorted)
		n := float64(len(x))
		ks := []float64{0, 1, 1.5, 2, n / 3, (n + 1) / 2, n/2 + 0.25, n - 1, n - 0.5, n, n + 2}
		for _, k := range ks {
			s := slices.Clone(x)
			if got, want := ctlSelectStats(s, k)[0], ctlOrderStat(sorted, k); got != want {
				t.Fatalf("n=%d k=%g: %g, want %g", len(x), k, got, want)
			}
		}
		// several ranks at once, as Sen's slope asks for them (the median,
		// then the two bounds), and a few in any order, the same twice
		r := rand.New(rand.NewPCG(seed, 7))
		sets := [][]float64{{(n + 1) / 2, n/2 - 1.7, n/2 + 2.3}, {n - 0.5, 1.5}}
		for j := 0; j < 5; j++ {
			set := make([]float64, 1+r.IntN(5))
			for i := range set {
				set[i] = ks[r.IntN(len(ks))]
			}
			sets = append(sets, set)
		}
		for _, set := range sets {
			s := slices.Clone(x)
			got := ctlSelectStats(s, set...)
			for i, k := range set {
				if want := ctlOrderStat(sorted, k); got[i] != want {
					t.Fatalf("n=%d ranks %v: at %g %g, want %g", len(x), set, k, got[i], want)
				}
			}
		}
	}
}
