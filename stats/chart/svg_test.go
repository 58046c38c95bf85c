package chart

import (
	"fmt"
	"math"
	"math/rand"
	"strconv"
	"strings"
	"testing"

	"lotlens/stats"
)

// The charts write their text by appending (svg.go); these tests hold each
// appender to what the standard library's formatting writes (Go's fmt and
// strconv are the references), and the point titles of the long charts to
// the same titles built as plain strings.

// refNum is Format.Num written with strings (the reference).
func refNum(f Format, v float64, d int) string {
	d = min(max(d, 0), 12)
	s := strconv.FormatFloat(v, 'f', d, 64)
	if s == "-0" || strings.HasPrefix(s, "-0.") && strings.Trim(s[3:], "0") == "" {
		s = s[1:]
	}
	if f.DecimalComma {
		s = strings.Replace(s, ".", ",", 1)
	}
	return s
}

func refValue(f Format, v float64) string {
	if f.Unit != "" {
		return refNum(f, v, f.Decimals) + " " + f.Unit
	}
	return refNum(f, v, f.Decimals)
}

// testValues are decimals of 0 to 8 places over many magnitudes, the
// doubles either side of each, and values strconv treats specially.
func testValues(n int) []float64 {
	r := rand.New(rand.NewSource(11))
	vals := []float64{0, math.Copysign(0, -1), 0.05, -0.05, 0.005, 0.0049999, 1e9, 999999999.9999999, -1e9, 1e-7, 1e300, -1e-300,
		math.MaxFloat64, math.SmallestNonzeroFloat64, math.Inf(1), math.Inf(-1), math.NaN(), 2.5, 0.125, -0.125, 5.1, 4.85}
	for i := 0; i < n; i++ {
		places := r.Intn(9)
		mant := r.Int63n([]int64{10, 1000, 1e6, 1e9, 1e12, 1e15}[r.Intn(6)])
		v := float64(mant) / math.Pow(10, float64(places))
		v, _ = strconv.ParseFloat(strconv.FormatFloat(v, 'f', places, 64), 64) // the double nearest the decimal
		if r.Intn(2) == 0 {
			v = -v
		}
		vals = append(vals, v, math.Nextafter(v, math.Inf(1)), math.Nextafter(v, math.Inf(-1)))
	}
	return vals
}

func TestAppendFixedAgreesWithStrconv(t *testing.T) {
	n := 100000
	if testing.Short() {
		n = 10000
	}
	for _, v := range testValues(n) {
		for d := 0; d <= 12; d++ {
			want := strconv.FormatFloat(v, 'f', d, 64)
			if got := appendFixed([]byte("x"), v, d); string(got[1:]) != want {
				t.Fatalf("%v with %d decimals: %s, strconv %s", v, d, got[1:], want)
			}
		}
	}
}

func TestNumAgreesWithStrings(t *testing.T) {
	for _, v := range testValues(3000) {
		for _, f := range []Format{{Decimals: 2}, {Decimals: 3, DecimalComma: true, Unit: "g"}, {Decimals: 0, Unit: `<&>"'`}} {
			for d := -1; d <= 13; d++ {
				if got, want := f.Num(v, d), refNum(f, v, d); got != want {
					t.Fatalf("Num(%v, %d) with %+v = %q, want %q", v, d, f, got, want)
				}
			}
			if got, want := f.Value(v), refValue(f, v); got != want {
				t.Fatalf("Value(%v) with %+v = %q, want %q", v, f, got, want)
			}
			if got, want := string(f.appendValue([]byte{}, v)), esc(refValue(f, v)); got != want {
				t.Fatalf("appendValue(%v) with %+v = %q, want %q", v, f, got, want)
			}
		}
	}
}

// TestLineAndTextAgreeWithFmt: line and text write what the format strings
// they replaced write.
func TestLineAndTextAgreeWithFmt(t *testing.T) {
	vals := testValues(200)
	for i, x := range vals {
		y := vals[(i*7+3)%len(vals)]
		c := &canvas{}
		c.line(x, y, y, x, Vermilion, []float64{1, 1.5, 2, 2.5, 0.5}[i%5], []string{"", "8 4"}[i%2], "limit upper")
		d := ""
		if i%2 == 1 {
			d = ` stroke-dasharray="8 4"`
		}
		want := fmt.Sprintf(`<line x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f" stroke="%s" stroke-width="%g"%s class="%s"/>`,
			x, y, y, x, Vermilion, []float64{1, 1.5, 2, 2.5, 0.5}[i%5], d, "limit upper")
		if string(c.b) != want {
			t.Fatalf("line: %s\nwant  %s", c.b, want)
		}
		c.b = nil
		c.text(x, y, "middle", "row-label", xss+" 5,1 g")
		want = fmt.Sprintf(`<text x="%.1f" y="%.1f" text-anchor="%s" class="%s">%s</text>`, x, y, "middle", "row-label", esc(xss+" 5,1 g"))
		if string(c.b) != want {
			t.Fatalf("text: %s\nwant  %s", c.b, want)
		}
	}
}

// refPointTitle is a control chart point's title built as a string.
func refPointTitle(r *stats.Report, p stats.CtlPoint, f Format) string {
	s := "row " + strconv.Itoa(p.Row) + ": " + refValue(f, p.Y)
	if p.Label != "" {
		s = p.Label + " (" + strconv.Itoa(p.N) + " readings, mean " + refNum(f, p.Y, f.Decimals+1) + ")"
	}
	s += ", position " + strconv.Itoa(p.I)
	if p.T != nil && r.Stability.Chart.TimeAxis {
		s += ", " + timeLabel(*p.T)
	}
	if p.LeftOut {
		s += "; left out by you"
	}
	for _, fl := range p.Flags {
		s += "; signal " + fl
	}
	return s
}

func TestPointTitleAgreesWithStrings(t *testing.T) {
	r := controlSample()
	r.Stability.Chart.TimeAxis = true
	tm := 1.7e9 + 3600.5
	for i, f := range []Format{{Decimals: 2}, {Decimals: 1, DecimalComma: true, Unit: "<g>"}} {
		for _, p := range []stats.CtlPoint{
			{I: 3, Row: 4, Y: 5.12},
			{I: 7, Row: 9, Y: -0.001, LeftOut: true, T: &tm},
			{I: 12, Row: 15, Label: xss + "&'\"", N: 4, Y: 5.125, Flags: []string{"beyond-limits", "ewma"}},
		} {
			want := esc(refPointTitle(r, p, f))
			if got := string(appendPointTitle(nil, r, &p, f)); got != want {
				t.Errorf("format %d, row %d: %q, want %q", i, p.Row, got, want)
			}
		}
	}
}

// TestPointTitlesInSVG reads every point symbol's title back from the long
// charts of engine reports (individuals with a decimal comma and readings
// left out; subgroups whose labels need escaping) and compares it with the
// title built as a string from the report.
func TestPointTitlesInSVG(t *testing.T) {
	var ind, sub strings.Builder
	ind.WriteString("Weight (g)\n")
	sub.WriteString("Lot\tWeight (g)\n")
	for i := 0; i < 3000; i++ { // invented: a cycle with a step after reading 2000
		v := 5 + 0.01*float64((i*7)%13-6)
		if i > 2000 {
			v += 0.08
		}
		ind.WriteString(strings.Replace(strconv.FormatFloat(v, 'f', 2, 64), ".", ",", 1) + "\n")
		sub.WriteString("<lot & " + strconv.Itoa(i/5) + ">\t" + strconv.FormatFloat(v, 'f', 2, 64) + "\n")
	}
	for name, req := range map[string]stats.Request{
		"individuals": {Text: ind.String(), Options: stats.Options{Exclude: []int{5, 900}}},
		"subgroups":   {Text: sub.String(), Value: "Weight (g)", Subgroup: "Lot"},
	} {
		r, err := stats.Analyze(req)
		if err != nil {
			t.Fatal(err)
		}
		f := FormatOf(r)
		want := map[string]map[string]string{"control": {}, "probplot": {}, "run": {}}
		for _, p := range r.Stability.Chart.Points {
			want["control"][strconv.Itoa(p.Row)] = refPointTitle(r, p, f)
		}
		for _, p := range r.Charts.ProbPlot.Points {
			want["probplot"][strconv.Itoa(p.Row)] = "row " + strconv.Itoa(p.Row) + ": " + refValue(f, p.Y) + " (z = " + refNum(f, p.Z, 2) + ")"
		}
		flagged := map[int]bool{}
		for _, s := range r.Suspects.Readings {
			flagged[s.Row] = true
		}
		for _, p := range r.Charts.Series {
			s := "row " + strconv.Itoa(p.Row) + ": " + refValue(f, p.Y)
			if flagged[p.Row] {
				s += ", flagged"
			}
			want["run"][strconv.Itoa(p.Row)] = s
		}
		all := All(r)
		for chart, titles := range want {
			n, signals := 0, 0
			for _, pt := range parse(t, all[chart]).all(byClass("pt")) {
				if pt.hasClass("spread") {
					continue // the spread chart's own symbols
				}
				n++
				if pt.hasClass("signal") {
					signals++
				}
				if got, w := pt.title(), titles[pt.attr("data-row")]; got != w {
					t.Errorf("%s %s, row %s: title %q, want %q", name, chart, pt.attr("data-row"), got, w)
				}
			}
			if n < 100 || chart == "control" && signals == 0 {
				t.Errorf("%s %s: %d symbols (%d signals): the test does not reach the titles", name, chart, n, signals)
			}
		}
	}
}

// TestBarsAgreeWithFmt: the histogram's and the spec chart's bars are what
// the format strings they replaced write.
func TestBarsAgreeWithFmt(t *testing.T) {
	h := stats.Histogram{Edges: []float64{-0.0001, 4.95, 5.05, 5.15, 1e9, math.Inf(1)}, Counts: []int{0, 3, 12, 1, 7}}
	xs, ys := scale{-0.5, 6, marginL, Width - marginR}, scale{0, 12, Height - marginB, marginT}
	for _, f := range []Format{{Decimals: 2}, {Decimals: 1, DecimalComma: true, Unit: "<g>"}} {
		for _, style := range []string{"", ` fill-opacity="0.6"`} {
			var want strings.Builder
			want.WriteString(`<g class="bars">`)
			for i, k := range h.Counts {
				x0, x1 := xs.at(h.Edges[i]), xs.at(h.Edges[i+1])
				y := ys.at(float64(k))
				fmt.Fprintf(&want, `<rect x="%.1f" y="%.1f" width="%.1f" height="%.1f" fill="%s"%s stroke="%s" stroke-width="1" class="bar" data-bin="%d" data-count="%d"><title>%s</title></rect>`,
					x0, y, math.Max(x1-x0, 0.5), ys.at(0)-y, SkyBlue, style, Black, i, k,
					esc(fmt.Sprintf("%s to %s: %d values", refNum(f, h.Edges[i], f.Decimals+1), refNum(f, h.Edges[i+1], f.Decimals+1), k)))
			}
			want.WriteString(`</g>`)
			c := &canvas{}
			c.bars(h, xs, ys, f, style)
			if string(c.b) != want.String() {
				t.Errorf("bars with %+v:\n got %s\nwant %s", f, c.b, want.String())
			}
		}
	}
}
