package dist

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"io/fs"
	"net/http/httptest"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"lotlens/build/web"
	"lotlens/build/web/sitecheck"
)

// fakeSite is a small site with the page's reference patterns: quoted
// asset names in HTML and scripts, url() in CSS, a help page with relative
// paths, the service worker's placeholders.
func fakeSite() files {
	return files{
		"index.html": []byte(`<!doctype html><html><head><link rel="stylesheet" href="style.css"><link rel="manifest" href="manifest.webmanifest"><script type="module" src="app.js"></script></head>` +
			`<body><a href="help/mean.html#mean">mean</a><a href="help/">help</a></body></html>`),
		"app.js":                []byte(`import { start } from "./client.js"; import { card } from './cards.js'; navigator.serviceWorker.register("sw.js"); fetch('demo/capsule-fill.tsv'); const h = "help/" + slug + ".html";`),
		"client.js":             []byte(`export function start() { return new Worker("engine.js"); }`),
		"cards.js":              []byte(`import { start } from "./client.js"; export const card = 1;`),
		"engine.js":             []byte(`importScripts("wasm_exec.js"); fetch("lotlens.wasm");`),
		"wasm_exec.js":          []byte(`// runtime glue`),
		"lotlens.wasm":          append([]byte("\x00asm"), bytes.Repeat([]byte("engine "), 200)...),
		"style.css":             []byte(`body { background: url(icon.svg) no-repeat; } .x { background: url("icon.svg"); }`),
		"icon.svg":              []byte(`<svg xmlns="http://www.w3.org/2000/svg"></svg>`),
		"manifest.webmanifest":  []byte(`{"icons":[{"src":"icon.svg"}]}`),
		"demo/capsule-fill.tsv": []byte("g\n5.01\n"),
		"sw.js":                 []byte(`const BUILD = "__LOTLENS_BUILD__"; const FILES = ["__LOTLENS_ASSETS__"];`),
		"404.html":              []byte(`<!doctype html><p>Not here. <a href="/index.html">Start</a></p>`),
		"help/index.html":       []byte(`<h1 id="help">Help</h1><link rel="stylesheet" href="../style.css"><a href="mean.html">Mean</a>`),
		"help/mean.html":        []byte(`<h1 id="mean">Mean</h1><link rel="stylesheet" href="../style.css"><a href="../index.html">back</a> <a href="https://example.org/paper">paper</a> ` + strings.Repeat("text ", 100)),
	}
}

func TestFingerprintRewritesReferences(t *testing.T) {
	site := fakeSite()
	renamed, err := fingerprint(site)
	if err != nil {
		t.Fatal(err)
	}
	for _, keep := range []string{"index.html", "sw.js", "404.html", "help/mean.html", "help/index.html"} {
		if _, ok := site[keep]; !ok {
			t.Errorf("%s lost its name", keep)
		}
	}
	for _, old := range []string{"app.js", "client.js", "cards.js", "engine.js", "wasm_exec.js", "lotlens.wasm", "style.css", "icon.svg", "manifest.webmanifest", "demo/capsule-fill.tsv"} {
		neu, ok := renamed[old]
		if !ok || !web.Fingerprinted(neu) {
			t.Errorf("%s renamed to %q", old, neu)
		}
		if _, ok := site[old]; ok {
			t.Errorf("%s still present under its old name", old)
		}
	}
	idx := string(site["index.html"])
	for _, old := range []string{"style.css", "app.js", "manifest.webmanifest"} {
		if !strings.Contains(idx, `"`+renamed[old]+`"`) {
			t.Errorf("index.html does not refer to %s: %s", renamed[old], idx)
		}
	}
	app := string(site[renamed["app.js"]])
	// module import specifiers are fingerprinted like any quoted reference
	if !strings.Contains(app, `from "./`+renamed["client.js"]+`"`) || !strings.Contains(app, `from './`+renamed["cards.js"]+`'`) ||
		!strings.Contains(app, `'`+renamed["demo/capsule-fill.tsv"]+`'`) || !strings.Contains(app, `"sw.js"`) {
		t.Errorf("app.js not rewritten: %s", app)
	}
	if client := string(site[renamed["client.js"]]); !strings.Contains(client, `"`+renamed["engine.js"]+`"`) {
		t.Errorf("client.js not rewritten: %s", client)
	}
	css := string(site[renamed["style.css"]])
	if strings.Count(css, renamed["icon.svg"]) != 2 {
		t.Errorf("style.css url() not rewritten: %s", css)
	}
	if !strings.Contains(string(site["help/mean.html"]), `"../`+renamed["style.css"]+`"`) {
		t.Errorf("help page's ../style.css not rewritten")
	}
	// A change deep down renames everything that leads to it.
	site2 := fakeSite()
	site2["lotlens.wasm"] = append(site2["lotlens.wasm"], '!')
	renamed2, err := fingerprint(site2)
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range []string{"lotlens.wasm", "engine.js", "client.js", "cards.js", "app.js"} {
		if renamed[f] == renamed2[f] {
			t.Errorf("%s kept its name %s although lotlens.wasm changed", f, renamed[f])
		}
	}
	if renamed["style.css"] != renamed2["style.css"] {
		t.Errorf("style.css renamed although it did not change")
	}
}

func TestFingerprintRefusesCycles(t *testing.T) {
	site := files{"a.js": []byte(`"b.js"`), "b.js": []byte(`"a.js"`)}
	if _, err := fingerprint(site); err == nil || !strings.Contains(err.Error(), "cycle") {
		t.Errorf("cycle: err = %v", err)
	}
}

func TestServiceWorkerPlaceholders(t *testing.T) {
	site := fakeSite()
	if _, err := fingerprint(site); err != nil {
		t.Fatal(err)
	}
	if err := fillServiceWorker(site); err != nil {
		t.Fatal(err)
	}
	sw := string(site["sw.js"])
	m := regexp.MustCompile(`BUILD = "([0-9a-f]{16})"; const FILES = (\[.*\]);`).FindStringSubmatch(sw)
	if m == nil {
		t.Fatalf("sw.js placeholders not filled: %s", sw)
	}
	var list []string
	if err := json.Unmarshal([]byte(m[2]), &list); err != nil {
		t.Fatal(err)
	}
	if len(list) != len(site)-1 {
		t.Errorf("asset list has %d entries for %d files (sw.js excluded)", len(list), len(site))
	}
	for _, u := range list {
		if _, ok := site[strings.TrimPrefix(u, "/")]; !ok || !strings.HasPrefix(u, "/") {
			t.Errorf("asset list entry %q", u)
		}
	}
	// The build id follows the content.
	site2 := fakeSite()
	site2["style.css"] = append(site2["style.css"], ' ')
	fingerprint(site2)
	fillServiceWorker(site2)
	if string(site2["sw.js"]) == sw {
		t.Error("build id unchanged after a content change")
	}
}

func TestLinkCheck(t *testing.T) {
	site := fakeSite()
	if _, err := fingerprint(site); err != nil {
		t.Fatal(err)
	}
	if err := checkLinks(site); err != nil {
		t.Fatalf("a good site fails the link check: %v", err)
	}
	for name, c := range map[string]struct{ file, content, want string }{
		"broken link":        {"index.html", `<a href="help/nosuch.html">x</a>`, "help/nosuch.html"},
		"missing anchor":     {"index.html", `<a href="help/mean.html#nosuch">x</a>`, "no element with id"},
		"external script":    {"index.html", `<script src="https://cdn.example.com/x.js"></script>`, "external resource"},
		"external style":     {"help/mean.html", `<link rel="stylesheet" href="//cdn.example.com/x.css">`, "external resource"},
		"external link page": {"index.html", `<a href="https://example.org/">x</a>`, "external resource"},
		"css external url":   {"style.css", `body { background: url(https://example.com/a.png) }`, "external resource"},
		"css broken url":     {"style.css", `body { background: url("nosuch.png") }`, "nosuch.png"},
		"script loads":       {"app.js", `importScripts("nosuch.js")`, "nosuch.js"},
		"script external":    {"app.js", `import("https://cdn.example.com/lib.js")`, "external"},
	} {
		bad := fakeSite()
		fingerprint(bad)
		f := c.file
		if f == "style.css" || f == "app.js" {
			for n := range bad {
				if strings.HasPrefix(n, strings.TrimSuffix(f, filepath.Ext(f))+".") && filepath.Ext(n) == filepath.Ext(f) {
					f = n
				}
			}
		}
		bad[f] = append(bad[f], c.content...)
		err := checkLinks(bad)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: link check error %v, want one mentioning %q", name, err, c.want)
		}
	}
}

func TestAccepts(t *testing.T) {
	// Expected answers: RFC 9110 section 12.5.3 (Accept-Encoding, q-values).
	for _, c := range []struct {
		h, tok string
		want   bool
	}{
		{"gzip, deflate, br", "br", true},
		{"gzip", "br", false},
		{"br;q=0, gzip", "br", false},
		{"BR; q=0.5", "br", true},
		{"*", "br", true},
		{"*;q=0", "gzip", false},
		{"gzip;q=0, *", "gzip", false},
		{"", "gzip", false},
	} {
		if got := web.Accepts(c.h, c.tok); got != c.want {
			t.Errorf("Accepts(%q, %q) = %v", c.h, c.tok, got)
		}
	}
}

// writeFakeDist builds the fake site through the same steps as Build (minus
// the wasm compile and the help rendering) into a temporary directory.
func writeFakeDist(t *testing.T) string {
	t.Helper()
	site := fakeSite()
	if _, err := fingerprint(site); err != nil {
		t.Fatal(err)
	}
	if err := fillServiceWorker(site); err != nil {
		t.Fatal(err)
	}
	if err := checkLinks(site); err != nil {
		t.Fatal(err)
	}
	if err := compress(site); err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	if err := write(site, dir); err != nil {
		t.Fatal(err)
	}
	return dir
}

// TestHandler runs the HTTP checks the edge worker's test runs, against the
// local server on a small built site.
func TestHandler(t *testing.T) {
	dir := writeFakeDist(t)
	srv := httptest.NewServer(Handler(dir))
	defer srv.Close()
	sitecheck.Run(t, srv.URL, dir)
}

// TestBuildReproducible builds the real site twice into two directories and
// compares every file; then serves one with the local server and checks it.
func TestBuildReproducible(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the wasm twice; make test-worker runs it")
	}
	a, b := t.TempDir(), t.TempDir()
	before := inputHash(t, "../..")
	for _, d := range []string{a, b} {
		if err := BuildWith("../..", d, Options{WasmOpt: os.Getenv("LOTLENS_WASM_OPT")}); err != nil {
			t.Fatal(err)
		}
	}
	if inputHash(t, "../..") != before {
		// Several people edit the shared working tree at once; on a clean
		// clone (CI) the input cannot change.
		t.Skip("the build's input changed while the test ran: run it again")
	}
	list := func(root string) map[string][]byte {
		out := map[string][]byte{}
		filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
			if err == nil && !d.IsDir() {
				rel, _ := filepath.Rel(root, p)
				out[rel], _ = os.ReadFile(p)
			}
			return nil
		})
		return out
	}
	fa, fb := list(a), list(b)
	if len(fa) != len(fb) || len(fa) < 40 {
		t.Errorf("the two builds have %d and %d files", len(fa), len(fb))
	}
	for n, ba := range fa {
		if bb, ok := fb[n]; !ok {
			t.Errorf("%s is only in the first build", n)
		} else if !bytes.Equal(ba, bb) {
			t.Errorf("%s differs between two builds of the same input", n)
		}
	}
	// Every compressible file has its .br and .gz, and they decode to it.
	for n := range fa {
		if web.Compressible(n) && len(fa[n]) >= 4096 {
			if _, ok := fa[n+".br"]; !ok {
				t.Errorf("%s has no .br", n)
			}
			if _, ok := fa[n+".gz"]; !ok {
				t.Errorf("%s has no .gz", n)
			}
		}
	}
	srv := httptest.NewServer(Handler(a))
	defer srv.Close()
	sitecheck.Run(t, srv.URL, a)
}

// inputHash hashes every file the build reads: the site, the engine, the
// bridge, the build itself and the module files.
func inputHash(t *testing.T, root string) string {
	t.Helper()
	h := sha256.New()
	for _, dir := range []string{"site", "wasm", "stats", "build/dist", "build/web", "go.mod", "go.sum"} {
		filepath.WalkDir(filepath.Join(root, dir), func(p string, d fs.DirEntry, err error) error {
			if err != nil || d.IsDir() {
				return nil
			}
			b, err := os.ReadFile(p)
			if err != nil {
				return nil
			}
			fmt.Fprintf(h, "%s\x00%d\x00", p, len(b))
			h.Write(b)
			return nil
		})
	}
	return hex.EncodeToString(h.Sum(nil))
}

// TestMetaCSPMatchesHeader holds the contract that site/index.html repeats
// the served Content-Security-Policy in a meta element (without
// frame-ancestors, which browsers ignore in a meta policy).
func TestMetaCSPMatchesHeader(t *testing.T) {
	b, err := os.ReadFile("../../site/index.html")
	if err != nil {
		t.Fatal(err)
	}
	m := regexp.MustCompile(`http-equiv="Content-Security-Policy"\s+content="([^"]*)"`).FindSubmatch(b)
	if m == nil {
		t.Fatal("site/index.html has no meta Content-Security-Policy")
	}
	var header []string
	for _, d := range strings.Split(web.Headers["Content-Security-Policy"], ";") {
		if d = strings.TrimSpace(d); d != "" && !strings.HasPrefix(d, "frame-ancestors") {
			header = append(header, d)
		}
	}
	var meta []string
	for _, d := range strings.Split(string(m[1]), ";") {
		if d = strings.TrimSpace(d); d != "" {
			meta = append(meta, d)
		}
	}
	if strings.Join(meta, "; ") != strings.Join(header, "; ") {
		t.Errorf("meta CSP in site/index.html\n  %s\ndiffers from the served header (build/web.Headers, frame-ancestors aside)\n  %s", strings.Join(meta, "; "), strings.Join(header, "; "))
	}
}
