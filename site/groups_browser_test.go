package site

import (
	"encoding/json"
	"os"
	"strconv"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"

	"lotlens/stats"
)

// TestGroupsCard runs the demo (site/demo/capsule-fill.tsv: two filling
// lines in column "Line"), chooses Line as the group column and checks
// that the Groups card shows the engine's own sentence (stats.Analyze run
// natively here on the same text is the check value), a group row per
// line, and the chart with one row per group and its points by row. Then
// side-by-side columns through the automation entry give the same section
// as stats.Analyze.
func TestGroupsCard(t *testing.T) {
	data, err := os.ReadFile("demo/capsule-fill.tsv")
	if err != nil {
		t.Fatal(err)
	}
	want, err := stats.Analyze(stats.Request{Text: string(data), Group: "Line"})
	if err != nil {
		t.Fatal(err)
	}
	if want.Groups == nil || len(want.Groups.Levels) != 2 {
		t.Fatalf("the engine gives no groups for the demo: %+v", want.Groups)
	}
	s := browser(t)
	s.open(t)
	if err := chromedp.Run(s.ctx, chromedp.Click("#demo", chromedp.ByID), analysed(1)); err != nil {
		t.Fatal(err)
	}
	s.state(t)
	var placeholder bool
	if err := chromedp.Run(s.ctx, chromedp.Evaluate(`document.getElementById("card-groups").classList.contains("placeholder")`, &placeholder)); err != nil {
		t.Fatal(err)
	}
	if !placeholder {
		t.Error("without a group column the Groups card is not the placeholder")
	}
	if err := chromedp.Run(s.ctx,
		chromedp.SetValue("#col-group", "Line", chromedp.ByID),
		chromedp.Evaluate(`document.getElementById("col-group").dispatchEvent(new Event("change")); true`, nil),
		analysed(2)); err != nil {
		t.Fatal(err)
	}
	s.state(t)
	var got struct {
		Statement string
		Rows      int
		Groups    int
		Points    int
		Suspects  []string
		Pairs     bool
	}
	if err := chromedp.Run(s.ctx, chromedp.Evaluate(`(() => {
		const c = document.getElementById("card-groups");
		const st = c.querySelector("[data-field=groups-statement]");
		const fig = c.querySelector('figure[data-chart="groups"] svg');
		return {
			Statement: st ? st.textContent : "",
			Rows: c.querySelectorAll("table.groups-levels tbody tr").length,
			Groups: fig ? fig.querySelectorAll("g.group").length : 0,
			Points: fig ? fig.querySelectorAll("[data-row]").length : 0,
			Suspects: fig ? Array.from(fig.querySelectorAll(".row-label")).map((e) => e.textContent) : [],
			Pairs: !!c.querySelector("table.groups-tests"),
		} })()`, &got)); err != nil {
		t.Fatal(err)
	}
	if got.Statement != want.Groups.Statement {
		t.Errorf("the card says %q, the engine %q", got.Statement, want.Groups.Statement)
	}
	if got.Rows != 2 || got.Groups != 2 || !got.Pairs {
		t.Errorf("card: %d group rows, chart %d groups, tests shown %v", got.Rows, got.Groups, got.Pairs)
	}
	n := 0
	for _, l := range want.Groups.Levels {
		n += len(l.Points)
		for _, sp := range l.Suspects {
			found := false
			for _, lab := range got.Suspects {
				found = found || lab == "row "+strconv.Itoa(sp.Row)
			}
			if !found {
				t.Errorf("suspect row %d of line %s is not labelled in the chart (labels %v)", sp.Row, l.Name, got.Suspects)
			}
		}
	}
	if got.Points < n {
		t.Errorf("the chart has %d points with rows, the engine lists %d readings", got.Points, n)
	}
	s.shot(t, "09-groups-demo-1024.png")

	// wide: the two lines side by side, through the automation entry
	var a strings.Builder
	a.WriteString("A\tB\n")
	var la, lb []string
	for _, line := range strings.Split(strings.TrimSpace(string(data)), "\n")[1:] {
		f := strings.Split(line, "\t")
		if f[1] == "A" {
			la = append(la, f[2])
		} else {
			lb = append(lb, f[2])
		}
	}
	for i := range max(len(la), len(lb)) {
		if i < len(la) {
			a.WriteString(la[i])
		}
		a.WriteByte('\t')
		if i < len(lb) {
			a.WriteString(lb[i])
		}
		a.WriteByte('\n')
	}
	wideWant, err := stats.Analyze(stats.Request{Text: a.String(), Groups: []string{"A", "B"}})
	if err != nil {
		t.Fatal(err)
	}
	var wide stats.Report
	js, _ := json.Marshal(a.String())
	if err := chromedp.Run(s.ctx, chromedp.Evaluate(`lotlens.analyse({text: `+string(js)+`, groups: ["A", "B"]})`, &wide, awaitPromise)); err != nil {
		t.Fatal(err)
	}
	if wide.Groups == nil || wide.Groups.Shape != "wide" || wide.Groups.Statement != wideWant.Groups.Statement {
		t.Errorf("wide through the page: %+v", wide.Groups)
	}

	// wide on the page: paste the columns side by side, tick both, compare
	var shown, shape string
	if err := chromedp.Run(s.ctx, paste(a.String()), analysed(3),
		chromedp.Evaluate(`document.querySelectorAll('input[name="groups-wide"]').forEach((b) => { b.checked = true }); true`, nil),
		chromedp.Click("#groups-wide-go", chromedp.ByID), analysed(4)); err != nil {
		t.Fatal(err)
	}
	s.state(t)
	if err := chromedp.Run(s.ctx,
		chromedp.Text("#card-groups [data-field=groups-statement]", &shown, chromedp.ByQuery),
		chromedp.Text("#card-groups .basis", &shape, chromedp.ByQuery)); err != nil {
		t.Fatal(err)
	}
	if shown != wideWant.Groups.Statement || !strings.Contains(shape, "side by side") {
		t.Errorf("wide on the page: %q (%q), engine %q", shown, shape, wideWant.Groups.Statement)
	}
}
