package method

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

// Check values: R 4.2.2 TukeyHSD, pairwise.wilcox.test and p.adjust, and
// Games-Howell and Dunn written out by their formulas with R's ptukey,
// qtukey and pnorm (testdata/rref/groups.R).
func TestGrpPairwiseAgainstR(t *testing.T) {
	sets, ref := grpLoadSets(t), grpLoadRef(t)
	for _, name := range grpSetNames(sets) {
		s, r := sets[name], ref[name]
		k := len(s.f)
		tk, err := TukeyKramer(s.f, 0.95)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		gh, err := GamesHowell(s.f, 0.95)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		pf, err := PairwiseMannWhitney(s.f)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		pm, err := PairwiseMannWhitney(s.m)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		df, err := Dunn(s.f)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		dm, err := Dunn(s.m)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if len(tk) != k*(k-1)/2 || len(gh) != len(tk) || len(pf) != len(tk) || len(df) != len(tk) {
			t.Fatalf("%s: %d pairs", name, len(tk))
		}
		for c := range tk {
			i, j := tk[c].I, tk[c].J
			key := fmt.Sprintf("%d-%d", i, j)
			if gh[c].I != i || gh[c].J != j || pf[c].I != i || df[c].J != j {
				t.Fatalf("%s: pair order", name)
			}
			// R's qtukey stops at a step below 1e-4: limits agree to about 1e-4 * SE
			grpNear(t, name+" tukey diff "+key, tk[c].Diff, grpRef(t, r, "tukey."+key+".diff"), 1e-12)
			grpNear(t, name+" tukey lo "+key, tk[c].Lo, grpRef(t, r, "tukey."+key+".lo"), 1e-4*tk[c].SE)
			grpNear(t, name+" tukey hi "+key, tk[c].Hi, grpRef(t, r, "tukey."+key+".hi"), 1e-4*tk[c].SE)
			grpNear(t, name+" tukey p "+key, tk[c].P, grpRef(t, r, "tukey."+key+".p"), 1e-9)
			grpNear(t, name+" gh diff "+key, gh[c].Diff, grpRef(t, r, "gh."+key+".diff"), 1e-12)
			grpNear(t, name+" gh df "+key, gh[c].DF, grpRef(t, r, "gh."+key+".df"), 1e-10)
			grpNear(t, name+" gh p "+key, gh[c].P, grpRef(t, r, "gh."+key+".p"), 1e-9)
			grpNear(t, name+" gh lo "+key, gh[c].Lo, grpRef(t, r, "gh."+key+".lo"), 1e-4*gh[c].SE)
			grpNear(t, name+" gh hi "+key, gh[c].Hi, grpRef(t, r, "gh."+key+".hi"), 1e-4*gh[c].SE)
			for _, p := range []RankPair{pf[c], pm[c]} {
				grpNear(t, name+" pmw p "+key, p.P, grpRef(t, r, "pmw."+key+".p"), 1e-9)
				grpNear(t, name+" pmw padj "+key, p.PAdj, grpRef(t, r, "pmw."+key+".padj"), 1e-9)
			}
			for _, p := range []RankPair{df[c], dm[c]} {
				grpNear(t, name+" dunn z "+key, p.Stat, grpRef(t, r, "dunn."+key+".z"), 1e-10)
				grpNear(t, name+" dunn p "+key, p.P, grpRef(t, r, "dunn."+key+".p"), 1e-9)
				grpNear(t, name+" dunn padj "+key, p.PAdj, grpRef(t, r, "dunn."+key+".padj"), 1e-9)
			}
		}
	}
}

func TestGrpHolmAgainstR(t *testing.T) {
	r := grpLoadRef(t)["holm"]
	var in []float64
	for i := 1; ; i++ {
		v, ok := r[fmt.Sprintf("in%d", i)]
		if !ok {
			break
		}
		in = append(in, v)
	}
	got, err := Holm(in)
	if err != nil || len(in) < 5 {
		t.Fatal(err, len(in))
	}
	for i := range in {
		grpNear(t, fmt.Sprintf("holm %d", i), got[i], grpRef(t, r, fmt.Sprintf("out%d", i+1)), 1e-15)
	}
	if _, err := Holm([]float64{0.1, math.NaN()}); err == nil {
		t.Error("Holm(NaN): no error")
	}
}

// The letter display by its definition: two groups share a letter
// exactly when they do not differ; every group has a letter; letters are
// numbered from 0 without gaps; the first group in order holds letter 0.
func grpCheckLetters(t *testing.T, k int, differ func(i, j int) bool, order []int, letters [][]int) {
	t.Helper()
	used := map[int]bool{}
	for g := 0; g < k; g++ {
		if len(letters[g]) == 0 {
			t.Fatalf("group %d has no letter: %v", g, letters)
		}
		for _, l := range letters[g] {
			used[l] = true
		}
	}
	for l := 0; l < len(used); l++ {
		if !used[l] {
			t.Fatalf("letter %d unused: %v", l, letters)
		}
	}
	for i := 0; i < k; i++ {
		for j := i + 1; j < k; j++ {
			share := false
			for _, a := range letters[i] {
				for _, b := range letters[j] {
					share = share || a == b
				}
			}
			if share == differ(i, j) {
				t.Fatalf("groups %d,%d: share %v, differ %v: %v", i, j, share, differ(i, j), letters)
			}
		}
	}
	if order != nil && letters[order[0]][0] != 0 {
		t.Fatalf("first group in order lacks letter 0: %v", letters)
	}
}

func TestGrpCompactLetters(t *testing.T) {
	// Means on a line, groups differ when more than 1 apart: the classic
	// overlapping pattern (a, ab, b, bc, c ...).
	means := []float64{0, 0.6, 1.2, 1.8, 2.4, 5}
	differ := func(i, j int) bool { return math.Abs(means[i]-means[j]) > 1 }
	l, err := CompactLetters(len(means), differ, nil)
	if err != nil {
		t.Fatal(err)
	}
	grpCheckLetters(t, len(means), differ, nil, l)
	// a b c d... for the chain above: 0:{0} 1:{0,1} 2:{1,2} 3:{2,3} 4:{3} 5:{4} (by hand)
	want := [][]int{{0}, {0, 1}, {1, 2}, {2, 3}, {3}, {4}}
	if fmt.Sprint(l) != fmt.Sprint(want) {
		t.Errorf("letters %v, want %v", l, want)
	}
	// random patterns, up to 50 groups, from random means (interval-like)
	// and fully random relations
	rng := rand.New(rand.NewPCG(5, 6))
	for trial := 0; trial < 200; trial++ {
		k := 1 + rng.IntN(12)
		if trial%20 == 0 {
			k = MaxGroups
		}
		mu := make([]float64, k)
		for i := range mu {
			mu[i] = rng.Float64() * 10
		}
		rel := make([][]bool, k)
		for i := range rel {
			rel[i] = make([]bool, k)
			for j := range rel[i] {
				rel[i][j] = rng.IntN(3) == 0
			}
		}
		var d func(i, j int) bool
		if trial%2 == 0 || k > 14 {
			d = func(i, j int) bool { return math.Abs(mu[i]-mu[j]) > 2 }
		} else {
			d = func(i, j int) bool { return rel[i][j] }
		}
		order := rng.Perm(k)
		l, err := CompactLetters(k, d, order)
		if err != nil {
			t.Fatalf("k=%d: %v", k, err)
		}
		grpCheckLetters(t, k, d, order, l)
	}
	if _, err := CompactLetters(3, differ, []int{0, 0, 1}); err == nil {
		t.Error("bad order accepted")
	}
}

// Tukey-Kramer and Games-Howell intervals are simultaneous: the interval
// excludes 0 exactly when the p-value is below 1 - level (by
// construction of both from the same studentized range).
func TestGrpPairIntervalsAgreeWithP(t *testing.T) {
	sets := grpLoadSets(t)
	for _, name := range grpSetNames(sets) {
		for _, f := range []func([][]float64, float64) ([]MeanPair, error){TukeyKramer, GamesHowell} {
			ps, err := f(sets[name].f, 0.95)
			if err != nil {
				t.Fatal(err)
			}
			for _, p := range ps {
				if (p.Lo > 0 || p.Hi < 0) != (p.P < 0.05) && math.Abs(p.P-0.05) > 1e-6 {
					t.Errorf("%s %d-%d: [%g, %g] with p %g", name, p.I, p.J, p.Lo, p.Hi, p.P)
				}
			}
		}
	}
}
