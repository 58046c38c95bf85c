//go:build js && wasm

// Command worker is Lotlens's edge worker: it serves the built site (dist/,
// embedded at build time) with the same handler as the local server
// (lotlens/build/web): strict security headers, the wasm media type, a year of
// immutable caching for fingerprinted files and no-cache for the rest,
// precompressed bodies when the client accepts them, and the 404 page.
//
// Build it with `go run ./build worker` (it copies dist/ here, generates the
// JavaScript glue and compiles this package to build/app.wasm); run it locally
// with `make test-worker`, deploy it with `make deploy`.
package main

import (
	"embed"
	"io/fs"

	"github.com/syumai/workers"

	"lotlens/build/web"
)

// site is a copy of dist/ made by `go run ./build worker` (gitignored).
//
//go:embed all:dist
var site embed.FS

func main() {
	sub, err := fs.Sub(site, "dist")
	if err != nil {
		panic(err)
	}
	workers.Serve(web.Handler(sub))
}
