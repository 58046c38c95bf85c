package site

// Browser tests: the built site (dist/, made by `make dist`; built by
// TestMain into a temporary directory when missing) served with the edge
// worker's headers, driven in headless Chromium through chromedp.
// `make test` runs them; `go test -short` skips them. Screenshots of the main
// states go to testdata/artefacts/ (gitignored).

import (
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"math"
	"net/http"
	"net/http/httptest"
	"net/http/httputil"
	"net/url"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/cdproto/network"
	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/cdproto/runtime"
	"github.com/chromedp/chromedp"

	"lotlens/build/dist"
	"lotlens/site/headless"
	"lotlens/stats"
)

const artefacts = "../testdata/artefacts"

// distDir is the built site under test: ../dist, or $LOTLENS_DIST (an
// absolute path) to compare two builds side by side without touching dist/.
var distDir = func() string {
	if d := os.Getenv("LOTLENS_DIST"); d != "" {
		return d
	}
	return "../dist"
}()

func awaitPromise(p *runtime.EvaluateParams) *runtime.EvaluateParams { return p.WithAwaitPromise(true) }

// session is one served dist/ and one headless Chromium.
type session struct {
	ctx  context.Context
	base string
	srv  *httptest.Server
}

// browser serves dist/ and starts headless Chromium.
func browser(t testing.TB, extra ...chromedp.ExecAllocatorOption) *session {
	t.Helper()
	if testing.Short() {
		t.Skip("browser tests skipped with -short")
	}
	srv := httptest.NewServer(dist.Handler(distDir)) // TestMain checked Chromium and dist/
	t.Cleanup(srv.Close)
	ctx := headless.Start(t, 60*time.Second, extra...)
	return &session{ctx: ctx, base: srv.URL, srv: srv}
}

// close ends the browser now (it would otherwise run until the test ends):
// a benchmark that starts a browser per iteration must not leave the last
// one's page working (its engine's warm-up) beside the next.
func (s *session) close() {
	chromedp.Cancel(s.ctx)
	s.srv.Close()
}

// open loads the page and waits for the engine.
func (s *session) open(t testing.TB) {
	t.Helper()
	if err := chromedp.Run(s.ctx,
		chromedp.Navigate(s.base+"/"),
		chromedp.WaitVisible(`body[data-ready="1"]`, chromedp.ByQuery),
	); err != nil {
		t.Fatal(err)
	}
}

// analysed waits until the page has shown its n-th report (or an error).
func analysed(n int) chromedp.Action {
	return chromedp.Poll(fmt.Sprintf(`(document.body.dataset.analysed|0) >= %d || document.body.dataset.state === "error"`, n), nil,
		chromedp.WithPollingTimeout(30*time.Second))
}

func (s *session) state(t testing.TB) string {
	var st string
	if err := chromedp.Run(s.ctx, chromedp.Evaluate(`document.body.dataset.state || ""`, &st)); err != nil {
		t.Fatal(err)
	}
	if st == "error" {
		var msg string
		chromedp.Run(s.ctx, chromedp.Text("#status", &msg, chromedp.ByID))
		t.Fatalf("the page shows an error: %s", msg)
	}
	return st
}

// paste puts text in the box and sends the paste event the page listens to.
func paste(text string) chromedp.Action {
	js, _ := json.Marshal(text)
	return chromedp.Evaluate(fmt.Sprintf(`(() => { const d = document.getElementById("data"); d.value = %s;
		d.dispatchEvent(new ClipboardEvent("paste", {bubbles: true})); return true })()`, js), nil)
}

// shot saves a PNG screenshot of the whole page under testdata/artefacts.
func (s *session) shot(t testing.TB, name string) {
	t.Helper()
	var buf []byte
	if err := chromedp.Run(s.ctx, chromedp.FullScreenshot(&buf, 100)); err != nil {
		t.Logf("screenshot %s: %v", name, err)
		return
	}
	save(t, name, buf)
}

func save(t testing.TB, name string, b []byte) {
	if err := os.MkdirAll(artefacts, 0o755); err != nil {
		t.Log(err)
		return
	}
	p := filepath.Join(artefacts, name)
	if err := os.WriteFile(p, b, 0o644); err != nil {
		t.Log(err)
	}
}

// fields reads every number the page shows with its exact value.
func (s *session) fields(t *testing.T) map[string][2]string {
	t.Helper()
	var got map[string][2]string
	if err := chromedp.Run(s.ctx, chromedp.Evaluate(`(() => { const o = {};
		for (const e of document.querySelectorAll("#cards [data-field]")) if (!(e.dataset.field in o)) o[e.dataset.field] = [e.textContent, e.dataset.value];
		return o })()`, &got)); err != nil {
		t.Fatal(err)
	}
	return got
}

// checkShown compares a number on the page with the engine's: the exact
// value carried by the element, and the text rounded from it.
func checkShown(t *testing.T, got map[string][2]string, field string, want float64) {
	t.Helper()
	f, ok := got[field]
	if !ok {
		t.Errorf("the page shows no %s", field)
		return
	}
	exact, err := strconv.ParseFloat(f[1], 64)
	if err != nil || exact != want {
		t.Errorf("%s: page carries %q, engine says %v", field, f[1], want)
	}
	shown, err := strconv.ParseFloat(strings.Replace(f[0], ",", ".", 1), 64)
	dec := 0
	if i := strings.IndexAny(f[0], ".,"); i >= 0 {
		dec = len(f[0]) - i - 1
	}
	if err != nil || math.Abs(shown-want) > 0.5*math.Pow(10, -float64(dec))*(1+1e-9) {
		t.Errorf("%s: page shows %q, engine says %v", field, f[0], want)
	}
}

// TestPasteShowsEngineNumbers pastes values and checks that the figures shown
// equal the engine's own (stats.Analyze run natively here).
func TestPasteShowsEngineNumbers(t *testing.T) {
	s := browser(t)
	// NIST StRD Michelso (testdata/nist): the engine's native answer is the check value.
	data, err := os.ReadFile("../testdata/nist/Michelso.dat")
	if err != nil {
		t.Fatal(err)
	}
	want, err := stats.Analyze(stats.Request{Text: string(data)})
	if err != nil {
		t.Fatal(err)
	}
	s.open(t)
	s.shot(t, "01-start-1024.png")
	if err := chromedp.Run(s.ctx, paste(string(data)), analysed(1)); err != nil {
		t.Fatal(err)
	}
	s.state(t)
	got := s.fields(t)
	checkShown(t, got, "used", float64(want.Counts.Used))
	if want.Centre != nil {
		checkShown(t, got, "mean-all", want.Centre.Mean)
		checkShown(t, got, "median-all", want.Centre.Median)
		// NIST's certified mean for Michelso, to 12 digits.
		v, _ := strconv.ParseFloat(got["mean-all"][1], 64)
		if math.Abs(v-299.852400000000) > 1e-12*299.8524 {
			t.Errorf("page mean %v, NIST certifies 299.852400000000", v)
		}
	}
	if want.Spread != nil {
		checkShown(t, got, "sd-all", want.Spread.SD)
		// NIST's certified SD for Michelso.
		v, _ := strconv.ParseFloat(got["sd-all"][1], 64)
		if math.Abs(v-0.0790105478190518) > 1e-12*0.079 {
			t.Errorf("page SD %v, NIST certifies 0.0790105478190518", v)
		}
		if want.Spread.IQR != 0 {
			checkShown(t, got, "iqr-all", want.Spread.IQR)
		}
	}
	var fp string
	if err := chromedp.Run(s.ctx, chromedp.Text(".fp", &fp, chromedp.ByQuery)); err != nil {
		t.Fatal(err)
	}
	if fp != want.Input.Fingerprint {
		t.Errorf("fingerprint shown %q, engine %q", fp, want.Input.Fingerprint)
	}
	// The probability plot's caption and key name the simultaneous
	// envelope at the level the engine used (95 %, the default).
	var ppCap, ppKey string
	if err := chromedp.Run(s.ctx, chromedp.Text(`figure[data-chart="probplot"] .cap`, &ppCap, chromedp.ByQuery),
		chromedp.TextContent(`figure[data-chart="probplot"] svg`, &ppKey, chromedp.ByQuery)); err != nil {
		t.Fatal(err)
	}
	if pp := want.Charts.ProbPlot; pp.BandLevel != 0.95 || !strings.Contains(ppCap, "simultaneous ("+pp.BandMethod+" method, 95 %)") ||
		!strings.Contains(ppCap, "if any point leaves it, the normal model is doubtful") || !strings.Contains(ppKey, "95 % envelope, all points") {
		t.Errorf("probability plot: level %v, caption %q, chart text %q: want the simultaneous envelope at 95 %% named", pp.BandLevel, ppCap, ppKey)
	}
	s.shot(t, "02-report-paste-1024.png")
	// The automation entry point gives the same report.
	var rep stats.Report
	js, _ := json.Marshal(string(data))
	if err := chromedp.Run(s.ctx, chromedp.Evaluate(`lotlens.analyse({text: `+string(js)+`})`, &rep,
		awaitPromise)); err != nil {
		t.Fatal(err)
	}
	a, _ := json.Marshal(rep)
	b, _ := json.Marshal(want)
	if where, same := sameReport(a, b); !same {
		t.Errorf("lotlens.analyse differs from stats.Analyze at %s", where)
	}
	// Full precision on request.
	if err := chromedp.Run(s.ctx, chromedp.Click("#precision", chromedp.ByID)); err != nil {
		t.Fatal(err)
	}
	if want.Centre != nil {
		if got := s.fields(t)["mean-all"]; got[0] != got[1] {
			t.Errorf("full precision: shown %q, exact %q", got[0], got[1])
		}
	}
}

// dropJS is JavaScript that drops each file (a JavaScript expression that
// makes a File) on the input panel in turn, as dragging it there does.
func dropJS(files ...string) string {
	return `(() => { const t = document.getElementById("input");
		for (const f of [` + strings.Join(files, ", ") + `]) { const dt = new DataTransfer(); dt.items.add(f);
			t.dispatchEvent(new DragEvent("dragover", {bubbles: true, cancelable: true, dataTransfer: dt}));
			t.dispatchEvent(new DragEvent("drop", {bubbles: true, cancelable: true, dataTransfer: dt})); }
		return true })()`
}

// TestDropSupersedes drops a second file while the first (1 MB) is still
// being read: the report is the second file's alone (its readings, its
// fingerprint), and the first one's end does not undo it. Before, the first
// read went on feeding its chunks into the second file's read.
func TestDropSupersedes(t *testing.T) {
	s := browser(t)
	second := "torque\n" // invented values for the page test
	for i := 0; i < 40; i++ {
		second += fmt.Sprintf("%.1f\n", 12+0.1*float64(i%7))
	}
	want, err := stats.Analyze(stats.Request{Text: second})
	if err != nil {
		t.Fatal(err)
	}
	sum := sha256.Sum256([]byte(second))
	js, _ := json.Marshal(second)
	s.open(t)
	err = chromedp.Run(s.ctx,
		chromedp.Evaluate(dropJS(`new File([`+values(150000)+`], "first.txt", {type: "text/plain"})`,
			`new File([`+string(js)+`], "second.csv", {type: "text/csv"})`), nil),
		analysed(1))
	if err != nil {
		t.Fatal(err)
	}
	time.Sleep(500 * time.Millisecond) // the first file's answer, if any, has come by now
	s.state(t)
	got := s.fields(t)
	checkShown(t, got, "used", float64(want.Counts.Used))
	var fp, st string
	if err := chromedp.Run(s.ctx,
		chromedp.Text(".fp", &fp, chromedp.ByQuery),
		chromedp.Evaluate(`document.body.dataset.state + " | " + document.getElementById("status").textContent`, &st),
	); err != nil {
		t.Fatal(err)
	}
	if fp != hex.EncodeToString(sum[:]) {
		t.Errorf("fingerprint %s, want the second file's %x", fp, sum)
	}
	if !strings.HasPrefix(st, "report |") || strings.Contains(st, "cancel") {
		t.Errorf("page state and status after the second file: %q", st)
	}
}

// TestDropCancel cancels the reading of a large file (3,000,000 values,
// about 21 MB) once the bar has moved: the reading stops where it is (the
// engine hears the cancel between the slices it parses, not only at the
// end), nothing is analysed, and the page says so.
func TestDropCancel(t *testing.T) {
	s := browser(t)
	s.open(t)
	var got map[string]any
	err := chromedp.Run(s.ctx,
		chromedp.Evaluate(dropJS(`new File([`+values(3000000)+`], "big.txt", {type: "text/plain"})`), nil),
		chromedp.Poll(`document.getElementById("progress").value > 0`, nil, chromedp.WithPollingTimeout(20*time.Second)),
		chromedp.Click("#cancel", chromedp.ByID),
		chromedp.Poll(`document.body.dataset.state === "cancelled" || document.body.dataset.state === "error" || (document.body.dataset.analysed|0) > 0`, nil,
			chromedp.WithPollingTimeout(20*time.Second)),
		chromedp.Evaluate(`({state: document.body.dataset.state, status: document.getElementById("status").textContent,
			read: document.getElementById("progress").value, total: document.getElementById("progress").max,
			report: !document.getElementById("report").hidden})`, &got))
	if err != nil {
		t.Fatal(err)
	}
	if got["state"] != "cancelled" || !strings.HasPrefix(got["status"].(string), "Reading cancelled.") || got["report"] == true {
		t.Errorf("after the cancel: %v; want the state cancelled, the status \"Reading cancelled...\" and no report", got)
	}
	if read, total := got["read"].(float64), got["total"].(float64); !(read > 0 && read < total) {
		t.Errorf("the reading went on to %v of %v bytes after the cancel", read, total)
	}
}

// TestChartsDrawnAfter: the large charts of a report of 5,000 readings are
// drawn just after the rest. At the moment the report is put on the page a
// large chart holds a placeholder of its size (so nothing moves when it
// comes); a chart that a key press needs is drawn at once; and by the time
// the page counts the report as analysed, every chart is drawn, each the
// height of its placeholder.
func TestChartsDrawnAfter(t *testing.T) {
	s := browser(t)
	s.open(t)
	var at map[string]any
	err := chromedp.Run(s.ctx,
		chromedp.Evaluate(`window.__at = null; new MutationObserver((_, obs) => {
			if (window.__at || !document.querySelector("#cards .chart-fig")) return;
			obs.disconnect();
			const figs = [...document.querySelectorAll("#cards .chart-fig")];
			const waiting = figs.filter((f) => f.querySelector(".chart-wait"));
			const h = {};
			for (const f of waiting) h[f.dataset.chart] = f.querySelector(".chart-wait").getBoundingClientRect().height;
			const r = {charts: figs.length, waiting: waiting.map((f) => f.dataset.chart), heights: h};
			const f = waiting.find((f) => f.dataset.chart === "control");
			if (f) { f.focus(); f.dispatchEvent(new KeyboardEvent("keydown", {key: "ArrowRight", bubbles: true}));
				r.keyDrew = !!f.querySelector("svg") && !f.querySelector(".chart-wait"); r.tip = !document.getElementById("tip").hidden; }
			window.__at = r;
		}).observe(document.getElementById("cards"), {childList: true}); true`, nil),
		paste(values5000()),
		analysed(1),
		chromedp.Evaluate(`(() => { const r = window.__at; r.after = {}; r.left = document.querySelectorAll("#cards .chart-wait").length;
			for (const f of document.querySelectorAll("#cards .chart-fig")) { const g = f.querySelector("svg"); r.after[f.dataset.chart] = g ? g.getBoundingClientRect().height : -1; }
			return r })()`, &at))
	if err != nil {
		t.Fatal(err)
	}
	waiting, _ := at["waiting"].([]any)
	if len(waiting) == 0 || len(waiting) == int(at["charts"].(float64)) {
		t.Fatalf("charts waiting when the report was put on the page: %v of %v; want the large ones only", waiting, at["charts"])
	}
	if at["keyDrew"] != true || at["tip"] != true {
		t.Errorf("an arrow key on the waiting control chart: drawn %v, tip shown %v; want both", at["keyDrew"], at["tip"])
	}
	if at["left"].(float64) != 0 {
		t.Errorf("%v placeholders left once analysed", at["left"])
	}
	after := at["after"].(map[string]any)
	for k, h := range at["heights"].(map[string]any) {
		if a := after[k].(float64); math.Abs(a-h.(float64)) > 1 {
			t.Errorf("chart %s: placeholder %.1f px high, the chart %.1f px", k, h, a)
		}
	}
}

// values5000 is 5,000 invented readings, one a line.
func values5000() string {
	var b strings.Builder
	for i := 0; i < 5000; i++ {
		fmt.Fprintf(&b, "%.3f\n", 10+0.02*float64(i%97)-0.015*float64(i%61))
	}
	return b.String()
}

// TestDropFile drops a file (made in the page) and checks the report, the
// fingerprint of the bytes and the problem rows in the preview.
func TestDropFile(t *testing.T) {
	s := browser(t)
	var b strings.Builder
	b.WriteString("weight\n")
	for i := 0; i < 300; i++ { // invented values for the page test
		fmt.Fprintf(&b, "%.2f\n", 5+0.01*float64(i%17)-0.003*float64(i%5))
		if i == 6 {
			b.WriteString("n/a\n")
		}
	}
	text := b.String()
	want, err := stats.Analyze(stats.Request{Text: text})
	if err != nil {
		t.Fatal(err)
	}
	sum := sha256.Sum256([]byte(text))
	js, _ := json.Marshal(text)
	s.open(t)
	err = chromedp.Run(s.ctx,
		chromedp.Evaluate(dropJS(`new File([`+string(js)+`], "fill-weights.csv", {type: "text/csv"})`), nil),
		analysed(1))
	if err != nil {
		t.Fatal(err)
	}
	s.state(t)
	got := s.fields(t)
	checkShown(t, got, "used", float64(want.Counts.Used))
	if want.Centre != nil {
		checkShown(t, got, "mean-all", want.Centre.Mean)
	}
	var fp string
	var problemRows []int
	if err := chromedp.Run(s.ctx,
		chromedp.Text(".fp", &fp, chromedp.ByQuery),
		chromedp.Evaluate(`Array.from(document.querySelectorAll("#preview tr.problem th")).map((e) => +e.textContent)`, &problemRows),
	); err != nil {
		t.Fatal(err)
	}
	if fp != hex.EncodeToString(sum[:]) {
		t.Errorf("fingerprint %s, want SHA-256 of the file's bytes %x", fp, sum)
	}
	// "n/a" is on line 9 of the file (header, 7 values, then it).
	found := false
	for _, r := range problemRows {
		found = found || r == 9
	}
	if !found {
		t.Errorf("preview marks rows %v as problems, want row 9 (n/a) among them", problemRows)
	}
	s.shot(t, "03-report-drop-1024.png")
}

// TestExclusionRecomputes leaves a reading out and checks the page shows the
// engine's figures for the data without it, and lists the exclusion.
func TestExclusionRecomputes(t *testing.T) {
	s := browser(t)
	text := "5.02\n5.04\n4.98\n5.01\n6.40\n5.00\n4.99\n5.03\n5.02\n4.97\n5.01\n5.00\n" // invented: row 5 is far out
	full, err := stats.Analyze(stats.Request{Text: text})
	if err != nil {
		t.Fatal(err)
	}
	without, err := stats.Analyze(stats.Request{Text: text, Options: stats.Options{Exclude: []int{5}}})
	if err != nil {
		t.Fatal(err)
	}
	if without.Counts.Used != full.Counts.Used-1 {
		t.Fatalf("the engine does not honour Options.Exclude (used %d, then %d)", full.Counts.Used, without.Counts.Used)
	}
	s.open(t)
	if err := chromedp.Run(s.ctx, paste(text), analysed(1)); err != nil {
		t.Fatal(err)
	}
	s.state(t)
	// Use the suspect reading's switch when the engine flags row 5, the
	// leave-out box otherwise.
	var hasToggle bool
	if err := chromedp.Run(s.ctx, chromedp.Evaluate(`!!document.querySelector('button.toggle[data-row="5"]')`, &hasToggle)); err != nil {
		t.Fatal(err)
	}
	act := chromedp.Action(chromedp.Click(`button.toggle[data-row="5"]`, chromedp.ByQuery))
	if !hasToggle {
		act = chromedp.SendKeys("#leave-out", "5", chromedp.ByID)
	}
	if err := chromedp.Run(s.ctx, act, analysed(2)); err != nil {
		t.Fatal(err)
	}
	s.state(t)
	got := s.fields(t)
	checkShown(t, got, "used", float64(without.Counts.Used))
	checkShown(t, got, "mean-all", without.Centre.Mean)
	checkShown(t, got, "sd-all", without.Spread.SD)
	var listed string
	if err := chromedp.Run(s.ctx, chromedp.Text("#exclusion-list", &listed, chromedp.ByID)); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(listed, "Row 5") {
		t.Errorf("exclusion list %q does not name row 5", listed)
	}
	s.shot(t, "04-exclusion-1024.png")

	// The share link carries data, settings and the exclusion: opening it
	// restores them and gives the same figures.
	var link string
	err = chromedp.Run(s.ctx,
		chromedp.SetValue("#target", "5.00", chromedp.ByID),
		chromedp.Click("#share", chromedp.ByID),
		chromedp.Poll(`document.getElementById("share-url").value.includes("#s=")`, nil, chromedp.WithPollingTimeout(10*time.Second)),
		chromedp.Value("#share-url", &link, chromedp.ByID),
	)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(link, s.base+"/#s=") {
		t.Fatalf("share link %q", link)
	}
	var target string
	err = chromedp.Run(s.ctx,
		chromedp.Navigate("about:blank"),
		chromedp.Navigate(link),
		chromedp.WaitVisible(`body[data-ready="1"]`, chromedp.ByQuery),
		analysed(1),
		chromedp.Value("#target", &target, chromedp.ByID),
		chromedp.Text("#exclusion-list", &listed, chromedp.ByID),
	)
	if err != nil {
		t.Fatal(err)
	}
	s.state(t)
	got = s.fields(t)
	checkShown(t, got, "used", float64(without.Counts.Used))
	checkShown(t, got, "mean-all", without.Centre.Mean)
	if !strings.Contains(listed, "Row 5") || target != "5" {
		t.Errorf("the shared link restored exclusions %q and target %q, want row 5 and 5", listed, target)
	}
}

// TestDemoScreensAndPrint runs the demo, checks the layout at three widths
// (screens), then renders the print stylesheet: the input panel is hidden,
// the print header carries title, date, fingerprint, settings and
// exclusions, and Chromium prints an A4 PDF of at most three pages.
func TestDemoScreensAndPrint(t *testing.T) {
	s := browser(t)
	s.open(t)
	if err := chromedp.Run(s.ctx, chromedp.Click("#demo", chromedp.ByID), analysed(1)); err != nil {
		t.Fatal(err)
	}
	s.state(t)
	screens(t, s)
	var head string
	var panelShown, headShown bool
	var pdf []byte
	err := chromedp.Run(s.ctx,
		emulation.SetEmulatedMedia().WithMedia("print"),
		chromedp.Evaluate(`getComputedStyle(document.getElementById("input")).display !== "none"`, &panelShown),
		chromedp.Evaluate(`getComputedStyle(document.getElementById("print-head")).display !== "none"`, &headShown),
		chromedp.Text("#print-head", &head, chromedp.ByID),
		chromedp.ActionFunc(func(ctx context.Context) error {
			var err error
			pdf, _, err = page.PrintToPDF().WithPaperWidth(8.27).WithPaperHeight(11.69).Do(ctx)
			return err
		}),
		emulation.SetEmulatedMedia().WithMedia(""),
	)
	if err != nil {
		t.Fatal(err)
	}
	if panelShown || !headShown {
		t.Errorf("print media: input panel shown %v, print header shown %v", panelShown, headShown)
	}
	for _, want := range []string{"Lotlens report", "fingerprint", "Settings:", "Confidence level", "left out"} {
		if !strings.Contains(head, want) {
			t.Errorf("print header lacks %q:\n%s", want, head)
		}
	}
	if !bytes.HasPrefix(pdf, []byte("%PDF")) || len(pdf) < 2000 {
		t.Fatalf("PrintToPDF gave %d bytes, not a PDF", len(pdf))
	}
	pages := bytes.Count(pdf, []byte("/Type /Page")) - bytes.Count(pdf, []byte("/Type /Pages"))
	t.Logf("print: %d bytes, %d A4 pages", len(pdf), pages)
	// Three pages at most: the print holds every figure of every card,
	// the sections folded on screen included (quantile table, the rules as
	// applied, all centre and spread figures), so it stands as a record.
	if pages < 1 || pages > 3 {
		t.Errorf("the report prints on %d A4 pages, want 1 to 3", pages)
	}
	save(t, "05-print-a4.pdf", pdf)
}

// TestOfflineReload loads the page once (the service worker caches the app),
// then stops the server, turns the network off, reloads and analyses.
func TestOfflineReload(t *testing.T) {
	s := browser(t)
	s.open(t)
	var controlled bool
	err := chromedp.Run(s.ctx,
		chromedp.Evaluate(`navigator.serviceWorker.ready.then(() => true)`, nil,
			awaitPromise),
		chromedp.Poll(`!!navigator.serviceWorker.controller`, &controlled, chromedp.WithPollingTimeout(15*time.Second)),
	)
	if err != nil {
		t.Fatalf("the service worker did not take control: %v", err)
	}
	s.srv.CloseClientConnections()
	s.srv.Close()
	err = chromedp.Run(s.ctx,
		network.Enable(),
		network.EmulateNetworkConditions(true, 0, -1, -1),
		chromedp.Reload(),
		chromedp.WaitVisible(`body[data-ready="1"]`, chromedp.ByQuery),
		paste("12.1\n12.4\n11.9\n12.0\n12.2\n"),
		analysed(1),
	)
	if err != nil {
		t.Fatalf("offline reload: %v", err)
	}
	s.state(t)
	got := s.fields(t)
	want, _ := stats.Analyze(stats.Request{Text: "12.1\n12.4\n11.9\n12.0\n12.2\n"})
	checkShown(t, got, "used", float64(want.Counts.Used))
	s.shot(t, "06-offline-1024.png")
}

// TestNoRequestLeavesOrigin sends all of Chromium's traffic (page, worker
// and service worker alike, loopback included) through a recording proxy
// while the page loads, analyses the demo and makes a share link, and checks
// that every request went to the page's own origin. A fetch to elsewhere must
// also be refused by the Content-Security-Policy.
func TestNoRequestLeavesOrigin(t *testing.T) {
	var mu sync.Mutex
	var seen []string
	var origin *url.URL
	proxy := httptest.NewServer(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		mu.Lock()
		seen = append(seen, r.Method+" "+r.Host+" "+r.URL.Path)
		o := origin
		mu.Unlock()
		if r.Method == http.MethodConnect || o == nil || r.Host != o.Host {
			http.Error(w, "refused by the test proxy", http.StatusForbidden)
			return
		}
		httputil.NewSingleHostReverseProxy(o).ServeHTTP(w, r)
	}))
	defer proxy.Close()
	s := browser(t,
		chromedp.ProxyServer(proxy.URL),
		chromedp.Flag("proxy-bypass-list", "<-loopback>"))
	mu.Lock()
	origin, _ = url.Parse(s.base)
	mu.Unlock()
	var blocked bool
	err := chromedp.Run(s.ctx,
		chromedp.Navigate(s.base+"/"),
		chromedp.WaitVisible(`body[data-ready="1"]`, chromedp.ByQuery),
		chromedp.Click("#demo", chromedp.ByID),
		analysed(1),
		chromedp.Click("#share", chromedp.ByID),
		chromedp.WaitVisible("#share-box", chromedp.ByID),
		chromedp.Evaluate(`fetch("https://example.invalid/x").then(() => false, () => true)`, &blocked, awaitPromise),
		chromedp.Sleep(300*time.Millisecond),
	)
	if err != nil {
		t.Fatal(err)
	}
	s.state(t)
	if !blocked {
		t.Error("a fetch to another origin was not refused")
	}
	mu.Lock()
	defer mu.Unlock()
	sawWasm := false
	browserOwn := 0
	for _, r := range seen {
		f := append(strings.Fields(r), "", "")
		host := strings.Split(f[1], ":")[0]
		switch {
		case f[1] == origin.Host:
		case chromiumService(host):
			// Chromium's own update, clock and sign-in checks: browser
			// traffic, not the page's (the page's CSP refuses these hosts,
			// as the fetch above shows).
			browserOwn++
		default:
			t.Errorf("request leaves the origin: %s", r)
		}
		sawWasm = sawWasm || strings.HasSuffix(f[2], ".wasm")
	}
	if browserOwn > 0 {
		t.Logf("%d requests by Chromium itself to its own services (not the page)", browserOwn)
	}
	if !sawWasm || len(seen) < 5 {
		t.Errorf("the proxy saw %d requests (engine among them: %v): the log is not working", len(seen), sawWasm)
	}
	t.Logf("%d requests in all; every one from the page went to %s", len(seen), origin.Host)
}

// chromiumService reports whether host is one of the services Chromium itself
// calls (component updates, network time, sign-in, autofill hints).
func chromiumService(host string) bool {
	for _, d := range []string{"google.com", "googleapis.com", "gstatic.com", "gvt1.com"} {
		if host == d || strings.HasSuffix(host, "."+d) {
			return true
		}
	}
	return false
}

// TestHeaderShownAsText pastes data whose header is HTML: it must appear as
// text, never become an element or run.
func TestHeaderShownAsText(t *testing.T) {
	s := browser(t)
	const header = `<img src=x onerror=alert(1)>`
	text := header + "\n5.1\n5.3\n5.2\n5.4\n5.2\n"
	s.open(t)
	var imgs int
	var body string
	err := chromedp.Run(s.ctx, paste(text), analysed(1),
		chromedp.Evaluate(`document.querySelectorAll('img[src="x"], #cards img, #preview img, svg img').length`, &imgs),
		chromedp.Evaluate(`document.body.innerText`, &body),
	)
	if err != nil {
		t.Fatal(err)
	}
	s.state(t)
	if imgs != 0 {
		t.Errorf("%d <img> elements made from the header", imgs)
	}
	if !strings.Contains(body, header) {
		t.Errorf("the header is not shown as text")
	}
	time.Sleep(300 * time.Millisecond) // give a stray onerror a moment to fire
	s.shot(t, "07-header-as-text.png")
}

// screens takes screenshots of the report at desktop, tablet-portrait and
// phone widths and checks that every control is at least 44 px tall and
// nothing scrolls sideways.
func screens(t *testing.T, s *session) {
	t.Helper()
	for _, w := range []int64{1280, 768, 390} {
		var small []string
		var overflow bool
		err := chromedp.Run(s.ctx,
			chromedp.EmulateViewport(w, 1024),
			chromedp.Sleep(150*time.Millisecond),
			chromedp.Evaluate(`Array.from(document.querySelectorAll("button, select, input:not([type=file]), textarea, summary"))
				.map((e) => e.type === "checkbox" ? e.closest("label") : e)
				.filter((e) => e.offsetParent !== null && e.getBoundingClientRect().height < 43.5)
				.map((e) => (e.id || e.textContent.trim().slice(0, 30)) + " " + Math.round(e.getBoundingClientRect().height))`, &small),
			chromedp.Evaluate(`document.documentElement.scrollWidth > window.innerWidth + 1`, &overflow),
		)
		if err != nil {
			t.Fatal(err)
		}
		if len(small) > 0 {
			t.Errorf("width %d: controls under 44 px: %v", w, small)
		}
		if overflow {
			t.Errorf("width %d: the page scrolls sideways", w)
		}
		s.shot(t, fmt.Sprintf("08-demo-%d.png", w))
	}
	if err := chromedp.Run(s.ctx, chromedp.EmulateViewport(1024, 768)); err != nil {
		t.Fatal(err)
	}
}

// TestDecimalMarkChoice: a column like "1,234" is read with the reader's
// default until the user chooses the decimal mark; the choice re-runs the
// analysis. Check values: the engine's own answers for each choice (run
// natively here).
func TestDecimalMarkChoice(t *testing.T) {
	s := browser(t)
	const text = "Torque (N m)\n1,234\n1,567\n1,890\n1,402\n"
	s.open(t)
	if err := chromedp.Run(s.ctx, paste(text), analysed(1)); err != nil {
		t.Fatal(err)
	}
	s.state(t)
	for i, mark := range []string{"point", "comma"} {
		want, err := stats.Analyze(stats.Request{Text: text, Options: stats.Options{DecimalMark: mark}})
		if err != nil {
			t.Fatal(err)
		}
		err = chromedp.Run(s.ctx,
			chromedp.SetValue("#decimal-mark", mark, chromedp.ByID),
			chromedp.Evaluate(`document.getElementById("decimal-mark").dispatchEvent(new Event("change", {bubbles: true})), true`, nil),
			analysed(i+2))
		if err != nil {
			t.Fatal(err)
		}
		s.state(t)
		checkShown(t, s.fields(t), "mean-all", want.Centre.Mean)
	}
}

// TestEncodedFileShared drops a UTF-16 file and a Windows-1252 (Latin-1)
// file whose header has non-ASCII characters and a unit, then shares it: the
// preview shows the header as the engine's reader decoded it, and the link
// (which carries the file's bytes as read) reopens with the same header,
// unit, figures and encoding. Expected figures: stats.Analyze run natively on the same
// text as UTF-8 (invented values).
func TestEncodedFileShared(t *testing.T) {
	text := "Épaisseur (µm)\r\n12,5\r\n12,7\r\n12,4\r\n12,9\r\n12,6\r\n13,0\r\n12,5\r\n12,8\r\n"
	want, err := stats.Analyze(stats.Request{Text: text})
	if err != nil {
		t.Fatal(err)
	}
	if want.Input.Column != "Épaisseur" || want.Input.Unit != "µm" {
		t.Fatalf("the engine reads column %q unit %q", want.Input.Column, want.Input.Unit)
	}
	u16 := []byte{0xFF, 0xFE}
	for _, r := range text { // every rune here is in the Basic Multilingual Plane
		u16 = append(u16, byte(r), byte(r>>8))
	}
	var latin []byte
	for _, r := range text { // every rune here is below U+0100
		latin = append(latin, byte(r))
	}
	s := browser(t)
	for _, f := range []struct {
		name, encoding string
		b              []byte
	}{{"thickness-utf16.txt", "utf-16le", u16}, {"thickness-latin1.csv", "windows-1252", latin}} {
		t.Run(f.encoding, func(t *testing.T) {
			s.open(t)
			b64, _ := json.Marshal(f.b) // []byte marshals as base64
			err := chromedp.Run(s.ctx,
				chromedp.Evaluate(`(() => { const bin = atob(`+string(b64)+`); const u = new Uint8Array(bin.length);
					for (let i = 0; i < bin.length; i++) u[i] = bin.charCodeAt(i);
					const dt = new DataTransfer();
					dt.items.add(new File([u], "`+f.name+`"));
					const t = document.getElementById("input");
					t.dispatchEvent(new DragEvent("drop", {bubbles: true, cancelable: true, dataTransfer: dt}));
					return true })()`, nil),
				analysed(1))
			if err != nil {
				t.Fatal(err)
			}
			s.state(t)
			check := func(when string) {
				t.Helper()
				var col, quote, head string
				if err := chromedp.Run(s.ctx,
					chromedp.Text(".colname", &col, chromedp.ByQuery),
					chromedp.Evaluate(`document.querySelector("#card-data .quote").textContent`, &quote),
					chromedp.Evaluate(`(document.querySelector("#preview tr.header-row td") || {}).textContent || ""`, &head),
				); err != nil {
					t.Fatal(err)
				}
				if col != "Épaisseur" || !strings.Contains(quote, "(µm)") || head != "Épaisseur (µm)" {
					t.Errorf("%s: column %q, data card %q, preview header %q; want Épaisseur, (µm), Épaisseur (µm)", when, col, quote, head)
				}
				got := s.fields(t)
				checkShown(t, got, "used", float64(want.Counts.Used))
				checkShown(t, got, "mean-all", want.Centre.Mean)
				checkShown(t, got, "sd-all", want.Spread.SD)
			}
			check("dropped")
			var note string
			if err := chromedp.Run(s.ctx, chromedp.Text("#preview-note", &note, chromedp.ByID)); err != nil {
				t.Fatal(err)
			}
			if !strings.Contains(note, f.encoding) {
				t.Errorf("preview note %q does not say the encoding %s", note, f.encoding)
			}
			var link string
			err = chromedp.Run(s.ctx,
				chromedp.Click("#share", chromedp.ByID),
				chromedp.Poll(`document.getElementById("share-url").value.includes("#s=")`, nil, chromedp.WithPollingTimeout(10*time.Second)),
				chromedp.Value("#share-url", &link, chromedp.ByID))
			if err != nil {
				t.Fatal(err)
			}
			if !strings.HasPrefix(link, s.base+"/#s=") {
				t.Fatalf("share link %q", link)
			}
			err = chromedp.Run(s.ctx,
				chromedp.Navigate("about:blank"),
				chromedp.Navigate(link),
				chromedp.WaitVisible(`body[data-ready="1"]`, chromedp.ByQuery),
				analysed(1))
			if err != nil {
				t.Fatal(err)
			}
			s.state(t)
			check("opened from the link")
			if err := chromedp.Run(s.ctx, chromedp.Text("#preview-note", &note, chromedp.ByID)); err != nil || !strings.Contains(note, f.encoding) {
				t.Errorf("opened from the link: preview note %q does not say the encoding %s", note, f.encoding)
			}
		})
	}
}

// TestOverTimeCard: the demo data show the stability verdict and the
// control chart in the "Over time" card, and a baseline typed in the
// settings reaches the engine (the verdict names it).
func TestOverTimeCard(t *testing.T) {
	s := browser(t)
	s.open(t)
	if err := chromedp.Run(s.ctx, chromedp.Click("#demo", chromedp.ByID), analysed(1)); err != nil {
		t.Fatal(err)
	}
	var verdict string
	var points int
	var stable string
	err := chromedp.Run(s.ctx,
		chromedp.Text(`#card-time [data-field="stability-verdict"]`, &verdict, chromedp.ByQuery),
		chromedp.Evaluate(`document.querySelector('#card-time [data-field="stability-verdict"]').dataset.stable`, &stable),
		chromedp.Evaluate(`document.querySelectorAll('#card-time figure[data-chart="control"] svg .pt').length`, &points))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(verdict, "120 readings") && !strings.HasPrefix(strings.TrimLeft(verdict, "\u2714\u26a0 "), "Not stable") && !strings.Contains(verdict, "Shift") {
		t.Errorf("verdict %q", verdict)
	}
	if stable != "true" && stable != "false" || points < 100 {
		t.Errorf("stable flag %q, %d points on the control chart (want the 120 readings)", stable, points)
	}
	err = chromedp.Run(s.ctx,
		chromedp.Evaluate(`document.getElementById("overtime-settings").open = true`, nil),
		chromedp.SendKeys("#baseline", "2-61", chromedp.ByID), analysed(2),
		chromedp.Text(`#card-time [data-field="stability-verdict"]`, &verdict, chromedp.ByQuery))
	if err != nil {
		var diag string
		chromedp.Run(s.ctx, chromedp.Evaluate(`JSON.stringify({sw: document.getElementById("signal-switches").childElementCount, b: document.getElementById("baseline").value, st: document.body.dataset.state, an: document.body.dataset.analysed, err: document.getElementById("settings-error").textContent, status: document.getElementById("status").textContent})`, &diag))
		t.Fatal(err, diag)
	}
	if !strings.Contains(verdict, "limits set from readings 1-60") {
		t.Errorf("after a baseline of rows 2-61 the verdict is %q", verdict)
	}
	s.shot(t, "08-over-time.png")
}

// sameReport compares two report JSONs: equal structure and text, numbers
// equal within 4 units in the last place. The page runs the engine as
// js/wasm and the test natively: Go's math functions (Exp, Log) use
// assembly on amd64 and portable code on wasm, which may differ in the
// last bit (seen: a p-value 0.6965836485454426 against ...27). Two pages
// (wasm and wasm) give the same bits; the share-link test checks that.
func sameReport(a, b []byte) (string, bool) {
	var x, y any
	if json.Unmarshal(a, &x) != nil || json.Unmarshal(b, &y) != nil {
		return "(not JSON)", false
	}
	var walk func(x, y any, path string) (string, bool)
	walk = func(x, y any, path string) (string, bool) {
		switch u := x.(type) {
		case map[string]any:
			v, ok := y.(map[string]any)
			if !ok || len(u) != len(v) {
				return path, false
			}
			for k := range u {
				if p, ok := walk(u[k], v[k], path+"."+k); !ok {
					return p, false
				}
			}
		case []any:
			v, ok := y.([]any)
			if !ok || len(u) != len(v) {
				return path, false
			}
			for i := range u {
				if p, ok := walk(u[i], v[i], fmt.Sprintf("%s[%d]", path, i)); !ok {
					return p, false
				}
			}
		case float64:
			v, ok := y.(float64)
			if !ok {
				return path, false
			}
			if u != v && math.Abs(u-v) > 4*math.Abs(u)*0x1p-52 {
				return fmt.Sprintf("%s (%v against %v)", path, u, v), false
			}
		default:
			if x != y {
				return fmt.Sprintf("%s (%v against %v)", path, x, y), false
			}
		}
		return "", true
	}
	return walk(x, y, "report")
}
