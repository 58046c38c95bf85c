package stats

import (
	"encoding/json"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
	"testing"

	"lotlens/stats/internal/rref"
	"lotlens/stats/method"
)

// The section's figures against R 4.2.2 (testdata/rref/control.R, base R
// formulas written out; values in testdata/rref/control.tsv). The series
// are the script's invented data, typed at the decimals the script rounds
// them to, so the section runs on the decimals as typed.

func loadControl(t *testing.T) map[string]map[string]float64 {
	t.Helper()
	return rref.Load(t, "control.tsv", 5)
}

// seriesText writes the readings x:1..x:n of a set, one a line, with dec
// decimals (row i+1 holds reading i... no header: row i holds reading i).
func seriesText(ref map[string]float64, dec int) (string, int) {
	var b strings.Builder
	n := 0
	for i := 1; ; i++ {
		v, ok := ref[fmt.Sprintf("x:%d", i)]
		if !ok {
			break
		}
		b.WriteString(strconv.FormatFloat(v, 'f', dec, 64) + "\n")
		n++
	}
	return b.String(), n
}

// groupText writes the subgroups g:i:j as "label<TAB>value" lines under a header.
func groupText(ref map[string]float64, dec int) string {
	var b strings.Builder
	b.WriteString("Lot\tValue\n")
	for i := 1; ; i++ {
		if _, ok := ref[fmt.Sprintf("g:%d:1", i)]; !ok {
			break
		}
		for j := 1; ; j++ {
			v, ok := ref[fmt.Sprintf("g:%d:%d", i, j)]
			if !ok {
				break
			}
			fmt.Fprintf(&b, "L%02d\t%s\n", i, strconv.FormatFloat(v, 'f', dec, 64))
		}
	}
	return b.String()
}

func nearR(t *testing.T, what string, got, want, tol float64) {
	t.Helper()
	if math.Abs(got-want) > tol*math.Max(1, math.Abs(want)) {
		t.Errorf("%s = %.15g, want %.15g (R 4.2.2)", what, got, want)
	}
}

func stab(t *testing.T, req Request) *Stability {
	t.Helper()
	rep, err := Analyze(req)
	if err != nil {
		t.Fatal(err)
	}
	if rep.Stability == nil {
		t.Fatalf("no stability section; notes %v", rep.Notes)
	}
	return rep.Stability
}

func TestStabilityIndividualsAgainstR(t *testing.T) {
	ref := loadControl(t)
	for _, c := range []struct {
		set string
		dec int
	}{{"ind", 3}, {"ar", 2}, {"ties", 1}, {"small", 2}} {
		r := ref[c.set]
		text, n := seriesText(r, c.dec)
		s := stab(t, Request{Text: text})
		if s.Chart == nil || s.Chart.Kind != "individuals" || s.Chart.Count != n {
			t.Fatalf("%s: chart %+v", c.set, s.Chart)
		}
		// limits from all readings (R: mean, mean moving range / d2(2))
		nearR(t, c.set+" centre", s.Chart.Centre, r["all.centre"], 1e-14)
		nearR(t, c.set+" sigma", s.Chart.Sigma, r["all.sigma"], 1e-12)
		// EWMA (lambda 0.2, L 3) and CUSUM (k 0.5, h 5), the section's defaults
		for _, p := range []int{1, n / 2, n} {
			e := s.EWMA.Points[p-1]
			nearR(t, fmt.Sprintf("%s ewma:%d", c.set, p), e.Z, r[fmt.Sprintf("ewma:%d", p)], 1e-12)
			nearR(t, fmt.Sprintf("%s ewma half-width:%d", c.set, p), e.Hi-s.EWMA.Centre, r[fmt.Sprintf("ewmahw:%d", p)], 1e-9)
			cu := s.CUSUM.Points[p-1]
			nearR(t, fmt.Sprintf("%s cusum+:%d", c.set, p), cu.Up, r[fmt.Sprintf("cusum+:%d", p)], 1e-9)
			nearR(t, fmt.Sprintf("%s cusum-:%d", c.set, p), cu.Down, r[fmt.Sprintf("cusum-:%d", p)], 1e-9)
		}
		d := s.Drift
		if !d.Exact {
			t.Errorf("%s: drift tests not on the decimals as typed", c.set)
		}
		nearR(t, c.set+" r1", d.Autocorrelation.R1, r["r1"], 1e-12)
		nearR(t, c.set+" Ljung-Box Q", d.Autocorrelation.Q, r["lbq"], 1e-10)
		nearR(t, c.set+" Ljung-Box p", d.Autocorrelation.P, r["lbp"], 1e-9)
		nearR(t, c.set+" runs", float64(d.Runs.Runs), r["runs"], 0)
		nearR(t, c.set+" runs above", float64(d.Runs.Above), r["runs.above"], 0)
		nearR(t, c.set+" runs z", d.Runs.Z, r["runs.z"], 1e-12)
		nearR(t, c.set+" runs exact p", d.Runs.P, r["runs.pexact"], 1e-9)
		nearR(t, c.set+" longest run", float64(d.Runs.Longest), r["runs.longest"], 0)
		nearR(t, c.set+" Mann-Kendall S", float64(d.Trend.S), r["mk.s"], 0)
		nearR(t, c.set+" Mann-Kendall var", d.Trend.VarS, r["mk.var"], 1e-12)
		nearR(t, c.set+" Mann-Kendall p", d.Trend.P, r["mk.p"], 1e-9)
		nearR(t, c.set+" Kendall tau", d.Trend.Tau, r["mk.tau"], 1e-12)
		nearR(t, c.set+" Sen slope", d.Slope.Slope, r["sen.slope"], 1e-12)
		nearR(t, c.set+" Sen lower", d.Slope.Lower, r["sen.lo"], 1e-12)
		nearR(t, c.set+" Sen upper", d.Slope.Upper, r["sen.hi"], 1e-12)
		nearR(t, c.set+" Sen intercept", d.Slope.Intercept, r["sen.intercept"], 1e-12)
		// Pettitt: R's t is the last reading before the change
		if s.Change == nil || s.Change.Position != int(r["pettitt.t"])+1 || s.Change.Row != int(r["pettitt.t"])+1 {
			t.Errorf("%s: change point %+v, want after reading %g (R 4.2.2)", c.set, s.Change, r["pettitt.t"])
		} else {
			nearR(t, c.set+" Pettitt K", s.Change.Statistic, r["pettitt.k"], 0)
			nearR(t, c.set+" Pettitt p", s.Change.P, r["pettitt.p"], 1e-12)
			nearR(t, c.set+" mean before", s.Change.MeanBefore, r["pettitt.before"], 1e-14)
			nearR(t, c.set+" mean after", s.Change.MeanAfter, r["pettitt.after"], 1e-14)
		}
		// limits from the first half as baseline (rows = readings: no header)
		half := n / 2
		sb := stab(t, Request{Text: text, Options: Options{Baseline: fmt.Sprintf("1-%d", half)}})
		nearR(t, c.set+" baseline centre", sb.Chart.Centre, r["half.centre"], 1e-14)
		nearR(t, c.set+" baseline sigma", sb.Chart.Sigma, r["half.sigma"], 1e-12)
		if sb.Baseline == nil || sb.Baseline.Points != half || sb.Chart.SigmaShared || !strings.Contains(sb.Verdict, fmt.Sprintf("limits set from readings 1-%d", half)) {
			t.Errorf("%s: baseline %+v, verdict %q", c.set, sb.Baseline, sb.Verdict)
		}
		for _, p := range sb.Chart.Points {
			if p.Outside != (p.I > half) {
				t.Errorf("%s: point %d outside the baseline = %v", c.set, p.I, p.Outside)
				break
			}
		}
		// the median moving range (R: median / d4(2))
		sm := stab(t, Request{Text: text, Options: Options{WithinSigma: WithinMedianMovingRange}})
		nearR(t, c.set+" median-MR sigma", sm.Chart.Sigma, r["all.sigmamed"], 1e-12)
	}
}

func TestStabilitySubgroupsAgainstR(t *testing.T) {
	ref := loadControl(t)
	for _, c := range []struct {
		set, kind string
		dec       int
	}{{"sub-eq", "mean-range", 3}, {"sub-uneq", "mean-range", 3}, {"sub-big", "mean-sd", 2}} {
		r := ref[c.set]
		text := groupText(r, c.dec)
		for _, w := range []struct{ within, stat string }{{"", "sigma.pooled"}, {WithinMeanRange, "sigma.r"}, {WithinMeanSD, "sigma.s"}} {
			s := stab(t, Request{Text: text, Value: "Value", Subgroup: "Lot", Options: Options{WithinSigma: w.within}})
			ch := s.Chart
			if ch == nil || ch.Kind != c.kind {
				t.Fatalf("%s: chart %+v, want %s (chosen by subgroup size)", c.set, ch, c.kind)
			}
			nearR(t, c.set+" centre", ch.Centre, r["centre"], 1e-14)
			nearR(t, c.set+" "+w.stat, ch.Sigma, r[w.stat], 1e-12)
			// limits per subgroup: centre ± 3σ/√n (ASTM E2587), each segment
			for _, l := range ch.Limits {
				nI := ch.Points[l.From-1].N
				nearR(t, c.set+" upper limit", l.Upper, r["centre"]+3*r[w.stat]/math.Sqrt(float64(nI)), 1e-12)
			}
		}
		// the spread chart can be chosen
		s := stab(t, Request{Text: text, Value: "Value", Subgroup: "Lot", Options: Options{ChartSpread: "sd"}})
		if s.Chart.Kind != "mean-sd" || !strings.Contains(s.Chart.KindRule, "chosen") {
			t.Errorf("%s: chartSpread sd gave %s (%s)", c.set, s.Chart.Kind, s.Chart.KindRule)
		}
	}
	// unequal sizes: one limit segment per run of equal sizes (3, 5, 8, 4, 6 repeated)
	s := stab(t, Request{Text: groupText(ref["sub-uneq"], 3), Value: "Value", Subgroup: "Lot"})
	if len(s.Chart.Limits) != 20 || s.EWMA.Scale != "standardized" {
		t.Errorf("unequal sizes: %d limit segments, EWMA scale %s; want 20 and standardized", len(s.Chart.Limits), s.EWMA.Scale)
	}
}

// TestStabilityVerdicts: the lead sentence and the flag for a stable
// series, a shift (after a baseline), and the caution for the spec section.
func TestStabilityVerdicts(t *testing.T) {
	// alternating small steps about 10.00: no check fires (constructed)
	var b strings.Builder
	for i := 0; i < 40; i++ {
		fmt.Fprintf(&b, "%.2f\n", 10+0.01*float64([]int{0, 1, -1, 2, -2, 1, 0, -1}[i%8]))
	}
	s := stab(t, Request{Text: b.String()})
	if !s.Stable || s.Verdict != "Stable over the 40 readings: no signal" {
		t.Errorf("stable series: %v %q %+v", s.Stable, s.Verdict, s.Reasons)
	}
	if c := s.Caution(); c != nil {
		t.Errorf("a stable process gives a caution: %+v", c)
	}
	// the same, then 20 readings 0.05 higher: a shift from reading 41
	for i := 0; i < 20; i++ {
		fmt.Fprintf(&b, "%.2f\n", 10.05+0.01*float64([]int{0, 1, -1, 2, -2, 1, 0, -1}[i%8]))
	}
	s = stab(t, Request{Text: b.String(), Options: Options{Baseline: "1-40"}})
	if s.Stable || !strings.HasPrefix(s.Verdict, "Shift upward from reading 41 (about +0.05") || !strings.HasSuffix(s.Verdict, "limits set from readings 1-40") {
		t.Errorf("shifted series: %q", s.Verdict)
	}
	if c := s.Caution(); c == nil || c.Code != "not-stable" || c.Text != s.Verdict {
		t.Errorf("caution %+v", c)
	}
	for _, sg := range s.Signals {
		for _, r := range sg.Rows {
			if r < 1 || r > 60 {
				t.Errorf("signal %+v lists row %d", sg, r)
			}
		}
	}
}

// TestStabilityEdges: too few readings, constant data, all subgroups of
// one, one subgroup, a time column with duplicates, a gap and rows out of
// order, exponent input, readings left out, bad options.
func TestStabilityEdges(t *testing.T) {
	for _, text := range []string{"5\n", "5\n6\n"} {
		s := stab(t, Request{Text: text})
		if s.Judged || s.Stable || s.Reasons[0].Code != "too-few" || s.Chart != nil {
			t.Errorf("%q: %+v", text, s)
		}
		if c := s.Caution(); c == nil || c.Code != "stability-not-judged" {
			t.Errorf("%q: caution %+v", text, c)
		}
	}
	s := stab(t, Request{Text: "5\n5\n5\n5\n"})
	if s.Judged || s.Reasons[0].Code != "no-spread" {
		t.Errorf("constant: %+v", s.Reasons)
	}
	// every subgroup of one reading: charted as individuals, with a note
	rep, err := Analyze(Request{Text: "Lot\tV\nA\t1.0\nB\t1.2\nC\t0.9\nD\t1.1\nE\t1.0\n", Value: "V", Subgroup: "Lot"})
	if err != nil || rep.Stability.Chart == nil || rep.Stability.Chart.Kind != "individuals" {
		t.Fatalf("all singles: %v %+v", err, rep.Stability)
	}
	// one subgroup
	s = stab(t, Request{Text: "Lot\tV\nA\t1.0\nA\t1.2\nA\t0.9\nA\t1.1\n", Value: "V", Subgroup: "Lot"})
	if s.Chart == nil || s.Chart.Count != 1 || s.Chart.Kind != "mean-range" {
		t.Errorf("one subgroup: %+v", s.Chart)
	}
	// a time column: a duplicate time, one gap of an hour, one row out of order
	text := "When\tV\n2026-03-02 08:00\t5.1\n2026-03-02 08:05\t5.2\n2026-03-02 08:15\t5.0\n2026-03-02 08:10\t5.1\n2026-03-02 08:15\t5.3\n" +
		"2026-03-02 08:20\t5.1\n2026-03-02 09:20\t5.2\n2026-03-02 09:25\t5.0\n2026-03-02 09:30\t5.1\n"
	s = stab(t, Request{Text: text, Value: "V", Order: "When"})
	o := s.Order
	if o.Source != "column" || o.Kind != "time" || o.Duplicates != 1 || o.OutOfOrder != 1 || o.GapCount != 1 || o.MedianStep != 300 ||
		o.Gaps[0].AfterRow != 7 || o.Gaps[0].BeforeRow != 8 || o.Gaps[0].Step != 3600 || !s.Chart.TimeAxis {
		t.Errorf("time order: %+v", o)
	}
	if s.Chart.Points[2].Row != 5 || s.Chart.Points[3].Row != 4 {
		t.Errorf("the chart does not follow the time column: %+v", s.Chart.Points[:4])
	}
	// exponent form: the drift tests fall back to binary values, with a note
	rep, _ = Analyze(Request{Text: "1e0\n1.2\n0.9\n1.1\n1.0\n1.3\n"})
	if rep.Stability.Drift == nil || rep.Stability.Drift.Exact || !hasNote(rep, "stability.drift") {
		t.Errorf("exponent form: %+v", rep.Stability.Drift)
	}
	// a reading left out stays on the chart, marked, and is listed
	rep, _ = Analyze(Request{Text: "5.1\n5.2\n9.9\n5.0\n5.1\n5.2\n", Options: Options{Exclude: []int{3}}})
	st := rep.Stability
	if len(st.LeftOut) != 1 || st.LeftOut[0].Row != 3 || st.Chart.Count != 6 || !st.Chart.Points[2].LeftOut || st.Chart.Points[2].Flags != nil {
		t.Errorf("left out: %+v %+v", st.LeftOut, st.Chart.Points)
	}
	for _, o := range []Options{{Baseline: "x-3"}, {Baseline: "5-2"}, {Signals: map[string]bool{"rule-1": true}}, {EWMALambda: 1.5}, {EWMAL: -1}, {CUSUMK: -0.5}, {CUSUMH: 100}, {ChartSpread: "mad"}} {
		if _, err := Analyze(Request{Text: "1\n2\n3\n", Options: o}); CodeOf(err) != CodeBadOption {
			t.Errorf("%+v: got %v, want %s", o, err, CodeBadOption)
		}
	}
	// the baseline as rows and ranges in a string; anything else is refused
	for _, js := range []string{`"1, 2, 3, 4"`, `"1-4"`, `"1-2;3 4"`} {
		req, err := ParseRequest([]byte(`{"text":"1.1\n1.2\n1.0\n1.1\n1.3\n1.2\n","options":{"baseline":` + js + `}}`))
		if err != nil {
			t.Fatal(err)
		}
		if s := stab(t, req); s.Baseline == nil || s.Baseline.Points != 4 {
			t.Errorf("baseline %s: %+v", js, s.Baseline)
		}
	}
	for _, js := range []string{`{"a":1}`, `[1,2]`} {
		if _, err := ParseRequest([]byte(`{"text":"1","options":{"baseline":` + js + `}}`)); err == nil || !strings.Contains(err.Error(), "baseline") {
			t.Errorf("baseline %s: %v", js, err)
		}
	}
	// switching a check off removes its signals
	s = stab(t, Request{Text: "1.0\n1.1\n0.9\n1.0\n1.1\n0.9\n1.0\n5.0\n1.0\n1.1\n", Options: Options{Signals: map[string]bool{"beyond-limits": false, "ewma": false, "cusum": false}}})
	for _, sg := range s.Signals {
		if sg.Code == "beyond-limits" || sg.Code == SignalSpreadBeyond {
			t.Errorf("a switched-off check signalled: %+v", sg)
		}
	}
}

func hasNote(rep *Report, field string) bool {
	for _, n := range rep.Notes {
		if strings.HasPrefix(n.Field, field) {
			return true
		}
	}
	return false
}

// FuzzStability: the section never panics, its report encodes, and every
// row it lists is a row of the data.
func FuzzStability(f *testing.F) {
	f.Add("1\n2\n3\n4\n5\n", "", "", uint8(0))
	f.Add("A\t1.0\nA\t1.1\nB\t2.0\nB\t2.2\nC\t1.5\n", "1-3", "", uint8(1))
	f.Add("t\tv\n3\t1\n1\t2\n2\t3\n2\t4\n9\t1e3\n", "2", "", uint8(2))
	f.Fuzz(func(t *testing.T, text, baseline, spread string, mode uint8) {
		req := Request{Text: text, Options: Options{Baseline: baseline, ChartSpread: spread}}
		if mode%3 == 1 {
			req.Subgroup, req.Value = "Column 1", "Column 2"
		} else if mode%3 == 2 {
			req.Order, req.Value = "t", "v"
		}
		rep, err := Analyze(req)
		if err != nil || rep.Stability == nil {
			return
		}
		if _, err := json.Marshal(rep); err != nil {
			t.Fatal(err)
		}
		rows := map[int]bool{}
		for _, p := range rep.Input.Problems {
			rows[p.Row] = true
		}
		tab := rep.Stability
		if tab.Chart != nil {
			for _, p := range tab.Chart.Points {
				rows[p.Row] = true
				if p.Row < 1 {
					t.Fatalf("point row %d", p.Row)
				}
			}
			if !tab.Chart.Thinned {
				for _, s := range tab.Signals {
					for _, r := range s.Rows {
						if !rows[r] {
							t.Fatalf("signal %+v lists row %d, not a row of the chart", s, r)
						}
					}
				}
			}
		}
	})
}

// TestSpecCautionFromStability: the stability section is built before the
// spec section and its verdict becomes the spec's first caution; a stable
// process gives none. Data constructed (a steady pattern, then the same
// pattern 0.08 higher from reading 31).
func TestSpecCautionFromStability(t *testing.T) {
	pattern := []int{0, 2, -1, 1, -2, 0, 1, -1}
	text := func(shift float64) string {
		var b strings.Builder
		for i := 1; i <= 60; i++ {
			x := 5.1 + 0.01*float64(pattern[i%8])
			if i > 30 {
				x += shift
			}
			fmt.Fprintf(&b, "%.2f\n", x)
		}
		return b.String()
	}
	lsl, usl := 4.9, 5.4
	rep, err := Analyze(Request{Text: text(0.08), Options: Options{LSL: &lsl, USL: &usl}})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Stability.Stable || rep.Spec == nil || len(rep.Spec.Cautions) == 0 {
		t.Fatalf("stability %q, spec %+v", rep.Stability.Verdict, rep.Spec)
	}
	c := rep.Spec.Cautions[0]
	if c.Code != "not-stable" || !strings.Contains(c.Text, rep.Stability.Verdict) || !strings.Contains(c.Text, "capability then describes this batch, not the process") {
		t.Errorf("first caution %+v", c)
	}
	rep, err = Analyze(Request{Text: text(0), Options: Options{LSL: &lsl, USL: &usl}})
	if err != nil {
		t.Fatal(err)
	}
	if !rep.Stability.Stable {
		t.Fatalf("steady data: %q", rep.Stability.Verdict)
	}
	for _, c := range rep.Spec.Cautions {
		if c.Code == "not-stable" || c.Code == "stability-not-judged" {
			t.Errorf("stable process, caution %+v", c)
		}
	}
	// too few readings to judge: the spec says so
	rep, err = Analyze(Request{Text: "5.10\n5.12\n", Options: Options{LSL: &lsl, USL: &usl}})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Spec == nil || len(rep.Spec.Cautions) == 0 || rep.Spec.Cautions[0].Code != "stability-not-judged" || !strings.Contains(rep.Spec.Cautions[0].Text, "not the process") {
		t.Errorf("two readings: spec %+v", rep.Spec)
	}
}

// TestStabilityLongSeries: above driftMax readings the drift tests run on
// block means (said in a Note and in drift.blocks), the chart is thinned
// with the signals' points kept, and the EWMA and CUSUM are given at the
// drawn points. Data constructed: a repeating pattern typed to 0.01, 0.05
// higher from the first reading of a block after reading 150,000. The trend statistic is checked against
// method.MannKendallTest on the block sums computed here (Mann 1945, the
// definition on the blocks).
func TestStabilityLongSeries(t *testing.T) {
	const n = 250_007
	size := (n + driftMax - 1) / driftMax // 13 (19,231 blocks; the last 4 readings in none)
	shift := (150_000/size + 1) * size    // the shift starts a block
	pattern := []int64{0, 3, -2, 1, -4, 2, 0, -1, 4, -3, 1}
	var b strings.Builder
	mant := make([]int64, n)
	for i := range n {
		m := 1000 + pattern[i%len(pattern)]
		if i >= shift {
			m += 5
		}
		mant[i] = m
		fmt.Fprintf(&b, "%d.%02d\n", m/100, m%100)
	}
	rep, err := Analyze(Request{Text: b.String()})
	if err != nil {
		t.Fatal(err)
	}
	s := rep.Stability
	d := s.Drift
	if d == nil || d.Blocks != n/size || d.BlockSize != size || !d.Exact {
		t.Fatalf("drift %+v", d)
	}
	if !hasNote(rep, "stability.drift") {
		t.Errorf("no note on the block means: %+v", rep.Notes)
	}
	sums := make([]int64, n/size)
	for k := range sums {
		for _, m := range mant[k*size : (k+1)*size] {
			sums[k] += m
		}
	}
	mk, err := method.MannKendallTest(sums)
	if err != nil || d.Trend == nil || d.Trend.S != mk.S {
		t.Errorf("trend S %+v, want %d (%v)", d.Trend, mk.S, err)
	}
	if c := s.Change; c == nil || !c.Found || c.Position != shift+1 || c.Row != shift+1 {
		t.Errorf("change point %+v, want reading %d", s.Change, shift+1)
	}
	ch := s.Chart
	if ch == nil || !ch.Thinned || ch.Count != n || len(ch.Points) > 3*maxChartPoints+2*maxSignalRows {
		t.Fatalf("chart: thinned %v, %d of %d points", ch != nil && ch.Thinned, len(ch.Points), ch.Count)
	}
	drawn := map[int]bool{}
	for k, p := range ch.Points {
		drawn[p.I] = true
		if k > 0 && p.I <= ch.Points[k-1].I {
			t.Fatalf("points out of order at %d", k)
		}
		if p.Row != p.I { // no header: reading i is row i
			t.Fatalf("point %d on row %d", p.I, p.Row)
		}
	}
	for _, sg := range s.Signals[:min(20, len(s.Signals))] {
		if !drawn[sg.First] {
			t.Errorf("signal %q at %d-%d not drawn", sg.Code, sg.First, sg.Last)
		}
	}
	for _, pts := range [][]int{ewmaIs(s.EWMA.Points), cusumIs(s.CUSUM.Points)} {
		if len(pts) < 2*maxChartPoints/2 || !slices.IsSorted(pts) {
			t.Errorf("EWMA or CUSUM: %d points, sorted %v", len(pts), slices.IsSorted(pts))
		}
	}
}

func ewmaIs(p []EWMAPt) []int {
	out := make([]int, len(p))
	for i := range p {
		out[i] = p[i].I
	}
	return out
}

func cusumIs(p []CUSUMPt) []int {
	out := make([]int, len(p))
	for i := range p {
		out[i] = p[i].I
	}
	return out
}

// TestWithinAllSingles: with a subgroup column whose every subgroup holds
// one reading, the spec and stability sections use the same within sigma
// (within.go): the moving-range estimate of the readings as individuals,
// the one an analysis without the subgroup column gives (that estimate is
// checked against R in TestStabilityIndividualsAgainstR). Data
// constructed: 40 readings typed to 0.01, one per lot label.
func TestWithinAllSingles(t *testing.T) {
	var withSub, plain strings.Builder
	withSub.WriteString("Lot\tV\n")
	plain.WriteString("V\n")
	for i := 0; i < 40; i++ {
		x := 5.1 + 0.01*float64((i*7)%11) - 0.02*float64(i%3)
		fmt.Fprintf(&withSub, "L%02d\t%.2f\n", i, x)
		fmt.Fprintf(&plain, "%.2f\n", x)
	}
	lsl, usl := 4.8, 5.4
	for _, within := range []string{"", WithinPooledSD, WithinMeanRange, WithinMeanSD} {
		rep, err := Analyze(Request{Text: withSub.String(), Value: "V", Subgroup: "Lot", Options: Options{LSL: &lsl, USL: &usl, WithinSigma: within}})
		if err != nil {
			t.Fatal(err)
		}
		ref, err := Analyze(Request{Text: plain.String(), Value: "V", Options: Options{LSL: &lsl, USL: &usl}})
		if err != nil {
			t.Fatal(err)
		}
		st, sp := rep.Stability, rep.Spec
		if st == nil || st.Chart == nil || sp == nil || sp.Sigma.Within == nil {
			t.Fatalf("%q: stability %+v, spec %+v", within, st, sp)
		}
		if st.Chart.Kind != "individuals" || st.Chart.SigmaMethod != WithinMovingRange || sp.Sigma.Within.Method != WithinMovingRange {
			t.Errorf("%q: chart %s by %s, spec by %s", within, st.Chart.Kind, st.Chart.SigmaMethod, sp.Sigma.Within.Method)
		}
		want := ref.Spec.Sigma.Within.Value
		if st.Chart.Sigma != want || sp.Sigma.Within.Value != want || ref.Stability.Chart.Sigma != want {
			t.Errorf("%q: stability sigma %g, spec %g, individuals %g", within, st.Chart.Sigma, sp.Sigma.Within.Value, want)
		}
		noted := false
		for _, n := range rep.Notes {
			noted = noted || n.Field == "spec.sigma.within" && strings.Contains(n.Text, "one reading")
		}
		if !noted {
			t.Errorf("%q: no note on the spec's within sigma", within)
		}
	}
}

// TestStabilityVerdictCut: with more signals than are listed, the list
// runs check by check (every "beyond a limit" first) but the verdict and
// the reasons name the earliest signal of all, here a steady climb over
// the first six readings that the list leaves out. Data constructed: a
// steady pattern typed to 0.01 about 10, rising over readings 1-6, with
// 250 readings 0.5 high from reading 1000 on.
func TestStabilityVerdictCut(t *testing.T) {
	pattern := []int{0, 2, -1, 1, -2, 0, 1, -1}
	var b strings.Builder
	for i := 1; i <= 20000; i++ {
		x := 10 + 0.01*float64(pattern[i%8])
		if i <= 6 {
			x = 9.96 + 0.01*float64(i)
		}
		if i >= 1000 && i%50 == 0 && i < 1000+250*50 {
			x += 0.5
		}
		fmt.Fprintf(&b, "%.2f\n", x)
	}
	s := stab(t, Request{Text: b.String()})
	if !s.SignalsCut || len(s.Signals) != maxSignalsListed {
		t.Fatalf("cut %v, %d listed", s.SignalsCut, len(s.Signals))
	}
	for _, g := range s.Signals {
		if g.Code == method.SignalTrend {
			t.Fatalf("the climb is listed (%+v): the test needs it left out", g)
		}
	}
	if !strings.Contains(s.Verdict, "readings 1-6") || !strings.Contains(s.Reasons[0].Text, "readings 1-6") {
		t.Errorf("verdict %q, reason %q: want the climb over readings 1-6", s.Verdict, s.Reasons[0].Text)
	}
	total := 0
	for _, c := range s.Checks {
		total += c.Count
	}
	if !strings.HasPrefix(s.Verdict, fmt.Sprintf("Not stable: %d signals", total)) {
		t.Errorf("verdict %q: want the full count %d", s.Verdict, total)
	}
}
