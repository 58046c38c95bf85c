//go:build js && wasm

// Command worker is Lotlens's edge worker: it serves the built site (dist/)
// with the same handler as the local server (lotlens/build/web): strict
// security headers, the wasm media type, a year of immutable caching for
// fingerprinted files and no-cache for the rest, precompressed bodies when the
// client accepts them, and the 404 page.
//
// The files come from a copy of dist/ embedded in the worker (the default,
// wrangler.jsonc) or, built with -tags lotlens_assets, from the platform's
// static-asset binding (wrangler.assets.jsonc). DEVELOPERS.md gives the
// measurements behind the default.
//
// With a Workers KV binding named LOTLENS_SHARES (wrangler.stored.jsonc) it
// also keeps encrypted shared analyses (build/web/stored; store.go binds
// it); without the binding those endpoints answer 404.
//
// Build it with `go run ./build worker` (it copies dist/ here, generates the
// JavaScript glue and compiles this package to build/app.wasm); run it
// locally with `make test-worker`, deploy it with `make deploy`.
package main

import (
	"github.com/syumai/workers"

	"lotlens/build/web"
	"lotlens/build/web/stored"
)

func main() {
	workers.Serve(stored.Handler(env, web.Handler(siteFS())))
}
