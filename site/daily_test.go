package site

// Browser tests for the page in daily use (issue 14): settings errors beside
// the action, focus after an analysis and after leaving a reading out, the
// first click on Save SVG, exclusions kept across an edit, one analysis for
// typing then Analyse, a refused file clearing the report, time columns,
// reasons for left-out readings, wording, CSV guards, touch targets, layout
// on tablets, the focus ring and the help pages' icon. Each subtest loads
// the page afresh in one shared Chromium (the machine is small).

import (
	"encoding/json"
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"
	"github.com/chromedp/chromedp/kb"

	"lotlens/stats"
)

// twelve is invented: row 5 (6.40) lies far out, every line is distinct
// except 5.02, 5.01 and 5.00, which appear twice.
const twelve = "5.02\n5.04\n4.98\n5.01\n6.40\n5.00\n4.99\n5.03\n5.02\n4.97\n5.01\n5.00\n"

func (s *session) eval(t *testing.T, js string, out any) {
	t.Helper()
	if err := chromedp.Run(s.ctx, chromedp.Evaluate(js, out)); err != nil {
		t.Fatalf("%s: %v", js, err)
	}
}

func (s *session) run(t *testing.T, acts ...chromedp.Action) {
	t.Helper()
	if err := chromedp.Run(s.ctx, acts...); err != nil {
		t.Fatal(err)
	}
}

// setVal sets a field's value as a script would (no input event).
func setVal(id, v string) chromedp.Action {
	js, _ := json.Marshal(v)
	return chromedp.Evaluate(`document.getElementById("`+id+`").value = `+string(js)+`, true`, nil)
}

func (s *session) analysedCount(t *testing.T) int {
	var n int
	s.eval(t, `document.body.dataset.analysed|0`, &n)
	return n
}

func (s *session) activeDesc(t *testing.T) string {
	var d string
	s.eval(t, `(() => { const a = document.activeElement; return a ? a.tagName.toLowerCase() + "#" + a.id + "." + a.className + " row=" + (a.dataset.row || a.dataset.putBack || "") + " chart=" + (a.dataset.chart || "") : "" })()`, &d)
	return d
}

// TestDailyFlow: settings errors, typing then Analyse, edits, reasons,
// focus after Leave out / Put back, chart touch targets and CSV guards.
func TestDailyFlow(t *testing.T) {
	s := browser(t)

	t.Run("setting error beside the action", func(t *testing.T) {
		s.open(t)
		s.run(t, paste(twelve), analysed(1))
		s.state(t)
		var shown bool
		var msg string
		s.run(t, setVal("target", "12 Nm"), chromedp.Click("#analyse", chromedp.ByID),
			chromedp.Sleep(200*time.Millisecond))
		s.eval(t, `!document.getElementById("action-error").hidden`, &shown)
		s.eval(t, `document.getElementById("action-error").textContent`, &msg)
		if !shown || !strings.Contains(msg, "Target") || !strings.Contains(msg, "12 Nm") {
			t.Errorf("after Analyse with Target \"12 Nm\": message beside the action shown %v, %q", shown, msg)
		}
		if a := s.activeDesc(t); !strings.HasPrefix(a, "input#target") {
			t.Errorf("focus is on %s, want the Target field", a)
		}
		// the action's message sits next to the Analyse button, in view
		var gap float64
		s.eval(t, `document.getElementById("action-error").getBoundingClientRect().top - document.getElementById("analyse").getBoundingClientRect().bottom`, &gap)
		if gap < 0 || gap > 80 {
			t.Errorf("the message is %v px below the Analyse button, want it beside the action", gap)
		}
		s.run(t, setVal("target", ""), setVal("lsl", "6"), setVal("usl", "5"),
			chromedp.Click("#demo", chromedp.ByID), chromedp.Sleep(400*time.Millisecond))
		s.eval(t, `document.getElementById("action-error").textContent`, &msg)
		if !strings.Contains(msg, "LSL") {
			t.Errorf("after the demo with LSL above USL: message %q", msg)
		}
		if a := s.activeDesc(t); !strings.HasPrefix(a, "input#lsl") {
			t.Errorf("focus is on %s, want the LSL field", a)
		}
		s.run(t, setVal("lsl", ""), setVal("usl", ""), chromedp.Click("#demo", chromedp.ByID), analysed(2))
		s.state(t)
		s.eval(t, `!document.getElementById("action-error").hidden`, &shown)
		if shown {
			t.Error("the settings message stays after the settings were fixed")
		}
	})

	t.Run("typing then Analyse runs once", func(t *testing.T) {
		s.open(t)
		s.run(t, chromedp.Focus("#data", chromedp.ByID), chromedp.SendKeys("#data", "5.1\n5.3\n5.2\n5.0\n5.4", chromedp.ByID),
			chromedp.Click("#analyse", chromedp.ByID), analysed(1), chromedp.Sleep(1500*time.Millisecond))
		s.state(t)
		if n := s.analysedCount(t); n != 1 {
			t.Errorf("typing then Analyse ran the analysis %d times, want 1", n)
		}
	})

	t.Run("edit keeps exclusions on the same text", func(t *testing.T) {
		s.open(t)
		s.run(t, paste(twelve), analysed(1), chromedp.SendKeys("#leave-out", "3, 5", chromedp.ByID), analysed(2))
		s.state(t)
		// one line added on top (so 6.40 moves to row 6) and 4.98 (row 3) changed
		edited := "5.05\n" + strings.Replace(twelve, "4.98\n", "4.96\n", 1)
		js, _ := json.Marshal(edited)
		s.run(t, chromedp.Evaluate(`document.getElementById("data").value = `+string(js)+`; true`, nil),
			chromedp.Click("#analyse", chromedp.ByID), analysed(3))
		s.state(t)
		want, err := stats.Analyze(stats.Request{Text: edited, Options: stats.Options{Exclude: []int{6}}})
		if err != nil {
			t.Fatal(err)
		}
		got := s.fields(t)
		checkShown(t, got, "used", float64(want.Counts.Used))
		checkShown(t, got, "mean-all", want.Centre.Mean)
		var listed, status string
		s.run(t, chromedp.Text("#exclusion-list", &listed, chromedp.ByID), chromedp.Text("#status", &status, chromedp.ByID))
		if !strings.Contains(listed, "Row 6: 6.40") || strings.Contains(listed, "Row 3") || strings.Contains(listed, "Row 5") {
			t.Errorf("left out after the edit: %q, want row 6 (6.40) only", listed)
		}
		if !strings.Contains(status, "row 3 (4.98)") || !strings.Contains(status, "row 5 is now row 6") {
			t.Errorf("status %q does not say that row 3 was put back and row 5 moved to row 6", status)
		}
	})

	t.Run("focus kept after Leave out and Put back", func(t *testing.T) {
		s.open(t)
		s.run(t, paste(twelve), analysed(1))
		s.state(t)
		var flagged bool
		s.eval(t, `!!document.querySelector('button.toggle[data-row="5"]')`, &flagged)
		if !flagged {
			t.Fatal("the engine does not flag row 5 (6.40 among values near 5.0)")
		}
		s.run(t, chromedp.Focus(`button.toggle[data-row="5"]`, chromedp.ByQuery), chromedp.KeyEvent(kb.Enter), analysed(2))
		if a := s.activeDesc(t); !strings.Contains(a, "row=5") {
			t.Errorf("after Leave out by Enter, focus is on %q, want the control of row 5", a)
		}
		s.run(t, chromedp.KeyEvent(kb.Enter), analysed(3))
		if a := s.activeDesc(t); !strings.Contains(a, "row=5") {
			t.Errorf("after Put back by Enter, focus is on %q, want the control of row 5", a)
		}
		// on a chart: arrow to a point, Enter; the chart keeps focus and its tip
		s.run(t, chromedp.Focus(`.chart-fig[data-chart="box"]`, chromedp.ByQuery), chromedp.KeyEvent(kb.ArrowRight),
			chromedp.KeyEvent(kb.Enter), analysed(4))
		if a := s.activeDesc(t); !strings.Contains(a, "chart=box") {
			t.Errorf("after Enter on a chart point, focus is on %q, want the box plot", a)
		}
		// the run chart too (its first point, row 1, is left out)
		s.run(t, chromedp.Focus(`.chart-fig[data-chart="run"]`, chromedp.ByQuery), chromedp.KeyEvent(kb.ArrowRight),
			chromedp.KeyEvent(kb.Enter), analysed(5))
		var listed string
		s.run(t, chromedp.Text("#exclusion-list", &listed, chromedp.ByID))
		if a := s.activeDesc(t); !strings.Contains(a, "chart=run") || !strings.Contains(listed, "Row 1:") {
			t.Errorf("after Enter on the run chart's first point: focus on %q, left out %q; want the run chart, row 1 left out", a, listed)
		}
	})

	t.Run("chart points have 44 px targets and the tip beside them", func(t *testing.T) {
		s.open(t)
		s.run(t, paste(twelve), analysed(1))
		s.state(t)
		var pt map[string]float64
		s.eval(t, `(() => { const p = document.querySelector('.chart-fig[data-chart="box"] [data-row="5"]');
			p.scrollIntoView({block: "center"}); const b = p.getBoundingClientRect();
			return {x: b.left + b.width / 2, y: b.top + b.height / 2, w: b.width} })()`, &pt)
		// 19 px from the centre: outside the drawn symbol, inside a 44 px target
		s.run(t, chromedp.MouseClickXY(pt["x"]+15, pt["y"]+12))
		var tip map[string]any
		s.eval(t, `(() => { const t = document.getElementById("tip"); const b = t.getBoundingClientRect();
			return {shown: !t.hidden, text: t.textContent, l: b.left, r: b.right, t: b.top, b: b.bottom} })()`, &tip)
		if tip["shown"] != true || !strings.Contains(fmt.Sprint(tip["text"]), "row 5") {
			t.Fatalf("a tap 19 px from the point of row 5 (drawn %v px wide) shows tip %v, want row 5", pt["w"], tip)
		}
		// the tip leaves the point's 44 px target uncovered
		l, r, tp, b := tip["l"].(float64), tip["r"].(float64), tip["t"].(float64), tip["b"].(float64)
		if l < pt["x"]+22 && r > pt["x"]-22 && tp < pt["y"]+22 && b > pt["y"]-22 {
			t.Errorf("the tip (%v..%v, %v..%v) covers the point at (%v, %v)", l, r, tp, b, pt["x"], pt["y"])
		}
	})

	t.Run("reasons in the report, the print and the share link", func(t *testing.T) {
		s.open(t)
		s.run(t, paste(twelve), analysed(1), chromedp.Click(`button.toggle[data-row="5"]`, chromedp.ByQuery), analysed(2))
		s.state(t)
		const why = "gauge dropped on the bench"
		s.run(t, chromedp.SendKeys(`input[data-reason-row="5"]`, why, chromedp.ByQuery))
		var head, list string
		s.run(t, chromedp.Evaluate(`document.getElementById("print-head").textContent`, &head),
			chromedp.Text("#exclusion-list", &list, chromedp.ByID))
		if !strings.Contains(head, "row 5 (6.40; reason: "+why+")") || !strings.Contains(list, why) {
			t.Errorf("print header %q / list %q lack the reason", head, list)
		}
		var sent string
		s.run(t, chromedp.Evaluate(`lotlens.shownReport() || ""`, &sent))
		if !strings.Contains(sent, `"reason":"`+why+`"`) {
			t.Errorf("the report shown does not echo the reason in settings.excluded: %.400s", sent)
		}
		// the summary and the CSV carry it too
		var copied string
		s.run(t, chromedp.Evaluate(`navigator.clipboard.writeText = (t) => { window.__copied = t; return Promise.resolve() }; true`, nil),
			chromedp.Click("#copy", chromedp.ByID), chromedp.Sleep(100*time.Millisecond),
			chromedp.Evaluate(`window.__copied || ""`, &copied))
		if !strings.Contains(copied, why) {
			t.Errorf("copied summary lacks the reason:\n%s", copied)
		}
		var link string
		s.run(t, chromedp.Click("#share", chromedp.ByID),
			chromedp.Poll(`document.getElementById("share-url").value.includes("#s=")`, nil, chromedp.WithPollingTimeout(10*time.Second)),
			chromedp.Value("#share-url", &link, chromedp.ByID))
		s.run(t, chromedp.Navigate("about:blank"), chromedp.Navigate(link),
			chromedp.WaitVisible(`body[data-ready="1"]`, chromedp.ByQuery), analysed(1))
		s.state(t)
		var value string
		s.run(t, chromedp.Value(`input[data-reason-row="5"]`, &value, chromedp.ByQuery),
			chromedp.Evaluate(`document.getElementById("print-head").textContent`, &head))
		if value != why || !strings.Contains(head, why) {
			t.Errorf("opened from the link: reason field %q, print header %q; want %q in both", value, head, why)
		}
		// the reason came back in the report (settings.excluded[].reason),
		// the very report the sender showed
		var got string
		s.run(t, chromedp.Evaluate(`lotlens.shownReport() || ""`, &got))
		if got != sent {
			t.Errorf("the report opened from the link differs from the sender's:\n%.400s\n%.400s", got, sent)
		}
	})

	t.Run("decimal-mark trouble in the verdict, one count of unused cells", func(t *testing.T) {
		s.open(t)
		// invented: row 3 a comma among points, row 4 NA, row 5 empty, row 6
		// text, row 8 an empty label; by construction 4 values used, 2 cells
		// not numbers, 2 empty or marked missing (stats.TestUnusedCellsAgree
		// reads the same data)
		text := "Line\tTorque\nA\t12.31\nB\t12,35\nA\tNA\nB\t\nA\tabc\nB\t12.40\n\t12.33\nA\t12.36\n"
		s.run(t, paste(text), analysed(1))
		s.state(t)
		var warn, basis, heading, counts string
		s.eval(t, `(document.querySelector('#card-verdict li[data-code="mixed-decimal-marks"]') || {}).textContent || ""`, &warn)
		s.eval(t, `document.querySelector("#card-verdict .basis").textContent`, &basis)
		s.eval(t, `document.querySelector("#card-data details.problems summary").textContent`, &heading)
		s.eval(t, `document.querySelector("#card-data table.kv").textContent`, &counts)
		if !strings.Contains(warn, "1 value of \"Torque\" was left out") || !strings.Contains(warn, "other 4 values") {
			t.Errorf("verdict warning %q", warn)
		}
		if !strings.Contains(basis, "4 values used, 2 cells not numbers, 2 empty or marked missing") {
			t.Errorf("verdict basis %q", basis)
		}
		if !strings.HasPrefix(heading, "4 cells of \u201cTorque\u201d not used (2 not numbers, 2 empty or marked missing)") {
			t.Errorf("data card heading %q", heading)
		}
		if !strings.Contains(counts, "Cells not numbers2") || !strings.Contains(counts, "Empty or marked missing2") {
			t.Errorf("data card counts %q", counts)
		}
		// "1,234"-like values read by the default decimal comma: warned in
		// the verdict until a decimal mark is chosen
		s.run(t, paste("Gap (mm)\n1,234\n1,256\n1,301\n1,199\n1,245\n1,262\n"), analysed(2))
		s.state(t)
		s.eval(t, `(document.querySelector('#card-verdict li[data-code="ambiguous-decimal-mark"]') || {}).textContent || ""`, &warn)
		if !strings.Contains(warn, "read with a decimal comma") || !strings.Contains(warn, "1\u00a0000 times larger") {
			t.Errorf("ambiguous warning %q", warn)
		}
		n := s.analysedCount(t)
		s.run(t, chromedp.Evaluate(`(() => { const e = document.getElementById("decimal-mark"); e.value = "point"; e.dispatchEvent(new Event("change", {bubbles: true})); return true })()`, nil),
			analysed(n+1))
		s.state(t)
		var still bool
		s.eval(t, `!!document.querySelector('#card-verdict li[data-code="ambiguous-decimal-mark"]')`, &still)
		if still {
			t.Error("the warning stays after choosing the decimal point")
		}
	})

	t.Run("CSV guards formulas but keeps negative numbers", func(t *testing.T) {
		s.open(t)
		// invented: negative readings, one far out (row 8), two cells that are
		// formulas to a spreadsheet
		text := "Offset\n-5.02\n-5.04\n-4.98\n-2+3\n-5.01\n=1+1\n-9.50\n-5.00\n-4.99\n-5.03\n-5.02\n-4.97\n"
		s.run(t, paste(text), analysed(1))
		s.state(t)
		s.eval(t, `(() => { window.__blobs = []; const o = URL.createObjectURL.bind(URL);
			URL.createObjectURL = (b) => { window.__blobs.push(b); return o(b) }; return true })()`, nil)
		var suspects, unused string
		s.run(t, chromedp.Click("#dl-csv", chromedp.ByID),
			chromedp.Evaluate(`window.__blobs[window.__blobs.length - 1].text()`, &suspects, awaitPromise),
			chromedp.Evaluate(`Array.from(document.querySelectorAll("#card-data button")).find((b) => b.textContent.includes("CSV")).click(), true`, nil),
			chromedp.Evaluate(`window.__blobs[window.__blobs.length - 1].text()`, &unused, awaitPromise))
		if !strings.Contains(suspects, `"-9.50"`) || strings.Contains(suspects, `"'-9.50"`) {
			t.Errorf("suspect readings CSV does not keep -9.50 as a number:\n%s", suspects)
		}
		if !strings.Contains(unused, `"'-2+3"`) || !strings.Contains(unused, `"'=1+1"`) {
			t.Errorf("unused cells CSV does not guard -2+3 and =1+1:\n%s", unused)
		}
	})
}

// TestScreensAndFocus: the verdict brought into view on portrait tablets
// and phones, the first click on Save SVG, the layout on landscape tablets,
// selects not cut short, the focus ring's contrast.
func TestScreensAndFocus(t *testing.T) {
	s := browser(t)
	for _, vp := range [][2]int64{{768, 1024}, {390, 844}} {
		t.Run(fmt.Sprintf("verdict in view at %dx%d", vp[0], vp[1]), func(t *testing.T) {
			s.run(t, chromedp.EmulateViewport(vp[0], vp[1]))
			s.open(t)
			s.run(t, chromedp.Click("#demo", chromedp.ByID), analysed(1), chromedp.Sleep(200*time.Millisecond))
			s.state(t)
			var top, vh float64
			s.eval(t, `document.getElementById("card-verdict").getBoundingClientRect().top`, &top)
			s.eval(t, `window.innerHeight`, &vh)
			if a := s.activeDesc(t); !strings.HasPrefix(a, "article#card-verdict") {
				t.Errorf("focus on %q after the demo, want the verdict", a)
			}
			if top < -1 || top > vh/3 {
				t.Errorf("the verdict starts at %v px in a %v px window", top, vh)
			}
		})
	}
	s.run(t, chromedp.EmulateViewport(1024, 768))

	t.Run("first click on Save SVG saves", func(t *testing.T) {
		s.open(t)
		s.run(t, chromedp.Click("#demo", chromedp.ByID), analysed(1))
		s.state(t)
		s.eval(t, `(() => { window.__blobs = []; const o = URL.createObjectURL.bind(URL);
			URL.createObjectURL = (b) => { window.__blobs.push(b); return o(b) };
			document.querySelector("#card-centre figcaption button").scrollIntoView({block: "center"}); return true })()`, nil)
		var n int
		var status string
		s.run(t, chromedp.Click("#card-centre figcaption button", chromedp.ByQuery), chromedp.Sleep(150*time.Millisecond),
			chromedp.Evaluate(`window.__blobs.length`, &n), chromedp.Text("#status", &status, chromedp.ByID))
		if n != 1 || !strings.Contains(status, "histogram.svg") {
			t.Errorf("after one click on Save SVG: %d downloads, status %q", n, status)
		}
	})

	for _, vp := range [][2]int64{{1280, 800}, {1024, 768}} {
		t.Run(fmt.Sprintf("landscape %dx%d: settings in view, not in a scrolling box", vp[0], vp[1]), func(t *testing.T) {
			s.run(t, chromedp.EmulateViewport(vp[0], vp[1]))
			s.open(t)
			var r map[string]any
			s.eval(t, `(() => { const st = document.getElementById("settings"), b = st.getBoundingClientRect();
				let clip = "";
				for (let e = st.parentElement; e && e !== document.body; e = e.parentElement) {
					const o = getComputedStyle(e).overflowY;
					if ((o === "auto" || o === "scroll" || o === "hidden") && e.scrollHeight > e.clientHeight + 1) clip = e.id || e.className;
				}
				const d = document.getElementById("data").getBoundingClientRect();
				return {bottom: b.bottom, vh: innerHeight, clip, dataW: d.width, w: innerWidth} })()`, &r)
			if r["clip"] != "" {
				t.Errorf("settings are inside a scrolling box (%v)", r["clip"])
			}
			if r["bottom"].(float64) > r["vh"].(float64) {
				t.Errorf("settings end at %v px, below the %v px window", r["bottom"], r["vh"])
			}
			s.shot(t, fmt.Sprintf("10-start-%dx%d.png", vp[0], vp[1]))
		})
	}

	for _, w := range []int64{768, 390, 1280} {
		t.Run(fmt.Sprintf("selects not cut short at %d px", w), func(t *testing.T) {
			s.run(t, chromedp.EmulateViewport(w, 1024))
			s.open(t)
			var cut []string
			s.eval(t, `(() => { const c = document.createElement("canvas").getContext("2d"); const out = [];
				for (const s of document.querySelectorAll("#settings select")) {
					const cs = getComputedStyle(s); c.font = cs.fontWeight + " " + cs.fontSize + " " + cs.fontFamily;
					const need = c.measureText(s.options[s.selectedIndex].text).width + parseFloat(cs.paddingLeft) + parseFloat(cs.paddingRight) + 24;
					if (need > s.clientWidth) out.push(s.id + " needs " + Math.round(need) + " has " + s.clientWidth);
				}
				return out })()`, &cut)
			if len(cut) > 0 {
				t.Errorf("selects cut short: %v", cut)
			}
		})
	}
	s.run(t, chromedp.EmulateViewport(1024, 768))

	// A folded section (a <details>) must show that it opens: with its
	// summary a flex box the browser draws no marker, and a bold line alone
	// reads as a heading with nothing under it. Each summary, in the
	// settings and in the report, draws a sign whose turn differs between
	// folded and open (read with reduced motion, so no turn is under way).
	t.Run("folded sections show that they open", func(t *testing.T) {
		s.open(t)
		s.run(t, emulation.SetEmulatedMedia().WithFeatures([]*emulation.MediaFeature{{Name: "prefers-reduced-motion", Value: "reduce"}}))
		defer s.run(t, emulation.SetEmulatedMedia().WithFeatures(nil))
		s.run(t, chromedp.Click("#demo", chromedp.ByID), analysed(1))
		s.state(t)
		var bad []string
		s.eval(t, `(() => { const out = [];
			const sign = (sm) => { const b = getComputedStyle(sm, "::before"), cs = getComputedStyle(sm);
				if (cs.display === "list-item" && cs.listStyleType !== "none") return "marker";
				if (b.content === "none" || b.content === "normal" || !(parseFloat(b.width) > 0) || !(parseFloat(b.borderRightWidth) > 0)) return "";
				return b.transform };
			const all = [...document.querySelectorAll("details > summary")].filter((sm) => sm.offsetParent !== null);
			if (all.length < 5) out.push("only " + all.length + " visible summaries");
			for (const sm of all) {
				const d = sm.parentElement, was = d.open, name = sm.textContent.trim().slice(0, 40);
				d.open = false; const shut = sign(sm);
				d.open = true; const open = sign(sm);
				d.open = was;
				if (!shut) out.push(name + ": no sign");
				else if (shut !== "marker" && shut === open) out.push(name + ": the same sign folded and open");
			}
			return out })()`, &bad)
		if len(bad) > 0 {
			t.Errorf("folded sections: %v", bad)
		}
	})

	// Every method a figure names is in words, not the report's code for it
	// ("interpolated-order-statistics", "hf7", "tukey-kramer"), on a report
	// with every section: limits and a target, groups, an order column.
	t.Run("methods named in words", func(t *testing.T) {
		s.open(t)
		s.run(t, chromedp.Click("#demo", chromedp.ByID), analysed(1))
		s.run(t, chromedp.SetValue("#target", "5.1", chromedp.ByID), chromedp.SetValue("#lsl", "4.9", chromedp.ByID), chromedp.SetValue("#usl", "5.3", chromedp.ByID),
			setChoice("col-group", "Line"), setChoice("col-order", "Sampled at"),
			waitFor(`!!document.querySelector("#card-groups:not(.placeholder)") && !!document.querySelector("#card-spec:not(.placeholder)") && /Cpk/.test(document.getElementById("card-spec").textContent)`))
		s.state(t)
		var text string
		s.eval(t, `(() => { for (const d of document.querySelectorAll("#report details")) d.open = true; return document.getElementById("report").innerText })()`, &text)
		codes := regexp.MustCompile(`\b(?:[a-z0-9]+-)+(?:statistics|t|pearson|distribution|lehmann|kramer|howell|holm|exact|sd|range|1941|1990|1991)\b|\bhf[1-9]\b|\btukey\b`)
		for _, at := range codes.FindAllStringIndex(text, -1) {
			t.Errorf("a method code shown as it is in the report: %q in %q", text[at[0]:at[1]], text[max(0, at[0]-60):min(len(text), at[1]+20)])
		}
		// the verdict gives the other sections' verdicts, in their words,
		// each a link to its card
		var glance []string
		s.eval(t, `(() => { const spec = document.querySelector("#card-spec .spec-statement").textContent;
			const time = document.querySelector("#card-time [data-field=stability-verdict]").textContent.replace(/^\S+\s/, "");
			const groups = document.querySelector("#card-groups [data-field=groups-statement]").textContent;
			return [...document.querySelectorAll("#card-verdict ul.glance li")].map((li) => {
				const a = li.querySelector("a"), rest = li.textContent.slice(a.textContent.length + 2);
				// the target's statement is the spec card's too, in a paragraph of its own
				const want = a.textContent === "Against the target"
					? ([...document.querySelectorAll("#card-spec p.lead-small")].some((p) => p.textContent === rest) ? rest : "")
					: {spec, time, groups}[a.getAttribute("href").slice(6)];
				const same = want === rest;
				return a.getAttribute("href") + " " + a.textContent + (same ? "" : " differs: " + rest);
			}) })()`, &glance)
		want := []string{"#card-spec Against the limits", "#card-spec Against the target", "#card-time Over time", "#card-groups Between groups"}
		if strings.Join(glance, "|") != strings.Join(want, "|") {
			t.Errorf("the verdict's list of the other sections: %q, want %q", glance, want)
		}
	})

	t.Run("focus ring contrast", func(t *testing.T) {
		s.open(t)
		var ratio float64
		var colour string
		s.run(t, chromedp.Focus("#target", chromedp.ByID))
		s.eval(t, `getComputedStyle(document.getElementById("target")).outlineColor`, &colour)
		s.eval(t, `(() => { const lin = (c) => { c /= 255; return c <= 0.03928 ? c / 12.92 : Math.pow((c + 0.055) / 1.055, 2.4) };
			const m = getComputedStyle(document.getElementById("target")).outlineColor.match(/\d+(\.\d+)?/g).map(Number);
			const L = 0.2126 * lin(m[0]) + 0.7152 * lin(m[1]) + 0.0722 * lin(m[2]);
			return 1.05 / (L + 0.05) })()`, &ratio)
		// WCAG 2.1 SC 1.4.11: 3:1 against the white around the control
		if ratio < 3 {
			t.Errorf("focus ring %s has contrast %.2f:1 on white, want at least 3:1", colour, ratio)
		}
	})
}

// TestWordingAndInput: ordinal percentiles, p-values in the summary, the
// count of pasted lines, very large numbers, time columns, a refused
// spreadsheet file, advice only where its choice is visible, and the help
// pages' icon.
func TestWordingAndInput(t *testing.T) {
	s := browser(t)

	t.Run("percentiles and p-values", func(t *testing.T) {
		s.open(t)
		// invented, strongly skewed: 200 squares, so the normality tests give p < 0.0001
		var b strings.Builder
		for i := 1; i <= 200; i++ {
			fmt.Fprintf(&b, "%d\n", i*i)
		}
		s.run(t, paste(b.String()), analysed(1))
		s.state(t)
		var spread, copied string
		s.eval(t, `document.getElementById("card-spread").textContent`, &spread)
		if !strings.Contains(spread, "1st percentile") || strings.Contains(spread, "1th") || !strings.Contains(spread, "99th percentile") {
			t.Errorf("quantile names: %q", spread)
		}
		s.run(t, chromedp.Evaluate(`navigator.clipboard.writeText = (t) => { window.__copied = t; return Promise.resolve() }; true`, nil),
			chromedp.Click("#copy", chromedp.ByID), chromedp.Sleep(100*time.Millisecond),
			chromedp.Evaluate(`window.__copied || ""`, &copied))
		if strings.Contains(copied, "= <") || !strings.Contains(copied, "p < 0.0001") {
			t.Errorf("summary p-value wording:\n%s", copied)
		}
	})

	t.Run("one value is one value", func(t *testing.T) {
		s.open(t)
		s.run(t, paste("5.1\n"), analysed(1))
		s.state(t)
		var basis, status string
		s.eval(t, `document.querySelector("#card-verdict .basis").textContent`, &basis)
		s.eval(t, `document.getElementById("status").textContent`, &status)
		if !strings.HasPrefix(basis, "1 value used") || !strings.Contains(status, "Analysed 1 value ") {
			t.Errorf("one value: verdict %q, status %q", basis, status)
		}
	})

	t.Run("pasted lines counted as an editor counts them", func(t *testing.T) {
		s.open(t)
		s.run(t, chromedp.Evaluate(`(() => { const d = document.getElementById("data"); d.value = "";
			const dt = new DataTransfer(); dt.setData("text/plain", "Torque (N m)\n" + `+values(40000)+`);
			d.dispatchEvent(new ClipboardEvent("paste", {bubbles: true, cancelable: true, clipboardData: dt})); return true })()`, nil),
			analysed(1))
		s.state(t)
		var ph string
		s.eval(t, `document.getElementById("data").placeholder`, &ph)
		if !strings.Contains(ph, "40,001 lines") || !strings.Contains(ph, "40,000 values") {
			t.Errorf("placeholder %q, want 40,001 lines and 40,000 values", ph)
		}
	})

	t.Run("very large numbers", func(t *testing.T) {
		s.open(t)
		text := "1e200\n3e200\n2e200\n5e200\n4e200\n"
		want, err := stats.Analyze(stats.Request{Text: text})
		if err != nil || want.Spread == nil {
			t.Fatalf("engine: %v", err)
		}
		s.run(t, paste(text), analysed(1))
		s.state(t)
		got := s.fields(t)
		sd := got["sd-all"]
		// 5 significant digits and a power of ten (the SD of 1..5 is 1.5811388..., R 4.2.2 sd(1:5))
		if !regexp.MustCompile(`^1\.5811\x{a0}\x{d7}\x{a0}10\x{b2}\x{2070}\x{2070}$`).MatchString(sd[0]) {
			t.Errorf("SD shown as %q", sd[0])
		}
		if v, _ := strconv.ParseFloat(sd[1], 64); math.Abs(v-want.Spread.SD) > 1e-12*want.Spread.SD {
			t.Errorf("SD carried %q, engine %v", sd[1], want.Spread.SD)
		}
	})

	t.Run("time-of-day column offered as the order", func(t *testing.T) {
		s.open(t)
		var b strings.Builder
		b.WriteString("Time\tTorque (N m)\n")
		for i := 0; i < 12; i++ { // invented readings every 5 minutes
			fmt.Fprintf(&b, "%02d:%02d\t%.1f\n", 6+i/12, (i%12)*5, 12+0.1*float64(i%4))
		}
		s.run(t, paste(b.String()), analysed(1))
		s.state(t)
		var valueOpts, orderOpts []string
		var hint, timeCard string
		s.eval(t, `Array.from(document.getElementById("col-value").options).map((o) => o.value)`, &valueOpts)
		s.eval(t, `Array.from(document.getElementById("col-order").options).map((o) => o.value)`, &orderOpts)
		s.eval(t, `document.getElementById("col-hint").hidden ? "" : document.getElementById("col-hint").textContent`, &hint)
		s.eval(t, `document.getElementById("card-time").textContent`, &timeCard)
		for _, v := range valueOpts {
			if v == "Time" {
				t.Errorf("the time column is offered as values: %v", valueOpts)
			}
		}
		if len(orderOpts) < 2 || orderOpts[1] != "Time" || !strings.Contains(hint, "Time") {
			t.Errorf("order choices %v and hint %q: want Time offered first", orderOpts, hint)
		}
		if !strings.Contains(timeCard, "under Columns") {
			t.Errorf("time card %q: with columns to choose from, it should point to Columns", timeCard)
		}
		// one column: no choice on screen, so no advice to make one
		s.open(t)
		s.run(t, paste(twelve), analysed(1))
		s.eval(t, `document.getElementById("card-time").textContent + document.getElementById("card-groups").textContent`, &timeCard)
		if strings.Contains(timeCard, "under Columns") {
			t.Errorf("one column: the cards advise a choice under Columns, which is hidden: %q", timeCard)
		}
	})

	t.Run("refused spreadsheet file clears the report", func(t *testing.T) {
		s.open(t)
		s.run(t, paste(twelve), analysed(1))
		s.state(t)
		var st string
		var reportShown bool
		s.run(t, chromedp.Evaluate(`(() => { const dt = new DataTransfer();
			dt.items.add(new File([new Uint8Array([0x50, 0x4b, 3, 4, 20, 0, 6, 0, 8, 0, 0, 0, 33])], "torques.xlsx"));
			document.getElementById("input").dispatchEvent(new DragEvent("drop", {bubbles: true, cancelable: true, dataTransfer: dt}));
			return true })()`, nil),
			chromedp.Poll(`document.body.dataset.state === "error"`, nil, chromedp.WithPollingTimeout(10*time.Second)),
			chromedp.Evaluate(`document.body.dataset.state`, &st),
			chromedp.Evaluate(`!document.getElementById("report").hidden || document.querySelectorAll("#cards .card").length > 0`, &reportShown))
		if reportShown {
			t.Error("the old report stays on screen after the spreadsheet file was refused")
		}
	})

	t.Run("help pages name their icon", func(t *testing.T) {
		var r map[string]any
		s.run(t, chromedp.Navigate(s.base+"/help/mean.html"), chromedp.WaitVisible("article", chromedp.ByQuery),
			chromedp.Evaluate(`(async () => { const l = document.querySelector('link[rel~="icon"]');
				if (!l) return {href: ""}; const res = await fetch(l.href); return {href: l.href, status: res.status} })()`, &r, awaitPromise))
		if r["href"] == "" || r["status"] != float64(200) {
			t.Errorf("help page icon %v: want a link to an icon that loads (else the browser asks for /favicon.ico)", r)
		}
	})
}
