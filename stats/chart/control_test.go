package chart

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"lotlens/stats"
)

// controlSample: a hand-made section (invented numbers, consistent by
// construction): 6 readings, limits 4.7 to 5.3, row 5 beyond the upper
// limit, rows 2-3 in a run signal, row 6 left out.
func controlSample() *stats.Report {
	r := sample()
	ms := func(v float64) *float64 { return &v }
	r.Stability = &stats.Stability{Chart: &stats.ControlChart{Kind: "individuals", Spread: "moving-range", Centre: 5.0, Sigma: 0.1, Width: 3, Count: 6,
		Limits: []stats.CtlLimits{{From: 1, To: 6, Lower: 4.7, Upper: 5.3, SpreadCentre: 0.113, SpreadUpper: 0.368}},
		Points: []stats.CtlPoint{
			{I: 1, Row: 2, Y: 5.0},
			{I: 2, Row: 3, Y: 5.1, S: ms(0.1), Flags: []string{"trend"}},
			{I: 3, Row: 4, Y: 5.2, S: ms(0.1), Flags: []string{"trend"}},
			{I: 4, Row: 5, Y: 5.4, S: ms(0.2), Flags: []string{"beyond-limits"}},
			{I: 5, Row: 6, Y: 4.9, S: ms(0.5), Flags: []string{stats.SignalSpreadBeyond}},
			{I: 6, Row: 7, Y: 9.9, LeftOut: true},
		}},
		Signals: []stats.SignalInfo{{Code: "beyond-limits", Chart: "values", First: 4, Last: 4, Rows: []int{5}}},
	}
	return r
}

func TestControlChartMarks(t *testing.T) {
	root := parse(t, Control(controlSample()))
	pts := root.all(byClass("pt"))
	byRow := map[string][]node{}
	for _, p := range pts {
		byRow[p.attr("data-row")] = append(byRow[p.attr("data-row")], p)
	}
	// shape, not colour alone: a triangle path for the point beyond a
	// limit, a diamond (path) for the run, an open circle for a left-out row
	if p := byRow["5"]; len(p) != 1 || p[0].XMLName.Local != "path" || !p[0].hasClass("beyond") {
		t.Errorf("row 5 beyond the limit: %+v", p)
	}
	if p := byRow["3"]; len(p) != 1 || !p[0].hasClass("pattern") {
		t.Errorf("row 3 in a run: %+v", p)
	}
	if p := byRow["7"]; len(p) != 1 || p[0].XMLName.Local != "circle" || p[0].attr("fill") != "#ffffff" || !p[0].hasClass("left-out") {
		t.Errorf("row 7 left out: %+v", p)
	}
	// the spread beyond its limit is marked on the spread chart (row 6)
	if len(root.all(byClass("spread"))) == 0 || len(byRow["6"]) != 2 {
		t.Errorf("row 6's moving range beyond its limit is not marked: %d marks", len(byRow["6"]))
	}
	// labels by row for signal points
	var labels []string
	for _, n := range root.all(byClass("row-label")) {
		labels = append(labels, n.Text)
	}
	if !strings.Contains(strings.Join(labels, ","), "row 5") {
		t.Errorf("no label for row 5: %v", labels)
	}
	// the upper limit line lies above the centre line and the point beyond it
	up := root.all(byClass("upper"))[0]
	ctr := root.all(byClass("centre"))[0]
	if !(up.num(t, "y1") < ctr.num(t, "y1")) || !(byRow["5"][0].attr("d") != "") {
		t.Error("upper limit not above the centre")
	}
	if len(root.all(byClass("zone"))) != 4 {
		t.Errorf("want 4 shaded zone bands for one limit segment")
	}
}

// TestControlFromEngine draws the chart of a real report: a time axis from
// a time column, and a long series drawn thinned with every signal kept.
func TestControlFromEngine(t *testing.T) {
	var b strings.Builder
	b.WriteString("When\tWeight\n")
	for i := 0; i < 5000; i++ { // invented: a slow cycle, one far reading
		v := 5.0 + 0.01*float64((i*7)%11-5)
		if i == 4321 {
			v = 6.0
		}
		fmt.Fprintf(&b, "2026-03-%02d %02d:%02d\t%.2f\n", 2+i/1440, (i/60)%24, i%60, v)
	}
	rep, err := stats.Analyze(stats.Request{Text: b.String(), Value: "Weight", Order: "When"})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Stability.Chart == nil || !rep.Stability.Chart.Thinned || !rep.Stability.Chart.TimeAxis {
		t.Fatalf("chart %+v", rep.Stability.Chart)
	}
	svg := All(rep)["control"]
	root := parse(t, svg)
	found := false
	for _, p := range root.all(byClass("pt")) {
		if p.attr("data-row") == "4323" && p.hasClass("beyond") {
			found = true
		}
	}
	if !found {
		t.Error("the far reading (row 4323) lost its mark in the thinned chart")
	}
	ticks := root.all(byClass("tick-label"))
	hasTime := false
	for _, tk := range ticks {
		hasTime = hasTime || strings.Contains(tk.Text, ":")
	}
	if !hasTime {
		t.Error("no time labels on the x axis")
	}
	if n := len(root.all(byClass("pt"))); n > 2*MaxMarkers+100 {
		t.Errorf("%d point symbols for 5000 readings", n)
	}
}

// TestControlLineNames: the names and values of the limits and the centre
// lie right of the plot (where the x axis ends), never over a point, apart
// from each other, and carry the limits' values (from controlSample).
func TestControlLineNames(t *testing.T) {
	root := parse(t, Control(controlSample()))
	var right float64
	for _, a := range root.all(func(n node) bool { return n.XMLName.Local == "line" && n.hasClass("axis") && n.hasClass("x") }) {
		right = max(right, a.num(t, "x2"))
	}
	for _, p := range root.all(byClass("pt")) {
		if p.XMLName.Local == "circle" && p.num(t, "cx") > right {
			t.Fatalf("a point lies right of the axis end %g", right)
		}
	}
	labels := root.all(byClass("marker-label"))
	var texts []string
	for i, l := range labels {
		texts = append(texts, l.Text)
		if l.num(t, "x") < right || l.attr("text-anchor") != "start" {
			t.Errorf("line name %q at x=%g is inside the plot, which ends at %g", l.Text, l.num(t, "x"), right)
		}
		for _, m := range labels[:i] {
			if math.Abs(l.num(t, "y")-m.num(t, "y")) < 12 {
				t.Errorf("line names %q and %q overlap", l.Text, m.Text)
			}
		}
	}
	if got := strings.Join(texts, "|"); got != "UCL|5.300|centre|5.000|LCL|4.700" {
		t.Errorf("line names %q, want UCL|5.300|centre|5.000|LCL|4.700 (controlSample's values, one decimal more than the data)", got)
	}
}
