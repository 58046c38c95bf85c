package chart

import (
	"math"
	"math/rand"
	"strconv"
	"strings"
	"testing"

	"lotlens/stats"
)

// specReport analyses generated readings with the given limits. Nothing
// here is a statistical check value: the tests check the drawing against
// the report it was drawn from.
func specReport(t *testing.T, skewed bool, lsl, usl, target *float64) *stats.Report {
	t.Helper()
	rng := rand.New(rand.NewSource(7))
	var b strings.Builder
	b.WriteString("Seal strength (N)\n")
	for i := 0; i < 300; i++ {
		v := 5 + 0.05*rng.NormFloat64()
		if skewed {
			v = 4.9 + 0.08*rng.ExpFloat64()
		}
		b.WriteString(strconv.FormatFloat(v, 'f', 3, 64) + "\n")
	}
	rep, err := stats.Analyze(stats.Request{Text: b.String(), Options: stats.Options{LSL: lsl, USL: usl, Target: target}})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Spec == nil {
		t.Fatal("no spec section")
	}
	return rep
}

func TestSpecFitChart(t *testing.T) {
	for _, skewed := range []bool{false, true} {
		rep := specReport(t, skewed, f64(4.85), f64(5.25), f64(5.05))
		svg := All(rep)["spec"]
		root := parse(t, svg)
		if strings.Contains(svg, "NaN") || strings.Contains(svg, "Inf") {
			t.Errorf("skewed=%v: the chart holds NaN or Inf", skewed)
		}
		bars := root.all(byClass("bar"))
		if len(bars) != len(rep.Charts.Histogram.Counts) {
			t.Errorf("skewed=%v: %d bars, want %d", skewed, len(bars), len(rep.Charts.Histogram.Counts))
		}
		// one curve per model the report carries, each named in the legend
		curves := root.all(byClass("curve"))
		if len(curves) != len(rep.Spec.Curves) || len(curves) < 2 {
			t.Fatalf("skewed=%v: %d curves drawn, report has %d", skewed, len(curves), len(rep.Spec.Curves))
		}
		legend := strings.Join(texts(root.all(byClass("legend-label"))), "|")
		for i, c := range curves {
			m := rep.Spec.Curves[i].Model
			if c.attr("data-model") != m {
				t.Errorf("curve %d is %q, want %q", i, c.attr("data-model"), m)
			}
			if !strings.Contains(legend, specModelStyle(m).label) {
				t.Errorf("legend %q does not name %s", legend, m)
			}
		}
		// styles differ in dash pattern as well as colour
		seen := map[string]bool{}
		for _, c := range curves {
			seen[c.attr("stroke-dasharray")] = true
		}
		if len(seen) != len(curves) {
			t.Errorf("skewed=%v: curves share a dash pattern", skewed)
		}
		if skewed && len(curves) != 3 {
			t.Errorf("skewed data: %d curves, want the chosen fit as a third (lead %s)", len(curves), rep.Spec.Lead)
		}
		// the normal curve peaks where the mean is (the bar scale: n·width·density)
		for _, c := range curves {
			if c.attr("data-model") != "normal-overall" {
				continue
			}
			pts := pathPoints(t, c.attr("d"))
			best := pts[0]
			for _, p := range pts {
				if p[1] < best[1] {
					best = p
				}
			}
			lsl, usl := lineX(t, root, "lsl"), lineX(t, root, "usl")
			// LSL 4.85 and USL 5.25 on screen give the value scale
			x := 4.85 + (best[0]-lsl)/(usl-lsl)*0.4
			if math.Abs(x-rep.Centre.Mean) > 0.4/50 {
				t.Errorf("overall normal peaks at %.4f, mean %.4f", x, rep.Centre.Mean)
			}
		}
		labels := strings.Join(texts(root.all(byClass("marker-label"))), "|")
		for _, want := range []string{"LSL 4.850", "USL 5.250", "target 5.050"} {
			if !strings.Contains(labels, want) {
				t.Errorf("labels %q lack %q", labels, want)
			}
		}
	}
}

func TestSpecSpreadChart(t *testing.T) {
	rep := specReport(t, false, f64(4.85), f64(5.25), f64(5.05))
	root := parse(t, All(rep)["spec-spread"])
	rows := map[string]node{}
	for _, g := range root.all(func(n node) bool { return n.XMLName.Local == "g" && n.hasClass("span") }) {
		for _, k := range []string{"tolerance", "within", "overall", "fitted", "readings"} {
			if g.hasClass(k) {
				rows[k] = g
			}
		}
	}
	for _, k := range []string{"tolerance", "within", "overall", "readings"} {
		if _, ok := rows[k]; !ok {
			t.Fatalf("no %s row", k)
		}
	}
	if _, ok := rows["fitted"]; ok {
		t.Error("a fitted row for normal readings")
	}
	lsl, usl := lineX(t, root, "lsl"), lineX(t, root, "usl")
	scaleX := func(v float64) float64 { return lsl + (v-4.85)/0.4*(usl-lsl) }
	bar := func(k string) (float64, float64) {
		b := rows[k].all(byClass("span-bar"))
		if len(b) == 0 {
			t.Fatalf("%s row has no bar", k)
		}
		if b[0].XMLName.Local == "rect" {
			return b[0].num(t, "x"), b[0].num(t, "x") + b[0].num(t, "width")
		}
		ls := b[0].all(byClass("range"))
		return ls[0].num(t, "x1"), ls[0].num(t, "x2")
	}
	check := func(k string, lo, hi float64) {
		x0, x1 := bar(k)
		if math.Abs(x0-scaleX(lo)) > 0.6 || math.Abs(x1-scaleX(hi)) > 0.6 {
			t.Errorf("%s spans %.1f..%.1f px, want %.1f..%.1f", k, x0, x1, scaleX(lo), scaleX(hi))
		}
	}
	check("tolerance", 4.85, 5.25)
	m, sw, so := rep.Centre.Mean, rep.Spec.Sigma.Within.Value, rep.Spec.Sigma.Overall.Value
	check("within", m-3*sw, m+3*sw)
	check("overall", m-3*so, m+3*so)
	check("readings", rep.Quantile.Min, rep.Quantile.Max)
	// each row is named in text with its ends and its place against the limits
	for k, g := range rows {
		lab := texts(g.all(byClass("span-label")))
		ends := texts(g.all(byClass("span-ends")))
		if len(lab) != 1 || len(ends) != 1 || lab[0] == "" {
			t.Errorf("%s row: labels %q, ends %q", k, lab, ends)
			continue
		}
		if k != "tolerance" && !strings.HasSuffix(ends[0], "inside") && !strings.Contains(ends[0], "beyond") {
			t.Errorf("%s row does not say whether it stays inside: %q", k, ends[0])
		}
	}
	if x := lineX(t, root, "target"); math.Abs(x-scaleX(5.05)) > 0.6 {
		t.Errorf("target at %.1f px, want %.1f", x, scaleX(5.05))
	}
}

func TestSpecChartsOneSidedAndSkewed(t *testing.T) {
	// one-sided: the tolerance row is open towards the missing limit
	rep := specReport(t, false, nil, f64(5.25), nil)
	root := parse(t, All(rep)["spec-spread"])
	ends := texts(root.all(byClass("span-ends")))
	if len(ends) == 0 || !strings.HasPrefix(ends[0], "up to USL 5.250") {
		t.Errorf("one-sided tolerance row says %q", ends)
	}
	if len(root.all(byClass("lsl"))) != 0 {
		t.Error("an LSL line without an LSL")
	}
	parse(t, All(rep)["spec"])
	// skewed: the chosen fit has its 99.73 % row
	rep = specReport(t, true, f64(4.85), f64(5.6), nil)
	if rep.Spec.Model == nil || rep.Spec.Model.Chosen == "normal" {
		t.Skipf("skewed data did not lead to a non-normal model (%+v)", rep.Spec.Model)
	}
	root = parse(t, All(rep)["spec-spread"])
	if len(root.all(byClass("fitted"))) != 1 {
		t.Errorf("no row for the chosen model %s", rep.Spec.Model.Chosen)
	}
	// without limits neither chart is drawn
	rep = specReport(t, false, f64(4.85), nil, nil)
	rep.Spec = nil
	if s := All(rep); s["spec"] != "" || s["spec-spread"] != "" {
		t.Error("spec charts drawn without a spec section")
	}
}

func texts(ns []node) []string {
	var out []string
	for _, n := range ns {
		out = append(out, n.Text)
	}
	return out
}

func lineX(t *testing.T, root node, class string) float64 {
	t.Helper()
	ls := root.all(func(n node) bool { return n.XMLName.Local == "line" && n.hasClass(class) })
	if len(ls) != 1 {
		t.Fatalf("%d %s lines, want 1", len(ls), class)
	}
	return ls[0].num(t, "x1")
}

// pathPoints reads the points of an "M x y L x y ..." path.
func pathPoints(t *testing.T, d string) [][2]float64 {
	t.Helper()
	var out [][2]float64
	for _, seg := range strings.FieldsFunc(d, func(r rune) bool { return r == 'M' || r == 'L' }) {
		f := strings.Fields(seg)
		if len(f) != 2 {
			t.Fatalf("path segment %q", seg)
		}
		x, err1 := strconv.ParseFloat(f[0], 64)
		y, err2 := strconv.ParseFloat(f[1], 64)
		if err1 != nil || err2 != nil {
			t.Fatalf("path segment %q", seg)
		}
		out = append(out, [2]float64{x, y})
	}
	return out
}
