package site

import (
	"fmt"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"lotlens/stats"
)

// setChoice picks an option of a select and tells the page.
func setChoice(id, v string) chromedp.Action {
	return chromedp.Evaluate(fmt.Sprintf(`(() => { const e = document.getElementById(%q); e.value = %q;
		e.dispatchEvent(new Event("change", {bubbles: true})); return true })()`, id, v), nil)
}

// waitFor polls a condition on the page (up to 30 s).
func waitFor(cond string) chromedp.Action {
	return chromedp.Poll(`(() => { try { return !!(`+cond+`) } catch (e) { return false } })()`, nil, chromedp.WithPollingTimeout(30*time.Second))
}

// checkSpecCard compares the spec card with the engine's own report (run
// natively here): the statement, Cpk and Ppk, and both charts.
func checkSpecCard(t *testing.T, s *session, want *stats.Report) {
	t.Helper()
	if want.Spec == nil {
		t.Fatal("the engine gives no spec section")
	}
	var statement string
	s.eval(t, `(document.querySelector("#card-spec .spec-statement") || {}).textContent || ""`, &statement)
	if statement != want.Spec.Statement {
		t.Errorf("statement on the page:\n%s\nengine:\n%s", statement, want.Spec.Statement)
	}
	got := s.fields(t)
	for _, name := range []string{"Cpk", "Ppk"} {
		for _, x := range want.Spec.Indices {
			if x.Name == name && x.Basis != "percentile" {
				// the page carries the wasm engine's value: its math
				// functions (pure Go) may differ from native ones
				// (assembly) in the last bits
				f, ok := got["spec."+name]
				v, err := strconv.ParseFloat(f[1], 64)
				if !ok || err != nil || math.Abs(v-x.Value) > 1e-12*math.Abs(x.Value) {
					t.Errorf("spec.%s: page carries %q, engine says %v", name, f[1], x.Value)
				} else if f[0] != strconv.FormatFloat(v, 'f', 2, 64) && f[0] != strings.Replace(strconv.FormatFloat(v, 'f', 2, 64), ".", ",", 1) {
					t.Errorf("spec.%s: page shows %q for %v", name, f[0], v)
				}
				break
			}
		}
	}
	var charts map[string]int
	s.eval(t, `(() => { const o = {}; for (const k of ["spec", "spec-spread"]) o[k] = document.querySelectorAll('#card-spec figure[data-chart="' + k + '"] svg').length; return o })()`, &charts)
	if charts["spec"] != 1 || charts["spec-spread"] != 1 {
		t.Errorf("spec card charts %v, want one of each", charts)
	}
	var curves int
	s.eval(t, `document.querySelectorAll('#card-spec figure[data-chart="spec"] .curve').length`, &curves)
	if curves != len(want.Spec.Curves) {
		t.Errorf("%d curves drawn, engine gives %d", curves, len(want.Spec.Curves))
	}
}

// TestSpecCard: the demo data with limits and a target, then invented
// subgrouped readings with the subgroup column and an estimator chosen in
// Settings, and an invalid coverage shown beside the buttons.
func TestSpecCard(t *testing.T) {
	s := browser(t)
	s.open(t)
	demo, err := os.ReadFile("demo/capsule-fill.tsv")
	if err != nil {
		t.Fatal(err)
	}
	lsl, usl, target := 4.85, 5.25, 5.05
	opts := stats.Options{Confidence: 0.95, Quantile: "hf7", LSL: &lsl, USL: &usl, Target: &target, Coverage: 0.99, CpkGoal: 1.33}
	want, err := stats.Analyze(stats.Request{Text: string(demo), Options: opts})
	if err != nil {
		t.Fatal(err)
	}
	s.run(t, setField("lsl", "4.85"), setField("usl", "5.25"), setField("target", "5.05"),
		chromedp.Click("#demo", chromedp.ByID), analysed(1))
	s.state(t)
	checkSpecCard(t, s, want)
	s.shot(t, "09-spec-demo.png")

	// invented subgrouped widths: 25 subgroups of 4, a slow drift between
	// subgroups (nothing here is a statistical check value: the engine's
	// native answer is)
	var b strings.Builder
	b.WriteString("Subgroup\tWidth (mm)\n")
	for g := 0; g < 25; g++ {
		for j := 0; j < 4; j++ {
			v := 12.0 + 0.01*float64(g%5) + 0.004*float64((g*7+j*3)%5) - 0.008
			fmt.Fprintf(&b, "S%02d\t%s\n", g+1, strconv.FormatFloat(v, 'f', 3, 64))
		}
	}
	text := b.String()
	lsl2, usl2 := 11.95, 12.10
	opts2 := stats.Options{Confidence: 0.95, Quantile: "hf7", LSL: &lsl2, USL: &usl2, Coverage: 0.99, CpkGoal: 1.33, WithinSigma: "mean-range"}
	want2, err := stats.Analyze(stats.Request{Text: text, Value: "Width (mm)", Subgroup: "Subgroup", Options: opts2})
	if err != nil {
		t.Fatal(err)
	}
	if w := want2.Spec.Sigma.Within; w == nil || w.Method != "mean-range" {
		t.Fatalf("engine's within sigma %+v, want mean-range", w)
	}
	var n int
	s.run(t, setField("target", ""), setField("lsl", "11.95"), setField("usl", "12.10"), paste(text),
		waitFor(`[...document.querySelectorAll("#col-subgroup option")].some((o) => o.value === "Subgroup") && /12\.10/.test(document.querySelector("#card-spec").textContent)`))
	// the estimators for subgroups are offered only once a subgroup column is chosen
	var disabled bool
	s.eval(t, `document.querySelector('#within-sigma option[value="mean-range"]').disabled`, &disabled)
	if !disabled {
		t.Error("a subgroup estimator is offered without a subgroup column")
	}
	s.run(t, setChoice("col-subgroup", "Subgroup"), waitFor(`/pooled SD of the subgroups/.test(document.querySelector("#card-spec").textContent)`))
	s.run(t, setChoice("within-sigma", "mean-range"), waitFor(`/average subgroup range/.test(document.querySelector("#card-spec").textContent)`))
	s.state(t)
	checkSpecCard(t, s, want2)
	var why string
	s.eval(t, `document.querySelector("#card-spec").textContent`, &why)
	if !strings.Contains(why, "average subgroup range / d2") {
		t.Error("the card does not name the chosen estimator")
	}
	s.shot(t, "10-spec-subgroups.png")

	// an invalid coverage is shown beside the action and not sent
	s.eval(t, `document.body.dataset.analysed|0`, &n)
	s.run(t, setField("coverage", "120"), chromedp.Click("#analyse", chromedp.ByID))
	var shown bool
	var msg string
	s.eval(t, `!document.getElementById("action-error").hidden`, &shown)
	s.eval(t, `document.getElementById("action-error").textContent`, &msg)
	if !shown || !strings.Contains(msg, "Coverage") {
		t.Errorf("invalid coverage: action error shown %v, %q", shown, msg)
	}
	var m int
	s.eval(t, `document.body.dataset.analysed|0`, &m)
	if m != n {
		t.Error("an analysis ran with an invalid coverage")
	}
}
