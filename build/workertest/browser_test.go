package workertest

// The encrypted stored link end to end in a browser: the page (site/share.js
// and site/stored.js, built into the worker) encrypts in headless Chromium,
// the worker under wrangler dev keeps the ciphertext in its local KV, and a
// fresh browser (its own profile) opens /s/<id>#<key>. Every request the browsers make
// goes through a recording proxy in front of the worker.

import (
	"context"
	"encoding/json"
	"fmt"
	"net/http"
	"net/http/httptest"
	"net/http/httputil"
	"net/url"
	"os"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/runtime"
	"github.com/chromedp/chromedp"

	"lotlens/site/headless"
	"lotlens/stats"
)

// storedText is invented data: tightening torque of two fastening stations.
const storedText = "Station\tTorque (Nm)\nK7\t12.437\nK8\t12.391\nK7\t12.452\nK8\t12.418\nK7\t12.406\nK8\t12.463\nK7\t12.429\nK8\t12.384\nK7\t12.441\nK8\t12.412\nK7\t12.397\nK8\t12.455\n"

// storedPass is the invented passphrase of the passphrase variant.
const storedPass = "amber-gearbox-quarry-71"

// recorder is a reverse proxy in front of the worker that keeps every
// request as sent (headers and body).
type recorder struct {
	mu   sync.Mutex
	seen []string
}

func (rec *recorder) handler(t *testing.T, base string) http.Handler {
	target, err := url.Parse(base)
	if err != nil {
		t.Fatal(err)
	}
	rp := httputil.NewSingleHostReverseProxy(target)
	director := rp.Director
	rp.Director = func(r *http.Request) { director(r); r.Host = target.Host }
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		dump, err := httputil.DumpRequest(r, true) // keeps the body for the proxy
		if err != nil {
			http.Error(w, err.Error(), http.StatusBadRequest)
			return
		}
		rec.mu.Lock()
		rec.seen = append(rec.seen, string(dump))
		rec.mu.Unlock()
		rp.ServeHTTP(w, r)
	})
}

func (rec *recorder) requests() []string {
	rec.mu.Lock()
	defer rec.mu.Unlock()
	return append([]string(nil), rec.seen...)
}

// fresh starts headless Chromium (site/headless, as the page's tests do) with a
// fresh profile, so each sender or receiver has its own storage, cache and
// service workers, and returns the context of its tab.
func fresh(t *testing.T) context.Context {
	if err := headless.Check(); err != nil {
		t.Fatal(err)
	}
	return headless.Start(t, 4*time.Minute)
}

func run(t *testing.T, ctx context.Context, what string, acts ...chromedp.Action) {
	t.Helper()
	if err := chromedp.Run(ctx, acts...); err != nil {
		var status string
		sctx, cancel := context.WithTimeout(ctx, 5*time.Second)
		chromedp.Run(sctx, chromedp.Evaluate(`document.getElementById("status").textContent`, &status))
		cancel()
		t.Fatalf("%s: %v (status line: %q)", what, err, status)
	}
}

// setValue sets a field's value as typed (with its input event).
func setValue(id, v string) chromedp.Action {
	return chromedp.Evaluate(fmt.Sprintf(`(() => { const e = document.getElementById(%q); e.value = %s;
		e.dispatchEvent(new Event("input", {bubbles: true})); return e.value === %[2]s })()`, id, mustJSON(v)), nil)
}

func poll(cond string) chromedp.Action {
	return chromedp.Poll(cond, nil, chromedp.WithPollingTimeout(90*time.Second))
}

func awaitPromise(p *runtime.EvaluateParams) *runtime.EvaluateParams { return p.WithAwaitPromise(true) }

// openLink loads link in ctx and waits until the engine is ready.
func openLink(t *testing.T, ctx context.Context, link string) {
	t.Helper()
	run(t, ctx, "opening "+link, chromedp.Navigate("about:blank"), chromedp.Navigate(link),
		chromedp.WaitVisible(`body[data-ready="1"]`, chromedp.ByQuery))
}

// waitReport waits for the page to show a report opened from a stored copy
// and returns its JSON.
func waitReport(t *testing.T, ctx context.Context, what string) string {
	t.Helper()
	var rep, errState string
	run(t, ctx, what,
		poll(`document.body.dataset.state === "report" && !!document.getElementById("shared-fp") || document.body.dataset.state === "error"`),
		chromedp.Evaluate(`document.body.dataset.state === "error" ? document.getElementById("status").textContent : ""`, &errState))
	if errState != "" {
		t.Fatalf("%s: the page shows an error: %s", what, errState)
	}
	run(t, ctx, what, chromedp.Evaluate(`lotlens.shownReport() || ""`, &rep))
	return rep
}

// openFails checks that the page refuses to open: the error code and a
// message, and no report.
func openFails(t *testing.T, ctx context.Context, what, code, msg string) {
	t.Helper()
	var got struct {
		Code, Status, Report string
		Hidden               bool
	}
	run(t, ctx, what,
		poll(`document.body.dataset.state === "error" || document.body.dataset.state === "report"`),
		chromedp.Evaluate(`({code: document.body.dataset.shareError || "", status: document.getElementById("status").textContent,
			report: lotlens.shownReport() || "", hidden: document.getElementById("report").hidden})`, &got))
	if got.Code != code || !strings.Contains(got.Status, msg) {
		t.Errorf("%s: code %q, message %q; want %q with %q", what, got.Code, got.Status, code, msg)
	}
	if got.Report != "" || !got.Hidden {
		t.Errorf("%s: a report is shown (hidden %v): %.100s", what, got.Hidden, got.Report)
	}
}

// noCopyKept checks that the browser context keeps no stored copy or
// answer of the store in its caches or storage.
func noCopyKept(t *testing.T, ctx context.Context, what string) {
	t.Helper()
	var kept []string
	run(t, ctx, what, chromedp.Evaluate(`(async () => {
		const out = [];
		for (const k of await caches.keys()) for (const r of await (await caches.open(k)).keys()) if (/\/api\/|\/s\//.test(new URL(r.url).pathname)) out.push(r.url);
		if (localStorage.length + sessionStorage.length) out.push("web storage");
		return out })()`, &kept, awaitPromise))
	if len(kept) > 0 {
		t.Errorf("%s: the browser keeps %v", what, kept)
	}
}

// storeCopy presses "Store an encrypted copy", sets the passphrase (or
// none) and stores; it returns the link shown.
func storeCopy(t *testing.T, ctx context.Context, pass, previous string) string {
	t.Helper()
	var link string
	run(t, ctx, "storing an encrypted copy",
		chromedp.Click("#share-stored", chromedp.ByID),
		poll(`document.getElementById("stored-status").textContent.includes("The site will hold only the encrypted data")`),
		setValue("stored-days", "1"),
		setValue("stored-pass", pass),
		chromedp.Click("#stored-go", chromedp.ByID),
		poll(fmt.Sprintf(`document.getElementById("share-url").value.includes("/s/") && document.getElementById("share-url").value !== %q`, previous)),
		chromedp.Value("#share-url", &link, chromedp.ByID))
	return link
}

// typePass waits for the passphrase box with the message msg, types pass
// and presses Open.
func typePass(t *testing.T, ctx context.Context, msg, pass string) {
	t.Helper()
	run(t, ctx, "typing the passphrase",
		poll(fmt.Sprintf(`!document.getElementById("pass-box").hidden && document.getElementById("pass-msg").textContent.includes(%q)`, msg)),
		setValue("pass-input", pass),
		chromedp.Click("#pass-go", chromedp.ByID))
}

// TestBrowserStoredLinks: the page stores an encrypted copy through the
// worker and fresh browser contexts open it; wrong keys, passphrases and a
// deleted copy are refused with their messages; no request carries the
// key, the passphrase or the data. Check values: the sender's own report
// (the receiver's must be the same JSON text) and stats.Analyze run
// natively for the fingerprint.
func TestBrowserStoredLinks(t *testing.T) {
	root, wrangler := prepare(t)
	if os.Getenv("LOTLENS_WORKER_CONFIG") != "" {
		t.Skip("the stored link is checked with the default worker")
	}
	worker, out := startWorker(t, root, wrangler, "build/worker/wrangler.stored.jsonc", "--persist-to", t.TempDir())
	defer func() {
		if t.Failed() {
			t.Logf("wrangler output:\n%s", out.String())
		}
	}()
	rec := &recorder{}
	proxy := httptest.NewServer(rec.handler(t, worker))
	defer proxy.Close()
	base := proxy.URL

	// The sender pastes data, sets a target and stores a copy with the key in the link.
	a := fresh(t)
	openLink(t, a, base+"/")
	var sent string
	run(t, a, "pasting the data",
		chromedp.Evaluate(fmt.Sprintf(`(() => { const d = document.getElementById("data"); d.value = %s;
			d.dispatchEvent(new ClipboardEvent("paste", {bubbles: true})); return true })()`, mustJSON(storedText)), nil),
		poll(`(document.body.dataset.analysed|0) >= 1`),
		chromedp.Evaluate(`(() => { const e = document.getElementById("target"); e.value = "12.42"; e.dispatchEvent(new Event("input", {bubbles: true})); return true })()`, nil),
		poll(`(lotlens.shownReport() || "").includes('"target":12.42')`),
		chromedp.Evaluate(`lotlens.shownReport()`, &sent),
		chromedp.Click("#share", chromedp.ByID),
		poll(`document.getElementById("share-url").value.includes("#s=")`))
	want, err := stats.Analyze(stats.Request{Text: storedText})
	if err != nil {
		t.Fatal(err)
	}
	var sentRep stats.Report
	if err := json.Unmarshal([]byte(sent), &sentRep); err != nil {
		t.Fatal(err)
	}
	if sentRep.Input.Fingerprint != want.Input.Fingerprint || sentRep.Target == nil {
		t.Fatalf("the sender's report: fingerprint %s (native %s), target %v", sentRep.Input.Fingerprint, want.Input.Fingerprint, sentRep.Target)
	}
	link := storeCopy(t, a, "", "")
	i := strings.Index(link, "#")
	if !strings.HasPrefix(link, base+"/s/") || i < 0 || len(link)-i-1 != 43 || i-len(base+"/s/") != 22 {
		t.Fatalf("stored link %q: want %s/s/<22-character id>#<43-character key>", link, base)
	}
	key := link[i+1:]

	// A fresh browser (its own profile) opens it: the same report, the same fingerprint.
	b := fresh(t)
	openLink(t, b, link)
	got := waitReport(t, b, "opening the stored link")
	if got != sent {
		t.Errorf("the report opened from the stored link differs from the sender's:\n%.300s\n%.300s", got, sent)
	}
	var bannerText, fp, href string
	run(t, b, "reading the banner",
		chromedp.Text("#shared-banner", &bannerText, chromedp.ByID),
		chromedp.Text("#shared-fp", &fp, chromedp.ByID),
		chromedp.Evaluate(`location.href`, &href))
	if fp != want.Input.Fingerprint || !strings.Contains(bannerText, "Opened from an encrypted stored copy") {
		t.Errorf("banner %q, fingerprint %s, want %s", bannerText, fp, want.Input.Fingerprint)
	}
	if strings.Contains(href, key) || strings.Contains(href, "s=") {
		t.Errorf("the address still holds the link: %s", href)
	}

	// A wrong key (same form, one character changed) and a missing key.
	wrong := []byte(key)
	if wrong[5] == 'A' {
		wrong[5] = 'B'
	} else {
		wrong[5] = 'A'
	}
	openLink(t, b, link[:i+1]+string(wrong))
	openFails(t, b, "a wrong key", "stored-key", "does not open the stored copy")
	openLink(t, b, link[:i])
	openFails(t, b, "no key", "stored-key", "missing its key")
	// Opened again (the service worker controls the page by now): still the same.
	openLink(t, b, link)
	if got := waitReport(t, b, "opening the stored link again"); got != sent {
		t.Errorf("the second opening differs from the sender's report")
	}

	// The sender deletes the copy: the link no longer opens, in the
	// browser that opened it before nor in a fresh one.
	var st string
	run(t, a, "deleting",
		chromedp.Click("#stored-delete", chromedp.ByID),
		poll(`document.getElementById("stored-status").textContent.includes("deleted") || document.getElementById("stored-status").textContent.includes("no longer")`),
		chromedp.Text("#stored-status", &st, chromedp.ByID))
	if !strings.Contains(st, "The stored copy was deleted") {
		t.Errorf("after delete the sender sees %q", st)
	}
	openLink(t, b, link)
	openFails(t, b, "a deleted copy", "stored-gone", "no longer exists")
	noCopyKept(t, b, "the receiver")
	c := fresh(t)
	openLink(t, c, link)
	openFails(t, c, "a deleted copy in a fresh context", "stored-gone", "no longer exists")

	// The passphrase variant: no key in the link; a wrong or an empty
	// passphrase does not open it, the right one does.
	plink := storeCopy(t, a, storedPass, link)
	if !strings.HasPrefix(plink, base+"/s/") || strings.Contains(plink, "#") || len(plink) != len(base+"/s/")+22 {
		t.Fatalf("passphrase link %q", plink)
	}
	d := fresh(t)
	openLink(t, d, plink)
	typePass(t, d, "protected by a passphrase", "amber-gearbox-quarry-17")
	typePass(t, d, "That passphrase does not open it", "")
	var none struct {
		Report string
		Hidden bool
	}
	run(t, d, "waiting after an empty passphrase",
		poll(`!document.getElementById("pass-box").hidden && document.getElementById("pass-msg").textContent.includes("That passphrase does not open it")`),
		chromedp.Evaluate(`({report: lotlens.shownReport() || "", hidden: !!document.getElementById("shared-banner").hidden})`, &none))
	if none.Report != "" || !none.Hidden {
		t.Errorf("without the passphrase a report is shown: %.100s", none.Report)
	}
	typePass(t, d, "That passphrase does not open it", storedPass)
	if got := waitReport(t, d, "opening with the passphrase"); got != sent {
		t.Errorf("the report opened with the passphrase differs from the sender's:\n%.300s\n%.300s", got, sent)
	}
	noCopyKept(t, a, "the sender")
	noCopyKept(t, d, "the passphrase receiver")

	// No request carried the key, the passphrase or the data.
	reqs := rec.requests()
	var stores, fetches int
	for _, r := range reqs {
		if strings.HasPrefix(r, "POST /api/share") {
			stores++
		}
		if strings.HasPrefix(r, "GET /api/share/") {
			fetches++
		}
		for _, sec := range []string{key, string(wrong), storedPass, "Torque (Nm)", "12.437", "12.463", "K7\t"} {
			if strings.Contains(r, sec) {
				t.Errorf("a request carries %q: %.200q", sec, r)
			}
		}
	}
	if stores != 2 || fetches < 6 {
		t.Errorf("the proxy saw %d stores and %d fetches of %d requests: the log is not working", stores, fetches, len(reqs))
	}
	t.Logf("%d requests recorded, %d stores, %d fetches of a stored copy", len(reqs), stores, fetches)
}

func mustJSON(v any) string {
	b, err := json.Marshal(v)
	if err != nil {
		panic(err)
	}
	return string(b)
}
