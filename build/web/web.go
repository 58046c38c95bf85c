// Package web is how Lotlens's files are served: the security headers, the
// content types, the caching rule and the choice of a precompressed body. The
// local server (build/dist.Handler) and the edge worker (build/worker) both
// serve through Handler, so they send the same bytes and headers.
//
// It depends only on the standard library so that the worker (js/wasm) stays
// small.
package web

import (
	"crypto/sha256"
	"encoding/hex"
	"io/fs"
	"net/http"
	"path"
	"regexp"
	"strconv"
	"strings"
)

// Headers are the security headers every response carries. The page's
// index.html repeats the Content-Security-Policy in a meta element: change
// both together.
var Headers = map[string]string{
	// script-src allows WebAssembly compilation ('wasm-unsafe-eval') and
	// nothing else beyond the site's own files.
	"Content-Security-Policy": "default-src 'self'; script-src 'self' 'wasm-unsafe-eval'; style-src 'self'; img-src 'self' data: blob:; connect-src 'self'; worker-src 'self'; object-src 'none'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'",
	"X-Content-Type-Options":  "nosniff",
	"Referrer-Policy":         "no-referrer",
	// The page needs none of these features; clipboard access stays allowed
	// for copying a share link.
	"Permissions-Policy":           "accelerometer=(), camera=(), display-capture=(), geolocation=(), gyroscope=(), magnetometer=(), microphone=(), payment=(), usb=(), serial=(), hid=()",
	"Cross-Origin-Opener-Policy":   "same-origin",
	"Cross-Origin-Resource-Policy": "same-origin",
	"X-Frame-Options":              "DENY",
}

// Cache-Control values.
const (
	Immutable = "public, max-age=31536000, immutable"
	NoCache   = "no-cache"
)

// ContentTypes maps a file extension to its media type.
var ContentTypes = map[string]string{
	".html":        "text/html; charset=utf-8",
	".js":          "text/javascript; charset=utf-8",
	".mjs":         "text/javascript; charset=utf-8",
	".css":         "text/css; charset=utf-8",
	".wasm":        "application/wasm",
	".json":        "application/json",
	".webmanifest": "application/manifest+json",
	".svg":         "image/svg+xml",
	".png":         "image/png",
	".ico":         "image/x-icon",
	".webp":        "image/webp",
	".tsv":         "text/tab-separated-values; charset=utf-8",
	".csv":         "text/csv; charset=utf-8",
	".txt":         "text/plain; charset=utf-8",
	".xml":         "application/xml",
	".woff2":       "font/woff2",
}

// ContentType is the media type for a file name.
func ContentType(name string) string {
	if t, ok := ContentTypes[path.Ext(name)]; ok {
		return t
	}
	return "application/octet-stream"
}

// HashLen is the number of hex digits of a fingerprint in a file name.
const HashLen = 10

var fingerprinted = regexp.MustCompile(`\.[0-9a-f]{10}\.[A-Za-z0-9]+$`)

// Fingerprinted reports whether a file name carries a content hash
// (name.<10 hex>.ext): such files never change and are cached for a year.
func Fingerprinted(name string) bool { return fingerprinted.MatchString(name) }

// CacheControl is the Cache-Control value for a file name.
func CacheControl(name string) string {
	if Fingerprinted(name) {
		return Immutable
	}
	return NoCache
}

// Compressible reports whether a file type is worth precompressing.
func Compressible(name string) bool {
	switch path.Ext(name) {
	case ".html", ".js", ".mjs", ".css", ".wasm", ".json", ".webmanifest", ".svg", ".tsv", ".csv", ".txt", ".xml", ".ico":
		return true
	}
	return false
}

// Encodings are the precompressed variants, best first: file name suffix and
// Content-Encoding token.
var Encodings = []struct{ Suffix, Token string }{{".br", "br"}, {".gz", "gzip"}}

// Accepts reports whether an Accept-Encoding header value allows token
// (a q-value of 0 refuses it; "*" allows what is not named).
func Accepts(header, token string) bool {
	star := false
	for _, part := range strings.Split(header, ",") {
		name, params, _ := strings.Cut(strings.TrimSpace(part), ";")
		name = strings.ToLower(strings.TrimSpace(name))
		q := 1.0
		for _, p := range strings.Split(params, ";") {
			k, v, ok := strings.Cut(strings.TrimSpace(p), "=")
			if ok && strings.EqualFold(strings.TrimSpace(k), "q") {
				if f, err := strconv.ParseFloat(strings.TrimSpace(v), 64); err == nil {
					q = f
				}
			}
		}
		if name == token {
			return q > 0
		}
		if name == "*" && q > 0 {
			star = true
		}
	}
	return star
}

// Handler serves the files of fsys (a built dist/) with Headers, the media
// type, the caching rule and, when the client accepts it, a precompressed
// body (name.br or name.gz next to the file). "/" and "dir/" serve
// index.html; a missing file gets 404.html with status 404.
func Handler(fsys fs.FS) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		h := w.Header()
		for k, v := range Headers {
			h.Set(k, v)
		}
		if r.Method != http.MethodGet && r.Method != http.MethodHead {
			h.Set("Allow", "GET, HEAD")
			http.Error(w, "method not allowed", http.StatusMethodNotAllowed)
			return
		}
		name := strings.TrimPrefix(path.Clean("/"+r.URL.Path), "/")
		if name == "" || strings.HasSuffix(r.URL.Path, "/") {
			name = path.Join(name, "index.html")
		}
		status := http.StatusOK
		// The precompressed variant first: the raw file is not read at all
		// when the client takes br or gzip.
		body, enc := variant(fsys, name, r.Header.Get("Accept-Encoding"))
		if body == nil {
			var err error
			if body, err = fs.ReadFile(fsys, name); err != nil {
				// "/help" -> "/help/" when it is a directory with an index.
				if _, ierr := fs.Stat(fsys, path.Join(name, "index.html")); ierr == nil && path.Ext(name) == "" {
					http.Redirect(w, r, "/"+name+"/", http.StatusMovedPermanently)
					return
				}
				name, status = "404.html", http.StatusNotFound
				body, enc = variant(fsys, name, r.Header.Get("Accept-Encoding"))
				if body == nil {
					if body, err = fs.ReadFile(fsys, name); err != nil {
						body = []byte("404 page not found\n")
						name = "404.txt"
					}
				}
			}
		}
		h.Set("Content-Type", ContentType(name))
		if status == http.StatusOK {
			h.Set("Cache-Control", CacheControl(name))
		} else {
			h.Set("Cache-Control", NoCache)
		}
		if Compressible(name) {
			h.Set("Vary", "Accept-Encoding")
		}
		if enc != "" {
			h.Set("Content-Encoding", enc)
		}
		// Fingerprinted files are immutable; the others revalidate by ETag.
		if status == http.StatusOK && !Fingerprinted(name) {
			sum := sha256.Sum256(body)
			etag := `"` + hex.EncodeToString(sum[:8]) + `"`
			h.Set("ETag", etag)
			if inm := r.Header.Get("If-None-Match"); inm != "" && strings.Contains(inm, etag) {
				w.WriteHeader(http.StatusNotModified)
				return
			}
		}
		if r.Method == http.MethodHead {
			// No Content-Length: the worker's runtime refuses a declared
			// length with an empty body.
			w.WriteHeader(status)
			return
		}
		h.Set("Content-Length", strconv.Itoa(len(body)))
		w.WriteHeader(status)
		w.Write(body)
	})
}

// variant returns the best precompressed variant of name that the
// Accept-Encoding header allows, with its Content-Encoding token, or nil.
func variant(fsys fs.FS, name, acceptEncoding string) ([]byte, string) {
	if !Compressible(name) {
		return nil, ""
	}
	for _, e := range Encodings {
		if Accepts(acceptEncoding, e.Token) {
			if b, err := fs.ReadFile(fsys, name+e.Suffix); err == nil {
				return b, e.Token
			}
		}
	}
	return nil, ""
}
