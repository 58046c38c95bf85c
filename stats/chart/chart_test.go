package chart

import (
	"encoding/xml"
	"fmt"
	"math"
	"math/rand"
	"strconv"
	"strings"
	"testing"

	"lotlens/stats"
)

// node is a generic XML element for inspecting the SVG.
type node struct {
	XMLName xml.Name
	Attrs   []xml.Attr `xml:",any,attr"`
	Nodes   []node     `xml:",any"`
	Text    string     `xml:",chardata"`
}

func (n node) attr(k string) string {
	for _, a := range n.Attrs {
		if a.Name.Local == k {
			return a.Value
		}
	}
	return ""
}

func (n node) num(t *testing.T, k string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(n.attr(k), 64)
	if err != nil {
		t.Fatalf("<%s> attribute %s = %q is not a number", n.XMLName.Local, k, n.attr(k))
	}
	return v
}

func (n node) hasClass(c string) bool {
	for _, f := range strings.Fields(n.attr("class")) {
		if f == c {
			return true
		}
	}
	return false
}

// all returns every element (depth first) for which keep is true.
func (n node) all(keep func(node) bool) []node {
	var out []node
	if keep(n) {
		out = append(out, n)
	}
	for _, c := range n.Nodes {
		out = append(out, c.all(keep)...)
	}
	return out
}

func (n node) title() string {
	for _, c := range n.Nodes {
		if c.XMLName.Local == "title" {
			return c.Text
		}
	}
	return ""
}

func parse(t *testing.T, svg string) node {
	t.Helper()
	if svg == "" {
		t.Fatal("chart is empty")
	}
	var root node
	if err := xml.Unmarshal([]byte(svg), &root); err != nil {
		t.Fatalf("not well-formed XML: %v\n%s", err, svg)
	}
	if root.XMLName.Local != "svg" {
		t.Fatalf("root element is <%s>, want <svg>", root.XMLName.Local)
	}
	return root
}

func byClass(c string) func(node) bool { return func(n node) bool { return n.hasClass(c) } }

const xss = `<img src=x onerror=alert(1)>`

func f64(v float64) *float64 { return &v }

// sample is a hand-made report (invented numbers, consistent by construction:
// 10 readings, two of them flagged). Nothing here is a statistical check
// value: the tests check geometry and text against these inputs.
func sample() *stats.Report {
	return &stats.Report{
		Input:    stats.Input{Column: xss, Unit: "g"},
		Settings: stats.Settings{Target: f64(5.0), LSL: f64(4.8), USL: f64(5.4)},
		Counts:   stats.Counts{Used: 10, Decimals: 2},
		Centre:   &stats.Centre{Mean: 5.1, Median: 5.1},
		Spread:   &stats.Spread{SD: 0.1},
		Suspects: &stats.Suspects{Readings: []stats.Suspect{
			{Reading: stats.Reading{Row: 12, Value: 6.0, Text: "6.00"}},
			{Reading: stats.Reading{Row: 3, Value: 4.6, Text: "4.60"}},
		}},
		Charts: &stats.Charts{
			Histogram: stats.Histogram{Rule: "sturges", Edges: []float64{4.9, 5.0, 5.1, 5.2, 5.3}, Counts: []int{1, 3, 4, 2}},
			Box: stats.Box{Q1: 5.0, Median: 5.1, Q3: 5.2, LoWhisker: 4.95, HiWhisker: 5.28,
				InnerLo: 4.7, InnerHi: 5.5, OuterLo: 4.4, OuterHi: 5.8},
			ProbPlot: stats.ProbPlot{Positions: "Blom", Line: [2]float64{5.1, 0.1},
				Points: []stats.ProbPt{{Z: -1, Y: 5.0, Row: 2}, {Z: 0, Y: 5.1, Row: 4}, {Z: 1, Y: 5.25, Row: 5}},
				Band:   []stats.BandPt{{Z: -1, Lo: 4.9, Hi: 5.1}, {Z: 0, Lo: 5.05, Hi: 5.15}, {Z: 1, Lo: 5.1, Hi: 5.3}}},
			Series: []stats.SeriesPt{{I: 0, Row: 2, Y: 5.0}, {I: 1, Row: 3, Y: 4.6}, {I: 2, Row: 4, Y: 5.1}, {I: 3, Row: 12, Y: 6.0}},
		},
	}
}

func TestTicks(t *testing.T) {
	// Expected ticks: the 1-2-5 rule (Heckbert 1990), worked by hand.
	for _, c := range []struct {
		lo, hi float64
		n      int
		want   []float64
		dec    int
	}{
		{0, 10, 6, []float64{0, 2, 4, 6, 8, 10}, 0},
		{4.93, 5.31, 7, []float64{4.95, 5, 5.05, 5.1, 5.15, 5.2, 5.25, 5.3}, 2},
		{-3, 3, 7, []float64{-3, -2, -1, 0, 1, 2, 3}, 0},
		{120, 980, 5, []float64{200, 400, 600, 800}, 0},
	} {
		got, dec := Ticks(c.lo, c.hi, c.n)
		if dec != c.dec || len(got) != len(c.want) {
			t.Errorf("Ticks(%g, %g, %d) = %v (dec %d), want %v (dec %d)", c.lo, c.hi, c.n, got, dec, c.want, c.dec)
			continue
		}
		for i := range got {
			if math.Abs(got[i]-c.want[i]) > 1e-12 {
				t.Errorf("Ticks(%g, %g, %d) = %v, want %v", c.lo, c.hi, c.n, got, c.want)
				break
			}
		}
	}
	// A degenerate range still gets ticks around the value.
	if got, _ := Ticks(5, 5, 5); len(got) == 0 || got[0] > 5 || got[len(got)-1] < 5 {
		t.Errorf("Ticks(5, 5) = %v, want ticks around 5", got)
	}
}

func TestFormat(t *testing.T) {
	f := Format{DecimalComma: true, Unit: "g", Decimals: 2}
	if got := f.Num(5.14, 2); got != "5,14" {
		t.Errorf("decimal comma: got %q, want 5,14", got)
	}
	if got := f.Value(5.1); got != "5,10 g" {
		t.Errorf("value at resolution: got %q, want \"5,10 g\"", got)
	}
	if got := (Format{}).Num(-0.0001, 2); got != "0.00" {
		t.Errorf("negative zero: got %q, want 0.00", got)
	}
}

func TestEscapesText(t *testing.T) {
	r := sample()
	for name, svg := range All(r) {
		root := parse(t, svg)
		if imgs := root.all(func(n node) bool { return n.XMLName.Local == "img" }); len(imgs) > 0 {
			t.Errorf("%s: the column header became an <img> element", name)
		}
		if !strings.Contains(root.title(), xss) {
			t.Errorf("%s: title %q does not show the header as text", name, root.title())
		}
	}
	if len(All(r)) != 4 {
		t.Errorf("All drew %d charts, want 4", len(All(r)))
	}
}

func TestNilAndEmpty(t *testing.T) {
	if got := All(nil); len(got) != 0 {
		t.Errorf("All(nil) = %v", got)
	}
	if got := All(&stats.Report{}); len(got) != 0 {
		t.Errorf("All(no charts) = %v", got)
	}
	r := sample()
	r.Charts.Histogram.Edges = r.Charts.Histogram.Edges[:2] // inconsistent bins
	if Histogram(r) != "" {
		t.Error("histogram drawn from inconsistent bins")
	}
}

func TestHistogramGeometry(t *testing.T) {
	root := parse(t, Histogram(sample()))
	bars := root.all(byClass("bar"))
	if len(bars) != 4 {
		t.Fatalf("%d bars, want 4", len(bars))
	}
	base := bars[0].num(t, "y") + bars[0].num(t, "height")
	for i, b := range bars {
		if got := b.num(t, "y") + b.num(t, "height"); math.Abs(got-base) > 0.2 {
			t.Errorf("bar %d does not stand on the axis: bottom %g, want %g", i, got, base)
		}
	}
	// heights proportional to counts 1, 3, 4, 2
	unit := bars[0].num(t, "height")
	for i, want := range []float64{1, 3, 4, 2} {
		if got := bars[i].num(t, "height") / unit; math.Abs(got-want) > 0.05 {
			t.Errorf("bar %d height ratio %g, want %g", i, got, want)
		}
		if !strings.Contains(bars[i].title(), strconv.Itoa(int(want))+" values") {
			t.Errorf("bar %d title %q", i, bars[i].title())
		}
	}
	// bars are adjacent: each starts where the last ended
	for i := 1; i < 4; i++ {
		end := bars[i-1].num(t, "x") + bars[i-1].num(t, "width")
		if math.Abs(bars[i].num(t, "x")-end) > 0.2 {
			t.Errorf("gap between bar %d and %d", i-1, i)
		}
	}
	// target 5.0 sits on the edge between bars 0 and 1; LSL left of all bars, USL right
	line := func(class string) node {
		ls := root.all(func(n node) bool { return n.XMLName.Local == "line" && n.hasClass(class) })
		if len(ls) != 1 {
			t.Fatalf("%d %s lines, want 1", len(ls), class)
		}
		return ls[0]
	}
	if x := line("target").num(t, "x1"); math.Abs(x-bars[1].num(t, "x")) > 0.2 {
		t.Errorf("target at x=%g, want the 5.0 bin edge at %g", x, bars[1].num(t, "x"))
	}
	if x := line("lsl").num(t, "x1"); x >= bars[0].num(t, "x") {
		t.Errorf("LSL 4.8 at x=%g, not left of the first bin (4.9)", x)
	}
	if x := line("usl").num(t, "x1"); x <= bars[3].num(t, "x")+bars[3].num(t, "width") {
		t.Errorf("USL 5.4 at x=%g, not right of the last bin (5.3)", x)
	}
	if fit := root.all(byClass("normal-fit")); len(fit) != 1 {
		t.Errorf("%d normal curves, want 1", len(fit))
	}
	// the limits are labelled in text, not by colour only
	labels := root.all(byClass("marker-label"))
	var txt []string
	for _, l := range labels {
		txt = append(txt, l.Text)
	}
	if j := strings.Join(txt, "|"); !strings.Contains(j, "LSL 4.80") || !strings.Contains(j, "USL 5.40") || !strings.Contains(j, "target 5.00") {
		t.Errorf("marker labels %q, want LSL 4.80, target 5.00, USL 5.40", j)
	}
}

func TestBoxFlagsByRow(t *testing.T) {
	root := parse(t, Box(sample()))
	pts := root.all(byClass("pt"))
	if len(pts) != 2 {
		t.Fatalf("%d flagged points, want 2", len(pts))
	}
	rows := map[string]node{}
	for _, p := range pts {
		rows[p.attr("data-row")] = p
	}
	far, near := rows["12"], rows["3"]
	if !far.hasClass("far") || far.XMLName.Local != "path" {
		t.Errorf("row 12 (6.0, beyond the outer fence 5.8) drawn as <%s class=%q>, want a triangle of class far", far.XMLName.Local, far.attr("class"))
	}
	if !near.hasClass("near") || near.XMLName.Local != "circle" {
		t.Errorf("row 3 (4.6, between fences) drawn as <%s class=%q>, want an open circle of class near", near.XMLName.Local, near.attr("class"))
	}
	if far.title() != "row 12: 6.00 g" {
		t.Errorf("row 12 title %q", far.title())
	}
	var labels []string
	for _, l := range root.all(byClass("row-label")) {
		labels = append(labels, l.Text)
	}
	if strings.Join(labels, ",") != "row 3,row 12" {
		t.Errorf("row labels %v, want row 3, row 12", labels)
	}
	box := root.all(byClass("box"))[0]
	med := root.all(byClass("median"))[0]
	x0, x1 := box.num(t, "x"), box.num(t, "x")+box.num(t, "width")
	if mx := med.num(t, "x1"); !(mx > x0 && mx < x1) || math.Abs(mx-(x0+x1)/2) > 0.2 {
		t.Errorf("median at %g, want the middle of the box %g..%g (Q1 5.0, median 5.1, Q3 5.2)", mx, x0, x1)
	}
	outer := root.all(func(n node) bool { return n.XMLName.Local == "line" && n.hasClass("outer") })
	if len(outer) != 2 {
		t.Fatalf("%d outer fences, want 2", len(outer))
	}
	if fx := outer[1].num(t, "x1"); fx >= pointX(t, far) {
		t.Errorf("row 12 is not drawn beyond the outer fence")
	}
}

// pointX returns the x of a marker (circle centre or the path's first vertex).
func pointX(t *testing.T, n node) float64 {
	if n.XMLName.Local == "circle" {
		return n.num(t, "cx")
	}
	d := strings.TrimPrefix(n.attr("d"), "M")
	x, err := strconv.ParseFloat(strings.Fields(d)[0], 64)
	if err != nil {
		t.Fatal(err)
	}
	return x
}

func TestProbPlotOrder(t *testing.T) {
	root := parse(t, ProbPlot(sample()))
	pts := root.all(byClass("pt"))
	if len(pts) != 3 {
		t.Fatalf("%d points, want 3", len(pts))
	}
	for i := 1; i < 3; i++ {
		if !(pts[i].num(t, "cx") > pts[i-1].num(t, "cx") && pts[i].num(t, "cy") < pts[i-1].num(t, "cy")) {
			t.Errorf("point %d is not right of and above point %d", i, i-1)
		}
	}
	// the middle point (z 0, 5.1) lies on the fitted line 5.1 + 0.1 z
	fit := root.all(byClass("fit"))[0]
	x1, y1, x2, y2 := fit.num(t, "x1"), fit.num(t, "y1"), fit.num(t, "x2"), fit.num(t, "y2")
	cx, cy := pts[1].num(t, "cx"), pts[1].num(t, "cy")
	if yl := y1 + (cx-x1)/(x2-x1)*(y2-y1); math.Abs(yl-cy) > 0.3 {
		t.Errorf("point on the line drawn at y=%g, line at %g", cy, yl)
	}
	if pts[2].title() != "row 5: 5.25 g (z = 1.00)" {
		t.Errorf("title %q", pts[2].title())
	}
	// the band is one shaded envelope, not two dashed lines
	if b := root.all(byClass("band")); len(b) != 0 {
		t.Errorf("%d band lines, want none (a shaded envelope instead)", len(b))
	}
	env := root.all(byClass("envelope"))
	if len(env) != 1 {
		t.Fatalf("%d envelopes, want 1", len(env))
	}
	if e := env[0]; e.attr("fill") == "" || e.attr("fill") == "none" || e.attr("stroke-dasharray") != "" || !strings.HasSuffix(e.attr("d"), "Z") {
		t.Errorf("envelope fill %q dash %q d %q: want a filled, closed shape without dashes", e.attr("fill"), e.attr("stroke-dasharray"), e.attr("d"))
	}
	// 3 band points: up along the upper edge, back along the lower: 6 vertices
	if got := strings.Count(env[0].attr("d"), "L") + 1; got != 6 {
		t.Errorf("envelope has %d vertices, want 6", got)
	}
	var key []string
	for _, l := range root.all(byClass("legend-label")) {
		key = append(key, l.Text)
	}
	if j := strings.Join(key, "|"); !strings.Contains(j, "95 % envelope, all points") {
		t.Errorf("legend %q does not name the 95 %% simultaneous envelope (the default confidence, no bandLevel in the report)", j)
	}
	// with the report's bandLevel (the level actually used, here 0.99 while
	// the setting asked 0.995) the key and the description name that level
	// and the envelope's method
	r := sample()
	r.Settings.Confidence = 0.995
	r.Charts.ProbPlot.BandMethod, r.Charts.ProbPlot.BandLevel = "tail-sensitive", 0.99
	svg := ProbPlot(r)
	root = parse(t, svg)
	key = key[:0]
	for _, l := range root.all(byClass("legend-label")) {
		key = append(key, l.Text)
	}
	if j := strings.Join(key, "|"); !strings.Contains(j, "99 % envelope, all points") || strings.Contains(j, "99.5") {
		t.Errorf("legend %q does not name the 99 %% envelope the report used", j)
	}
	if !strings.Contains(svg, "99 % simultaneous envelope (tail-sensitive): if any point leaves it") {
		t.Errorf("description does not name the simultaneous envelope: %.400s", svg)
	}
}

// The box plot's row labels never overlap, however close the flagged
// readings lie, and every flagged row is named by a label (readings too
// close to label one by one share a label). Widths are estimated at 0.6 em
// a character (common practice for digits and lower-case letters of
// sans-serif faces), independently of the layout's own estimate.
func TestBoxLabelsDoNotCollide(t *testing.T) {
	for _, n := range []int{2, 7, 16, 60} {
		r := sample()
		r.Suspects.Readings = nil
		want := map[string]bool{}
		for i := 0; i < n; i++ { // invented: n readings packed just beyond the upper fence
			row := 100 + 7*i
			r.Suspects.Readings = append(r.Suspects.Readings, stats.Suspect{Reading: stats.Reading{Row: row, Value: 5.52 + 0.004*float64(i)}})
			want[strconv.Itoa(row)] = true
		}
		r.Suspects.Readings = append(r.Suspects.Readings, stats.Suspect{Reading: stats.Reading{Row: 3, Value: 4.6}})
		want["3"] = true
		root := parse(t, Box(r))
		type box struct{ x0, x1, y float64 }
		var boxes []box
		got := map[string]bool{}
		for _, l := range root.all(byClass("row-label")) {
			fs := root.num(t, "font-size") // the chart's font size unless the label has its own
			if l.attr("font-size") != "" {
				fs = l.num(t, "font-size")
			}
			w := 0.6 * fs * float64(len([]rune(l.Text)))
			x := l.num(t, "x")
			boxes = append(boxes, box{x - w/2, x + w/2, l.num(t, "y")})
			if x-w/2 < 0 || x+w/2 > Width {
				t.Errorf("n=%d: label %q at x=%g runs off the chart", n, l.Text, x)
			}
			for _, row := range strings.Fields(l.attr("data-rows")) {
				if got[row] {
					t.Errorf("n=%d: row %s labelled twice", n, row)
				}
				got[row] = true
			}
			if rows := strings.Fields(l.attr("data-rows")); len(rows) == 1 && l.Text != "row "+rows[0] {
				t.Errorf("n=%d: label %q for row %s", n, l.Text, rows[0])
			}
		}
		if len(got) != len(want) {
			t.Errorf("n=%d: labels name %d rows, want %d", n, len(got), len(want))
		}
		for i := range boxes {
			for j := i + 1; j < len(boxes); j++ {
				a, b := boxes[i], boxes[j]
				if math.Abs(a.y-b.y) < 13 && a.x0 < b.x1 && b.x0 < a.x1 {
					t.Errorf("n=%d: labels %d and %d overlap: %v %v", n, i, j, a, b)
				}
			}
		}
	}
}

func TestRunChart(t *testing.T) {
	root := parse(t, Run(sample()))
	pts := root.all(byClass("pt"))
	if len(pts) != 4 {
		t.Fatalf("%d points, want 4", len(pts))
	}
	med := root.all(func(n node) bool { return n.XMLName.Local == "line" && n.hasClass("median") })[0]
	// row 4 has the median value 5.1: its centre is on the median line
	if got := pts[2].num(t, "cy"); math.Abs(got-med.num(t, "y1")) > 0.2 {
		t.Errorf("row 4 (median value) at y=%g, median line at %g", got, med.num(t, "y1"))
	}
	// data order left to right; flagged rows 3 and 12 are triangles
	for i, want := range []string{"2", "3", "4", "12"} {
		if pts[i].attr("data-row") != want {
			t.Errorf("point %d is row %s, want %s", i, pts[i].attr("data-row"), want)
		}
	}
	if !pts[1].hasClass("suspect") || !pts[3].hasClass("suspect") || pts[0].hasClass("suspect") {
		t.Error("flagged rows 3 and 12 are not marked (and only they)")
	}
	if x0, x1 := pts[0].num(t, "cx"), pts[2].num(t, "cx"); x1 <= x0 {
		t.Error("points not in data order left to right")
	}
	// the names of the median, target and limits lie right of the plot
	// (the x axis ends there), never over a reading, and apart
	axis := root.all(func(n node) bool { return n.XMLName.Local == "line" && n.hasClass("axis") && n.hasClass("x") })[0]
	right := axis.num(t, "x2")
	labels := root.all(byClass("marker-label"))
	if len(labels) != 4 {
		t.Fatalf("%d line names, want 4 (median, LSL, target, USL)", len(labels))
	}
	for i, l := range labels {
		if l.num(t, "x") < right || l.attr("text-anchor") != "start" {
			t.Errorf("line name %q at x=%g (anchor %s) is inside the plot, which ends at %g", l.Text, l.num(t, "x"), l.attr("text-anchor"), right)
		}
		for _, m := range labels[:i] {
			if math.Abs(l.num(t, "y")-m.num(t, "y")) < 12 {
				t.Errorf("line names %q and %q overlap", l.Text, m.Text)
			}
		}
	}
	// the legend holds the median, the target and the limits with values
	var key []string
	for _, l := range root.all(byClass("legend-label")) {
		key = append(key, l.Text)
	}
	for _, w := range []string{"median 5.10", "target 5.00", "LSL 4.80", "USL 5.40", "flagged"} {
		if !strings.Contains(strings.Join(key, "|"), w) {
			t.Errorf("legend %q lacks %q", key, w)
		}
	}
	// the x axis is labelled with rows: every tick label is a row number
	// placed at that row's reading (rows 2, 3, 4, 12 at positions 0-3), or
	// between two readings for a row that has none (row 8: between 4 and 12)
	x := map[int]float64{}
	for _, p := range pts {
		row, _ := strconv.Atoi(p.attr("data-row"))
		x[row] = pointX(t, p)
	}
	ticks := root.all(func(n node) bool { return n.hasClass("tick-label") && n.hasClass("x") })
	if len(ticks) < 3 {
		t.Fatalf("%d x tick labels", len(ticks))
	}
	for _, tk := range ticks {
		row, err := strconv.Atoi(tk.Text)
		if err != nil {
			t.Fatalf("x tick %q is not a row number", tk.Text)
		}
		tx := tk.num(t, "x")
		if px, ok := x[row]; ok && math.Abs(px-tx) > 0.2 {
			t.Errorf("tick row %d at x=%g, its reading at %g", row, tx, px)
		}
		if row > 4 && row < 12 && !(tx > x[4] && tx < x[12]) {
			t.Errorf("tick row %d at x=%g, not between rows 4 (%g) and 12 (%g)", row, tx, x[4], x[12])
		}
	}
	if al := root.all(func(n node) bool { return n.hasClass("axis-label") && n.hasClass("x") }); len(al) != 1 || !strings.HasPrefix(al[0].Text, "row") {
		t.Errorf("x axis label %v, want it to say rows", al)
	}
}

// Long series: every point stays in the line, symbols are capped, and the
// highest and lowest readings keep theirs (so their rows can be tapped).
func TestLongSeriesCapped(t *testing.T) {
	r := sample()
	r.Charts.Series = nil
	r.Charts.ProbPlot.Points = nil
	for i := 0; i < 2000; i++ { // invented zig-zag with one peak and one dip
		y := 5 + 0.01*float64(i%7)
		switch i {
		case 1234:
			y = 6
		case 77:
			y = 4
		}
		r.Charts.Series = append(r.Charts.Series, stats.SeriesPt{I: i, Row: i + 2, Y: y})
		r.Charts.ProbPlot.Points = append(r.Charts.ProbPlot.Points, stats.ProbPt{Z: -3 + 6*float64(i)/1999, Y: 4 + 2*float64(i)/1999, Row: i + 2})
	}
	before := fmt.Sprint(r.Suspects.Readings)
	root := parse(t, Run(r))
	pts := root.all(byClass("pt"))
	if len(pts) > MaxMarkers+2 || len(pts) < MaxMarkers/2 {
		t.Errorf("%d symbols, want about %d", len(pts), MaxMarkers)
	}
	rows := map[string]bool{}
	for _, p := range pts {
		rows[p.attr("data-row")] = true
	}
	if !rows["1236"] || !rows["79"] {
		t.Errorf("the peak (row 1236) or the dip (row 79) lost its symbol")
	}
	trace := root.all(byClass("trace"))[0]
	if got := strings.Count(trace.attr("d"), "L") + 1; got != 2000 {
		t.Errorf("the line has %d points, want 2000", got)
	}
	pp := parse(t, ProbPlot(r))
	ppts := pp.all(byClass("pt"))
	if len(ppts) > MaxMarkers {
		t.Errorf("probability plot: %d symbols, want at most %d", len(ppts), MaxMarkers)
	}
	if ppts[0].attr("data-row") != "2" || ppts[len(ppts)-1].attr("data-row") != "2001" {
		t.Errorf("probability plot: the extreme points lost their symbols")
	}
	Box(r)
	if fmt.Sprint(r.Suspects.Readings) != before {
		t.Error("drawing reordered the report's suspect readings")
	}
}

// appendF's shortcut writes what strconv's shortest form writes for the
// value rounded to tenths (Go's standard library is the reference).
func TestAppendFAgreesWithStrconv(t *testing.T) {
	r := rand.New(rand.NewSource(5))
	vals := []float64{0, -0.0, 0.04, -0.04, -0.05, 0.05, 0.95, -0.95, 1e9, -1e9, 999999999.94, 1e300, math.Inf(1), math.NaN(), 12.25, -12.25}
	for i := 0; i < 200000; i++ {
		scale := math.Pow(10, float64(r.Intn(12)-3))
		vals = append(vals, (r.Float64()-0.5)*scale)
	}
	for _, v := range vals {
		want := strconv.AppendFloat(nil, math.Round(v*10)/10, 'f', -1, 64)
		if got := appendF(nil, v); string(got) != string(want) {
			t.Fatalf("%v: %s, strconv %s", v, got, want)
		}
	}
}

// TestHistogramMarkerLabels: the labels of the target and limits sit above
// every bar, and stagger only where they would collide; the legend names
// only the lines drawn. Settings and bins are invented to put a label over
// the tallest bar (the target at the peak) and two labels close together.
func TestHistogramMarkerLabels(t *testing.T) {
	for _, c := range []struct {
		name                   string
		target, lsl, usl       *float64
		wantLanes              int
		wantTarget, wantLimits bool
	}{
		{"apart", f64(5.1), f64(4.8), f64(5.4), 1, true, true},
		{"target beside a limit", f64(5.0), f64(4.98), f64(5.4), 2, true, true},
		{"limits only", nil, f64(4.8), f64(5.4), 1, false, true},
		{"target only", f64(5.1), nil, nil, 1, true, false},
	} {
		r := sample()
		r.Settings.Target, r.Settings.LSL, r.Settings.USL = c.target, c.lsl, c.usl
		root := parse(t, Histogram(r))
		top := math.Inf(1)
		for _, b := range root.all(byClass("bar")) {
			top = math.Min(top, b.num(t, "y"))
		}
		type box struct{ x0, x1, y float64 }
		var boxes []box
		ys := map[float64]bool{}
		for _, l := range root.all(byClass("marker-label")) {
			x, y := l.num(t, "x"), l.num(t, "y")
			if y > top-4 {
				t.Errorf("%s: label %q at baseline %g reaches the bars (top %g)", c.name, l.Text, y, top)
			}
			w := textWidth(l.Text, 15)
			for _, o := range boxes {
				if o.y == y && x-w/2 < o.x1 && x+w/2 > o.x0 {
					t.Errorf("%s: label %q overlaps another on the same line", c.name, l.Text)
				}
			}
			boxes = append(boxes, box{x - w/2, x + w/2, y})
			ys[y] = true
		}
		if len(ys) != c.wantLanes {
			t.Errorf("%s: labels on %d lines, want %d", c.name, len(ys), c.wantLanes)
		}
		var legend []string
		for _, g := range root.all(byClass("legend")) {
			for _, tx := range g.all(func(n node) bool { return n.XMLName.Local == "text" }) {
				legend = append(legend, tx.Text)
			}
		}
		j := strings.Join(legend, "|")
		if strings.Contains(j, "target") != c.wantTarget || strings.Contains(j, "spec limits") != c.wantLimits {
			t.Errorf("%s: legend %q, want target %v, spec limits %v", c.name, j, c.wantTarget, c.wantLimits)
		}
	}
}
