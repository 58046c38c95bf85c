//go:build js && wasm && lotlens_assets

package main

import (
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"net/url"
	"syscall/js"
	"time"
)

// siteFS reads the site through the static-asset binding ASSETS (wrangler.jsonc:
// "assets" with run_worker_first, so that every response passes through
// web.Handler). The binding serves the files of dist/ byte for byte, .br and
// .gz variants included. It calls the binding's fetch through syscall/js
// rather than net/http's client, which would double the worker's size.
func siteFS() fs.FS { return assetsFS{} }

type assetsFS struct{}

// binding is env.ASSETS from the runtime context that syumai/workers' glue
// passes to the Go program.
func binding() (js.Value, error) {
	ctx := js.Global().Get("context")
	if ctx.IsUndefined() || ctx.Get("env").IsUndefined() {
		return js.Value{}, errors.New("no runtime context")
	}
	a := ctx.Get("env").Get("ASSETS")
	if a.IsUndefined() {
		return js.Value{}, errors.New(`no ASSETS binding: check "assets" in wrangler.jsonc`)
	}
	return a, nil
}

// await waits for a JavaScript promise.
func await(p js.Value) (js.Value, error) {
	ok, fail := make(chan js.Value, 1), make(chan js.Value, 1)
	then := js.FuncOf(func(_ js.Value, args []js.Value) any { ok <- args[0]; return nil })
	catch := js.FuncOf(func(_ js.Value, args []js.Value) any { fail <- args[0]; return nil })
	defer then.Release()
	defer catch.Release()
	p.Call("then", then, catch)
	select {
	case v := <-ok:
		return v, nil
	case e := <-fail:
		return js.Value{}, errors.New(e.Call("toString").String())
	}
}

func (assetsFS) ReadFile(name string) ([]byte, error) {
	if !fs.ValidPath(name) {
		return nil, &fs.PathError{Op: "read", Path: name, Err: fs.ErrInvalid}
	}
	perr := func(err error) error { return &fs.PathError{Op: "read", Path: name, Err: err} }
	assets, err := binding()
	if err != nil {
		return nil, perr(err)
	}
	u := url.URL{Scheme: "https", Host: "assets.local", Path: "/" + name}
	res, err := await(assets.Call("fetch", u.String()))
	if err != nil {
		return nil, perr(err)
	}
	switch status := res.Get("status").Int(); {
	case status == 404:
		return nil, perr(fs.ErrNotExist)
	case status != 200:
		return nil, perr(fmt.Errorf("asset binding answered %d", status))
	}
	buf, err := await(res.Call("arrayBuffer"))
	if err != nil {
		return nil, perr(err)
	}
	u8 := js.Global().Get("Uint8Array").New(buf)
	b := make([]byte, u8.Get("length").Int())
	js.CopyBytesToGo(b, u8)
	return b, nil
}

func (a assetsFS) Open(name string) (fs.File, error) {
	b, err := a.ReadFile(name)
	if err != nil {
		return nil, err
	}
	return &memFile{Reader: bytes.NewReader(b), info: fileInfo{name: name, size: int64(len(b))}}, nil
}

func (a assetsFS) Stat(name string) (fs.FileInfo, error) {
	b, err := a.ReadFile(name)
	if err != nil {
		return nil, err
	}
	return fileInfo{name: name, size: int64(len(b))}, nil
}

type memFile struct {
	*bytes.Reader
	info fileInfo
}

func (f *memFile) Stat() (fs.FileInfo, error) { return f.info, nil }
func (f *memFile) Close() error               { return nil }

type fileInfo struct {
	name string
	size int64
}

func (i fileInfo) Name() string       { return i.name }
func (i fileInfo) Size() int64        { return i.size }
func (i fileInfo) Mode() fs.FileMode  { return 0o444 }
func (i fileInfo) ModTime() time.Time { return time.Time{} }
func (i fileInfo) IsDir() bool        { return false }
func (i fileInfo) Sys() any           { return nil }
