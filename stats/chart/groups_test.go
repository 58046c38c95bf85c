package chart

import (
	"fmt"
	"strings"
	"testing"

	"lotlens/stats"
)

// groupsReport analyses invented data in three groups (one holding a far
// reading, row 5) with a group column whose labels need escaping. Nothing
// here is a statistical check value: the test checks the drawing against
// the report it was drawn from.
func groupsReport(t *testing.T) *stats.Report {
	t.Helper()
	var b strings.Builder
	b.WriteString("Cavity\tWeight (g)\n")
	vals := map[string][]string{
		"C1": {"5.10", "5.12", "5.11", "5.60", "5.09", "5.13", "5.10", "5.12", "5.11", "5.10"},
		"C2": {"5.15", "5.17", "5.16", "5.18", "5.14", "5.16", "5.17", "5.15", "5.16", "5.18"},
		xss:  {"5.05", "5.07", "5.06", "5.08", "5.04", "5.06", "5.05", "5.07", "5.06", "5.05"},
		"ab": {"5.20", "5.30"},
	}
	for i := 0; i < 10; i++ {
		for _, k := range []string{"C1", "C2", xss, "ab"} {
			if i < len(vals[k]) {
				fmt.Fprintf(&b, "%s\t%s\n", k, vals[k][i])
			}
		}
	}
	lsl, usl := 4.9, 5.4
	rep, err := stats.Analyze(stats.Request{Text: b.String(), Value: "Weight", Group: "Cavity", Options: stats.Options{LSL: &lsl, USL: &usl}})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Groups == nil || len(rep.Groups.Levels) != 4 {
		t.Fatalf("groups = %+v", rep.Groups)
	}
	return rep
}

func TestGroupsChart(t *testing.T) {
	rep := groupsReport(t)
	svg := Groups(rep)
	root := parse(t, svg)
	if strings.Contains(svg, "<img") {
		t.Error("a group label is not escaped")
	}
	rows := root.all(byClass("group"))
	if len(rows) != len(rep.Groups.Levels) {
		t.Fatalf("%d group rows drawn, want %d", len(rows), len(rep.Groups.Levels))
	}
	// colour never alone: each group's dots differ from every other
	// group's in shape or colour, and each row has its text label
	seen := map[string]string{}
	for i, g := range rows {
		lvl := rep.Groups.Levels[i]
		labels := g.all(byClass("group-label"))
		if len(labels) != 1 || !strings.HasPrefix(labels[0].Text, lvl.Title) {
			t.Errorf("row %d: label %v, want %q", i, labels, lvl.Title)
		}
		pts := g.all(func(n node) bool { return n.hasClass("pt") && !n.hasClass("suspect") })
		if len(pts) == 0 {
			t.Errorf("row %d (%s) has no dots", i, lvl.Name)
			continue
		}
		key := pts[0].XMLName.Local + " " + pts[0].attr("fill")
		if other, dup := seen[key]; dup {
			t.Errorf("groups %s and %s are drawn alike (%s)", other, lvl.Name, key)
		}
		seen[key] = lvl.Name
		// every reading of a small group is drawn, each with its row
		want := len(lvl.Points) - len(lvl.Suspects)
		if !lvl.Thinned && len(pts) != want {
			t.Errorf("row %d: %d dots, want %d", i, len(pts), want)
		}
		for _, p := range pts {
			if p.attr("data-row") == "" || !strings.Contains(p.title(), "row ") {
				t.Errorf("a dot without its row: %+v", p.Attrs)
			}
		}
		// suspects: marked and labelled by row
		for _, s := range lvl.Suspects {
			found := false
			for _, l := range g.all(byClass("row-label")) {
				if l.Text == fmt.Sprintf("row %d", s.Row) {
					found = true
				}
			}
			if !found {
				t.Errorf("suspect row %d of %s is not labelled", s.Row, lvl.Name)
			}
		}
	}
	if n := len(root.all(byClass("suspect"))); n == 0 {
		t.Error("the far reading is not drawn as a suspect")
	}
	// one scale: the median line of each row sits where the scale puts
	// the median (same mapping in every row)
	var xs []float64
	var meds []float64
	for i, g := range rows {
		m := g.all(byClass("median"))
		if len(m) != 1 {
			t.Fatalf("row %d: %d median lines", i, len(m))
		}
		xs = append(xs, m[0].num(t, "x1"))
		meds = append(meds, rep.Groups.Levels[i].Box.Median)
	}
	for i := 1; i < len(xs); i++ {
		if meds[i] == meds[0] {
			continue
		}
		// pixel per unit from rows 0 and i must agree with rows 0 and 1
		k0 := (xs[1] - xs[0]) / (meds[1] - meds[0])
		ki := (xs[i] - xs[0]) / (meds[i] - meds[0])
		if d := k0 - ki; d > 0.02*k0 || d < -0.02*k0 {
			t.Errorf("rows are not on one scale: %g and %g px per unit", k0, ki)
		}
	}
	// the centre sits inside its interval bar
	for i, g := range rows {
		if len(g.all(byClass("centre"))) != 1 {
			t.Errorf("row %d: no centre marker", i)
		}
	}
	if len(root.all(byClass("lsl"))) == 0 || len(root.all(byClass("usl"))) == 0 {
		t.Error("specification limits not drawn")
	}
	if _, ok := All(rep)["groups"]; !ok {
		t.Error("All does not draw the groups chart")
	}
}

func TestGroupsChartAbsent(t *testing.T) {
	if Groups(nil) != "" || Groups(&stats.Report{}) != "" || Groups(&stats.Report{Groups: &stats.Groups{}}) != "" {
		t.Error("a chart drawn without groups")
	}
	if _, ok := All(sample())["groups"]; ok {
		t.Error("groups chart drawn for a report without groups")
	}
}
