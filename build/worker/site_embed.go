//go:build js && wasm && !lotlens_assets

package main

import (
	"embed"
	"io/fs"
)

// site is a copy of dist/ made by `go run ./build worker` (gitignored).
//
//go:embed all:dist
var site embed.FS

func siteFS() fs.FS {
	sub, err := fs.Sub(site, "dist")
	if err != nil {
		panic(err)
	}
	return sub
}
