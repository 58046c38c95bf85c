package stats

import (
	"fmt"
	"math"
	"reflect"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// The formatters of words.go, with a point and with a comma. Check values
// from memory (rounding of the decimals written out).
func TestWordsFormatters(t *testing.T) {
	pt, cm := words{}, words{comma: true}
	for _, c := range []struct{ got, want string }{
		{pt.p(0.1234), "p = 0.123"}, {cm.p(0.1234), "p = 0,123"},
		{pt.p(0.0004), "p < 0.001"}, {cm.p(0.0004), "p < 0,001"},
		{cm.p(0.001), "p = 0,001"},
		{pt.sig(0.2, 3), "0.200"}, {cm.sig(4.9413, 3), "4,94"}, {cm.sig(1.5e10, 3), "1,5e+10"},
		{pt.trim(1.50, 2), "1.5"}, {cm.trim(1.333, 2), "1,33"}, {cm.trim(2, 2), "2"},
		{cm.fixed(5.1, 2), "5,10"}, {pt.fixed(-0.05, 3), "-0.050"},
		{cm.level(0.95), "95%"}, {cm.level(0.9973), "99,73%"},
		{cm.pct(0.025), "2,5%"},
		{cm.g3(0.01), "0,01"}, {pt.g3(1234.5), "1.23e+03"},
		{cm.shortest(4.5), "4,5"},
		{pt.ppm(0), "0 ppm"}, {cm.ppm(0.001), "below 0,01 ppm"}, {cm.ppm(1234), "1200 ppm"},
		{cm.ppm(0.15), "0,15 ppm"}, {cm.ppm(25000), "2,5%"}, {pt.ppm(9960), "1%"}, {pt.ppm(9940), "9900 ppm"},
		{pt.grouped(100000), "100,000"}, {cm.grouped(100000), "100\u00a0000"}, {pt.grouped(999), "999"},
		{pt.grouped(-1234567), "-1,234,567"},
		// errors: the request's numbers, plainly (99.9/100 is 0.9990000000000001 in binary)
		{plainNum(99.9 / 100), "0.999"}, {plainNum(1e6), "1000000"}, {plainNum(95), "95"},
		{plainNum(1.5e-9), "1.5e-09"}, {plainNum(-0.25), "-0.25"},
	} {
		if c.got != c.want {
			t.Errorf("got %q, want %q", c.got, c.want)
		}
	}
	// decimalsFor: one significant digit of the half-width, two when it
	// starts with 1 (common practice for reporting intervals)
	for _, c := range []struct {
		h    float64
		want int
	}{{0.05, 2}, {0.015, 3}, {2.5, 0}, {0.2, 1}, {0, 2}, {math.Inf(1), 2}} {
		if got := decimalsFor(c.h); got != c.want {
			t.Errorf("decimalsFor(%v) = %d, want %d", c.h, got, c.want)
		}
	}
}

// userText lists the JSON paths of report strings that are the user's own
// text or identifiers (not written by the engine): readings as typed,
// column names and units, the reader's view of the input, the fingerprint,
// the groups' labels and titles.
var userText = regexp.MustCompile(`^(schema|input\.(fingerprint|column|order|unit|columns|reader)|input\.problems\[\d+\]\.(text|column)|(settings\.excluded|suspects\.readings)\[\d+\]\.(text|column)|centre\.modes\[\d+\]\.text|groups\.(column|columns|spread\.(largest|smallest)|effect\.[ab]|levels\[\d+\]\.(name|title|suspects\[\d+\]\.(text|column))|pairwise\.(means|medians)\.pairs\[\d+\]\.[ab]))(\.|\[|$)`)

// sentencePairs walks a report read with a decimal point and the same
// report read with a decimal comma side by side and returns every string
// the engine wrote (all but userText), with its JSON path.
func sentencePairs(t *testing.T, pt, cm *Report) (paths, points, commas []string) {
	var walk func(a, b reflect.Value, path string)
	walk = func(a, b reflect.Value, path string) {
		switch a.Kind() {
		case reflect.String:
			if !userText.MatchString(path) {
				paths, points, commas = append(paths, path), append(points, a.String()), append(commas, b.String())
			}
		case reflect.Pointer, reflect.Interface:
			if a.IsNil() != b.IsNil() {
				t.Errorf("%s: present in one report only", path)
				return
			}
			if !a.IsNil() {
				walk(a.Elem(), b.Elem(), path)
			}
		case reflect.Struct:
			for i := 0; i < a.NumField(); i++ {
				f := a.Type().Field(i)
				if !f.IsExported() {
					continue
				}
				name, _, _ := jsonName(f)
				p := path + "." + name
				if path == "" {
					p = name
				} else if f.Anonymous && f.Tag.Get("json") == "" {
					p = path
				}
				walk(a.Field(i), b.Field(i), p)
			}
		case reflect.Slice, reflect.Array:
			if a.Len() != b.Len() {
				t.Errorf("%s: %d items against %d", path, a.Len(), b.Len())
				return
			}
			for i := 0; i < a.Len(); i++ {
				walk(a.Index(i), b.Index(i), path+"["+strconv.Itoa(i)+"]")
			}
		case reflect.Map:
			for _, k := range a.MapKeys() {
				if bv := b.MapIndex(k); bv.IsValid() {
					walk(a.MapIndex(k), bv, path+"."+fmt.Sprint(k.Interface()))
				}
			}
		}
	}
	walk(reflect.ValueOf(pt).Elem(), reflect.ValueOf(cm).Elem(), "")
	return
}

var (
	pointNumber = regexp.MustCompile(`\d\.\d`)
	pointDigits = regexp.MustCompile(`(\d)\.(\d)`)
	commaNumber = regexp.MustCompile(`(\d),(\d)`)
)

// TestSentencesFollowDecimalMark: the same readings typed with a decimal
// comma and with a decimal point give the same report, and every sentence
// of the comma report writes its numbers with a comma (p-values, limits,
// constants of formulas), every sentence of the point report with a
// point: the comma report's text is the point report's with each decimal
// point between digits turned into a comma. The data sets are invented to
// reach many sentences (target, limits, suspects, skewed and bimodal
// shapes, few and equal values, a quantile definition whose median
// differs); the target 5.10 lies at the mean of the first set by
// construction (readings in pairs 5.10 ± d).
func TestSentencesFollowDecimalMark(t *testing.T) {
	f := func(x float64) *float64 { return &x }
	sym := []string{"5.10", "5.12", "5.08", "5.13", "5.07", "5.11", "5.09", "5.10", "5.14", "5.06",
		"5.12", "5.08", "5.10", "5.15", "5.05", "5.11", "5.09", "5.31", "4.89", "5.10", "5.13", "5.07", "5.10"}
	var skew, lognormal, bimodal, coarse, shifted []string
	for i := 1; i <= 60; i++ {
		skew = append(skew, strconv.FormatFloat(2+3*math.Pow(float64(i)/60, 4), 'f', 2, 64))
		// lognormal quantiles: 5·exp(0.4·Φ⁻¹((i - ½)/60))
		lognormal = append(lognormal, strconv.FormatFloat(5*math.Exp(0.4*math.Sqrt2*math.Erfinv(2*(float64(i)-0.5)/60-1)), 'f', 2, 64))
		bimodal = append(bimodal, strconv.FormatFloat(5+float64(i%2)+float64(i%7)/100, 'f', 2, 64))
		coarse = append(coarse, strconv.FormatFloat(5.1+float64(i%3)/10, 'f', 1, 64))
		// in time order: steady about 5.10, then 0.08 higher from reading 31
		// (a shift, a change point and signals in the Over time section)
		step := 0.0
		if i > 30 {
			step = 0.08
		}
		shifted = append(shifted, strconv.FormatFloat(5.1+step+0.01*float64([]int{0, 2, -1, 1, -2, 0, 1, -1}[i%8]), 'f', 2, 64))
	}
	// grouped: three lines (the third with a far reading, so the rank
	// tests and the Hodges-Lehmann shifts lead), and two lines
	var three, two []string
	for i := 0; i < 12; i++ {
		three = append(three, "A\t"+strconv.FormatFloat(5.10+float64(i%5)/100, 'f', 2, 64),
			"B\t"+strconv.FormatFloat(5.16+float64(i%4)/100, 'f', 2, 64),
			"C\t"+strconv.FormatFloat(5.05+float64(i%6)/100, 'f', 2, 64))
		two = append(two, "A\t"+strconv.FormatFloat(5.10+float64(i%5)/100, 'f', 2, 64),
			"B\t"+strconv.FormatFloat(5.13+float64(i%3)/100, 'f', 2, 64))
	}
	three = append([]string{"Line\tW"}, append(three, "C\t5.61")...)
	two = append([]string{"Line\tW"}, two...)
	grouped := Request{Value: "W", Group: "Line"}
	sets := []struct {
		name string
		vals []string
		opts Options
		req  Request // the columns, when not one column
	}{
		{"three groups", three, Options{LSL: f(4.95), USL: f(5.35), Confidence: 0.9}, grouped},
		{"two groups", two, Options{LSL: f(4.95), USL: f(5.35)}, grouped},
		{"symmetric with suspects", sym, Options{Target: f(5.1), LSL: f(4.95), USL: f(5.25), Exclude: []int{3, 999}, PopulationSD: true}, Request{}},
		{"skewed", skew, Options{Target: f(2.5), LSL: f(1.9), USL: f(5.5), Confidence: 0.9, CpkGoal: 1.67}, Request{}},
		{"lognormal", lognormal, Options{Target: f(5), LSL: f(1.9), USL: f(15)}, Request{}},
		{"bimodal", bimodal, Options{LSL: f(4.8), USL: f(6.3), Coverage: 0.95}, Request{}},
		{"coarse", coarse, Options{LSL: f(5.0), USL: f(5.4)}, Request{}},
		{"five", []string{"5.12", "5.08", "5.10", "5.15", "5.11"}, Options{Target: f(5.1)}, Request{}},
		{"near the largest double", []string{"1.7e308", "1.6e308", "1.5e308", "1.7e308"}, Options{LSL: f(1e308)}, Request{}},
		{"few, hf1", []string{"5.10", "5.30", "5.20", "5.60", "5.40", "5.50"}, Options{Target: f(5.25), Quantile: "hf1", LSL: f(5.0), USL: f(5.7)}, Request{}},
		{"equal", []string{"5.10", "5.10", "5.10", "5.10"}, Options{Target: f(5.1), LSL: f(5.0), USL: f(5.2)}, Request{}},
		{"ordered, shifting", shifted, Options{LSL: f(4.9), USL: f(5.4)}, Request{}},
		{"ordered, shifting, baseline", shifted, Options{LSL: f(4.9), USL: f(5.4), Baseline: "1-30", Signals: map[string]bool{"alternating": true}}, Request{}},
	}
	seenP, seenStatement, seenStability, seenGroups := false, false, false, 0
	for _, set := range sets {
		text := strings.Join(set.vals, "\n") + "\n"
		req := set.req
		req.Text, req.Options = text, set.opts
		pt, err := Analyze(req)
		if err != nil {
			t.Fatalf("%s: %v", set.name, err)
		}
		req.Text = strings.ReplaceAll(text, ".", ",")
		cm, err := Analyze(req)
		if err != nil {
			t.Fatalf("%s, comma: %v", set.name, err)
		}
		if pt.Input.DecimalComma || !cm.Input.DecimalComma {
			t.Fatalf("%s: decimal comma read as %v and %v", set.name, pt.Input.DecimalComma, cm.Input.DecimalComma)
		}
		paths, points, commas := sentencePairs(t, pt, cm)
		if len(paths) < 30 {
			t.Errorf("%s: only %d strings walked", set.name, len(paths))
		}
		for i, p := range paths {
			if pointNumber.MatchString(commas[i]) {
				t.Errorf("%s: %s has a decimal point with a decimal comma: %q", set.name, p, commas[i])
			}
			if commaNumber.MatchString(points[i]) {
				t.Errorf("%s: %s has a decimal comma with a decimal point: %q", set.name, p, points[i])
			}
			if want := pointDigits.ReplaceAllString(points[i], "$1,$2"); commas[i] != want {
				t.Errorf("%s: %s differs beyond the decimal mark:\npoint %q\ncomma %q", set.name, p, points[i], commas[i])
			}
			if regexp.MustCompile(`p [<=] 0,\d{3}`).MatchString(commas[i]) {
				seenP = true
			}
		}
		if strings.HasPrefix(set.name, "ordered") {
			// the section signals, and its sentences were walked
			if pt.Stability == nil || pt.Stability.Stable || !strings.Contains(cm.Stability.Verdict, "+0,0") || !strings.Contains(pt.Stability.Verdict, "+0.0") {
				t.Errorf("%s: verdicts %q and %q", set.name, pt.Stability.Verdict, cm.Stability.Verdict)
			}
			seenStability = true
		}
		if set.req.Group != "" {
			g := cm.Groups
			if g == nil || g.Statement == "" || !regexp.MustCompile(`\d,\d`).MatchString(g.Statement) {
				t.Errorf("%s: groups %+v, want a statement with decimal commas", set.name, g)
			} else {
				seenGroups++
			}
		}
		if set.name == "symmetric with suspects" {
			st := cm.Target.Statement
			if !regexp.MustCompile(`^The target 5,10+ lies inside the 95% interval for the mean, 5,\d+ to 5,\d+\.`).MatchString(st) {
				t.Errorf("comma statement %q", st)
			}
			if !regexp.MustCompile(`^The target 5\.10+ lies inside the 95% interval for the mean, 5\.\d+ to 5\.\d+\.`).MatchString(pt.Target.Statement) {
				t.Errorf("point statement %q", pt.Target.Statement)
			}
			seenStatement = true
		}
	}
	if !seenP || !seenStatement || !seenStability || seenGroups != 2 {
		t.Errorf("no p-value (%v), target statement (%v), over-time verdict (%v) or groups statements (%d of 2) was checked", seenP, seenStatement, seenStability, seenGroups)
	}
}
