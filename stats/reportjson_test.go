package stats

import (
	"bytes"
	"encoding/json"
	"math"
	"os"
	"reflect"
	"strconv"
	"strings"
	"testing"
)

// plainReportJSON is ReportJSON as it was before marshalReport: everything
// through encoding/json. The reference of TestReportJSONSame.
func plainReportJSON(rep *Report) []byte {
	out, err := json.Marshal(rep)
	if err != nil {
		return ErrorJSON(errorf(CodeInternal, "", "internal error encoding the report: %v", err))
	}
	return out
}

// readings writes n invented readings, one a line, as the page's benchmark
// paste does (a Lehmer generator), with shift added from reading from on.
func readings(n int, seed int64, decimals int, shift float64, from int) string {
	var sb strings.Builder
	x := seed
	for i := 0; i < n; i++ {
		x = x * 16807 % 2147483647
		v := 5 + (float64(x)/2147483647-0.5)*0.4
		if i >= from {
			v += shift
		}
		sb.WriteString(strconv.FormatFloat(v, 'f', decimals, 64))
		sb.WriteByte('\n')
	}
	return sb.String()
}

// reportRequests are reports of many shapes: the demo file with its groups
// and limits, 10,000 readings with and without signals, subgroups with
// labels that need escaping, readings left out, a time column, very short
// series and extreme magnitudes.
func reportRequests(t *testing.T) map[string]Request {
	demo, err := os.ReadFile("../site/demo/capsule-fill.tsv")
	if err != nil {
		t.Fatal(err)
	}
	lsl, usl, tgt := 4.9, 5.3, 5.1
	lim := Options{LSL: &lsl, USL: &usl, Target: &tgt}
	var sub strings.Builder
	sub.WriteString("Lot\tLine\tW\n")
	labels := []string{"A<1>", "B&2", `C"3"`, "Grün", "lot\u2028x", "plain"}
	for i := 0; i < 600; i++ {
		x := 5 + 0.01*float64(i%7) - 0.02*float64(i%3)
		if i > 480 {
			x += 0.2
		}
		sub.WriteString(labels[(i/5)%len(labels)] + strconv.Itoa(i/5) + "\t" + labels[i%len(labels)] + "\t" + strconv.FormatFloat(x, 'f', 2, 64) + "\n")
	}
	var timed strings.Builder
	timed.WriteString("When\tV\n")
	for i := 0; i < 300; i++ {
		timed.WriteString("2026-11-" + strconv.Itoa(10+i/100) + " " + strconv.Itoa(10+(i%100)/10) + ":" + strconv.Itoa(10+i%10*4) + "\t" +
			strconv.FormatFloat(3+0.001*float64(i%17), 'f', 3, 64) + "\n")
	}
	var tiny, huge, negz, mixed strings.Builder
	for i := 0; i < 120; i++ {
		tiny.WriteString(strconv.FormatFloat(1e-300*(1+float64(i%11)/7), 'e', 6, 64) + "\n")
		huge.WriteString(strconv.FormatFloat(1e300*(1+float64(i%13)/9), 'e', 6, 64) + "\n")
		negz.WriteString([]string{"-0", "-0.0", "0.001", "-0.001", "0"}[i%5] + "\n")
		mixed.WriteString(strconv.FormatFloat(float64(i%9-4)*1e-7, 'e', 3, 64) + "\n")
	}
	return map[string]Request{
		"demo":             {Text: string(demo)},
		"demo-groups":      {Text: string(demo), Value: "Fill weight (g)", Group: "Line", Options: lim},
		"demo-order":       {Text: string(demo), Order: "Sampled at", Options: lim},
		"10k":              {Text: readings(10000, 1, 3, 0, 0)},
		"10k-limits":       {Text: readings(10000, 2, 3, 0, 0), Options: lim},
		"10k-signals":      {Text: readings(10000, 3, 3, 0.15, 6000), Options: lim},
		"10k-4dec":         {Text: readings(10000, 4, 4, -0.1, 2000), Options: Options{Exclude: []int{5, 77, 9000}}},
		"1200-signals":     {Text: readings(1200, 5, 2, 0.3, 700)},
		"subgroups":        {Text: sub.String(), Value: "W", Subgroup: "Lot"},
		"subgroups-groups": {Text: sub.String(), Value: "W", Group: "Line", Subgroup: "Lot"},
		"time":             {Text: timed.String(), Order: "When", Value: "V"},
		"one":              {Text: "5.1\n"},
		"two":              {Text: "5.1\n5.3\n"},
		"three":            {Text: "5.1\n5.3\n5.2\n"},
		"tiny":             {Text: tiny.String()},
		"huge":             {Text: huge.String()},
		"negative-zero":    {Text: negz.String()},
		"exponents":        {Text: mixed.String()},
	}
}

// TestReportJSONSame: the report JSON with the long lists written directly
// is json.Marshal's, byte for byte (the reference is encoding/json itself).
func TestReportJSONSame(t *testing.T) {
	reqs := reportRequests(t)
	if testing.Short() {
		for _, k := range []string{"10k-limits", "10k-4dec"} {
			delete(reqs, k)
		}
	}
	spliced := 0
	for name, req := range reqs {
		rep, err := Analyze(req)
		if err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		before := plainReportJSON(rep)
		got, err := marshalReport(rep)
		if err != nil {
			t.Errorf("%s: marshalReport: %v", name, err)
			continue
		}
		if !bytes.Equal(got, before) {
			t.Errorf("%s: report JSON differs from json.Marshal at byte %d", name, firstDiff(got, before))
		}
		if after := plainReportJSON(rep); !bytes.Equal(after, before) {
			t.Errorf("%s: marshalReport changed the report", name)
		}
		if !bytes.Equal(ReportJSON(rep, nil), before) {
			t.Errorf("%s: ReportJSON differs from json.Marshal", name)
		}
		if rep.Stability != nil && rep.Stability.EWMA != nil && len(rep.Stability.EWMA.Points) > 0 {
			spliced++
		}
	}
	if spliced < 5 {
		t.Errorf("only %d reports had EWMA points: the test does not reach the lists", spliced)
	}
}

// TestReportJSONEdges puts the values and text encoding/json treats
// specially into every list written directly.
func TestReportJSONEdges(t *testing.T) {
	floats := []float64{0, math.Copysign(0, -1), 1, -1, 0.1, 1e-6, 9.999999999999999e-7, -1e-7, 1e-300, 5e-324, -5e-324,
		1e20, 1e21, -1e21, 123456789012345678901.0, 1e300, math.MaxFloat64, -math.MaxFloat64, math.SmallestNonzeroFloat64,
		1.0 / 3, 2.5e-9, 1e-10, 1e-100, 4.940656458412465e-324, 0.000001, 1234.5678, -0.0001}
	texts := []string{"", "plain", "<b>&amp;</b>", `quote " and \ back`, "tab\there", "nl\n", "\x00\x1f", "Grün σ ←",
		"line\u2028sep\u2029", "bad \xff utf8", "\xe2\x80", "😀"}
	rep, err := Analyze(Request{Text: readings(50, 7, 2, 0, 0)})
	if err != nil {
		t.Fatal(err)
	}
	ch, st := rep.Charts, rep.Stability
	ch.ProbPlot.Points, ch.Series = nil, nil
	st.Chart.Points, st.Signals, st.EWMA.Points, st.CUSUM.Points = nil, nil, nil, nil
	for i, f := range floats {
		g := floats[(i+5)%len(floats)]
		s := texts[i%len(texts)]
		ch.ProbPlot.Points = append(ch.ProbPlot.Points, ProbPt{Z: f, Y: g, Row: i - 3})
		ch.Series = append(ch.Series, SeriesPt{I: i, Row: -i, Y: f})
		p := CtlPoint{I: i, Row: i + 1, Y: f}
		if i%2 == 0 {
			p.Label, p.N, p.S, p.Flags = s, i, &floats[(i+1)%len(floats)], []string{s, "beyond-limits"}
		}
		if i%3 == 0 {
			p.T, p.LeftOut = &floats[(i+2)%len(floats)], true
		}
		p.Outside = i%4 == 1
		st.Chart.Points = append(st.Chart.Points, p)
		sig := SignalInfo{Code: s, Chart: texts[(i+3)%len(texts)], First: i, Last: -i, Points: i * 7, Text: texts[(i+1)%len(texts)]}
		if i%2 == 1 {
			sig.Side, sig.Rows, sig.Subgroups = 1-i%4, []int{i, -i, 0}, []string{s, ""}
		}
		st.Signals = append(st.Signals, sig)
		st.EWMA.Points = append(st.EWMA.Points, EWMAPt{I: i, Z: f, Lo: -g, Hi: g})
		st.CUSUM.Points = append(st.CUSUM.Points, CUSUMPt{I: i, Up: g, Down: -f})
	}
	// limits repeated (written once, then copied), and 0 beside -0
	negz := math.Copysign(0, -1)
	for i, lim := range []float64{4.9, 4.9, 4.9, 0, negz, negz, 0, 1e-300, 1e-300} {
		st.EWMA.Points = append(st.EWMA.Points, EWMAPt{I: 100 + i, Z: lim, Lo: lim, Hi: -lim})
	}
	want := plainReportJSON(rep)
	got, err := marshalReport(rep)
	if err != nil {
		t.Fatalf("marshalReport: %v", err)
	}
	if !bytes.Equal(got, want) {
		i := firstDiff(got, want)
		t.Fatalf("differs from json.Marshal at byte %d:\n got %.120s\nwant %.120s", i, got[max(0, i-40):], want[max(0, i-40):])
	}
	// an empty list stays encoding/json's "[]" and a missing one its null
	ch.Series, st.Signals = []SeriesPt{}, nil
	if got, want := ReportJSON(rep, nil), plainReportJSON(rep); !bytes.Equal(got, want) {
		t.Errorf("empty and nil lists: differs from json.Marshal at byte %d", firstDiff(got, want))
	}
	// a value encoding/json refuses gives its error, as before
	for _, bad := range []float64{math.NaN(), math.Inf(1), math.Inf(-1)} {
		st.EWMA.Points[3].Hi = bad
		got, want := ReportJSON(rep, nil), plainReportJSON(rep)
		if !bytes.Equal(got, want) || !bytes.Contains(got, []byte(`"error"`)) {
			t.Errorf("%v in a list: got %.200s, want %.200s", bad, got, want)
		}
	}
}

func firstDiff(a, b []byte) int {
	for i := 0; i < len(a) && i < len(b); i++ {
		if a[i] != b[i] {
			return i
		}
	}
	return min(len(a), len(b))
}

// TestAppendTypedFloat checks the short path for readings as typed against
// encoding/json on decimals of 0 to 8 places over magnitudes 1e-7 to 1e10,
// the doubles either side of each, and random bit patterns.
func TestAppendTypedFloat(t *testing.T) {
	n := 200000
	if testing.Short() {
		n = 20000
	}
	x := uint64(88172645463325252) // xorshift64 (Marsaglia 2003)
	next := func() uint64 { x ^= x << 13; x ^= x >> 7; x ^= x << 17; return x }
	check := func(f float64) {
		want, err := json.Marshal(f)
		if err != nil {
			return
		}
		got, ok := appendTypedFloat([]byte("x"), f)
		if !ok || string(got[1:]) != string(want) {
			t.Fatalf("%v (bits %#x): got %q, want %q", f, math.Float64bits(f), got[1:], want)
		}
	}
	for _, f := range []float64{1e-6, 9.999999999999999e-7, 1e9, 999999999.999999, 999999999.9999999, 0.1, 0.000123, 5.1, -5.1, 100, 1e6, 123456789.123456} {
		check(f)
		check(math.Nextafter(f, 0))
		check(math.Nextafter(f, math.Inf(1)))
	}
	for i := 0; i < n; i++ {
		places := int(next() % 9)
		mant := next() % []uint64{10, 1000, 1e6, 1e9, 1e12, 1e15}[next()%6]
		s := strconv.FormatUint(mant, 10)
		for len(s) <= places {
			s = "0" + s
		}
		if places > 0 {
			s = s[:len(s)-places] + "." + s[len(s)-places:]
		}
		if next()%2 == 0 {
			s = "-" + s
		}
		f, _ := strconv.ParseFloat(s, 64)
		check(f)
		check(math.Nextafter(f, math.Inf(1)))
		check(math.Nextafter(f, math.Inf(-1)))
		check(math.Float64frombits(next()))
	}
}

// TestReportJSONListFields fills every field of each list element type
// with a value that is not zero and requires its appender to write what
// encoding/json writes: a field added to one of these types fails here
// until its appender writes it too.
func TestReportJSONListFields(t *testing.T) {
	var fill func(v reflect.Value)
	fill = func(v reflect.Value) {
		switch v.Kind() {
		case reflect.Int, reflect.Int64:
			v.SetInt(-7)
		case reflect.Float64:
			v.SetFloat(-1.25e-7)
		case reflect.String:
			v.SetString("a<b>&\"c\"")
		case reflect.Bool:
			v.SetBool(true)
		case reflect.Pointer:
			v.Set(reflect.New(v.Type().Elem()))
			fill(v.Elem())
		case reflect.Slice:
			v.Set(reflect.MakeSlice(v.Type(), 2, 2))
			fill(v.Index(0))
			fill(v.Index(1))
		case reflect.Struct:
			for i := 0; i < v.NumField(); i++ {
				fill(v.Field(i))
			}
		default:
			t.Fatalf("fill: a field of kind %s: extend the test", v.Kind())
		}
	}
	var (
		prob   ProbPt
		series SeriesPt
		ctl    CtlPoint
		sig    SignalInfo
		ewma   EWMAPt
		cusum  CUSUMPt
	)
	for _, c := range []struct {
		v     any
		write func() []byte
	}{
		{&prob, func() []byte { b, _ := appendProbPt(nil, &prob); return b }},
		{&series, func() []byte { b, _ := appendSeriesPt(nil, &series); return b }},
		{&ctl, func() []byte { b, _ := appendCtlPoint(nil, &ctl); return b }},
		{&sig, func() []byte { b, _ := appendSignal(nil, &sig); return b }},
		{&ewma, func() []byte { b, _ := ewmaWriter([]EWMAPt{ewma})(nil, 0); return b }},
		{&cusum, func() []byte { b, _ := appendCUSUMPt(nil, &cusum); return b }},
	} {
		fill(reflect.ValueOf(c.v).Elem())
		want, err := json.Marshal(c.v)
		if err != nil {
			t.Fatal(err)
		}
		if got := c.write(); !bytes.Equal(got, want) {
			t.Errorf("%T:\n got %s\nwant %s", c.v, got, want)
		}
	}
}
