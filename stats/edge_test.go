package stats

import (
	"bytes"
	"encoding/json"
	"math"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	"lotlens/stats/ingest"
)

// checkClean fails when the report does not marshal or holds a NaN/Inf.
func checkClean(t testing.TB, rep *Report) []byte {
	t.Helper()
	b, err := json.Marshal(rep)
	if err != nil {
		t.Fatalf("json.Marshal: %v", err)
	}
	// outside string literals (the input's own text may say "NaN")
	bare := jsonString.ReplaceAll(b, []byte(`""`))
	for _, w := range [][]byte{[]byte("NaN"), []byte("Inf")} {
		if bytes.Contains(bare, w) {
			t.Fatalf("report JSON holds %s: %s", w, b)
		}
	}
	return b
}

var jsonString = regexp.MustCompile(`"(?:[^"\\]|\\.)*"`)

func lines(vals ...string) string { return strings.Join(vals, "\n") + "\n" }

func TestEdgeSmallN(t *testing.T) {
	for n := 1; n <= 3; n++ {
		var v []string
		for i := 0; i < n; i++ {
			v = append(v, strconv.Itoa(10+i))
		}
		rep, err := Analyze(Request{Text: lines(v...)})
		if err != nil {
			t.Fatalf("n=%d: %v", n, err)
		}
		checkClean(t, rep)
		if rep.Counts.Used != n {
			t.Errorf("n=%d: used %d", n, rep.Counts.Used)
		}
		// from memory: mean of 10..10+n-1 is 10+(n-1)/2
		if want := 10 + float64(n-1)/2; rep.Centre.Mean != want || rep.Centre.Median != want {
			t.Errorf("n=%d: mean %v median %v, want %v", n, rep.Centre.Mean, rep.Centre.Median, want)
		}
		if n == 1 && (rep.Centre.MeanCI != nil || rep.Spread.SDCI != nil || len(rep.Notes) == 0) {
			t.Errorf("n=1: intervals given or no note: %+v", rep.Notes)
		}
		if n >= 2 && rep.Centre.MeanCI == nil {
			t.Errorf("n=%d: no mean interval", n)
		}
		// n = 2, 3: no 95% order-statistic interval exists; min..max with its level, noted
		// (level 1 - 2*0.5^n, from memory: 0.5 for n=2, 0.75 for n=3)
		if n >= 2 {
			iv := rep.Centre.MedianCI
			if iv == nil || iv.Level != 1-2*math.Pow(0.5, float64(n)) || iv.Lo != 10 || iv.Hi != float64(10+n-1) {
				t.Errorf("n=%d: median CI %+v", n, iv)
			}
		}
		if rep.Verdict.Quote == "" || rep.Verdict.Caution == "" {
			t.Errorf("n=%d: verdict %+v", n, rep.Verdict)
		}
	}
}

func TestEdgeConstant(t *testing.T) {
	rep, err := Analyze(Request{Text: lines("5.20", "5.20", "5.20", "5.20", "5.20")})
	if err != nil {
		t.Fatal(err)
	}
	checkClean(t, rep)
	if rep.Spread.SD != 0 || rep.Spread.IQR != 0 || rep.Spread.MAD != 0 || rep.Centre.Mean != 5.2 {
		t.Errorf("constant: %+v %+v", rep.Centre, rep.Spread)
	}
	if rep.Centre.MeanCI != nil || rep.Spread.SDCI != nil {
		t.Error("intervals on constant data")
	}
	found := false
	for _, w := range rep.Verdict.Warnings {
		found = found || w.Code == "constant"
	}
	if !found {
		t.Errorf("no constant warning: %+v", rep.Verdict.Warnings)
	}
	if len(rep.Centre.Modes) != 1 || rep.Centre.Modes[0].Count != 5 || rep.Centre.Modes[0].Text != "5.20" {
		t.Errorf("modes %+v", rep.Centre.Modes)
	}
}

func TestEdgeExtremes(t *testing.T) {
	cases := map[string]string{
		"1e300":          lines("1e300", "2e300", "3e300", "-1e300"),
		"1e-300":         lines("1e-300", "2e-300", "3e-300", "5e-300"),
		"near max":       lines("1.7e308", "-1.7e308", "1.6e308", "0"),
		"long integers":  lines(strings.Repeat("9", 300), strings.Repeat("8", 300), "1"),
		"long fractions": lines("0."+strings.Repeat("1", 40), "0."+strings.Repeat("2", 40), "0.3"),
		"negatives":      lines("-1.5", "-2.25", "-3.125", "-0.5"),
		"subnormal":      lines("4e-320", "5e-320", "6e-320"),
	}
	for name, text := range cases {
		rep, err := Analyze(Request{Text: text})
		if err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		checkClean(t, rep)
	}
	// from memory: mean of 1,2,3,-1 (x1e300) is 1.25e300, sd = 1.707825127659933e300
	rep, _ := Analyze(Request{Text: cases["1e300"]})
	if rep.Centre == nil || relErr(rep.Centre.Mean, 1.25e300) > 1e-15 || rep.Spread == nil || relErr(rep.Spread.SD, 1.707825127659933e300) > 1e-14 {
		t.Errorf("1e300: %+v %+v", rep.Centre, rep.Spread)
	}
	if rep.Spread.Variance != nil {
		t.Errorf("variance %v should be omitted (beyond float64)", *rep.Spread.Variance)
	}
	rep, _ = Analyze(Request{Text: cases["1e-300"]})
	// from memory: mean of 1,2,3,5 (x1e-300) is 2.75e-300, sd = 1.707825127659933e-300
	if relErr(rep.Centre.Mean, 2.75e-300) > 1e-15 || relErr(rep.Spread.SD, 1.707825127659933e-300) > 1e-14 {
		t.Errorf("1e-300: mean %v sd %v", rep.Centre.Mean, rep.Spread.SD)
	}
}

func TestEdgeRejectedCells(t *testing.T) {
	rep, err := Analyze(Request{Text: lines("1.0", "Inf", "2.0", "NaN", "", "-inf", "3.0", "abc")})
	if err != nil {
		t.Fatal(err)
	}
	checkClean(t, rep)
	// the reader reads "NaN" as a missing-value marker, the others as not numbers
	if rep.Counts.Used != 3 || rep.Counts.Rejected+rep.Counts.Missing != 5 || rep.Counts.Rejected < 3 {
		t.Errorf("counts %+v", rep.Counts)
	}
	rows := map[int]bool{}
	for _, p := range rep.Input.Problems {
		rows[p.Row] = true
	}
	for _, r := range []int{2, 4, 5, 6, 8} {
		if !rows[r] {
			t.Errorf("row %d not listed in problems %+v", r, rep.Input.Problems)
		}
	}
}

func TestEdgeNoNumbers(t *testing.T) {
	for _, text := range []string{"", "   \n", "abc\ndef\n", "NaN\n"} {
		rep, err := Analyze(Request{Text: text})
		if err == nil {
			t.Errorf("%q: no error, report %+v", text, rep)
		} else if len(err.Error()) < 10 {
			t.Errorf("%q: unhelpful error %q", text, err)
		}
	}
}

func TestExclusions(t *testing.T) {
	text := lines("10.1", "10.2", "10.3", "55.0", "10.2")
	rep, err := Analyze(Request{Text: text, Options: Options{Exclude: []int{4, 99}}})
	if err != nil {
		t.Fatal(err)
	}
	checkClean(t, rep)
	if rep.Counts.Used != 4 || rep.Counts.Excluded != 1 {
		t.Fatalf("counts %+v", rep.Counts)
	}
	ex := rep.Settings.Excluded
	if len(ex) != 1 || ex[0].Row != 4 || ex[0].Text != "55.0" || ex[0].Value != 55 {
		t.Errorf("excluded %+v", ex)
	}
	// from memory: mean of 10.1, 10.2, 10.3, 10.2 is 10.2
	if rep.Centre.Mean != 10.2 {
		t.Errorf("mean %v", rep.Centre.Mean)
	}
	noted := false
	for _, n := range rep.Notes {
		noted = noted || strings.Contains(n.Text, "99")
	}
	if !noted {
		t.Errorf("row 99 not noted: %+v", rep.Notes)
	}
	// a reason is echoed with its reading, and only with it (invented reasons)
	why := strings.Repeat("ü", MaxReasonChars) // the longest accepted: characters, not bytes
	rep, err = Analyze(Request{Text: text, Options: Options{Exclude: []int{2, 4}, ExcludeReasons: map[int]string{4: "gauge dropped", 2: why}}})
	if err != nil {
		t.Fatal(err)
	}
	if ex := rep.Settings.Excluded; len(ex) != 2 || ex[0].Row != 2 || ex[0].Reason != why || ex[1].Row != 4 || ex[1].Reason != "gauge dropped" {
		t.Errorf("excluded with reasons %+v", ex)
	}
	b, _ := json.Marshal(Reading{Row: 3})
	if strings.Contains(string(b), "reason") {
		t.Errorf("an empty reason is written: %s", b)
	}
	// all excluded: a report, no figures, the exclusions listed
	rep, err = Analyze(Request{Text: lines("1", "2"), Options: Options{Exclude: []int{1, 2}}})
	if err != nil {
		t.Fatal(err)
	}
	checkClean(t, rep)
	if rep.Centre != nil || len(rep.Settings.Excluded) != 2 {
		t.Errorf("all excluded: %+v", rep)
	}
}

func TestCells(t *testing.T) {
	rep, err := Analyze(Request{Cells: []InCell{{Row: 7, Text: "1,5"}, {Row: 8, Text: "2,5"}, {Row: 9, Text: "x"}, {Row: 12, Text: "3,5"}}, Name: "torque"})
	if err != nil {
		t.Fatal(err)
	}
	checkClean(t, rep)
	if rep.Centre.Mean != 2.5 || !rep.Input.DecimalComma || rep.Counts.Rejected != 1 || rep.Input.Column != "torque" {
		t.Errorf("cells: %+v %+v", rep.Centre, rep.Counts)
	}
	if len(rep.Input.Problems) != 1 || rep.Input.Problems[0].Row != 9 {
		t.Errorf("problems %+v", rep.Input.Problems)
	}
	last := rep.Charts.Series[len(rep.Charts.Series)-1]
	if last.Row != 12 {
		t.Errorf("series row %d, want 12", last.Row)
	}
}

func TestBadOptions(t *testing.T) {
	lo, hi := 5.0, 4.0
	for name, o := range map[string]Options{
		"confidence 95": {Confidence: 95},
		"confidence 1":  {Confidence: 1},
		"quantile":      {Quantile: "hf10"},
		"limits":        {LSL: &lo, USL: &hi},
	} {
		if _, err := Analyze(Request{Text: lines("1", "2", "3"), Options: o}); err == nil {
			t.Errorf("%s: accepted", name)
		}
	}
	if _, err := Analyze(Request{Schema: "lotlens.request/9", Text: "1\n"}); err == nil {
		t.Error("unknown schema accepted")
	}
}

func TestModes(t *testing.T) {
	// from memory: 2.0 and 3.0 each occur twice
	rep, _ := Analyze(Request{Text: lines("1.0", "2.0", "2.0", "3.0", "3.0", "4.0")})
	if len(rep.Centre.Modes) != 2 || rep.Centre.Modes[0].Text != "2.0" || rep.Centre.Modes[1].Value != 3 || rep.Centre.ModeNote == "" {
		t.Errorf("tied modes %+v %q", rep.Centre.Modes, rep.Centre.ModeNote)
	}
	rep, _ = Analyze(Request{Text: lines("1.0", "2.0", "3.0")})
	if len(rep.Centre.Modes) != 0 || rep.Centre.ModeNote != "no repeated value" {
		t.Errorf("unique: %+v %q", rep.Centre.Modes, rep.Centre.ModeNote)
	}
}

func TestStepAndResolution(t *testing.T) {
	// data typed to 0.1 but recorded in half units: step 0.5 (from memory),
	// shown by 11 distinct values (stepMinDistinct)
	half := lines("2.5", "3.0", "3.5", "3.0", "4.0", "2.5", "4.5", "5.0", "5.5", "6.0", "6.5", "7.0", "7.5")
	rep, _ := Analyze(Request{Text: half})
	if rep.Counts.Resolution != 0.1 || rep.Counts.Step != 0.5 || rep.Counts.Decimals != 1 {
		t.Errorf("counts %+v", rep.Counts)
	}
	lsl, usl := 2.0, 5.0
	rep, _ = Analyze(Request{Text: half, Options: Options{LSL: &lsl, USL: &usl}})
	codes := ""
	for _, w := range rep.Verdict.Warnings {
		codes += w.Code + " "
	}
	// common practice: at least ten steps across the tolerance (here 3/0.5 = 6)
	if !strings.Contains(codes, "coarse-for-tolerance") {
		t.Errorf("warnings %q", codes)
	}
}

func TestQuantileSensitivity(t *testing.T) {
	// A small sample whose top value lies between the inner fences of
	// different definitions: by hand (from memory of the definitions),
	// hf7 gives Q1 = 10.2, Q3 = 10.4 and fence 10.7; hf6 gives Q3 = 10.45
	// and fence 10.825; 10.8 is flagged by one and not the other.
	rep, err := Analyze(Request{Text: lines("10.0", "10.2", "10.2", "10.3", "10.4", "10.4", "10.5", "10.8")})
	if err != nil {
		t.Fatal(err)
	}
	q := rep.Quantile
	if !q.Sensitive || !strings.Contains(q.Note, "row 8") {
		t.Errorf("sensitivity not reported: %+v", q)
	}
}

func TestHistogramCounts(t *testing.T) {
	b := mustRead(t, "../testdata/sets/18-n1000-normal.txt")
	rep, _ := Analyze(Request{Text: b})
	h := rep.Charts.Histogram
	sum := 0
	for _, c := range h.Counts {
		sum += c
	}
	if sum != 1000 || len(h.Edges) != len(h.Counts)+1 || h.Rule != "freedman-diaconis" {
		t.Errorf("histogram %+v", h)
	}
	if h.Edges[0] > rep.Quantile.Min || h.Edges[len(h.Edges)-1] < rep.Quantile.Max {
		t.Errorf("edges do not cover the data")
	}
	mc := rep.Centre.ModalClass
	if mc[1] <= mc[0] {
		t.Errorf("modal class %v", mc)
	}
}

func TestSeriesThinned(t *testing.T) {
	var sb strings.Builder
	for i := 0; i < 50000; i++ {
		v := 100 + float64(i%97)/10
		if i == 31234 {
			v = 999.5
		}
		sb.WriteString(strconv.FormatFloat(v, 'f', 1, 64) + "\n")
	}
	rep, err := Analyze(Request{Text: sb.String()})
	if err != nil {
		t.Fatal(err)
	}
	checkClean(t, rep)
	s := rep.Charts.Series
	if !rep.Charts.Thinned || len(s) > maxChartPoints {
		t.Fatalf("thinned %v, %d points", rep.Charts.Thinned, len(s))
	}
	found := false
	for i, p := range s {
		if i > 0 && p.I <= s[i-1].I {
			t.Fatal("series not in data order")
		}
		found = found || (p.Y == 999.5 && p.Row == 31235)
	}
	if !found {
		t.Error("the extreme reading was thinned away")
	}
}

func mustRead(t testing.TB, path string) string {
	t.Helper()
	b, err := osReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

func TestExactRange(t *testing.T) {
	// from memory: 0.3 - 0.1 = 0.2 in decimal; binary floating point gives 0.19999999999999998
	rep, _ := Analyze(Request{Text: lines("0.1", "0.2", "0.3")})
	if rep.Spread.Range != 0.2 {
		t.Errorf("range %v, want 0.2", rep.Spread.Range)
	}
}

// TestAnalyzeTableReuse: the page analyses one table many times with
// different options; the table must not change between calls.
func TestAnalyzeTableReuse(t *testing.T) {
	tab, err := ingest.Read(lines("12.1", "x", "12.3", "12.2", "99.0", "12.4"))
	if err != nil {
		t.Fatal(err)
	}
	nProb := len(tab.Problems)
	vals := append([]float64(nil), tab.Columns[0].Values...)
	a, err := AnalyzeTable(tab, "f", Request{})
	if err != nil {
		t.Fatal(err)
	}
	b, err := AnalyzeTable(tab, "f", Request{Options: Options{Exclude: []int{5}, Quantile: "hf6"}})
	if err != nil {
		t.Fatal(err)
	}
	c, _ := AnalyzeTable(tab, "f", Request{})
	same := slices.EqualFunc(vals, tab.Columns[0].Values, func(x, y float64) bool {
		return x == y || (math.IsNaN(x) && math.IsNaN(y))
	})
	if len(tab.Problems) != nProb || !same {
		t.Fatal("the table changed")
	}
	ja, _ := json.Marshal(a)
	jc, _ := json.Marshal(c)
	if string(ja) != string(jc) {
		t.Error("same table, same options, different reports")
	}
	// from memory: mean of 12.1, 12.3, 12.2, 12.4 is 12.25
	if b.Counts.Excluded != 1 || b.Centre.Mean != 12.25 || a.Counts.Used != 5 {
		t.Errorf("a %+v b %+v", a.Counts, b.Counts)
	}
}

func TestHistogramSturges(t *testing.T) {
	// set 09 has IQR 0 (R 4.2.2: both type-7 quartiles are 7), so the
	// Freedman-Diaconis width is 0 and the rule falls back to Sturges (1926)
	rep := analyzeFile(t, "../testdata/sets/09-coarse-ties-n50.txt", Options{})
	h := rep.Charts.Histogram
	if h.Rule != "sturges" {
		t.Fatalf("rule %q", h.Rule)
	}
	// values move in whole units: edges at half units, no bin boundary on a value
	for _, e := range h.Edges {
		if e == math.Trunc(e) {
			t.Errorf("edge %v lies on a recorded value", e)
		}
	}
	sum := 0
	for _, c := range h.Counts {
		sum += c
	}
	if sum != 50 {
		t.Errorf("counts sum %d", sum)
	}
}

func TestAnalyzeJSON(t *testing.T) {
	out := AnalyzeJSON([]byte(`{"schema":"lotlens.request/1","text":"1.5\n2.5\n3.5\n","options":{"quantile":"hf6"}}`))
	var rep Report
	if err := json.Unmarshal(out, &rep); err != nil {
		t.Fatal(err)
	}
	// from memory: mean of 1.5, 2.5, 3.5 is 2.5
	if rep.Schema != ReportSchema || rep.Centre.Mean != 2.5 || rep.Settings.Quantile != "hf6" {
		t.Errorf("report %s", out)
	}
	for _, bad := range []string{`{`, `{"text":""}`, `{"text":"1\n","options":{"confidence":7}}`} {
		var e map[string]string
		if err := json.Unmarshal(AnalyzeJSON([]byte(bad)), &e); err != nil || e["error"] == "" {
			t.Errorf("%s: want an error object", bad)
		}
	}
}
