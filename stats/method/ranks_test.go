package method

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// Check values: R 4.2.2 kruskal.test and wilcox.test(conf.int = TRUE) via
// testdata/rref/groups.R. Every test runs on the float64 readings and on
// their int64 mantissas, which must agree.
func TestGrpKruskalWallisAgainstR(t *testing.T) {
	sets, ref := grpLoadSets(t), grpLoadRef(t)
	for _, name := range grpSetNames(sets) {
		s, r := sets[name], ref[name]
		kf, err := KruskalWallis(s.f)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		km, err := KruskalWallis(s.m)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		for _, k := range []KruskalWallisTest{kf, km} {
			grpNear(t, name+" H", k.H, grpRef(t, r, "kw.H"), 1e-10)
			grpNear(t, name+" KW p", k.P, grpRef(t, r, "kw.p"), 1e-9)
		}
		if !slices.Equal(kf.MeanRanks, km.MeanRanks) {
			t.Errorf("%s: mean ranks differ: %v %v", name, kf.MeanRanks, km.MeanRanks)
		}
	}
}

func TestGrpMannWhitneyAgainstR(t *testing.T) {
	sets, ref := grpLoadSets(t), grpLoadRef(t)
	n2 := 0
	for _, name := range grpSetNames(sets) {
		s, r := sets[name], ref[name]
		if len(s.f) != 2 {
			continue
		}
		n2++
		mf, err := MannWhitney(s.f[0], s.f[1], 0.95)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		mm, err := MannWhitney(s.m[0], s.m[1], 0.95)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		sc := math.Pow(10, -float64(s.scale))
		mm.Shift, mm.Lo, mm.Hi = mm.Shift*sc, mm.Lo*sc, mm.Hi*sc
		m90, err := MannWhitney(s.m[0], s.m[1], 0.90)
		if err != nil {
			t.Fatal(err)
		}
		exact := grpRef(t, r, "mw.exact") == 1
		for _, m := range []MannWhitneyTest{mf, mm} {
			if m.Exact != exact {
				t.Errorf("%s: Exact = %v", name, m.Exact)
			}
			grpNear(t, name+" W", m.W, grpRef(t, r, "mw.W"), 0)
			grpNear(t, name+" MW p", m.P, grpRef(t, r, "mw.p"), 1e-9)
			// the Hodges-Lehmann estimate by its definition (R's median of outer(x, y, "-"))
			grpNear(t, name+" shift", m.Shift, grpRef(t, r, "hl.median"), 1e-12)
			tol := 1e-12
			if !exact {
				tol = 2e-4 // R finds the limits by uniroot(tol = 1e-4)
			}
			grpNear(t, name+" lo", m.Lo, grpRef(t, r, "mw.lo"), tol)
			grpNear(t, name+" hi", m.Hi, grpRef(t, r, "mw.hi"), tol)
			if exact {
				grpNear(t, name+" R shift", m.Shift, grpRef(t, r, "mw.shift"), 1e-12)
			}
		}
		tol := 1e-12
		if !exact {
			tol = 2e-4
		}
		grpNear(t, name+" lo90", m90.Lo*sc, grpRef(t, r, "mw90.lo"), tol)
		grpNear(t, name+" hi90", m90.Hi*sc, grpRef(t, r, "mw90.hi"), tol)
		if !exact {
			// R's estimate in the normal approximation is a root of the
			// standardized statistic: a median of the differences, to
			// uniroot's tolerance.
			e := grpRef(t, r, "mw.shift")
			below, above := 0, 0
			for _, a := range s.f[0] {
				for _, b := range s.f[1] {
					if a-b < e-1e-4 {
						below++
					}
					if a-b > e+1e-4 {
						above++
					}
				}
			}
			half := len(s.f[0]) * len(s.f[1]) / 2
			if below > half || above > half {
				t.Errorf("%s: R's estimate %g is not a median of the differences (%d below, %d above)", name, e, below, above)
			}
		}
	}
	if n2 < 4 {
		t.Fatalf("only %d two-group sets", n2)
	}
}

// Hollander and Wolfe (1973, p. 69), permeability constants: W = 35 as
// published (the example in R's wilcox.test help); exact two-sided p from
// R 4.2.2 (0.2544).
func TestGrpMannWhitneyPublished(t *testing.T) {
	s := grpLoadSets(t)["hw-permeability"]
	m, err := MannWhitney(s.f[0], s.f[1], 0.95)
	if err != nil {
		t.Fatal(err)
	}
	if m.W != 35 || !m.Exact || math.Abs(m.P-0.2544) > 5e-5 {
		t.Errorf("W = %g exact %v p = %g; want 35, exact, 0.2544", m.W, m.Exact, m.P)
	}
}

// The exact counts by their definition: enumerate all C(m+n, m) ways to
// choose the ranks of x and count W = rank sum - m(m+1)/2.
func TestGrpWilcoxCountsEnumerated(t *testing.T) {
	for m := 1; m <= 6; m++ {
		for n := 1; n <= 7; n++ {
			want := make([]float64, m*n+1)
			N := m + n
			for mask := 0; mask < 1<<N; mask++ {
				c, rs := 0, 0
				for i := 0; i < N; i++ {
					if mask&(1<<i) != 0 {
						c++
						rs += i + 1
					}
				}
				if c == m {
					want[rs-m*(m+1)/2]++
				}
			}
			if got := grpWilcoxCounts(m, n); !slices.Equal(got, want) {
				t.Errorf("counts(%d,%d) = %v, want %v", m, n, got, want)
			}
		}
	}
	// the largest exact case: total C(98, 49) ≈ 2.5e28 (a known binomial
	// coefficient, from the definition by lgamma) and symmetry
	c := grpWilcoxCounts(49, 49)
	tot := 0.0
	for i, v := range c {
		tot += v
		if v != c[len(c)-1-i] && math.Abs(v-c[len(c)-1-i]) > 1e-12*v {
			t.Fatalf("asymmetric at %d", i)
		}
	}
	l98, _ := math.Lgamma(99)
	l49, _ := math.Lgamma(50)
	if math.Abs(math.Log(tot)-(l98-2*l49)) > 1e-10 {
		t.Errorf("total %g", tot)
	}
}

// grpBruteDiffs is the sorted list of all differences (by definition).
func grpBruteDiffs[T RankNumber](x, y []T) []T {
	var d []T
	for _, a := range x {
		for _, b := range y {
			d = append(d, a-b)
		}
	}
	slices.Sort(d)
	return d
}

// The selection of the k-th difference against sorting all of them, on
// random samples with and without ties, large enough to use the sampled
// rounds (m·n above the gathering size).
func TestGrpDiffSelect(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := 0; trial < 30; trial++ {
		m, n := 1+rng.IntN(300), 1+rng.IntN(300)
		if trial%3 == 0 {
			m, n = 150+rng.IntN(150), 150+rng.IntN(150)
		}
		res := []int64{1, 3, 1000, 1 << 40}[trial%4]
		x, y := make([]int64, m), make([]int64, n)
		for i := range x {
			x[i] = rng.Int64N(res) - res/2
		}
		for i := range y {
			y[i] = rng.Int64N(res) - res/3
		}
		slices.Sort(x)
		slices.Sort(y)
		all := grpBruteDiffs(x, y)
		s := grpNewDiffSel(x, y)
		for _, k := range []int64{0, int64(len(all)) - 1, int64(len(all)) / 2, rng.Int64N(int64(len(all)))} {
			if got := s.kth(k); got != all[k] {
				t.Fatalf("trial %d (%dx%d, res %d): kth(%d) = %d, want %d", trial, m, n, res, k, got, all[k])
			}
			if k+1 < int64(len(all)) {
				if got := s.next(all[k], k); got != all[k+1] {
					t.Fatalf("trial %d: next(%d) = %d, want %d", trial, k, got, all[k+1])
				}
			}
		}
		xf, yf := make([]float64, m), make([]float64, n)
		for i := range x {
			xf[i] = float64(x[i]) * 0.001
		}
		for i := range y {
			yf[i] = float64(y[i]) * 0.001
		}
		allf := grpBruteDiffs(xf, yf)
		sf := grpNewDiffSel(xf, yf)
		k := rng.Int64N(int64(len(allf)))
		if got := sf.kth(k); got != allf[k] {
			t.Fatalf("float trial %d: kth(%d) = %g, want %g", trial, k, got, allf[k])
		}
	}
}

// Decisions on the decimals as typed: 0.3 - 0.1 and 0.2 - 0.0 are the
// same difference of decimals (0.2, by arithmetic) but not of binary
// doubles (0.19999999999999998 and 0.2); with mantissas the two
// differences tie exactly and the median of the differences is 0.2.
func TestGrpMantissaTies(t *testing.T) {
	x, y := []int64{2, 3, 7}, []int64{0, 1, 10} // 0.2 0.3 0.7 and 0.0 0.1 1.0 at scale 1
	s := grpNewDiffSel(x, y)
	d := grpBruteDiffs(x, y)
	for k := range d {
		if got := s.kth(int64(k)); got != d[k] {
			t.Errorf("kth(%d) = %d, want %d", k, got, d[k])
		}
	}
	m, err := MannWhitney(x, y, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	// differences at scale 1: -8 -7 -3 1 2 2 3 6 7: median 2 (0.2), by arithmetic
	if m.Shift != 2 {
		t.Errorf("shift %g, want 2", m.Shift)
	}
	xf, yf := []float64{0.2, 0.3, 0.7}, []float64{0.0, 0.1, 1.0}
	if xf[1]-yf[1] == xf[0]-yf[0] {
		t.Fatal("the doubles were expected to differ here")
	}
}

func TestGrpPairRank(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for trial := 0; trial < 200; trial++ {
		m, n := 1+rng.IntN(20), 1+rng.IntN(20)
		x, y := make([]int64, m), make([]int64, n)
		for i := range x {
			x[i] = rng.Int64N(8)
		}
		for i := range y {
			y[i] = rng.Int64N(8)
		}
		slices.Sort(x)
		slices.Sort(y)
		// by definition: pairs with x > y, ties one half
		want := 0.0
		for _, a := range x {
			for _, b := range y {
				if a > b {
					want++
				} else if a == b {
					want += 0.5
				}
			}
		}
		w, tie := grpPairRank(x, y)
		all := append(slices.Clone(x), y...)
		slices.Sort(all)
		if w != want || tie != grpSelfTie(all) {
			t.Fatalf("W = %g want %g; tie %g want %g", w, want, tie, grpSelfTie(all))
		}
		// the k-way merge gives the same rank sum for x
		rk := grpRankSums([][]int64{x, y})
		if rk.sums[0]-float64(m*(m+1))/2 != want || rk.tie != tie {
			t.Fatalf("rank sums %v tie %g", rk.sums, rk.tie)
		}
	}
}

// Samples too small for the requested level under the normal
// approximation (ties force it): the interval is the whole range of the
// differences, as R's wilcox.test returns (its root search stops at
// min(x) - max(y) and max(x) - min(y)), and AchievedLevel says how much
// it covers (below Level). R 4.2.2: wilcox.test(c(10,10,12), c(11,13,13),
// conf.int = TRUE)$conf.int is -3, 1.
func TestGrpMannWhitneySmallTied(t *testing.T) {
	x, y := []int64{10, 10, 12}, []int64{11, 13, 13}
	r, err := MannWhitney(x, y, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	if r.Exact || r.Lo != 10-13 || r.Hi != 12-11 || !(r.AchievedLevel < 0.95 && r.AchievedLevel > 0) {
		t.Errorf("%+v", r)
	}
}
