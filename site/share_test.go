package site

import (
	"context"
	"encoding/base64"
	"encoding/json"
	"fmt"
	"net/http"
	"net/http/httptest"
	"net/http/httputil"
	"net/url"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/network"
	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/chromedp"

	"lotlens/stats"
	"lotlens/stats/share"
	"lotlens/stats/share/sharetest"
)

// shareText is invented data: fill weights in two columns with a label.
const shareText = "Line\tFill (g)\nL1\t5.02\nL2\t4.98\nL1\t5.07\nL2\t4.95\nL1\t5.01\nL2\t5.00\nL1\t5.04\nL2\t4.97\nL1\t5.31\nL2\t4.99\n"

// setField types into a settings field and sends the input event.
func setField(id, v string) chromedp.Action {
	return chromedp.Evaluate(fmt.Sprintf(`(() => { const e = document.getElementById(%q); e.value = %q;
		e.dispatchEvent(new Event("input", {bubbles: true})); return true })()`, id, v), nil)
}

// shownReport is the report JSON the page shows (lotlens.shownReport()).
func (s *session) shownReport(t *testing.T) string {
	t.Helper()
	var rep string
	if err := chromedp.Run(s.ctx, chromedp.Evaluate(`lotlens.shownReport() || ""`, &rep)); err != nil {
		t.Fatal(err)
	}
	if rep == "" {
		t.Fatal("the page shows no report")
	}
	return rep
}

// history is every URL of the tab's session history.
func (s *session) history(t *testing.T) []string {
	t.Helper()
	var urls []string
	err := chromedp.Run(s.ctx, chromedp.ActionFunc(func(ctx context.Context) error {
		_, entries, err := page.GetNavigationHistory().Do(ctx)
		for _, e := range entries {
			urls = append(urls, e.URL)
		}
		return err
	}))
	if err != nil {
		t.Fatal(err)
	}
	return urls
}

// noTrace checks that the address, the history and the browser's storage
// hold no part of the shared data.
func (s *session) noTrace(t *testing.T, when string, secrets ...string) {
	t.Helper()
	var href string
	var stored int
	err := chromedp.Run(s.ctx,
		chromedp.Evaluate(`location.href`, &href),
		chromedp.Evaluate(`(async () => localStorage.length + sessionStorage.length + (indexedDB.databases ? (await indexedDB.databases()).length : 0))()`, &stored, awaitPromise))
	if err != nil {
		t.Fatal(err)
	}
	if stored != 0 {
		t.Errorf("%s: %d items in localStorage, sessionStorage or IndexedDB", when, stored)
	}
	for _, u := range append([]string{href}, s.history(t)...) {
		for _, sec := range secrets {
			if sec != "" && strings.Contains(u, sec) {
				t.Errorf("%s: the address or history holds the shared data: %.120s", when, u)
			}
		}
		if strings.Contains(u, "#s=") || strings.Contains(u, share.LinkPrefix) {
			t.Errorf("%s: the address or history holds a link: %.120s", when, u)
		}
	}
}

// goOffline makes the service worker take control, then turns the network off.
func (s *session) goOffline(t *testing.T) {
	t.Helper()
	var controlled bool
	err := chromedp.Run(s.ctx,
		chromedp.Evaluate(`navigator.serviceWorker.ready.then(() => true)`, nil, awaitPromise),
		chromedp.Poll(`!!navigator.serviceWorker.controller`, &controlled, chromedp.WithPollingTimeout(15*time.Second)),
	)
	if err != nil {
		t.Fatalf("the service worker did not take control: %v", err)
	}
	s.srv.CloseClientConnections()
	s.srv.Close()
	if err := chromedp.Run(s.ctx, network.Enable(), network.EmulateNetworkConditions(true, 0, -1, -1)); err != nil {
		t.Fatal(err)
	}
}

// makeLink presses Share link and returns the link.
func (s *session) makeLink(t *testing.T) string {
	t.Helper()
	var link string
	err := chromedp.Run(s.ctx,
		chromedp.Click("#share", chromedp.ByID),
		chromedp.Poll(`document.getElementById("share-url").value.includes("#s=")`, nil, chromedp.WithPollingTimeout(20*time.Second)),
		chromedp.Value("#share-url", &link, chromedp.ByID))
	if err != nil {
		t.Fatal(err)
	}
	return link
}

// TestShareLinkSameReportOffline makes a link in one browser (with a
// target, limits, a confidence level and an exclusion) and opens it in a
// fresh browser, offline after a first visit: the report JSON is the same
// text (so every number has the same bits), the fingerprint is the
// sender's, the banner says where the data came from, and neither browser
// keeps the link in its address, history or storage. Check values: the
// sender's own report and stats.Analyze natively.
func TestShareLinkSameReportOffline(t *testing.T) {
	a := browser(t)
	a.open(t)
	err := chromedp.Run(a.ctx,
		paste(shareText), analysed(1),
		chromedp.SetValue("#confidence", "0.99", chromedp.ByID),
		setField("target", "5.0"), setField("lsl", "4.85"), setField("usl", "5.15"), setField("leave-out", "10"),
		chromedp.Poll(`(lotlens.shownReport() || "").includes('"excluded":1') && lotlens.shownReport().includes('"level":0.99')`, nil, chromedp.WithPollingTimeout(20*time.Second)))
	if err != nil {
		t.Fatal(err)
	}
	a.state(t)
	var histBefore int
	chromedp.Run(a.ctx, chromedp.Evaluate(`history.length`, &histBefore))
	sent := a.shownReport(t)
	link := a.makeLink(t)
	payload := link[strings.Index(link, "#s=")+3:]
	if !strings.HasPrefix(link, a.base+"/#s="+share.LinkPrefix) {
		t.Fatalf("link %.80s", link)
	}
	var histAfter int
	chromedp.Run(a.ctx, chromedp.Evaluate(`history.length`, &histAfter))
	if histAfter != histBefore {
		t.Errorf("making the link added %d history entries", histAfter-histBefore)
	}
	a.noTrace(t, "sender after making the link", payload[:40])
	p, err := share.Decode(payload)
	if err != nil {
		t.Fatal(err)
	}
	if p.Text != shareText || p.Options.Target == nil || *p.Options.Target != 5.0 || p.Options.Confidence != 0.99 || len(p.Options.Exclude) != 1 {
		t.Errorf("the link carries %+v", p.Options)
	}

	b := browser(t)
	b.open(t)
	b.goOffline(t)
	err = chromedp.Run(b.ctx,
		chromedp.Navigate("about:blank"),
		chromedp.Navigate(strings.Replace(link, a.base, b.base, 1)),
		chromedp.WaitVisible(`body[data-ready="1"]`, chromedp.ByQuery),
		analysed(1))
	if err != nil {
		t.Fatal(err)
	}
	b.state(t)
	got := b.shownReport(t)
	if got != sent {
		t.Errorf("the report opened from the link differs from the sender's:\n%.300s\n%.300s", got, sent)
	}
	var rep stats.Report
	if err := json.Unmarshal([]byte(got), &rep); err != nil {
		t.Fatal(err)
	}
	want, _ := stats.Analyze(stats.Request{Text: shareText})
	if rep.Input.Fingerprint != want.Input.Fingerprint || rep.Input.Fingerprint != p.Fingerprint() {
		t.Errorf("fingerprint %s, sender %s", rep.Input.Fingerprint, want.Input.Fingerprint)
	}
	var bannerText, fp string
	err = chromedp.Run(b.ctx,
		chromedp.WaitVisible("#shared-banner", chromedp.ByID),
		chromedp.Text("#shared-banner", &bannerText, chromedp.ByID),
		chromedp.Text("#shared-fp", &fp, chromedp.ByID))
	if err != nil {
		t.Fatal(err)
	}
	if fp != rep.Input.Fingerprint || !strings.Contains(bannerText, "from the link itself") || !strings.Contains(bannerText, "Opened from a shared link") {
		t.Errorf("banner %q", bannerText)
	}
	b.noTrace(t, "receiver after opening", payload[:40])
	b.shot(t, "09-opened-from-link.png")
	// A change of settings re-runs on the shared data.
	if err := chromedp.Run(b.ctx, setField("target", "5.01"), analysed(2)); err != nil {
		t.Fatal(err)
	}
	b.state(t)
}

// TestDamagedLinks: each damaged link shows its message, which stays (the
// start-up "Ready" does not overwrite it), says what to ask for and nothing
// technical, and the link leaves the address bar.
func TestDamagedLinks(t *testing.T) {
	p := share.Payload{Created: 1796000000, Text: "5.1\n5.2\n5.3\n5.0\n5.2\n"}
	link, err := share.Encode(p)
	if err != nil {
		t.Fatal(err)
	}
	raw, _ := share.Marshal(p)
	changed := []byte(link)
	if changed[30] == 'A' {
		changed[30] = 'B'
	} else {
		changed[30] = 'A'
	}
	s := browser(t)
	for _, c := range []struct{ name, frag, code, says string }{
		{"one character changed", "#s=" + string(changed), stats.CodeShareCorrupt, "changed or damaged"},
		{"cut short", "#s=" + link[:len(link)-10], stats.CodeShareTruncated, "cut short"},
		{"empty", "#s=", stats.CodeShareEmpty, "holds no data"},
		{"not base64", "#s=" + link[:20] + "%25%25" + link[22:], stats.CodeShareCorrupt, "changed or damaged"},
		{"random text", "#s=hello%20there", stats.CodeShareForeign, "not a Lotlens link"},
		{"JSON null", "#s=null", stats.CodeShareForeign, "not a Lotlens link"},
		{"unknown version", "#s=" + base64.RawURLEncoding.EncodeToString(sharetest.Reframe(raw, 2, 0)), stats.CodeShareVersion, "newer version"},
		{"the page's old format", "#d=eJwrSS0u0c1LzE0FAA", stats.CodeShareForeign, "not a Lotlens link"},
	} {
		err := chromedp.Run(s.ctx,
			chromedp.Navigate("about:blank"),
			chromedp.Navigate(s.base+"/"+c.frag),
			chromedp.WaitVisible(`body[data-ready="1"]`, chromedp.ByQuery),
			chromedp.Poll(`!!document.body.dataset.shareError`, nil, chromedp.WithPollingTimeout(20*time.Second)),
			chromedp.Sleep(500*time.Millisecond))
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		var msg, code, href string
		var reportShown bool
		chromedp.Run(s.ctx,
			chromedp.Text("#status", &msg, chromedp.ByID),
			chromedp.Evaluate(`document.body.dataset.shareError`, &code),
			chromedp.Evaluate(`location.href`, &href),
			chromedp.Evaluate(`!document.getElementById("report").hidden`, &reportShown))
		if code != c.code || !strings.Contains(msg, c.says) || !strings.Contains(msg, "not opened") {
			t.Errorf("%s: code %q, message %q", c.name, code, msg)
		}
		low := strings.ToLower(msg)
		for _, w := range []string{"ready", "atob", "fetch", "base64", "undefined", "exception"} {
			if strings.Contains(low, w) {
				t.Errorf("%s: the message says %q: %s", c.name, w, msg)
			}
		}
		if !strings.Contains(low, "ask the sender") && !strings.Contains(low, "reload the page") {
			t.Errorf("%s: the message does not say what to do: %s", c.name, msg)
		}
		if href != s.base+"/" || reportShown {
			t.Errorf("%s: address %q, report shown %v", c.name, href, reportShown)
		}
	}
}

// TestSharedFileOpens: the .lotlens file of an analysis, dropped on a page,
// opens to the report the page makes of the same text (the JSON text is
// the same: every number has the same bits); the picker accepts the
// extension. (The engine as js/wasm may differ from the native one in the
// last bit of a p-value, so the check value is the page's own report.)
func TestSharedFileOpens(t *testing.T) {
	p := share.Payload{Created: 1796000000, Name: "fill.tsv", Text: shareText}
	file, err := share.EncodeFile(p)
	if err != nil {
		t.Fatal(err)
	}
	s := browser(t)
	s.open(t)
	if err := chromedp.Run(s.ctx, paste(shareText), analysed(1)); err != nil {
		t.Fatal(err)
	}
	want := s.shownReport(t)
	b64, _ := json.Marshal(file)
	var accept string
	err = chromedp.Run(s.ctx,
		chromedp.Evaluate(`(() => { const bin = atob(`+string(b64)+`); const u = new Uint8Array(bin.length);
			for (let i = 0; i < bin.length; i++) u[i] = bin.charCodeAt(i);
			const dt = new DataTransfer();
			dt.items.add(new File([u], "fill.lotlens"));
			document.getElementById("input").dispatchEvent(new DragEvent("drop", {bubbles: true, cancelable: true, dataTransfer: dt}));
			return true })()`, nil),
		analysed(2),
		chromedp.Evaluate(`document.getElementById("file").accept`, &accept))
	if err != nil {
		t.Fatal(err)
	}
	s.state(t)
	if got := s.shownReport(t); got != want {
		t.Errorf("the report of the dropped file differs from the pasted text's:\n%.300s\n%.300s", got, want)
	}
	var banner string
	chromedp.Run(s.ctx, chromedp.Text("#shared-banner", &banner, chromedp.ByID))
	if !strings.Contains(banner, "shared file") || !strings.Contains(banner, "fill.tsv") {
		t.Errorf("banner %q", banner)
	}
	if !strings.Contains(accept, ".lotlens") {
		t.Errorf("the picker accepts %q", accept)
	}
}

// TestLinkRequestsCarryNoData records every request of a page that makes a
// link and of a page that opens it (through a recording proxy, loopback
// included): none carries the link's payload or a reading, in its address
// or its body.
func TestLinkRequestsCarryNoData(t *testing.T) {
	var mu sync.Mutex
	var seen []string
	var origin *url.URL
	proxy := httptest.NewServer(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		body, _ := httputil.DumpRequest(r, true)
		mu.Lock()
		seen = append(seen, string(body))
		o := origin
		mu.Unlock()
		if r.Method == http.MethodConnect || o == nil || r.Host != o.Host {
			http.Error(w, "refused by the test proxy", http.StatusForbidden)
			return
		}
		httputil.NewSingleHostReverseProxy(o).ServeHTTP(w, r)
	}))
	defer proxy.Close()
	s := browser(t, chromedp.ProxyServer(proxy.URL), chromedp.Flag("proxy-bypass-list", "<-loopback>"))
	mu.Lock()
	origin, _ = url.Parse(s.base)
	mu.Unlock()
	s.open(t)
	if err := chromedp.Run(s.ctx, paste(shareText), analysed(1)); err != nil {
		t.Fatal(err)
	}
	link := s.makeLink(t)
	err := chromedp.Run(s.ctx, chromedp.Navigate("about:blank"), chromedp.Navigate(link),
		chromedp.WaitVisible(`body[data-ready="1"]`, chromedp.ByQuery), analysed(1))
	if err != nil {
		t.Fatal(err)
	}
	s.state(t)
	payload := link[strings.Index(link, "#s=")+3:]
	mu.Lock()
	defer mu.Unlock()
	for _, r := range seen {
		for _, sec := range []string{payload[:24], payload[len(payload)-24:], "5.31", "Fill (g)"} {
			if strings.Contains(r, sec) {
				t.Errorf("a request carries %q: %.200s", sec, r)
			}
		}
	}
	if len(seen) < 5 {
		t.Errorf("the proxy saw %d requests: the log is not working", len(seen))
	}
}
