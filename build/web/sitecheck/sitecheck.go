// Package sitecheck checks a running server of a built site over HTTP: the
// security headers, media types, caching, precompressed bodies and the 404
// page. The local server's tests (build/dist) and the edge worker's test
// (build/workertest) run the same checks.
package sitecheck

import (
	"bytes"
	"compress/gzip"
	"io"
	"net/http"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/andybalholm/brotli"

	"lotlens/build/web"
)

// Run requests pages and assets from base (e.g. http://127.0.0.1:8787) and
// compares them with the built site in dir.
func Run(t *testing.T, base, dir string) {
	t.Helper()
	client := &http.Client{
		Transport:     &http.Transport{DisableCompression: true},
		CheckRedirect: func(*http.Request, []*http.Request) error { return http.ErrUseLastResponse },
	}
	read := func(name string) []byte {
		b, err := os.ReadFile(filepath.Join(dir, filepath.FromSlash(name)))
		if err != nil {
			t.Fatal(err)
		}
		return b
	}
	get := func(method, path string, hdr map[string]string) (*http.Response, []byte) {
		t.Helper()
		req, err := http.NewRequest(method, base+path, nil)
		if err != nil {
			t.Fatal(err)
		}
		for k, v := range hdr {
			req.Header.Set(k, v)
		}
		res, err := client.Do(req)
		if err != nil {
			t.Fatalf("%s %s: %v", method, path, err)
		}
		defer res.Body.Close()
		b, err := io.ReadAll(res.Body)
		if err != nil {
			t.Fatalf("%s %s: reading the body: %v", method, path, err)
		}
		return res, b
	}
	// decode undoes Content-Encoding.
	decode := func(path string, res *http.Response, b []byte) []byte {
		t.Helper()
		var r io.Reader
		switch enc := res.Header.Get("Content-Encoding"); enc {
		case "":
			return b
		case "br":
			r = brotli.NewReader(bytes.NewReader(b))
		case "gzip":
			zr, err := gzip.NewReader(bytes.NewReader(b))
			if err != nil {
				t.Fatalf("%s: gzip body does not decode: %v", path, err)
			}
			r = zr
		default:
			t.Fatalf("%s: unexpected Content-Encoding %q", path, enc)
		}
		out, err := io.ReadAll(r)
		if err != nil {
			t.Fatalf("%s: %s body does not decode: %v", path, res.Header.Get("Content-Encoding"), err)
		}
		return out
	}
	security := func(path string, res *http.Response) {
		t.Helper()
		for k, v := range web.Headers {
			if got := res.Header.Get(k); got != v {
				t.Errorf("%s: header %s = %q, want %q", path, k, got, v)
			}
		}
	}
	expect := func(path string, res *http.Response, status int, ctype, cache, enc string) {
		t.Helper()
		if res.StatusCode != status {
			t.Errorf("%s: status %d, want %d", path, res.StatusCode, status)
		}
		security(path, res)
		if got := res.Header.Get("Content-Type"); got != ctype {
			t.Errorf("%s: Content-Type %q, want %q", path, got, ctype)
		}
		if cache != "" && res.Header.Get("Cache-Control") != cache {
			t.Errorf("%s: Cache-Control %q, want %q", path, res.Header.Get("Cache-Control"), cache)
		}
		if got := res.Header.Get("Content-Encoding"); got != enc {
			t.Errorf("%s: Content-Encoding %q, want %q", path, got, enc)
		}
	}
	// The client's order decides between encodings of equal weight at the
	// edge (the runtime re-encodes to the client's first choice), so the
	// exact checks name br first.
	both := map[string]string{"Accept-Encoding": "br, gzip"}

	// The page, brotli-compressed, no-cache, revalidated by ETag.
	res, b := get("GET", "/", both)
	expect("/", res, 200, "text/html; charset=utf-8", web.NoCache, "br")
	if !strings.Contains(res.Header.Get("Vary"), "Accept-Encoding") {
		t.Errorf("/: Vary %q lacks Accept-Encoding", res.Header.Get("Vary"))
	}
	if !bytes.Equal(decode("/", res, b), read("index.html")) {
		t.Errorf("/: body differs from index.html")
	}
	if etag := res.Header.Get("ETag"); etag == "" {
		t.Errorf("/: no ETag")
	} else {
		res, _ := get("GET", "/", map[string]string{"Accept-Encoding": "br, gzip", "If-None-Match": etag})
		if res.StatusCode != http.StatusNotModified {
			t.Errorf("/ with If-None-Match: status %d, want 304", res.StatusCode)
		}
	}

	// The engine: fingerprinted, immutable, wasm media type, each encoding.
	wasms, _ := filepath.Glob(filepath.Join(dir, "lotlens.*.wasm"))
	if len(wasms) != 1 {
		t.Fatalf("want one fingerprinted lotlens.<hash>.wasm in %s, found %v", dir, wasms)
	}
	wname := filepath.Base(wasms[0])
	raw := read(wname)
	for _, c := range []struct{ ae, enc string }{{"br, gzip", "br"}, {"br", "br"}, {"gzip", "gzip"}, {"gzip, deflate, br, zstd", "*"}, {"", ""}, {"br;q=0, gzip;q=0", ""}} {
		p := "/" + wname
		res, b := get("GET", p, map[string]string{"Accept-Encoding": c.ae})
		enc := c.enc
		if enc == "*" { // a browser's header: either compressed form will do
			if enc = res.Header.Get("Content-Encoding"); enc != "br" && enc != "gzip" {
				t.Errorf("%s (Accept-Encoding: %s): Content-Encoding %q, want br or gzip", p, c.ae, enc)
			}
		}
		expect(p+" (Accept-Encoding: "+c.ae+")", res, 200, "application/wasm", web.Immutable, enc)
		if !bytes.Equal(decode(p, res, b), raw) {
			t.Errorf("%s (Accept-Encoding: %s): body differs from the built file", p, c.ae)
		}
	}

	// Every fingerprinted asset the page names is served immutable.
	idx := string(read("index.html"))
	for _, name := range []string{"app", "style"} {
		m, _ := filepath.Glob(filepath.Join(dir, name+".*.*"))
		for _, f := range m {
			base := filepath.Base(f)
			if strings.HasSuffix(base, ".br") || strings.HasSuffix(base, ".gz") || !web.Fingerprinted(base) {
				continue
			}
			if !strings.Contains(idx, base) {
				continue
			}
			res, b := get("GET", "/"+base, both)
			enc := ""
			if _, err := os.Stat(filepath.Join(dir, base+".br")); err == nil {
				enc = "br"
			}
			expect("/"+base, res, 200, web.ContentType(base), web.Immutable, enc)
			if !bytes.Equal(decode(base, res, b), read(base)) {
				t.Errorf("/%s: body differs", base)
			}
		}
	}

	// A help page and the help index.
	res, b = get("GET", "/help/mean.html", both)
	expect("/help/mean.html", res, 200, "text/html; charset=utf-8", web.NoCache, "br")
	if !bytes.Equal(decode("/help/mean.html", res, b), read("help/mean.html")) {
		t.Errorf("/help/mean.html: body differs")
	}
	res, b = get("GET", "/help/", nil)
	expect("/help/", res, 200, "text/html; charset=utf-8", web.NoCache, "")
	if !bytes.Equal(b, read("help/index.html")) {
		t.Errorf("/help/: body is not help/index.html")
	}
	res, _ = get("GET", "/help", nil)
	if res.StatusCode != http.StatusMovedPermanently || !strings.HasSuffix(res.Header.Get("Location"), "/help/") {
		t.Errorf("/help: status %d Location %q, want 301 to /help/", res.StatusCode, res.Header.Get("Location"))
	}

	// The 404 page, with the headers.
	res, b = get("GET", "/no/such/page.html", nil)
	expect("/no/such/page.html", res, 404, "text/html; charset=utf-8", web.NoCache, "")
	if !bytes.Equal(b, read("404.html")) {
		t.Errorf("404: body is not 404.html")
	}
	// HEAD has the headers and no body; other methods are refused.
	res, b = get("HEAD", "/", nil)
	expect("HEAD /", res, 200, "text/html; charset=utf-8", web.NoCache, "")
	if len(b) != 0 {
		t.Errorf("HEAD /: %d body bytes", len(b))
	}
	res, _ = get("POST", "/", nil)
	if res.StatusCode != http.StatusMethodNotAllowed {
		t.Errorf("POST /: status %d, want 405", res.StatusCode)
	}
	security("POST /", res)
}
