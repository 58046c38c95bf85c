package method

import (
	"bufio"
	"errors"
	"lotlens/stats/internal/rref"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"testing"
)

// Check values: R 4.2.2 (Debian r-base-core) by testdata/rref/groups.R,
// committed as testdata/rref/groups.tsv; the data sets (invented, made
// deterministically by the same script, plus two published ones) as
// testdata/rref/groups-data.tsv.

type grpSet struct {
	name  string
	text  [][]string // as typed
	f     [][]float64
	m     [][]int64 // mantissas at the common scale
	scale int
}

var grpRefDir = filepath.Join("..", "..", "testdata", "rref")

func grpLoadSets(t testing.TB) map[string]*grpSet {
	t.Helper()
	f, err := os.Open(filepath.Join(grpRefDir, "groups-data.tsv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sets := map[string]*grpSet{}
	sc := bufio.NewScanner(f)
	sc.Scan()
	for sc.Scan() {
		p := strings.Split(sc.Text(), "\t")
		if len(p) != 3 {
			t.Fatalf("bad line %q", sc.Text())
		}
		s := sets[p[0]]
		if s == nil {
			s = &grpSet{name: p[0]}
			sets[p[0]] = s
		}
		g, err := strconv.Atoi(p[1])
		if err != nil {
			t.Fatal(err)
		}
		for len(s.text) <= g {
			s.text = append(s.text, nil)
		}
		s.text[g] = append(s.text[g], p[2])
	}
	for _, s := range sets {
		for _, g := range s.text {
			for _, v := range g {
				if i := strings.IndexByte(v, '.'); i >= 0 {
					s.scale = max(s.scale, len(v)-i-1)
				}
			}
		}
		for _, g := range s.text {
			var fs []float64
			var ms []int64
			for _, v := range g {
				x, err := strconv.ParseFloat(v, 64)
				if err != nil {
					t.Fatal(err)
				}
				fs = append(fs, x)
				ms = append(ms, grpMantissa(t, v, s.scale))
			}
			s.f = append(s.f, fs)
			s.m = append(s.m, ms)
		}
	}
	if len(sets) < 10 {
		t.Fatalf("only %d sets", len(sets))
	}
	return sets
}

// grpMantissa converts a typed decimal to its integer mantissa at scale.
func grpMantissa(t testing.TB, v string, scale int) int64 {
	ip, fp, _ := strings.Cut(v, ".")
	fp += strings.Repeat("0", scale-len(fp))
	n, err := strconv.ParseInt(ip+fp, 10, 64)
	if err != nil {
		t.Fatal(err)
	}
	return n
}

func grpLoadRef(t testing.TB) map[string]map[string]float64 {
	t.Helper()
	return rref.Load(t, "groups.tsv", 1)
}

func grpSetNames(sets map[string]*grpSet) []string {
	var n []string
	for k := range sets {
		n = append(n, k)
	}
	sort.Strings(n)
	return n
}

// grpNear checks got against want with a relative tolerance (absolute
// below 1).
func grpNear(t *testing.T, what string, got, want, tol float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > tol*math.Max(1, math.Abs(want)) {
		t.Errorf("%s = %.15g, want %.15g (R 4.2.2), tol %g", what, got, want, tol)
	}
}

func grpRef(t *testing.T, ref map[string]float64, key string) float64 {
	t.Helper()
	v, ok := ref[key]
	if !ok {
		t.Fatalf("reference %q missing", key)
	}
	return v
}

func TestGrpANOVAAgainstR(t *testing.T) {
	sets, ref := grpLoadSets(t), grpLoadRef(t)
	for _, name := range grpSetNames(sets) {
		s, r := sets[name], ref[name]
		a, err := OneWayANOVA(s.f)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		grpNear(t, name+" F", a.F, grpRef(t, r, "anova.F"), 1e-10)
		grpNear(t, name+" p", a.P, grpRef(t, r, "anova.p"), 1e-9)
		grpNear(t, name+" df1", a.DF1, grpRef(t, r, "anova.df1"), 0)
		grpNear(t, name+" df2", a.DF2, grpRef(t, r, "anova.df2"), 0)
		grpNear(t, name+" SSB", a.SSBetween, grpRef(t, r, "anova.ssb"), 1e-10)
		grpNear(t, name+" SSW", a.SSWithin, grpRef(t, r, "anova.ssw"), 1e-10)
		grpNear(t, name+" MSB", a.MSBetween, grpRef(t, r, "anova.msb"), 1e-10)
		grpNear(t, name+" MSW", a.MSWithin, grpRef(t, r, "anova.msw"), 1e-10)

		w, err := WelchANOVA(s.f)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		grpNear(t, name+" Welch F", w.F, grpRef(t, r, "welch.F"), 1e-10)
		grpNear(t, name+" Welch df2", w.DF2, grpRef(t, r, "welch.df2"), 1e-10)
		grpNear(t, name+" Welch p", w.P, grpRef(t, r, "welch.p"), 1e-9)

		if len(s.f) != 2 {
			continue
		}
		tt, err := WelchT(s.f[0], s.f[1], 0.95)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		grpNear(t, name+" t", tt.T, grpRef(t, r, "welcht.t"), 1e-10)
		grpNear(t, name+" t df", tt.DF, grpRef(t, r, "welcht.df"), 1e-10)
		grpNear(t, name+" t p", tt.P, grpRef(t, r, "welcht.p"), 1e-9)
		grpNear(t, name+" t diff", tt.Diff, grpRef(t, r, "welcht.diff"), 1e-12)
		grpNear(t, name+" t lo", tt.Lo, grpRef(t, r, "welcht.lo"), 1e-9)
		grpNear(t, name+" t hi", tt.Hi, grpRef(t, r, "welcht.hi"), 1e-9)

		h, err := Hedges(s.f[0], s.f[1], 0.95)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		grpNear(t, name+" d", h.D, grpRef(t, r, "hedges.d"), 1e-10)
		grpNear(t, name+" g", h.G, grpRef(t, r, "hedges.g"), 1e-10)
		grpNear(t, name+" g se", h.SE, grpRef(t, r, "hedges.se"), 1e-10)
		grpNear(t, name+" g lo", h.Lo, grpRef(t, r, "hedges.lo"), 1e-9)
		grpNear(t, name+" g hi", h.Hi, grpRef(t, r, "hedges.hi"), 1e-9)
	}
}

// PlantGrowth (Dobson 1983, table 7.1): the one-way ANOVA's F = 4.846 on
// 2 and 27 df, p = 0.0159, as printed in the many worked examples of this
// data set (from memory), and the same to full precision from R above.
func TestGrpANOVAPublished(t *testing.T) {
	s := grpLoadSets(t)["plantgrowth"]
	a, err := OneWayANOVA(s.f)
	if err != nil {
		t.Fatal(err)
	}
	if math.Round(a.F*1000)/1000 != 4.846 || a.DF1 != 2 || a.DF2 != 27 || math.Round(a.P*10000)/10000 != 0.0159 {
		t.Errorf("PlantGrowth ANOVA: F = %g (%g, %g), p = %g; want 4.846 (2, 27), 0.0159", a.F, a.DF1, a.DF2, a.P)
	}
}

func TestGrpErrors(t *testing.T) {
	ok := []float64{1, 2, 3}
	cases := []struct {
		name string
		err  error
		code GroupsCode
		grp  int
	}{}
	add := func(name string, err error, code GroupsCode, grp int) {
		cases = append(cases, struct {
			name string
			err  error
			code GroupsCode
			grp  int
		}{name, err, code, grp})
	}
	_, e := OneWayANOVA([][]float64{ok})
	add("one group", e, GroupsTooFew, -1)
	_, e = OneWayANOVA([][]float64{ok, {1, 2}})
	add("small group", e, GroupsSmall, 1)
	_, e = OneWayANOVA([][]float64{ok, {1, math.NaN(), 3}})
	add("NaN", e, GroupsNotFinite, 1)
	_, e = OneWayANOVA([][]float64{{2, 2, 2}, {3, 3, 3}})
	add("no spread", e, GroupsNoSpread, -1)
	_, e = WelchANOVA([][]float64{ok, {4, 4, 4}})
	add("welch constant", e, GroupsNoSpread, 1)
	_, e = WelchT(ok, ok, 1)
	add("level", e, GroupsBadLevel, -1)
	_, e = WelchT(ok, []float64{1}, 0.95)
	add("t small", e, GroupsSmall, 1)
	_, e = Bartlett([][]float64{{5, 5, 5}, ok})
	add("bartlett constant", e, GroupsNoSpread, 0)
	_, e = KruskalWallis([][]int64{{1, 1, 1}, {1, 1, 1}})
	add("kw tied", e, GroupsNoSpread, -1)
	_, e = MannWhitney([]int64{1, 2, 3}, []int64{1, 2, 3, 4}, 0)
	add("mw level", e, GroupsBadLevel, -1)
	many := make([][]float64, MaxGroups+1)
	for i := range many {
		many[i] = ok
	}
	_, e = KruskalWallis(many)
	add("too many", e, GroupsTooMany, -1)
	_, e = TukeyKramer([][]float64{ok, ok, {math.Inf(1), 1, 2}}, 0.95)
	add("inf", e, GroupsNotFinite, 2)
	for _, c := range cases {
		var ge *GroupsError
		if !errors.As(c.err, &ge) {
			t.Errorf("%s: error %v, want a *GroupsError", c.name, c.err)
			continue
		}
		if ge.Code != c.code || ge.Group != c.grp {
			t.Errorf("%s: code %d group %d, want %d group %d", c.name, ge.Code, ge.Group, c.code, c.grp)
		}
	}
	keep, skip := ScreenGroups([]int{5, 1, 3, 2, 0})
	if len(keep) != 2 || keep[0] != 0 || keep[1] != 2 || len(skip) != 3 || skip[0].Group != 1 || skip[0].N != 1 || skip[0].Code != GroupsSmall {
		t.Errorf("ScreenGroups: keep %v skip %v", keep, skip) // rule: MinGroupReadings = 3 (common practice)
	}
}
