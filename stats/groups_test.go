package stats

import (
	"bufio"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"testing"
)

// Check values: testdata/rref/groups.tsv (R 4.2.2, written by groups.R:
// aov, oneway.test, kruskal.test, bartlett.test, t.test, wilcox.test,
// TukeyHSD; Brown-Forsythe, Games-Howell and Dunn by their formulas) and
// testdata/rref/groupsec.tsv (R 4.2.2, written by groupsec.R: the figures
// of each group, the limits, the counts outside with binom.test, Ppk from
// the overall SD and Cpk from the average moving range with Bissell's
// interval by its formula), both on the data sets of
// testdata/rref/groups-data.tsv (invented, plus R's PlantGrowth and the
// Hollander-Wolfe permeability data).

// grpSets returns each data set as its groups' readings as typed.
func grpSets(t testing.TB) map[string][][]string {
	t.Helper()
	f, err := os.Open(filepath.Join("..", "testdata", "rref", "groups-data.tsv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sets := map[string][][]string{}
	sc := bufio.NewScanner(f)
	sc.Scan()
	for sc.Scan() {
		p := strings.Split(sc.Text(), "\t")
		g, _ := strconv.Atoi(p[1])
		for len(sets[p[0]]) <= g {
			sets[p[0]] = append(sets[p[0]], nil)
		}
		sets[p[0]][g] = append(sets[p[0]][g], p[2])
	}
	return sets
}

// grpRefs reads a reference file as set -> stat -> value.
func grpRefs(t testing.TB, name string) map[string]map[string]float64 {
	t.Helper()
	f, err := os.Open(filepath.Join("..", "testdata", "rref", name))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	out := map[string]map[string]float64{}
	sc := bufio.NewScanner(f)
	sc.Scan()
	for sc.Scan() {
		p := strings.Split(sc.Text(), "\t")
		v, err := strconv.ParseFloat(p[2], 64)
		if err != nil {
			t.Fatalf("%s: %q", name, sc.Text())
		}
		if out[p[0]] == nil {
			out[p[0]] = map[string]float64{}
		}
		out[p[0]][p[1]] = v
	}
	return out
}

// grpLongText writes the groups as a two-column table (label, value), the
// groups one after another.
func grpLongText(groups [][]string) string {
	var b strings.Builder
	b.WriteString("Group\tValue\n")
	for i, g := range groups {
		for _, v := range g {
			fmt.Fprintf(&b, "G%d\t%s\n", i, v)
		}
	}
	return b.String()
}

// grpWideText writes the groups side by side, one column each.
func grpWideText(groups [][]string) string {
	var b strings.Builder
	n := 0
	for i, g := range groups {
		if i > 0 {
			b.WriteByte('\t')
		}
		fmt.Fprintf(&b, "G%d", i)
		n = max(n, len(g))
	}
	b.WriteByte('\n')
	for r := 0; r < n; r++ {
		for i, g := range groups {
			if i > 0 {
				b.WriteByte('\t')
			}
			if r < len(g) {
				b.WriteString(g[r])
			}
		}
		b.WriteByte('\n')
	}
	return b.String()
}

func grpNear(t *testing.T, what string, got, want, tol float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > tol*math.Max(1, math.Abs(want)) {
		t.Errorf("%s = %.15g, want %.15g (R 4.2.2), tol %g", what, got, want, tol)
	}
}

func grpTest(g *Groups, code string) *GroupTest {
	for _, s := range []*[]GroupTest{&g.Centre.Tests, &g.Spread.Tests} {
		for i := range *s {
			if (*s)[i].Code == code {
				return &(*s)[i]
			}
		}
	}
	return nil
}

// TestGroupsAgainstR runs every reference data set through Analyze as a
// group column and checks the section's figures against R 4.2.2.
func TestGroupsAgainstR(t *testing.T) {
	sets := grpSets(t)
	ref := grpRefs(t, "groups.tsv")
	sec := grpRefs(t, "groupsec.tsv")
	names := make([]string, 0, len(sets))
	for s := range sets {
		names = append(names, s)
	}
	sort.Strings(names)
	for _, s := range names {
		groups := sets[s]
		r, q := ref[s], sec[s]
		lsl, usl := q["lsl"], q["usl"]
		rep, err := Analyze(Request{Text: grpLongText(groups), Value: "Value", Group: "Group", Options: Options{LSL: &lsl, USL: &usl}})
		if err != nil {
			t.Fatalf("%s: %v", s, err)
		}
		g := rep.Groups
		if g == nil || len(g.Levels) != len(groups) {
			t.Fatalf("%s: groups %+v", s, g)
		}
		if !g.Exact || g.Shape != "long" || g.Column != "Group" {
			t.Errorf("%s: exact %v shape %q column %q", s, g.Exact, g.Shape, g.Column)
		}
		k := len(groups)
		for i, l := range g.Levels {
			p := fmt.Sprintf("g%d.", i)
			w := fmt.Sprintf("%s %s", s, l.Name)
			if l.Name != fmt.Sprintf("G%d", i) || float64(l.N) != q[p+"n"] || !l.InTests {
				t.Errorf("%s: name %q n %d in tests %v, want G%d, %g", w, l.Name, l.N, l.InTests, i, q[p+"n"])
			}
			grpNear(t, w+" mean", l.Mean, q[p+"mean"], 1e-15)
			grpNear(t, w+" sd", l.SD, q[p+"sd"], 1e-13)
			grpNear(t, w+" mean lo", l.MeanCI.Lo, q[p+"mean.lo"], 1e-12)
			grpNear(t, w+" mean hi", l.MeanCI.Hi, q[p+"mean.hi"], 1e-12)
			grpNear(t, w+" sd lo", l.SDCI.Lo, q[p+"sd.lo"], 1e-10)
			grpNear(t, w+" sd hi", l.SDCI.Hi, q[p+"sd.hi"], 1e-10)
			grpNear(t, w+" median", l.Median, q[p+"median"], 1e-14)
			grpNear(t, w+" q1", l.Box.Q1, q[p+"q1"], 1e-14)
			grpNear(t, w+" q3", l.Box.Q3, q[p+"q3"], 1e-14)
			outer := 0
			for _, sp := range l.Suspects {
				if sp.Flags[0].Rule == "tukey-outer" {
					outer++
				}
			}
			if float64(l.SuspectCount) != q[p+"inner"] || float64(outer) != q[p+"outer"] || len(l.Suspects) != l.SuspectCount {
				t.Errorf("%s: beyond the fences %d (outer %d, listed %d), want %g (outer %g)", w, l.SuspectCount, outer, len(l.Suspects), q[p+"inner"], q[p+"outer"])
			}
			sp := l.Spec
			if sp == nil || float64(sp.Below+sp.Above) != q[p+"outside"] {
				t.Errorf("%s: spec %+v, want %g outside", w, sp, q[p+"outside"])
				continue
			}
			grpNear(t, w+" outside lo", sp.OutsideCI.Lo, q[p+"outside.lo"], 1e-9)
			grpNear(t, w+" outside hi", sp.OutsideCI.Hi, q[p+"outside.hi"], 1e-9)
			if sp.Ppk == nil || sp.Cpk == nil || sp.SigmaWithin == nil || sp.Sigma != WithinMovingRange {
				t.Errorf("%s: spec %+v, want Ppk and Cpk from the moving range", w, sp)
				continue
			}
			grpNear(t, w+" ppk", *sp.Ppk, q[p+"ppk"], 1e-12)
			grpNear(t, w+" ppk lo", sp.PpkCI.Lo, q[p+"ppk.lo"], 1e-9)
			grpNear(t, w+" ppk hi", sp.PpkCI.Hi, q[p+"ppk.hi"], 1e-9)
			grpNear(t, w+" sigma within", *sp.SigmaWithin, q[p+"sigma.within"], 1e-12)
			grpNear(t, w+" cpk", *sp.Cpk, q[p+"cpk"], 1e-12)
			grpNear(t, w+" cpk lo", sp.CpkCI.Lo, q[p+"cpk.lo"], 1e-9)
			grpNear(t, w+" cpk hi", sp.CpkCI.Hi, q[p+"cpk.hi"], 1e-9)
		}
		// centre and spread tests
		if g.Centre == nil || g.Spread == nil {
			t.Fatalf("%s: centre %v spread %v", s, g.Centre, g.Spread)
		}
		a := grpTest(g, "anova")
		grpNear(t, s+" anova F", a.Statistic, r["anova.F"], 1e-10)
		grpNear(t, s+" anova p", a.P, r["anova.p"], 1e-9)
		bf := grpTest(g, "brown-forsythe")
		grpNear(t, s+" bf F", bf.Statistic, r["bf.F"], 1e-10)
		grpNear(t, s+" bf p", bf.P, r["bf.p"], 1e-9)
		ba := grpTest(g, "bartlett")
		grpNear(t, s+" bartlett", ba.Statistic, r["bartlett.K2"], 1e-10)
		grpNear(t, s+" bartlett p", ba.P, r["bartlett.p"], 1e-9)
		grpNear(t, s+" sd ratio", g.Spread.Ratio, r["sdratio.ratio"], 1e-12)
		if k == 2 {
			wt := grpTest(g, "welch-t")
			grpNear(t, s+" welch t", wt.Statistic, -r["welcht.t"], 1e-10) // R: group 0 minus group 1
			grpNear(t, s+" welch t p", wt.P, r["welcht.p"], 1e-9)
			e := g.Effect
			grpNear(t, s+" diff", e.MeanDiff, q["diff"], 1e-12)
			grpNear(t, s+" diff lo", e.MeanDiffCI.Lo, q["diff.lo"], 1e-10)
			grpNear(t, s+" diff hi", e.MeanDiffCI.Hi, q["diff.hi"], 1e-10)
			mw := grpTest(g, "mann-whitney")
			grpNear(t, s+" mw p", mw.P, q["mw.p"], 1e-9)
			// the shift by its definition (R's median of outer(x, y, "-"),
			// group 0 minus group 1 there); R's own estimate and limits
			// with the normal approximation come from uniroot(tol = 1e-4)
			grpNear(t, s+" shift", *e.Shift, -r["hl.median"], 1e-12)
			tol := 1e-12
			if !strings.Contains(mw.Method, "exact") {
				tol = 2e-4
			}
			grpNear(t, s+" shift R", *e.Shift, q["shift"], tol)
			grpNear(t, s+" shift lo", e.ShiftCI.Lo, q["shift.lo"], tol)
			grpNear(t, s+" shift hi", e.ShiftCI.Hi, q["shift.hi"], tol)
			grpNear(t, s+" hedges g", *e.HedgesG, -r["hedges.g"], 1e-10)
			grpNear(t, s+" sd ratio lo", g.Spread.RatioCI.Lo, r["sdratio.lo"], 1e-9)
			continue
		}
		wa := grpTest(g, "welch-anova")
		grpNear(t, s+" welch F", wa.Statistic, r["welch.F"], 1e-10)
		grpNear(t, s+" welch p", wa.P, r["welch.p"], 1e-9)
		kw := grpTest(g, "kruskal-wallis")
		grpNear(t, s+" kw H", kw.Statistic, r["kw.H"], 1e-10)
		grpNear(t, s+" kw p", kw.P, r["kw.p"], 1e-9)
		// pairwise: the method the section chose, checked against R's
		pw := g.Pairwise
		if pw == nil || pw.Means == nil || pw.Medians == nil {
			t.Fatalf("%s: pairwise %+v", s, pw)
		}
		pre := map[string]string{"tukey-kramer": "tukey.", "games-howell": "gh."}[pw.Means.Method]
		c := 0
		for i := 0; i < k; i++ {
			for j := i + 1; j < k; j++ {
				key := fmt.Sprintf("%d-%d", i, j)
				mp, dp := pw.Means.Pairs[c], pw.Medians.Pairs[c]
				c++
				if mp.A != fmt.Sprintf("G%d", i) || mp.B != fmt.Sprintf("G%d", j) {
					t.Fatalf("%s: pair %d is %s-%s", s, c, mp.A, mp.B)
				}
				se := (mp.CI.Hi - mp.CI.Lo) / 10 // R's qtukey stops at a step of about 1e-4 (see stats/method)
				grpNear(t, s+" "+pre+key+" diff", *mp.Diff, r[pre+key+".diff"], 1e-12)
				grpNear(t, s+" "+pre+key+" p", mp.P, r[pre+key+".p"], 1e-8)
				grpNear(t, s+" "+pre+key+" lo", mp.CI.Lo, r[pre+key+".lo"], 1e-4*se)
				grpNear(t, s+" "+pre+key+" hi", mp.CI.Hi, r[pre+key+".hi"], 1e-4*se)
				grpNear(t, s+" dunn "+key+" z", dp.Statistic, r["dunn."+key+".z"], 1e-10)
				grpNear(t, s+" dunn "+key+" padj", dp.P, r["dunn."+key+".padj"], 1e-9)
				if mp.Differ != (mp.P < g.Alpha) || dp.Differ != (dp.P < g.Alpha) {
					t.Errorf("%s %s: differ flags %v %v against p %g %g", s, key, mp.Differ, dp.Differ, mp.P, dp.P)
				}
			}
		}
	}
}

// TestGroupsLetters checks the letters by their definition (Piepho 2004):
// two tested groups share a letter exactly when the leading pairwise set
// does not find them different.
func TestGroupsLetters(t *testing.T) {
	sets := grpSets(t)
	for _, s := range []string{"g3-equal", "g4-unequal", "g5-ties", "g6-outlier", "g8-mixed", "plantgrowth"} {
		rep, err := Analyze(Request{Text: grpLongText(sets[s]), Value: "Value", Group: "Group"})
		if err != nil {
			t.Fatal(err)
		}
		g := rep.Groups
		set := g.Pairwise.Means
		if g.Pairwise.LettersFrom == "medians" {
			set = g.Pairwise.Medians
		}
		if !set.Lead || (g.Lead == "medians") != (g.Pairwise.LettersFrom == "medians") {
			t.Errorf("%s: letters from %s, lead %s", s, g.Pairwise.LettersFrom, g.Lead)
		}
		idx := map[string]int{}
		for i, l := range g.Levels {
			idx[l.Name] = i
			if l.Letters == "" {
				t.Errorf("%s: %s has no letter", s, l.Name)
			}
		}
		share := func(a, b string) bool {
			for _, x := range a {
				if strings.ContainsRune(b, x) {
					return true
				}
			}
			return false
		}
		for _, p := range set.Pairs {
			la, lb := g.Levels[idx[p.A]].Letters, g.Levels[idx[p.B]].Letters
			if share(la, lb) == p.Differ {
				t.Errorf("%s: %s (%s) and %s (%s) share a letter %v, differ %v", s, p.A, la, p.B, lb, share(la, lb), p.Differ)
			}
		}
	}
}

// TestGroupsWideLikeLong: the same readings side by side (one column per
// group) and as a group column give the same section, apart from the
// shape, the column names and the rows.
func TestGroupsWideLikeLong(t *testing.T) {
	sets := grpSets(t)
	for _, s := range []string{"g2-equal", "g2-ties", "g4-unequal", "g6-outlier", "plantgrowth"} {
		groups := sets[s]
		lsl, usl := 1.0, 1e6
		opts := Options{LSL: &lsl, USL: &usl, Confidence: 0.9}
		long, err := Analyze(Request{Text: grpLongText(groups), Value: "Value", Group: "Group", Options: opts})
		if err != nil {
			t.Fatal(err)
		}
		names := make([]string, len(groups))
		for i := range groups {
			names[i] = fmt.Sprintf("G%d", i)
		}
		wide, err := Analyze(Request{Text: grpWideText(groups), Groups: names, Options: opts})
		if err != nil {
			t.Fatal(err)
		}
		if wide.Groups.Shape != "wide" || strings.Join(wide.Groups.Columns, ",") != strings.Join(names, ",") || long.Groups.Shape != "long" {
			t.Errorf("%s: shapes %q %q, columns %v", s, wide.Groups.Shape, long.Groups.Shape, wide.Groups.Columns)
		}
		if a, b := grpComparable(t, long.Groups), grpComparable(t, wide.Groups); a != b {
			t.Errorf("%s: wide and long sections differ:\nlong %s\nwide %s", s, a, b)
		}
	}
}

// grpComparable is the section as JSON without what depends on the layout
// (shape, columns, rows, the column of a reading, titles with the column
// name).
func grpComparable(t *testing.T, g *Groups) string {
	c := *g
	c.Shape, c.Column, c.Columns = "", "", nil
	c.Statement = strings.ReplaceAll(c.Statement, "Group G", "G")
	c.Levels = nil
	for _, l := range g.Levels {
		l.Title = ""
		l.Points = nil
		l.Thinned = false
		var sus []Suspect
		for _, s := range l.Suspects {
			s.Row, s.Column = 0, ""
			sus = append(sus, s)
		}
		l.Suspects = sus
		c.Levels = append(c.Levels, l)
	}
	c.Reasons = nil
	for _, r := range g.Reasons {
		r.Text = strings.ReplaceAll(r.Text, "Group G", "G")
		c.Reasons = append(c.Reasons, r)
	}
	b, err := json.Marshal(c)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// TestGroupsSmallAndRefused: groups of one or two readings are listed and
// left out of the tests; more than 50 groups, a group column mixed with
// side-by-side columns, and one side-by-side column are refused with
// their codes.
func TestGroupsSmallAndRefused(t *testing.T) {
	text := "Line\tW\nA\t5.1\nA\t5.2\nA\t5.3\nA\t5.25\nB\t5.4\nB\t5.5\nB\t5.45\nB\t5.6\nC\t5.0\nC\t5.9\nD\t7.7\n"
	rep, err := Analyze(Request{Text: text, Value: "W", Group: "Line"})
	if err != nil {
		t.Fatal(err)
	}
	g := rep.Groups
	if len(g.Levels) != 4 {
		t.Fatalf("levels %+v", g.Levels)
	}
	for i, want := range []bool{true, true, false, false} {
		l := g.Levels[i]
		if l.InTests != want || (l.LeftOut != "") == want {
			t.Errorf("%s: in tests %v, left out %q", l.Name, l.InTests, l.LeftOut)
		}
	}
	if g.Effect == nil || !strings.Contains(g.Statement, "2 groups with fewer than 3 readings") {
		t.Errorf("two tested groups expected; statement %q", g.Statement)
	}
	// a single group with enough readings: listed, no tests, a note
	rep, err = Analyze(Request{Text: "Line\tW\nA\t5.1\nA\t5.2\nA\t5.3\nB\t5.4\n", Value: "W", Group: "Line"})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Groups.Centre != nil || rep.Groups.Lead != "" || !strings.HasPrefix(rep.Groups.Statement, "No comparison") {
		t.Errorf("one testable group: %+v", rep.Groups)
	}
	// 51 groups
	var b strings.Builder
	b.WriteString("Lot\tW\n")
	for i := 0; i < 51; i++ {
		fmt.Fprintf(&b, "L%d\t5.%d\nL%d\t5.%d1\n", i, i%10, i, i%10)
	}
	_, err = Analyze(Request{Text: b.String(), Value: "W", Group: "Lot"})
	if CodeOf(err) != CodeTooManyGroups {
		t.Errorf("51 groups: %v (code %s)", err, CodeOf(err))
	}
	wide := "A\tB\tC\n1.1\t1.2\t1.3\n1.2\t1.4\t1.1\n1.3\t1.0\t1.2\n"
	for _, c := range []struct {
		req  Request
		code string
	}{
		{Request{Text: wide, Groups: []string{"A", "B"}, Group: "C"}, CodeBadRequest},
		{Request{Text: wide, Groups: []string{"A"}}, CodeColumn},
		{Request{Text: wide, Groups: []string{"A", "A"}}, CodeColumn},
		{Request{Text: wide, Groups: []string{"A", "Z"}}, CodeColumn},
	} {
		if _, err := Analyze(c.req); CodeOf(err) != c.code {
			t.Errorf("%+v: %v, want code %s", c.req.Groups, err, c.code)
		}
	}
	if rep, err := Analyze(Request{Text: wide, Groups: []string{"A", "B", "C"}}); err != nil || rep.Groups == nil || len(rep.Groups.Levels) != 3 {
		t.Errorf("wide A, B, C: %v", err)
	}
}

// TestGroupsExactFences: the fences are decided on the decimals as typed.
// Group A's quartiles (type 7) are 1.1 and 1.3 (IQR 0.2), so its upper
// inner fence is exactly 1.6: 1.6 itself is not beyond it, 1.61 is
// (Tukey 1977: beyond means strictly outside; worked by hand). In binary
// doubles 1.3 + 1.5 × (1.3 - 1.1) is 1.6000000000000003 and 1.1 - 0.3
// is 0.8000000000000003, which would get 0.8 wrong.
func TestGroupsExactFences(t *testing.T) {
	for _, c := range []struct {
		hi, lo string
		want   int
	}{{"1.6", "0.8", 0}, {"1.61", "0.8", 1}, {"1.6", "0.79", 1}} {
		text := "G\tV\nA\t1.1\nA\t1.1\nA\t1.2\nA\t1.3\nA\t1.3\nA\t" + c.hi + "\nA\t" + c.lo + "\nA\t1.2\nA\t1.1\nA\t1.3\nA\t1.2\n"
		text += "B\t2.1\nB\t2.2\nB\t2.3\n"
		rep, err := Analyze(Request{Text: text, Value: "V", Group: "G"})
		if err != nil {
			t.Fatal(err)
		}
		l := rep.Groups.Levels[0]
		if l.Box.Q1 != 1.1 || l.Box.Q3 != 1.3 {
			t.Fatalf("quartiles %g %g, want 1.1 and 1.3 (by hand)", l.Box.Q1, l.Box.Q3)
		}
		if l.SuspectCount != c.want {
			t.Errorf("with %s and %s: %d beyond the fences, want %d (%+v)", c.hi, c.lo, l.SuspectCount, c.want, l.Suspects)
		}
	}
}

// TestGroupsLeadFollowsShape: clean symmetric groups lead with Welch's
// tests and Games-Howell or Tukey-Kramer as the spreads and sizes say; a
// group with a far reading makes the rank tests lead (the verdict's rule
// 3, Tukey 1977 outer fence).
func TestGroupsLeadFollowsShape(t *testing.T) {
	sets := grpSets(t)
	rep, _ := Analyze(Request{Text: grpLongText(sets["g3-equal"]), Value: "Value", Group: "Group"})
	g := rep.Groups
	if g.Lead != "means" || g.Centre.Lead != "welch-anova" {
		t.Errorf("g3-equal: lead %s, %s (reasons %v)", g.Lead, g.Centre.Lead, g.Reasons)
	}
	wantM := "tukey-kramer"
	if g.Spread.Differ {
		wantM = "games-howell"
	}
	if g.Pairwise.Means.Method != wantM {
		t.Errorf("g3-equal (equal sizes): %s, want %s", g.Pairwise.Means.Method, wantM)
	}
	rep, _ = Analyze(Request{Text: grpLongText(sets["g4-unequal"]), Value: "Value", Group: "Group"})
	if m := rep.Groups.Pairwise.Means.Method; m != "games-howell" {
		t.Errorf("g4-unequal (unequal sizes): %s, want games-howell", m)
	}
	groups := [][]string{append([]string{"9.0"}, sets["g3-equal"][0]...), sets["g3-equal"][1], sets["g3-equal"][2]}
	rep, _ = Analyze(Request{Text: grpLongText(groups), Value: "Value", Group: "Group"})
	g = rep.Groups
	if g.Lead != "medians" || g.Centre.Lead != "kruskal-wallis" || g.Spread.Lead != "brown-forsythe" || g.Pairwise.LettersFrom != "medians" {
		t.Errorf("far reading: lead %s, centre %s, spread %s, letters %s", g.Lead, g.Centre.Lead, g.Spread.Lead, g.Pairwise.LettersFrom)
	}
	found := false
	for _, r := range g.Reasons {
		if r.Code == "beyond-outer-fence" && strings.HasPrefix(r.Text, "Group G0") {
			found = true
		}
	}
	if !found {
		t.Errorf("reasons %v do not name group G0's far reading", g.Reasons)
	}
}

// TestGroupsFloatPath: readings in exponent form are not plain decimals:
// the rank tests run on doubles and a Note says so; the figures agree
// with R 4.2.2 all the same (the values are the same numbers).
func TestGroupsFloatPath(t *testing.T) {
	sets := grpSets(t)
	ref := grpRefs(t, "groups.tsv")["plantgrowth"]
	groups := make([][]string, len(sets["plantgrowth"]))
	for i, g := range sets["plantgrowth"] {
		for _, v := range g {
			f, _ := strconv.ParseFloat(v, 64)
			groups[i] = append(groups[i], strconv.FormatFloat(f, 'e', -1, 64))
		}
	}
	rep, err := Analyze(Request{Text: grpLongText(groups), Value: "Value", Group: "Group"})
	if err != nil {
		t.Fatal(err)
	}
	g := rep.Groups
	noted := false
	for _, n := range rep.Notes {
		noted = noted || n.Field == "groups.exact"
	}
	if g.Exact || !noted {
		t.Errorf("exact %v, noted %v", g.Exact, noted)
	}
	grpNear(t, "float kw H", grpTest(g, "kruskal-wallis").Statistic, ref["kw.H"], 1e-10)
}

// FuzzGroups: the section never panics, a successful report is JSON
// without NaN or Inf (checkClean), every group's readings are counted
// once, and wide and long input of the same readings agree on the groups'
// sizes. The fuzzer gives a list of (group, reading) pairs as text. Run
// long with
//
//	go test -run '^$' -fuzz FuzzGroups -fuzztime 10m -parallel 1 ./stats/
func FuzzGroups(f *testing.F) {
	for _, s := range []string{
		"A 1\nA 2\nA 3\nB 4\nB 5\nB 6\n", "A 1\nB 1\nA 1\nB 1\nA 1\nB 1\n", "A 1e300\nA -1e300\nA 0\nB 1\nB 2\nB 3\n",
		"A 0.1\nA 0.10\nA 0.100\nB 5\nB 5\nB 5\nC 7\n", "A 1\nB 2\nC 3\nD 4\n", "A 5.10\nA 5.12\nA 5.60\nA 5.11\nB 5.2\nB 5.3\nB 5.25\nC 1\nC 1\nC 1\n",
		"A 1.7976931348623157e308\nA 1\nA 2\nB -1.7976931348623157e308\nB 3\nB 4\n",
	} {
		f.Add(s, 0.95, true)
	}
	f.Fuzz(func(t *testing.T, pairs string, conf float64, limits bool) {
		groups := map[string][]string{}
		var order []string
		for _, line := range strings.Split(pairs, "\n") {
			g, v, ok := strings.Cut(strings.TrimSpace(line), " ")
			if !ok || g == "" || strings.ContainsAny(g+v, "\t\r\"") || strings.TrimSpace(v) == "" {
				continue
			}
			if _, seen := groups[g]; !seen {
				order = append(order, g)
			}
			groups[g] = append(groups[g], strings.TrimSpace(v))
		}
		if len(order) == 0 || len(order) > 60 {
			return
		}
		var long strings.Builder
		long.WriteString("Grp\tVal\n")
		var gs [][]string
		for _, g := range order {
			gs = append(gs, groups[g])
			for _, v := range groups[g] {
				long.WriteString("L" + g + "\t" + v + "\n")
			}
		}
		o := Options{Confidence: conf}
		if limits {
			lsl, usl := -1.0, 1.0
			o.LSL, o.USL = &lsl, &usl
		}
		rep, err := Analyze(Request{Text: long.String(), Value: "Val", Group: "Grp", Options: o})
		if err != nil {
			return
		}
		checkClean(t, rep)
		if rep.Groups == nil {
			return
		}
		total := 0
		for _, l := range rep.Groups.Levels {
			total += l.N
			if l.InTests != (l.N >= 3) {
				t.Fatalf("group %s of %d readings: in tests %v", l.Name, l.N, l.InTests)
			}
		}
		if total != rep.Counts.Used {
			t.Fatalf("groups hold %d readings, the column %d", total, rep.Counts.Used)
		}
		names := make([]string, len(gs))
		for i := range gs {
			names[i] = fmt.Sprintf("G%d", i)
		}
		if len(gs) < 2 {
			return
		}
		wide, err := Analyze(Request{Text: grpWideText(gs), Groups: names, Options: o})
		if err != nil || wide.Groups == nil {
			return // the reader may read a column of the wide table differently (e.g. as dates)
		}
		checkClean(t, wide)
	})
}
